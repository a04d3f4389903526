// `sortie health LOG.csv [LOG2.csv ...] --pack PACK.json | --profile P.json`: the pack's capacity
// and resistance factors (the soh block) from flight logs, with their uncertainty.
#include <cmath>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "estimate/cell_count.hpp"
#include "estimate/health.hpp"
#include "io/battery_json.hpp"
#include "io/flight_log_csv.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "report/health_report.hpp"
#include "report/text_table.hpp"

namespace sortie::cli {

namespace {

const char* kHealthCaution =
    "Caution: lithium packs can burn. This is an estimate from a model fitted to logs; it does not "
    "certify a pack. Retire packs by the manufacturer's limits and local aviation rules.";
const char* kPerLogNote =
    "with several logs the estimate above is the joint one (the factors shared by all the logs); each log is also "
    "fitted alone, its own capacity and resistance factors and start SoC, where that log alone can tell them apart";
const char* kHealthMethod =
    "pack model replayed on each log's current (RC pairs relaxed at the first row, the cell's thermal "
    "block if it has one), capacity and R0 factors and each log's start SoC fitted to the logged voltage "
    "by bounded Levenberg-Marquardt; sd = sqrt(diag(sigma^2 (J^T J)^-1 * n/n_eff)), n_eff from each log's "
    "lag-1 residual autocorrelation (AR(1), never below 0)";

struct HealthCliOptions {
  std::vector<std::string> logs;
  std::string profile, pack, columns, json_file;
  bool rested_start = false, quiet = false;
  ReportOutput report;
};

/// The pack and the air its cells cool in: a profile's at its field, or a pack file's own.
battery::Pack load_health_pack(const HealthCliOptions& o) {
  if (!o.profile.empty()) {
    const io::LoadedProfile lp = load_profile(o.profile, o.pack);
    battery::Pack p = lp.mission.pack;
    if (!p.air_C)
      if (const auto air = lp.mission.environment.atmosphere.at(0.0)) p.air_C = air->temperature_K - 273.15;
    return p;
  }
  return io::load_pack_file(o.pack);
}

/// Why a log alone gives no estimate: its screening reason, else the fit's.
std::string own_refusal(const estimate::HealthEstimate& x) {
  if (!x.flights.empty() && !x.flights.front().refused.empty()) return x.flights.front().refused;
  return x.why_refused;
}

/// Each log's own estimate, as the JSON's flights[i].own: the factors with their sd, or why the log
/// alone gives none.
nlohmann::json own_json(const estimate::HealthEstimate& x) {
  nlohmann::json j = {{"refused", x.refused}};
  if (x.refused) j["why_refused"] = own_refusal(x);
  if (!x.refused)
    j.update({{"capacity", x.capacity}, {"capacity_sd", x.capacity_sd}, {"resistance", x.resistance},
              {"resistance_sd", x.resistance_sd}, {"correlation", x.correlation}, {"rmse_V", x.rmse_V}});
  return j;
}

nlohmann::json health_json(const HealthCliOptions& o, const battery::Pack& pack, const estimate::HealthEstimate& e,
                           const std::vector<estimate::HealthEstimate>& own) {
  nlohmann::json j;
  j["pack"] = o.pack.empty() ? o.profile : o.pack;
  j["pack_layout"] = pack.layout();
  j["refused"] = e.refused;
  if (e.refused) j["why_refused"] = e.why_refused;
  if (e.logs_used > 0) {
    j["soh"] = {{"capacity", e.capacity}, {"capacity_sd", e.capacity_sd}, {"resistance", e.resistance},
                {"resistance_sd", e.resistance_sd}, {"correlation", e.correlation}};
    j["fit"] = {{"rows_used", e.rows_used}, {"logs_used", e.logs_used}, {"parameters", e.parameters},
                {"iterations", e.iterations}, {"status", e.status}, {"rmse_V", e.rmse_V}, {"sigma_V", e.sigma_V},
                {"sd_inflation", e.inflation}};
  }
  j["thresholds"] = {{"min_depth", e.options.min_depth}, {"min_current_spread", e.options.min_current_spread},
                     {"min_rows", e.options.min_rows}, {"max_correlation", e.options.max_correlation},
                     {"capacity_bounds", {e.options.capacity_lo, e.options.capacity_hi}},
                     {"resistance_bounds", {e.options.resistance_lo, e.options.resistance_hi}}};
  if (!own.empty()) j["per_log_note"] = kPerLogNote;
  nlohmann::json fl = nlohmann::json::array();
  for (std::size_t i = 0; i < e.flights.size(); ++i) {
    const auto& f = e.flights[i];
    nlohmann::json x = {{"log", f.name}, {"rows", f.rows}, {"charge_Ah", f.charge_Ah}, {"depth", f.depth},
                        {"current_spread", f.current_spread}, {"used", f.refused.empty()}};
    if (!f.refused.empty()) x["refused"] = f.refused;
    if (f.refused.empty()) {
      x["soc0"] = f.soc0;
      x["soc0_fitted"] = f.soc0_fitted;
      if (f.soc0_fitted) x["soc0_sd"] = f.soc0_sd;
      x["soc0_at_bound"] = f.soc0_at_bound;
      if (!f.soc0_source.empty()) x["soc0_source"] = f.soc0_source;
      x["rmse_V"] = f.rmse_V;
      x["residual_lag1"] = f.lag1;
      x["n_eff"] = f.n_eff;
    }
    if (i < own.size()) {
      x["own"] = own_json(own[i]);
    }
    fl.push_back(x);
  }
  j["flights"] = fl;
  j["method"] = kHealthMethod;
  j["caution"] = kHealthCaution;
  return j;
}

std::string health_text(const HealthCliOptions& o, const battery::Pack& pack, const estimate::HealthEstimate& e,
                        const std::vector<estimate::HealthEstimate>& own) {
  using report::fixed;
  std::string out = "State of health: " + (o.pack.empty() ? o.profile : o.pack) + " (" + pack.layout() + ")\n\n";
  if (e.refused) out += "No estimate: " + e.why_refused + "\n\n";
  if (e.logs_used > 0) {
    report::KeyValues kv;
    kv.add(e.refused ? "capacity factor (not accepted)" : "capacity factor",
           fixed(e.capacity, 3) + " ± " + fixed(e.capacity_sd, 3) + " (1 sd)");
    kv.add(e.refused ? "resistance factor (not accepted)" : "resistance factor",
           fixed(e.resistance, 3) + " ± " + fixed(e.resistance_sd, 3) + " (1 sd, on R0)");
    kv.add("correlation", fixed(e.correlation, 3));
    kv.add("fit", std::to_string(e.logs_used) + " log(s), " + std::to_string(e.rows_used) + " rows, " +
                      std::to_string(e.parameters) + " parameters, RMSE " + fixed(e.rmse_V, 4) + " V, " + e.status +
                      " after " + std::to_string(e.iterations) + " steps; sd widened x" + fixed(std::sqrt(e.inflation), 2) +
                      " for residual autocorrelation");
    out += kv.render();
    if (!e.refused)
      out += "\n  for the pack file: \"soh\": { \"capacity\": " + fixed(e.capacity, 3) + ", \"resistance\": " +
             fixed(e.resistance, 3) + " }\n";
  }
  report::TextTable t({"log", "rows", "charge Ah", "depth", "I spread", "start SoC", "RMSE V", "used"});
  for (const auto& f : e.flights) {
    std::string soc = "-";
    if (f.refused.empty())
      soc = fixed(100 * f.soc0, 1) + " %" +
            (f.soc0_fitted ? (f.soc0_at_bound ? " (at bound)" : " ± " + fixed(100 * f.soc0_sd, 1)) : " (" + f.soc0_source + ")");
    t.add_row({f.name, std::to_string(f.rows), fixed(f.charge_Ah, 3), fixed(100 * f.depth, 1) + " %",
               fixed(100 * f.current_spread, 1) + " %", soc, f.refused.empty() ? fixed(f.rmse_V, 4) : "-",
               f.refused.empty() ? "yes" : "no: " + f.refused});
  }
  t.wrap_last(60);
  out += "\nLogs\n" + t.render();
  if (!own.empty()) {
    report::TextTable a({"log", "capacity factor", "resistance factor", "correlation", "RMSE V"});
    for (std::size_t i = 0; i < own.size() && i < e.flights.size(); ++i) {
      const auto& x = own[i];
      if (x.refused)
        a.add_row({e.flights[i].name, "no estimate: " + own_refusal(x), "", "", ""});
      else
        a.add_row({e.flights[i].name, fixed(x.capacity, 3) + " ± " + fixed(x.capacity_sd, 3),
                   fixed(x.resistance, 3) + " ± " + fixed(x.resistance_sd, 3), fixed(x.correlation, 3), fixed(x.rmse_V, 4)});
    }
    out += "\nEach log alone (1 sd)\n" + a.render();
    out += "Note: " + std::string(kPerLogNote) + ".\n";
  }
  out += "\nThresholds: a log must use at least " + fixed(100 * e.options.min_depth, 0) +
         " % of the rated charge and vary its current by sd/mean of at least " + fixed(100 * e.options.min_current_spread, 0) +
         " %; the estimate is refused when |correlation| exceeds " + fixed(e.options.max_correlation, 2) + ".\n";
  out += "Method: " + std::string(kHealthMethod) + ".\n" + kHealthCaution + "\n";
  return out;
}

int run_health(const HealthCliOptions& o) {
  if (o.pack.empty() && o.profile.empty()) throw UsageError("health: give --pack PACK.json or --profile PROFILE.json");
  const bool print = print_format(o.report, {{"--json", &o.json_file}}, o.quiet);
  const auto cols = o.columns.empty() ? std::map<std::string, io::ColumnRef>{}
                                      : io::parse_column_spec(o.columns, io::flight_log_quantities());
  const battery::Pack pack = load_health_pack(o);
  std::vector<estimate::HealthFlight> flights;
  for (const auto& path : o.logs) {
    const io::FlightLog fl = io::read_flight_log_file(path, cols);
    estimate::HealthFlight hf{path, sim::MeasuredFlight{fl.time_s, fl.voltage_V, fl.current_A, fl.lines}, std::nullopt, ""};
    estimate::require_cell_count(pack, hf.log, path);
    if (o.rested_start) {
      // A rested start: the first row's voltage is the OCV (its current must be near zero).
      const double c_rate = std::abs(fl.current_A[0]) / (pack.cell.capacity_Ah * pack.parallel);
      if (c_rate > 0.02)
        throw InputError(path + ": line " + std::to_string(fl.lines[0]) + ": --rested-start needs the first row at rest (got " +
                         report::fixed(fl.current_A[0], 3) + " A, expected at most 0.02 C)");
      const double ocv_cell = fl.voltage_V[0] / pack.series;
      hf.soc0 = pack.cell.ocv_V.inverse(ocv_cell);
      hf.soc0_source = "OCV of the first row";
    }
    flights.push_back(std::move(hf));
  }
  const estimate::HealthEstimate e = estimate::estimate_health(pack, flights);
  // With several logs, each one alone too: its own factors where it can tell them apart.
  std::vector<estimate::HealthEstimate> own;
  if (flights.size() > 1)
    for (const auto& f : flights) own.push_back(estimate::estimate_health(pack, {f}));
  const nlohmann::json j = health_json(o, pack, e, own);
  const std::string json = j.dump(2) + "\n";
  const std::string page = o.report.html_file.empty()
                               ? ""
                               : report::health_html(o.pack.empty() ? o.profile : o.pack, pack, flights, e, own, j);
  if (!o.json_file.empty()) io::write_output(o.json_file, json);
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, page);
  if (print && o.report.format == "json") io::write_output("-", json);
  if (print && o.report.format == "text") io::write_output("-", printable(health_text(o, pack, e, own), true));
  return e.refused ? kExitNoEstimate : kExitOk;
}

}  // namespace

void add_health_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<HealthCliOptions>();
  CLI::App* c = app.add_subcommand("health", "Estimate a pack's capacity and resistance factors (the soh block) from flight logs, with their uncertainty");
  c->add_option("LOG", o->logs, "flight logs of one pack (CSV: time, pack voltage, pack current)")->required()->check(CLI::ExistingFile);
  c->add_option("--pack", o->pack, "the pack that flew (JSON); with --profile, used in place of the profile's pack")->check(CLI::ExistingFile);
  c->add_option("--profile", o->profile, "take the pack, and the air its cells cool in, from this profile (JSON)")->check(CLI::ExistingFile);
  c->add_option("--columns", o->columns, "columns by name or number with units: time=T:ms,voltage=3,current=I_bat:mA");
  c->add_flag("--rested-start", o->rested_start, "each log starts after a long rest: take its start SoC from the first row's voltage instead of fitting it");
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  add_report_options(c, o->report, {"text", "json"});
  c->add_flag("--quiet,-q", o->quiet, "print nothing");
  c->callback([o, &exit_code] { exit_code = run_health(*o); });
}

}  // namespace sortie::cli
