#include "core/io.hpp"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <stdexcept>

#include <unistd.h>

namespace dm {

namespace fs = std::filesystem;

void writeFileAtomic(const std::string& path, const std::string& content) {
  const fs::path target(path);
  const fs::path tmp = target.parent_path() / (".tmp-" + target.filename().string() + "-" + std::to_string(::getpid()));
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out) throw OutputError("cannot write " + tmp.string());
    out.write(content.data(), std::streamsize(content.size()));
    out.flush();
    if (!out) {
      std::error_code ec;
      fs::remove(tmp, ec);
      throw OutputError("cannot write " + tmp.string());
    }
  }
  std::error_code ec;
  fs::rename(tmp, target, ec);
  if (ec) {
    fs::remove(tmp, ec);
    throw OutputError("cannot rename into " + path + ": " + ec.message());
  }
}

void prepareOutputDir(const std::string& dir, bool force) {
  const fs::path p(dir);
  std::error_code ec;
  if (fs::exists(p, ec)) {
    if (!fs::is_directory(p, ec)) throw OutputError(dir + " exists and is not a folder");
    if (!fs::is_empty(p, ec) && !force)
      throw OutputError(dir + " already holds files; choose an empty or new folder, or pass --force to overwrite");
    return;
  }
  fs::create_directories(p, ec);
  if (ec) throw OutputError("cannot create " + dir + ": " + ec.message());
}

std::string fmt(double v, int digits) {
  if (!std::isfinite(v)) throw std::domain_error("a non-finite number reached an output");
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

}  // namespace dm
