// `sortie compare PROFILE.json (--pack A.json ... | --series ... --capacity-Ah ... [--parallel ...])`
#include <unistd.h>

#include <cstdio>
#include <optional>
#include <iostream>
#include <type_traits>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/coverage_options.hpp"
#include "cli/report_output.hpp"
#include "cli/logbook_pack.hpp"
#include "cli/what_if.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/battery_json.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "report/compare_report.hpp"
#include "report/html_compare.hpp"
#include "report/result_csv.hpp"
#include "report/what_if_report.hpp"
#include "sim/compare.hpp"

namespace sortie::cli {

namespace {

struct CompareOptions {
  std::string profile, cell, json_file;
  std::vector<std::string> packs;
  std::vector<int> series, parallel{1};
  std::vector<double> capacity_Ah;
  bool quiet = false;
  bool stop_at_coverage = false, accept_extrapolation = false;
  ReportOutput report;
  WhatIfOptions what_if;  ///< the mission's what-if numbers and files (the packs come from --pack or the grid)
  std::string rank_by = "spare";
  std::optional<double> need_spare_s, need_landing_soc_pct, equal_energy_Wh;
  std::string logbook;                ///< with pack_ids: packs from the logbook
  std::vector<std::int64_t> pack_ids;
};

/// A progress bar on stderr, only when stderr is a terminal.
void progress_bar(std::size_t done, std::size_t total) {
  static const bool tty = ::isatty(2) != 0;
  if (!tty || total < 2) return;
  const int width = 30;
  const int filled = static_cast<int>(width * done / total);
  std::fprintf(stderr, "\r  [%s%s] %zu/%zu packs", std::string(filled, '#').c_str(),
               std::string(width - filled, ' ').c_str(), done, total);
  if (done == total) std::fprintf(stderr, "\r%*s\r", width + 24, "");
  std::fflush(stderr);
}

int run_compare(const CompareOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}}, o.quiet);
  io::LoadedProfile lp = load_profile(o.profile);
  std::vector<sim::Override> overrides = apply_what_if(lp.mission, o.what_if);
  // The loader's cross-checks again on the changed mission (a fixed-wing airframe on a hover, a
  // cell whose maximum is below the reserve voltage, a wind no leg makes headway in).
  if (!overrides.empty()) cli::check_profile(lp);
  std::vector<sim::PackCandidate> cands;
  if (!o.packs.empty()) {
    for (const auto& f : o.packs) {
      battery::Pack p = io::load_pack_file(f);
      cands.push_back({p.name.empty() ? f : p.name, p});
    }
  } else {
    const battery::Cell cell = o.cell.empty() ? lp.mission.pack.cell : io::load_cell_file(o.cell);
    cands = o.equal_energy_Wh ? sim::equal_energy_packs(cell, lp.mission.pack, o.series, *o.equal_energy_Wh, o.parallel)
                              : sim::pack_grid(cell, lp.mission.pack, o.series, o.capacity_Ah, o.parallel);
  }
  if (!o.logbook.empty()) {
    // Packs from the logbook join the candidates, each with its latest SoH, listed as overrides.
    logbook::Database db = open_logbook(o.logbook);
    for (const auto id : o.pack_ids) {
      const LogbookPack lb = logbook_pack(db, id, true);
      cands.push_back({lb.record.name + " (logbook pack " + std::to_string(id) + ")", lb.pack});
      overrides.push_back(lb.override_line);
    }
  }
  sim::RankOptions rank;
  rank.by = o.rank_by == "lightest" ? sim::RankBy::lightest
            : o.rank_by == "spare-per-kg" ? sim::RankBy::spare_per_kg : sim::RankBy::spare;
  rank.need_spare_s = o.need_spare_s;
  if (o.need_landing_soc_pct) rank.need_landing_soc = *o.need_landing_soc_pct / 100.0;
  sim::SimOptions so;
  so.stop_at_coverage = o.stop_at_coverage;
  so.accept_extrapolation = o.accept_extrapolation;
  auto rows = sim::compare_packs(lp.mission, cands, progress_bar, so);
  sim::rank_rows(rows, rank);
  std::string html = o.report.html_file.empty() ? "" : report::compare_html(lp.mission, rows, rank);
  // The overrides in effect: a key of the JSON, lines after the text, a box at the page's top.
  if (!overrides.empty() && !html.empty())
    if (const auto at = html.find("<main"); at != std::string::npos)
      if (const auto end = html.find('>', at); end != std::string::npos)
        html.insert(end + 1, "<section><h2>What-if overrides in effect</h2>" + report::overrides_html(overrides) + "</section>");
  auto json_text = [&] {
    nlohmann::json j = report::compare_json(lp.mission, rows, rank);
    if (!overrides.empty()) j["overrides"] = report::overrides_json(overrides);
    return j.dump(2) + "\n";
  };
  if (!o.json_file.empty()) io::write_output(o.json_file, json_text());
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, html);
  if (print && o.report.format == "json") io::write_output("-", json_text());
  if (print && o.report.format == "csv") io::write_output("-", report::compare_csv(rows));
  if (print && o.report.format == "text") io::write_output("-", printable(report::compare_text(lp.mission, rows, rank) + (overrides.empty() ? "" : "\n" + report::overrides_text(overrides)), true));
  return 0;
}

/// A list option may not repeat a value: the same pack twice would be one row shown twice.
template <class T>
void refuse_repeats(const char* option, const std::vector<T>& values) {
  for (std::size_t i = 0; i < values.size(); ++i)
    for (std::size_t k = 0; k < i; ++k)
      if (values[k] == values[i]) {
        std::string v;
        if constexpr (std::is_same_v<T, std::string>) v = values[i];
        else v = format_number(static_cast<double>(values[i]));
        throw UsageError(std::string(option) + ": " + v + " given twice (expected each value once)");
      }
}

}  // namespace

void add_compare_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<CompareOptions>();
  CLI::App* c = app.add_subcommand("compare", "Fly one mission with several packs and rank them by spare time");
  c->add_option("PROFILE", o->profile, "mission profile (JSON)")->required()->check(CLI::ExistingFile);
  auto* pk = c->add_option("--pack", o->packs, "a pack file to compare (repeat for each)")->check(CLI::ExistingFile);
  auto* se = c->add_option("--series", o->series, "cell counts in series, e.g. 2,3,4,6")
                 ->delimiter(',')->check(whole_in(1, 1000));
  auto* ca = c->add_option("--capacity-Ah", o->capacity_Ah, "cell capacities, Ah, e.g. 3,4,5 (a pack holds --parallel times that)")
                 ->delimiter(',')->check(number_in(between(0.01, 1e4, "Ah")));
  c->add_option("--parallel", o->parallel, "cells in parallel, e.g. 1,2 (default 1)")
      ->delimiter(',')->check(whole_in(1, 1000));
  c->add_option("--cell", o->cell, "cell to build the packs from (default: the profile pack's cell)")
      ->check(CLI::ExistingFile);
  auto* ee = c->add_option("--equal-energy-Wh", o->equal_energy_Wh,
                           "instead of --capacity-Ah: size the cells so that every --series (and --parallel) pack holds this energy, Wh (S·P·mean OCV·Ah)")
                 ->check(number_in(between(0.1, 1e6, "Wh")));
  c->add_option("--rank-by", o->rank_by, "what ranks first: spare (longest spare time, the default), lightest (the lightest pack meeting --need-spare-s / --need-landing-soc-pct), spare-per-kg")
      ->check(CLI::IsMember({"spare", "lightest", "spare-per-kg"}));
  c->add_option("--need-spare-s", o->need_spare_s, "a pack is ranked only with at least this spare time, s")
      ->check(number_in(between(0.0, 1e6, "s")));
  c->add_option("--need-landing-soc-pct", o->need_landing_soc_pct, "a pack is ranked only when it lands with at least this charge, %")
      ->check(number_in(between(0.0, 100.0, "%")));
  pk->excludes(se)->excludes(ca)->excludes(ee);
  ca->excludes(ee);
  c->add_option("--json", o->json_file, "write the ranked rows as JSON to FILE, or - for standard output")->check(output_path());
  add_report_options(c, o->report, {"text", "json", "csv"});
  add_coverage_options(c, o->stop_at_coverage, o->accept_extrapolation);
  c->add_flag("--quiet,-q", o->quiet, "print nothing on success");
  add_what_if_options(c, o->what_if, false);
  c->add_option("--logbook", o->logbook, "a pack logbook (sortie logbook): --pack-id takes packs from it")->check(CLI::ExistingFile);
  c->add_option("--pack-id", o->pack_ids, "a logbook pack to compare, with its latest SoH (repeat for each)")
      ->check(whole_in(1, 2147483647));
  c->callback([o, &exit_code] {
    if (o->logbook.empty() != o->pack_ids.empty())
      throw UsageError(o->logbook.empty() ? "--pack-id: needs --logbook" : "--logbook: needs --pack-id");
    refuse_repeats("--pack-id", o->pack_ids);
    if (o->packs.empty() && o->pack_ids.empty() && (o->series.empty() || (o->capacity_Ah.empty() && !o->equal_energy_Wh)))
      throw CLI::RequiredError("--pack or --pack-id (repeated), or --series with --capacity-Ah or --equal-energy-Wh");
    refuse_repeats("--pack", o->packs);
    refuse_repeats("--series", o->series);
    refuse_repeats("--capacity-Ah", o->capacity_Ah);
    refuse_repeats("--parallel", o->parallel);
    exit_code = run_compare(*o);
  });
}

}  // namespace sortie::cli
