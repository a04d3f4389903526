#pragma once
/// Writing results: to a temporary file renamed into place, so an error never leaves a
/// half-written file; "-" means standard output.
#include <string>

namespace sortie::io {

void write_output(const std::string& path, const std::string& content);

}  // namespace sortie::io
