#pragma once
/// What `check` and `logbook add-flight` share: a flight log read with the command's
/// `--columns`, and checked against the plan of a loaded profile (the plan simulated with a 1 s
/// trace, a refused plan an input error; a log whose voltage does not fit the pack's cell count
/// an input error, estimate/cell_count.hpp).
#include <string>

#include "io/profile_json.hpp"
#include "sim/flight_check.hpp"

namespace sortie::cli {

struct LogAgainstPlan {
  sim::MeasuredFlight flight;  ///< the log in SI, as the check read it
  sim::FlightCheck check;
};

/// `columns` empty: the reader's own header matching.
LogAgainstPlan check_log_against_plan(const std::string& log, const std::string& columns,
                                      const io::LoadedProfile& lp);

}  // namespace sortie::cli
