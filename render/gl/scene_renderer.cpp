#include "render/gl/scene_renderer.hpp"

#include <algorithm>
#include <cmath>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <vector>

#include <glm/gtc/matrix_transform.hpp>
#include <glm/gtc/type_ptr.hpp>

#include "core/colour.hpp"
#include "core/constants.hpp"

namespace dm::gl {

namespace {

std::string readText(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read shader " + path);
  std::stringstream buf;
  buf << in.rdbuf();
  return buf.str();
}

GLuint compile(GLenum kind, const std::string& path) {
  const std::string source = readText(path);
  const char* text = source.c_str();
  const GLuint shader = glCreateShader(kind);
  glShaderSource(shader, 1, &text, nullptr);
  glCompileShader(shader);
  GLint ok = 0;
  glGetShaderiv(shader, GL_COMPILE_STATUS, &ok);
  if (!ok) {
    char log[2048];
    glGetShaderInfoLog(shader, sizeof log, nullptr, log);
    glDeleteShader(shader);
    throw std::runtime_error("shader " + path + " does not compile: " + log);
  }
  return shader;
}

GLuint link(const std::string& dir, const std::string& name) {
  const GLuint vs = compile(GL_VERTEX_SHADER, dir + "/" + name + ".vert");
  const GLuint fs = compile(GL_FRAGMENT_SHADER, dir + "/" + name + ".frag");
  const GLuint program = glCreateProgram();
  glAttachShader(program, vs);
  glAttachShader(program, fs);
  glLinkProgram(program);
  glDeleteShader(vs);
  glDeleteShader(fs);
  GLint ok = 0;
  glGetProgramiv(program, GL_LINK_STATUS, &ok);
  if (!ok) {
    char log[2048];
    glGetProgramInfoLog(program, sizeof log, nullptr, log);
    throw std::runtime_error("shader program " + name + " does not link: " + log);
  }
  return program;
}

GLint at(GLuint program, const char* name) { return glGetUniformLocation(program, name); }

glm::vec3 vec(const Vec3& v) { return {float(v.x()), float(v.y()), float(v.z())}; }
glm::vec3 encoded(const Rgb& c) { return {float(linearToSrgb(c.r)), float(linearToSrgb(c.g)), float(linearToSrgb(c.b))}; }

// A flat horizontal surface seen from above (or below) lit as the surface
// shader would, without the highlight: one colour for the whole plane.
Rgb litFromAbove(const ViewScene& s, const Rgb& albedo) {
  const double k = s.ambient + s.keyIntensity * std::max(0.0, s.towardsKeyLight.z());
  return {albedo.r * k, albedo.g * k, albedo.b * k};
}
Rgb litFromBelow(const ViewScene& s, const Rgb& albedo) {
  const double k = s.ambient + s.keyIntensity * std::max(0.0, -s.towardsKeyLight.z());
  return {albedo.r * k, albedo.g * k, albedo.b * k};
}


// A unit disk in the plane z = 0 (normal up), centred on the origin.
Mesh unitDisk(int segments) {
  Mesh m;
  m.vertices.push_back({{0, 0, 0}, {0, 0, 1}, {0, 0}});
  for (int i = 0; i <= segments; ++i) {
    const double th = k::twoPi * i / segments;
    m.vertices.push_back({{float(std::cos(th)), float(std::sin(th)), 0}, {0, 0, 1}, {0, 0}});
  }
  for (int i = 1; i <= segments; ++i) m.indices.insert(m.indices.end(), {0u, std::uint32_t(i), std::uint32_t(i + 1)});
  return m;
}

// The square [-1, 1]^2 in the plane z = 0 (normal up).
Mesh unitSquare() {
  Mesh m;
  for (auto [x, y] : {std::pair{-1, -1}, {1, -1}, {1, 1}, {-1, 1}})
    m.vertices.push_back({{float(x), float(y), 0}, {0, 0, 1}, {0, 0}});
  m.indices = {0, 1, 2, 0, 2, 3};
  return m;
}

// Sides of the table's polygon: round at any zoom on a 300 mm table.
constexpr int tableSegments = 192;
// Behind the table (sRGB-encoded): a dark blue-grey.
constexpr glm::vec3 backgroundColour{0.105f, 0.118f, 0.133f};

// True when the table top fills the whole view: the eye is above it and
// the ray through each corner of the view meets the table inside its
// polygon of `segments` sides. The table is convex, so the whole view
// then shows table.
bool tableFillsView(const ViewScene& s, const ViewMatrices& v, const glm::mat4& clipFromWorld, int segments) {
  const double inscribed = s.tableRadius * std::cos(k::pi / segments);
  const glm::dmat4 worldFromClip = glm::inverse(glm::dmat4(clipFromWorld));
  for (double cx : {-1.0, 1.0})
    for (double cy : {-1.0, 1.0}) {
      glm::dvec4 nearPoint = worldFromClip * glm::dvec4(cx, cy, -1, 1), farPoint = worldFromClip * glm::dvec4(cx, cy, 1, 1);
      nearPoint /= nearPoint.w;
      farPoint /= farPoint.w;
      if (!(nearPoint.z > 0 && farPoint.z < 0)) return false;  // the corner does not look down through the table's plane
      const glm::dvec4 hit = nearPoint + (nearPoint.z / (nearPoint.z - farPoint.z)) * (farPoint - nearPoint);
      if (std::hypot(hit.x, hit.y) >= inscribed) return false;
    }
  return v.eye.z > 0;
}

glm::mat4 worldFromPose(const Pose& pose) {
  const Eigen::Matrix3d r = pose.worldFromBody.toRotationMatrix();
  glm::mat4 m(1.0f);
  for (int c = 0; c < 3; ++c)
    for (int row = 0; row < 3; ++row) m[c][row] = float(r(row, c));
  m[3] = glm::vec4(vec(pose.position), 1.0f);
  return m;
}

}  // namespace

SceneRenderer::SceneRenderer(const std::string& shaderDir) {
  surfaceProgram_ = link(shaderDir, "surface");
  flatProgram_ = link(shaderDir, "flat");
  const GLuint p = surfaceProgram_, f = flatProgram_;
  surface_ = {at(p, "uClipFromWorld"), at(p, "uWorldFromModel"), at(p, "uNormalWorldFromModel"), at(p, "uTowardsLight"),
              at(p, "uAmbient"),       at(p, "uKey"),            at(p, "uEye"),                  at(p, "uPaint")};
  flat_ = {at(f, "uClipFromWorld"), at(f, "uWorldFromModel"), at(f, "uEncodedColour"), at(f, "uOpacity")};
  upload(disk_, unitDisk(tableSegments));
  upload(square_, unitSquare());
  // One vertex layout (a position) for both line buffers.
  glGenVertexArrays(1, &lineVao_);
  glGenBuffers(1, &lineBuffer_);
  glGenBuffers(1, &gridBuffer_);
  GLfloat range[2] = {1, 1};
  glGetFloatv(GL_ALIASED_LINE_WIDTH_RANGE, range);
  maxLineWidth_ = range[1];
  glGenTextures(1, &atlas_);
}

SceneRenderer::~SceneRenderer() {
  for (Shape* s : {&body_, &disk_, &square_}) {
    glDeleteVertexArrays(1, &s->vao);
    glDeleteBuffers(1, &s->vertices);
    glDeleteBuffers(1, &s->indices);
  }
  glDeleteVertexArrays(1, &lineVao_);
  glDeleteBuffers(1, &lineBuffer_);
  glDeleteBuffers(1, &gridBuffer_);
  glDeleteTextures(1, &atlas_);
  glDeleteProgram(surfaceProgram_);
  glDeleteProgram(flatProgram_);
}

void SceneRenderer::upload(Shape& shape, const Mesh& mesh) {
  if (!shape.vao) {
    glGenVertexArrays(1, &shape.vao);
    glGenBuffers(1, &shape.vertices);
    glGenBuffers(1, &shape.indices);
  }
  glBindVertexArray(shape.vao);
  glBindBuffer(GL_ARRAY_BUFFER, shape.vertices);
  glBufferData(GL_ARRAY_BUFFER, GLsizeiptr(mesh.vertices.size() * sizeof(MeshVertex)), mesh.vertices.data(), GL_STATIC_DRAW);
  glBindBuffer(GL_ELEMENT_ARRAY_BUFFER, shape.indices);
  glBufferData(GL_ELEMENT_ARRAY_BUFFER, GLsizeiptr(mesh.indices.size() * sizeof(std::uint32_t)), mesh.indices.data(),
               GL_STATIC_DRAW);
  const GLsizei stride = sizeof(MeshVertex);
  glEnableVertexAttribArray(0);
  glVertexAttribPointer(0, 3, GL_FLOAT, GL_FALSE, stride, reinterpret_cast<void*>(offsetof(MeshVertex, position)));
  glEnableVertexAttribArray(1);
  glVertexAttribPointer(1, 3, GL_FLOAT, GL_FALSE, stride, reinterpret_cast<void*>(offsetof(MeshVertex, normal)));
  glEnableVertexAttribArray(2);
  glVertexAttribPointer(2, 2, GL_FLOAT, GL_FALSE, stride, reinterpret_cast<void*>(offsetof(MeshVertex, uv)));
  glBindVertexArray(0);
  shape.count = GLsizei(mesh.indices.size());
}

void SceneRenderer::setBodyLook(const BodyLook& look) {
  upload(body_, look.mesh);
  // 8-bit sRGB texels: a quarter of the float atlas' memory, and the
  // sampler decodes them to linear light before filtering.
  const Image& a = look.atlas;
  const std::vector<unsigned char> texels = srgbaBytes(a);
  glBindTexture(GL_TEXTURE_2D, atlas_);
  glPixelStorei(GL_UNPACK_ALIGNMENT, 1);
  glTexImage2D(GL_TEXTURE_2D, 0, GL_SRGB8_ALPHA8, a.width, a.height, 0, GL_RGBA, GL_UNSIGNED_BYTE, texels.data());
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_MIN_FILTER, GL_LINEAR);
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_MAG_FILTER, GL_LINEAR);
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_WRAP_S, GL_REPEAT);  // azimuth wraps round
  glTexParameteri(GL_TEXTURE_2D, GL_TEXTURE_WRAP_T, GL_CLAMP_TO_EDGE);
  glBindTexture(GL_TEXTURE_2D, 0);
}

// The grid's points in one buffer, uploaded when its key changes.
void SceneRenderer::uploadGrid(const ViewScene& scene) {
  if (scene.gridKey == gridKey_) return;
  std::vector<Eigen::Vector3f> points;
  gridRanges_.clear();
  for (const SceneLine& line : scene.grid) {
    gridRanges_.push_back({GLint(points.size()), GLsizei(line.points.size()), encoded(line.colour), line.width, line.strip});
    points.insert(points.end(), line.points.begin(), line.points.end());
  }
  glBindBuffer(GL_ARRAY_BUFFER, gridBuffer_);
  glBufferData(GL_ARRAY_BUFFER, GLsizeiptr(points.size() * sizeof(Eigen::Vector3f)), points.data(), GL_STATIC_DRAW);
  gridKey_ = scene.gridKey;
}

void SceneRenderer::drawSurface(const Shape& shape, const glm::mat4& worldFromModel, const glm::mat4& clipFromWorld,
                                const ViewScene& scene, const ViewMatrices& view) {
  glUseProgram(surfaceProgram_);
  glUniformMatrix4fv(surface_.clipFromWorld, 1, GL_FALSE, glm::value_ptr(clipFromWorld));
  glUniformMatrix4fv(surface_.worldFromModel, 1, GL_FALSE, glm::value_ptr(worldFromModel));
  const glm::mat3 normals = glm::transpose(glm::inverse(glm::mat3(worldFromModel)));
  glUniformMatrix3fv(surface_.normalWorldFromModel, 1, GL_FALSE, glm::value_ptr(normals));
  glUniform3fv(surface_.towardsLight, 1, glm::value_ptr(vec(scene.towardsKeyLight)));
  glUniform1f(surface_.ambient, float(scene.ambient));
  glUniform1f(surface_.key, float(scene.keyIntensity));
  glUniform3fv(surface_.eye, 1, glm::value_ptr(view.eye));
  glActiveTexture(GL_TEXTURE0);
  glBindTexture(GL_TEXTURE_2D, atlas_);
  glUniform1i(surface_.paint, 0);
  glBindVertexArray(shape.vao);
  glDrawElements(GL_TRIANGLES, shape.count, GL_UNSIGNED_INT, nullptr);
}

void SceneRenderer::drawFlat(const Shape& shape, const glm::mat4& worldFromModel, const glm::mat4& clipFromWorld,
                             const glm::vec3& encodedColour, float opacity) {
  glUseProgram(flatProgram_);
  glUniformMatrix4fv(flat_.clipFromWorld, 1, GL_FALSE, glm::value_ptr(clipFromWorld));
  glUniformMatrix4fv(flat_.worldFromModel, 1, GL_FALSE, glm::value_ptr(worldFromModel));
  glUniform3fv(flat_.encodedColour, 1, glm::value_ptr(encodedColour));
  glUniform1f(flat_.opacity, opacity);
  glBindVertexArray(shape.vao);
  glDrawElements(GL_TRIANGLES, shape.count, GL_UNSIGNED_INT, nullptr);
}

void SceneRenderer::drawLines(const std::vector<LineRange>& ranges, GLuint buffer, const glm::mat4& clipFromWorld) {
  glUseProgram(flatProgram_);
  glUniformMatrix4fv(flat_.clipFromWorld, 1, GL_FALSE, glm::value_ptr(clipFromWorld));
  const glm::mat4 identity(1.0f);
  glUniformMatrix4fv(flat_.worldFromModel, 1, GL_FALSE, glm::value_ptr(identity));
  glUniform1f(flat_.opacity, 1.0f);
  glBindVertexArray(lineVao_);
  glBindBuffer(GL_ARRAY_BUFFER, buffer);
  glEnableVertexAttribArray(0);
  glVertexAttribPointer(0, 3, GL_FLOAT, GL_FALSE, sizeof(Eigen::Vector3f), nullptr);
  for (const LineRange& r : ranges) {
    if (r.count < 2) continue;
    glUniform3fv(flat_.encodedColour, 1, glm::value_ptr(r.encodedColour));
    glLineWidth(std::min(r.width, maxLineWidth_));
    glDrawArrays(r.strip ? GL_LINE_STRIP : GL_LINES, r.first, r.count);
  }
  glLineWidth(1);
}

// The table top: one flat lit colour (a plane facing up has the same
// diffuse light everywhere), pushed back so the grid lines lie on it.
void SceneRenderer::drawTable(const ViewScene& scene, const glm::mat4& clipFromWorld) {
  const float r = float(scene.tableRadius);
  const glm::mat4 model = glm::scale(glm::mat4(1.0f), glm::vec3(r, r, 1.0f));
  glEnable(GL_POLYGON_OFFSET_FILL);
  glPolygonOffset(1.0f, 1.0f);
  drawFlat(disk_, model, clipFromWorld, encoded(litFromAbove(scene, scene.tableColour)), 1.0f);
  glDisable(GL_POLYGON_OFFSET_FILL);
}

// The translucent ceiling, without writing depth: a flat plane, lit the
// same everywhere from the side the eye is on.
void SceneRenderer::drawCeiling(const ViewScene& scene, const ViewMatrices& view, const glm::mat4& clipFromWorld) {
  glEnable(GL_BLEND);
  glBlendFunc(GL_SRC_ALPHA, GL_ONE_MINUS_SRC_ALPHA);
  glDepthMask(GL_FALSE);
  const float h = float(scene.ceilingHalfSize);
  const glm::mat4 model = glm::scale(glm::translate(glm::mat4(1.0f), vec(scene.ceilingCentre)), glm::vec3(h, h, 1.0f));
  const bool fromAbove = view.eye.z >= float(scene.ceilingCentre.z());
  const Rgb lit = fromAbove ? litFromAbove(scene, scene.ceilingColour) : litFromBelow(scene, scene.ceilingColour);
  drawFlat(square_, model, clipFromWorld, encoded(lit), float(scene.ceilingOpacity));
  glDepthMask(GL_TRUE);
  glDisable(GL_BLEND);
}

void SceneRenderer::draw(const ViewScene& scene, const ViewMatrices& view, int x, int y, int width, int height) {
  const glm::mat4 clipFromWorld = view.clipFromView * view.viewFromWorld;
  // Clear only this view's region: to the table's colour when the table
  // fills it (nothing lies below the table to hide, and a clear costs far
  // less than filling the view with triangles in software GL).
  const bool tableEverywhere = tableFillsView(scene, view, clipFromWorld, tableSegments);
  const glm::vec3 clear = tableEverywhere ? encoded(litFromAbove(scene, scene.tableColour)) : backgroundColour;
  glViewport(x, y, width, height);
  glEnable(GL_SCISSOR_TEST);
  glScissor(x, y, width, height);
  glClearColor(clear.r, clear.g, clear.b, 1.0f);
  glClearDepth(1.0);
  glClear(GL_COLOR_BUFFER_BIT | GL_DEPTH_BUFFER_BIT);
  glEnable(GL_DEPTH_TEST);
  glDepthFunc(GL_LEQUAL);
  glDisable(GL_CULL_FACE);
  glDisable(GL_BLEND);

  if (!tableEverywhere) drawTable(scene, clipFromWorld);
  if (body_.count) drawSurface(body_, worldFromPose(scene.bodyPose), clipFromWorld, scene, view);
  // The grid from its kept buffer, the traces streamed this frame.
  uploadGrid(scene);
  drawLines(gridRanges_, gridBuffer_, clipFromWorld);
  std::vector<Eigen::Vector3f> points;
  std::vector<LineRange> ranges;
  for (const SceneLine& line : scene.lines) {
    ranges.push_back({GLint(points.size()), GLsizei(line.points.size()), encoded(line.colour), line.width, line.strip});
    points.insert(points.end(), line.points.begin(), line.points.end());
  }
  glBindBuffer(GL_ARRAY_BUFFER, lineBuffer_);
  glBufferData(GL_ARRAY_BUFFER, GLsizeiptr(points.size() * sizeof(Eigen::Vector3f)), points.data(), GL_STREAM_DRAW);
  drawLines(ranges, lineBuffer_, clipFromWorld);
  if (scene.ceilingVisible) drawCeiling(scene, view, clipFromWorld);
  glBindVertexArray(0);
  glUseProgram(0);
  glDisable(GL_DEPTH_TEST);
  glDisable(GL_SCISSOR_TEST);
}

// ---- offscreen -------------------------------------------------------------

namespace {

// A framebuffer with one colour and (optionally) one depth renderbuffer.
bool makeFramebuffer(GLuint& fbo, GLuint& colour, GLuint* depth, int width, int height, int samples) {
  glGenFramebuffers(1, &fbo);
  glGenRenderbuffers(1, &colour);
  glBindRenderbuffer(GL_RENDERBUFFER, colour);
  if (samples > 1) glRenderbufferStorageMultisample(GL_RENDERBUFFER, samples, GL_RGBA8, width, height);
  else glRenderbufferStorage(GL_RENDERBUFFER, GL_RGBA8, width, height);
  glBindFramebuffer(GL_FRAMEBUFFER, fbo);
  glFramebufferRenderbuffer(GL_FRAMEBUFFER, GL_COLOR_ATTACHMENT0, GL_RENDERBUFFER, colour);
  if (depth) {
    glGenRenderbuffers(1, depth);
    glBindRenderbuffer(GL_RENDERBUFFER, *depth);
    if (samples > 1) glRenderbufferStorageMultisample(GL_RENDERBUFFER, samples, GL_DEPTH_COMPONENT24, width, height);
    else glRenderbufferStorage(GL_RENDERBUFFER, GL_DEPTH_COMPONENT24, width, height);
    glFramebufferRenderbuffer(GL_FRAMEBUFFER, GL_DEPTH_ATTACHMENT, GL_RENDERBUFFER, *depth);
  }
  const bool ok = glCheckFramebufferStatus(GL_FRAMEBUFFER) == GL_FRAMEBUFFER_COMPLETE;
  glBindFramebuffer(GL_FRAMEBUFFER, 0);
  glBindRenderbuffer(GL_RENDERBUFFER, 0);
  return ok;
}

}  // namespace

OffscreenTarget::OffscreenTarget(int width, int height, int samples)
    : width_(width), height_(height), samples_(std::max(1, samples)) {
  bool ok = makeFramebuffer(drawFbo_, drawColour_, &drawDepth_, width, height, samples_);
  if (samples_ > 1) ok = makeFramebuffer(resolveFbo_, resolveColour_, nullptr, width, height, 1) && ok;
  if (!ok)
    throw std::runtime_error("the GL driver refused an offscreen image of " + std::to_string(width) + " x " +
                             std::to_string(height) + " px");
}

OffscreenTarget::~OffscreenTarget() {
  glDeleteFramebuffers(1, &drawFbo_);
  glDeleteFramebuffers(1, &resolveFbo_);
  glDeleteRenderbuffers(1, &drawColour_);
  glDeleteRenderbuffers(1, &drawDepth_);
  glDeleteRenderbuffers(1, &resolveColour_);
}

void OffscreenTarget::bind() { glBindFramebuffer(GL_FRAMEBUFFER, drawFbo_); }

void OffscreenTarget::resolve() {
  if (samples_ == 1) return;
  glBindFramebuffer(GL_READ_FRAMEBUFFER, drawFbo_);
  glBindFramebuffer(GL_DRAW_FRAMEBUFFER, resolveFbo_);
  glBlitFramebuffer(0, 0, width_, height_, 0, 0, width_, height_, GL_COLOR_BUFFER_BIT, GL_NEAREST);
}

Image OffscreenTarget::read() {
  resolve();
  glBindFramebuffer(GL_FRAMEBUFFER, samples_ > 1 ? resolveFbo_ : drawFbo_);
  Image img = readFramebuffer(0, 0, width_, height_);
  glBindFramebuffer(GL_FRAMEBUFFER, 0);
  return img;
}

void OffscreenTarget::copyToWindow() {
  resolve();
  glBindFramebuffer(GL_READ_FRAMEBUFFER, samples_ > 1 ? resolveFbo_ : drawFbo_);
  glBindFramebuffer(GL_DRAW_FRAMEBUFFER, 0);
  glBlitFramebuffer(0, 0, width_, height_, 0, 0, width_, height_, GL_COLOR_BUFFER_BIT, GL_NEAREST);
  glBindFramebuffer(GL_FRAMEBUFFER, 0);
}

Image readFramebuffer(int x, int y, int width, int height) {
  std::vector<unsigned char> bytes(std::size_t(width) * std::size_t(height) * 4);
  glPixelStorei(GL_PACK_ALIGNMENT, 1);
  glReadPixels(x, y, width, height, GL_RGBA, GL_UNSIGNED_BYTE, bytes.data());
  // GL rows run bottom-up; images top-down. Bytes are sRGB: decode to linear
  // so writePng encodes them back to the same bytes.
  Image img(width, height);
  std::vector<double> linear(256);
  for (int i = 0; i < 256; ++i) linear[std::size_t(i)] = srgbToLinear(i / 255.0);
  for (int row = 0; row < height; ++row)
    for (int col = 0; col < width; ++col) {
      const unsigned char* p = &bytes[(std::size_t(height - 1 - row) * std::size_t(width) + std::size_t(col)) * 4];
      img.set(col, row, {linear[p[0]], linear[p[1]], linear[p[2]]});
    }
  return img;
}

}  // namespace dm::gl
