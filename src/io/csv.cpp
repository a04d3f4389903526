#include "io/csv.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>
#include <functional>
#include <sstream>

#include "core/error.hpp"
#include "io/output.hpp"
#include "core/text.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

namespace {

const std::string kEmpty;

}  // namespace

std::string read_text_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot open the file");
  std::error_code ec;
  const bool regular = std::filesystem::is_regular_file(path, ec);
  const std::uintmax_t size = regular ? std::filesystem::file_size(path, ec) : 0;
  std::string text;
  if (regular && !ec) {
    text.resize(static_cast<std::size_t>(size));
    in.read(text.data(), static_cast<std::streamsize>(size));
    text.resize(static_cast<std::size_t>(std::max<std::streamsize>(0, in.gcount())));
  } else {  // a pipe or a device: read as it comes
    std::ostringstream ss;
    ss << in.rdbuf();
    text = ss.str();
  }
  return text;
}

bool LineCursor::next(std::string& line) {
  if (pos_ >= text_.size()) return false;
  const std::size_t end = text_.find('\n', pos_);
  const std::size_t stop = end == std::string::npos ? text_.size() : end;
  line.assign(text_, pos_, stop - pos_);
  pos_ = end == std::string::npos ? text_.size() : end + 1;
  return true;
}

std::size_t LineCursor::count(const std::string& text) {
  return static_cast<std::size_t>(std::count(text.begin(), text.end(), '\n')) + 1;
}

std::vector<std::string> split_fields(const std::string& line, char delimiter) {
  std::vector<std::string> out;
  out.reserve(static_cast<std::size_t>(std::count(line.begin(), line.end(), delimiter)) + 1);
  std::string cur;
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted) {
      if (c == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        cur += '"';
        ++i;
      } else if (c == '"') {
        quoted = false;
      } else {
        cur += c;
      }
    } else if (c == '"') {
      quoted = true;
    } else if (c == delimiter) {
      out.push_back(trim(cur));
      cur.clear();
    } else {
      cur += c;
    }
  }
  out.push_back(trim(cur));
  // Trailing empty fields (a trailing comma on every line is common in logger output).
  while (out.size() > 1 && out.back().empty()) out.pop_back();
  return out;
}

std::vector<std::string> split_csv_line(const std::string& line) { return split_fields(line, ','); }

void for_each_record(const std::string& text, char delimiter, const std::function<void(std::string)>& comment,
                     const std::function<void(std::size_t, std::vector<std::string>)>& row) {
  LineCursor in(text);
  std::string line;
  std::size_t n = 0;
  while (in.next(line)) {
    ++n;
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (n == 1 && line.size() >= 3 && line.compare(0, 3, "\xEF\xBB\xBF") == 0) line.erase(0, 3);
    const std::string t = trim(line);
    if (t.empty()) continue;
    if (t[0] == '#') {
      comment(trim(t.substr(1)));
      continue;
    }
    row(n, split_fields(line, delimiter));
  }
}

CsvFile parse_csv(const std::string& text, const std::string& name, bool has_header) {
  CsvFile f;
  f.file = name;
  const std::size_t n_lines = LineCursor::count(text);
  f.rows.reserve(n_lines);
  f.lines.reserve(n_lines);
  bool need_header = has_header;
  for_each_record(
      text, ',', [&](std::string c) { f.comments.push_back(std::move(c)); },
      [&](std::size_t n, std::vector<std::string> fields) {
        if (need_header) {
          f.header = std::move(fields);
          f.header_line = n;
          need_header = false;
          return;
        }
        f.rows.push_back(std::move(fields));
        f.lines.push_back(n);
      });
  if (has_header && f.header.empty()) throw InputError(name + ": no header line (the file is empty)");
  return f;
}

CsvFile read_csv(const std::filesystem::path& path, bool has_header) {
  note_input(path);
  return parse_csv(read_text_file(path), path.string(), has_header);
}

std::optional<std::size_t> CsvFile::find_column(const std::vector<std::string>& names) const {
  for (const auto& want : names)
    for (std::size_t i = 0; i < header.size(); ++i)
      if (to_lower(trim(header[i])) == to_lower(want)) return i;
  return std::nullopt;
}

std::size_t CsvFile::require_column(const std::vector<std::string>& names,
                                    const std::string& what) const {
  if (auto c = find_column(names)) return *c;
  std::string list;
  for (const auto& n : names) list += (list.empty() ? "'" : ", '") + n + "'";
  std::string have;
  for (const auto& h : header) have += (have.empty() ? "" : ",") + h;
  throw InputError(file + ": line " + std::to_string(header_line) + ": missing column for " + what +
                   " (got header \"" + have + "\", expected a column named " + list + ")");
}

std::string CsvFile::column_name(std::size_t col) const {
  if (col < header.size()) return "column '" + header[col] + "'";
  return "column " + std::to_string(col + 1);
}

const std::string& CsvFile::text(std::size_t row, std::size_t col) const {
  const auto& r = rows.at(row);
  return col < r.size() ? r[col] : kEmpty;
}

void CsvFile::fail(std::size_t row, const std::string& what, const std::string& got,
                   const std::string& expected) const {
  throw InputError(message(Source{file, {}}, "line " + std::to_string(lines.at(row)), what, got,
                           expected));
}

double CsvFile::number(std::size_t row, std::size_t col, const std::string& expected) const {
  const std::string& s = text(row, col);
  double v = 0.0;
  const char* b = s.data();
  const char* e = s.data() + s.size();
  if (b != e && *b == '+') ++b;
  auto res = std::from_chars(b, e, v);
  if (s.empty()) fail(row, column_name(col) + " is empty", "\"\"", expected);
  if (res.ec != std::errc() || res.ptr != e || !std::isfinite(v))
    fail(row, column_name(col) + " is not a number", "\"" + s + "\"", expected);
  return v;
}

}  // namespace sortie::io
