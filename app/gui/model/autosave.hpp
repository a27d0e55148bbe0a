// The scenario being edited, kept on disk while it has unsaved edits, so a
// crash, a killed window or a power cut loses at most one interval of work.
// The GUI writes it on a clock (AutosaveClock), removes it when the edits
// are saved or deliberately discarded, and offers it back at the next start.
// File: {"dwellmark_unsaved": 1, "origin": PATH, "scenario": {...}}, the
// scenario in the same JSON as the command line's files.
#pragma once
#include <cstdint>
#include <optional>
#include <string>

#include "core/scenario.hpp"

namespace dm::gui {

/// What an autosave file holds.
struct AutosaveRecord {
  Scenario scenario;   ///< the edited scenario, valid
  std::string origin;  ///< the file those edits belong to ("" for a new scenario)
};

/// $XDG_STATE_HOME/dwellmark/unsaved-scenario.json, else
/// ~/.local/state/dwellmark/unsaved-scenario.json ("" when neither is set).
std::string defaultAutosavePath();

/// Writes the record atomically, creating its folder (throws OutputError).
void writeAutosave(const std::string& file, const Scenario& scenario, const std::string& origin);

/// Reads an autosave file. Empty when there is none; throws ScenarioError
/// when it exists but does not hold a valid scenario (the caller says so and
/// keeps the file for the user to inspect).
std::optional<AutosaveRecord> loadAutosave(const std::string& file);

/// Removes the file (nothing when it is absent).
void clearAutosave(const std::string& file);

/// When an autosave is due: the scenario has unsaved edits, they changed
/// since the last write, and `interval` seconds have passed since it.
struct AutosaveClock {
  double interval = 5;              ///< s between writes at most
  double lastWrite = -1e300;        ///< s, clock time of the last write
  std::uint64_t writtenRevision = 0;  ///< the edit revision last written (0: none)
  /// True when a write is due at clock time `now` (s).
  bool due(double now, std::uint64_t revision, bool dirty) const;
  /// Records a write of `revision` at `now`.
  void wrote(double now, std::uint64_t revision);
};

}  // namespace dm::gui
