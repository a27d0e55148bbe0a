// Spot detection: along the ring the raised end's top point traces, find
// where the markings make the image darker or brighter than they make the
// ring on the whole, by more than a Weber contrast threshold. Works on top
// views and, with the ring projected, on a visitor's view.
#pragma once
#include <vector>

#include "core/body.hpp"
#include "core/trajectory.hpp"
#include "core/vec.hpp"
#include "render/camera.hpp"
#include "render/image.hpp"

namespace dm {

/// The circle the raised end's top point traces: centre on the spin axis at
/// the top point's height, radius horizontal (lab, m).
struct Ring {
  Vec3 centre = Vec3::Zero();
  double radius = 0;
};

/// The top point of the raised end at a pose: the rim point of that end
/// with the greatest height, Q = c + (L/2) a + R u, u the unit of z - (z.a) a
/// for the raised axis a.
Vec3 topPoint(const Cylinder& body, const Pose& pose, End raised);

/// The ring of a run over [t0, t1]: the least-squares circle (Kasa fit)
/// through the top points at `samples` times, at their mean height.
Ring ringOfRun(const Trajectory& trajectory, const Cylinder& body, End raised, double t0, double t1, int samples = 720);

/// Relative luminance of linear sRGB (ITU-R BT.709 primaries, IEC 61966-2-1): 0.2126 R + 0.7152 G + 0.0722 B.
double luminance(const Rgb& c);

/// One spot found on the ring of an image (named apart from the pattern
/// analysis' Spot in core/pattern.hpp: one name for two types broke the
/// one-definition rule once both were linked).
struct ImageSpot {
  double azimuth = 0;   ///< about the ring's centre, from lab x towards lab y, rad in [0, 2 pi)
  double radius = 0;    ///< distance from the ring's centre where the contrast peaks, m
  double contrast = 0;  ///< Weber contrast (L - L_median) / L_median at the peak: negative for a dark spot
  double width = 0;     ///< azimuthal extent above the threshold, rad
  Rgb colour;           ///< linear colour at the peak
};

struct SpotReport {
  Ring ring;
  double threshold = 0.02;     ///< Weber contrast a spot must exceed
  double medianLuminance = 0;  ///< the ring's median relative luminance (seen against the table)
  /// The markings' tint of the ring: the median over the ring (spots left
  /// out) of the luminance seen over that of the unpainted body, less one.
  double markTint = 0;
  double strongestContrast = 0;  ///< the largest |contrast| anywhere on the ring seen against the table, spot or not
  double seenShare = 1;          ///< share of the ring seen against the table top (the rest is not searched)
  std::vector<ImageSpot> spots;  ///< in order of azimuth
};

/// Finds the spots the markings make along `ring` in `image`, seen through
/// `camera`, with `unpainted` the same exposure with the markings left off
/// the body (Exposure::unpainted). The ring is cut into bins a pixel of its
/// length long (at least 720), each the mean of an image over two pixels
/// either side of the ring, smoothed over five bins. What counts is the
/// ratio of the two images: the body's outline, its shading and the table
/// are in both and divide out, so only what the markings change is read
/// (from a low eye the ring runs across the smeared outline of the body, a
/// strong edge that is no spot). A bin's Weber contrast is its ratio over
/// the markings' tint of the ring (the median ratio, taken again without
/// the strong spots and their skirts); a spot is a run of bins, at least
/// two pixels long, all beyond the threshold with one sign. Only the ring's
/// part seen against the table top (within `tableRadius` of the lab origin)
/// is searched: from a low eye the far side of the ring can stand against
/// what lies beyond the table's edge. Below a quarter of the ring seen,
/// nothing is reported.
SpotReport findSpots(const Image& image, const Image& unpainted, const Camera& camera, const Ring& ring,
                     double threshold, double tableRadius = 1e300);

}  // namespace dm
