#pragma once
// Numbers printed in an HTML report against the JSON result of the same run. The report marks
// each such number with data-key="<path>" (dots between JSON keys, array indexes, or a rule's
// name inside "rules"); the printed text is a number with its decimals and an optional unit.
// A "%" unit (in the text or in data-unit) means the JSON holds the fraction, unless the key
// itself ends in _pct; data-scale="1000" gives any other factor (mV shown for V). The check formats the JSON value with the printed number of decimals
// (report::fixed, as the report does) and wants the same digits.
#include <nlohmann/json.hpp>
#include <regex>
#include <string>
#include <vector>

#include "report/text_table.hpp"
#include "support/xml_check.hpp"

namespace sortie::test {

struct KeyCheck {
  std::size_t checked = 0;
  std::vector<std::string> keys;      ///< every key seen
  std::vector<std::string> problems;  ///< "key: printed X, JSON Y"
};

/// The JSON value at a dotted path, or nullptr when there is none.
inline const nlohmann::json* json_at(const nlohmann::json& j, const std::string& path) {
  const nlohmann::json* cur = &j;
  std::size_t p = 0;
  while (p <= path.size()) {
    const auto dot = path.find('.', p);
    const std::string seg = path.substr(p, dot == std::string::npos ? std::string::npos : dot - p);
    if (cur->is_object()) {
      if (!cur->contains(seg)) return nullptr;
      cur = &(*cur)[seg];
    } else if (cur->is_array()) {
      const bool index = !seg.empty() && seg.find_first_not_of("0123456789") == std::string::npos;
      const nlohmann::json* next = nullptr;
      if (index) {
        const auto k = std::stoul(seg);
        if (k < cur->size()) next = &(*cur)[k];
      } else {
        for (const auto& e : *cur)
          if (e.is_object() && e.contains("name") && e["name"] == seg) next = &e;
      }
      if (!next) return nullptr;
      cur = next;
    } else {
      return nullptr;
    }
    if (dot == std::string::npos) break;
    p = dot + 1;
  }
  return cur;
}

inline KeyCheck check_keys(const XmlCheck& doc, const nlohmann::json& j) {
  KeyCheck out;
  static const std::regex number(R"(^\s*([+-]?)([0-9]+)(\.([0-9]+))?\s*(.*?)\s*$)");
  for (const auto& e : doc.elements) {
    const auto k = e.attrs.find("data-key");
    if (k == e.attrs.end()) continue;
    const std::string& key = k->second;
    out.keys.push_back(key);
    ++out.checked;
    const nlohmann::json* v = json_at(j, key);
    if (!v) {
      out.problems.push_back(key + ": not in the JSON result");
      continue;
    }
    if (v->is_string()) {
      if (e.text != v->get<std::string>()) out.problems.push_back(key + ": printed \"" + e.text + "\", JSON \"" + v->get<std::string>() + "\"");
      continue;
    }
    std::smatch m;
    if (!v->is_number() || !std::regex_match(e.text, m, number)) {
      out.problems.push_back(key + ": printed \"" + e.text + "\", JSON " + v->dump());
      continue;
    }
    const int decimals = m[4].matched ? static_cast<int>(m[4].length()) : 0;
    std::string unit = m[5].str();
    if (auto u = e.attrs.find("data-unit"); u != e.attrs.end()) unit = u->second;
    const bool pct_key = key.size() > 4 && key.compare(key.size() - 4, 4, "_pct") == 0;
    double scale = unit.rfind('%', 0) == 0 && !pct_key ? 100.0 : 1.0;
    if (auto s = e.attrs.find("data-scale"); s != e.attrs.end()) scale = std::stod(s->second);
    const std::string printed = (m[1] == "-" ? "-" : "") + m[2].str() + (m[3].matched ? m[3].str() : "");
    const std::string expected = report::fixed(v->get<double>() * scale, decimals);
    if (printed != expected)
      out.problems.push_back(key + ": printed " + printed + ", JSON gives " + expected + " (" + v->dump() + ")");
  }
  return out;
}

inline bool has_key(const KeyCheck& c, const std::string& key) {
  for (const auto& k : c.keys)
    if (k == key) return true;
  return false;
}

/// Every absolute URL in the text ("http://", "https://").
inline std::vector<std::string> urls_in(const std::string& text) {
  std::vector<std::string> out;
  for (const char* scheme : {"http://", "https://"})
    for (auto p = text.find(scheme); p != std::string::npos; p = text.find(scheme, p + 1))
      out.push_back(text.substr(p, 60));
  return out;
}

}  // namespace sortie::test
