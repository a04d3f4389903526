#include "io/load_csv.hpp"

#include <cmath>

#include "core/error.hpp"

namespace sortie::io {

plan::LoadSeries read_load_csv(const CsvFile& csv, std::optional<bool> step_override) {
  plan::LoadSeries s;
  const std::size_t ct = csv.require_column({"time_s"}, "time (s)");
  const auto ci = csv.find_column({"current_A"});
  const auto cp = csv.find_column({"power_W"});
  if (ci && cp)
    throw InputError(csv.file + ": line " + std::to_string(csv.header_line) +
                     ": both current_A and power_W columns (expected one of them)");
  if (!ci && !cp) csv.require_column({"current_A", "power_W"}, "the load (A or W)");
  const std::size_t cv = ci ? *ci : *cp;
  s.quantity = ci ? plan::LoadSeries::Quantity::current : plan::LoadSeries::Quantity::power;
  for (const auto& c : csv.comments) {
    if (c.rfind("interpolation:", 0) != 0) continue;
    std::string mode = c.substr(14);
    mode.erase(0, mode.find_first_not_of(' '));
    if (mode == "step") s.step = true;
    else if (mode == "linear") s.step = false;
    else
      throw InputError(csv.file + ": '# interpolation:' is \"" + mode + "\" (expected step or linear)");
  }
  if (step_override) s.step = *step_override;
  const std::string unit = ci ? "a number in A" : "a number in W";
  for (std::size_t r = 0; r < csv.rows.size(); ++r) {
    const double t = csv.number(r, ct, "a time in s");
    const double v = csv.number(r, cv, unit);
    if (!s.time_s.empty() && !(t > s.time_s.back()))
      csv.fail(r, "time not increasing", format_number(t) + " s",
               "a time after " + format_number(s.time_s.back()) + " s");
    if (std::fabs(v) > 1e6) csv.fail(r, "load out of range", format_number(v), "|value| <= 1e6");
    s.time_s.push_back(t);
    s.value.push_back(v);
  }
  if (s.time_s.size() < 2)
    throw InputError(csv.file + ": too few rows (got " + std::to_string(s.time_s.size()) +
                     ", expected at least 2 times)");
  return s;
}

plan::LoadSeries load_load_csv(const std::filesystem::path& path, std::optional<bool> step_override) {
  return read_load_csv(read_csv(path), step_override);
}

}  // namespace sortie::io
