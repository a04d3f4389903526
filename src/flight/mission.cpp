#include "flight/mission.hpp"

#include <cmath>
#include <numbers>

#include "flight/fixed_wing.hpp"

namespace sortie::flight {

const char* to_string(Phase::Kind k) {
  switch (k) {
    case Phase::Kind::climb: return "climb";
    case Phase::Kind::cruise: return "cruise";
    case Phase::Kind::hover: return "hover";
    case Phase::Kind::loiter: return "loiter";
    case Phase::Kind::descend: return "descend";
  }
  return "?";
}

double turn_load_factor(const Phase& p, double airspeed_mps) {
  double bank = p.bank_deg * std::numbers::pi / 180.0;
  if (p.turn_radius_m) bank = bank_for_radius_rad(airspeed_mps, *p.turn_radius_m);
  return 1.0 / std::cos(bank);
}

const char* to_string(Phase::Speed s) {
  switch (s) {
    case Phase::Speed::given: return "given";
    case Phase::Speed::best_endurance: return "best_endurance";
    case Phase::Speed::best_range: return "best_range";
  }
  return "?";
}

}  // namespace sortie::flight
