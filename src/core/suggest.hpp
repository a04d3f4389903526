#pragma once
/// Nearest-name suggestions for unknown keys and options.
#include <string>
#include <string_view>
#include <vector>

namespace sortie {

/// Edit distance (insert, delete, substitute, each cost 1).
std::size_t edit_distance(std::string_view a, std::string_view b);

/// The candidate closest to `name` by edit distance, or "" when none is close
/// (distance above half the longer length).
std::string nearest(std::string_view name, const std::vector<std::string>& candidates);

}  // namespace sortie
