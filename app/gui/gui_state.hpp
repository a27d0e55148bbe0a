// Everything the window remembers between frames that is not the scenario
// or the run (those live in the Session): camera, overlays, open dialogs,
// per-field messages, recent files, timings. One struct, no static locals.
#pragma once
#include <deque>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "app/gui/camera.hpp"
#include "app/gui/model/files.hpp"
#include "app/gui/model/session.hpp"
#include "core/surface_preset.hpp"
#include "render/gl/scene_renderer.hpp"
#include "render/view_scene.hpp"

namespace dm::gui {

/// A screen rectangle in window pixels, origin at the top left.
struct Rect {
  float x = 0, y = 0, w = 0, h = 0;
  bool contains(float px, float py) const { return px >= x && py >= y && px < x + w && py < y + h; }
};

/// Where each panel sits; recomputed from the window size every frame.
struct Layout {
  Rect design, playback, view3d, timelines, observer, readings;
};
Layout computeLayout(float width, float height, float menuHeight);

/// What the file chooser is choosing for.
enum class FileTask { Open, SaveAs, ExportView, ExportObserver, ExportCsv, ReviewFolder };

/// The in-window file chooser.
struct FileChooser {
  bool visible = false;
  bool justOpened = false;
  FileTask task = FileTask::Open;
  std::string folder;
  std::string name;  ///< file name typed or picked
  std::string error;
  std::vector<FolderEntry> entries;
};

/// An action waiting for the unsaved-changes question to be answered.
enum class Deferred { None, NewScenario, OpenFile, Quit };

/// Where one frame's time went, ms (each stage's GL work included when the
/// frame log asks for settled timings), and what the frame redrew.
struct FrameStages {
  double stepMs = 0;     ///< stepping the run, picking up worker results
  double panelsMs = 0;   ///< building the panels (ImGui, CPU), without the upload
  double uploadMs = 0;   ///< uploading a new visitor's-view picture
  double sceneMs = 0;    ///< building the 3D view's scene description (CPU)
  double viewMs = 0;     ///< drawing the 3D view (GL), scene building included
  double drawPanelsMs = 0;  ///< drawing the panels (GL)
  double presentMs = 0;  ///< putting the pixels on the screen
  long steps = 0;        ///< integrator steps
  bool viewDrawn = false;
  int panelsDrawn = 0;   ///< 0 none, 1 one live panel, 2 all panels
};

/// Frame timings for the metrics window and the frame log.
struct FrameTimes {
  std::deque<double> frameMs;  ///< the last `capacity` whole-frame times
  std::size_t capacity = 240;
  FrameStages last;            ///< the stages of the last frame
  bool behind = false;         ///< the simulation could not keep up last frame
  void add(double ms);
  double mean() const;
  double percentile(double p) const;
};

/// One row of the frame log.
struct FrameLogRow {
  long frame;
  double frameMs;
  FrameStages stages;
};

/// The whole UI state.
struct GuiState {
  OrbitCamera camera;
  SceneOverlays overlays;
  bool showMetrics = false;
  bool showHelp = false;
  bool showAbout = false;
  double timelineSeconds = 10;  ///< s of history the plots show (0 = the whole run)
  std::map<std::string, std::string> fieldMessages;  ///< refused edits, by field path
  FileChooser chooser;
  Deferred deferred = Deferred::None;
  std::string deferredPath;    ///< file to open once the question is answered
  bool askUnsaved = false;
  RecentFiles recent;
  std::string recentFile;      ///< where the recent list is kept ("" = nowhere)
  std::vector<SurfacePreset> presets;
  std::string presetError;
  int exportWidth = 1920, exportHeight = 1200;  ///< px, picture exports
  int reviewLaunches = 200;     ///< visitor launches of a design review (1..100000, as `review --launches`)
  bool reviewForce = false;     ///< a review may write into a folder that already holds files
  std::uint64_t reviewsSeen = 0;  ///< finished reviews whose outcome has been shown
  int adviceSpots = 4;                          ///< spots the advisor designs for (2..20)
  float adviceFromRevS = 6, adviceToRevS = 12;  ///< precession range a visitor reaches, rev/s
  std::string status;          ///< last message of the status line
  FrameTimes times;
  std::vector<FrameLogRow> frameLog;
  bool settleTimings = false;  ///< wait for the GL work after each stage (frame log runs), so each stage's time is its own
  bool quit = false;           ///< leave the main loop
  bool viewDragging = false;   ///< a mouse drag that began in the 3D view is going on
  std::uint64_t builtLook = ~0ull;  ///< session look revision uploaded to the renderer
  unsigned observerTexture = 0;     ///< GL texture of the observer picture (0 = none yet)
  double uploadedShotEnd = -1;      ///< end time of the picture in that texture, s
  int uploadedShotSize = 0;         ///< its side, px
};

/// What the panels work with.
struct GuiContext {
  Session& session;
  GuiState& ui;
  gl::SceneRenderer& renderer;
  Layout layout;
};

// ---- panels (one function per panel, in app/gui/panel_*.cpp) --------------
void drawMenuBar(GuiContext& c);
void drawDesignPanel(GuiContext& c);
void drawPlaybackBar(GuiContext& c);
void drawTimelines(GuiContext& c);
void drawReadings(GuiContext& c);
void drawObserverPanel(GuiContext& c);
void drawMetricsWindow(GuiContext& c);
void drawHelpWindow(GuiContext& c);
void drawFileDialogs(GuiContext& c);
/// Keyboard shortcuts (when no text field has the keyboard).
void handleShortcuts(GuiContext& c);
/// Mouse orbit, pan and zoom in the 3D view (when the UI does not want the mouse).
void handleViewMouse(GuiContext& c);

// ---- actions shared by menus, buttons and shortcuts -----------------------
void requestOpen(GuiContext& c, const std::string& path);  ///< asks about unsaved changes first
void requestNew(GuiContext& c);
void requestQuit(GuiContext& c);
void saveScenario(GuiContext& c);  ///< to its file, or asks for one
void openChooser(GuiContext& c, FileTask task);
/// The 3D view's scene at this instant.
ViewScene currentScene(GuiContext& c);
/// Renders the 3D view offscreen at the export size and writes a PNG.
void exportViewPicture(GuiContext& c, const std::string& path);
void exportTrajectoryCsv(GuiContext& c, const std::string& path);
/// Starts the design review of the current scenario into `folder` on the session's worker.
void startReview(GuiContext& c, const std::string& folder);
/// Starts an observer exposure at the export size that writes a PNG when done.
void exportObserverPicture(GuiContext& c, const std::string& path);
void applyOutcome(GuiContext& c, const std::string& path, const EditOutcome& out);

/// The keyboard shortcut table (shown by the help window).
struct Shortcut {
  int key;  ///< GLFW key code
  bool ctrl, shift;
  const char* keys;  ///< as shown
  const char* what;
};
const std::vector<Shortcut>& shortcuts();

/// The tiled panels' window titles.
namespace panel_title {
inline constexpr const char* design = "Design";
inline constexpr const char* playback = "Playback";
inline constexpr const char* timelines = "Timelines";
inline constexpr const char* observer = "Visitor's view";
inline constexpr const char* readings = "Readings";
inline constexpr const char* menuBar = "##MainMenuBar";  ///< Dear ImGui's name for the main menu bar
}  // namespace panel_title

/// Begins one of the tiled panels at its layout rectangle (fixed, not
/// movable or resizable); pair with ImGui::End().
void beginFixedPanel(const char* title, const Rect& r, int extraFlags = 0);

/// Colours and spacing of our theme.
void applyTheme();

}  // namespace dm::gui
