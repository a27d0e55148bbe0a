#include "render/camera.hpp"

#include <cmath>

namespace dm {

namespace {

// Height of the orthographic eye plane above the table, m: above anything a
// hand-spun piece reaches.
constexpr double topEyeHeight = 2.0;

}  // namespace

Ray Camera::rayAt(double x, double y) const {
  const double u = (x - 0.5 * width) * pixelScale, v = (0.5 * height - y) * pixelScale;
  if (orthographic) return {eye + u * right + v * up, forward};
  return {eye, forward + u * right + v * up};
}

bool Camera::project(const Vec3& world, double& x, double& y) const {
  const Vec3 rel = world - eye;
  double u = rel.dot(right), v = rel.dot(up);
  if (!orthographic) {
    const double depth = rel.dot(forward);
    if (depth <= 0) return false;
    u /= depth;
    v /= depth;
  }
  x = 0.5 * width + u / pixelScale;
  y = 0.5 * height - v / pixelScale;
  return true;
}

double Camera::footprintAt(const Vec3& world) const {
  return orthographic ? pixelScale : std::max(depthOf(world), 0.0) * pixelScale;
}

double Camera::halfDiagonalAngle() const {
  return orthographic ? 0.0 : std::atan(std::hypot(0.5 * width, 0.5 * height) * pixelScale);
}

Camera topCamera(const Vec3& centre, double span, int size) {
  Camera c;
  c.orthographic = true;
  c.width = c.height = size;
  c.eye = Vec3(centre.x(), centre.y(), topEyeHeight);
  c.forward = -Vec3::UnitZ();
  c.right = Vec3::UnitX();
  c.up = Vec3::UnitY();
  c.pixelScale = span / size;
  return c;
}

Camera visitorCamera(const Vec3& centre, double height, double distance, double azimuth, double fieldOfView, int size) {
  Camera c;
  c.orthographic = false;
  c.width = c.height = size;
  c.eye = Vec3(centre.x() + distance * std::cos(azimuth), centre.y() + distance * std::sin(azimuth), height);
  c.forward = (centre - c.eye).normalized();
  // Image right is horizontal; looking straight down, it is lab x.
  const Vec3 side = c.forward.cross(Vec3::UnitZ());
  c.right = side.norm() > 1e-9 ? Vec3(side.normalized()) : Vec3(Vec3::UnitX());
  c.up = c.right.cross(c.forward);
  c.pixelScale = std::tan(0.5 * fieldOfView) / (0.5 * size);
  return c;
}

Camera cameraOf(const ObserverSpec& o, const Vec3& centre) {
  if (o.view == ViewKind::Top) return topCamera(centre, o.viewSpan, o.imageSize);
  return visitorCamera(centre, o.eyeHeight, o.eyeDistance, o.eyeAzimuth, o.fieldOfView, o.imageSize);
}

}  // namespace dm
