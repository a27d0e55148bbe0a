// dwellmark simulate: one headless run, writing trajectory.csv, traces.csv,
// stops.csv and summary.json (with the spot pattern per time window).
#include <algorithm>
#include <iostream>

#include "app/cli.hpp"
#include "core/export.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

struct SimulateArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  double duration = 0;
  bool durationGiven = false;  ///< --duration-s was on the command line
  bool force = false;
};

int runSimulate(const SimulateArgs& a) {
  Scenario s = loadScenarioWithOverrides(a.scenario, a.sets);
  if (a.durationGiven) {
    s.run.duration = a.duration;
    validate(s);
  }
  // Refuse a folder that would mix results before the run; create it only
  // when there is something to write.
  checkOutputDir(a.out, a.force);
  return finishSimulation(s, simulate(s), a.out, std::cout, std::cerr);
}

}  // namespace

int finishSimulation(const Scenario& s, const RunResult& r, const std::string& outDir, std::ostream& out,
                     std::ostream& err) {
  if (r.fault) {
    err << "dwellmark: " << faultReport(*r.fault) << "\n  nothing was written.\n";
    return exitFault;
  }
  const PatternAnalysis pattern = analysePattern(s, r);
  const std::vector<OutputFile> files = simulationFiles(s, r, pattern);
  writeOutputs(outDir, files);
  const std::string dir = outDir + "/";
  out << "simulated " << r.summary.endTime << " s of \"" << s.name << "\"\n";
  out << "  settle time: " << (r.summary.settleTime ? fmt(*r.summary.settleTime, 4) + " s" : "never settled")
      << ", raised end: " << (r.summary.raisedEnd ? std::string(endName(*r.summary.raisedEnd)) : "none")
      << ", rest time: " << (r.summary.restTime ? fmt(*r.summary.restTime, 4) + " s" : "still moving") << "\n";
  // The last window with an end raised: the pattern a visitor saw last.
  const auto seen = std::find_if(pattern.windows.rbegin(), pattern.windows.rend(),
                                 [](const PatternWindow& w) { return w.visibleEnd.has_value(); });
  if (seen != pattern.windows.rend())
    out << "  last pattern " << patternSentence(*seen) << "\n";
  else
    out << "  no end raised in any pattern window\n";
  for (const OutputFile& f : files) out << "wrote " << dir << f.name << "\n";
  return exitOk;
}

void addSimulateCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<SimulateArgs>();
  CLI::App* sub = app.add_subcommand("simulate", "Run the physics headless; write trajectory.csv, traces.csv, stops.csv and summary.json");
  sub->add_option("scenario", args->scenario, "scenario JSON file")->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  CLI::Option* duration =
      sub->add_option("--duration-s", args->duration, "simulated time in seconds (overrides run.duration_s)");
  sub->add_flag("--force", args->force, "write into a folder that already holds files");
  commands.add(sub, [args, duration] {
    args->durationGiven = duration->count() > 0;
    return runSimulate(*args);
  });
}

}  // namespace dm::app
