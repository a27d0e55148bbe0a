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

namespace dm {

namespace fs = std::filesystem;

namespace {

// A temporary name beside `target`, distinct per process and per thread so
// that concurrent writers of the same file never share one.
fs::path temporaryBeside(const fs::path& target) {
  const std::size_t thread = std::hash<std::thread::id>{}(std::this_thread::get_id());
  return target.parent_path() /
         (".tmp-" + target.filename().string() + "-" + std::to_string(::getpid()) + "-" + std::to_string(thread % 1000003));
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

std::string fmt(double v, int digits) {
  if (!std::isfinite(v)) throw std::domain_error("a non-finite number reached an output");
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

}  // namespace dm
