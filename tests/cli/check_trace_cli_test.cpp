// `sortie check` end to end: the planned mission's own trace, read back as a flight log, must
// agree with the plan; a constant voltage offset planted in it must show as that RMSE.
#include <doctest/doctest.h>

#include <cmath>
#include <sstream>

#include <nlohmann/json.hpp>

#include "support/cli.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const char* kCols = "time=time_s:s,voltage=v_terminal_V:V,current=current_A:A";

/// The demo mission's trace, with `dv` added to every terminal voltage.
std::string trace_log(const std::string& tag, double dv) {
  const std::string trace = work_path(tag + "-trace.csv");
  const auto r = run_sortie({"fly", source_path("profiles/demo-quad-water-tank.json"), "--trace", trace, "-q"});
  REQUIRE(r.exit_code == 0);
  std::istringstream in(read_file(trace));
  std::ostringstream out;
  std::string line;
  std::getline(in, line);
  out << line << "\n";
  while (std::getline(in, line)) {
    // v_terminal_V is the third column.
    const auto a = line.find(',');
    const auto b = line.find(',', a + 1);
    const auto c = line.find(',', b + 1);
    const double v = std::stod(line.substr(b + 1, c - b - 1)) + dv;
    std::ostringstream vs;
    vs.precision(9);
    vs << v;
    out << line.substr(0, b + 1) << vs.str() << line.substr(c) << "\n";
  }
  return write_work_file(tag + "-log.csv", out.str());
}

json check(const std::string& log) {
  const auto r = run_sortie({"check", log, "--profile", source_path("profiles/demo-quad-water-tank.json"),
                             "--columns", kCols, "--json", "-"});
  REQUIRE(r.exit_code == 0);
  return json::parse(r.out);
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("check: the plan's own trace read as a log agrees with the plan") {
  const json j = check(trace_log("check-same", 0.0));
  // The trace is the plan sampled at 1 s: the voltages agree to the trace's 1e-6 V rounding.
  CHECK(j["v_rmse_V"].get<double>() < 1e-5);
  CHECK(j["flight_time_s"]["measured"].get<double>() ==
        doctest::Approx(j["flight_time_s"]["planned"].get<double>()).epsilon(1e-3));
  // Rectangle-rule sums over 1 s samples of a smooth current: within 1 % of the integrals.
  CHECK(j["energy_Wh"]["measured"].get<double>() ==
        doctest::Approx(j["energy_Wh"]["planned"].get<double>()).epsilon(0.01));
  CHECK(j["charge_Ah"]["measured"].get<double>() ==
        doctest::Approx(j["charge_Ah"]["planned"].get<double>()).epsilon(0.01));
  CHECK(j["landing_soc"]["from_voltage"].get<double>() ==
        doctest::Approx(j["landing_soc"]["planned"].get<double>()).epsilon(0.01));
}

TEST_CASE("check: a constant voltage offset shows as an RMSE equal to the offset") {
  // RMS of a constant c is |c| (definition of the root mean square).
  const json j = check(trace_log("check-offset", -0.1));
  CHECK(j["v_rmse_V"].get<double>() == doctest::Approx(0.1).epsilon(1e-3));
}

TEST_CASE("check: a log without a voltage column is a one-line error") {
  const std::string log = write_work_file("check-novolt.csv", "time_s,current_A\n0,1\n1,1\n");
  const auto r = run_sortie({"check", log, "--profile", source_path("profiles/demo-quad-water-tank.json")});
  CHECK(r.exit_code == 1);
  CHECK(r.err.find("check-novolt.csv") != std::string::npos);
}

}  // TEST_SUITE
