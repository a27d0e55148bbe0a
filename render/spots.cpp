#include "render/spots.hpp"

#include <algorithm>
#include <cmath>

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

// The colour seen at ring azimuth `phi` and radius `radius`, averaged over
// three points a footprint apart across the ring.
Rgb ringColour(const Image& img, const Camera& camera, const Ring& ring, double phi, double radius, double step) {
  Rgb sum;
  int n = 0;
  for (int k = -1; k <= 1; ++k) {
    const double r = radius + k * step;
    const Vec3 p = ring.centre + Vec3(r * std::cos(phi), r * std::sin(phi), 0);
    double x, y;
    if (!camera.project(p, x, y)) continue;
    const Rgb c = sampleAt(img, x, y);
    sum = {sum.r + c.r, sum.g + c.g, sum.b + c.b};
    ++n;
  }
  return n > 0 ? Rgb{sum.r / n, sum.g / n, sum.b / n} : Rgb{};
}

// Where across the ring, within a third of its radius, the contrast at
// azimuth `phi` peaks with the spot's sign.
double peakRadius(const Image& img, const Camera& camera, const Ring& ring, double phi, double median, double sign,
                  double step) {
  double best = ring.radius, bestValue = -1e300;
  const int reach = int(std::ceil(ring.radius / 3 / step));
  for (int k = -reach; k <= reach; ++k) {
    const double r = ring.radius + k * step;
    if (r <= 0) continue;
    const double c = sign * (luminance(ringColour(img, camera, ring, phi, r, step)) / median - 1.0);
    if (c > bestValue) {
      bestValue = c;
      best = r;
    }
  }
  return best;
}

}  // namespace

SpotReport findSpots(const Image& img, const Camera& camera, const Ring& ring, double threshold) {
  SpotReport report;
  report.ring = ring;
  report.threshold = threshold;
  // Sample the ring at least twice per pixel of its length.
  const double step = camera.footprintAt(ring.centre);
  const int n = std::max(720, int(std::ceil(2.0 * k::twoPi * ring.radius / step)));
  const std::size_t count = static_cast<std::size_t>(n);
  std::vector<Rgb> colour(count);
  std::vector<double> lum(count);
  for (int i = 0; i < n; ++i) {
    colour[std::size_t(i)] = ringColour(img, camera, ring, k::twoPi * i / n, ring.radius, step);
    lum[std::size_t(i)] = luminance(colour[std::size_t(i)]);
  }
  std::vector<double> sorted = lum;
  std::nth_element(sorted.begin(), sorted.begin() + n / 2, sorted.end());
  report.medianLuminance = sorted[std::size_t(n / 2)];
  if (!(report.medianLuminance > 0)) return report;
  std::vector<double> contrast(count);
  for (int i = 0; i < n; ++i) {
    contrast[std::size_t(i)] = lum[std::size_t(i)] / report.medianLuminance - 1.0;
    report.strongestContrast = std::max(report.strongestContrast, std::abs(contrast[std::size_t(i)]));
  }
  // Sign of a sample: +1 bright, -1 dark, 0 within the threshold.
  auto signAt = [&](int i) {
    const double c = contrast[std::size_t(((i % n) + n) % n)];
    return c > threshold ? 1 : c < -threshold ? -1 : 0;
  };
  // Start at a quiet sample so no run wraps round the start.
  int start = 0;
  while (start < n && signAt(start) != 0) ++start;
  if (start == n) return report;
  constexpr int minRun = 2;  // a pixel of ring length: two samples
  for (int i = start + 1; i < start + n;) {
    const int s = signAt(i);
    if (s == 0) {
      ++i;
      continue;
    }
    int j = i;
    int peak = i;
    while (j < start + n && signAt(j) == s) {
      if (s * contrast[std::size_t(j % n)] > s * contrast[std::size_t(peak % n)]) peak = j;
      ++j;
    }
    if (j - i >= minRun) {
      Spot spot;
      spot.azimuth = wrapAngle(k::twoPi * (peak % n) / n);
      spot.contrast = contrast[std::size_t(peak % n)];
      spot.width = k::twoPi * (j - i) / n;
      spot.colour = colour[std::size_t(peak % n)];
      spot.radius = peakRadius(img, camera, ring, spot.azimuth, report.medianLuminance, s, step);
      report.spots.push_back(spot);
    }
    i = j;
  }
  std::sort(report.spots.begin(), report.spots.end(), [](const Spot& a, const Spot& b) { return a.azimuth < b.azimuth; });
  return report;
}

}  // namespace dm
