#pragma once
/// The what-if options of `fly` and `compare` (--payload-kg, --air-C, ..., --drive, --airframe,
/// and for fly --pack-layout with --cell): each number is checked with the range of the JSON
/// field it replaces, and apply_what_if sets them in the loaded mission and lists them.
#include <CLI/CLI.hpp>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "sim/mission.hpp"
#include "sim/what_if.hpp"

namespace sortie::cli {

struct WhatIfOptions {
  std::map<std::string, double> numbers;  ///< by sim::WhatIfParameter::name, as given
  std::string drive, airframe;            ///< files replacing the profile's
  std::string pack_layout;                ///< "4S2P" (fly only)
  std::string cell;                       ///< re-cell the profile's pack (fly only)
};

/// Register the options on `c`. `pack_options`: also --pack-layout and --cell (fly).
void add_what_if_options(CLI::App* c, WhatIfOptions& o, bool pack_options);

/// Set every override of `o` in `m` and list them in a fixed order (files, then pack, then
/// numbers in sim::what_if_parameters() order).
std::vector<sim::Override> apply_what_if(sim::Mission& m, const WhatIfOptions& o);

/// "4S2P" → (4, 2); a UsageError naming --pack-layout otherwise.
std::pair<int, int> parse_pack_layout(const std::string& word);

}  // namespace sortie::cli
