#pragma once
/// Aligned terminal tables: a header row (each column names its unit), right-aligned numbers.
#include <string>
#include <vector>

namespace sortie::report {

/// `v` with `digits` decimals ("-" for NaN).
std::string fixed(double v, int digits);

class TextTable {
 public:
  /// Column titles, e.g. {"phase", "start s", "energy Wh"}; the first column is left-aligned.
  explicit TextTable(std::vector<std::string> header) : header_(std::move(header)) {}
  void add_row(std::vector<std::string> cells) { rows_.push_back(std::move(cells)); }
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
  void add(std::string key, std::string value) { items_.emplace_back(std::move(key), std::move(value)); }
  std::string render(const std::string& indent = "  ") const;

 private:
  std::vector<std::pair<std::string, std::string>> items_;
};

/// Display width of UTF-8 text (code points; all our symbols are one column wide).
std::size_t display_width(const std::string& s);

}  // namespace sortie::report
