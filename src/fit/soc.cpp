#include "fit/soc.hpp"

#include <algorithm>
#include <cmath>

#include "core/error.hpp"
#include "core/text.hpp"

namespace sortie::fit {

namespace {
}  // namespace

double rest_current_A(const battery::CellLog& log) {
  double imax = 0.0;
  for (double i : log.current_A) imax = std::max(imax, std::fabs(i));
  return std::max(0.005 * imax, 1e-6);
}

SocEstimate estimate_soc(const battery::CellLog& log, const SocOptions& opts) {
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
  // Constant-voltage charges: the current fell to a fifth of its peak or less while the voltage
  // stayed within 20 mV of its final level (the CV phase). Their level is the voltage at the end.
  struct Cv {
    std::size_t row;
    double level;
  };
  std::vector<Cv> cvs;
  double v_chg_end_max = -1e300;  // for the message: the highest end of any long charge
  for (const Run& r : runs) {
    if (r.sign > 0) continue;
    const std::size_t e = r.last;
    v_chg_end_max = std::max(v_chg_end_max, log.voltage_V[e]);
    if (std::fabs(log.current_A[e]) > 0.2 * r.peak) continue;
    // Rows since the current began to fall below 90 % of the peak: all near the end level.
    std::size_t k = e;
    while (k > r.first && std::fabs(log.current_A[k - 1]) < 0.9 * r.peak) --k;
    bool flat = k < e;
    for (std::size_t j = k; j <= e && flat; ++j) flat = std::fabs(log.voltage_V[j] - log.voltage_V[e]) <= 0.02;
    if (flat) cvs.push_back({e, log.voltage_V[e]});
  }
  double cv_level = -1e300;
  for (const Cv& c : cvs) cv_level = std::max(cv_level, c.level);

  // Chemistry: given, else from the full-charge level.
  if (!opts.chemistry.empty()) {
    out.chemistry = chemistry_by_name(opts.chemistry);
    if (!out.chemistry)
      out.notes.push_back("chemistry '" + opts.chemistry +
                          "' is not one the fit knows (LiPo, Li-ion, LCO, NMC, NCA, LiHV, LFP): no chemistry defaults used");
  } else if (opts.v_max_V) {
    out.chemistry = chemistry_from_full_voltage(*opts.v_max_V);
    if (out.chemistry) out.chemistry->how = "taken from --v-max-V " + format_fixed(*opts.v_max_V, 3) + " V (give --chemistry to set it)";
  } else if (!cvs.empty()) {
    out.chemistry = chemistry_from_full_voltage(cv_level);
  }

  // Full-charge voltage: given, else the CV level, else the chemistry's.
  if (opts.v_max_V) {
    out.v_full_V = *opts.v_max_V;
    out.v_full_source = "given (--v-max-V)";
  } else if (!cvs.empty()) {
    out.v_full_V = cv_level;
    out.v_full_source = "the constant-voltage level of the log's charges";
  } else if (out.chemistry) {
    out.v_full_V = out.chemistry->v_full_V;
    out.v_full_source = "the chemistry's full-charge voltage (" + out.chemistry->name + ")";
  }
  // Cutoff: given, else the top of the chemistry's usual end-of-discharge range.
  if (opts.v_cutoff_V) {
    out.v_empty_V = *opts.v_cutoff_V;
    out.v_empty_source = "given (--v-cutoff-V)";
  } else if (out.chemistry) {
    out.v_empty_V = out.chemistry->v_eod_hi_V;
    out.v_empty_source = "the top of the chemistry's usual end-of-discharge range (" + out.chemistry->name + ", " +
                         format_fixed(out.chemistry->v_eod_lo_V, 2) + "-" + format_fixed(out.chemistry->v_eod_hi_V, 2) + " V)";
  }

  // The charge swing of the log: at most the capacity, so a C-rate against it is not understated.
  double q_lo = 0.0, q_hi = 0.0;
  for (double q : out.charge_Ah) q_lo = std::min(q_lo, q), q_hi = std::max(q_hi, q);
  const double q_ref = opts.capacity_Ah.value_or(std::max(q_hi - q_lo, 1e-9));

  std::vector<SocAnchor> anchors;
  if (opts.soc0) anchors.push_back({SocAnchor::Kind::given, 0, *opts.soc0, "given (--soc0)"});
  if (out.v_full_V > 0.0)
    for (const Cv& c : cvs)
      if (c.level >= out.v_full_V - 0.02)
        anchors.push_back({SocAnchor::Kind::full, c.row, 1.0,
                           "end of a constant-voltage charge at " + format_fixed(c.level, 3) + " V"});
  // A long rest at the very start near the chemistry's full voltage.
  std::size_t rest0 = 0;
  while (rest0 + 1 < n && !log.starts_section(rest0 + 1) && std::fabs(log.current_A[rest0 + 1]) <= i_rest) ++rest0;
  const double rest0_s = log.time_s[rest0] - log.time_s[0];
  const double v_full_ref = out.chemistry ? out.chemistry->v_full_V : (opts.v_max_V ? *opts.v_max_V : 0.0);
  if (!opts.soc0 && v_full_ref > 0.0 && rest0_s >= kFullRestS && log.voltage_V[rest0] >= v_full_ref - kFullRestMarginV &&
      (anchors.empty() || anchors.front().row > rest0))
    anchors.push_back({SocAnchor::Kind::full, rest0, 1.0,
                       "end of a " + format_fixed(rest0_s / 60.0, 0) + " min rest at the start at " +
                           format_fixed(log.voltage_V[rest0], 3) + " V, within " + format_fixed(1000 * kFullRestMarginV, 0) +
                           " mV of the full " + format_fixed(v_full_ref, 3) + " V"});
  // Discharges that end at the cutoff at a low enough rate.
  double v_dis_min = 1e300, rate_at_min = 0.0;
  for (const Run& r : runs) {
    if (r.sign < 0) continue;
    const std::size_t e = r.last;
    const double rate = log.current_A[e] / q_ref;
    if (log.voltage_V[e] < v_dis_min) v_dis_min = log.voltage_V[e], rate_at_min = rate;
    if (out.v_empty_V > 0.0 && log.voltage_V[e] <= out.v_empty_V + 0.02 && rate <= kEmptyMaxC + 1e-9)
      anchors.push_back({SocAnchor::Kind::empty, e, 0.0,
                         "end of a " + format_fixed(rate, 2) + " C discharge at " + format_fixed(log.voltage_V[e], 3) + " V"});
  }
  if (anchors.empty()) {
    const std::string chem = out.chemistry ? out.chemistry->name + ", " + out.chemistry->how
                                           : std::string("not known (give --chemistry or --v-max-V and --v-cutoff-V)");
    throw InputError(
        log.file + ": no known full or empty point: looked for a charge that tapered at a constant voltage (found " +
        (cvs.empty() ? (v_chg_end_max > -1e299 ? "charges ending at up to " + format_fixed(v_chg_end_max, 3) + " V, none tapered"
                                               : std::string("no charge of a minute or more"))
                     : std::to_string(cvs.size()) + " below the full level") +
        "), a rest of " + format_fixed(kFullRestS / 60.0, 0) + " min or more at the start near the full voltage (found " +
        format_fixed(rest0_s / 60.0, 1) + " min ending at " + format_fixed(log.voltage_V[rest0], 3) +
        " V), and a discharge at " + format_fixed(kEmptyMaxC, 0) + " C or less ending at the cutoff " +
        (out.v_empty_V > 0.0 ? format_fixed(out.v_empty_V, 3) + " V" : std::string("(not known)")) + " (found " +
        (v_dis_min < 1e299 ? "the lowest discharge end " + format_fixed(v_dis_min, 3) + " V at " + format_fixed(rate_at_min, 2) + " C"
                           : std::string("no discharge of a minute or more")) +
        "); chemistry " + chem + " (got none of these, expected one, or give --soc0)");
  }
  std::stable_sort(anchors.begin(), anchors.end(),
                   [](const SocAnchor& a, const SocAnchor& b) { return a.row < b.row; });

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
    if (!opts.capacity_Ah) {
      std::size_t n_full = 0;
      for (const auto& a : anchors) n_full += a.kind == SocAnchor::Kind::full ? 1 : 0;
      const std::size_t n_empty = anchors.size() - n_full;
      // Say which end is missing and why, so the user knows which option or test step is missing.
      std::string why;
      if (n_empty == 0 && out.v_empty_V <= 0.0)
        why = "; no empty point can be found because the cutoff voltage is not known (give --chemistry or --v-cutoff-V)";
      else if (n_empty == 0)
        why = "; no discharge at " + format_fixed(kEmptyMaxC, 0) + " C or less ended within 20 mV of the cutoff " +
              format_fixed(out.v_empty_V, 3) + " V, " + out.v_empty_source + "; the lowest discharge end was " +
              (v_dis_min < 1e299 ? format_fixed(v_dis_min, 3) + " V at " + format_fixed(rate_at_min, 2) + " C"
                                 : std::string("none: no discharge of a minute or more"));
      else if (n_full == 0)
        why = "; no full point was found before an empty one (a charge that tapered at the full voltage, or a long "
              "rest at the start near it)";
      throw InputError(log.file + ": the log does not cover a full discharge or charge (got " +
                       std::to_string(n_full) + " full and " + std::to_string(n_empty) +
                       " empty point(s) but no full-to-empty or empty-to-full pair" + why +
                       "), so the capacity cannot be measured (expected --capacity-Ah)");
    }
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
