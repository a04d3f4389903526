#pragma once
/// Small text helpers shared by every layer's messages and readers.
#include <string>

namespace sortie {

/// `v` with `digits` decimals, as printf's %.*f ("-" for NaN, "inf" for infinity).
std::string format_fixed(double v, int digits);
/// `s` without leading and trailing white space.
std::string trim(std::string s);
/// `s` in ASCII lower case.
std::string to_lower(std::string s);

}  // namespace sortie
