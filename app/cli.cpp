#include "app/cli.hpp"

#include <iostream>
#include <regex>

#include "core/io.hpp"

namespace dm::app {

Scenario loadScenarioWithOverrides(const std::string& path, const std::vector<std::string>& sets) {
  nlohmann::json doc = readScenarioJson(path);
  for (const std::string& s : sets) applyOverride(doc, s);
  return scenarioFromJson(doc);
}

void addThreadsOption(CLI::App* sub, int& threads) {
  sub->add_option("--threads", threads, "worker threads; 0 = one per hardware thread (the output does not change)")
      ->check(CLI::Range(0, 1024));
}

std::pair<int, int> parseSize(const std::string& flag, const std::string& text, std::pair<int, int> min,
                              std::pair<int, int> max) {
  std::smatch m;
  if (!std::regex_match(text, m, std::regex("([0-9]{1,5})x([0-9]{1,5})")))
    throw ScenarioError(flag, "expected WIDTHxHEIGHT in pixels, e.g. 1280x800, got \"" + text + "\"");
  const int width = std::stoi(m[1]), height = std::stoi(m[2]);
  if (width < min.first || width > max.first || height < min.second || height > max.second)
    throw ScenarioError(flag, "value " + text + " is out of range; allowed " + std::to_string(min.first) + "x" +
                                  std::to_string(min.second) + " to " + std::to_string(max.first) + "x" +
                                  std::to_string(max.second));
  return {width, height};
}

int runCli(int argc, char** argv, GuiRunner gui, SnapshotRunner snapshot) {
  CLI::App app{"dwellmark: predicts what visitors see when they spin a marked tube, rod, ring or coin on a table"};
  app.set_version_flag("--version", std::string(DWELLMARK_VERSION));
  app.require_subcommand(1);
  Commands commands;
  addSimulateCommand(app, commands);
  addExposeCommand(app, commands);
  addSteadyCommand(app, commands);
  addAdviseCommand(app, commands);
  addParamsCommand(app, commands);
  addEnsembleCommand(app, commands);
  addCalibrateCommand(app, commands);
  addReviewCommand(app, commands);
  addGuiCommand(app, commands, std::move(gui));
  addSnapshotCommand(app, commands, std::move(snapshot));
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? exitOk : exitBadInput;
  }
  try {
    for (auto& [sub, action] : commands.list)
      if (sub->parsed()) return action();
  } catch (const ScenarioError& e) {
    std::cerr << "dwellmark: bad input: " << e.what() << "\n";
    return exitBadInput;
  } catch (const OutputError& e) {
    std::cerr << "dwellmark: cannot write output: " << e.what() << "\n";
    return exitBadInput;
  } catch (const std::exception& e) {
    std::cerr << "dwellmark: error: " << e.what() << "\n";
    return exitFailure;
  }
  return exitFailure;
}

}  // namespace dm::app
