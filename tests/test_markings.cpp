// Markings: which surface points each kind covers, and paint order.
#include <catch2/catch.hpp>

#include "core/constants.hpp"
#include "core/markings.hpp"

using namespace dm;

namespace {

const Cylinder markedTube{0.1, 0.01, 0.008, 0.01};

SurfacePoint outer(double z, double angleDeg) { return {SurfacePart::Outer, z, angleDeg * k::degree, markedTube.outerRadius}; }

}  // namespace

TEST_CASE("a band covers its end's face and the outer surface within its width", "[markings]") {
  Marking m;
  m.kind = MarkingKind::Band;
  m.end = End::B;
  m.width = 0.004;
  CHECK(covers(markedTube, m, outer(-0.049, 123)));
  CHECK(covers(markedTube, m, outer(-0.0461, 0)));
  CHECK_FALSE(covers(markedTube, m, outer(-0.0459, 0)));
  CHECK_FALSE(covers(markedTube, m, outer(0.049, 0)));
  CHECK(covers(markedTube, m, {SurfacePart::FaceB, -0.05, 1.0, 0.009}));
  CHECK_FALSE(covers(markedTube, m, {SurfacePart::FaceA, 0.05, 1.0, 0.009}));
  CHECK_FALSE(covers(markedTube, m, {SurfacePart::Bore, -0.049, 1.0, 0.008}));
}

TEST_CASE("a rim patch covers only its arc, across the zero azimuth too", "[markings]") {
  Marking m;
  m.kind = MarkingKind::RimPatch;
  m.end = End::A;
  m.width = 0.003;
  m.fromAngle = -10 * k::degree;
  m.toAngle = 15 * k::degree;
  CHECK(covers(markedTube, m, outer(0.049, 0)));
  CHECK(covers(markedTube, m, outer(0.049, 355)));
  CHECK(covers(markedTube, m, outer(0.049, 14.9)));
  CHECK_FALSE(covers(markedTube, m, outer(0.049, 15.1)));
  CHECK_FALSE(covers(markedTube, m, outer(0.049, 180)));
  CHECK_FALSE(covers(markedTube, m, outer(0.046, 0)));  // 4 mm from the edge, width 3 mm
  CHECK(covers(markedTube, m, {SurfacePart::FaceA, 0.05, 0.0, 0.0095}));
  CHECK_FALSE(covers(markedTube, m, {SurfacePart::FaceA, 0.05, 0.0, 0.0065}));  // 3.5 mm in from the rim
}

TEST_CASE("stripes and dots sit on the outer surface", "[markings]") {
  Marking stripe;
  stripe.kind = MarkingKind::Stripe;
  stripe.angle = 90 * k::degree;
  stripe.arcWidth = 20 * k::degree;
  CHECK(covers(markedTube, stripe, outer(0.0, 99)));
  CHECK(covers(markedTube, stripe, outer(-0.05, 81)));
  CHECK_FALSE(covers(markedTube, stripe, outer(0.0, 101)));
  Marking dot;
  dot.kind = MarkingKind::Dot;
  dot.angle = 0;
  dot.axial = 0.02;
  dot.radius = 0.002;
  CHECK(covers(markedTube, dot, outer(0.0215, 0)));
  // 1.5 mm along the arc at R = 10 mm is 8.59 degrees.
  CHECK(covers(markedTube, dot, outer(0.02, 8.5)));
  CHECK_FALSE(covers(markedTube, dot, outer(0.02, 12)));
  CHECK_FALSE(covers(markedTube, dot, outer(0.0225, 0)));
}

TEST_CASE("later markings paint over earlier ones; the bore keeps its own colour", "[markings]") {
  Paint paint;
  paint.body = {0.9, 0.9, 0.9};
  paint.bore = {0.2, 0.2, 0.2};
  Marking band;
  band.kind = MarkingKind::Band;
  band.end = End::A;
  band.width = 0.01;
  band.colour = {1, 0, 0};
  Marking patch = band;
  patch.kind = MarkingKind::RimPatch;
  patch.fromAngle = 0;
  patch.toAngle = 30 * k::degree;
  patch.colour = {0, 0, 1};
  paint.markings = {band, patch};
  CHECK(colourAt(markedTube, paint, outer(0.049, 10)) == Rgb{0, 0, 1});
  CHECK(colourAt(markedTube, paint, outer(0.049, 90)) == Rgb{1, 0, 0});
  CHECK(colourAt(markedTube, paint, outer(0.0, 90)) == paint.body);
  CHECK(colourAt(markedTube, paint, {SurfacePart::Bore, 0.049, 0.1, 0.008}) == paint.bore);
}
