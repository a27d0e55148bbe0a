// Pattern analysis speed: traces, stop events and sliding spot windows of a
// 10 s demo run (the trajectory is simulated once, outside the timing).
#include <benchmark/benchmark.h>

#include "core/pattern.hpp"
#include "core/scenario.hpp"
#include "core/simulate.hpp"

static void BM_DemoPattern(benchmark::State& state) {
  const dm::Scenario s = dm::loadScenario(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json");
  dm::SimulateOptions o;
  o.duration = 10.0;
  const dm::RunResult run = dm::simulate(s, o);
  double analysed = 0;
  for (auto _ : state) {
    const dm::PatternAnalysis a = dm::analysePattern(s, run);
    benchmark::DoNotOptimize(a.windows.data());
    analysed += run.summary.endTime;
  }
  state.counters["simulated_s_per_s"] = benchmark::Counter(analysed, benchmark::Counter::kIsRate);
}
BENCHMARK(BM_DemoPattern)->Unit(benchmark::kMillisecond)->MinTime(2.0);

BENCHMARK_MAIN();
