#pragma once
/// Where a run leaves the range its cell model rests on: the ranges the cell's data covered
/// (battery::CellCoverage), the ends of its OCV and temperature tables (beyond them the model
/// holds the end values: an invented OCV or resistance), and the cell's maximum voltage. Each
/// excursion is measured on the integrator's dense output: how far (the extreme value reached)
/// and how long (seconds outside, from when).
#include <functional>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "sim/segment.hpp"

namespace sortie::sim {

/// One quantity outside one bound over a run.
struct Excursion {
  std::string quantity;   ///< soc | cell_current_A | cell_temperature_C | cell_voltage_V
  std::string side;       ///< below | above
  std::string range;      ///< coverage | ocv_table | temperature_table | v_max
  double limit = 0.0;     ///< the bound left, in the quantity's unit
  double extreme = 0.0;   ///< the value furthest beyond it
  double first_s = 0.0;   ///< when the run first left the range, s
  double duration_s = 0.0;  ///< time outside in all, s
  int intervals = 0;      ///< separate stretches outside
  int phase = -1;         ///< mission phase where it first left (-1: not a mission)
  bool at_end = false;    ///< still outside when the run ended
  /// How far beyond the bound the extreme is (≥ 0, in the quantity's unit).
  double beyond() const { return side == "below" ? limit - extreme : extreme - limit; }
};

/// Watches every bound of a pack's cell over the steps of a run.
class RangeWatch {
 public:
  explicit RangeWatch(const battery::Pack& pack);

  /// The state the run starts from (a run may start outside, e.g. at a temperature beyond the
  /// table).
  void start(const Sample& s, int phase = -1);
  /// One accepted step [ta, tb] with its dense output (a StepHook's arguments).
  void step(double ta, double tb, const std::function<Sample(double)>& at, int phase = -1);
  /// The same with the samples at ta, the middle and tb already evaluated.
  void step(const Sample& a, const Sample& mid, const Sample& b, const std::function<Sample(double)>& at,
            int phase = -1);
  /// The bounds that were left, in the order the run left them.
  std::vector<Excursion> excursions() const;

 private:
  struct Bound {
    Excursion e;
    std::function<double(const Sample&)> value;
    bool below = false;  ///< e.side == "below", kept for the hot path
    bool outside = false;
  };
  /// > 0 inside, ≤ 0 on or beyond the bound.
  static double margin(const Bound& b, const Sample& s);
  void visit(Bound& b, const Sample& s, double g);
  std::vector<Bound> bounds_;
};

/// An excursion in words: "state of charge below 10.0 %, the lowest the cell's data covered:
/// down to 4.9 % (5.1 % beyond) for 312.4 s from t = 2401.2 s".
std::string describe(const Excursion& e);
/// The same in a few words: "cell current above 66.00 A (up to 80.00 A, 30.0 s)".
std::string brief(const Excursion& e);

}  // namespace sortie::sim
