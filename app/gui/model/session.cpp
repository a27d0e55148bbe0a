#include "app/gui/model/session.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>

#include "core/constants.hpp"
#include "core/launch_spread.hpp"
#include "core/io.hpp"
#include "core/launch.hpp"
#include "render/observe.hpp"

namespace dm::gui {

namespace {

bool startsWith(const std::string& s, const char* prefix) { return s.rfind(prefix, 0) == 0; }

// A number in the shortest text that reads back to the same double.
std::string exactText(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.17g", v);
  return buf;
}

// Most warnings kept: the metrics window shows the recent ones.
constexpr std::size_t maxWarnings = 50;

}  // namespace

bool changesMotion(const std::string& path) {
  if (path == "body.colour" || path == "body.bore_colour") return false;
  if (path == "surface.name" || path == "surface.colour" || path == "surface.grid_mm" ||
      path == "surface.table_radius_mm")
    return false;
  return startsWith(path, "body.") || startsWith(path, "surface.") || startsWith(path, "launch.") ||
         startsWith(path, "run.") || startsWith(path, "contact.");
}

bool changesLook(const std::string& path) { return startsWith(path, "body.") || startsWith(path, "markings."); }

bool changesAnalysis(const std::string& path) { return startsWith(path, "markings.") || startsWith(path, "analysis."); }

Session::Effect Session::effectOf(const std::string& path) {
  return {changesMotion(path), changesLook(path), changesAnalysis(path)};
}

void Timeline::clear() {
  for (auto* v : {&time_s, &tilt_deg, &precession_rev_s, &spots_per_rev, &energy_mJ, &slip_mm_s}) v->clear();
}

Session::Session(Scenario scenario, std::string path, bool background)
    : scenario_(std::move(scenario)),
      path_(std::move(path)),
      forecastWorker_(background ? backgroundNice : 0),
      observerWorker_(background ? backgroundNice : 0),
      adviceWorker_(background ? backgroundNice : 0),
      reviewWorker_(background ? backgroundNice : 0) {
  savedJson_ = path_.empty() ? nlohmann::json() : scenarioToJson(scenario_);
  restart();
}

bool Session::dirty() const { return scenarioToJson(scenario_) != savedJson_; }

// ---- edits -----------------------------------------------------------------

// The scenario as a file document, with the keys an edit may need that the
// file form leaves out (a rod's wall, the density when a mass is given), so
// switching shape or mass mode keeps the values the user had.
nlohmann::json Session::editableDocument() const {
  nlohmann::json doc = scenarioToJson(scenario_);
  doc["body"]["wall_mm"] = findField("body.wall_mm")->getNumber(scenario_);
  return doc;
}

EditOutcome Session::setNumber(const std::string& path, double fileValue) {
  nlohmann::json doc = editableDocument();
  try {
    applyOverride(doc, path + "=" + exactText(fileValue));
  } catch (const ScenarioError& e) {
    return {false, false, e.what()};
  }
  // Mass and density are alternatives: a mass above zero replaces the density.
  if (path == "body.mass_g") {
    if (fileValue > 0) doc["body"].erase("density_kg_m3");
    else doc["body"]["density_kg_m3"] = findField("body.density_kg_m3")->getNumber(scenario_);
  }
  if (path == "body.density_kg_m3") doc["body"].erase("mass_g");
  return applyDocument(doc, effectOf(path));
}

EditOutcome Session::setText(const std::string& path, const std::string& value) {
  nlohmann::json doc = editableDocument();
  try {
    applyOverride(doc, path + "=\"" + value + "\"");
  } catch (const ScenarioError& e) {
    return {false, false, e.what()};
  }
  return applyDocument(doc, effectOf(path));
}

EditOutcome Session::setMarkingNumber(std::size_t index, const std::string& path, double fileValue) {
  return setNumber("markings." + std::to_string(index) + "." + path, fileValue);
}

EditOutcome Session::setMarkingText(std::size_t index, const std::string& path, const std::string& value) {
  return setText("markings." + std::to_string(index) + "." + path, value);
}

EditOutcome Session::addMarking() {
  Scenario next = scenario_;
  Marking m;  // a rim patch on end A: the commonest mark
  m.colour = {0.9, 0.1, 0.45};
  next.paint.markings.push_back(m);
  return commit(next, {false, true, true});
}

EditOutcome Session::removeMarking(std::size_t index) {
  if (index >= scenario_.paint.markings.size()) return {false, false, "markings: no marking " + std::to_string(index)};
  Scenario next = scenario_;
  next.paint.markings.erase(next.paint.markings.begin() + long(index));
  return commit(next, {false, true, true});
}

EditOutcome Session::addTracePoint() {
  Scenario next = scenario_;
  next.analysis.tracePoints.push_back(TracePointSpec{});
  return commit(next, {false, false, true});
}

EditOutcome Session::removeTracePoint(std::size_t index) {
  auto& points = scenario_.analysis.tracePoints;
  if (index >= points.size())
    return {false, false, "analysis.trace_points: no trace point " + std::to_string(index)};
  Scenario next = scenario_;
  next.analysis.tracePoints.erase(next.analysis.tracePoints.begin() + long(index));
  return commit(next, {false, false, true});
}

EditOutcome Session::replace(const Scenario& next) {
  const bool motion = scenarioToJson(next).dump() != scenarioToJson(scenario_).dump();
  return commit(next, {motion, true, true});
}

EditOutcome Session::flick() {
  Scenario next = scenario_;
  next.launch = drawLaunch(scenario_.launch, scenario_.launchSpread, scenario_.launch.seed, flicks_);
  const EditOutcome out = commit(next, {true, false, false});
  if (out.accepted) ++flicks_;
  return out;
}

// Parses the edited document through the field table: the one validation.
EditOutcome Session::applyDocument(const nlohmann::json& doc, Effect effect) {
  try {
    return commit(scenarioFromJson(doc), effect);
  } catch (const ScenarioError& e) {
    return {false, false, e.what()};
  }
}

EditOutcome Session::commit(Scenario next, Effect effect) {
  try {
    validate(next);
  } catch (const ScenarioError& e) {
    return {false, false, e.what()};
  }
  scenario_ = std::move(next);
  ++revision_;
  if (effect.look) ++lookRevision_;
  if (effect.motion) restart();
  else if (effect.analysis) startForecast();
  return {true, effect.motion, {}};
}

// ---- files -----------------------------------------------------------------

void Session::open(const std::string& path) {
  Scenario s = loadScenario(path);  // throws before anything changes
  scenario_ = std::move(s);
  path_ = path;
  savedJson_ = scenarioToJson(scenario_);
  flicks_ = 0;
  ++revision_;
  ++lookRevision_;
  restart();
}

void Session::saveAs(const std::string& path) {
  const nlohmann::json doc = scenarioToJson(scenario_);
  writeFileAtomic(path, doc.dump(2) + "\n");
  path_ = path;
  savedJson_ = doc;
}

void Session::reset(Scenario s) {
  scenario_ = std::move(s);
  path_.clear();
  savedJson_ = nlohmann::json();
  flicks_ = 0;
  ++revision_;
  ++lookRevision_;
  restart();
}

// ---- transport -------------------------------------------------------------

void Session::setSpeed(double factor) { speed_ = std::clamp(factor, minSpeed, maxSpeed); }

void Session::setKeepSeconds(double seconds) { keepSeconds_ = std::clamp(seconds, 0.1, 20.0); }

void Session::restart() {
  live_ = LiveRun{};
  live_.params = makeParams(scenario_);
  live_.state = launchState(live_.params, scenario_.launch);
  live_.totalSteps = long(std::llround(scenario_.run.duration / live_.params.timeStep));
  // The launch is shown at once; its exact record (with the first step's
  // contact report, as simulate() keeps it) replaces it after that step.
  live_.recent.push_back(sampleOf(live_.params, live_.state, contacts(live_.params, live_.state)));
  provisionalNow_ = true;
  targetTime_ = 0;
  lastShotRequest_ = -1e9;
  shot_.reset();  // a picture of the previous run would mislead
  ++motionRevision_;
  startForecast();
}

void Session::record(const State& before, const Sample& sample) {
  LiveRun& r = live_;
  if (provisionalNow_) {
    r.recent.back() = sample;
    provisionalNow_ = false;
  } else {
    r.recent.push_back(sample);
  }
  // Sparse record at the trajectory.csv row spacing.
  const long rowEvery = std::max(1L, long(std::llround(scenario_.run.sampleInterval / r.params.timeStep)));
  const long index = r.steps;  // index of `before` among the run's samples
  if (index % rowEvery == 0) r.record.push_back(sample);
  // Plot series.
  const long plotEvery = std::max(1L, long(std::llround(plotInterval / r.params.timeStep)));
  if (index % plotEvery == 0) {
    const AxisMotion m = axisMotion(sample.orientation, sample.spin);
    r.timeline.time_s.push_back(sample.t);
    r.timeline.tilt_deg.push_back(m.tilt / k::degree);
    r.timeline.precession_rev_s.push_back(m.precession / k::twoPi);
    r.timeline.spots_per_rev.push_back(m.precessing ? m.spotsPerRev : 0.0);
    r.timeline.energy_mJ.push_back(energy(r.params, before) * 1e3);
    r.timeline.slip_mm_s.push_back(double(sample.slip) * 1e3);
  }
  // Drop dense history older than the keep window (in chunks, amortised).
  const std::size_t keep = std::size_t(keepSeconds_ / r.params.timeStep) + 2;
  if (r.recent.size() > 2 * keep) r.recent.erase(r.recent.begin(), r.recent.end() - long(keep));
}

void Session::stepLive() {
  LiveRun& r = live_;
  if (r.finished()) return;
  const State before = r.state;
  const ContactReport c = step(r.params, r.state);
  record(before, sampleOf(r.params, before, c));
  ++r.steps;
  if (!healthy(r.state)) {
    r.fault = "numerical fault at t = " + fmt(r.state.t, 6) + " s (non-finite or runaway state); the run stopped";
    warn(*r.fault);
    return;
  }
  // The last state of the run is recorded with its own contacts, as simulate() does.
  if (r.steps == r.totalSteps) record(r.state, sampleOf(r.params, r.state, contacts(r.params, r.state)));
}

void Session::stepOnce() { stepLive(); }

AdvanceReport Session::advance(double wallSeconds, double budgetSeconds) {
  AdvanceReport report;
  if (!playing()) return report;
  using Clock = std::chrono::steady_clock;
  const auto start = Clock::now();
  targetTime_ = std::max(targetTime_, live_.state.t) + wallSeconds * speed_;
  const double h = live_.params.timeStep;
  while (!live_.finished() && live_.state.t + h / 2 < targetTime_) {
    stepLive();
    ++report.steps;
    // Check the clock every 64 steps (a few tens of microseconds).
    if (report.steps % 64 == 0 && std::chrono::duration<double>(Clock::now() - start).count() > budgetSeconds) {
      report.behind = true;
      targetTime_ = live_.state.t;
      break;
    }
  }
  return report;
}

// ---- forecast ----------------------------------------------------------------

void Session::startForecast() {
  forecast_.reset();
  const Scenario s = scenario_;
  const std::uint64_t revision = motionRevision_;
  forecastWorker_.submit([s, revision](JobControl& control) {
    SimulateOptions options;
    const long steps = long(std::llround(s.run.duration / s.run.timeStep()));
    const bool truncated = steps > maxForecastSteps;
    if (truncated) options.duration = double(maxForecastSteps) * s.run.timeStep();
    // Progress reports double as cancellation points.
    options.progress = [&control](double f) {
      control.progress = f;
      control.check();
    };
    Forecast f;
    f.motionRevision = revision;
    f.run = simulate(s, options);
    f.truncated = truncated;
    control.check();
    f.pattern = analysePattern(s, f.run);
    return f;
  });
}

void Session::poll() {
  if (auto f = forecastWorker_.take(); f && f->motionRevision == motionRevision_) forecast_ = std::move(*f);
  if (auto e = forecastWorker_.takeError()) warn("forecast failed: " + *e);
  if (auto shot = observerWorker_.take()) {
    if (!shot->savedTo.empty()) warn("wrote " + shot->savedTo);
    shot_ = std::move(*shot);
  }
  if (auto e = observerWorker_.takeError()) warn("observer camera failed: " + *e);
  if (auto a = adviceWorker_.take()) advice_ = std::move(*a);
  if (auto e = adviceWorker_.takeError()) warn("advisor: " + *e);
  pollReview();
}

const Forecast* Session::forecast() const { return forecast_ ? &*forecast_ : nullptr; }

const PatternWindow* Session::patternAt(double t) const {
  if (!forecast_) return nullptr;
  const PatternWindow* found = nullptr;
  for (const PatternWindow& w : forecast_->pattern.windows)
    if (w.start <= t) found = &w;
  return found;
}

void Session::waitForForecast() {
  forecastWorker_.wait();
  poll();
}

// ---- observer camera ---------------------------------------------------------

std::pair<double, double> Session::observerWindow() const {
  const double end = live_.now().t;
  const ObserverSpec& o = scenario_.observer;
  // A camera exposes what has happened so far; the eye needs its whole window.
  const double start = o.mode == ExposureMode::Camera ? std::max(0.0, end - o.exposure) : end - o.exposure;
  return {start, end};
}

bool Session::requestObserverShot(int size, const std::string& exportPath) {
  // Named copies, not a structured binding: clang 14 (the sanitizer build) cannot capture those.
  const std::pair<double, double> span = observerWindow();
  const double start = span.first, end = span.second;
  if (!(start >= 0 && end > start) || start < live_.recent.front().t) {
    if (!exportPath.empty()) warn("the run has not yet moved for observer.exposure_s; no picture written");
    return false;
  }
  // The dense samples covering the window, copied for the worker as a run
  // of its own: the observation chain of `dwellmark expose` reads it.
  auto run = std::make_shared<RunResult>();
  run->params = live_.params;
  for (const Sample& smp : live_.recent)
    if (smp.t >= start - 2 * live_.params.timeStep && smp.t <= end) run->trajectory.samples.push_back(smp);
  Scenario s = scenario_;
  s.observer.imageSize = size;
  s.observer.exposure = end - start;  // shorter than asked only while a camera's run is younger than its exposure
  observerWorker_.submit([s, run, start, end, exportPath](JobControl&) {
    const Observation seen = observeRun(s, run, start, end);
    // One thread: the other core keeps the window responsive; the picture is the same.
    const ExposureResult e = exposeObservation(s, seen, start, 1);
    ObserverShot shot;
    shot.image = e.exposure.image;
    shot.camera = e.camera;
    shot.stats = e.exposure.stats;
    shot.spots = e.spots;
    shot.visibleEnd = seen.visibleEnd;
    shot.start = start;
    shot.end = end;
    if (!exportPath.empty()) {
      writePng(exportPath, shot.image);
      shot.savedTo = exportPath;
    }
    return shot;
  });
  return true;
}

void Session::refreshObserver() {
  if (observerWorker_.busy()) return;
  const double now = live_.now().t;
  if (shot_ && now - lastShotRequest_ < observerRefresh && now >= lastShotRequest_) return;
  if (requestObserverShot(liveObserverSize)) lastShotRequest_ = now;
}

void Session::waitForObserver() {
  observerWorker_.wait();
  poll();
}

void Session::requestAdvice(int spots, double from, double to) {
  const Cylinder section = cylinderOf(scenario_.body);
  adviceWorker_.submit([section, spots, from, to](JobControl&) { return adviseLength(section, spots, from, to); });
}

// ---- design review -------------------------------------------------------------

void Session::requestReview(const std::string& folder, app::ReviewOptions options) {
  const std::vector<Scenario> variants{scenario_};
  reviewFolder_ = folder;
  auto stage = reviewStage_;
  {
    std::lock_guard lock(stage->mutex);
    stage->text = "starting";
  }
  reviewWorker_.submit([variants, folder, options, stage](JobControl& control) mutable {
    // Each stage the review reports is shown, and is a point where a newer request cancels it.
    options.progress = [&control, stage](const std::string& what) {
      control.check();
      std::lock_guard lock(stage->mutex);
      stage->text = what;
    };
    ReviewOutcome out;
    out.folder = folder;
    out.files = app::writeReview(variants, folder, options);
    out.written = true;
    return out;
  });
}

// Picks up a finished review: its files, or why it wrote nothing.
void Session::pollReview() {
  std::optional<ReviewOutcome> done = reviewWorker_.take();
  if (const std::optional<std::string> error = reviewWorker_.takeError()) {
    done = ReviewOutcome{};
    done->folder = reviewFolder_;
    done->message = *error;
  }
  if (!done) return;
  review_ = std::move(done);
  ++reviewsFinished_;
  std::lock_guard lock(reviewStage_->mutex);
  reviewStage_->text.clear();
}

std::string Session::reviewStage() const {
  std::lock_guard lock(reviewStage_->mutex);
  return reviewStage_->text;
}

void Session::waitForReview() {
  reviewWorker_.wait();
  poll();
}

void Session::warn(std::string message) {
  warnings_.push_back(std::move(message));
  if (warnings_.size() > maxWarnings) warnings_.erase(warnings_.begin());
}

}  // namespace dm::gui
