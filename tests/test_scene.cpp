// The observer camera's scene at one instant: ray casting the marked
// cylinder, the compiled paint, the table's grid, and the cameras.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>

#include "core/constants.hpp"
#include "core/markings.hpp"
#include "render/camera.hpp"
#include "render/scene.hpp"

using namespace dm;

namespace {

const Cylinder sceneTube{0.064, 0.008, 0.007, 0.01};

}  // namespace

TEST_CASE("rays meet the outer surface, the faces, the bore, or pass through", "[scene]") {
  BodyHit hit;
  // Straight down onto the side: the outer surface at x = R.
  REQUIRE(intersectBody(sceneTube, Vec3(0.1, 0, 0.01), Vec3(-1, 0, 0), hit));
  CHECK(hit.part == SurfacePart::Outer);
  CHECK(hit.point.x() == Approx(0.008));
  CHECK(hit.t == Approx(0.092));
  CHECK(hit.normal.x() == Approx(1.0));
  // Along the axis onto end A's face annulus.
  REQUIRE(intersectBody(sceneTube, Vec3(0.0075, 0, 1), Vec3(0, 0, -1), hit));
  CHECK(hit.part == SurfacePart::FaceA);
  CHECK(hit.point.z() == Approx(0.032));
  CHECK(hit.radius == Approx(0.0075));
  // Along the axis through the bore: nothing to meet.
  CHECK_FALSE(intersectBody(sceneTube, Vec3(0.001, 0.001, 1), Vec3(0, 0, -1), hit));
  // Slanted into end B's opening: meets the bore wall inside.
  REQUIRE(intersectBody(sceneTube, Vec3(-0.004, 0, -0.1), Vec3(0.1, 0, 1), hit));
  CHECK(hit.part == SurfacePart::Bore);
  CHECK(std::hypot(hit.point.x(), hit.point.y()) == Approx(0.007));
  CHECK(hit.point.z() == Approx(0.01));
  CHECK(hit.normal.x() == Approx(-1.0));
  // Slanted less, it leaves through end A's opening.
  CHECK_FALSE(intersectBody(sceneTube, Vec3(0, 0, -0.1), Vec3(0.05, 0, 1), hit));
  // A solid rod's face is whole.
  const Cylinder rod{0.064, 0.008, 0, 0.01};
  REQUIRE(intersectBody(rod, Vec3(0.001, 0, -1), Vec3(0, 0, 1), hit));
  CHECK(hit.part == SurfacePart::FaceB);
  // Misses beside and beyond the ends.
  CHECK_FALSE(intersectBody(sceneTube, Vec3(0.1, 0.009, 0), Vec3(-1, 0, 0), hit));
  CHECK_FALSE(intersectBody(sceneTube, Vec3(0.1, 0, 0.033), Vec3(-1, 0, 0), hit));
}

TEST_CASE("the compiled paint gives colourAt's answer everywhere", "[scene]") {
  Paint paint;
  paint.body = {0.9, 0.9, 0.9};
  paint.bore = {0.4, 0.4, 0.4};
  Marking patch;  // across the 0-degree seam
  patch.kind = MarkingKind::RimPatch;
  patch.fromAngle = -0.3;
  patch.toAngle = 0.5;
  patch.colour = {1, 0, 0};
  Marking wide = patch;  // more than half a turn
  wide.end = End::B;
  wide.fromAngle = 1.0;
  wide.toAngle = 5.5;
  wide.colour = {0, 0, 1};
  Marking band;
  band.kind = MarkingKind::Band;
  band.end = End::B;
  band.width = 0.002;
  band.colour = {0, 1, 0};
  Marking stripe;
  stripe.kind = MarkingKind::Stripe;
  stripe.angle = 2.0;
  stripe.arcWidth = 0.4;
  stripe.colour = {1, 1, 0};
  Marking dot;
  dot.kind = MarkingKind::Dot;
  dot.angle = -2.5;
  dot.axial = 0.01;
  dot.radius = 0.003;
  dot.colour = {0, 1, 1};
  paint.markings = {patch, wide, band, stripe, dot};
  const PaintLookup lookup(sceneTube, paint);
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> u(0, 1);
  int checked = 0;
  for (int i = 0; i < 20000; ++i) {
    // A random surface point, built as a ray hit would report it.
    BodyHit hit;
    const int part = i % 4;
    const double angle = k::twoPi * u(rng) - k::pi;
    hit.part = part == 0 ? SurfacePart::Outer : part == 1 ? SurfacePart::Bore : part == 2 ? SurfacePart::FaceA : SurfacePart::FaceB;
    hit.radius = part == 0 ? sceneTube.outerRadius : part == 1 ? sceneTube.innerRadius
                                                          : sceneTube.innerRadius + u(rng) * (sceneTube.outerRadius - sceneTube.innerRadius);
    const double z = part == 2 ? sceneTube.length / 2 : part == 3 ? -sceneTube.length / 2 : (u(rng) - 0.5) * sceneTube.length;
    hit.point = Vec3(hit.radius * std::cos(angle), hit.radius * std::sin(angle), z);
    hit.dirX = std::cos(angle);
    hit.dirY = std::sin(angle);
    SurfacePoint sp{hit.part, z, angle, hit.radius};
    CHECK(lookup.albedoAt(hit) == colourAt(sceneTube, paint, sp));
    ++checked;
  }
  CHECK(checked == 20000);
}

TEST_CASE("the outer surface's plain stretch holds no marking, and the paint agrees with colourAt at its edges", "[scene]") {
  Paint paint;
  paint.body = {0.9, 0.9, 0.9};
  Marking patch;  // end A's rim, 4 mm
  patch.kind = MarkingKind::RimPatch;
  patch.end = End::A;
  patch.width = 0.004;
  patch.fromAngle = 0.2;
  patch.toAngle = 0.9;
  patch.colour = {1, 0, 0};
  Marking band;  // end B, 2 mm
  band.kind = MarkingKind::Band;
  band.end = End::B;
  band.width = 0.002;
  band.colour = {0, 1, 0};
  Marking dot;  // 3 mm round at z = +10 mm
  dot.kind = MarkingKind::Dot;
  dot.angle = 1.0;
  dot.axial = 0.01;
  dot.radius = 0.003;
  dot.colour = {0, 0, 1};
  paint.markings = {patch, band, dot};
  const PaintLookup lookup(sceneTube, paint);
  // The longest unmarked stretch runs from end B's band (z = -30 mm) to the
  // dot (z = +7 mm), less a margin of 1e-9 of the body's half size.
  const PaintLookup::Stretch plain = lookup.plainStretch();
  CHECK(plain.lo == Approx(-0.030).margin(1e-9));
  CHECK(plain.hi == Approx(0.007).margin(1e-9));
  CHECK(plain.lo > -0.030);
  CHECK(plain.hi < 0.007);
  // Random outer points, half of them within 1 um of a marking's edge: the
  // compiled paint answers as colourAt, and inside the stretch the colour is the body's.
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> u(0, 1);
  const double edges[] = {-0.030, 0.007, 0.013, 0.028};
  for (int i = 0; i < 20000; ++i) {
    const double angle = k::twoPi * u(rng) - k::pi;
    const double z = i % 2 ? (u(rng) - 0.5) * sceneTube.length : edges[i / 2 % 4] + (u(rng) - 0.5) * 2e-6;
    BodyHit hit;
    hit.part = SurfacePart::Outer;
    hit.radius = sceneTube.outerRadius;
    hit.point = Vec3(sceneTube.outerRadius * std::cos(angle), sceneTube.outerRadius * std::sin(angle), z);
    hit.dirX = std::cos(angle);
    hit.dirY = std::sin(angle);
    const Rgb colour = colourAt(sceneTube, paint, SurfacePoint{SurfacePart::Outer, z, angle, sceneTube.outerRadius});
    CHECK(lookup.albedoAt(hit) == colour);
    if (plain.contains(z)) CHECK(colour == paint.body);
  }
  // A stripe reaches the whole length: no plain stretch.
  Marking stripe;
  stripe.kind = MarkingKind::Stripe;
  paint.markings.push_back(stripe);
  const PaintLookup striped(sceneTube, paint);
  CHECK_FALSE(striped.plainStretch().contains(0.0));
  CHECK(striped.plainStretch().lo >= striped.plainStretch().hi);
}

TEST_CASE("the grid is box-filtered over each pixel's footprint", "[scene]") {
  SceneLook look;
  look.tableColour = {0.5, 0.5, 0.5};
  look.gridSpacing = 0.01;
  look.lights = {1.0, 0.0, Vec3::UnitZ()};
  // A top view whose pixels are 0.1 mm: the mean over whole grid cells is
  // the table colour darkened by the lines' area share, 1 - (1 - w/s)^2.
  const Camera cam = topCamera(Vec3::Zero(), 0.04, 400);
  double mean = 0;
  for (int y = 0; y < 400; ++y)
    for (int x = 0; x < 400; ++x) mean += backgroundAt(look, cam, x, y).r / (400.0 * 400.0);
  const double share = 1 - std::pow(1 - gridLineWidth / 0.01, 2);
  // The 0.04 m square holds four whole cells; the filter conserves area exactly.
  CHECK(mean == Approx(0.5 * (1 - share * (1 - gridLineShade))).epsilon(1e-9));
  // Beyond the table's edge: the room.
  const Camera far = topCamera(Vec3(1.0, 0, 0), 0.04, 8);
  CHECK(backgroundAt(look, far, 4, 4).r == Approx(roomAlbedo));
}

TEST_CASE("cameras project their own rays back to the pixel", "[scene]") {
  const Camera top = topCamera(Vec3(0.01, -0.02, 0.03), 0.12, 256);
  const Camera eye = visitorCamera(Vec3(0.01, -0.02, 0.03), 1.2, 0.6, 0.7, 0.1, 256);
  for (const Camera& cam : {top, eye}) {
    const Ray ray = cam.rayAt(37.5, 201.25);
    double x, y;
    REQUIRE(cam.project(ray.origin + 1.3 * ray.direction, x, y));
    CHECK(x == Approx(37.5));
    CHECK(y == Approx(201.25));
    // The centre looked at sits in the middle of the image.
    REQUIRE(cam.project(Vec3(0.01, -0.02, cam.orthographic ? 0.0 : 0.03), x, y));
    CHECK(x == Approx(128));
    CHECK(y == Approx(128));
  }
  // The visitor's eye is where the observer fields put it.
  CHECK(eye.eye.z() == Approx(1.2));
  CHECK(std::hypot(eye.eye.x() - 0.01, eye.eye.y() + 0.02) == Approx(0.6));
  // Image up points away from the table for a top view: lab +y.
  double x, y0, y1;
  top.project(Vec3(0.01, 0.0, 0), x, y0);
  top.project(Vec3(0.01, 0.01, 0), x, y1);
  CHECK(y1 < y0);
}
