#include "sim/model_range.hpp"

#include <algorithm>
#include <cmath>

#include "core/roots.hpp"
#include "core/text.hpp"

namespace sortie::sim {

namespace {

/// Crossing times to 0.1 ms, the segment's event tolerance.
constexpr double kTimeTolS = 1e-4;

std::string value_words(const std::string& quantity, double v) {
  if (quantity == "soc") return format_fixed(v * 100.0, 1) + " %";
  if (quantity == "cell_current_A") return format_fixed(v, 2) + " A";
  if (quantity == "cell_temperature_C") return format_fixed(v, 1) + " °C";
  return format_fixed(v, 3) + " V";
}

std::string quantity_words(const std::string& quantity) {
  if (quantity == "soc") return "state of charge";
  if (quantity == "cell_current_A") return "cell current";
  if (quantity == "cell_temperature_C") return "cell temperature";
  return "loaded cell voltage";
}

std::string range_words(const Excursion& e) {
  const bool below = e.side == "below";
  if (e.range == "coverage")
    return std::string(below ? "the lowest" : "the highest") + " the cell model's data covered";
  if (e.range == "ocv_table")
    return std::string("the ") + (below ? "first" : "last") + " point of the OCV table (the OCV is held flat beyond it: invented)";
  if (e.range == "temperature_table")
    return std::string("the ") + (below ? "coldest" : "warmest") +
           " point of the temperature table (its factors are held beyond it: extrapolated)";
  return "the cell's maximum voltage v_max_V";
}

}  // namespace

RangeWatch::RangeWatch(const battery::Pack& pack) {
  const battery::Cell& c = pack.cell;
  const double P = pack.parallel, S = pack.series;
  auto soc = [](const Sample& s) { return s.x[battery::kSoc]; };
  auto current = [P](const Sample& s) { return s.term.current_A / P; };
  auto temperature = [](const Sample& s) { return s.x[battery::kTemp]; };
  auto voltage = [S](const Sample& s) { return s.term.v_terminal_V / S; };
  auto add = [&](std::string q, std::string side, std::string range, double limit,
                 std::function<double(const Sample&)> value) {
    Bound b;
    b.e.quantity = std::move(q);
    b.e.side = std::move(side);
    b.e.range = std::move(range);
    b.e.limit = limit;
    b.e.extreme = limit;
    b.below = b.e.side == "below";
    b.value = std::move(value);
    bounds_.push_back(std::move(b));
  };
  // A constant OCV (one value, as test cells have) is a claim for every SoC, not a table.
  const bool table = !c.ocv_V.is_constant();
  const double ocv_lo = table ? c.ocv_V.x().front() : 0.0, ocv_hi = table ? c.ocv_V.x().back() : 1.0;
  if (table) {
    add("soc", "below", "ocv_table", ocv_lo, soc);
    add("soc", "above", "ocv_table", ocv_hi, soc);
  }
  if (const auto& cov = c.coverage) {
    // A covered bound inside the table's is the stricter claim; one outside it says nothing the
    // table's bound does not.
    if (cov->soc_min > ocv_lo) add("soc", "below", "coverage", cov->soc_min, soc);
    if (cov->soc_max < ocv_hi) add("soc", "above", "coverage", cov->soc_max, soc);
    if (cov->current_max_A) add("cell_current_A", "above", "coverage", *cov->current_max_A, current);
    if (cov->current_min_A) add("cell_current_A", "below", "coverage", *cov->current_min_A, current);
    if (cov->temperature_min_C) add("cell_temperature_C", "below", "coverage", *cov->temperature_min_C, temperature);
    if (cov->temperature_max_C) add("cell_temperature_C", "above", "coverage", *cov->temperature_max_C, temperature);
  }
  if (c.temperature) {
    const auto& C = c.temperature->r_factor.is_constant() ? c.temperature->capacity_factor.x()
                                                          : c.temperature->r_factor.x();
    if (C.size() > 1) {
      add("cell_temperature_C", "below", "temperature_table", C.front(), temperature);
      add("cell_temperature_C", "above", "temperature_table", C.back(), temperature);
    }
  }
  add("cell_voltage_V", "above", "v_max", c.v_max_V, voltage);
}

double RangeWatch::margin(const Bound& b, const Sample& s) {
  const double v = b.value(s);
  return b.below ? v - b.e.limit : b.e.limit - v;
}

void RangeWatch::visit(Bound& b, const Sample& s, double g) {
  if (g < 0.0 && -g > b.e.beyond()) b.e.extreme = b.value(s);
}

void RangeWatch::start(const Sample& s, int phase) {
  for (auto& b : bounds_) {
    const double g = margin(b, s);
    if (g < 0.0 && !b.outside) {
      b.outside = true;
      if (b.e.intervals++ == 0) {
        b.e.first_s = s.t;
        b.e.phase = phase;
      }
    }
    visit(b, s, g);
    b.e.at_end = b.outside;
  }
}

void RangeWatch::step(double ta, double tb, const std::function<Sample(double)>& at, int phase) {
  if (!(tb > ta)) return;
  step(at(ta), at(0.5 * (ta + tb)), at(tb), at, phase);
}

void RangeWatch::step(const Sample& a0, const Sample& mid, const Sample& b0, const std::function<Sample(double)>& at,
                      int phase) {
  if (!(b0.t > a0.t)) return;
  const Sample* pts[3] = {&a0, &mid, &b0};
  for (auto& b : bounds_) {
    double g[3];
    for (int k = 0; k < 3; ++k) {
      g[k] = margin(b, *pts[k]);
      visit(b, *pts[k], g[k]);
    }
    auto leave = [&](double t) {
      if (b.outside) return;
      b.outside = true;
      if (b.e.intervals++ == 0) {
        b.e.first_s = t;
        b.e.phase = phase;
      }
    };
    for (int k = 0; k < 2; ++k) {
      const double a = pts[k]->t, z = pts[k + 1]->t;
      const bool out_a = g[k] < 0.0, out_z = g[k + 1] < 0.0;
      if (out_a) leave(a);  // outside at a point the watch had not seen it leave
      if (out_a == out_z) {
        if (out_a) b.e.duration_s += z - a;
        continue;
      }
      // The crossing, bracketed on the dense output (docs/style.md rule 8).
      auto gt = [&](double t) { return margin(b, at(t)); };
      const double tc = find_root(gt, a, z, g[k], g[k + 1], kTimeTolS).value_or(out_z ? a : z);
      if (out_z) {
        leave(tc);
        b.e.duration_s += z - tc;
      } else {
        b.e.duration_s += tc - a;
        b.outside = false;
      }
    }
    b.e.at_end = b.outside;
  }
}

std::vector<Excursion> RangeWatch::excursions() const {
  std::vector<Excursion> out;
  for (const auto& b : bounds_)
    if (b.e.intervals > 0) out.push_back(b.e);
  std::stable_sort(out.begin(), out.end(), [](const Excursion& a, const Excursion& b) { return a.first_s < b.first_s; });
  return out;
}

std::string brief(const Excursion& e) {
  return quantity_words(e.quantity) + " " + e.side + " " + value_words(e.quantity, e.limit) + " (" +
         (e.side == "below" ? "down to " : "up to ") + value_words(e.quantity, e.extreme) + ", " +
         format_fixed(e.duration_s, 1) + " s)";
}

std::string describe(const Excursion& e) {
  std::string s = quantity_words(e.quantity) + " " + e.side + " " + value_words(e.quantity, e.limit) + ", " +
                  range_words(e) + ": " + (e.side == "below" ? "down to " : "up to ") +
                  value_words(e.quantity, e.extreme) + " (" + value_words(e.quantity, e.beyond()) + " beyond) for " +
                  format_fixed(e.duration_s, 1) + " s from t = " + format_fixed(e.first_s, 1) + " s";
  if (e.intervals > 1) s += " in " + std::to_string(e.intervals) + " stretches";
  if (e.at_end) s += ", still outside at the end";
  return s;
}

}  // namespace sortie::sim
