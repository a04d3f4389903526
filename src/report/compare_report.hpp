#pragma once
/// The results of `sortie compare`: a ranked table and its JSON.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "sim/compare.hpp"

namespace sortie::report {

inline constexpr const char* kCompareSchema = "sortie.compare/1";

std::string compare_text(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                         const sim::RankOptions& rank = {});
nlohmann::json compare_json(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                            const sim::RankOptions& rank = {});
/// "ranked by spare time", "the lightest pack with a spare of at least 300 s ranked first", ...
std::string rank_words(const sim::RankOptions& rank);

}  // namespace sortie::report
