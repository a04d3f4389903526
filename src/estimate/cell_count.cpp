#include "estimate/cell_count.hpp"

#include <algorithm>
#include <cstdio>

#include "battery/thevenin.hpp"
#include "core/error.hpp"

namespace sortie::estimate {

namespace {

std::string num(double v, int d) {
  char b[64];
  std::snprintf(b, sizeof b, "%.*f", d, v);
  return b;
}

}  // namespace

CellCountCheck check_cell_count(const battery::Pack& pack, const sim::MeasuredFlight& log, const std::string& file,
                                const CellCountOptions& opts) {
  CellCountCheck c;
  const battery::PackModel m(pack);
  const auto& ocv = pack.cell.ocv_V.y();
  c.ocv_lo_V = *std::min_element(ocv.begin(), ocv.end());
  c.ocv_hi_V = std::max(*std::max_element(ocv.begin(), ocv.end()), pack.cell.v_max_V);
  // R0_pack already holds soh_resistance, r_factor(T) and the wiring (battery/thevenin.hpp); the
  // resistances at full charge, where a log's fullest row usually is.
  double r_dc = m.r0_pack_ohm(1.0);
  for (std::size_t i = 0; i < m.n_rc; ++i) r_dc += m.r_pack_ohm[i](1.0);
  c.r_dc_ohm = r_dc * opts.resistance_margin;
  const double s = pack.series;
  bool any = false;
  for (std::size_t k = 0; k < log.voltage_V.size(); ++k) {
    const double i = log.current_A[k];
    if (!(i >= 0.0)) continue;
    const double rest = (log.voltage_V[k] + i * c.r_dc_ohm) / s;
    const double load = log.voltage_V[k] / s;
    if (!any || rest > c.rest_cell_max_V) c.rest_cell_max_V = rest, c.rest_row = k;
    if (!any || load > c.load_cell_max_V) c.load_cell_max_V = load, c.load_row = k;
    any = true;
  }
  if (!any) return c;
  const std::string layout = pack.layout();
  const std::string series = std::to_string(pack.series);
  auto line = [&](std::size_t k) {
    return k < log.lines.size() ? "line " + std::to_string(log.lines[k]) + ": " : std::string();
  };
  if (c.rest_cell_max_V < c.ocv_lo_V - opts.tolerance_V) {
    const double need = c.ocv_lo_V - opts.tolerance_V;
    c.ok = false;
    c.why = file + ": " + line(c.rest_row) + "the pack voltage is too low for " + series +
            " cells in series: at most " + num(c.rest_cell_max_V, 2) + " V per cell at rest over the whole log (got " +
            num(log.voltage_V[c.rest_row], 2) + " V at " + num(log.current_A[c.rest_row], 2) + " A, expected at least " +
            series + " x " + num(need, 2) + " V = " + num(need * s, 2) + " V at rest for the " + layout +
            " pack, whose cell OCV spans " + num(c.ocv_lo_V, 2) + "-" + num(c.ocv_hi_V, 2) +
            " V: a log from a pack with fewer cells?)";
  } else if (c.load_cell_max_V > c.ocv_hi_V + opts.tolerance_V) {
    const double lim = c.ocv_hi_V + opts.tolerance_V;
    c.ok = false;
    c.why = file + ": " + line(c.load_row) + "the pack voltage is too high for " + series +
            " cells in series: " + num(c.load_cell_max_V, 2) + " V per cell while discharging (got " +
            num(log.voltage_V[c.load_row], 2) + " V at " + num(log.current_A[c.load_row], 2) + " A, expected at most " +
            series + " x " + num(lim, 2) + " V = " + num(lim * s, 2) + " V for the " + layout +
            " pack, whose cell OCV spans " + num(c.ocv_lo_V, 2) + "-" + num(c.ocv_hi_V, 2) +
            " V: a log from a pack with more cells?)";
  }
  return c;
}

void require_cell_count(const battery::Pack& pack, const sim::MeasuredFlight& log, const std::string& file,
                        const CellCountOptions& opts) {
  const CellCountCheck c = check_cell_count(pack, log, file, opts);
  if (!c.ok) throw InputError(c.why);
}

}  // namespace sortie::estimate
