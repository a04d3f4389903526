#pragma once
/// The results of `sortie fly`: text report, JSON result, trace CSV.
#include <nlohmann/json.hpp>
#include <string>

#include "sim/mission.hpp"

namespace sortie::report {

inline constexpr const char* kFlySchema = "sortie.fly/1";

/// One line a pilot reads at a glance: "GO: ..." or "NO-GO: ...".
std::string verdict_line(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s);
/// A phase's display name: "2 cruise" or its label.
std::string phase_name(const sim::Mission& m, int i);
/// Rule names in words.
std::string rule_words(const std::string& name);
std::string rule_value(const sim::RuleCheck& r, double v);

std::string fly_text(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s);
nlohmann::json fly_json(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s);
/// `time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,phase,duty,thrust_N`
std::string fly_trace_csv(const sim::MissionResult& r);

}  // namespace sortie::report
