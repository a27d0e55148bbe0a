// Where a frame's pixels are drawn and how they reach the screen, so that a
// frame that changes only the 3D view costs only the 3D view. With the GLX
// extension GLX_MESA_copy_sub_buffer (Mesa's software GL has it) the
// window's back buffer keeps its pixels between frames and only the changed
// rectangle is copied to the screen; without it a canvas framebuffer keeps
// them and is copied whole onto the back buffer before each swap.
#pragma once
#include <memory>

#include "render/gl/scene_renderer.hpp"
#include "render/image.hpp"

struct GLFWwindow;

namespace dm::gui {

/// A rectangle of framebuffer pixels, origin at the bottom left (GL's).
struct PixelRect {
  int x = 0, y = 0, w = 0, h = 0;
};

class WindowSurface {
 public:
  /// Picks the way of presenting the window's current GL context supports.
  explicit WindowSurface(GLFWwindow* window);
  ~WindowSurface();
  WindowSurface(const WindowSurface&) = delete;
  WindowSurface& operator=(const WindowSurface&) = delete;

  /// Binds the pixels to draw into, `width` x `height` framebuffer px.
  /// True when they hold nothing yet (first frame, resize): draw everything.
  bool begin(int width, int height);
  /// Shows what was drawn since the last present: `changed` (nullptr for
  /// nothing new), or the whole window after damageAll().
  void present(const PixelRect* changed);
  /// The whole window as last drawn, linear light, row 0 at the top.
  Image read();
  /// The screen lost the window's pixels (uncovered, restored): the next
  /// present shows them all again.
  void damageAll() { damaged_ = true; }
  /// True when the back buffer keeps its pixels (copy-sub-buffer presenting).
  bool keepsPixels() const { return keepsPixels_; }

 private:
  GLFWwindow* window_;
  bool keepsPixels_ = false;
  bool damaged_ = true;
  std::unique_ptr<gl::OffscreenTarget> canvas_;  ///< holds the pixels without copy-sub-buffer
  int width_ = 0, height_ = 0;
};

}  // namespace dm::gui
