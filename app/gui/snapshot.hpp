// `dwellmark snapshot`: the GUI's 3D view of a scenario at one instant,
// drawn without a display (an EGL surfaceless context) by the same scene
// renderer, camera framing and overlays the window starts with.
#pragma once
#include "app/cli.hpp"

namespace dm::gui {

/// Simulates up to options.time, draws the 3D view as the window's default
/// camera (following the body) shows it and writes the PNG; returns the
/// exit code (exitFault, nothing written, when the run faults before then).
int runSnapshot(const app::SnapshotOptions& options);

}  // namespace dm::gui
