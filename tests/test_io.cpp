// File output: atomic writes, output folders that are never silently mixed,
// and no NaN or infinity in any text that reaches a file.
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>

#include <catch2/catch.hpp>

#include "core/export.hpp"
#include "core/io.hpp"

using namespace dm;
namespace fs = std::filesystem;

namespace {

// A fresh, empty folder under the system's temporary folder.
fs::path emptyFolder(const std::string& name) {
  const fs::path p = fs::temp_directory_path() / ("dwellmark-io-" + name + "-" + std::to_string(::getpid()));
  fs::remove_all(p);
  fs::create_directories(p);
  return p;
}

std::string contentOf(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::size_t entriesIn(const fs::path& dir) {
  return std::size_t(std::distance(fs::directory_iterator(dir), fs::directory_iterator()));
}

}  // namespace

TEST_CASE("an atomic write replaces the whole file and leaves no temporary behind", "[io]") {
  const fs::path dir = emptyFolder("atomic");
  const std::string path = (dir / "a.txt").string();
  writeFileAtomic(path, "first version, longer than the second\n");
  writeFileAtomic(path, "second\n");
  CHECK(contentOf(path) == "second\n");
  CHECK(entriesIn(dir) == 1);
  fs::remove_all(dir);
}

TEST_CASE("a failed atomic write leaves the target and the folder as they were", "[io]") {
  const fs::path dir = emptyFolder("failed");
  // A folder where the file should go: the rename cannot replace it.
  fs::create_directory(dir / "summary.json");
  CHECK_THROWS_AS(writeFileAtomic((dir / "summary.json").string(), "{}\n"), OutputError);
  CHECK(fs::is_directory(dir / "summary.json"));
  CHECK(entriesIn(dir) == 1);
  // A folder that does not exist: nothing can be written, nothing is created.
  CHECK_THROWS_AS(writeFileAtomic((dir / "missing" / "x.txt").string(), "x"), OutputError);
  CHECK_FALSE(fs::exists(dir / "missing"));
  fs::remove_all(dir);
}

TEST_CASE("output folders are checked before a run and never silently mixed", "[io]") {
  const fs::path dir = emptyFolder("folders");
  const fs::path fresh = dir / "new";
  // A missing folder passes the check and is not created by it.
  CHECK_NOTHROW(checkOutputDir(fresh.string(), false));
  CHECK_FALSE(fs::exists(fresh));
  // writeOutputs creates it and writes every file.
  writeOutputs(fresh.string(), {{"one.txt", "1\n"}, {"two.txt", "2\n"}});
  CHECK(contentOf(fresh / "one.txt") == "1\n");
  CHECK(contentOf(fresh / "two.txt") == "2\n");
  CHECK(entriesIn(fresh) == 2);
  // Now it holds files: refused without force, accepted with it.
  CHECK_THROWS_AS(checkOutputDir(fresh.string(), false), OutputError);
  CHECK_THROWS_AS(prepareOutputDir(fresh.string(), false), OutputError);
  CHECK_NOTHROW(checkOutputDir(fresh.string(), true));
  // A plain file is never taken for a folder, even with force.
  writeFileAtomic((dir / "plain").string(), "x");
  CHECK_THROWS_AS(checkOutputDir((dir / "plain").string(), true), OutputError);
  // An empty folder is fine without force.
  fs::create_directory(dir / "empty");
  CHECK_NOTHROW(checkOutputDir((dir / "empty").string(), false));
  fs::remove_all(dir);
}

TEST_CASE("no NaN or infinity reaches a text output", "[io]") {
  CHECK(fmt(1.5) == "1.5");
  CHECK_THROWS_AS(fmt(std::numeric_limits<double>::quiet_NaN()), std::domain_error);
  CHECK_THROWS_AS(fmt(-std::numeric_limits<double>::infinity()), std::domain_error);
  nlohmann::json j = {{"a", 1.0}, {"list", {1.0, 2.0}}, {"deep", {{"x", 3.0}}}};
  CHECK(jsonFileText(j) == j.dump(2) + "\n");
  // The JSON library would write these as null; the check names where they are.
  j["list"][1] = std::numeric_limits<double>::quiet_NaN();
  CHECK_THROWS_WITH(jsonFileText(j), Catch::Contains("list.1"));
  j["list"][1] = 2.0;
  j["deep"]["x"] = std::numeric_limits<double>::infinity();
  CHECK_THROWS_WITH(jsonFileText(j), Catch::Contains("deep.x"));
}
