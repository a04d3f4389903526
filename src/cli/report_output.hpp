#pragma once
/// Options every reporting command shares: --format (what goes to standard output) and
/// --html FILE.html (the self-contained page), and the rule that standard output carries one
/// thing at a time.
#include <CLI/CLI.hpp>
#include <initializer_list>
#include <string>
#include <vector>

namespace sortie::cli {

struct ReportOutput {
  std::string format = "text";  ///< text | json | csv
  std::string html_file;        ///< empty: no page; "-": standard output
};

/// Adds `--format` with the choices given (the first is the default) and `--html FILE`.
void add_report_options(CLI::App* c, ReportOutput& o, const std::vector<std::string>& formats);

/// Whether the chosen --format should be printed: not with --quiet, and not when a file option
/// already writes to standard output ("-"). Refuses, as a usage error, a --format other than
/// text together with a file option on standard output, and --html - together with another.
bool print_format(const ReportOutput& o, std::initializer_list<std::pair<const char*, const std::string*>> files,
                  bool quiet);

}  // namespace sortie::cli
