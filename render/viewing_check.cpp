#include "render/viewing_check.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"

namespace dm {

double framingFieldOfView(const Scenario& s, const Observation& seen, double eyeAbove, double distance) {
  const double reach = seen.ring.radius + s.body.length / 2 + s.body.outerDiameter;
  const double range = std::hypot(distance, eyeAbove - seen.ring.centre.z());
  const double fov = 2 * std::atan(1.2 * reach / std::max(range, 1e-3));
  return std::clamp(fov, 1 * k::degree, 120 * k::degree);
}

std::vector<ViewerPosition> viewerPositions(const ViewingSpec& v) {
  return {{"standing adult", v.standingEyeHeight}, {"child", v.childEyeHeight}, {"seated visitor", v.seatedEyeHeight}};
}

std::vector<ViewingResult> viewingCheck(const Scenario& s, const Observation& seen, int imageSize, int threads) {
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
      v.observer.imageSize = imageSize;
      v.observer.fieldOfView = framingFieldOfView(s, seen, r.eyeAboveTable, r.distance);
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
