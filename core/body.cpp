#include "core/body.hpp"

#include "core/constants.hpp"

namespace dm {

std::string_view shapeName(Shape s) {
  switch (s) {
    case Shape::Tube: return "tube";
    case Shape::Rod: return "rod";
    case Shape::Ring: return "ring";
    case Shape::Disk: return "disk";
  }
  return "tube";
}

std::string_view endName(End e) { return e == End::A ? "A" : "B"; }

bool isHollow(Shape s) { return s == Shape::Tube || s == Shape::Ring; }

double materialVolume(const Cylinder& c) {
  return k::pi * (c.outerRadius * c.outerRadius - c.innerRadius * c.innerRadius) * c.length;
}

MassProperties massProperties(const Cylinder& c) {
  const double r2 = c.outerRadius * c.outerRadius + c.innerRadius * c.innerRadius;
  MassProperties p;
  p.mass = c.mass;
  p.axial = c.mass * r2 / 2.0;
  p.transverse = c.mass * (3.0 * r2 + c.length * c.length) / 12.0;
  return p;
}

}  // namespace dm
