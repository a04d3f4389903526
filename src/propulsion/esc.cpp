#include "propulsion/esc.hpp"

namespace sortie::propulsion {

double esc_loss_W(const Esc& e, double v_bus_V, double i_motor_A) {
  // loss = P_idle + R_on·I_m² + k_sw·V_bus·I_m
  return e.p_idle_W + e.r_on_ohm * i_motor_A * i_motor_A + e.k_switch * v_bus_V * i_motor_A;
}

}  // namespace sortie::propulsion
