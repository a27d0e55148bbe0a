// dwellmark simulate: one headless run, writing trajectory.csv and summary.json.
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
  writeOutputs(outDir, simulationFiles(s, r));
  const std::string dir = outDir + "/";
  out << "simulated " << r.summary.endTime << " s of \"" << s.name << "\"\n";
  out << "  settle time: " << (r.summary.settleTime ? fmt(*r.summary.settleTime, 4) + " s" : "never settled")
      << ", raised end: " << (r.summary.raisedEnd ? std::string(endName(*r.summary.raisedEnd)) : "none")
      << ", rest time: " << (r.summary.restTime ? fmt(*r.summary.restTime, 4) + " s" : "still moving") << "\n";
  out << "wrote " << dir << "trajectory.csv\nwrote " << dir << "summary.json\n";
  return exitOk;
}

void addSimulateCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<SimulateArgs>();
  CLI::App* sub = app.add_subcommand("simulate", "Run the physics headless; write trajectory.csv and summary.json");
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
