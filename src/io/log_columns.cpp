#include "io/log_columns.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>
#include <sstream>

#include "core/error.hpp"
#include "io/output.hpp"
#include "core/suggest.hpp"
#include "core/text.hpp"
#include "io/csv.hpp"

namespace sortie::io {

namespace {

/// The delimiter of the file: of ',', ';' and tab, the one that splits most of the first 50
/// non-comment lines into the same number (above one) of fields; comma on a tie. A decimal comma
/// in a semicolon file gives varying comma counts, so it does not win.
char sniff_delimiter(const std::string& text) {
  LineCursor in(text);
  std::string line;
  std::vector<std::string> lines;
  while (lines.size() < 50 && in.next(line)) {
    const std::string t = trim(line);
    if (!t.empty() && t[0] != '#') lines.push_back(t);
  }
  char best = ',';
  std::size_t best_score = 0;
  for (const char d : {',', ';', '\t'}) {
    std::map<std::size_t, std::size_t> counts;  // fields per line → lines
    for (const auto& l : lines) ++counts[static_cast<std::size_t>(std::count(l.begin(), l.end(), d)) + 1];
    std::size_t score = 0;
    for (const auto& [fields, n] : counts)
      if (fields > 1) score = std::max(score, n);
    if (score > best_score) best = d, best_score = score;
  }
  return best;
}

const std::vector<std::string> kUnitWords = {
    "s", "ms", "min", "h", "a", "ma", "v", "mv", "c", "degc", "°c", "k", "pct", "percent", "us",
    "rpm", "n", "g", "gf", "kg", "kgf", "nm", "ncm", "mnm", "w", "rad/s", "µs", "lbf", "ozf", "rps",
    "nmm", "kgfcm", "hz", "1/min"};

bool is_unit_word(const std::string& u) {
  const std::string l = to_lower(u);
  return std::find(kUnitWords.begin(), kUnitWords.end(), l) != kUnitWords.end();
}

}  // namespace

std::string FieldRows::Row::operator[](std::size_t c) const {
  const std::size_t i = t_->first_[k_] + c;
  const std::size_t b = i == 0 ? 0 : t_->ends_[i - 1];
  return t_->chars_.substr(b, t_->ends_[i] - b);
}

std::vector<std::string> FieldRows::Row::to_vector() const {
  std::vector<std::string> out;
  out.reserve(size());
  for (std::size_t c = 0; c < size(); ++c) out.push_back((*this)[c]);
  return out;
}

bool FieldRows::Row::operator==(const std::vector<std::string>& other) const {
  if (other.size() != size()) return false;
  for (std::size_t c = 0; c < size(); ++c) {
    const std::size_t i = t_->first_[k_] + c;
    const std::size_t b = i == 0 ? 0 : t_->ends_[i - 1];
    if (t_->chars_.compare(b, t_->ends_[i] - b, other[c]) != 0) return false;
  }
  return true;
}

void FieldRows::push_back(const std::vector<std::string>& fields, const std::string& file) {
  std::size_t add = 0;
  for (const auto& x : fields) add += x.size();
  if (chars_.size() + add > UINT32_MAX || ends_.size() + fields.size() > UINT32_MAX)
    throw InputError(file + ": the file holds more than 4 GiB of field text (expected a smaller log; split it)");
  for (const auto& x : fields) {
    chars_ += x;
    ends_.push_back(static_cast<std::uint32_t>(chars_.size()));
  }
  first_.push_back(static_cast<std::uint32_t>(ends_.size()));
}

DelimitedFile parse_delimited(const std::string& text, const std::string& name) {
  DelimitedFile f;
  f.file = name;
  f.delimiter = sniff_delimiter(text);
  const std::size_t n_lines = LineCursor::count(text);
  f.rows.reserve(n_lines);
  f.lines.reserve(n_lines);
  for_each_record(
      text, f.delimiter, [&](std::string c) { f.comments.push_back(std::move(c)); },
      [&](std::size_t n, std::vector<std::string> fields) {
        f.rows.push_back(fields, name);
        f.lines.push_back(n);
      });
  return f;
}

DelimitedFile read_delimited(const std::filesystem::path& path) {
  note_input(path);
  return parse_delimited(read_text_file(path), path.string());
}

std::string normalise_name(const std::string& text) {
  std::string out;
  for (unsigned char c : text)
    if (std::isalnum(c)) out += static_cast<char>(std::tolower(c));
  return out;
}

HeaderName split_header(const std::string& raw) {
  std::string text = trim(raw);
  HeaderName h;
  // A unit in brackets: "Current(A)", "Voltage [mV]", "Temp {°C}".
  for (const auto& [open, close] : {std::pair{'(', ')'}, std::pair{'[', ']'}, std::pair{'{', '}'}}) {
    const auto a = text.rfind(open);
    const auto b = text.rfind(close);
    if (a != std::string::npos && b != std::string::npos && b > a) {
      h.unit = trim(text.substr(a + 1, b - a - 1));
      text = text.substr(0, a) + text.substr(b + 1);
      h.base = normalise_name(text);
      return h;
    }
  }
  // A unit after the last '_', ' ', '-' or '/': "time_s", "I mA", "voltage-V".
  const auto p = text.find_last_of("_ -/");
  if (p != std::string::npos && p + 1 < text.size()) {
    const std::string u = trim(text.substr(p + 1));
    const std::string before = text.substr(0, p);
    if (is_unit_word(u) && !normalise_name(before).empty()) {
      h.unit = u;
      h.base = normalise_name(before);
      return h;
    }
  }
  h.base = normalise_name(text);
  return h;
}

std::vector<std::string> spec_items(const std::string& spec) {
  std::vector<std::string> items;
  std::size_t start = 0;
  while (start <= spec.size()) {
    std::size_t end = spec.find(',', start);
    if (end == std::string::npos) end = spec.size();
    std::string item = trim(spec.substr(start, end - start));
    if (!item.empty()) items.push_back(std::move(item));
    if (end == spec.size()) break;
    start = end + 1;
  }
  return items;
}

void check_quantity(const std::string& q, const std::vector<std::string>& known) {
  if (std::find(known.begin(), known.end(), q) != known.end()) return;
  std::string list;
  for (const auto& k : known) list += (list.empty() ? "" : ", ") + k;
  const std::string near = nearest(q, known);
  throw UsageError("--columns: unknown quantity '" + q + "'" + (near.empty() ? "" : "; did you mean '" + near + "'?") +
                   " (expected one of " + list + ")");
}

std::map<std::string, ColumnRef> parse_column_spec(const std::string& spec,
                                                   const std::vector<std::string>& known) {
  std::map<std::string, ColumnRef> out;
  for (const std::string& item : spec_items(spec)) {
    const auto eq = item.find('=');
    if (eq == std::string::npos || eq == 0 || eq + 1 == item.size())
      throw UsageError("--columns: '" + item + "' is not QUANTITY=COLUMN (expected e.g. current=I_mA or voltage=3)");
    const std::string q = to_lower(trim(item.substr(0, eq)));
    check_quantity(q, known);
    if (out.count(q)) throw UsageError("--columns: '" + q + "' given twice");
    std::string col = trim(item.substr(eq + 1));
    ColumnRef ref;
    if (const auto colon = col.rfind(':'); colon != std::string::npos && colon > 0) {
      ref.unit = trim(col.substr(colon + 1));
      col = trim(col.substr(0, colon));
    }
    unsigned long n = 0;
    const auto res = std::from_chars(col.data(), col.data() + col.size(), n);
    if (res.ec == std::errc() && res.ptr == col.data() + col.size()) {
      if (n == 0) throw UsageError("--columns: column numbers start at 1 (got " + q + "=0)");
      ref.number = n;
    } else {
      ref.name = col;
    }
    out[q] = ref;
  }
  return out;
}

std::vector<std::map<std::string, ColumnRef>> parse_column_specs_per_file(const std::vector<std::string>& values,
                                                                          const std::vector<std::string>& files,
                                                                          const std::vector<std::string>& known) {
  std::optional<std::map<std::string, ColumnRef>> general;
  std::vector<std::optional<std::map<std::string, ColumnRef>>> own(files.size());
  for (const auto& value : values) {
    const auto at = value.find('@');
    const bool for_file = at != std::string::npos && value.substr(0, at).find('=') == std::string::npos;
    if (!for_file) {
      if (general) throw UsageError("--columns: given twice for every log (got \"" + value + "\", expected one SPEC and FILE@SPEC for single logs)");
      general = parse_column_spec(value, known);
      continue;
    }
    const std::string file = trim(value.substr(0, at));
    std::optional<std::size_t> k;
    for (std::size_t i = 0; i < files.size() && !k; ++i)
      if (files[i] == file || std::filesystem::path(files[i]).filename().string() == file) k = i;
    if (!k) {
      std::string list;
      for (const auto& f : files) list += (list.empty() ? "" : ", ") + f;
      throw UsageError("--columns: '" + file + "@' names no log of this run (got \"" + value + "\", expected one of " + list + ")");
    }
    if (own[*k]) throw UsageError("--columns: log " + files[*k] + " given columns twice");
    own[*k] = parse_column_spec(value.substr(at + 1), known);
  }
  std::vector<std::map<std::string, ColumnRef>> out;
  for (std::size_t i = 0; i < files.size(); ++i) out.push_back(own[i] ? *own[i] : general.value_or(std::map<std::string, ColumnRef>{}));
  return out;
}

std::optional<UnitFactor> unit_factor(Quantity q, const std::string& unit_raw) {
  const std::string u = to_lower(trim(unit_raw));
  switch (q) {
    case Quantity::time:
      if (u == "s" || u == "sec" || u == "seconds") return UnitFactor{1.0, 0.0, "s"};
      if (u == "ms") return UnitFactor{1e-3, 0.0, "s"};
      if (u == "min") return UnitFactor{60.0, 0.0, "s"};
      if (u == "h" || u == "hr") return UnitFactor{3600.0, 0.0, "s"};
      break;
    case Quantity::current:
      if (u == "a" || u == "amps") return UnitFactor{1.0, 0.0, "A"};
      if (u == "ma") return UnitFactor{1e-3, 0.0, "A"};
      break;
    case Quantity::voltage:
      if (u == "v" || u == "volts") return UnitFactor{1.0, 0.0, "V"};
      if (u == "mv") return UnitFactor{1e-3, 0.0, "V"};
      break;
    case Quantity::temperature:
      if (u == "c" || u == "degc" || u == "°c" || u == "deg c" || u == "celsius")
        return UnitFactor{1.0, 0.0, "°C"};
      if (u == "k") return UnitFactor{1.0, -273.15, "°C"};
      break;
    case Quantity::throttle:
      if (u == "%" || u == "pct" || u == "percent") return UnitFactor{0.01, 0.0, "fraction"};
      if (u == "1" || u == "fraction") return UnitFactor{1.0, 0.0, "fraction"};
      // RC pulse width: 1000 µs = 0, 2000 µs = 1 (common practice for hobby ESCs).
      if (u == "us" || u == "µs" || u == "μs") return UnitFactor{1e-3, -1.0, "fraction"};
      break;
    case Quantity::speed:
      if (u == "rpm" || u == "1/min") return UnitFactor{1.0, 0.0, "rpm"};
      if (u == "rad/s") return UnitFactor{60.0 / (2.0 * 3.14159265358979323846), 0.0, "rpm"};
      if (u == "hz" || u == "rps") return UnitFactor{60.0, 0.0, "rpm"};
      break;
    case Quantity::force:
      if (u == "n") return UnitFactor{1.0, 0.0, "N"};
      // grams-force and kilograms-force with standard gravity 9.80665 m/s² (CGPM 1901).
      if (u == "g" || u == "gf") return UnitFactor{9.80665e-3, 0.0, "N"};
      if (u == "kg" || u == "kgf") return UnitFactor{9.80665, 0.0, "N"};
      break;
    case Quantity::torque:
      if (u == "nm" || u == "n·m" || u == "n.m" || u == "n m" || u == "n*m") return UnitFactor{1.0, 0.0, "N·m"};
      if (u == "ncm" || u == "n·cm" || u == "n.cm") return UnitFactor{1e-2, 0.0, "N·m"};
      if (u == "mnm" || u == "mn·m" || u == "mn.m") return UnitFactor{1e-3, 0.0, "N·m"};
      break;
    case Quantity::power:
      if (u == "w") return UnitFactor{1.0, 0.0, "W"};
      break;
  }
  return std::nullopt;
}

std::string accepted_units(Quantity q) {
  switch (q) {
    case Quantity::time: return "s, ms, min, h";
    case Quantity::current: return "A, mA";
    case Quantity::voltage: return "V, mV";
    case Quantity::temperature: return "C, degC, K";
    case Quantity::throttle: return "%, 1 (fraction), us (1000-2000 pulse width)";
    case Quantity::speed: return "rpm, rad/s, Hz";
    case Quantity::force: return "N, g, kgf";
    case Quantity::torque: return "Nm, Ncm, mNm";
    case Quantity::power: return "W";
  }
  return "";
}

std::optional<double> parse_log_number(const std::string& text, bool decimal_comma) {
  if (text.empty()) return std::nullopt;
  std::string s = text;
  if (decimal_comma) std::replace(s.begin(), s.end(), ',', '.');
  const char* b = s.data();
  const char* e = s.data() + s.size();
  if (*b == '+') ++b;
  double v = 0.0;
  const auto res = std::from_chars(b, e, v);
  if (res.ec != std::errc() || res.ptr != e || !std::isfinite(v)) return std::nullopt;
  return v;
}

namespace {

/// Days from 1970-01-01 to a proleptic Gregorian date (H. Hinnant, "chrono-Compatible Low-Level
/// Date Algorithms", 2013, days_from_civil).
long days_from_civil(long y, unsigned m, unsigned d) {
  y -= m <= 2;
  const long era = (y >= 0 ? y : y - 399) / 400;
  const unsigned yoe = static_cast<unsigned>(y - era * 400);
  const unsigned doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + static_cast<long>(doe) - 719468;
}

std::optional<long> whole(const std::string& s) {
  if (s.empty() || s.size() > 9) return std::nullopt;
  long v = 0;
  const auto res = std::from_chars(s.data(), s.data() + s.size(), v);
  if (res.ec != std::errc() || res.ptr != s.data() + s.size() || v < 0) return std::nullopt;
  return v;
}

/// "h:mm:ss(.fff)" or "d:hh:mm:ss(.fff)" as seconds.
std::optional<double> clock_seconds(const std::string& s, bool decimal_comma) {
  std::vector<std::string> parts;
  std::size_t a = 0;
  while (true) {
    const auto p = s.find(':', a);
    parts.push_back(s.substr(a, p == std::string::npos ? std::string::npos : p - a));
    if (p == std::string::npos) break;
    a = p + 1;
  }
  if (parts.size() < 2 || parts.size() > 4) return std::nullopt;
  const auto sec = parse_log_number(parts.back(), decimal_comma);
  if (!sec || *sec < 0 || *sec >= 60.0 + 1e-9) return std::nullopt;
  double total = *sec;
  const double mult[] = {60.0, 3600.0, 86400.0};
  for (std::size_t i = 0; i + 1 < parts.size(); ++i) {
    const auto v = whole(parts[parts.size() - 2 - i]);
    if (!v) return std::nullopt;
    total += mult[i] * static_cast<double>(*v);
  }
  return total;
}

}  // namespace

std::optional<double> parse_log_time(const std::string& text, bool decimal_comma) {
  if (auto v = parse_log_number(text, decimal_comma)) return v;
  if (text.find(':') == std::string::npos) return std::nullopt;
  // Date and time: YYYY-MM-DD hh:mm:ss (or YYYY/MM/DD, 'T' between).
  if (text.size() >= 19 && (text[4] == '-' || text[4] == '/') && text[7] == text[4] &&
      (text[10] == ' ' || text[10] == 'T')) {
    const auto y = whole(text.substr(0, 4)), m = whole(text.substr(5, 2)), d = whole(text.substr(8, 2));
    std::string clock = text.substr(11);
    while (!clock.empty() && (clock.back() == 'Z')) clock.pop_back();
    const auto c = clock_seconds(clock, decimal_comma);
    if (!y || !m || !d || !c || *m < 1 || *m > 12 || *d < 1 || *d > 31) return std::nullopt;
    return 86400.0 * static_cast<double>(days_from_civil(*y, static_cast<unsigned>(*m),
                                                         static_cast<unsigned>(*d))) + *c;
  }
  return clock_seconds(text, decimal_comma);
}

}  // namespace sortie::io
