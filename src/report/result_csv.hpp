#pragma once
/// Results as CSV tables for `--format csv`: one header line of key names (the JSON result's
/// keys, units in the names), then one line per row. Numbers in full precision (%.10g), an
/// empty field for a value that does not exist, text fields quoted as RFC 4180 says
/// (Shafranovich 2005, section 2, rules 5–7).
#include <string>
#include <vector>

#include "report/drive_report.hpp"
#include "sim/compare.hpp"
#include "sim/mission.hpp"

namespace sortie::report {

/// `sortie fly --format csv`: one line per phase, as the JSON "phases".
std::string fly_phases_csv(const sim::Mission& m, const sim::MissionResult& r);
/// `sortie compare --format csv`: one line per pack in rank order, as the JSON "rows".
std::string compare_csv(const std::vector<sim::CompareRow>& rows);
/// `sortie drive --format csv`: one line per operating point, as the JSON "points"; with a
/// bench map and no drive model, one line per bench row.
std::string drive_csv(const DriveResult& r);

/// One CSV field: quoted when it holds a comma, a quote or a line break.
std::string csv_field(const std::string& s);
/// A number for CSV: %.10g, empty when not finite.
std::string csv_number(double v);

}  // namespace sortie::report
