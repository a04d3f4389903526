#include "fit/voltage_error.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace sortie::fit {

namespace {
struct Acc {
  double sum2 = 0.0, sum = 0.0;
  VoltageError e;
  void add(std::size_t row, double d) {
    ++e.rows;
    sum2 += d * d;
    sum += d;
    if (std::fabs(d) > e.max_abs_V) {
      e.max_abs_V = std::fabs(d);
      e.max_row = row;
    }
  }
  VoltageError done() const {
    VoltageError r = e;
    if (r.rows > 0) {
      r.rmse_V = std::sqrt(sum2 / static_cast<double>(r.rows));
      r.mean_V = sum / static_cast<double>(r.rows);
    }
    return r;
  }
};
}  // namespace

VoltageErrors voltage_errors(const std::vector<double>& measured, const std::vector<double>& model,
                             const std::vector<double>& soc, const std::vector<double>& band_centres) {
  assert(measured.size() == model.size());
  Acc all;
  std::vector<Acc> bands(band_centres.size());
  for (std::size_t k = 0; k < measured.size(); ++k) {
    const double d = model[k] - measured[k];
    all.add(k, d);
    if (band_centres.empty() || k >= soc.size()) continue;
    std::size_t best = 0;
    for (std::size_t b = 1; b < band_centres.size(); ++b)
      if (std::fabs(band_centres[b] - soc[k]) < std::fabs(band_centres[best] - soc[k])) best = b;
    bands[best].add(k, d);
  }
  VoltageErrors out;
  out.all = all.done();
  for (const auto& b : bands) out.bands.push_back(b.done());
  return out;
}

VoltageError voltage_error_where(const std::vector<double>& measured, const std::vector<double>& model,
                                 const std::vector<char>& rows) {
  assert(measured.size() == model.size() && rows.size() == model.size());
  Acc a;
  for (std::size_t k = 0; k < measured.size(); ++k)
    if (rows[k]) a.add(k, model[k] - measured[k]);
  return a.done();
}

}  // namespace sortie::fit
