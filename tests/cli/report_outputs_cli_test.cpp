// --html, --format and --quiet end to end on every reporting command: the real binary on the
// demo files. Each page is checked for well-formedness, one <svg> per promised plot, no URL,
// and its marked numbers against the JSON result written by the same run.
#include <doctest/doctest.h>

#include <nlohmann/json.hpp>
#include <algorithm>
#include <filesystem>

#include "io/csv.hpp"

#include "report/html_compare.hpp"
#include "report/html_discharge.hpp"
#include "report/html_drive.hpp"
#include "report/html_fit.hpp"
#include "report/html_fly.hpp"
#include "support/cli.hpp"
#include "support/report_keys.hpp"
#include "support/xml_check.hpp"

using namespace sortie::test;
using nlohmann::json;

namespace {

const std::string kQuadProfile = "profiles/demo-quad-water-tank.json";
const std::string kHexaProfile = "profiles/demo-hexa-highland-sensor.json";
const std::string kPack = "models/packs/demo-4s1p-lipo-5000.json";
const std::string kDrive = "models/drives/demo-quad-15in.json";

bool has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

template <std::size_t N>
std::vector<std::string> promised(const char* const (&ids)[N]) {
  return std::vector<std::string>(ids, ids + N);
}

std::vector<std::string> plot_ids(const XmlCheck& x) {
  std::vector<std::string> out;
  for (const auto& e : x.elements)
    if (e.name == "svg") out.push_back(e.attrs.count("data-plot") ? e.attrs.at("data-plot") : "");
  return out;
}

/// Run a command with --html and --json, check the page against the JSON; returns the page.
struct Page {
  XmlCheck x;
  KeyCheck keys;
  std::string html;
  json j;
  int exit_code = -1;
};
Page page_of(std::vector<std::string> args, const std::string& tag) {
  const std::string html = work_path(tag + ".html"), js = work_path(tag + ".json");
  args.insert(args.end(), {"--html", html, "--json", js, "--quiet"});
  const auto r = run_sortie(args);
  Page p;
  p.exit_code = r.exit_code;
  CHECK(r.out.empty());
  CHECK(r.err.empty());
  REQUIRE(file_exists(html));
  p.html = read_file(html);
  p.j = json::parse(read_file(js));
  p.x = check_xml(p.html);
  REQUIRE_MESSAGE(p.x.ok, p.x.error);
  CHECK(urls_in(p.html).empty());
  CHECK(has(p.html, "<h2>Cautions</h2>"));
  CHECK(p.x.count("script") == 0);
  p.keys = check_keys(p.x, p.j);
  for (const auto& problem : p.keys.problems) FAIL_CHECK(problem);
  return p;
}

/// Paths (curves) drawn inside one plot.
std::size_t curves_in(const XmlCheck& x, const std::string& plot) {
  std::size_t n = 0;
  bool inside = false;
  int depth = 0;
  for (const auto& e : x.elements) {
    if (e.name == "svg") {
      inside = e.attrs.count("data-plot") && e.attrs.at("data-plot") == plot;
      depth = e.depth;
      continue;
    }
    if (inside && e.depth <= depth) inside = false;
    if (inside && e.name == "path") ++n;
  }
  return n;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  for (std::size_t p = 0; p < text.size();) {
    const auto e = text.find('\n', p);
    out.push_back(text.substr(p, e - p));
    if (e == std::string::npos) break;
    p = e + 1;
  }
  if (!out.empty() && out.back().empty()) out.pop_back();
  return out;
}

}  // namespace

TEST_SUITE("cli") {

TEST_CASE("fly --html: the demo page has its plots — and its numbers are those of --json") {
  const Page p = page_of({"fly", source_path(kQuadProfile)}, "fly-quad");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == sortie::report::fly_plot_ids(p.j.contains("cell_temperature_C")));
  for (const char* k : {"verdict_text", "flight_time_s", "landing.soc", "spare_s", "rules.soc_min.actual",
                        "rules.v_load_cell_min_V.actual", "rules.hover_s.actual"})
    CHECK_MESSAGE(has_key(p.keys, k), k);
  CHECK(has(p.html, ">GO</div>"));
  CHECK(curves_in(p.x, "fly-voltage-soc") == 3);  // loaded, open-circuit, SoC
}

TEST_CASE("fly --html: a no-go run still writes its page — NO-GO first — with exit code 3") {
  const Page p = page_of({"fly", source_path(kHexaProfile)}, "fly-hexa");
  CHECK(p.exit_code == 3);
  CHECK(has(p.html, ">NO-GO</div>"));
  CHECK(p.j["verdict"] == "no-go");
}

TEST_CASE("compare --html: spare time and landing charge per pack — no-go packs marked") {
  const Page p = page_of({"compare", source_path(kQuadProfile), "--series", "4,6", "--capacity-Ah", "3,5"}, "compare");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == promised(sortie::report::kComparePlots));
  std::size_t no_go = 0;
  for (const auto& row : p.j["rows"]) no_go += row["verdict"] == "no-go" ? 1 : 0;
  REQUIRE(no_go >= 1);  // the 4S 3 Ah pack ends early on the demo mission
  std::size_t hatched = 0;
  for (const auto& e : p.x.elements)
    if (e.name == "rect" && e.attrs.count("fill") && e.attrs.at("fill").rfind("url(#", 0) == 0) ++hatched;
  // One hatched bar per no-go pack in the charge plot, and one in the spare plot where the
  // pack has a solved spare figure (a pack no length of the spare phase mends has none).
  std::size_t no_go_spare = 0;
  for (const auto& row : p.j["rows"]) no_go_spare += row["verdict"] == "no-go" && !row["spare_s"].is_null() ? 1 : 0;
  CHECK(hatched == no_go + no_go_spare);
  for (std::size_t i = 0; i < p.j["rows"].size(); ++i) {
    CHECK(has_key(p.keys, "rows." + std::to_string(i) + ".landing_soc"));
    CHECK(has_key(p.keys, "rows." + std::to_string(i) + ".spare_s") == !p.j["rows"][i]["spare_s"].is_null());
    // The ranking names every reason of a no-go pack in full.
    if (p.j["rows"][i]["verdict"] == "no-go") {
      const std::string limit = p.j["rows"][i]["limit"];
      CHECK_MESSAGE(has(p.html, limit.substr(std::string("fails: ").size())), limit);
    }
  }
}

TEST_CASE("drive --html: three efficiency plots — one curve per cell count") {
  const Page p = page_of({"drive", source_path(kDrive), "--sweep", "--cells", "4,6"}, "drive");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == promised(sortie::report::kDrivePlots));
  for (const char* plot : sortie::report::kDrivePlots) CHECK(curves_in(p.x, plot) == 2);
  CHECK(has_key(p.keys, "points.0.eta_system"));
  CHECK(has_key(p.keys, "points.19.eta_esc"));  // 10 throttle steps × 2 packs
}

TEST_CASE("discharge --html: voltage and charge — current and power") {
  const Page p = page_of({"discharge", source_path(kPack), "--power", "300"}, "discharge");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == sortie::report::discharge_plot_ids(p.j.contains("cell_temperature_C")));
  CHECK(has_key(p.keys, "time_to_end_s"));
}

TEST_CASE("fit cell --html: voltage — error — OCV and resistance plots — numbers equal to --json") {
  const Page p = page_of({"fit", "cell", source_path("models/logs/demo-hppc-synthetic.csv"), "--out",
                          work_path("fit-cell-model.json"), "--chemistry", "LiPo"},
                         "fit-cell");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == promised(sortie::report::kFitCellPlots));
  for (const char* k : {"voltage_rmse_V", "voltage_max_error_V", "soc.capacity_Ah", "bands.0.r0_ohm",
                        "bands.0.rc.1.tau_s"})
    CHECK_MESSAGE(has_key(p.keys, k), k);
  CHECK(curves_in(p.x, "fit-cell-voltage") == 2);  // measured and model
}

TEST_CASE("fit drive --html: thrust — power — residual and efficiency plots — numbers equal to --json") {
  const Page p = page_of({"fit", "drive", source_path("models/logs/demo-bench-synthetic.csv"), "--out",
                          work_path("fit-drive-model.json"), "--diameter-m", "0.381"},
                         "fit-drive");
  CHECK(p.exit_code == 0);
  CHECK(plot_ids(p.x) == promised(sortie::report::kFitDrivePlots));
  for (const char* k : {"rms_power_pct", "parameters.Kv.value", "parameters.Rm.se_rel", "points.5.measured.rpm",
                        "points.5.model.bus_W", "points.5.error_pct.bus_power"})
    CHECK_MESSAGE(has_key(p.keys, k), k);
}

TEST_CASE("--html: bad input writes no page at all") {
  const std::string broken = write_work_file("broken-pack.json", "{ \"cell\": ");
  const std::string html = work_path("never.html");
  auto r = run_sortie({"discharge", broken, "--power", "300", "--html", html});
  CHECK(r.exit_code == 1);
  CHECK_FALSE(file_exists(html));
  CHECK_FALSE(file_exists(html + ".part"));
  r = run_sortie({"fly", source_path(kQuadProfile), "--pack", broken, "--html", html});
  CHECK(r.exit_code == 1);
  CHECK_FALSE(file_exists(html));
  r = run_sortie({"fly", source_path(kQuadProfile), "--html", work_dir() + "/no-such-folder/page.html"});
  CHECK(r.exit_code == 1);
  CHECK(has(r.err, "no-such-folder/page.html"));
}

TEST_CASE("--format json prints the JSON result — the same as --json -") {
  const std::vector<std::vector<std::string>> runs = {
      {"fly", source_path(kQuadProfile)},
      {"compare", source_path(kQuadProfile), "--series", "6", "--capacity-Ah", "5"},
      {"drive", source_path(kDrive), "--bus-V", "14.8"},
      {"discharge", source_path(kPack), "--current", "10"}};
  for (auto args : runs) {
    CAPTURE(args[0]);
    auto a = args, b = args;
    a.insert(a.end(), {"--format", "json"});
    b.insert(b.end(), {"--json", "-"});
    const auto ra = run_sortie(a), rb = run_sortie(b);
    CHECK(ra.exit_code == 0);
    const json ja = json::parse(ra.out);
    CHECK(ja == json::parse(rb.out));
    CHECK(ja["schema"].get<std::string>().rfind("sortie." + args[0] + "/", 0) == 0);
  }
}

TEST_CASE("--format csv: fly phases — compare rows — drive points and the discharge trace") {
  auto csv = [](std::vector<std::string> args) {
    args.insert(args.end(), {"--format", "csv"});
    const auto r = run_sortie(args);
    CHECK(r.exit_code == 0);
    CHECK(r.err.empty());
    return lines_of(r.out);
  };
  auto fly = csv({"fly", source_path(kQuadProfile)});
  REQUIRE(fly.size() == 11);  // header and 10 phases
  CHECK(fly[0].rfind("phase,kind,label,start_s,duration_s,planned_s,flown,", 0) == 0);
  CHECK(fly[1].rfind("1,climb,climb out,0,16,16,true,", 0) == 0);
  const json jf = json::parse(run_sortie({"fly", source_path(kQuadProfile), "--format", "json"}).out);
  // The energy column of the last phase, in full precision, is the JSON's.
  const auto header = sortie::io::split_csv_line(fly[0]);
  const auto last = sortie::io::split_csv_line(fly[10]);
  const auto col = std::find(header.begin(), header.end(), "energy_Wh") - header.begin();
  REQUIRE(col < static_cast<long>(header.size()));
  CHECK(std::stod(last[col]) == doctest::Approx(jf["phases"][9]["energy_Wh"].get<double>()).epsilon(1e-9));

  auto cmp = csv({"compare", source_path(kQuadProfile), "--series", "4,6", "--capacity-Ah", "5"});
  REQUIRE(cmp.size() == 3);
  CHECK(cmp[0].rfind("rank,pack,layout,series,parallel,capacity_Ah,verdict,", 0) == 0);
  auto drv = csv({"drive", source_path(kDrive), "--sweep", "--cells", "4,6"});
  CHECK(drv.size() == 1 + 20);  // 10 throttle steps × 2 packs
  CHECK(drv[0].rfind("cells,cell_V,bus_V,throttle_pct,duty,", 0) == 0);
  auto dis = csv({"discharge", source_path(kPack), "--current", "10", "--sample-s", "10"});
  CHECK(dis[0] == "time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,cell_temperature_C");  // the demo LiPo has a thermal block
  CHECK(dis.size() > 20);
}

TEST_CASE("--quiet prints nothing on every command — and still writes the files asked for") {
  const std::string html = work_path("quiet.html");
  const std::vector<std::vector<std::string>> runs = {
      {"fly", source_path(kQuadProfile)},
      {"fly", source_path(kHexaProfile)},
      {"compare", source_path(kQuadProfile), "--series", "6", "--capacity-Ah", "5"},
      {"drive", source_path(kDrive), "--bus-V", "14.8"},
      {"discharge", source_path(kPack), "--current", "10"}};
  for (auto args : runs) {
    CAPTURE(args[1]);
    args.insert(args.end(), {"--quiet", "--format", "csv", "--html", html});
    const auto r = run_sortie(args);
    // The hexacopter demo is a no-go (exit 3), everything else exits 0.
    CHECK(r.exit_code == (args[1] == source_path(kHexaProfile) ? 3 : 0));
    CHECK(r.out.empty());
    CHECK(r.err.empty());
    CHECK(file_exists(html));
    std::filesystem::remove(html);
  }
}

TEST_CASE("standard output carries one thing: two claims on it are a usage error") {
  const std::string fly = source_path(kQuadProfile);
  auto r = run_sortie({"fly", fly, "--format", "json", "--json", "-"});
  CHECK(r.exit_code == 2);
  CHECK(has(r.err, "--format json"));
  r = run_sortie({"fly", fly, "--html", "-", "--json", "-"});
  CHECK(r.exit_code == 2);
  r = run_sortie({"fly", fly, "--json", "-", "--trace", "-"});
  CHECK(r.exit_code == 2);
  r = run_sortie({"drive", source_path(kDrive), "--bus-V", "14.8", "--format", "xml"});
  CHECK(r.exit_code == 2);
  // --html - alone is the page on standard output.
  r = run_sortie({"discharge", source_path(kPack), "--current", "10", "--html", "-"});
  CHECK(r.exit_code == 0);
  CHECK(r.out.rfind("<!DOCTYPE html>", 0) == 0);
  CHECK(check_xml(r.out).ok);
}

}
