// Coloured regions painted on the body, in body coordinates, so that a viewer
// model can ask which colour a surface point has.
#pragma once
#include <string>
#include <vector>

#include "core/body.hpp"
#include "core/vec.hpp"

namespace dm {

/// Which part of the cylinder's surface a point lies on.
enum class SurfacePart {
  Outer,  ///< the outer cylindrical surface, radius R
  Bore,   ///< the inner cylindrical surface of a hollow body, radius r
  FaceA,  ///< the flat annular (or full) end face at z = +L/2
  FaceB,  ///< the flat end face at z = -L/2
};

/// A point on the surface in cylindrical body coordinates.
struct SurfacePoint {
  SurfacePart part = SurfacePart::Outer;
  double z = 0;       ///< along the axis from the centre, metres (-L/2..L/2)
  double angle = 0;   ///< azimuth about the axis from body x towards body y, radians
  double radius = 0;  ///< distance from the axis, metres (R on Outer, r on Bore)
};

/// Kinds of marking. Angles are azimuths about the body axis from body x
/// towards body y; widths are measured from the end edge along the length.
enum class MarkingKind {
  Band,      ///< all round an end: outer surface within `width` of the end, and that end's face
  RimPatch,  ///< part of an end's rim between two azimuths: outer surface within `width` of the end and the face within `width` of the rim
  Stripe,    ///< along the whole length, on the outer surface, `arcWidth` wide centred on `angle`
  Dot,       ///< a round dot of `radius` on the outer surface at (`axial`, `angle`)
};

std::string_view markingKindName(MarkingKind k);

/// One painted region. Only the fields its kind names are used.
struct Marking {
  MarkingKind kind = MarkingKind::RimPatch;
  Rgb colour{1, 0, 0};      ///< linear RGB
  End end = End::A;         ///< Band, RimPatch: which end
  double width = 0.003;     ///< Band, RimPatch: metres from the end edge
  double fromAngle = 0;     ///< RimPatch: start azimuth, radians
  double toAngle = 0.4363;  ///< RimPatch: end azimuth, radians (counter-clockwise from fromAngle)
  double angle = 0;         ///< Stripe, Dot: centre azimuth, radians
  double arcWidth = 0.2;    ///< Stripe: angular width, radians
  double axial = 0;         ///< Dot: position along the axis from the centre, metres
  double radius = 0.002;    ///< Dot: metres
};

/// Colours of the unpainted body and its bore.
struct Paint {
  Rgb body{0.8, 0.8, 0.8};
  Rgb bore{0.5, 0.5, 0.5};
  std::vector<Marking> markings;  ///< later markings paint over earlier ones
};

/// Colour of a surface point: the last marking that covers it, else the body
/// (or bore) colour.
Rgb colourAt(const Cylinder& body, const Paint& paint, const SurfacePoint& p);

/// True when marking `m` covers point `p`.
bool covers(const Cylinder& body, const Marking& m, const SurfacePoint& p);

/// Wraps an angle into [0, 2 pi).
double wrapAngle(double a);

}  // namespace dm
