// `sortie logbook DB.sqlite add-pack | add-flight | packs | history | trend`: the pack logbook.
#include <ctime>
#include <filesystem>

#include "cli/commands.hpp"
#include "cli/log_check.hpp"
#include "cli/logbook_pack.hpp"
#include "cli/number_option.hpp"
#include "cli/report_output.hpp"
#include "cli/run.hpp"
#include "core/error.hpp"
#include "core/range.hpp"
#include "core/sha256.hpp"
#include "core/text.hpp"
#include "estimate/health.hpp"
#include "io/battery_json.hpp"
#include "io/csv.hpp"
#include "io/flight_log_csv.hpp"
#include "io/output.hpp"
#include "cli/profile_load.hpp"
#include "logbook/logbook.hpp"
#include "logbook/trend.hpp"
#include "report/logbook_report.hpp"
#include "report/text_table.hpp"
#include "sim/flight_check.hpp"

namespace sortie::cli {

namespace {

namespace fs = std::filesystem;

struct LogbookOptions {
  std::string db;
  // add-pack
  std::string pack_file, name, serial, first_use;
  // add-flight
  std::string log, profile, columns, date;
  // add-flight, history, trend
  std::int64_t pack_id = 0;
  double capacity_limit = 0.8, resistance_limit = 2.0;
  bool quiet = false;
  ReportOutput report;
};

std::string today_utc() {
  const std::time_t now = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%d", &tm);
  return buf;
}

std::string checked_date(const std::string& option, const std::string& v) {
  if (!logbook::days_from_date(v))
    throw UsageError(option + ": not a date (got " + printable(v) + ", expected YYYY-MM-DD)");
  return v;
}

/// The logbook of a command that reads it or adds to a pack already there: the file must exist.
logbook::Database existing(const std::string& path, bool writable) {
  if (!fs::exists(path))
    throw InputError(path + ": no logbook here (expected a file made by `sortie logbook " + path + " add-pack`)");
  return logbook::Database(path, writable);
}

std::string fmt(double v, int d) {
  char b[64];
  std::snprintf(b, sizeof b, "%.*f", d, v);
  return b;
}

int run_add_pack(const LogbookOptions& o) {
  const bool print = print_format(o.report, {}, o.quiet);
  const battery::Pack pack = io::load_pack_file(o.pack_file);  // validates it as fly would
  const std::string text = io::read_text_file(o.pack_file);
  logbook::PackRecord r;
  r.name = o.name;
  r.serial = o.serial;
  r.cell_note = pack.cell.name + (pack.cell.chemistry.empty() ? "" : " (" + pack.cell.chemistry + ")");
  r.series = pack.series;
  r.parallel = pack.parallel;
  const bool dated = !o.first_use.empty();
  r.first_use = dated ? checked_date("--first-use", o.first_use) : today_utc();
  r.pack_path = fs::absolute(o.pack_file).lexically_normal().string();
  r.pack_sha256 = sha256_hex(text);
  r.pack_json = text;
  logbook::Database db(o.db, true);
  r.id = db.add_pack(r);
  const auto stored = db.pack(r.id);
  if (print && o.report.format == "json") io::write_output("-", report::pack_json(*stored).dump(2) + "\n");
  if (print && o.report.format == "text")
    io::write_output("-", printable("Pack " + std::to_string(r.id) + " added to " + o.db + ": " + r.name + ", " +
                                        pack.layout() + " of " + r.cell_note + ", first use " + r.first_use +
                                        (dated ? "" : " (today, UTC: --first-use sets it)") + "\n  pack file " +
                                        r.pack_path + " stored as read (SHA-256 " + r.pack_sha256 + ")\n",
                                    true));
  return kExitOk;
}

int run_packs(const LogbookOptions& o) {
  const bool print = print_format(o.report, {}, o.quiet);
  logbook::Database db = existing(o.db, false);
  const auto all = db.packs();
  nlohmann::json j = nlohmann::json::array();
  report::TextTable t({"id", "name", "serial", "layout", "cell", "first use", "flights"});
  for (const auto& p : all) {
    const auto n = db.flights(p.id).size();
    nlohmann::json pj = report::pack_json(p);
    pj["flights"] = n;
    j.push_back(pj);
    t.add_row({std::to_string(p.id), p.name, p.serial, std::to_string(p.series) + "S" + std::to_string(p.parallel) + "P",
               p.cell_note, p.first_use, std::to_string(n)});
  }
  if (print && o.report.format == "json") io::write_output("-", nlohmann::json{{"logbook", o.db}, {"packs", j}}.dump(2) + "\n");
  if (print && o.report.format == "text")
    io::write_output("-", printable("Packs in " + o.db + "\n\n" + (all.empty() ? "  none yet\n" : t.render()), true));
  return kExitOk;
}

int run_add_flight(const LogbookOptions& o) {
  const bool print = print_format(o.report, {}, o.quiet);
  logbook::Database db = existing(o.db, true);
  const std::string log_text = io::read_text_file(o.log);
  const std::string hash = sha256_hex(log_text);
  if (const auto dup = db.flight_by_hash(hash))
    throw InputError(o.log + ": this log is already in the logbook " + o.db + " (got SHA-256 " + hash + " of flight " +
                     std::to_string(dup->id) + ", expected a log not added before)");
  // The check, as `sortie check LOG --profile P` with the pack as stored in the logbook (its own
  // soh block: the plan as it would have been made from the pack file).
  const LogbookPack lb = logbook_pack(db, o.pack_id, false);
  io::LoadedProfile lp = load_profile(o.profile);
  lp.mission.pack = lb.pack;
  cli::check_profile(lp);
  const LogAgainstPlan r = check_log_against_plan(o.log, o.columns, lp);
  const sim::MeasuredFlight& mf = r.flight;
  const sim::FlightCheck& c = r.check;
  // The state of health from this flight (start SoC fitted).
  const estimate::HealthEstimate h = estimate::estimate_health(lb.pack, {{o.log, mf, std::nullopt, ""}});

  logbook::FlightRecord f;
  f.pack_id = o.pack_id;
  const bool dated = !o.date.empty();
  f.date = dated ? checked_date("--date", o.date) : today_utc();
  f.profile_path = fs::absolute(o.profile).lexically_normal().string();
  f.log_path = fs::absolute(o.log).lexically_normal().string();
  f.log_sha256 = hash;
  f.flight_time_s = c.flight_time_meas_s;
  f.energy_Wh = c.energy_meas_Wh;
  f.charge_Ah = c.charge_meas_Ah;
  f.soc_land_counted = c.soc_land_counted;
  f.soc_land_voltage = c.soc_land_voltage;
  f.v_rmse_V = c.v_rmse_V;
  f.replay_rmse_V = c.replay_rmse_V;
  f.station_left_s = c.reserve_meas_s;
  std::int64_t fid = 0, eid = 0;
  int cycle = 0;
  if (h.refused) {
    fid = db.add_flight(f);
  } else {
    logbook::EstimateRecord e;
    e.pack_id = o.pack_id;
    e.capacity = h.capacity;
    e.capacity_sd = h.capacity_sd;
    e.resistance = h.resistance;
    e.resistance_sd = h.resistance_sd;
    e.method = "estimate_health on this flight's log (start SoC fitted), " + std::to_string(h.rows_used) + " rows";
    e.date = f.date;
    std::tie(fid, eid) = db.add_flight_with_estimate(f, e);
    for (const auto& x : db.estimates(o.pack_id))
      if (x.id == eid) cycle = x.cycle;
  }
  nlohmann::json j = {{"logbook", o.db}, {"pack_id", o.pack_id}, {"flight_id", fid}, {"date", f.date},
                      {"date_given", dated}, {"log", o.log}, {"log_sha256", hash},
                      {"check", {{"flight_time_s", f.flight_time_s}, {"energy_Wh", f.energy_Wh}, {"charge_Ah", f.charge_Ah},
                                 {"soc_land_counted", f.soc_land_counted}, {"soc_land_voltage", f.soc_land_voltage},
                                 {"v_rmse_V", f.v_rmse_V}, {"replay_rmse_V", c.replay_rmse_V},
                                 {"station_left_s", f.station_left_s}}}};
  if (h.refused) {
    j["estimate"] = nullptr;
    j["estimate_refused"] = h.why_refused;
  } else {
    j["estimate"] = {{"id", eid}, {"cycle", cycle}, {"capacity", h.capacity}, {"capacity_sd", h.capacity_sd},
                     {"resistance", h.resistance}, {"resistance_sd", h.resistance_sd}, {"correlation", h.correlation},
                     {"rmse_V", h.rmse_V}};
  }
  j["cycle_note"] = report::kCycleNote;
  if (print && o.report.format == "json") io::write_output("-", j.dump(2) + "\n");
  if (print && o.report.format == "text") {
    std::string t = "Flight " + std::to_string(fid) + " of pack " + std::to_string(o.pack_id) + " added to " + o.db + ": " +
                    f.date + (dated ? "" : " (today, UTC: --date sets it)") + "\n";
    report::KeyValues kv;
    kv.add("flight time", fmt(f.flight_time_s, 0) + " s");
    kv.add("energy, charge", fmt(f.energy_Wh, 1) + " Wh, " + fmt(f.charge_Ah, 3) + " Ah");
    kv.add("landing SoC", fmt(100 * f.soc_land_counted, 1) + " % counted, " + fmt(100 * f.soc_land_voltage, 1) + " % from the voltage");
    kv.add("voltage RMSE", fmt(1000 * f.v_rmse_V, 0) + " mV against the plan, " + fmt(1000 * c.replay_rmse_V, 0) + " mV replayed");
    kv.add("station left", fmt(f.station_left_s, 0) + " s");
    if (h.refused) {
      kv.add("SoH estimate", "none stored: " + h.why_refused);
    } else {
      kv.add("SoH capacity", fmt(h.capacity, 3) + " ± " + fmt(h.capacity_sd, 3));
      kv.add("SoH resistance", fmt(h.resistance, 3) + " ± " + fmt(h.resistance_sd, 3));
      kv.add("cycle", std::to_string(cycle) + " (" + report::kCycleNote + ")");
    }
    t += kv.render();
    t += "\n`sortie check` gives the per-phase figures of this flight. Caution: estimates from one log and a model; they "
         "do not certify a pack. Follow the manufacturer's limits and local aviation rules.\n";
    io::write_output("-", printable(t, true));
  }
  return kExitOk;
}

int run_history(const LogbookOptions& o) {
  const bool print = print_format(o.report, {}, o.quiet);
  logbook::Database db = existing(o.db, false);
  const LogbookPack lb = logbook_pack(db, o.pack_id, false);
  const auto fl = db.flights(o.pack_id);
  const auto es = db.estimates(o.pack_id);
  if (print && o.report.format == "json") io::write_output("-", report::history_json(o.db, lb.record, fl, es).dump(2) + "\n");
  if (print && o.report.format == "text") io::write_output("-", printable(report::history_text(o.db, lb.record, fl, es), true));
  return kExitOk;
}

int run_trend(const LogbookOptions& o) {
  const bool print = print_format(o.report, {}, o.quiet);
  logbook::Database db = existing(o.db, false);
  const LogbookPack lb = logbook_pack(db, o.pack_id, false);
  const logbook::PackTrend t = logbook::pack_trend(db.estimates(o.pack_id), o.capacity_limit, o.resistance_limit);
  const std::string page = o.report.html_file.empty() ? "" : report::trend_html(o.db, lb.record, t);
  if (!o.report.html_file.empty()) io::write_output(o.report.html_file, page);
  if (print && o.report.format == "json") io::write_output("-", report::trend_json(o.db, lb.record, t).dump(2) + "\n");
  if (print && o.report.format == "text") io::write_output("-", printable(report::trend_text(o.db, lb.record, t), true));
  return kExitOk;
}

}  // namespace

void add_logbook_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<LogbookOptions>();
  CLI::App* lb = app.add_subcommand("logbook", "The pack logbook (an SQLite file): packs, their flights, SoH estimates and trend");
  lb->add_option("DB", o->db, "the logbook file (created by add-pack when absent)")->required();
  lb->require_subcommand(1);
  auto pack_id = [&](CLI::App* c) {
    c->add_option("--pack", o->pack_id, "the pack's id in the logbook (add-pack prints it; `packs` lists them)")
        ->required()->check(whole_in(1, 2147483647));
  };

  CLI::App* ap = lb->add_subcommand("add-pack", "Add a pack: its pack file (stored as read, with its SHA-256), a name, a serial");
  ap->add_option("PACK", o->pack_file, "the pack file (JSON, as fly reads it)")->required()->check(CLI::ExistingFile);
  ap->add_option("--name", o->name, "your name for this pack")->required();
  ap->add_option("--serial", o->serial, "its serial number or label");
  ap->add_option("--first-use", o->first_use, "date of first use, YYYY-MM-DD (default: today, UTC)");
  add_report_options(ap, o->report, {"text", "json"});
  ap->add_flag("--quiet,-q", o->quiet, "print nothing");
  ap->callback([o, &exit_code] { exit_code = run_add_pack(*o); });

  CLI::App* pk = lb->add_subcommand("packs", "List the packs in the logbook");
  add_report_options(pk, o->report, {"text", "json"});
  pk->add_flag("--quiet,-q", o->quiet, "print nothing");
  pk->callback([o, &exit_code] { exit_code = run_packs(*o); });

  CLI::App* af = lb->add_subcommand("add-flight", "Add a flight of a pack: runs check against the profile and the SoH estimate on the log, stores both");
  af->add_option("LOG", o->log, "flight log (CSV, as check reads it)")->required()->check(CLI::ExistingFile);
  pack_id(af);
  af->add_option("--profile", o->profile, "the mission profile that was planned (JSON); its pack is replaced by the logbook's")
      ->required()->check(CLI::ExistingFile);
  af->add_option("--columns", o->columns, "columns by name or number with units, as check's --columns");
  af->add_option("--date", o->date, "date of the flight, YYYY-MM-DD (default: today, UTC)");
  add_report_options(af, o->report, {"text", "json"});
  af->add_flag("--quiet,-q", o->quiet, "print nothing");
  af->callback([o, &exit_code] { exit_code = run_add_flight(*o); });

  CLI::App* hi = lb->add_subcommand("history", "A pack's flights with their check figures and SoH estimates");
  pack_id(hi);
  add_report_options(hi, o->report, {"text", "json"});
  hi->add_flag("--quiet,-q", o->quiet, "print nothing");
  hi->callback([o, &exit_code] { exit_code = run_history(*o); });

  CLI::App* tr = lb->add_subcommand("trend", "A pack's SoH against cycles: fitted lines and where a limit is reached (extrapolated)");
  pack_id(tr);
  tr->add_option("--capacity-limit", o->capacity_limit, "capacity factor at which the pack is retired (default 0.8, common practice)")
      ->check(number_in(between(0.05, 1.0, "")));
  tr->add_option("--resistance-limit", o->resistance_limit, "resistance factor at which the pack is retired (default 2, a doubled resistance, common practice)")
      ->check(number_in(between(1.0, 20.0, "")));
  add_report_options(tr, o->report, {"text", "json"});
  tr->add_flag("--quiet,-q", o->quiet, "print nothing");
  tr->callback([o, &exit_code] { exit_code = run_trend(*o); });
}

}  // namespace sortie::cli
