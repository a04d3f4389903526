// The plotting module: tick choice, thinning, the shared right-hand axis, gaps, bars, and that
// its SVG is well-formed and names no external resource.
#include "report/svg_plot.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <regex>

#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie::report;
using sortie::test::check_xml;

namespace {

/// Attribute values of one kind of element, in document order.
std::vector<std::string> attr_values(const sortie::test::XmlCheck& x, const std::string& el, const std::string& attr) {
  std::vector<std::string> out;
  for (const auto& e : x.elements)
    if (e.name == el && e.attrs.count(attr)) out.push_back(e.attrs.at(attr));
  return out;
}

std::vector<std::string> texts(const sortie::test::XmlCheck& x) {
  std::vector<std::string> out;
  for (const auto& e : x.elements)
    if (e.name == "text") out.push_back(e.text);
  return out;
}

bool contains(const std::vector<std::string>& v, const std::string& s) {
  return std::find(v.begin(), v.end(), s) != v.end();
}

}  // namespace

TEST_SUITE("report") {

TEST_CASE("svg ticks: nice steps of 1 2 2.5 and 5 that cover the range") {
  // Worked by hand: (hi − lo)/target, rounded up to 1, 2, 2.5 or 5 × 10^k.
  auto t = svg::nice_ticks(0.0, 7.3, 6);  // raw 1.22 → 2
  CHECK(t.step == doctest::Approx(2.0));
  CHECK(t.lo == doctest::Approx(0.0));
  CHECK(t.hi == doctest::Approx(8.0));
  CHECK(t.at.size() == 5);
  CHECK(t.decimals == 0);
  t = svg::nice_ticks(20.7, 25.2, 6);  // raw 0.75 → 1
  CHECK(t.step == doctest::Approx(1.0));
  CHECK(t.lo == doctest::Approx(20.0));
  CHECK(t.hi == doctest::Approx(26.0));
  t = svg::nice_ticks(0.0, 1.0, 4);  // raw 0.25 → 0.25, two decimals to print it
  CHECK(t.step == doctest::Approx(0.25));
  CHECK(t.decimals == 2);
  CHECK(svg::tick_label(t.at[1], t.decimals) == "0.25");
  t = svg::nice_ticks(-150.0, 377.0, 6);  // raw 87.8 → 100
  CHECK(t.step == doctest::Approx(100.0));
  CHECK(t.lo == doctest::Approx(-200.0));
  CHECK(t.hi == doctest::Approx(400.0));
  CHECK(contains([&] {
    std::vector<std::string> v;
    for (double x : t.at) v.push_back(svg::tick_label(x, t.decimals));
    return v;
  }(), "0"));  // zero prints as 0, never -0
  t = svg::nice_ticks(5.0, 5.0, 6);  // a flat range is widened, not divided by zero
  CHECK(t.hi > t.lo);
  CHECK(t.lo <= 5.0);
  CHECK(t.hi >= 5.0);
}

TEST_CASE("svg thin: long lines keep their ends — their extremes and their gaps") {
  std::vector<double> x, y;
  for (int i = 0; i < 10000; ++i) {
    x.push_back(i);
    y.push_back(std::sin(i * 0.01));
  }
  y[4321] = 7.0;            // a spike
  y[8000] = std::nan("");  // a gap
  svg::thin(x, y, 500);
  CHECK(x.size() <= 502);
  CHECK(x.front() == 0.0);
  CHECK(x.back() == 9999.0);
  CHECK(contains([&] {
    std::vector<std::string> v;
    for (double a : x) v.push_back(std::to_string(static_cast<int>(a)));
    return v;
  }(), "4321"));
  CHECK(*std::max_element(y.begin(), y.end(), [](double a, double b) {
    return std::isnan(a) || (!std::isnan(b) && a < b);
  }) == 7.0);
  CHECK(std::count_if(y.begin(), y.end(), [](double v) { return std::isnan(v); }) == 1);
  CHECK(std::is_sorted(x.begin(), x.end()));
  std::vector<double> sx = {0, 1, 2}, sy = {1, 2, 3};
  svg::thin(sx, sy, 500);  // short lines are left alone
  CHECK(sx.size() == 3);
}

TEST_CASE("svg line plot: well-formed — labelled axes with units — legend — levels — bands — no URL") {
  svg::LinePlot p;
  p.id = "t1";
  p.title = "voltage & charge <test>";
  p.x = {"time", "min", 0.0, 10.0};
  p.y = {"pack voltage", "V", {}, {}};
  p.y2 = svg::Axis{"state of charge", "%", 0.0, 100.0};
  p.lines.push_back({"loaded \"V\"", {0, 5, 10}, {25, 23, 21}, "#123456"});
  p.lines.push_back({"charge", {0, 10}, {100, 40}, "#654321", svg::Side::right});
  p.levels.push_back({20.7, "reserve 20.70 V", "#b23a48"});
  p.bands = {{0, 4, "1"}, {4, 10, "2"}};
  const std::string s = svg::render(p);
  const auto x = check_xml(s);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(x.count("svg") == 1);
  CHECK(attr_values(x, "svg", "data-plot") == std::vector<std::string>{"t1"});
  CHECK(sortie::test::urls_in(s).empty());
  const auto t = texts(x);
  CHECK(contains(t, "time / min"));
  CHECK(contains(t, "pack voltage / V"));
  CHECK(contains(t, "state of charge / %"));
  CHECK(contains(t, "loaded \"V\""));   // escaped in the source, whole in the text
  CHECK(contains(t, "reserve 20.70 V"));
  CHECK(contains(t, "1"));
  CHECK(contains(t, "100"));            // right-axis ticks
  for (const auto& e : x.elements)
    if (e.name == "title") CHECK(e.text == "voltage & charge <test>");
  // One path per line, both clipped to the frame.
  CHECK(attr_values(x, "path", "d").size() == 2);
}

TEST_CASE("svg line plot: a right axis tied to the left one puts its ticks on the same heights") {
  // Current 0..15 A on the left, C-rate = I / 5 Ah on the right: 1 C must sit where 5 A sits.
  svg::LinePlot p;
  p.id = "t2";
  p.x = {"time", "s", 0.0, 1.0};
  p.y = {"current", "A", 0.0, 15.0};
  p.y2 = svg::Axis{"C-rate", "", {}, {}};
  p.y2_per_y = 1.0 / 5.0;
  p.lines.push_back({"I", {0, 1}, {3, 12}, "#000000"});
  const auto x = check_xml(svg::render(p));
  REQUIRE(x.ok);
  std::map<std::string, std::string> left, right;  // tick text → y
  for (const auto& e : x.elements) {
    if (e.name != "text" || !e.attrs.count("text-anchor")) continue;
    if (e.attrs.at("text-anchor") == "end") left[e.text] = e.attrs.at("y");
    if (e.attrs.at("text-anchor") == "start") right[e.text] = e.attrs.at("y");
  }
  REQUIRE(left.count("5"));
  REQUIRE(right.count("1"));
  CHECK(left["5"] == right["1"]);
  REQUIRE(left.count("15"));
  REQUIRE(right.count("3"));
  CHECK(left["15"] == right["3"]);
}

TEST_CASE("svg line plot: NaN breaks a line into pieces") {
  svg::LinePlot p;
  p.id = "t3";
  p.lines.push_back({"", {0, 1, 2, 3, 4}, {1, 2, std::nan(""), 2, 1}, "#000000"});
  const auto x = check_xml(svg::render(p));
  REQUIRE(x.ok);
  const auto d = attr_values(x, "path", "d");
  REQUIRE(d.size() == 1);
  CHECK(std::count(d[0].begin(), d[0].end(), 'M') == 2);
}

TEST_CASE("svg bar plot: negative bars reach left of zero — flagged bars are hatched and say why") {
  svg::BarPlot p;
  p.id = "b1";
  p.value = {"spare time", "s", {}, {}};
  p.bars.push_back({"pack A", 377.0, "+377 s", false, ""});
  p.bars.push_back({"pack B", -150.0, "-150 s", true, "NO-GO: ends early"});
  p.bars.push_back({"pack C", std::nullopt, "cannot fly", true, "NO-GO"});
  const std::string s = svg::render(p);
  const auto x = check_xml(s);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(x.count("pattern") == 1);
  std::vector<const sortie::test::XmlElement*> bars;
  for (const auto& e : x.elements)
    if (e.name == "rect" && e.attrs.count("fill") &&
        (e.attrs.at("fill") == p.color || e.attrs.at("fill") == "url(#b1-hatch)"))
      bars.push_back(&e);
  REQUIRE(bars.size() == 2);  // pack C has no bar
  const double a_left = std::stod(bars[0]->attrs.at("x"));
  const double b_left = std::stod(bars[1]->attrs.at("x"));
  const double b_right = b_left + std::stod(bars[1]->attrs.at("width"));
  CHECK(b_left < a_left);                        // B starts left of zero, A at zero
  CHECK(b_right == doctest::Approx(a_left).epsilon(1e-3));  // and B ends at zero
  CHECK(bars[1]->attrs.at("fill") == "url(#b1-hatch)");
  const auto t = texts(x);
  CHECK(contains(t, "NO-GO: ends early"));
  CHECK(contains(t, "cannot fly"));
  CHECK(contains(t, "spare time / s"));
}

}
