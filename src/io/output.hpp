#pragma once
/// Writing results: to a temporary file renamed into place, so an error never leaves a
/// half-written file; "-" means standard output.
#include <string>
#include <utility>
#include <vector>

namespace sortie::io {

/// Write `content` to `path` (through `path.part`, then a rename), or to standard output for
/// "-". While an OutputBatch is open the rename waits for the batch's commit().
void write_output(const std::string& path, const std::string& content);

/// Every file a command writes appears together, or none does: while a batch is open,
/// write_output leaves each file as its `.part` temporary; commit() renames them all into
/// place, and a batch closed without commit() (an error part way through a command that writes
/// several files) removes them. Batches nest (the innermost open one holds the files);
/// standard output is never held back.
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
  std::vector<std::pair<std::string, std::string>> pending_;  // temporary, final path
  OutputBatch* outer_;
};

}  // namespace sortie::io
