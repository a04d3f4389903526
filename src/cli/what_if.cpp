#include "cli/what_if.hpp"

#include <regex>

#include "cli/number_option.hpp"
#include "core/error.hpp"
#include "core/text.hpp"
#include "io/airframe_json.hpp"
#include "io/battery_json.hpp"
#include "io/drive_json.hpp"

namespace sortie::cli {

void add_what_if_options(CLI::App* c, WhatIfOptions& o, bool pack_options) {
  for (const auto& p : sim::what_if_parameters()) {
    const std::string name = p.name;
    c->add_option_function<double>(
         "--" + name, [&o, name](double v) { o.numbers[name] = v; },
         "what-if: " + p.description + " in place of the profile's " + p.json_field)
        ->check(number_in(p.range))
        ->group("What-if");
  }
  c->add_option("--drive", o.drive, "what-if: this drive file in place of the profile's")
      ->check(CLI::ExistingFile)->group("What-if");
  c->add_option("--airframe", o.airframe, "what-if: this airframe file in place of the profile's (its payload_kg too)")
      ->check(CLI::ExistingFile)->group("What-if");
  if (pack_options) {
    c->add_option("--pack-layout", o.pack_layout, "what-if: the pack's cells as SxP, e.g. 6S2P (same cell, wiring, SoH)")
        ->group("What-if");
    c->add_option("--cell", o.cell, "what-if: build the pack from this cell file (its layout kept unless --pack-layout)")
        ->check(CLI::ExistingFile)->group("What-if");
  }
}

std::pair<int, int> parse_pack_layout(const std::string& word) {
  static const std::regex re("([0-9]{1,4})[sS]([0-9]{1,4})[pP]");
  std::smatch mt;
  if (std::regex_match(word, mt, re)) {
    const int s = std::stoi(mt[1]), p = std::stoi(mt[2]);
    if (s >= 1 && s <= 1000 && p >= 1 && p <= 1000) return {s, p};
  }
  // The same bounds as the pack loader's series and parallel (io/battery_json.cpp).
  throw UsageError("--pack-layout: not a pack layout (got " + printable(word.substr(0, 40)) +
                   ", expected SxP such as 4S2P with S and P from 1 to 1000)");
}

std::vector<sim::Override> apply_what_if(sim::Mission& m, const WhatIfOptions& o) {
  std::vector<sim::Override> out;
  if (!o.airframe.empty()) {
    m.airframe = io::load_airframe_file(o.airframe);
    out.push_back({"airframe", o.airframe, "airframe", "the whole airframe file, its payload_kg included"});
  }
  if (!o.drive.empty()) {
    m.drive = io::load_drive_file(o.drive);
    out.push_back({"drive", o.drive, "drive", ""});
  }
  if (!o.cell.empty()) {
    m.pack.cell = io::load_cell_file(o.cell);
    m.pack.name.clear();
    out.push_back({"cell", o.cell, "pack/cell", "the pack's layout, wiring, SoH, charge and temperature kept"});
  }
  if (!o.pack_layout.empty()) {
    const auto [s, p] = parse_pack_layout(o.pack_layout);
    m.pack.series = s;
    m.pack.parallel = p;
    m.pack.name.clear();
    out.push_back({"pack-layout", m.pack.layout(), "pack/series, pack/parallel",
                   "the same cell, wiring resistance, SoH, charge and temperature"});
  }
  // Elevation before temperature: a given air temperature is then the field's, as in a profile.
  for (const std::string name : {"field-elevation-m"}) {
    if (const auto it = o.numbers.find(name); it != o.numbers.end()) sim::set_what_if(m, name, it->second);
  }
  for (const auto& p : sim::what_if_parameters()) {
    const auto it = o.numbers.find(p.name);
    if (it == o.numbers.end()) continue;
    if (p.name != "field-elevation-m") sim::set_what_if(m, p.name, it->second);
    out.push_back({p.name, format_number(it->second), p.json_field,
                   p.name == "field-elevation-m" ? "the field's air temperature held, the ISA offset recomputed" : ""});
  }
  return out;
}

}  // namespace sortie::cli
