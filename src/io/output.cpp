#include "io/output.hpp"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>

#include "core/error.hpp"

namespace sortie::io {

namespace {

OutputBatch* g_batch = nullptr;  // the open batch, if any

void rename_into_place(const std::string& tmp, const std::string& path) {
  std::error_code ec;
  std::filesystem::rename(tmp, path, ec);
  if (ec) {
    std::remove(tmp.c_str());
    throw InputError(path + ": cannot write the file (" + ec.message() + ")");
  }
}

}  // namespace

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
  if (g_batch) {
    auto& p = g_batch->pending_;
    const auto same = [&](const auto& e) { return e.second == path; };
    if (std::find_if(p.begin(), p.end(), same) == p.end()) p.emplace_back(tmp, path);
    return;
  }
  rename_into_place(tmp, path);
}

OutputBatch::OutputBatch() : outer_(g_batch) { g_batch = this; }

OutputBatch::~OutputBatch() {
  for (const auto& [tmp, path] : pending_) std::remove(tmp.c_str());
  g_batch = outer_;
}

void OutputBatch::commit() {
  while (!pending_.empty()) {
    const auto [tmp, path] = pending_.front();
    pending_.erase(pending_.begin());
    rename_into_place(tmp, path);  // on failure the destructor removes the rest
  }
}

}  // namespace sortie::io
