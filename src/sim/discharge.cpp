#include "sim/discharge.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "core/text.hpp"

namespace sortie::sim {

using battery::Demand;

const char* to_string(EndReason r) {
  switch (r) {
    case EndReason::cutoff_voltage: return "cutoff_voltage";
    case EndReason::soc_floor: return "soc_floor";
    case EndReason::power_collapse: return "power_collapse";
    case EndReason::load_end: return "load_end";
    case EndReason::pack_full: return "pack_full";
    case EndReason::coverage_floor: return "coverage_floor";
  }
  return "?";
}

namespace {

/// The demand of one stretch [t_i, t_{i+1}] of a load series.
Demand series_demand(const LoadSeries& s, std::size_t i) {
  Demand d;
  d.kind = s.quantity == LoadSeries::Quantity::current ? Demand::Kind::current : Demand::Kind::power;
  d.t0 = s.time_s[i];
  d.a = s.value[i];
  if (!s.step && i + 1 < s.time_s.size())
    d.a_rate = (s.value[i + 1] - s.value[i]) / (s.time_s[i + 1] - s.time_s[i]);
  return d;
}

}  // namespace

double max_power_W(double emf_V, double r0_ohm) {
  if (!(emf_V > 0.0)) return 0.0;
  return emf_V * emf_V / (4.0 * r0_ohm);  // P_max = E²/(4·R0) at I = E/(2·R0)
}

DischargeResult discharge(const battery::Pack& pack, const DischargeSpec& spec) {
  const battery::PackModel model(pack);
  const double S = pack.series;
  const double i_limit = pack.cell.i_cont_max_A * pack.parallel;
  enum : std::size_t { kCutoff, kFloor, kCollapse, kOverCurrent, kCellHot, kFull, kCoverage };
  const double covered_floor = pack.cell.soc_floor_covered();
  const bool stop_at_floor = spec.stop_at_coverage && covered_floor > spec.soc_floor;
  std::vector<EventSpec> events = {
      {"cutoff_voltage", [&](const Sample& s) { return s.term.v_terminal_V / S - spec.cutoff_cell_V; }, true},
      {"soc_floor", [&](const Sample& s) { return s.x[battery::kSoc] - spec.soc_floor; }, true},
      {"power_collapse", [](const Sample& s) { return s.term.discriminant; }, true},
      {"over_current", [=](const Sample& s) { return i_limit - s.term.current_A; }, false},
      {"cell_hot", [](const Sample& s) { return battery::kCellHotC - s.x[battery::kTemp]; }, false},
      // A charging current takes the SoC up; at 1 the pack is full and takes no more (charge
      // forced in beyond that is not stored). Only a charging current can reach it, so the
      // margin is left positive while the pack discharges (a run may start full).
      {"pack_full", [](const Sample& s) { return s.term.current_A < 0.0 ? 1.0 - s.x[battery::kSoc] : 1.0; }, true},
  };
  if (stop_at_floor)
    events.push_back({"coverage_floor", [=](const Sample& s) { return s.x[battery::kSoc] - covered_floor; }, true});

  // Segments: one for a constant load, one per stretch of a series.
  std::vector<std::pair<Demand, double>> segments;  // demand, end time
  if (spec.load == DischargeSpec::Load::current) {
    segments.push_back({Demand::current(spec.value), std::numeric_limits<double>::infinity()});
  } else if (spec.load == DischargeSpec::Load::power) {
    segments.push_back({Demand::power(spec.value), std::numeric_limits<double>::infinity()});
  } else {
    const auto& s = spec.series;
    assert(s.time_s.size() >= 2);
    for (std::size_t i = 0; i + 1 < s.time_s.size(); ++i)
      segments.push_back({series_demand(s, i), s.time_s[i + 1]});
  }

  DischargeResult out;
  out.v_min_V = std::numeric_limits<double>::infinity();
  double t = spec.load == DischargeSpec::Load::series ? spec.series.time_s.front() : 0.0;
  const double t_start = t;
  battery::State x = model.initial_state(pack.soc0);
  SegmentOptions opts;
  opts.sample_s = spec.sample_s;
  opts.next_sample_t = t;
  opts.method = spec.method;
  opts.abs_tol = spec.abs_tol;
  opts.rel_tol = spec.rel_tol;
  // For the whole discharge, over every segment; a series gets a share per stretch (see the spec).
  opts.max_steps = spec.max_steps;
  if (spec.load == DischargeSpec::Load::series) {
    opts.max_steps += spec.steps_per_stretch * segments.size();
    opts.step_cap_hint = "the load has " + std::to_string(spec.series.time_s.size()) +
                         " rows; resample it to fewer rows, or split it into shorter files";
  }
  opts.max_samples = spec.max_samples;
  opts.context = spec.context;
  out.thermal = model.thermal;
  out.air_C = model.air_C;
  out.temperature_max_C = model.t0_C;
  out.soc_floor_covered = covered_floor;
  RangeWatch watch(pack);
  auto track = [&](const Sample& s) {
    out.v_min_V = std::min(out.v_min_V, s.term.v_terminal_V);
    out.i_max_A = std::max(out.i_max_A, s.term.current_A);
    out.temperature_max_C = std::max(out.temperature_max_C, s.x[battery::kTemp]);
  };
  const StepHook hook = [&](const Sample& a, const Sample& b, const std::function<Sample(double)>& at) {
    const Sample mid = at(0.5 * (a.t + b.t));
    track(a);
    track(mid);
    track(b);
    watch.step(a, mid, b, at);
  };

  Sample end;
  std::optional<std::size_t> stopped;
  bool warned_hot = false;
  Demand last_demand = segments.front().first;
  watch.start(Sample{t, x, battery::Thevenin{model, last_demand}.terminal(x, t)});
  for (const auto& [demand, t_end] : segments) {
    last_demand = demand;
    opts.t_end = t_end;
    SegmentResult seg = run_segment(model, demand, t, x, events, opts, hook);
    opts.steps_done += seg.steps;
    if (spec.steps_out) *spec.steps_out += seg.steps;
    opts.samples_done += seg.samples.size();
    opts.next_sample_t = seg.next_sample_t;
    out.trace.insert(out.trace.end(), seg.samples.begin(), seg.samples.end());
    for (const auto& w : seg.warnings) {
      if (w.event == kCellHot) {
        if (!warned_hot)
          out.events.push_back({w.at.t - t_start, "cell_hot",
                                "cell temperature reached " + format_fixed(battery::kCellHotC, 0) +
                                    " °C, the usual discharge limit of lithium cells (check the maker's)"});
        warned_hot = true;
        continue;
      }
      const double per_cell = w.at.term.current_A / pack.parallel;
      out.events.push_back({w.at.t - t_start, "over_current",
                            "cell current " + format_fixed(per_cell, 1) + " A above the continuous limit " +
                                format_fixed(pack.cell.i_cont_max_A, 1) + " A"});
    }
    end = seg.end;
    track(end);
    t = end.t;
    x = end.x;
    if (seg.stopped) {
      stopped = seg.stopped;
      break;
    }
  }
  if (out.trace.empty() || out.trace.back().t < end.t) {
    if (spec.sample_s > 0) out.trace.push_back(end);
  }
  for (auto& s : out.trace) s.t -= t_start;

  out.time_to_end_s = end.t - t_start;
  out.charge_Ah = end.x[battery::kCharge] / 3600.0;
  out.energy_Wh = end.x[battery::kEnergy] / 3600.0;
  out.soc_end = end.x[battery::kSoc];
  out.temperature_end_C = end.x[battery::kTemp];
  if (!std::isfinite(out.v_min_V)) out.v_min_V = end.term.v_terminal_V;
  // A demand the pack cannot meet from the very start leaves the loaded voltage at the vertex
  // of the power curve, below the cutoff as well: the collapse is the reason.
  if (stopped && *stopped == kCutoff && end.term.collapsed) stopped = kCollapse;
  std::string detail;
  if (!stopped) {
    out.end_reason = EndReason::load_end;
    detail = "the load ended";
  } else if (*stopped == kCutoff) {
    out.end_reason = EndReason::cutoff_voltage;
    detail = "loaded cell voltage reached " + format_fixed(spec.cutoff_cell_V, 3) + " V";
  } else if (*stopped == kFloor) {
    out.end_reason = EndReason::soc_floor;
    detail = "state of charge reached " + format_fixed(spec.soc_floor * 100, 1) + " %";
  } else if (*stopped == kFull) {
    out.end_reason = EndReason::pack_full;
    detail = "the charging load brought the pack to full (state of charge 100 %): it takes no more charge";
  } else if (*stopped == kCoverage) {
    out.end_reason = EndReason::coverage_floor;
    detail = "state of charge reached " + format_fixed(covered_floor * 100, 1) +
             " %, the lowest the cell model rests on data for (--stop-at-coverage)";
  } else {
    out.end_reason = EndReason::power_collapse;
    // Asked: P = a + a_rate·(t − t0) + b·V; at most E²/(4·R0) with E = S·OCV − v1 − v2.
    const double emf = end.term.v_ocv_V - end.x[battery::kV1] - end.x[battery::kV2];
    out.power_max_W = max_power_W(emf, model.r0_pack(end.x[battery::kSoc], end.x[battery::kTemp]));
    out.power_asked_W = last_demand.a + last_demand.a_rate * (end.t - last_demand.t0) +
                        last_demand.b * end.term.v_terminal_V;
    detail = "the pack cannot deliver this power: " + format_fixed(out.power_asked_W, 1) + " W asked, at most " +
             format_fixed(out.power_max_W, 1) + " W at this state (E²/(4·R0), E = " + format_fixed(emf, 2) +
             " V, R0 = " + format_fixed(model.r0_pack(end.x[battery::kSoc], end.x[battery::kTemp]) * 1000, 1) +
             " mΩ)";
  }
  out.excursions = watch.excursions();
  for (auto it = out.excursions.begin(); it != out.excursions.end();) {
    // A run stopped at the covered floor or at full ends a hair beyond it (the event's time
    // tolerance): not an excursion, unless the run started there.
    const bool stop_kind = out.end_reason == EndReason::coverage_floor || out.end_reason == EndReason::pack_full;
    const bool at_stop = stop_kind && out.time_to_end_s > 0.0 && it->quantity == "soc" && it->at_end &&
                         it->duration_s < 1e-3;
    if (at_stop) {
      it = out.excursions.erase(it);
      continue;
    }
    it->first_s -= t_start;
    out.events.push_back({it->first_s, "model_range", describe(*it)});
    ++it;
  }
  out.events.push_back({out.time_to_end_s, to_string(out.end_reason), detail});
  std::stable_sort(out.events.begin(), out.events.end(), [](const Event& a, const Event& b) { return a.t_s < b.t_s; });
  return out;
}

}  // namespace sortie::sim
