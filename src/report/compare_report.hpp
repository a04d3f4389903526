#pragma once
/// The results of `sortie compare`: a ranked table and its JSON.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "sim/compare.hpp"

namespace sortie::report {

inline constexpr const char* kCompareSchema = "sortie.compare/1";

std::string compare_text(const sim::Mission& base, const std::vector<sim::CompareRow>& rows);
nlohmann::json compare_json(const sim::Mission& base, const std::vector<sim::CompareRow>& rows);

}  // namespace sortie::report
