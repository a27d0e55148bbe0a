// dwellmark steady: the analytic steady spin (core/steady.hpp) of a body,
// at a precession rate or a tilt, or swept over precession rates.
#include <cmath>
#include <iostream>
#include <memory>
#include <sstream>

#include "app/body_flags.hpp"
#include "app/cli.hpp"
#include "core/io.hpp"
#include "core/steady.hpp"

namespace dm::app {

namespace {

struct SteadyArgs {
  BodyFlags body;
  double precessionRevS = 0;
  double tiltDeg = 0;
  double orbitMm = 0;
  std::string sweep;
  bool json = false;
  CLI::Option* precession = nullptr;
  CLI::Option* tilt = nullptr;
  CLI::Option* sweepOpt = nullptr;
};

double deg(double a) { return a / k::degree; }

// "9/2", or empty without a fraction pattern.
std::string ratioText(const FractionPattern& f) {
  return f.spots > 0 ? dm::ratioText(f.spots, f.revsPerVisit) : std::string();
}

// One steady state as JSON, file units.
nlohmann::json spinJson(const SteadySpin& s) {
  const FractionPattern& f = s.fraction;
  const auto orNull = [&f](const nlohmann::json& v) { return f.spots > 0 ? v : nlohmann::json(nullptr); };
  return {{"pattern", s.pattern},
          {"tilt_deg", deg(s.tilt)},
          {"precession_rev_s", revS(s.precession)},
          {"relative_spin_rev_s", revS(s.relativeSpin)},
          {"spots_per_rev", s.spotsPerRev},
          {"nearest_spots", s.nearestSpots},
          {"drift_deg_per_rev", jsonNumber(s.driftDegPerRev)},
          {"drift_deg_s", jsonNumber(s.driftDegPerSecond)},
          {"n_ratio", orNull(ratioText(f))},
          {"ratio_spots", orNull(f.spots)},
          {"revs_per_visit", orNull(f.revsPerVisit)},
          {"ratio_drift_deg_per_rev", orNull(jsonNumber(f.driftDegPerRev))},
          {"contact_radius_mm", s.contactRadius * mm},
          {"ring_radius_mm", s.ringRadius * mm},
          {"centre_height_mm", s.centreHeight * mm},
          {"ceiling_height_mm", s.ceilingHeight * mm},
          {"orbit_mm", s.orbit * mm},
          {"friction_needed", s.frictionNeeded},
          {"top_speed_mm_s", s.topSpeed * mm}};
}

nlohmann::json bodyJson(const BodySpec& b, const Cylinder& c) {
  return {{"shape", std::string(shapeName(b.shape))},
          {"length_mm", c.length * mm},
          {"outer_diameter_mm", 2 * c.outerRadius * mm},
          {"inner_diameter_mm", 2 * c.innerRadius * mm},
          {"wall_mm", (c.outerRadius - c.innerRadius) * mm}};
}

nlohmann::json solutionJson(const Scenario& s, const Cylinder& c, const SteadySolution& sol, nlohmann::json input) {
  nlohmann::json j;
  j["body"] = bodyJson(s.body, c);
  j["input"] = std::move(input);
  j["gravity_m_s2"] = k::gravity;
  const SteadySpin* p = sol.pattern();
  j["solution"] = p ? "pattern" : "none";
  if (!sol.reason.empty()) j["reason"] = sol.reason;
  // The pattern state at the top level; null when there is none.
  const nlohmann::json fields = p ? spinJson(*p) : spinJson(SteadySpin{});
  for (auto it = fields.begin(); it != fields.end(); ++it)
    if (it.key() != "pattern") j[it.key()] = p ? *it : nlohmann::json(nullptr);
  j["min_precession_rev_s"] = revS(sol.minPrecession);
  j["squat_body"] = squatBody(c);
  nlohmann::json branches = nlohmann::json::array();
  for (const SteadySpin& b : sol.branches) branches.push_back(spinJson(b));
  j["branches"] = branches;
  return j;
}

std::string driftText(const SteadySpin& s) {
  if (s.nearestSpots == 0) return "fewer than half a spot per revolution: no spot pattern";
  std::string text = "drift of the " + std::to_string(s.nearestSpots) + "-spot pattern " +
                     signedFmt(s.driftDegPerRev, 4) + " deg per revolution, " + signedFmt(s.driftDegPerSecond, 4) +
                     " deg/s";
  const FractionPattern& f = s.fraction;
  if (f.spots == 0)
    text += "\n    N is near no p/q with at most " + std::to_string(maxRevsPerVisit) +
            " revolutions between visits: the stops creep round the ring";
  else if (f.revsPerVisit > 1)
    text += "\n    N is near " + ratioText(f) + ": " + std::to_string(f.spots) + " spots, each visited every " +
            std::to_string(f.revsPerVisit) + " revolutions, drift " + signedFmt(f.driftDegPerRev, 4) +
            " deg per revolution (apart only where a mark spans under " + fmt(180.0 / f.spots, 3) +
            " deg of the ring)";
  return text;
}

// What the orbit asks of the table and does to the marks at the top.
std::string orbitText(const SteadySpin& s) {
  return "centre orbit " + fmt(s.orbit * mm, 5) + " mm needs a friction coefficient of at least " +
         fmt(s.frictionNeeded, 4) + "; the raised end's top passes at " + fmt(s.topSpeed * mm, 5) +
         " mm/s along a ring of radius " + fmt(s.ringRadius * mm, 5) + " mm";
}

void printHuman(const Scenario& s, const Cylinder& c, const SteadySolution& sol, const std::string& input,
                double orbit) {
  std::cout << "steady spin of a " << bodyDescription(s.body) << "\n";
  if (orbit == 0)
    std::cout << "  (centre fixed, rolling on the lower end's rim; mass cancels; g = " << fmt(k::gravity, 6)
              << " m/s^2)\n";
  else
    std::cout << "  (centre circling the spin axis " << fmt(orbit * mm, 6)
              << " mm from it, + towards the raised end; rolling on the lower end's rim; mass cancels; g = "
              << fmt(k::gravity, 6) << " m/s^2)\n";
  std::cout << input << ":\n";
  const SteadySpin* p = sol.pattern();
  if (p) {
    std::cout << "  pattern state: tilt " << fmt(deg(p->tilt), 5) << " deg at precession "
              << fmt(revS(p->precession), 5) << " rev/s\n"
              << "    spots per revolution N = " << fmt(p->spotsPerRev, 6) << " (nearest " << p->nearestSpots
              << "), relative spin " << fmt(revS(p->relativeSpin), 5) << " rev/s\n"
              << "    " << driftText(*p) << "\n"
              << "    floor contact circle radius " << fmt(p->contactRadius * mm, 5) << " mm, centre height "
              << fmt(p->centreHeight * mm, 5) << " mm, imaginary ceiling at " << fmt(p->ceilingHeight * mm, 5)
              << " mm\n";
    if (orbit != 0) std::cout << "    " << orbitText(*p) << "\n";
  } else {
    std::cout << "  no pattern state: " << sol.reason << "\n";
  }
  for (const SteadySpin& b : sol.branches) {
    if (b.pattern) continue;
    std::cout << "  other steady state (not the pattern): tilt " << fmt(deg(b.tilt), 5) << " deg at precession "
              << fmt(revS(b.precession), 5) << " rev/s, N = " << fmt(b.spotsPerRev, 5) << ", ceiling at "
              << fmt(b.ceilingHeight * mm, 5) << " mm, contact circle radius " << fmt(b.contactRadius * mm, 5)
              << " mm\n";
  }
  if (squatBody(c))
    std::cout << "a body this short rolls steadily on its rim only below " << fmt(revS(sol.minPrecession), 5)
              << " rev/s (" << fmt(sol.minPrecession, 5) << " rad/s)" << (orbit == 0 ? "" : " with the centre still")
              << "\n";
  else
    std::cout << "lowest precession that keeps the end up" << (orbit == 0 ? "" : " with the centre still") << ": "
              << fmt(revS(sol.minPrecession), 5) << " rev/s (" << fmt(sol.minPrecession, 5) << " rad/s)\n";
}

// The CSV sweep: one row per precession, the pattern state's columns empty
// when there is none.
std::string sweepCsv(const Cylinder& c, const FlagRange& r, double orbit) {
  const long rows = long(std::floor((r.to - r.from) / r.step * (1 + 1e-12))) + 1;
  if (rows > steady_input::maxSweepRows)
    throw ScenarioError("--sweep-precession-rev-s", "the sweep has " + std::to_string(rows) + " rows; at most " +
                                                        std::to_string(steady_input::maxSweepRows) +
                                                        " are allowed: use a larger STEP");
  std::ostringstream o;
  o << "precession_rev_s,orbit_mm,solution,tilt_deg,spots_per_rev,nearest_spots,drift_deg_per_rev,drift_deg_s,"
       "relative_spin_rev_s,contact_radius_mm,centre_height_mm,ceiling_height_mm,friction_needed,ring_radius_mm,"
       "top_speed_mm_s,n_ratio,revs_per_visit,ratio_drift_deg_per_rev,branches\n";
  const auto cell = [](double v) { return std::isfinite(v) ? fmt(v, 10) : std::string(); };
  for (long i = 0; i < rows; ++i) {
    const double f = std::min(r.to, r.from + i * r.step);
    const SteadySolution sol = steadyAtPrecession(c, f * k::twoPi, CentreOrbit{orbit});
    const SteadySpin* p = sol.pattern();
    o << fmt(f, 10) << "," << cell(orbit * mm) << "," << (p ? "pattern" : "none");
    if (p)
      o << "," << cell(deg(p->tilt)) << "," << cell(p->spotsPerRev) << "," << p->nearestSpots << ","
        << cell(p->driftDegPerRev) << "," << cell(p->driftDegPerSecond) << "," << cell(revS(p->relativeSpin)) << ","
        << cell(p->contactRadius * mm) << "," << cell(p->centreHeight * mm) << "," << cell(p->ceilingHeight * mm)
        << "," << cell(p->frictionNeeded) << "," << cell(p->ringRadius * mm) << "," << cell(p->topSpeed * mm) << ","
        << ratioText(p->fraction) << ","
        << (p->fraction.spots > 0 ? std::to_string(p->fraction.revsPerVisit) + "," + cell(p->fraction.driftDegPerRev)
                                  : std::string(","));
    else
      o << ",,,,,,,,,,,,,,,";
    o << "," << sol.branches.size() << "\n";
  }
  return o.str();
}

int runSteady(const SteadyArgs& a) {
  const bool byPrecession = a.precession->count() > 0, byTilt = a.tilt->count() > 0, bySweep = a.sweepOpt->count() > 0;
  if (!byPrecession && !byTilt && !bySweep)
    throw ScenarioError("--precession-rev-s",
                        "missing; give --precession-rev-s, --tilt-deg or --sweep-precession-rev-s");
  // Check the flags before reading anything.
  FlagRange sweep;
  if (bySweep)
    sweep =
        parseFlagRange(a.sweep, "--sweep-precession-rev-s", steady_input::precession, true, &steady_input::sweepStep);
  if (byPrecession) checkedFlag(steady_input::precession, a.precessionRevS, "--precession-rev-s");
  if (byTilt) checkedFlag(steady_input::tilt, a.tiltDeg, "--tilt-deg");
  checkedFlag(steady_input::orbit, a.orbitMm, "--orbit-mm");
  const CentreOrbit orbit{a.orbitMm / mm};

  const Scenario s = loadBodyScenario(a.body);
  const Cylinder c = cylinderOf(s.body);
  if (bySweep) {
    std::cout << sweepCsv(c, sweep, orbit.rho);
    return exitOk;
  }
  const SteadySolution sol = byPrecession ? steadyAtPrecession(c, a.precessionRevS * k::twoPi, orbit)
                                          : steadyAtTilt(c, a.tiltDeg * k::degree, orbit);
  if (a.json) {
    nlohmann::json input =
        byPrecession ? nlohmann::json{{"precession_rev_s", a.precessionRevS}} : nlohmann::json{{"tilt_deg", a.tiltDeg}};
    input["orbit_mm"] = a.orbitMm;
    std::cout << solutionJson(s, c, sol, std::move(input)).dump(2) << "\n";
  } else {
    printHuman(s, c, sol,
               byPrecession ? "at precession " + fmt(a.precessionRevS, 6) + " rev/s"
                            : "at tilt " + fmt(a.tiltDeg, 6) + " deg",
               orbit.rho);
  }
  return exitOk;
}

}  // namespace

void addSteadyCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<SteadyArgs>();
  CLI::App* sub = app.add_subcommand(
      "steady",
      "Solve the steady spin (rolling on the lower rim, the centre still or on a given orbit) at a precession rate or "
      "a tilt");
  addBodyFlags(sub, args->body);
  args->precession = sub->add_option(
      "--precession-rev-s", args->precessionRevS,
      "precession rate of the axis, rev/s (" + steady_input::precession.allowedText() + "); the tilt is solved");
  args->tilt = sub->add_option("--tilt-deg", args->tiltDeg,
                               "tilt of the raised axis above the table, deg (" + steady_input::tilt.allowedText() +
                                   "); the precession is solved");
  args->sweepOpt = sub->add_option("--sweep-precession-rev-s", args->sweep,
                                   "FROM:TO:STEP in rev/s: print a CSV table of the pattern state instead");
  sub->add_option("--orbit-mm", args->orbitMm,
                  "the centre circling the spin axis this far from it, mm, signed: + towards the raised end, - "
                  "towards the floor contact (" +
                      steady_input::orbit.allowedText() +
                      "; default 0, the centre still); a hand launch settles with a few mm (simulate's "
                      "centre_orbit_mm)");
  auto* json = sub->add_flag("--json", args->json, "print one JSON object instead of text");
  args->precession->excludes(args->tilt)->excludes(args->sweepOpt);
  args->tilt->excludes(args->sweepOpt);
  args->sweepOpt->excludes(json);
  commands.add(sub, [args] { return runSteady(*args); });
}

}  // namespace dm::app
