#pragma once
// Reading a PNG screenshot for the browser check, with no library: chunks and CRC-32 (PNG,
// W3C Recommendation, 2nd edition, 2003, sections 5.3 and annex D), the zlib stream (RFC 1950,
// Deutsch and Gailly 1996) holding DEFLATE data (RFC 1951, Deutsch 1996: stored, fixed and
// dynamic Huffman blocks, section 3.2), and the scanline filters None, Sub, Up, Average and
// Paeth (PNG section 9.2). Only 8-bit RGB and RGBA images are decoded, which is what a
// browser screenshot is; anything else is reported, not guessed.
#include <algorithm>
#include <array>
#include <cstdint>
#include <cstdlib>
#include <optional>
#include <string>
#include <vector>

namespace sortie::test::png {

struct Image {
  std::uint32_t width = 0, height = 0;
  int channels = 0;                 ///< 3 (RGB) or 4 (RGBA)
  std::vector<std::uint8_t> pixels;  ///< rows top to bottom, unfiltered
};

struct Result {
  std::optional<Image> image;
  std::string error;
};

namespace detail {

inline std::uint32_t crc32(const std::uint8_t* p, std::size_t n) {
  static const auto table = [] {
    std::array<std::uint32_t, 256> t{};
    for (std::uint32_t i = 0; i < 256; ++i) {
      std::uint32_t c = i;
      for (int k = 0; k < 8; ++k) c = c & 1 ? 0xEDB88320u ^ (c >> 1) : c >> 1;
      t[i] = c;
    }
    return t;
  }();
  std::uint32_t c = 0xFFFFFFFFu;
  for (std::size_t i = 0; i < n; ++i) c = table[(c ^ p[i]) & 0xFF] ^ (c >> 8);
  return c ^ 0xFFFFFFFFu;
}

inline std::uint32_t be32(const std::uint8_t* p) {
  return (std::uint32_t(p[0]) << 24) | (std::uint32_t(p[1]) << 16) | (std::uint32_t(p[2]) << 8) | p[3];
}

/// A canonical Huffman code as counts per length and symbols in code order (RFC 1951 3.2.2).
struct Huffman {
  std::array<std::uint16_t, 16> count{};
  std::vector<std::uint16_t> symbol;
  bool build(const std::uint8_t* lengths, int n) {
    count.fill(0);
    for (int s = 0; s < n; ++s) ++count[lengths[s]];
    count[0] = 0;
    int left = 1;  // over-subscribed codes are refused; incomplete ones are allowed (one-code case)
    for (int len = 1; len < 16; ++len) {
      left = left * 2 - count[len];
      if (left < 0) return false;
    }
    std::array<std::uint16_t, 16> offs{};
    for (int len = 1; len < 15; ++len) offs[len + 1] = offs[len] + count[len];
    symbol.assign(n, 0);
    for (int s = 0; s < n; ++s)
      if (lengths[s]) symbol[offs[lengths[s]]++] = static_cast<std::uint16_t>(s);
    return true;
  }
};

class Inflater {
 public:
  Inflater(const std::uint8_t* data, std::size_t size) : d_(data), n_(size) {}

  /// The whole zlib stream; false with a reason on any malformation.
  bool zlib(std::vector<std::uint8_t>& out, std::string& error) {
    if (n_ < 6) return fail(error, "zlib stream too short");
    const unsigned cmf = d_[0], flg = d_[1];
    if ((cmf & 0x0F) != 8 || ((cmf << 8) | flg) % 31 != 0 || (flg & 0x20)) return fail(error, "bad zlib header");
    pos_ = 2;
    bool last = false;
    while (!last) {
      last = bits(1);
      const int type = static_cast<int>(bits(2));
      if (bad_) return fail(error, "DEFLATE data ends early");
      bool ok = false;
      if (type == 0) ok = stored(out);
      else if (type == 1) ok = fixed(out);
      else if (type == 2) ok = dynamic(out);
      if (!ok || bad_) return fail(error, "bad DEFLATE block (type " + std::to_string(type) + ")");
    }
    // Adler-32 of the data (RFC 1950 section 2.2), after the last block's final byte.
    const std::size_t p = pos_;  // the checksum follows the byte holding the last bits
    if (p + 4 > n_) return fail(error, "no Adler-32 checksum");
    std::uint32_t a = 1, b = 0;
    for (auto c : out) {
      a = (a + c) % 65521;
      b = (b + a) % 65521;
    }
    if (be32(d_ + p) != ((b << 16) | a)) return fail(error, "Adler-32 checksum does not match");
    return true;
  }

 private:
  static bool fail(std::string& error, const std::string& why) {
    error = why;
    return false;
  }
  std::uint32_t bits(int need) {
    std::uint32_t v = bitbuf_;
    while (bitcnt_ < need) {
      if (pos_ >= n_) {
        bad_ = true;
        return 0;
      }
      v |= std::uint32_t(d_[pos_++]) << bitcnt_;
      bitcnt_ += 8;
    }
    bitbuf_ = v >> need;
    bitcnt_ -= need;
    return v & ((1u << need) - 1);
  }
  int decode(const Huffman& h) {
    int code = 0, first = 0, index = 0;
    for (int len = 1; len < 16; ++len) {
      code |= static_cast<int>(bits(1));
      if (bad_) return -1;
      const int count = h.count[len];
      if (code - count < first) return h.symbol[index + (code - first)];
      index += count;
      first += count;
      first <<= 1;
      code <<= 1;
    }
    return -1;
  }
  bool stored(std::vector<std::uint8_t>& out) {
    bitbuf_ = 0;
    bitcnt_ = 0;
    if (pos_ + 4 > n_) return false;
    const unsigned len = d_[pos_] | (d_[pos_ + 1] << 8), nlen = d_[pos_ + 2] | (d_[pos_ + 3] << 8);
    pos_ += 4;
    if (len != (~nlen & 0xFFFF) || pos_ + len > n_) return false;
    out.insert(out.end(), d_ + pos_, d_ + pos_ + len);
    pos_ += len;
    return true;
  }
  bool codes(std::vector<std::uint8_t>& out, const Huffman& lit, const Huffman& dist) {
    static const std::uint16_t lbase[29] = {3,  4,  5,  6,  7,  8,  9,  10, 11,  13,  15,  17,  19,  23, 27,
                                            31, 35, 43, 51, 59, 67, 83, 99, 115, 131, 163, 195, 227, 258};
    static const std::uint8_t lext[29] = {0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4, 5, 5, 5, 5, 0};
    static const std::uint16_t dbase[30] = {1,   2,   3,   4,   5,   7,    9,    13,   17,   25,   33,   49,   65,    97,    129,
                                            193, 257, 385, 513, 769, 1025, 1537, 2049, 3073, 4097, 6145, 8193, 12289, 16385, 24577};
    static const std::uint8_t dext[30] = {0, 0, 0, 0, 1, 1, 2, 2, 3, 3, 4, 4, 5, 5, 6, 6, 7, 7, 8, 8, 9, 9, 10, 10, 11, 11, 12, 12, 13, 13};
    for (;;) {
      const int sym = decode(lit);
      if (sym < 0) return false;
      if (sym < 256) {
        out.push_back(static_cast<std::uint8_t>(sym));
        continue;
      }
      if (sym == 256) return true;
      const int li = sym - 257;
      if (li >= 29) return false;
      const std::size_t len = lbase[li] + bits(lext[li]);
      const int ds = decode(dist);
      if (ds < 0 || ds >= 30) return false;
      const std::size_t back = dbase[ds] + bits(dext[ds]);
      if (bad_ || back > out.size()) return false;
      const std::size_t from = out.size() - back;
      for (std::size_t k = 0; k < len; ++k) out.push_back(out[from + k]);
    }
  }
  bool fixed(std::vector<std::uint8_t>& out) {
    std::uint8_t l[288], d[30];
    for (int s = 0; s < 288; ++s) l[s] = s < 144 ? 8 : s < 256 ? 9 : s < 280 ? 7 : 8;
    for (auto& x : d) x = 5;
    Huffman lit, dist;
    lit.build(l, 288);
    dist.build(d, 30);
    return codes(out, lit, dist);
  }
  bool dynamic(std::vector<std::uint8_t>& out) {
    const int nlen = static_cast<int>(bits(5)) + 257, ndist = static_cast<int>(bits(5)) + 1,
              ncode = static_cast<int>(bits(4)) + 4;
    if (bad_ || nlen > 286 || ndist > 30) return false;
    static const int order[19] = {16, 17, 18, 0, 8, 7, 9, 6, 10, 5, 11, 4, 12, 3, 13, 2, 14, 1, 15};
    std::uint8_t lengths[320] = {};
    for (int k = 0; k < ncode; ++k) lengths[order[k]] = static_cast<std::uint8_t>(bits(3));
    Huffman lencode;
    if (!lencode.build(lengths, 19)) return false;
    int k = 0;
    std::uint8_t all[320] = {};
    while (k < nlen + ndist) {
      int sym = decode(lencode);
      if (sym < 0) return false;
      if (sym < 16) {
        all[k++] = static_cast<std::uint8_t>(sym);
        continue;
      }
      std::uint8_t value = 0;
      int rep = 0;
      if (sym == 16) {
        if (k == 0) return false;
        value = all[k - 1];
        rep = 3 + static_cast<int>(bits(2));
      } else if (sym == 17) {
        rep = 3 + static_cast<int>(bits(3));
      } else {
        rep = 11 + static_cast<int>(bits(7));
      }
      if (k + rep > nlen + ndist) return false;
      while (rep--) all[k++] = value;
    }
    if (all[256] == 0) return false;  // no end-of-block code
    Huffman lit, dist;
    if (!lit.build(all, nlen) || !dist.build(all + nlen, ndist)) return false;
    return codes(out, lit, dist);
  }

  const std::uint8_t* d_;
  std::size_t n_;
  std::size_t pos_ = 0;
  std::uint32_t bitbuf_ = 0;
  int bitcnt_ = 0;
  bool bad_ = false;
};

}  // namespace detail

/// Inflate a zlib stream (exposed for tests).
inline bool inflate_zlib(const std::vector<std::uint8_t>& z, std::vector<std::uint8_t>& out, std::string& error) {
  out.clear();
  detail::Inflater inf(z.data(), z.size());
  return inf.zlib(out, error);
}

inline Result read(const std::vector<std::uint8_t>& f) {
  Result r;
  auto fail = [&](const std::string& why) {
    r.error = why;
    return r;
  };
  static const std::uint8_t sig[8] = {0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};
  if (f.size() < 8 || !std::equal(sig, sig + 8, f.begin())) return fail("not a PNG file (no PNG signature)");
  Image img;
  int depth = 0, colour = -1, interlace = 0;
  std::vector<std::uint8_t> z;
  bool end = false;
  for (std::size_t p = 8; p + 12 <= f.size() && !end;) {
    const std::uint32_t len = detail::be32(&f[p]);
    if (p + 12 + std::size_t(len) > f.size()) return fail("chunk runs past the end of the file");
    const std::string type(f.begin() + p + 4, f.begin() + p + 8);
    const std::uint8_t* body = &f[p + 8];
    if (detail::crc32(&f[p + 4], len + 4) != detail::be32(body + len)) return fail("CRC of chunk " + type + " does not match");
    if (type == "IHDR") {
      if (len != 13) return fail("IHDR of the wrong size");
      img.width = detail::be32(body);
      img.height = detail::be32(body + 4);
      depth = body[8];
      colour = body[9];
      interlace = body[12];
    } else if (type == "IDAT") {
      z.insert(z.end(), body, body + len);
    } else if (type == "IEND") {
      end = true;
    }
    p += 12 + len;
  }
  if (!end) return fail("no IEND chunk");
  if (img.width == 0 || img.height == 0) return fail("no image size");
  if (depth != 8 || (colour != 2 && colour != 6) || interlace != 0)
    return fail("unsupported PNG (bit depth " + std::to_string(depth) + ", colour type " + std::to_string(colour) +
                ", interlace " + std::to_string(interlace) + "): only 8-bit RGB or RGBA, not interlaced");
  img.channels = colour == 6 ? 4 : 3;
  std::vector<std::uint8_t> raw;
  std::string why;
  if (!inflate_zlib(z, raw, why)) return fail("image data: " + why);
  const std::size_t stride = std::size_t(img.width) * img.channels;
  if (raw.size() != (stride + 1) * img.height) return fail("image data of the wrong size");
  img.pixels.assign(stride * img.height, 0);
  const int bpp = img.channels;
  for (std::uint32_t y = 0; y < img.height; ++y) {
    const std::uint8_t filter = raw[y * (stride + 1)];
    const std::uint8_t* in = &raw[y * (stride + 1) + 1];
    std::uint8_t* row = &img.pixels[y * stride];
    const std::uint8_t* up = y ? &img.pixels[(y - 1) * stride] : nullptr;
    for (std::size_t x = 0; x < stride; ++x) {
      const int a = x >= std::size_t(bpp) ? row[x - bpp] : 0;
      const int b = up ? up[x] : 0;
      const int c = up && x >= std::size_t(bpp) ? up[x - bpp] : 0;
      int pred = 0;
      switch (filter) {
        case 0: pred = 0; break;
        case 1: pred = a; break;
        case 2: pred = b; break;
        case 3: pred = (a + b) / 2; break;
        case 4: {
          const int pp = a + b - c, pa = std::abs(pp - a), pb = std::abs(pp - b), pc = std::abs(pp - c);
          pred = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
          break;
        }
        default: return fail("unknown filter type " + std::to_string(filter) + " on row " + std::to_string(y));
      }
      row[x] = static_cast<std::uint8_t>(in[x] + pred);
    }
  }
  r.image = std::move(img);
  return r;
}

}  // namespace sortie::test::png
