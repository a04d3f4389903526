#include "fit/fit_cell.hpp"

#include <algorithm>
#include <filesystem>
#include <limits>

#include "core/error.hpp"
#include "fit/fit_cell_steps.hpp"

namespace sortie::fit {

namespace {

using detail::FitWork;

std::string file_name(const std::string& path) { return std::filesystem::path(path).filename().string(); }

/// The procedure (fit/fit_cell.hpp), each step in fit/fit_cell_steps.hpp.
CellFitResult fit_impl(const battery::CellLog& log, const CellFitOptions& opts, const SocEstimate* given) {
  CellFitResult out;
  out.files = {log.file};
  FitWork w(log, opts, out);
  detail::survey_log(w);
  detail::log_temperature(w);
  detail::count_soc(w, given);
  detail::first_r0(w);
  detail::first_ocv(w);
  detail::rc_bounds(w);
  detail::choose_rc_structure(w);
  detail::fit_tables(w);
  detail::band_excitation(w);
  detail::choose_structure(w);
  detail::held_out_check(w);
  detail::fit_warnings(w);
  const Table ocv = detail::written_ocv(w);
  detail::model_circuit(w, ocv);
  detail::model_limits(w);
  detail::model_mass(w);
  detail::model_thermal(w);
  detail::model_temperature(w);
  detail::model_note(w);
  return out;
}

SocOptions soc_options(const CellFitOptions& opts) {
  SocOptions so = opts.soc;
  if (so.chemistry.empty()) so.chemistry = opts.chemistry;
  return so;
}

/// The capacity of several logs: the mean of those that hold a full-to-empty pair, else given.
double common_capacity(const std::vector<battery::CellLog>& logs, const SocOptions& so, std::size_t& measured) {
  std::vector<double> caps;
  for (std::size_t i = 0; i < logs.size(); ++i) {
    SocOptions o = so;
    if (i > 0) o.soc0.reset();  // --soc0 is the first log's
    o.capacity_Ah.reset();
    try {
      const SocEstimate e = estimate_soc(logs[i], o);
      if (e.capacity_from_log) caps.push_back(e.capacity_Ah);
    } catch (const InputError&) {
      // This log cannot measure the capacity alone; the second pass says why if it cannot be fitted at all.
    }
  }
  measured = caps.size();
  if (!caps.empty()) {
    double q = 0.0;
    for (double c : caps) q += c;
    return q / static_cast<double>(caps.size());
  }
  if (so.capacity_Ah) return *so.capacity_Ah;
  throw InputError(logs.front().file + ": none of the " + std::to_string(logs.size()) +
                   " logs covers a full discharge or charge, so the capacity cannot be measured (expected --capacity-Ah)");
}

/// Appends log `l` to `m` as a section of its own, an hour after the previous one ends.
void append_log(battery::CellLog& m, const battery::CellLog& l, bool first, bool any_temp, bool any_mode) {
  const std::size_t base = m.size();
  const double shift = first ? 0.0 : m.time_s.back() + 3600.0 - l.time_s.front();
  for (std::size_t k = 0; k < l.size(); ++k) {
    m.time_s.push_back(l.time_s[k] + shift);
    m.current_A.push_back(l.current_A[k]);
    m.voltage_V.push_back(l.voltage_V[k]);
    if (any_temp) m.temperature_C.push_back(l.temperature_C.empty() ? std::numeric_limits<double>::quiet_NaN() : l.temperature_C[k]);
    if (any_mode) m.mode.push_back(l.mode.empty() ? std::string() : l.mode[k]);
    m.line.push_back(l.line.empty() ? k + 2 : l.line[k]);
  }
  for (std::size_t st : l.section_starts) m.section_starts.push_back(base + st);
  for (const auto& nline : l.notes) m.notes.push_back(file_name(l.file) + ": " + nline);
  for (const auto& w : l.warnings) m.warnings.push_back(file_name(l.file) + ": " + w);
}

/// Appends one log's SoC estimate `e` (its rows from `base`) to the merged one.
void append_estimate(SocEstimate& se, SocEstimate e, std::size_t base, const std::string& file, bool first) {
  const double q0 = se.charge_Ah.empty() ? 0.0 : se.charge_Ah.back();
  for (double c : e.charge_Ah) se.charge_Ah.push_back(q0 + c);
  se.soc.insert(se.soc.end(), e.soc.begin(), e.soc.end());
  for (SocAnchor a : e.anchors) {
    a.row += base;
    a.how = file_name(file) + ": " + a.how;
    se.anchors.push_back(a);
  }
  for (const auto& w : e.warnings) se.warnings.push_back(file_name(file) + ": " + w);
  if (first) {
    se.v_full_V = e.v_full_V, se.v_full_source = e.v_full_source;
    se.v_empty_V = e.v_empty_V, se.v_empty_source = e.v_empty_source;
    se.chemistry = e.chemistry, se.notes = e.notes;
    se.i_rest_A = e.i_rest_A;
  } else {
    if (!(se.v_full_V > 0.0) && e.v_full_V > 0.0) se.v_full_V = e.v_full_V, se.v_full_source = e.v_full_source;
    if (!se.chemistry && e.chemistry) se.chemistry = e.chemistry;
    se.i_rest_A = std::max(se.i_rest_A, e.i_rest_A);
  }
}

}  // namespace

CellFitResult fit_cell(const battery::CellLog& log, const CellFitOptions& opts) { return fit_impl(log, opts, nullptr); }

CellFitResult fit_cell(const std::vector<battery::CellLog>& logs, const CellFitOptions& opts) {
  if (logs.empty()) throw InputError("fit cell: no log given (expected at least one)");
  if (logs.size() == 1) return fit_impl(logs.front(), opts, nullptr);
  const SocOptions so = soc_options(opts);
  std::size_t measured = 0;
  const double q = common_capacity(logs, so, measured);
  // One log of sections: each input log starts a section (an unknown gap, cell relaxed), its SoC
  // counted from its own known points with the common capacity.
  battery::CellLog m;
  SocEstimate se;
  m.section_starts.clear();
  std::vector<std::size_t> starts;
  std::string names;
  const bool any_temp = std::any_of(logs.begin(), logs.end(), [](const battery::CellLog& l) { return !l.temperature_C.empty(); });
  const bool any_mode = std::any_of(logs.begin(), logs.end(), [](const battery::CellLog& l) { return !l.mode.empty(); });
  for (std::size_t i = 0; i < logs.size(); ++i) {
    SocOptions o = so;
    if (i > 0) o.soc0.reset();
    o.capacity_Ah = q;
    starts.push_back(m.size());
    append_estimate(se, estimate_soc(logs[i], o), m.size(), logs[i].file, i == 0);
    append_log(m, logs[i], i == 0, any_temp, any_mode);
    names += (i ? " " : "") + file_name(logs[i].file);
  }
  m.file = names;
  se.capacity_Ah = q;
  se.capacity_from_log = measured > 0;
  se.capacity_source = measured == 0 ? std::string("given (--capacity-Ah)")
                                     : "from the logs: the mean of " + std::to_string(measured) + " measured";
  CellFitResult r = fit_impl(m, opts, &se);
  r.log_starts = starts;
  r.files.clear();
  for (const battery::CellLog& l : logs) r.files.push_back(l.file);
  if (r.cell.coverage) r.cell.coverage->source = "fit cell " + names;
  return r;
}

}  // namespace sortie::fit
