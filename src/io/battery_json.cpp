#include "io/battery_json.hpp"

#include "core/error.hpp"

namespace sortie::io {

namespace {

/// The "coverage" block: every field optional, each lower bound at most its upper bound.
battery::CellCoverage read_coverage(ObjectReader v) {
  battery::CellCoverage cov;
  cov.soc_min = v.number_or("soc_min", 0.0, between(0.0, 1.0, ""));
  cov.soc_max = v.number_or("soc_max", 1.0, between(0.0, 1.0, ""));
  if (cov.soc_max <= cov.soc_min)
    v.fail("soc_max", "covered SoC range empty", format_number(cov.soc_max),
           "above soc_min = " + format_number(cov.soc_min));
  // A cell current beyond 10 kA is a unit slip (mA), not a cell.
  cov.current_max_A = v.optional_number("current_max_A", between(-1e4, 1e4, "A"));
  cov.current_min_A = v.optional_number("current_min_A", between(-1e4, 1e4, "A"));
  if (cov.current_min_A && cov.current_max_A && *cov.current_min_A > *cov.current_max_A)
    v.fail("current_min_A", "covered current range empty", format_number(*cov.current_min_A) + " A",
           "at most current_max_A = " + format_number(*cov.current_max_A) + " A");
  cov.temperature_min_C = v.optional_number("temperature_min_C", between(-60.0, 100.0, "C"));
  cov.temperature_max_C = v.optional_number("temperature_max_C", between(-60.0, 100.0, "C"));
  if (cov.temperature_min_C && cov.temperature_max_C && *cov.temperature_min_C > *cov.temperature_max_C)
    v.fail("temperature_min_C", "covered temperature range empty", format_number(*cov.temperature_min_C) + " C",
           "at most temperature_max_C = " + format_number(*cov.temperature_max_C) + " C");
  cov.source = v.string_or("source", "");
  v.finish();
  return cov;
}

}  // namespace

battery::Cell read_cell(ObjectReader& r) {
  battery::Cell c;
  c.name = r.string_or("name", "");
  c.chemistry = r.string_or("chemistry", "");
  c.capacity_Ah = r.number("capacity_Ah", positive("Ah"));
  c.mass_kg = r.number("mass_kg", positive("kg"));
  c.v_max_V = r.number("v_max_V", above_to(0.0, 10.0, "V"));
  c.v_cutoff_V = r.number("v_cutoff_V", above_to(0.0, 10.0, "V"));
  if (c.v_cutoff_V >= c.v_max_V)
    r.fail("v_cutoff_V", "cutoff voltage at or above the maximum voltage",
           format_number(c.v_cutoff_V) + " V", "below v_max_V = " + format_number(c.v_max_V) + " V");
  c.i_cont_max_A = r.number("i_cont_max_A", positive("A"));
  // A burst rating comes as a pair: the current and how long it may be held.
  if (r.has("i_burst_max_A") || r.has("burst_s")) {
    battery::Burst b;
    b.i_max_A = r.number("i_burst_max_A", positive("A"));
    b.duration_s = r.number("burst_s", above_to(0.0, 3600.0, "s"));
    if (b.i_max_A < c.i_cont_max_A)
      r.fail("i_burst_max_A", "burst current below the continuous limit", format_number(b.i_max_A) + " A",
             "at least i_cont_max_A = " + format_number(c.i_cont_max_A) + " A");
    c.burst = b;
  }
  c.ocv_V = r.table("ocv", "soc", "V", between(0.0, 1.0, ""), above_to(0.0, 10.0, "V"), 11);
  r.object("ocv").require_increasing("V", c.ocv_V.y(), "OCV not increasing with SoC");
  c.r0_ohm = r.number_or_table("r0_ohm", "soc", "ohm", between(0.0, 1.0, ""), positive("ohm"));
  if (r.has("rc")) {
    auto pairs = r.objects("rc", 0);
    if (pairs.size() > 2)
      r.fail("rc", "too many RC pairs", std::to_string(pairs.size()), "0, 1 or 2");
    for (auto& p : pairs) {
      battery::RcPair rc;
      rc.r_ohm = p.number_or_table("r_ohm", "soc", "ohm", between(0.0, 1.0, ""), positive("ohm"));
      rc.tau_s = p.number_or_table("tau_s", "soc", "s", between(0.0, 1.0, ""), positive("s"));
      p.finish();
      c.rc.push_back(std::move(rc));
    }
  }
  if (r.has("temperature")) {
    ObjectReader t = r.object("temperature");
    const std::vector<double> C = t.numbers("C", between(-60.0, 100.0, "C"));
    if (C.size() < 2) t.fail("C", "too few table points", std::to_string(C.size()), "at least 2");
    t.require_increasing("C", C, "'C' not strictly increasing");
    battery::TemperatureEffect eff;
    if (t.has("r_factor")) {
      auto f = t.numbers("r_factor", positive(""));
      t.require_length("r_factor", f, C.size(), "C");
      eff.r_factor = Table(C, std::move(f));
    }
    if (t.has("capacity_factor")) {
      auto f = t.numbers("capacity_factor", above_to(0.0, 2.0, ""));
      t.require_length("capacity_factor", f, C.size(), "C");
      eff.capacity_factor = Table(C, std::move(f));
    }
    t.finish();
    c.temperature = eff;
  }
  if (r.has("thermal")) {
    ObjectReader t = r.object("thermal");
    battery::Thermal th;
    // Li-ion cells hold about 0.8–1.3 kJ/(kg·K) (common practice); the range only refuses typing
    // slips such as a value in kJ.
    th.c_J_per_kgK = t.number("c_J_per_kgK", between(100.0, 5000.0, "J/(kg·K)"));
    th.hA_W_per_K = t.number("hA_W_per_K", between(0.0, 1000.0, "W/K"));
    t.finish();
    c.thermal = th;
  }
  if (r.has("coverage")) c.coverage = read_coverage(r.object("coverage"));
  if (r.has("fit_quality")) {
    ObjectReader v = r.object("fit_quality");
    battery::CellFitQuality q;
    q.resimulation_rmse_V = v.number("resimulation_rmse_V", between(0.0, 10.0, "V"));
    if (v.has("held_out_rmse_V")) q.held_out_rmse_V = v.number("held_out_rmse_V", between(0.0, 10.0, "V"));
    q.threshold_V = v.number("threshold_V", between(0.0, 10.0, "V"));
    q.passed = v.boolean_or("passed", false);
    v.finish();
    c.fit_quality = q;
  }
  r.finish();
  return c;
}

battery::Pack read_pack(ObjectReader& r) {
  battery::Pack p;
  p.name = r.string_or("name", "");
  {
    ObjectReader cr = r.model("cell");
    p.cell = read_cell(cr);
  }
  p.series = r.integer("series", 1, 1000);
  p.parallel = r.integer_or("parallel", 1, 1, 1000);
  p.wiring_ohm = r.number_or("wiring_ohm", 0.0, between(0.0, 10.0, "ohm"));
  if (r.has("soh")) {
    ObjectReader s = r.object("soh");
    p.soh_capacity = s.number_or("capacity", 1.0, above_to(0.0, 1.5, ""));
    p.soh_resistance = s.number_or("resistance", 1.0, above_to(0.0, 20.0, ""));
    s.finish();
  }
  p.temperature_C = r.number_or("temperature_C", 25.0, between(-60.0, 100.0, "C"));
  p.air_C = r.optional_number("air_temperature_C", between(-60.0, 100.0, "C"));
  const bool has_soc = r.has("soc0");
  const bool has_v = r.has("v_rest_cell0_V");
  if (has_soc && has_v)
    r.fail("v_rest_cell0_V", "give either soc0 or v_rest_cell0_V, not both");
  if (has_v) {
    const double v = r.number("v_rest_cell0_V", above_to(0.0, 10.0, "V"));
    const auto& ocv = p.cell.ocv_V;
    const double lo = ocv.y().front(), hi = ocv.y().back();
    if (v < lo || v > hi)
      r.fail("v_rest_cell0_V", "initial resting voltage outside the OCV table",
             format_number(v) + " V", "from " + format_number(lo) + " to " + format_number(hi) + " V");
    p.soc0 = ocv.inverse(v);
  } else {
    p.soc0 = r.number_or("soc0", 1.0, between(0.0, 1.0, ""));
  }
  r.finish();
  return p;
}

battery::Cell load_cell_file(const std::filesystem::path& path) {
  ObjectReader r = open_model_file(path);
  return read_cell(r);
}

battery::Pack load_pack_file(const std::filesystem::path& path) {
  ObjectReader r = open_model_file(path);
  return read_pack(r);
}

battery::Cell parse_cell_json(const std::string& text, const Source& src) {
  ObjectReader r = open_model_text(text, src);
  return read_cell(r);
}

battery::Pack parse_pack_json(const std::string& text, const Source& src) {
  ObjectReader r = open_model_text(text, src);
  return read_pack(r);
}

}  // namespace sortie::io
