// The window's life: GLFW and GL set-up, the frame loop (step the run on
// its own clock, build the panels, redraw only what changed and show only
// that, so software GL keeps up), the scripted screenshot and frame-log
// modes, and shut-down.
#include <epoxy/gl.h>
#define GLFW_INCLUDE_NONE
#include <GLFW/glfw3.h>
#include <imgui.h>
#include <imgui_internal.h>
#include <imgui_impl_glfw.h>
#include <imgui_impl_opengl3.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <optional>
#include <memory>
#include <filesystem>
#include <iostream>
#include <sstream>

#include "app/gui/gui.hpp"
#include "app/gui/gui_state.hpp"
#include "app/gui/window_surface.hpp"
#include "core/io.hpp"
#include "render/image.hpp"

namespace dm::gui {

namespace {

using Clock = std::chrono::steady_clock;

// Wall time the stepping may take per frame, s: keeps 30+ frames per second
// when a fast-forward asks for more steps than the machine can do.
constexpr double stepBudget = 0.012;
// Simulated wall time per frame in scripted runs, s: fixed, so a screenshot
// after N frames shows the same instant on every machine.
constexpr double scriptedFrameSeconds = 1.0 / 60.0;
// Shortest frame of an interactive run, s: 60 frames per second at most,
// leaving the cores to the workers and other programs.
constexpr double frameSeconds = 1.0 / 60.0;
// Longest wait for input while nothing moves, s.
constexpr double idleWait = 0.5;
// Body font, px: legible at 1280 x 800.
constexpr float fontPixels = 15.0f;
constexpr const char* fontFile = "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf";

double msSince(Clock::time_point t) { return std::chrono::duration<double, std::milli>(Clock::now() - t).count(); }

void glfwError(int code, const char* text) { std::cerr << "dwellmark: GLFW error " << code << ": " << text << "\n"; }

// Times the stages of a frame. With `settle` each lap first waits for the
// GL work queued so far (glFinish), so the GL time lands on the stage that
// caused it rather than on a later one; without it, laps are CPU time plus
// whatever the driver chose to do then.
class StageClock {
 public:
  explicit StageClock(bool settle) : settle_(settle) {}
  double lap() {
    if (settle_) glFinish();
    const double ms = msSince(last_);
    last_ = Clock::now();
    return ms;
  }

 private:
  bool settle_;
  Clock::time_point last_ = Clock::now();
};

// Fills a rectangle of the bound framebuffer with the panels' background colour.
void clearToWindowColour(const PixelRect& r) {
  const ImVec4 bg = ImGui::GetStyle().Colors[ImGuiCol_WindowBg];
  glEnable(GL_SCISSOR_TEST);
  glScissor(r.x, r.y, r.w, r.h);
  glClearColor(bg.x, bg.y, bg.z, 1.0f);
  glClear(GL_COLOR_BUFFER_BIT);
  glDisable(GL_SCISSOR_TEST);
}

// The smallest rectangle holding both.
PixelRect unite(const PixelRect& a, const PixelRect& b) {
  const int x0 = std::min(a.x, b.x), y0 = std::min(a.y, b.y);
  const int x1 = std::max(a.x + a.w, b.x + b.w), y1 = std::max(a.y + a.h, b.y + b.h);
  return {x0, y0, x1 - x0, y1 - y0};
}

// The 3D view's region in framebuffer pixels (bottom-left origin).
PixelRect viewPixels(const Rect& r, int framebufferHeight, float scale) {
  return {int(r.x * scale), int(framebufferHeight - (r.y + r.h) * scale), int(r.w * scale), int(r.h * scale)};
}

// Everything the 3D view's picture depends on: when none of it changed
// since the last drawing, the pixels on screen are still right.
struct ViewKey {
  std::uint64_t revision = 0, motionRevision = 0;
  long steps = -1;
  gl::ViewMatrices view;
  SceneOverlays overlays;
  PixelRect pixels;
  bool operator==(const ViewKey& o) const {
    return revision == o.revision && motionRevision == o.motionRevision && steps == o.steps &&
           view.viewFromWorld == o.view.viewFromWorld && view.clipFromView == o.view.clipFromView &&
           overlays == o.overlays && pixels.x == o.pixels.x && pixels.y == o.pixels.y && pixels.w == o.pixels.w &&
           pixels.h == o.pixels.h;
  }
};

ViewKey viewKey(const GuiContext& c, const PixelRect& pixels) {
  const Rect& r = c.layout.view3d;
  return {c.session.revision(), c.session.motionRevision(), c.session.live().steps, c.ui.camera.matrices(r.w / r.h),
          c.ui.overlays, pixels};
}

// The tiled panels whose readouts move while something runs. Between
// full redraws each is redrawn alone when due, one a frame, so that no
// single frame pays for them all.
constexpr std::array<const char*, 5> livePanels = {panel_title::playback, panel_title::timelines, panel_title::observer,
                                                   panel_title::readings, panel_title::menuBar};

// What the window showed after the last frame.
struct Shown {
  ViewKey view;
  std::array<double, livePanels.size()> liveAt{};  ///< wall-clock time each live panel was last drawn, s
  bool lively = false;  ///< something moved during the last frame (the run or a worker)
  ImGuiID hovered = 0;  ///< the control under the mouse when the panels were last drawn whole
};

// Draws the 3D view into its region of the window.
void drawView(GuiContext& c, const PixelRect& px) {
  const Rect& r = c.layout.view3d;
  const auto start = Clock::now();
  const ViewScene scene = currentScene(c);
  c.ui.times.last.sceneMs = msSince(start);
  c.renderer.draw(scene, c.ui.camera.matrices(r.w / r.h), px.x, px.y, px.w, px.h);
}

// Seconds between redraws of a live panel while the run plays or a worker
// runs; otherwise the panels are redrawn on input only.
constexpr double panelRefresh = 0.1;

// True when the run plays or a background job runs: the readouts move.
bool lively(const Session& s) {
  return s.playing() || s.forecastBusy() || s.observerBusy() || s.adviceBusy() || s.reviewBusy();
}

// True while a tooltip shows (it follows the mouse).
bool tooltipShown() {
  for (const ImGuiWindow* w : ImGui::GetCurrentContext()->Windows)
    if (w->Active && (w->Flags & ImGuiWindowFlags_Tooltip)) return true;
  return false;
}

// True when every panel must be redrawn: input (buttons, wheel, keys,
// text), the hovered control changed, an open popup, tooltip or floating
// window, a control in use, or the moment the run and the workers came to
// rest (their last readouts). A mouse merely moving within one control
// changes nothing on screen.
bool allPanelsDue(const GuiContext& c, const Shown& shown) {
  const GuiState& ui = c.ui;
  const ImGuiIO& io = ImGui::GetIO();
  bool input = io.MouseWheel != 0 || !io.InputQueueCharacters.empty();
  for (bool down : io.MouseDown) input = input || (down && !ui.viewDragging);
  for (bool down : io.KeysDown) input = input || down;
  const bool hoverChanged = ImGui::GetCurrentContext()->HoveredId != shown.hovered;
  const bool overlay = ImGui::IsPopupOpen("", ImGuiPopupFlags_AnyPopupId) || ui.showMetrics || ui.showHelp ||
                       ImGui::IsAnyItemActive() || ui.chooser.visible || tooltipShown();
  const bool cameToRest = shown.lively && !lively(c.session);
  return input || hoverChanged || overlay || cameToRest;
}

// The live panel to redraw alone this frame (the longest waiting one, once
// panelRefresh has passed), or -1.
int livePanelDue(const GuiContext& c, const Shown& shown, double now) {
  if (!lively(c.session)) return -1;
  const auto oldest = std::min_element(shown.liveAt.begin(), shown.liveAt.end());
  return now - *oldest >= panelRefresh ? int(oldest - shown.liveAt.begin()) : -1;
}

// A window's rectangle in framebuffer pixels (bottom-left origin), rounded outwards.
PixelRect windowPixels(const ImGuiWindow& w, int framebufferHeight, float scale) {
  const int x0 = int(std::floor(w.Pos.x * scale)), x1 = int(std::ceil((w.Pos.x + w.Size.x) * scale));
  const int top = int(std::floor(w.Pos.y * scale)), bottom = int(std::ceil((w.Pos.y + w.Size.y) * scale));
  return {x0, framebufferHeight - bottom, x1 - x0, bottom - top};
}

// Clears one panel's rectangle and draws that panel (with its child
// windows) alone from this frame's draw data; returns the rectangle, or
// nothing when the panel is not shown.
std::optional<PixelRect> drawPanelAlone(const char* title, int framebufferHeight, float scale) {
  ImGuiWindow* root = ImGui::FindWindowByName(title);
  if (!root || !root->Active) return std::nullopt;
  std::vector<const ImDrawList*> own;
  for (const ImGuiWindow* w : ImGui::GetCurrentContext()->Windows)
    if (w->Active && w->RootWindow == root) own.push_back(w->DrawList);
  ImDrawData* all = ImGui::GetDrawData();
  std::vector<ImDrawList*> lists;
  for (int i = 0; i < all->CmdListsCount; ++i)
    if (std::find(own.begin(), own.end(), all->CmdLists[i]) != own.end()) lists.push_back(all->CmdLists[i]);
  ImDrawData alone = *all;
  alone.CmdLists = lists.data();
  alone.CmdListsCount = int(lists.size());
  alone.TotalVtxCount = alone.TotalIdxCount = 0;
  for (const ImDrawList* l : lists) alone.TotalVtxCount += l->VtxBuffer.Size, alone.TotalIdxCount += l->IdxBuffer.Size;
  const PixelRect r = windowPixels(*root, framebufferHeight, scale);
  clearToWindowColour(r);
  ImGui_ImplOpenGL3_RenderDrawData(&alone);
  return r;
}

// The whole window's pixels and where the panels are, for scripted checks.
void writeScreenshot(const GuiContext& c, WindowSurface& surface, const std::string& path) {
  const Image picture = surface.read();
  writePng(path, picture);
  auto rect = [](const Rect& r) { return "[" + fmt(r.x, 6) + ", " + fmt(r.y, 6) + ", " + fmt(r.w, 6) + ", " + fmt(r.h, 6) + "]"; };
  std::ostringstream o;
  o << "{\n  \"window_px\": [" << picture.width << ", " << picture.height << "],\n  \"regions_px_xywh\": {\n"
    << "    \"view3d\": " << rect(c.layout.view3d) << ",\n    \"observer\": " << rect(c.layout.observer) << ",\n"
    << "    \"design\": " << rect(c.layout.design) << ",\n    \"timelines\": " << rect(c.layout.timelines) << "\n  },\n"
    << "  \"time_s\": " << fmt(c.session.live().now().t, 9) << "\n}\n";
  writeFileAtomic(path + ".json", o.str());
  std::cout << "wrote " << path << " (" << picture.width << " x " << picture.height << " px)\n";
}

void writeFrameLog(const GuiState& ui, const std::string& path) {
  std::ostringstream o;
  o << "frame,frame_ms,step_ms,panels_ms,upload_ms,scene_ms,view_ms,draw_panels_ms,present_ms,steps,view_drawn,"
       "panels_drawn\n";
  for (const FrameLogRow& r : ui.frameLog) {
    const FrameStages& s = r.stages;
    o << r.frame << ',' << fmt(r.frameMs, 6) << ',' << fmt(s.stepMs, 6) << ',' << fmt(s.panelsMs, 6) << ','
      << fmt(s.uploadMs, 6) << ',' << fmt(s.sceneMs, 6) << ',' << fmt(s.viewMs, 6) << ',' << fmt(s.drawPanelsMs, 6)
      << ',' << fmt(s.presentMs, 6) << ',' << s.steps << ',' << int(s.viewDrawn) << ',' << int(s.panelsDrawn) << '\n';
  }
  writeFileAtomic(path, o.str());
}

// Mean and 95th percentile frame time over the logged frames, skipping the
// first ten (start-up: shader compilation, first uploads).
void printFrameStats(const GuiState& ui, int width, int height) {
  FrameTimes t;
  t.capacity = ui.frameLog.size();
  for (std::size_t i = 10; i < ui.frameLog.size(); ++i) t.add(ui.frameLog[i].frameMs);
  if (t.frameMs.empty()) return;
  std::cout << "frames: " << t.frameMs.size() << " timed at " << width << " x " << height << ", mean "
            << fmt(t.mean(), 4) << " ms (" << fmt(1000.0 / t.mean(), 4) << " frames/s), 95th percentile "
            << fmt(t.percentile(0.95), 4) << " ms\n";
}

// Builds the panels (ImGui's CPU side) and handles their input.
void buildPanels(GuiContext& c, GLFWwindow* window) {
  ImGui_ImplOpenGL3_NewFrame();
  ImGui_ImplGlfw_NewFrame();
  ImGui::NewFrame();
  int width = 0, height = 0;
  glfwGetWindowSize(window, &width, &height);
  drawMenuBar(c);
  c.layout = computeLayout(float(width), float(height), ImGui::GetFrameHeight());
  drawDesignPanel(c);
  drawPlaybackBar(c);
  drawTimelines(c);
  drawObserverPanel(c);
  drawReadings(c);
  drawMetricsWindow(c);
  drawHelpWindow(c);
  drawFileDialogs(c);
  handleShortcuts(c);
  handleViewMouse(c);
  ImGui::Render();
}

// Redraws what changed since the last frame and shows only that: the 3D
// view when its picture moved, every panel when they are due (then the
// view too: the clear under the panels covers it), else at most one live
// panel. `forceAll` redraws everything.
void redraw(GuiContext& c, GLFWwindow* window, WindowSurface& surface, Shown& shown, double now, bool forceAll,
            StageClock& clock) {
  FrameStages& st = c.ui.times.last;
  int width = 0, fbWidth = 0, fbHeight = 0;
  glfwGetWindowSize(window, &width, nullptr);
  glfwGetFramebufferSize(window, &fbWidth, &fbHeight);
  const float scale = width > 0 ? float(fbWidth) / float(width) : 1.0f;
  const PixelRect viewPx = viewPixels(c.layout.view3d, fbHeight, scale);
  const PixelRect whole{0, 0, fbWidth, fbHeight};
  const bool fresh = surface.begin(fbWidth, fbHeight);
  const bool all = forceAll || fresh || allPanelsDue(c, shown);
  const int live = all ? -1 : livePanelDue(c, shown, now);
  const ViewKey key = viewKey(c, viewPx);
  st.viewDrawn = all || !(key == shown.view);
  // The panels' background is this clear: the tiled panels draw none of their own.
  if (all) clearToWindowColour(whole);
  if (st.viewDrawn && viewPx.w >= 2 && viewPx.h >= 2) {
    drawView(c, viewPx);
    shown.view = key;
  }
  st.viewMs = clock.lap();
  std::optional<PixelRect> changed = st.viewDrawn ? std::optional(viewPx) : std::nullopt;
  if (all) {
    ImGui_ImplOpenGL3_RenderDrawData(ImGui::GetDrawData());
    shown.liveAt.fill(now);
    shown.hovered = ImGui::GetCurrentContext()->HoveredId;
    changed = whole;
    st.panelsDrawn = 2;
  } else if (live >= 0) {
    if (const std::optional<PixelRect> r = drawPanelAlone(livePanels[std::size_t(live)], fbHeight, scale))
      changed = changed ? unite(*changed, *r) : *r;
    shown.liveAt[std::size_t(live)] = now;
    st.panelsDrawn = 1;
  }
  shown.lively = lively(c.session);
  st.drawPanelsMs = clock.lap();
  surface.present(changed ? &*changed : nullptr);
  st.presentMs = clock.lap();
}

// One frame: step the run, pick up worker results, build the panels, then
// redraw what changed. `now` is the wall clock (s).
void frame(GuiContext& c, GLFWwindow* window, WindowSurface& surface, Shown& shown, double wallSeconds, double now,
           bool forceAll) {
  FrameStages& st = c.ui.times.last;
  st = FrameStages{};
  StageClock clock(c.ui.settleTimings);
  c.session.setKeepSeconds(std::max(c.ui.overlays.trailSeconds, c.session.scenario().observer.exposure) + 0.5);
  const AdvanceReport adv = c.session.advance(wallSeconds, stepBudget);
  st.steps = adv.steps;
  c.ui.times.behind = adv.behind;
  c.session.poll();
  c.session.refreshObserver();
  st.stepMs = clock.lap();
  buildPanels(c, window);
  st.panelsMs = clock.lap() - st.uploadMs;
  redraw(c, window, surface, shown, now, forceAll, clock);
}

std::string windowTitle(const Session& s) {
  const std::string file = s.path().empty() ? "new scenario" : std::filesystem::path(s.path()).filename().string();
  return "dwellmark: " + file + (s.dirty() ? " (unsaved)" : "");
}

}  // namespace

int runGui(const app::GuiOptions& options) {
  glfwSetErrorCallback(glfwError);
  if (!glfwInit()) {
    std::cerr << "dwellmark: cannot open the display; try xvfb-run -a -s '-screen 0 1280x800x24' dwellmark gui ...\n";
    return app::exitFailure;
  }
  glfwWindowHint(GLFW_CONTEXT_VERSION_MAJOR, 3);
  glfwWindowHint(GLFW_CONTEXT_VERSION_MINOR, 3);
  glfwWindowHint(GLFW_OPENGL_PROFILE, GLFW_OPENGL_CORE_PROFILE);
  glfwWindowHint(GLFW_RESIZABLE, options.frames > 0 ? GLFW_FALSE : GLFW_TRUE);
  GLFWwindow* window = glfwCreateWindow(options.width, options.height, "dwellmark", nullptr, nullptr);
  if (!window) {
    std::cerr << "dwellmark: cannot create an OpenGL 3.3 core window on this display\n";
    glfwTerminate();
    return app::exitFailure;
  }
  glfwMakeContextCurrent(window);
  glfwSwapInterval(options.frames > 0 ? 0 : 1);  // scripted runs: as fast as it goes

  IMGUI_CHECKVERSION();
  ImGui::CreateContext();
  ImGuiIO& io = ImGui::GetIO();
  io.IniFilename = nullptr;  // our layout is computed, not saved
  if (std::filesystem::exists(fontFile)) io.Fonts->AddFontFromFileTTF(fontFile, fontPixels);
  applyTheme();
  ImGui_ImplGlfw_InitForOpenGL(window, true);
  ImGui_ImplOpenGL3_Init("#version 330 core");

  int code = app::exitOk;
  {
    // Workers yield to the frame loop, except in screenshot runs, which wait for them.
    Session session(options.scenario, options.scenarioPath, options.screenshotPath.empty());
    GuiState ui;
    ui.camera = framingPreset(options.scenario);
    ui.recentFile = options.frames > 0 ? std::string() : defaultRecentFilesPath();
    if (!ui.recentFile.empty()) ui.recent = loadRecentFiles(ui.recentFile);
    if (!options.scenarioPath.empty() && !ui.recentFile.empty()) ui.recent.add(options.scenarioPath);
    try {
      ui.presets = loadSurfacePresets(bundledSurfaceDir());
    } catch (const std::exception& e) {
      ui.presetError = e.what();
    }
    try {
      gl::SceneRenderer renderer;
      GuiContext c{session, ui, renderer, {}};
      WindowSurface surface(window);
      Shown shown;
      std::string title;
      ui.settleTimings = !options.frameLogPath.empty();
      const bool scripted = options.frames > 0;
      const auto began = Clock::now();
      auto last = began;
      for (long n = 0; !ui.quit; ++n) {
        const auto start = Clock::now();
        glfwPollEvents();
        if (glfwWindowShouldClose(window)) {
          glfwSetWindowShouldClose(window, GLFW_FALSE);
          requestQuit(c);
        }
        const bool lastFrame = scripted && n + 1 >= options.frames;
        // Before the last scripted frame, let the background work finish so
        // the picture shows its results.
        if (lastFrame) {
          session.waitForForecast();
          session.waitForObserver();
          // The visitor's view of the stretch just before this frame, whatever the worker managed meanwhile.
          if (session.requestObserverShot(liveObserverSize)) session.waitForObserver();
        }
        const auto timed = Clock::now();  // the frame's own time starts after those waits
        // Scripted runs use a fixed clock, so the same frames show the same instants.
        const double wall = scripted ? scriptedFrameSeconds : std::chrono::duration<double>(start - last).count();
        const double now = scripted ? double(n) * scriptedFrameSeconds : std::chrono::duration<double>(start - began).count();
        last = start;
        frame(c, window, surface, shown, std::min(wall, 0.1), now, n < 2 || lastFrame);
        if (lastFrame && !options.screenshotPath.empty()) writeScreenshot(c, surface, options.screenshotPath);
        if (const std::string t = windowTitle(session); t != title) glfwSetWindowTitle(window, (title = t).c_str());
        ui.times.add(msSince(timed));
        ui.frameLog.push_back({n, msSince(timed), ui.times.last});
        if (lastFrame) ui.quit = true;
        // Interactive runs wait for input between frames: a frame's worth of
        // time while something moves, longer when nothing does.
        const double wait = shown.lively ? frameSeconds - msSince(start) / 1e3 : idleWait;
        if (!scripted && wait > 0) glfwWaitEventsTimeout(wait);
      }
      if (!options.frameLogPath.empty()) {
        writeFrameLog(ui, options.frameLogPath);
        printFrameStats(ui, options.width, options.height);
      }
      glDeleteTextures(1, &ui.observerTexture);
    } catch (const std::exception& e) {
      std::cerr << "dwellmark: GUI error: " << e.what() << "\n";
      code = app::exitFailure;
    }
    if (!ui.recentFile.empty()) {
      try {
        saveRecentFiles(ui.recent, ui.recentFile);
      } catch (const std::exception& e) {
        std::cerr << "dwellmark: cannot keep the recent-files list: " << e.what() << "\n";
      }
    }
  }
  ImGui_ImplOpenGL3_Shutdown();
  ImGui_ImplGlfw_Shutdown();
  ImGui::DestroyContext();
  glfwDestroyWindow(window);
  glfwTerminate();
  return code;
}

// ---- layout and timings ------------------------------------------------------

Layout computeLayout(float width, float height, float menuHeight) {
  // Columns: design controls on the left, the visitor's view and the
  // readings on the right, the playback bar, 3D view and plots between.
  const float left = std::max(300.0f, width * 0.27f);
  const float right = std::max(300.0f, width * 0.25f);
  const float middle = std::max(100.0f, width - left - right);
  const float top = menuHeight;
  const float body = height - top;
  const float playback = 66.0f;
  const float plots = std::max(150.0f, body * 0.27f);
  const float observer = std::min(body * 0.55f, right + 96.0f);
  Layout l;
  l.design = {0, top, left, body};
  l.playback = {left, top, middle, playback};
  l.view3d = {left, top + playback, middle, std::max(2.0f, body - playback - plots)};
  l.timelines = {left, top + body - plots, middle, plots};
  l.observer = {left + middle, top, right, observer};
  l.readings = {left + middle, top + observer, right, body - observer};
  return l;
}

void FrameTimes::add(double ms) {
  frameMs.push_back(ms);
  while (frameMs.size() > capacity) frameMs.pop_front();
}

double FrameTimes::mean() const {
  if (frameMs.empty()) return 0;
  double s = 0;
  for (double v : frameMs) s += v;
  return s / double(frameMs.size());
}

double FrameTimes::percentile(double p) const {
  if (frameMs.empty()) return 0;
  std::vector<double> v(frameMs.begin(), frameMs.end());
  std::sort(v.begin(), v.end());
  return v[std::min(v.size() - 1, std::size_t(p * double(v.size() - 1) + 0.5))];
}

}  // namespace dm::gui
