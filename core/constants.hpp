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
/// Share of the spacing between spots by which a mark's revisit may miss
/// its place and still count as the same spot: an eighth, so that stops
/// scattered that much fill less than two fifths of the circle with +-2
/// sigma bands. The window analysis (core/pattern.cpp) and the steady
/// reading (fractionPattern, core/steady.cpp) both use it.
inline constexpr double revisitTolerance = 1.0 / 8;
/// Angular-speed scale (rad/s) that smooths the rolling-resistance and pivot
/// torques through zero; about a hundredth of a revolution per second.
inline constexpr double torqueSmoothing = 0.05;
/// Any state with a speed above this (m/s) is runaway, not physics: no
/// hand-launched piece moves at a hundred metres per second.
inline constexpr double runawaySpeed = 100.0;
/// Angular speed (rad/s) above which a state is runaway, not physics: about
/// 1600 revolutions per second, beyond any hand launch.
inline constexpr double runawaySpin = 1e4;
/// Largest turn of the body in one integrator step at release, rad (about
/// 29 degrees). Plain RK4 on a uniform rotation turns by the phase of
/// 1 + z + z^2/2 + z^3/6 + z^4/24, z = i h w / 2 (our derivation): 3.2e-5
/// of the angle short at 0.5 rad per step, unstable above 2.8 rad. Our
/// step, which renormalises the quaternion at every stage, measured on a
/// free body spinning about its axis: 1.2e-5 short at 0.5 rad, 1.8e-4 at
/// 1 rad, 2.4e-3 at 2 rad, 1.0e-2 at 3 rad.
inline constexpr double maxTurnPerStep = 0.5;
/// Largest static deflection of the contact under the body's weight, as a
/// fraction of the outer radius. Softer contacts misstate a small piece's
/// rocking: measured on a 2 % fast Moffatt disk at 30 degrees, the tilt
/// history after 0.5 s departs from a 2000 Hz contact by 0.48 deg at a
/// deflection of 2.5 % of R (2 mm coin, 100 Hz), 0.25 deg at 1 % (5 mm coin,
/// 100 Hz), 0.06 deg at 0.16 % (2 mm coin, 400 Hz); the nutation itself is
/// 0.52 deg.
inline constexpr double maxStaticDeflection = 0.01;
/// Sustained rolling must last this long (s) to count as settled.
inline constexpr double settleHold = 0.5;

/// Shortest eye-mode integration window, s: the eye's temporal impulse
/// response (Watson 1986, render/temporal.hpp) has delivered all
/// its area by then (all but 5e-5), so the window's weights sum to one.
inline constexpr double minEyeWindow = 0.2;

}  // namespace dm::k
