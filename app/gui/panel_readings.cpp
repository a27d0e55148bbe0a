// The "Readings" panel: the run's state now (phase, tilt, precession, N)
// and what the forecast run predicts (spots, drift, visible end, settle
// time, time left before it stops). Every number comes from a core result.
#include <imgui.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>

#include "app/gui/gui_state.hpp"
#include "core/constants.hpp"
#include "core/io.hpp"
#include "core/kinematics.hpp"
#include "core/steady.hpp"

namespace dm::gui {

namespace {

void row(const char* name, const std::string& value) {
  ImGui::TableNextRow();
  ImGui::TableNextColumn();
  ImGui::TextUnformatted(name);
  ImGui::TableNextColumn();
  ImGui::TextUnformatted(value.c_str());
}

std::string orDash(bool known, const std::string& text) { return known ? text : std::string("-"); }

// A reading with a fixed number of decimals (small values read as 0.00, not 1e-15).
std::string fixed(double v, int decimals) {
  fmt(v);  // refuses NaN and infinity like every output
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, std::abs(v) < 0.5 * std::pow(10.0, -decimals) ? 0.0 : v);
  return buf;
}

// The forecast's answers at simulated time t.
void forecastRows(const Session& s, double t) {
  const Forecast* f = s.forecast();
  if (!f) {
    row("forecast", s.forecastBusy() ? "running " + fmt(100 * s.forecastProgress(), 3) + " %" : "none");
    return;
  }
  const RunSummary& sum = f->run.summary;
  row("settle time", sum.settleTime ? fixed(*sum.settleTime, 3) + " s" : "never settles");
  if (sum.restTime) row("time left before it stops", fixed(std::max(0.0, *sum.restTime - t), 2) + " s (at " + fixed(*sum.restTime, 2) + " s)");
  else row("time left before it stops", "still moving at " + fmt(sum.endTime, 4) + " s" + (f->truncated ? " (forecast cut short)" : ""));
  if (f->run.fault) row("forecast fault", f->run.fault->reason);
  const PatternWindow* w = s.patternAt(t);
  if (!w) {
    row("predicted spots", "-");
    return;
  }
  const std::string when = " (" + fmt(w->start, 3) + " to " + fmt(w->end, 3) + " s)";
  row("predicted spots", std::to_string(w->spots.size()) + ", " + std::string(patternKindName(w->kind)) + when);
  row("visible end", w->visibleEnd ? std::string(endName(*w->visibleEnd)) : "none raised");
  row("pattern drift", orDash(!w->spots.empty(), fixed(w->patternDrift / k::degree, 2) + " deg/s"));
  row("stops in window", std::to_string(w->stopCount) + (w->revsPerVisit > 0 ? ", each spot every " + std::to_string(w->revsPerVisit) + " rev" : ""));
  row("centre orbit", orDash(w->centreOrbit.has_value(), fixed(w->centreOrbit.value_or(0) * 1e3, 2) + " mm"));
}

// The solver's steady spin of this geometry at the precession now (or, before
// the body precesses, at the launch's vertical spin), with the centre orbit
// the forecast measured in the window now (the centre still without one).
void steadyRows(const Session& s, const AxisMotion& m, double t) {
  const Cylinder cyl = cylinderOf(s.scenario().body);
  const double precession = m.precessing ? std::abs(m.precession) : s.scenario().launch.revolution;
  row("at precession", fixed(precession / k::twoPi, 3) + " rev/s" + (m.precessing ? "" : " (launch spin)"));
  const PatternWindow* w = s.patternAt(t);
  const double orbit = w && w->centreOrbit ? *w->centreOrbit : 0.0;
  row("with centre orbit", orbit == 0 ? std::string("0 (centre still)") : fixed(orbit * 1e3, 2) + " mm (forecast window)");
  const SteadySolution sol = steadyAtPrecession(cyl, precession, CentreOrbit{orbit});
  row("end stays up above", fixed(sol.minPrecession / k::twoPi, 3) + " rev/s");
  const auto pattern = std::find_if(sol.branches.begin(), sol.branches.end(), [](const SteadySpin& b) { return b.pattern; });
  if (pattern == sol.branches.end()) {
    row("pattern state", sol.reason.empty() ? "none" : sol.reason);
    return;
  }
  row("steady tilt", fixed(pattern->tilt / k::degree, 2) + " deg");
  row("steady N", fixed(pattern->spotsPerRev, 4) + " (nearest " + std::to_string(pattern->nearestSpots) + ")");
  if (pattern->nearestSpots > 0)
    row("steady drift", fixed(pattern->driftDegPerRev, 2) + " deg/rev, " + fixed(pattern->driftDegPerSecond, 1) + " deg/s");
  const FractionPattern& f = pattern->fraction;
  if (f.spots > 0 && f.revsPerVisit > 1)
    row("steady spots", std::to_string(f.spots) + ", each every " + std::to_string(f.revsPerVisit) + " rev (N near " +
                            ratioText(f.spots, f.revsPerVisit) + "), drift " + fixed(f.driftDegPerRev, 2) + " deg/rev");
  else if (f.spots == 0 && pattern->nearestSpots > 0)
    row("steady spots", "creeping: N near no p/q within " + std::to_string(maxRevsPerVisit) + " rev");
  row("ceiling height", fixed(pattern->ceilingHeight * 1e3, 2) + " mm");
  row("contact circle radius", fixed(pattern->contactRadius * 1e3, 2) + " mm");
  if (orbit != 0) row("friction needed", fixed(pattern->frictionNeeded, 3));
}

void adviceRows(const LengthAdvice& a, const char* label) {
  if (!a.found) {
    row(label, a.reason);
    return;
  }
  row(label, std::to_string(a.spots) + " spots: length " + fixed(a.length * 1e3, 1) + " mm, worst drift " +
                 fixed(a.worst.driftDegPerSecond, 1) + " deg/s");
}

void advisorSection(GuiContext& c) {
  GuiState& ui = c.ui;
  ImGui::SetNextItemWidth(90);
  ImGui::InputInt("spots", &ui.adviceSpots);
  ui.adviceSpots = std::clamp(ui.adviceSpots, 2, 20);
  ImGui::SetNextItemWidth(150);
  ImGui::DragFloatRange2("rev/s", &ui.adviceFromRevS, &ui.adviceToRevS, 0.05f, 0.0f, 100.0f, "%.2f");
  if (ImGui::Button("Advise a length")) c.session.requestAdvice(ui.adviceSpots, ui.adviceFromRevS * k::twoPi, ui.adviceToRevS * k::twoPi);
  if (c.session.adviceBusy()) {
    ImGui::SameLine();
    ImGui::TextDisabled("working ...");
  }
  const DimensionAdvice* a = c.session.advice();
  if (!a || !ImGui::BeginTable("advice", 2, ImGuiTableFlags_RowBg | ImGuiTableFlags_SizingStretchProp)) return;
  row("range", fixed(a->from / k::twoPi, 2) + " to " + fixed(a->to / k::twoPi, 2) + " rev/s");
  adviceRows(a->fewer, "one fewer");
  adviceRows(a->best, "asked");
  adviceRows(a->more, "one more");
  ImGui::EndTable();
}

}  // namespace

void drawReadings(GuiContext& c) {
  const Rect& r = c.layout.readings;
  beginFixedPanel(panel_title::readings, r);
  const Session& s = c.session;
  const Sample& now = s.live().now();
  const AxisMotion m = axisMotion(now.orientation, now.spin);
  if (ImGui::CollapsingHeader("Gauges", ImGuiTreeNodeFlags_DefaultOpen) &&
      ImGui::BeginTable("gauges", 2, ImGuiTableFlags_RowBg | ImGuiTableFlags_SizingStretchProp)) {
    row("phase", std::string(phaseName(now.phase)));
    row("tilt", fixed(m.tilt / k::degree, 2) + " deg, end " + std::string(endName(m.raisedEnd)) + " up");
    row("precession", fixed(m.precession / k::twoPi, 3) + " rev/s");
    row("spots per rev N", m.precessing ? fixed(m.spotsPerRev, 3) : "- (not precessing)");
    forecastRows(s, now.t);
    ImGui::EndTable();
  }
  if (ImGui::CollapsingHeader("Steady spin", ImGuiTreeNodeFlags_DefaultOpen) &&
      ImGui::BeginTable("steady", 2, ImGuiTableFlags_RowBg | ImGuiTableFlags_SizingStretchProp)) {
    steadyRows(s, m, now.t);
    ImGui::EndTable();
  }
  if (ImGui::CollapsingHeader("Length advisor")) advisorSection(c);
  ImGui::End();
}

}  // namespace dm::gui
