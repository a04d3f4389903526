#include "report/compare_report.hpp"

#include "core/text.hpp"

#include "report/mission_report.hpp"
#include "report/model_range_report.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

/// What limits or sinks a row, in a few words.
std::string limit_words(const sim::Mission& base, const sim::CompareRow& row) {
  const auto& r = row.result;
  if (r.refused) return "cannot fly: " + r.end_detail;
  if (!r.go) return "fails: " + failure_reasons(base, r);
  if (!row.meets) return "short of the requirement: " + row.short_of;
  return row.spare.binding_rule.empty() ? "" : "then " + rule_words(row.spare.binding_rule) + " binds";
}

/// limit_words, and the excursions beyond the model's range when there are any.
std::string limit_cell(const sim::Mission& base, const sim::CompareRow& row) {
  std::string s = limit_words(base, row);
  for (const auto& e : row.result.excursions) s += (s.empty() ? "" : "; ") + std::string("outside data: ") + sim::brief(e);
  return s;
}

std::string spare_cell(const sim::CompareRow& row) {
  if (row.result.refused || !row.spare.phase || !row.spare.bounded) return "-";
  if (row.spare.capped) return "> " + fixed(row.spare.spare_s, 0);
  std::string s = fixed(row.spare.spare_s, 0);
  if (row.spare.spare_s > 0) s = "+" + s;
  return s;
}

std::string per_kg_cell(const sim::CompareRow& row) {
  if (!row.result.go || !row.spare.phase || !row.spare.bounded || row.spare.capped) return "-";
  return fixed(sim::counted_spare_s(row) / row.result.pack_mass_kg, 0);
}

}  // namespace

std::string rank_words(const sim::RankOptions& rank) {
  std::string need;
  if (rank.need_spare_s) need = "a spare of at least " + fixed(*rank.need_spare_s, 0) + " s";
  if (rank.need_landing_soc)
    need += (need.empty() ? "" : " and ") + std::string("a landing SoC of at least ") + fixed(100 * *rank.need_landing_soc, 1) + " %";
  std::string by;
  switch (rank.by) {
    case sim::RankBy::spare: by = "ranked by spare time, longest first"; break;
    case sim::RankBy::lightest: by = "ranked by pack mass, lightest first"; break;
    case sim::RankBy::spare_per_kg: by = "ranked by spare time per kg of pack, most first"; break;
  }
  return by + (need.empty() ? "" : ", among the go packs that meet " + need);
}

std::string compare_text(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                         const sim::RankOptions& rank_opts) {
  std::string out = "sortie compare: " + printable(base.name) + "\n" + rank_words(rank_opts) +
                    " (front: on the Pareto front of spare time against pack mass among go packs)\n";
  if (!rows.empty() && rows.front().spare.phase)
    out += "spare time is on phase " + phase_name(base, static_cast<int>(*rows.front().spare.phase)) + "\n";
  out += "\n";
  TextTable t({"rank", "pack", "verdict", "spare s", "flight s", "landing SoC %", "pack kg", "all-up kg", "spare s/kg",
               "front", "max C", "duty mean %", "ESC η mean %", "limit"});
  t.wrap_last(60);
  int rank = 0;
  for (const auto& row : rows) {
    const auto& r = row.result;
    // Only packs that pass every rule are ranked; the others say why they fail.
    t.add_row({row.meets ? std::to_string(++rank) : "-", row.candidate.label, r.go ? "go" : "NO-GO", spare_cell(row),
               fixed(r.flight_time_s, 0), r.refused ? "-" : fixed(r.landing.soc * 100, 1), fixed(r.pack_mass_kg, 3),
               fixed(r.all_up_mass_kg, 3), per_kg_cell(row), row.pareto ? "yes" : "", r.refused ? "-" : fixed(r.c_rate_max, 2), r.refused ? "-" : fixed(r.duty_mean * 100, 1),
               r.refused ? "-" : fixed(r.eta_esc_mean * 100, 1), limit_cell(base, row)});
  }
  out += t.render();
  out += "\nAn estimate from models, not a clearance to fly: follow local aviation rules and the\n"
         "makers' limits, and keep your own reserve.\n";
  return out;
}

nlohmann::json compare_json(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                            const sim::RankOptions& rank_opts) {
  using nlohmann::json;
  json j;
  j["schema"] = kCompareSchema;
  j["name"] = base.name;
  j["rank_by"] = sim::to_string(rank_opts.by);
  j["need_spare_s"] = rank_opts.need_spare_s ? json(*rank_opts.need_spare_s) : json();
  j["need_landing_soc"] = rank_opts.need_landing_soc ? json(*rank_opts.need_landing_soc) : json();
  j["ranking"] = rank_words(rank_opts);
  json arr = json::array();
  int rank = 0;
  for (const auto& row : rows) {
    const auto& r = row.result;
    const bool per_kg = r.go && row.spare.phase && row.spare.bounded && !row.spare.capped;
    arr.push_back({{"rank", row.meets ? json(++rank) : json()},
                   {"meets_requirement", row.meets},
                   {"short_of", row.short_of},
                   {"pareto_front", row.pareto},
                   {"spare_per_kg_s_per_kg", per_kg ? json(sim::counted_spare_s(row) / r.pack_mass_kg) : json()},
                   {"pack", row.candidate.label},
                   {"layout", row.candidate.pack.layout()},
                   {"series", row.candidate.pack.series},
                   {"parallel", row.candidate.pack.parallel},
                   {"capacity_Ah", row.candidate.pack.capacity_Ah()},
                   {"verdict", r.go ? "go" : "no-go"},
                   {"refused", r.refused},
                   {"spare_s", row.spare.phase && !r.refused && row.spare.bounded && !row.spare.capped
                                   ? json(row.spare.spare_s) : json()},
                   {"spare_capped", row.spare.capped},
                   {"binding_rule", row.spare.binding_rule},
                   {"flight_time_s", r.flight_time_s},
                   {"landing_soc", r.landing.soc},
                   {"pack_mass_kg", r.pack_mass_kg},
                   {"all_up_mass_kg", r.all_up_mass_kg},
                   {"c_rate_max", r.c_rate_max},
                   {"duty_mean", r.duty_mean},
                   {"eta_esc_mean", r.eta_esc_mean},
                   {"limit", limit_words(base, row)},
                   {"model_range", {{"soc_floor_covered", r.soc_floor_covered},
                                    {"excursions", excursions_json(r.excursions, true)}}}});
  }
  j["rows"] = arr;
  return j;
}

}  // namespace sortie::report
