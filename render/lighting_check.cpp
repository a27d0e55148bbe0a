#include "render/lighting_check.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"
#include "core/safety.hpp"

namespace dm {

namespace {

// The window whose stops set the beat: the first showing spots, else the
// first with stops of a raised end.
const PatternWindow* beatWindow(const std::vector<PatternWindow>& windows) {
  for (const PatternWindow& w : windows)
    if ((w.kind == PatternKind::Stationary || w.kind == PatternKind::Creeping) && !w.spots.empty()) return &w;
  for (const PatternWindow& w : windows)
    if (w.visibleEnd && w.stopCount > 1) return &w;
  return nullptr;
}

// Stops per second of one mark and the median dwell, over the visible end's
// stops in [t0, t1]; false when no mark stops twice there.
bool stopRateIn(const PatternAnalysis& a, End visible, double t0, double t1, double& rate, double& dwell) {
  std::vector<std::vector<double>> times(a.points.size());
  std::vector<double> dwells;
  for (const StopEvent& s : a.stops)
    if (s.end == visible && s.time >= t0 && s.time <= t1) {
      times[s.point].push_back(s.time);
      if (s.dwell > 0) dwells.push_back(s.dwell);
    }
  double sumRate = 0;
  int marks = 0;
  for (const auto& t : times)
    if (t.size() > 1) {
      sumRate += double(t.size() - 1) / (t.back() - t.front());
      ++marks;
    }
  if (marks == 0) return false;
  rate = sumRate / marks;
  std::sort(dwells.begin(), dwells.end());
  dwell = dwells.empty() ? 0 : dwells[dwells.size() / 2];
  return true;
}

double sinc(double x) { return x == 0 ? 1.0 : std::sin(x) / x; }

}  // namespace

std::optional<StopBeat> stopBeat(const LightFlicker& flicker, const PatternAnalysis& pattern, double threshold) {
  const std::vector<ModulationComponent> spectrum = modulationSpectrum(flicker);
  const PatternWindow* w = beatWindow(pattern.windows);
  if (spectrum.empty() || !w) return std::nullopt;
  StopBeat b;
  if (!stopRateIn(pattern, *w->visibleEnd, w->start, w->end, b.stopRate, b.dwell)) return std::nullopt;
  b.spots = std::max<int>(1, int(w->spots.size()));
  b.visitRate = b.stopRate / b.spots;
  // The component whose light, averaged over a dwell, changes most from visit to visit.
  for (const ModulationComponent& c : spectrum) {
    const double modulation = c.amplitude * std::abs(sinc(k::pi * c.frequency * b.dwell));
    if (modulation <= b.modulation) continue;
    b.modulation = modulation;
    b.lightFrequency = c.frequency;
    b.beatFrequency = std::abs(c.frequency - std::round(c.frequency / b.visitRate) * b.visitRate);
  }
  b.visible = b.modulation >= threshold;
  return b;
}

LightingCheck lightingCheck(const Scenario& s, const PatternAnalysis& pattern) {
  LightingCheck c;
  c.flicker = flickerOf(s.lighting);
  c.modulationPercent = modulationPercent(c.flicker);
  c.lowRiskLimitPercent = ieee1789LowRiskLimitPercent(c.flicker.frequency);
  c.lowRisk = ieee1789LowRisk(c.flicker);
  c.svm = stroboscopicVisibility(modulationSpectrum(c.flicker));
  c.svmVisible = c.svm >= 1;
  c.beat = stopBeat(c.flicker, pattern, s.observer.spotThreshold);
  c.flashRate = flashRate(s.lighting);
  c.flashWarning = c.flashRate > maxFlashesPerSecond;
  return c;
}

}  // namespace dm
