// OpenGL 3.3 core drawing of a ViewScene (render/view_scene.hpp), and an
// offscreen target for snapshots at any resolution. Holds no physics: it
// draws the poses, meshes, colours and lines it is given. Needs a current
// GL context (GLFW window, or EGL for headless use).
#pragma once
#include <cstdint>
#include <string>
#include <vector>

#include <epoxy/gl.h>
#include <glm/glm.hpp>

#include "render/image.hpp"
#include "render/view_scene.hpp"

namespace dm::gl {

/// Where the 3D view is looked at from.
struct ViewMatrices {
  glm::mat4 viewFromWorld{1.0f};
  glm::mat4 clipFromView{1.0f};
  glm::vec3 eye{0.0f};  ///< camera position, m (for highlights)
};

/// The shaders, the body's mesh and atlas, and the table and plane shapes on the GPU.
class SceneRenderer {
 public:
  /// Compiles the shaders from `shaderDir` (throws std::runtime_error with the GL log).
  explicit SceneRenderer(const std::string& shaderDir = DWELLMARK_SHADER_DIR);
  ~SceneRenderer();
  SceneRenderer(const SceneRenderer&) = delete;
  SceneRenderer& operator=(const SceneRenderer&) = delete;

  /// Uploads the body's mesh and paint atlas (after a geometry or paint
  /// change); the atlas is kept as 8-bit sRGB, decoded to linear light when sampled.
  void setBodyLook(const BodyLook& look);
  /// Draws the scene into the bound framebuffer's viewport (x, y, width, height
  /// in pixels from the bottom left), clearing that region first. The grid
  /// is uploaded only when its key changed; the body's pose is a uniform.
  void draw(const ViewScene& scene, const ViewMatrices& view, int x, int y, int width, int height);

 private:
  struct Shape {
    GLuint vao = 0, vertices = 0, indices = 0;
    GLsizei count = 0;
  };
  /// Uniform locations, looked up once.
  struct SurfaceUniforms {
    GLint clipFromWorld, worldFromModel, normalWorldFromModel, towardsLight, ambient, key, eye, paint;
  };
  struct FlatUniforms {
    GLint clipFromWorld, worldFromModel, encodedColour, opacity;
  };
  /// A run of points in a line buffer drawn as one line or strip.
  struct LineRange {
    GLint first = 0;
    GLsizei count = 0;
    glm::vec3 encodedColour{0.0f};
    float width = 1;
    bool strip = true;
  };
  void upload(Shape& shape, const Mesh& mesh);
  void uploadGrid(const ViewScene& scene);
  void drawSurface(const Shape& shape, const glm::mat4& worldFromModel, const glm::mat4& clipFromWorld,
                   const ViewScene& scene, const ViewMatrices& view);
  void drawFlat(const Shape& shape, const glm::mat4& worldFromModel, const glm::mat4& clipFromWorld,
                const glm::vec3& encodedColour, float opacity);
  void drawLines(const std::vector<LineRange>& ranges, GLuint buffer, const glm::mat4& clipFromWorld);
  void drawTable(const ViewScene& scene, const glm::mat4& clipFromWorld);
  void drawCeiling(const ViewScene& scene, const ViewMatrices& view, const glm::mat4& clipFromWorld);

  GLuint surfaceProgram_ = 0, flatProgram_ = 0;
  SurfaceUniforms surface_{};
  FlatUniforms flat_{};
  Shape body_, disk_, square_;
  GLuint atlas_ = 0;
  GLuint lineVao_ = 0, lineBuffer_ = 0, gridBuffer_ = 0;
  std::vector<LineRange> gridRanges_;
  std::uint64_t gridKey_ = 0;  ///< ViewScene::gridKey of the uploaded grid (0: none)
  float maxLineWidth_ = 1;
};

/// An offscreen colour + depth framebuffer, multisampled when `samples` > 1
/// (then resolved into a plain one for reading back).
class OffscreenTarget {
 public:
  OffscreenTarget(int width, int height, int samples = 4);  ///< throws std::runtime_error if incomplete
  ~OffscreenTarget();
  OffscreenTarget(const OffscreenTarget&) = delete;
  OffscreenTarget& operator=(const OffscreenTarget&) = delete;
  /// Binds the framebuffer for drawing.
  void bind();
  /// Resolves and reads the pixels (sRGB bytes as the shaders wrote them)
  /// into a linear-light image, row 0 at the top; rebinds the window's framebuffer.
  Image read();
  /// Copies the (resolved) pixels to the window's framebuffer, same size, and binds it.
  void copyToWindow();
  int width() const { return width_; }
  int height() const { return height_; }

 private:
  void resolve();
  int width_, height_, samples_;
  GLuint drawFbo_ = 0, drawColour_ = 0, drawDepth_ = 0, resolveFbo_ = 0, resolveColour_ = 0;
};

/// Reads the bound framebuffer's region (bottom-left origin) as sRGB bytes
/// into a linear-light image, row 0 at the top.
Image readFramebuffer(int x, int y, int width, int height);

}  // namespace dm::gl
