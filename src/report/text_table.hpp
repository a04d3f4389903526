#pragma once
/// Aligned terminal tables: a header row (each column names its unit), right-aligned numbers.
#include <string>
#include <vector>

namespace sortie::report {

/// `v` with `digits` decimals ("-" for NaN); beyond 1e9, or nonzero below 1e-6 where the
/// decimals would show only zeros, in scientific form ("1.000e+300") instead.
std::string fixed(double v, int digits);

class TextTable {
 public:
  /// Column titles, e.g. {"phase", "start s", "energy Wh"}; the first column is left-aligned.
  explicit TextTable(std::vector<std::string> header) : header_(std::move(header)) {}
  /// Control characters in a cell (a name from a file) are shown escaped (core/text.hpp printable).
  void add_row(std::vector<std::string> cells);
  /// Wrap the last column's text at spaces to lines of at most `width` columns (long notes).
  void wrap_last(std::size_t width) { wrap_ = width; }
  std::string render(const std::string& indent = "  ") const;

 private:
  std::vector<std::string> header_;
  std::vector<std::vector<std::string>> rows_;
  std::size_t wrap_ = 0;
};

/// Lines of "label  value" with the labels padded to one width.
class KeyValues {
 public:
  /// Control characters in the value are shown escaped, as in TextTable::add_row.
  void add(std::string key, std::string value);
  std::string render(const std::string& indent = "  ") const;

 private:
  std::vector<std::pair<std::string, std::string>> items_;
};

/// Display width of UTF-8 text (code points; all our symbols are one column wide).
std::size_t display_width(const std::string& s);

}  // namespace sortie::report
