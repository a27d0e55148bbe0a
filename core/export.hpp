// Text exports of a run, shared by the command line and the GUI.
#pragma once
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "core/io.hpp"
#include "core/simulate.hpp"

namespace dm {

/// trajectory.csv: one row per `sampleInterval`, header with units.
std::string trajectoryCsv(const RunResult& r, double sampleInterval);

/// summary.json contents (events, extremes, energies, the creep bound).
nlohmann::json summaryJson(const RunResult& r);

/// JSON text for a file (two-space indent, final newline). Throws
/// std::domain_error when any number in `j` is NaN or infinite: the JSON
/// library would otherwise write it as null without a word.
std::string jsonFileText(const nlohmann::json& j);

/// The files `dwellmark simulate` writes for a finished run (no fault):
/// trajectory.csv and summary.json, fully formatted (throws
/// std::domain_error before anything is written if a number is not finite).
std::vector<OutputFile> simulationFiles(const Scenario& s, const RunResult& r);

/// The message for a run stopped by a numerical fault: when (time, phase),
/// why, and the last good state in practical units. Several lines, no final
/// newline; the same for the command line and the GUI.
std::string faultReport(const Fault& f);

/// The creep bound stated for the friction model: slip speed in steady rim
/// rolling stays below this fraction of the rim speed (see README).
inline constexpr double creepBoundRatio = 1e-4;

}  // namespace dm
