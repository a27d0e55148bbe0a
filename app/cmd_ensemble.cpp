// dwellmark ensemble: many visitor launches of one design, drawn from the
// scenario's launch_spread, writing launches.csv and ensemble.json.
#include <unistd.h>

#include <iostream>

#include "app/cli.hpp"
#include "core/ensemble.hpp"
#include "core/export.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

struct EnsembleArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  int launches = 100;
  int threads = 0;
  std::optional<std::uint64_t> seed;
  std::optional<double> duration;
  bool quiet = false;
  bool force = false;
};

// A one-line progress bar on standard error, redrawn in place.
void drawProgress(int done, int total) {
  constexpr int width = 40;
  const int filled = total > 0 ? done * width / total : width;
  std::cerr << "\r[" << std::string(std::size_t(filled), '#') << std::string(std::size_t(width - filled), '.') << "] "
            << done << "/" << total << " launches" << (done == total ? "\n" : "") << std::flush;
}

void printSummary(const EnsembleResult& r, const std::string& dir) {
  const EnsembleSummary& e = r.summary;
  std::cout << "ran " << e.launches << " launches of \"" << r.scenario << "\" (seed " << r.seed << ", "
            << fmt(r.duration, 4) << " s each)\n";
  if (e.faults > 0) std::cout << "  " << e.faults << " launches stopped on a numerical fault (left out of the figures)\n";
  std::cout << "  pressed end rises and is seen in " << fmt(100 * e.pressedVisibleShare, 3)
            << " % of launches; end A seen " << fmt(100 * e.visibleShareA, 3) << " %, end B "
            << fmt(100 * e.visibleShareB, 3) << " %, neither " << fmt(100 * e.visibleShareNone, 3) << " %\n";
  std::cout << "  settle time median " << fmt(e.settleTime.median, 3) << " s (10-90 %: " << fmt(e.settleTime.p10, 3)
            << "-" << fmt(e.settleTime.p90, 3) << " s), show median " << fmt(e.showTime.median, 3) << " s\n";
  std::cout << "  table radius " << fmt(e.table.radius * 1e3, 4) << " mm: reached in " << fmt(100 * e.table.reachesEdgeShare, 3)
            << " %, centre over the edge in " << fmt(100 * e.table.leavesShare, 3) << " %; radius holding all "
            << fmt(e.table.radiusHoldingAll * 1e3, 4) << " mm\n";
  std::cout << "wrote " << dir << "launches.csv\nwrote " << dir << "ensemble.json\n";
}

int runEnsembleCommand(const EnsembleArgs& a) {
  Scenario s = loadScenarioWithOverrides(a.scenario, a.sets);
  if (a.duration) {
    s.run.duration = *a.duration;
    validate(s);  // names run.duration_s and its range when out of it
  }
  checkOutputDir(a.out, a.force);  // refuse a folder that would mix results before the long run
  EnsembleOptions options;
  options.launches = a.launches;
  options.threads = a.threads;
  options.seed = a.seed;
  if (!a.quiet && ::isatty(STDERR_FILENO)) options.progress = drawProgress;
  const EnsembleResult r = runEnsemble(s, options);
  writeOutputs(a.out, {{"launches.csv", launchesCsv(r)}, {"ensemble.json", jsonFileText(ensembleJson(r))}});
  if (!a.quiet) printSummary(r, a.out + "/");
  return exitOk;
}

}  // namespace

void addEnsembleCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<EnsembleArgs>();
  CLI::App* sub = app.add_subcommand(
      "ensemble", "Simulate many visitor launches drawn from launch_spread; write launches.csv and ensemble.json");
  sub->add_option("scenario", args->scenario, "scenario JSON file")->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--launches", args->launches, "number of launches")->check(CLI::Range(1, 1000000));
  addThreadsOption(sub, args->threads);
  sub->add_option("--seed", args->seed, "seed of the launch draws (overrides launch.seed)")
      ->check(CLI::Range(std::uint64_t(0), std::uint64_t(9007199254740991ULL)));
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  sub->add_option("--duration-s", args->duration, "simulated time per launch in seconds (overrides run.duration_s)");
  sub->add_flag("--quiet", args->quiet, "print nothing but errors (no progress bar)");
  sub->add_flag("--force", args->force, "write into a folder that already holds files");
  commands.add(sub, [args] { return runEnsembleCommand(*args); });
}

}  // namespace dm::app
