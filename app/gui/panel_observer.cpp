// The "Visitor's view" panel: the CPU observer camera's exposure of the
// latest stretch of the run (refreshed on a worker thread as the run goes
// on), the spots found on it circled, and their count, the visible end and
// the pattern's drift beside it.
#include <epoxy/gl.h>
#include <imgui.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <vector>

#include "app/gui/gui_state.hpp"
#include "core/constants.hpp"
#include "core/io.hpp"

namespace dm::gui {

namespace {

// Uploads a linear-light picture as sRGB bytes into the panel's texture.
void upload(GuiState& ui, const ObserverShot& shot) {
  const Image& img = shot.image;
  const std::vector<unsigned char> bytes = srgbaBytes(img);
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

// Circles the spots found on the picture's ring, each about as wide as
// the arc it spans (at least a few pixels, so a narrow spot still shows).
void circleSpots(const ObserverShot& shot, ImVec2 origin, float scale) {
  ImDrawList* draw = ImGui::GetWindowDrawList();
  const Ring& ring = shot.spots.ring;
  auto onRing = [&](double azimuth, double radius) {
    return Vec3(ring.centre + radius * Vec3(std::cos(azimuth), std::sin(azimuth), 0));
  };
  for (const ImageSpot& spot : shot.spots.spots) {
    double x = 0, y = 0, x0 = 0, y0 = 0, x1 = 0, y1 = 0;
    if (!shot.camera.project(onRing(spot.azimuth, spot.radius), x, y)) continue;
    const bool ends = shot.camera.project(onRing(spot.azimuth - spot.width / 2, spot.radius), x0, y0) &&
                      shot.camera.project(onRing(spot.azimuth + spot.width / 2, spot.radius), x1, y1);
    const float across = ends ? float(std::hypot(x1 - x0, y1 - y0)) * scale / 2 : 0.0f;
    draw->AddCircle(ImVec2(origin.x + float(x) * scale, origin.y + float(y) * scale),
                    std::clamp(across + 3.0f, 6.0f, 40.0f), IM_COL32(255, 236, 90, 230), 24, 1.5f);
  }
}

// The picture's spot count and visible end, and the drift of the pattern
// the forecast's analysis finds at the picture's time.
void spotReadout(const Session& s, const ObserverShot& shot) {
  const std::string end = shot.visibleEnd ? std::string(endName(*shot.visibleEnd)) : "none";
  if (shot.visibleEnd && shot.spots.ring.radius > 0)
    ImGui::Text("spots %zu on a %s mm ring, end %s seen", shot.spots.spots.size(),
                fmt(shot.spots.ring.radius * 1e3, 3).c_str(), end.c_str());
  else
    ImGui::Text("no end raised in this window (end %s)", end.c_str());
  if (ImGui::IsItemHovered())
    ImGui::SetTooltip("circles: spots found on the picture along the raised end's ring (Weber contrast above %s)",
                      fmt(shot.spots.threshold, 3).c_str());
  if (const PatternWindow* w = s.patternAt(shot.end))
    ImGui::Text("drift %s deg/s (%s)", fmt(w->patternDrift / k::degree, 3).c_str(),
                std::string(patternKindName(w->kind)).c_str());
  else
    ImGui::TextDisabled("drift: waiting for the forecast");
}

}  // namespace

void exportObserverPicture(GuiContext& c, const std::string& path) {
  if (!c.session.requestObserverShot(c.ui.exportWidth, path))
    throw OutputError("the run has not yet moved for observer.exposure_s; let it run a little first");
  c.ui.status = "exposing the visitor's view for " + path + " ...";
}

void drawObserverPanel(GuiContext& c) {
  const Rect& r = c.layout.observer;
  beginFixedPanel(panel_title::observer, r);
  const Session& s = c.session;
  const ObserverSpec& o = s.scenario().observer;
  const ObserverShot* shot = s.observerShot();
  const float side = std::max(32.0f, std::min(ImGui::GetContentRegionAvail().x, r.h - 4 * ImGui::GetTextLineHeightWithSpacing() - 40));
  if (shot && (shot->end != c.ui.uploadedShotEnd || shot->image.width != c.ui.uploadedShotSize)) {
    const auto start = std::chrono::steady_clock::now();
    upload(c.ui, *shot);
    if (c.ui.settleTimings) glFinish();
    c.ui.times.last.uploadMs = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - start).count();
  }
  if (shot && c.ui.observerTexture) {
    const ImVec2 origin = ImGui::GetCursorScreenPos();
    ImGui::Image(reinterpret_cast<ImTextureID>(static_cast<intptr_t>(c.ui.observerTexture)), ImVec2(side, side));
    circleSpots(*shot, origin, side / float(shot->image.width));
    ImGui::Text("%s, %s, %s to %s s%s", o.view == ViewKind::Top ? "top" : "eye view",
                o.mode == ExposureMode::Eye ? "eye" : "camera", fmt(shot->start, 3).c_str(), fmt(shot->end, 3).c_str(),
                s.observerBusy() ? " ..." : "");
    spotReadout(s, *shot);
  } else {
    const auto [start, end] = s.observerWindow();
    ImGui::InvisibleButton("##waiting", ImVec2(side, side * 0.4f));
    if (start < 0) ImGui::TextWrapped("collecting motion: %s of %s s", fmt(end, 3).c_str(), fmt(o.exposure, 3).c_str());
    else ImGui::TextWrapped("exposing the first picture ...");
  }
  ImGui::End();
}

}  // namespace dm::gui
