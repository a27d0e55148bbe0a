// The "Visitor's view" panel: the CPU observer camera's exposure of the
// latest stretch of the run (refreshed on a worker thread as the run goes
// on), the forecast's stops of the visible end circled on it, and the
// predicted spot count, drift and visible end beside it.
#include <epoxy/gl.h>
#include <imgui.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "app/gui/gui_state.hpp"
#include "core/colour.hpp"
#include "core/constants.hpp"
#include "core/io.hpp"

namespace dm::gui {

namespace {

// Uploads a linear-light picture as sRGB bytes into the panel's texture.
void upload(GuiState& ui, const ObserverShot& shot) {
  const Image& img = shot.image;
  std::vector<unsigned char> bytes(std::size_t(img.width) * std::size_t(img.height) * 4);
  for (int y = 0; y < img.height; ++y)
    for (int x = 0; x < img.width; ++x) {
      const Rgb c = img.at(x, y);
      unsigned char* p = &bytes[(std::size_t(y) * std::size_t(img.width) + std::size_t(x)) * 4];
      p[0] = (unsigned char)std::lround(linearToSrgb(c.r) * 255);
      p[1] = (unsigned char)std::lround(linearToSrgb(c.g) * 255);
      p[2] = (unsigned char)std::lround(linearToSrgb(c.b) * 255);
      p[3] = 255;
    }
  if (!ui.observerTexture) glGenTextures(1, &ui.observerTexture);
  glBindTexture(GL_TEXTURE_2D, ui.observerTexture);
  glPixelStorei(GL_UNPACK_ALIGNMENT, 1);
  glTexImage2D(GL_TEXTURE_2D, 0, GL_RGBA8, img.width, img.height, 0, GL_RGBA, GL_UNSIGNED_BYTE, bytes.data());
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_MIN_FILTER, GL_LINEAR);
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_MAG_FILTER, GL_LINEAR);
  glBindTexture(GL_TEXTURE_2D, 0);
  ui.uploadedShotEnd = shot.end;
  ui.uploadedShotSize = img.width;
}

// Circles where the forecast's marks of the visible end stopped during the
// picture's window: the stops pile up on the spots a visitor sees.
void circleStops(const Session& s, const ObserverShot& shot, ImVec2 origin, float scale) {
  const Forecast* f = s.forecast();
  const PatternWindow* w = s.patternAt(shot.end);
  if (!f || !w || !w->visibleEnd) return;
  ImDrawList* draw = ImGui::GetWindowDrawList();
  for (const StopEvent& e : f->pattern.stops) {
    if (e.time < shot.start || e.time > shot.end || e.end != *w->visibleEnd) continue;
    double x = 0, y = 0;
    if (!shot.camera.project(e.position, x, y)) continue;
    draw->AddCircle(ImVec2(origin.x + float(x) * scale, origin.y + float(y) * scale), 7.0f, IM_COL32(255, 236, 90, 230), 20, 1.5f);
  }
}

}  // namespace

void exportObserverPicture(GuiContext& c, const std::string& path) {
  if (!c.session.requestObserverShot(c.ui.exportWidth, path))
    throw OutputError("the run has not yet moved for observer.exposure_s; let it run a little first");
  c.ui.status = "exposing the visitor's view for " + path + " ...";
}

void drawObserverPanel(GuiContext& c) {
  const Rect& r = c.layout.observer;
  beginFixedPanel("Visitor's view", r);
  const Session& s = c.session;
  const ObserverSpec& o = s.scenario().observer;
  const ObserverShot* shot = s.observerShot();
  const float side = std::max(32.0f, std::min(ImGui::GetContentRegionAvail().x, r.h - 4 * ImGui::GetTextLineHeightWithSpacing() - 40));
  if (shot && (shot->end != c.ui.uploadedShotEnd || shot->image.width != c.ui.uploadedShotSize)) upload(c.ui, *shot);
  if (shot && c.ui.observerTexture) {
    const ImVec2 origin = ImGui::GetCursorScreenPos();
    ImGui::Image(reinterpret_cast<ImTextureID>(static_cast<intptr_t>(c.ui.observerTexture)), ImVec2(side, side));
    circleStops(s, *shot, origin, side / float(shot->image.width));
    ImGui::Text("%s, %s, %s to %s s%s", o.view == ViewKind::Top ? "top" : "eye view",
                o.mode == ExposureMode::Eye ? "eye" : "camera", fmt(shot->start, 3).c_str(), fmt(shot->end, 3).c_str(),
                s.observerBusy() ? " ..." : "");
    const PatternWindow* w = s.patternAt(shot->end);
    if (w) {
      ImGui::Text("spots %zu (%s), end %s seen", w->spots.size(), std::string(patternKindName(w->kind)).c_str(),
                  w->visibleEnd ? std::string(endName(*w->visibleEnd)).c_str() : "none");
      ImGui::Text("drift %s deg/s", fmt(w->patternDrift / k::degree, 3).c_str());
      if (ImGui::IsItemHovered()) ImGui::SetTooltip("circles: where the visible end's marks stopped in this window");
    } else {
      ImGui::TextDisabled("spot statistics: waiting for the forecast");
    }
  } else {
    const auto [start, end] = s.observerWindow();
    ImGui::InvisibleButton("##waiting", ImVec2(side, side * 0.4f));
    if (start < 0) ImGui::TextWrapped("collecting motion: %s of %s s", fmt(end, 3).c_str(), fmt(o.exposure, 3).c_str());
    else ImGui::TextWrapped("exposing the first picture ...");
  }
  ImGui::End();
}

}  // namespace dm::gui
