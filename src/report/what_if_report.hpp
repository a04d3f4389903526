#pragma once
/// The overrides in effect (text, JSON, HTML) and the `fly --sweep` results: a table, JSON,
/// CSV and an HTML page with spare time and landing charge against the swept value.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "sim/mission.hpp"
#include "sim/sweep.hpp"
#include "sim/uncertainty.hpp"
#include "sim/what_if.hpp"

namespace sortie::report {

inline constexpr const char* kSweepSchema = "sortie.sweep/1";

/// "Overrides in effect:" lines (empty text when none).
std::string overrides_text(const std::vector<sim::Override>& o);
/// [{"name", "value", "replaces", "note"}, ...]
nlohmann::json overrides_json(const std::vector<sim::Override>& o);
/// A boxed list for an HTML page (empty when none).
std::string overrides_html(const std::vector<sim::Override>& o);

std::string sweep_text(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o);
nlohmann::json sweep_json(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o);
std::string sweep_csv(const sim::SweepResult& s);
std::string sweep_html(const sim::Mission& m, const sim::SweepResult& s, const std::vector<sim::Override>& o);

inline constexpr const char* kSamplesSchema = "sortie.samples/1";

/// `fly --samples`: P(every rule met) with its standard error and Wilson interval, the 5th,
/// 50th and 95th percentiles, the rule failing most; worded as a probability from the stated
/// spreads, not a guarantee.
std::string samples_text(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o);
nlohmann::json samples_json(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o);
/// One line per sample: what was drawn and what came of it.
std::string samples_csv(const sim::SampleRun& s);
/// Histogram and cumulative plot of the spare time, and the summary.
std::string samples_html(const sim::Mission& m, const sim::SampleRun& s, const std::vector<sim::Override>& o);

}  // namespace sortie::report
