#include "fit/soc.hpp"

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "core/text.hpp"

namespace sortie::fit {

namespace {
}  // namespace

double rest_current_A(const CellLog& log) {
  double imax = 0.0;
  for (double i : log.current_A) imax = std::max(imax, std::fabs(i));
  return std::max(0.005 * imax, 1e-6);
}

SocEstimate estimate_soc(const CellLog& log, const SocOptions& opts) {
  const std::size_t n = log.size();
  SocEstimate out;
  out.i_rest_A = rest_current_A(log);
  const double i_rest = out.i_rest_A;

  // Counted charge, discharge positive.
  out.charge_Ah.assign(n, 0.0);
  for (std::size_t k = 1; k < n; ++k) {
    const double dq = log.starts_section(k) ? 0.0
                                            : log.current_A[k] * (log.time_s[k] - log.time_s[k - 1]) / 3600.0;
    out.charge_Ah[k] = out.charge_Ah[k - 1] + dq;
  }

  // Runs of charge and of discharge within a section, at least a minute long (a pulse is not a
  // charge to full or a discharge to empty).
  struct Run {
    std::size_t first, last;
    double sign, peak, duration;
  };
  std::vector<Run> runs;
  for (std::size_t k = 0; k < n;) {
    const auto sign_of = [&](double i) { return i < -i_rest ? -1.0 : (i > i_rest ? 1.0 : 0.0); };
    const double s = sign_of(log.current_A[k]);
    std::size_t e = k;
    double peak = std::fabs(log.current_A[k]);
    while (e + 1 < n && !log.starts_section(e + 1) && sign_of(log.current_A[e + 1]) == s) {
      ++e;
      peak = std::max(peak, std::fabs(log.current_A[e]));
    }
    const double start_t = k > 0 && !log.starts_section(k) ? log.time_s[k - 1] : log.time_s[k];
    if (s != 0.0 && log.time_s[e] - start_t >= 60.0) runs.push_back({k, e, s, peak, log.time_s[e] - start_t});
    k = e + 1;
  }
  // Full and empty voltages: the highest voltage of those charges, the lowest end of those
  // discharges (unless given).
  double v_chg_max = -1e300, v_dis_min = 1e300;
  for (const Run& r : runs) {
    if (r.sign < 0)
      for (std::size_t k = r.first; k <= r.last; ++k) v_chg_max = std::max(v_chg_max, log.voltage_V[k]);
    if (r.sign > 0) v_dis_min = std::min(v_dis_min, log.voltage_V[r.last]);
  }
  out.v_full_V = opts.v_max_V.value_or(v_chg_max);
  out.v_empty_V = opts.v_cutoff_V.value_or(v_dis_min);

  std::vector<SocAnchor> anchors;
  if (opts.soc0) anchors.push_back({SocAnchor::Kind::given, 0, *opts.soc0});
  for (const Run& r : runs) {
    const std::size_t e = r.last;
    if (r.sign < 0) {
      // Full: the charge ended at the maximum voltage after tapering (constant-voltage phase).
      const bool at_top = log.voltage_V[e] >= out.v_full_V - 0.02;
      const bool tapered = std::fabs(log.current_A[e]) <= 0.2 * r.peak;
      if (at_top && tapered) anchors.push_back({SocAnchor::Kind::full, e, 1.0});
    } else if (log.voltage_V[e] <= out.v_empty_V + 0.02) {
      anchors.push_back({SocAnchor::Kind::empty, e, 0.0});
    }
  }
  std::stable_sort(anchors.begin(), anchors.end(),
                   [](const SocAnchor& a, const SocAnchor& b) { return a.row < b.row; });
  if (anchors.empty())
    throw InputError(log.file +
                     ": no known full or empty point: the log has no charge that ends at the maximum voltage "
                     "with a tapering current, and no discharge that ends at the cutoff voltage (got highest charge voltage " +
                     (v_chg_max > -1e299 ? format_fixed(v_chg_max, 3) + " V" : std::string("none")) + ", lowest discharge voltage " +
                     (v_dis_min < 1e299 ? format_fixed(v_dis_min, 3) + " V" : std::string("none")) +
                     "; expected such a point, or give --soc0)");

  // Capacity from full-to-empty discharges, else empty-to-full charges.
  std::vector<double> dis, chg;
  for (std::size_t a = 0; a + 1 < anchors.size(); ++a) {
    const auto& p = anchors[a];
    const auto& q = anchors[a + 1];
    const double dq = out.charge_Ah[q.row] - out.charge_Ah[p.row];
    if (p.kind == SocAnchor::Kind::full && q.kind == SocAnchor::Kind::empty && dq > 0) dis.push_back(dq);
    if (p.kind == SocAnchor::Kind::empty && q.kind == SocAnchor::Kind::full && dq < 0) chg.push_back(-dq);
  }
  auto mean = [](const std::vector<double>& v) {
    double s = 0.0;
    for (double x : v) s += x;
    return s / static_cast<double>(v.size());
  };
  if (!dis.empty()) {
    out.capacity_Ah = mean(dis);
    out.capacity_from_log = true;
    out.capacity_source = "from the log: " + std::to_string(dis.size()) + " full-to-empty discharge" +
                          (dis.size() > 1 ? "s" : "");
  } else if (!chg.empty()) {
    out.capacity_Ah = mean(chg);
    out.capacity_from_log = true;
    out.capacity_source = "from the log: " + std::to_string(chg.size()) + " empty-to-full charge" +
                          (chg.size() > 1 ? "s" : "") + " (no full discharge; a charge counts slightly more)";
  }
  if (out.capacity_from_log && opts.capacity_Ah) {
    const double rel = std::fabs(*opts.capacity_Ah - out.capacity_Ah) / out.capacity_Ah;
    if (rel > 0.03)
      out.warnings.push_back("--capacity-Ah " + format_fixed(*opts.capacity_Ah, 3) + " differs from the log's " +
                             format_fixed(out.capacity_Ah, 3) + " Ah by " + format_fixed(100 * rel, 1) +
                             " %; the log's value is used");
  }
  if (!out.capacity_from_log) {
    if (!opts.capacity_Ah)
      throw InputError(log.file + ": the log does not cover a full discharge or charge (got " +
                       std::to_string(anchors.size()) +
                       " known point(s) but no full-to-empty pair), so the capacity cannot be measured "
                       "(expected --capacity-Ah)");
    out.capacity_Ah = *opts.capacity_Ah;
    out.capacity_source = "given (--capacity-Ah)";
  }
  if (!(out.capacity_Ah > 0.0))
    throw InputError(log.file + ": measured capacity is not positive (got " + format_fixed(out.capacity_Ah, 4) +
                     " Ah, expected a discharge between the full and the empty point)");

  // SoC of every row from the latest anchor (the first for rows before it).
  out.soc.resize(n);
  std::size_t a = 0;
  for (std::size_t r = 0; r < n; ++r) {
    while (a + 1 < anchors.size() && anchors[a + 1].row <= r) ++a;
    const auto& an = anchors[a];
    out.soc[r] = an.soc - (out.charge_Ah[r] - out.charge_Ah[an.row]) / out.capacity_Ah;
  }
  double lo = 1e300, hi = -1e300;
  for (double s : out.soc) lo = std::min(lo, s), hi = std::max(hi, s);
  if (lo < -0.05 || hi > 1.05)
    out.warnings.push_back("state of charge runs from " + format_fixed(lo, 3) + " to " + format_fixed(hi, 3) +
                           ": the capacity or the known points do not fit the log (expected 0 to 1)");
  out.anchors = std::move(anchors);
  return out;
}

}  // namespace sortie::fit
