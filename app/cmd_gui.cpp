// dwellmark gui: the interactive window. This file only reads the command
// line; the window lives in app/gui/ and is passed in when the build has it.
#include <cstdlib>
#include <iostream>
#include <tuple>

#include "app/cli.hpp"

namespace dm::app {

namespace {

struct GuiArgs {
  std::string scenario;
  std::vector<std::string> sets;
  std::string screenshot;
  int frames = 0;
  std::string size = "1280x800";
  std::string frameLog;
};

// Window size limits, px: the smallest that still shows every panel, and 8K.
constexpr int minWidth = 960, minHeight = 600, maxWidth = 7680, maxHeight = 4320;
// Default number of frames before a screenshot when --frames is not given.
constexpr int defaultScreenshotFrames = 30;

bool haveDisplay() {
  const char* display = std::getenv("DISPLAY");
  return display && *display;
}

int runGuiCommand(const GuiArgs& a, const GuiRunner& runner) {
  // Inputs first, so a bad scenario is reported the same with or without a display.
  GuiOptions o;
  if (!a.scenario.empty()) {
    o.scenario = loadScenarioWithOverrides(a.scenario, a.sets);
    o.scenarioPath = a.scenario;
  } else {
    if (!a.sets.empty()) throw ScenarioError("--set", "needs a scenario file to override");
    o.scenario = defaultScenario();
  }
  std::tie(o.width, o.height) = parseSize("--size", a.size, {minWidth, minHeight}, {maxWidth, maxHeight});
  if (a.frames < 0 || a.frames > 1000000)
    throw ScenarioError("--frames", "value " + std::to_string(a.frames) + " is out of range; allowed 1 to 1000000");
  o.frames = a.frames > 0 ? a.frames : (a.screenshot.empty() ? 0 : defaultScreenshotFrames);
  o.screenshotPath = a.screenshot;
  o.frameLogPath = a.frameLog;

  if (!runner) {
    std::cerr << "dwellmark: this build has no GUI (configured with -DDWELLMARK_GUI=OFF).\n"
                 "  Headless commands work as usual, e.g.: dwellmark simulate SCENARIO.json --out DIR\n";
    return exitFailure;
  }
  if (!haveDisplay()) {
    std::cerr << "dwellmark: no display (DISPLAY is not set), so the GUI cannot open a window.\n"
                 "  Without a window: dwellmark simulate SCENARIO.json --out DIR\n"
                 "  For a screenshot on a headless machine: xvfb-run -a -s '-screen 0 1280x800x24' dwellmark gui "
                 "SCENARIO.json --screenshot shot.png --frames 30\n";
    return exitFailure;
  }
  return runner(o);
}

}  // namespace

void addGuiCommand(CLI::App& app, Commands& commands, GuiRunner runner) {
  auto args = std::make_shared<GuiArgs>();
  CLI::App* sub = app.add_subcommand("gui", "Open the interactive simulator window (needs a display; see xvfb-run)");
  sub->add_option("scenario", args->scenario, "scenario JSON file (default: a built-in marked tube)");
  sub->add_option("--set", args->sets, "override a scenario field: key.path=value (repeatable)");
  sub->add_option("--screenshot", args->screenshot, "after --frames frames, write a PNG of the whole window and exit");
  sub->add_option("--frames", args->frames, "render this many frames, then exit (scripted checks, timing)");
  sub->add_option("--size", args->size, "window size in pixels, WIDTHxHEIGHT (default 1280x800)");
  sub->add_option("--frame-log", args->frameLog, "write per-frame timings (CSV) here on exit");
  commands.add(sub, [args, runner = std::move(runner)] { return runGuiCommand(*args, runner); });
}

}  // namespace dm::app
