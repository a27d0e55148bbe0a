// Text exports of a run, shared by the command line and the GUI.
#pragma once
#include <string>

#include <nlohmann/json.hpp>

#include "core/simulate.hpp"

namespace dm {

/// trajectory.csv: one row per `sampleInterval`, header with units.
std::string trajectoryCsv(const RunResult& r, double sampleInterval);

/// summary.json contents (events, extremes, energies, the creep bound).
nlohmann::json summaryJson(const RunResult& r);

/// The creep bound stated for the friction model: slip speed in steady rim
/// rolling stays below this fraction of the rim speed (see README).
inline constexpr double creepBoundRatio = 1e-4;

}  // namespace dm
