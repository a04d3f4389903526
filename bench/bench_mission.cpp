// Mission benchmarks: one whole-mission simulation and one spare-time solve per demo profile.
#include <map>
#include <string>

#include "bench.hpp"
#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace {

using namespace sortie;

const sim::Mission& demo(const char* name) {
  static std::map<std::string, sim::Mission> cache;
  auto it = cache.find(name);
  if (it == cache.end())
    it = cache.emplace(name, io::load_profile_file(std::string(SORTIE_SOURCE_DIR "/profiles/") + name).mission).first;
  return it->second;
}

struct Demo {
  const char* file;
  const char* tag;
};
constexpr Demo kDemos[] = {{"demo-quad-water-tank.json", "quad_water_tank"},
                           {"demo-fixed-wing-field-survey.json", "fixed_wing_survey"},
                           {"demo-hexa-highland-sensor.json", "hexa_highland"}};

const bool reg = [] {
  for (const auto& d : kDemos) {
    const char* file = d.file;
    bench::add_case(std::string("fly_") + d.tag, [file] { bench::keep(sim::simulate(demo(file)).flight_time_s); });
    bench::add_case(std::string("spare_") + d.tag, [file] {
      const auto& m = demo(file);
      bench::keep(sim::solve_spare(m, sim::simulate(m)).spare_s);
    }, 20);
    bench::add_case(std::string("turn_home_") + d.tag, [file] { bench::keep(sim::solve_turn_home(demo(file)).simulations); }, 5);
  }
  return true;
}();

}  // namespace
