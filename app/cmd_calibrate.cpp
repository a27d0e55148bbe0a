// dwellmark calibrate: fits a surface's kinetic friction and rolling
// resistance to times measured on a prototype; writes calibration.json and
// the scenario with the fitted values.
#include <unistd.h>

#include <iostream>

#include "app/cli.hpp"
#include "core/calibrate.hpp"
#include "core/export.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

struct CalibrateArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  CalibrationTarget target;
  std::optional<int> spots;
  int launches = 16;
  int threads = 0;
  std::optional<std::uint64_t> seed;
  bool quiet = false;
  bool force = false;
};

std::string coefficientLine(const std::string& name, const FittedCoefficient& c) {
  std::string line = "  " + name + " " + fmt(c.value, 4);
  if (c.uncertainty) line += " +- " + fmt(*c.uncertainty, 2);
  if (!c.matched) line += " (no value in " + fmt(c.low, 3) + " to " + fmt(c.high, 3) + " matches the measured time; the closest)";
  else if (!c.determined) line += " (not determined: the measured time hardly depends on it; keep a handbook value)";
  return line + "\n";
}

void printResult(const CalibrationResult& r, const std::string& dir) {
  std::cout << "calibrated \"" << r.calibrated.name << "\" on " << r.launches << " launches (" << r.trials << " trials)\n"
            << coefficientLine("kinetic friction", r.frictionKinetic)
            << coefficientLine("rolling resistance", r.rollingResistance) << "  static friction "
            << fmt(r.frictionStatic, 4) << " (the scenario's static/kinetic ratio)\n"
            << "  predicted settle " << fmt(r.predictedSettle, 4) << " s (residual " << fmt(r.settleResidual, 3)
            << " s), spin " << fmt(r.predictedSpin, 4) << " s (residual " << fmt(r.spinResidual, 3) << " s)";
  if (r.spotsResidual) std::cout << ", spots " << *r.predictedSpots << " (residual " << *r.spotsResidual << ")";
  std::cout << ", chi-square " << fmt(r.chiSquare, 3) << "\n";
  std::cout << "wrote " << dir << "calibration.json\nwrote " << dir << "calibrated_scenario.json\n";
}

int runCalibrate(CalibrateArgs& a) {
  const Scenario s = loadScenarioWithOverrides(a.scenario, a.sets);
  a.target.spots = a.spots;
  checkTarget(a.target);  // bad measurements are refused before any folder is made
  checkOutputDir(a.out, a.force);
  CalibrationOptions options;
  options.launches = a.launches;
  options.threads = a.threads;
  options.seed = a.seed;
  if (!a.quiet && ::isatty(STDERR_FILENO))
    options.progress = [](int trials) { std::cerr << "\rtrial " << trials << std::flush; };
  const CalibrationResult r = calibrate(s, a.target, options);
  if (options.progress) std::cerr << "\n";
  writeOutputs(a.out, {{"calibration.json", jsonFileText(calibrationJson(r))},
                       {"calibrated_scenario.json", jsonFileText(scenarioToJson(r.calibrated))}});
  if (!a.quiet) printResult(r, a.out + "/");
  return exitOk;
}

}  // namespace

void addCalibrateCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<CalibrateArgs>();
  CLI::App* sub = app.add_subcommand(
      "calibrate", "Fit the surface's kinetic friction and rolling resistance to times measured on a prototype");
  sub->add_option("scenario", args->scenario, "scenario JSON file (the prototype, its surface and the launch spread)")
      ->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--settle-s", args->target.settleTime, "measured time from release to settling, s (mean of a few flicks)")
      ->required();
  sub->add_option("--spin-s", args->target.spinTime,
                  "measured time from release until it stops rolling on a rim and falls flat, s")
      ->required();
  sub->add_option("--spots", args->spots, "number of spots seen during the show (optional)");
  sub->add_option("--timing-s", args->target.timing, "uncertainty of each measured time, s (default 0.2)");
  sub->add_option("--launches", args->launches, "launches from launch_spread averaged per trial")->check(CLI::Range(1, 1000));
  addThreadsOption(sub, args->threads);
  sub->add_option("--seed", args->seed, "seed of the launch draws (overrides launch.seed)")
      ->check(CLI::Range(std::uint64_t(0), std::uint64_t(9007199254740991ULL)));
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  sub->add_flag("--quiet", args->quiet, "print nothing but errors");
  sub->add_flag("--force", args->force, "write into a folder that already holds files");
  commands.add(sub, [args] { return runCalibrate(*args); });
}

}  // namespace dm::app
