#include "sim/outcome.hpp"

namespace sortie::sim {

namespace {
constexpr EndKind kAll[] = {EndKind::cutoff_voltage, EndKind::saturation,     EndKind::power_collapse,
                            EndKind::soc_floor,      EndKind::coverage_floor, EndKind::refused};
}  // namespace

const char* to_string(EndKind k) {
  switch (k) {
    case EndKind::cutoff_voltage: return "cutoff_voltage";
    case EndKind::saturation: return "saturation";
    case EndKind::power_collapse: return "power_collapse";
    case EndKind::soc_floor: return "soc_floor";
    case EndKind::coverage_floor: return "coverage_floor";
    case EndKind::refused: return "refused";
  }
  return "?";
}

std::optional<EndKind> end_kind_named(std::string_view name) {
  for (const EndKind k : kAll)
    if (name == to_string(k)) return k;
  return std::nullopt;
}

std::string end_text(const std::optional<EndKind>& k, const std::string& refusal) {
  if (!k) return "";
  if (*k == EndKind::refused) return "refused: " + refusal;
  return to_string(*k);
}

}  // namespace sortie::sim
