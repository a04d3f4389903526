#include "io/output.hpp"

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>

#include "core/error.hpp"

namespace sortie::io {

void write_output(const std::string& path, const std::string& content) {
  if (path == "-") {
    std::cout << content;
    std::cout.flush();
    return;
  }
  const std::string tmp = path + ".part";
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out) throw InputError(path + ": cannot write the file");
    out << content;
    out.flush();
    if (!out) {
      std::remove(tmp.c_str());
      throw InputError(path + ": writing failed");
    }
  }
  std::error_code ec;
  std::filesystem::rename(tmp, path, ec);
  if (ec) {
    std::remove(tmp.c_str());
    throw InputError(path + ": cannot write the file (" + ec.message() + ")");
  }
}

}  // namespace sortie::io
