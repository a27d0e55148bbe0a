#include "core/export.hpp"

#include <cmath>
#include <sstream>

#include "core/constants.hpp"
#include "core/io.hpp"
#include "core/kinematics.hpp"
#include "core/steady.hpp"

namespace dm {

std::string trajectoryCsv(const RunResult& r, double sampleInterval) {
  // Rows fall on whole steps: the scenario makes the step divide the row spacing.
  std::ostringstream o;
  o << "t_s,x_mm,y_mm,z_mm,qw,qx,qy,qz,wx_rad_s,wy_rad_s,wz_rad_s,tilt_deg,precession_rev_s,spots_per_rev,"
       "raised_end,phase,slip_mm_s,normal_N,energy_mJ\n";
  const auto& samples = r.trajectory.samples;
  const long every = std::max(1L, long(std::llround(sampleInterval / r.params.timeStep)));
  std::size_t row = 0;
  for (std::size_t i = 0; i < samples.size(); i += std::size_t(every), ++row) {
    const Sample& s = samples[i];
    const AxisMotion m = axisMotion(s.orientation, s.spin);
    o << fmt(s.t, 8) << ',' << fmt(s.position.x() * 1e3) << ',' << fmt(s.position.y() * 1e3) << ','
      << fmt(s.position.z() * 1e3) << ',' << fmt(s.orientation.w()) << ',' << fmt(s.orientation.x()) << ','
      << fmt(s.orientation.y()) << ',' << fmt(s.orientation.z()) << ',' << fmt(s.spin.x()) << ','
      << fmt(s.spin.y()) << ',' << fmt(s.spin.z()) << ',' << fmt(m.tilt * 180 / M_PI, 7) << ','
      << fmt(m.precession / (2 * M_PI), 7) << ',';
    if (m.precessing) o << fmt(m.spotsPerRev, 7);  // empty when the axis is not precessing
    o << ',' << endName(m.raisedEnd) << ',' << phaseName(s.phase) << ',' << fmt(s.slip * 1e3, 6) << ','
      << fmt(s.normal, 6) << ',';
    if (row < r.energyAt.size()) o << fmt(r.energyAt[row] * 1e3, 9);
    o << '\n';
  }
  return o.str();
}

namespace {

// Appends ",x,y,z" in mm.
void writeMm(std::ostringstream& o, const Vec3& p) {
  o << ',' << fmt(p.x() * 1e3) << ',' << fmt(p.y() * 1e3) << ',' << fmt(p.z() * 1e3);
}

// Header columns "name_x_mm,name_y_mm,name_z_mm", each preceded by a comma.
std::string xyzColumns(const std::string& name) {
  return "," + name + "_x_mm," + name + "_y_mm," + name + "_z_mm";
}

constexpr double degPerRad = 1 / k::degree;

// "7/2": the rational N = p/q the stops repeat with (PatternWindow::stopsPerVisit, revsPerVisit).
std::string ratioText(const PatternWindow& w) { return dm::ratioText(w.stopsPerVisit, w.revsPerVisit); }

}  // namespace

std::string tracesCsv(const PatternAnalysis& a) {
  std::ostringstream o;
  o << "t_s" << xyzColumns("floor") << xyzColumns("ceiling");
  for (const MarkedPoint& p : a.points) o << xyzColumns(p.label);
  o << '\n';
  const Traces& t = a.traces;
  for (std::size_t i = 0; i < t.time.size(); ++i) {
    o << fmt(t.time[i], 8);
    writeMm(o, t.floorContact[i]);
    writeMm(o, t.ceilingContact[i]);
    for (const auto& path : t.points) writeMm(o, path[i]);
    o << '\n';
  }
  return o.str();
}

std::string stopsCsv(const PatternAnalysis& a) {
  std::ostringstream o;
  o << "t_s,point,end,x_mm,y_mm,z_mm,horizontal_speed_mm_s,dwell_ms\n";
  for (const StopEvent& s : a.stops) {
    o << fmt(s.time, 12) << ',' << a.points[s.point].label << ',' << endName(s.end);
    writeMm(o, s.position);
    o << ',' << fmt(s.horizontalSpeed * 1e3, 6) << ',' << fmt(s.dwell * 1e3, 6) << '\n';
  }
  return o.str();
}

nlohmann::json patternJson(const std::vector<PatternWindow>& windows) {
  using nlohmann::json;
  json list = json::array();
  for (const PatternWindow& w : windows) {
    json azimuths = json::array(), drifts = json::array();
    for (const PatternSpot& s : w.spots) {
      azimuths.push_back(s.azimuth * degPerRad);
      drifts.push_back(s.drift * degPerRad);
    }
    json j;
    j["start_s"] = w.start;
    j["end_s"] = w.end;
    j["visible_end"] = w.visibleEnd ? json(endName(*w.visibleEnd)) : json(nullptr);
    j["spot_count"] = w.spots.size();
    j["spot_azimuths_deg"] = azimuths;
    j["drift_deg_s"] = drifts;
    j["spots_per_rev"] = w.spotsPerRev ? json(*w.spotsPerRev) : json(nullptr);
    j["kind"] = patternKindName(w.kind);
    j["revs_per_visit"] = w.revsPerVisit;
    j["n_ratio"] = w.stopsPerVisit > 0 ? json(ratioText(w)) : json(nullptr);
    j["pattern_drift_deg_s"] = w.patternDrift * degPerRad;
    j["spot_size_deg"] = w.spotSize * degPerRad;
    j["spot_spread_deg"] = w.spotSpread * degPerRad;
    j["stop_count"] = w.stopCount;
    j["mean_tilt_deg"] = w.meanTilt * degPerRad;
    j["mean_precession_rev_s"] = w.meanPrecession / k::twoPi;
    j["centre_orbit_mm"] = w.centreOrbit ? json(*w.centreOrbit * 1e3) : json(nullptr);
    j["centre_orbit_across_mm"] = w.centreOrbitAcross ? json(*w.centreOrbitAcross * 1e3) : json(nullptr);
    list.push_back(j);
  }
  return list;
}

std::string patternSentence(const PatternWindow& w) {
  std::ostringstream o;
  o << fmt(w.start, 4) << "-" << fmt(w.end, 4) << " s: ";
  if (!w.visibleEnd) return o.str() + "no end raised";
  o << "end " << endName(*w.visibleEnd) << " seen from above";
  if (w.spotsPerRev) o << ", N = " << fmt(*w.spotsPerRev, 5);
  if (w.stopsPerVisit > 0) o << " (near " << ratioText(w) << ")";
  switch (w.kind) {
    case PatternKind::None: o << ", too few stops to tell a pattern"; break;
    case PatternKind::Ring:
      o << ", a washed-out ring";
      if (!w.spots.empty()) o << " (" << w.spots.size() << " spots drifting " << fmt(w.patternDrift * degPerRad, 3) << " deg/s)";
      break;
    case PatternKind::Stationary:
    case PatternKind::Creeping:
      o << ", " << w.spots.size() << " spots " << patternKindName(w.kind) << " at " << fmt(w.patternDrift * degPerRad, 3)
        << " deg/s, each visited every " << w.revsPerVisit << " rev";
      break;
  }
  if (w.centreOrbit) o << "; centre orbit " << fmt(*w.centreOrbit * 1e3, 3) << " mm";
  return o.str();
}

nlohmann::json summaryJson(const RunResult& r) {
  using nlohmann::json;
  const RunSummary& s = r.summary;
  json j;
  j["pressed_end"] = endName(s.pressedEnd);
  j["raised_end"] = s.raisedEnd ? json(endName(*s.raisedEnd)) : json(nullptr);
  j["settle_time_s"] = s.settleTime ? json(*s.settleTime) : json(nullptr);
  j["rest_time_s"] = s.restTime ? json(*s.restTime) : json(nullptr);
  json phases = json::array();
  for (const PhaseSpan& p : s.phases) phases.push_back({{"phase", phaseName(p.phase)}, {"start_s", p.start}, {"end_s", p.end}});
  j["phases"] = phases;
  j["max_excursion_mm"] = s.maxExcursion * 1e3;
  j["max_speed_m_s"] = s.maxSurfaceSpeed;
  j["energy_initial_mJ"] = s.energyInitial * 1e3;
  j["energy_final_mJ"] = s.energyFinal * 1e3;
  j["end_time_s"] = s.endTime;
  j["creep_bound"] = {{"model", "stick spring with Coulomb slip limit (Cundall-Strack)"},
                      {"max_slip_to_rim_speed_ratio", creepBoundRatio}};
  j["mass_g"] = r.params.inertia.mass * 1e3;
  j["time_step_us"] = r.params.timeStep * 1e6;
  if (r.fault) {
    j["fault"] = {{"time_s", r.fault->time}, {"phase", phaseName(r.fault->phase)}, {"reason", r.fault->reason}};
  }
  return j;
}

std::vector<OutputFile> simulationFiles(const Scenario& s, const RunResult& r, const PatternAnalysis& pattern) {
  nlohmann::json summary = summaryJson(r);
  summary["scenario"] = s.name;
  summary["pattern"] = patternJson(pattern.windows);
  return {{"trajectory.csv", trajectoryCsv(r, s.run.sampleInterval)},
          {"traces.csv", tracesCsv(pattern)},
          {"stops.csv", stopsCsv(pattern)},
          {"summary.json", jsonFileText(summary)}};
}

}  // namespace dm
