// File output: every file is written atomically (a temporary file in the
// same folder, then a rename), and output folders are never silently mixed.
#pragma once
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

namespace dm {

class OutputError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

/// Writes `content` to `path` through a temporary file and a rename, so a
/// reader sees the old file or the whole new one, never a part.
void writeFileAtomic(const std::string& path, const std::string& content);

/// Makes `dir` ready for new results: creates it if missing; refuses
/// (OutputError) if it exists and is not empty, unless `force`.
void prepareOutputDir(const std::string& dir, bool force);

/// The check of prepareOutputDir without creating anything: refuses
/// (OutputError) a `dir` that is not a folder, or a non-empty folder unless
/// `force`. Run it before a long computation, write with writeOutputs after,
/// so a run that stops early leaves no folder behind.
void checkOutputDir(const std::string& dir, bool force);

/// One output file: its name inside the output folder and its whole content.
struct OutputFile {
  std::string name;
  std::string content;
};

/// Creates `dir` if missing and writes every file into it atomically. The
/// contents are formatted before anything is written, so a formatting
/// failure (NaN, see fmt) never leaves a folder with only some of the files.
void writeOutputs(const std::string& dir, const std::vector<OutputFile>& files);

/// Formats a number for text outputs: `digits` significant digits, no NaN or
/// infinity (those throw std::domain_error: they must never reach a file).
std::string fmt(double v, int digits = 9);

/// fmt with an explicit sign: "+1.5", "-2", "0" (never "-0").
std::string signedFmt(double v, int digits);

/// An angular rate in rad/s as text in rev/s, four digits: "3.2 rev/s".
std::string revSText(double omegaRadS);

/// JSON text for a file (two-space indent, final newline). Throws
/// std::domain_error when any number in `j` is NaN or infinite: the JSON
/// library would otherwise write it as null without a word.
std::string jsonFileText(const nlohmann::json& j);

}  // namespace dm
