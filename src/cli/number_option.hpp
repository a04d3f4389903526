#pragma once
/// Command-line numbers through the one validator (core/range.hpp): an option's word must be a
/// number inside its documented range, so NaN, ±inf and values past a physical bound are refused
/// before any command runs, as `--sample-s: not a finite number (got NaN, expected a number from
/// 0.001 to 1e+06 s)`.
#include <CLI/CLI.hpp>
#include <string>

#include "core/range.hpp"

namespace sortie::cli {

/// A CLI11 check for a real-valued option: the word must parse whole and lie in `r`.
CLI::Validator number_in(const Range& r);

/// A CLI11 check for a whole-number option from `lo` to `hi` (`unit` may be empty).
CLI::Validator whole_in(int lo, int hi, const std::string& unit = "");

/// A CLI11 check for a file option (--json, --trace, --html, --out, --report): an empty word
/// (`--json "$OUT"` with OUT unset) is refused rather than read as "no file".
CLI::Validator output_path();

}  // namespace sortie::cli
