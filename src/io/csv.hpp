#pragma once
/// Reading CSV files: rows of text cells with their line numbers, and checked numeric access.
/// Lines starting with '#' are comments; blank lines are skipped; trailing empty fields and
/// CRLF line ends are accepted; a field may be double-quoted.
#include <cstddef>
#include <filesystem>
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace sortie::io {

struct CsvFile {
  std::string file;                             ///< as shown in messages
  std::vector<std::string> header;              ///< empty when read without a header
  std::size_t header_line = 0;                  ///< 1-based line of the header
  std::vector<std::vector<std::string>> rows;   ///< data rows, fields trimmed
  std::vector<std::size_t> lines;               ///< 1-based file line of each row
  std::vector<std::string> comments;            ///< text after '#' of each comment line

  /// Index of the first header name equal (case-insensitive, spaces trimmed) to any of `names`.
  std::optional<std::size_t> find_column(const std::vector<std::string>& names) const;
  /// As find_column; a missing column is an InputError listing what was looked for.
  std::size_t require_column(const std::vector<std::string>& names, const std::string& what) const;
  /// The cell as a finite number; text, an empty cell or a missing cell is an InputError naming
  /// the line, the column and the value.
  double number(std::size_t row, std::size_t col, const std::string& expected) const;
  /// The cell's text ("" when the row is short).
  const std::string& text(std::size_t row, std::size_t col) const;
  /// `FILE: line N: what (got X, expected Y)`.
  [[noreturn]] void fail(std::size_t row, const std::string& what, const std::string& got = {},
                         const std::string& expected = {}) const;
  std::string column_name(std::size_t col) const;
};

/// Read a CSV file. With `has_header`, the first non-comment line is the header.
CsvFile read_csv(const std::filesystem::path& path, bool has_header = true);
/// Parse CSV text (for tests and fuzzing); `name` is used in messages.
CsvFile parse_csv(const std::string& text, const std::string& name, bool has_header = true);

/// Split one CSV line into trimmed fields.
std::vector<std::string> split_csv_line(const std::string& line);
/// Split one line at `delimiter` into trimmed fields; double quotes group (`""` is a quote);
/// trailing empty fields are dropped.
std::vector<std::string> split_fields(const std::string& line, char delimiter);

/// The one record walker of every delimited reader (CsvFile, DelimitedFile): for each line of
/// `text`, a CR line end and a leading UTF-8 byte-order mark taken off, blank lines skipped,
/// `comment` gets the text after '#' of a comment line and `row` the 1-based line number and
/// fields of any other line.
void for_each_record(const std::string& text, char delimiter, const std::function<void(std::string)>& comment,
                     const std::function<void(std::size_t, std::vector<std::string>)>& row);

/// The whole file as text, read once into its final buffer (a large log is not copied again).
/// Throws InputError when it cannot be opened. Does not call note_input.
std::string read_text_file(const std::filesystem::path& path);

/// Walks the lines of `text` as std::getline would (split at '\n', a last line without one
/// counts), without copying the text into a stream.
class LineCursor {
 public:
  explicit LineCursor(const std::string& text) : text_(text) {}
  bool next(std::string& line);
  /// Lines in the text (for reserving row storage).
  static std::size_t count(const std::string& text);

 private:
  const std::string& text_;
  std::size_t pos_ = 0;
};

}  // namespace sortie::io
