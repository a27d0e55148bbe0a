// Ensemble speed: 1000 visitor launches of the demo, 20 s each, on two
// threads, drawn from the default spread (issue target: under 60 s on 2
// cores). Each launch stops 0.5 s after it comes to rest.
#include <benchmark/benchmark.h>

#include "core/ensemble.hpp"
#include "core/scenario.hpp"

static void BM_DemoEnsemble(benchmark::State& state) {
  const dm::Scenario s = dm::loadScenario(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json");
  dm::EnsembleOptions o;
  o.launches = int(state.range(0));
  o.duration = 20.0;
  o.threads = 2;
  double simulated = 0;
  for (auto _ : state) {
    const dm::EnsembleResult r = dm::runEnsemble(s, o);
    for (const dm::LaunchOutcome& l : r.outcomes) simulated += l.endTime;
    benchmark::DoNotOptimize(r.summary.showTime.median);
  }
  state.counters["simulated_s_per_s"] = benchmark::Counter(simulated, benchmark::Counter::kIsRate);
}
BENCHMARK(BM_DemoEnsemble)->Arg(1000)->Unit(benchmark::kSecond)->Iterations(1)->UseRealTime();

BENCHMARK_MAIN();
