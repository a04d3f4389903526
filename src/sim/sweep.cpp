#include "sim/sweep.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/error.hpp"
#include "core/text.hpp"
#include "sim/parallel.hpp"

namespace sortie::sim {

namespace {

std::string names_list() {
  std::string s;
  for (const auto& p : what_if_parameters()) s += (s.empty() ? "" : ", ") + p.name;
  return s;
}

double sweep_number(const std::string& word, const std::string& whole, const char* what) {
  const auto v = parse_number_word(word);
  if (!v || !std::isfinite(*v))
    throw UsageError("--sweep: " + std::string(what) + " is not a finite number (got " + printable(whole.substr(0, 60)) +
                     ", expected NAME=FROM:TO:STEP)");
  return *v;
}

}  // namespace

SweepAxis parse_sweep(const std::string& word) {
  const std::string shown = printable(word.substr(0, 60));
  const auto eq = word.find('=');
  const auto c1 = word.find(':', eq == std::string::npos ? 0 : eq);
  const auto c2 = c1 == std::string::npos ? c1 : word.find(':', c1 + 1);
  if (eq == std::string::npos || c1 == std::string::npos || c2 == std::string::npos ||
      word.find(':', c2 + 1) != std::string::npos)
    throw UsageError("--sweep: not NAME=FROM:TO:STEP (got " + shown + ", expected e.g. payload-kg=0:1:0.1)");
  SweepAxis a;
  a.name = word.substr(0, eq);
  const WhatIfParameter* p = find_what_if(a.name);
  if (!p)
    throw UsageError("--sweep: unknown name (got " + printable(a.name.substr(0, 40)) + ", expected one of " +
                     names_list() + ")");
  a.from = sweep_number(word.substr(eq + 1, c1 - eq - 1), word, "FROM");
  a.to = sweep_number(word.substr(c1 + 1, c2 - c1 - 1), word, "TO");
  a.step = sweep_number(word.substr(c2 + 1), word, "STEP");
  for (const double v : {a.from, a.to})
    if (const auto why = range_problem(v, p->range)) throw UsageError("--sweep: " + a.name + ": " + *why);
  if (!(a.step > 0.0))
    throw UsageError("--sweep: " + a.name + ": STEP not above 0 (got " + format_number(a.step) +
                     ", expected a step > 0)");
  if (a.to < a.from)
    throw UsageError("--sweep: " + a.name + ": TO below FROM (got " + format_number(a.from) + ":" +
                     format_number(a.to) + ", expected FROM ≤ TO)");
  // Points from, from + step, …: a last point within 1e-9 steps of TO counts (decimal steps
  // such as 0.1 do not divide exactly in binary).
  const double span = (a.to - a.from) / a.step;
  if (span + 1.0 > static_cast<double>(kMaxSweepPoints))
    throw UsageError("--sweep: " + a.name + ": too many points (got " + format_number(std::floor(span + 1e-9) + 1.0) +
                     ", expected at most " + std::to_string(kMaxSweepPoints) + ")");
  const std::size_t n = static_cast<std::size_t>(std::floor(span + 1e-9)) + 1;
  for (std::size_t i = 0; i < n; ++i) {
    // Rounded to 12 significant digits, so that a point is the decimal number a user would type
    // for a single run (0.6, not 0.6000000000000001).
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.12g", a.from + static_cast<double>(i) * a.step);
    double v = std::strtod(buf, nullptr);
    if (v > a.to) v = a.to;  // within 1e-9 steps: TO itself, never past the range checked above
    a.values.push_back(v);
  }
  return a;
}

PointResult fly_point(const Mission& m, const SimOptions& so) {
  PointResult out;
  const MissionResult r = simulate(m, so);
  out.completed = r.completed;
  out.end_kind = r.end_kind;
  out.end_detail = r.end_detail;
  if (r.refused) {
    out.refused = true;
    out.limiting_rule = "refused";
    out.failing.push_back("refused");
    return out;
  }
  out.go = r.go;
  out.flight_time_s = r.flight_time_s;
  out.landing_soc = r.landing.soc;
  if (!r.completed) out.failing.push_back("completion");
  for (const auto& rule : r.rules)
    if (!rule.pass) out.failing.push_back(rule.name);
  SpareOptions sp;
  sp.sim = so;
  const SpareResult s = solve_spare(m, r, sp);
  out.spare_capped = s.capped;
  if (s.phase && s.bounded && !s.capped) out.spare_s = s.spare_s;
  out.limiting_rule = !out.failing.empty() ? out.failing.front() : s.binding_rule;
  return out;
}

SweepResult run_sweep(const Mission& base, const std::vector<SweepAxis>& axes, const SimOptions& so,
                      unsigned threads, const std::function<void(std::size_t, std::size_t)>& progress) {
  SweepResult out;
  out.axes = axes;
  std::size_t n = 1;
  for (const auto& a : axes) n *= a.values.size();
  if (n > kMaxSweepPoints)
    throw UsageError("--sweep: too many points (got " + std::to_string(n) + ", expected at most " +
                     std::to_string(kMaxSweepPoints) + " over all axes)");
  out.points.resize(n);
  for_each_index(
      n, threads,
      [&](std::size_t i) {
        Mission m = base;
        std::vector<double> x(axes.size());
        std::size_t rest = i;
        for (std::size_t k = axes.size(); k-- > 0;) {
          x[k] = axes[k].values[rest % axes[k].values.size()];
          rest /= axes[k].values.size();
        }
        for (std::size_t k = 0; k < axes.size(); ++k) set_what_if(m, axes[k].name, x[k]);
        PointResult p = fly_point(m, so);
        p.x = std::move(x);
        out.points[i] = std::move(p);
      },
      progress);
  return out;
}

}  // namespace sortie::sim
