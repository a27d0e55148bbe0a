// Text exports of the pattern analysis: traces.csv, stops.csv and the
// `pattern` list of summary.json, checked on small hand-made results.
#include <catch2/catch.hpp>

#include "core/constants.hpp"
#include "core/export.hpp"

using namespace dm;

namespace {

// Two marked points, two trace rows, one stop and two windows.
PatternAnalysis smallAnalysis() {
  PatternAnalysis a;
  MarkedPoint p0, p1;
  p0.label = "rim_patch0_A";
  p1.label = "point0_B";
  a.points = {p0, p1};
  a.traces.time = {0, 0.001};
  a.traces.floorContact = {Vec3(0.01, 0, 0), Vec3(0.01, 0.0005, 0)};
  a.traces.ceilingContact = {Vec3(-0.01, 0, 0.02), Vec3(-0.01, -0.0005, 0.02)};
  a.traces.points = {{Vec3(0.001, 0.002, 0.003), Vec3(0.004, 0.005, 0.006)}, {Vec3::Zero(), Vec3(-0.001, 0, 0)}};
  StopEvent s;
  s.point = 1;
  s.end = End::B;
  s.time = 0.25;
  s.position = Vec3(0.03, -0.002, 0.021);
  s.horizontalSpeed = 0.0015;
  s.dwell = 0.0008;
  a.stops = {s};
  PatternWindow w;
  w.start = 0;
  w.end = 1;
  w.visibleEnd = End::A;
  w.spots = {{10 * k::degree, -2 * k::degree, 6}, {100 * k::degree, -2 * k::degree, 6}};
  w.revsPerVisit = 1;
  w.stopsPerVisit = 2;
  w.patternDrift = -2 * k::degree;
  w.spotSize = 6 * k::degree;
  w.spotSpread = 1.5 * k::degree;
  w.stopCount = 12;
  w.spotsPerRev = 1.99;
  w.meanTilt = 1.5 * k::degree;
  w.meanPrecession = 6 * k::twoPi;
  w.centreOrbit = -0.0035;
  w.centreOrbitAcross = 0.0001;
  w.kind = PatternKind::Creeping;
  PatternWindow none;
  none.start = 0.5;
  none.end = 1.5;
  a.windows = {w, none};
  return a;
}

}  // namespace

TEST_CASE("traces.csv names every column with its unit, one row per trace time", "[export]") {
  const std::string csv = tracesCsv(smallAnalysis());
  CHECK(csv ==
        "t_s,floor_x_mm,floor_y_mm,floor_z_mm,ceiling_x_mm,ceiling_y_mm,ceiling_z_mm,"
        "rim_patch0_A_x_mm,rim_patch0_A_y_mm,rim_patch0_A_z_mm,point0_B_x_mm,point0_B_y_mm,point0_B_z_mm\n"
        "0,10,0,0,-10,0,20,1,2,3,0,0,0\n"
        "0.001,10,0.5,0,-10,-0.5,20,4,5,6,-1,0,0\n");
}

TEST_CASE("stops.csv lists each stop with its point, end, position, speed and dwell", "[export]") {
  CHECK(stopsCsv(smallAnalysis()) ==
        "t_s,point,end,x_mm,y_mm,z_mm,horizontal_speed_mm_s,dwell_ms\n"
        "0.25,point0_B,B,30,-2,21,1.5,0.8\n");
}

TEST_CASE("summary pattern windows carry the issue's keys in display units", "[export]") {
  const nlohmann::json j = patternJson(smallAnalysis().windows);
  REQUIRE(j.size() == 2);
  const auto& w = j[0];
  CHECK(w["start_s"] == 0.0);
  CHECK(w["end_s"] == 1.0);
  CHECK(w["visible_end"] == "A");
  CHECK(w["spot_count"] == 2);
  CHECK(w["spot_azimuths_deg"][1].get<double>() == Approx(100));
  CHECK(w["drift_deg_s"][0].get<double>() == Approx(-2));
  CHECK(w["spots_per_rev"].get<double>() == Approx(1.99));
  CHECK(w["kind"] == "creeping");
  CHECK(w["revs_per_visit"] == 1);
  CHECK(w["n_ratio"] == "2/1");
  CHECK(w["spot_size_deg"].get<double>() == Approx(6));
  CHECK(w["spot_spread_deg"].get<double>() == Approx(1.5));
  CHECK(w["mean_tilt_deg"].get<double>() == Approx(1.5));
  CHECK(w["mean_precession_rev_s"].get<double>() == Approx(6));
  CHECK(w["centre_orbit_mm"].get<double>() == Approx(-3.5));
  CHECK(w["centre_orbit_across_mm"].get<double>() == Approx(0.1));
  // A window with no raised end: nulls, empty lists, kind none.
  CHECK(j[1]["visible_end"].is_null());
  CHECK(j[1]["spots_per_rev"].is_null());
  CHECK(j[1]["spot_azimuths_deg"].empty());
  CHECK(j[1]["kind"] == "none");
  CHECK(j[1]["n_ratio"].is_null());
  CHECK(j[1]["centre_orbit_mm"].is_null());
  CHECK(j[1]["centre_orbit_across_mm"].is_null());
}

TEST_CASE("the pattern sentence says how many spots, how they move and how often each is visited", "[export]") {
  const auto a = smallAnalysis();
  CHECK(patternSentence(a.windows[0]) ==
        "0-1 s: end A seen from above, N = 1.99 (near 2/1), 2 spots creeping at -2 deg/s, each visited every 1 rev; "
        "centre orbit -3.5 mm");
  CHECK(patternSentence(a.windows[1]) == "0.5-1.5 s: no end raised");
}
