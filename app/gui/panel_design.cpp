// The "Design" panel: every scenario parameter as a slider and a typed
// entry, built from the field table (core/scenario.hpp), so labels, units,
// ranges and help come from that one place. Edits go to the Session.
#include <imgui.h>
#include <imgui_stdlib.h>

#include <cmath>
#include <cstdio>

#include "app/gui/gui_state.hpp"
#include "core/colour.hpp"

namespace dm::gui {

namespace {

// The panel's sections: field path prefix and title, in order.
struct Section {
  const char* prefix;
  const char* title;
};
constexpr Section sections[] = {
    {"body.", "Body"},          {"surface.", "Table surface"}, {"launch.", "Launch"},
    {"observer.", "Observer"},  {"lighting.", "Lighting"},     {"analysis.", "Pattern analysis"},
    {"run.", "Run and numerics"},
    {"contact.", "Run and numerics"},
};

// Unit suffixes of field names, longest first; the unit is shown separately.
constexpr const char* unitSuffixes[] = {"_mm_s", "_rev_s", "_kg_m3", "_mm", "_deg", "_hz", "_us", "_ms", "_px", "_s", "_g"};

std::string shownName(const std::string& path) {
  std::string name = path.substr(path.rfind('.') + 1);
  for (const char* suffix : unitSuffixes) {
    const std::string s(suffix);
    if (name.size() > s.size() && name.compare(name.size() - s.size(), s.size(), s) == 0) {
      name.resize(name.size() - s.size());
      break;
    }
  }
  for (char& ch : name)
    if (ch == '_') ch = ' ';
  return name;
}

// A logarithmic slider where the range spans orders of magnitude.
bool wantsLogSlider(double lo, double hi) {
  if (lo < 0) return false;
  return lo > 0 ? hi / lo >= 100 : (hi >= 50 || hi <= 0.2);
}

// Sliders only where a range is short enough to drag across (seeds are typed).
bool wantsSlider(double lo, double hi) { return hi - lo <= 1e5; }

void labelCell(const std::string& name, const std::string& unit, const std::string& help, const std::string& path) {
  const std::string text = unit == "-" ? name : name + " (" + unit + ")";
  ImGui::AlignTextToFramePadding();
  ImGui::TextUnformatted(text.c_str());
  if (ImGui::IsItemHovered()) ImGui::SetTooltip("%s\n%s", help.c_str(), path.c_str());
}

// sRGB hex <-> 0..1 channels for the colour picker (display encoding only).
void hexToChannels(const std::string& hex, float out[3]) {
  for (int i = 0; i < 3; ++i) out[i] = float(std::stoi(hex.substr(1 + 2 * i, 2), nullptr, 16)) / 255.0f;
}
std::string channelsToHex(const float c[3]) {
  char buf[8];
  std::snprintf(buf, sizeof buf, "#%02x%02x%02x", int(std::lround(c[0] * 255)), int(std::lround(c[1] * 255)),
                int(std::lround(c[2] * 255)));
  return buf;
}

// One parameter row: name and unit, then the widget(s) its type calls for.
template <class Owner>
void fieldRow(GuiContext& c, const Field<Owner>& f, const Owner& owner, const std::string& path) {
  ImGui::PushID(path.c_str());
  const float labelWidth = ImGui::GetContentRegionAvail().x * 0.42f;
  const float rest = ImGui::GetContentRegionAvail().x - labelWidth;
  labelCell(shownName(f.path), f.unit, f.help, path);
  ImGui::SameLine(labelWidth);
  switch (f.type) {
    case FieldType::Number:
    case FieldType::Integer: {
      double v = f.getNumber(owner);
      const bool integer = f.type == FieldType::Integer;
      const char* format = integer ? "%.0f" : "%.4g";
      const bool slider = wantsSlider(f.min, f.max);
      if (slider) {
        ImGui::SetNextItemWidth(rest * 0.62f);
        double lo = f.min, hi = f.max;
        ImGuiSliderFlags flags = ImGuiSliderFlags_AlwaysClamp;
        if (wantsLogSlider(lo, hi)) flags |= ImGuiSliderFlags_Logarithmic;
        if (ImGui::SliderScalar("##slide", ImGuiDataType_Double, &v, &lo, &hi, format, flags))
          applyOutcome(c, path, c.session.setNumber(path, integer ? std::round(v) : v));
        ImGui::SameLine();
      }
      ImGui::SetNextItemWidth(-1);
      double typed = f.getNumber(owner);
      if (ImGui::InputDouble("##type", &typed, 0, 0, integer ? "%.0f" : "%.6g", ImGuiInputTextFlags_EnterReturnsTrue))
        applyOutcome(c, path, c.session.setNumber(path, typed));
      if (ImGui::IsItemHovered()) ImGui::SetTooltip("type a value and press Enter; allowed %g to %g", f.min, f.max);
      break;
    }
    case FieldType::Choice: {
      const std::string current = f.getText(owner);
      ImGui::SetNextItemWidth(-1);
      if (ImGui::BeginCombo("##choice", current.c_str())) {
        for (const std::string& option : f.choices)
          if (ImGui::Selectable(option.c_str(), option == current) && option != current)
            applyOutcome(c, path, c.session.setText(path, option));
        ImGui::EndCombo();
      }
      break;
    }
    case FieldType::Colour: {
      float rgb[3];
      hexToChannels(f.getText(owner), rgb);
      ImGui::SetNextItemWidth(-1);
      if (ImGui::ColorEdit3("##colour", rgb, ImGuiColorEditFlags_DisplayHex))
        applyOutcome(c, path, c.session.setText(path, channelsToHex(rgb)));
      break;
    }
    case FieldType::Text: {
      std::string text = f.getText(owner);
      ImGui::SetNextItemWidth(-1);
      ImGui::InputText("##text", &text);
      if (ImGui::IsItemDeactivatedAfterEdit()) applyOutcome(c, path, c.session.setText(path, text));
      break;
    }
  }
  if (auto it = c.ui.fieldMessages.find(path); it != c.ui.fieldMessages.end()) {
    ImGui::PushStyleColor(ImGuiCol_Text, ImVec4(1.0f, 0.45f, 0.35f, 1.0f));
    ImGui::TextWrapped("%s", it->second.c_str());
    ImGui::PopStyleColor();
  }
  ImGui::PopID();
}

void scalarSection(GuiContext& c, const std::string& prefix) {
  const Scenario& s = c.session.scenario();
  for (const Field<Scenario>& f : scenarioFields())
    if (f.path.rfind(prefix, 0) == 0) fieldRow(c, f, s, f.path);
}

void markingsSection(GuiContext& c) {
  const auto& marks = c.session.scenario().paint.markings;
  std::optional<std::size_t> remove;
  for (std::size_t i = 0; i < marks.size(); ++i) {
    const Marking& m = marks[i];
    ImGui::PushID(int(i));
    const Rgb shown{linearToSrgb(m.colour.r), linearToSrgb(m.colour.g), linearToSrgb(m.colour.b)};
    ImGui::ColorButton("##swatch", ImVec4(float(shown.r), float(shown.g), float(shown.b), 1.0f),
                       ImGuiColorEditFlags_NoTooltip, ImVec2(14, 14));
    ImGui::SameLine();
    const std::string title = "mark " + std::to_string(i + 1) + ": " + std::string(markingKindName(m.kind)) +
                              (m.kind == MarkingKind::Band || m.kind == MarkingKind::RimPatch
                                   ? " on end " + std::string(endName(m.end))
                                   : "");
    if (ImGui::TreeNode("##mark", "%s", title.c_str())) {
      for (const Field<Marking>& f : markingFields()) fieldRow(c, f, m, "markings." + std::to_string(i) + "." + f.path);
      if (ImGui::Button("Remove this mark")) remove = i;
      ImGui::TreePop();
    }
    ImGui::PopID();
  }
  if (remove) applyOutcome(c, "markings", c.session.removeMarking(*remove));
  if (ImGui::Button("Add a mark")) applyOutcome(c, "markings", c.session.addMarking());
}

void surfacePresets(GuiContext& c) {
  if (!c.ui.presetError.empty()) ImGui::TextWrapped("presets unavailable: %s", c.ui.presetError.c_str());
  if (c.ui.presets.empty()) return;
  const std::string current = c.session.scenario().surface.name;
  ImGui::AlignTextToFramePadding();
  ImGui::TextUnformatted("preset");
  ImGui::SameLine(ImGui::GetContentRegionAvail().x * 0.42f);
  ImGui::SetNextItemWidth(-1);
  if (ImGui::BeginCombo("##preset", current.c_str())) {
    for (const SurfacePreset& p : c.ui.presets) {
      if (ImGui::Selectable(p.name.c_str(), p.name == current)) {
        try {
          applyOutcome(c, "surface", c.session.replace(withSurfacePreset(c.session.scenario(), p)));
        } catch (const ScenarioError& e) {
          applyOutcome(c, "surface", {false, false, std::string(p.file) + ": " + e.what()});
        }
      }
      if (ImGui::IsItemHovered() && !p.note.empty()) ImGui::SetTooltip("%s", p.note.c_str());
    }
    ImGui::EndCombo();
  }
  if (auto it = c.ui.fieldMessages.find("surface"); it != c.ui.fieldMessages.end())
    ImGui::TextColored(ImVec4(1.0f, 0.45f, 0.35f, 1.0f), "%s", it->second.c_str());
}

void tracePointsSection(GuiContext& c) {
  const auto& points = c.session.scenario().analysis.tracePoints;
  std::optional<std::size_t> remove;
  for (std::size_t i = 0; i < points.size(); ++i) {
    ImGui::PushID(int(i) + 1000);
    if (ImGui::TreeNode("##point", "trace point %zu on end %s", i + 1, std::string(endName(points[i].end)).c_str())) {
      for (const Field<TracePointSpec>& f : tracePointFields())
        fieldRow(c, f, points[i], "analysis.trace_points." + std::to_string(i) + "." + f.path);
      if (ImGui::Button("Remove this point")) remove = i;
      ImGui::TreePop();
    }
    ImGui::PopID();
  }
  if (remove) applyOutcome(c, "analysis.trace_points", c.session.removeTracePoint(*remove));
  if (ImGui::Button("Add a trace point")) applyOutcome(c, "analysis.trace_points", c.session.addTracePoint());
}

void flickButton(GuiContext& c) {
  if (ImGui::Button("Visitor flick")) applyOutcome(c, "launch", c.session.flick());
  if (ImGui::IsItemHovered())
    ImGui::SetTooltip("replaces the launch with a random hand flick from the seeded spread (draw %llu)",
                      static_cast<unsigned long long>(c.session.flickCount() + 1));
}

}  // namespace

void applyOutcome(GuiContext& c, const std::string& path, const EditOutcome& out) {
  if (out.accepted) {
    c.ui.fieldMessages.erase(path);
    c.ui.status = out.restarted ? "changed " + path + "; the run started again" : "changed " + path;
  } else {
    c.ui.fieldMessages[path] = out.error;
    c.ui.status = "not changed: " + out.error;
  }
}

void drawDesignPanel(GuiContext& c) {
  const Rect& r = c.layout.design;
  beginFixedPanel(panel_title::design, r);
  if (ImGui::CollapsingHeader("Scenario")) {
    for (const char* path : {"name", "description"}) fieldRow(c, *findField(path), c.session.scenario(), path);
  }
  const char* lastTitle = "";
  for (const Section& s : sections) {
    // Sections sharing a title (run and contact numerics) share a header.
    if (std::string(s.title) == lastTitle) continue;
    lastTitle = s.title;
    const std::string prefix = s.prefix;
    const bool startOpen = prefix == "body." || prefix == "launch.";
    if (ImGui::CollapsingHeader(s.title, startOpen ? ImGuiTreeNodeFlags_DefaultOpen : 0)) {
      if (prefix == "surface.") surfacePresets(c);
      for (const Section& same : sections)
        if (std::string(same.title) == s.title) scalarSection(c, same.prefix);
      if (prefix == "launch.") flickButton(c);
      if (prefix == "analysis.") tracePointsSection(c);
    }
    if (prefix == "body." && ImGui::CollapsingHeader("Markings", ImGuiTreeNodeFlags_DefaultOpen)) markingsSection(c);
  }
  ImGui::End();
}

}  // namespace dm::gui
