// Planning benchmarks: a 1000-sample run and a 21 × 21 sweep of the demo quad mission, each
// point a whole flight with its spare solve, on every core (the figure is the wall time).
#include "bench.hpp"
#include "io/profile_json.hpp"
#include "sim/sweep.hpp"
#include "sim/uncertainty.hpp"

namespace sortie::bench {

namespace {

const sim::Mission& quad() {
  static const sim::Mission m =
      io::load_profile_file(std::string(SORTIE_SOURCE_DIR "/profiles/demo-quad-water-tank.json")).mission;
  return m;
}

const bool samples_1000 = add_case(
    "samples_1000_quad_default_spreads",
    [] {
      const auto r = sim::run_samples(quad(), sim::Spreads{}, 1000, 1, {}, 0);
      keep(r.p_go);
    },
    3);

const bool sweep_21x21 = add_case(
    "sweep_21x21_quad_payload_wind",
    [] {
      const auto r = sim::run_sweep(quad(), {sim::parse_sweep("payload-kg=0:1:0.05"), sim::parse_sweep("wind-mps=0:6:0.3")},
                                    {}, 0);
      keep(r.points.back().flight_time_s);
    },
    3);

}  // namespace

}  // namespace sortie::bench
