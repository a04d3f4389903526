#include "report/what_if_report.hpp"

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "core/text.hpp"
#include "report/html_page.hpp"
#include "report/result_csv.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

const char* kSafety =
    "An estimate from the models and the stated inputs, not a certification: lithium packs can burn; "
    "keep to the manufacturer's limits and the local aviation rules.";

std::string unit_of(const std::string& name) {
  const auto* p = sim::find_what_if(name);
  return p ? p->range.unit : "";
}

std::string axis_label(const sim::SweepAxis& a) {
  const std::string u = unit_of(a.name);
  return a.name + (u.empty() ? "" : " (" + u + ")");
}

std::string spare_text(const sim::PointResult& p) {
  if (p.refused) return "refused";
  if (p.spare_s) return fixed(*p.spare_s, 0);
  return p.spare_capped ? "capped" : "none";
}

nlohmann::json point_json(const sim::SweepResult& s, const sim::PointResult& p) {
  nlohmann::json j;
  for (std::size_t k = 0; k < s.axes.size(); ++k) j[s.axes[k].name] = p.x[k];
  j["refused"] = p.refused;
  j["go"] = p.go;
  j["completed"] = p.completed;
  if (p.end_kind) j["end_kind"] = sim::to_string(*p.end_kind);
  if (p.refused) j["end_detail"] = p.end_detail;
  j["flight_time_s"] = p.flight_time_s;
  j["landing_soc"] = p.landing_soc;
  j["spare_s"] = p.spare_s ? nlohmann::json(*p.spare_s) : nlohmann::json(nullptr);
  j["spare_capped"] = p.spare_capped;
  j["limiting_rule"] = p.limiting_rule;
  j["failing_rules"] = p.failing;
  return j;
}

}  // namespace

std::string overrides_text(const std::vector<sim::Override>& o) {
  if (o.empty()) return "";
  std::string out = "Overrides in effect (in place of the profile's values):\n";
  for (const auto& v : o)
    out += "  --" + v.name + " " + printable(v.value) + "  (replaces " + v.json_field + ")" +
           (v.note.empty() ? "" : "; " + v.note) + "\n";
  return out;
}

nlohmann::json overrides_json(const std::vector<sim::Override>& o) {
  nlohmann::json j = nlohmann::json::array();
  for (const auto& v : o) j.push_back({{"name", v.name}, {"value", v.value}, {"replaces", v.json_field}, {"note", v.note}});
  return j;
}

std::string overrides_html(const std::vector<sim::Override>& o) {
  if (o.empty()) return "";
  html::Table t({"option", "value", "replaces", "note"});
  for (const auto& v : o)
    t.add_row({html::text_cell("--" + v.name), html::text_cell(v.value), html::text_cell(v.json_field),
               html::text_cell(v.note)});
  return t.render();
}

std::string sweep_text(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o) {
  std::string out = "sortie fly --sweep: " + printable(m.name) + "\n\n";
  out += overrides_text(o);
  if (!o.empty()) out += "\n";
  std::vector<std::string> head;
  for (const auto& a : s.axes) head.push_back(axis_label(a));
  for (const char* h : {"verdict", "flight s", "landing SoC %", "spare s", "limiting rule"}) head.push_back(h);
  TextTable t(head);
  std::size_t nogo = 0;
  for (const auto& p : s.points) {
    std::vector<std::string> row;
    for (const double x : p.x) row.push_back(format_number(x));
    row.push_back(p.refused ? "refused" : p.go ? "go" : "NO-GO");
    row.push_back(p.refused ? "-" : fixed(p.flight_time_s, 0));
    row.push_back(p.refused ? "-" : fixed(p.landing_soc * 100, 1));
    row.push_back(spare_text(p));
    row.push_back(p.limiting_rule);
    t.add_row(row);
    if (!p.go) ++nogo;
  }
  out += t.render();
  out += "\n  " + std::to_string(s.points.size()) + " points, " + std::to_string(nogo) +
         " no-go. Each point is one flight with every other input as the profile gives it; spare is the time "
         "the spare phase could be lengthened with every rule met.\n  " + std::string(kSafety) + "\n";
  return out;
}

nlohmann::json sweep_json(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o) {
  nlohmann::json j;
  j["schema"] = kSweepSchema;
  j["mission"] = m.name;
  j["overrides"] = overrides_json(o);
  j["axes"] = nlohmann::json::array();
  for (const auto& a : s.axes)
    j["axes"].push_back({{"name", a.name}, {"unit", unit_of(a.name)}, {"from", a.from}, {"to", a.to}, {"step", a.step},
                         {"points", a.values.size()}});
  j["points"] = nlohmann::json::array();
  for (const auto& p : s.points) j["points"].push_back(point_json(s, p));
  j["caution"] = kSafety;
  return j;
}

std::string sweep_csv(const sim::SweepResult& s) {
  std::string out;
  for (const auto& a : s.axes) out += csv_field(a.name) + ",";
  out += "refused,go,completed,flight_time_s,landing_soc,spare_s,limiting_rule,failing_rules\n";
  for (const auto& p : s.points) {
    for (const double x : p.x) out += csv_number(x) + ",";
    std::string failing;
    for (const auto& f : p.failing) failing += (failing.empty() ? "" : " ") + f;
    out += std::string(p.refused ? "true" : "false") + "," + (p.go ? "true" : "false") + "," +
           (p.completed ? "true" : "false") + "," + (p.refused ? "" : csv_number(p.flight_time_s)) + "," +
           (p.refused ? "" : csv_number(p.landing_soc)) + "," + (p.spare_s ? csv_number(*p.spare_s) : "") + "," +
           csv_field(p.limiting_rule) + "," + csv_field(failing) + "\n";
  }
  return out;
}

std::string sweep_html(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o) {
  std::size_t nogo = 0;
  for (const auto& p : s.points) nogo += p.go ? 0 : 1;
  std::string sub = "sortie fly --sweep · " + m.pack.layout() + " pack · " + std::to_string(s.points.size()) + " points";
  html::Page page("Sweep: " + m.name, sub);
  page.add(html::verdict_banner(nogo == 0,
                                std::string(nogo == 0 ? "GO" : "NO-GO") + ": " + std::to_string(nogo) + " of " +
                                    std::to_string(s.points.size()) + " points fail a rule",
                                ""));
  if (!o.empty()) page.section("Overrides in effect", overrides_html(o));
  if (s.axes.size() == 1) {
    const auto& a = s.axes[0];
    svg::LinePlot plot;
    plot.id = "sweep";
    plot.title = "spare time and landing charge against " + a.name;
    plot.x.quantity = a.name;
    plot.x.unit = unit_of(a.name);
    plot.y.quantity = "spare time";
    plot.y.unit = "s";
    plot.y2 = svg::Axis{"landing charge", "%", 0.0, 100.0};
    svg::Line spare{"spare time", {}, {}, "#0b6e8a"};
    svg::Line soc{"landing charge", {}, {}, "#7a4f9a", svg::Side::right, svg::Stroke::dashed};
    spare.markers = soc.markers = true;
    for (const auto& p : s.points) {
      spare.x.push_back(p.x[0]);
      spare.y.push_back(p.spare_s ? *p.spare_s : std::nan(""));
      soc.x.push_back(p.x[0]);
      soc.y.push_back(p.refused ? std::nan("") : p.landing_soc * 100);
    }
    plot.lines = {spare, soc};
    plot.levels.push_back({0.0, "no spare", "#b23a48"});
    // Shade each run of no-go points, half a step either side.
    for (std::size_t i = 0; i < s.points.size();) {
      if (s.points[i].go) { ++i; continue; }
      std::size_t k = i;
      while (k + 1 < s.points.size() && !s.points[k + 1].go) ++k;
      const double h = a.values.size() > 1 ? a.step / 2 : 0.5;
      plot.bands.push_back({std::max(a.from, a.values[i] - h), std::min(a.to, a.values[k] + h), "no-go"});
      i = k + 1;
    }
    page.add(html::figure("Spare time and landing charge against " + a.name, svg::render(plot),
                          "Shaded: points where a rule fails (no-go). A gap in the spare line: no spare figure "
                          "(refused, capped, or the mission fails even without the spare phase)."));
  } else {
    // A grid: rows the first axis, columns the second; each cell the spare time, red when no-go.
    const auto& a = s.axes[0];
    const auto& b = s.axes[1];
    std::vector<std::string> head{a.name + " \\ " + b.name};
    for (const double v : b.values) head.push_back(format_number(v));
    html::Table t(head);
    for (std::size_t i = 0; i < a.values.size(); ++i) {
      std::vector<html::Cell> row{html::text_cell(format_number(a.values[i]))};
      for (std::size_t k = 0; k < b.values.size(); ++k) {
        const std::size_t idx = i * b.values.size() + k;
        const auto& p = s.points[idx];
        row.push_back(html::html_cell(
            p.spare_s ? html::keyed("points." + std::to_string(idx) + ".spare_s", fixed(*p.spare_s, 0))
                      : html::esc(spare_text(p)),
            true, p.go ? "pass" : "fail"));
      }
      t.add_row(row);
    }
    page.section("Spare time, s (red: no-go)", t.render());
  }
  html::Table pts({"point", "verdict", "flight s", "landing SoC %", "spare s", "limiting rule"});
  for (std::size_t i = 0; i < s.points.size(); ++i) {
    const auto& p = s.points[i];
    std::string at;
    for (std::size_t k = 0; k < s.axes.size(); ++k)
      at += (k ? ", " : "") + s.axes[k].name + " " + format_number(p.x[k]);
    const std::string key = "points." + std::to_string(i) + ".";
    pts.add_row({html::text_cell(at), html::text_cell(p.refused ? "refused" : p.go ? "go" : "NO-GO"),
                 p.refused ? html::text_cell("-") : html::number_cell(fixed(p.flight_time_s, 0), key + "flight_time_s"),
                 p.refused ? html::text_cell("-")
                           : html::number_cell(fixed(p.landing_soc * 100, 1), key + "landing_soc", "%"),
                 p.spare_s ? html::number_cell(fixed(*p.spare_s, 0), key + "spare_s") : html::text_cell(spare_text(p)),
                 html::text_cell(p.limiting_rule)},
                p.go ? "" : "fail");
  }
  page.section("Points", pts.render());
  return page.render();
}

}  // namespace sortie::report

namespace sortie::report {

namespace {

std::string probability_line(const sim::SampleRun& s) {
  const std::size_t n = s.points.size();
  return "P(every reserve rule and limit met) = " + fixed(s.p_go * 100, 1) + " % (" + std::to_string(s.n_go) + " of " +
         std::to_string(n) + " samples; standard error " + fixed(s.p_go_se * 100, 1) + " %, 95 % Wilson interval " +
         fixed(s.wilson_lo * 100, 1) + "–" + fixed(s.wilson_hi * 100, 1) +
         " %; a sample the plan cannot fly at all counts as failing, as \"refused\"). This is a probability from "
         "the stated spreads, not a guarantee: inputs outside them, and the models' own errors, are not in it.";
}

nlohmann::json pct_json(const sim::Percentiles& p) {
  auto num = [](double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr); };
  return {{"n", p.n}, {"p5", num(p.p5)}, {"p50", num(p.p50)}, {"p95", num(p.p95)}};
}

nlohmann::json spreads_json(const sim::Spreads& s) {
  return {{"cell_capacity_sd", s.cell_capacity_sd},     {"cell_resistance_sd", s.cell_resistance_sd},
          {"soh_capacity_sd", s.soh_capacity_sd},       {"soh_resistance_sd", s.soh_resistance_sd},
          {"wind_speed_sd_mps", s.wind_speed_sd_mps},   {"wind_from_sd_deg", s.wind_from_sd_deg},
          {"gust_max_mps", s.gust_max_mps},             {"gust_power_W_per_mps2", s.gust_power_W_per_mps2},
          {"temperature_sd_C", s.temperature_sd_C},     {"payload_sd_kg", s.payload_sd_kg}};
}

std::string pct_row(const sim::Percentiles& p, double scale, int digits) {
  if (p.n == 0) return "-";
  return fixed(p.p5 * scale, digits) + " / " + fixed(p.p50 * scale, digits) + " / " + fixed(p.p95 * scale, digits);
}

}  // namespace

std::string samples_text(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o) {
  std::string out = "sortie fly --samples: " + printable(m.name) + "\n\n";
  out += overrides_text(o);
  if (!o.empty()) out += "\n";
  out += "  " + probability_line(s) + "\n\n";
  TextTable t({"quantity", "5th / 50th / 95th percentile", "samples"});
  t.add_row({"flight time s", pct_row(s.flight_time_s, 1, 0), std::to_string(s.flight_time_s.n)});
  t.add_row({"landing SoC %", pct_row(s.landing_soc, 100, 1), std::to_string(s.landing_soc.n)});
  t.add_row({"spare time s", pct_row(s.spare_s, 1, 0), std::to_string(s.spare_s.n)});
  out += t.render();
  out += "\n  Rule failing most: " + (s.most_failing.empty() ? std::string("none (every sample met every rule)")
                                                            : s.most_failing + " (in " +
                                                                  std::to_string(s.failures.at(s.most_failing)) +
                                                                  " samples)") + "\n";
  out += "  Seed " + std::to_string(s.seed) + "; percentiles by Hyndman-Fan definition 7; spare time over the samples "
         "that have one.\n";
  if (s.clamped > 0)
    out += "  " + std::to_string(s.clamped) + " samples had a draw outside its field's range, held at the range's end.\n";
  out += "  " + std::string(kSafety) + "\n";
  return out;
}

nlohmann::json samples_json(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o) {
  nlohmann::json j;
  j["schema"] = kSamplesSchema;
  j["mission"] = m.name;
  j["overrides"] = overrides_json(o);
  j["spreads"] = spreads_json(s.spreads);
  j["seed"] = s.seed;
  j["samples"] = s.points.size();
  j["go"] = s.n_go;
  j["p_go"] = s.p_go;
  j["p_go_se"] = s.p_go_se;
  j["p_go_wilson95"] = {s.wilson_lo, s.wilson_hi};
  j["p_go_meaning"] = "a probability from the stated spreads, not a guarantee";
  j["flight_time_s"] = pct_json(s.flight_time_s);
  j["landing_soc"] = pct_json(s.landing_soc);
  j["spare_s"] = pct_json(s.spare_s);
  j["failures"] = s.failures;
  j["most_failing_rule"] = s.most_failing;
  j["clamped_samples"] = s.clamped;
  j["caution"] = kSafety;
  return j;
}

std::string samples_csv(const sim::SampleRun& s) {
  std::string out =
      "sample,soh_capacity,soh_resistance,wind_mps,wind_from_deg,gust_mps,gust_W,air_C,pack_C,payload_kg,clamped,"
      "refused,go,flight_time_s,landing_soc,spare_s,limiting_rule\n";
  for (std::size_t i = 0; i < s.points.size(); ++i) {
    const auto& d = s.draws[i];
    const auto& p = s.points[i];
    std::string cl;
    for (const auto& c : d.clamped) cl += (cl.empty() ? "" : " ") + c;
    out += std::to_string(i) + "," + csv_number(d.soh_capacity) + "," + csv_number(d.soh_resistance) + "," +
           csv_number(d.wind_mps) + "," + csv_number(d.wind_from_deg) + "," + csv_number(d.gust_mps) + "," +
           csv_number(d.gust_W) + "," + csv_number(d.air_C) + "," + csv_number(d.pack_C) + "," +
           csv_number(d.payload_kg) + "," + csv_field(cl) + "," + (p.refused ? "true" : "false") + "," +
           (p.go ? "true" : "false") + "," + (p.refused ? "" : csv_number(p.flight_time_s)) + "," +
           (p.refused ? "" : csv_number(p.landing_soc)) + "," + (p.spare_s ? csv_number(*p.spare_s) : "") + "," +
           csv_field(p.limiting_rule) + "\n";
  }
  return out;
}

std::string samples_html(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o) {
  html::Page page("Samples: " + m.name,
                  "sortie fly --samples · " + m.pack.layout() + " pack · " + std::to_string(s.points.size()) +
                      " samples · seed " + std::to_string(s.seed));
  page.add(html::verdict_banner(s.n_go == s.points.size(), probability_line(s), ""));
  if (!o.empty()) page.section("Overrides in effect", overrides_html(o));
  html::Table t({"quantity", "5th percentile", "median", "95th percentile", "samples"});
  auto row = [&](const std::string& name, const std::string& key, const sim::Percentiles& p, double scale, int dig,
                 const std::string& unit) {
    if (p.n == 0) {
      t.add_row({html::text_cell(name), html::text_cell("-"), html::text_cell("-"), html::text_cell("-"),
                 html::number_cell("0")});
      return;
    }
    t.add_row({html::text_cell(name), html::number_cell(fixed(p.p5 * scale, dig), key + ".p5", unit),
               html::number_cell(fixed(p.p50 * scale, dig), key + ".p50", unit),
               html::number_cell(fixed(p.p95 * scale, dig), key + ".p95", unit),
               html::number_cell(std::to_string(p.n), key + ".n")});
  };
  row("flight time, s", "flight_time_s", s.flight_time_s, 1, 0, "");
  row("landing charge, %", "landing_soc", s.landing_soc, 100, 1, "%");
  row("spare time, s", "spare_s", s.spare_s, 1, 0, "");
  page.section("Percentiles", t.render() + "<p>Rule failing most: " +
                                  html::esc(s.most_failing.empty() ? "none" : s.most_failing) + "</p>");
  std::vector<double> spare;
  for (const auto& p : s.points)
    if (p.spare_s) spare.push_back(*p.spare_s);
  std::sort(spare.begin(), spare.end());
  if (spare.size() >= 2) {
    // Histogram: 20 equal bins over the range, drawn as a step line of counts.
    const double lo = spare.front(), hi = spare.back() > lo ? spare.back() : lo + 1.0;
    const int bins = 20;
    std::vector<double> count(bins, 0.0);
    for (const double v : spare) count[std::min(bins - 1, static_cast<int>((v - lo) / (hi - lo) * bins))] += 1;
    svg::LinePlot h;
    h.id = "spare_histogram";
    h.title = "histogram of spare time";
    h.x.quantity = "spare time";
    h.x.unit = "s";
    h.y.quantity = "samples";
    h.y.min = 0.0;
    svg::Line l{"samples per bin", {}, {}, "#0b6e8a"};
    for (int b = 0; b < bins; ++b) {
      const double x0 = lo + (hi - lo) * b / bins, x1 = lo + (hi - lo) * (b + 1) / bins;
      l.x.insert(l.x.end(), {x0, x0, x1, x1});
      l.y.insert(l.y.end(), {0.0, count[b], count[b], 0.0});
    }
    h.lines = {l};
    h.levels.push_back({0.0, "", "#b23a48"});
    if (lo < 0) h.bands.push_back({lo, std::min(0.0, hi), "no-go"});
    page.add(html::figure("Spare time over the samples", svg::render(h),
                          "Counts in 20 equal bins from the least to the most spare time. Shaded: negative spare "
                          "(a rule fails)."));
    svg::LinePlot c;
    c.id = "spare_cumulative";
    c.title = "cumulative share of samples by spare time";
    c.x.quantity = "spare time";
    c.x.unit = "s";
    c.y.quantity = "share of samples at or below";
    c.y.unit = "%";
    c.y.min = 0.0;
    c.y.max = 100.0;
    svg::Line cl{"cumulative", {}, {}, "#7a4f9a"};
    for (std::size_t i = 0; i < spare.size(); ++i) {
      cl.x.push_back(spare[i]);
      cl.y.push_back(100.0 * static_cast<double>(i + 1) / static_cast<double>(spare.size()));
    }
    c.lines = {cl};
    if (lo < 0) c.bands.push_back({lo, std::min(0.0, hi), "no-go"});
    page.add(html::figure("Cumulative share of samples by spare time", svg::render(c),
                          "The height at a spare time is the share of samples with at most that much. " +
                              probability_line(s)));
  }
  return page.render();
}

}  // namespace sortie::report
