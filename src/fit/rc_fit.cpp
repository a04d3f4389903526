#include "fit/rc_fit.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>

namespace sortie::fit {

namespace {

/// Interval of `x` holding s and the weight of its upper point (held at the ends).
void locate(const std::vector<double>& x, double s, std::size_t& j, double& w) {
  const std::size_t k = x.size();
  if (k == 1 || s <= x.front()) {
    j = 0;
    w = 0.0;
    return;
  }
  if (s >= x.back()) {
    j = k - 2;
    w = 1.0;
    return;
  }
  const auto it = std::upper_bound(x.begin(), x.end(), s);
  j = static_cast<std::size_t>(it - x.begin()) - 1;
  w = (s - x[j]) / (x[j + 1] - x[j]);
}

/// Rows of J gathered before a blocked rank update of JᵀJ (far faster than one row at a time).
constexpr Eigen::Index kBlock = 256;
/// Merging of held-current rows (see the constructor): the longest merged row, s; its largest
/// share of the time since the last current change; and the current change that ends a merge,
/// the larger of an absolute floor (A) and a fraction of the log's largest current. A choice of
/// ours, not a published rule: the merged step is below the shortest time constant the fit
/// allows at a current change's tail, and far above logger noise.
constexpr double kMergeMaxS = 1.0;
constexpr double kMergeFraction = 0.05;
constexpr double kMergeCurrentA = 0.01;
constexpr double kMergeCurrentFraction = 0.01;

}  // namespace

RcTables RcTables::constant(std::vector<double> knots, int n_rc, double r0, std::array<double, 2> r,
                            std::array<double, 2> tau) {
  RcTables t;
  const std::size_t k = knots.size();
  t.knots = std::move(knots);
  t.n_rc = n_rc;
  t.r0_ohm.assign(k, r0);
  for (int p = 0; p < 2; ++p) {
    t.r_ohm[p].assign(k, r[p]);
    t.tau_s[p].assign(k, tau[p]);
  }
  return t;
}

Table RcTables::r0_table() const { return knots.size() == 1 ? Table(r0_ohm[0]) : Table(knots, r0_ohm); }
Table RcTables::r_table(int p) const { return knots.size() == 1 ? Table(r_ohm[p][0]) : Table(knots, r_ohm[p]); }
Table RcTables::tau_table(int p) const { return knots.size() == 1 ? Table(tau_s[p][0]) : Table(knots, tau_s[p]); }

RcProblem::RcProblem(const battery::CellLog& log, const std::vector<double>& soc, const Table& ocv,
                     std::vector<double> knots, int n_rc, std::vector<char> use, RowMerge row_merge)
    : knots_(std::move(knots)), n_rc_(n_rc), ocv_held_(ocv) {
  assert(!knots_.empty() && (n_rc == 1 || n_rc == 2));
  const std::size_t n = log.size();
  // Rows of a held current are merged into one row of their summed step and charge-mean
  // current (the RC update is exact for a held current over any step), weighted by the rows it
  // stands for. A merged row spans at most kMergeMaxS, and at most kMergeFraction of the time
  // since the last current change, so the fast response after every step keeps each sample.
  // A log sampled at 1 s or slower is unchanged; a fast log loses nothing the model can show.
  double i_max = 0.0;
  for (double i : log.current_A) i_max = std::max(i_max, std::fabs(i));
  const double tol = std::max(kMergeCurrentA, kMergeCurrentFraction * i_max);
  rows_.reserve(n);
  double t_step = log.size() ? log.time_s[0] : 0.0;  // time of the last current change
  double soc_before = 0.0;  // SoC at the row before the open merged row
  for (std::size_t k = 0; k < n; ++k) {
    const bool restart = k == 0 || log.starts_section(k);
    const bool use_k = use.empty() || use[k];
    rows_used_ += use_k ? 1 : 0;
    if (!restart && std::fabs(log.current_A[k] - log.current_A[k - 1]) > tol) t_step = log.time_s[k - 1];
    const double dt = restart ? 0.0 : log.time_s[k] - log.time_s[k - 1];
    if (restart) t_step = log.time_s[k];
    bool merge = false;
    if (row_merge == RowMerge::held_current && !restart && !rows_.empty()) {
      const Row& last = rows_.back();
      const double span = last.dt + dt;
      const double start = log.time_s[k] - span;  // the merged row would begin here
      merge = !last.restart && last.use == use_k && std::fabs(log.current_A[k] - last.i) <= tol &&
              span <= std::min(kMergeMaxS, kMergeFraction * (start - t_step));
    }
    if (!merge) {
      soc_before = k > 0 ? soc[k - 1] : soc[k];
      rows_.push_back(Row{});
      Row& r = rows_.back();
      r.restart = restart;
      r.use = use_k;
      r.i = log.current_A[k];
      r.weight = 0.0;
    }
    Row& r = rows_.back();
    const double charge = r.i * r.dt + log.current_A[k] * dt;
    r.dt += dt;
    if (r.dt > 0.0) r.i = charge / r.dt;
    r.weight += 1.0;
    r.v = log.voltage_V[k];
    r.y = log.voltage_V[k] - ocv(soc[k]);
    r.soc = soc[k];
    locate(knots_, soc[k], r.j0, r.w0);
    const double mid = r.restart ? soc[k] : 0.5 * (soc[k] + soc_before);
    locate(knots_, mid, r.j1, r.w1);
  }
}

void RcProblem::free_ocv(std::vector<double> grid, double rho_V) {
  assert(grid.size() >= 2);
  grid_ = std::move(grid);
  rho_ocv_ = rho_V;
  for (Row& r : rows_) locate(grid_, r.soc, r.o, r.wo);
}

Eigen::Index RcProblem::n_free_rc() const {
  Eigen::Index m = 0;
  for (int ty = 0; ty < 1 + 2 * n_rc_; ++ty) m += shared_[ty] ? 1 : static_cast<Eigen::Index>(knots_.size());
  return m;
}

Eigen::Index RcProblem::n_free() const { return n_free_rc() + static_cast<Eigen::Index>(grid_.size()); }

Eigen::Index RcProblem::free_index(int type, std::size_t j) const {
  Eigen::Index m = 0;
  for (int ty = 0; ty < type; ++ty) m += shared_[ty] ? 1 : static_cast<Eigen::Index>(knots_.size());
  return m + (shared_[type] ? 0 : static_cast<Eigen::Index>(j));
}

Eigen::VectorXd RcProblem::to_z(const RcSolution& s) const {
  Eigen::VectorXd z = Eigen::VectorXd::Zero(n_free());
  Eigen::VectorXd count = Eigen::VectorXd::Zero(n_free_rc());
  const RcTables& t = s.t;
  for (std::size_t j = 0; j < knots_.size(); ++j) {
    auto put = [&](int ty, double v) {
      z[free_index(ty, j)] += std::log(v);  // a shared value starts at the mean of the logs
      count[free_index(ty, j)] += 1.0;
    };
    put(0, t.r0_ohm[j]);
    for (int p = 0; p < n_rc_; ++p) {
      put(1 + 2 * p, t.r_ohm[p][j]);
      put(2 + 2 * p, t.tau_s[p][j]);
    }
  }
  z.head(n_free_rc()) = z.head(n_free_rc()).cwiseQuotient(count);
  for (std::size_t o = 0; o < grid_.size(); ++o)
    z[ocv_index(o)] = s.ocv_V.size() == grid_.size() ? s.ocv_V[o] : ocv_held_(grid_[o]);
  return z;
}

RcTables RcProblem::tables_from(const Eigen::VectorXd& z) const {
  RcTables t = RcTables::constant(knots_, n_rc_, 0.0, {0.0, 0.0}, {1.0, 1.0});
  for (std::size_t j = 0; j < knots_.size(); ++j) {
    t.r0_ohm[j] = std::exp(z[free_index(0, j)]);
    for (int p = 0; p < n_rc_; ++p) {
      t.r_ohm[p][j] = std::exp(z[free_index(1 + 2 * p, j)]);
      t.tau_s[p][j] = std::exp(z[free_index(2 + 2 * p, j)]);
    }
  }
  return t;
}

RcSolution RcProblem::from_z(const Eigen::VectorXd& z) const {
  RcSolution s;
  s.t = tables_from(z);
  for (std::size_t o = 0; o < grid_.size(); ++o) s.ocv_V.push_back(z[ocv_index(o)]);
  return s;
}

void RcProblem::evaluate(const Eigen::VectorXd& z, bool with_jacobian, NormalEquations& out,
                         bool include_penalty) const {
  const std::size_t K = knots_.size();
  const Eigen::Index P = n_free_rc();
  const Eigen::Index M = static_cast<Eigen::Index>(grid_.size());
  const bool free_ocv = M > 0;
  const RcTables t = tables_from(z);
  out.cost = 0.0;
  Eigen::MatrixXd rc_rc, cross;   // JᵀJ blocks: RC×RC (lower), OCV×RC
  Eigen::VectorXd ocv_diag, ocv_off;  // OCV×OCV is tridiagonal
  if (with_jacobian) {
    rc_rc.setZero(P, P);
    cross.setZero(M, P);
    ocv_diag.setZero(M);
    ocv_off.setZero(std::max<Eigen::Index>(M - 1, 0));
    out.jtr.setZero(P + M);
  }
  // Sensitivities of each pair's voltage to log R_p and log τ_p at every knot.
  std::array<std::vector<double>, 2> s_r, s_tau;
  for (int p = 0; p < 2; ++p) {
    s_r[p].assign(K, 0.0);
    s_tau[p].assign(K, 0.0);
  }
  std::array<double, 2> v{0.0, 0.0};
  Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor> block;
  Eigen::VectorXd eblock;
  Eigen::Index filled = 0;
  if (with_jacobian) {
    block.setZero(kBlock, P);
    eblock.setZero(kBlock);
  }
  auto flush = [&]() {
    if (filled == 0) return;
    const auto b = block.topRows(filled);
    rc_rc.selfadjointView<Eigen::Lower>().rankUpdate(b.transpose());
    out.jtr.head(P).noalias() += b.transpose() * eblock.head(filled);
    filled = 0;
  };
  const bool one = K == 1;
  std::array<std::vector<Eigen::Index>, 5> fi;
  for (int ty = 0; ty < 1 + 2 * n_rc_; ++ty)
    for (std::size_t j = 0; j < K; ++j) fi[ty].push_back(free_index(ty, j));
  for (const Row& r : rows_) {
    if (r.restart) {
      v = {0.0, 0.0};
      if (with_jacobian)
        for (int p = 0; p < 2; ++p) {
          std::fill(s_r[p].begin(), s_r[p].end(), 0.0);
          std::fill(s_tau[p].begin(), s_tau[p].end(), 0.0);
        }
    } else {
      const std::size_t ja = r.j1, jb = one ? r.j1 : r.j1 + 1;
      const double wa = one ? 1.0 : 1.0 - r.w1, wb = one ? 0.0 : r.w1;
      for (int p = 0; p < n_rc_; ++p) {
        const double R = wa * t.r_ohm[p][ja] + wb * t.r_ohm[p][jb];
        const double tau = wa * t.tau_s[p][ja] + wb * t.tau_s[p][jb];
        const double a = std::exp(-r.dt / tau);
        const double ri = R * r.i;
        const double v_old = v[p];
        v[p] = ri + a * (v_old - ri);  // v_k = R·I + a·(v_{k−1} − R·I)
        if (with_jacobian) {
          for (std::size_t j = 0; j < K; ++j) {
            s_r[p][j] *= a;
            s_tau[p][j] *= a;
          }
          // ∂v/∂log R_j = a·(…) + I·(1 − a)·w_j·R_j;  ∂v/∂log τ_j = a·(…) + (v_old − R·I)·a·Δt/τ²·w_j·τ_j
          const double dv_dR = r.i * (1.0 - a);
          const double dv_dtau = (v_old - ri) * a * r.dt / (tau * tau);
          s_r[p][ja] += dv_dR * wa * t.r_ohm[p][ja];
          s_tau[p][ja] += dv_dtau * wa * t.tau_s[p][ja];
          if (!one) {
            s_r[p][jb] += dv_dR * wb * t.r_ohm[p][jb];
            s_tau[p][jb] += dv_dtau * wb * t.tau_s[p][jb];
          }
        }
      }
    }
    if (!r.use) continue;
    const std::size_t ja = r.j0, jb = one ? r.j0 : r.j0 + 1;
    const double wa = one ? 1.0 : 1.0 - r.w0, wb = one ? 0.0 : r.w0;
    const double r0 = wa * t.r0_ohm[ja] + wb * t.r0_ohm[jb];
    // e = V_model − V = OCV(s) − R0·I − v1 − v2 − V
    double e;
    if (free_ocv) {
      const Eigen::Index oa = static_cast<Eigen::Index>(r.o);
      e = (1.0 - r.wo) * z[ocv_index(r.o)] + r.wo * z[ocv_index(r.o + 1)] - r0 * r.i - v[0] - v[1] - r.v;
      if (with_jacobian) {
        const double ua = 1.0 - r.wo, ub = r.wo, w = r.weight;
        ocv_diag[oa] += w * ua * ua;
        ocv_diag[oa + 1] += w * ub * ub;
        ocv_off[oa] += w * ua * ub;
        out.jtr[P + oa] += w * ua * e;
        out.jtr[P + oa + 1] += w * ub * e;
      }
    } else {
      e = -r0 * r.i - v[0] - v[1] - r.y;
    }
    out.cost += 0.5 * r.weight * e * e;
    if (!with_jacobian) continue;
    auto row = block.row(filled);
    row.setZero();
    row[fi[0][ja]] += -r.i * wa * t.r0_ohm[ja];
    if (!one) row[fi[0][jb]] += -r.i * wb * t.r0_ohm[jb];
    for (int p = 0; p < n_rc_; ++p)
      for (std::size_t j = 0; j < K; ++j) {
        row[fi[1 + 2 * p][j]] += -s_r[p][j];
        row[fi[2 + 2 * p][j]] += -s_tau[p][j];
      }
    if (free_ocv) {
      const Eigen::Index oa = static_cast<Eigen::Index>(r.o);
      cross.row(oa) += r.weight * (1.0 - r.wo) * row;
      cross.row(oa + 1) += r.weight * r.wo * row;
    }
    // The RC block takes the row and its residual each scaled by √weight.
    if (r.weight != 1.0) {
      const double sw = std::sqrt(r.weight);
      row *= sw;
      e *= sw;
    }
    eblock[filled] = e;
    if (++filled == kBlock) flush();
  }
  if (with_jacobian) {
    flush();
    out.jtj.setZero(P + M, P + M);
    out.jtj.topLeftCorner(P, P) = rc_rc.selfadjointView<Eigen::Lower>();
    if (free_ocv) {
      out.jtj.bottomLeftCorner(M, P) = cross;
      out.jtj.topRightCorner(P, M) = cross.transpose();
      for (Eigen::Index o = 0; o < M; ++o) {
        out.jtj(P + o, P + o) = ocv_diag[o];
        if (o + 1 < M) out.jtj(P + o, P + o + 1) = out.jtj(P + o + 1, P + o) = ocv_off[o];
      }
    }
  }
  if (!include_penalty) return;

  // Smoothness between neighbouring knots, in log space (shared parameters have none).
  auto penalise = [&](const std::vector<std::pair<Eigen::Index, double>>& terms, double rho) {
    double e = 0.0;
    for (const auto& [i, c] : terms) e += c * z[i];
    e *= rho;
    out.cost += 0.5 * e * e;
    if (!with_jacobian) return;
    for (const auto& [i, ci] : terms) {
      out.jtr[i] += rho * ci * e;
      for (const auto& [j, cj] : terms) out.jtj(i, j) += rho * rho * ci * cj;
    }
  };
  if (rho_ > 0.0 && K > 1)
    for (int ty = 0; ty < 1 + 2 * n_rc_; ++ty) {
      if (shared_[ty]) continue;
      for (std::size_t j = 0; j + 1 < K; ++j) penalise({{free_index(ty, j), -1.0}, {free_index(ty, j + 1), 1.0}}, rho_);
    }
  if (free_ocv && rho_ocv_ > 0.0)
    for (std::size_t o = 1; o + 1 < grid_.size(); ++o)
      penalise({{ocv_index(o - 1), 1.0}, {ocv_index(o), -2.0}, {ocv_index(o + 1), 1.0}}, rho_ocv_);
}

double RcProblem::data_cost(const RcSolution& s) const {
  NormalEquations ne;
  evaluate(to_z(s), false, ne, false);
  return ne.cost;
}

std::array<double, 2> RcProblem::information_scale(const RcSolution& s) const {
  NormalEquations ne;
  evaluate(to_z(s), true, ne, false);
  const Eigen::Index P = n_free_rc();
  const double rc = ne.jtj.diagonal().head(P).maxCoeff();
  const double oc = grid_.empty() ? 0.0 : ne.jtj.diagonal().tail(static_cast<Eigen::Index>(grid_.size())).maxCoeff();
  return {rc, oc};
}

LmResult RcProblem::solve(const RcSolution& start, const RcBounds& b, const LmOptions& opts) const {
  Eigen::VectorXd lo(n_free()), hi(n_free());
  for (std::size_t j = 0; j < knots_.size(); ++j) {
    lo[free_index(0, j)] = std::log(b.r_min_ohm);
    hi[free_index(0, j)] = std::log(b.r_max_ohm);
    for (int p = 0; p < n_rc_; ++p) {
      lo[free_index(1 + 2 * p, j)] = std::log(b.r_min_ohm);
      hi[free_index(1 + 2 * p, j)] = std::log(b.r_max_ohm);
      lo[free_index(2 + 2 * p, j)] = std::log(b.tau_min_s[p]);
      hi[free_index(2 + 2 * p, j)] = std::log(b.tau_max_s[p]);
    }
  }
  for (std::size_t o = 0; o < grid_.size(); ++o) {
    lo[ocv_index(o)] = 0.0;
    hi[ocv_index(o)] = 10.0;
  }
  const LeastSquaresProblem f = [this](const Eigen::VectorXd& z, bool jac, NormalEquations& ne) {
    evaluate(z, jac, ne, true);
  };
  return levenberg_marquardt(f, to_z(start), lo, hi, opts);
}

std::vector<CurrentStep> find_current_steps(const battery::CellLog& log, const std::vector<double>& soc,
                                            double min_step_A) {
  std::vector<CurrentStep> out;
  for (std::size_t k = 1; k < log.size(); ++k) {
    if (log.starts_section(k)) continue;
    const double di = log.current_A[k] - log.current_A[k - 1];
    if (std::fabs(di) < min_step_A) continue;
    CurrentStep s;
    s.row = k;
    s.di_A = di;
    s.dv_V = log.voltage_V[k] - log.voltage_V[k - 1];
    s.r_ohm = -s.dv_V / di;  // R0 ≈ −ΔV/ΔI across an instantaneous step (common practice)
    s.soc = soc[k];
    s.dt_s = log.time_s[k] - log.time_s[k - 1];
    out.push_back(s);
  }
  return out;
}

}  // namespace sortie::fit
