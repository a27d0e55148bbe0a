// dwellmark review: the design review of one or more variants, as one
// self-contained HTML page and review.json.
#include <unistd.h>

#include <iostream>

#include "app/cli.hpp"
#include "app/review.hpp"

namespace dm::app {

namespace {

struct ReviewArgs {
  std::vector<std::string> scenarios;
  std::string out;
  std::vector<std::string> sets;
  ReviewOptions options;
  std::optional<double> duration;
  bool quiet = false;
};

int runReview(ReviewArgs& a) {
  std::vector<Scenario> variants;
  for (const std::string& path : a.scenarios) variants.push_back(loadScenarioWithOverrides(path, a.sets));
  a.options.duration = a.duration;
  if (!a.quiet && ::isatty(STDERR_FILENO)) a.options.progress = [](const std::string& what) { std::cerr << what << "\n"; };
  std::vector<std::string> written;
  try {
    written = writeReview(variants, a.out, a.options);
  } catch (const ReviewFault& e) {
    std::cerr << "dwellmark: " << e.what() << "\n  nothing was written.\n";
    return exitFault;
  }
  if (!a.quiet)
    for (const std::string& path : written) std::cout << "wrote " << path << "\n";
  return exitOk;
}

}  // namespace

void addReviewCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<ReviewArgs>();
  CLI::App* sub = app.add_subcommand(
      "review", "Design review of one or more variants: one self-contained review.html and review.json");
  sub->add_option("scenarios", args->scenarios, "scenario JSON files, one per design variant")->required();
  sub->add_option("--out", args->out, "output folder (new or empty)")->required();
  sub->add_option("--set", args->sets, "override a field of every variant: key.path=value (repeatable)");
  sub->add_option("--launches", args->options.launches, "visitor launches per variant")->check(CLI::Range(1, 100000));
  addThreadsOption(sub, args->options.threads);
  sub->add_option("--seed", args->options.seed, "seed of the launch draws (overrides launch.seed)")
      ->check(CLI::Range(std::uint64_t(0), std::uint64_t(9007199254740991ULL)));
  sub->add_option("--duration-s", args->duration, "simulated time of every run in seconds (overrides run.duration_s)");
  sub->add_option("--image-px", args->options.imageSize, "size of the observer images, px")->check(CLI::Range(16, 4096));
  sub->add_option("--viewer-image-px", args->options.viewerImageSize,
                  "largest viewing-check image, px (each is sized to resolve the markings, up to this)")
      ->check(CLI::Range(16, 4096));
  sub->add_flag("--quiet", args->quiet, "print nothing but errors");
  sub->add_flag("--force", args->options.force, "write into a folder that already holds files");
  commands.add(sub, [args] { return runReview(*args); });
}

}  // namespace dm::app
