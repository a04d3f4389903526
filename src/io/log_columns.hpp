#pragma once
/// Reading measurement logs whose layout we do not control: delimiter sniffing (comma,
/// semicolon or tab, with decimal commas in the latter two), header names split into a name and
/// a unit ("Current (mA)", "voltage_V", "I[mA]"), `--columns` specifications, unit factors and
/// time stamps written as numbers or clock times. Used by the cell-log and bench-log readers.
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <vector>

namespace sortie::io {

/// Rows of a delimited text file, fields trimmed, with their 1-based file lines. Lines starting
/// with '#' are comments; blank lines are skipped; trailing empty fields are dropped.
/// The fields of many rows in one buffer: a million-row log takes a few tens of MB, where a
/// vector of vectors of strings takes over a hundred. Row k's fields are read as strings.
class FieldRows {
 public:
  class Row {
   public:
    Row(const FieldRows& t, std::size_t k) : t_(&t), k_(k) {}
    std::size_t size() const { return t_->first_[k_ + 1] - t_->first_[k_]; }
    bool empty() const { return size() == 0; }
    std::string operator[](std::size_t c) const;
    std::vector<std::string> to_vector() const;
    operator std::vector<std::string>() const { return to_vector(); }  // NOLINT: a row reads as its fields
    bool operator==(const std::vector<std::string>& other) const;

   private:
    const FieldRows* t_;
    std::size_t k_;
  };
  /// Appends a row; throws InputError (naming `file`) past 4 GiB of field text.
  void push_back(const std::vector<std::string>& fields, const std::string& file = "");
  void reserve(std::size_t rows) { first_.reserve(rows + 1); }
  std::size_t size() const { return first_.size() - 1; }
  bool empty() const { return size() == 0; }
  Row operator[](std::size_t k) const { return Row(*this, k); }
  Row front() const { return Row(*this, 0); }

 private:
  std::string chars_;
  std::vector<std::uint32_t> ends_;        ///< end of each field in chars_
  std::vector<std::uint32_t> first_{0};    ///< first field of each row, and one past the last
};

struct DelimitedFile {
  std::string file;
  char delimiter = ',';
  FieldRows rows;
  std::vector<std::size_t> lines;
  std::vector<std::string> comments;
};

DelimitedFile read_delimited(const std::filesystem::path& path);
DelimitedFile parse_delimited(const std::string& text, const std::string& name);

/// A header cell split into a normalised name (lower case, letters and digits only) and the
/// unit it declares, if any: "Current(A)" → {"current", "A"}, "voltage_mV" → {"voltage", "mV"},
/// "Test Time [s]" → {"testtime", "s"}.
struct HeaderName {
  std::string base;
  std::string unit;  ///< as written ("" when none)
};
HeaderName split_header(const std::string& text);
/// Lower case, letters and digits only.
std::string normalise_name(const std::string& text);

/// One column named on the command line: a header name or a 1-based column number, with an
/// optional unit after a colon ("current=I_bat:mA", "voltage=3").
struct ColumnRef {
  std::string name;                   ///< header text (empty when given by number)
  std::optional<std::size_t> number;  ///< 1-based
  std::string unit;                   ///< "" when not declared
};

/// The trimmed, non-empty comma-separated items of a `--columns` value.
std::vector<std::string> spec_items(const std::string& spec);
/// Throws UsageError `--columns: unknown quantity 'q'; did you mean '...'? (expected one of ...)`
/// unless `q` is in `known`.
void check_quantity(const std::string& q, const std::vector<std::string>& known);

/// Parse "time=Time(s),current=3:mA,..." for the quantities in `known` (keys such as "time").
/// Throws UsageError naming the bad item and, for an unknown quantity, the nearest known one.
std::map<std::string, ColumnRef> parse_column_spec(const std::string& spec,
                                                   const std::vector<std::string>& known);

/// `--columns` values for several logs, one map per file in `files`' order. Each value is
/// either `SPEC` (every log) or `FILE@SPEC` (that log only, in place of the general one), FILE
/// as given on the command line or its file name. A value whose text before the first '@' holds
/// no '=' names a file; one that is not among `files`, a file named twice, or two general values
/// are a UsageError.
std::vector<std::map<std::string, ColumnRef>> parse_column_specs_per_file(const std::vector<std::string>& values,
                                                                          const std::vector<std::string>& files,
                                                                          const std::vector<std::string>& known);

/// The kinds of quantity a log column can hold, each with its accepted units.
enum class Quantity { time, current, voltage, temperature, throttle, speed, force, torque, power };

/// Multiply a value in `unit` by `scale` and add `offset` to get SI (s, A, V, °C, fraction 0..1,
/// rpm, N, N·m, W). nullopt for a unit this quantity does not accept.
struct UnitFactor {
  double scale = 1.0;
  double offset = 0.0;
  std::string si;  ///< the unit converted to, for messages
};
std::optional<UnitFactor> unit_factor(Quantity q, const std::string& unit);
/// The accepted units of a quantity, for messages ("s, ms, min, h").
std::string accepted_units(Quantity q);

/// A number in a log cell: plain ("3.712", "+1e-3"), or with a decimal comma when
/// `decimal_comma`. nullopt for anything else (including an empty cell).
std::optional<double> parse_log_number(const std::string& text, bool decimal_comma);

/// A time in a log cell, in s: a number, a clock time "h:mm:ss(.fff)", "d:hh:mm:ss", or a date
/// and time "YYYY-MM-DD hh:mm:ss(.fff)" (also with 'T'), as seconds since 1970-01-01 (no time
/// zone is applied: only differences matter). nullopt for anything else.
std::optional<double> parse_log_time(const std::string& text, bool decimal_comma);

}  // namespace sortie::io
