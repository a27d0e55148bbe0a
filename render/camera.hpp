// The observer's camera: a top-down orthographic view over the table or a
// visitor's eye in perspective, mapping pixels to rays and points to pixels.
// Pixel (i, j) covers image coordinates [i, i+1) x [j, j+1), row 0 at the top.
#pragma once
#include "core/scenario.hpp"
#include "core/vec.hpp"

namespace dm {

/// A ray in the lab frame: origin and (not necessarily unit) direction.
struct Ray {
  Vec3 origin = Vec3::Zero();
  Vec3 direction = -Vec3::UnitZ();
};

/// A pinhole or orthographic camera. Image x runs along `right`, image y
/// (downwards) against `up`.
struct Camera {
  bool orthographic = true;
  int width = 512, height = 512;  ///< px
  Vec3 eye = Vec3::Zero();        ///< perspective: the eye; orthographic: a point above the view centre, m
  Vec3 forward = -Vec3::UnitZ();  ///< unit viewing direction
  Vec3 right = Vec3::UnitX();     ///< unit image x direction
  Vec3 up = Vec3::UnitY();        ///< unit image up direction
  double pixelScale = 1e-4;       ///< orthographic: metres per pixel; perspective: tangent per pixel at unit depth

  /// The ray through image point (x, y) (pixel centres at half-integers).
  Ray rayAt(double x, double y) const;
  /// Image point of a lab point; false when it is not in front of the camera.
  bool project(const Vec3& world, double& x, double& y) const;
  /// Distance of a lab point along the viewing direction, m (orthographic: from the eye plane).
  double depthOf(const Vec3& world) const { return (world - eye).dot(forward); }
  /// Size of one pixel at a lab point, measured across the viewing direction, m.
  double footprintAt(const Vec3& world) const;
  /// Largest angle between a pixel's ray and the viewing direction, rad (0 when orthographic).
  double halfDiagonalAngle() const;
};

/// Top-down orthographic view of a square `span` (m) of the table centred
/// over `centre`, at `size` x `size` pixels; image up is lab +y.
Camera topCamera(const Vec3& centre, double span, int size);

/// A visitor's eye at `height` above the table, `distance` horizontally
/// from `centre` at azimuth `azimuth` (rad, from lab x towards lab y),
/// looking at `centre` with the full field of view `fieldOfView` (rad).
Camera visitorCamera(const Vec3& centre, double height, double distance, double azimuth, double fieldOfView, int size);

/// The camera an observer spec asks for, looking at `centre` (lab, m; the
/// top view ignores its height).
Camera cameraOf(const ObserverSpec& o, const Vec3& centre);

}  // namespace dm
