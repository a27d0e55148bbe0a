// Text exports of an ensemble: launches.csv and ensemble.json.
#include <cmath>
#include <sstream>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/ensemble.hpp"
#include "core/io.hpp"

namespace dm {

namespace {

using nlohmann::json;

json optionalNumber(const std::optional<double>& v, double scale = 1) { return v ? json(*v * scale) : json(nullptr); }

json percentilesJson(const Percentiles& p, double scale) {
  return {{"launches", p.count},
          {"p10", p.p10 * scale},
          {"median", p.median * scale},
          {"p90", p.p90 * scale},
          {"max", p.max * scale}};
}

json histogramJson(const SpotHistogram& h) {
  json list = json::array();
  for (std::size_t n = 0; n < h.launches.size(); ++n) list.push_back({{"spots", n}, {"launches", h.launches[n]}});
  return list;
}

json spreadJson(const Spread& d, double toFile) {
  const char* kind = d.kind == SpreadKind::Uniform ? "uniform" : d.kind == SpreadKind::Normal ? "normal" : "fixed";
  json j = {{"kind", kind}};
  if (d.kind == SpreadKind::Fixed) return j;
  j["min"] = d.min * toFile;
  j["max"] = d.max * toFile;
  if (d.kind == SpreadKind::Normal) {
    j["mean"] = d.mean * toFile;
    j["sd"] = d.sd * toFile;
  }
  return j;
}

json tableJson(const TableCheck& t) {
  return {{"radius_mm", t.radius * 1e3},
          {"reaches_edge_share", t.reachesEdgeShare},
          {"leaves_share", t.leavesShare},
          {"radius_holding_all_mm", t.radiusHoldingAll * 1e3},
          {"radius_holding_90_percent_mm", t.radiusHolding90 * 1e3},
          {"lip_height_mm", optionalNumber(t.lipHeight, 1e3)},
          {"lip_rule", "centre height when the body first reaches the edge plus v^2/(2 g) of the centre's speed then, "
                       "at least the outer radius; our rule, no source"}};
}

// A CSV cell holding free text: quoted, inner quotes doubled.
std::string quoted(const std::string& text) {
  std::string out = "\"";
  for (char c : text) out += c == '"' ? std::string("\"\"") : std::string(1, c);
  return out + "\"";
}

std::string optionalCell(const std::optional<double>& v, double scale, int digits) {
  return v ? fmt(*v * scale, digits) : "";
}

}  // namespace

std::string launchesCsv(const EnsembleResult& r) {
  std::ostringstream o;
  o << "launch,pressed_end,revolution_rev_s,backspin,tilt_deg,drift_mm_s,visible_end,settle_time_s,show_s,"
       "spin_time_s,rest_time_s,spots_at_settle,max_excursion_mm,max_surface_speed_m_s,edge_time_s,edge_centre_height_mm,"
       "edge_centre_speed_mm_s,leaves_table,end_time_s,fault\n";
  for (const LaunchOutcome& l : r.outcomes) {
    o << l.index << ',' << endName(l.launch.pressedEnd) << ',' << fmt(l.launch.revolution / k::twoPi, 8) << ','
      << fmt(l.launch.backspin, 8) << ',' << fmt(l.launch.tilt / k::degree, 8) << ',' << fmt(l.launch.drift * 1e3, 8)
      << ',' << (l.visibleEnd ? std::string(endName(*l.visibleEnd)) : "") << ',' << optionalCell(l.settleTime, 1, 6)
      << ',' << fmt(l.showTime, 6) << ',' << fmt(l.spinTime, 6) << ',' << optionalCell(l.restTime, 1, 6) << ','
      << (l.spotsAtSettle ? std::to_string(*l.spotsAtSettle) : "") << ',' << fmt(l.maxExcursion * 1e3, 6) << ','
      << fmt(l.maxSurfaceSpeed, 6) << ',' << optionalCell(l.edgeTime, 1, 6) << ',';
    if (l.edgeTime) o << fmt(l.edgeCentreHeight * 1e3, 6) << ',' << fmt(l.edgeCentreSpeed * 1e3, 6);
    else o << ',';
    o << ',' << (l.leavesTable ? "yes" : "no") << ',' << fmt(l.endTime, 6) << ','
      << (l.fault.empty() ? "" : quoted(l.fault)) << '\n';
  }
  return o.str();
}

json ensembleJson(const EnsembleResult& r) {
  const EnsembleSummary& e = r.summary;
  json j;
  j["scenario"] = r.scenario;
  j["launches"] = e.launches;
  j["seed"] = r.seed;
  j["duration_s"] = r.duration;
  j["launch_spread"] = {{"revolution_rev_s", spreadJson(r.spread.revolution, 1 / k::twoPi)},
                        {"backspin", spreadJson(r.spread.backspin, 1)},
                        {"tilt_deg", spreadJson(r.spread.tilt, 1 / k::degree)},
                        {"drift_mm_s", spreadJson(r.spread.drift, 1e3)},
                        {"pressed_end_a_share", r.spread.pressedEndAShare}};
  j["faults"] = e.faults;
  j["visible_end_share"] = {{"A", e.visibleShareA}, {"B", e.visibleShareB}, {"none", e.visibleShareNone}};
  j["pressed_end_visible_share"] = e.pressedVisibleShare;
  j["spots_at_settle"] = histogramJson(e.spotsAtSettle);
  json overTime = json::array();
  for (std::size_t i = 0; i < e.windowStarts.size(); ++i)
    overTime.push_back({{"start_s", e.windowStarts[i]}, {"histogram", histogramJson(e.spotsOverTime[i])}});
  j["spots_over_time"] = {{"window_s", e.windowLength}, {"window_step_s", e.windowStep}, {"windows", overTime}};
  j["settle_time_s"] = percentilesJson(e.settleTime, 1);
  j["show_s"] = percentilesJson(e.showTime, 1);
  j["spin_time_s"] = percentilesJson(e.spinTime, 1);
  j["rest_time_s"] = percentilesJson(e.restTime, 1);
  j["max_excursion_mm"] = percentilesJson(e.maxExcursion, 1e3);
  j["max_surface_speed_m_s"] = percentilesJson(e.maxSurfaceSpeed, 1);
  j["table"] = tableJson(e.table);
  return j;
}

}  // namespace dm
