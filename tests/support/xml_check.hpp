#pragma once
// A small, strict well-formedness checker for the HTML reports, which are written to be
// XHTML-clean: every element closed (or self-closed, <br/>), properly nested, attributes
// named once and quoted, '&' only as a character reference, '<' never in text (the inline
// stylesheet included), one root element after an optional <!DOCTYPE ...>. The rules are
// those of XML 1.0 (W3C Recommendation, 5th edition, 2008): sections 2.1 (one root), 2.4 and
// 4.1 (character data and references), 3.1 (start, end and empty-element tags, unique
// attributes, quoted values). Not checked: DTD validity, names beyond ASCII.
#include <cctype>
#include <map>
#include <string>
#include <vector>

namespace sortie::test {

struct XmlElement {
  std::string name;
  std::map<std::string, std::string> attrs;  ///< values with references decoded
  std::string text;                          ///< all text inside, references decoded
  int depth = 0;
  std::size_t line = 0;
};

struct XmlCheck {
  bool ok = false;
  std::string error;  ///< "line N: what"
  std::vector<XmlElement> elements;  ///< in document order
  std::size_t count(const std::string& name) const {
    std::size_t n = 0;
    for (const auto& e : elements) n += e.name == name;
    return n;
  }
};

namespace xml_detail {

inline bool name_start(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_' || c == ':'; }
inline bool name_char(char c) {
  return name_start(c) || std::isdigit(static_cast<unsigned char>(c)) || c == '-' || c == '.';
}

/// Decode one reference at s[i] == '&'; returns false when it is not a well-formed reference.
inline bool reference(const std::string& s, std::size_t& i, std::string& out) {
  const auto semi = s.find(';', i);
  if (semi == std::string::npos || semi - i > 10) return false;
  const std::string body = s.substr(i + 1, semi - i - 1);
  static const std::map<std::string, std::string> named = {
      {"amp", "&"}, {"lt", "<"}, {"gt", ">"}, {"quot", "\""}, {"apos", "'"}};
  if (auto it = named.find(body); it != named.end()) {
    out += it->second;
  } else if (body.size() > 1 && body[0] == '#') {
    const bool hex = body[1] == 'x';
    const std::string digits = body.substr(hex ? 2 : 1);
    if (digits.empty()) return false;
    for (char c : digits)
      if (!(hex ? std::isxdigit(static_cast<unsigned char>(c)) : std::isdigit(static_cast<unsigned char>(c)))) return false;
    const unsigned long cp = std::stoul(digits, nullptr, hex ? 16 : 10);
    if (cp < 0x80) out += static_cast<char>(cp);
    else out += "?";  // beyond ASCII: kept as a placeholder, enough for our comparisons
  } else {
    return false;
  }
  i = semi + 1;
  return true;
}

}  // namespace xml_detail

/// Check `doc` and collect its elements.
inline XmlCheck check_xml(const std::string& doc) {
  using namespace xml_detail;
  XmlCheck r;
  std::size_t i = 0, line = 1;
  std::vector<std::size_t> open;  // indexes into r.elements
  bool root_seen = false;
  auto fail = [&](const std::string& what) {
    r.ok = false;
    r.error = "line " + std::to_string(line) + ": " + what;
    return r;
  };
  auto advance_to = [&](std::size_t j) {
    for (; i < j && i < doc.size(); ++i)
      if (doc[i] == '\n') ++line;
  };
  // Optional byte-order mark and doctype.
  if (doc.compare(0, 3, "\xEF\xBB\xBF") == 0) i = 3;
  while (i < doc.size() && std::isspace(static_cast<unsigned char>(doc[i]))) advance_to(i + 1);
  if (doc.compare(i, 9, "<!DOCTYPE") == 0) {
    const auto e = doc.find('>', i);
    if (e == std::string::npos) return fail("unterminated <!DOCTYPE");
    advance_to(e + 1);
  }
  while (i < doc.size()) {
    if (doc[i] != '<') {
      // Character data.
      std::string text;
      while (i < doc.size() && doc[i] != '<') {
        if (doc[i] == '&') {
          if (!reference(doc, i, text)) return fail("'&' that is not a character reference");
          continue;
        }
        if (open.empty() && !std::isspace(static_cast<unsigned char>(doc[i])))
          return fail("text outside the root element");
        text += doc[i];
        advance_to(i + 1);
      }
      for (auto k : open) r.elements[k].text += text;
      continue;
    }
    if (doc.compare(i, 4, "<!--") == 0) {
      const auto e = doc.find("-->", i + 4);
      if (e == std::string::npos) return fail("unterminated comment");
      if (doc.substr(i + 4, e - i - 4).find("--") != std::string::npos) return fail("'--' inside a comment");
      advance_to(e + 3);
      continue;
    }
    if (doc.compare(i, 2, "<!") == 0 || doc.compare(i, 2, "<?") == 0) return fail("markup declaration inside the document");
    if (doc.compare(i, 2, "</") == 0) {
      std::size_t j = i + 2;
      const std::size_t s = j;
      while (j < doc.size() && name_char(doc[j])) ++j;
      const std::string name = doc.substr(s, j - s);
      while (j < doc.size() && std::isspace(static_cast<unsigned char>(doc[j]))) ++j;
      if (j >= doc.size() || doc[j] != '>') return fail("malformed end tag </" + name);
      if (open.empty()) return fail("end tag </" + name + "> with nothing open");
      if (r.elements[open.back()].name != name)
        return fail("end tag </" + name + "> closes <" + r.elements[open.back()].name + ">");
      open.pop_back();
      advance_to(j + 1);
      continue;
    }
    // Start tag.
    std::size_t j = i + 1;
    if (j >= doc.size() || !name_start(doc[j])) return fail("'<' that does not start a tag");
    const std::size_t s = j;
    while (j < doc.size() && name_char(doc[j])) ++j;
    XmlElement el;
    el.name = doc.substr(s, j - s);
    el.depth = static_cast<int>(open.size());
    el.line = line;
    if (open.empty()) {
      if (root_seen) return fail("a second root element <" + el.name + ">");
      root_seen = true;
    }
    bool empty = false;
    for (;;) {
      const std::size_t ws = j;
      while (j < doc.size() && std::isspace(static_cast<unsigned char>(doc[j]))) ++j;
      if (j >= doc.size()) return fail("unterminated tag <" + el.name);
      if (doc[j] == '>') {
        ++j;
        break;
      }
      if (doc.compare(j, 2, "/>") == 0) {
        j += 2;
        empty = true;
        break;
      }
      if (ws == j) return fail("no space before an attribute in <" + el.name);
      const std::size_t an = j;
      if (!name_start(doc[j])) return fail("bad attribute name in <" + el.name);
      while (j < doc.size() && name_char(doc[j])) ++j;
      const std::string aname = doc.substr(an, j - an);
      while (j < doc.size() && std::isspace(static_cast<unsigned char>(doc[j]))) ++j;
      if (j >= doc.size() || doc[j] != '=') return fail("attribute " + aname + " of <" + el.name + "> has no value");
      ++j;
      while (j < doc.size() && std::isspace(static_cast<unsigned char>(doc[j]))) ++j;
      if (j >= doc.size() || (doc[j] != '"' && doc[j] != '\''))
        return fail("attribute " + aname + " of <" + el.name + "> is not quoted");
      const char q = doc[j++];
      std::string value;
      while (j < doc.size() && doc[j] != q) {
        if (doc[j] == '<') return fail("'<' in attribute " + aname + " of <" + el.name + ">");
        if (doc[j] == '&') {
          if (!reference(doc, j, value)) return fail("'&' in attribute " + aname + " that is not a reference");
          continue;
        }
        value += doc[j++];
      }
      if (j >= doc.size()) return fail("unterminated attribute " + aname);
      ++j;
      if (!el.attrs.emplace(aname, value).second) return fail("attribute " + aname + " twice in <" + el.name + ">");
    }
    r.elements.push_back(el);
    if (!empty) open.push_back(r.elements.size() - 1);
    advance_to(j);
  }
  if (!open.empty()) return fail("<" + r.elements[open.back()].name + "> is never closed");
  if (!root_seen) return fail("no root element");
  r.ok = true;
  return r;
}

}  // namespace sortie::test
