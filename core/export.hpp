// Text exports of a run, shared by the command line and the GUI.
#pragma once
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/io.hpp"
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
/// JSON text for a file (two-space indent, final newline). Throws
/// std::domain_error when any number in `j` is NaN or infinite: the JSON
/// library would otherwise write it as null without a word.
std::string jsonFileText(const nlohmann::json& j);

/// The files `dwellmark simulate` writes for a finished run (no fault):
/// trajectory.csv, traces.csv, stops.csv and summary.json (with the pattern
/// windows), fully formatted (throws std::domain_error before anything is
/// written if a number is not finite).
std::vector<OutputFile> simulationFiles(const Scenario& s, const RunResult& r, const PatternAnalysis& pattern);

/// The message for a run stopped by a numerical fault: when (time, phase),
/// why, and the last good state in practical units. Several lines, no final
/// newline; the same for the command line and the GUI.
std::string faultReport(const Fault& f);

/// The creep bound stated for the friction model: slip speed in steady rim
/// rolling stays below this fraction of the rim speed (see README).
inline constexpr double creepBoundRatio = 1e-4;

}  // namespace dm
