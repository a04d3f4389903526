#pragma once
/// `sortie logbook`: a pack's history (its flights with their check figures and SoH estimates)
/// and its SoH trend, as text, JSON and (trend) an HTML page.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "logbook/logbook.hpp"
#include "logbook/trend.hpp"

namespace sortie::report {

/// What the cycle count is, said wherever one is shown.
inline constexpr const char* kCycleNote =
    "cycle = the pack's flight count in this logbook at the estimate (charges without a logged flight are not counted)";

nlohmann::json pack_json(const logbook::PackRecord& p);
std::string history_text(const std::string& db, const logbook::PackRecord& p, const std::vector<logbook::FlightRecord>& f,
                         const std::vector<logbook::EstimateRecord>& e);
nlohmann::json history_json(const std::string& db, const logbook::PackRecord& p, const std::vector<logbook::FlightRecord>& f,
                            const std::vector<logbook::EstimateRecord>& e);

std::string trend_text(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t);
nlohmann::json trend_json(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t);
std::string trend_html(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t);

}  // namespace sortie::report
