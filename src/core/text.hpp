#pragma once
/// Small text helpers shared by every layer's messages and readers.
#include <string>

namespace sortie {

/// `v` with `digits` decimals, as printf's %.*f ("-" for NaN, "inf" for infinity). A magnitude
/// of 1e9 or more, or a nonzero one below 1e-6 that the decimals would show as zero, is written
/// in scientific form with four significant digits ("1.000e+300", "2.500e-09"): a 300-digit
/// integer or a "0.00" hides what the number is.
std::string format_fixed(double v, int digits);
/// `s` without leading and trailing white space.
std::string trim(std::string s);
/// `s` in ASCII lower case.
std::string to_lower(std::string s);
/// `s` safe for a terminal: control characters (C0, DEL and the C1 range U+0080..U+009F) shown
/// as `\xNN` (C1 as `\u0080`..), so a name cannot move the cursor, clear the screen or forge a
/// line; with `keep_newlines` line breaks and tabs stay as they are (whole reports).
std::string printable(const std::string& s, bool keep_newlines = false);

}  // namespace sortie
