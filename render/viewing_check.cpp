#include "render/viewing_check.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"
#include "core/markings.hpp"

namespace dm {

namespace {

// Distance from an eye `eyeAbove` (m) above the table and `distance` (m)
// from the spin centre to the ring's centre, m.
double rangeToRing(const Observation& seen, double eyeAbove, double distance) {
  return std::max(std::hypot(distance, eyeAbove - seen.ring.centre.z()), 1e-3);
}

}  // namespace

double framingFieldOfView(const Scenario& s, const Observation& seen, double eyeAbove, double distance) {
  // The body's rims reach at most a diameter beyond the ring of its top
  // points (and the contact circle below it has the same radius).
  const double reach = seen.ring.radius + s.body.outerDiameter;
  const double fov = 2 * std::atan(1.2 * reach / rangeToRing(seen, eyeAbove, distance));
  return std::clamp(fov, 1 * k::degree, 120 * k::degree);
}

double smallestMarkExtent(const Scenario& s) {
  const double radius = s.body.outerDiameter / 2;
  double smallest = 0;
  const auto keep = [&](double extent) {
    if (extent > 0) smallest = smallest > 0 ? std::min(smallest, extent) : extent;
  };
  for (const Marking& m : s.paint.markings) switch (m.kind) {
      case MarkingKind::Band: keep(m.width); break;
      case MarkingKind::RimPatch: {
        const double span = wrapAngle(m.toAngle - m.fromAngle);
        keep(m.width);
        keep((span > 0 ? span : k::twoPi) * radius);
        break;
      }
      case MarkingKind::Stripe: keep(m.arcWidth * radius); break;
      case MarkingKind::Dot: keep(2 * m.radius); break;
    }
  return smallest;
}

int viewingImageSize(const Scenario& s, double fieldOfView, double range, int largest, bool& resolved) {
  const double mark = smallestMarkExtent(s);
  const double footprint = std::max(eyeAcuity * range, mark / pixelsPerMark);
  const double width = 2 * range * std::tan(fieldOfView / 2);
  const double wanted = std::max(64.0, std::ceil(width / footprint));
  resolved = wanted <= largest;
  return resolved ? int(wanted) : largest;
}

std::vector<ViewerPosition> viewerPositions(const ViewingSpec& v) {
  return {{"standing adult", v.standingEyeHeight}, {"child", v.childEyeHeight}, {"seated visitor", v.seatedEyeHeight}};
}

std::vector<ViewingResult> viewingCheck(const Scenario& s, const Observation& seen, int largestImageSize, int threads) {
  std::vector<ViewingResult> results;
  for (const ViewerPosition& viewer : viewerPositions(s.viewing)) {
    ViewingResult r;
    r.viewer = viewer;
    r.eyeAboveTable = viewer.eyeHeight - s.viewing.tableHeight;
    r.distance = s.viewing.distance;
    r.elevation = std::atan2(r.eyeAboveTable, r.distance);
    r.threshold = s.observer.spotThreshold;
    if (r.eyeAboveTable >= minEyeAboveTable) {
      Scenario v = s;
      v.observer.view = ViewKind::Visitor;
      v.observer.eyeHeight = r.eyeAboveTable;
      v.observer.eyeDistance = r.distance;
      v.observer.fieldOfView = framingFieldOfView(s, seen, r.eyeAboveTable, r.distance);
      const double range = rangeToRing(seen, r.eyeAboveTable, r.distance);
      v.observer.imageSize = viewingImageSize(s, v.observer.fieldOfView, range, largestImageSize, r.resolved);
      r.footprint = 2 * range * std::tan(v.observer.fieldOfView / 2) / v.observer.imageSize;
      const ExposureResult e = exposeObservation(v, seen, s.observer.start, threads);
      r.spots = int(e.spots.spots.size());
      for (const ImageSpot& spot : e.spots.spots) r.contrast = std::max(r.contrast, std::abs(spot.contrast));
      r.seen = r.spots > 0 && r.contrast >= r.threshold;
      r.image = e.exposure.image;
    }
    results.push_back(std::move(r));
  }
  return results;
}

}  // namespace dm
