#include "app/gui/camera.hpp"

#include <algorithm>
#include <cmath>

#include <glm/gtc/matrix_transform.hpp>

namespace dm::gui {

namespace {
constexpr float maxPitch = 1.5707f;  // just short of straight down, where "up" would be undefined
constexpr float orbitRadiansPerPixel = 0.008f;
}  // namespace

void OrbitCamera::orbit(float dx, float dy) {
  orthographic = false;
  yaw -= dx * orbitRadiansPerPixel;
  pitch = std::clamp(pitch + dy * orbitRadiansPerPixel, -1.5f, maxPitch);
}

void OrbitCamera::pan(float dx, float dy, float viewHeight) {
  // Metres per pixel at the target's depth.
  const float across = orthographic ? span : 2.0f * distance * std::tan(fieldOfView / 2);
  const float perPixel = across / std::max(1.0f, viewHeight);
  const glm::vec3 forward = glm::normalize(target - eye());
  const glm::vec3 right = glm::normalize(glm::cross(forward, glm::vec3(0, 0, 1)));
  const glm::vec3 upOnScreen = glm::cross(right, forward);
  target += (-dx * right + dy * upOnScreen) * perPixel;
  followBody = false;
}

void OrbitCamera::zoom(float wheel) {
  const float factor = std::pow(0.88f, wheel);
  distance = std::clamp(distance * factor, 0.01f, 20.0f);
  span = std::clamp(span * factor, 0.005f, 20.0f);
}

void OrbitCamera::follow(const Vec3& p) {
  if (!followBody) return;
  target.x = float(p.x());
  target.y = float(p.y());
}

glm::vec3 OrbitCamera::eye() const {
  return target + distance * glm::vec3(std::cos(pitch) * std::cos(yaw), std::cos(pitch) * std::sin(yaw), std::sin(pitch));
}

gl::ViewMatrices OrbitCamera::matrices(float aspect) const {
  gl::ViewMatrices m;
  m.eye = eye();
  if (orthographic) {
    // Map view: x to the right, y up the screen, looking down -z.
    const glm::vec3 above = target + glm::vec3(0, 0, std::max(distance, 1.0f));
    m.eye = above;
    m.viewFromWorld = glm::lookAt(above, target, glm::vec3(0, 1, 0));
    // The span fits the shorter side of the view.
    const float a = std::max(aspect, 1e-3f);
    const float halfH = aspect >= 1 ? span / 2 : span / 2 / a;
    const float halfW = halfH * a;
    m.clipFromView = glm::ortho(-halfW, halfW, -halfH, halfH, 0.001f, 100.0f);
    return m;
  }
  m.viewFromWorld = glm::lookAt(m.eye, target, glm::vec3(0, 0, 1));
  const float nearPlane = std::max(0.0005f, distance * 0.01f);
  m.clipFromView = glm::perspective(fieldOfView, std::max(aspect, 1e-3f), nearPlane, 200.0f);
  return m;
}

OrbitCamera topViewPreset(const Scenario& s) {
  OrbitCamera c;
  c.orthographic = true;
  c.followBody = false;
  c.target = glm::vec3(0, 0, 0);
  c.span = float(s.observer.viewSpan);
  c.pitch = maxPitch;
  return c;
}

OrbitCamera visitorEyePreset(const Scenario& s) {
  const ObserverSpec& o = s.observer;
  OrbitCamera c;
  c.followBody = false;
  c.target = glm::vec3(0, 0, 0);
  c.distance = float(std::hypot(o.eyeDistance, o.eyeHeight));
  c.pitch = float(std::atan2(o.eyeHeight, o.eyeDistance));
  c.yaw = float(o.eyeAzimuth);
  c.fieldOfView = float(o.fieldOfView);
  return c;
}

OrbitCamera framingPreset(const Scenario& s) {
  OrbitCamera c;
  const double size = std::max(s.body.length, s.body.outerDiameter);
  c.distance = float(std::clamp(3.2 * size, 0.03, 10.0));
  c.target = glm::vec3(0, 0, float(s.body.outerDiameter / 2));
  return c;
}

}  // namespace dm::gui
