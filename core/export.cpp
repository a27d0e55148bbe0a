#include "core/export.hpp"

#include <cmath>
#include <sstream>

#include "core/io.hpp"
#include "core/kinematics.hpp"

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

}  // namespace dm
