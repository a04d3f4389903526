#pragma once
/// The results of `sortie fly`: text report, JSON result, trace CSV.
#include <nlohmann/json.hpp>
#include <string>

#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace sortie::report {

inline constexpr const char* kFlySchema = "sortie.fly/1";

/// One line a pilot reads at a glance: "GO: ..." or "NO-GO: ...".
std::string verdict_line(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s);
/// A phase's display name: "2 cruise" or its label.
std::string phase_name(const sim::Mission& m, int i);
/// Rule names in words.
std::string rule_words(const std::string& name);
std::string rule_value(const sim::RuleCheck& r, double v);
/// Every failing rule with its value and limit ("cell current 10.40 A, limit 10.00 A in phase
/// 4 hover at 120 s; ..."), and the early end of a flight that ended early.
std::string failure_reasons(const sim::Mission& m, const sim::MissionResult& r);
/// The spare figure in words: "+379 s", "more than 1000000 s (the search stops there)", or how
/// the mission must shrink.
std::string spare_words(const sim::Mission& m, const sim::SpareResult& s);

/// `home`: the turn-home point, shown when given.
std::string fly_text(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s,
                     const sim::TurnHome* home = nullptr);
nlohmann::json fly_json(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s,
                        const sim::TurnHome* home = nullptr);
/// `time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,phase,duty,thrust_N` (then
/// `cell_temperature_C` with a thermal model), then `height_m,past_turn_home`: 1 after the
/// turn-home point (all 0 without one).
std::string fly_trace_csv(const sim::MissionResult& r, const sim::TurnHome* home = nullptr);

}  // namespace sortie::report
