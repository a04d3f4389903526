#pragma once
/// The loader entry points the fuzzers drive and the corpus replay test feeds (fuzz/README in
/// DEVELOPERS.md "Fuzzing and sanitizers"). Each target reads one input the way a command does,
/// then runs a short simulation on what loaded, with its work bounded, so that the numerics
/// see every model that passes validation.
///
/// Contract: for ANY input a target either returns or throws sortie::InputError or
/// sortie::LimitError. Anything else — another exception, a crash, a sanitizer report, a hang —
/// is a bug. A target also throws std::logic_error when a model that loaded simulates to a
/// non-finite time, charge, energy or state of charge (a range check missing at load).
#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

namespace sortie::fuzz {

struct Target {
  const char* name;  ///< also the folder name under fuzz/corpus/ and fuzz/regressions/
  void (*run)(const std::string& input);
};

/// Every target: cell, pack, drive, airframe, profile, load_csv, cell_log, bench_csv, fit_cell,
/// cli_options.
const std::vector<Target>& targets();
/// nullptr for an unknown name.
const Target* find_target(std::string_view name);

/// Copy the bundled models/ and profiles/ from `source_dir` into `folder` and use that folder
/// as the only place model paths may lead (io::Source::root): a fuzzed path such as
/// "/etc/passwd" or "../../x" is refused as bad input, never opened. Call once before running
/// targets.
void use_models_from(const std::filesystem::path& source_dir, const std::filesystem::path& folder);

}  // namespace sortie::fuzz
