#include "cli/log_check.hpp"

#include <map>

#include "cli/profile_load.hpp"
#include "core/error.hpp"
#include "estimate/cell_count.hpp"
#include "io/flight_log_csv.hpp"

namespace sortie::cli {

LogAgainstPlan check_log_against_plan(const std::string& log, const std::string& columns,
                                      const io::LoadedProfile& lp) {
  const auto cols = columns.empty() ? std::map<std::string, io::ColumnRef>{}
                                    : io::parse_column_spec(columns, io::flight_log_quantities());
  const io::FlightLog fl = io::read_flight_log_file(log, cols);
  LogAgainstPlan out{sim::MeasuredFlight{fl.time_s, fl.voltage_V, fl.current_A, fl.lines}, {}};
  estimate::require_cell_count(lp.mission.pack, out.flight, log);
  sim::SimOptions so;
  so.sample_s = 1.0;
  const sim::MissionResult plan = sim::simulate(lp.mission, so);
  if (plan.refused) throw InputError(refusal_message(lp, plan));
  out.check = sim::check_flight(lp.mission, plan, out.flight, log);
  return out;
}

}  // namespace sortie::cli
