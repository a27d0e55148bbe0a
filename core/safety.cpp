#include "core/safety.hpp"

#include <algorithm>
#include <cmath>

#include "core/io.hpp"

namespace dm {

namespace {

std::string mmText(double metres) { return fmt(metres * 1e3, 4) + " mm"; }
std::string percent(double share) { return fmt(100 * share, 3) + " %"; }

Caution tableEdge(const EnsembleSummary& e) {
  const TableCheck& t = e.table;
  Caution c{"a spinning piece can leave the table", t.reachesEdgeShare > 0 || t.leavesShare > 0, ""};
  c.text = "In " + percent(t.reachesEdgeShare) + " of " + std::to_string(e.launches - e.faults) +
           " simulated visitor launches part of the piece reaches the edge of the " + mmText(t.radius) +
           " radius table, and in " + percent(t.leavesShare) +
           " its centre passes the edge (without a lip it falls off). A table of radius " + mmText(t.radiusHoldingAll) +
           " holds every launch, " + mmText(t.radiusHolding90) + " holds 90 %. ";
  c.text += t.lipHeight ? "A lip at least " + mmText(*t.lipHeight) +
                              " high keeps the launches that reach the edge (centre height there plus v^2/(2 g) of its "
                              "speed, at least the outer radius: our rule, no source). "
                        : "No launch reaches the edge of this table. ";
  c.text += "Fastest surface speed: " + fmt(e.maxSurfaceSpeed.median, 3) + " m/s median, " +
            fmt(e.maxSurfaceSpeed.max, 3) + " m/s at most; a piece leaving the table can hit a visitor.";
  return c;
}

Caution smallParts(const Scenario& s) {
  const bool fits = fitsSmallPartsCylinder(s.body);
  Caution c{"small parts, end caps and young children", fits, ""};
  c.text = "The body (" + mmText(s.body.outerDiameter) + " across, " + mmText(s.body.length) + " long) " +
           (fits ? "could fit" : "does not fit") + " in the small-parts test cylinder of US 16 CFR 1501 (" +
           mmText(smallPartsDiameter) + " across, up to " + mmText(smallPartsDepth) +
           " deep; from memory): a choking hazard for children under three if it fits. End caps, plugs and any "
           "loose part are not modelled: test each one in the cylinder.";
  return c;
}

Caution pinchPoints(const EnsembleSummary& e) {
  Caution c{"pinch points", false, ""};
  c.text = "A spinning piece pinches where it meets the lip or a fixed part: surface speeds reach " +
           fmt(e.maxSurfaceSpeed.p90, 3) + " m/s in 90 % of launches. Leave no gap between the lip, fixtures and "
           "the table narrower than a finger where the piece can run; dwellmark does not model hands.";
  return c;
}

Caution flashing(const LightingSpec& l) {
  const double rate = flashRate(l);
  Caution c{"flashing light and photosensitive visitors", rate > maxFlashesPerSecond, ""};
  if (rate <= 0) {
    c.text = "No strobe and no visible flashing of the room light is set. A strobe used to freeze the pattern must not "
             "flash more than three times in any second (WCAG 2.x success criterion 2.3.1; ITU-R BT.1702).";
    return c;
  }
  c.text = "The light flashes " + fmt(rate, 4) + " times a second: " +
           (c.warning ? "above" : "within") +
           " the limit of three flashes in any second (WCAG 2.x success criterion 2.3.1; ITU-R BT.1702). Flashing "
           "above it can trigger seizures in photosensitive visitors.";
  return c;
}

Caution reach(const Scenario& s, const std::vector<std::string>& unseenBy) {
  const double height = s.viewing.tableHeight, depth = s.surface.tableRadius;
  const double high = depth <= reachDepthShallow ? reachHigh : reachHighDeep;
  const bool tooDeep = depth > reachDepthMax, outOfRange = height < reachLow || height > high;
  Caution c{"reach and viewing heights", tooDeep || outOfRange || !unseenBy.empty(), ""};
  c.text = "Table top " + mmText(height) + " above the floor, spin centre " + mmText(depth) + " from the edge. ";
  if (tooDeep)
    c.text += "That is deeper than the " + mmText(reachDepthMax) + " a seated visitor can reach over an obstruction. ";
  else
    c.text += std::string(outOfRange ? "Outside" : "Within") + " the forward reach range of " + mmText(reachLow) + " to " +
              mmText(high) + " for this depth. ";
  c.text += "(2010 ADA Standards section 308, from memory.) ";
  if (unseenBy.empty()) {
    c.text += "Every viewing position of the viewing check sees the spots.";
  } else {
    c.text += "No spot reaches the detection threshold for:";
    for (std::size_t i = 0; i < unseenBy.size(); ++i) c.text += (i ? ", " : " ") + unseenBy[i];
    c.text += ".";
  }
  return c;
}

}  // namespace

bool fitsSmallPartsCylinder(const BodySpec& b) {
  const double small = std::min(b.outerDiameter, b.length), large = std::max(b.outerDiameter, b.length);
  return small <= smallPartsDiameter && large <= smallPartsDepth;
}

double flashRate(const LightingSpec& l) {
  if (l.strobeRate > 0) return l.strobeRate;
  if (l.flicker == Waveform::None || l.flickerFrequency >= 60) return 0;
  // Michelson depth m: (max - min) / max = 2 m / (1 + m).
  const double change = 2 * l.flickerDepth / (1 + l.flickerDepth);
  return change >= 0.1 ? l.flickerFrequency : 0;
}

std::vector<Caution> cautionsOf(const Scenario& s, const EnsembleSummary& e, const std::vector<std::string>& unseenBy) {
  return {tableEdge(e), smallParts(s), pinchPoints(e), flashing(s.lighting), reach(s, unseenBy)};
}

}  // namespace dm
