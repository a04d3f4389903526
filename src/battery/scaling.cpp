#include "battery/scaling.hpp"

#include <cassert>
#include <cmath>

namespace sortie::battery {

Cell scale_cell(const Cell& c, double capacity_Ah) {
  assert(capacity_Ah > 0 && c.capacity_Ah > 0);
  const double k = capacity_Ah / c.capacity_Ah;
  Cell out = c;
  out.capacity_Ah = capacity_Ah;
  out.mass_kg = c.mass_kg * k;
  out.i_cont_max_A = c.i_cont_max_A * k;
  if (out.burst) out.burst->i_max_A = c.burst->i_max_A * k;
  out.r0_ohm = c.r0_ohm.scaled(1.0 / k);
  for (auto& rc : out.rc) rc.r_ohm = rc.r_ohm.scaled(1.0 / k);
  // The covered currents are those of the same C-rates in the bigger cell; SoC and temperature
  // ranges stay.
  if (out.coverage) {
    if (out.coverage->current_max_A) *out.coverage->current_max_A *= k;
    if (out.coverage->current_min_A) *out.coverage->current_min_A *= k;
  }
  // Heat grows with k at a given C-rate (I²·R ∝ k²/k) and so does the heat capacity; the cooling
  // surface of a cell of the same shape grows as k^(2/3).
  if (out.thermal) out.thermal->hA_W_per_K = c.thermal->hA_W_per_K * std::cbrt(k * k);
  return out;
}

}  // namespace sortie::battery
