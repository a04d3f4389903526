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

}  // namespace sortie::flight
