#include "core/scenario.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <limits>
#include <map>
#include <set>
#include <sstream>

#include "core/colour.hpp"
#include "core/constants.hpp"
#include "core/dynamics.hpp"
#include "core/launch.hpp"
#include "core/steady.hpp"

namespace dm {

namespace {

using json = nlohmann::json;

std::string describe(double v) {
  std::ostringstream o;
  o.precision(10);
  o << v;
  return o.str();
}

// A derived figure in a message, to four significant digits.
std::string approx(double v) {
  std::ostringstream o;
  o.precision(4);
  o << v;
  return o.str();
}

std::string rangeText(double lo, double hi, const std::string& unit) {
  return "allowed " + describe(lo) + " to " + describe(hi) + (unit == "-" ? "" : " " + unit);
}

// What a field accepts, for a message: its range with unit, its choices, or its form.
template <class T>
std::string allowedText(const Field<T>& f) {
  switch (f.type) {
    case FieldType::Number:
    case FieldType::Integer: return rangeText(f.min, f.max, f.unit);
    case FieldType::Choice: {
      std::string options;
      for (const auto& c : f.choices) options += (options.empty() ? "" : ", ") + c;
      return "allowed one of: " + options;
    }
    case FieldType::Colour: return "allowed an sRGB colour \"#rrggbb\"";
    case FieldType::Text: return "allowed any text";
  }
  return "";
}

template <class T>
ScenarioError missingField(const Field<T>& f, const std::string& path) {
  return ScenarioError(path, "missing required field; " + allowedText(f));
}

// ---- field constructors --------------------------------------------------

// A number stored in SI at `ref`, shown in file units: file = SI / toSI.
template <class T>
Field<T> number(std::string path, std::string unit, double min, double max, double toSI,
                std::function<double&(T&)> ref, std::string help, bool required = false) {
  Field<T> f;
  f.path = std::move(path);
  f.type = FieldType::Number;
  f.unit = std::move(unit);
  f.min = min;
  f.max = max;
  f.required = required;
  f.help = std::move(help);
  f.getNumber = [ref, toSI](const T& s) { return ref(const_cast<T&>(s)) / toSI; };
  f.setNumber = [ref, toSI](T& s, double v) { ref(s) = v * toSI; };
  return f;
}

// A whole number stored at `ref`, in the same unit in files and in memory.
template <class T>
Field<T> integer(std::string path, std::string unit, double min, double max, int& (*ref)(T&), std::string help) {
  Field<T> f;
  f.path = std::move(path);
  f.type = FieldType::Integer;
  f.unit = std::move(unit);
  f.min = min;
  f.max = max;
  f.help = std::move(help);
  f.getNumber = [ref](const T& s) { return double(ref(const_cast<T&>(s))); };
  f.setNumber = [ref](T& s, double v) { ref(s) = int(v); };
  return f;
}

template <class T>
Field<T> text(std::string path, FieldType type, std::vector<std::string> choices,
              std::function<std::string(const T&)> get, std::function<void(T&, const std::string&)> set,
              std::string help, bool required = false) {
  Field<T> f;
  f.path = std::move(path);
  f.type = type;
  f.unit = "-";
  f.choices = std::move(choices);
  f.required = required;
  f.help = std::move(help);
  f.getText = std::move(get);
  f.setText = std::move(set);
  return f;
}

template <class T>
Field<T> colour(std::string path, Rgb& (*ref)(T&), std::string help) {
  return text<T>(
      std::move(path), FieldType::Colour, {},
      [ref](const T& s) { return hexFromRgb(ref(const_cast<T&>(s))); },
      [ref](T& s, const std::string& v) { ref(s) = rgbFromHex(v); }, std::move(help));
}

End endFromName(const std::string& s) { return s == "B" ? End::B : End::A; }

constexpr double mm = 1e-3;
constexpr double deg = k::degree;
constexpr double revS = k::twoPi;
constexpr double hz = k::twoPi;

// ---- launch spread --------------------------------------------------------

// One launch parameter that visitors vary: its name under launch_spread, its
// file unit and range (those of its launch field), the factor to SI, where
// its spread lives and what it is.
struct SpreadParam {
  const char* name;
  const char* unit;
  double min, max, toSI;
  Spread& (*ref)(Scenario&);
  const char* what;
};

const std::vector<SpreadParam>& spreadParams() {
  static const std::vector<SpreadParam> params = {
      {"revolution", "rev/s", 0, 50, revS, [](Scenario& s) -> Spread& { return s.launchSpread.revolution; },
       "vertical spin at release"},
      {"backspin", "-", 0, 2, 1, [](Scenario& s) -> Spread& { return s.launchSpread.backspin; },
       "axial spin at release"},
      {"tilt", "deg", 0, 90, deg, [](Scenario& s) -> Spread& { return s.launchSpread.tilt; },
       "initial tilt of the axis"},
      {"drift", "mm/s", 0, 2000, mm, [](Scenario& s) -> Spread& { return s.launchSpread.drift; },
       "sideways speed of the centre at release"},
  };
  return params;
}

// The file-key suffix of a unit: "rev/s" -> "_rev_s", "-" -> "".
std::string unitSuffix(const std::string& unit) {
  if (unit == "-") return "";
  std::string out = "_" + unit;
  std::replace(out.begin(), out.end(), '/', '_');
  return out;
}

// Path of one member (min, max, mean, sd) of a parameter's spread.
std::string spreadPath(const SpreadParam& p, const std::string& member) {
  return "launch_spread." + std::string(p.name) + "." + member + unitSuffix(p.unit);
}

std::string spreadKindName(SpreadKind k) {
  return k == SpreadKind::Uniform ? "uniform" : k == SpreadKind::Normal ? "normal" : "fixed";
}

// The kind, bounds, mean and sd fields of one parameter's spread.
void addSpreadFields(std::vector<Field<Scenario>>& f, const SpreadParam& p) {
  using S = Scenario;
  const auto ref = p.ref;
  const std::string what = p.what;
  f.push_back(text<S>(
      "launch_spread." + std::string(p.name) + ".kind", FieldType::Choice, {"fixed", "uniform", "normal"},
      [ref](const S& s) { return spreadKindName(ref(const_cast<S&>(s)).kind); },
      [ref](S& s, const std::string& v) {
        ref(s).kind = v == "uniform" ? SpreadKind::Uniform : v == "normal" ? SpreadKind::Normal : SpreadKind::Fixed;
      },
      "ensembles: how " + what + " varies between launches (fixed: the launch value)"));
  f.push_back(number<S>(spreadPath(p, "min"), p.unit, p.min, p.max, p.toSI, [ref](S& s) -> double& { return ref(s).min; },
                        "ensembles: lowest " + what + " drawn (uniform and normal)"));
  f.push_back(number<S>(spreadPath(p, "max"), p.unit, p.min, p.max, p.toSI, [ref](S& s) -> double& { return ref(s).max; },
                        "ensembles: highest " + what + " drawn (uniform and normal)"));
  f.push_back(number<S>(spreadPath(p, "mean"), p.unit, p.min, p.max, p.toSI,
                        [ref](S& s) -> double& { return ref(s).mean; }, "ensembles, normal: mean " + what));
  f.push_back(number<S>(spreadPath(p, "sd"), p.unit, 0, p.max - p.min, p.toSI,
                        [ref](S& s) -> double& { return ref(s).sd; }, "ensembles, normal: standard deviation of " + what));
}

// Cross-field rules of the launch spread: bounds in order, a normal's mean
// within its bounds.
void validateLaunchSpread(const Scenario& s) {
  for (const SpreadParam& p : spreadParams()) {
    const Spread& d = p.ref(const_cast<Scenario&>(s));
    const std::string unit = p.unit == std::string("-") ? "" : " " + std::string(p.unit);
    if (d.max < d.min)
      throw ScenarioError(spreadPath(p, "max"), "value " + describe(d.max / p.toSI) + " is below " +
                                                    spreadPath(p, "min") + " (" + describe(d.min / p.toSI) + "); " +
                                                    rangeText(d.min / p.toSI, p.max, p.unit));
    if (d.kind == SpreadKind::Normal && (d.mean < d.min || d.mean > d.max))
      throw ScenarioError(spreadPath(p, "mean"), "value " + describe(d.mean / p.toSI) + unit +
                                                     " lies outside the bounds of a truncated normal; " +
                                                     rangeText(d.min / p.toSI, d.max / p.toSI, p.unit));
  }
}

std::vector<Field<Scenario>> buildScenarioFields() {
  using S = Scenario;
  std::vector<Field<S>> f;
  f.push_back(text<S>("name", FieldType::Text, {}, [](const S& s) { return s.name; },
                      [](S& s, const std::string& v) { s.name = v; }, "short name of the design"));
  f.push_back(text<S>("description", FieldType::Text, {}, [](const S& s) { return s.description; },
                      [](S& s, const std::string& v) { s.description = v; }, "free text"));
  // body
  f.push_back(text<S>(
      "body.shape", FieldType::Choice, {"tube", "rod", "ring", "disk"},
      [](const S& s) { return std::string(shapeName(s.body.shape)); },
      [](S& s, const std::string& v) {
        s.body.shape = v == "rod" ? Shape::Rod : v == "ring" ? Shape::Ring : v == "disk" ? Shape::Disk : Shape::Tube;
      },
      "tube and ring are hollow, rod and disk solid; tube and rod are longer than wide", true));
  f.push_back(number<S>("body.length_mm", "mm", 0.2, 1000, mm, [](S& s) -> double& { return s.body.length; },
                        "length along the axis", true));
  f.push_back(number<S>("body.outer_diameter_mm", "mm", 1, 500, mm,
                        [](S& s) -> double& { return s.body.outerDiameter; }, "outer diameter D", true));
  f.push_back(number<S>("body.wall_mm", "mm", 0.05, 250, mm, [](S& s) -> double& { return s.body.wall; },
                        "wall thickness of a tube or ring (less than the outer radius); ignored for rod and disk"));
  f.push_back(number<S>("body.density_kg_m3", "kg/m^3", 10, 25000, 1,
                        [](S& s) -> double& { return s.body.density; }, "material density (used unless mass_g is set)"));
  f.push_back(number<S>("body.mass_g", "g", 0, 10000, 1e-3, [](S& s) -> double& { return s.body.mass; },
                        "mass; 0 derives it from the density"));
  f.push_back(colour<S>("body.colour", [](S& s) -> Rgb& { return s.paint.body; }, "unpainted body colour, sRGB hex"));
  f.push_back(colour<S>("body.bore_colour", [](S& s) -> Rgb& { return s.paint.bore; }, "bore colour, sRGB hex"));
  // surface
  f.push_back(text<S>("surface.name", FieldType::Text, {}, [](const S& s) { return s.surface.name; },
                      [](S& s, const std::string& v) { s.surface.name = v; }, "name of the table surface"));
  f.push_back(number<S>("surface.friction_static", "-", 0, 2, 1,
                        [](S& s) -> double& { return s.surface.frictionStatic; }, "Coulomb static friction coefficient", true));
  f.push_back(number<S>("surface.friction_kinetic", "-", 0, 2, 1,
                        [](S& s) -> double& { return s.surface.frictionKinetic; },
                        "Coulomb kinetic friction coefficient (at most the static one)", true));
  f.push_back(number<S>("surface.rolling_resistance", "-", 0, 0.1, 1,
                        [](S& s) -> double& { return s.surface.rollingResistance; },
                        "rolling resistance coefficient: torque c_rr * N * R against rolling"));
  f.push_back(number<S>("surface.pivot_friction_mm", "mm", 0, 5, mm,
                        [](S& s) -> double& { return s.surface.pivotFriction; },
                        "arm of the drilling (pivot) friction torque N * arm"));
  f.push_back(number<S>("surface.air_drag_coefficient", "-", 0, 3, 1,
                        [](S& s) -> double& { return s.surface.airDrag; }, "quadratic air drag coefficient C_d"));
  f.push_back(number<S>("surface.restitution", "-", 0.15, 0.95, 1,
                        [](S& s) -> double& { return s.surface.restitution; }, "normal coefficient of restitution"));
  f.push_back(colour<S>("surface.colour", [](S& s) -> Rgb& { return s.surface.colour; }, "table colour, sRGB hex"));
  f.push_back(number<S>("surface.grid_mm", "mm", 0, 100, mm, [](S& s) -> double& { return s.surface.gridSpacing; },
                        "spacing of the drawn table grid; 0 for none"));
  f.push_back(number<S>("surface.table_radius_mm", "mm", 50, 5000, mm,
                        [](S& s) -> double& { return s.surface.tableRadius; }, "radius of the round table top"));
  // launch
  f.push_back(text<S>("launch.pressed_end", FieldType::Choice, {"A", "B"},
                      [](const S& s) { return std::string(endName(s.launch.pressedEnd)); },
                      [](S& s, const std::string& v) { s.launch.pressedEnd = endFromName(v); },
                      "the end the visitor presses down", true));
  f.push_back(number<S>("launch.revolution_rev_s", "rev/s", 0, 50, revS,
                        [](S& s) -> double& { return s.launch.revolution; }, "vertical spin at release", true));
  f.push_back(number<S>("launch.backspin", "-", 0, 2, 1, [](S& s) -> double& { return s.launch.backspin; },
                        "axial spin at release; 1 puts the pressed end's top point at rest, 0 is none"));
  f.push_back(number<S>("launch.tilt_deg", "deg", 0, 90, deg, [](S& s) -> double& { return s.launch.tilt; },
                        "initial tilt of the axis, pressed end down"));
  f.push_back(number<S>("launch.drift_mm_s", "mm/s", 0, 2000, mm, [](S& s) -> double& { return s.launch.drift; },
                        "sideways speed of the centre at release"));
  {
    Field<S> seed;
    seed.path = "launch.seed";
    seed.type = FieldType::Integer;
    seed.unit = "-";
    seed.min = 0;
    seed.max = 9007199254740991.0;  // 2^53 - 1: every integer a JSON double holds exactly
    seed.help = "seed of the random launch draws";
    seed.getNumber = [](const S& s) { return double(s.launch.seed); };
    seed.setNumber = [](S& s, double v) { s.launch.seed = std::uint64_t(v); };
    f.push_back(seed);
  }
  // launch spread of the ensembles
  for (const SpreadParam& p : spreadParams()) addSpreadFields(f, p);
  f.push_back(number<S>("launch_spread.pressed_end_a_share", "-", 0, 1, 1,
                        [](S& s) -> double& { return s.launchSpread.pressedEndAShare; },
                        "ensembles: share of launches in which end A is pressed (the rest press end B)"));
  // run and numerics
  f.push_back(number<S>("run.duration_s", "s", 0.01, 600, 1, [](S& s) -> double& { return s.run.duration; },
                        "simulated time", true));
  f.push_back(number<S>("run.sample_ms", "ms", 0.05, 100, 1e-3,
                        [](S& s) -> double& { return s.run.sampleInterval; }, "trajectory.csv row spacing"));
  {
    Field<S> sub;
    sub.path = "run.substeps";
    sub.type = FieldType::Integer;
    sub.unit = "-";
    sub.min = 1;
    sub.max = 1000;
    sub.help = "integrator (RK4) steps per row; the step is sample_ms / substeps";
    sub.getNumber = [](const S& s) { return double(s.run.substeps); };
    sub.setNumber = [](S& s, double v) { s.run.substeps = int(v); };
    f.push_back(sub);
  }
  f.push_back(number<S>("contact.frequency_hz", "Hz", 50, 2000, hz,
                        [](S& s) -> double& { return s.contact.frequency; },
                        "natural frequency of the body resting on its contact (sets the stiffness)"));
  // observer
  f.push_back(text<S>("observer.view", FieldType::Choice, {"top", "visitor"},
                      [](const S& s) { return std::string(s.observer.view == ViewKind::Top ? "top" : "visitor"); },
                      [](S& s, const std::string& v) { s.observer.view = v == "visitor" ? ViewKind::Visitor : ViewKind::Top; },
                      "top-down orthographic view or a visitor's eye"));
  f.push_back(text<S>("observer.mode", FieldType::Choice, {"camera", "eye"},
                      [](const S& s) { return std::string(s.observer.mode == ExposureMode::Eye ? "eye" : "camera"); },
                      [](S& s, const std::string& v) { s.observer.mode = v == "camera" ? ExposureMode::Camera : ExposureMode::Eye; },
                      "box-shutter camera or the eye's temporal response"));
  f.push_back(number<S>("observer.start_s", "s", 0, 600, 1, [](S& s) -> double& { return s.observer.start; },
                        "time the exposure starts"));
  f.push_back(number<S>("observer.exposure_s", "s", 0.001, 10, 1, [](S& s) -> double& { return s.observer.exposure; },
                        "exposure time (camera) or integration window (eye)"));
  f.push_back(number<S>("observer.eye_height_mm", "mm", 10, 3000, mm,
                        [](S& s) -> double& { return s.observer.eyeHeight; }, "visitor's eye above the table top"));
  f.push_back(number<S>("observer.eye_distance_mm", "mm", 0, 5000, mm,
                        [](S& s) -> double& { return s.observer.eyeDistance; }, "horizontal distance of the eye from the spin centre"));
  f.push_back(number<S>("observer.eye_azimuth_deg", "deg", -360, 360, deg,
                        [](S& s) -> double& { return s.observer.eyeAzimuth; }, "azimuth of the eye about the spin centre"));
  f.push_back(number<S>("observer.field_of_view_deg", "deg", 1, 120, deg,
                        [](S& s) -> double& { return s.observer.fieldOfView; }, "visitor view field of view"));
  f.push_back(number<S>("observer.view_span_mm", "mm", 10, 2000, mm,
                        [](S& s) -> double& { return s.observer.viewSpan; }, "top view: width of the table region shown"));
  f.push_back(integer<S>("observer.image_size_px", "px", 16, 4096, [](S& s) -> int& { return s.observer.imageSize; },
                         "image width and height"));
  f.push_back(number<S>("observer.spot_threshold", "-", 0.001, 1, 1,
                        [](S& s) -> double& { return s.observer.spotThreshold; }, "Weber contrast a spot must exceed"));
  f.push_back(number<S>("observer.steady_precession_rev_s", "rev/s", 0, 100, revS,
                        [](S& s) -> double& { return s.observer.steadyPrecession; },
                        "above 0: show the exact steady spin at this precession (pressed end raised) instead of the run"));
  f.push_back(number<S>("observer.steady_orbit_mm", "mm", steady_input::orbit.min, steady_input::orbit.max, mm,
                        [](S& s) -> double& { return s.observer.steadyOrbit; },
                        "with steady_precession_rev_s: the centre circling the spin axis this far from it, + towards "
                        "the raised end (0: the centre still)"));
  f.push_back(number<S>("observer.frame_rate_hz", "Hz", 0, 1000, 1, [](S& s) -> double& { return s.observer.frameRate; },
                        "camera video frame rate; 0 for a single exposure"));
  f.push_back(integer<S>("observer.frame_count", "-", 1, 600, [](S& s) -> int& { return s.observer.frameCount; },
                         "camera video: number of frames, each observer.exposure_s long and 1/frame_rate apart"));
  // lighting
  f.push_back(number<S>("lighting.ambient", "-", 0, 1, 1, [](S& s) -> double& { return s.lighting.ambient; },
                        "ambient light level"));
  f.push_back(number<S>("lighting.key_intensity", "-", 0, 2, 1,
                        [](S& s) -> double& { return s.lighting.keyIntensity; }, "directional light level"));
  f.push_back(number<S>("lighting.key_elevation_deg", "deg", 0, 90, deg,
                        [](S& s) -> double& { return s.lighting.keyElevation; }, "directional light elevation"));
  f.push_back(number<S>("lighting.key_azimuth_deg", "deg", -360, 360, deg,
                        [](S& s) -> double& { return s.lighting.keyAzimuth; }, "directional light azimuth"));
  f.push_back(text<S>(
      "lighting.flicker", FieldType::Choice, {"none", "sine", "rectified_mains"},
      [](const S& s) {
        return std::string(s.lighting.flicker == Waveform::None ? "none"
                           : s.lighting.flicker == Waveform::Sine ? "sine" : "rectified_mains");
      },
      [](S& s, const std::string& v) {
        s.lighting.flicker = v == "sine" ? Waveform::Sine : v == "rectified_mains" ? Waveform::RectifiedMains : Waveform::None;
      },
      "light modulation waveform"));
  f.push_back(number<S>("lighting.flicker_frequency_hz", "Hz", 1, 10000, 1,
                        [](S& s) -> double& { return s.lighting.flickerFrequency; },
                        "modulation frequency (rectified mains: twice the line frequency)"));
  f.push_back(number<S>("lighting.flicker_depth", "-", 0, 1, 1,
                        [](S& s) -> double& { return s.lighting.flickerDepth; }, "modulation depth (Michelson)"));
  f.push_back(number<S>("lighting.strobe_flashes_per_s", "1/s", 0, 100, 1,
                        [](S& s) -> double& { return s.lighting.strobeRate; },
                        "flash rate of a strobe or flashing light in the exhibit, 0 for none (photosensitivity check)"));
  // viewing positions of the review's viewing check
  f.push_back(number<S>("viewing.table_height_mm", "mm", 200, 1500, mm,
                        [](S& s) -> double& { return s.viewing.tableHeight; }, "floor to table top"));
  f.push_back(number<S>("viewing.distance_mm", "mm", 0, 5000, mm, [](S& s) -> double& { return s.viewing.distance; },
                        "horizontal distance of the viewers' eyes from the spin centre"));
  f.push_back(number<S>("viewing.standing_eye_height_mm", "mm", 300, 2500, mm,
                        [](S& s) -> double& { return s.viewing.standingEyeHeight; },
                        "eye height above the floor of a standing adult (from memory: about 1570)"));
  f.push_back(number<S>("viewing.child_eye_height_mm", "mm", 300, 2500, mm,
                        [](S& s) -> double& { return s.viewing.childEyeHeight; },
                        "eye height above the floor of a child of six to eight (from memory: about 1000)"));
  f.push_back(number<S>("viewing.seated_eye_height_mm", "mm", 300, 2500, mm,
                        [](S& s) -> double& { return s.viewing.seatedEyeHeight; },
                        "eye height above the floor of a seated visitor or wheelchair user (from memory: about 1090 to 1295)"));
  // analysis of traces, stops and spots
  f.push_back(number<S>("analysis.window_s", "s", 0.05, 60, 1, [](S& s) -> double& { return s.analysis.window; },
                        "length of each spot-statistics window"));
  f.push_back(number<S>("analysis.window_step_s", "s", 0.01, 60, 1,
                        [](S& s) -> double& { return s.analysis.windowStep; },
                        "start-to-start spacing of the sliding spot-statistics windows"));
  f.push_back(number<S>("analysis.dwell_speed_mm_s", "mm/s", 0.1, 10000, mm,
                        [](S& s) -> double& { return s.analysis.dwellSpeed; },
                        "horizontal speed below which a mark counts as stopped (sets the dwell)"));
  f.push_back(number<S>("analysis.eye_time_ms", "ms", 1, 1000, 1e-3, [](S& s) -> double& { return s.analysis.eyeTime; },
                        "eye integration time: a spot drifting more than its size in it reads as a ring"));
  return f;
}

std::vector<Field<Marking>> buildMarkingFields() {
  using M = Marking;
  std::vector<Field<M>> f;
  f.push_back(text<M>(
      "kind", FieldType::Choice, {"band", "rim_patch", "stripe", "dot"},
      [](const M& m) { return std::string(markingKindName(m.kind)); },
      [](M& m, const std::string& v) {
        m.kind = v == "band" ? MarkingKind::Band : v == "stripe" ? MarkingKind::Stripe
               : v == "dot" ? MarkingKind::Dot : MarkingKind::RimPatch;
      },
      "band all round an end, patch on an end's rim, stripe along the length, or dot", true));
  f.push_back(colour<M>("colour", [](M& m) -> Rgb& { return m.colour; }, "sRGB hex"));
  f.push_back(text<M>("end", FieldType::Choice, {"A", "B"}, [](const M& m) { return std::string(endName(m.end)); },
                      [](M& m, const std::string& v) { m.end = endFromName(v); }, "band, rim_patch: which end"));
  f.push_back(number<M>("width_mm", "mm", 0.05, 1000, mm, [](M& m) -> double& { return m.width; },
                        "band, rim_patch: extent from the end edge"));
  f.push_back(number<M>("from_deg", "deg", -360, 360, deg, [](M& m) -> double& { return m.fromAngle; },
                        "rim_patch: start azimuth"));
  f.push_back(number<M>("to_deg", "deg", -360, 360, deg, [](M& m) -> double& { return m.toAngle; },
                        "rim_patch: end azimuth, counter-clockwise from from_deg"));
  f.push_back(number<M>("angle_deg", "deg", -360, 360, deg, [](M& m) -> double& { return m.angle; },
                        "stripe, dot: centre azimuth"));
  f.push_back(number<M>("arc_width_deg", "deg", 0.1, 360, deg, [](M& m) -> double& { return m.arcWidth; },
                        "stripe: angular width"));
  f.push_back(number<M>("axial_mm", "mm", -500, 500, mm, [](M& m) -> double& { return m.axial; },
                        "dot: position along the axis from the centre (towards end A)"));
  f.push_back(number<M>("radius_mm", "mm", 0.05, 250, mm, [](M& m) -> double& { return m.radius; }, "dot: radius"));
  return f;
}

std::vector<Field<TracePointSpec>> buildTracePointFields() {
  using P = TracePointSpec;
  std::vector<Field<P>> f;
  f.push_back(text<P>("end", FieldType::Choice, {"A", "B"}, [](const P& p) { return std::string(endName(p.end)); },
                      [](P& p, const std::string& v) { p.end = endFromName(v); }, "which end's outer rim edge", true));
  f.push_back(number<P>("angle_deg", "deg", -360, 360, deg, [](P& p) -> double& { return p.angle; },
                        "azimuth about the body axis from body x towards body y", true));
  f.push_back(number<P>("size_mm", "mm", 0.05, 100, mm, [](P& p) -> double& { return p.size; },
                        "extent along the rim of the mark the point stands for (sets its spot size)"));
  return f;
}

// True when `text` can be written back into a JSON file: valid UTF-8 (a
// --set value can hold any bytes; a parsed file cannot).
bool isUtf8(const std::string& text) {
  try {
    (void)json(text).dump();
    return true;
  } catch (const json::type_error&) {
    return false;
  }
}

template <class T>
void checkRange(const Field<T>& f, const T& s, const std::string& prefix) {
  if (f.type != FieldType::Number && f.type != FieldType::Integer) return;
  const double v = f.getNumber(s);
  if (!std::isfinite(v) || v < f.min || v > f.max)
    throw ScenarioError(prefix + f.path, "value " + describe(v) + " is out of range; " + rangeText(f.min, f.max, f.unit));
}

// Sets one field from a JSON value, checking its type and range.
template <class T>
void setFromJson(const Field<T>& f, T& target, const json& v, const std::string& path) {
  switch (f.type) {
    case FieldType::Number:
    case FieldType::Integer: {
      if (!v.is_number())
        throw ScenarioError(path, "expected a number (" + f.unit + "), got " + v.dump());
      const double x = v.get<double>();
      if (f.type == FieldType::Integer && (std::floor(x) != x))
        throw ScenarioError(path, "expected a whole number, got " + v.dump());
      if (!(x >= f.min && x <= f.max))
        throw ScenarioError(path, "value " + describe(x) + " is out of range; " + rangeText(f.min, f.max, f.unit));
      f.setNumber(target, x);
      return;
    }
    case FieldType::Choice: {
      if (!v.is_string()) throw ScenarioError(path, "expected a string, got " + v.dump());
      const std::string s = v.get<std::string>();
      bool ok = false;
      std::string options;
      for (const auto& c : f.choices) {
        ok = ok || c == s;
        options += (options.empty() ? "" : ", ") + c;
      }
      if (!ok) throw ScenarioError(path, "value \"" + s + "\" is not one of: " + options);
      f.setText(target, s);
      return;
    }
    case FieldType::Colour: {
      if (!v.is_string()) throw ScenarioError(path, "expected an sRGB colour \"#rrggbb\", got " + v.dump());
      try {
        f.setText(target, v.get<std::string>());
      } catch (const std::invalid_argument&) {
        throw ScenarioError(path, "value " + v.dump() + " is not an sRGB colour \"#rrggbb\"");
      }
      return;
    }
    case FieldType::Text:
      if (!v.is_string()) throw ScenarioError(path, "expected a string, got " + v.dump());
      if (!isUtf8(v.get<std::string>())) throw ScenarioError(path, "text is not valid UTF-8");
      f.setText(target, v.get<std::string>());
      return;
  }
}

template <class T>
json fieldToJson(const Field<T>& f, const T& s) {
  switch (f.type) {
    case FieldType::Number: return f.getNumber(s);
    case FieldType::Integer: return std::int64_t(f.getNumber(s));
    default: return f.getText(s);
  }
}

// Sets doc at a dotted path (creating objects; digits index arrays).
json& atPath(json& doc, const std::string& path) {
  json* node = &doc;
  std::stringstream ss(path);
  std::string part;
  while (std::getline(ss, part, '.')) {
    if (!part.empty() && std::all_of(part.begin(), part.end(), ::isdigit)) {
      std::size_t i = 0;
      const auto [end, error] = std::from_chars(part.data(), part.data() + part.size(), i);
      if (error != std::errc() || !node->is_array() || i >= node->size())
        throw ScenarioError(path, "no element " + part + " here");
      node = &(*node)[i];
    } else {
      if (node->is_null()) *node = json::object();
      if (!node->is_object()) throw ScenarioError(path, "\"" + part + "\" is not inside an object");
      node = &(*node)[part];
    }
  }
  return *node;
}

template <class T>
const Field<T>* findIn(const std::vector<Field<T>>& fields, const std::string& path) {
  for (const auto& f : fields)
    if (f.path == path) return &f;
  return nullptr;
}

// Deepest nesting of objects and arrays a scenario text may have: the
// format needs three; the bound keeps every recursive JSON routine shallow.
constexpr std::size_t maxNesting = 32;

// A SAX pass over a JSON text that stops at the first key given twice in one
// object (with its dotted path, array items by index: "markings.1.end"), at
// nesting deeper than maxNesting, or at a syntax error (json::parse then says
// what is wrong).
class StructureCheck : public nlohmann::json_sax<json> {
 public:
  std::string duplicate;  ///< dotted path of the first repeated key; empty if none
  bool tooDeep = false;   ///< the nesting passed maxNesting ...
  std::string deepPath;   ///< ... at this dotted path (cut to 200 characters)

  bool null() override { return item(); }
  bool boolean(bool) override { return item(); }
  bool number_integer(number_integer_t) override { return item(); }
  bool number_unsigned(number_unsigned_t) override { return item(); }
  bool number_float(number_float_t, const string_t&) override { return item(); }
  bool string(string_t&) override { return item(); }
  bool binary(binary_t&) override { return item(); }
  bool start_object(std::size_t) override { return open(false); }
  bool start_array(std::size_t) override { return open(true); }
  bool end_object() override { return close(); }
  bool end_array() override { return close(); }
  bool key(string_t& k) override {
    Frame& f = frames_.back();
    if (!f.keys.insert(k).second) {
      duplicate = pathTo(k);
      return false;
    }
    f.key = k;
    return true;
  }
  bool parse_error(std::size_t, const std::string&, const nlohmann::detail::exception&) override { return false; }

 private:
  struct Frame {
    bool array = false;
    std::size_t items = 0;  // array: items begun so far
    std::string key;        // object: the key being read
    std::set<std::string> keys;
  };
  std::vector<Frame> frames_;        // the open containers, outermost first
  std::vector<std::string> labels_;  // how each open container but the outermost is reached

  // The label of the value that begins now (its key, or its index in an
  // array), counting it as an array item.
  std::string beginValue() {
    if (frames_.empty()) return "";
    Frame& f = frames_.back();
    return f.array ? std::to_string(f.items++) : f.key;
  }
  bool item() {
    beginValue();
    return true;
  }
  bool open(bool array) {
    const bool nested = !frames_.empty();
    const std::string label = beginValue();
    if (frames_.size() >= maxNesting) {
      tooDeep = true;
      deepPath = pathTo(label).substr(0, 200);
      return false;
    }
    if (nested) labels_.push_back(label);
    frames_.push_back(Frame{array, 0, "", {}});
    return true;
  }
  bool close() {
    frames_.pop_back();
    if (!frames_.empty()) labels_.pop_back();
    return true;
  }
  std::string pathTo(const std::string& last) const {
    std::string path;
    for (const std::string& l : labels_) path += l + ".";
    return path + last;
  }
};

// True when `path` names a group of scenario fields, the JSON object that
// holds them ("body" holds "body.length_mm").
bool isFieldGroup(const std::string& path) {
  const std::string prefix = path + ".";
  for (const auto& f : scenarioFields())
    if (f.path.rfind(prefix, 0) == 0) return true;
  return false;
}

// True when a version value names a format this build reads (1 to
// scenarioFormatVersion), whatever JSON integer type holds it.
bool readableVersion(const json& version) {
  if (version.is_number_unsigned()) {
    const std::uint64_t v = version.get<std::uint64_t>();
    return v >= 1 && v <= std::uint64_t(scenarioFormatVersion);
  }
  if (!version.is_number_integer()) return false;
  const std::int64_t v = version.get<std::int64_t>();
  return v >= 1 && v <= scenarioFormatVersion;
}

// Parses the bare text of a --set value into JSON by the field's type.
template <class T>
json parseOverrideValue(const Field<T>& f, const std::string& value, const std::string& path) {
  if (f.type == FieldType::Number || f.type == FieldType::Integer) {
    char* end = nullptr;
    const double x = std::strtod(value.c_str(), &end);
    if (value.empty() || end != value.c_str() + value.size() || !std::isfinite(x))
      throw ScenarioError(path, "expected a number (" + f.unit + "), got \"" + value + "\"");
    // Whole numbers within what a double holds exactly become JSON integers;
    // anything else stays a number for the range check to refuse.
    if (f.type == FieldType::Integer && std::abs(x) <= 9007199254740991.0 && std::floor(x) == x)
      return json(std::int64_t(x));
    return x;
  }
  std::string v = value;
  if (v.size() >= 2 && v.front() == '"' && v.back() == '"') v = v.substr(1, v.size() - 2);
  return v;
}

// An unknown key inside an item of a list, with the keys an item takes.
template <class T>
ScenarioError unknownItemKey(const std::string& path, const std::vector<Field<T>>& fields) {
  std::string keys;
  for (const auto& f : fields) keys += (keys.empty() ? "" : ", ") + f.path;
  return ScenarioError(path, "unknown key; allowed here: " + keys);
}

// An unknown key of the scenario, with the keys allowed in the nearest
// enclosing group that exists ("body" for "body.lenght_mm", the top level
// for "bdy.length_mm").
ScenarioError unknownKey(const std::string& path) {
  std::string group = path;
  do {
    const auto dot = group.rfind('.');
    group = dot == std::string::npos ? "" : group.substr(0, dot);
  } while (!group.empty() && !isFieldGroup(group));
  const std::string prefix = group.empty() ? "" : group + ".";
  std::vector<std::string> keys;
  auto add = [&](const std::string& fieldPath) {
    if (fieldPath.rfind(prefix, 0) != 0) return;
    const std::string rest = fieldPath.substr(prefix.size());
    const std::string key = rest.substr(0, rest.find('.'));
    if (std::find(keys.begin(), keys.end(), key) == keys.end()) keys.push_back(key);
  };
  if (group.empty()) add("dwellmark_scenario");
  for (const auto& f : scenarioFields()) add(f.path);
  add("markings");
  add("analysis.trace_points");
  std::string list;
  for (const auto& k : keys) list += (list.empty() ? "" : ", ") + k;
  return ScenarioError(path, "unknown key; allowed " + (group.empty() ? std::string("at the top level") : "in " + group) +
                                 ": " + list);
}

// Parses a JSON array of items (markings, trace points), each an object of
// known fields; `path` names the array in messages.
template <class T>
std::vector<T> itemsFromJson(const json& array, const std::string& path, const std::vector<Field<T>>& fields) {
  if (!array.is_array()) throw ScenarioError(path, "expected an array");
  std::vector<T> items;
  for (std::size_t i = 0; i < array.size(); ++i) {
    const json& item = array[i];
    const std::string itemPath = path + "." + std::to_string(i);
    if (!item.is_object()) throw ScenarioError(itemPath, "expected an object");
    T value;
    std::set<std::string> seen;
    for (auto it = item.begin(); it != item.end(); ++it) {
      const auto* f = findIn(fields, it.key());
      if (!f) throw unknownItemKey(itemPath + "." + it.key(), fields);
      setFromJson(*f, value, *it, itemPath + "." + it.key());
      seen.insert(it.key());
    }
    for (const auto& f : fields)
      if (f.required && !seen.count(f.path)) throw missingField(f, itemPath + "." + f.path);
    items.push_back(value);
  }
  return items;
}

// Writes items as a JSON array of objects holding every field in file units.
template <class T>
json itemsToJson(const std::vector<T>& items, const std::vector<Field<T>>& fields) {
  json array = json::array();
  for (const T& item : items) {
    json j = json::object();
    for (const auto& f : fields) j[f.path] = fieldToJson(f, item);
    array.push_back(j);
  }
  return array;
}

// Applies an override of one array item's field (`prefix` INDEX.key); false
// when the path does not start with `prefix`.
template <class T>
bool overrideItem(json& doc, const std::string& path, const std::string& value, const std::string& prefix,
                  const std::vector<Field<T>>& fields) {
  if (path.rfind(prefix, 0) != 0) return false;
  const auto dot = path.find('.', prefix.size());
  if (dot == std::string::npos) throw ScenarioError(path, "expected " + prefix + "INDEX.key");
  const auto* f = findIn(fields, path.substr(dot + 1));
  if (!f) throw unknownItemKey(path, fields);
  atPath(doc, path) = parseOverrideValue(*f, value, path);
  return true;
}

// Cross-field rules of the observer: the eye's window must hold its whole
// temporal response, a video frame cannot expose longer than the frame
// interval, and a steady orbit belongs to a steady spin.
void validateObserver(const ObserverSpec& o) {
  if (o.steadyOrbit != 0 && o.steadyPrecession <= 0)
    throw ScenarioError("observer.steady_orbit_mm", "value " + describe(o.steadyOrbit * 1e3) +
                                                        " mm needs observer.steady_precession_rev_s above 0; allowed 0 "
                                                        "when the observer shows the simulated run");
  if (o.mode == ExposureMode::Eye && o.exposure < k::minEyeWindow)
    throw ScenarioError("observer.exposure_s", "value " + describe(o.exposure) + " s is too short for observer.mode eye; "
                                               "allowed " + describe(k::minEyeWindow) + " to 10 s (the eye's response lasts about that long)");
  if (o.frameCount > 1 && (o.frameRate <= 0 || o.mode != ExposureMode::Camera))
    throw ScenarioError("observer.frame_count", "value " + std::to_string(o.frameCount) +
                                                    " needs observer.mode camera and observer.frame_rate_hz above 0; allowed 1 otherwise");
  if (o.frameRate > 0 && o.exposure > 1.0 / o.frameRate)
    throw ScenarioError("observer.exposure_s", "value " + describe(o.exposure) + " s is longer than one frame at " +
                                                   describe(o.frameRate) + " Hz; allowed 0.001 to " + describe(1.0 / o.frameRate) + " s");
}

}  // namespace

const std::vector<Field<Scenario>>& scenarioFields() {
  static const std::vector<Field<Scenario>> fields = buildScenarioFields();
  return fields;
}

const std::vector<Field<Marking>>& markingFields() {
  static const std::vector<Field<Marking>> fields = buildMarkingFields();
  return fields;
}

const std::vector<Field<TracePointSpec>>& tracePointFields() {
  static const std::vector<Field<TracePointSpec>> fields = buildTracePointFields();
  return fields;
}

const Field<Scenario>* findField(const std::string& path) { return findIn(scenarioFields(), path); }

namespace {

// Largest launch.backspin that keeps the release spin at or below `limit`
// (rad/s) with the scenario's vertical spin and body: the release spin is
// W z + b psi1 u (u the pressed end's axis, psi1 the axial spin of b = 1).
double largestBackspin(const Scenario& s, double limit) {
  Scenario one = s;
  one.launch.backspin = 1;
  const Params p = makeParams(one);
  const State s1 = launchState(p, one.launch);
  const Vec3 axial = s1.spinWorld() - s.launch.revolution * up();
  const double psi1 = axial.norm(), w = s.launch.revolution;
  if (psi1 <= 0) return 2;
  const double uz = axial.z() / psi1;
  // |W z + b psi1 u|^2 = limit^2, the larger root.
  const double half = w * psi1 * uz;
  return std::max(0.0, (-half + std::sqrt(half * half - psi1 * psi1 * (w * w - limit * limit))) / (psi1 * psi1));
}

// Refuses run.substeps: says which limit the step breaks, the substeps
// that would do, and what else would (less back-spin, shorter rows).
[[noreturn]] void refuseSubsteps(const Scenario& s, const NumericsNeeds& needs) {
  const double step = s.run.timeStep(), turn = needs.releaseSpin * step;
  const bool spinBound = turn > k::maxTurnPerStep;
  const std::string why =
      spinBound ? "in which the release spin (" + approx(needs.releaseSpin) + " rad/s) turns the body by " +
                      approx(turn) + " rad, more than " + describe(k::maxTurnPerStep) + " rad"
                : "longer than a twentieth of the contact period (" +
                      approx(0.05 * k::twoPi / s.contact.frequency * 1e6) + " us)";
  const double most = findField("run.substeps")->max;
  std::string cure = needs.minSubsteps <= most
                         ? "allowed at least " + std::to_string(needs.minSubsteps)
                         : "it needs " + std::to_string(needs.minSubsteps) + ", more than the " + describe(most) +
                               " allowed: lower run.sample_ms to at most " +
                               describe(std::floor(most * needs.longestStep * 1e6) / 1e3);
  // Less back-spin cures it only when the step already resolves the contact and the vertical spin.
  const bool backspinCures =
      step <= 0.05 * k::twoPi / s.contact.frequency && s.launch.revolution * step <= k::maxTurnPerStep;
  if (spinBound && backspinCures)
    cure += ", or launch.backspin at most " +
            describe(std::floor(largestBackspin(s, k::maxTurnPerStep / step) * 1000) / 1000);
  throw ScenarioError("run.substeps", "value " + describe(s.run.substeps) + " gives a " + approx(step * 1e6) +
                                          " us step " + why + "; " + cure);
}

// The numerical rules: a stiff enough contact, a release spin below the
// runaway limit, and a step that resolves the contact and the release spin.
void checkNumerics(const Scenario& s) {
  const NumericsNeeds needs = numericsNeeds(s);
  const double radius = s.body.outerDiameter / 2, w = s.contact.frequency;
  if (w < needs.minContactFrequency) {
    Scenario stiffer = s;
    stiffer.contact.frequency = std::ceil(needs.minContactFrequency / hz) * hz;
    const double sag = k::gravity / (w * w);
    throw ScenarioError("contact.frequency_hz",
                        "value " + describe(w / hz) + " lets the body sink " + approx(sag * 1e6) +
                            " um under its weight, " + approx(100 * sag / radius) + " % of its " +
                            describe(radius / mm) + " mm outer radius; allowed at least " +
                            describe(stiffer.contact.frequency / hz) + " Hz for this body (at most " +
                            describe(100 * k::maxStaticDeflection) + " %), with run.substeps at least " +
                            std::to_string(numericsNeeds(stiffer).minSubsteps));
  }
  const double spinLimit = 0.5 * k::runawaySpin;
  if (needs.releaseSpin > spinLimit)
    throw ScenarioError("launch.backspin",
                        "value " + describe(s.launch.backspin) + " spins the body at " + approx(needs.releaseSpin) +
                            " rad/s at release, over half the " + describe(k::runawaySpin) +
                            " rad/s a run treats as runaway; allowed at most " +
                            describe(std::floor(largestBackspin(s, spinLimit) * 1000) / 1000) +
                            " for this body and launch.revolution_rev_s");
  if (s.run.substeps < needs.minSubsteps) refuseSubsteps(s, needs);
}

}  // namespace

NumericsNeeds numericsNeeds(const Scenario& s) {
  NumericsNeeds n;
  n.minContactFrequency = std::sqrt(k::gravity / (k::maxStaticDeflection * s.body.outerDiameter / 2));
  n.releaseSpin = launchState(makeParams(s), s.launch).spinBody.norm();
  // Longest step that resolves the contact and turns the body by at most maxTurnPerStep.
  n.longestStep = 0.05 * k::twoPi / s.contact.frequency;
  if (n.releaseSpin > 0) n.longestStep = std::min(n.longestStep, k::maxTurnPerStep / n.releaseSpin);
  n.minSubsteps = int(std::ceil(s.run.sampleInterval / n.longestStep * (1 - 1e-12)));
  return n;
}

Cylinder cylinderOf(const BodySpec& b) {
  Cylinder c;
  c.length = b.length;
  c.outerRadius = b.outerDiameter / 2;
  c.innerRadius = isHollow(b.shape) ? std::max(0.0, c.outerRadius - b.wall) : 0.0;
  c.mass = b.mass > 0 ? b.mass : b.density * materialVolume(c);
  return c;
}

Scenario defaultScenario() {
  Scenario s;
  // A demo-like marked tube: patches on both rims.
  Marking a;
  a.kind = MarkingKind::RimPatch;
  a.end = End::A;
  a.colour = rgbFromHex("#d2372d");
  a.fromAngle = 0;
  a.toAngle = 25 * k::degree;
  Marking b = a;
  b.end = End::B;
  b.colour = rgbFromHex("#2d6fd2");
  s.paint.markings = {a, b};
  return s;
}

void validate(const Scenario& s) {
  const BodySpec& b = s.body;
  const bool hollow = isHollow(b.shape);
  for (const auto& f : scenarioFields())
    if (hollow || f.path != "body.wall_mm") checkRange(f, s, "");
  if (hollow && !(b.wall < b.outerDiameter / 2))
    throw ScenarioError("body.wall_mm", "value " + describe(b.wall / mm) + " must be less than the outer radius " +
                                            describe(b.outerDiameter / 2 / mm) + " mm");
  const bool flat = b.shape == Shape::Ring || b.shape == Shape::Disk;
  if (flat && b.length > b.outerDiameter)
    throw ScenarioError("body.length_mm", "a " + std::string(shapeName(b.shape)) + " is no longer than its diameter: " +
                                              describe(b.length / mm) + " mm > " + describe(b.outerDiameter / mm) +
                                              " mm; use tube or rod, or a shorter length");
  if (!flat && b.length <= b.outerDiameter)
    throw ScenarioError("body.length_mm", "a " + std::string(shapeName(b.shape)) + " is longer than its diameter: " +
                                              describe(b.length / mm) + " mm <= " + describe(b.outerDiameter / mm) +
                                              " mm; use ring or disk, or a longer length");
  if (s.surface.frictionKinetic > s.surface.frictionStatic)
    throw ScenarioError("surface.friction_kinetic", "value " + describe(s.surface.frictionKinetic) +
                                                        " exceeds surface.friction_static " +
                                                        describe(s.surface.frictionStatic) + "; allowed 0 to the static value");
  checkNumerics(s);
  validateObserver(s.observer);
  validateLaunchSpread(s);
  for (std::size_t i = 0; i < s.paint.markings.size(); ++i) {
    const Marking& m = s.paint.markings[i];
    const std::string prefix = "markings." + std::to_string(i) + ".";
    for (const auto& f : markingFields()) checkRange(f, m, prefix);
    if (m.kind == MarkingKind::Dot && std::abs(m.axial) > b.length / 2)
      throw ScenarioError(prefix + "axial_mm", "value " + describe(m.axial / mm) + " is off the body; allowed " +
                                                   rangeText(-b.length / 2 / mm, b.length / 2 / mm, "mm").substr(8));
  }
  for (std::size_t i = 0; i < s.analysis.tracePoints.size(); ++i)
    for (const auto& f : tracePointFields())
      checkRange(f, s.analysis.tracePoints[i], "analysis.trace_points." + std::to_string(i) + ".");
}

Scenario scenarioFromJson(const json& doc) {
  if (!doc.is_object()) throw ScenarioError("(document)", "a scenario is a JSON object, got " + std::string(doc.type_name()));
  // Version policy: version 1 is the only format so far; a file without a
  // version or from a newer dwellmark is refused rather than guessed at.
  if (!doc.contains("dwellmark_scenario"))
    throw ScenarioError("dwellmark_scenario", "missing; a scenario file starts with \"dwellmark_scenario\": " +
                                                  std::to_string(scenarioFormatVersion));
  const json& version = doc["dwellmark_scenario"];
  if (!readableVersion(version))
    throw ScenarioError("dwellmark_scenario", "version " + version.dump() + " is not supported; this build reads version " +
                                                  std::to_string(scenarioFormatVersion));

  Scenario s = defaultScenario();
  std::set<std::string> seen;
  // Walk every leaf; each must be a known field.
  std::function<void(const json&, const std::string&)> walk = [&](const json& node, const std::string& prefix) {
    for (auto it = node.begin(); it != node.end(); ++it) {
      const std::string path = prefix.empty() ? it.key() : prefix + "." + it.key();
      if (path == "dwellmark_scenario") continue;
      if (path == "markings") {
        s.paint.markings = itemsFromJson(*it, path, markingFields());
        seen.insert(path);
        continue;
      }
      if (path == "analysis.trace_points") {
        s.analysis.tracePoints = itemsFromJson(*it, path, tracePointFields());
        seen.insert(path);
        continue;
      }
      const auto* f = findField(path);
      // Only known groups are entered, so the walk is never deeper than the table.
      if (!f && it->is_object()) {
        if (!isFieldGroup(path)) throw unknownKey(path);
        walk(*it, path);
        continue;
      }
      if (!f && isFieldGroup(path))
        throw ScenarioError(path, "expected an object holding the " + path + ".* fields, got " + it->dump());
      if (!f) throw unknownKey(path);
      setFromJson(*f, s, *it, path);
      seen.insert(path);
    }
  };
  walk(doc, "");
  for (const auto& f : scenarioFields())
    if (f.required && !seen.count(f.path)) throw missingField(f, f.path);
  if (isHollow(s.body.shape) && !seen.count("body.wall_mm"))
    throw ScenarioError("body.wall_mm", "missing; a " + std::string(shapeName(s.body.shape)) + " needs its wall thickness");
  if (!seen.count("body.density_kg_m3") && !seen.count("body.mass_g"))
    throw ScenarioError("body.density_kg_m3", "missing; give body.density_kg_m3 or body.mass_g");
  if (seen.count("body.density_kg_m3") && seen.count("body.mass_g") && s.body.mass > 0)
    throw ScenarioError("body.mass_g", "give body.density_kg_m3 or body.mass_g, not both");
  validate(s);
  return s;
}

json scenarioToJson(const Scenario& s) {
  json doc = json::object();
  doc["dwellmark_scenario"] = scenarioFormatVersion;
  for (const auto& f : scenarioFields()) {
    if (f.path == "body.mass_g" && s.body.mass <= 0) continue;
    if (f.path == "body.density_kg_m3" && s.body.mass > 0) continue;
    if (f.path == "body.wall_mm" && !isHollow(s.body.shape)) continue;
    atPath(doc, f.path) = fieldToJson(f, s);
  }
  doc["markings"] = itemsToJson(s.paint.markings, markingFields());
  atPath(doc, "analysis.trace_points") = itemsToJson(s.analysis.tracePoints, tracePointFields());
  return doc;
}

json parseScenarioText(const std::string& text, const std::string& origin) {
  // A streaming pass first: it refuses repeated keys and deep nesting before
  // any document is built.
  StructureCheck check;
  json::sax_parse(text, &check);
  if (!check.duplicate.empty()) throw ScenarioError(check.duplicate, "key given twice in " + origin + "; keep one");
  if (check.tooDeep)
    throw ScenarioError(check.deepPath,
                        "nested deeper than " + std::to_string(maxNesting) + " levels in " + origin +
                            "; a scenario needs three");
  try {
    return json::parse(text);
  } catch (const json::exception& e) {
    // parse_error for bad syntax, out_of_range for a number beyond a double.
    throw ScenarioError("(file)", origin + " is not valid JSON: " + e.what());
  }
}

json readScenarioJson(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw ScenarioError("(file)", "cannot read " + path);
  std::stringstream buf;
  buf << in.rdbuf();
  return parseScenarioText(buf.str(), path);
}

Scenario loadScenario(const std::string& path) { return scenarioFromJson(readScenarioJson(path)); }

void applyOverride(json& doc, const std::string& assignment) {
  const auto eq = assignment.find('=');
  if (eq == std::string::npos || eq == 0)
    throw ScenarioError("--set", "expected key.path=value, got \"" + assignment + "\"");
  const std::string path = assignment.substr(0, eq);
  const std::string value = assignment.substr(eq + 1);
  if (overrideItem(doc, path, value, "markings.", markingFields())) return;
  if (overrideItem(doc, path, value, "analysis.trace_points.", tracePointFields())) return;
  const auto* f = findField(path);
  if (!f) throw unknownKey(path);
  atPath(doc, path) = parseOverrideValue(*f, value, path);
}

Rgb rgbFromHex(const std::string& hex) {
  if (hex.size() != 7 || hex[0] != '#') throw std::invalid_argument("colour");
  for (std::size_t i = 1; i < 7; ++i)
    if (!std::isxdigit(static_cast<unsigned char>(hex[i]))) throw std::invalid_argument("colour");
  auto channel = [&](int i) { return srgbToLinear(std::stoi(hex.substr(1 + 2 * i, 2), nullptr, 16) / 255.0); };
  return {channel(0), channel(1), channel(2)};
}

std::string hexFromRgb(const Rgb& c) {
  auto byte = [](double v) { return int(std::lround(linearToSrgb(v) * 255.0)); };
  char buf[8];
  std::snprintf(buf, sizeof buf, "#%02x%02x%02x", byte(c.r), byte(c.g), byte(c.b));
  return buf;
}

}  // namespace dm
