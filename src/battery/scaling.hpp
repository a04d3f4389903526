#pragma once
/// Resizing a cell within its chemistry, for comparing packs of other capacities built from the
/// same kind of cell: capacity, mass and current limit scale with size k = Q'/Q, resistances
/// scale with 1/k (a bigger cell is more electrode area in parallel), time constants and the
/// OCV curve stay; a thermal model keeps its specific heat and its hA grows as k^(2/3) (the
/// surface); covered currents scale with k. A first-order rule of thumb (common practice), not a cell maker's data.
#include "battery/cell.hpp"

namespace sortie::battery {

Cell scale_cell(const Cell& c, double capacity_Ah);

}  // namespace sortie::battery
