#include "battery/cell_log.hpp"

#include <algorithm>

namespace sortie::battery {

bool CellLog::starts_section(std::size_t k) const {
  return std::binary_search(section_starts.begin(), section_starts.end(), k);
}

}  // namespace sortie::battery
