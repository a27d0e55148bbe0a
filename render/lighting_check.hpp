// The lighting check of a design review: how visible the room light's
// flicker is (stroboscopic visibility measure, CIE TN 006:2016), whether
// its modulation lies in the IEEE Std 1789-2015 low-risk region, whether
// the spots' stops alias with it into a visible beat, and whether a strobe
// or flashing light exceeds three flashes a second (WCAG 2.x SC 2.3.1).
// The measures themselves live in render/flicker.hpp; this file applies
// them to a design.
#pragma once
#include <optional>
#include <vector>

#include "core/pattern.hpp"
#include "core/scenario.hpp"
#include "render/flicker.hpp"

namespace dm {

/// How the lights beat with the stops of the visible end's marks.
struct StopBeat {
  double stopRate = 0;         ///< Hz, stops of one mark per second
  int spots = 0;               ///< spots those stops are shared among (1 when no pattern is seen)
  double visitRate = 0;        ///< Hz, visits of one spot per second (stopRate / spots)
  double dwell = 0;            ///< s, median time a mark stays still at a stop
  double lightFrequency = 0;   ///< Hz, the light's component that beats most visibly
  double beatFrequency = 0;    ///< Hz, its alias against the visits: |f - k visitRate|, 0 to visitRate / 2
  /// Change of a spot's brightness from visit to visit, relative to its
  /// mean: the component's amplitude times |sin(pi f dwell) / (pi f dwell)|
  /// (the dwell averages the light).
  double modulation = 0;
  bool visible = false;        ///< modulation at least the scenario's spot detection threshold
};

/// The stop beat of a run's stops over the pattern windows: the first window
/// showing spots (else the first with stops of a raised end). None without
/// modulated light or without stops.
std::optional<StopBeat> stopBeat(const LightFlicker& flicker, const PatternAnalysis& pattern, double threshold);

struct LightingCheck {
  LightFlicker flicker;
  double modulationPercent = 0;    ///< IEEE Std 1789-2015 definition
  double lowRiskLimitPercent = 0;  ///< IEEE Std 1789-2015 low-risk limit at the flicker frequency (infinite above 1250 Hz)
  bool lowRisk = true;
  double svm = 0;                  ///< stroboscopic visibility measure, CIE TN 006:2016 (1 = visibility threshold)
  bool svmVisible = false;         ///< svm >= 1
  std::optional<StopBeat> beat;
  double flashRate = 0;            ///< flashes per second (core/safety.hpp flashRate)
  bool flashWarning = false;       ///< more than three flashes a second
};

/// The lighting check of scenario `s` with the pattern analysis of its run.
LightingCheck lightingCheck(const Scenario& s, const PatternAnalysis& pattern);

}  // namespace dm
