// Mass properties of the cylinder family.
#include <catch2/catch.hpp>

#include "core/body.hpp"

using namespace dm;

TEST_CASE("hollow cylinder mass properties match the handbook formulas", "[body]") {
  // Machinery's Handbook, 31st ed., "Formulas for polar moment of inertia of
  // masses", hollow circular cylinder: I_axis = m (R^2 + r^2) / 2,
  // I_transverse(centre) = m (3 (R^2 + r^2) + L^2) / 12.
  Cylinder c{0.064, 0.008, 0.007, 0.010};
  const MassProperties p = massProperties(c);
  CHECK(p.axial == Approx(0.010 * (0.008 * 0.008 + 0.007 * 0.007) / 2).epsilon(1e-12));
  CHECK(p.transverse == Approx(0.010 * (3 * (0.008 * 0.008 + 0.007 * 0.007) + 0.064 * 0.064) / 12).epsilon(1e-12));
}

TEST_CASE("solid rod and thin disk limits", "[body]") {
  // Same handbook: solid cylinder I_axis = m R^2 / 2; thin disk about a
  // diameter m R^2 / 4; slender rod about its centre m L^2 / 12.
  const MassProperties rod = massProperties({1.0, 1e-4, 0, 2.0});
  CHECK(rod.transverse == Approx(2.0 / 12).epsilon(1e-7));
  const MassProperties disk = massProperties({1e-6, 0.05, 0, 1.0});
  CHECK(disk.transverse == Approx(0.05 * 0.05 / 4).epsilon(1e-6));
  CHECK(disk.axial == Approx(0.05 * 0.05 / 2).epsilon(1e-12));
}

TEST_CASE("material volume subtracts the bore", "[body]") {
  Cylinder c{0.1, 0.01, 0.005, 1};
  CHECK(materialVolume(c) == Approx(3.14159265358979 * (1e-4 - 2.5e-5) * 0.1).epsilon(1e-12));
}
