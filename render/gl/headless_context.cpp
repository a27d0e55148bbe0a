#include "render/gl/headless_context.hpp"

#include <stdexcept>
#include <string>

namespace dm::gl {

namespace {

[[noreturn]] void refuse(const std::string& what) {
  throw std::runtime_error("cannot open a headless OpenGL context: " + what);
}

}  // namespace

HeadlessContext::HeadlessContext() {
  // The surfaceless platform needs no display server at all.
  if (!epoxy_has_egl_extension(EGL_NO_DISPLAY, "EGL_MESA_platform_surfaceless"))
    refuse("EGL lacks Mesa's surfaceless platform (EGL_MESA_platform_surfaceless)");
  display_ = eglGetPlatformDisplayEXT(EGL_PLATFORM_SURFACELESS_MESA, EGL_DEFAULT_DISPLAY, nullptr);
  if (display_ == EGL_NO_DISPLAY || !eglInitialize(display_, nullptr, nullptr)) refuse("eglInitialize failed");
  if (!epoxy_has_egl_extension(display_, "EGL_KHR_surfaceless_context") ||
      !epoxy_has_egl_extension(display_, "EGL_KHR_no_config_context"))
    refuse("EGL lacks EGL_KHR_surfaceless_context or EGL_KHR_no_config_context");
  if (!eglBindAPI(EGL_OPENGL_API)) refuse("EGL cannot bind desktop OpenGL");
  const EGLint attributes[] = {EGL_CONTEXT_MAJOR_VERSION, 3, EGL_CONTEXT_MINOR_VERSION, 3,
                               EGL_CONTEXT_OPENGL_PROFILE_MASK, EGL_CONTEXT_OPENGL_CORE_PROFILE_BIT, EGL_NONE};
  context_ = eglCreateContext(display_, EGL_NO_CONFIG_KHR, EGL_NO_CONTEXT, attributes);
  if (context_ == EGL_NO_CONTEXT) {
    eglTerminate(display_);
    refuse("no OpenGL 3.3 core context");
  }
  if (!eglMakeCurrent(display_, EGL_NO_SURFACE, EGL_NO_SURFACE, context_)) {
    eglDestroyContext(display_, context_);
    eglTerminate(display_);
    refuse("eglMakeCurrent failed");
  }
}

HeadlessContext::~HeadlessContext() {
  eglMakeCurrent(display_, EGL_NO_SURFACE, EGL_NO_SURFACE, EGL_NO_CONTEXT);
  eglDestroyContext(display_, context_);
  eglTerminate(display_);
}

}  // namespace dm::gl
