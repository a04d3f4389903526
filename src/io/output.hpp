#pragma once
/// The one writer of every output, file or standard output (README "Outputs"):
/// - "-" is standard output: written at once, flushed and checked (a full disk or a closed pipe
///   is an error, never a truncated result with exit 0);
/// - a path that is a device, a FIFO, a socket or a directory is refused, never replaced;
/// - a symbolic link is written through: its target is replaced and the link stays a link (a link
///   whose target cannot be reached is refused);
/// - the content goes to a unique temporary (mkstemp) in the target's folder, is fsync'ed and
///   renamed over the target, which keeps its permission bits (a new file gets 0666 less the
///   umask); the temporary is removed on any error and on SIGINT or SIGTERM;
/// - an output that is the same file (device and inode, or the same path) as an input the run
///   read or as another output of the run is refused.
#include <filesystem>
#include <string>
#include <utility>
#include <vector>

namespace sortie::io {

/// Record a file the run reads (every loader calls this as it opens a file), so that an output
/// onto it is refused. The run is the open OutputBatch (cli::run opens one around a command)
///; without a batch nothing is recorded, and outputs are checked against nothing.
void note_input(const std::filesystem::path& path);

/// Write `content` to `path` (see above), or to standard output for "-". While an OutputBatch is
/// open the rename waits for the batch's commit().
void write_output(const std::string& path, const std::string& content);

/// Every file a command writes appears together, or none does: while a batch is open,
/// write_output leaves each file as its temporary; commit() renames them all into place, and a
/// batch closed without commit() (an error part way through a command that writes several files)
/// removes them. Batches nest (the innermost open one holds the files); standard output is never
/// held back.
class OutputBatch {
 public:
  OutputBatch();
  ~OutputBatch();
  OutputBatch(const OutputBatch&) = delete;
  OutputBatch& operator=(const OutputBatch&) = delete;

  /// Rename every written file into place. Throws InputError when a rename fails (the files
  /// not yet renamed are removed).
  void commit();

 private:
  friend void write_output(const std::string& path, const std::string& content);
  struct Pending {
    std::string tmp;     ///< the temporary, in the target's folder
    std::string target;  ///< the file renamed over (a link's target when the path is a link)
    std::string shown;   ///< the path as the user gave it, for messages
  };
  std::vector<Pending> pending_;
  OutputBatch* outer_;
};

/// The temporaries not yet renamed or removed (tests: none may be left after a run).
std::size_t open_temporaries();

}  // namespace sortie::io
