#include "logbook/logbook.hpp"

#include <sqlite3.h>

#include <array>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/error.hpp"

namespace sortie::logbook {

namespace {

namespace fs = std::filesystem;

[[noreturn]] void fail(const std::string& path, const std::string& what) {
  throw InputError(path + ": " + what);
}

/// The sqlite3 handle, closed on every path out.
class Connection {
 public:
  Connection(const std::string& path, int flags) {
    const int rc = sqlite3_open_v2(path.c_str(), &db_, flags | SQLITE_OPEN_NOMUTEX, nullptr);
    if (rc != SQLITE_OK) {
      const std::string msg = db_ ? sqlite3_errmsg(db_) : sqlite3_errstr(rc);
      sqlite3_close(db_);
      db_ = nullptr;
      fail(path, "cannot open the logbook (" + msg + ")");
    }
    sqlite3_extended_result_codes(db_, 1);
  }
  ~Connection() { sqlite3_close(db_); }
  Connection(const Connection&) = delete;
  Connection& operator=(const Connection&) = delete;
  sqlite3* get() const { return db_; }

 private:
  sqlite3* db_ = nullptr;
};

/// A prepared statement, finalized on every path out; binds by position from 1.
class Statement {
 public:
  Statement(sqlite3* db, const std::string& path, const char* sql) : db_(db), path_(path) {
    if (sqlite3_prepare_v2(db, sql, -1, &st_, nullptr) != SQLITE_OK) error("prepare");
  }
  ~Statement() { sqlite3_finalize(st_); }
  Statement(const Statement&) = delete;
  Statement& operator=(const Statement&) = delete;

  Statement& bind(int i, const std::string& v) {
    check(sqlite3_bind_text(st_, i, v.c_str(), static_cast<int>(v.size()), SQLITE_TRANSIENT));
    return *this;
  }
  Statement& bind(int i, double v) { check(sqlite3_bind_double(st_, i, v)); return *this; }
  Statement& bind(int i, std::int64_t v) { check(sqlite3_bind_int64(st_, i, v)); return *this; }
  Statement& bind(int i, int v) { check(sqlite3_bind_int(st_, i, v)); return *this; }
  Statement& bind(int i, const std::optional<double>& v) {
    check(v ? sqlite3_bind_double(st_, i, *v) : sqlite3_bind_null(st_, i));
    return *this;
  }
  /// true: a row is ready; false: done.
  bool step() {
    const int rc = sqlite3_step(st_);
    if (rc == SQLITE_ROW) return true;
    if (rc == SQLITE_DONE) return false;
    error("step");
  }
  void run() { while (step()) {} }
  std::int64_t integer(int c) const { return sqlite3_column_int64(st_, c); }
  double real(int c) const { return sqlite3_column_double(st_, c); }
  std::optional<double> maybe_real(int c) const {
    if (sqlite3_column_type(st_, c) == SQLITE_NULL) return std::nullopt;
    return real(c);
  }
  std::string text(int c) const {
    const auto* p = sqlite3_column_text(st_, c);
    return p ? std::string(reinterpret_cast<const char*>(p), sqlite3_column_bytes(st_, c)) : std::string();
  }

 private:
  void check(int rc) { if (rc != SQLITE_OK) error("bind"); }
  [[noreturn]] void error(const char* stage) {
    fail(path_, std::string("database ") + stage + " failed (" + sqlite3_errmsg(db_) + ")");
  }
  sqlite3* db_;
  std::string path_;
  sqlite3_stmt* st_ = nullptr;
};

void exec(sqlite3* db, const std::string& path, const char* sql) {
  char* err = nullptr;
  if (sqlite3_exec(db, sql, nullptr, nullptr, &err) != SQLITE_OK) {
    const std::string msg = err ? err : sqlite3_errmsg(db);
    sqlite3_free(err);
    fail(path, std::string("database statement failed (") + msg + ")");
  }
}

std::int64_t pragma_int(sqlite3* db, const std::string& path, const char* sql) {
  Statement s(db, path, sql);
  return s.step() ? s.integer(0) : 0;
}

/// BEGIN IMMEDIATE ... COMMIT; rolled back when left by an exception.
class Transaction {
 public:
  Transaction(sqlite3* db, const std::string& path) : db_(db), path_(path) { exec(db, path, "BEGIN IMMEDIATE"); }
  ~Transaction() {
    if (!done_) sqlite3_exec(db_, "ROLLBACK", nullptr, nullptr, nullptr);
  }
  void commit() { exec(db_, path_, "COMMIT"); done_ = true; }

 private:
  sqlite3* db_;
  std::string path_;
  bool done_ = false;
};

/// Ordered migrations: migrations[k] takes schema k to k + 1. Never edit one that has shipped;
/// add the next.
const std::array<const char*, kSchemaVersion> kMigrations = {
    // 0 → 1: packs and flights.
    R"sql(
CREATE TABLE packs (
  id INTEGER PRIMARY KEY,
  name TEXT NOT NULL,
  serial TEXT NOT NULL DEFAULT '',
  cell_note TEXT NOT NULL DEFAULT '',
  series INTEGER NOT NULL CHECK (series >= 1),
  parallel INTEGER NOT NULL CHECK (parallel >= 1),
  first_use TEXT NOT NULL,
  pack_path TEXT NOT NULL,
  pack_sha256 TEXT NOT NULL,
  pack_json TEXT NOT NULL,
  added_utc TEXT NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%SZ', 'now'))
);
CREATE TABLE flights (
  id INTEGER PRIMARY KEY,
  pack_id INTEGER NOT NULL REFERENCES packs(id),
  date TEXT NOT NULL,
  profile_path TEXT NOT NULL,
  log_path TEXT NOT NULL,
  log_sha256 TEXT NOT NULL UNIQUE,
  flight_time_s REAL NOT NULL,
  energy_Wh REAL NOT NULL,
  charge_Ah REAL NOT NULL,
  soc_land_counted REAL NOT NULL,
  soc_land_voltage REAL NOT NULL,
  v_rmse_V REAL NOT NULL,
  station_left_s REAL NOT NULL,
  added_utc TEXT NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%SZ', 'now'))
);
CREATE INDEX flights_by_pack ON flights(pack_id);
)sql",
    // 1 → 2: the replay's voltage error per flight (NULL for flights logged before), and the
    // state-of-health estimates with the flights each was made from.
    R"sql(
ALTER TABLE flights ADD COLUMN replay_rmse_V REAL;
CREATE TABLE estimates (
  id INTEGER PRIMARY KEY,
  pack_id INTEGER NOT NULL REFERENCES packs(id),
  cycle INTEGER NOT NULL CHECK (cycle >= 0),
  capacity REAL NOT NULL,
  capacity_sd REAL NOT NULL,
  resistance REAL NOT NULL,
  resistance_sd REAL NOT NULL,
  method TEXT NOT NULL,
  date TEXT NOT NULL,
  added_utc TEXT NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%SZ', 'now'))
);
CREATE TABLE estimate_flights (
  estimate_id INTEGER NOT NULL REFERENCES estimates(id),
  flight_id INTEGER NOT NULL REFERENCES flights(id),
  PRIMARY KEY (estimate_id, flight_id)
);
CREATE INDEX estimates_by_pack ON estimates(pack_id);
)sql"};

std::string hex32(std::int64_t v) {
  std::ostringstream o;
  o << "0x" << std::hex << (static_cast<std::uint64_t>(v) & 0xffffffffu);
  return o.str();
}

/// The file's first 100 bytes, read without SQLite (so nothing can write to it); `size` is the
/// file's length at the same moment.
struct Header {
  std::array<unsigned char, 100> bytes{};
  std::size_t got = 0;
  std::uintmax_t size = 0;
};

Header read_header(const std::string& path) {
  Header h;
  std::error_code ec;
  h.size = fs::file_size(path, ec);
  if (ec) fail(path, "cannot read the logbook (" + ec.message() + ")");
  std::ifstream in(path, std::ios::binary);
  if (!in) fail(path, "cannot read the logbook");
  in.read(reinterpret_cast<char*>(h.bytes.data()), h.bytes.size());
  h.got = static_cast<std::size_t>(in.gcount());
  return h;
}

/// Refuses a file that is not SQLite at all. The magic string never changes once written, so
/// this needs no lock.
void check_magic(const std::string& path) {
  const Header h = read_header(path);
  static const char magic[] = "SQLite format 3";  // and its terminating NUL: 16 bytes
  if (h.got < 16 || std::memcmp(h.bytes.data(), magic, 16) != 0)
    fail(path, "not an SQLite database (got a file of " + std::to_string(h.size) +
                   " bytes without the SQLite header, expected a sortie logbook)");
}

/// Why the file is shorter than its header's page count, or empty when it is not. The page
/// count and the length agree only while no writer is committing: call this with a shared lock
/// held (inside a read transaction), or a concurrent commit reads as a truncated file.
std::string truncation(const std::string& path) {
  const Header h = read_header(path);
  if (h.got < 100)
    return "truncated SQLite database (got " + std::to_string(h.size) + " bytes, expected at least the 100-byte header)";
  auto be = [&](int at, int n) {
    std::uint64_t v = 0;
    for (int i = 0; i < n; ++i) v = (v << 8) | h.bytes[at + i];
    return v;
  };
  std::uint64_t page = be(16, 2);
  if (page == 1) page = 65536;
  const std::uint64_t pages = be(28, 4);
  // The in-header page count is valid when the change counter equals version-valid-for
  // (SQLite file format, "1.3.7 In-header database size").
  if (be(24, 4) == be(92, 4) && pages > 0 && h.size < page * pages)
    return "truncated SQLite database (got " + std::to_string(h.size) + " bytes, expected " +
           std::to_string(page * pages) + " from its header)";
  return {};
}

/// Schema checks on a read-only connection: the mark, the version, the integrity.
/// Returns the user_version; `fresh` when the file is an empty SQLite database of nobody's.
int check_existing(const std::string& path, bool& fresh) {
  Connection c(path, SQLITE_OPEN_READONLY);
  sqlite3_busy_timeout(c.get(), 10000);
  std::int64_t app = 0, version = 0, objects = 0;
  try {
    // One read transaction: from its first read until COMMIT the shared lock keeps any writer
    // from changing the file, so its length, its header and quick_check all see one state.
    exec(c.get(), path, "BEGIN");
    try {
      objects = pragma_int(c.get(), path, "SELECT count(*) FROM sqlite_master");
    } catch (const InputError&) {
      if (const std::string why = truncation(path); !why.empty()) fail(path, why);
      throw;
    }
    if (const std::string why = truncation(path); !why.empty()) fail(path, why);
    app = pragma_int(c.get(), path, "PRAGMA application_id");
    version = pragma_int(c.get(), path, "PRAGMA user_version");
    Statement q(c.get(), path, "PRAGMA quick_check(1)");
    if (!q.step() || q.text(0) != "ok") {
      // SQLite's report spans lines ("*** in database main ***\nPage 7: ..."): one line here.
      std::string why = q.text(0);
      for (char& ch : why) if (ch == '\n' || ch == '\r') ch = ' ';
      if (why.size() > 160) why = why.substr(0, 160) + "...";
      fail(path, "corrupt SQLite database (quick_check: " + why + ")");
    }
    exec(c.get(), path, "COMMIT");
  } catch (const InputError& e) {
    const std::string what = e.what();
    if (what.find("quick_check") != std::string::npos || what.find("truncated") != std::string::npos) throw;
    fail(path, "corrupt or unreadable SQLite database (" + what.substr(path.size() + 2) + ")");
  }
  fresh = app == 0 && version == 0 && objects == 0;
  if (!fresh && app != kApplicationId)
    fail(path, "not a sortie logbook (got application_id " + hex32(app) + ", expected " + hex32(kApplicationId) + ")");
  if (version > kSchemaVersion)
    fail(path, "logbook schema is newer than this sortie (got version " + std::to_string(version) +
                   ", expected at most " + std::to_string(kSchemaVersion) + ")");
  return static_cast<int>(version);
}

/// Bring the schema to `target` inside one BEGIN IMMEDIATE transaction (re-reading the version
/// under the lock, so two processes opening the same file migrate it once).
void migrate(sqlite3* db, const std::string& path, int target) {
  Transaction t(db, path);
  const std::int64_t app = pragma_int(db, path, "PRAGMA application_id");
  const std::int64_t objects = pragma_int(db, path, "SELECT count(*) FROM sqlite_master");
  if (app == 0 && objects == 0) {
    exec(db, path, ("PRAGMA application_id = " + std::to_string(kApplicationId)).c_str());
  } else if (app != kApplicationId) {
    fail(path, "not a sortie logbook (got application_id " + hex32(app) + ", expected " + hex32(kApplicationId) + ")");
  }
  int v = static_cast<int>(pragma_int(db, path, "PRAGMA user_version"));
  if (v > kSchemaVersion)
    fail(path, "logbook schema is newer than this sortie (got version " + std::to_string(v) +
                   ", expected at most " + std::to_string(kSchemaVersion) + ")");
  for (; v < target; ++v) {
    exec(db, path, kMigrations[v]);
    exec(db, path, ("PRAGMA user_version = " + std::to_string(v + 1)).c_str());
  }
  t.commit();
}

}  // namespace

struct Database::Impl {
  Connection conn;
  Impl(const std::string& path, int flags) : conn(path, flags) {}
};

Database::Database(const std::string& path, bool writable, int busy_timeout_ms) : path_(path) {
  std::error_code ec;
  const bool exists = fs::exists(path, ec);
  const std::uintmax_t size = exists ? fs::file_size(path, ec) : 0;
  if (exists && ec) fail(path, "cannot read the logbook (" + ec.message() + ")");
  if (exists && !fs::is_regular_file(path)) fail(path, "not a regular file (expected a sortie logbook)");
  if (!writable && (!exists || size == 0))
    fail(path, "no logbook here (expected a file made by `sortie logbook FILE add-pack`)");
  int version = 0;
  if (exists && size > 0) {
    check_magic(path);
    bool fresh = false;
    version = check_existing(path, fresh);
  }
  impl_ = std::make_unique<Impl>(path, writable ? SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE : SQLITE_OPEN_READONLY);
  sqlite3* db = impl_->conn.get();
  sqlite3_busy_timeout(db, busy_timeout_ms);
  exec(db, path, "PRAGMA foreign_keys = ON");
  if (writable) {
    migrate(db, path, kSchemaVersion);
  } else if (version < kSchemaVersion) {
    fail(path, "logbook schema is older than this sortie (got version " + std::to_string(version) +
                   ", expected " + std::to_string(kSchemaVersion) + "; any writing command, such as add-pack, migrates it)");
  }
}

Database::~Database() = default;

int Database::schema_version() {
  return static_cast<int>(pragma_int(impl_->conn.get(), path_, "PRAGMA user_version"));
}

std::int64_t Database::add_pack(const PackRecord& p) {
  sqlite3* db = impl_->conn.get();
  Transaction t(db, path_);
  Statement s(db, path_,
              "INSERT INTO packs (name, serial, cell_note, series, parallel, first_use, pack_path, pack_sha256, pack_json) "
              "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)");
  s.bind(1, p.name).bind(2, p.serial).bind(3, p.cell_note).bind(4, p.series).bind(5, p.parallel);
  s.bind(6, p.first_use).bind(7, p.pack_path).bind(8, p.pack_sha256).bind(9, p.pack_json);
  s.run();
  const std::int64_t id = sqlite3_last_insert_rowid(db);
  t.commit();
  return id;
}

namespace {

std::int64_t insert_flight(sqlite3* db, const std::string& path, const FlightRecord& f) {
  {
    Statement dup(db, path, "SELECT id FROM flights WHERE log_sha256 = ?");
    dup.bind(1, f.log_sha256);
    if (dup.step())
      fail(f.log_path, "this log is already in the logbook " + path + " (got SHA-256 " + f.log_sha256 +
                           " of flight " + std::to_string(dup.integer(0)) + ", expected a log not added before)");
  }
  {
    Statement pk(db, path, "SELECT 1 FROM packs WHERE id = ?");
    pk.bind(1, f.pack_id);
    if (!pk.step()) fail(path, "no pack with id " + std::to_string(f.pack_id) + " (expected the id add-pack gave)");
  }
  Statement s(db, path,
              "INSERT INTO flights (pack_id, date, profile_path, log_path, log_sha256, flight_time_s, energy_Wh, "
              "charge_Ah, soc_land_counted, soc_land_voltage, v_rmse_V, station_left_s, replay_rmse_V) "
              "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)");
  s.bind(1, f.pack_id).bind(2, f.date).bind(3, f.profile_path).bind(4, f.log_path).bind(5, f.log_sha256);
  s.bind(6, f.flight_time_s).bind(7, f.energy_Wh).bind(8, f.charge_Ah).bind(9, f.soc_land_counted);
  s.bind(10, f.soc_land_voltage).bind(11, f.v_rmse_V).bind(12, f.station_left_s).bind(13, f.replay_rmse_V);
  s.run();
  return sqlite3_last_insert_rowid(db);
}

std::int64_t insert_estimate(sqlite3* db, const std::string& path, const EstimateRecord& e) {
  Statement s(db, path,
              "INSERT INTO estimates (pack_id, cycle, capacity, capacity_sd, resistance, resistance_sd, method, date) "
              "VALUES (?, ?, ?, ?, ?, ?, ?, ?)");
  s.bind(1, e.pack_id).bind(2, e.cycle).bind(3, e.capacity).bind(4, e.capacity_sd).bind(5, e.resistance);
  s.bind(6, e.resistance_sd).bind(7, e.method).bind(8, e.date);
  s.run();
  const std::int64_t id = sqlite3_last_insert_rowid(db);
  for (std::int64_t f : e.flight_ids) {
    Statement l(db, path, "INSERT INTO estimate_flights (estimate_id, flight_id) VALUES (?, ?)");
    l.bind(1, id).bind(2, f);
    l.run();
  }
  return id;
}

int flight_count(sqlite3* db, const std::string& path, std::int64_t pack_id) {
  Statement s(db, path, "SELECT count(*) FROM flights WHERE pack_id = ?");
  s.bind(1, pack_id);
  return s.step() ? static_cast<int>(s.integer(0)) : 0;
}

}  // namespace

std::int64_t Database::add_flight(const FlightRecord& f) {
  sqlite3* db = impl_->conn.get();
  Transaction t(db, path_);
  const std::int64_t id = insert_flight(db, path_, f);
  t.commit();
  return id;
}

std::int64_t Database::add_estimate(const EstimateRecord& e) {
  sqlite3* db = impl_->conn.get();
  Transaction t(db, path_);
  const std::int64_t id = insert_estimate(db, path_, e);
  t.commit();
  return id;
}

std::pair<std::int64_t, std::int64_t> Database::add_flight_with_estimate(const FlightRecord& f, EstimateRecord e) {
  sqlite3* db = impl_->conn.get();
  Transaction t(db, path_);
  const std::int64_t fid = insert_flight(db, path_, f);
  e.flight_ids.push_back(fid);
  // The cycle is the pack's flight count with this one, counted under the write lock.
  e.cycle = flight_count(db, path_, f.pack_id);
  const std::int64_t eid = insert_estimate(db, path_, e);
  t.commit();
  return {fid, eid};
}

namespace {

const char* kPackColumns =
    "SELECT id, name, serial, cell_note, series, parallel, first_use, pack_path, pack_sha256, pack_json, added_utc FROM packs";

PackRecord read_pack(const Statement& s) {
  PackRecord p;
  p.id = s.integer(0);
  p.name = s.text(1);
  p.serial = s.text(2);
  p.cell_note = s.text(3);
  p.series = static_cast<int>(s.integer(4));
  p.parallel = static_cast<int>(s.integer(5));
  p.first_use = s.text(6);
  p.pack_path = s.text(7);
  p.pack_sha256 = s.text(8);
  p.pack_json = s.text(9);
  p.added_utc = s.text(10);
  return p;
}

const char* kFlightColumns =
    "SELECT id, pack_id, date, profile_path, log_path, log_sha256, flight_time_s, energy_Wh, charge_Ah, "
    "soc_land_counted, soc_land_voltage, v_rmse_V, station_left_s, replay_rmse_V, added_utc FROM flights";

FlightRecord read_flight(const Statement& s) {
  FlightRecord f;
  f.id = s.integer(0);
  f.pack_id = s.integer(1);
  f.date = s.text(2);
  f.profile_path = s.text(3);
  f.log_path = s.text(4);
  f.log_sha256 = s.text(5);
  f.flight_time_s = s.real(6);
  f.energy_Wh = s.real(7);
  f.charge_Ah = s.real(8);
  f.soc_land_counted = s.real(9);
  f.soc_land_voltage = s.real(10);
  f.v_rmse_V = s.real(11);
  f.station_left_s = s.real(12);
  f.replay_rmse_V = s.maybe_real(13);
  f.added_utc = s.text(14);
  return f;
}

}  // namespace

std::optional<PackRecord> Database::pack(std::int64_t id) {
  Statement s(impl_->conn.get(), path_, (std::string(kPackColumns) + " WHERE id = ?").c_str());
  s.bind(1, id);
  if (!s.step()) return std::nullopt;
  return read_pack(s);
}

std::vector<PackRecord> Database::packs() {
  Statement s(impl_->conn.get(), path_, (std::string(kPackColumns) + " ORDER BY id").c_str());
  std::vector<PackRecord> out;
  while (s.step()) out.push_back(read_pack(s));
  return out;
}

std::vector<FlightRecord> Database::flights(std::int64_t pack_id) {
  Statement s(impl_->conn.get(), path_, (std::string(kFlightColumns) + " WHERE pack_id = ? ORDER BY date, id").c_str());
  s.bind(1, pack_id);
  std::vector<FlightRecord> out;
  while (s.step()) out.push_back(read_flight(s));
  return out;
}

std::optional<FlightRecord> Database::flight_by_hash(const std::string& sha256) {
  Statement s(impl_->conn.get(), path_, (std::string(kFlightColumns) + " WHERE log_sha256 = ?").c_str());
  s.bind(1, sha256);
  if (!s.step()) return std::nullopt;
  return read_flight(s);
}

std::vector<EstimateRecord> Database::estimates(std::int64_t pack_id) {
  sqlite3* db = impl_->conn.get();
  Statement s(db, path_,
              "SELECT id, pack_id, cycle, capacity, capacity_sd, resistance, resistance_sd, method, date, added_utc "
              "FROM estimates WHERE pack_id = ? ORDER BY cycle, id");
  s.bind(1, pack_id);
  std::vector<EstimateRecord> out;
  while (s.step()) {
    EstimateRecord e;
    e.id = s.integer(0);
    e.pack_id = s.integer(1);
    e.cycle = static_cast<int>(s.integer(2));
    e.capacity = s.real(3);
    e.capacity_sd = s.real(4);
    e.resistance = s.real(5);
    e.resistance_sd = s.real(6);
    e.method = s.text(7);
    e.date = s.text(8);
    e.added_utc = s.text(9);
    out.push_back(e);
  }
  for (EstimateRecord& e : out) {
    Statement l(db, path_, "SELECT flight_id FROM estimate_flights WHERE estimate_id = ? ORDER BY flight_id");
    l.bind(1, e.id);
    while (l.step()) e.flight_ids.push_back(l.integer(0));
  }
  return out;
}

std::optional<EstimateRecord> Database::latest_estimate(std::int64_t pack_id) {
  auto all = estimates(pack_id);
  if (all.empty()) return std::nullopt;
  return all.back();
}

void create_at_version(const std::string& path, int version) {
  if (fs::exists(path)) fail(path, "exists");
  Connection c(path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
  exec(c.get(), path, "PRAGMA foreign_keys = ON");
  migrate(c.get(), path, version);
}

}  // namespace sortie::logbook
