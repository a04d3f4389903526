#pragma once
/// A drive: N identical rotors, each a propeller on a motor fed by its own ESC from the common
/// bus (docs/formats.md "Drive"). Plain data, SI inside.
#include <string>

#include "propulsion/esc.hpp"
#include "propulsion/motor.hpp"
#include "propulsion/propeller.hpp"

namespace sortie::propulsion {

struct Drive {
  std::string name;
  int rotors = 1;  ///< identical rotors sharing the bus
  Prop prop;
  Motor motor;
  Esc esc;

  /// Mass of the rotors' props, motors and ESCs, kg (informational: mass_empty_kg already
  /// holds it in a mission).
  double mass_kg() const { return rotors * (prop.mass_kg + motor.mass_kg + esc.mass_kg); }
};

}  // namespace sortie::propulsion
