#include "io/output.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <csignal>
#include <cstring>
#include <iostream>
#include <optional>

#include "core/error.hpp"

namespace sortie::io {

namespace {

// ---- temporaries the signal handler removes -------------------------------------------------
// A fixed table, because the handler may only touch plain memory and call async-signal-safe
// functions (unlink, sigaction, raise: POSIX.1-2017, System Interfaces 2.4.3).
constexpr std::size_t kSlots = 32;
constexpr std::size_t kPathBytes = 4096;
struct Slot {
  volatile std::sig_atomic_t used = 0;
  char path[kPathBytes] = {};
};
Slot g_slots[kSlots];

extern "C" void remove_temporaries_and_reraise(int sig) {
  for (auto& s : g_slots)
    if (s.used) ::unlink(s.path);
  // SA_RESETHAND put back the default action; the signal raised here is delivered when this
  // handler returns, so the process ends the way it would have without us.
  ::raise(sig);
}

void install_handlers_once() {
  static bool installed = false;
  if (installed) return;
  installed = true;
  for (int sig : {SIGINT, SIGTERM, SIGHUP}) {
    struct sigaction old {};
    if (::sigaction(sig, nullptr, &old) == 0 && old.sa_handler == SIG_IGN) continue;  // nohup, background
    struct sigaction sa {};
    sa.sa_handler = remove_temporaries_and_reraise;
    sigemptyset(&sa.sa_mask);
    sa.sa_flags = SA_RESETHAND;
    ::sigaction(sig, &sa, nullptr);
  }
}

/// Signals held back while the table changes, so the handler never sees half a path.
class BlockSignals {
 public:
  BlockSignals() {
    sigset_t s;
    sigemptyset(&s);
    sigaddset(&s, SIGINT);
    sigaddset(&s, SIGTERM);
    sigaddset(&s, SIGHUP);
    ::sigprocmask(SIG_BLOCK, &s, &old_);
  }
  ~BlockSignals() { ::sigprocmask(SIG_SETMASK, &old_, nullptr); }
  BlockSignals(const BlockSignals&) = delete;
  BlockSignals& operator=(const BlockSignals&) = delete;

 private:
  sigset_t old_;
};

void release_slot(const std::string& tmp) {
  BlockSignals block;
  for (auto& s : g_slots)
    if (s.used && tmp == s.path) {
      s.used = 0;
      return;
    }
}

/// Remove a temporary and forget it.
void drop_temporary(const std::string& tmp) {
  ::unlink(tmp.c_str());
  release_slot(tmp);
}

std::string errno_text(int e) { return std::strerror(e); }

// ---- what the run reads and writes -----------------------------------------------------------

struct FileId {
  dev_t dev = 0;
  ino_t ino = 0;
  bool operator==(const FileId& o) const { return dev == o.dev && ino == o.ino; }
};

struct NotedFile {
  std::string shown;                ///< as given
  std::filesystem::path canonical;  ///< links and ".." resolved, as far as the path exists
  std::optional<FileId> id;         ///< when the file exists
};

std::optional<FileId> file_id(const std::string& path) {
  struct stat st {};
  if (::stat(path.c_str(), &st) != 0) return std::nullopt;
  return FileId{st.st_dev, st.st_ino};
}

std::filesystem::path canonical_or_given(const std::filesystem::path& p) {
  std::error_code ec;
  auto c = std::filesystem::weakly_canonical(p, ec);
  return ec ? p : c;
}

bool same_file(const NotedFile& a, const NotedFile& b) {
  if (a.id && b.id) return *a.id == *b.id;
  return a.canonical == b.canonical;
}

/// The batch of the run and its files: the innermost open one.
OutputBatch* g_batch = nullptr;

struct RunFiles {
  std::vector<NotedFile> inputs, outputs;
};
// Kept beside the batch chain rather than in OutputBatch, so that the header stays plain; one
// entry per open batch, innermost last.
std::vector<RunFiles> g_run_files;

const char* kind_of(mode_t m) {
  if (S_ISDIR(m)) return "a directory";
  if (S_ISCHR(m)) return "a character device";
  if (S_ISBLK(m)) return "a block device";
  if (S_ISFIFO(m)) return "a FIFO (named pipe)";
  if (S_ISSOCK(m)) return "a socket";
  return "not a regular file";
}

mode_t new_file_mode() {
  // umask can only be read by setting it; the process is single-threaded here.
  const mode_t mask = ::umask(022);
  ::umask(mask);
  return 0666 & ~mask;
}

void write_all(int fd, const std::string& content, const std::string& shown, const std::string& what) {
  const char* p = content.data();
  std::size_t left = content.size();
  while (left > 0) {
    const ssize_t n = ::write(fd, p, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      throw InputError(shown + ": " + what + " (" + errno_text(errno) + ")");
    }
    p += n;
    left -= static_cast<std::size_t>(n);
  }
}

void write_stdout(const std::string& content) {
  std::cout.flush();
  if (!std::cout) throw InputError("standard output: cannot write");
  write_all(1, content, "standard output", "cannot write");
}

void rename_into_place(const std::string& tmp, const std::string& target, const std::string& shown) {
  if (::rename(tmp.c_str(), target.c_str()) != 0) {
    const int e = errno;
    drop_temporary(tmp);
    throw InputError(shown + ": cannot write the file (" + errno_text(e) + ")");
  }
  release_slot(tmp);
  // The rename itself lasts once the folder is on disk too (fsync(2), NOTES).
  const std::string dir = std::filesystem::path(target).parent_path().string();
  const int dfd = ::open(dir.empty() ? "." : dir.c_str(), O_RDONLY | O_DIRECTORY);
  if (dfd >= 0) {
    ::fsync(dfd);
    ::close(dfd);
  }
}

}  // namespace

void note_input(const std::filesystem::path& path) {
  if (g_run_files.empty()) return;  // no run open: nothing to protect
  g_run_files.back().inputs.push_back({path.string(), canonical_or_given(path), file_id(path.string())});
}

void write_output(const std::string& path, const std::string& content) {
  if (path == "-") {
    write_stdout(content);
    return;
  }
  if (path.empty()) throw InputError("an output path is empty (expected a file name, or - for standard output)");

  // A symbolic link is written through to its target, and stays a link.
  std::string target = path;
  struct stat lst {};
  if (::lstat(path.c_str(), &lst) == 0 && S_ISLNK(lst.st_mode)) {
    std::error_code ec;
    const auto t = std::filesystem::canonical(path, ec);
    if (ec) {
      std::error_code ec2;
      const auto to = std::filesystem::read_symlink(path, ec2);
      throw InputError(path + ": a symbolic link whose target cannot be reached (got a link to " +
                       (ec2 ? std::string("?") : to.string()) + ", expected a link to an existing file)");
    }
    target = t.string();
  }
  struct stat st {};
  const bool exists = ::stat(target.c_str(), &st) == 0;
  if (!exists && errno != ENOENT) throw InputError(path + ": cannot write the file (" + errno_text(errno) + ")");
  if (exists && !S_ISREG(st.st_mode))
    throw InputError(path + ": not a regular file (got " + kind_of(st.st_mode) +
                     ", expected a regular file, or - for standard output)");

  // Never onto an input of the run, nor twice onto one file.
  const NotedFile me{path, canonical_or_given(target),
                     exists ? std::optional<FileId>(FileId{st.st_dev, st.st_ino}) : std::nullopt};
  for (const auto& run : g_run_files) {
    for (const auto& in : run.inputs)
      if (same_file(me, in))
        throw InputError(path + ": the output is an input of this run (got the same file as " + in.shown +
                         ", expected another path)");
    for (const auto& out : run.outputs)
      if (same_file(me, out))
        throw InputError(path + ": written twice in this run (got the same file as the output " + out.shown +
                         ", expected another path)");
  }

  // A unique temporary beside the target (a short name: the target's own may be near NAME_MAX).
  const std::string dir = std::filesystem::path(target).parent_path().string();
  std::string tmp = (dir.empty() ? std::string(".") : dir) + "/.sortie-XXXXXX";
  if (tmp.size() >= kPathBytes) throw InputError(path + ": cannot write the file (the path is too long)");
  install_handlers_once();
  int fd = -1;
  {
    BlockSignals block;
    Slot* slot = nullptr;
    for (auto& s : g_slots)
      if (!s.used) {
        slot = &s;
        break;
      }
    if (!slot) throw InputError(path + ": too many output files in one run (expected at most 32)");
    fd = ::mkstemp(tmp.data());
    if (fd < 0) throw InputError(path + ": cannot write the file (" + errno_text(errno) + ")");
    std::memcpy(slot->path, tmp.c_str(), tmp.size() + 1);
    slot->used = 1;
  }
  try {
    // An existing file keeps its permission bits; a new one gets what open(2) would give it.
    if (::fchmod(fd, exists ? (st.st_mode & 07777) : new_file_mode()) != 0)
      throw InputError(path + ": cannot write the file (" + errno_text(errno) + ")");
    write_all(fd, content, path, "writing failed");
    if (::fsync(fd) != 0) throw InputError(path + ": writing failed (" + errno_text(errno) + ")");
    const int fd_closing = fd;
    fd = -1;
    if (::close(fd_closing) != 0) throw InputError(path + ": writing failed (" + errno_text(errno) + ")");
  } catch (...) {
    if (fd >= 0) ::close(fd);
    drop_temporary(tmp);
    throw;
  }
  if (!g_run_files.empty()) g_run_files.back().outputs.push_back(me);
  if (g_batch) {
    g_batch->pending_.push_back({tmp, target, path});
    return;
  }
  rename_into_place(tmp, target, path);
}

OutputBatch::OutputBatch() : outer_(g_batch) {
  g_batch = this;
  g_run_files.emplace_back();
}

OutputBatch::~OutputBatch() {
  for (const auto& p : pending_) drop_temporary(p.tmp);
  g_batch = outer_;
  g_run_files.pop_back();
}

void OutputBatch::commit() {
  while (!pending_.empty()) {
    const Pending p = pending_.front();
    pending_.erase(pending_.begin());
    rename_into_place(p.tmp, p.target, p.shown);  // on failure the destructor removes the rest
  }
}

std::size_t open_temporaries() {
  return static_cast<std::size_t>(
      std::count_if(std::begin(g_slots), std::end(g_slots), [](const Slot& s) { return s.used != 0; }));
}

}  // namespace sortie::io
