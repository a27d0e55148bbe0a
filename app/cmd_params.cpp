// dwellmark params: prints the scenario field table (path, unit, range,
// meaning) as Markdown; the README's parameter table is this output.
#include <iostream>
#include <sstream>

#include "app/cli.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

template <class T>
void printRows(std::ostream& o, const std::vector<Field<T>>& fields, const std::string& prefix, const T& defaults) {
  for (const auto& f : fields) {
    std::string range, value;
    switch (f.type) {
      case FieldType::Number:
      case FieldType::Integer:
        range = fmt(f.min, 10) + " to " + fmt(f.max, 10);
        value = fmt(f.getNumber(defaults), 10);
        break;
      case FieldType::Choice:
        for (const auto& c : f.choices) range += (range.empty() ? "" : " \\| ") + c;
        value = f.getText(defaults);
        break;
      case FieldType::Colour:
        range = "sRGB #rrggbb";
        value = f.getText(defaults);
        break;
      case FieldType::Text:
        range = "text";
        value = "";
        break;
    }
    o << "| `" << prefix << f.path << "` | " << f.unit << " | " << range << " | " << value << " | "
      << (f.required ? "yes" : "") << " | " << f.help << " |\n";
  }
}

}  // namespace

std::string parameterTableMarkdown() {
  std::ostringstream o;
  o << "| field | unit | allowed | default | required | meaning |\n| --- | --- | --- | --- | --- | --- |\n";
  const Scenario d = defaultScenario();
  printRows(o, scenarioFields(), "", d);
  printRows(o, markingFields(), "markings[].", d.paint.markings.front());
  printRows(o, tracePointFields(), "analysis.trace_points[].", TracePointSpec{});
  return o.str();
}

void addParamsCommand(CLI::App& app, Commands& commands) {
  CLI::App* sub = app.add_subcommand("params", "Print every scenario field with its unit, range and meaning (Markdown)");
  commands.add(sub, [] {
    std::cout << parameterTableMarkdown();
    return exitOk;
  });
}

}  // namespace dm::app
