// dwellmark expose: what an observer sees of a run (or of the exact steady
// spin), as an sRGB PNG and a spot report; optionally the linear image and
// a camera's video frames.
#include <iostream>
#include <optional>

#include "app/cli.hpp"
#include "core/io.hpp"
#include "core/simulate.hpp"
#include "render/image.hpp"
#include "render/observe.hpp"

namespace dm::app {

namespace {

struct ExposeArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  std::optional<std::string> view, mode;
  std::optional<double> eyeHeight, eyeDistance, start, exposure, steadyPrecession, steadyOrbit;
  std::optional<int> size;
  int threads = 0;
  bool pfm = false;
  bool force = false;
};

// The flags as overrides of the observer fields, so the field table checks them.
std::vector<std::string> flagOverrides(const ExposeArgs& a) {
  std::vector<std::string> sets = a.sets;
  auto number = [](double v) { return fmt(v, 17); };
  if (a.view) sets.push_back("observer.view=" + *a.view);
  if (a.mode) sets.push_back("observer.mode=" + *a.mode);
  if (a.eyeHeight) sets.push_back("observer.eye_height_mm=" + number(*a.eyeHeight));
  if (a.eyeDistance) sets.push_back("observer.eye_distance_mm=" + number(*a.eyeDistance));
  if (a.start) sets.push_back("observer.start_s=" + number(*a.start));
  if (a.exposure) sets.push_back("observer.exposure_s=" + number(*a.exposure));
  if (a.size) sets.push_back("observer.image_size_px=" + std::to_string(*a.size));
  if (a.steadyPrecession) sets.push_back("observer.steady_precession_rev_s=" + number(*a.steadyPrecession));
  if (a.steadyOrbit) sets.push_back("observer.steady_orbit_mm=" + number(*a.steadyOrbit));
  return sets;
}

// The motion the observer sees: the steady spin, or a simulated run (nullopt after a fault, reported).
std::optional<Observation> observe(const Scenario& s) {
  if (s.observer.steadyPrecession > 0) return observeSteady(s);
  SimulateOptions options;
  options.duration = observedUntil(s.observer);
  auto run = std::make_shared<const RunResult>(simulate(s, options));
  if (run->fault) {
    std::cerr << "dwellmark: " << faultReport(*run->fault) << "\n  nothing was written.\n";
    return std::nullopt;
  }
  return observeRun(s, run, s.observer.start, s.observer.start + s.observer.exposure);
}

void printSummary(const ExposureResult& r, const Observation& seen) {
  const ExposureStats& st = r.exposure.stats;
  std::cout << "exposed " << fmt(r.start, 6) << " s + " << st.strata << " strata (largest step " << fmt(st.largestStepPx, 3)
            << " px); " << r.spots.spots.size() << " spot(s) on a " << fmt(seen.ring.radius * 1e3, 4) << " mm ring, visible end "
            << (seen.visibleEnd ? std::string(endName(*seen.visibleEnd)) : "none") << "\n";
}

int runExpose(const ExposeArgs& a) {
  const Scenario s = loadScenarioWithOverrides(a.scenario, flagOverrides(a));
  // Refuse a folder that would mix results before the run; create it only
  // when there is something to write.
  checkOutputDir(a.out, a.force);
  const std::optional<Observation> seen = observe(s);
  if (!seen) return exitFault;
  const std::string dir = a.out + "/";
  const ExposureResult first = exposeObservation(s, *seen, s.observer.start, a.threads);
  nlohmann::json report = spotsJson(s, *seen, first);
  // The first exposure's files, formatted (and checked for NaN) before any is written.
  std::vector<OutputFile> files{{"exposure.png", encodePng(first.exposure.image)}};
  if (a.pfm) files.push_back({"exposure.pfm", encodePfm(first.exposure.image)});
  printSummary(first, *seen);
  // A camera's video: each frame its own exposure, 1/frame_rate apart.
  if (s.observer.frameCount > 1) {
    prepareOutputDir(dir + "frames", true);
    nlohmann::json frames = nlohmann::json::array();
    for (int i = 0; i < s.observer.frameCount; ++i) {
      const double start = s.observer.start + i / s.observer.frameRate;
      const ExposureResult frame = i == 0 ? first : exposeObservation(s, *seen, start, a.threads);
      char name[32];
      std::snprintf(name, sizeof name, "frame_%04d.png", i);
      writePng(dir + "frames/" + name, frame.exposure.image);
      nlohmann::json entry = spotsJson(s, *seen, frame);
      frames.push_back({{"file", std::string("frames/") + name}, {"start_s", entry["start_s"]},
                        {"spot_count", entry["spot_count"]}, {"spots", entry["spots"]}});
    }
    report["frame_rate_hz"] = s.observer.frameRate;
    report["frames"] = frames;
    std::cout << "wrote " << s.observer.frameCount << " frames in " << dir << "frames/\n";
  }
  files.push_back({"spots.json", jsonFileText(report)});
  writeOutputs(a.out, files);
  for (const OutputFile& f : files) std::cout << "wrote " << dir << f.name << "\n";
  return exitOk;
}

}  // namespace

void addExposeCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<ExposeArgs>();
  CLI::App* sub = app.add_subcommand("expose", "Show what an observer sees: exposure.png and spots.json (spot report)");
  sub->add_option("scenario", args->scenario, "scenario JSON file")->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--view", args->view, "top or visitor (observer.view)");
  sub->add_option("--mode", args->mode, "camera or eye (observer.mode)");
  sub->add_option("--eye-height-mm", args->eyeHeight, "visitor's eye above the table (observer.eye_height_mm)");
  sub->add_option("--eye-distance-mm", args->eyeDistance, "visitor's eye from the spin centre (observer.eye_distance_mm)");
  sub->add_option("--start-s", args->start, "exposure start time (observer.start_s)");
  sub->add_option("--exposure-s", args->exposure, "exposure time or eye window (observer.exposure_s)");
  sub->add_option("--size", args->size, "image width and height in px (observer.image_size_px)");
  sub->add_option("--steady-precession-rev-s", args->steadyPrecession,
                  "show the exact steady spin at this precession instead of a run (observer.steady_precession_rev_s)");
  sub->add_option("--steady-orbit-mm", args->steadyOrbit,
                  "that steady spin with the centre circling the spin axis this far from it, + towards the raised end "
                  "(observer.steady_orbit_mm)");
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  addThreadsOption(sub, args->threads);
  sub->add_flag("--pfm", args->pfm, "also write the linear float image exposure.pfm");
  sub->add_flag("--force", args->force, "write into a folder that already holds files");
  commands.add(sub, [args] { return runExpose(*args); });
}

}  // namespace dm::app
