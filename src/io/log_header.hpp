#pragma once
/// Finding a log's columns: the one resolver the cell-log, flight-log and bench readers share.
/// A quantity's column is the one named by `--columns` (header text or 1-based number, with an
/// optional unit), else the header cell that best matches the quantity's rule: its name read as
/// words and its declared unit. The header line itself may follow a preamble: the first of the
/// first 200 rows on which every required quantity resolves.
#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "io/log_columns.hpp"

namespace sortie::io {

/// How one quantity is recognised in a header (names normalised: lower case, letters and digits).
struct ColumnRule {
  std::string key;                      ///< "time", "current", ... (the `--columns` key)
  std::optional<Quantity> kind;         ///< the unit family; nullopt for text columns (exclude, mode)
  std::vector<std::string> words;       ///< whole names that mean the quantity ("current", "i")
  std::vector<std::string> stems;       ///< parts that mean it inside a longer name ("volt")
  std::vector<std::string> symbols;     ///< a letter that means it before a noun ("v" in "vcell")
  bool required = false;
};

/// The `--columns` keys of `rules`, in order.
std::vector<std::string> rule_keys(const std::vector<ColumnRule>& rules);

/// Nouns a quantity's symbol may stand before: "vcell", "ibat", "tpack" (common practice).
const std::vector<std::string>& symbol_nouns();

/// How well `cell` matches `rule`: 0 for no match; higher is better (a whole word 30, a stem
/// inside the name 20, a symbol before a noun 10; 5 less when the name also says "step",
/// "cycle" or "loop" (a per-step clock or counter); 1 more when the declared unit fits). A
/// declared unit of another quantity rules the cell out ("t (°C)" is not a time); a unit of none
/// ("furlongs") does not, so that the reader can refuse it by name.
int match_score(const std::string& cell, const ColumnRule& rule);

/// A `--columns` header name against one header cell: the exact text, or the same normalised
/// name, case-insensitively.
bool header_matches(const std::string& cell, const std::string& wanted);

/// Where one quantity is in the file.
struct ResolvedColumn {
  std::size_t index = 0;
  std::string title;      ///< "'Current (A)'" or "column 3 ('I')", for messages
  std::string unit;       ///< as declared ("" when none)
  bool declared = false;  ///< the unit came from the header or `--columns`
};
using ResolvedColumns = std::map<std::string, ResolvedColumn>;

/// The columns on one candidate header row; nullopt when a required quantity is not there.
/// `header` empty: every column is given by number.
std::optional<ResolvedColumns> resolve_columns(const std::vector<std::string>& header,
                                               const std::vector<ColumnRule>& rules,
                                               const std::map<std::string, ColumnRef>& refs);

/// The header of a delimited log: its row (nullopt when the file has none, which needs every
/// required column given by number and a first row whose time reads as a time) and its columns.
/// Throws InputError `FILE: no header line naming the A, B and C columns in the first N lines
/// (got ..., expected ...)`; `examples` are header names to show ("Time(s), Current(A)").
struct LogHeader {
  std::optional<std::size_t> row;
  ResolvedColumns columns;
  std::vector<std::string> cells;  ///< the header row's fields (empty without one)
};
LogHeader find_log_header(const DelimitedFile& f, const std::vector<ColumnRule>& rules,
                          const std::map<std::string, ColumnRef>& refs, const std::string& examples);

}  // namespace sortie::io
