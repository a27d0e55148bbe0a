// The design review: for each design variant, the parameters, the steady
// spin prediction, the visitor-launch ensemble, the observer's images, the
// viewing and lighting checks, the dimension advisor's suggestion and the
// cautions, written as one self-contained HTML page (images embedded,
// plots as inline SVG) and review.json. writeReview() is the one entry
// point: the `review` subcommand calls it, and so should any other front end.
#pragma once
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/advise.hpp"
#include "core/ensemble.hpp"
#include "core/pattern.hpp"
#include "core/safety.hpp"
#include "core/scenario.hpp"
#include "core/simulate.hpp"
#include "core/steady.hpp"
#include "render/lighting_check.hpp"
#include "render/observe.hpp"
#include "render/viewing_check.hpp"

namespace dm::app {

struct ReviewOptions {
  int launches = 200;                      ///< ensemble launches per variant, 1 to 100000
  int threads = 0;                         ///< worker threads, 0 = one per hardware thread; the output does not depend on it
  std::optional<std::uint64_t> seed;       ///< overrides each variant's launch.seed
  std::optional<double> duration;          ///< overrides run.duration of every run, s
  int imageSize = 240;                     ///< observer images (top and visitor views), px, 16 to 4096
  /// Largest viewing-check image, px, 16 to 4096: each is sized to resolve
  /// the markings (viewingImageSize), up to this.
  int viewerImageSize = 640;
  bool force = false;                      ///< write into a folder that already holds files
  std::function<void(const std::string&)> progress;  ///< told what is being done, stage by stage
};

/// A nominal run that stopped on a numerical fault: the review is not written.
class ReviewFault : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// What the nominal run measured over the pattern window a steady row stands for.
struct MeasuredWindow {
  double start = 0, end = 0;          ///< s
  double tilt = 0;                    ///< mean tilt, rad
  std::optional<double> spotsPerRev;  ///< the window's N
};

/// The steady spin at one precession and centre orbit.
struct SteadyRow {
  double precession = 0;                   ///< rad/s
  std::string label;                       ///< where the precession comes from
  double orbit = 0;                        ///< centre orbit solved with, m (CentreOrbit; 0: the centre still)
  std::optional<MeasuredWindow> measured;  ///< the run's window, for the nominal launch's row
  PatternResult result;                    ///< the pattern state there, if any
};

/// Everything the review shows of one variant.
struct VariantReview {
  Scenario scenario;
  std::shared_ptr<const RunResult> nominal;  ///< the scenario's own launch
  PatternAnalysis pattern;                   ///< of the nominal run
  double minPrecession = 0;                  ///< rad/s, lowest steady precession of the body
  std::vector<SteadyRow> steady;
  EnsembleResult ensemble;
  Observation seen;                          ///< the nominal run at observer.start_s
  ExposureResult top, visitor;               ///< the observer's two views
  std::vector<ViewingResult> viewing;
  LightingCheck lighting;
  int adviceSpots = 0;                       ///< n asked of the advisor
  double adviceFrom = 0, adviceTo = 0;       ///< rad/s, precession range asked
  DimensionAdvice advice;
  std::vector<Caution> cautions;
};

/// Computes the review of one validated scenario. Throws ReviewFault when
/// the nominal run stops on a numerical fault.
VariantReview reviewVariant(const Scenario& s, const ReviewOptions& options);

/// review.json: one object per variant, units in the keys.
nlohmann::json reviewJson(const std::vector<VariantReview>& variants);

/// The self-contained HTML page (no network access needed to view it).
std::string reviewHtml(const std::vector<VariantReview>& variants);

/// Reviews every scenario and writes DIR/review.html and DIR/review.json
/// (atomically, after every variant is computed; the folder through
/// prepareOutputDir). Returns the paths written. Throws ScenarioError for
/// bad options, ReviewFault for a faulted run, OutputError for the folder.
std::vector<std::string> writeReview(const std::vector<Scenario>& scenarios, const std::string& dir,
                                     const ReviewOptions& options);

}  // namespace dm::app
