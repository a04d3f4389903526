// The well-formedness checker itself: it must refuse what XML 1.0 refuses (W3C XML 1.0, 5th
// edition, 2008, sections 2.1, 2.4, 3.1, 4.1) or its passes on the reports mean nothing.
#include "support/xml_check.hpp"

#include <doctest/doctest.h>

using sortie::test::check_xml;

TEST_SUITE("report") {

TEST_CASE("xml check: a small XHTML page passes and its elements are collected") {
  const auto r = check_xml(
      "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"/><title>a &amp; b</title></head>\n"
      "<body><p data-key='x'>1.5 <b>%</b></p><!-- note --><br/><svg viewBox=\"0 0 1 1\"></svg></body></html>\n");
  REQUIRE_MESSAGE(r.ok, r.error);
  CHECK(r.count("svg") == 1);
  CHECK(r.count("meta") == 1);
  bool found = false;
  for (const auto& e : r.elements)
    if (e.name == "p") {
      found = true;
      CHECK(e.attrs.at("data-key") == "x");
      CHECK(e.text == "1.5 %");  // nested text is part of the element's text
    }
  CHECK(found);
  for (const auto& e : r.elements)
    if (e.name == "title") CHECK(e.text == "a & b");
}

TEST_CASE("xml check: each kind of malformed markup is refused with its line") {
  struct Bad {
    const char* doc;
    const char* why;
  };
  const Bad cases[] = {
      {"<html><body><p>open</body></html>", "closes <p>"},
      {"<html><br></html>", "closes <br>"},
      {"<html><p class=x>t</p></html>", "not quoted"},
      {"<html><p hidden>t</p></html>", "has no value"},
      {"<html><p a=\"1\" a=\"2\">t</p></html>", "twice"},
      {"<html><p>fish & chips</p></html>", "character reference"},
      {"<html><p>&nbsp;</p></html>", "character reference"},
      {"<html><style>a < b {}</style></html>", "does not start a tag"},
      {"<html><p title=\"a<b\">t</p></html>", "'<' in attribute"},
      {"<html></html><html></html>", "second root"},
      {"<html>", "never closed"},
      {"</html>", "nothing open"},
      {"text<html></html>", "outside the root"},
      {"<html><!-- a -- b --></html>", "inside a comment"},
      {"<html><p a=\"1\"b=\"2\">t</p></html>", "no space"},
      {"", "no root"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.doc);
    const auto r = check_xml(c.doc);
    CHECK_FALSE(r.ok);
    CHECK(r.error.find(c.why) != std::string::npos);
    CHECK(r.error.rfind("line ", 0) == 0);
  }
  CHECK(check_xml("<html>\n\n<p>\n</html>").error.rfind("line 4", 0) == 0);
}

}
