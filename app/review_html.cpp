// The review as one self-contained HTML page: images embedded as base64
// PNG data, plots drawn as inline SVG, no script and no link outside the
// page. Every figure is printed with its unit.
#include <algorithm>
#include <cmath>
#include <sstream>

#include "app/review.hpp"
#include "core/constants.hpp"
#include "core/io.hpp"
#include "render/image.hpp"

namespace dm::app {

namespace {

// ---- text helpers --------------------------------------------------------------

std::string escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string base64(const std::string& bytes) {
  static constexpr char table[] = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
  std::string out;
  for (std::size_t i = 0; i < bytes.size(); i += 3) {
    const std::size_t n = std::min<std::size_t>(3, bytes.size() - i);
    std::uint32_t v = 0;
    for (std::size_t j = 0; j < 3; ++j) v = (v << 8) | (j < n ? std::uint8_t(bytes[i + j]) : 0u);
    for (std::size_t j = 0; j < 4; ++j) out += j <= n ? table[(v >> (18 - 6 * j)) & 63] : '=';
  }
  return out;
}

std::string number(double v, int digits = 4) { return std::isfinite(v) ? fmt(v, digits) : "-"; }
std::string mm(double metres) { return number(metres * 1e3) + " mm"; }
std::string seconds(double s) { return number(s, 3) + " s"; }
std::string percent(double share) { return number(100 * share, 3) + " %"; }
std::string revS(double radS) { return number(radS / k::twoPi) + " rev/s"; }

// The spots a steady spin makes: "4", "7, each every 2 rev (N near 7/2)" or
// "4, creeping" (fractionPattern).
std::string spotsText(const SteadySpin& s) {
  const FractionPattern& f = s.fraction;
  if (f.spots == 0) return s.nearestSpots > 0 ? std::to_string(s.nearestSpots) + ", creeping" : std::string("-");
  if (f.revsPerVisit == 1) return std::to_string(f.spots);
  return std::to_string(f.spots) + ", each every " + std::to_string(f.revsPerVisit) + " rev (N near " +
         ratioText(f.spots, f.revsPerVisit) + ")";
}

// An embedded PNG, shown at most `shownWidth` px wide (0: at its own size).
std::string image(const Image& img, const std::string& alt, int shownWidth = 0) {
  const int w = shownWidth > 0 ? std::min(shownWidth, img.width) : img.width;
  const int h = int(std::lround(double(img.height) * w / std::max(1, img.width)));
  return "<img src=\"data:image/png;base64," + base64(encodePng(img)) + "\" alt=\"" + escape(alt) + "\" width=\"" +
         std::to_string(w) + "\" height=\"" + std::to_string(h) + "\">";
}

// A table with a header row of variant names and one row per label.
struct Table {
  std::vector<std::string> head;
  std::vector<std::vector<std::string>> rows;  ///< cells already escaped
  std::string html() const {
    std::string out = "<table><thead><tr>";
    for (const std::string& h : head) out += "<th>" + escape(h) + "</th>";
    out += "</tr></thead><tbody>";
    for (const auto& row : rows) {
      out += "<tr>";
      for (std::size_t i = 0; i < row.size(); ++i) out += (i == 0 ? "<th>" : "<td>") + row[i] + (i == 0 ? "</th>" : "</td>");
      out += "</tr>";
    }
    return out + "</tbody></table>";
  }
};

Table variantTable(const std::vector<VariantReview>& variants, const std::string& first) {
  Table t;
  t.head.push_back(first);
  for (const VariantReview& v : variants) t.head.push_back(v.scenario.name);
  return t;
}

// One row: a label and one cell per variant.
template <class F>
void addRow(Table& t, const std::vector<VariantReview>& variants, const std::string& label, F cell) {
  std::vector<std::string> row{escape(label)};
  for (const VariantReview& v : variants) row.push_back(cell(v));
  t.rows.push_back(row);
}

std::string flag(bool warning) { return warning ? "<span class=\"warn\">warning</span>" : "<span class=\"ok\">ok</span>"; }

// ---- SVG plots -------------------------------------------------------------------

const char* palette[] = {"#4c72b0", "#dd8452", "#55a868", "#c44e52", "#8172b3", "#937860", "#da8bc3", "#8c8c8c"};

// The frame of a plot: axes, title and axis labels, in a 360 x 220 box with
// the plot area [50, 340] x [20, 180].
struct Plot {
  static constexpr double left = 50, right = 340, top = 20, bottom = 180;
  std::string title, xLabel, yLabel;
  std::ostringstream body;
  Plot(std::string t, std::string x, std::string y) : title(std::move(t)), xLabel(std::move(x)), yLabel(std::move(y)) {}
  double x(double u) const { return left + u * (right - left); }  ///< u in 0..1
  double y(double u) const { return bottom - u * (bottom - top); }
  std::string svg() const {
    std::ostringstream o;
    o << "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"360\" height=\"220\" viewBox=\"0 0 360 220\" role=\"img\" "
         "aria-label=\""
      << escape(title) << "\"><title>" << escape(title) << "</title>"
      << "<line x1=\"" << left << "\" y1=\"" << bottom << "\" x2=\"" << right << "\" y2=\"" << bottom
      << "\" stroke=\"#333\"></line><line x1=\"" << left << "\" y1=\"" << top << "\" x2=\"" << left << "\" y2=\""
      << bottom << "\" stroke=\"#333\"></line>" << body.str() << "<text x=\"" << (left + right) / 2
      << "\" y=\"212\" font-size=\"11\" text-anchor=\"middle\">" << escape(xLabel) << "</text><text x=\"12\" y=\""
      << (top + bottom) / 2 << "\" font-size=\"11\" text-anchor=\"middle\" transform=\"rotate(-90 12 "
      << (top + bottom) / 2 << ")\">" << escape(yLabel) << "</text></svg>";
    return "<figure>" + o.str() + "<figcaption>" + escape(title) + "</figcaption></figure>";
  }
  void rect(double x0, double y0, double x1, double y1, const std::string& fill) {
    body << "<rect x=\"" << fmt(std::min(x0, x1), 6) << "\" y=\"" << fmt(std::min(y0, y1), 6) << "\" width=\""
         << fmt(std::abs(x1 - x0), 6) << "\" height=\"" << fmt(std::abs(y1 - y0), 6) << "\" fill=\"" << fill
         << "\"></rect>";
  }
  void text(double px, double py, const std::string& t, const char* anchor = "middle") {
    body << "<text x=\"" << fmt(px, 6) << "\" y=\"" << fmt(py, 6) << "\" font-size=\"10\" text-anchor=\"" << anchor
         << "\">" << escape(t) << "</text>";
  }
  void line(double x0, double y0, double x1, double y1, const std::string& stroke) {
    body << "<line x1=\"" << fmt(x0, 6) << "\" y1=\"" << fmt(y0, 6) << "\" x2=\"" << fmt(x1, 6) << "\" y2=\""
         << fmt(y1, 6) << "\" stroke=\"" << stroke << "\"></line>";
  }
};

// Share of launches per spot count at settle.
std::string settleHistogram(const EnsembleSummary& e) {
  Plot p("spots at settle (share of launches)", "spots seen (0: none or a ring)", "share");
  const auto& h = e.spotsAtSettle.launches;
  std::size_t total = 0;
  for (std::size_t n : h) total += n;
  const std::size_t bars = std::max<std::size_t>(h.size(), 1);
  for (std::size_t i = 0; i < h.size(); ++i) {
    const double share = total ? double(h[i]) / double(total) : 0;
    const double w = 1.0 / double(bars);
    p.rect(p.x(i * w + 0.1 * w), p.y(0), p.x((i + 0.9) * w), p.y(share), palette[0]);
    p.text(p.x((i + 0.5) * w), 195, std::to_string(i));
  }
  p.text(p.left - 4, p.y(1) + 4, "1", "end");
  p.text(p.left - 4, p.y(0) + 4, "0", "end");
  return p.svg();
}

// Stacked shares of spot counts for each window start.
std::string spotsOverTime(const EnsembleSummary& e) {
  Plot p("spots seen over time (share of launches)", "window start, s", "share");
  const std::size_t windows = std::max<std::size_t>(e.windowStarts.size(), 1);
  std::size_t counts = 0;
  for (const SpotHistogram& h : e.spotsOverTime) counts = std::max(counts, h.launches.size());
  for (std::size_t i = 0; i < e.spotsOverTime.size(); ++i) {
    const auto& h = e.spotsOverTime[i].launches;
    std::size_t total = 0;
    for (std::size_t n : h) total += n;
    double below = 0;
    for (std::size_t n = 0; n < h.size() && total; ++n) {
      const double share = double(h[n]) / double(total);
      p.rect(p.x(double(i) / windows), p.y(below), p.x(double(i + 1) / windows), p.y(below + share),
             n == 0 ? "#dddddd" : palette[n % 8]);
      below += share;
    }
  }
  if (!e.windowStarts.empty()) {
    p.text(p.x(0), 195, number(e.windowStarts.front(), 3));
    p.text(p.x(1), 195, number(e.windowStarts.back(), 3));
  }
  // The legend goes in the caption, beside the plot rather than over it.
  std::string legend = "<span style=\"color:#bbbbbb\">&#9632;</span> none or a ring";
  for (std::size_t n = 1; n < counts; ++n)
    legend += " <span style=\"color:" + std::string(palette[n % 8]) + "\">&#9632;</span> " + std::to_string(n) + " spots";
  const std::string svg = p.svg();
  return svg.substr(0, svg.size() - std::string("</figcaption></figure>").size()) + ": " + legend +
         "</figcaption></figure>";
}

// Median and 10th-90th percentile bars of the times of a launch.
std::string timeRanges(const EnsembleSummary& e) {
  Plot p("settle, show and spin times (bar: 10th to 90th percentile, tick: median)", "time, s", "");
  const std::pair<const char*, const Percentiles*> rows[] = {
      {"settle", &e.settleTime}, {"show", &e.showTime}, {"spin", &e.spinTime}, {"rest", &e.restTime}};
  double top = 1e-9;
  for (const auto& r : rows) top = std::max(top, r.second->max);
  for (std::size_t i = 0; i < 4; ++i) {
    const Percentiles& q = *rows[i].second;
    const double yc = p.top + 20 + 38.0 * double(i);
    p.text(p.left + 4, yc - 8, std::string(rows[i].first) + " (" + std::to_string(q.count) + " launches)", "start");
    if (q.count == 0) continue;
    p.rect(p.x(q.p10 / top), yc - 5, p.x(q.p90 / top), yc + 5, palette[i]);
    p.line(p.x(q.median / top), yc - 8, p.x(q.median / top), yc + 8, "#000");
  }
  p.text(p.x(0), 195, "0");
  p.text(p.x(1), 195, number(top, 3));
  return p.svg();
}

// Share of launches whose body stays within a table radius, against the radius.
std::string holdCurve(const VariantReview& v) {
  Plot p("share of launches kept on a round table, by its radius", "table radius, mm", "share kept");
  std::vector<double> reach;
  const double half = std::hypot(v.scenario.body.length / 2, v.scenario.body.outerDiameter / 2);
  for (const LaunchOutcome& o : v.ensemble.outcomes)
    if (o.fault.empty()) reach.push_back(o.maxExcursion + half);
  std::sort(reach.begin(), reach.end());
  const double top = std::max(reach.empty() ? 0.0 : reach.back(), v.scenario.surface.tableRadius) * 1.05;
  std::ostringstream points;
  points << fmt(p.x(0), 6) << "," << fmt(p.y(0), 6);
  for (std::size_t i = 0; i < reach.size(); ++i) {
    const double share = double(i + 1) / double(reach.size());
    points << " " << fmt(p.x(reach[i] / top), 6) << "," << fmt(p.y(double(i) / double(reach.size())), 6) << " "
           << fmt(p.x(reach[i] / top), 6) << "," << fmt(p.y(share), 6);
  }
  p.body << "<polyline points=\"" << points.str() << "\" fill=\"none\" stroke=\"" << palette[0] << "\"></polyline>";
  const double table = p.x(v.scenario.surface.tableRadius / top);
  p.line(table, p.top, table, p.bottom, palette[3]);
  p.text(table, p.top - 4, "this table");
  p.text(p.x(0), 195, "0");
  p.text(p.x(1), 195, number(top * 1e3, 4));
  return p.svg();
}

// ---- sections --------------------------------------------------------------------

std::string fieldValue(const Field<Scenario>& f, const Scenario& s) {
  if (f.type == FieldType::Number || f.type == FieldType::Integer)
    return number(f.getNumber(s), 6) + (f.unit == "-" ? "" : " " + f.unit);
  return f.getText(s);
}

std::string parametersSection(const std::vector<VariantReview>& variants) {
  const char* key[] = {"body.shape", "body.length_mm", "body.outer_diameter_mm", "body.wall_mm", "body.density_kg_m3",
                       "surface.name", "surface.friction_kinetic", "surface.rolling_resistance",
                       "surface.table_radius_mm", "launch.pressed_end", "launch.revolution_rev_s", "launch.backspin",
                       "launch.tilt_deg", "launch.drift_mm_s", "run.duration_s", "lighting.flicker",
                       "lighting.flicker_frequency_hz", "lighting.flicker_depth"};
  Table main = variantTable(variants, "parameter");
  for (const char* path : key)
    if (const auto* f = findField(path)) addRow(main, variants, path, [&](const VariantReview& v) { return escape(fieldValue(*f, v.scenario)); });
  addRow(main, variants, "mass", [](const VariantReview& v) { return number(v.nominal->params.inertia.mass * 1e3) + " g"; });
  Table all = variantTable(variants, "field");
  for (const auto& f : scenarioFields())
    addRow(all, variants, f.path, [&](const VariantReview& v) { return escape(fieldValue(f, v.scenario)); });
  return "<section id=\"parameters\"><h2>Design variants</h2>" + main.html() +
         "<details><summary>every scenario field</summary>" + all.html() + "</details></section>";
}

std::string steadySection(const std::vector<VariantReview>& variants) {
  std::string out = "<section id=\"steady\"><h2>Steady-spin prediction</h2><p>The spin the piece settles into, "
                    "rolling on the lower rim while its axis turns about a vertical line: tilt, spots per revolution "
                    "N and the drift of the nearest whole-number pattern; where N is near a fraction p/q the mark "
                    "stops at p places, each every q revolutions (shown so under spots), and where it is near none "
                    "with at most four revolutions between visits the stops creep round the ring. A hand launch settles with its centre "
                    "circling that line a few millimetres off it, held by the table's friction (the centre orbit, - "
                    "towards the floor contact); the first row uses the orbit the nominal launch shows in the window "
                    "named, beside what that window measured. The other rows keep the centre on the line (orbit 0), "
                    "where the raised end's top point stands still.</p><div class=\"variants\">";
  for (const VariantReview& v : variants) {
    Table t{{"precession", "centre orbit", "tilt", "N", "spots", "drift", "friction needed", "the run measured"}, {}};
    for (const SteadyRow& r : v.steady) {
      const std::string orbit = r.orbit == 0 ? "0 (centre still)" : mm(r.orbit);
      std::string measured = "-";
      if (r.measured)
        measured = "tilt " + number(r.measured->tilt / k::degree) + " deg, N " +
                   (r.measured->spotsPerRev ? number(*r.measured->spotsPerRev) : std::string("-")) + " (" +
                   seconds(r.measured->start) + " to " + seconds(r.measured->end) + ")";
      if (!r.result.found) {
        t.rows.push_back({escape(revS(r.precession) + " (" + r.label + ")"), escape(orbit), "no steady spin", "-", "-",
                          "-", "-", escape(measured)});
        continue;
      }
      const SteadySpin& s = r.result.spin;
      t.rows.push_back({escape(revS(r.precession) + " (" + r.label + ")"), escape(orbit),
                        number(s.tilt / k::degree) + " deg", number(s.spotsPerRev), escape(spotsText(s)),
                        number(s.driftDegPerSecond) + " deg/s", number(s.frictionNeeded, 3), escape(measured)});
    }
    out += "<div class=\"variant\"><h3>" + escape(v.scenario.name) + "</h3><p>Lowest steady precession " +
           revS(v.minPrecession) + " (centre still).</p>" + t.html() + "</div>";
  }
  return out + "</div></section>";
}

std::string ensembleSection(const std::vector<VariantReview>& variants) {
  Table t = variantTable(variants, "visitor launches");
  addRow(t, variants, "launches (faults)", [](const VariantReview& v) {
    return std::to_string(v.ensemble.summary.launches) + " (" + std::to_string(v.ensemble.summary.faults) + ")";
  });
  addRow(t, variants, "pressed end rises and is seen", [](const VariantReview& v) { return percent(v.ensemble.summary.pressedVisibleShare); });
  addRow(t, variants, "end A / end B / neither seen", [](const VariantReview& v) {
    const EnsembleSummary& e = v.ensemble.summary;
    return percent(e.visibleShareA) + " / " + percent(e.visibleShareB) + " / " + percent(e.visibleShareNone);
  });
  auto q = [](const Percentiles& p) {
    return p.count ? seconds(p.median) + " (" + seconds(p.p10) + " to " + seconds(p.p90) + ")" : std::string("none");
  };
  addRow(t, variants, "settle time, median (10-90 %)", [&](const VariantReview& v) { return q(v.ensemble.summary.settleTime); });
  addRow(t, variants, "show time, median (10-90 %)", [&](const VariantReview& v) { return q(v.ensemble.summary.showTime); });
  addRow(t, variants, "spin time, median (10-90 %)", [&](const VariantReview& v) { return q(v.ensemble.summary.spinTime); });
  addRow(t, variants, "rest time, median (10-90 %)", [&](const VariantReview& v) { return q(v.ensemble.summary.restTime); });
  addRow(t, variants, "largest excursion, median / max", [](const VariantReview& v) {
    return mm(v.ensemble.summary.maxExcursion.median) + " / " + mm(v.ensemble.summary.maxExcursion.max);
  });
  addRow(t, variants, "fastest surface speed, median / max", [](const VariantReview& v) {
    return number(v.ensemble.summary.maxSurfaceSpeed.median, 3) + " / " + number(v.ensemble.summary.maxSurfaceSpeed.max, 3) + " m/s";
  });
  addRow(t, variants, "reach the edge / centre over the edge", [](const VariantReview& v) {
    return percent(v.ensemble.summary.table.reachesEdgeShare) + " / " + percent(v.ensemble.summary.table.leavesShare);
  });
  std::string out = "<section id=\"ensemble\"><h2>Visitor launches</h2><p>Launches drawn from each variant's "
                    "launch spread (seed per launch), each run until it rests or the run ends.</p>" + t.html() +
                    "<div class=\"variants\">";
  for (const VariantReview& v : variants)
    out += "<div class=\"variant\"><h3>" + escape(v.scenario.name) + "</h3>" + settleHistogram(v.ensemble.summary) +
           spotsOverTime(v.ensemble.summary) + timeRanges(v.ensemble.summary) + holdCurve(v) + "</div>";
  return out + "</div></section>";
}

std::string observerSection(const std::vector<VariantReview>& variants) {
  std::string out = "<section id=\"observer\"><h2>What visitors see</h2><p>The observer camera on the nominal launch "
                    "(exposure over the observer window), from above and from the scenario's visitor eye.</p>"
                    "<div class=\"variants\">";
  for (const VariantReview& v : variants) {
    const std::string at = " at " + seconds(v.top.start) + " for " + seconds(v.scenario.observer.exposure);
    out += "<div class=\"variant\"><h3>" + escape(v.scenario.name) + "</h3><figure>" +
           image(v.top.exposure.image, v.scenario.name + ": top view") + "<figcaption>top view" + at + ": " +
           std::to_string(v.top.spots.spots.size()) + " spots found</figcaption></figure><figure>" +
           image(v.visitor.exposure.image, v.scenario.name + ": visitor view") + "<figcaption>visitor's eye " +
           mm(v.scenario.observer.eyeHeight) + " above the table, " + mm(v.scenario.observer.eyeDistance) + " away" +
           at + ": " + std::to_string(v.visitor.spots.spots.size()) + " spots found</figcaption></figure></div>";
  }
  return out + "</div></section>";
}

// Widest the viewing check's images are shown, px: they are sized to
// resolve the markings, often larger than a page column.
constexpr int shownViewerWidth = 320;

std::string viewingSection(const std::vector<VariantReview>& variants) {
  std::string out = "<section id=\"viewing\"><h2>Viewing check</h2><p>Spot contrast from each viewing position "
                    "(eye heights above the floor, from memory: check them for the venue's visitors) against the "
                    "detection threshold, a Weber contrast of about 2 % (Blackwell, JOSA 36, 624, 1946, from "
                    "memory). The contrast is what the markings make: the spot against the same place with the "
                    "markings' mean tint, so the edge of the spinning body is not taken for a spot. Each image is "
                    "sized so a pixel at the ring is no wider than the eye resolves there (one minute of arc) or a "
                    "tenth of the smallest marking, whichever is wider.</p><div class=\"variants\">";
  for (const VariantReview& v : variants) {
    out += "<div class=\"variant\"><h3>" + escape(v.scenario.name) + "</h3>";
    for (const ViewingResult& r : v.viewing) {
      const std::string text = r.viewer.name + ": eye " + mm(r.viewer.eyeHeight) + " above the floor, " +
                               mm(r.eyeAboveTable) + " above the table, " + mm(r.distance) + " away (" +
                               number(r.elevation / k::degree, 3) + " deg); " + std::to_string(r.spots) +
                               " spots, strongest contrast " + number(r.contrast, 3) + " against " +
                               number(r.threshold, 3) + "; " + number(r.footprint * 1e3, 3) + " mm a pixel" +
                               (r.resolved ? std::string()
                                           : std::string(" (coarser than the markings ask: the image size limit was "
                                                         "reached and the contrast reads low)"));
      out += "<figure>" + (r.image.width > 0 ? image(r.image, v.scenario.name + ": " + r.viewer.name, shownViewerWidth) : "") +
             "<figcaption>" + escape(text) + " " + flag(!r.seen) + "</figcaption></figure>";
    }
    out += "</div>";
  }
  return out + "</div></section>";
}

std::string lightingSection(const std::vector<VariantReview>& variants) {
  Table t = variantTable(variants, "lighting");
  addRow(t, variants, "room light modulation", [](const VariantReview& v) {
    const LightingCheck& c = v.lighting;
    return c.flicker.waveform == Waveform::None ? std::string("none") : number(c.modulationPercent, 3) + " % at " + number(c.flicker.frequency) + " Hz";
  });
  addRow(t, variants, "IEEE Std 1789-2015 low-risk limit (from memory)", [](const VariantReview& v) {
    const LightingCheck& c = v.lighting;
    return (std::isfinite(c.lowRiskLimitPercent) ? number(c.lowRiskLimitPercent, 3) + " %" : std::string("no limit")) + " " + flag(!c.lowRisk);
  });
  addRow(t, variants, "stroboscopic visibility SVM (CIE TN 006:2016, from memory; 1 = threshold)", [](const VariantReview& v) {
    return number(v.lighting.svm, 3) + " " + flag(v.lighting.svmVisible);
  });
  addRow(t, variants, "beat of the stops with the light", [](const VariantReview& v) {
    if (!v.lighting.beat) return std::string("no modulated light or no stops");
    const StopBeat& b = *v.lighting.beat;
    return escape("a spot is visited " + number(b.visitRate, 3) + " times a second (" + number(b.stopRate, 3) +
                  " stops/s over " + std::to_string(b.spots) + " spots, dwell " + number(b.dwell * 1e3, 3) +
                  " ms); the " + number(b.lightFrequency) + " Hz light beats at " + number(b.beatFrequency, 3) +
                  " Hz with " + percent(b.modulation) + " brightness change ") + flag(b.visible);
  });
  addRow(t, variants, "flashes per second (WCAG 2.x SC 2.3.1: at most 3)", [](const VariantReview& v) {
    return number(v.lighting.flashRate, 3) + " " + flag(v.lighting.flashWarning);
  });
  return "<section id=\"lighting\"><h2>Lighting check</h2>" + t.html() + "</section>";
}

std::string lengthText(const LengthAdvice& a) {
  if (!a.found) return std::to_string(a.spots) + " spots: no length (" + a.reason + ")";
  return std::to_string(a.spots) + " spots: length " + mm(a.length) + ", worst drift " +
         number(a.worst.driftDegPerSecond, 3) + " deg/s";
}

std::string adviceSection(const std::vector<VariantReview>& variants) {
  Table t = variantTable(variants, "dimension advisor");
  addRow(t, variants, "asked", [](const VariantReview& v) {
    return escape(std::to_string(v.adviceSpots) + " spots over " + revS(v.adviceFrom) + " to " + revS(v.adviceTo) +
                  " (the body is " + mm(v.scenario.body.length) + " long)");
  });
  addRow(t, variants, "recommended", [](const VariantReview& v) { return escape(lengthText(v.advice.best)); });
  addRow(t, variants, "one spot fewer", [](const VariantReview& v) { return escape(lengthText(v.advice.fewer)); });
  addRow(t, variants, "one spot more", [](const VariantReview& v) { return escape(lengthText(v.advice.more)); });
  return "<section id=\"advice\"><h2>Dimension suggestion</h2><p>The length that keeps the pattern stillest over "
         "the precessions the spin passes through as it slows.</p>" + t.html() + "</section>";
}

std::string cautionsSection(const std::vector<VariantReview>& variants) {
  std::string out = "<section id=\"cautions\"><h2>Cautions</h2><div class=\"variants\">";
  for (const VariantReview& v : variants) {
    out += "<div class=\"variant\"><h3>" + escape(v.scenario.name) + "</h3><ul>";
    for (const Caution& c : v.cautions)
      out += "<li><strong>" + escape(c.topic) + "</strong> " + flag(c.warning) + "<br>" + escape(c.text) + "</li>";
    out += "</ul></div>";
  }
  return out + "</div><p class=\"authority\">" + escape(safetyAuthority) + "</p></section>";
}

const char* style =
    "body{font-family:sans-serif;margin:1.5em;color:#222}h1{font-size:1.6em}h2{border-bottom:1px solid #999;"
    "margin-top:1.6em}table{border-collapse:collapse;margin:0.6em 0}th,td{border:1px solid #bbb;padding:0.2em 0.5em;"
    "text-align:left;vertical-align:top;font-size:0.9em}thead th{background:#eee}.variants{display:grid;"
    "grid-template-columns:repeat(auto-fit,minmax(380px,1fr));gap:1em}.variant{border:1px solid #ddd;padding:0.5em}"
    "figure{margin:0.5em 0}figcaption{font-size:0.85em}.warn{color:#fff;background:#b22;padding:0 0.3em}"
    ".ok{color:#fff;background:#383;padding:0 0.3em}.authority{font-weight:bold}nav a{margin-right:1em}";

}  // namespace

std::string reviewHtml(const std::vector<VariantReview>& variants) {
  std::string names;
  for (const VariantReview& v : variants) names += (names.empty() ? "" : ", ") + v.scenario.name;
  std::string out = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>Design review: " +
                    escape(names) + "</title>\n<style>" + style + "</style>\n</head>\n<body>\n<h1>Design review: " +
                    escape(names) + "</h1>\n<nav><a href=\"#parameters\">variants</a><a href=\"#steady\">steady "
                    "spin</a><a href=\"#ensemble\">visitor launches</a><a href=\"#observer\">what visitors see</a>"
                    "<a href=\"#viewing\">viewing</a><a href=\"#lighting\">lighting</a><a href=\"#advice\">dimensions"
                    "</a><a href=\"#cautions\">cautions</a></nav>\n";
  for (const std::string& section : {parametersSection(variants), steadySection(variants), ensembleSection(variants),
                                     observerSection(variants), viewingSection(variants), lightingSection(variants),
                                     adviceSection(variants), cautionsSection(variants)})
    out += section + "\n";
  return out + "<footer><p>dwellmark " DWELLMARK_VERSION "</p></footer>\n</body>\n</html>\n";
}

}  // namespace dm::app
