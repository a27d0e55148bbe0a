#include "core/io.hpp"

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <functional>
#include <stdexcept>
#include <thread>

#include <fcntl.h>
#include <unistd.h>

#include "core/constants.hpp"

namespace dm {

namespace fs = std::filesystem;

namespace {

// A temporary name beside `target`, distinct per process and per thread so
// that concurrent writers of the same file never share one.
fs::path temporaryBeside(const fs::path& target) {
  const std::size_t thread = std::hash<std::thread::id>{}(std::this_thread::get_id());
  const std::string tag = std::to_string(::getpid()) + "-" + std::to_string(thread % 1000003);
  return target.parent_path() / (".tmp-" + target.filename().string() + "-" + tag);
}

// Writes all of `content` to a new file and flushes it to the disk, so the
// rename that follows never exposes an empty or short file after a crash.
bool writeDurably(const fs::path& path, const std::string& content) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) return false;
  std::size_t done = 0;
  while (done < content.size()) {
    const ssize_t n = ::write(fd, content.data() + done, content.size() - done);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) break;
    done += std::size_t(n);
  }
  const bool synced = done == content.size() && ::fsync(fd) == 0;
  return ::close(fd) == 0 && synced;
}

}  // namespace

void writeFileAtomic(const std::string& path, const std::string& content) {
  const fs::path target(path);
  const fs::path tmp = temporaryBeside(target);
  std::error_code ec;
  if (!writeDurably(tmp, content)) {
    fs::remove(tmp, ec);
    throw OutputError("cannot write " + tmp.string());
  }
  fs::rename(tmp, target, ec);
  if (ec) {
    fs::remove(tmp, ec);
    throw OutputError("cannot rename into " + path + ": " + ec.message());
  }
}

void checkOutputDir(const std::string& dir, bool force) {
  const fs::path p(dir);
  std::error_code ec;
  if (!fs::exists(p, ec)) return;
  if (!fs::is_directory(p, ec)) throw OutputError(dir + " exists and is not a folder");
  if (!fs::is_empty(p, ec) && !force)
    throw OutputError(dir + " already holds files; choose an empty or new folder, or pass --force to overwrite");
}

void prepareOutputDir(const std::string& dir, bool force) {
  checkOutputDir(dir, force);
  std::error_code ec;
  if (fs::is_directory(dir, ec)) return;
  fs::create_directories(dir, ec);
  if (ec) throw OutputError("cannot create " + dir + ": " + ec.message());
}

void writeOutputs(const std::string& dir, const std::vector<OutputFile>& files) {
  prepareOutputDir(dir, true);
  for (const OutputFile& f : files) writeFileAtomic((fs::path(dir) / f.name).string(), f.content);
}

namespace {

// Throws std::domain_error naming the first non-finite number's path.
void requireFinite(const nlohmann::json& j, const std::string& path) {
  if (j.is_number_float() && !std::isfinite(j.get<double>()))
    throw std::domain_error("a non-finite number reached an output at " + (path.empty() ? "(top)" : path));
  if (j.is_object())
    for (auto it = j.begin(); it != j.end(); ++it) requireFinite(*it, path.empty() ? it.key() : path + "." + it.key());
  if (j.is_array())
    for (std::size_t i = 0; i < j.size(); ++i) requireFinite(j[i], path + "." + std::to_string(i));
}

}  // namespace

std::string jsonFileText(const nlohmann::json& j) {
  requireFinite(j, "");
  return j.dump(2) + "\n";
}

std::string fmt(double v, int digits) {
  if (!std::isfinite(v)) throw std::domain_error("a non-finite number reached an output");
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

std::string signedFmt(double v, int digits) {
  if (v == 0) v = 0;
  return (v > 0 ? "+" : "") + fmt(v, digits);
}

std::string revSText(double omegaRadS) { return fmt(omegaRadS / k::twoPi, 4) + " rev/s"; }

}  // namespace dm
