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
  if (!p.end_kind.empty()) j["end_kind"] = p.end_kind;
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
