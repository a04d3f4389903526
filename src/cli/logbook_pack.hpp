#pragma once
/// A pack taken from the logbook (`fly`/`compare --logbook DB --pack-id ID`, `logbook add-flight`):
/// the pack file's text as stored at add-pack, with the latest state-of-health estimate set in
/// its soh block, and the override line that says so.
#include <CLI/CLI.hpp>
#include <cstdint>
#include <vector>
#include <optional>
#include <string>

#include "battery/pack.hpp"
#include "logbook/logbook.hpp"
#include "sim/mission.hpp"
#include "sim/what_if.hpp"

namespace sortie::cli {

struct LogbookPack {
  logbook::PackRecord record;
  battery::Pack pack;  ///< with the latest estimate's soh factors (when `apply_soh` and one exists)
  std::optional<logbook::EstimateRecord> estimate;
  sim::Override override_line;
};

/// The stored pack of `id`; its model paths (the cell) resolve beside the original pack file.
LogbookPack logbook_pack(logbook::Database& db, std::int64_t id, bool apply_soh);

/// The logbook at `path`, read-only; it must exist.
logbook::Database open_logbook(const std::string& path);

/// `--logbook DB --pack-id ID` of fly: registers both.
void add_logbook_pack_options(CLI::App* c, std::string& logbook, std::int64_t& pack_id);

/// Sets the logbook pack in `m` (when `logbook` is given) and returns its override line (empty
/// list otherwise). Usage errors: one without the other, or with --pack (`has_pack_file`).
std::vector<sim::Override> logbook_override(sim::Mission& m, const std::string& logbook, std::int64_t pack_id,
                                            bool has_pack_file);

}  // namespace sortie::cli
