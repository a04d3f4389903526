#include "report/model_range_report.hpp"

#include "report/phase_number.hpp"

namespace sortie::report {

namespace {
nlohmann::json opt(const std::optional<double>& v) { return v ? nlohmann::json(*v) : nlohmann::json(); }
}  // namespace

nlohmann::json coverage_json(const battery::Cell& c) {
  if (!c.coverage) return nullptr;
  const auto& v = *c.coverage;
  return {{"soc_min", v.soc_min},
          {"soc_max", v.soc_max},
          {"current_max_A", opt(v.current_max_A)},
          {"current_min_A", opt(v.current_min_A)},
          {"temperature_min_C", opt(v.temperature_min_C)},
          {"temperature_max_C", opt(v.temperature_max_C)},
          {"source", v.source}};
}

nlohmann::json excursions_json(const std::vector<sim::Excursion>& xs, bool with_phase) {
  nlohmann::json arr = nlohmann::json::array();
  for (const auto& e : xs) {
    nlohmann::json j = {{"quantity", e.quantity},     {"side", e.side},
                        {"range", e.range},           {"limit", e.limit},
                        {"extreme", e.extreme},       {"beyond", e.beyond()},
                        {"first_s", e.first_s},       {"duration_s", e.duration_s},
                        {"intervals", e.intervals},   {"at_end", e.at_end}};
    if (with_phase) j["phase"] = phase_number_or_null(e.phase);
    arr.push_back(j);
  }
  return arr;
}

std::string excursions_text(const std::vector<sim::Excursion>& xs) {
  if (xs.empty()) return "";
  std::string out = "outside the model's range (the figures there are extrapolated):\n";
  for (const auto& e : xs) out += "  " + sim::describe(e) + "\n";
  return out;
}

}  // namespace sortie::report
