// dwellmark simulate: one headless run, writing trajectory.csv, traces.csv,
// stops.csv and summary.json (with the spot pattern per time window).
#include <algorithm>
#include <iostream>

#include "app/cli.hpp"
#include "core/export.hpp"
#include "core/io.hpp"
#include "core/simulate.hpp"

namespace dm::app {

namespace {

struct SimulateArgs {
  std::string scenario;
  std::string out;
  std::vector<std::string> sets;
  double duration = -1;
  bool force = false;
};

int runSimulate(const SimulateArgs& a) {
  Scenario s = loadScenarioWithOverrides(a.scenario, a.sets);
  if (a.duration >= 0) {
    s.run.duration = a.duration;
    validate(s);
  }
  prepareOutputDir(a.out, a.force);
  const RunResult r = simulate(s);
  if (r.fault) {
    const State& g = r.fault->lastGood;
    std::cerr << "dwellmark: numerical fault at t = " << r.fault->time << " s in phase " << phaseName(r.fault->phase)
              << ": " << r.fault->reason << "\n  last good state: t = " << g.t << " s, centre (" << g.position.x() * 1e3
              << ", " << g.position.y() * 1e3 << ", " << g.position.z() * 1e3 << ") mm, speed " << g.velocity.norm()
              << " m/s, spin " << g.spinBody.norm() << " rad/s\n  nothing was written.\n";
    return exitFault;
  }
  const PatternAnalysis pattern = analysePattern(s, r);
  const std::string dir = a.out + "/";
  writeFileAtomic(dir + "trajectory.csv", trajectoryCsv(r, s.run.sampleInterval));
  writeFileAtomic(dir + "traces.csv", tracesCsv(pattern));
  writeFileAtomic(dir + "stops.csv", stopsCsv(pattern));
  nlohmann::json summary = summaryJson(r);
  summary["scenario"] = s.name;
  summary["pattern"] = patternJson(pattern.windows);
  writeFileAtomic(dir + "summary.json", summary.dump(2) + "\n");
  std::cout << "simulated " << r.summary.endTime << " s of \"" << s.name << "\"\n";
  std::cout << "  settle time: " << (r.summary.settleTime ? fmt(*r.summary.settleTime, 4) + " s" : "never settled")
            << ", raised end: " << (r.summary.raisedEnd ? std::string(endName(*r.summary.raisedEnd)) : "none")
            << ", rest time: " << (r.summary.restTime ? fmt(*r.summary.restTime, 4) + " s" : "still moving") << "\n";
  // The last window with an end raised: the pattern a visitor saw last.
  const auto seen = std::find_if(pattern.windows.rbegin(), pattern.windows.rend(),
                                 [](const PatternWindow& w) { return w.visibleEnd.has_value(); });
  if (seen != pattern.windows.rend())
    std::cout << "  last pattern " << patternSentence(*seen) << "\n";
  else
    std::cout << "  no end raised in any pattern window\n";
  for (const char* name : {"trajectory.csv", "traces.csv", "stops.csv", "summary.json"})
    std::cout << "wrote " << dir << name << "\n";
  return exitOk;
}

}  // namespace

void addSimulateCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<SimulateArgs>();
  CLI::App* sub = app.add_subcommand("simulate", "Run the physics headless; write trajectory.csv, traces.csv, stops.csv and summary.json");
  sub->add_option("scenario", args->scenario, "scenario JSON file")->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  sub->add_option("--duration-s", args->duration, "simulated time in seconds (overrides run.duration_s)");
  sub->add_flag("--force", args->force, "write into a folder that already holds files");
  commands.add(sub, [args] { return runSimulate(*args); });
}

}  // namespace dm::app
