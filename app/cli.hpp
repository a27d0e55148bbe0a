// The command line: one subcommand per file, each a thin layer over core/
// and render/ functions. Exit codes: 0 done, 1 output or internal error,
// 2 bad input (nothing written), 3 numerical fault (run stopped cleanly).
#pragma once
#include <functional>
#include <ostream>
#include <string>
#include <utility>
#include <vector>

#include <CLI/CLI.hpp>

#include "core/scenario.hpp"
#include "core/simulate.hpp"

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
/// `expose`: the observer camera's image and spot report (app/cmd_expose.cpp).
void addExposeCommand(CLI::App& app, Commands& commands);
void addParamsCommand(CLI::App& app, Commands& commands);
void addEnsembleCommand(CLI::App& app, Commands& commands);
void addCalibrateCommand(CLI::App& app, Commands& commands);
void addReviewCommand(CLI::App& app, Commands& commands);

/// `steady`: the analytic steady spin at a precession rate or a tilt (app/cmd_steady.cpp).
void addSteadyCommand(CLI::App& app, Commands& commands);
/// `advise`: the dimension advisor (app/cmd_advise.cpp).
void addAdviseCommand(CLI::App& app, Commands& commands);

/// The scenario field table as Markdown (the README's parameter table).
std::string parameterTableMarkdown();

/// What `dwellmark gui` was asked for.
struct GuiOptions {
  Scenario scenario;             ///< the validated scenario to open
  std::string scenarioPath;      ///< its file ("" for the built-in default)
  std::string screenshotPath;    ///< write a PNG of the whole window after `frames` frames, then exit
  int frames = 0;                ///< frames to render before exiting (0 = interactive)
  int width = 1280, height = 800;  ///< window size, px
  std::string frameLogPath;      ///< per-frame timing CSV written on exit ("" = none)
};
/// Opens the GUI; returns the process exit code. Empty in builds without a GUI.
using GuiRunner = std::function<int(const GuiOptions&)>;

/// Registers `dwellmark gui`. With an empty runner the command still exists
/// and says that this build has no GUI.
void addGuiCommand(CLI::App& app, Commands& commands, GuiRunner runner);

/// What `dwellmark snapshot` was asked for.
struct SnapshotOptions {
  Scenario scenario;                   ///< the validated scenario
  std::string outPath;                 ///< the PNG to write
  int width = 1280, height = 800;      ///< picture size, px
  double time = 0;                     ///< s, the instant shown (0 to run.duration_s)
  bool force = false;                  ///< replace an existing file
};
/// Renders the snapshot without a display; returns the exit code. Empty in builds without GL.
using SnapshotRunner = std::function<int(const SnapshotOptions&)>;

/// Registers `dwellmark snapshot` (app/cmd_snapshot.cpp). With an empty
/// runner the command still exists and says that this build has no OpenGL.
void addSnapshotCommand(CLI::App& app, Commands& commands, SnapshotRunner runner);

/// A picture or window size typed as WIDTHxHEIGHT (e.g. 1280x800), checked
/// against [minWidth, maxWidth] x [minHeight, maxHeight] px; throws
/// ScenarioError naming `flag`, the value and the allowed range.
std::pair<int, int> parseSize(const std::string& flag, const std::string& text, std::pair<int, int> min,
                              std::pair<int, int> max);

/// Adds the `--threads K` option (0 to 1024; 0 = one per hardware thread)
/// shared by every subcommand that works in parallel: its output never
/// depends on K.
void addThreadsOption(CLI::App* sub, int& threads);

/// Reads a scenario file, applies `--set key.path=value` overrides, parses
/// and validates it (throws ScenarioError).
Scenario loadScenarioWithOverrides(const std::string& path, const std::vector<std::string>& sets);

/// Finishes `dwellmark simulate` after the run. A run stopped by a numerical
/// fault gets its report (time, phase, last good state) on `err`, nothing is
/// written and the result is exitFault; otherwise trajectory.csv, traces.csv,
/// stops.csv and summary.json go into `outDir` (created if missing) and `out`
/// says so.
int finishSimulation(const Scenario& s, const RunResult& r, const std::string& outDir, std::ostream& out,
                     std::ostream& err);

/// Parses the command line and runs the chosen subcommand; `gui` and
/// `snapshot` are the GUI's and the headless 3D view's entry points when
/// this build has OpenGL.
int runCli(int argc, char** argv, GuiRunner gui = {}, SnapshotRunner snapshot = {});

}  // namespace dm::app
