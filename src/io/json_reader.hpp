#pragma once
/// Reading model files: JSON objects with their keys checked once, at load (docs/style.md rule 6).
/// Every error names the file, the JSON pointer, the value and what was expected.
#include <cstddef>
#include <filesystem>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/range.hpp"
#include "core/table.hpp"

namespace sortie::io {

// The number validator lives in core (the command line uses it too).
using sortie::above_to;
using sortie::any_number;
using sortie::between;
using sortie::non_negative;
using sortie::positive;
using sortie::Range;

/// Where a JSON value came from: the file and the folder relative paths are resolved from.
struct Source {
  Source() = default;
  // A constructor rather than an aggregate, so that `Source{file, dir}` leaves `root` empty
  // without a missing-initializer warning.
  Source(std::string file_, std::filesystem::path dir_ = {}, std::filesystem::path root_ = {})
      : file(std::move(file_)), dir(std::move(dir_)), root(std::move(root_)) {}

  std::string file;                ///< as shown in messages
  std::filesystem::path dir;       ///< folder of the file, for relative model paths
  /// When not empty, a model path must lead to a file inside this folder (text read from an
  /// untrusted place, such as a fuzzer's input, then reaches no other file). Handed on to the
  /// models it refers to.
  std::filesystem::path root;
};

/// Deepest nesting of arrays and objects accepted in a JSON text (a model file nests about 5).
inline constexpr std::size_t kMaxJsonDepth = 64;

/// Parse a JSON file; a syntax error names the line and column.
nlohmann::json load_json_file(const std::filesystem::path& path);
/// Parse JSON text; `name` is shown in messages. A syntax error names the line and column;
/// nesting deeper than kMaxJsonDepth is refused there too.
nlohmann::json parse_json_text(const std::string& text, const std::string& name);

/// `FILE: /pointer: what (got X, expected Y)`; parts left empty are left out.
std::string message(const Source& src, const std::string& pointer, const std::string& what,
                    const std::string& got = {}, const std::string& expected = {});

/// Reads one JSON object. Every key asked for, present or not, becomes a known key; finish()
/// refuses the rest, suggesting the nearest known key.
class ObjectReader {
 public:
  ObjectReader(const nlohmann::json& j, Source src, std::string pointer);

  bool has(const std::string& key);
  double number(const std::string& key, const Range& r);
  std::optional<double> optional_number(const std::string& key, const Range& r);
  double number_or(const std::string& key, double fallback, const Range& r);
  int integer(const std::string& key, int lo, int hi);
  int integer_or(const std::string& key, int fallback, int lo, int hi);
  std::string string(const std::string& key);
  std::string string_or(const std::string& key, const std::string& fallback);
  /// One of `choices`.
  std::string choice(const std::string& key, const std::vector<std::string>& choices,
                     const std::string& fallback);
  bool boolean_or(const std::string& key, bool fallback);
  /// A child object.
  ObjectReader object(const std::string& key);
  /// A list of objects (at least `min_size`).
  std::vector<ObjectReader> objects(const std::string& key, std::size_t min_size);
  /// A list of numbers, each in range.
  std::vector<double> numbers(const std::string& key, const Range& r);
  /// Refuse a list that is not strictly increasing, naming the first offending entry.
  void require_increasing(const std::string& key, const std::vector<double>& v,
                          const std::string& what) const;
  /// Refuse a list whose length differs from `n` (the length of `other_key`).
  void require_length(const std::string& key, const std::vector<double>& v, std::size_t n,
                      const std::string& other_key) const;
  /// A table `{ "<x_key>": [...], "<y_key>": [...] }`, x strictly increasing, equal lengths.
  Table table(const std::string& key, const std::string& x_key, const std::string& y_key,
              const Range& rx, const Range& ry, std::size_t min_points);
  /// A plain number (a constant) or such a table.
  Table number_or_table(const std::string& key, const std::string& x_key,
                        const std::string& y_key, const Range& rx, const Range& ry);
  /// A model given inline or as a path relative to this file's folder.
  ObjectReader model(const std::string& key);

  /// Refuse keys never asked for (a free-text "note" is allowed in every object).
  void finish();

  [[noreturn]] void fail(const std::string& key, const std::string& what,
                         const std::string& got = {}, const std::string& expected = {}) const;
  std::string pointer(const std::string& key) const;
  const std::string& pointer() const { return pointer_; }
  const Source& source() const { return src_; }
  const nlohmann::json& json() const { return *j_; }

 private:
  friend ObjectReader open_model_file(const std::filesystem::path& path,
                                      const std::filesystem::path& root);
  friend ObjectReader open_model_text(const std::string& text, Source src);
  ObjectReader child(const nlohmann::json& j, std::string pointer) const;
  const nlohmann::json& require(const std::string& key);
  double checked_number(const nlohmann::json& v, const std::string& ptr, const Range& r) const;

  const nlohmann::json* j_;
  std::shared_ptr<const nlohmann::json> owned_;  // set when this object was loaded from a file
  Source src_;
  std::string pointer_;
  std::vector<std::string> known_;
};

/// Open a model file as a reader on its root object; `root` as in Source::root.
ObjectReader open_model_file(const std::filesystem::path& path,
                             const std::filesystem::path& root = {});
/// A reader on the root object of a JSON text (tests, fuzzing): `src.file` names it in
/// messages, `src.dir` resolves its relative model paths.
ObjectReader open_model_text(const std::string& text, Source src);

/// JSON-pointer escaping of one key (RFC 6901: ~ → ~0, / → ~1).
std::string escape_pointer_token(const std::string& key);

}  // namespace sortie::io
