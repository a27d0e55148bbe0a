#include "app/gui/snapshot.hpp"

#include <algorithm>
#include <cmath>
#include <iostream>

#include "app/gui/camera.hpp"
#include "core/io.hpp"
#include "core/simulate.hpp"
#include "render/gl/headless_context.hpp"
#include "render/gl/scene_renderer.hpp"
#include "render/view_scene.hpp"

namespace dm::gui {

namespace {

// Multisampling of the offscreen picture: smooth edges, as the GUI's exports have.
constexpr int snapshotSamples = 4;

// The run's sparse record as the window keeps it: every run.sample_ms from the launch.
std::vector<Sample> recordOf(const Scenario& s, const Trajectory& t) {
  const long every = std::max(1L, long(std::llround(s.run.sampleInterval / s.run.timeStep())));
  std::vector<Sample> record;
  for (std::size_t i = 0; i < t.samples.size(); i += std::size_t(every)) record.push_back(t.samples[i]);
  return record;
}

}  // namespace

int runSnapshot(const app::SnapshotOptions& o) {
  const Scenario& s = o.scenario;
  SimulateOptions run;
  run.duration = o.time;
  const RunResult result = simulate(s, run);
  if (result.fault) {
    std::cerr << "dwellmark: " << faultReport(*result.fault) << "\n  nothing was written.\n";
    return app::exitFault;
  }
  // The scene the window would show at that instant, its traces from the dense samples.
  const std::vector<Sample>& dense = result.trajectory.samples;
  const ViewScene scene = buildViewScene({s, dense, recordOf(s, result.trajectory)}, SceneOverlays{});
  OrbitCamera camera = framingPreset(s);
  camera.follow(dense.back().position);

  gl::HeadlessContext context;
  gl::SceneRenderer renderer;
  renderer.setBodyLook(makeBodyLook(cylinderOf(s.body), s.paint));
  gl::OffscreenTarget target(o.width, o.height, snapshotSamples);
  target.bind();
  renderer.draw(scene, camera.matrices(float(o.width) / float(o.height)), 0, 0, o.width, o.height);
  writePng(o.outPath, target.read());
  std::cout << "wrote " << o.outPath << " (" << o.width << " x " << o.height << " px, t = " << fmt(dense.back().t, 6)
            << " s)\n";
  return app::exitOk;
}

}  // namespace dm::gui
