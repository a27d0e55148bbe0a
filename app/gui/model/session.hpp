// The GUI's state without any window or GL: the scenario being edited, the
// run it drives (stepped here on the GUI's own schedule with the core's
// step()), the plot series, and a full forecast run on a worker thread.
// Every control edits the scenario through this one path (the same
// key.path=value override and validation the command line's --set uses);
// an accepted edit that changes the motion restarts the run.
#pragma once
#include <cstdint>
#include <memory>
#include <mutex>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "app/gui/model/worker.hpp"
#include "app/review.hpp"
#include "core/dynamics.hpp"
#include "core/kinematics.hpp"
#include "core/advise.hpp"
#include "core/pattern.hpp"
#include "core/scenario.hpp"
#include "core/simulate.hpp"
#include "render/camera.hpp"
#include "render/expose.hpp"
#include "render/spots.hpp"

namespace dm::gui {

/// Slow-motion factor range: simulated seconds per wall second.
inline constexpr double minSpeed = 0.01;
inline constexpr double maxSpeed = 10.0;
/// Simulated time between plot points, s (fine enough for a 10 rev/s precession's wobble).
inline constexpr double plotInterval = 0.005;
/// Most integrator steps a forecast runs (about 0.4 GB of trajectory); a
/// longer run is forecast over its first this-many steps.
inline constexpr long maxForecastSteps = 3'000'000;

/// What became of an edit.
struct EditOutcome {
  bool accepted = false;
  bool restarted = false;  ///< the run began again from the launch
  std::string error;       ///< why it was refused (field, value, allowed range)
};

/// The plot series: one point every plotInterval of simulated time.
struct Timeline {
  std::vector<double> time_s, tilt_deg, precession_rev_s, spots_per_rev, energy_mJ, slip_mm_s;
  void clear();
  std::size_t size() const { return time_s.size(); }
};

/// The run in progress.
struct LiveRun {
  Params params;
  State state;                  ///< the state the next step starts from
  std::vector<Sample> recent;   ///< every step of the last keep seconds (lagging the state by one step)
  std::vector<Sample> record;   ///< one sample every run.sample_ms, from the launch
  Timeline timeline;
  long steps = 0, totalSteps = 0;
  std::optional<std::string> fault;  ///< why the run stopped early
  bool finished() const { return fault.has_value() || steps >= totalSteps; }
  /// The latest recorded sample (the launch before the first step).
  const Sample& now() const { return recent.back(); }
};

/// A finished forecast: the whole run of one revision of the scenario and
/// its pattern analysis (spots, drift, visible end per time window).
struct Forecast {
  std::uint64_t motionRevision = 0;
  RunResult run;
  PatternAnalysis pattern;
  bool truncated = false;  ///< covers only the first maxForecastSteps steps
};

/// One exposure of the observer camera over the latest stretch of the run,
/// and the spots found on it: the same observation, exposure and spot
/// detection as `dwellmark expose` (render/observe.hpp).
struct ObserverShot {
  Image image;          ///< what the observer perceives, linear light
  Camera camera;        ///< the camera it was taken with (maps lab points to pixels)
  double start = 0, end = 0;  ///< s, the exposed window of simulated time
  ExposureStats stats;
  SpotReport spots;     ///< spots found on the ring of the visible end (none when no end is raised)
  std::optional<End> visibleEnd;  ///< the raised end, whose marks make the spots
  std::string savedTo;  ///< file written for an export ("" for the live panel)
};

/// Side of the live observer picture, px (the panel shows it about this size).
inline constexpr int liveObserverSize = 256;
/// Simulated time between live observer refreshes, s.
inline constexpr double observerRefresh = 0.25;

/// How a design review ended.
struct ReviewOutcome {
  bool written = false;              ///< false: refused or failed, nothing written
  std::string folder;                ///< where it was asked for
  std::vector<std::string> files;    ///< the files written
  std::string message;               ///< why it was refused (field or folder, value, allowed range)
};

/// What one advance() did.
struct AdvanceReport {
  long steps = 0;
  bool behind = false;  ///< ran out of wall-time budget before reaching the target time
};

/// Nice increment of the session's workers when they run in the background
/// of a window (Session's `background`): they then get a core mostly when
/// the frame loop leaves it idle.
inline constexpr int backgroundNice = 5;

class Session {
 public:
  /// With `background`, the worker threads run at a lower priority than the
  /// caller (a window's frame loop); tests leave it off.
  explicit Session(Scenario scenario, std::string path = {}, bool background = false);

  const Scenario& scenario() const { return scenario_; }
  /// The file this scenario was opened from or last saved to ("" when new).
  const std::string& path() const { return path_; }
  /// True when the scenario differs from its file (or is new and edited).
  bool dirty() const;

  // ---- edits: every control comes through here --------------------------
  /// Sets a scenario field in file units (path as in the field table).
  EditOutcome setNumber(const std::string& path, double fileValue);
  /// Sets a choice, colour or text field.
  EditOutcome setText(const std::string& path, const std::string& value);
  /// Sets a field of marking `index` (path as in markingFields()).
  EditOutcome setMarkingNumber(std::size_t index, const std::string& path, double fileValue);
  EditOutcome setMarkingText(std::size_t index, const std::string& path, const std::string& value);
  EditOutcome addMarking();
  EditOutcome removeMarking(std::size_t index);
  /// Extra traced rim points (analysis.trace_points).
  EditOutcome addTracePoint();
  EditOutcome removeTracePoint(std::size_t index);
  /// Replaces the whole scenario (preset, flick); restarts when the motion changes.
  EditOutcome replace(const Scenario& next);
  /// Replaces the launch with the next visitor flick drawn from the scenario's launch spread and seed.
  EditOutcome flick();
  /// How many flicks have been drawn since the scenario was opened.
  std::uint64_t flickCount() const { return flicks_; }

  /// Bumped by every accepted edit / by every restart / by body or paint changes.
  std::uint64_t revision() const { return revision_; }
  std::uint64_t motionRevision() const { return motionRevision_; }
  std::uint64_t lookRevision() const { return lookRevision_; }

  // ---- files -------------------------------------------------------------
  /// Loads a scenario file (throws ScenarioError; the session is unchanged then).
  void open(const std::string& path);
  /// Writes the scenario as JSON, atomically (throws OutputError), and remembers the path.
  void saveAs(const std::string& path);
  /// A fresh default scenario with no file.
  void reset(Scenario s);

  // ---- transport ---------------------------------------------------------
  void play() { playing_ = true; }
  void pause() { playing_ = false; }
  void togglePlay() { playing_ = !playing_; }
  bool playing() const { return playing_ && !live_.finished(); }
  /// Speed factor, clamped to [minSpeed, maxSpeed].
  void setSpeed(double factor);
  double speed() const { return speed_; }
  /// Back to the launch state (keeps the play/pause setting).
  void restart();
  /// One integrator step, whether playing or not.
  void stepOnce();
  /// Steps while playing until the simulated clock has moved `wallSeconds`
  /// times the speed, or `budgetSeconds` of wall time is spent (then the
  /// lag is dropped: the run slows down rather than piling up debt).
  AdvanceReport advance(double wallSeconds, double budgetSeconds);
  /// Seconds of dense history kept for traces and exposures (0.1..20).
  void setKeepSeconds(double seconds);
  const LiveRun& live() const { return live_; }

  // ---- forecast (worker thread) -------------------------------------------
  /// Picks up a finished forecast; call once a frame.
  void poll();
  /// The forecast of the current motion, if finished.
  const Forecast* forecast() const;
  /// The forecast's pattern window holding simulated time t (the latest
  /// one starting at or before t), if any.
  const PatternWindow* patternAt(double t) const;
  bool forecastBusy() const { return forecastWorker_.busy(); }
  double forecastProgress() const { return forecastWorker_.progress(); }
  /// Blocks until the forecast is done (scripted runs and tests).
  void waitForForecast();
  // ---- observer camera (worker thread) -------------------------------------
  /// Starts an exposure of the last observer.exposure_s of the run at
  /// `size` px (square); with `exportPath`, the picture is also written
  /// there as PNG. False (with a warning) when the run has too little history.
  bool requestObserverShot(int size, const std::string& exportPath = {});
  /// Starts a live refresh when none is running and the run has moved on by
  /// observerRefresh since the last picture; call once a frame.
  void refreshObserver();
  /// The latest finished picture, if any.
  const ObserverShot* observerShot() const { return shot_ ? &*shot_ : nullptr; }
  bool observerBusy() const { return observerWorker_.busy(); }
  /// Blocks until the observer camera is done (scripted runs and tests).
  void waitForObserver();
  /// The window of simulated time an exposure ending now would cover, s
  /// (start > end when there is not yet enough motion).
  std::pair<double, double> observerWindow() const;

  // ---- dimension advisor (worker thread) ----------------------------------
  /// Starts the advisor for `spots` over precessions [from, to] rad/s on the
  /// current cross-section (core adviseLength; refused arguments become a warning).
  void requestAdvice(int spots, double from, double to);
  /// The latest finished advice, if any.
  const DimensionAdvice* advice() const { return advice_ ? &*advice_ : nullptr; }
  bool adviceBusy() const { return adviceWorker_.busy(); }

  // ---- design review (worker thread) ---------------------------------------
  /// Starts writing the design review of the current scenario into
  /// `folder`: app::writeReview, the same report as `dwellmark review`
  /// (folder rules included: new or empty unless options.force). A
  /// refusal or failure becomes the outcome's message.
  void requestReview(const std::string& folder, app::ReviewOptions options);
  bool reviewBusy() const { return reviewWorker_.busy(); }
  /// The stage the running review has reached ("" when none runs).
  std::string reviewStage() const;
  /// The last finished review, if any.
  const ReviewOutcome* reviewOutcome() const { return review_ ? &*review_ : nullptr; }
  /// How many reviews have finished (written or not): a change means a new outcome.
  std::uint64_t reviewsFinished() const { return reviewsFinished_; }
  /// Blocks until the review is done (tests).
  void waitForReview();

  /// Messages the session wants shown (refused edits, faults, job errors), oldest first.
  const std::vector<std::string>& warnings() const { return warnings_; }
  void clearWarnings() { warnings_.clear(); }

 private:
  /// What an accepted edit invalidates.
  struct Effect {
    bool motion = false, look = false, analysis = false;
  };
  static Effect effectOf(const std::string& path);
  EditOutcome applyDocument(const nlohmann::json& doc, Effect effect);
  EditOutcome commit(Scenario next, Effect effect);
  nlohmann::json editableDocument() const;
  void stepLive();
  void record(const State& before, const Sample& sample);
  void startForecast();
  void pollReview();
  void warn(std::string message);

  Scenario scenario_;
  std::string path_;
  nlohmann::json savedJson_;  ///< the file's content as last read or written
  LiveRun live_;
  bool playing_ = true;
  bool provisionalNow_ = false;  ///< recent.back() is the launch, recorded before its first step
  double speed_ = 1.0;
  double keepSeconds_ = 2.0;
  double targetTime_ = 0;
  std::uint64_t revision_ = 0, motionRevision_ = 0, lookRevision_ = 0, flicks_ = 0;
  std::optional<Forecast> forecast_;
  std::vector<std::string> warnings_;
  std::optional<ObserverShot> shot_;
  std::optional<DimensionAdvice> advice_;
  double lastShotRequest_ = -1e9;  ///< simulated time of the last live request, s
  std::optional<ReviewOutcome> review_;
  std::uint64_t reviewsFinished_ = 0;
  std::string reviewFolder_;  ///< folder of the review asked for last
  /// The running review's stage, written by the worker, read by the UI.
  struct ReviewStage {
    mutable std::mutex mutex;
    std::string text;
  };
  std::shared_ptr<ReviewStage> reviewStage_ = std::make_shared<ReviewStage>();
  Worker<Forecast> forecastWorker_;  // workers last: they stop before the members above go
  Worker<ObserverShot> observerWorker_;
  Worker<DimensionAdvice> adviceWorker_;
  Worker<ReviewOutcome> reviewWorker_;
};

/// True when a change of this field path changes the motion (and so restarts the run).
bool changesMotion(const std::string& path);
/// True when a change of this field path changes how the body looks.
bool changesLook(const std::string& path);
/// True when a change of this field path changes the forecast's pattern
/// analysis without changing the motion (paint, analysis settings).
bool changesAnalysis(const std::string& path);

}  // namespace dm::gui
