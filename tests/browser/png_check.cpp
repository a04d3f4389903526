// png_check FILE.png --width W --height H [--min-colours N] [--min-ink FRACTION]
// Is a screenshot a rendered page? Its size is the window's, and it is not blank: it holds
// many colours (text is anti-aliased, plots are coloured) and a fair share of its pixels
// differ from the most common one (the page background). Prints one line; exit 0 when it
// passes, 1 when it does not, 2 on bad usage.
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iterator>
#include <string>
#include <unordered_map>

#include "support/png_read.hpp"

int main(int argc, char** argv) {
  std::string file;
  long width = -1, height = -1, min_colours = 64;
  double min_ink = 0.02;
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    auto value = [&]() -> std::string {
      if (i + 1 >= argc) {
        std::fprintf(stderr, "png_check: %s needs a value\n", a.c_str());
        std::exit(2);
      }
      return argv[++i];
    };
    if (a == "--width") width = std::stol(value());
    else if (a == "--height") height = std::stol(value());
    else if (a == "--min-colours") min_colours = std::stol(value());
    else if (a == "--min-ink") min_ink = std::stod(value());
    else if (file.empty()) file = a;
    else {
      std::fprintf(stderr, "png_check: unexpected argument %s\n", a.c_str());
      return 2;
    }
  }
  if (file.empty()) {
    std::fprintf(stderr, "usage: png_check FILE.png --width W --height H [--min-colours N] [--min-ink F]\n");
    return 2;
  }
  std::ifstream in(file, std::ios::binary);
  if (!in) {
    std::printf("png_check: %s: cannot open\n", file.c_str());
    return 1;
  }
  const std::vector<std::uint8_t> bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const auto r = sortie::test::png::read(bytes);
  if (!r.image) {
    std::printf("png_check: %s: %s\n", file.c_str(), r.error.c_str());
    return 1;
  }
  const auto& img = *r.image;
  std::unordered_map<std::uint32_t, std::size_t> colours;
  const std::size_t n = std::size_t(img.width) * img.height;
  for (std::size_t k = 0; k < n; ++k) {
    const std::uint8_t* px = &img.pixels[k * img.channels];
    const std::uint32_t rgb = (std::uint32_t(px[0]) << 16) | (std::uint32_t(px[1]) << 8) | px[2];
    ++colours[rgb];
  }
  std::uint32_t background = 0;
  std::size_t most = 0;
  for (const auto& [c, count] : colours)
    if (count > most) {
      most = count;
      background = c;
    }
  const double ink = 1.0 - static_cast<double>(most) / static_cast<double>(n);
  std::printf("png_check: %s: %ux%u, %zu colours, %.1f %% of pixels differ from the background #%06x\n", file.c_str(),
              img.width, img.height, colours.size(), ink * 100.0, background);
  bool ok = true;
  if ((width >= 0 && img.width != width) || (height >= 0 && img.height != height)) {
    std::printf("png_check: expected %ldx%ld\n", width, height);
    ok = false;
  }
  if (static_cast<long>(colours.size()) < min_colours) {
    std::printf("png_check: fewer than %ld colours: the page looks blank\n", min_colours);
    ok = false;
  }
  if (ink < min_ink) {
    std::printf("png_check: less than %.1f %% of the pixels are not background: the page looks blank\n", min_ink * 100);
    ok = false;
  }
  return ok ? 0 : 1;
}
