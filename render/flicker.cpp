#include "render/flicker.hpp"

#include <cmath>
#include <limits>

#include "core/constants.hpp"

namespace dm {

namespace {

// Coefficients of the rectified shape A + B |sin(pi f t)| with mean 1 and
// Michelson depth d: max A + B, min A, so d = B / (2 A + B), and the mean of
// |sin| is 2 / pi, so A + 2 B / pi = 1.
struct RectifiedShape {
  double offset = 1, scale = 0;
};

RectifiedShape rectifiedShape(double depth) {
  if (depth <= 0) return {};
  const double scale = 1.0 / ((1.0 - depth) / (2.0 * depth) + 2.0 / k::pi);
  return {scale * (1.0 - depth) / (2.0 * depth), scale};
}

// Frequency limits of the stroboscopic visibility sum, Hz (CIE TN 006:2016, from memory).
constexpr double svmMaxFrequency = 2000;
constexpr double svmExponent = 3.7;

}  // namespace

double LightFlicker::factor(double t) const {
  switch (waveform) {
    case Waveform::None: return 1.0;
    case Waveform::Sine: return 1.0 + depth * std::sin(k::twoPi * frequency * t);
    case Waveform::RectifiedMains: {
      const RectifiedShape s = rectifiedShape(depth);
      return s.offset + s.scale * std::abs(std::sin(k::pi * frequency * t));
    }
  }
  return 1.0;
}

LightFlicker flickerOf(const LightingSpec& l) { return {l.flicker, l.flickerFrequency, l.flickerDepth}; }

std::vector<ModulationComponent> modulationSpectrum(const LightFlicker& f, double maxFrequency) {
  std::vector<ModulationComponent> out;
  if (f.waveform == Waveform::None || f.depth <= 0) return out;
  if (f.waveform == Waveform::Sine) {
    if (f.frequency <= maxFrequency) out.push_back({f.frequency, f.depth});
    return out;
  }
  // |sin(x)| = 2/pi - (4/pi) sum_k cos(2 k x) / (4 k^2 - 1); with x = pi f t
  // the k-th harmonic sits at k f.
  const RectifiedShape s = rectifiedShape(f.depth);
  for (int harmonic = 1; harmonic * f.frequency <= maxFrequency; ++harmonic)
    out.push_back({harmonic * f.frequency, 4.0 * s.scale / (k::pi * (4.0 * harmonic * harmonic - 1.0))});
  return out;
}

double svmThreshold(double frequency) { return 2.865e-5 * std::pow(frequency, 1.543) + 0.225; }

double stroboscopicVisibility(const std::vector<ModulationComponent>& components) {
  double sum = 0;
  for (const ModulationComponent& c : components)
    if (c.frequency > 0 && c.frequency <= svmMaxFrequency) sum += std::pow(c.amplitude / svmThreshold(c.frequency), svmExponent);
  return std::pow(sum, 1.0 / svmExponent);
}

double modulationPercent(const LightFlicker& f) { return f.waveform == Waveform::None ? 0.0 : 100.0 * f.depth; }

double ieee1789LowRiskLimitPercent(double frequency) {
  if (frequency < 90) return 0.025 * frequency;
  if (frequency <= 1250) return 0.08 * frequency;
  return std::numeric_limits<double>::infinity();
}

bool ieee1789LowRisk(const LightFlicker& f) {
  return modulationPercent(f) <= ieee1789LowRiskLimitPercent(f.frequency);
}

}  // namespace dm
