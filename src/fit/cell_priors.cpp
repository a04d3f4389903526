#include "fit/cell_priors.hpp"

#include <algorithm>
#include <cmath>

#include "core/text.hpp"

namespace sortie::fit {

namespace {

double inv_kelvin(double t_C) { return 1.0 / (t_C + 273.15); }

}  // namespace

ArrheniusFit fit_arrhenius(const battery::CellLog& log, const std::vector<CurrentStep>& steps, const battery::Cell& cell,
                           double reference_C, const std::string& reference_how) {
  ArrheniusFit a;
  a.reference_C = reference_C;
  std::vector<double> xs, ys;
  double lo = 1e300, hi = -1e300;
  if (log.temperature_C.size() == log.size())
    for (const CurrentStep& s : steps) {
      const double t = log.temperature_C[s.row];
      const double r0 = cell.r0_ohm(std::clamp(s.soc, 0.0, 1.0));
      if (!std::isfinite(t) || !(s.r_ohm > 0.0) || !(r0 > 0.0)) continue;
      xs.push_back(inv_kelvin(t) - inv_kelvin(reference_C));
      ys.push_back(std::log(s.r_ohm / r0));
      lo = std::min(lo, t), hi = std::max(hi, t);
    }
  a.steps = xs.size();
  a.spread_K = xs.empty() ? 0.0 : hi - lo;
  const std::string prior = "prior E_a " + format_fixed(a.ea_J_per_mol / 1000.0, 0) +
                            " kJ/mol (from memory: whole-cell Li-ion resistances, 20-50 kJ/mol)";
  if (xs.size() < 6 || a.spread_K < kArrheniusMinSpreadK) {
    a.how = prior + ": the current steps' temperatures span " + format_fixed(a.spread_K, 1) + " K over " +
            std::to_string(xs.size()) + " steps (fitted from a spread of " + format_fixed(kArrheniusMinSpreadK, 0) +
            " K or more); reference " + format_fixed(reference_C, 1) + " °C " + reference_how;
    return a;
  }
  double mx = 0.0, my = 0.0;
  for (std::size_t i = 0; i < xs.size(); ++i) mx += xs[i], my += ys[i];
  mx /= static_cast<double>(xs.size());
  my /= static_cast<double>(xs.size());
  double sxx = 0.0, sxy = 0.0;
  for (std::size_t i = 0; i < xs.size(); ++i) sxx += (xs[i] - mx) * (xs[i] - mx), sxy += (xs[i] - mx) * (ys[i] - my);
  const double ea = kGasConstant * sxy / sxx;
  if (!(ea >= kArrheniusMinJPerMol && ea <= kArrheniusMaxJPerMol)) {
    a.how = prior + ": the fit over " + std::to_string(xs.size()) + " steps spanning " + format_fixed(a.spread_K, 1) +
            " K gave " + format_fixed(ea / 1000.0, 1) + " kJ/mol, outside the physical " +
            format_fixed(kArrheniusMinJPerMol / 1000.0, 0) + "-" + format_fixed(kArrheniusMaxJPerMol / 1000.0, 0) +
            " kJ/mol; reference " + format_fixed(reference_C, 1) + " °C " + reference_how;
    return a;
  }
  a.ea_J_per_mol = ea;
  a.fitted = true;
  a.how = "fitted E_a " + format_fixed(ea / 1000.0, 1) + " kJ/mol from " + std::to_string(xs.size()) +
          " current steps spanning " + format_fixed(a.spread_K, 1) + " K; reference " + format_fixed(reference_C, 1) +
          " °C " + reference_how;
  return a;
}

battery::TemperatureEffect arrhenius_effect(const ArrheniusFit& a) {
  std::vector<double> t, f;
  for (int c = -20; c <= 60; c += 5) {
    t.push_back(c);
    const double e = std::exp(a.ea_J_per_mol / kGasConstant * (inv_kelvin(c) - inv_kelvin(a.reference_C)));
    f.push_back(std::round(e * 1e4) / 1e4);
  }
  battery::TemperatureEffect eff;
  eff.r_factor = Table(t, f);
  return eff;
}

ThermalPrior thermal_prior(double mass_kg) {
  ThermalPrior p;
  const double volume_m3 = std::max(1e-7, mass_kg) / 2500.0;
  p.area_m2 = 6.0 * std::pow(volume_m3, 2.0 / 3.0);
  p.hA_lo = 7.0 * p.area_m2;
  p.hA_hi = 40.0 * 3.0 * p.area_m2;
  p.hA_default = 10.0 * p.area_m2;
  return p;
}

}  // namespace sortie::fit
