#include <doctest/doctest.h>
#include <sqlite3.h>
#include <fcntl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <cstdio>
#include <fstream>
#include <string>

#include "core/error.hpp"
#include "logbook/logbook.hpp"
#include "support/cli.hpp"

using namespace sortie;
using namespace sortie::logbook;

namespace {

PackRecord demo_pack() {
  PackRecord p;
  p.name = "field pack A";
  p.serial = "A-001";
  p.cell_note = "demo LiPo 5000 (invented)";
  p.series = 4;
  p.parallel = 1;
  p.first_use = "2026-11-01";
  p.pack_path = "/nowhere/pack.json";
  p.pack_sha256 = std::string(64, 'a');
  p.pack_json = "{}";
  return p;
}

FlightRecord demo_flight(std::int64_t pack_id, const std::string& hash, const std::string& date = "2026-11-02") {
  FlightRecord f;
  f.pack_id = pack_id;
  f.date = date;
  f.profile_path = "p.json";
  f.log_path = "log.csv";
  f.log_sha256 = hash;
  f.flight_time_s = 600.0;
  f.energy_Wh = 50.0;
  f.charge_Ah = 3.2;
  f.soc_land_counted = 0.3;
  f.soc_land_voltage = 0.31;
  f.v_rmse_V = 0.05;
  f.replay_rmse_V = 0.02;
  f.station_left_s = 120.0;
  return f;
}

std::int64_t sql_int(const std::string& path, const std::string& sql) {
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK);
  sqlite3_stmt* st = nullptr;
  REQUIRE(sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) == SQLITE_OK);
  std::int64_t v = -1;
  if (sqlite3_step(st) == SQLITE_ROW) v = sqlite3_column_int64(st, 0);
  sqlite3_finalize(st);
  sqlite3_close(db);
  return v;
}

void sql_exec(const std::string& path, const std::string& sql) {
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open(path.c_str(), &db) == SQLITE_OK);
  REQUIRE(sqlite3_exec(db, sql.c_str(), nullptr, nullptr, nullptr) == SQLITE_OK);
  sqlite3_close(db);
}

std::string error_of(const std::string& path, bool writable) {
  try {
    Database db(path, writable);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

}  // namespace

TEST_CASE("logbook: a new file gets the mark and the current schema and foreign keys") {
  const std::string path = test::work_path("lb-new.sqlite");
  {
    Database db(path, true);
    CHECK(db.schema_version() == kSchemaVersion);
    const auto id = db.add_pack(demo_pack());
    CHECK(id == 1);
    const auto fid = db.add_flight(demo_flight(id, std::string(64, '1')));
    CHECK(fid == 1);
    // A flight of a pack that is not there is refused (by our check, and by the foreign key).
    CHECK_THROWS_AS(db.add_flight(demo_flight(99, std::string(64, '2'))), InputError);
    const auto p = db.pack(id);
    REQUIRE(p);
    CHECK(p->serial == "A-001");
    CHECK(p->series == 4);
    CHECK_FALSE(p->added_utc.empty());
    const auto fl = db.flights(id);
    REQUIRE(fl.size() == 1);
    CHECK(fl[0].charge_Ah == doctest::Approx(3.2));
    REQUIRE(fl[0].replay_rmse_V);
    CHECK(*fl[0].replay_rmse_V == doctest::Approx(0.02));
  }
  CHECK(sql_int(path, "PRAGMA application_id") == kApplicationId);
  CHECK(sql_int(path, "PRAGMA user_version") == kSchemaVersion);
  // The foreign key is declared: SQLite itself refuses an orphan flight with foreign_keys on.
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open(path.c_str(), &db) == SQLITE_OK);
  sqlite3_exec(db, "PRAGMA foreign_keys = ON", nullptr, nullptr, nullptr);
  const int rc = sqlite3_exec(db,
                              "INSERT INTO flights (pack_id, date, profile_path, log_path, log_sha256, flight_time_s, "
                              "energy_Wh, charge_Ah, soc_land_counted, soc_land_voltage, v_rmse_V, station_left_s) "
                              "VALUES (42, 'd', 'p', 'l', 'h', 1, 1, 1, 1, 1, 1, 1)",
                              nullptr, nullptr, nullptr);
  CHECK(rc == SQLITE_CONSTRAINT);
  sqlite3_close(db);
}

TEST_CASE("logbook: the same log hash twice is refused naming the flight that has it") {
  const std::string path = test::work_path("lb-dup.sqlite");
  Database db(path, true);
  const auto id = db.add_pack(demo_pack());
  db.add_flight(demo_flight(id, std::string(64, 'c')));
  try {
    db.add_flight(demo_flight(id, std::string(64, 'c')));
    FAIL("no error");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("already in the logbook") != std::string::npos);
    CHECK(std::string(e.what()).find("flight 1") != std::string::npos);
  }
  CHECK(db.flights(id).size() == 1);
}

TEST_CASE("logbook: a v1 database migrates to the current schema with its rows kept") {
  const std::string path = test::work_path("lb-v1.sqlite");
  create_at_version(path, 1);
  CHECK(sql_int(path, "PRAGMA user_version") == 1);
  CHECK(sql_int(path, "SELECT count(*) FROM sqlite_master WHERE name = 'estimates'") == 0);
  sql_exec(path,
           "INSERT INTO packs (name, series, parallel, first_use, pack_path, pack_sha256, pack_json) "
           "VALUES ('old', 6, 2, '2025-01-01', '/x.json', 'h', '{}');"
           "INSERT INTO flights (pack_id, date, profile_path, log_path, log_sha256, flight_time_s, energy_Wh, charge_Ah, "
           "soc_land_counted, soc_land_voltage, v_rmse_V, station_left_s) "
           "VALUES (1, '2025-01-02', 'p', 'l', 'hh', 500, 40, 3, 0.4, 0.41, 0.06, 90)");
  // A read-only open of an older schema is refused, and leaves it at version 1.
  CHECK(error_of(path, false).find("older than this sortie") != std::string::npos);
  CHECK(sql_int(path, "PRAGMA user_version") == 1);
  {
    Database db(path, true);
    CHECK(db.schema_version() == kSchemaVersion);
    const auto fl = db.flights(1);
    REQUIRE(fl.size() == 1);
    CHECK(fl[0].flight_time_s == 500.0);
    CHECK_FALSE(fl[0].replay_rmse_V);  // the v2 column is NULL for the old row, not a made-up 0
    EstimateRecord e;
    e.pack_id = 1;
    e.flight_ids = {1};
    e.cycle = 1;
    e.capacity = 0.95;
    e.capacity_sd = 0.01;
    e.resistance = 1.1;
    e.resistance_sd = 0.02;
    e.method = "test";
    e.date = "2025-01-02";
    db.add_estimate(e);
    const auto got = db.latest_estimate(1);
    REQUIRE(got);
    CHECK(got->flight_ids == std::vector<std::int64_t>{1});
  }
  CHECK(sql_int(path, "PRAGMA user_version") == kSchemaVersion);
  CHECK(sql_int(path, "SELECT count(*) FROM packs") == 1);
}

namespace {
std::string bytes_of(const std::string& path) { return test::read_file(path); }
}  // namespace

TEST_CASE("logbook: a foreign SQLite database is refused and left byte for byte as it was") {
  const std::string path = test::work_path("lb-foreign.sqlite");
  sql_exec(path, "CREATE TABLE notes (t TEXT); INSERT INTO notes VALUES ('hello'); PRAGMA application_id = 1234;");
  const std::string before = bytes_of(path);
  for (bool writable : {true, false}) {
    const std::string err = error_of(path, writable);
    CHECK(err.find(path + ": not a sortie logbook (got application_id 0x4d2, expected 0x5352544c)") == 0);
    CHECK(err.find('\n') == std::string::npos);
  }
  CHECK(bytes_of(path) == before);
  // Application id 0 with tables in it is someone else's too.
  const std::string path0 = test::work_path("lb-foreign0.sqlite");
  sql_exec(path0, "CREATE TABLE notes (t TEXT);");
  const std::string before0 = bytes_of(path0);
  CHECK(error_of(path0, true).find("not a sortie logbook (got application_id 0x0") != std::string::npos);
  CHECK(bytes_of(path0) == before0);
  CHECK_FALSE(std::filesystem::exists(path0 + "-journal"));
}

TEST_CASE("logbook: a file that is not SQLite or a truncated logbook is refused in one line and not changed") {
  const std::string text = test::write_work_file("lb-text.sqlite", "time_s,voltage_V\n0,16.8\n");
  const std::string before = bytes_of(text);
  const std::string err = error_of(text, true);
  CHECK(err.find("not an SQLite database") != std::string::npos);
  CHECK(err.find('\n') == std::string::npos);
  CHECK(bytes_of(text) == before);

  const std::string full = test::work_path("lb-full.sqlite");
  {
    Database db(full, true);
    const auto id = db.add_pack(demo_pack());
    for (int i = 0; i < 200; ++i) db.add_flight(demo_flight(id, std::to_string(i)));
  }
  const std::string whole = bytes_of(full);
  REQUIRE(whole.size() > 8192);
  const std::string cut = test::write_work_file("lb-cut.sqlite", whole.substr(0, whole.size() / 2));
  const std::string cut_before = bytes_of(cut);
  for (bool writable : {true, false}) {
    const std::string e = error_of(cut, writable);
    CHECK(e.find(cut + ": truncated SQLite database (got ") == 0);
  }
  CHECK(bytes_of(cut) == cut_before);

  const std::string tiny = test::write_work_file("lb-tiny.sqlite", whole.substr(0, 40));
  CHECK(error_of(tiny, true).find("truncated SQLite database") != std::string::npos);
  CHECK(bytes_of(tiny) == whole.substr(0, 40));

  // The header intact but the pages after it overwritten: SQLite's own check finds it.
  std::string scrambled = whole;
  for (std::size_t i = 4096; i < scrambled.size(); ++i) scrambled[i] = static_cast<char>((i * 131) & 0xff);
  const std::string bad = test::write_work_file("lb-scrambled.sqlite", scrambled);
  const std::string e = error_of(bad, true);
  CHECK(e.find("corrupt") != std::string::npos);
  CHECK(e.find('\n') == std::string::npos);
  CHECK(bytes_of(bad) == scrambled);

  // A missing file is not created by a read-only open.
  const std::string missing = test::work_path("lb-missing.sqlite");
  CHECK(error_of(missing, false).find("no logbook here") != std::string::npos);
  CHECK_FALSE(std::filesystem::exists(missing));
}

TEST_CASE("logbook: two processes writing at once leave every row and no error") {
  const std::string path = test::work_path("lb-two.sqlite");
  std::int64_t pack_id = 0;
  {
    Database db(path, true);
    pack_id = db.add_pack(demo_pack());
  }
  constexpr int kEach = 400;
  int go[2];
  REQUIRE(pipe(go) == 0);
  const pid_t child = fork();
  REQUIRE(child >= 0);
  const char* who = child == 0 ? "child" : "parent";
  int failures = 0;
  try {
    // Each process opens its own connection, as two sortie runs would, and both start writing
    // when the parent closes the pipe.
    Database db(path, true);
    char byte = 0;
    if (child == 0) {
      close(go[1]);
      (void)!read(go[0], &byte, 1);
    } else {
      close(go[0]);
      close(go[1]);
    }
    for (int i = 0; i < kEach; ++i) {
      const std::string hash = std::string(who) + "-" + std::to_string(i);
      if (i % 10 == 0) {
        EstimateRecord e;
        e.pack_id = pack_id;
        e.capacity = 1.0;
        e.resistance = 1.0;
        e.method = "test";
        e.date = "2026-11-02";
        db.add_flight_with_estimate(demo_flight(pack_id, hash), e);
      } else {
        db.add_flight(demo_flight(pack_id, hash));
      }
    }
  } catch (const std::exception& e) {
    if (child == 0) std::fprintf(stderr, "child: %s\n", e.what());
    ++failures;
  }
  if (child == 0) _exit(failures == 0 ? 0 : 1);
  int status = 0;
  REQUIRE(waitpid(child, &status, 0) == child);
  CHECK(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 0);
  CHECK(failures == 0);
  CHECK(sql_int(path, "SELECT count(*) FROM flights") == 2 * kEach);
  CHECK(sql_int(path, "SELECT count(*) FROM flights WHERE log_sha256 LIKE 'child-%'") == kEach);
  CHECK(sql_int(path, "SELECT count(*) FROM estimates") == 2 * kEach / 10);
  // Each estimate's cycle is the flight count under the write lock: all distinct.
  CHECK(sql_int(path, "SELECT count(DISTINCT cycle) FROM estimates") == 2 * kEach / 10);
}

TEST_CASE("logbook: a file mid-commit under another process's lock is waited for and not called truncated") {
  // While a writer commits, the header may already name pages not yet on disk. The child stands
  // for that writer: it takes SQLite's exclusive lock, makes the header name 8 more pages than
  // the file holds, waits, puts the header back and lets go. An opener that compares the length
  // with the header without the shared lock refuses a good file; one that reads under the lock
  // waits (busy timeout) and opens it.
  const std::string path = test::work_path("lb-mid-commit.sqlite");
  {
    Database db(path, true);
    db.add_pack(demo_pack());
  }
  const std::string before = bytes_of(path);
  REQUIRE(before.size() >= 100);
  int ready[2];
  REQUIRE(pipe(ready) == 0);
  const pid_t child = fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    close(ready[0]);
    sqlite3* db = nullptr;
    int rc = sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READWRITE, nullptr);
    rc |= sqlite3_exec(db, "BEGIN EXCLUSIVE", nullptr, nullptr, nullptr);
    std::string grown = before.substr(0, 100);
    std::uint32_t pages = 0;
    for (int k = 0; k < 4; ++k) pages = (pages << 8) | static_cast<unsigned char>(grown[28 + k]);
    pages += 8;
    for (int k = 3; k >= 0; --k, pages >>= 8) grown[28 + k] = static_cast<char>(pages & 0xff);
    // Written through a descriptor kept open until the lock is let go:
    // closing any descriptor of the file drops this process's POSIX locks, SQLite's included.
    const int fd = open(path.c_str(), O_RDWR);
    auto put_header = [&](const std::string& h) { rc |= pwrite(fd, h.data(), h.size(), 0) == 100 ? 0 : 1; };
    put_header(grown);
    (void)!write(ready[1], "x", 1);
    close(ready[1]);
    usleep(300000);
    put_header(before.substr(0, 100));
    rc |= sqlite3_exec(db, "ROLLBACK", nullptr, nullptr, nullptr);
    sqlite3_close(db);
    close(fd);
    _exit(rc == SQLITE_OK ? 0 : 1);
  }
  close(ready[1]);
  char byte = 0;
  REQUIRE(read(ready[0], &byte, 1) == 1);
  close(ready[0]);
  std::string refusal;
  int packs = 0;
  try {
    Database db(path, false);
    packs = static_cast<int>(db.packs().size());
  } catch (const std::exception& e) {
    refusal = e.what();
  }
  int status = 0;
  REQUIRE(waitpid(child, &status, 0) == child);
  CHECK(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 0);
  CHECK(refusal == "");
  CHECK(packs == 1);
  CHECK(bytes_of(path) == before);
}
