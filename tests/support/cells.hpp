#pragma once
// Analytic test cells: flat or linear OCV, constant resistances, built in code (no files).
#include "battery/pack.hpp"

namespace sortie::test {

/// A cell with OCV = v0 + k·SoC (k = 0: flat), R0, and optional RC pairs, all constant.
inline battery::Cell analytic_cell(double capacity_Ah, double v0, double k, double r0,
                                   std::vector<battery::RcPair> rc = {}) {
  battery::Cell c;
  c.name = "analytic test cell";
  c.capacity_Ah = capacity_Ah;
  c.mass_kg = 0.1;
  c.v_max_V = v0 + k + 1.0;
  c.v_cutoff_V = 0.5;
  c.i_cont_max_A = 1000.0;
  c.ocv_V = k == 0.0 ? Table(v0) : Table({0.0, 1.0}, {v0, v0 + k});
  c.r0_ohm = Table(r0);
  c.rc = std::move(rc);
  return c;
}

inline battery::Pack single(const battery::Cell& c, double soc0 = 1.0) {
  battery::Pack p;
  p.cell = c;
  p.soc0 = soc0;
  return p;
}

}  // namespace sortie::test
