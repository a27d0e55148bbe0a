#include "app/gui/window_surface.hpp"

// epoxy's GLX header first: it keeps GL/glx.h (pulled in by glfw3native.h) out.
#include <epoxy/gl.h>
#include <epoxy/glx.h>
#define GLFW_INCLUDE_NONE
#include <GLFW/glfw3.h>
#define GLFW_EXPOSE_NATIVE_X11
#define GLFW_EXPOSE_NATIVE_GLX
#include <GLFW/glfw3native.h>

namespace dm::gui {

namespace {

// True when the window's GLX context can copy a part of the back buffer to
// the screen (the back buffer is then left as it was).
bool canCopySubBuffer(GLFWwindow* window) {
  Display* display = glfwGetX11Display();
  if (!display || !glfwGetGLXContext(window) || !glfwGetGLXWindow(window)) return false;
  return epoxy_has_glx_extension(display, DefaultScreen(display), "GLX_MESA_copy_sub_buffer");
}

// The window system asks for a repaint: its copy of the window is gone.
void onRefresh(GLFWwindow* window) {
  if (auto* surface = static_cast<WindowSurface*>(glfwGetWindowUserPointer(window))) surface->damageAll();
}

}  // namespace

WindowSurface::WindowSurface(GLFWwindow* window) : window_(window), keepsPixels_(canCopySubBuffer(window)) {
  glfwSetWindowUserPointer(window, this);
  glfwSetWindowRefreshCallback(window, onRefresh);
}

WindowSurface::~WindowSurface() {
  glfwSetWindowRefreshCallback(window_, nullptr);
  glfwSetWindowUserPointer(window_, nullptr);
}

bool WindowSurface::begin(int width, int height) {
  const bool fresh = width != width_ || height != height_;
  width_ = width;
  height_ = height;
  if (keepsPixels_) {
    glBindFramebuffer(GL_FRAMEBUFFER, 0);
    glDrawBuffer(GL_BACK);
  } else {
    if (fresh || !canvas_) canvas_ = std::make_unique<gl::OffscreenTarget>(width, height, 1);
    canvas_->bind();
  }
  if (fresh) damaged_ = true;
  return fresh;
}

void WindowSurface::present(const PixelRect* changed) {
  if (!damaged_ && !changed) return;  // the screen already shows these pixels
  if (keepsPixels_) {
    Display* display = glfwGetX11Display();
    const GLXWindow drawable = glfwGetGLXWindow(window_);
    if (damaged_ || !changed) glXCopySubBufferMESA(display, drawable, 0, 0, width_, height_);
    else glXCopySubBufferMESA(display, drawable, changed->x, changed->y, changed->w, changed->h);
  } else {
    // The back buffer's pixels are undefined after a swap: copy them all.
    canvas_->copyToWindow();
    glfwSwapBuffers(window_);
  }
  damaged_ = false;
}

Image WindowSurface::read() {
  if (!keepsPixels_) return canvas_->read();
  glBindFramebuffer(GL_READ_FRAMEBUFFER, 0);
  glReadBuffer(GL_BACK);
  return gl::readFramebuffer(0, 0, width_, height_);
}

}  // namespace dm::gui
