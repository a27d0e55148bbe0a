#include "render/spots.hpp"

#include <algorithm>
#include <cmath>
#include <tuple>

#include "core/constants.hpp"
#include "core/markings.hpp"

namespace dm {

Vec3 topPoint(const Cylinder& body, const Pose& pose, End raised) {
  const Vec3 axis = endSign(raised) * pose.axis();
  Vec3 upInPlane = Vec3::UnitZ() - axis.z() * axis;
  upInPlane = upInPlane.norm() > 1e-12 ? Vec3(upInPlane.normalized()) : Vec3::Zero();
  return pose.position + body.length / 2 * axis + body.outerRadius * upInPlane;
}

Ring ringOfRun(const Trajectory& trajectory, const Cylinder& body, End raised, double t0, double t1, int samples) {
  // Kasa fit: minimise sum (x^2 + y^2 + D x + E y + F)^2, a linear least-squares problem.
  Eigen::Matrix3d normal = Eigen::Matrix3d::Zero();
  Eigen::Vector3d rhs = Eigen::Vector3d::Zero();
  double height = 0;
  for (int i = 0; i < samples; ++i) {
    const double t = t0 + (t1 - t0) * (i + 0.5) / samples;
    const Vec3 q = topPoint(body, trajectory.poseAt(t), raised);
    const Eigen::Vector3d row(q.x(), q.y(), 1.0);
    normal += row * row.transpose();
    rhs += row * -(q.x() * q.x() + q.y() * q.y());
    height += q.z() / samples;
  }
  const Eigen::Vector3d def = normal.ldlt().solve(rhs);
  Ring ring;
  ring.centre = Vec3(-def.x() / 2, -def.y() / 2, height);
  ring.radius = std::sqrt(std::max(0.0, ring.centre.x() * ring.centre.x() + ring.centre.y() * ring.centre.y() - def.z()));
  return ring;
}

double luminance(const Rgb& c) { return 0.2126 * c.r + 0.7152 * c.g + 0.0722 * c.b; }

namespace {

// Bilinear sample of the image at image point (x, y), clamped at the edges.
Rgb sampleAt(const Image& img, double x, double y) {
  const double fx = std::clamp(x - 0.5, 0.0, img.width - 1.0), fy = std::clamp(y - 0.5, 0.0, img.height - 1.0);
  const int x0 = std::min(int(fx), std::max(0, img.width - 2)), y0 = std::min(int(fy), std::max(0, img.height - 2));
  const int x1 = std::min(x0 + 1, img.width - 1), y1 = std::min(y0 + 1, img.height - 1);
  const double u = fx - x0, v = fy - y0;
  const Rgb a = img.at(x0, y0), b = img.at(x1, y0), c = img.at(x0, y1), d = img.at(x1, y1);
  auto mix = [&](double pa, double pb, double pc, double pd) {
    return (1 - v) * ((1 - u) * pa + u * pb) + v * ((1 - u) * pc + u * pd);
  };
  return {mix(a.r, b.r, c.r, d.r), mix(a.g, b.g, c.g, d.g), mix(a.b, b.b, c.b, d.b)};
}

// Half-width, in bins, of the moving average along the ring: five bins,
// five pixels of ring length, so that noise cannot split a spot's edge.
constexpr int smoothing = 2;

// Radial rows and azimuthal columns of the samples averaged into one bin.
constexpr int binRadial = 2;  // rows at -2..+2 footprints across the ring
constexpr int binAzimuthal = 3;

// The mean colour of the annular bin centred at azimuth `phi`, `width`
// radians wide, within two footprints `step` either side of `radius`:
// averaging a bin's area evens out the pixel grid and the per-pixel
// sampling noise where the ring runs along the edge of the swept disc.
Rgb ringColour(const Image& img, const Camera& camera, const Ring& ring, double phi, double width, double radius,
               double step) {
  Rgb sum;
  int n = 0;
  for (int j = 0; j < binAzimuthal; ++j) {
    const double a = phi + ((j + 0.5) / binAzimuthal - 0.5) * width;
    for (int k = -binRadial; k <= binRadial; ++k) {
      const double r = radius + k * step;
      const Vec3 p = ring.centre + Vec3(r * std::cos(a), r * std::sin(a), 0);
      double x, y;
      if (!camera.project(p, x, y)) continue;
      const Rgb c = sampleAt(img, x, y);
      sum = {sum.r + c.r, sum.g + c.g, sum.b + c.b};
      ++n;
    }
  }
  return n > 0 ? Rgb{sum.r / n, sum.g / n, sum.b / n} : Rgb{};
}

// Circular moving average over 2 half + 1 values.
std::vector<double> movingAverage(const std::vector<double>& v, int half) {
  const int n = int(v.size());
  std::vector<double> out(v.size());
  for (int i = 0; i < n; ++i) {
    double sum = 0;
    for (int d = -half; d <= half; ++d) sum += v[std::size_t(((i + d) % n + n) % n)];
    out[std::size_t(i)] = sum / (2 * half + 1);
  }
  return out;
}

double medianOf(std::vector<double> v) {
  std::nth_element(v.begin(), v.begin() + std::ptrdiff_t(v.size() / 2), v.end());
  return v[v.size() / 2];
}

// Runs [first, last] of indices (last may pass n, wrapping) where |v / reference - 1| > limit with one sign.
std::vector<std::pair<int, int>> runsBeyond(const std::vector<double>& v, double reference, double limit) {
  const int n = int(v.size());
  auto signAt = [&](int i) {
    const double c = v[std::size_t(((i % n) + n) % n)] / reference - 1.0;
    return c > limit ? 1 : c < -limit ? -1 : 0;
  };
  std::vector<std::pair<int, int>> runs;
  int start = 0;
  while (start < n && signAt(start) != 0) ++start;
  if (start == n) return runs;
  for (int i = start + 1; i < start + n;) {
    const int s = signAt(i);
    if (s == 0) {
      ++i;
      continue;
    }
    int j = i;
    while (j < start + n && signAt(j) == s) ++j;
    runs.emplace_back(i, j - 1);
    i = j;
  }
  return runs;
}

// The radii a spot's radial profile is read at: within a third of the
// ring's radius either side, one footprint `step` apart.
std::vector<double> profileRadii(const Ring& ring, double step) {
  std::vector<double> radii;
  const int reach = int(std::ceil(ring.radius / 3 / step));
  for (int k = -reach; k <= reach; ++k)
    if (ring.radius + k * step > 0) radii.push_back(ring.radius + k * step);
  return radii;
}

// Lowest luminance a reference is taken at: against a black table the
// Weber contrast of any mark is huge, not undefined.
constexpr double darkestReference = 1e-4;

// The two exposures spot detection reads: what the visitor sees (over a
// plain table) and the same with the markings left off.
struct SpotImages {
  const Image& seen;
  const Image& unpainted;
  const Camera& camera;
  const Ring& ring;
  // The luminance of both in the bin at azimuth `phi`, `width` wide, at `radius`.
  std::pair<double, double> luminances(double phi, double width, double radius, double step) const {
    return {luminance(ringColour(seen, camera, ring, phi, width, radius, step)),
            luminance(ringColour(unpainted, camera, ring, phi, width, radius, step))};
  }
  // How much the markings change the luminance there: seen / unpainted.
  double markRatio(double phi, double width, double radius, double step) const {
    const auto [lum, ref] = luminances(phi, width, radius, step);
    return lum / std::max(ref, darkestReference);
  }
};

// The median mark ratio of the circle of each radius, in `bins` bins: the
// markings' tint at that distance from the centre. A spot's place across
// the ring is judged against it: outside the swept disc the ratio is one.
std::vector<double> circleMedians(const SpotImages& images, const std::vector<double>& radii, int bins, double step) {
  std::vector<double> medians;
  const double width = k::twoPi / bins;
  for (double r : radii) {
    std::vector<double> ratio(static_cast<std::size_t>(bins));
    for (int i = 0; i < bins; ++i) ratio[std::size_t(i)] = images.markRatio(width * i, width, r, step);
    medians.push_back(medianOf(ratio));
  }
  return medians;
}

// Where across the ring the contrast the markings make at azimuth `phi`,
// against their tint at the same radius, peaks with the spot's sign.
double peakRadius(const SpotImages& images, double phi, double width, double sign, double step,
                  const std::vector<double>& radii, const std::vector<double>& medians) {
  double best = images.ring.radius, bestValue = -1e300;
  for (std::size_t i = 0; i < radii.size(); ++i) {
    if (!(medians[i] > 0)) continue;
    const double c = sign * (images.markRatio(phi, width, radii[i], step) / medians[i] - 1.0);
    if (c > bestValue) {
      bestValue = c;
      best = radii[i];
    }
  }
  return best;
}

// Whether the line of sight through the ring's point at azimuth `phi`
// lands on the table top (within `tableRadius` of the lab origin, less a
// margin of `margin`) behind it: where it does not, the ring is seen against
// whatever lies beyond the table's edge, and that edge is no spot.
bool againstTable(const Camera& camera, const Ring& ring, double phi, double tableRadius, double margin) {
  const Vec3 p = ring.centre + Vec3(ring.radius * std::cos(phi), ring.radius * std::sin(phi), 0);
  const Vec3 d = camera.orthographic ? camera.forward : Vec3(p - camera.eye);
  if (!(d.z() < 0)) return false;
  const Vec3 hit = p + d * (-p.z() / d.z());
  return std::hypot(hit.x(), hit.y()) <= tableRadius - margin;
}

// Bins seen against the table, and those within `skirt` bins of one that is
// not (the smoothing and the bins' own width carry the edge that far).
std::vector<bool> seenBins(const Camera& camera, const Ring& ring, int n, double tableRadius, double step, int skirt) {
  const std::size_t count = static_cast<std::size_t>(n);
  std::vector<bool> raw(count), seen(count, true);
  for (int i = 0; i < n; ++i) raw[std::size_t(i)] = againstTable(camera, ring, k::twoPi * i / n, tableRadius, 3 * step);
  for (int i = 0; i < n; ++i)
    if (!raw[std::size_t(i)])
      for (int d = -skirt; d <= skirt; ++d) seen[std::size_t(((i + d) % n + n) % n)] = false;
  return seen;
}

// Runs of one sign with a gap of at most `gapBins` between them joined:
// noise that dips a spot's flank under the threshold for a bin or two must
// not split it in two. (Distinct spots lie tens of bins apart.)
constexpr int gapBins = 2 * smoothing + 1;

std::vector<std::pair<int, int>> joinNearRuns(const std::vector<std::pair<int, int>>& runs,
                                              const std::vector<double>& v, double reference, int n) {
  const auto signOf = [&](int i) { return v[std::size_t(((i % n) + n) % n)] > reference ? 1 : -1; };
  std::vector<std::pair<int, int>> joined;
  for (const auto& run : runs) {
    if (!joined.empty() && run.first - joined.back().second - 1 <= gapBins &&
        signOf(run.first) == signOf(joined.back().first))
      joined.back().second = run.second;
    else
      joined.push_back(run);
  }
  // The last run may reach round to the first.
  if (joined.size() > 1 && joined.front().first + n - joined.back().second - 1 <= gapBins &&
      signOf(joined.front().first) == signOf(joined.back().first)) {
    joined.back().second = joined.front().second + n;
    joined.erase(joined.begin());
  }
  return joined;
}

}  // namespace

SpotReport findSpots(const Image& image, const Image& unpainted, const Camera& camera, const Ring& ring,
                     double threshold, double tableRadius) {
  SpotReport report;
  report.ring = ring;
  report.threshold = threshold;
  const SpotImages images{image, unpainted, camera, ring};
  // One bin per pixel of the ring's length, at least 720 round the ring.
  const double step = camera.footprintAt(ring.centre);
  const int n = std::max(720, int(std::ceil(k::twoPi * ring.radius / step)));
  const double width = k::twoPi / n;
  const std::size_t count = static_cast<std::size_t>(n);
  std::vector<double> lum(count), ref(count);
  for (int i = 0; i < n; ++i) std::tie(lum[std::size_t(i)], ref[std::size_t(i)]) = images.luminances(width * i, width, ring.radius, step);
  // Only the part of the ring seen against the table counts: the rest is
  // filled with the median of the part that does and takes no part below.
  const std::vector<bool> seen = seenBins(camera, ring, n, tableRadius, step, 2 * (smoothing + binAzimuthal));
  const auto medianOfSeen = [&](const std::vector<double>& v) {
    std::vector<double> kept;
    for (std::size_t i = 0; i < count; ++i)
      if (seen[i]) kept.push_back(v[i]);
    return kept.empty() ? 0.0 : medianOf(kept);
  };
  report.seenShare = double(std::count(seen.begin(), seen.end(), true)) / double(count);
  if (report.seenShare < 0.25) return report;  // too little of the ring to judge
  // The ratio of what is seen to the same without the markings, smoothed:
  // what the markings change. The body's outline, the shading and the table
  // are in both and divide out, so from a low eye the smeared edge of the
  // body is no spot; a body without markings has none.
  const std::vector<double> smoothLum = movingAverage(lum, smoothing), smoothRef = movingAverage(ref, smoothing);
  report.medianLuminance = medianOfSeen(smoothLum);
  std::vector<double> ratio(count);
  for (std::size_t i = 0; i < count; ++i) ratio[i] = smoothLum[i] / std::max(smoothRef[i], darkestReference);
  // The markings' tint of the ring: the median ratio, then the median again
  // without the strong spots and a skirt of their own width either side, so
  // that the spots and their approach do not pull down (or up) their own
  // reference.
  double tint = medianOfSeen(ratio);
  if (!(tint > 0)) return report;
  for (std::size_t i = 0; i < count; ++i)
    if (!seen[i]) ratio[i] = tint;
  std::vector<bool> quiet(seen);
  for (const auto& [first, last] : runsBeyond(ratio, tint, 2 * threshold)) {
    const int w = last - first + 1;
    for (int i = first - w; i <= last + w; ++i) quiet[std::size_t(((i % n) + n) % n)] = false;
  }
  std::vector<double> background;
  for (std::size_t i = 0; i < count; ++i)
    if (quiet[i]) background.push_back(ratio[i]);
  if (background.size() >= count / 10) tint = medianOf(background);
  for (std::size_t i = 0; i < count; ++i)
    if (!seen[i]) ratio[i] = tint;
  report.markTint = tint - 1.0;
  // Weber contrast of each bin against the tinted ring: the spot's
  // luminance over its surround's, were the surround the same place with
  // the markings' mean tint.
  std::vector<double> contrast(count);
  for (std::size_t i = 0; i < count; ++i) {
    contrast[i] = ratio[i] / tint - 1.0;
    report.strongestContrast = std::max(report.strongestContrast, std::abs(contrast[i]));
  }
  // Spots: runs of at least two bins beyond the threshold, each placed
  // across the ring against the markings' tint at each radius (computed
  // once, when there is a spot to place; a quarter of the ring's bins is
  // enough for a median).
  const std::vector<std::pair<int, int>> runs = joinNearRuns(runsBeyond(ratio, tint, threshold), ratio, tint, n);
  std::vector<double> radii, medians;
  if (!runs.empty()) {
    radii = profileRadii(ring, step);
    medians = circleMedians(images, radii, std::max(180, n / 4), step);
  }
  constexpr int minRun = 2;  // two pixels of ring length
  for (const auto& [first, last] : runs) {
    if (last - first + 1 < minRun) continue;
    const double sign = contrast[std::size_t(first % n)] > 0 ? 1.0 : -1.0;
    int peak = first;
    double weight = 0, moment = 0;
    for (int j = first; j <= last; ++j) {
      const double c = sign * contrast[std::size_t(j % n)];
      if (c > sign * contrast[std::size_t(peak % n)]) peak = j;
      weight += c;
      moment += c * j;
    }
    ImageSpot spot;
    spot.azimuth = wrapAngle(width * (moment / weight));
    spot.contrast = contrast[std::size_t(peak % n)];
    spot.width = width * (last - first + 1);
    spot.radius = peakRadius(images, spot.azimuth, width, sign, step, radii, medians);
    // The colour where the spot is strongest: on its peak across the ring.
    spot.colour = ringColour(image, camera, ring, width * peak, width, spot.radius, step);
    report.spots.push_back(spot);
  }
  std::sort(report.spots.begin(), report.spots.end(), [](const ImageSpot& a, const ImageSpot& b) { return a.azimuth < b.azimuth; });
  return report;
}

}  // namespace dm
