#pragma once
/// A mission as described: the aircraft, its pack, the air and the phases and reserve, as read
/// from a profile. Plain data; flying it is sim::simulate.
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "flight/airframe.hpp"
#include "flight/environment.hpp"
#include "flight/mission.hpp"
#include "propulsion/drive.hpp"

namespace sortie::plan {

/// Everything one flight needs, loaded and validated.
struct Mission {
  std::string name;
  flight::Airframe airframe;
  propulsion::Drive drive;
  battery::Pack pack;
  double avionics_W = 0.0;  ///< avionics and payload electrical load, W
  flight::Environment environment;
  std::vector<flight::Phase> phases;
  flight::Reserve reserve;
};

}  // namespace sortie::plan
