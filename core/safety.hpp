// The cautions a design review must show, from the design's own numbers:
// the piece leaving the table, small parts, pinch points, flashing light,
// reach and viewing heights. The tool's figures support these judgements;
// local codes and the venue's safety officer decide.
#pragma once
#include <string>
#include <vector>

#include "core/ensemble.hpp"
#include "core/scenario.hpp"

namespace dm {

/// One caution of the review.
struct Caution {
  std::string topic;     ///< short heading
  bool warning = false;  ///< the design's numbers call for action
  std::string text;      ///< what the numbers say, units included, with the source of every limit
};

/// The closing statement of every cautions section.
inline constexpr const char* safetyAuthority =
    "These figures support the judgement; they do not replace it. Local codes and the venue's safety officer decide.";

/// US 16 CFR 1501 small-parts test cylinder (from memory): 31.7 mm across,
/// 25.4 mm deep on its shallow side and 57.1 mm on its slanted deep side.
inline constexpr double smallPartsDiameter = 0.0317;  ///< m
inline constexpr double smallPartsDepth = 0.0571;     ///< m, the deep side (the conservative reading)

/// True when the body could fit in the small-parts cylinder in some
/// orientation: its diameter and length both within the cylinder's width and
/// deep side, one of them within the width (conservative: the slanted floor
/// is not modelled).
bool fitsSmallPartsCylinder(const BodySpec& body);

/// Flashes per second of the exhibit's light: the strobe's rate when one is
/// set; otherwise the room light's modulation frequency when it is below
/// 60 Hz (flicker fusion at exhibit light levels, from memory) and changes
/// the light by at least 10 % of its maximum (the WCAG 2.x general flash
/// definition, from memory); otherwise 0.
double flashRate(const LightingSpec& lighting);

/// WCAG 2.x success criterion 2.3.1: no more than three flashes in any one second.
inline constexpr double maxFlashesPerSecond = 3.0;

/// 2010 ADA Standards section 308 forward reach (from memory): 380 to 1220 mm
/// unobstructed; over an obstruction 510 mm deep at most 1220 mm high, 510 to
/// 635 mm deep at most 1120 mm, deeper not allowed.
inline constexpr double reachLow = 0.380, reachHigh = 1.220, reachHighDeep = 1.120;  ///< m
inline constexpr double reachDepthShallow = 0.510, reachDepthMax = 0.635;            ///< m

/// The cautions of one design: the table edge and lip (from the ensemble),
/// small parts, pinch points, flashing light and reach. `unseenBy` names the
/// viewing positions from which no spot reaches the detection threshold
/// (from the viewing check); they join the reach and viewing caution.
std::vector<Caution> cautionsOf(const Scenario& s, const EnsembleSummary& e, const std::vector<std::string>& unseenBy);

}  // namespace dm
