#include "app/review.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"
#include "core/export.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

using json = nlohmann::json;

void tell(const ReviewOptions& o, const std::string& what) {
  if (o.progress) o.progress(what);
}

// The options' ranges, checked before anything runs.
void checkOptions(const ReviewOptions& o) {
  auto range = [](const std::string& name, double v, double lo, double hi) {
    if (!(v >= lo && v <= hi))
      throw ScenarioError(name, "value " + fmt(v, 10) + " is out of range; allowed " + fmt(lo, 10) + " to " + fmt(hi, 10));
  };
  range("launches", o.launches, 1, 100000);
  range("threads", o.threads, 0, 1024);
  range("image_size_px", o.imageSize, 16, 4096);
  range("viewer_image_size_px", o.viewerImageSize, 16, 4096);
}

// The scenario as reviewed: the duration override applied, the observer's
// window moved inside the run when the run is shorter.
Scenario reviewedScenario(const Scenario& s, const ReviewOptions& o) {
  Scenario r = s;
  if (o.duration) r.run.duration = *o.duration;
  if (r.observer.exposure > r.run.duration)
    throw ScenarioError("run.duration_s", "value " + fmt(r.run.duration, 10) + " s is shorter than observer.exposure_s (" +
                                              fmt(r.observer.exposure, 10) + " s); allowed at least that");
  r.observer.start = std::min(r.observer.start, r.run.duration - r.observer.exposure);
  validate(r);
  return r;
}

// The first pattern window that starts after the settle and precesses, or none.
const PatternWindow* settledWindow(const RunResult& run, const PatternAnalysis& p) {
  if (!run.summary.settleTime) return nullptr;
  for (const PatternWindow& w : p.windows)
    if (w.start >= *run.summary.settleTime && std::abs(w.meanPrecession) > 0) return &w;
  return nullptr;
}

// Steady predictions: at the nominal run's settled precession with the
// centre orbit measured in that window (so the prediction describes the
// motion the run makes), and, with the centre still, at three multiples of
// the lowest steady precession (below it for a squat body, whose rolling
// branch lies there).
std::vector<SteadyRow> steadyRows(const Cylinder& body, double minPrecession, const PatternWindow* settled) {
  std::vector<SteadyRow> rows;
  if (settled) {
    SteadyRow r;
    r.precession = std::abs(settled->meanPrecession);
    r.label = "the nominal launch after settling";
    r.orbit = settled->centreOrbit.value_or(0.0);
    r.measured = MeasuredWindow{settled->start, settled->end, settled->meanTilt, settled->spotsPerRev};
    r.result = patternAtPrecession(body, r.precession, CentreOrbit{r.orbit});
    rows.push_back(r);
  }
  const bool squat = squatBody(body);
  for (double f : squat ? std::vector<double>{0.5, 0.7, 0.9} : std::vector<double>{1.1, 1.5, 2.0}) {
    SteadyRow r;
    r.precession = f * minPrecession;
    r.label = fmt(f, 2) + " x the lowest steady precession";
    r.result = patternAtPrecession(body, r.precession);
    rows.push_back(r);
  }
  return rows;
}

// The advisor's question: the spot count the design shows once settled (or
// the whole number nearest L/D), over the precessions of the steady rows.
void adviseOn(VariantReview& v) {
  const Cylinder body = cylinderOf(v.scenario.body);
  int n = int(std::lround(v.scenario.body.length / v.scenario.body.outerDiameter));
  if (!v.steady.empty() && v.steady.front().result.found) n = v.steady.front().result.spin.nearestSpots;
  v.adviceSpots = std::clamp(n, int(advise_input::spots.min), int(advise_input::spots.max));
  // The last three steady rows are the multiples of the lowest steady precession.
  v.adviceFrom = v.steady[v.steady.size() - 3].precession;
  v.adviceTo = v.steady.back().precession;
  try {
    v.advice = adviseLength(body, v.adviceSpots, v.adviceFrom, v.adviceTo);
  } catch (const std::invalid_argument& e) {
    v.advice.best.spots = v.adviceSpots;
    v.advice.best.reason = e.what();
  }
}

// The observer's two views of the nominal run, framed on the body's sweep.
void observe(VariantReview& v, const ReviewOptions& o) {
  Scenario top = v.scenario;
  top.observer.view = ViewKind::Top;
  top.observer.imageSize = o.imageSize;
  const double sweep = v.seen.ring.radius + v.scenario.body.length / 2 + v.scenario.body.outerDiameter;
  top.observer.viewSpan = std::clamp(2.4 * sweep, 0.01, 2.0);
  v.top = exposeObservation(top, v.seen, top.observer.start, o.threads);
  Scenario visitor = v.scenario;
  visitor.observer.view = ViewKind::Visitor;
  visitor.observer.imageSize = o.imageSize;
  visitor.observer.fieldOfView =
      framingFieldOfView(v.scenario, v.seen, visitor.observer.eyeHeight, visitor.observer.eyeDistance);
  v.visitor = exposeObservation(visitor, v.seen, visitor.observer.start, o.threads);
}

// ---- review.json ---------------------------------------------------------------

json orNull(double v) { return std::isfinite(v) ? json(v) : json(nullptr); }

json steadyJson(const VariantReview& v) {
  json rows = json::array();
  for (const SteadyRow& r : v.steady) {
    json j = {{"label", r.label},
              {"precession_rev_s", r.precession / k::twoPi},
              {"orbit_mm", r.orbit * 1e3},
              {"found", r.result.found}};
    if (r.result.found) {
      const SteadySpin& s = r.result.spin;
      j["tilt_deg"] = s.tilt / k::degree;
      j["spots_per_rev"] = s.spotsPerRev;
      j["nearest_spots"] = s.nearestSpots;
      j["n_ratio"] = s.fraction.spots > 0 ? json(ratioText(s.fraction.spots, s.fraction.revsPerVisit)) : json(nullptr);
      j["drift_deg_s"] = orNull(s.driftDegPerSecond);
      j["ceiling_height_mm"] = s.ceilingHeight * 1e3;
      j["contact_radius_mm"] = s.contactRadius * 1e3;
      j["friction_needed"] = s.frictionNeeded;
    }
    if (r.measured)
      j["measured"] = {{"start_s", r.measured->start},
                       {"end_s", r.measured->end},
                       {"tilt_deg", r.measured->tilt / k::degree},
                       {"spots_per_rev", r.measured->spotsPerRev ? json(*r.measured->spotsPerRev) : json(nullptr)}};
    rows.push_back(j);
  }
  return {{"min_precession_rev_s", v.minPrecession / k::twoPi}, {"rows", rows}};
}

json viewJson(const std::string& view, const ExposureResult& e) {
  return {{"view", view},
          {"image_size_px", e.exposure.image.width},
          {"start_s", e.start},
          {"spot_count", e.spots.spots.size()},
          {"strongest_contrast", e.spots.strongestContrast},
          {"threshold", e.spots.threshold},
          {"ring_radius_mm", e.spots.ring.radius * 1e3}};
}

json viewingJson(const std::vector<ViewingResult>& list) {
  json out = json::array();
  for (const ViewingResult& r : list)
    out.push_back({{"viewer", r.viewer.name},
                   {"eye_height_mm", r.viewer.eyeHeight * 1e3},
                   {"eye_above_table_mm", r.eyeAboveTable * 1e3},
                   {"distance_mm", r.distance * 1e3},
                   {"elevation_deg", r.elevation / k::degree},
                   {"spots", r.spots},
                   {"contrast", r.contrast},
                   {"threshold", r.threshold},
                   {"seen", r.seen},
                   {"image_size_px", r.image.width},
                   {"footprint_mm", r.footprint * 1e3},
                   {"resolved", r.resolved}});
  return out;
}

json lightingJson(const LightingCheck& c) {
  json j = {{"waveform", c.flicker.waveform == Waveform::None ? "none"
                         : c.flicker.waveform == Waveform::Sine ? "sine" : "rectified_mains"},
            {"frequency_hz", c.flicker.frequency},
            {"modulation_percent", c.modulationPercent},
            {"ieee1789_low_risk_limit_percent", orNull(c.lowRiskLimitPercent)},
            {"ieee1789_low_risk", c.lowRisk},
            {"svm", c.svm},
            {"svm_visible", c.svmVisible},
            {"flashes_per_s", c.flashRate},
            {"flash_warning", c.flashWarning}};
  if (!c.beat) return j;
  const StopBeat& b = *c.beat;
  j["stop_beat"] = {{"stop_rate_hz", b.stopRate},   {"spots", b.spots},
                    {"visit_rate_hz", b.visitRate}, {"dwell_ms", b.dwell * 1e3},
                    {"light_frequency_hz", b.lightFrequency}, {"beat_hz", b.beatFrequency},
                    {"modulation", b.modulation},   {"visible", b.visible}};
  return j;
}

json lengthJson(const LengthAdvice& a) {
  json j = {{"spots", a.spots}, {"found", a.found}};
  if (a.found) {
    j["length_mm"] = a.length * 1e3;
    j["worst_drift_deg_s"] = orNull(a.worst.driftDegPerSecond);
  } else {
    j["reason"] = a.reason;
  }
  return j;
}

json adviceJson(const VariantReview& v) {
  return {{"spots", v.adviceSpots},
          {"precession_rev_s", {{"from", v.adviceFrom / k::twoPi}, {"to", v.adviceTo / k::twoPi}}},
          {"fewer", lengthJson(v.advice.fewer)},
          {"recommended", lengthJson(v.advice.best)},
          {"more", lengthJson(v.advice.more)}};
}

json cautionsJson(const std::vector<Caution>& list) {
  json out = json::array();
  for (const Caution& c : list) out.push_back({{"topic", c.topic}, {"warning", c.warning}, {"text", c.text}});
  return out;
}

}  // namespace

VariantReview reviewVariant(const Scenario& input, const ReviewOptions& o) {
  checkOptions(o);
  VariantReview v;
  v.scenario = reviewedScenario(input, o);
  const Scenario& s = v.scenario;
  tell(o, s.name + ": the nominal launch");
  auto run = std::make_shared<const RunResult>(simulate(s));
  if (run->fault) throw ReviewFault(s.name + ": " + faultReport(*run->fault));
  v.nominal = run;
  v.pattern = analysePattern(s, *run);
  const Cylinder body = cylinderOf(s.body);
  v.minPrecession = minSteadyPrecession(body);
  v.steady = steadyRows(body, v.minPrecession, settledWindow(*run, v.pattern));
  tell(o, s.name + ": " + std::to_string(o.launches) + " visitor launches");
  EnsembleOptions e;
  e.launches = o.launches;
  e.threads = o.threads;
  e.seed = o.seed;
  v.ensemble = runEnsemble(s, e);
  tell(o, s.name + ": observer images and viewing check");
  v.seen = observeRun(s, run, s.observer.start, s.observer.start + s.observer.exposure);
  observe(v, o);
  v.viewing = viewingCheck(s, v.seen, o.viewerImageSize, o.threads);
  v.lighting = lightingCheck(s, v.pattern);
  adviseOn(v);
  std::vector<std::string> unseen;
  for (const ViewingResult& r : v.viewing)
    if (!r.seen) unseen.push_back(r.viewer.name);
  v.cautions = cautionsOf(s, v.ensemble.summary, unseen);
  return v;
}

json reviewJson(const std::vector<VariantReview>& variants) {
  json list = json::array();
  for (const VariantReview& v : variants) {
    json j;
    j["name"] = v.scenario.name;
    j["scenario"] = scenarioToJson(v.scenario);
    j["nominal_run"] = summaryJson(*v.nominal);
    j["steady"] = steadyJson(v);
    j["ensemble"] = ensembleJson(v.ensemble);
    j["observer"] = {viewJson("top", v.top), viewJson("visitor", v.visitor)};
    j["viewing"] = viewingJson(v.viewing);
    j["lighting"] = lightingJson(v.lighting);
    j["advice"] = adviceJson(v);
    j["cautions"] = cautionsJson(v.cautions);
    list.push_back(j);
  }
  return {{"dwellmark_review", 1}, {"variants", list}, {"safety_authority", safetyAuthority}};
}

std::vector<std::string> writeReview(const std::vector<Scenario>& scenarios, const std::string& dir,
                                     const ReviewOptions& options) {
  if (scenarios.empty()) throw ScenarioError("scenarios", "a review needs at least one design variant");
  checkOptions(options);
  checkOutputDir(dir, options.force);
  std::vector<VariantReview> variants;
  for (const Scenario& s : scenarios) variants.push_back(reviewVariant(s, options));
  tell(options, "writing the report");
  writeOutputs(dir, {{"review.html", reviewHtml(variants)}, {"review.json", jsonFileText(reviewJson(variants))}});
  return {dir + "/review.html", dir + "/review.json"};
}

}  // namespace dm::app
