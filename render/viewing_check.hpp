// The viewing check of a design review: what a standing adult, a child and
// a seated visitor see of the spots from their eye heights at the viewing
// distance, and whether the spots' contrast reaches the detection
// threshold (observer.spot_threshold: a Weber contrast of about 2 % for
// large targets, Blackwell, JOSA 36, 624, 1946, from memory).
#pragma once
#include <string>
#include <vector>

#include "core/scenario.hpp"
#include "render/image.hpp"
#include "render/observe.hpp"

namespace dm {

/// One place a visitor looks from.
struct ViewerPosition {
  std::string name;        ///< "standing adult", "child", "seated visitor"
  double eyeHeight = 0;    ///< above the floor, m
};

/// The three positions of a scenario's viewing section.
std::vector<ViewerPosition> viewerPositions(const ViewingSpec& v);

/// What one viewer sees.
struct ViewingResult {
  ViewerPosition viewer;
  double eyeAboveTable = 0;   ///< m (negative: below the table top)
  double distance = 0;        ///< horizontal distance from the spin centre, m
  double elevation = 0;       ///< angle of the sight line to the spin centre above the table, rad
  int spots = 0;              ///< spots found above the threshold
  double contrast = 0;        ///< largest |Weber contrast| of a found spot (0 when none)
  double threshold = 0;       ///< the detection threshold used
  bool seen = false;          ///< at least one spot reaches the threshold
  Image image;                ///< the viewer's exposure (empty when the eye is below the table top)
};

/// Smallest eye height above the table top a viewer's camera is placed at,
/// m (the observer field's lower limit); lower eyes see no spots.
inline constexpr double minEyeAboveTable = 0.01;

/// The full field of view (rad, 1 to 120 deg) that holds the ring and the
/// body's sweep around it, with a fifth to spare, from an eye `eyeAbove` (m)
/// above the table and `distance` (m) from the spin centre.
double framingFieldOfView(const Scenario& s, const Observation& seen, double eyeAbove, double distance);

/// Exposes the observation from each viewer position (the scenario's
/// observer settings with the viewer's eye, at `imageSize` pixels, the field
/// of view framing the body's sweep) and finds the spots.
std::vector<ViewingResult> viewingCheck(const Scenario& s, const Observation& seen, int imageSize, int threads);

}  // namespace dm
