// A visitor's flick as an initial state.
#pragma once
#include "core/dynamics.hpp"
#include "core/scenario.hpp"

namespace dm {

/// The state at release: the pressed end down at `tilt` with its lowest rim
/// point on the table, the axis along lab x (pressed end towards +x), the
/// centre over the origin, a vertical spin `revolution` about the centre,
/// an axial spin `backspin` times the one that holds the pressed end's top
/// point still, and a sideways drift along lab y. Body x points up within
/// the end plane, so a mark at azimuth 0 starts at the top of the rim.
State launchState(const Params& p, const LaunchSpec& launch);

}  // namespace dm
