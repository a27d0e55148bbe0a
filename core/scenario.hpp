// A scenario: every input of a run (body, paint, surface, launch, run,
// contact numerics, observer, lighting), in SI inside the program. Files and
// the screen use practical units with the unit in the name; the one field
// table below converts, documents and range-checks every parameter, and the
// CLI, the GUI and the docs all read it.
#pragma once
#include <cstdint>
#include <functional>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/body.hpp"
#include "core/markings.hpp"

namespace dm {

/// Version of the scenario file format this build reads and writes.
inline constexpr int scenarioFormatVersion = 1;

struct BodySpec {
  Shape shape = Shape::Tube;
  double length = 0.060;         ///< m
  double outerDiameter = 0.015;  ///< m
  double wall = 0.0012;          ///< m (hollow shapes only)
  double density = 1180;         ///< kg/m^3; used when mass == 0
  double mass = 0;               ///< kg; 0 = derive from density
};

struct SurfaceSpec {
  std::string name = "custom";
  double frictionStatic = 0.45;     ///< Coulomb static coefficient, -
  double frictionKinetic = 0.35;    ///< Coulomb kinetic coefficient, -
  double rollingResistance = 0.002; ///< c_rr: torque c_rr N R opposes rolling, -
  double pivotFriction = 0.0002;    ///< arm of the drilling torque N * arm, m
  double airDrag = 1.1;             ///< drag coefficient C_d of the body's cross-flow, -
  double restitution = 0.4;         ///< normal coefficient of restitution of an impact, -
  Rgb colour{0.62, 0.48, 0.33};     ///< table colour, linear RGB
  double gridSpacing = 0.01;        ///< drawn grid spacing, m (0 = none)
  double tableRadius = 0.30;        ///< round table radius for the "leaves the table" check, m
};

struct LaunchSpec {
  End pressedEnd = End::A;  ///< the end a visitor presses down
  double revolution = 9 * 6.283185307179586;  ///< vertical spin at release, rad/s
  double backspin = 0.7;    ///< 1 = top of the pressed end at rest at release, 0 = no axial spin
  double tilt = 0.0;        ///< axis below horizontal at the pressed end, rad
  double drift = 0.0;       ///< sideways centre speed at release, m/s
  std::uint64_t seed = 1;   ///< seed for randomised launches
};

/// How one launch parameter is drawn for each visitor in an ensemble.
enum class SpreadKind {
  Fixed,    ///< always the nominal launch value
  Uniform,  ///< uniform between min and max
  Normal,   ///< normal with mean and sd, truncated to [min, max]
};

/// The distribution of one launch parameter, in the parameter's SI unit.
struct Spread {
  SpreadKind kind = SpreadKind::Fixed;
  double min = 0;   ///< lower bound (uniform range, normal truncation)
  double max = 0;   ///< upper bound
  double mean = 0;  ///< normal: mean, within [min, max]
  double sd = 0;    ///< normal: standard deviation, >= 0
};

/// What visitors do differently from one launch to the next. Defaults are
/// our own assumption of hand flicks at an exhibit table (common practice,
/// no source): 6 to 12 turns a second, a firm but uneven press, a small
/// tilt, a little sideways push, either end pressed.
struct LaunchSpreadSpec {
  Spread revolution{SpreadKind::Normal, 6 * 6.283185307179586, 12 * 6.283185307179586, 9 * 6.283185307179586,
                    1.5 * 6.283185307179586};                      ///< rad/s
  Spread backspin{SpreadKind::Uniform, 0.5, 1.0, 0.75, 0.15};      ///< -
  Spread tilt{SpreadKind::Uniform, 0.0, 0.10471975511965977, 0.05235987755982988, 0.017453292519943295};  ///< rad
  Spread drift{SpreadKind::Uniform, 0.0, 0.03, 0.015, 0.01};       ///< m/s
  double pressedEndAShare = 0.5;  ///< probability that a visitor presses end A, 0..1
};

struct RunSpec {
  double duration = 10.0;        ///< simulated time, s
  double sampleInterval = 1e-3;  ///< trajectory.csv row spacing, s
  int substeps = 3;              ///< integrator steps per row: the step is sampleInterval / substeps
  double timeStep() const { return sampleInterval / substeps; }  ///< integrator step, s
};

struct ContactSpec {
  double frequency = 6.283185307179586 * 100;  ///< natural frequency of the body on its contact, rad/s
};

enum class ViewKind { Top, Visitor };
enum class ExposureMode { Camera, Eye };
enum class Waveform { None, Sine, RectifiedMains };

struct ObserverSpec {
  ViewKind view = ViewKind::Top;
  ExposureMode mode = ExposureMode::Camera;
  double start = 4.0;             ///< exposure start time, s
  double exposure = 0.5;          ///< box-shutter exposure / eye integration window, s
  double eyeHeight = 1.5;         ///< visitor eye above the table top, m
  double eyeDistance = 0.6;       ///< horizontal distance of the eye from the spin centre, m
  double eyeAzimuth = 0.0;        ///< azimuth of the eye about the spin centre, rad
  double fieldOfView = 0.35;      ///< visitor view full field of view, rad
  double viewSpan = 0.12;         ///< top view: width of the table region shown, m
  int imageSize = 512;            ///< image width and height, px
  double spotThreshold = 0.02;    ///< Weber contrast detection threshold, -
  double steadyPrecession = 0;    ///< > 0: show the exact steady spin at this precession, rad/s; 0: the simulated run
  double steadyOrbit = 0;         ///< the centre orbit of that steady spin, m (CentreOrbit: + towards the raised end)
  double frameRate = 0;           ///< camera video frame rate, Hz; 0 = one exposure only
  int frameCount = 1;             ///< camera video: number of frames, each exposure_s long, 1/frame_rate apart
};

struct LightingSpec {
  double ambient = 0.35;             ///< ambient light level, 0..1
  double keyIntensity = 0.75;        ///< directional light level, 0..1
  double keyElevation = 1.1;         ///< directional light elevation above the table, rad
  double keyAzimuth = 0.7;           ///< directional light azimuth, rad
  Waveform flicker = Waveform::None; ///< light modulation waveform
  double flickerFrequency = 100.0;   ///< modulation frequency, Hz (rectified mains: twice the line frequency)
  double flickerDepth = 0.0;         ///< modulation depth (Michelson), 0..1
  double strobeRate = 0.0;           ///< flashes per second of a strobe or flashing light in the exhibit, 1/s (0 = none)
};

/// Where visitors stand or sit to look at the table, for the viewing check.
/// Eye heights are above the floor; defaults are rounded typical values
/// (from memory, after anthropometric tables and accessible exhibit design
/// guidance such as the Smithsonian Guidelines for Accessible Exhibition
/// Design; check them for the venue's visitors).
struct ViewingSpec {
  double tableHeight = 0.76;          ///< floor to table top, m
  double distance = 0.6;              ///< horizontal distance of the viewers' eyes from the spin centre, m
  double standingEyeHeight = 1.57;    ///< standing adult, m
  double childEyeHeight = 1.0;        ///< child of about six to eight years, m
  double seatedEyeHeight = 1.19;      ///< visitor seated or using a wheelchair, m
};

/// A point on one end's outer rim edge whose path and stops are traced, in
/// addition to the points taken from the markings.
struct TracePointSpec {
  End end = End::A;     ///< which end's rim
  double angle = 0;     ///< azimuth about the body axis from body x towards body y, rad
  double size = 0.002;  ///< extent of the mark it stands for along the rim, m (sets its spot size)
};

/// How a run's traces, stops and spots are analysed.
struct AnalysisSpec {
  double window = 1.0;         ///< length of each spot-statistics window, s
  double windowStep = 0.5;     ///< start-to-start spacing of the sliding windows, s
  double dwellSpeed = 0.05;    ///< horizontal speed below which a mark counts as stopped, m/s
  double eyeTime = 0.1;        ///< eye integration time that tells a creeping pattern from a ring, s
  std::vector<TracePointSpec> tracePoints;  ///< extra rim points to trace
};

/// All inputs of a run, SI.
struct Scenario {
  std::string name = "untitled";
  std::string description;
  BodySpec body;
  Paint paint;
  SurfaceSpec surface;
  LaunchSpec launch;
  LaunchSpreadSpec launchSpread;
  RunSpec run;
  ContactSpec contact;
  ObserverSpec observer;
  LightingSpec lighting;
  AnalysisSpec analysis;
  ViewingSpec viewing;
};

/// The body's geometry and mass, derived from the scenario.
Cylinder cylinderOf(const BodySpec& b);

/// A refused input: names the field (dotted JSON path), the value and what is allowed.
class ScenarioError : public std::runtime_error {
 public:
  ScenarioError(std::string field, const std::string& message)
      : std::runtime_error(field + ": " + message), field_(std::move(field)) {}
  const std::string& field() const { return field_; }
 private:
  std::string field_;
};

enum class FieldType { Number, Integer, Choice, Colour, Text };

/// One parameter as files, the screen and the docs see it: its dotted path,
/// unit, valid range (file units, inclusive), the factor to SI, default and
/// meaning. `get`/`set` move the value between the struct and file units.
template <class T>
struct Field {
  std::string path;
  FieldType type = FieldType::Number;
  std::string unit;  ///< file unit, "-" when dimensionless
  double min = 0, max = 0;
  std::vector<std::string> choices;  ///< Choice fields
  bool required = false;
  std::string help;
  std::function<double(const T&)> getNumber;       ///< file units
  std::function<void(T&, double)> setNumber;       ///< file units
  std::function<std::string(const T&)> getText;    ///< Choice, Colour, Text
  std::function<void(T&, const std::string&)> setText;
};

/// The table of every scalar scenario field (markings excluded).
const std::vector<Field<Scenario>>& scenarioFields();
/// The table of fields of one marking (paths relative to the marking).
const std::vector<Field<Marking>>& markingFields();
/// The table of fields of one extra trace point (paths relative to the point).
const std::vector<Field<TracePointSpec>>& tracePointFields();
/// Finds a field by dotted path, or nullptr.
const Field<Scenario>* findField(const std::string& path);

/// The defaults of every field: a valid scenario of its own.
Scenario defaultScenario();

/// Checks every range and every cross-field rule; throws ScenarioError
/// naming the first offending field.
void validate(const Scenario& s);

/// What a scenario's body and launch ask of the numerics (validate enforces
/// it): a contact stiff enough that the body's weight sinks it by at most
/// k::maxStaticDeflection of its outer radius, and enough integrator steps
/// per row to resolve both the contact (a twentieth of its period per step)
/// and the spin at release (at most k::maxTurnPerStep per step).
struct NumericsNeeds {
  double minContactFrequency = 0;  ///< rad/s
  double longestStep = 0;          ///< s, at the scenario's own contact.frequency
  int minSubsteps = 1;             ///< at the scenario's own contact.frequency and run.sample_ms
  double releaseSpin = 0;          ///< angular speed at release, rad/s
};
/// The needs of a scenario whose fields are each within their ranges.
NumericsNeeds numericsNeeds(const Scenario& s);

/// Parses and validates a scenario document. Unknown keys, missing required
/// fields, wrong types and out-of-range values throw ScenarioError.
Scenario scenarioFromJson(const nlohmann::json& doc);
/// Writes every field in file units (round-trips through scenarioFromJson).
nlohmann::json scenarioToJson(const Scenario& s);

/// Reads, parses and validates a scenario file.
Scenario loadScenario(const std::string& path);
/// Reads a scenario file as JSON (no validation); throws ScenarioError on a
/// missing file or what parseScenarioText refuses.
nlohmann::json readScenarioJson(const std::string& path);
/// Parses scenario text as JSON (no validation). Malformed JSON and a key
/// given twice in one object (RFC 8259 section 4 leaves its meaning open; a
/// hand edit that repeats a key would otherwise lose one value silently)
/// throw ScenarioError; `origin` names the text in messages.
nlohmann::json parseScenarioText(const std::string& text, const std::string& origin);

/// Applies `key.path=value` overrides to a scenario document before parsing.
/// Numbers, true/false and quoted or bare strings are accepted; the path must
/// name an existing field (array items by index: markings.0.colour,
/// analysis.trace_points.0.angle_deg).
void applyOverride(nlohmann::json& doc, const std::string& assignment);

/// sRGB "#rrggbb" <-> linear RGB (IEC 61966-2-1 transfer function).
Rgb rgbFromHex(const std::string& hex);  ///< throws std::invalid_argument
std::string hexFromRgb(const Rgb& c);

}  // namespace dm
