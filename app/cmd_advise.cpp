// dwellmark advise: the dimension advisor (core/advise.hpp). Without
// --length-mm: the length that keeps n spots steadiest over a precession
// range, with n - 1 and n + 1 beside it. With --length-mm: the precession
// range over which that body's n-spot pattern drifts less than a limit.
#include <cmath>
#include <iostream>
#include <memory>

#include "app/body_flags.hpp"
#include "app/cli.hpp"
#include "core/advise.hpp"
#include "core/io.hpp"

namespace dm::app {

namespace {

struct AdviseArgs {
  BodyFlags body;
  int spots = 0;
  std::string precession;
  double maxDriftDegS = 0;
  double orbitMm = 0;
  bool json = false;
  CLI::Option* precessionOpt = nullptr;
  CLI::Option* maxDriftOpt = nullptr;
};


nlohmann::json pointJson(const DriftPoint& p) {
  nlohmann::json j{{"precession_rev_s", revS(p.precession)}, {"pattern", p.pattern}};
  j["tilt_deg"] = p.pattern ? nlohmann::json(p.spin.tilt / k::degree) : nlohmann::json(nullptr);
  j["spots_per_rev"] = p.pattern ? nlohmann::json(p.spin.spotsPerRev) : nlohmann::json(nullptr);
  j["drift_deg_per_rev"] = p.pattern ? jsonNumber(p.driftDegPerRev) : nlohmann::json(nullptr);
  j["drift_deg_s"] = p.pattern ? jsonNumber(p.driftDegPerSecond) : nlohmann::json(nullptr);
  return j;
}

nlohmann::json adviceJson(const LengthAdvice& a, double D) {
  nlohmann::json j{{"spots", a.spots}, {"found", a.found}};
  if (!a.found) {
    j["reason"] = a.reason;
    return j;
  }
  j["length_mm"] = a.length * mm;
  j["length_over_diameter"] = a.length / D;
  j["worst_drift_deg_s"] = a.worst.driftDegPerSecond;
  j["worst_at_precession_rev_s"] = revS(a.worst.precession);
  j["from"] = pointJson(a.atFrom);
  j["to"] = pointJson(a.atTo);
  return j;
}

nlohmann::json windowJson(const PrecessionWindow& w) {
  nlohmann::json bands = nlohmann::json::array();
  for (const PrecessionBand& b : w.bands) bands.push_back({{"from_rev_s", revS(b.from)}, {"to_rev_s", revS(b.to)}});
  nlohmann::json j{{"spots", w.spots},
                   {"length_mm", w.length * mm},
                   {"drift_limit_deg_s", w.limitDegPerSecond},
                   {"search_rev_s", {{"from", revS(w.searchFrom)}, {"to", revS(w.searchTo)}}},
                   {"bands", bands},
                   {"best", pointJson(w.best)}};
  if (!w.reason.empty()) j["reason"] = w.reason;
  return j;
}

nlohmann::json sectionJson(const BodySpec& b, const Cylinder& c) {
  return {{"shape", std::string(shapeName(b.shape))},
          {"outer_diameter_mm", 2 * c.outerRadius * mm},
          {"inner_diameter_mm", 2 * c.innerRadius * mm},
          {"wall_mm", (c.outerRadius - c.innerRadius) * mm}};
}

std::string pointText(const DriftPoint& p) {
  if (!p.pattern) return "no pattern";
  return signedFmt(p.driftDegPerSecond, 4) + " deg/s (" + signedFmt(p.driftDegPerRev, 4) + " deg/rev, tilt " +
         fmt(p.spin.tilt / k::degree, 3) + " deg, N " + fmt(p.spin.spotsPerRev, 5) + ")";
}

std::string bandsText(const PrecessionWindow& w) {
  if (w.bands.empty()) return "nowhere: " + w.reason;
  std::string s;
  for (const PrecessionBand& b : w.bands)
    s += (s.empty() ? "" : ", ") + fmt(revS(b.from), 5) + " to " + fmt(revS(b.to), 5) + " rev/s";
  return s;
}

std::string limitText(const PrecessionWindow& w, bool isDefault) {
  return fmt(w.limitDegPerSecond, 4) + " deg/s" + (isDefault ? " (one spot spacing in 10 s)" : "");
}

int runAdvise(const AdviseArgs& a) {
  // Check the flags before reading anything.
  const int n = int(checkedFlag(advise_input::spots, a.spots, "--spots"));
  const bool reverse = a.body.length->count() > 0;
  if (!reverse && a.precessionOpt->count() == 0)
    throw ScenarioError("--precession-rev-s",
                        "missing; give the precession range FROM:TO in rev/s (or --length-mm "
                        "for the precession range of a given length)");
  FlagRange range{0, advise_input::windowSearchTopRevS, 0};
  if (a.precessionOpt->count() > 0)
    range = parseFlagRange(a.precession, "--precession-rev-s", steady_input::precession, false);
  const bool defaultLimit = a.maxDriftOpt->count() == 0;
  const double limit = defaultLimit ? defaultDriftLimitDegPerSecond(n)
                                    : checkedFlag(advise_input::driftLimit, a.maxDriftDegS, "--max-drift-deg-s");
  const CentreOrbit orbit{checkedFlag(steady_input::orbit, a.orbitMm, "--orbit-mm") / mm};
  const std::string orbitNote =
      orbit.rho == 0 ? std::string()
                     : "  (the centre expected to circle the spin axis " + fmt(a.orbitMm, 5) +
                           " mm from it at every precession, + towards the raised end)\n";

  if (reverse) {
    const Scenario s = loadBodyScenario(a.body);
    const Cylinder c = cylinderOf(s.body);
    const PrecessionWindow w =
        precessionWindow(c, n, limit, range.from * k::twoPi, range.to * k::twoPi, k::gravity, orbit);
    if (a.json) {
      nlohmann::json j = windowJson(w);
      j["mode"] = "window";
      j["orbit_mm"] = a.orbitMm;
      j["solution"] = w.bands.empty() ? "none" : "window";
      j["body"] = sectionJson(s.body, c);
      j["body"]["length_mm"] = c.length * mm;
      j["min_precession_rev_s"] = revS(minSteadyPrecession(c));
      std::cout << j.dump(2) << "\n";
      return exitOk;
    }
    std::cout << "precession window of a " << bodyDescription(s.body) << " for " << n << " spots\n"
              << "  searched " << fmt(range.from, 5) << " to " << fmt(range.to, 5) << " rev/s; the end stays up above "
              << fmt(revS(minSteadyPrecession(c)), 5) << " rev/s\n"
              << orbitNote << "  drift of the " << n << "-spot pattern under " << limitText(w, defaultLimit) << ": "
              << bandsText(w) << "\n";
    if (w.best.pattern)
      std::cout << "  steadiest at " << fmt(revS(w.best.precession), 5) << " rev/s: " << pointText(w.best) << "\n";
    return exitOk;
  }

  // Forward: the advisor picks the length, so the scenario's own length is
  // replaced by n diameters (and a ring or disk by a tube or rod of the
  // same cross-section) just for validating the cross-section.
  const Scenario s = loadBodyScenario(a.body, [n](nlohmann::json& doc) {
    nlohmann::json& body = doc["body"];
    const double d = body.value("outer_diameter_mm", 0.0);
    if (d > 0) body["length_mm"] = std::min(n * d, findField("body.length_mm")->max);
    const std::string shape = body.value("shape", std::string("tube"));
    if (shape == "ring") body["shape"] = "tube";
    if (shape == "disk") body["shape"] = "rod";
  });
  const Cylinder section = cylinderOf(s.body);
  const double D = 2 * section.outerRadius;
  const DimensionAdvice adv = adviseLength(section, n, range.from * k::twoPi, range.to * k::twoPi, k::gravity, orbit);
  PrecessionWindow w;
  if (adv.best.found) {
    Cylinder c = section;
    c.length = adv.best.length;
    w = precessionWindow(c, n, limit, 0, advise_input::windowSearchTopRevS * k::twoPi, k::gravity, orbit);
  }
  if (a.json) {
    nlohmann::json j;
    j["mode"] = "length";
    j["solution"] = adv.best.found ? "length" : "none";
    if (!adv.best.found) j["reason"] = adv.best.reason;
    j["body"] = sectionJson(s.body, section);
    j["spots"] = n;
    j["precession_rev_s"] = {{"from", range.from}, {"to", range.to}};
    j["orbit_mm"] = a.orbitMm;
    j["min_precession_rev_s"] = revS(adv.minPrecession);
    j["drift_limit_deg_s"] = limit;
    j["recommended"] = adviceJson(adv.best, D);
    if (adv.best.found) j["recommended"]["window"] = windowJson(w);
    j["fewer"] = adviceJson(adv.fewer, D);
    j["more"] = adviceJson(adv.more, D);
    std::cout << j.dump(2) << "\n";
    return exitOk;
  }
  std::cout << "length advice for " << n << " spots on a " << bodyDescription(s.body, false) << ", over "
            << fmt(range.from, 5) << " to " << fmt(range.to, 5) << " rev/s\n"
            << "  (the end stays up above " << fmt(revS(adv.minPrecession), 5)
            << " rev/s; drift of the n-spot pattern, + in the direction of precession)\n"
            << orbitNote;
  if (!adv.fewer.found && !adv.best.found && !adv.more.found && adv.fewer.reason == adv.best.reason &&
      adv.more.reason == adv.best.reason) {
    std::cout << "  no length for " << n - 1 << ", " << n << " or " << n + 1 << " spots: " << adv.best.reason << "\n";
    return exitOk;
  }
  for (const LengthAdvice* l : {&adv.fewer, &adv.best, &adv.more}) {
    std::cout << "  " << l->spots << " spots" << (l == &adv.best ? " (asked)" : "") << ": ";
    if (!l->found) {
      std::cout << "no length: " << l->reason << "\n";
      continue;
    }
    std::cout << "length " << fmt(l->length * mm, 5) << " mm (L/D " << fmt(l->length / D, 4) << "), worst |drift| "
              << fmt(l->worst.driftDegPerSecond, 4) << " deg/s at " << fmt(revS(l->worst.precession), 4) << " rev/s\n"
              << "      at " << fmt(range.from, 5) << " rev/s: " << pointText(l->atFrom) << "\n"
              << "      at " << fmt(range.to, 5) << " rev/s: " << pointText(l->atTo) << "\n";
  }
  if (adv.best.found)
    std::cout << "recommended length " << fmt(adv.best.length * mm, 5) << " mm; its " << n
              << "-spot pattern drifts under " << limitText(w, defaultLimit) << " from " << bandsText(w) << "\n";
  return exitOk;
}

}  // namespace

void addAdviseCommand(CLI::App& app, Commands& commands) {
  auto args = std::make_shared<AdviseArgs>();
  CLI::App* sub = app.add_subcommand(
      "advise",
      "Dimension advisor: the length for n steady spots over a precession range, or the precession range "
      "of a given length");
  addBodyFlags(sub, args->body);
  args->body.length->description(fieldHelp("body.length_mm",
                                           "the body's length: asks the reverse question, over which precessions "
                                           "its n-spot pattern drifts less than the limit"));
  sub->add_option("--spots", args->spots, "spots wanted, n (" + advise_input::spots.allowedText() + ")")->required();
  args->precessionOpt = sub->add_option(
      "--precession-rev-s", args->precession,
      "precession range FROM:TO in rev/s (each " + steady_input::precession.allowedText() +
          "); with --length-mm the range searched (default 0 to " + fmt(advise_input::windowSearchTopRevS, 4) + ")");
  args->maxDriftOpt = sub->add_option("--max-drift-deg-s", args->maxDriftDegS,
                                      "drift limit, deg/s (" + advise_input::driftLimit.allowedText() +
                                          "; default one spot spacing, 360/n deg, in 10 s)");
  sub->add_option("--orbit-mm", args->orbitMm,
                  "the centre orbit a designer expects, mm, signed: + towards the raised end (" +
                      steady_input::orbit.allowedText() +
                      "; default 0, the centre still); the same at every precession, as `steady --orbit-mm`");
  sub->add_flag("--json", args->json, "print one JSON object instead of text");
  commands.add(sub, [args] { return runAdvise(*args); });
}

}  // namespace dm::app
