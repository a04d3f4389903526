#include "report/plan_view.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <optional>
#include <sstream>
#include <vector>

#include "geo/geodesy.hpp"
#include "report/html_page.hpp"

namespace sortie::report {

namespace {

using nlohmann::json;

std::string num(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.1f", v);
  return b;
}

/// SoC 1 → green, 0.5 → amber, 0 → red (linear in hue).
std::string soc_colour(double soc) {
  const double hue = 120.0 * std::clamp(soc, 0.0, 1.0);
  return "hsl(" + num(hue) + ",75%,40%)";
}

geo::LonLat lonlat(const json& coords) { return {coords.at(0).get<double>(), coords.at(1).get<double>()}; }

}  // namespace

std::string plan_view_svg(const json& route, const flight::Wind& wind) {
  const json& f = route.at("features");
  const json& line = f.at(0).at("geometry").at("coordinates");
  const geo::LonLat home = lonlat(line.at(0));
  const geo::LocalPlane plane(home);
  struct Stop {
    geo::Xy at;
    double soc;
    std::string label;
  };
  std::vector<Stop> stops;
  std::optional<geo::Xy> turn;
  for (const auto& x : f) {
    const auto& p = x.at("properties");
    if (p.at("role") == "waypoint" && p.contains("soc"))
      stops.push_back({plane.forward(lonlat(x.at("geometry").at("coordinates"))), p.at("soc").get<double>(),
                       p.at("label").get<std::string>()});
    if (p.at("role") == "turn_home") turn = plane.forward(lonlat(x.at("geometry").at("coordinates")));
  }
  double x0 = 0, x1 = 0, y0 = 0, y1 = 0;
  for (const auto& s : stops) x0 = std::min(x0, s.at.x), x1 = std::max(x1, s.at.x), y0 = std::min(y0, s.at.y), y1 = std::max(y1, s.at.y);
  const double span = std::max({x1 - x0, y1 - y0, 10.0});
  const double W = 640, H = 640, pad = 50;
  const double k = (W - 2 * pad) / span;
  auto px = [&](const geo::Xy& p) { return std::make_pair(pad + (p.x - x0) * k, H - pad - (p.y - y0) * k); };
  std::ostringstream s;
  s << "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 " << W << " " << H << "\" width=\"" << W << "\" height=\"" << H
    << "\" role=\"img\" aria-label=\"plan view of the route\">\n";
  s << "<rect x=\"0\" y=\"0\" width=\"" << W << "\" height=\"" << H << "\" fill=\"#fafafa\" stroke=\"#ccc\"/>\n";
  geo::Xy prev{0, 0};
  for (const auto& st : stops) {
    const auto [ax, ay] = px(prev);
    const auto [bx, by] = px(st.at);
    if (std::hypot(bx - ax, by - ay) > 0.1)
      s << "<line x1=\"" << num(ax) << "\" y1=\"" << num(ay) << "\" x2=\"" << num(bx) << "\" y2=\"" << num(by) << "\" stroke=\""
        << soc_colour(st.soc) << "\" stroke-width=\"3\"><title>" << html::esc(st.label) << ": " << num(100 * st.soc)
        << " % charge at its end</title></line>\n";
    prev = st.at;
  }
  const auto [hx, hy] = px({0, 0});
  s << "<rect x=\"" << num(hx - 6) << "\" y=\"" << num(hy - 6) << "\" width=\"12\" height=\"12\" fill=\"#222\"><title>home</title></rect>\n";
  s << "<text x=\"" << num(hx - 14) << "\" y=\"" << num(hy - 12) << "\" font-size=\"13\">home</text>\n";
  if (turn) {
    const auto [tx, ty] = px(*turn);
    s << "<circle cx=\"" << num(tx) << "\" cy=\"" << num(ty) << "\" r=\"7\" fill=\"none\" stroke=\"#b00\" stroke-width=\"3\"><title>turn-home point</title></circle>\n";
    s << "<text x=\"" << num(tx + 10) << "\" y=\"" << num(ty + 18) << "\" font-size=\"13\" fill=\"#b00\">turn home</text>\n";
  }
  // Wind arrow: drawn the way the air moves (toward from + 180°), top right.
  if (wind.speed_mps > 0.0) {
    const double to = (wind.from_deg + 180.0) * 3.14159265358979323846 / 180.0;
    const double cx = W - 60, cy = 60, L = 30;
    const double ex = cx + L * std::sin(to), ey = cy - L * std::cos(to);
    const double sx = cx - L * std::sin(to), sy = cy + L * std::cos(to);
    s << "<g stroke=\"#246\" stroke-width=\"3\" fill=\"#246\"><line x1=\"" << num(sx) << "\" y1=\"" << num(sy) << "\" x2=\"" << num(ex)
      << "\" y2=\"" << num(ey) << "\"/><circle cx=\"" << num(ex) << "\" cy=\"" << num(ey) << "\" r=\"5\"/></g>\n";
    s << "<text x=\"" << num(W - 190) << "\" y=\"" << num(cy + 50) << "\" font-size=\"12\">wind " << num(wind.speed_mps) << " m/s from "
      << num(wind.from_deg) << "°</text>\n";
  }
  // Scale bar: a round length near a fifth of the view.
  double bar = std::pow(10.0, std::floor(std::log10(span / 5.0)));
  if (bar * 5 <= span / 5.0) bar *= 5;
  else if (bar * 2 <= span / 5.0) bar *= 2;
  s << "<line x1=\"" << pad << "\" y1=\"" << H - 20 << "\" x2=\"" << num(pad + bar * k) << "\" y2=\"" << H - 20
    << "\" stroke=\"#222\" stroke-width=\"3\"/><text x=\"" << num(pad + bar * k + 8) << "\" y=\"" << H - 16 << "\" font-size=\"12\">" << num(bar) << " m</text>\n";
  s << "<text x=\"" << W - 30 << "\" y=\"" << H - 20 << "\" font-size=\"14\">N ↑</text>\n";
  s << "</svg>\n";
  return s.str();
}

std::string plan_view_page(const json& route, const sim::Mission& m, const sim::MissionResult& r) {
  html::Page page("sortie route: " + m.name, "plan view of the generated profile, flown once");
  page.add(html::figure("Route coloured by state of charge (green full, red empty) at the end of each stretch",
                        plan_view_svg(route, m.environment.wind),
                        "East/north metres in the plane tangent at home; no map. The turn-home point is the latest moment "
                        "to turn back with every rule holding on the way."));
  page.section("Flight", html::facts({{"flight time", num(r.flight_time_s) + " s"},
                                      {"landing charge", num(100.0 * r.landing.soc) + " %"},
                                      {"energy used", num(r.energy_Wh) + " Wh"}}));
  return page.render();
}

}  // namespace sortie::report
