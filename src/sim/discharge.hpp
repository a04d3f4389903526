#pragma once
/// A pack under a load until it ends: cutoff, SoC floor, power collapse or end of the load.
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "plan/load_series.hpp"
#include "sim/model_range.hpp"
#include "sim/segment.hpp"

namespace sortie::sim {

/// A load over time (plan/load_series.hpp).
using plan::LoadSeries;

struct DischargeSpec {
  enum class Load { current, power, series };
  Load load = Load::current;
  double value = 0.0;        ///< A or W for constant loads
  LoadSeries series;
  double cutoff_cell_V = 0;  ///< loaded cell voltage that ends the discharge, V
  double soc_floor = 0.0;    ///< SoC that ends the discharge
  /// End the run where the SoC falls to the lowest SoC the cell model rests on data for
  /// (battery::Cell::soc_floor_covered), as its own end kind.
  bool stop_at_coverage = false;
  double sample_s = 1.0;     ///< trace spacing, s (0: no trace)
  /// Integration steps in all (LimitError beyond), plus steps_per_stretch for each stretch of a
  /// load series: the stepper starts again at every row of a load file, so a long log needs at
  /// least a step per row, and a cap that did not grow with the log would refuse an ordinary
  /// 100 Hz one-hour log (360 000 rows). 16 is about ten times what a smooth stretch takes.
  std::size_t max_steps = 200000;
  std::size_t steps_per_stretch = 16;
  /// What the run is, leading the cap messages ("discharge: load.csv").
  std::string context = "discharge";
  std::size_t max_samples = 1000000;   ///< trace samples in all (LimitError beyond)
  /// The stepper and its tolerances (SegmentOptions): the exponential stepper by default,
  /// Dormand–Prince kept as the reference.
  SegmentOptions::Method method = SegmentOptions::Method::exponential;
  double abs_tol = 1e-10, rel_tol = 1e-10;
  std::size_t* steps_out = nullptr;  ///< where to add the accepted steps taken (may be null)
};

/// pack_full: a charging load (negative current or power) brought the SoC to 1, where the
/// pack takes no more charge. coverage_floor: the SoC reached the covered floor
/// (DischargeSpec::stop_at_coverage).
enum class EndReason { cutoff_voltage, soc_floor, power_collapse, load_end, pack_full, coverage_floor };
const char* to_string(EndReason r);

/// Something that happened, at a time: an end, a warning, a phase boundary.
struct Event {
  double t_s = 0.0;
  std::string kind;
  std::string detail;
};

struct DischargeResult {
  double time_to_end_s = 0.0;
  EndReason end_reason = EndReason::load_end;
  double charge_Ah = 0.0;
  double energy_Wh = 0.0;
  double v_min_V = 0.0;      ///< lowest loaded pack voltage
  double soc_end = 0.0;
  double i_max_A = 0.0;
  bool thermal = false;      ///< the cell has a thermal model
  double temperature_end_C = 0.0, temperature_max_C = 0.0;  ///< cell temperature, °C
  double air_C = 0.0;        ///< air the cells give their heat to, °C
  /// For power_collapse: the power asked for and the most the pack could deliver at that
  /// state, E²/(4·R0), W.
  double power_asked_W = 0.0, power_max_W = 0.0;
  double soc_floor_covered = 0.0;  ///< battery::Cell::soc_floor_covered of the pack's cell
  std::vector<Excursion> excursions;  ///< where the run left the model's range (times from the start)
  std::vector<Event> events;
  std::vector<Sample> trace;  ///< every sample_s, plus the exact end point
};

/// The most a pack can deliver at its terminals at EMF E and series resistance R0: V·I with
/// V = E − R0·I is largest at I = E/(2·R0), where it is E²/(4·R0) (the maximum power transfer
/// theorem; common practice, and docs/physics.md: E² < 4·R0·P is power collapse).
double max_power_W(double emf_V, double r0_ohm);

DischargeResult discharge(const battery::Pack& pack, const DischargeSpec& spec);

}  // namespace sortie::sim
