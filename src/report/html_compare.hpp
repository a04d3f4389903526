#pragma once
/// `sortie compare --html`: spare time and landing charge of each pack as bars (no-go packs
/// hatched and named), the ranked table, the Cautions box.
#include <string>
#include <vector>

#include "sim/compare.hpp"

namespace sortie::report {

/// The plots the compare page draws, by their data-plot id, in page order.
inline constexpr const char* kComparePlots[] = {"compare-spare", "compare-landing-soc"};

std::string compare_html(const sim::Mission& base, const std::vector<sim::CompareRow>& rows,
                         const sim::RankOptions& rank = {});

}  // namespace sortie::report
