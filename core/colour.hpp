// sRGB transfer function (IEC 61966-2-1:1999), shared by scenario colours and
// every image the program writes.
#pragma once

namespace dm {

/// Encoded sRGB value (0..1) to linear light (0..1).
double srgbToLinear(double encoded);
/// Linear light (0..1, clamped) to encoded sRGB (0..1).
double linearToSrgb(double linear);

}  // namespace dm
