#include "app/cli.hpp"

#include <iostream>

#include "core/io.hpp"

namespace dm::app {

Scenario loadScenarioWithOverrides(const std::string& path, const std::vector<std::string>& sets) {
  nlohmann::json doc = readScenarioJson(path);
  for (const std::string& s : sets) applyOverride(doc, s);
  return scenarioFromJson(doc);
}

int runCli(int argc, char** argv, GuiRunner gui) {
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
