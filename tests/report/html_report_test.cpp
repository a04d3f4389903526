// The HTML pages built in process from real simulations of the demo files: well-formed,
// one <svg> per promised plot, no URL, the Cautions box, and every marked number equal to
// the JSON result of the same run.
#include <doctest/doctest.h>

#include <string>

#include "io/battery_json.hpp"
#include "io/profile_json.hpp"
#include "report/discharge_report.hpp"
#include "report/html_discharge.hpp"
#include "report/html_fly.hpp"
#include "report/mission_report.hpp"
#include "sim/discharge.hpp"
#include "sim/mission.hpp"
#include "support/cli.hpp"
#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie;
using sortie::test::check_xml;
using sortie::test::source_path;

namespace {

std::vector<std::string> plot_ids(const test::XmlCheck& x) {
  std::vector<std::string> out;
  for (const auto& e : x.elements)
    if (e.name == "svg") out.push_back(e.attrs.count("data-plot") ? e.attrs.at("data-plot") : "");
  return out;
}

template <std::size_t N>
std::vector<std::string> promised(const char* const (&ids)[N]) {
  return std::vector<std::string>(ids, ids + N);
}

struct Flown {
  io::LoadedProfile lp;
  sim::MissionResult r;
  sim::SpareResult s;
};

Flown fly(const std::string& profile) {
  Flown f{io::load_profile_file(source_path(profile)), {}, {}};
  sim::SimOptions so;
  so.sample_s = 1.0;
  f.r = sim::simulate(f.lp.mission, so);
  f.s = sim::solve_spare(f.lp.mission, f.r);
  return f;
}

bool has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

}  // namespace

TEST_SUITE("report") {

TEST_CASE("fly html: the demo mission page is well-formed — draws its four plots and matches the JSON") {
  const Flown f = fly("profiles/demo-quad-water-tank.json");
  REQUIRE(f.r.go);
  REQUIRE(f.r.trace.size() > 100);
  const std::string page = report::fly_html(f.lp.mission, f.r, f.s);
  const auto x = check_xml(page);
  REQUIRE_MESSAGE(x.ok, x.error);
  // The demo LiPo has a thermal block: its cell temperature plot follows the current plot.
  REQUIRE(f.r.thermal);
  CHECK(plot_ids(x) == report::fly_plot_ids(true));
  CHECK(test::urls_in(page).empty());
  CHECK(x.count("script") == 0);
  CHECK(x.count("link") == 0);
  CHECK(x.count("img") == 0);
  CHECK(has(page, "Cautions"));
  CHECK(has(page, "Lithium packs can burn"));
  CHECK(has(page, "@media print"));

  const auto j = report::fly_json(f.lp.mission, f.r, f.s);
  const auto keys = test::check_keys(x, j);
  for (const auto& p : keys.problems) FAIL_CHECK(p);
  // The figures a pilot looks for are among those checked.
  for (const char* k : {"verdict_text", "flight_time_s", "landing.soc", "spare_s", "energy_Wh", "v_min_cell_V",
                        "landing.reserve_time_s", "phases.0.energy_Wh", "phases.9.duty_mean"})
    CHECK_MESSAGE(test::has_key(keys, k), k);
  for (const auto& rule : f.r.rules) {
    CHECK(test::has_key(keys, "rules." + rule.name + ".actual"));
    CHECK(test::has_key(keys, "rules." + rule.name + ".required"));
  }
  CHECK(keys.checked > 100);
}

TEST_CASE("fly html: a no-go mission says NO-GO at the top and marks the failed rules") {
  const Flown f = fly("profiles/demo-hexa-highland-sensor.json");
  REQUIRE_FALSE(f.r.go);
  const std::string page = report::fly_html(f.lp.mission, f.r, f.s);
  const auto x = check_xml(page);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(has(page, "class=\"verdict nogo\""));
  CHECK(has(page, ">NO-GO</div>"));
  CHECK(page.find("NO-GO") < page.find("Reserve rules"));
  std::size_t failed_rows = 0;
  for (const auto& e : x.elements)
    if (e.name == "tr" && e.attrs.count("class") && e.attrs.at("class") == "fail") ++failed_rows;
  std::size_t failed_rules = 0;
  for (const auto& rule : f.r.rules) failed_rules += rule.pass ? 0 : 1;
  CHECK(failed_rows == failed_rules);
  const auto keys = test::check_keys(x, report::fly_json(f.lp.mission, f.r, f.s));
  for (const auto& p : keys.problems) FAIL_CHECK(p);
}

TEST_CASE("fly html: names with markup characters are escaped — not interpreted") {
  Flown f = fly("profiles/demo-quad-water-tank.json");
  f.lp.mission.name = "tank <b>run</b> & \"return\" 'home'";
  f.lp.mission.phases[0].label = "up & <away>";
  const std::string page = report::fly_html(f.lp.mission, f.r, f.s);
  const auto x = check_xml(page);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(x.count("b") == 0);
  CHECK(has(page, "tank &lt;b&gt;run&lt;/b&gt; &amp; &quot;return&quot; &#39;home&#39;"));
  bool title_ok = false;
  for (const auto& e : x.elements)
    if (e.name == "title" && e.depth == 2) title_ok = e.text == "Mission: tank <b>run</b> & \"return\" 'home'";
  CHECK(title_ok);
}

TEST_CASE("fly html: without a trace the page still stands and says why the curves are missing") {
  Flown f = fly("profiles/demo-quad-water-tank.json");
  f.r.trace.clear();
  const std::string page = report::fly_html(f.lp.mission, f.r, f.s);
  const auto x = check_xml(page);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(plot_ids(x) == report::fly_plot_ids(f.r.thermal));
  CHECK(has(page, "No trace was recorded"));
}

TEST_CASE("discharge html: well-formed — two plots — numbers equal to the JSON") {
  const battery::Pack pack = io::load_pack_file(source_path("models/packs/demo-4s1p-lipo-5000.json"));
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = 300.0;
  spec.cutoff_cell_V = pack.cell.v_cutoff_V;
  spec.sample_s = 1.0;
  const auto r = sim::discharge(pack, spec);
  const std::string page = report::discharge_html(pack, "constant power 300.0 W", spec, r);
  const auto x = check_xml(page);
  REQUIRE_MESSAGE(x.ok, x.error);
  CHECK(plot_ids(x) == report::discharge_plot_ids(r.thermal));
  CHECK(r.thermal);  // the demo LiPo has a thermal block: the temperature plot is drawn
  CHECK(test::urls_in(page).empty());
  CHECK(has(page, "Cautions"));
  const auto keys = test::check_keys(x, report::discharge_json(pack, "constant power 300.0 W", r));
  for (const auto& p : keys.problems) FAIL_CHECK(p);
  for (const char* k : {"time_to_end_s", "energy_Wh", "charge_Ah", "v_min_V", "i_max_A", "soc_end", "end_reason"})
    CHECK_MESSAGE(test::has_key(keys, k), k);
}

TEST_CASE("report keys: a printed number that differs from the JSON is caught") {
  // The comparison itself must be able to fail: one digit off, a wrong scale, a missing key.
  const nlohmann::json j = {{"a_s", 739.4}, {"soc", 0.5098}, {"rows", {{{"name", "r1"}, {"v", 1.26}}}}};
  auto check = [&](const std::string& html) {
    const auto x = check_xml(html);
    REQUIRE_MESSAGE(x.ok, x.error);
    return test::check_keys(x, j);
  };
  CHECK(check("<p><span data-key=\"a_s\">739 s</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"a_s\">740 s</span></p>").problems.size() == 1);
  CHECK(check("<p><span data-key=\"soc\">51.0 %</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"soc\" data-unit=\"%\">51.0</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"soc\">0.5</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"soc\">51.0</span></p>").problems.size() == 1);
  CHECK(check("<p><span data-key=\"rows.r1.v\">+1.26</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"rows.0.v\">1.3</span></p>").problems.empty());
  CHECK(check("<p><span data-key=\"rows.0.w\">1.3</span></p>").problems.size() == 1);
  CHECK(check("<p><span data-key=\"a_s\">n/a</span></p>").problems.size() == 1);
}

}
