// Writing results: a temporary file renamed into place, and a batch that makes every file of a
// command appear together or not at all.
#include "io/output.hpp"

#include <doctest/doctest.h>

#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <csignal>
#include <filesystem>
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
    CHECK_FALSE(test::file_exists(a));
    CHECK_FALSE(test::file_exists(b));
    batch.commit();
  }
  CHECK(test::read_file(a) == "a\n");
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

namespace {

/// Files of the writer's temporary pattern left in `dir`.
int temporaries_in(const std::string& dir) {
  int n = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir))
    if (e.path().filename().string().rfind(".sortie-", 0) == 0) ++n;
  return n;
}

}  // namespace

TEST_CASE("write_output: a symbolic link is written through — the link stays and its target gets the content") {
  const std::string target = test::write_work_file("link-target.txt", "old\n");
  const std::string link = test::work_path("link.txt");
  std::filesystem::create_symlink(target, link);
  io::write_output(link, "new\n");
  CHECK(std::filesystem::is_symlink(link));
  CHECK(std::filesystem::read_symlink(link) == target);
  CHECK(test::read_file(target) == "new\n");
}

TEST_CASE("write_output: an existing file keeps its permission bits and a new one follows the umask") {
  const std::string p = test::write_work_file("mode-kept.txt", "old\n");
  REQUIRE(::chmod(p.c_str(), 0640) == 0);
  io::write_output(p, "new\n");
  struct stat st {};
  REQUIRE(::stat(p.c_str(), &st) == 0);
  CHECK((st.st_mode & 07777) == 0640);
  const std::string fresh = test::work_path("mode-new.txt");
  const mode_t mask = ::umask(022);
  io::write_output(fresh, "x\n");
  ::umask(mask);
  REQUIRE(::stat(fresh.c_str(), &st) == 0);
  CHECK((st.st_mode & 07777) == (0666 & ~022));  // what open(2) with 0666 under umask 022 gives
}

TEST_CASE("write_output: devices and FIFOs and folders are refused and stay what they were") {
  CHECK_THROWS_WITH_AS(io::write_output("/dev/null", "x"),
                       "/dev/null: not a regular file (got a character device, expected a regular file, or - for standard output)",
                       InputError);
  struct stat st {};
  REQUIRE(::stat("/dev/null", &st) == 0);
  CHECK(S_ISCHR(st.st_mode));
  const std::string fifo = test::work_path("a-fifo");
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  CHECK_THROWS_AS(io::write_output(fifo, "x"), InputError);
  CHECK_THROWS_AS(io::write_output(test::work_dir(), "x"), InputError);
  CHECK(temporaries_in(test::work_dir()) == 0);
}

TEST_CASE("write_output: a name near the 255-byte limit works (the temporary's name is short)") {
  const std::string p = test::work_path(std::string(250, 'n') + ".json");
  io::write_output(p, "{}\n");
  CHECK(test::read_file(p) == "{}\n");
  std::filesystem::remove(p);
}

TEST_CASE("output batch: the same file twice or an input of the run is refused") {
  const std::string in = test::write_work_file("batch-input.csv", "time_s\n");
  const std::string out = test::work_path("batch-out.json");
  {
    io::OutputBatch batch;
    io::note_input(in);
    const std::string onto_input =
        in + ": the output is an input of this run (got the same file as " + in + ", expected another path)";
    CHECK_THROWS_WITH_AS(io::write_output(in, "x"), onto_input.c_str(), InputError);
    io::write_output(out, "1\n");
    const std::string twice =
        out + ": written twice in this run (got the same file as the output " + out + ", expected another path)";
    CHECK_THROWS_WITH_AS(io::write_output(out, "2\n"), twice.c_str(), InputError);
  }
  CHECK(test::read_file(in) == "time_s\n");
  CHECK_FALSE(test::file_exists(out));
  CHECK(io::open_temporaries() == 0);
}

TEST_CASE("output batch: SIGTERM while files wait for commit removes every temporary and then ends the process by it") {
  // A child writes two files into a batch and is killed before the commit; the parent then finds
  // no output and no temporary in the folder.
  const std::string dir = test::work_dir() + "/sigterm";
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  const pid_t pid = ::fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    io::OutputBatch batch;
    io::write_output(dir + "/a.json", "a\n");
    io::write_output(dir + "/b.csv", "b\n");
    ::kill(::getpid(), SIGTERM);
    ::_exit(0);  // not reached when the handler re-raises
  }
  int status = 0;
  REQUIRE(::waitpid(pid, &status, 0) == pid);
  CHECK(WIFSIGNALED(status));
  if (WIFSIGNALED(status)) CHECK(WTERMSIG(status) == SIGTERM);
  CHECK(temporaries_in(dir) == 0);
  CHECK_FALSE(test::file_exists(dir + "/a.json"));
  CHECK_FALSE(test::file_exists(dir + "/b.csv"));
}

}  // TEST_SUITE
