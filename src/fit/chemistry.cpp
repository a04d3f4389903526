#include "fit/chemistry.hpp"

#include <algorithm>
#include <cctype>

#include "core/text.hpp"

namespace sortie::fit {

namespace {

Chemistry li_ion() { return {"Li-ion (LCO/NMC/NCA)", 4.20, 2.5, 3.0, 2.7, 4.25, ""}; }
Chemistry li_po() { return {"LiPo", 4.20, 3.0, 3.3, 2.7, 4.25, ""}; }
Chemistry li_hv() { return {"LiHV", 4.35, 3.0, 3.3, 2.9, 4.40, ""}; }
Chemistry lfp() { return {"LFP", 3.65, 2.0, 2.5, 2.5, 3.70, ""}; }

}  // namespace

std::optional<Chemistry> chemistry_by_name(const std::string& name) {
  std::string s;
  for (char ch : name) s += static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  auto has = [&](const char* w) { return s.find(w) != std::string::npos; };
  std::optional<Chemistry> c;
  if (has("lihv") || has("li-hv")) c = li_hv();
  else if (has("lfp") || has("lifepo") || has("lfe")) c = lfp();
  else if (has("lipo") || has("li-po")) c = li_po();
  else if (has("li-ion") || has("liion") || has("li ion") || has("lco") || has("nmc") || has("nca"))
    c = li_ion();
  if (c) c->how = "given (--chemistry " + name + ")";
  return c;
}

std::optional<Chemistry> chemistry_from_full_voltage(double v) {
  std::optional<Chemistry> c;
  if (v >= 3.5 && v <= 3.7) c = lfp();
  else if (v >= 4.1 && v <= 4.25) c = li_ion();
  else if (v >= 4.3 && v <= 4.45) c = li_hv();
  if (c) c->how = "taken from the constant-voltage level " + format_fixed(v, 3) + " V (give --chemistry to set it)";
  return c;
}

}  // namespace sortie::fit
