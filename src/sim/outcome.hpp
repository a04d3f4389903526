#pragma once
/// What ended a flight before its plan, or the time on station counted at landing: one name per
/// kind, written the same in JSON, text and the events list.
#include <optional>
#include <string>
#include <string_view>

namespace sortie::sim {

enum class EndKind {
  cutoff_voltage,  ///< the loaded cell voltage reached the cutoff (or the reserve floor in the hold)
  saturation,      ///< the ESC at full duty could not give the motor the voltage it needs
  power_collapse,  ///< the pack cannot deliver the power asked at any current
  soc_floor,       ///< the pack is empty
  coverage_floor,  ///< the SoC reached the lowest SoC the cell model has data for
  refused          ///< a phase (or the hold) asks for something the airframe or drive cannot do
};

/// The kind's name ("cutoff_voltage", ...).
const char* to_string(EndKind k);

/// The kind of that name (the terminal events of a segment are named by to_string); nullopt
/// for any other name.
std::optional<EndKind> end_kind_named(std::string_view name);

/// An ending as shown: "" for none, "refused: WHY" for a refusal, else the kind's name.
std::string end_text(const std::optional<EndKind>& k, const std::string& refusal = "");

}  // namespace sortie::sim
