#include "io/cell_json_write.hpp"

#include <algorithm>
#include <cmath>

namespace sortie::io {

namespace {

/// v rounded to `decimals` places; dividing by a power of ten prints shortest ("0.3", not
/// "0.30000000000000004").
double round_to(double v, int decimals) {
  const double p = std::pow(10.0, decimals);
  return std::round(v * p) / p;
}

double significant(double v, int digits) {
  if (v == 0.0 || !std::isfinite(v)) return v;
  const int d = digits - 1 - static_cast<int>(std::floor(std::log10(std::fabs(v))));
  return round_to(v, d);
}

/// A number or `{ "soc": [...], "<y_key>": [...] }`.
nlohmann::ordered_json number_or_table(const Table& t, const char* y_key, double (*round)(double)) {
  if (t.is_constant()) return round(t.y().front());
  nlohmann::ordered_json j;
  nlohmann::ordered_json xs = nlohmann::ordered_json::array(), ys = nlohmann::ordered_json::array();
  for (double x : t.x()) xs.push_back(round_to(x, 4));
  for (double y : t.y()) ys.push_back(round(y));
  j["soc"] = xs;
  j[y_key] = ys;
  return j;
}

double ohm(double v) { return std::max(1e-7, significant(v, 5)); }
double seconds(double v) { return std::max(1e-3, significant(v, 4)); }

}  // namespace

nlohmann::ordered_json cell_to_json(const battery::Cell& c, const std::string& note) {
  nlohmann::ordered_json j;
  j["name"] = c.name;
  if (!note.empty()) j["note"] = note;
  if (!c.chemistry.empty()) j["chemistry"] = c.chemistry;
  j["capacity_Ah"] = significant(c.capacity_Ah, 5);
  j["mass_kg"] = significant(c.mass_kg, 4);
  j["v_max_V"] = round_to(c.v_max_V, 3);
  j["v_cutoff_V"] = round_to(c.v_cutoff_V, 3);
  j["i_cont_max_A"] = significant(c.i_cont_max_A, 4);
  nlohmann::ordered_json ocv;
  nlohmann::ordered_json soc = nlohmann::ordered_json::array(), v = nlohmann::ordered_json::array();
  double prev = -1.0;
  for (std::size_t i = 0; i < c.ocv_V.size(); ++i) {
    soc.push_back(round_to(c.ocv_V.x()[i], 4));
    double y = round_to(c.ocv_V.y()[i], 5);
    if (y <= prev) y = round_to(prev + 1e-5, 5);  // rounding never merges two points
    prev = y;
    v.push_back(y);
  }
  ocv["soc"] = soc;
  ocv["V"] = v;
  j["ocv"] = ocv;
  j["r0_ohm"] = number_or_table(c.r0_ohm, "ohm", ohm);
  nlohmann::ordered_json rc = nlohmann::ordered_json::array();
  for (const auto& p : c.rc) {
    nlohmann::ordered_json o;
    o["r_ohm"] = number_or_table(p.r_ohm, "ohm", ohm);
    o["tau_s"] = number_or_table(p.tau_s, "s", seconds);
    rc.push_back(o);
  }
  j["rc"] = rc;
  if (c.temperature) {
    nlohmann::ordered_json t;
    // One temperature column for both factors: the capacity factor is sampled at the
    // resistance table's temperatures (a constant factor gives a one-point table otherwise).
    const Table& rf = c.temperature->r_factor;
    const Table& cf = c.temperature->capacity_factor;
    const Table& axis = rf.size() >= cf.size() ? rf : cf;
    std::vector<double> C = axis.x(), r, q;
    if (C.size() < 2) C = {0.0, 40.0};
    for (double x : C) r.push_back(rf(x)), q.push_back(cf(x));
    t["C"] = C;
    t["r_factor"] = r;
    t["capacity_factor"] = q;
    j["temperature"] = t;
  }
  if (c.thermal) j["thermal"] = {{"c_J_per_kgK", c.thermal->c_J_per_kgK}, {"hA_W_per_K", c.thermal->hA_W_per_K}};
  if (c.coverage) {
    const battery::CellCoverage& v = *c.coverage;
    nlohmann::ordered_json o;
    // SoC rounded inwards, so the range written never claims more than the data.
    o["soc_min"] = std::min(1.0, std::ceil(v.soc_min * 1e4 - 1e-6) / 1e4);
    o["soc_max"] = std::max(0.0, std::floor(v.soc_max * 1e4 + 1e-6) / 1e4);
    if (v.current_max_A) o["current_max_A"] = significant(*v.current_max_A, 5);
    if (v.current_min_A) o["current_min_A"] = significant(*v.current_min_A, 5);
    if (v.temperature_min_C) o["temperature_min_C"] = round_to(*v.temperature_min_C, 2);
    if (v.temperature_max_C) o["temperature_max_C"] = round_to(*v.temperature_max_C, 2);
    o["source"] = v.source;
    j["coverage"] = o;
  }
  if (c.fit_quality) {
    const battery::CellFitQuality& q = *c.fit_quality;
    nlohmann::ordered_json o;
    o["resimulation_rmse_V"] = significant(q.resimulation_rmse_V, 4);
    if (q.held_out_rmse_V) o["held_out_rmse_V"] = significant(*q.held_out_rmse_V, 4);
    o["threshold_V"] = q.threshold_V;
    o["passed"] = q.passed;
    j["fit_quality"] = o;
  }
  return j;
}

}  // namespace sortie::io
