// dwellmark snapshot: a picture of the GUI's 3D view of a scenario at one
// instant, rendered without any display (EGL, Mesa's surfaceless platform)
// by the GUI's own scene renderer. This file only reads the command line;
// the drawing lives in app/gui/ and is passed in when the build has OpenGL.
#include <filesystem>
#include <iostream>
#include <optional>
#include <tuple>

#include "app/cli.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

struct SnapshotArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  std::string size = "1280x800";
  std::optional<double> time;
  bool force = false;
};

// Picture side limits, px: a thumbnail to a poster, within what software GL
// renders offscreen in a few seconds.
constexpr int minSide = 16, maxSide = 8192;

// The inputs checked, so that nothing is drawn or written for a bad one.
SnapshotOptions optionsOf(const SnapshotArgs& a) {
  SnapshotOptions o;
  o.scenario = loadScenarioWithOverrides(a.scenario, a.sets);
  std::tie(o.width, o.height) = parseSize("--size", a.size, {minSide, minSide}, {maxSide, maxSide});
  const double duration = o.scenario.run.duration;
  o.time = a.time.value_or(std::min(o.scenario.observer.start, duration));
  if (!(o.time >= 0 && o.time <= duration))
    throw ScenarioError("--time-s", "value " + fmt(o.time, 10) + " s is out of range; allowed 0 to " + fmt(duration, 10) +
                                        " s (run.duration_s)");
  namespace fs = std::filesystem;
  const fs::path out(a.out);
  if (out.extension() != ".png") throw ScenarioError("--out", "value \"" + a.out + "\" is not a .png file");
  std::error_code ec;
  if (fs::is_directory(out, ec)) throw OutputError(a.out + " is a folder; name the PNG file to write");
  if (fs::exists(out, ec) && !a.force)
    throw OutputError(a.out + " already exists; choose a new name, or pass --force to replace it");
  const fs::path folder = out.has_parent_path() ? out.parent_path() : fs::path(".");
  if (!fs::is_directory(folder, ec)) throw OutputError("folder " + folder.string() + " does not exist");
  o.outPath = a.out;
  o.force = a.force;
  return o;
}

int runSnapshotCommand(const SnapshotArgs& a, const SnapshotRunner& runner) {
  const SnapshotOptions o = optionsOf(a);
  if (!runner) {
    std::cerr << "dwellmark: this build has no OpenGL (configured with -DDWELLMARK_GUI=OFF), so it cannot draw the "
                 "3D view.\n  The observer's picture needs none: dwellmark expose SCENARIO.json --out DIR\n";
    return exitFailure;
  }
  return runner(o);
}

}  // namespace

void addSnapshotCommand(CLI::App& app, Commands& commands, SnapshotRunner runner) {
  auto args = std::make_shared<SnapshotArgs>();
  CLI::App* sub = app.add_subcommand(
      "snapshot", "Picture of the GUI's 3D view at one instant, drawn without a display (EGL, no X needed)");
  sub->add_option("scenario", args->scenario, "scenario JSON file")->required();
  sub->add_option("--out", args->out, "PNG file to write (new, unless --force)")->required();
  sub->add_option("--size", args->size, "picture size in pixels, WIDTHxHEIGHT (default 1280x800)");
  sub->add_option("--time-s", args->time, "simulated instant shown, s (default observer.start_s)");
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  sub->add_flag("--force", args->force, "replace an existing file");
  commands.add(sub, [args, runner = std::move(runner)] { return runSnapshotCommand(*args, runner); });
}

}  // namespace dm::app
