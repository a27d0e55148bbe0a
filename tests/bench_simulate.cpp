// Simulation speed: simulated seconds per second of one core's CPU time for
// the demo launch (x_real_time; Google Benchmark divides a rate counter by
// the CPU time), single-threaded. Issue target: at least 500 times real time
// at the default step.
#include <benchmark/benchmark.h>

#include "core/scenario.hpp"
#include "core/simulate.hpp"

static void BM_DemoRun(benchmark::State& state) {
  dm::Scenario s = dm::loadScenario(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json");
  dm::SimulateOptions o;
  o.duration = 5.0;
  double simulated = 0;
  for (auto _ : state) {
    const dm::RunResult r = dm::simulate(s, o);
    benchmark::DoNotOptimize(r.trajectory.samples.data());
    simulated += r.summary.endTime;
  }
  state.counters["x_real_time"] = benchmark::Counter(simulated, benchmark::Counter::kIsRate);
}
BENCHMARK(BM_DemoRun)->Unit(benchmark::kMillisecond)->MinTime(2.0);

BENCHMARK_MAIN();
