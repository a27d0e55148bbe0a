// An OpenGL 3.3 core context without any display or window: EGL on Mesa's
// surfaceless platform (EGL_MESA_platform_surfaceless), drawing only into
// framebuffer objects. What headless snapshots render with.
#pragma once
#include <epoxy/egl.h>

namespace dm::gl {

class HeadlessContext {
 public:
  /// Creates the context and makes it current on this thread; throws
  /// std::runtime_error naming the missing piece when EGL cannot.
  HeadlessContext();
  ~HeadlessContext();
  HeadlessContext(const HeadlessContext&) = delete;
  HeadlessContext& operator=(const HeadlessContext&) = delete;

 private:
  EGLDisplay display_ = EGL_NO_DISPLAY;
  EGLContext context_ = EGL_NO_CONTEXT;
};

}  // namespace dm::gl
