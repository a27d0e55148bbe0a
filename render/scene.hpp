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

/// Where a body-frame ray crosses the solid's bounds: the infinite outer
/// cylinder between ray parameters cylIn and cylOut, the slab |z| <= L/2
/// between slabIn and slabOut; b = o.d and rho2 = |o|^2 across the axis.
struct BoundsCrossing {
  double cylIn = 0, cylOut = 0, slabIn = 0, slabOut = 0;
  double b = 0, rho2 = 0;
  /// True when the ray enters the solid through its outer surface (at cylIn).
  bool throughOuter() const { return cylIn >= slabIn; }
};

/// The first stage of intersectBody(), its common part: where the ray
/// crosses the infinite outer cylinder (b, rho2, cylIn, cylOut); false when
/// it misses it.
inline bool crossCylinder(const BodyShape& shape, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                          BoundsCrossing& crossing);
/// The second stage, after crossCylinder(): where the ray crosses the slab
/// (slabIn, slabOut); false unless the two overlap in front of the origin.
inline bool crossSlab(const BodyShape& shape, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                      BoundsCrossing& crossing);

/// First hit of a body-frame ray (origin o, direction d, t > 0) with the
/// solid between radii r and R, |z| <= L/2: the outer surface, an end face
/// (annulus) or, through an end's opening, the bore. False on a miss.
/// `terms` must be DirectionTerms(d).
inline bool intersectBody(const BodyShape& shape, const Vec3& o, const Vec3& d, const DirectionTerms& terms,
                          BodyHit& hit);
bool intersectBody(const Cylinder& c, const Vec3& o, const Vec3& d, BodyHit& hit);

/// The paint compiled for fast look-up: the same answer as colourAt() (to
/// rounding at a region's edge) without angles or wrap-arounds per point.
class PaintLookup {
 public:
  PaintLookup(const Cylinder& body, const Paint& paint);
  /// Linear albedo at a body hit.
  inline Rgb albedoAt(const BodyHit& hit) const;
  /// A stretch lo < z < hi (m, along the body axis) of the outer surface
  /// that no marking reaches: there the albedo is the body colour.
  struct Stretch {
    double lo = 0, hi = 0;
    bool contains(double z) const { return z > lo && z < hi; }
  };
  const Stretch& plainStretch() const { return plain_; }
  /// Linear albedo of the unpainted body.
  const Rgb& bodyColour() const { return paint_.body; }
  /// Linear albedo at a body hit with the markings left off: the body
  /// colour, or the bore colour inside the bore.
  Rgb unpaintedAt(const BodyHit& hit) const { return hit.part == SurfacePart::Bore ? paint_.bore : paint_.body; }

 private:
  struct Compiled {
    Marking marking;
    double fromX = 1, fromY = 0, toX = 1, toY = 0;  // arc ends as unit vectors
    double span = 0;                                // arc length in radians, 2 pi for a whole turn
    double centreX = 1, centreY = 0, minCos = 1;    // stripe and dot centre direction; stripe half-width cosine
  };
  inline bool covers(const Compiled& m, const BodyHit& hit) const;
  // Sets plain_ from the outer surface's markings.
  void findPlainStretch();
  Cylinder body_;
  Paint paint_;
  // Per surface part (indexed by SurfacePart), the markings that can cover
  // it, latest first: the first that covers a point is the one on top.
  std::vector<Compiled> byPart_[4];
  // The longest stretch of the outer surface no marking reaches (empty when
  // lo >= hi): most hits of a tube marked at its ends land there and need
  // no marking test.
  Stretch plain_;
};

/// Radiance (unflickered) of a surface of `albedo` whose normal makes
/// cos = `cosKey` with the key light's direction.
inline Rgb shade(const SceneLights& lights, const Rgb& albedo, double cosKey);

/// Radiance (unflickered) of what a pixel sees when the body is absent: the
/// table (grid lines filtered over the pixel's footprint) or the room.
/// `withGrid` false draws the table plain.
Rgb backgroundAt(const SceneLook& scene, const Camera& camera, int px, int py, bool withGrid = true);

}  // namespace dm

// The per-sample functions above, inline: the exposure calls them for every
// sample that meets the body.
#include "render/scene_inline.hpp"
