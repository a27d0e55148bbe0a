// The README's parameter table is the one the program validates against.
#include <fstream>
#include <sstream>

#include <catch2/catch.hpp>

#include "app/cli.hpp"

TEST_CASE("the README parameter table equals the field table", "[docs]") {
  std::ifstream in(std::string(DWELLMARK_SOURCE_DIR) + "/README.md");
  REQUIRE(in);
  std::stringstream ss;
  ss << in.rdbuf();
  const std::string readme = ss.str();
  const std::string begin = "<!-- params:begin -->\n", end = "<!-- params:end -->";
  const auto b = readme.find(begin), e = readme.find(end);
  REQUIRE(b != std::string::npos);
  REQUIRE(e != std::string::npos);
  const std::string table = readme.substr(b + begin.size(), e - b - begin.size());
  // Regenerate with: build/app/dwellmark params, pasted between the markers.
  CHECK(table == dm::app::parameterTableMarkdown());
}
