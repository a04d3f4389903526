#pragma once
/// The results of `sortie discharge`: a short text summary, a JSON result and a trace CSV.
#include <nlohmann/json.hpp>
#include <string>

#include "battery/pack.hpp"
#include "sim/discharge.hpp"

namespace sortie::report {

/// JSON result schema version (README "JSON results").
inline constexpr const char* kDischargeSchema = "sortie.discharge/1";

std::string discharge_text(const battery::Pack& pack, const std::string& load_label,
                           const sim::DischargeResult& r);
nlohmann::json discharge_json(const battery::Pack& pack, const std::string& load_label,
                              const sim::DischargeResult& r);
/// `time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W`
std::string discharge_trace_csv(const sim::DischargeResult& r);

/// Hours, minutes and seconds: "1 h 02 min 05 s", "12 min 30.0 s", "42.3 s".
std::string duration_hms(double seconds);

}  // namespace sortie::report
