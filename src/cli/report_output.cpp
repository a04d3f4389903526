#include "cli/report_output.hpp"

#include "cli/number_option.hpp"
#include "core/error.hpp"

namespace sortie::cli {

void add_report_options(CLI::App* c, ReportOutput& o, const std::vector<std::string>& formats) {
  std::string list;
  for (const auto& f : formats) list += (list.empty() ? "" : "|") + f;
  o.format = formats.front();
  c->add_option("--format", o.format, "what to print on standard output: " + list + " (default " + formats.front() +
                                          "; json is the JSON result)")
      ->check(CLI::IsMember(formats));
  c->add_option("--html", o.html_file, "write the report as one self-contained HTML page (plots inline) to FILE")->check(output_path());
}

bool print_format(const ReportOutput& o, std::initializer_list<std::pair<const char*, const std::string*>> files,
                  bool quiet) {
  const char* on_stdout = nullptr;
  for (const auto& [option, file] : files)
    if (*file == "-") {
      if (on_stdout) throw UsageError(std::string(option) + " -: standard output already carries " + on_stdout + " -");
      on_stdout = option;
    }
  if (o.html_file == "-" && on_stdout)
    throw UsageError(std::string("--html -: standard output already carries ") + on_stdout + " -");
  if (o.html_file == "-") on_stdout = "--html";
  if (on_stdout && o.format != "text")
    throw UsageError("--format " + o.format + ": standard output already carries " + on_stdout + " -");
  return !quiet && !on_stdout;
}

}  // namespace sortie::cli
