// The body: one right circular cylinder family (tube, rod, ring, disk) and its
// mass properties.
#pragma once
#include <string_view>

#include "core/vec.hpp"

namespace dm {

/// The four product shapes. Tube and ring are hollow (wall thickness given);
/// rod and disk are solid. Tube and rod are longer than wide; ring and disk
/// are no longer than wide.
enum class Shape { Tube, Rod, Ring, Disk };

/// The two ends. End A is at body z = +L/2, end B at body z = -L/2.
enum class End { A, B };

std::string_view shapeName(Shape s);
std::string_view endName(End e);
inline End otherEnd(End e) { return e == End::A ? End::B : End::A; }
/// +1 for end A, -1 for end B: the sign of the end's body z.
inline double endSign(End e) { return e == End::A ? 1.0 : -1.0; }
bool isHollow(Shape s);

/// Geometry and mass of the cylinder, SI.
struct Cylinder {
  double length = 0.064;       ///< L, metres
  double outerRadius = 0.008;  ///< R, metres
  double innerRadius = 0.007;  ///< r, metres (0 for solid shapes)
  double mass = 0.008;         ///< m, kilograms
};

/// Inertia about the centre of mass in body axes (axis = body z).
struct MassProperties {
  double mass = 0;    ///< kg
  double axial = 0;   ///< I_a = m (R^2 + r^2) / 2, kg m^2
  double transverse = 0;  ///< I_t = m (3 (R^2 + r^2) + L^2) / 12, kg m^2
  Eigen::Vector3d diagonal() const { return {transverse, transverse, axial}; }
};

/// Mass properties of a hollow (or, with r = 0, solid) right circular
/// cylinder (Machinery's Handbook, 31st ed., polar moments of inertia of masses).
MassProperties massProperties(const Cylinder& c);

/// Material volume, m^3 (outer cylinder minus the bore).
double materialVolume(const Cylinder& c);

}  // namespace dm
