// The 3D view as plain data: the body's mesh and paint atlas, its pose, the
// table, grid lines, traces, the ceiling plane and the spin axis. CPU
// functions fill it from the scenario and the recorded samples; the GL
// renderer (render/gl) only draws it, so nothing here includes GL.
#pragma once
#include <cstdint>
#include <vector>

#include <Eigen/Core>

#include "core/body.hpp"
#include "core/markings.hpp"
#include "core/scenario.hpp"
#include "core/trajectory.hpp"
#include "render/image.hpp"

namespace dm {

/// One mesh vertex: body-frame position (m), unit normal, paint atlas coordinates (0..1).
struct MeshVertex {
  float position[3];
  float normal[3];
  float uv[2];
};

/// An indexed triangle list.
struct Mesh {
  std::vector<MeshVertex> vertices;
  std::vector<std::uint32_t> indices;  ///< three per triangle
};

/// Rows of the paint atlas that hold each surface part (the atlas is
/// `atlasSize` square; columns are azimuth 0..2 pi). Outer and bore rows
/// run from end A (z = +L/2) to end B; face rows from the rim inwards.
struct AtlasLayout {
  int size = 512;
  int outerRows = 256, boreRows = 64, faceRows = 96;
  int outerStart() const { return 0; }
  int boreStart() const { return outerRows; }
  int faceStart(End e) const { return outerRows + boreRows + (e == End::A ? 0 : faceRows); }
};

/// What the body looks like: its mesh in body coordinates and the linear
/// RGB paint atlas the mesh's coordinates sample, painted by colourAt().
struct BodyLook {
  Mesh mesh;
  Image atlas;
};

/// Builds the body's mesh (`segments` around the axis, 8..1024) and paint atlas.
BodyLook makeBodyLook(const Cylinder& c, const Paint& paint, int segments = 128, const AtlasLayout& layout = {});

/// Body-frame surface point that atlas texel (column, row) shows.
SurfacePoint atlasTexelPoint(const Cylinder& c, const AtlasLayout& layout, int column, int row);

/// A set of lines in the lab frame, m: a strip joins consecutive points,
/// otherwise points pair up as separate segments.
struct SceneLine {
  std::vector<Eigen::Vector3f> points;
  Rgb colour;  ///< linear RGB
  float width = 1;  ///< pixels
  bool strip = true;
};

/// Which extras the 3D view draws, and how much of the past the traces show.
struct SceneOverlays {
  bool grid = true;
  bool floorTrace = true;     ///< path of the floor contact point
  bool ceiling = true;        ///< translucent plane at the body's top height
  bool ceilingTrace = true;   ///< path of the point touching that plane
  bool markPaths = true;      ///< paths of the markings' anchor points
  bool spinAxis = true;       ///< the angular velocity through the centre
  bool centrePath = true;     ///< the centre's path over the whole run
  double trailSeconds = 0.5;  ///< s, history shown by the point traces (0.02..10)
  bool operator==(const SceneOverlays&) const = default;
};

/// The 3D view at one instant, lab frame, SI.
struct ViewScene {
  Pose bodyPose;
  double tableRadius = 0.3;  ///< m
  Rgb tableColour;
  std::vector<SceneLine> grid;  ///< the table's grid lines: the same at every instant of a scenario
  std::uint64_t gridKey = 0;    ///< changes whenever `grid` does, so a renderer may keep it uploaded meanwhile
  std::vector<SceneLine> lines;  ///< traces, paths and the spin axis: new every instant
  bool ceilingVisible = false;
  Vec3 ceilingCentre = Vec3::Zero();  ///< m, the plane is horizontal
  double ceilingHalfSize = 0.05;      ///< m
  Rgb ceilingColour;
  double ceilingOpacity = 0.2;        ///< 0..1
  Vec3 towardsKeyLight = Vec3::UnitZ();  ///< unit vector
  double ambient = 0.35, keyIntensity = 0.75;
};

/// What the scene is built from: the scenario, the dense recent samples
/// (every integrator step, for the point traces) and the sparse record of
/// the whole run (for the centre's path). The last dense sample is "now".
struct SceneSource {
  const Scenario& scenario;
  const std::vector<Sample>& recent;
  const std::vector<Sample>& record;
};

/// Fills the scene for the last recent sample.
ViewScene buildViewScene(const SceneSource& source, const SceneOverlays& overlays);

/// Table grid lines within `radius` of the origin: major lines every
/// `spacing` m (none when 0), and millimetre lines within `fineExtent` m.
std::vector<SceneLine> tableGrid(double radius, double spacing, double fineExtent, const Rgb& tableColour);

}  // namespace dm
