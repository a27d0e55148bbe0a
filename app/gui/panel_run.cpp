// The run's panels: the playback bar, the timelines (plots over time), the
// metrics and help windows, keyboard shortcuts and the 3D view's mouse.
#include <epoxy/gl.h>
#define GLFW_INCLUDE_NONE
#include <GLFW/glfw3.h>
#include <imgui.h>

#include <algorithm>
#include <cmath>
#include <string>

#include "app/gui/gui_state.hpp"
#include "core/io.hpp"

namespace dm::gui {

namespace {


// Our plot colours, one per series (sRGB).
constexpr ImU32 seriesColours[] = {IM_COL32(240, 174, 66, 255), IM_COL32(88, 196, 178, 255),
                                   IM_COL32(226, 112, 150, 255), IM_COL32(150, 170, 240, 255),
                                   IM_COL32(200, 220, 110, 255)};

// Plot line thickness, px: a whole number lets Dear ImGui draw it
// anti-aliased from its texture with half the triangles of a fractional one.
constexpr float plotLineWidth = 2.0f;

// The plotted window of values and where it lands on screen.
struct PlotRange {
  double t0, dt, v0, dv;  ///< time from, time span, value from, value span
};

// The polyline of values [i0, i1) over a plot area: at most two points per
// pixel column, the column's lowest and highest value in the order they
// came, so a fast wobble shows as the band it sweeps rather than aliasing
// into a slower wave.
std::vector<ImVec2> envelope(const std::vector<double>& time, const std::vector<double>& v, std::size_t i0,
                             std::size_t i1, const PlotRange& r, const Rect& area) {
  std::vector<ImVec2> out;
  auto at = [&](std::size_t i) {
    return ImVec2(area.x + float((time[i] - r.t0) / r.dt) * area.w, area.y + area.h - float((v[i] - r.v0) / r.dv) * area.h);
  };
  for (std::size_t i = i0; i < i1;) {
    // One pixel column: from sample i up to the first sample right of it.
    const int column = int(at(i).x);
    std::size_t lowest = i, highest = i, j = i;
    for (; j < i1 && int(at(j).x) == column; ++j) {
      if (v[j] < v[lowest]) lowest = j;
      if (v[j] > v[highest]) highest = j;
    }
    out.push_back(at(std::min(lowest, highest)));
    if (lowest != highest) out.push_back(at(std::max(lowest, highest)));
    i = j;
  }
  return out;
}

struct Series {
  const char* title;
  const char* unit;
  const std::vector<double>* values;
};

// One plot: the values within [from, to] of simulated time, with its
// current value, its range and a frame.
void plot(const Series& s, const std::vector<double>& time, double from, double to, ImVec2 size, ImU32 colour) {
  ImDrawList* draw = ImGui::GetWindowDrawList();
  const ImVec2 p0 = ImGui::GetCursorScreenPos();
  const ImVec2 p1(p0.x + size.x, p0.y + size.y);
  draw->AddRectFilled(p0, p1, IM_COL32(24, 27, 30, 255), 3.0f);
  draw->AddRect(p0, p1, IM_COL32(70, 78, 82, 255), 3.0f);
  const auto begin = std::lower_bound(time.begin(), time.end(), from);
  const std::size_t i0 = std::size_t(begin - time.begin());
  const std::size_t i1 = std::size_t(std::upper_bound(time.begin(), time.end(), to) - time.begin());
  const std::vector<double>& v = *s.values;
  std::string head = s.title;
  if (i1 > i0) {
    double lo = v[i0], hi = v[i0];
    for (std::size_t i = i0; i < i1; ++i) lo = std::min(lo, v[i]), hi = std::max(hi, v[i]);
    const double pad = std::max(1e-9, (hi - lo) * 0.08);
    lo -= pad;
    hi += pad;
    const float top = p0.y + 20, bottom = p1.y - 4, left = p0.x + 4, right = p1.x - 4;
    const std::vector<ImVec2> points =
        envelope(time, v, i0, i1, {from, std::max(1e-9, to - from), lo, hi - lo}, {left, top, right - left, bottom - top});
    draw->AddPolyline(points.data(), int(points.size()), colour, 0, plotLineWidth);
    head += ": " + fmt(v[i1 - 1], 4) + " " + s.unit;
    const std::string range = fmt(lo + pad, 3) + " .. " + fmt(hi - pad, 3);
    const ImVec2 rangeSize = ImGui::CalcTextSize(range.c_str());
    draw->AddText(ImVec2(p1.x - rangeSize.x - 6, p1.y - rangeSize.y - 3), IM_COL32(140, 150, 150, 255), range.c_str());
  }
  draw->AddText(ImVec2(p0.x + 6, p0.y + 3), colour, head.c_str());
  ImGui::InvisibleButton(s.title, size);  // reserves the plot's area in the layout
}

std::string secondsText(double s) { return fmt(s, s < 10 ? 3 : 4) + " s"; }

}  // namespace

void drawPlaybackBar(GuiContext& c) {
  beginFixedPanel(panel_title::playback, c.layout.playback, ImGuiWindowFlags_NoTitleBar | ImGuiWindowFlags_NoScrollbar);
  Session& s = c.session;
  const LiveRun& live = s.live();
  // Row 1: transport, speed, clock.
  if (ImGui::Button(s.playing() ? "Pause" : "Play", ImVec2(64, 0))) s.togglePlay();
  ImGui::SameLine();
  if (ImGui::Button("Step")) {
    s.pause();
    s.stepOnce();
  }
  ImGui::SameLine();
  if (ImGui::Button("Restart")) s.restart();
  ImGui::SameLine();
  if (ImGui::Button("Flick")) applyOutcome(c, "launch", s.flick());
  ImGui::SameLine();
  float speed = float(s.speed());
  ImGui::SetNextItemWidth(140);
  if (ImGui::SliderFloat("##speed", &speed, float(minSpeed), float(maxSpeed), "speed %.2fx",
                         ImGuiSliderFlags_Logarithmic | ImGuiSliderFlags_AlwaysClamp))
    s.setSpeed(speed);
  ImGui::SameLine();
  const double t = live.now().t, total = s.scenario().run.duration;
  const std::string state = live.fault ? "stopped: fault" : live.finished() ? "finished" : s.playing() ? "running" : "paused";
  ImGui::SetNextItemWidth(-1);
  const std::string clock = "t " + secondsText(t) + " of " + secondsText(total) + "  (" + state + ")";
  ImGui::ProgressBar(float(std::clamp(t / total, 0.0, 1.0)), ImVec2(-1, 0), clock.c_str());
  // Row 2: what the 3D view draws and from where.
  SceneOverlays& o = c.ui.overlays;
  ImGui::Checkbox("grid", &o.grid);
  ImGui::SameLine();
  ImGui::Checkbox("floor", &o.floorTrace);
  ImGui::SameLine();
  ImGui::Checkbox("ceiling", &o.ceiling);
  ImGui::SameLine();
  ImGui::Checkbox("top trace", &o.ceilingTrace);
  ImGui::SameLine();
  ImGui::Checkbox("marks", &o.markPaths);
  ImGui::SameLine();
  ImGui::Checkbox("axis", &o.spinAxis);
  ImGui::SameLine();
  ImGui::Checkbox("centre", &o.centrePath);
  ImGui::SameLine();
  float trail = float(o.trailSeconds);
  ImGui::SetNextItemWidth(-1);
  if (ImGui::SliderFloat("##trail", &trail, 0.02f, 10.0f, "trail %.2f s", ImGuiSliderFlags_Logarithmic))
    o.trailSeconds = trail;
  ImGui::End();
}

void drawTimelines(GuiContext& c) {
  beginFixedPanel(panel_title::timelines, c.layout.timelines, ImGuiWindowFlags_NoScrollbar);
  const Timeline& tl = c.session.live().timeline;
  const Series series[] = {{"tilt", "deg", &tl.tilt_deg},
                           {"precession", "rev/s", &tl.precession_rev_s},
                           {"spots per rev N", "", &tl.spots_per_rev},
                           {"energy", "mJ", &tl.energy_mJ},
                           {"slip speed", "mm/s", &tl.slip_mm_s}};
  const double to = c.session.live().now().t;
  const double from = c.ui.timelineSeconds > 0 ? std::max(0.0, to - c.ui.timelineSeconds) : 0.0;
  const ImVec2 avail = ImGui::GetContentRegionAvail();
  const float spacing = ImGui::GetStyle().ItemSpacing.x;
  const ImVec2 cell((avail.x - 2 * spacing) / 3, (avail.y - ImGui::GetStyle().ItemSpacing.y) / 2);
  for (int i = 0; i < 5; ++i) {
    if (i % 3) ImGui::SameLine();
    plot(series[i], tl.time_s, from, std::max(to, from + 1e-6), cell, seriesColours[i]);
  }
  ImGui::SameLine();
  ImGui::BeginGroup();
  float window = float(c.ui.timelineSeconds);
  ImGui::TextUnformatted("history shown");
  ImGui::SetNextItemWidth(cell.x);
  if (ImGui::SliderFloat("##history", &window, 0.0f, 60.0f, window <= 0 ? "whole run" : "last %.1f s"))
    c.ui.timelineSeconds = window;
  ImGui::TextDisabled("one point every %.0f ms", plotInterval * 1e3);
  ImGui::EndGroup();
  ImGui::End();
}

void drawMetricsWindow(GuiContext& c) {
  if (!c.ui.showMetrics) return;
  ImGui::SetNextWindowSize(ImVec2(380, 300), ImGuiCond_FirstUseEver);
  ImGui::SetNextWindowPos(ImVec2(c.layout.view3d.x + 12, c.layout.view3d.y + 12), ImGuiCond_FirstUseEver);
  if (!ImGui::Begin("Frame meter", &c.ui.showMetrics)) {
    ImGui::End();
    return;
  }
  const FrameTimes& t = c.ui.times;
  const double mean = t.mean();
  ImGui::Text("frame %.2f ms mean, %.2f ms 95th pct (%.1f frames/s)", mean, t.percentile(0.95),
              mean > 0 ? 1000.0 / mean : 0.0);
  const FrameStages& st = t.last;
  ImGui::Text("stepping %.2f ms for %ld steps last frame%s", st.stepMs, st.steps, t.behind ? " (behind: slowed down)" : "");
  ImGui::Text("panels %.2f ms to build, %.2f ms to draw", st.panelsMs, st.drawPanelsMs);
  ImGui::Text("3D view %.2f ms (scene %.2f ms)%s", st.viewMs, st.sceneMs, st.viewDrawn ? "" : ", unchanged");
  ImGui::Text("on screen %.2f ms", st.presentMs);
  const Session& s = c.session;
  if (s.forecastBusy()) ImGui::Text("forecast running: %.0f %%", 100 * s.forecastProgress());
  else if (const Forecast* f = s.forecast()) ImGui::Text("forecast ready: %s%s", secondsText(f->run.summary.endTime).c_str(), f->truncated ? " (truncated)" : "");
  ImGui::Separator();
  ImGui::TextUnformatted("warnings");
  if (s.warnings().empty()) ImGui::TextDisabled("none");
  for (auto it = s.warnings().rbegin(); it != s.warnings().rend(); ++it) ImGui::TextWrapped("%s", it->c_str());
  if (!s.warnings().empty() && ImGui::Button("Clear")) c.session.clearWarnings();
  ImGui::End();
}

const std::vector<Shortcut>& shortcuts() {
  static const std::vector<Shortcut> table = {
      {GLFW_KEY_SPACE, false, false, "Space", "play or pause"},
      {GLFW_KEY_PERIOD, false, false, ".", "one integrator step (pauses)"},
      {GLFW_KEY_R, false, false, "R", "restart from the launch"},
      {GLFW_KEY_F, false, false, "F", "visitor flick: a random launch"},
      {GLFW_KEY_LEFT_BRACKET, false, false, "[", "half the speed"},
      {GLFW_KEY_RIGHT_BRACKET, false, false, "]", "double the speed"},
      {GLFW_KEY_EQUAL, false, false, "=", "real-time speed"},
      {GLFW_KEY_O, false, false, "O", "camera: framing the body"},
      {GLFW_KEY_T, false, false, "T", "camera: top view as the observer sees it"},
      {GLFW_KEY_V, false, false, "V", "camera: from the visitor's eye"},
      {GLFW_KEY_G, false, false, "G", "grid on or off"},
      {GLFW_KEY_C, false, false, "C", "ceiling plane and its trace"},
      {GLFW_KEY_P, false, false, "P", "paths of the marked points"},
      {GLFW_KEY_A, false, false, "A", "spin axis"},
      {GLFW_KEY_F1, false, false, "F1", "this list"},
      {GLFW_KEY_F2, false, false, "F2", "frame meter (timings, warnings)"},
      {GLFW_KEY_N, true, false, "Ctrl+N", "new scenario"},
      {GLFW_KEY_O, true, false, "Ctrl+O", "open a scenario"},
      {GLFW_KEY_S, true, false, "Ctrl+S", "save"},
      {GLFW_KEY_S, true, true, "Ctrl+Shift+S", "save as"},
      {GLFW_KEY_E, true, false, "Ctrl+E", "export a picture of the 3D view"},
      {GLFW_KEY_Q, true, false, "Ctrl+Q", "quit"},
  };
  return table;
}

namespace {

void runShortcut(GuiContext& c, const Shortcut& k) {
  Session& s = c.session;
  SceneOverlays& o = c.ui.overlays;
  const bool plain = !k.ctrl;
  switch (k.key) {
    case GLFW_KEY_SPACE: s.togglePlay(); break;
    case GLFW_KEY_PERIOD: s.pause(); s.stepOnce(); break;
    case GLFW_KEY_R: s.restart(); break;
    case GLFW_KEY_F: applyOutcome(c, "launch", s.flick()); break;
    case GLFW_KEY_LEFT_BRACKET: s.setSpeed(s.speed() / 2); break;
    case GLFW_KEY_RIGHT_BRACKET: s.setSpeed(s.speed() * 2); break;
    case GLFW_KEY_EQUAL: s.setSpeed(1); break;
    case GLFW_KEY_O:
      if (plain) c.ui.camera = framingPreset(s.scenario());
      else openChooser(c, FileTask::Open);
      break;
    case GLFW_KEY_T: c.ui.camera = topViewPreset(s.scenario()); break;
    case GLFW_KEY_V: c.ui.camera = visitorEyePreset(s.scenario()); break;
    case GLFW_KEY_G: o.grid = !o.grid; break;
    case GLFW_KEY_C: o.ceiling = o.ceilingTrace = !o.ceiling; break;
    case GLFW_KEY_P: o.markPaths = !o.markPaths; break;
    case GLFW_KEY_A: o.spinAxis = !o.spinAxis; break;
    case GLFW_KEY_F1: c.ui.showHelp = !c.ui.showHelp; break;
    case GLFW_KEY_F2: c.ui.showMetrics = !c.ui.showMetrics; break;
    case GLFW_KEY_N: requestNew(c); break;
    case GLFW_KEY_S:
      if (k.shift) openChooser(c, FileTask::SaveAs);
      else saveScenario(c);
      break;
    case GLFW_KEY_E: openChooser(c, FileTask::ExportView); break;
    case GLFW_KEY_Q: requestQuit(c); break;
    default: break;
  }
}

}  // namespace

void handleShortcuts(GuiContext& c) {
  const ImGuiIO& io = ImGui::GetIO();
  if (io.WantTextInput || ImGui::IsPopupOpen("", ImGuiPopupFlags_AnyPopupId)) return;
  for (const Shortcut& k : shortcuts())
    if (ImGui::IsKeyPressed(k.key, false) && io.KeyCtrl == k.ctrl && io.KeyShift == k.shift) {
      runShortcut(c, k);
      return;
    }
}

void drawHelpWindow(GuiContext& c) {
  if (!c.ui.showHelp) return;
  ImGui::SetNextWindowSize(ImVec2(430, 520), ImGuiCond_FirstUseEver);
  ImGui::SetNextWindowPos(ImVec2(c.layout.view3d.x + 40, c.layout.view3d.y + 20), ImGuiCond_FirstUseEver);
  if (!ImGui::Begin("Keys and mouse", &c.ui.showHelp)) {
    ImGui::End();
    return;
  }
  if (ImGui::BeginTable("keys", 2, ImGuiTableFlags_RowBg)) {
    for (const Shortcut& k : shortcuts()) {
      ImGui::TableNextRow();
      ImGui::TableNextColumn();
      ImGui::TextUnformatted(k.keys);
      ImGui::TableNextColumn();
      ImGui::TextUnformatted(k.what);
    }
    ImGui::EndTable();
  }
  ImGui::Separator();
  ImGui::TextWrapped("3D view: drag with the left button to orbit, with the right or middle button (or Shift+left) "
                     "to pan, wheel to zoom. Sliders: Ctrl+click to type; the box beside each takes a typed value "
                     "on Enter. Hover a name for its meaning.");
  ImGui::End();
}

void handleViewMouse(GuiContext& c) {
  ImGuiIO& io = ImGui::GetIO();
  OrbitCamera& cam = c.ui.camera;
  const Rect& r = c.layout.view3d;
  const bool inside = r.contains(io.MousePos.x, io.MousePos.y);
  const bool anyButton = io.MouseDown[0] || io.MouseDown[1] || io.MouseDown[2];
  // A drag belongs to the view only if it began there while the UI did not want the mouse.
  if (!anyButton) c.ui.viewDragging = false;
  else if (!c.ui.viewDragging && inside && !io.WantCaptureMouse && (io.MouseClicked[0] || io.MouseClicked[1] || io.MouseClicked[2]))
    c.ui.viewDragging = true;
  if (c.ui.viewDragging) {
    const bool panning = io.MouseDown[1] || io.MouseDown[2] || (io.MouseDown[0] && io.KeyShift);
    if (panning) cam.pan(io.MouseDelta.x, io.MouseDelta.y, r.h);
    else if (io.MouseDown[0]) cam.orbit(io.MouseDelta.x, io.MouseDelta.y);
  }
  if (inside && !io.WantCaptureMouse && io.MouseWheel != 0) cam.zoom(io.MouseWheel);
  // Follow the body's centre across the table.
  cam.follow(c.session.live().now().position);
}

void beginFixedPanel(const char* title, const Rect& r, int extraFlags) {
  ImGui::SetNextWindowPos(ImVec2(r.x, r.y));
  ImGui::SetNextWindowSize(ImVec2(r.w, r.h));
  // No background of its own: the frame is cleared to the window colour
  // under the panels, which saves painting every pixel twice.
  ImGui::Begin(title, nullptr,
               ImGuiWindowFlags_NoMove | ImGuiWindowFlags_NoResize | ImGuiWindowFlags_NoCollapse |
                   ImGuiWindowFlags_NoBackground | extraFlags);
}

void applyTheme() {
  ImGuiStyle& st = ImGui::GetStyle();
  st.WindowRounding = 0;
  st.FrameRounding = 3;
  st.GrabRounding = 3;
  st.TabRounding = 3;
  st.WindowBorderSize = 1;
  st.WindowPadding = ImVec2(8, 7);
  st.FramePadding = ImVec2(6, 4);
  st.ItemSpacing = ImVec2(7, 5);
  st.ScrollbarSize = 12;
  ImVec4* col = st.Colors;
  // Graphite panels, teal controls, amber marks of state.
  col[ImGuiCol_Text] = ImVec4(0.90f, 0.91f, 0.88f, 1.0f);
  col[ImGuiCol_TextDisabled] = ImVec4(0.55f, 0.58f, 0.57f, 1.0f);
  col[ImGuiCol_WindowBg] = ImVec4(0.115f, 0.125f, 0.135f, 1.0f);
  col[ImGuiCol_ChildBg] = ImVec4(0.13f, 0.14f, 0.15f, 1.0f);
  col[ImGuiCol_PopupBg] = ImVec4(0.13f, 0.14f, 0.15f, 0.98f);
  col[ImGuiCol_Border] = ImVec4(0.25f, 0.28f, 0.29f, 1.0f);
  col[ImGuiCol_FrameBg] = ImVec4(0.18f, 0.20f, 0.21f, 1.0f);
  col[ImGuiCol_FrameBgHovered] = ImVec4(0.22f, 0.27f, 0.28f, 1.0f);
  col[ImGuiCol_FrameBgActive] = ImVec4(0.25f, 0.32f, 0.33f, 1.0f);
  col[ImGuiCol_TitleBg] = ImVec4(0.09f, 0.10f, 0.11f, 1.0f);
  col[ImGuiCol_TitleBgActive] = ImVec4(0.12f, 0.19f, 0.19f, 1.0f);
  col[ImGuiCol_MenuBarBg] = ImVec4(0.09f, 0.10f, 0.11f, 1.0f);
  col[ImGuiCol_Header] = ImVec4(0.16f, 0.29f, 0.28f, 1.0f);
  col[ImGuiCol_HeaderHovered] = ImVec4(0.20f, 0.38f, 0.36f, 1.0f);
  col[ImGuiCol_HeaderActive] = ImVec4(0.24f, 0.46f, 0.43f, 1.0f);
  col[ImGuiCol_Button] = ImVec4(0.17f, 0.31f, 0.30f, 1.0f);
  col[ImGuiCol_ButtonHovered] = ImVec4(0.22f, 0.41f, 0.39f, 1.0f);
  col[ImGuiCol_ButtonActive] = ImVec4(0.27f, 0.51f, 0.48f, 1.0f);
  col[ImGuiCol_SliderGrab] = ImVec4(0.36f, 0.72f, 0.66f, 1.0f);
  col[ImGuiCol_SliderGrabActive] = ImVec4(0.47f, 0.85f, 0.78f, 1.0f);
  col[ImGuiCol_CheckMark] = ImVec4(0.94f, 0.68f, 0.26f, 1.0f);
  col[ImGuiCol_PlotHistogram] = ImVec4(0.24f, 0.46f, 0.43f, 1.0f);
  col[ImGuiCol_Separator] = ImVec4(0.25f, 0.28f, 0.29f, 1.0f);
  col[ImGuiCol_Tab] = ImVec4(0.16f, 0.22f, 0.22f, 1.0f);
  col[ImGuiCol_TabHovered] = ImVec4(0.22f, 0.41f, 0.39f, 1.0f);
  col[ImGuiCol_TabActive] = ImVec4(0.20f, 0.36f, 0.34f, 1.0f);
  col[ImGuiCol_TableRowBgAlt] = ImVec4(1.0f, 1.0f, 1.0f, 0.03f);
}

}  // namespace dm::gui
