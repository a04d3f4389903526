#include "report/html_compare.hpp"

#include "report/compare_report.hpp"
#include "report/html_page.hpp"
#include "report/mission_report.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using html::number_cell;
using html::text_cell;

const char* kBar = "#0b6e8a";
const char* kCharge = "#c46a00";
const char* kNoGo = "#b23a48";

std::string signed_fixed(double v, int digits) {
  std::string s = fixed(v, digits);
  if (v > 0 && s.find_first_not_of("0.") != std::string::npos) s = "+" + s;
  return s;
}

/// A solved spare figure (not a capped bound, not a mission that no length mends).
bool has_spare(const sim::CompareRow& row) {
  return row.spare.phase && !row.result.refused && row.spare.bounded && !row.spare.capped;
}

/// How a flight ended early, in words.
std::string end_words(const std::optional<sim::EndKind>& kind) {
  if (!kind) return "";
  switch (*kind) {
    case sim::EndKind::cutoff_voltage: return "cells at cutoff";
    case sim::EndKind::saturation: return "out of thrust";
    case sim::EndKind::power_collapse: return "power collapse";
    case sim::EndKind::soc_floor: return "pack empty";
    case sim::EndKind::coverage_floor:
    case sim::EndKind::refused: break;
  }
  return sim::to_string(*kind);
}

/// Why a row is no-go, in a few words for its bar.
std::string no_go_words(const sim::CompareRow& row) {
  const auto& r = row.result;
  if (r.go) return "";
  if (r.refused) return "NO-GO: cannot fly";
  if (!r.completed) return "NO-GO: ends early, " + end_words(r.end_kind);
  std::string s;
  for (const auto& rule : r.rules)
    if (!rule.pass) s += (s.empty() ? "" : ", ") + rule_words(rule.name);
  return "NO-GO: " + s;
}

}  // namespace

std::string compare_html(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                         const sim::RankOptions& rank_opts) {
  html::Page page("Packs compared: " + base.name,
                  "sortie compare · " + std::to_string(rows.size()) + " packs on one mission, " + rank_words(rank_opts));
  std::size_t go = 0;
  for (const auto& row : rows) go += row.result.go ? 1 : 0;
  const bool any_go = go > 0;
  std::string line;
  if (rows.empty()) line = "NO-GO: no pack to compare";
  else if (any_go)
    line = "GO with " + std::to_string(go) + " of " + std::to_string(rows.size()) + " packs: the best is " +
           rows.front().candidate.label +
           (has_spare(rows.front()) ? ", " + signed_fixed(rows.front().spare.spare_s, 0) + " s to spare" : "");
  else
    line = "NO-GO: none of the " + std::to_string(rows.size()) + " packs flies this mission with its reserves";
  page.add(html::verdict_banner(any_go, line, ""));

  std::string where;
  if (!rows.empty() && rows.front().spare.phase)
    where = "Spare time is the time that could be added to phase " +
            phase_name(base, static_cast<int>(*rows.front().spare.phase)) +
            " with every reserve rule still met; a negative figure is the time to cut. ";

  svg::BarPlot spare;
  spare.id = "compare-spare";
  spare.title = "Spare time with each pack";
  spare.value = {"spare time", "s", {}, {}};
  spare.color = kBar;
  spare.flag_color = kNoGo;
  svg::BarPlot soc;
  soc.id = "compare-landing-soc";
  soc.title = "State of charge at landing with each pack";
  soc.value = {"state of charge at landing", "%", 0.0, {}};
  soc.color = kCharge;
  soc.flag_color = kNoGo;
  if (base.reserve.soc_min)
    soc.levels.push_back({*base.reserve.soc_min * 100, "reserve " + fixed(*base.reserve.soc_min * 100, 0) + " %", kNoGo});
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const auto& row = rows[i];
    const auto& r = row.result;
    const std::string label = std::to_string(i + 1) + ". " + row.candidate.label;
    // The bar carries a short flag; the ranking table below gives every reason in full.
    svg::Bar b{label, {}, "", !r.go, r.go ? "" : "NO-GO"};
    if (has_spare(row)) {
      b.value = row.spare.spare_s;
      b.value_text = signed_fixed(row.spare.spare_s, 0) + " s";
    }
    spare.bars.push_back(b);
    svg::Bar c{label, {}, "", !r.go, r.go ? "" : "NO-GO"};
    if (!r.refused) {
      c.value = r.landing.soc * 100;
      c.value_text = fixed(r.landing.soc * 100, 1) + " %";
    }
    soc.bars.push_back(c);
  }
  std::string plots = html::figure("Spare time", svg::render(spare),
                                   where + "Hatched bars are no-go packs; the ranking below says why each fails.");
  plots += html::figure("State of charge at landing", svg::render(soc),
                        "A pack whose flight ends early shows the charge where it ended.");
  page.section("Packs side by side", plots);

  html::Table t({"rank", "pack", "verdict", "spare s", "flight time s", "landing SoC %", "pack kg", "all-up kg",
                 "Pareto front", "max C‑rate", "duty mean %", "ESC η mean %", "limit"});
  int rank = 0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const auto& row = rows[i];
    const auto& r = row.result;
    const std::string k = "rows." + std::to_string(i) + ".";
    auto or_dash = [&](bool ok, const std::string& text, const std::string& key) {
      return ok ? number_cell(text, k + key) : number_cell("-");
    };
    std::string limit = no_go_words(row);
    if (!r.go && !r.refused) limit = "NO-GO: " + failure_reasons(base, r);
    if (limit.empty() && !row.meets) limit = "short of the requirement: " + row.short_of;
    if (limit.empty() && !row.spare.binding_rule.empty()) limit = "then " + rule_words(row.spare.binding_rule) + " binds";
    t.add_row({row.meets ? number_cell(std::to_string(++rank), k + "rank") : number_cell("-"), text_cell(row.candidate.label),
               html::html_cell(r.go ? "go" : "NO-GO", false, r.go ? "pass" : "fail"),
               or_dash(has_spare(row), signed_fixed(row.spare.spare_s, 0) + " s", "spare_s"),
               number_cell(fixed(r.flight_time_s, 0) + " s", k + "flight_time_s"),
               or_dash(!r.refused, fixed(r.landing.soc * 100, 1) + " %", "landing_soc"),
               number_cell(fixed(r.pack_mass_kg, 3) + " kg", k + "pack_mass_kg"),
               number_cell(fixed(r.all_up_mass_kg, 3) + " kg", k + "all_up_mass_kg"),
               text_cell(row.pareto ? "yes" : ""),
               or_dash(!r.refused, fixed(r.c_rate_max, 2) + " C", "c_rate_max"),
               or_dash(!r.refused, fixed(r.duty_mean * 100, 1) + " %", "duty_mean"),
               or_dash(!r.refused, fixed(r.eta_esc_mean * 100, 1) + " %", "eta_esc_mean"), text_cell(limit)},
              r.go ? "" : "fail");
  }
  page.section("Ranking", t.render());
  return page.render();
}

}  // namespace sortie::report
