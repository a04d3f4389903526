// `sortie remaining LOG.csv --profile P.json --at-s T`: the SoC the filter reads from the log up
// to T, and the time left at the present power to each reserve rule of the profile.
#include <cmath>

#include "cli/commands.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "estimate/cell_count.hpp"
#include "estimate/soc_filter.hpp"
#include "io/flight_log_csv.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "report/remaining_report.hpp"
#include "report/text_table.hpp"

namespace sortie::cli {

namespace {

const char* kRemainingCaution =
    "Caution: lithium packs can burn. These times are a model's estimate at the present power, not a "
    "guarantee: land by the aircraft's own warnings, the manufacturer's limits and local aviation rules.";
const char* kRemainingMethod =
    "iterated extended Kalman filter on the pack model (state SoC, v1, v2; the voltage the measurement, "
    "the current the input), then the pack model run forward from the filtered state at the present power "
    "to each rule's limit; the hover-reserve time is the first limit less its hover time at the present power; "
    "sd from runs at SoC +- sd";

struct RemainingCliOptions {
  std::string log, profile, pack, columns, json_file;
  double at_s = 0.0, window_s = 30.0, current_sd = 0.05, voltage_sd = 0.02, soc0_sd = 0.10;
  std::optional<double> soc0, soh_capacity, soh_resistance;
  bool quiet = false;
  ReportOutput report;
};

int run_remaining(const RemainingCliOptions& o) {
  const bool print = print_format(o.report, {{"--json", &o.json_file}}, o.quiet);
  const auto cols = o.columns.empty() ? std::map<std::string, io::ColumnRef>{}
                                      : io::parse_column_spec(o.columns, io::flight_log_quantities());
  const io::FlightLog fl = io::read_flight_log_file(o.log, cols);
  const io::LoadedProfile lp = load_profile(o.profile, o.pack);
  battery::Pack pack = lp.mission.pack;
  if (!pack.air_C)
    if (const auto air = lp.mission.environment.atmosphere.at(0.0)) pack.air_C = air->temperature_K - 273.15;
  if (o.soh_capacity) pack.soh_capacity = *o.soh_capacity;
  if (o.soh_resistance) pack.soh_resistance = *o.soh_resistance;
  if (o.at_s < fl.time_s.front() || o.at_s > fl.time_s.back())
    throw InputError(o.log + ": --at-s " + report::fixed(o.at_s, 1) + " s is outside the log (expected " +
                     report::fixed(fl.time_s.front(), 1) + " to " + report::fixed(fl.time_s.back(), 1) + " s)");
  const sim::MeasuredFlight mf{fl.time_s, fl.voltage_V, fl.current_A, fl.lines};
  estimate::require_cell_count(pack, mf, o.log);
  estimate::FilterOptions fo;
  fo.current_sd_A = o.current_sd;
  fo.voltage_sd_V = o.voltage_sd;
  fo.soc0 = o.soc0;
  fo.soc0_sd = o.soc0_sd;
  estimate::RemainingOptions ro;
  ro.power_window_s = o.window_s;
  const estimate::Remaining r = estimate::remaining_time(pack, lp.mission.reserve, mf, o.at_s, fo, ro);
  if (r.power_W <= 0.0)
    throw InputError(o.log + ": the mean power over the " + report::fixed(r.window_s, 0) + " s before " +
                     report::fixed(r.t_cut_s, 1) + " s is not positive (got " + report::fixed(r.power_W, 1) +
                     " W, expected a discharge)");
  // The rest of the log, for comparison: the filter over the whole log.
  const estimate::FilterResult whole = estimate::run_soc_filter(pack, mf, mf.time_s.size(), fo);
  const double log_left_s = fl.time_s.back() - r.t_cut_s;

  nlohmann::json j;
  j["log"] = o.log;
  j["profile"] = o.profile;
  j["t_cut_s"] = r.t_cut_s;
  j["rows_used"] = r.rows;
  j["soc"] = r.soc;
  j["soc_sd"] = r.soc_sd;
  j["soc0_guess"] = whole.soc0_guess;
  j["soc0_source"] = whole.soc0_source;
  j["present_power_W"] = r.power_W;
  j["power_window_s"] = r.window_s;
  j["pack_soh"] = {{"capacity", pack.soh_capacity}, {"resistance", pack.soh_resistance}};
  j["filter"] = {{"current_sd_A", fo.current_sd_A}, {"voltage_sd_V", fo.voltage_sd_V}, {"soc0_sd", fo.soc0_sd},
                 {"soc_rate_sd_per_sqrt_s", fo.soc_rate_sd}, {"v_rate_sd_V_per_sqrt_s", fo.v_rate_sd_V}};
  nlohmann::json rules = nlohmann::json::array();
  for (const auto& t : r.rules) {
    nlohmann::json x = {{"rule", t.rule}, {"limit", t.limit}, {"already_past", t.already}};
    if (!t.unit.empty()) x["unit"] = t.unit;
    if (t.time_s) {
      x["time_left_s"] = *t.time_s;
      x["time_left_sd_s"] = t.sd_s;
    } else {
      x["time_left_s"] = nullptr;
      x["note"] = "not reached before the pack's end or the horizon";
    }
    rules.push_back(x);
  }
  j["rules"] = rules;
  j["forward_end"] = r.end;
  j["log_after_cut"] = {{"time_s", log_left_s}, {"rows", mf.time_s.size() - r.rows},
                        {"soc_end", whole.state.soc}, {"soc_end_sd", whole.rows.back().soc_sd}};
  j["method"] = kRemainingMethod;
  j["caution"] = kRemainingCaution;
  const std::string json = j.dump(2) + "\n";

  using report::fixed;
  std::string text = "Time left: " + o.log + " at " + fixed(r.t_cut_s, 1) + " s, " + o.profile + "\n\n";
  report::KeyValues kv;
  kv.add("state of charge", fixed(100 * r.soc, 1) + " % ± " + fixed(100 * r.soc_sd, 2) + " (1 sd; start guess " +
                                fixed(100 * whole.soc0_guess, 1) + " % from the " + whole.soc0_source + ", sd " +
                                fixed(100 * fo.soc0_sd, 0) + " %)");
  kv.add("present power", fixed(r.power_W, 1) + " W (mean V·I over the last " + fixed(r.window_s, 0) + " s)");
  kv.add("pack soh", "capacity " + fixed(pack.soh_capacity, 3) + ", resistance " + fixed(pack.soh_resistance, 3) +
                         (o.soh_capacity || o.soh_resistance ? " (set on the command line)" : " (the profile's pack; set it from sortie health)"));
  text += kv.render();
  report::TextTable t({"rule", "limit", "time left", "sd"});
  for (const auto& x : r.rules) {
    std::string left = !x.time_s ? "not reached" : x.already ? "already past" : fixed(*x.time_s, 0) + " s";
    t.add_row({x.rule, fixed(x.limit, x.unit == "V" ? 2 : x.unit == "s" ? 0 : 2) + (x.unit.empty() ? "" : " " + x.unit), left,
               x.time_s && !x.already ? fixed(x.sd_s, 0) + " s" : "-"});
  }
  text += "\nAt the present power\n" + t.render();
  text += "\nThe log goes on " + fixed(log_left_s, 0) + " s after the cut; the filter over the whole log ends at SoC " +
          fixed(100 * whole.state.soc, 1) + " % ± " + fixed(100 * whole.rows.back().soc_sd, 2) + ".\n";
  text += "Method: " + std::string(kRemainingMethod) + ".\n" + kRemainingCaution + "\n";
  const std::string page = o.report.html_file.empty() ? "" : report::remaining_html(o.log, o.profile, mf, r, whole, j);
  if (!o.json_file.empty()) io::write_output(o.json_file, json);
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, page);
  if (print && o.report.format == "json") io::write_output("-", json);
  if (print && o.report.format == "text") io::write_output("-", printable(text, true));
  return kExitOk;
}

}  // namespace

void add_remaining_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<RemainingCliOptions>();
  CLI::App* c = app.add_subcommand("remaining", "The state of charge read from a flight log up to a moment, and the time left at the present power to each reserve rule of the profile");
  c->add_option("LOG", o->log, "flight log (CSV: time, pack voltage, pack current)")->required()->check(CLI::ExistingFile);
  c->add_option("--profile", o->profile, "the profile whose pack and reserve rules apply (JSON)")->required()->check(CLI::ExistingFile);
  c->add_option("--pack", o->pack, "use this pack file instead of the profile's pack")->check(CLI::ExistingFile);
  c->add_option("--at-s", o->at_s, "cut the log here: use the rows up to this time, s")->required()->check(number_in(between(0.0, 1e7, "s")));
  c->add_option("--columns", o->columns, "columns by name or number with units: time=T:ms,voltage=3,current=I_bat:mA");
  c->add_option("--power-window-s", o->window_s, "the present power is the mean V·I over this stretch before the cut, s (default 30)")->check(number_in(between(0.0, 3600.0, "s")));
  c->add_option("--current-sd-A", o->current_sd, "current-sensor error, 1 sd, A (default 0.05)")->check(number_in(above_to(0.0, 100.0, "A")));
  c->add_option("--voltage-sd-V", o->voltage_sd, "voltage-sensor error, 1 sd, V (default 0.02)")->check(number_in(above_to(0.0, 10.0, "V")));
  c->add_option("--soc0", o->soc0, "start SoC guess, 0..1 (default: from the first row's voltage)")->check(number_in(between(0.0, 1.0, "")));
  c->add_option("--soc0-sd", o->soc0_sd, "sd of the start SoC guess (default 0.10)")->check(number_in(above_to(0.0, 1.0, "")));
  c->add_option("--soh-capacity", o->soh_capacity, "the pack's capacity factor (as sortie health estimates it), in place of the pack file's")->check(number_in(above_to(0.0, 1.5, "")));
  c->add_option("--soh-resistance", o->soh_resistance, "the pack's R0 factor (as sortie health estimates it), in place of the pack file's")->check(number_in(above_to(0.0, 10.0, "")));
  c->add_option("--json", o->json_file, "write the result as JSON to FILE, or - for standard output")->check(output_path());
  add_report_options(c, o->report, {"text", "json"});
  c->add_flag("--quiet,-q", o->quiet, "print nothing");
  c->callback([o, &exit_code] { exit_code = run_remaining(*o); });
}

}  // namespace sortie::cli
