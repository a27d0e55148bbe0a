// Text exports of a run, shared by the command line and the GUI.
#pragma once
#include <string>

#include <nlohmann/json.hpp>

#include "core/pattern.hpp"
#include "core/simulate.hpp"

namespace dm {

/// trajectory.csv: one row per `sampleInterval`, header with units.
std::string trajectoryCsv(const RunResult& r, double sampleInterval);

/// summary.json contents (events, extremes, energies, the creep bound).
nlohmann::json summaryJson(const RunResult& r);

/// traces.csv: one row per trace time: t_s, then the floor contact, the
/// ceiling contact and each marked point as x, y, z in mm (columns named
/// floor_x_mm, ceiling_x_mm, <label>_x_mm, ...).
std::string tracesCsv(const PatternAnalysis& a);

/// stops.csv: one row per stop event: t_s, the point's label, its end, the
/// lab position in mm, the horizontal speed at the top in mm/s and the dwell in ms.
std::string stopsCsv(const PatternAnalysis& a);

/// summary.json's `pattern`: one object per window (start_s, end_s,
/// visible_end, spot_count, spot_azimuths_deg, drift_deg_s, spots_per_rev,
/// kind, and the supporting figures).
nlohmann::json patternJson(const std::vector<PatternWindow>& windows);

/// One line in words about a window's pattern (the CLI and the report print it).
std::string patternSentence(const PatternWindow& w);

/// The creep bound stated for the friction model: slip speed in steady rim
/// rolling stays below this fraction of the rim speed (see README).
inline constexpr double creepBoundRatio = 1e-4;

}  // namespace dm
