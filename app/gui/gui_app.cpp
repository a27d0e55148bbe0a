// The window's life: GLFW and GL set-up, the frame loop (step the run on
// its own clock, draw the panels, draw the 3D view, show), the scripted
// screenshot and frame-log modes, and shut-down.
#include <epoxy/gl.h>
#define GLFW_INCLUDE_NONE
#include <GLFW/glfw3.h>
#include <imgui.h>
#include <imgui_impl_glfw.h>
#include <imgui_impl_opengl3.h>

#include <chrono>
#include <memory>
#include <filesystem>
#include <iostream>
#include <sstream>

#include "app/gui/gui.hpp"
#include "app/gui/gui_state.hpp"
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
// Body font, px: legible at 1280 x 800.
constexpr float fontPixels = 15.0f;
constexpr const char* fontFile = "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf";

double msSince(Clock::time_point t) { return std::chrono::duration<double, std::milli>(Clock::now() - t).count(); }

void glfwError(int code, const char* text) { std::cerr << "dwellmark: GLFW error " << code << ": " << text << "\n"; }

// Draws the 3D view into its region of the window.
void drawView(GuiContext& c, int framebufferHeight, float scale) {
  const Rect& r = c.layout.view3d;
  if (r.w < 2 || r.h < 2) return;
  const ViewScene scene = currentScene(c);
  c.renderer.draw(scene, c.ui.camera.matrices(r.w / r.h), int(r.x * scale), int(framebufferHeight - (r.y + r.h) * scale),
                  int(r.w * scale), int(r.h * scale));
}

// The window's pixels are drawn into a canvas that keeps them between
// frames: the 3D view is redrawn every frame, the panels only when they may
// have changed (input, an open popup or floating window, or every
// panelRefresh seconds for the live readouts), which keeps software GL fast.
struct Canvas {
  std::unique_ptr<gl::OffscreenTarget> target;
  double lastPanels = -1e9;  ///< wall-clock time the panels were last drawn, s
};
constexpr double panelRefresh = 0.1;

bool panelsDue(const GuiState& ui, const Rect& view, double now, double lastPanels) {
  const ImGuiIO& io = ImGui::GetIO();
  bool input = io.MouseWheel != 0 || !io.InputQueueCharacters.empty();
  for (bool down : io.MouseDown) input = input || (down && !ui.viewDragging);
  for (bool down : io.KeysDown) input = input || down;
  const bool moved = io.MouseDelta.x != 0 || io.MouseDelta.y != 0;
  input = input || (moved && !ui.viewDragging && !view.contains(io.MousePos.x, io.MousePos.y));
  const bool overlay = ImGui::IsPopupOpen("", ImGuiPopupFlags_AnyPopupId) || ui.showMetrics || ui.showHelp ||
                       ImGui::IsAnyItemHovered() || ImGui::IsAnyItemActive() || ui.chooser.visible;
  return input || overlay || now - lastPanels >= panelRefresh;
}

// The whole window's pixels and where the panels are, for scripted checks.
void writeScreenshot(const GuiContext& c, gl::OffscreenTarget& canvas, const std::string& path) {
  writePng(path, canvas.read());
  auto rect = [](const Rect& r) { return "[" + fmt(r.x, 6) + ", " + fmt(r.y, 6) + ", " + fmt(r.w, 6) + ", " + fmt(r.h, 6) + "]"; };
  std::ostringstream o;
  o << "{\n  \"window_px\": [" << canvas.width() << ", " << canvas.height() << "],\n  \"regions_px_xywh\": {\n"
    << "    \"view3d\": " << rect(c.layout.view3d) << ",\n    \"observer\": " << rect(c.layout.observer) << ",\n"
    << "    \"design\": " << rect(c.layout.design) << ",\n    \"timelines\": " << rect(c.layout.timelines) << "\n  },\n"
    << "  \"time_s\": " << fmt(c.session.live().now().t, 9) << "\n}\n";
  writeFileAtomic(path + ".json", o.str());
}

void writeFrameLog(const GuiState& ui, const std::string& path) {
  std::ostringstream o;
  o << "frame,frame_ms,step_ms,scene_ms,steps\n";
  for (const FrameLogRow& r : ui.frameLog)
    o << r.frame << ',' << fmt(r.frameMs, 6) << ',' << fmt(r.stepMs, 6) << ',' << fmt(r.sceneMs, 6) << ',' << r.steps << '\n';
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

// One frame: step, poll jobs, panels, 3D view, ImGui on top, into the
// canvas, then onto the window. `now` is the wall clock (s); `forcePanels`
// draws the panels whatever changed.
void frame(GuiContext& c, GLFWwindow* window, Canvas& canvas, double wallSeconds, double now, bool forcePanels) {
  c.session.setKeepSeconds(std::max(c.ui.overlays.trailSeconds, c.session.scenario().observer.exposure) + 0.5);
  const auto stepStart = Clock::now();
  const AdvanceReport adv = c.session.advance(wallSeconds, stepBudget);
  c.ui.times.stepMs = msSince(stepStart);
  c.ui.times.steps = adv.steps;
  c.ui.times.behind = adv.behind;
  c.session.poll();
  c.session.refreshObserver();

  ImGui_ImplOpenGL3_NewFrame();
  ImGui_ImplGlfw_NewFrame();
  ImGui::NewFrame();
  int width = 0, height = 0, fbWidth = 0, fbHeight = 0;
  glfwGetWindowSize(window, &width, &height);
  glfwGetFramebufferSize(window, &fbWidth, &fbHeight);
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

  if (!canvas.target || canvas.target->width() != fbWidth || canvas.target->height() != fbHeight) {
    canvas.target = std::make_unique<gl::OffscreenTarget>(fbWidth, fbHeight, 1);
    forcePanels = true;
  }
  const bool panels = forcePanels || panelsDue(c.ui, c.layout.view3d, now, canvas.lastPanels);
  canvas.target->bind();
  if (panels) {
    glViewport(0, 0, fbWidth, fbHeight);
    glClearColor(0.07f, 0.075f, 0.085f, 1.0f);
    glClear(GL_COLOR_BUFFER_BIT);
  }
  const auto sceneStart = Clock::now();
  drawView(c, fbHeight, width > 0 ? float(fbWidth) / float(width) : 1.0f);
  c.ui.times.sceneMs = msSince(sceneStart);
  if (panels) {
    canvas.target->bind();
    ImGui_ImplOpenGL3_RenderDrawData(ImGui::GetDrawData());
    canvas.lastPanels = now;
  }
  canvas.target->copyToWindow();
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
    Session session(options.scenario, options.scenarioPath);
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
      Canvas canvas;
      const auto began = Clock::now();
      auto last = began;
      for (long n = 0; !ui.quit; ++n) {
        const auto start = Clock::now();
        glfwPollEvents();
        if (glfwWindowShouldClose(window)) {
          glfwSetWindowShouldClose(window, GLFW_FALSE);
          requestQuit(c);
        }
        const bool scripted = options.frames > 0;
        const bool lastFrame = scripted && n + 1 >= options.frames;
        // Before the last scripted frame, let the background work finish so
        // the picture shows its results.
        if (lastFrame) {
          session.waitForForecast();
          session.waitForObserver();
        }
        // Scripted runs use a fixed clock, so the same frames show the same instants.
        const double wall = scripted ? scriptedFrameSeconds : std::chrono::duration<double>(start - last).count();
        const double now = scripted ? double(n) * scriptedFrameSeconds : std::chrono::duration<double>(start - began).count();
        last = start;
        frame(c, window, canvas, std::min(wall, 0.1), now, n < 2 || lastFrame);
        if (lastFrame && !options.screenshotPath.empty()) {
          writeScreenshot(c, *canvas.target, options.screenshotPath);
          std::cout << "wrote " << options.screenshotPath << " (" << canvas.target->width() << " x "
                    << canvas.target->height() << " px)\n";
        }
        glfwSwapBuffers(window);
        glfwSetWindowTitle(window, windowTitle(session).c_str());
        ui.times.add(msSince(start));
        ui.frameLog.push_back({n, msSince(start), ui.times.stepMs, ui.times.sceneMs, ui.times.steps});
        if (lastFrame) ui.quit = true;
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
