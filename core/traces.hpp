// Where the notable points of the body are at one pose: the centre, the
// floor contact (lowest rim point of the lower end), the point that touches
// the imaginary ceiling (highest rim point of the upper end), and the anchor
// point of each marking. Traces are these points followed over time.
#pragma once
#include <vector>

#include "core/body.hpp"
#include "core/markings.hpp"
#include "core/trajectory.hpp"
#include "core/vec.hpp"

namespace dm {

/// Lab position, m, of the rim point of end `e` lowest above the table:
/// p = c_end - R d, with d the unit vector of z - (z.a) a (physics.md
/// section 2). With the axis vertical every rim point is equally low and
/// the body x direction is used.
Vec3 lowestRimPoint(const Cylinder& c, const Pose& pose, End e);
/// Lab position, m, of the rim point of end `e` highest above the table (c_end + R d).
Vec3 highestRimPoint(const Cylinder& c, const Pose& pose, End e);

/// The notable points of one pose, lab frame, m.
struct TracePoints {
  Vec3 centre = Vec3::Zero();
  Vec3 floorContact = Vec3::Zero();    ///< lowest rim point of the lower end
  Vec3 ceilingContact = Vec3::Zero();  ///< highest rim point of the upper end
};
TracePoints tracePoints(const Cylinder& c, const Pose& pose);

/// Body-frame point that stands for a marking in a path plot, m: the middle
/// of a rim patch's arc on its end's rim, azimuth 0 of a band's rim, a
/// stripe's centre line on end A's rim, a dot's centre.
Vec3 markingAnchor(const Cylinder& c, const Marking& m);

/// Which point of the body a trace follows.
enum class TraceKind { Centre, FloorContact, CeilingContact };

/// Lab positions, m, of one kind of point at every `stride`-th sample of
/// `samples` from index `first` on.
std::vector<Vec3> tracePath(const Cylinder& c, const std::vector<Sample>& samples, TraceKind kind,
                            std::size_t first = 0, std::size_t stride = 1);
/// Lab positions, m, of a body-frame point at every `stride`-th sample from index `first` on.
std::vector<Vec3> bodyPointPath(const Vec3& bodyPoint, const std::vector<Sample>& samples, std::size_t first = 0,
                                std::size_t stride = 1);

}  // namespace dm
