#pragma once
/// What `fit cell` takes from a cell's chemistry: its full-charge voltage, the range of usual
/// end-of-discharge voltages, and the span an open-circuit voltage can physically take.
///
/// Figures are common practice for lithium cells (makers' datasheets; from memory):
///   Li-ion with an LCO, NMC or NCA cathode: charged to 4.20 V, discharged to 2.5–3.0 V, OCV
///     between about 2.7 V (fully discharged, rested) and 4.25 V;
///   LiPo (the same cathodes in a pouch, as flown): charged to 4.20 V, discharged to 3.0–3.3 V;
///   LiHV (high-voltage LiPo): charged to 4.35 V, discharged to 3.0–3.3 V, OCV 2.9–4.40 V;
///   LFP (LiFePO4): charged to 3.60–3.65 V, discharged to 2.0–2.5 V, OCV 2.5–3.70 V.
/// An OCV fitted outside these bounds is not physical for the chemistry.
#include <optional>
#include <string>

namespace sortie::fit {

struct Chemistry {
  std::string name;          ///< as reported
  double v_full_V = 4.2;     ///< full-charge (constant-voltage) level, V
  double v_eod_lo_V = 2.5;   ///< lowest usual end-of-discharge voltage, V
  double v_eod_hi_V = 3.0;   ///< highest usual end-of-discharge voltage, V
  double ocv_min_V = 2.7;    ///< physical OCV bounds, V
  double ocv_max_V = 4.25;
  std::string how;           ///< "given (--chemistry LiPo)" or how it was inferred
};

/// The chemistry named by `name` (case-insensitive: LiPo, Li-ion, LCO, NMC, NCA, LiHV, LFP,
/// LiFePO4; a name containing one of them counts), or none.
std::optional<Chemistry> chemistry_by_name(const std::string& name);

/// The chemistry a full-charge level points to: 3.5–3.7 V LFP, 4.1–4.25 V Li-ion (LCO/NMC/NCA;
/// LiPo cannot be told from it),
/// 4.3–4.45 V LiHV; none otherwise.
std::optional<Chemistry> chemistry_from_full_voltage(double v_V);

}  // namespace sortie::fit
