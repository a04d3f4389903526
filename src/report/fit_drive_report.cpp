#include "report/fit_drive_report.hpp"

#include <algorithm>
#include <cmath>

#include "report/text_table.hpp"

namespace sortie::report {

namespace {

std::string pct(double v) { return std::isfinite(v) ? fixed(v, 2) : "-"; }

nlohmann::ordered_json number_or_null(double v) {
  return std::isfinite(v) ? nlohmann::ordered_json(v) : nlohmann::ordered_json();
}

}  // namespace

std::string fit_drive_text(const std::string& bench_file, const fit::DriveFitResult& r,
                           const std::string& model_file) {
  std::string out = "sortie fit drive: " + bench_file + " -> " + model_file + "\n\n";
  std::size_t turning = 0;
  double v_lo = 1e300, v_hi = 0.0;
  for (const auto& p : r.points) {
    turning += p.running ? 1 : 0;
    v_lo = std::min(v_lo, p.measured.v_bus_V);
    v_hi = std::max(v_hi, p.measured.v_bus_V);
  }
  KeyValues kv;
  kv.add("bench", std::to_string(r.points.size()) + " throttle steps (" + std::to_string(turning) + " turning), bus " +
                      fixed(v_lo, 2) + " to " + fixed(v_hi, 2) + " V" + (r.has_torque ? ", torque measured" : ", no torque"));
  for (const auto& n : r.notes) kv.add("", n);
  kv.add("fit", std::to_string(r.iterations) + " Levenberg-Marquardt steps, " + fit::to_string(r.status));
  std::string rmsline = "rpm " + fixed(r.rms_rpm_pct, 2) + " %, thrust " + fixed(r.rms_thrust_pct, 2) + " %, bus power " +
                        fixed(r.rms_power_pct, 2) + " % (largest " + fixed(r.max_power_pct, 2) + " %)";
  if (r.has_torque) rmsline += ", torque " + fixed(r.rms_torque_pct, 2) + " %";
  kv.add("RMS error", rmsline);
  out += kv.render();

  out += "\nparameters (± one standard error)\n";
  TextTable pt({"parameter", "value", "unit", "± %"});
  for (const auto& p : r.parameters) {
    const int digits = p.value >= 100 ? 1 : (p.value >= 1 ? 3 : 5);
    pt.add_row({p.name, fixed(p.value, digits), p.unit, p.at_bound ? "at bound" : fixed(100.0 * p.se_rel, 1)});
  }
  out += pt.render();

  out += "\nper throttle step: measured beside the model (err = model - measured)\n";
  std::vector<std::string> head = {"throttle %", "bus V", "rpm", "model", "err %", "thrust N", "model", "err %",
                                   "bus W", "model", "err %"};
  if (r.has_torque) head.insert(head.end(), {"η meas", "η model"});
  head.insert(head.end(), {"g/W meas", "g/W model"});
  TextTable t(head);
  for (const auto& p : r.points) {
    const auto& m = p.measured;
    std::vector<std::string> row = {fixed(m.throttle_pct, 1), fixed(m.v_bus_V, 2), fixed(m.rpm, 0), fixed(p.rpm, 0),
                                    pct(p.err_rpm_pct), fixed(m.thrust_N, 3), fixed(p.thrust_N, 3),
                                    pct(p.err_thrust_pct), fixed(m.bus_W(), 2), fixed(p.bus_W, 2), pct(p.err_power_pct)};
    if (r.has_torque) {
      row.push_back(std::isfinite(p.eta_measured) ? fixed(p.eta_measured, 3) : "-");
      row.push_back(fixed(p.eta_model, 3));
    }
    row.push_back(fixed(p.g_per_W_measured, 2));
    row.push_back(fixed(p.g_per_W_model, 2));
    t.add_row(row);
  }
  out += t.render();
  if (!r.warnings.empty()) {
    out += "\nwarnings:\n";
    for (const auto& w : r.warnings) out += "  " + w + "\n";
  }
  out += "\nA model fitted to one bench test: check it at another voltage before trusting it, and respect the makers' limits.\n";
  return out;
}

nlohmann::ordered_json fit_drive_json(const std::string& bench_file, const fit::DriveFitResult& r,
                                      const std::string& model_file) {
  nlohmann::ordered_json j;
  j["schema"] = kFitDriveSchema;
  j["bench_file"] = bench_file;
  j["model_file"] = model_file;
  j["has_torque"] = r.has_torque;
  j["iterations"] = r.iterations;
  j["status"] = fit::to_string(r.status);
  j["rms_rpm_pct"] = r.rms_rpm_pct;
  j["rms_thrust_pct"] = r.rms_thrust_pct;
  j["rms_power_pct"] = r.rms_power_pct;
  j["max_power_pct"] = r.max_power_pct;
  if (r.has_torque) j["rms_torque_pct"] = r.rms_torque_pct;
  nlohmann::ordered_json params = nlohmann::ordered_json::array();
  for (const auto& p : r.parameters)
    params.push_back({{"name", p.name}, {"unit", p.unit}, {"value", p.value}, {"se_rel", p.se_rel}, {"at_bound", p.at_bound}});
  j["parameters"] = params;
  nlohmann::ordered_json pts = nlohmann::ordered_json::array();
  for (const auto& p : r.points) {
    const auto& m = p.measured;
    nlohmann::ordered_json o;
    o["throttle_pct"] = m.throttle_pct;
    o["v_bus_V"] = m.v_bus_V;
    o["turning"] = p.running;
    o["measured"] = {{"rpm", m.rpm}, {"thrust_N", m.thrust_N}, {"bus_W", m.bus_W()},
                     {"torque_Nm", m.torque_Nm ? nlohmann::ordered_json(*m.torque_Nm) : nlohmann::ordered_json()},
                     {"eta", number_or_null(p.eta_measured)}, {"g_per_W", p.g_per_W_measured}};
    o["model"] = {{"rpm", p.rpm}, {"thrust_N", p.thrust_N}, {"bus_W", p.bus_W}, {"torque_Nm", p.torque_Nm},
                  {"eta", p.eta_model}, {"g_per_W", p.g_per_W_model}};
    o["error_pct"] = {{"rpm", number_or_null(p.err_rpm_pct)}, {"thrust", number_or_null(p.err_thrust_pct)},
                      {"bus_power", number_or_null(p.err_power_pct)}, {"torque", number_or_null(p.err_torque_pct)}};
    pts.push_back(o);
  }
  j["points"] = pts;
  j["notes"] = r.notes;
  j["warnings"] = r.warnings;
  return j;
}

}  // namespace sortie::report
