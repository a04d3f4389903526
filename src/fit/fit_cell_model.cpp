#include <algorithm>
#include <cmath>
#include <filesystem>

#include "core/error.hpp"
#include "core/text.hpp"
#include "fit/chemistry.hpp"
#include "fit/fit_cell_steps.hpp"

namespace sortie::fit::detail {

namespace {

std::string file_name(const std::string& path) { return std::filesystem::path(path).filename().string(); }

}  // namespace

/// The OCV as written: the fitted grid over the SoC the counted rows cover, and at most
/// kOcvMarginSoc beyond (the second-difference penalty extends the fitted curve linearly there);
/// checked against the chemistry's physical bounds.
Table written_ocv(FitWork& w) {
  CellFitResult& out = w.out;
  const double cov_lo = std::max(0.0, w.s_lo), cov_hi = std::min(1.0, w.s_hi);
  const double ocv_lo = std::max(0.0, cov_lo - kOcvMarginSoc), ocv_hi = std::min(1.0, cov_hi + kOcvMarginSoc);
  if (ocv_lo > 1e-9)
    out.warnings.push_back("the log reaches down to SoC " + format_fixed(w.s_lo, 3) + " only: the OCV table stops at SoC " +
                           format_fixed(ocv_lo, 3) + " (" + format_fixed(100 * kOcvMarginSoc, 0) +
                           " % below the data); a run below it is outside the model's coverage");
  if (ocv_hi < 1.0 - 1e-9)
    out.warnings.push_back("the log reaches up to SoC " + format_fixed(w.s_hi, 3) + " only: the OCV table stops at SoC " +
                           format_fixed(ocv_hi, 3) + "; a run above it is outside the model's coverage");
  std::vector<double> g01, v01;
  for (std::size_t o = 0; o < w.grid.size(); ++o)
    if (w.grid[o] >= ocv_lo - 1e-9 && w.grid[o] <= ocv_hi + 1e-9)
      g01.push_back(std::clamp(w.grid[o], ocv_lo, ocv_hi)), v01.push_back(w.final_s().ocv_V[o]);
  const Table ocv = ocv_table_from_grid(g01, v01, 0.0005, out.warnings);
  if (w.se().chemistry) {
    const Chemistry& ch = *w.se().chemistry;
    if (ocv.y().front() < ch.ocv_min_V - 1e-9 || ocv.y().back() > ch.ocv_max_V + 1e-9) {
      out.ocv_physical = false;
      out.warnings.push_back("the fitted OCV runs from " + format_fixed(ocv.y().front(), 3) + " to " +
                             format_fixed(ocv.y().back(), 3) + " V, outside what a " + ch.name + " cell can show (" +
                             format_fixed(ch.ocv_min_V, 2) + " to " + format_fixed(ch.ocv_max_V, 2) +
                             " V): the SoC scale or the chemistry is wrong; the fit fails its quality gate");
    }
  }
  return ocv;
}

/// The circuit: name, capacity, OCV, R0 and the RC pairs (tables or constants).
void model_circuit(FitWork& w, const Table& ocv) {
  battery::Cell& c = w.out.cell;
  const RcTables& t = w.final_s().t;
  c.name = w.opts.name.empty() ? "cell fitted from " + file_name(w.log.file) : w.opts.name;
  c.chemistry = w.opts.chemistry;
  c.capacity_Ah = w.se().capacity_Ah;
  c.ocv_V = ocv;
  c.r0_ohm = w.out.tables ? t.r0_table() : Table(t.r0_ohm[0]);
  c.rc.clear();
  for (int p = 0; p < w.nrc; ++p) {
    battery::RcPair rc;
    rc.r_ohm = w.out.tables ? t.r_table(p) : Table(t.r_ohm[p][0]);
    rc.tau_s = w.out.tau_tables ? t.tau_table(p) : Table(t.tau_s[p][0]);
    c.rc.push_back(rc);
  }
}

/// Voltage and current limits and what the data covered (cell JSON "coverage").
void model_limits(FitWork& w) {
  CellFitResult& out = w.out;
  const SocEstimate& se = w.se();
  battery::Cell& c = out.cell;
  double idis_max = 0.0, ichg_max = 0.0;
  for (double i : w.log.current_A) idis_max = std::max(idis_max, i), ichg_max = std::min(ichg_max, i);
  // Full-charge and cutoff voltages: given, the CV level or the chemistry's (fit/soc); never a
  // pulse's peak or the lowest voltage seen.
  if (!(se.v_full_V > 0.0))
    throw InputError(w.log.file + ": the full-charge voltage is not known (got no charge that tapered at a constant voltage and "
                                  "no chemistry, expected --v-max-V or --chemistry)");
  if (!(se.v_empty_V > 0.0))
    throw InputError(w.log.file + ": the cutoff voltage is not known (got no chemistry, expected --v-cutoff-V or --chemistry)");
  c.v_max_V = std::round(se.v_full_V * 1000.0) / 1000.0;
  c.v_cutoff_V = std::round(se.v_empty_V * 1000.0) / 1000.0;
  out.notes.push_back("v_max_V " + format_fixed(c.v_max_V, 3) + " V: " + se.v_full_source + "; v_cutoff_V " +
                      format_fixed(c.v_cutoff_V, 3) + " V: " + se.v_empty_source);
  if (!(c.v_cutoff_V < c.v_max_V))
    throw InputError(w.log.file + ": the cutoff voltage is not below the maximum voltage (got " + format_fixed(c.v_cutoff_V, 3) +
                     " V and " + format_fixed(c.v_max_V, 3) +
                     " V, expected a log that spans a discharge; give --v-max-V and --v-cutoff-V)");
  battery::CellCoverage cov;
  cov.soc_min = std::max(0.0, w.s_lo);
  cov.soc_max = std::min(1.0, w.s_hi);
  cov.current_max_A = idis_max;
  cov.current_min_A = ichg_max;
  if (out.has_temperature) cov.temperature_min_C = out.temperature_min_C, cov.temperature_max_C = out.temperature_max_C;
  cov.source = "fit cell " + file_name(w.log.file);
  c.coverage = cov;
  // How far the model may be trusted in current: a linear circuit fitted up to one rate held
  // twice that rate to 10 mV on an open dataset of a pouch cell, and missed three times it by
  // 30–38 mV as the cell's polarisation grew faster than the current near empty (README, "Fit
  // figures").
  out.notes.push_back("largest discharge current in the log " + format_fixed(idis_max, 2) + " A (" +
                      format_fixed(idis_max / c.capacity_Ah, 2) + " C): above about twice that the model extrapolates; near empty "
                      "at such rates it can hold the voltage up too long. Log pulses at the highest current you will fly");
  if (w.opts.i_cont_max_A) {
    c.i_cont_max_A = *w.opts.i_cont_max_A;
  } else {
    c.i_cont_max_A = std::ceil(std::max(idis_max, 1e-3) * 10.0) / 10.0;
    out.notes.push_back("i_cont_max_A set to the largest discharge current in the log, " + format_fixed(c.i_cont_max_A, 1) +
                        " A (give --i-cont-max-A for the maker's limit)");
  }
}

/// The mass: given, else a placeholder at 200 Wh/kg, typical of Li-ion cells (common practice); flagged.
void model_mass(FitWork& w) {
  battery::Cell& c = w.out.cell;
  if (w.opts.mass_kg) {
    c.mass_kg = *w.opts.mass_kg;
    return;
  }
  const std::vector<double>& v = w.final_s().ocv_V;
  double mean_ocv = 0.0;
  for (double x : v) mean_ocv += x;
  mean_ocv /= static_cast<double>(v.size());
  c.mass_kg = std::max(0.001, std::round(c.capacity_Ah * mean_ocv / 200.0 * 1000.0) / 1000.0);
  w.out.warnings.push_back("mass_kg not given: " + format_fixed(c.mass_kg, 3) +
                           " kg written as a placeholder (200 Wh/kg); weigh the cell and give --mass-kg");
}

/// The thermal block, from a temperature column, within the bounds of a cell of this mass
/// (fit/thermal_fit, fit/cell_priors); none without a temperature column.
void model_thermal(FitWork& w) {
  CellFitResult& out = w.out;
  battery::Cell& c = out.cell;
  if (!out.has_temperature) {
    out.notes.push_back("no thermal block: the log has no temperature column (the model's cell stays at the pack "
                        "temperature; log the cell temperature to get one)");
    return;
  }
  std::string why;
  out.thermal = fit_thermal(w.log, w.soc(), c, w.opts.air_C, thermal_prior(c.mass_kg), out.warnings, why);
  if (!out.thermal) {
    out.warnings.push_back("no thermal block: " + why);
    return;
  }
  c.thermal = battery::Thermal{out.thermal->heat_capacity_J_per_K / c.mass_kg, out.thermal->hA_W_per_K};
  out.notes.push_back("thermal block: " + out.thermal->how);
}

/// The resistances' temperature dependence: Arrhenius, fitted where the log's current steps
/// span enough temperature, else the prior (fit/cell_priors).
void model_temperature(FitWork& w) {
  CellFitResult& out = w.out;
  double ref = 25.0;
  std::string how = "(assumed: the log has no temperature column; give --air-C for the test's temperature)";
  if (out.has_temperature) {
    ref = out.temperature_mean_C;
    how = "(the log's mean cell temperature)";
  } else if (w.opts.air_C) {
    ref = *w.opts.air_C;
    how = "(the air temperature given)";
  }
  out.arrhenius = fit_arrhenius(w.log, w.steps, out.cell, ref, how);
  out.cell.temperature = arrhenius_effect(*out.arrhenius);
  (out.arrhenius->fitted ? out.notes : out.warnings).push_back("resistance over temperature (Arrhenius): " + out.arrhenius->how);
}

/// The note written into the model file.
void model_note(FitWork& w) {
  const CellFitResult& out = w.out;
  const SocEstimate& se = w.se();
  w.out.note = "Fitted by sortie fit cell from " + file_name(w.log.file) + " (" + std::to_string(w.n) +
               " rows): capacity " + se.capacity_source + "; OCV fitted with the RC pairs, started from " +
               std::to_string(out.ocv_rest_points) + " rest ends and " + std::to_string(out.ocv_loaded_points) +
               " low-rate rows; " + std::to_string(w.nrc) + " RC pair(s)" +
               (out.tables ? " as tables over SoC" : " as constants") +
               (out.has_temperature ? "; at a mean cell temperature of " + format_fixed(out.temperature_mean_C, 1) + " °C" : "") +
               (out.thermal ? "; thermal block from the logged temperature" : "") +
               (w.opts.mass_kg ? "" : "; mass_kg is a placeholder") + ". An estimate from measurements, not a rating.";
}

}  // namespace sortie::fit::detail
