// Benchmark of the observer camera: a 512 x 512 top view of a 0.5 s camera
// exposure with motion-resolved sampling (every surface point moves at most
// half a pixel between a pixel's samples), on 2 threads. Three runs, all
// of the exact steady spin (so the figure is the renderer's alone):
//   a) a 16 mm x 64 mm tube (wall 1 mm, physics.md section 3) at 8 rev/s
//      in the default 120 mm view;
//   b) the same with the eye's temporal response instead of the camera's
//      shutter (the strata where the response has faded are skipped);
//   c) the demo tube (assets/scenarios/demo.json) at 1.2 times its lowest
//      steady precession, in a view that holds its sweep.
// Reported counters: strata, body samples (ray casts), and the pixel-samples
// per second the exposure stands for (pixels x strata / wall time). The CPU
// column is the whole process's, both threads together.
#include <benchmark/benchmark.h>

#include "core/constants.hpp"
#include "core/steady.hpp"
#include "render/expose.hpp"

using namespace dm;

namespace {

void exposeSteady(benchmark::State& state, const Scenario& s, double precession, double span,
                  ExposureMode mode = ExposureMode::Camera) {
  const SceneLook look = sceneOf(s);
  SteadyMotion m;
  m.body = look.body;
  m.spin = patternAtPrecession(look.body, precession).spin;
  const Camera cam = topCamera(Vec3::Zero(), span, 512);
  ExposureOptions o;
  o.timing.mode = mode;
  o.timing.start = 0;
  o.timing.duration = 0.5;
  o.threads = 2;
  ExposureStats stats;
  for (auto _ : state) {
    const Exposure e = expose(look, cam, [m](double t) { return m.poseAt(t); }, o);
    stats = e.stats;
    benchmark::DoNotOptimize(e.image.rgb.data());
  }
  state.counters["strata"] = stats.strata;
  state.counters["body_samples"] = double(stats.bodySamples);
  state.counters["pixel_samples_per_s"] =
      benchmark::Counter(double(stats.pixelSamples), benchmark::Counter::kIsIterationInvariantRate);
  state.counters["body_samples_per_s"] =
      benchmark::Counter(double(stats.bodySamples), benchmark::Counter::kIsIterationInvariantRate);
}

// The 16 mm x 64 mm tube of a) and b).
Scenario tube4to1() {
  Scenario s = defaultScenario();
  s.body.length = 0.064;
  s.body.outerDiameter = 0.016;
  s.body.wall = 0.001;
  return s;
}

void BM_ExposeTube4to1(benchmark::State& state) { exposeSteady(state, tube4to1(), 8 * k::twoPi, 0.12); }

void BM_ExposeTube4to1Eye(benchmark::State& state) {
  exposeSteady(state, tube4to1(), 8 * k::twoPi, 0.12, ExposureMode::Eye);
}

void BM_ExposeDemo(benchmark::State& state) {
  const Scenario s = loadScenario(std::string(DWELLMARK_ASSETS) + "/scenarios/demo.json");
  const Cylinder c = cylinderOf(s.body);
  const double reach = c.length / 2 + c.outerRadius;
  exposeSteady(state, s, 1.2 * minSteadyPrecession(c), 2.2 * reach);
}

}  // namespace

BENCHMARK(BM_ExposeTube4to1)->Unit(benchmark::kSecond)->MeasureProcessCPUTime()->UseRealTime()->Iterations(1);
BENCHMARK(BM_ExposeTube4to1Eye)->Unit(benchmark::kSecond)->MeasureProcessCPUTime()->UseRealTime()->Iterations(1);
BENCHMARK(BM_ExposeDemo)->Unit(benchmark::kSecond)->MeasureProcessCPUTime()->UseRealTime()->Iterations(1);
BENCHMARK_MAIN();
