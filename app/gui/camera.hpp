// The 3D view's camera: orbit, pan and zoom about a target point, and the
// presets that match the observer's top view and the visitor's eye.
#pragma once
#include <glm/glm.hpp>

#include "core/scenario.hpp"
#include "render/gl/scene_renderer.hpp"

namespace dm::gui {

/// How the 3D view looks at the scene. Angles in radians, lengths in metres.
struct OrbitCamera {
  glm::vec3 target{0.0f, 0.0f, 0.008f};
  float yaw = -2.2f;       ///< azimuth of the eye about the target
  float pitch = 0.55f;     ///< elevation of the eye above the target (-1.5..1.5707)
  float distance = 0.2f;   ///< eye to target (0.01..20)
  float fieldOfView = 0.6f;  ///< vertical, perspective only
  bool orthographic = false;  ///< straight-down map view
  float span = 0.12f;      ///< orthographic: width of the region shown
  bool followBody = true;  ///< keep the target over the body's centre

  /// Turns the eye about the target by a mouse drag of (dx, dy) pixels.
  void orbit(float dx, float dy);
  /// Slides the target by a drag of (dx, dy) pixels in a view `viewHeight` pixels tall.
  void pan(float dx, float dy, float viewHeight);
  /// Moves closer (wheel > 0) or further.
  void zoom(float wheel);
  /// With followBody, moves the target over the body's centre `p` (lab, m).
  void follow(const Vec3& p);
  glm::vec3 eye() const;
  gl::ViewMatrices matrices(float aspect) const;
};

/// Looking straight down at the spin centre over the observer's top-view span.
OrbitCamera topViewPreset(const Scenario& s);
/// From the visitor's eye towards the spin centre with the observer's field of view.
OrbitCamera visitorEyePreset(const Scenario& s);
/// The default three-quarter view framing the body.
OrbitCamera framingPreset(const Scenario& s);

}  // namespace dm::gui
