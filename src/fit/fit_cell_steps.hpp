#pragma once
/// The named steps of `fit cell` (fit/fit_cell.hpp), shared by its source files: what one step
/// finds is kept in FitWork for the next. Not an interface of its own.
#include <array>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "fit/fit_cell.hpp"
#include "fit/ocv.hpp"
#include "fit/rc_fit.hpp"

namespace sortie::fit::detail {

inline const double kNaN = std::numeric_limits<double>::quiet_NaN();

double median(std::vector<double> v);

/// One Levenberg–Marquardt solution and its data cost ½Σe².
struct Fit {
  RcSolution s;
  double cost = std::numeric_limits<double>::infinity();
};

/// What the steps find, in the order they find it.
struct FitWork {
  const battery::CellLog& log;
  const CellFitOptions& opts;
  CellFitResult& out;
  std::size_t n = 0;
  double imax = 0.0, min_step = 0.0;
  std::vector<char> use;  ///< rows the fit counts
  std::vector<CurrentStep> steps;
  double r0_step = 0.0, dt_step = 0.0;
  std::vector<Rest> rests;
  double longest_rest = 0.0;
  std::vector<OcvPoint> rest_pts, loaded_pts;
  double s_lo = 0.0, s_hi = 0.0;  ///< SoC range of the counted rows
  std::vector<double> grid;       ///< the fitted OCV grid
  std::optional<OcvTable> first_ocv;
  int nrc = 2;
  RcBounds bounds, tb;            ///< of the constants; of the tables
  double tau_min = 0.0, tau_max = 0.0;
  LmOptions lm;
  int iterations = 0;
  Fit constants, tables;
  bool tau_tables = false;
  std::vector<double> knots;
  std::size_t excited = 0;
  std::vector<int> block;  ///< per row: its block between long rests (-1: a long rest)
  int nblocks = 0;

  FitWork(const battery::CellLog& l, const CellFitOptions& o, CellFitResult& r) : log(l), opts(o), out(r) {}
  const SocEstimate& se() const { return out.soc_estimate; }
  const std::vector<double>& soc() const { return out.soc; }
  double rows_counted() const;
  /// The fit's problem: OCV free on the grid (or held at the first OCV), time constants shared
  /// across knots unless `tau_tables`, rows `mask` (default: the counted rows).
  RcProblem problem(const std::vector<double>& k, bool tau_tables, bool free_ocv,
                    const std::vector<char>* mask = nullptr);
  /// One Levenberg–Marquardt run with penalty weights from the data's own information.
  Fit solve(const RcSolution& start, const RcBounds& b, bool tau_tables, bool free_ocv,
            const std::vector<char>* mask = nullptr);
  const RcSolution& final_s() const { return out.tables ? tables.s : constants.s; }
  const RcBounds& final_bounds() const { return out.tables ? tb : bounds; }
};

// fit_cell_log.cpp: the log, SoC, first R0 and first OCV.
void survey_log(FitWork& w);
void log_temperature(FitWork& w);
void count_soc(FitWork& w, const SocEstimate* given);
void first_r0(FitWork& w);
void first_ocv(FitWork& w);
std::vector<int> log_blocks(const battery::CellLog& log, const std::vector<Rest>& rests, double rest_min_s, int& count);

// fit_cell_rc.cpp: the RC pairs.
void rc_bounds(FitWork& w);
void fit_constants(FitWork& w);
void choose_rc_structure(FitWork& w);
/// RMSE of a two-fold prediction over the blocks between long rests, refitting `start` (with
/// bounds `b`) on the other fold's rows; 0 rows when the log has fewer than two blocks.
double held_out_rmse(FitWork& w, const RcSolution& start, const RcBounds& b, bool tau_tables, std::size_t& rows);
void fit_tables(FitWork& w);
void band_excitation(FitWork& w);
void choose_structure(FitWork& w);
void held_out_check(FitWork& w);
void fit_warnings(FitWork& w);

// fit_cell_model.cpp: the written model.
Table written_ocv(FitWork& w);
void model_circuit(FitWork& w, const Table& ocv);
void model_limits(FitWork& w);
void model_mass(FitWork& w);
void model_thermal(FitWork& w);
void model_temperature(FitWork& w);
void model_note(FitWork& w);

}  // namespace sortie::fit::detail
