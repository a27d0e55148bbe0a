// What the observer camera looks at: the marked body, the table (colour and
// an optional grid, on a round top, a dim room beyond) and the lights
// (ambient plus one directional key light, Lambert shading, no shadows).
// Everything here is for one instant; render/expose.hpp adds time.
#pragma once
#include <vector>

#include "core/body.hpp"
#include "core/markings.hpp"
#include "core/scenario.hpp"
#include "core/vec.hpp"
#include "render/camera.hpp"

namespace dm {

/// Lights of the scene: radiance = albedo (ambient + key max(0, n . keyDirection)).
struct SceneLights {
  double ambient = 0.35;
  double key = 0.75;
  Vec3 keyDirection = Vec3::UnitZ();  ///< unit, towards the light
};

/// The scene apart from the body's pose.
struct SceneLook {
  Cylinder body;
  Paint paint;
  Rgb tableColour{0.62, 0.48, 0.33};  ///< linear albedo
  double gridSpacing = 0;             ///< m, 0 = no grid
  double tableRadius = 0.3;           ///< m, table centred on the lab origin
  SceneLights lights;
};

/// The scene of a scenario.
SceneLook sceneOf(const Scenario& s);

/// Linear albedo of the room seen past the table's edge (a dim grey).
inline constexpr double roomAlbedo = 0.05;
/// Width of a drawn grid line, m, and how much of the table colour it keeps.
inline constexpr double gridLineWidth = 0.4e-3;
inline constexpr double gridLineShade = 0.55;

/// A point where a ray meets the body, in body coordinates.
struct BodyHit {
  double t = 0;                   ///< ray parameter of the hit
  SurfacePart part = SurfacePart::Outer;
  Vec3 point = Vec3::Zero();      ///< body coordinates, m
  Vec3 normal = Vec3::UnitX();    ///< outward unit normal, body coordinates
  double radius = 0;              ///< distance from the axis, m
  double dirX = 1, dirY = 0;      ///< unit direction of the point from the axis (cos and sin of its azimuth)
};

/// The body's dimensions with the reciprocals a ray test needs.
struct BodyShape {
  double half = 0, outer = 0, inner = 0;  ///< L/2, R, r (m)
  double outer2 = 0, inner2 = 0;          ///< R^2, r^2
  double invOuter = 0, invInner = 0;      ///< 1/R, 1/r (0 when solid)
  explicit BodyShape(const Cylinder& c);
};

/// What a ray test needs of a direction d alone: a = dx^2 + dy^2 and the
/// reciprocals of a and dz (0 where they vanish). Rays sharing a direction
/// share these.
struct DirectionTerms {
  double across = 0, invAcross = 0, invZ = 0;
  explicit DirectionTerms(const Vec3& d);
};

/// First hit of a body-frame ray (origin o, direction d, t > 0) with the
/// solid between radii r and R, |z| <= L/2: the outer surface, an end face
/// (annulus) or, through an end's opening, the bore. False on a miss.
/// `terms` must be DirectionTerms(d).
bool intersectBody(const BodyShape& shape, const Vec3& o, const Vec3& d, const DirectionTerms& terms, BodyHit& hit);
bool intersectBody(const Cylinder& c, const Vec3& o, const Vec3& d, BodyHit& hit);

/// The paint compiled for fast look-up: the same answer as colourAt() (to
/// rounding at a region's edge) without angles or wrap-arounds per point.
class PaintLookup {
 public:
  PaintLookup(const Cylinder& body, const Paint& paint);
  /// Linear albedo at a body hit.
  Rgb albedoAt(const BodyHit& hit) const;

 private:
  struct Compiled {
    Marking marking;
    double fromX = 1, fromY = 0, toX = 1, toY = 0;  // arc ends as unit vectors
    double span = 0;                                // arc length in radians, 2 pi for a whole turn
    double centreX = 1, centreY = 0, minCos = 1;    // stripe and dot centre direction; stripe half-width cosine
  };
  bool covers(const Compiled& m, const BodyHit& hit) const;
  Cylinder body_;
  Paint paint_;
  std::vector<Compiled> marks_;
};

/// Radiance (unflickered) of a surface of `albedo` whose normal makes
/// cos = `cosKey` with the key light's direction.
Rgb shade(const SceneLights& lights, const Rgb& albedo, double cosKey);

/// Radiance (unflickered) of what a pixel sees when the body is absent: the
/// table (grid lines filtered over the pixel's footprint) or the room.
/// `withGrid` false draws the table plain.
Rgb backgroundAt(const SceneLook& scene, const Camera& camera, int px, int py, bool withGrid = true);

}  // namespace dm
