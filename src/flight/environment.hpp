#pragma once
/// Where and in what weather a mission flies: the field's atmosphere and a steady wind.
#include "flight/atmosphere.hpp"
#include "flight/wind.hpp"

namespace sortie::flight {

struct Environment {
  Atmosphere atmosphere;  ///< field elevation and ISA offset (from the OAT or given)
  Wind wind;              ///< calm unless given
};

}  // namespace sortie::flight
