// Room-light flicker: the modulation applied to every light over time, its
// Fourier content, and two published measures of whether it is seen or is a
// risk (CIE TN 006:2016 stroboscopic visibility, IEEE Std 1789-2015 limits).
// Plain functions, so a review report can call them without a camera.
#pragma once
#include <vector>

#include "core/scenario.hpp"

namespace dm {

/// How the lights' output varies in time. The factor has mean 1 over a
/// period and Michelson depth `depth` = (max - min) / (max + min).
struct LightFlicker {
  Waveform waveform = Waveform::None;
  double frequency = 100;  ///< modulation frequency, Hz (rectified mains: twice the line frequency), > 0
  double depth = 0;        ///< Michelson modulation depth, 0..1

  /// Light output multiplier at time t (s), >= 0, mean 1.
  double factor(double t) const;
};

/// The flicker of a scenario's lighting.
LightFlicker flickerOf(const LightingSpec& lighting);

/// One Fourier component of a modulation, amplitude relative to the mean.
struct ModulationComponent {
  double frequency = 0;  ///< Hz
  double amplitude = 0;  ///< relative to the mean light output, >= 0
};

/// The Fourier components of the flicker up to `maxFrequency` (Hz), in
/// closed form: a sine has one; the rectified shape A + B |sin(pi f t)| has
/// the harmonics k f of amplitude 4 B / (pi (4 k^2 - 1)).
std::vector<ModulationComponent> modulationSpectrum(const LightFlicker& flicker, double maxFrequency = 2000);

/// Visibility threshold of one sinusoidal component in the stroboscopic
/// visibility measure, T(f) = 2.865e-5 f^1.543 + 0.225 (CIE TN 006:2016,
/// from memory until checked). f in Hz.
double svmThreshold(double frequency);

/// Stroboscopic visibility measure SVM = (sum (C_m / T(f_m))^3.7)^(1/3.7)
/// (CIE TN 006:2016, from memory until checked): 1 is the visibility
/// threshold of the stroboscopic effect. Components above 2 kHz are ignored.
double stroboscopicVisibility(const std::vector<ModulationComponent>& components);

/// Modulation in percent as IEEE Std 1789-2015 defines it: 100 (max - min) / (max + min).
double modulationPercent(const LightFlicker& flicker);

/// IEEE Std 1789-2015 low-risk limit on the modulation, percent, at a
/// flicker frequency f (Hz) (from memory): 0.025 f below 90 Hz, 0.08 f from
/// 90 Hz to 1250 Hz, no limit above (returns infinity there).
double ieee1789LowRiskLimitPercent(double frequency);

/// True when the modulation lies within the IEEE Std 1789-2015 low-risk limit.
bool ieee1789LowRisk(const LightFlicker& flicker);

}  // namespace dm
