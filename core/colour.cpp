#include "core/colour.hpp"

#include <algorithm>
#include <cmath>

namespace dm {

// IEC 61966-2-1: linear segment below 0.04045 (encoded) / 0.0031308 (linear),
// power 2.4 with offset 0.055 above.
double srgbToLinear(double v) {
  v = std::clamp(v, 0.0, 1.0);
  return v <= 0.04045 ? v / 12.92 : std::pow((v + 0.055) / 1.055, 2.4);
}

double linearToSrgb(double v) {
  v = std::clamp(v, 0.0, 1.0);
  return v <= 0.0031308 ? 12.92 * v : 1.055 * std::pow(v, 1.0 / 2.4) - 0.055;
}

}  // namespace dm
