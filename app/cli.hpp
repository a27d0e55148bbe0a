// The command line: one subcommand per file, each a thin layer over core/
// and render/ functions. Exit codes: 0 done, 1 output or internal error,
// 2 bad input (nothing written), 3 numerical fault (run stopped cleanly).
#pragma once
#include <functional>
#include <string>
#include <utility>
#include <vector>

#include <CLI/CLI.hpp>

#include "core/scenario.hpp"

namespace dm::app {

inline constexpr int exitOk = 0;
inline constexpr int exitFailure = 1;
inline constexpr int exitBadInput = 2;
inline constexpr int exitFault = 3;

using Action = std::function<int()>;
/// The registered subcommands and what each runs.
struct Commands {
  std::vector<std::pair<CLI::App*, Action>> list;
  void add(CLI::App* sub, Action a) { list.emplace_back(sub, std::move(a)); }
};

void addSimulateCommand(CLI::App& app, Commands& commands);
void addParamsCommand(CLI::App& app, Commands& commands);
void addEnsembleCommand(CLI::App& app, Commands& commands);
void addCalibrateCommand(CLI::App& app, Commands& commands);

/// The scenario field table as Markdown (the README's parameter table).
std::string parameterTableMarkdown();

/// Reads a scenario file, applies `--set key.path=value` overrides, parses
/// and validates it (throws ScenarioError).
Scenario loadScenarioWithOverrides(const std::string& path, const std::vector<std::string>& sets);

/// Parses the command line and runs the chosen subcommand.
int runCli(int argc, char** argv);

}  // namespace dm::app
