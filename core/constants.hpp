// Physical constants and numerical tolerances, each with its unit and what
// its size means physically.
#pragma once

namespace dm::k {

inline constexpr double pi = 3.14159265358979323846;
inline constexpr double twoPi = 2.0 * pi;
inline constexpr double degree = pi / 180.0;  // radians per degree

/// Standard gravity, m/s^2 (CGPM 1901, ISO 80000-3).
inline constexpr double gravity = 9.80665;
/// Density of air at 20 degC and 101.325 kPa, kg/m^3 (ISO 2533 standard atmosphere gives 1.204).
inline constexpr double airDensity = 1.204;

/// Slip speed below which a contact counts as rolling, m/s: one millimetre
/// per second, far below what an eye resolves on a spinning piece.
inline constexpr double rollingSlip = 1e-3;
/// Centre speed (m/s) and angular speed (rad/s) below which the body is at rest:
/// a millimetre per second and about half a degree per second.
inline constexpr double restSpeed = 1e-3;
inline constexpr double restSpin = 0.01;
/// Angular-speed scale (rad/s) that smooths the rolling-resistance and pivot
/// torques through zero; about a hundredth of a revolution per second.
inline constexpr double torqueSmoothing = 0.05;
/// Any state with a speed above this (m/s) is runaway, not physics: no
/// hand-launched piece moves at a hundred metres per second.
inline constexpr double runawaySpeed = 100.0;
/// Sustained rolling must last this long (s) to count as settled.
inline constexpr double settleHold = 0.5;

/// Shortest eye-mode integration window, s: the eye's temporal impulse
/// response (Watson 1986, render/temporal.hpp) has delivered all
/// its area by then (all but 5e-5), so the window's weights sum to one.
inline constexpr double minEyeWindow = 0.2;

}  // namespace dm::k
