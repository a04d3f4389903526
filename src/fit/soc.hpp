#pragma once
/// State of charge of every log row by Coulomb counting from known points:
///   SoC_k = SoC_a − (q_k − q_a)/Q,   q_k = Σ_{j≤k} I_j·(t_j − t_{j−1}) / 3600   (Ah, discharge +)
/// with a the latest anchor at or before row k (the first anchor for rows before it), and Q the
/// capacity. Anchors — the only points whose SoC is known (common practice in cell testing):
///   full  — the end of a charge that tapered at a constant voltage (its current fell to a fifth
///           of its peak or less while the voltage stayed within 20 mV of the level it ended at:
///           the CV phase of a CC-CV charge) at the full level (--v-max-V, else the highest such
///           level in the log); or a rest of at least kFullRestS at the very start of the log
///           ending within kFullRestMarginV of the chemistry's full voltage, SoC 1;
///   empty — the end of a discharge of a minute or more at 1C or less that ends within 20 mV of
///           the cutoff (--v-cutoff-V, else the top of the chemistry's usual end-of-discharge
///           range, fit/chemistry), SoC 0 (at 1C the charge left at the cutoff is a few percent
///           of the capacity, common practice); the C-rate is against --capacity-Ah, else the
///           largest charge swing in the log (at most the capacity: the rate is not understated);
///   given — SoC at the first row from the command line (--soc0).
/// Nothing else is a known point: a log without one and without --soc0 is refused, naming what
/// was looked for and what was found. The full-charge voltage is the CV level, else
/// --v-max-V, else the chemistry's; never a pulse's peak.
/// Capacity: the mean charge of the full-to-empty discharges in the log; else of empty-to-full
/// charges; else the value given. Charge and discharge are counted alike (coulombic efficiency
/// taken as 1, common practice for Li-ion over a few cycles).
#include <optional>
#include <string>
#include <vector>

#include "battery/cell_log.hpp"
#include "fit/chemistry.hpp"

namespace sortie::fit {

struct SocAnchor {
  enum class Kind { full, empty, given };
  Kind kind = Kind::full;
  std::size_t row = 0;
  double soc = 1.0;
  std::string how;  ///< for the report: which kind of full or empty point
};

struct SocOptions {
  std::optional<double> capacity_Ah;  ///< used when the log has no full discharge
  std::optional<double> soc0;         ///< SoC at the first row
  std::optional<double> v_max_V;      ///< full-charge voltage (default: highest while charging)
  std::optional<double> v_cutoff_V;   ///< end-of-discharge voltage (default: the chemistry's)
  std::string chemistry;              ///< --chemistry (default: from the CV level)
};

/// Shortest rest at the start of a log that counts as full, s, and how far below the
/// chemistry's full voltage it may end, V (a rested full cell sits 10–30 mV below its charge
/// level; common practice).
inline constexpr double kFullRestS = 1800.0;
inline constexpr double kFullRestMarginV = 0.03;
/// Highest C-rate of a discharge whose end at the cutoff counts as empty.
inline constexpr double kEmptyMaxC = 1.0;

struct SocEstimate {
  std::vector<double> soc;        ///< per row
  std::vector<double> charge_Ah;  ///< q_k, discharge positive, from the first row
  double capacity_Ah = 0.0;
  bool capacity_from_log = false;
  std::string capacity_source;    ///< one line for the report
  std::vector<SocAnchor> anchors;
  double v_full_V = 0.0;          ///< the full-charge voltage (0: not known)
  std::string v_full_source;      ///< "constant-voltage level of the charges", "given", "chemistry"
  double v_empty_V = 0.0;         ///< the voltage taken as empty (0: not known)
  std::string v_empty_source;
  std::optional<Chemistry> chemistry;
  double i_rest_A = 0.0;          ///< |I| at or below this is a rest
  std::vector<std::string> warnings;
  std::vector<std::string> notes;
};

/// |I| at or below which a row is at rest: 0.5 % of the largest |I| (a logger's offset on a
/// rest is typically well under that; common practice).
double rest_current_A(const battery::CellLog& log);

/// Throws InputError when there is no anchor, or no capacity from the log or the options.
SocEstimate estimate_soc(const battery::CellLog& log, const SocOptions& opts);

}  // namespace sortie::fit
