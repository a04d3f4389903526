// The invented pack-ageing series of examples/pack-ageing/: six flights of the demo quad mission
// on one pack whose capacity factor falls 1.00 → 0.80 and R0 factor rises 1.0 → 1.4 over the
// series, flown by sortie's own simulator with 20 mV and 50 mA noise (support/synthetic_flight.hpp).
// SORTIE_WRITE_PACK_AGEING=1 writes the logs (scripts/make-demo-pack-ageing.sh); otherwise each
// bundled log is checked against the truth it was made with: the health estimate of the log
// alone recovers its capacity factor within 2 % and its R0 factor within 6 %, and a file that no
// longer matches the rebuilt log is reported (the simulator changed: rerun the script).
#include <doctest/doctest.h>

#include <cstdlib>
#include <fstream>

#include "estimate/health.hpp"
#include "io/flight_log_csv.hpp"
#include "io/profile_json.hpp"
#include "support/cli.hpp"
#include "support/synthetic_flight.hpp"

using namespace sortie;

namespace {

struct AgeingFlight {
  const char* file;
  const char* date;
  double capacity, resistance, soc0;
  unsigned seed;
};

// Dates spread over eight months; the start SoC varies as a pack is not always topped up.
constexpr AgeingFlight kSeries[] = {
    {"flight-1.csv", "2026-01-10", 1.00, 1.00, 1.00, 7001},
    {"flight-2.csv", "2026-02-21", 0.96, 1.08, 0.98, 7002},
    {"flight-3.csv", "2026-04-04", 0.92, 1.16, 1.00, 7003},
    {"flight-4.csv", "2026-05-23", 0.88, 1.24, 0.97, 7004},
    {"flight-5.csv", "2026-07-11", 0.84, 1.32, 0.99, 7005},
    {"flight-6.csv", "2026-09-05", 0.80, 1.40, 1.00, 7006},
};

std::string ageing_csv(const sim::Mission& m, const AgeingFlight& a) {
  test::SyntheticFlight f;
  f.soh_capacity = a.capacity;
  f.soh_resistance = a.resistance;
  f.soc0 = a.soc0;
  f.seed = a.seed;
  char head[512];
  std::snprintf(head, sizeof head,
                "# synthetic flight log, invented - not a measurement. Flown %s in this invented series.\n"
                "# made by sortie's own simulator: profiles/demo-quad-water-tank.json (invented) on its pack aged to\n"
                "# soh_capacity %.2f, soh_resistance %.2f, from SoC %.2f; 1 s rows, 20 mV voltage and 50 mA current\n"
                "# noise (seed %u), current positive on discharge. scripts/make-demo-pack-ageing.sh rebuilds it.\n",
                a.date, a.capacity, a.resistance, a.soc0, a.seed);
  return head + test::synthetic_flight_rows(m, f);
}

battery::Pack field_pack(const sim::Mission& m) {
  battery::Pack p = m.pack;
  if (!p.air_C)
    if (const auto air = m.environment.atmosphere.at(0.0)) p.air_C = air->temperature_K - 273.15;
  return p;
}

}  // namespace

TEST_SUITE("estimate") {

TEST_CASE("pack ageing example: each invented log gives back the capacity and resistance it was made with") {
  const io::LoadedProfile lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  const bool write = [] {
    const char* w = std::getenv("SORTIE_WRITE_PACK_AGEING");
    return w && std::string(w) == "1";
  }();
  const battery::Pack pack = field_pack(lp.mission);
  for (const auto& a : kSeries) {
    const std::string path = test::source_path(std::string("examples/pack-ageing/") + a.file);
    const std::string csv = ageing_csv(lp.mission, a);
    if (write) {
      std::ofstream(path, std::ios::binary) << csv;
      MESSAGE("wrote " << path);
    }
    const std::string bundled = test::read_file(path);
    WARN_MESSAGE(bundled == csv, path << " differs from the rebuilt log: rerun scripts/make-demo-pack-ageing.sh");
    const io::FlightLog fl = io::read_flight_log_file(path, {});
    const estimate::HealthEstimate e = estimate::estimate_health(
        pack, {{path, sim::MeasuredFlight{fl.time_s, fl.voltage_V, fl.current_A, fl.lines}, std::nullopt, ""}});
    INFO(a.file << ": c " << e.capacity << " ± " << e.capacity_sd << " (truth " << a.capacity << "), r " << e.resistance
                << " ± " << e.resistance_sd << " (truth " << a.resistance << "), " << e.why_refused);
    REQUIRE(!e.refused);
    CHECK(std::abs(e.capacity / a.capacity - 1.0) < 0.02);
    CHECK(std::abs(e.resistance / a.resistance - 1.0) < 0.06);
    CHECK(std::abs(e.flights[0].soc0 - a.soc0) < 0.02);
  }
}

}  // TEST_SUITE
