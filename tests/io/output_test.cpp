// Writing results: a temporary file renamed into place, and a batch that makes every file of a
// command appear together or not at all.
#include "io/output.hpp"

#include <doctest/doctest.h>

#include <stdexcept>
#include <string>

#include "core/error.hpp"
#include "support/cli.hpp"

using namespace sortie;

TEST_SUITE("io") {

TEST_CASE("write_output: without a batch the file is in place at once — with no temporary left") {
  const std::string p = test::work_path("out-alone.txt");
  io::write_output(p, "one\n");
  CHECK(test::read_file(p) == "one\n");
  CHECK_FALSE(test::file_exists(p + ".part"));
}

TEST_CASE("output batch: nothing appears until commit — then every file does") {
  const std::string a = test::work_path("out-a.txt"), b = test::work_path("out-b.txt");
  {
    io::OutputBatch batch;
    io::write_output(a, "a\n");
    io::write_output(b, "b\n");
    io::write_output(a, "a again\n");  // the same file twice: the last content stands
    CHECK_FALSE(test::file_exists(a));
    CHECK_FALSE(test::file_exists(b));
    batch.commit();
  }
  CHECK(test::read_file(a) == "a again\n");
  CHECK(test::read_file(b) == "b\n");
  CHECK_FALSE(test::file_exists(a + ".part"));
}

TEST_CASE("output batch: an error after the first file leaves no file and no temporary") {
  // A command that wrote its JSON and then failed on its trace used to leave the JSON behind.
  const std::string a = test::work_path("out-first.json");
  const std::string missing = test::work_dir() + "/no-such-folder/trace.csv";
  try {
    io::OutputBatch batch;
    io::write_output(a, "{}\n");
    io::write_output(missing, "t\n");
    batch.commit();
    FAIL("expected the write into a missing folder to fail");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("no-such-folder/trace.csv: cannot write the file") != std::string::npos);
  }
  CHECK_FALSE(test::file_exists(a));
  CHECK_FALSE(test::file_exists(a + ".part"));
}

}  // TEST_SUITE
