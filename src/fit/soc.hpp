#pragma once
/// State of charge of every log row by Coulomb counting from known points:
///   SoC_k = SoC_a − (q_k − q_a)/Q,   q_k = Σ_{j≤k} I_j·(t_j − t_{j−1}) / 3600   (Ah, discharge +)
/// with a the latest anchor at or before row k (the first anchor for rows before it), and Q the
/// capacity. Anchors (common practice in cell testing):
///   full  — the end of a charge that reached the maximum voltage and tapered to a fifth of its
///           peak current or less (the constant-voltage end of a CC-CV charge), SoC 1;
///   empty — the end of a discharge that reached the cutoff voltage (within 20 mV), SoC 0;
/// both counted only for charges and discharges of a minute or more (a pulse is neither), with
/// the maximum voltage the highest of those charges and the cutoff the lowest end of those
/// discharges unless given;
///   given — SoC at the first row from the command line.
/// Capacity: the mean charge of the full-to-empty discharges in the log; else of empty-to-full
/// charges; else the value given. Charge and discharge are counted alike (coulombic efficiency
/// taken as 1, common practice for Li-ion over a few cycles).
#include <optional>
#include <string>
#include <vector>

#include "fit/cell_log.hpp"

namespace sortie::fit {

struct SocAnchor {
  enum class Kind { full, empty, given };
  Kind kind = Kind::full;
  std::size_t row = 0;
  double soc = 1.0;
};

struct SocOptions {
  std::optional<double> capacity_Ah;  ///< used when the log has no full discharge
  std::optional<double> soc0;         ///< SoC at the first row
  std::optional<double> v_max_V;      ///< full-charge voltage (default: highest while charging)
  std::optional<double> v_cutoff_V;   ///< end-of-discharge voltage (default: lowest while discharging)
};

struct SocEstimate {
  std::vector<double> soc;        ///< per row
  std::vector<double> charge_Ah;  ///< q_k, discharge positive, from the first row
  double capacity_Ah = 0.0;
  bool capacity_from_log = false;
  std::string capacity_source;    ///< one line for the report
  std::vector<SocAnchor> anchors;
  double v_full_V = 0.0;          ///< the voltage taken as full
  double v_empty_V = 0.0;         ///< the voltage taken as empty
  double i_rest_A = 0.0;          ///< |I| at or below this is a rest
  std::vector<std::string> warnings;
};

/// |I| at or below which a row is at rest: 0.5 % of the largest |I| (a logger's offset on a
/// rest is typically well under that; common practice).
double rest_current_A(const CellLog& log);

/// Throws InputError when there is no anchor, or no capacity from the log or the options.
SocEstimate estimate_soc(const CellLog& log, const SocOptions& opts);

}  // namespace sortie::fit
