// File chores for the GUI without any window code: the recent-files list
// (kept in the user's config folder) and folder listings for the file chooser.
#pragma once
#include <string>
#include <vector>

namespace dm::gui {

/// Most recently used scenario files, newest first, at most `capacity`.
struct RecentFiles {
  std::vector<std::string> paths;
  std::size_t capacity = 8;
  /// Moves (or inserts) `path` to the front, made absolute.
  void add(const std::string& path);
  /// Removes `path` (e.g. after it failed to open).
  void remove(const std::string& path);
};

/// Reads the list from `file`; a missing or malformed file gives an empty list.
RecentFiles loadRecentFiles(const std::string& file);
/// Writes the list to `file` atomically, creating its folder (throws OutputError).
void saveRecentFiles(const RecentFiles& recent, const std::string& file);
/// $XDG_CONFIG_HOME/dwellmark/recent.json, else ~/.config/dwellmark/recent.json
/// ("" when neither variable is set).
std::string defaultRecentFilesPath();

/// One row of a folder listing.
struct FolderEntry {
  std::string name;
  bool folder = false;
};

/// The sub-folders and the files ending in `extension` (e.g. ".json"; ""
/// for all) of `dir`, folders first, each group sorted by name; hidden
/// entries skipped. An unreadable folder gives an empty list.
std::vector<FolderEntry> listFolder(const std::string& dir, const std::string& extension);

/// `dir` joined with `name` ("..": the parent), made absolute and normal.
std::string joinPath(const std::string& dir, const std::string& name);

/// `path` with its extension replaced by (or, if none, extended with) `extension`.
std::string withExtension(const std::string& path, const std::string& extension);

}  // namespace dm::gui
