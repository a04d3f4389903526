#pragma once
/// A pack taken from the logbook (`fly`/`compare --logbook DB --pack-id ID`, `logbook add-flight`):
/// the pack file's text as stored at add-pack, with the latest state-of-health estimate set in
/// its soh block, and the override line that says so.
#include <cstdint>
#include <optional>
#include <string>

#include "battery/pack.hpp"
#include "logbook/logbook.hpp"
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

}  // namespace sortie::cli
