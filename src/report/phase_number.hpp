#pragma once
/// Phases are numbered from 1 in every output — text, JSON, CSV, the trace and GeoJSON: phase n
/// is element n − 1 of a result's JSON "phases" array. The simulation indexes them from 0; this
/// is the one place the two meet.
#include <cstddef>
#include <optional>

#include <nlohmann/json.hpp>

namespace sortie::report {

inline int phase_number(std::size_t index) { return static_cast<int>(index) + 1; }

/// A phase index that may be absent (negative, or an empty optional): its number, or null.
inline nlohmann::json phase_number_or_null(int index) {
  return index >= 0 ? nlohmann::json(index + 1) : nlohmann::json();
}
inline nlohmann::json phase_number_or_null(const std::optional<std::size_t>& index) {
  return index ? nlohmann::json(phase_number(*index)) : nlohmann::json();
}

}  // namespace sortie::report
