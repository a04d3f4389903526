#include "cli/logbook_pack.hpp"

#include <cstdio>
#include <filesystem>

#include "core/error.hpp"
#include "io/battery_json.hpp"
#include "io/json_reader.hpp"
#include "cli/number_option.hpp"

namespace sortie::cli {

namespace {
std::string f3(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.3f", v);
  return b;
}
}  // namespace

LogbookPack logbook_pack(logbook::Database& db, std::int64_t id, bool apply_soh) {
  LogbookPack out;
  const auto rec = db.pack(id);
  if (!rec)
    throw InputError(db.path() + ": no pack with id " + std::to_string(id) +
                     " (expected the id add-pack gave; `sortie logbook " + db.path() + " packs` lists them)");
  out.record = *rec;
  const std::filesystem::path pack_file(rec->pack_path);
  out.pack = io::parse_pack_json(rec->pack_json, io::Source{rec->pack_path + " (as stored in " + db.path() + ")",
                                                            pack_file.parent_path()});
  std::string note = "pack " + std::to_string(id) + " \"" + rec->name + "\"" +
                     (rec->serial.empty() ? "" : " serial " + rec->serial) + " from the logbook: its pack file as added";
  if (apply_soh) {
    out.estimate = db.latest_estimate(id);
    if (out.estimate) {
      out.pack.soh_capacity = out.estimate->capacity;
      out.pack.soh_resistance = out.estimate->resistance;
      note += ", SoH from the latest estimate (cycle " + std::to_string(out.estimate->cycle) + ", " + out.estimate->date +
              "): capacity " + f3(out.estimate->capacity) + " ± " + f3(out.estimate->capacity_sd) + ", resistance " +
              f3(out.estimate->resistance) + " ± " + f3(out.estimate->resistance_sd);
    } else {
      note += "; no SoH estimate in the logbook yet, so the pack file's soh block is kept (capacity " +
              f3(out.pack.soh_capacity) + ", resistance " + f3(out.pack.soh_resistance) + ")";
    }
  }
  out.override_line = {"pack-id", std::to_string(id) + " in " + db.path(), "pack (cells, layout, soh)", note};
  return out;
}

logbook::Database open_logbook(const std::string& path) {
  if (!std::filesystem::exists(path))
    throw InputError(path + ": no logbook here (expected a file made by `sortie logbook " + path + " add-pack`)");
  return logbook::Database(path, false);
}

void add_logbook_pack_options(CLI::App* c, std::string& logbook, std::int64_t& pack_id) {
  c->add_option("--logbook", logbook, "a pack logbook (sortie logbook): --pack-id takes the pack from it")
      ->check(CLI::ExistingFile);
  c->add_option("--pack-id", pack_id, "fly the logbook's pack ID (its cells and layout) with its latest SoH; listed as an override")
      ->check(whole_in(1, 2147483647));
}

std::vector<sim::Override> logbook_override(sim::Mission& m, const std::string& logbook, std::int64_t pack_id,
                                            bool has_pack_file) {
  if (logbook.empty() && pack_id == 0) return {};
  if (logbook.empty()) throw UsageError("--pack-id: needs --logbook");
  if (pack_id == 0) throw UsageError("--logbook: needs --pack-id");
  if (has_pack_file) throw UsageError("--pack-id: not with --pack (expected one pack)");
  logbook::Database db = open_logbook(logbook);
  const LogbookPack lb = logbook_pack(db, pack_id, true);
  m.pack = lb.pack;
  return {lb.override_line};
}

}  // namespace sortie::cli
