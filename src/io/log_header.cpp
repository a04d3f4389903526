#include "io/log_header.hpp"

#include <algorithm>

#include "core/error.hpp"
#include "core/text.hpp"

namespace sortie::io {

namespace {

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

bool one_of(const std::string& s, const std::vector<std::string>& list) {
  return std::find(list.begin(), list.end(), s) != list.end();
}

/// Within a step, cycle or loop: a clock or counter that restarts, second choice for a quantity.
bool per_step(const std::string& base) {
  return contains(base, "step") || contains(base, "cycle") || contains(base, "loop");
}

/// A unit of some other quantity ("°C" for a time): the column is that quantity's, not this one's.
/// A unit of no quantity ("furlongs") leaves the name to decide, so the error can name the unit.
bool another_kind(Quantity q, const std::string& unit) {
  for (const Quantity other : {Quantity::time, Quantity::current, Quantity::voltage, Quantity::temperature,
                               Quantity::throttle, Quantity::speed, Quantity::force, Quantity::torque, Quantity::power})
    if (other != q && unit_factor(other, unit)) return true;
  return false;
}

/// The score of a base name by the rule's words, stems and symbols (0: none), before units.
int name_score(const std::string& base, const ColumnRule& rule, bool unit_fits) {
  if (one_of(base, rule.words)) return 30;
  for (const auto& s : rule.stems)
    if (contains(base, s)) return 20;
  for (const auto& sym : rule.symbols) {
    if (base.compare(0, sym.size(), sym) != 0) continue;
    if (base == sym) {
      if (unit_fits) return 10;  // "t [°C]": the symbol alone, told apart by its unit
      continue;
    }
    if (one_of(base.substr(sym.size()), symbol_nouns())) return 10;
    if (unit_fits && base.size() <= sym.size() + 5) return 10;  // "tc [°C]", "vmeas (V)"
  }
  return 0;
}

ResolvedColumn from_header(const std::vector<std::string>& header, std::size_t i) {
  ResolvedColumn c;
  c.index = i;
  c.title = "'" + header[i] + "'";
  c.unit = split_header(header[i]).unit;
  c.declared = !c.unit.empty();
  return c;
}

/// The column a `--columns` entry names, nullopt when the header does not hold it.
std::optional<ResolvedColumn> named(const std::vector<std::string>& header, const ColumnRef& ref) {
  std::optional<ResolvedColumn> c;
  if (ref.number) {
    const std::size_t i = *ref.number - 1;
    if (i < header.size()) {
      c = from_header(header, i);
      c->title = "column " + std::to_string(*ref.number) + " ('" + header[i] + "')";
    } else {
      c = ResolvedColumn{i, "column " + std::to_string(*ref.number), "", false};
    }
  } else {
    for (std::size_t i = 0; i < header.size() && !c; ++i)
      if (header_matches(header[i], ref.name)) c = from_header(header, i);
  }
  if (c && !ref.unit.empty()) {
    c->unit = ref.unit;
    c->declared = true;
  }
  return c;
}

/// The best-scoring header cell for a rule; the leftmost on a tie.
std::optional<ResolvedColumn> recognised(const std::vector<std::string>& header, const ColumnRule& rule) {
  int best = 0;
  std::optional<ResolvedColumn> c;
  for (std::size_t i = 0; i < header.size(); ++i) {
    const int s = match_score(header[i], rule);
    if (s > best) {
      best = s;
      c = from_header(header, i);
    }
  }
  return c;
}

std::string required_list(const std::vector<ColumnRule>& rules) {
  std::vector<std::string> keys;
  for (const auto& r : rules)
    if (r.required) keys.push_back(r.key);
  std::string s;
  for (std::size_t k = 0; k < keys.size(); ++k)
    s += (k == 0 ? "" : k + 1 == keys.size() ? " and " : ", ") + keys[k];
  return s;
}

}  // namespace

std::vector<std::string> rule_keys(const std::vector<ColumnRule>& rules) {
  std::vector<std::string> keys;
  for (const auto& r : rules) keys.push_back(r.key);
  return keys;
}

const std::vector<std::string>& symbol_nouns() {
  static const std::vector<std::string> n = {"bat", "batt", "battery", "cell", "pack", "bus", "load", "term", "terminal", "meas"};
  return n;
}

int match_score(const std::string& cell, const ColumnRule& rule) {
  const HeaderName h = split_header(cell);
  if (h.base.empty()) return 0;
  bool unit_fits = false;
  if (rule.kind && !h.unit.empty()) {
    unit_fits = unit_factor(*rule.kind, h.unit).has_value();
    if (!unit_fits && another_kind(*rule.kind, h.unit)) return 0;
  }
  int s = name_score(h.base, rule, unit_fits);
  if (s == 0) return 0;
  if (per_step(h.base)) s -= 5;
  return s + (unit_fits ? 1 : 0);
}

bool header_matches(const std::string& cell, const std::string& wanted) {
  if (to_lower(cell) == to_lower(wanted)) return true;
  const std::string n = normalise_name(wanted);
  return !n.empty() && (normalise_name(cell) == n || split_header(cell).base == n);
}

std::optional<ResolvedColumns> resolve_columns(const std::vector<std::string>& header,
                                               const std::vector<ColumnRule>& rules,
                                               const std::map<std::string, ColumnRef>& refs) {
  ResolvedColumns out;
  for (const auto& rule : rules) {
    const auto it = refs.find(rule.key);
    const std::optional<ResolvedColumn> c = it != refs.end() ? named(header, it->second) : recognised(header, rule);
    if (c) out[rule.key] = *c;
    else if (rule.required) return std::nullopt;
  }
  return out;
}

LogHeader find_log_header(const DelimitedFile& f, const std::vector<ColumnRule>& rules,
                          const std::map<std::string, ColumnRef>& refs, const std::string& examples) {
  LogHeader h;
  const bool decimal_comma = f.delimiter != ',';
  bool all_numbered = !refs.empty();
  for (const auto& r : rules)
    if (r.required && !refs.count(r.key)) all_numbered = false;
  for (const auto& [q, ref] : refs)
    if (!ref.number) all_numbered = false;
  if (all_numbered) {
    // Every column by number: the first row is a header only when its time does not read as one.
    h.columns = *resolve_columns({}, rules, refs);
    const std::vector<std::string> first = f.rows.front();
    const std::size_t ti = h.columns.at(rules.front().key).index;
    if (ti < first.size() && !parse_log_time(first[ti], decimal_comma)) {
      h.row = 0;
      h.columns = *resolve_columns(first, rules, refs);
      h.cells = first;
    }
    return h;
  }
  const std::size_t scan = std::min<std::size_t>(f.rows.size(), 200);
  for (std::size_t r = 0; r < scan; ++r) {
    const std::vector<std::string> cells = f.rows[r];
    if (auto c = resolve_columns(cells, rules, refs)) {
      h.row = r;
      h.columns = std::move(*c);
      h.cells = cells;
      return h;
    }
  }
  std::string asked, example_spec;
  for (const auto& [q, ref] : refs)
    asked += (asked.empty() ? "" : ", ") + q + "=" + (ref.number ? std::to_string(*ref.number) : ref.name);
  for (const auto& r : rules)
    if (r.required) example_spec += (example_spec.empty() ? "" : ",") + r.key + "=...";
  throw InputError(f.file + ": no header line naming the " + required_list(rules) + " columns in the first " +
                   std::to_string(scan) + " lines (" +
                   (asked.empty() ? std::string("got none of the recognised names") : "got --columns " + asked + " not all found") +
                   ", expected names such as " + examples + ", or --columns " + example_spec + ")");
}

}  // namespace sortie::io
