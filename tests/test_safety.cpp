// The review's cautions: small parts, flashing light, reach, and the table
// edge from an ensemble's figures, each with the limit it is judged against.
#include <catch2/catch.hpp>

#include "core/safety.hpp"

using namespace dm;

namespace {

const Caution& topic(const std::vector<Caution>& list, const std::string& name) {
  for (const Caution& c : list)
    if (c.topic.find(name) != std::string::npos) return c;
  FAIL("no caution on " << name);
  return list.front();
}

bool mentions(const Caution& c, const std::string& text) { return c.text.find(text) != std::string::npos; }

}  // namespace

TEST_CASE("a body that fits the small-parts cylinder is flagged", "[safety]") {
  // US 16 CFR 1501 test cylinder: 31.7 mm across, 57.1 mm on its deep side (from memory).
  BodySpec b;
  b.outerDiameter = 0.016;
  b.length = 0.050;
  CHECK(fitsSmallPartsCylinder(b));
  b.length = 0.064;  // longer than the deep side
  CHECK_FALSE(fitsSmallPartsCylinder(b));
  b.outerDiameter = 0.030;  // a coin: thin and within the width
  b.length = 0.003;
  CHECK(fitsSmallPartsCylinder(b));
  b.outerDiameter = 0.032;  // the demo tube is just wider than the cylinder
  b.length = 0.131;
  CHECK_FALSE(fitsSmallPartsCylinder(b));
}

TEST_CASE("flashes count from a strobe or a slow deep room-light modulation", "[safety]") {
  LightingSpec l;
  CHECK(flashRate(l) == 0);
  l.strobeRate = 5;
  CHECK(flashRate(l) == 5);
  l.strobeRate = 0;
  // Mains flicker at 100 Hz is fused, not a flash (fusion near 60 Hz, from memory).
  l.flicker = Waveform::RectifiedMains;
  l.flickerFrequency = 100;
  l.flickerDepth = 1;
  CHECK(flashRate(l) == 0);
  // A 10 Hz sine changing the light by at least 10 % of its maximum flashes
  // (WCAG 2.x general flash, from memory): 2 m / (1 + m) >= 0.1 from m = 1/19.
  l.flicker = Waveform::Sine;
  l.flickerFrequency = 10;
  l.flickerDepth = 0.06;
  CHECK(flashRate(l) == 10);
  l.flickerDepth = 0.05;
  CHECK(flashRate(l) == 0);
}

TEST_CASE("the cautions report the table edge, flashes and reach with their limits", "[safety]") {
  Scenario s = defaultScenario();
  EnsembleSummary e;
  e.launches = 10;
  e.table.radius = 0.3;
  e.table.reachesEdgeShare = 0.2;
  e.table.leavesShare = 0.1;
  e.table.radiusHoldingAll = 0.8;
  e.table.radiusHolding90 = 0.5;
  e.table.lipHeight = 0.025;
  e.maxSurfaceSpeed.median = 2.0;
  e.maxSurfaceSpeed.p90 = 3.0;
  e.maxSurfaceSpeed.max = 4.0;
  s.lighting.strobeRate = 4;  // above three a second: WCAG 2.x SC 2.3.1
  s.viewing.tableHeight = 0.9;
  s.surface.tableRadius = 0.3;
  const std::vector<Caution> list = cautionsOf(s, e, {"child"});
  REQUIRE(list.size() == 5);
  const Caution& edge = topic(list, "leave the table");
  CHECK(edge.warning);
  CHECK(mentions(edge, "20 %"));
  CHECK(mentions(edge, "25 mm"));
  CHECK(topic(list, "flashing").warning);
  CHECK(mentions(topic(list, "flashing"), "2.3.1"));
  const Caution& reach = topic(list, "reach");
  CHECK(reach.warning);  // the child sees no spot
  CHECK(mentions(reach, "child"));
  CHECK(mentions(reach, "section 308"));
  // A spin centre deeper than 635 mm is beyond a seated visitor's reach (2010 ADA 308.2.2, from memory).
  s.surface.tableRadius = 0.7;
  CHECK(mentions(topic(cautionsOf(s, e, {}), "reach"), "deeper than"));
  // A table top at 900 mm over a 300 mm reach depth is within 380 to 1220 mm.
  s.surface.tableRadius = 0.3;
  CHECK_FALSE(topic(cautionsOf(s, e, {}), "reach").warning);
  CHECK(std::string(safetyAuthority).find("safety officer") != std::string::npos);
}
