#pragma once
/// `--stop-at-coverage` and `--accept-extrapolation` of `fly` and `compare` (README "The
/// model's range").
#include <CLI/CLI.hpp>

namespace sortie::cli {

inline void add_coverage_options(CLI::App* c, bool& stop_at_coverage, bool& accept_extrapolation) {
  c->add_flag("--stop-at-coverage", stop_at_coverage,
              "end the flight where the state of charge falls below the lowest the cell model has data for "
              "(its coverage soc_min, or its OCV table's first point)");
  c->add_flag("--accept-extrapolation", accept_extrapolation,
              "let the verdict rest on the model below that floor (default: a landing below it fails the "
              "soc_covered rule, and the time on station left at landing counts down to the floor only)");
}

}  // namespace sortie::cli
