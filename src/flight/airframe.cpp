#include "flight/airframe.hpp"

namespace sortie::flight {

double all_up_mass_kg(const Airframe& a, double pack_mass_kg) {
  return std::visit([&](const auto& f) { return f.mass_empty_kg + f.payload_kg + pack_mass_kg; }, a);
}

std::optional<double> mtom_kg(const Airframe& a) {
  return std::visit([](const auto& f) { return f.mtom_kg; }, a);
}

const char* kind_name(const Airframe& a) {
  return std::holds_alternative<Multirotor>(a) ? "multirotor" : "fixed_wing";
}

const std::string& name(const Airframe& a) {
  return std::visit([](const auto& f) -> const std::string& { return f.name; }, a);
}

}  // namespace sortie::flight
