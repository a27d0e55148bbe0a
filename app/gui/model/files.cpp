#include "app/gui/model/files.hpp"

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>

#include <nlohmann/json.hpp>

#include "core/io.hpp"

namespace dm::gui {

namespace fs = std::filesystem;

void RecentFiles::add(const std::string& path) {
  std::error_code ec;
  const std::string absolute = fs::absolute(path, ec).lexically_normal().string();
  remove(absolute);
  paths.insert(paths.begin(), absolute);
  if (paths.size() > capacity) paths.resize(capacity);
}

void RecentFiles::remove(const std::string& path) { paths.erase(std::remove(paths.begin(), paths.end(), path), paths.end()); }

RecentFiles loadRecentFiles(const std::string& file) {
  RecentFiles r;
  std::ifstream in(file);
  if (!in) return r;
  std::stringstream buf;
  buf << in.rdbuf();
  const nlohmann::json doc = nlohmann::json::parse(buf.str(), nullptr, false);
  if (!doc.is_object() || !doc.contains("recent_files") || !doc["recent_files"].is_array()) return r;
  for (const auto& p : doc["recent_files"])
    if (p.is_string() && r.paths.size() < r.capacity) r.paths.push_back(p.get<std::string>());
  return r;
}

void saveRecentFiles(const RecentFiles& recent, const std::string& file) {
  std::error_code ec;
  fs::create_directories(fs::path(file).parent_path(), ec);
  if (ec) throw OutputError("cannot create " + fs::path(file).parent_path().string() + ": " + ec.message());
  nlohmann::json doc;
  doc["recent_files"] = recent.paths;
  writeFileAtomic(file, doc.dump(2) + "\n");
}

std::string defaultRecentFilesPath() {
  if (const char* xdg = std::getenv("XDG_CONFIG_HOME"); xdg && *xdg) return std::string(xdg) + "/dwellmark/recent.json";
  if (const char* home = std::getenv("HOME"); home && *home) return std::string(home) + "/.config/dwellmark/recent.json";
  return {};
}

std::vector<FolderEntry> listFolder(const std::string& dir, const std::string& extension) {
  std::vector<FolderEntry> folders, files;
  std::error_code ec;
  for (fs::directory_iterator it(dir, fs::directory_options::skip_permission_denied, ec), end; !ec && it != end;
       it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (name.empty() || name[0] == '.') continue;
    std::error_code typeError;
    if (it->is_directory(typeError)) folders.push_back({name, true});
    else if (extension.empty() || it->path().extension() == extension) files.push_back({name, false});
  }
  auto byName = [](const FolderEntry& a, const FolderEntry& b) { return a.name < b.name; };
  std::sort(folders.begin(), folders.end(), byName);
  std::sort(files.begin(), files.end(), byName);
  folders.insert(folders.end(), files.begin(), files.end());
  return folders;
}

std::string joinPath(const std::string& dir, const std::string& name) {
  std::error_code ec;
  const fs::path base = fs::absolute(dir, ec);
  if (name == "..") return base.lexically_normal().parent_path().string();
  return (base / name).lexically_normal().string();
}

std::string withExtension(const std::string& path, const std::string& extension) {
  fs::path p(path);
  p.replace_extension(extension);
  return p.string();
}

}  // namespace dm::gui
