// The desktop simulator window (GLFW + OpenGL 3.3 + Dear ImGui).
#pragma once
#include "app/cli.hpp"

namespace dm::gui {

/// Opens the window on the options' scenario and runs until closed (or,
/// with options.frames > 0, for that many frames); returns the exit code.
int runGui(const app::GuiOptions& options);

}  // namespace dm::gui
