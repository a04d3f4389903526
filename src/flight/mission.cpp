#include "flight/mission.hpp"

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

const char* to_string(Phase::Speed s) {
  switch (s) {
    case Phase::Speed::given: return "given";
    case Phase::Speed::best_endurance: return "best_endurance";
    case Phase::Speed::best_range: return "best_range";
  }
  return "?";
}

}  // namespace sortie::flight
