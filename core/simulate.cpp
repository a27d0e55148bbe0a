#include "core/simulate.hpp"

#include <cmath>
#include <sstream>

#include "core/constants.hpp"
#include "core/kinematics.hpp"
#include "core/launch.hpp"

namespace dm {

namespace {

bool isRimRolling(Phase p) { return p == Phase::RollingA || p == Phase::RollingB; }

// Angular speed below which a body lying flat has stopped spinning and
// rolling, rad/s (about one revolution a minute).
constexpr double flatStoppedSpin = 0.1;

bool restLike(const Sample& s) {
  return s.phase == Phase::AtRest || (s.phase == Phase::LyingFlat && s.spin.norm() < flatStoppedSpin);
}

RunSummary summarise(const Params& p, const Trajectory& tr, End pressedEnd) {
  RunSummary r;
  r.pressedEnd = pressedEnd;
  r.phases = phaseSpans(tr);
  r.endTime = tr.endTime();
  for (const PhaseSpan& span : r.phases)
    if (isRimRolling(span.phase) && span.end - span.start >= k::settleHold) {
      r.settleTime = span.start;
      // Rolling on end A's rim means end A is down: the raised end is B.
      r.raisedEnd = span.phase == Phase::RollingA ? End::B : End::A;
      break;
    }
  // Rest: the final stretch, reaching the end of the run, that is rest-like.
  if (!tr.empty() && restLike(tr.samples.back())) {
    std::size_t i = tr.samples.size() - 1;
    while (i > 0 && restLike(tr.samples[i - 1])) --i;
    r.restTime = tr.samples[i].t;
  }
  const Vec3 start = tr.empty() ? Vec3::Zero() : tr.samples.front().position;
  for (std::size_t i = 0; i < tr.samples.size(); ++i) {
    const Sample& s = tr.samples[i];
    const Vec3 d = s.position - start;
    r.maxExcursion = std::max(r.maxExcursion, std::hypot(d.x(), d.y()));
    r.maxSurfaceSpeed = std::max(r.maxSurfaceSpeed, fastestSurfaceSpeed(p.body, s.orientation, s.velocity, s.spin));
  }
  return r;
}

}  // namespace

std::vector<PhaseSpan> phaseSpans(const Trajectory& t, double minSpan) {
  std::vector<PhaseSpan> raw;
  for (const Sample& s : t.samples) {
    if (raw.empty() || raw.back().phase != s.phase) raw.push_back({s.phase, s.t, s.t});
    raw.back().end = s.t;
  }
  // Close each span at the start of the next.
  for (std::size_t i = 0; i + 1 < raw.size(); ++i) raw[i].end = raw[i + 1].start;
  std::vector<PhaseSpan> merged;
  for (const PhaseSpan& span : raw) {
    if (!merged.empty() && (span.end - span.start < minSpan || merged.back().phase == span.phase)) {
      merged.back().end = span.end;
      continue;
    }
    merged.push_back(span);
  }
  return merged;
}

Sample sampleOf(const Params& p, const State& s, const ContactReport& c) {
  Sample sample;
  sample.t = s.t;
  sample.position = s.position;
  sample.orientation = s.orientation;
  sample.velocity = s.velocity;
  sample.spin = s.spinWorld();
  sample.phase = classify(p, s, c);
  sample.slip = float(c.maxSlip());
  sample.normal = float(c.totalNormal());
  return sample;
}

RunResult simulateFrom(const Params& p, const State& initial, double duration, double sampleInterval,
                       End pressedEnd, const SimulateOptions& options) {
  RunResult result;
  result.params = p;
  State s = initial;
  const long steps = long(std::llround(duration / p.timeStep));
  const long rowEvery = std::max(1L, long(std::llround(sampleInterval / p.timeStep)));
  result.trajectory.samples.reserve(std::size_t(steps) + 1);
  double restSince = -1;
  for (long n = 0; n <= steps; ++n) {
    // Stage 1 of the step doubles as the record of the current state.
    State before = s;
    const ContactReport c = n < steps ? step(p, s) : contacts(p, s);
    const Sample sample = sampleOf(p, before, c);
    result.trajectory.samples.push_back(sample);
    if (n % rowEvery == 0) result.energyAt.push_back(energy(p, before, c));
    if (options.progress && n % 20000 == 0) options.progress(double(n) / double(std::max(1L, steps)));
    if (n == steps) break;
    if (!healthy(s)) {
      Fault f;
      f.time = s.t;
      f.phase = sample.phase;
      f.lastGood = before;
      std::ostringstream why;
      why << (s.position.allFinite() && s.velocity.allFinite() && s.spinBody.allFinite() ? "runaway state (speed "
                                                                                          : "non-finite state (speed ")
          << s.velocity.norm() << " m/s, spin " << s.spinBody.norm() << " rad/s)";
      f.reason = why.str();
      result.fault = f;
      break;
    }
    if (options.stopAtRest) {
      if (restLike(sample)) {
        if (restSince < 0) restSince = sample.t;
        if (sample.t - restSince > 0.5) break;
      } else {
        restSince = -1;
      }
    }
  }
  if (!result.trajectory.empty()) {
    result.summary = summarise(p, result.trajectory, pressedEnd);
    result.summary.energyInitial = result.energyAt.front();
    result.summary.energyFinal = result.energyAt.back();
  }
  return result;
}

std::string faultReport(const Fault& f) {
  const State& g = f.lastGood;
  std::ostringstream o;
  o.precision(6);
  o << "numerical fault at t = " << f.time << " s in phase " << phaseName(f.phase) << ": " << f.reason
    << "\n  last good state: t = " << g.t << " s, centre (" << g.position.x() * 1e3 << ", " << g.position.y() * 1e3
    << ", " << g.position.z() * 1e3 << ") mm, speed " << g.velocity.norm() << " m/s, spin " << g.spinBody.norm()
    << " rad/s";
  return o.str();
}

RunResult simulate(const Scenario& sc, const SimulateOptions& options) {
  const Params p = makeParams(sc);
  const State s0 = launchState(p, sc.launch);
  return simulateFrom(p, s0, options.duration.value_or(sc.run.duration), sc.run.sampleInterval,
                      sc.launch.pressedEnd, options);
}

}  // namespace dm
