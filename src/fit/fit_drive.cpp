#include "fit/fit_drive.hpp"

#include "core/constants.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <limits>
#include <numbers>

#include "core/error.hpp"
#include "core/text.hpp"
#include "propulsion/operating_point.hpp"

namespace sortie::fit {

namespace {

constexpr double kPi = std::numbers::pi;
const double kNaN = std::numeric_limits<double>::quiet_NaN();

double median(std::vector<double> v) {
  if (v.empty()) return kNaN;
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  return *mid;
}

/// The fitted parameters, SI (Kv in rad/s per V).
struct Params {
  double kv, rm, i0, p_idle, r_on, k_sw, ct, cp;
  static constexpr int kCount = 8;
  std::array<double, kCount> as_array() const { return {kv, rm, i0, p_idle, r_on, k_sw, ct, cp}; }
  static Params from(const Eigen::VectorXd& x) {  // x holds logs
    return {std::exp(x[0]), std::exp(x[1]), std::exp(x[2]), std::exp(x[3]),
            std::exp(x[4]), std::exp(x[5]), std::exp(x[6]), std::exp(x[7])};
  }
};

struct Prediction {
  double omega = 0.0, i_m = 0.0, thrust_N = 0.0, torque_Nm = 0.0, bus_W = 0.0;
};

/// The model of the header at duty d and bus voltage V.
Prediction predict(const Params& p, double duty, double v_bus, double rho, double D) {
  Prediction r;
  const double vm = duty * v_bus;
  const double c = p.cp * rho * std::pow(D, 5) / std::pow(2.0 * kPi, 3);  // Q = c·ω²
  const double b = p.kv * (vm - p.rm * p.i0);
  if (b <= 0.0) {
    r.i_m = vm / p.rm;  // stalled: the winding alone
  } else {
    // a·ω² + ω − b = 0 with a = Kv²·Rm·c: the positive root, cancellation-free 2b/(1 + √(1 + 4ab)).
    const double a = p.kv * p.kv * p.rm * c;
    r.omega = 2.0 * b / (1.0 + std::sqrt(1.0 + 4.0 * a * b));
    r.torque_Nm = c * r.omega * r.omega;
    r.i_m = p.i0 + p.kv * r.torque_Nm;
  }
  const double n = r.omega / (2.0 * kPi);
  r.thrust_N = p.ct * rho * n * n * std::pow(D, 4);
  r.bus_W = vm * r.i_m + p.p_idle + p.r_on * r.i_m * r.i_m + p.k_sw * v_bus * r.i_m;
  return r;
}

struct Row {
  double duty, v_bus, rpm, thrust_N, bus_W, torque_Nm;
  bool running, has_torque;
};

/// Relative residuals, 1 = 1 % of the measured value (floors keep near-zero readings from
/// dominating: 2 % of the largest thrust, bus power or torque).
void residuals(const Params& p, const std::vector<Row>& rows, double rho, double D, double t_max,
               double p_max, double q_max, std::vector<double>& out) {
  out.clear();
  for (const Row& r : rows) {
    const Prediction m = predict(p, r.duty, r.v_bus, rho, D);
    out.push_back((m.bus_W - r.bus_W) / (0.01 * std::max(r.bus_W, 0.02 * p_max)));
    if (!r.running) continue;
    out.push_back((m.omega * 60.0 / (2.0 * kPi) - r.rpm) / (0.01 * r.rpm));
    out.push_back((m.thrust_N - r.thrust_N) / (0.01 * std::max(r.thrust_N, 0.02 * t_max)));
    if (r.has_torque) out.push_back((m.torque_Nm - r.torque_Nm) / (0.01 * std::max(r.torque_Nm, 0.02 * q_max)));
  }
}

double rms(const std::vector<double>& v) {
  if (v.empty()) return 0.0;
  double s = 0.0;
  for (double x : v) s += x * x;
  return std::sqrt(s / static_cast<double>(v.size()));
}

}  // namespace

DriveFitResult fit_drive(const propulsion::BenchMap& bench, const DriveFitOptions& opts) {
  DriveFitResult out;
  const double rho = opts.rho_kg_m3.value_or(core::kSeaLevelDensity), D = opts.diameter_m;
  const std::string file = opts.file.empty() ? std::string("bench") : opts.file;
  out.has_torque = bench.has_torque;

  // --- rows; the motor turns where the bench shows speed ---
  double rpm_max = 0.0, t_max = 0.0, p_max = 0.0, q_max = 0.0, thr_max = 0.0, thr_min = 1e300;
  for (const auto& b : bench.rows) {
    rpm_max = std::max(rpm_max, b.rpm);
    t_max = std::max(t_max, b.thrust_N);
    p_max = std::max(p_max, b.bus_W());
    if (b.torque_Nm) q_max = std::max(q_max, *b.torque_Nm);
  }
  // Duty from throttle as `sortie drive` reads it: throttle = duty / duty_max.
  const double duty_max = opts.duty_max.value_or(1.0);
  std::vector<Row> rows;
  std::size_t running = 0;
  for (const auto& b : bench.rows) {
    Row r;
    r.duty = duty_max * b.throttle_pct / 100.0;
    r.v_bus = b.v_bus_V;
    r.rpm = b.rpm;
    r.thrust_N = b.thrust_N;
    r.bus_W = b.bus_W();
    r.has_torque = b.torque_Nm.has_value();
    r.torque_Nm = b.torque_Nm.value_or(0.0);
    r.running = b.rpm > 0.01 * rpm_max && b.thrust_N > 0.0;
    if (r.running) {
      ++running;
      thr_max = std::max(thr_max, r.duty);
      thr_min = std::min(thr_min, r.duty);
    }
    rows.push_back(r);
  }
  if (running < 4)
    throw InputError(file + ": too few rows with the motor turning (got " + std::to_string(running) +
                     ", expected at least 4 throttle steps with rpm and thrust) to fit Kv, Rm, I0, the ESC losses, CT and CP");
  if (thr_max - thr_min < 0.2)
    throw InputError(file + ": the throttle steps span " + format_fixed(100 * thr_min, 0) + " % to " + format_fixed(100 * thr_max, 0) +
                     " % only (expected at least 20 % of throttle between the lowest and highest running step)");

  // --- first guesses ---
  std::vector<double> ct, cp, kv;
  for (const Row& r : rows) {
    if (!r.running) continue;
    const double n = r.rpm / 60.0;
    ct.push_back(r.thrust_N / (rho * n * n * std::pow(D, 4)));  // T = CT·ρ·n²·D⁴
    cp.push_back(r.has_torque ? 2.0 * kPi * r.torque_Nm / (rho * n * n * std::pow(D, 5))
                              : 0.75 * r.bus_W / (rho * n * n * n * std::pow(D, 5)));  // ~75 % of bus power at the shaft
    kv.push_back(2.0 * kPi * n / (r.duty * r.v_bus));
  }
  double p_idle0 = 0.0;
  std::size_t idle_rows = 0;
  for (const Row& r : rows)
    if (!r.running && r.duty <= 0.0) p_idle0 += r.bus_W, ++idle_rows;
  p_idle0 = idle_rows ? std::max(p_idle0 / static_cast<double>(idle_rows), 1e-3) : std::max(0.005 * p_max, 1e-3);
  const double kv0 = *std::max_element(kv.begin(), kv.end()) * 1.05;
  // Rm from the hardest-working row: V_m − ω/Kv = I_m·Rm with I_m ≈ P_bus/V_m.
  double i_top = 0.0, vm_top = 1.0, w_top = 0.0, p_top = -1.0;
  for (const Row& r : rows)
    if (r.running && r.bus_W > p_top) {
      p_top = r.bus_W;
      vm_top = r.duty * r.v_bus;
      i_top = r.bus_W / vm_top;
      w_top = 2.0 * kPi * r.rpm / 60.0;
    }
  const double rm0 = std::clamp((vm_top - w_top / kv0) / std::max(i_top, 1e-6), 1e-3, 1.0);

  // --- bounded least squares in log space; a few starts for Kv and Rm ---
  Eigen::VectorXd lo(Params::kCount), hi(Params::kCount);
  const double i_bus_max = p_max / std::max(1e-9, bench.v_bus_min_V);
  const std::array<std::pair<double, double>, Params::kCount> box = {{
      {kv0 / 5.0, kv0 * 5.0},       // Kv, rad/s/V
      {1e-5, 10.0},                 // Rm, Ω
      {1e-5, 0.5 * i_bus_max + 1},  // I0, A
      {1e-5, std::max(1.0, p_max)}, // P_idle, W
      {1e-7, 1.0},                  // R_on, Ω
      {1e-7, 0.5},                  // k_switch (the drive reader's range)
      {1e-4, 1.0},                  // CT
      {1e-4, 1.0},                  // CP
  }};
  for (int i = 0; i < Params::kCount; ++i) lo[i] = std::log(box[i].first), hi[i] = std::log(box[i].second);
  const LeastSquaresProblem f = [&](const Eigen::VectorXd& x, bool jac, NormalEquations& ne) {
    std::vector<double> r0;
    residuals(Params::from(x), rows, rho, D, t_max, p_max, q_max, r0);
    ne.cost = 0.0;
    for (double e : r0) ne.cost += 0.5 * e * e;
    if (!jac) return;
    // Forward differences in log space, step 1e-6 (relative 1e-6 in each parameter).
    const Eigen::Index m = static_cast<Eigen::Index>(r0.size());
    Eigen::MatrixXd J(m, Params::kCount);
    std::vector<double> r1;
    for (int j = 0; j < Params::kCount; ++j) {
      Eigen::VectorXd xh = x;
      const double h = 1e-6;
      xh[j] += h;
      residuals(Params::from(xh), rows, rho, D, t_max, p_max, q_max, r1);
      for (Eigen::Index i = 0; i < m; ++i) J(i, j) = (r1[static_cast<std::size_t>(i)] - r0[static_cast<std::size_t>(i)]) / h;
    }
    const Eigen::Map<const Eigen::VectorXd> e(r0.data(), m);
    ne.jtj = J.transpose() * J;
    ne.jtr = J.transpose() * e;
  };
  LmOptions lm;
  lm.max_iterations = opts.max_iterations;
  lm.cost_rel_tol = 1e-12;
  LmResult best;
  best.cost = std::numeric_limits<double>::infinity();
  for (const double kf : {1.0, 1.2})
    for (const double rf : {1.0, 0.3}) {
      Eigen::VectorXd x0(Params::kCount);
      const Params p0{kv0 * kf, rm0 * rf, 0.03 * i_bus_max, p_idle0, 0.1 * rm0, 0.02, median(ct), median(cp)};
      const auto a = p0.as_array();
      for (int i = 0; i < Params::kCount; ++i) x0[i] = std::log(std::clamp(a[i], box[i].first, box[i].second));
      const LmResult r = levenberg_marquardt(f, x0, lo, hi, lm);
      out.iterations += r.iterations;
      if (r.cost < best.cost) best = r;
    }
  out.status = best.status;
  const Params p = Params::from(best.x);
  // Standard errors: σ²·(JᵀJ)⁻¹ with σ² = Σr²/(m − 8), in log parameters (relative).
  {
    NormalEquations ne;
    f(best.x, true, ne);
    std::vector<double> r0;
    residuals(p, rows, rho, D, t_max, p_max, q_max, r0);
    const double dof = std::max(1.0, static_cast<double>(r0.size()) - Params::kCount);
    const Eigen::MatrixXd cov = (2.0 * ne.cost / dof) *
                                ne.jtj.completeOrthogonalDecomposition().pseudoInverse();
    static const char* names[] = {"Kv", "Rm", "I0", "P_idle", "R_on", "k_switch", "CT", "CP"};
    static const char* units[] = {"rpm/V", "ohm", "A", "W", "ohm", "", "", ""};
    const auto a = p.as_array();
    for (int i = 0; i < Params::kCount; ++i) {
      DriveParameter dp;
      dp.name = names[i];
      dp.unit = units[i];
      dp.value = i == 0 ? a[i] * 60.0 / (2.0 * kPi) : a[i];
      dp.se_rel = std::sqrt(std::max(0.0, cov(i, i)));
      dp.at_bound = best.x[i] <= lo[i] + 1e-9 || best.x[i] >= hi[i] - 1e-9;
      if (dp.at_bound)
        out.warnings.push_back(dp.name + " reached a bound of the fit (" + format_fixed(std::exp(best.x[i]), 6) +
                               "): this bench does not pin it down");
      else if (dp.se_rel > 0.5)
        out.warnings.push_back(dp.name + " is loosely determined by this bench (standard error " +
                               format_fixed(100.0 * dp.se_rel, 0) + " %); more throttle steps, a second supply voltage or a "
                               "torque column would help");
      out.parameters.push_back(dp);
    }
  }

  // --- the drive ---
  propulsion::Drive& d = out.drive;
  d.name = opts.name.empty() ? "drive fitted from " + std::filesystem::path(file).filename().string() : opts.name;
  d.rotors = opts.rotors;
  d.prop.diameter_m = D;
  d.prop.ct = Table(p.ct);
  d.prop.cp = Table(p.cp);
  d.motor.kv_rpm_per_V = p.kv * 60.0 / (2.0 * kPi);
  d.motor.rm_ohm = p.rm;
  d.motor.i0_A = p.i0;
  d.motor.i0_ref_V = bench.v_bus_mean_V;
  d.motor.i0_speed_exponent = 0.0;
  d.esc.r_on_ohm = p.r_on;
  d.esc.k_switch = p.k_sw;
  d.esc.p_idle_W = p.p_idle;
  double i_m_max = 0.0;
  for (const Row& r : rows) i_m_max = std::max(i_m_max, predict(p, r.duty, r.v_bus, rho, D).i_m);
  const double i_lim = std::max(std::ceil(i_m_max * 10.0) / 10.0, 1.01 * p.i0 + 0.1);
  d.motor.i_max_A = opts.motor_i_max_A.value_or(i_lim);
  d.esc.i_max_A = opts.esc_i_max_A.value_or(i_lim);
  if (!opts.motor_i_max_A || !opts.esc_i_max_A)
    out.notes.push_back("current limits set to the largest motor current on the bench, " + format_fixed(i_lim, 1) +
                        " A (give --motor-i-max-A and --esc-i-max-A for the makers' ratings)");
  d.esc.duty_max = duty_max;
  out.notes.push_back("duty = throttle × duty_max with duty_max " + format_fixed(duty_max, 3) +
                      (opts.duty_max ? "" : " (give --duty-max for the ESC's)") +
                      " (a linear throttle response); air density " + format_fixed(rho, 3) + " kg/m³" +
                      (opts.rho_kg_m3 ? "" : " (ISA sea level; give --air-density-kg-m3)"));

  // --- every row through the propulsion model as `sortie drive` runs it ---
  std::vector<double> e_rpm, e_thrust, e_power, e_torque;
  for (std::size_t k = 0; k < rows.size(); ++k) {
    const Row& r = rows[k];
    DrivePointFit pt;
    pt.measured = bench.rows[k];
    pt.running = r.running;
    const propulsion::OperatingPoint op = propulsion::at_duty(d, r.duty, 0.0, rho, r.v_bus);
    pt.rpm = op.motor.rpm;
    pt.thrust_N = op.motor.thrust_N;
    pt.torque_Nm = op.motor.torque;
    // At zero duty the ESC alone draws its idle power.
    pt.bus_W = r.duty > 0.0 ? op.bus.bus_W : d.esc.p_idle_W;
    pt.bus_A = pt.bus_W / r.v_bus;
    pt.eta_model = pt.bus_W > 0.0 ? op.motor.shaft_W / pt.bus_W : 0.0;
    pt.g_per_W_model = pt.bus_W > 0.0 ? pt.thrust_N / propulsion::kStandardGravity * 1000.0 / pt.bus_W : 0.0;
    const double shaft_meas = r.has_torque ? r.torque_Nm * 2.0 * kPi * r.rpm / 60.0 : kNaN;
    pt.eta_measured = r.bus_W > 0.0 ? shaft_meas / r.bus_W : kNaN;
    pt.g_per_W_measured = r.bus_W > 0.0 ? r.thrust_N / propulsion::kStandardGravity * 1000.0 / r.bus_W : 0.0;
    pt.err_power_pct = r.bus_W > 0.0 ? 100.0 * (pt.bus_W / r.bus_W - 1.0) : kNaN;
    pt.err_rpm_pct = r.running ? 100.0 * (pt.rpm / r.rpm - 1.0) : kNaN;
    pt.err_thrust_pct = r.running ? 100.0 * (pt.thrust_N / r.thrust_N - 1.0) : kNaN;
    pt.err_torque_pct = r.running && r.has_torque && r.torque_Nm > 0 ? 100.0 * (pt.torque_Nm / r.torque_Nm - 1.0) : kNaN;
    if (r.running) {
      e_rpm.push_back(pt.err_rpm_pct);
      e_thrust.push_back(pt.err_thrust_pct);
      e_power.push_back(pt.err_power_pct);
      if (std::isfinite(pt.err_torque_pct)) e_torque.push_back(pt.err_torque_pct);
      out.max_power_pct = std::max(out.max_power_pct, std::fabs(pt.err_power_pct));
    }
    out.points.push_back(pt);
  }
  out.rms_rpm_pct = rms(e_rpm);
  out.rms_thrust_pct = rms(e_thrust);
  out.rms_power_pct = rms(e_power);
  out.rms_torque_pct = rms(e_torque);
  if (out.max_power_pct > 5.0)
    out.warnings.push_back("bus power differs from the bench by up to " + format_fixed(out.max_power_pct, 1) +
                           " %: the first-order motor and ESC model does not describe this drive well everywhere");
  if (out.status != LmStatus::converged)
    out.warnings.push_back(std::string("the parameter fit ended with '") + to_string(out.status) +
                           "'; the best parameters found are written");
  out.note = "Fitted by sortie fit drive from " + std::filesystem::path(file).filename().string() + " (" +
             std::to_string(rows.size()) + " throttle steps, " + std::to_string(running) +
             " turning): static CT and CP, duty = throttle × duty_max; RMS errors rpm " + format_fixed(out.rms_rpm_pct, 2) +
             " %, thrust " + format_fixed(out.rms_thrust_pct, 2) + " %, bus power " + format_fixed(out.rms_power_pct, 2) +
             " %. An estimate from measurements, not a rating.";
  return out;
}

}  // namespace sortie::fit
