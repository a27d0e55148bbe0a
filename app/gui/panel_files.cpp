// Files and exports: the menu bar, the in-window file chooser, the
// unsaved-changes question, and the actions behind them (open, save,
// pictures of the 3D view rendered offscreen, the trajectory CSV, the
// design review on a worker thread).
#include <imgui.h>
#include <imgui_stdlib.h>

#include <algorithm>
#include <filesystem>

#include "app/gui/gui_state.hpp"
#include "core/export.hpp"
#include "core/io.hpp"
#include "render/image.hpp"

namespace dm::gui {

namespace {

namespace fs = std::filesystem;

// Picture export size limits, px: small thumbnails to poster prints, within
// what llvmpipe renders offscreen in a few seconds.
constexpr int minExportSide = 16, maxExportSide = 8192;

const char* chooserTitle(FileTask t) {
  switch (t) {
    case FileTask::Open: return "Open a scenario";
    case FileTask::SaveAs: return "Save the scenario as";
    case FileTask::ExportView: return "Export a picture of the 3D view";
    case FileTask::ExportObserver: return "Export the visitor's view";
    case FileTask::ExportCsv: return "Export the trajectory (CSV)";
    case FileTask::ReviewFolder: return "Write a design review of this scenario into a folder (new or empty)";
  }
  return "";
}

const char* chooserExtension(FileTask t) {
  switch (t) {
    case FileTask::Open:
    case FileTask::SaveAs: return ".json";
    case FileTask::ExportView:
    case FileTask::ExportObserver: return ".png";
    case FileTask::ExportCsv: return ".csv";
    case FileTask::ReviewFolder: return "";
  }
  return "";
}

const char* chooserAction(FileTask t) {
  switch (t) {
    case FileTask::Open: return "Open";
    case FileTask::SaveAs: return "Save";
    case FileTask::ReviewFolder: return "Write review";
    default: return "Export";
  }
}

// The folder's listing; a review chooses a folder, so it lists folders only.
void refreshChooser(FileChooser& f) {
  f.entries = listFolder(f.folder, chooserExtension(f.task));
  if (f.task == FileTask::ReviewFolder)
    f.entries.erase(std::remove_if(f.entries.begin(), f.entries.end(), [](const FolderEntry& e) { return !e.folder; }),
                    f.entries.end());
}

// True when `path` is a folder holding anything.
bool folderHoldsFiles(const std::string& path) {
  std::error_code ec;
  return fs::is_directory(path, ec) && !fs::is_empty(path, ec);
}

void openNow(GuiContext& c, const std::string& path) {
  try {
    c.session.open(path);
    c.ui.recent.add(path);
    c.ui.fieldMessages.clear();
    c.ui.camera = framingPreset(c.session.scenario());
    c.ui.status = "opened " + path;
  } catch (const ScenarioError& e) {
    c.ui.recent.remove(path);
    c.ui.status = "cannot open " + path + ": " + e.what();
  }
}

// Runs the action that waited for the unsaved-changes question.
void runDeferred(GuiContext& c) {
  const Deferred d = c.ui.deferred;
  c.ui.deferred = Deferred::None;
  switch (d) {
    case Deferred::NewScenario:
      c.session.reset(defaultScenario());
      c.ui.camera = framingPreset(c.session.scenario());
      c.ui.status = "new scenario";
      break;
    case Deferred::OpenFile: openNow(c, c.ui.deferredPath); break;
    case Deferred::Quit: c.ui.quit = true; break;
    case Deferred::None: break;
  }
}

void defer(GuiContext& c, Deferred d) {
  c.ui.deferred = d;
  if (c.session.dirty()) c.ui.askUnsaved = true;
  else runDeferred(c);
}

bool saveTo(GuiContext& c, const std::string& path) {
  try {
    c.session.saveAs(path);
    c.ui.recent.add(path);
    c.ui.status = "saved " + path;
    return true;
  } catch (const OutputError& e) {
    c.ui.status = std::string("not saved: ") + e.what();
    return false;
  }
}

// Does what the chooser was opened for; false keeps it open (with a message).
bool finishChooser(GuiContext& c, const std::string& path) {
  FileChooser& f = c.ui.chooser;
  try {
    switch (f.task) {
      case FileTask::Open: requestOpen(c, path); return true;
      case FileTask::SaveAs:
        if (!saveTo(c, path)) return false;
        if (c.ui.deferred != Deferred::None) runDeferred(c);
        return true;
      case FileTask::ExportView: exportViewPicture(c, path); return true;
      case FileTask::ExportObserver: exportObserverPicture(c, path); return true;
      case FileTask::ExportCsv: exportTrajectoryCsv(c, path); return true;
      case FileTask::ReviewFolder: startReview(c, path); return true;
    }
  } catch (const std::exception& e) {
    f.error = e.what();
    return false;
  }
  return true;
}

// The review's options under the folder list: launches and the folder rule.
void reviewOptionsRow(GuiState& ui) {
  ImGui::SetNextItemWidth(140);
  ImGui::InputInt("visitor launches", &ui.reviewLaunches);
  if (ImGui::IsItemHovered()) ImGui::SetTooltip("launches of the visitor ensemble (1 to 100000), as review --launches");
  ImGui::SameLine();
  ImGui::Checkbox("write into a folder that holds files", &ui.reviewForce);
  if (ImGui::IsItemHovered()) ImGui::SetTooltip("as review --force; otherwise such a folder is refused untouched");
}

void drawChooser(GuiContext& c) {
  FileChooser& f = c.ui.chooser;
  if (f.justOpened) {
    ImGui::OpenPopup("chooser");
    f.justOpened = false;
  }
  ImGui::SetNextWindowSize(ImVec2(560, 460), ImGuiCond_Appearing);
  if (!ImGui::BeginPopupModal("chooser", nullptr, ImGuiWindowFlags_NoTitleBar)) return;
  ImGui::TextUnformatted(chooserTitle(f.task));
  ImGui::Separator();
  if (ImGui::Button("Up")) {
    f.folder = joinPath(f.folder, "..");
    refreshChooser(f);
  }
  ImGui::SameLine();
  ImGui::TextWrapped("%s", f.folder.c_str());
  const bool extraRow = f.task == FileTask::ExportView || f.task == FileTask::ExportObserver || f.task == FileTask::ReviewFolder;
  const float footer = ImGui::GetFrameHeightWithSpacing() * (extraRow ? 4 : 3);
  ImGui::BeginChild("entries", ImVec2(0, -footer), true);
  std::string enter;
  for (const FolderEntry& e : f.entries) {
    const std::string shown = e.folder ? e.name + "/" : e.name;
    if (ImGui::Selectable(shown.c_str(), !e.folder && e.name == f.name, ImGuiSelectableFlags_AllowDoubleClick)) {
      if (e.folder) enter = e.name;
      else f.name = e.name;
    }
  }
  ImGui::EndChild();
  if (!enter.empty()) {
    f.folder = joinPath(f.folder, enter);
    refreshChooser(f);
  }
  ImGui::SetNextItemWidth(-1);
  ImGui::InputText("##name", &f.name);
  if (f.task == FileTask::ExportView || f.task == FileTask::ExportObserver) {
    int size[2] = {c.ui.exportWidth, c.ui.exportHeight};
    if (f.task == FileTask::ExportObserver) size[1] = size[0];
    ImGui::SetNextItemWidth(220);
    if (ImGui::InputInt2(f.task == FileTask::ExportView ? "width x height (px)" : "side (px; the view is square)", size)) {
      c.ui.exportWidth = std::clamp(size[0], minExportSide, maxExportSide);
      c.ui.exportHeight = std::clamp(size[1], minExportSide, maxExportSide);
    }
  }
  if (f.task == FileTask::ReviewFolder) reviewOptionsRow(c.ui);
  const std::string path = f.name.empty() ? std::string() : joinPath(f.folder, f.name);
  if (!path.empty() && f.task == FileTask::ReviewFolder && folderHoldsFiles(path)) {
    ImGui::SameLine();
    ImGui::TextDisabled("(holds files)");
  } else if (!path.empty() && f.task != FileTask::Open && f.task != FileTask::ReviewFolder && fs::exists(path)) {
    ImGui::SameLine();
    ImGui::TextDisabled("(replaces the existing file)");
  }
  if (!f.error.empty()) ImGui::TextColored(ImVec4(1.0f, 0.45f, 0.35f, 1.0f), "%s", f.error.c_str());
  const bool ready = !path.empty();
  if (!ready) ImGui::BeginDisabled();
  if (ImGui::Button(chooserAction(f.task), ImVec2(110, 0))) {
    f.error.clear();
    const bool named = f.task == FileTask::ReviewFolder || fs::path(path).has_extension();
    const std::string target = named ? path : withExtension(path, chooserExtension(f.task));
    if (finishChooser(c, target)) {
      f.visible = false;
      ImGui::CloseCurrentPopup();
    }
  }
  if (!ready) ImGui::EndDisabled();
  ImGui::SameLine();
  if (ImGui::Button("Cancel", ImVec2(100, 0))) {
    f.visible = false;
    c.ui.deferred = Deferred::None;
    ImGui::CloseCurrentPopup();
  }
  ImGui::EndPopup();
}

// The review's end, once: the files it wrote, or why it wrote nothing.
void drawReviewOutcome(GuiContext& c) {
  const Session& s = c.session;
  if (s.reviewsFinished() != c.ui.reviewsSeen) {
    c.ui.reviewsSeen = s.reviewsFinished();
    const ReviewOutcome& out = *s.reviewOutcome();
    c.ui.status = out.written ? "wrote the design review in " + out.folder : "design review not written: " + out.message;
    ImGui::OpenPopup("Design review");
  }
  if (!ImGui::BeginPopupModal("Design review", nullptr, ImGuiWindowFlags_AlwaysAutoResize)) return;
  if (const ReviewOutcome* out = s.reviewOutcome()) {
    if (out->written) {
      ImGui::TextUnformatted("The design review is written:");
      for (const std::string& f : out->files) ImGui::BulletText("%s", f.c_str());
    } else {
      ImGui::TextUnformatted("The design review was not written, and nothing was changed:");
      ImGui::PushTextWrapPos(ImGui::GetFontSize() * 36);
      ImGui::TextColored(ImVec4(1.0f, 0.45f, 0.35f, 1.0f), "%s", out->message.c_str());
      ImGui::PopTextWrapPos();
    }
  }
  if (ImGui::Button("OK", ImVec2(100, 0))) ImGui::CloseCurrentPopup();
  ImGui::EndPopup();
}

// The menu bar's review button, or the running review's stage.
void reviewButton(GuiContext& c) {
  const Session& s = c.session;
  if (s.reviewBusy()) {
    ImGui::TextDisabled("design review: %s ...", s.reviewStage().c_str());
    return;
  }
  if (ImGui::SmallButton("Design review...")) openChooser(c, FileTask::ReviewFolder);
  if (ImGui::IsItemHovered())
    ImGui::SetTooltip("writes review.html and review.json for this scenario, the report `dwellmark review` writes");
}

void drawUnsavedQuestion(GuiContext& c) {
  if (c.ui.askUnsaved) {
    ImGui::OpenPopup("Unsaved changes");
    c.ui.askUnsaved = false;
  }
  if (!ImGui::BeginPopupModal("Unsaved changes", nullptr, ImGuiWindowFlags_AlwaysAutoResize)) return;
  ImGui::TextUnformatted("This scenario has changes that are not in its file.");
  if (ImGui::Button("Save first", ImVec2(120, 0))) {
    ImGui::CloseCurrentPopup();
    if (c.session.path().empty()) openChooser(c, FileTask::SaveAs);  // the deferred action runs after the save
    else if (saveTo(c, c.session.path())) runDeferred(c);
  }
  ImGui::SameLine();
  if (ImGui::Button("Discard changes", ImVec2(140, 0))) {
    ImGui::CloseCurrentPopup();
    runDeferred(c);
  }
  ImGui::SameLine();
  if (ImGui::Button("Cancel", ImVec2(100, 0))) {
    c.ui.deferred = Deferred::None;
    ImGui::CloseCurrentPopup();
  }
  ImGui::EndPopup();
}

}  // namespace

// ---- actions -------------------------------------------------------------------

void requestOpen(GuiContext& c, const std::string& path) {
  c.ui.deferredPath = path;
  defer(c, Deferred::OpenFile);
}

void requestNew(GuiContext& c) { defer(c, Deferred::NewScenario); }

void requestQuit(GuiContext& c) { defer(c, Deferred::Quit); }

void saveScenario(GuiContext& c) {
  if (c.session.path().empty()) openChooser(c, FileTask::SaveAs);
  else saveTo(c, c.session.path());
}

void openChooser(GuiContext& c, FileTask task) {
  FileChooser& f = c.ui.chooser;
  f.task = task;
  f.visible = true;
  f.justOpened = true;
  f.error.clear();
  const std::string current = c.session.path();
  f.folder = current.empty() ? fs::current_path().string() : fs::absolute(current).parent_path().string();
  const std::string stem = current.empty() ? "scenario" : fs::path(current).stem().string();
  switch (task) {
    case FileTask::Open: f.name.clear(); break;
    case FileTask::SaveAs: f.name = stem + ".json"; break;
    case FileTask::ExportView: f.name = stem + "-view.png"; break;
    case FileTask::ExportObserver: f.name = stem + "-visitor.png"; break;
    case FileTask::ExportCsv: f.name = stem + "-trajectory.csv"; break;
    case FileTask::ReviewFolder: f.name = stem + "-review"; break;
  }
  refreshChooser(f);
}

ViewScene currentScene(GuiContext& c) {
  const Session& s = c.session;
  if (c.ui.builtLook != s.lookRevision()) {
    c.renderer.setBodyLook(makeBodyLook(cylinderOf(s.scenario().body), s.scenario().paint));
    c.ui.builtLook = s.lookRevision();
  }
  return buildViewScene({s.scenario(), s.live().recent, s.live().record}, c.ui.overlays);
}

void exportViewPicture(GuiContext& c, const std::string& path) {
  const int w = c.ui.exportWidth, h = c.ui.exportHeight;
  const ViewScene scene = currentScene(c);
  gl::OffscreenTarget target(w, h);
  target.bind();
  c.renderer.draw(scene, c.ui.camera.matrices(float(w) / float(h)), 0, 0, w, h);
  writePng(path, target.read());
  c.ui.status = "wrote " + path + " (" + std::to_string(w) + " x " + std::to_string(h) + " px)";
}

void exportTrajectoryCsv(GuiContext& c, const std::string& path) {
  const Forecast* f = c.session.forecast();
  if (!f) throw OutputError("the forecast run is not finished yet; try again in a moment");
  // The same rows `dwellmark simulate` writes for this scenario.
  writeFileAtomic(path, trajectoryCsv(f->run, c.session.scenario().run.sampleInterval));
  c.ui.status = "wrote " + path + (f->truncated ? " (the forecast covers the start of the run only)" : "");
}

// ---- menu bar and dialogs -------------------------------------------------------

void drawMenuBar(GuiContext& c) {
  if (!ImGui::BeginMainMenuBar()) return;
  Session& s = c.session;
  if (ImGui::BeginMenu("File")) {
    if (ImGui::MenuItem("New scenario", "Ctrl+N")) requestNew(c);
    if (ImGui::MenuItem("Open...", "Ctrl+O")) openChooser(c, FileTask::Open);
    if (ImGui::BeginMenu("Open recent", !c.ui.recent.paths.empty())) {
      for (const std::string& p : c.ui.recent.paths)
        if (ImGui::MenuItem(p.c_str())) {
          requestOpen(c, p);
          break;
        }
      ImGui::EndMenu();
    }
    if (ImGui::MenuItem("Save", "Ctrl+S")) saveScenario(c);
    if (ImGui::MenuItem("Save as...", "Ctrl+Shift+S")) openChooser(c, FileTask::SaveAs);
    ImGui::Separator();
    if (ImGui::MenuItem("Export 3D view picture...", "Ctrl+E")) openChooser(c, FileTask::ExportView);
    if (ImGui::MenuItem("Export visitor's view picture...")) openChooser(c, FileTask::ExportObserver);
    if (ImGui::MenuItem("Export trajectory CSV...", nullptr, false, s.forecast() != nullptr))
      openChooser(c, FileTask::ExportCsv);
    if (ImGui::MenuItem("Write a design review...", nullptr, false, !s.reviewBusy()))
      openChooser(c, FileTask::ReviewFolder);
    ImGui::Separator();
    if (ImGui::MenuItem("Quit", "Ctrl+Q")) requestQuit(c);
    ImGui::EndMenu();
  }
  if (ImGui::BeginMenu("Run")) {
    if (ImGui::MenuItem(s.playing() ? "Pause" : "Play", "Space")) s.togglePlay();
    if (ImGui::MenuItem("Step", ".")) {
      s.pause();
      s.stepOnce();
    }
    if (ImGui::MenuItem("Restart", "R")) s.restart();
    if (ImGui::MenuItem("Visitor flick", "F")) applyOutcome(c, "launch", s.flick());
    ImGui::Separator();
    for (double f : {0.01, 0.1, 0.25, 1.0, 2.0, 10.0})
      if (ImGui::MenuItem(("speed " + fmt(f, 3) + "x").c_str(), nullptr, s.speed() == f)) s.setSpeed(f);
    ImGui::EndMenu();
  }
  if (ImGui::BeginMenu("View")) {
    if (ImGui::MenuItem("Frame the body", "O")) c.ui.camera = framingPreset(s.scenario());
    if (ImGui::MenuItem("Top view (as the observer)", "T")) c.ui.camera = topViewPreset(s.scenario());
    if (ImGui::MenuItem("Visitor's eye", "V")) c.ui.camera = visitorEyePreset(s.scenario());
    ImGui::MenuItem("Follow the body", nullptr, &c.ui.camera.followBody);
    ImGui::Separator();
    ImGui::MenuItem("Frame meter", "F2", &c.ui.showMetrics);
    ImGui::EndMenu();
  }
  if (ImGui::BeginMenu("Help")) {
    ImGui::MenuItem("Keys and mouse", "F1", &c.ui.showHelp);
    ImGui::EndMenu();
  }
  ImGui::Separator();
  reviewButton(c);
  if (!c.ui.status.empty()) {
    ImGui::Separator();
    ImGui::TextDisabled("%s", c.ui.status.c_str());
  }
  ImGui::EndMainMenuBar();
}

void drawFileDialogs(GuiContext& c) {
  drawChooser(c);
  drawUnsavedQuestion(c);
  drawReviewOutcome(c);
}

void startReview(GuiContext& c, const std::string& folder) {
  app::ReviewOptions options;
  options.launches = c.ui.reviewLaunches;
  options.force = c.ui.reviewForce;
  c.session.requestReview(folder, options);
  c.ui.status = "writing the design review into " + folder + " ...";
}

}  // namespace dm::gui
