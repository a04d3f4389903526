#pragma once
/// The pack logbook: packs, their flights and the state-of-health estimates made from them, in
/// one SQLite file. Plain records in, plain records out; the SQLite C API stays in logbook.cpp.
///
/// File rules: a file that does not exist (or is empty) becomes a new logbook when opened for
/// writing; an existing file must be an SQLite database whose `PRAGMA application_id` is
/// kApplicationId, otherwise it is refused (InputError, one line) before anything is written —
/// a foreign database, a file that is not SQLite, or one shorter than its header says are never
/// changed. The schema version is `PRAGMA user_version`; migrations run in order, each in the
/// same BEGIN IMMEDIATE transaction as the version bump. Foreign keys are on; every write is one
/// BEGIN IMMEDIATE transaction; other writers are waited for up to busy_timeout_ms.
#include <cstdint>
#include <optional>
#include <memory>
#include <string>
#include <utility>
#include <vector>

namespace sortie::logbook {

/// "SRTL" as a big-endian 32-bit number: the mark of a sortie logbook.
inline constexpr std::int32_t kApplicationId = 0x5352544c;
/// The schema this build writes (see migrations in logbook.cpp).
inline constexpr int kSchemaVersion = 2;

struct PackRecord {
  std::int64_t id = 0;
  std::string name;          ///< the owner's name for the pack
  std::string serial;        ///< the owner's serial number or label (may be empty)
  std::string cell_note;     ///< the cell's name and chemistry, as the pack file gives them
  int series = 1, parallel = 1;
  std::string first_use;     ///< YYYY-MM-DD
  std::string pack_path;     ///< the pack file it was made from (absolute)
  std::string pack_sha256;   ///< of that file's bytes when added
  std::string pack_json;     ///< that file's text when added
  std::string added_utc;     ///< filled by the database
};

struct FlightRecord {
  std::int64_t id = 0, pack_id = 0;
  std::string date;          ///< YYYY-MM-DD of the flight
  std::string profile_path, log_path;
  std::string log_sha256;    ///< unique: the same log is not added twice
  double flight_time_s = 0.0, energy_Wh = 0.0, charge_Ah = 0.0;
  double soc_land_counted = 0.0, soc_land_voltage = 0.0;
  double v_rmse_V = 0.0;
  std::optional<double> replay_rmse_V;  ///< none for flights logged before schema 2
  double station_left_s = 0.0;  ///< the time on station really left at landing (check)
  std::string added_utc;
};

/// A state-of-health estimate from one flight or a set of flights of one pack.
struct EstimateRecord {
  std::int64_t id = 0, pack_id = 0;
  std::vector<std::int64_t> flight_ids;
  int cycle = 0;             ///< the pack's flight count in the logbook at the estimate
  double capacity = 0.0, capacity_sd = 0.0;      ///< soh capacity factor and its σ
  double resistance = 0.0, resistance_sd = 0.0;  ///< soh resistance factor and its σ
  std::string method;        ///< how it was made
  std::string date;          ///< the date of its latest flight, YYYY-MM-DD
  std::string added_utc;
};

class Database {
 public:
  /// Opens (and for `writable`, creates or migrates) the logbook at `path`. Throws InputError
  /// naming the file for a foreign, corrupt, newer-schema or (read-only) missing file.
  Database(const std::string& path, bool writable, int busy_timeout_ms = 10000);
  ~Database();
  Database(const Database&) = delete;
  Database& operator=(const Database&) = delete;

  const std::string& path() const { return path_; }
  int schema_version();

  std::int64_t add_pack(const PackRecord& p);
  /// Throws InputError when a flight with the same log hash is already in (naming its id).
  std::int64_t add_flight(const FlightRecord& f);
  std::int64_t add_estimate(const EstimateRecord& e);
  /// The flight and its estimate together, in one transaction; returns (flight id, estimate id).
  std::pair<std::int64_t, std::int64_t> add_flight_with_estimate(const FlightRecord& f, EstimateRecord e);

  std::optional<PackRecord> pack(std::int64_t id);
  std::vector<PackRecord> packs();
  std::vector<FlightRecord> flights(std::int64_t pack_id);
  std::optional<FlightRecord> flight_by_hash(const std::string& sha256);
  std::vector<EstimateRecord> estimates(std::int64_t pack_id);
  /// The pack's estimate with the highest cycle (then id), if any.
  std::optional<EstimateRecord> latest_estimate(std::int64_t pack_id);

  struct Impl;

 private:
  std::string path_;
  std::unique_ptr<Impl> impl_;
};

/// For tests: create `path` at schema version `version` exactly (migrations 1..version), as an
/// older build would have left it. Throws if the file exists.
void create_at_version(const std::string& path, int version);

}  // namespace sortie::logbook
