#pragma once
/// R0 and one or two RC pairs of a Thevenin cell model, as tables over SoC knots, and (when
/// asked) the OCV on a SoC grid, fitted jointly to a log by bounded Levenberg–Marquardt
/// (fit/levenberg_marquardt) with the SoC of every row held.
///
/// The model on the log (G. Plett, Battery Management Systems, Vol. I, 2015, eq. 2.7–2.10),
/// with sample k's current I_k flowing over (t_{k−1}, t_k] (battery::CellLog):
///   v_{p,k} = R_p·I_k + a·(v_{p,k−1} − R_p·I_k),   a = exp(−Δt_k/τ_p)   (exact for constant I)
///   V_k = OCV(s_k) − R0(s_k)·I_k − Σ_p v_{p,k}
/// R_p and τ_p at the interval's mid SoC. Each parameter is a piecewise-linear table over the
/// knots (battery::Cell's Table), fitted in log space so every value stays positive; one knot is
/// a constant, and a parameter may be shared by all knots. The OCV is piecewise linear on its
/// grid, fitted in volts. The Jacobian is exact: the sensitivities ∂v/∂θ are carried through
/// the same recurrence (forward sensitivity), so JᵀJ needs no finite differences.
///
/// Penalties: neighbouring knots are tied by ρ·(log θ_{j+1} − log θ_j), and the OCV by its
/// second difference ρ_ocv·(U_{o−1} − 2U_o + U_{o+1}); both weak enough to leave values the
/// data determine alone, they decide the rest (a knot without excitation follows its
/// neighbours; the OCV beyond the data is extended linearly).
#include <array>
#include <cstddef>
#include <vector>

#include <Eigen/Dense>

#include "core/table.hpp"
#include "battery/cell_log.hpp"
#include "fit/levenberg_marquardt.hpp"

namespace sortie::fit {

/// Parameter values at each knot, SI.
struct RcTables {
  std::vector<double> knots;  ///< SoC, increasing; one knot: constants
  int n_rc = 2;
  std::vector<double> r0_ohm;
  std::array<std::vector<double>, 2> r_ohm;
  std::array<std::vector<double>, 2> tau_s;

  /// All parameters equal to these constants at every knot.
  static RcTables constant(std::vector<double> knots, int n_rc, double r0, std::array<double, 2> r,
                           std::array<double, 2> tau);
  Table r0_table() const;
  Table r_table(int p) const;
  Table tau_table(int p) const;
};

/// Bounds of the fit (SI).
struct RcBounds {
  double r_min_ohm = 1e-7;
  double r_max_ohm = 10.0;
  std::array<double, 2> tau_min_s{0.05, 0.05};
  std::array<double, 2> tau_max_s{1e4, 1e4};
};

/// A fitted state of the problem: the tables and, with a free OCV, its values on the grid.
struct RcSolution {
  RcTables t;
  std::vector<double> ocv_V;  ///< on the problem's OCV grid (empty with a fixed OCV)
};

class RcProblem {
 public:
  /// How log rows become the rows the residuals are evaluated on: one for one, or with rows of
  /// a held current merged into steps of up to a second, weighted by the rows they stand for
  /// (exact for the RC update at a held current; the RC parameters are then taken at the merged
  /// step's mid SoC, a relative change of the order of 1e-4 in the noise-free test).
  enum class RowMerge { none, held_current };

  /// `ocv` is the OCV when it is held (see free_ocv); rows with use[k] == 0 are simulated but
  /// not counted.
  RcProblem(const battery::CellLog& log, const std::vector<double>& soc, const Table& ocv,
            std::vector<double> knots, int n_rc, std::vector<char> use = {},
            RowMerge merge = RowMerge::none);

  /// Fit the OCV too, on `grid` (SoC, increasing), with second-difference weight rho_V.
  void free_ocv(std::vector<double> grid, double rho_V);
  /// Share one value of parameter `type` (0: R0, 1: R1, 2: τ1, 3: R2, 4: τ2) across all knots.
  void set_shared(int type, bool shared) { shared_[static_cast<std::size_t>(type)] = shared; }
  /// Weight of the knot-smoothness penalty, V per unit of log-parameter difference.
  void set_smoothing(double rho_V) { rho_ = rho_V; }

  std::size_t knots() const { return knots_.size(); }
  int n_rc() const { return n_rc_; }
  const std::vector<double>& ocv_grid() const { return grid_; }
  std::size_t rows_used() const { return rows_used_; }
  /// Rows the residuals are evaluated on after steady stretches are merged (≤ the log's rows).
  std::size_t rows_evaluated() const { return rows_.size(); }
  /// Free parameters: the RC values (shared ones once) and the OCV grid values.
  Eigen::Index n_free() const;
  /// Position of (type, knot) among the free parameters.
  Eigen::Index free_index(int type, std::size_t j) const;
  /// Position of OCV grid point o among the free parameters.
  Eigen::Index ocv_index(std::size_t o) const { return n_free_rc() + static_cast<Eigen::Index>(o); }

  Eigen::VectorXd to_z(const RcSolution& s) const;
  RcSolution from_z(const Eigen::VectorXd& z) const;

  /// Cost ½Σe² (with JᵀJ and Jᵀe over the free parameters when asked); `include_penalty`
  /// false gives the data alone.
  void evaluate(const Eigen::VectorXd& z, bool with_jacobian, NormalEquations& out,
                bool include_penalty = true) const;
  /// ½Σe² of the data at a solution.
  double data_cost(const RcSolution& s) const;
  /// The largest diagonal entry of the data's JᵀJ over the RC parameters, and over the OCV
  /// values (for choosing penalty weights).
  std::array<double, 2> information_scale(const RcSolution& s) const;

  /// Fit from `start` (a shared value starts at the mean of its knots' logs; a missing OCV at
  /// the held table on the grid).
  LmResult solve(const RcSolution& start, const RcBounds& b, const LmOptions& opts = {}) const;

 private:
  struct Row {
    double dt = 0.0;     ///< s (0 at a section start)
    double i = 0.0;      ///< A
    double v = 0.0;      ///< measured V
    double y = 0.0;      ///< V − OCV(s) with the held OCV, V
    std::size_t j0 = 0;  ///< R0 knot interval at s_k
    double w0 = 0.0;
    std::size_t j1 = 0;  ///< RC knot interval at the mid SoC
    double w1 = 0.0;
    std::size_t o = 0;   ///< OCV grid interval at s_k
    double wo = 0.0;
    bool restart = false;
    bool use = true;
    double soc = 0.0;    ///< SoC at the row's end
    double weight = 1.0; ///< log rows this row stands for (merged steady stretches)
  };
  Eigen::Index n_full() const { return static_cast<Eigen::Index>((1 + 2 * n_rc_) * knots_.size()); }
  Eigen::Index full_index(int type, std::size_t j) const {
    return static_cast<Eigen::Index>(type * knots_.size() + j);
  }
  Eigen::Index n_free_rc() const;
  RcTables tables_from(const Eigen::VectorXd& z) const;

  std::vector<double> knots_;
  int n_rc_;
  Table ocv_held_;
  std::vector<Row> rows_;
  std::size_t rows_used_ = 0;
  double rho_ = 0.0;
  std::array<bool, 5> shared_{false, false, false, false, false};
  std::vector<double> grid_;  ///< empty: OCV held
  double rho_ocv_ = 0.0;
};

/// A current step between two consecutive rows and the resistance it shows: R = −ΔV/ΔI.
struct CurrentStep {
  std::size_t row = 0;  ///< the row after the step
  double di_A = 0.0;
  double dv_V = 0.0;
  double r_ohm = 0.0;
  double soc = 0.0;
  double dt_s = 0.0;    ///< sampling interval across the step
};

/// Steps with |ΔI| at least `min_step_A` inside a section.
std::vector<CurrentStep> find_current_steps(const battery::CellLog& log, const std::vector<double>& soc,
                                            double min_step_A);

}  // namespace sortie::fit
