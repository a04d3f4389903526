#include "io/json_reader.hpp"

#include <cmath>
#include <fstream>
#include <set>
#include <sstream>

#include "core/error.hpp"
#include "io/output.hpp"
#include "core/suggest.hpp"

namespace sortie::io {

std::string message(const Source& src, const std::string& pointer, const std::string& what,
                    const std::string& got, const std::string& expected) {
  std::string m = src.file + ": ";
  if (!pointer.empty()) m += pointer + ": ";
  m += what;
  if (!got.empty() || !expected.empty()) {
    m += " (";
    if (!got.empty()) m += "got " + got;
    if (!got.empty() && !expected.empty()) m += ", ";
    if (!expected.empty()) m += "expected " + expected;
    m += ")";
  }
  return m;
}

namespace {

std::string describe_value(const nlohmann::json& v) {
  std::string s = v.dump();
  if (s.size() > 40) s = s.substr(0, 37) + "...";
  return s;
}

void line_column(const std::string& text, std::size_t byte, std::size_t& line, std::size_t& col) {
  line = 1;
  col = 1;
  for (std::size_t i = 0; i < text.size() && i + 1 < byte; ++i) {
    if (text[i] == '\n') {
      ++line;
      col = 1;
    } else {
      ++col;
    }
  }
}

/// The first place where arrays and objects nest deeper than kMaxJsonDepth (outside strings),
/// as a byte offset; nullopt when they never do. Checked before parsing: the parser copes with
/// any depth, but writing a value back out (messages quote values) recurses once per level.
std::optional<std::size_t> too_deep(const std::string& text) {
  std::size_t depth = 0;
  bool in_string = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (in_string) {
      if (c == '\\') ++i;
      else if (c == '"') in_string = false;
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > kMaxJsonDepth) return i;
    } else if ((c == ']' || c == '}') && depth > 0) {
      --depth;
    }
  }
  return std::nullopt;
}

/// Finds the first key given twice in one object (the parser keeps the last silently: a typo'd
/// copy of a block would win unnoticed). A SAX pass over the text already parsed, building each
/// value's JSON pointer as it goes.
class DuplicateKeys {
 public:
  using json = nlohmann::json;
  std::optional<std::string> found;  ///< the pointer of the repeated key

  bool null() { return value(); }
  bool boolean(bool) { return value(); }
  bool number_integer(json::number_integer_t) { return value(); }
  bool number_unsigned(json::number_unsigned_t) { return value(); }
  bool number_float(json::number_float_t, const json::string_t&) { return value(); }
  bool string(json::string_t&) { return value(); }
  bool binary(json::binary_t&) { return value(); }
  bool start_object(std::size_t) {
    value();
    frames_.push_back({true, {}, 0, {}});
    return true;
  }
  bool key(json::string_t& k) {
    Frame& f = frames_.back();
    f.token = escape_pointer_token(k);
    if (!f.keys.insert(k).second) {
      found = here();
      return false;  // stop: one message is enough
    }
    return true;
  }
  bool end_object() {
    frames_.pop_back();
    return true;
  }
  bool start_array(std::size_t) {
    value();
    frames_.push_back({false, {}, 0, {}});
    return true;
  }
  bool end_array() {
    frames_.pop_back();
    return true;
  }
  bool parse_error(std::size_t, const std::string&, const nlohmann::detail::exception&) { return false; }

 private:
  struct Frame {
    bool object;
    std::string token;      ///< the current member's key (escaped) or element's index
    std::size_t index;      ///< next element index (arrays)
    std::set<std::string> keys;
  };
  bool value() {
    if (!frames_.empty() && !frames_.back().object) frames_.back().token = std::to_string(frames_.back().index++);
    return true;
  }
  std::string here() const {
    std::string p;
    for (const auto& f : frames_) p += "/" + f.token;
    return p;
  }
  std::vector<Frame> frames_;
};

}  // namespace

nlohmann::json parse_json_text(const std::string& text, const std::string& name) {
  if (const auto at = too_deep(text)) {
    std::size_t line = 0, col = 0;
    line_column(text, *at + 1, line, col);
    throw InputError(name + ": line " + std::to_string(line) + ", column " + std::to_string(col) +
                     ": JSON nested too deeply (got more than " + std::to_string(kMaxJsonDepth) +
                     " levels of [ and {, expected at most " + std::to_string(kMaxJsonDepth) + ")");
  }
  try {
    nlohmann::json j = nlohmann::json::parse(text);
    DuplicateKeys dup;
    nlohmann::json::sax_parse(text, &dup);
    if (dup.found)
      throw InputError(name + ": " + *dup.found + ": key given twice in one object (expected each key once)");
    return j;
  } catch (const nlohmann::json::out_of_range& e) {
    // A literal too large for a double (1e999): nlohmann gives no position for it, only the
    // literal ("number overflow parsing '1e999'"); its first place in the text gives one.
    const std::string why = e.what();
    const auto q0 = why.find('\''), q1 = why.rfind('\'');
    const std::string literal = q0 != std::string::npos && q1 > q0 ? why.substr(q0 + 1, q1 - q0 - 1) : "";
    const std::size_t at = literal.empty() ? std::string::npos : text.find(literal);
    std::string where;
    if (at != std::string::npos) {
      std::size_t line = 0, col = 0;
      line_column(text, at + 1, line, col);
      where = "line " + std::to_string(line) + ", column " + std::to_string(col) + ": ";
    }
    throw InputError(name + ": " + where + "number too large for a double (got " + (literal.empty() ? "?" : literal) +
                     ", expected a finite number)");
  } catch (const nlohmann::json::parse_error& e) {
    std::size_t line = 0, col = 0;
    line_column(text, e.byte, line, col);
    std::string why = e.what();
    // nlohmann's text is "[json.exception.parse_error.101] parse error at line L, column C: why"
    if (auto p = why.find(": "); p != std::string::npos) why = why.substr(p + 2);
    throw InputError(name + ": line " + std::to_string(line) + ", column " +
                     std::to_string(col) + ": JSON syntax error: " + why);
  }
}

nlohmann::json load_json_file(const std::filesystem::path& path) {
  note_input(path);
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot open the file");
  std::ostringstream ss;
  ss << in.rdbuf();
  return parse_json_text(ss.str(), path.string());
}

std::string escape_pointer_token(const std::string& key) {
  std::string out;
  for (char c : key) {
    if (c == '~') out += "~0";
    else if (c == '/') out += "~1";
    else out += c;
  }
  return out;
}

ObjectReader::ObjectReader(const nlohmann::json& j, Source src, std::string pointer)
    : j_(&j), src_(std::move(src)), pointer_(std::move(pointer)) {
  if (!j.is_object())
    throw InputError(message(src_, pointer_, "not an object", describe_value(j), "a JSON object {...}"));
}

std::string ObjectReader::pointer(const std::string& key) const {
  return pointer_ + "/" + escape_pointer_token(key);
}

void ObjectReader::fail(const std::string& key, const std::string& what, const std::string& got,
                        const std::string& expected) const {
  throw InputError(message(src_, key.empty() ? pointer_ : pointer(key), what, got, expected));
}

bool ObjectReader::has(const std::string& key) {
  if (std::find(known_.begin(), known_.end(), key) == known_.end()) known_.push_back(key);
  return j_->contains(key) && !(*j_)[key].is_null();
}

const nlohmann::json& ObjectReader::require(const std::string& key) {
  if (!has(key)) {
    // A misspelt key is the likelier story than a forgotten one: name it.
    for (auto it = j_->begin(); it != j_->end(); ++it) {
      if (std::find(known_.begin(), known_.end(), it.key()) != known_.end()) continue;
      if (nearest(it.key(), {key}) == key)
        fail(it.key(), "unknown field '" + it.key() + "'; did you mean '" + key + "'?");
    }
    fail(key, "missing field '" + key + "'");
  }
  return (*j_)[key];
}

double ObjectReader::checked_number(const nlohmann::json& v, const std::string& ptr,
                                    const Range& r) const {
  if (!v.is_number())
    throw InputError(message(src_, ptr, "not a number", describe_value(v), r.describe()));
  const double d = v.get<double>();
  if (const auto why = range_problem(d, r)) throw InputError(message(src_, ptr, *why));
  return d;
}

double ObjectReader::number(const std::string& key, const Range& r) {
  return checked_number(require(key), pointer(key), r);
}

std::optional<double> ObjectReader::optional_number(const std::string& key, const Range& r) {
  if (!has(key)) return std::nullopt;
  return checked_number((*j_)[key], pointer(key), r);
}

double ObjectReader::number_or(const std::string& key, double fallback, const Range& r) {
  return optional_number(key, r).value_or(fallback);
}

int ObjectReader::integer(const std::string& key, int lo, int hi) {
  const auto& v = require(key);
  const std::string expected = "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi);
  if (!v.is_number()) fail(key, "not a number", describe_value(v), expected);
  const double d = v.get<double>();
  if (!std::isfinite(d) || d != std::floor(d) || d < lo || d > hi)
    fail(key, "out of range", format_number(d), expected);
  return static_cast<int>(d);
}

int ObjectReader::integer_or(const std::string& key, int fallback, int lo, int hi) {
  if (!has(key)) return fallback;
  return integer(key, lo, hi);
}

std::string ObjectReader::string(const std::string& key) {
  const auto& v = require(key);
  if (!v.is_string()) fail(key, "not a string", describe_value(v), "a string \"...\"");
  return v.get<std::string>();
}

std::string ObjectReader::string_or(const std::string& key, const std::string& fallback) {
  if (!has(key)) return fallback;
  return string(key);
}

std::string ObjectReader::choice(const std::string& key, const std::vector<std::string>& choices,
                                 const std::string& fallback) {
  if (!has(key) && !fallback.empty()) return fallback;
  const std::string s = string(key);
  if (std::find(choices.begin(), choices.end(), s) != choices.end()) return s;
  std::string list;
  for (const auto& c : choices) list += (list.empty() ? "" : " | ") + c;
  const std::string near = nearest(s, choices);
  fail(key, near.empty() ? "unknown value" : "unknown value; did you mean '" + near + "'?",
       "\"" + s + "\"", list);
}

bool ObjectReader::boolean_or(const std::string& key, bool fallback) {
  if (!has(key)) return fallback;
  const auto& v = (*j_)[key];
  if (!v.is_boolean()) fail(key, "not true or false", describe_value(v), "true or false");
  return v.get<bool>();
}

ObjectReader ObjectReader::child(const nlohmann::json& j, std::string ptr) const {
  ObjectReader c(j, src_, std::move(ptr));
  c.owned_ = owned_;  // the child points into the same document
  return c;
}

ObjectReader ObjectReader::object(const std::string& key) {
  return child(require(key), pointer(key));
}

std::vector<ObjectReader> ObjectReader::objects(const std::string& key, std::size_t min_size) {
  const auto& v = require(key);
  if (!v.is_array()) fail(key, "not a list", describe_value(v), "a list [...]");
  if (v.size() < min_size)
    fail(key, "too few entries", std::to_string(v.size()), "at least " + std::to_string(min_size));
  std::vector<ObjectReader> out;
  out.reserve(v.size());
  for (std::size_t i = 0; i < v.size(); ++i)
    out.push_back(child(v[i], pointer(key) + "/" + std::to_string(i)));
  return out;
}

std::vector<double> ObjectReader::numbers(const std::string& key, const Range& r) {
  const auto& v = require(key);
  if (!v.is_array()) fail(key, "not a list", describe_value(v), "a list of numbers");
  std::vector<double> out;
  out.reserve(v.size());
  for (std::size_t i = 0; i < v.size(); ++i)
    out.push_back(checked_number(v[i], pointer(key) + "/" + std::to_string(i), r));
  return out;
}

void ObjectReader::require_increasing(const std::string& key, const std::vector<double>& v,
                                      const std::string& what) const {
  for (std::size_t i = 1; i < v.size(); ++i)
    if (!(v[i] > v[i - 1]))
      throw InputError(message(src_, pointer(key) + "/" + std::to_string(i), what,
                               format_number(v[i]), "a value above " + format_number(v[i - 1])));
}

void ObjectReader::require_length(const std::string& key, const std::vector<double>& v,
                                  std::size_t n, const std::string& other_key) const {
  if (v.size() != n)
    fail(key, "table columns of unequal length", std::to_string(v.size()) + " values",
         std::to_string(n) + " like '" + other_key + "'");
}

Table ObjectReader::table(const std::string& key, const std::string& x_key,
                          const std::string& y_key, const Range& rx, const Range& ry,
                          std::size_t min_points) {
  ObjectReader t = object(key);
  std::vector<double> x = t.numbers(x_key, rx);
  std::vector<double> y = t.numbers(y_key, ry);
  t.finish();
  t.require_length(y_key, y, x.size(), x_key);
  if (x.size() < min_points)
    t.fail(x_key, "too few table points", std::to_string(x.size()),
           "at least " + std::to_string(min_points));
  t.require_increasing(x_key, x, "'" + x_key + "' not strictly increasing");
  return Table(std::move(x), std::move(y));
}

Table ObjectReader::number_or_table(const std::string& key, const std::string& x_key,
                                    const std::string& y_key, const Range& rx, const Range& ry) {
  const auto& v = require(key);
  if (v.is_number()) return Table(checked_number(v, pointer(key), ry));
  if (v.is_object()) return table(key, x_key, y_key, rx, ry, 2);
  fail(key, "neither a number nor a table", describe_value(v),
       "a number or {\"" + x_key + "\": [...], \"" + y_key + "\": [...]}");
}

namespace {

/// Whether `p` lies inside the folder `root` (both made canonical, so ".." and symbolic links
/// cannot lead out of it).
bool inside_folder(const std::filesystem::path& p, const std::filesystem::path& root) {
  std::error_code ec;
  const auto file = std::filesystem::weakly_canonical(p, ec);
  if (ec) return false;
  const auto folder = std::filesystem::weakly_canonical(root, ec);
  if (ec) return false;
  auto f = file.begin();
  for (auto r = folder.begin(); r != folder.end(); ++r, ++f) {
    if (r->empty()) continue;  // a trailing separator
    if (f == file.end() || *f != *r) return false;
  }
  return true;
}

}  // namespace

ObjectReader ObjectReader::model(const std::string& key) {
  const auto& v = require(key);
  if (v.is_string()) {
    const std::string given = v.get<std::string>();
    std::filesystem::path p = given;
    if (p.is_relative()) p = src_.dir / p;
    if (!src_.root.empty() && !inside_folder(p, src_.root))
      fail(key, "model file outside the folder models are read from", "\"" + given + "\"",
           "a path inside " + src_.root.string());
    // The error_code form: a name too long for the system or a loop of links is a file that is
    // not there, not an exception of the file system library.
    std::error_code ec;
    if (!std::filesystem::is_regular_file(p, ec))
      fail(key, "model file not found", "\"" + given + "\"",
           "a path relative to " + (src_.dir.empty() ? std::string(".") : src_.dir.string()));
    return open_model_file(p, src_.root);
  }
  if (v.is_object()) return child(v, pointer(key));
  fail(key, "neither a model object nor a file path", describe_value(v),
       "{...} or \"path/to/model.json\"");
}

void ObjectReader::finish() {
  for (auto it = j_->begin(); it != j_->end(); ++it) {
    if (it.key() == "note") continue;  // free text allowed in every object
    if (std::find(known_.begin(), known_.end(), it.key()) != known_.end()) continue;
    const std::string near = nearest(it.key(), known_);
    std::string list;
    for (const auto& k : known_) list += (list.empty() ? "" : ", ") + k;
    fail(it.key(), near.empty() ? "unknown field '" + it.key() + "'"
                                : "unknown field '" + it.key() + "'; did you mean '" + near + "'?",
         {}, "one of " + list);
  }
}

ObjectReader open_model_file(const std::filesystem::path& path, const std::filesystem::path& root) {
  auto owned = std::make_shared<const nlohmann::json>(load_json_file(path));
  ObjectReader r(*owned, Source{path.string(), path.parent_path(), root}, "");
  r.owned_ = owned;
  return r;
}

ObjectReader open_model_text(const std::string& text, Source src) {
  auto owned = std::make_shared<const nlohmann::json>(parse_json_text(text, src.file));
  ObjectReader r(*owned, std::move(src), "");
  r.owned_ = owned;
  return r;
}

}  // namespace sortie::io
