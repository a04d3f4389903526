#include "io/geojson.hpp"

#include "core/error.hpp"
#include "core/range.hpp"

namespace sortie::io {

namespace {

using nlohmann::json;

struct Reader {
  GeoInput out;
  std::size_t vertices = 0;

  [[noreturn]] void fail(const std::string& ptr, const std::string& what, const std::string& got = {},
                         const std::string& expected = {}) const {
    throw InputError(message(out.source, ptr, what, got, expected));
  }

  static std::string type_of(const json& j) {
    if (j.is_object() && j.contains("type") && j["type"].is_string()) return j["type"].get<std::string>();
    return {};
  }

  void check_crs(const json& j, const std::string& ptr) const {
    if (!j.is_object() || !j.contains("crs")) return;
    const json& c = j["crs"];
    const std::string p = ptr + "/crs";
    if (c.is_null()) return;
    std::string name;
    if (c.is_object() && c.contains("properties") && c["properties"].is_object() &&
        c["properties"].contains("name") && c["properties"]["name"].is_string())
      name = c["properties"]["name"].get<std::string>();
    static const char* const ok[] = {"urn:ogc:def:crs:OGC:1.3:CRS84", "urn:ogc:def:crs:OGC::CRS84",
                                     "urn:ogc:def:crs:EPSG::4326", "EPSG:4326", "CRS84"};
    for (const char* k : ok)
      if (name == k) return;
    fail(p, "only WGS 84 longitude/latitude is read", name.empty() ? c.dump() : "\"" + name + "\"",
         "no crs member, or urn:ogc:def:crs:OGC:1.3:CRS84");
  }

  GeoVertex position(const json& j, const std::string& ptr, bool height_allowed) {
    if (!j.is_array() || j.size() < 2 || j.size() > 3)
      fail(ptr, "a position is [longitude, latitude] or [longitude, latitude, height]",
           j.is_array() ? std::to_string(j.size()) + " numbers" : j.dump(), "2 or 3 numbers");
    if (++vertices > kMaxGeoJsonVertices)
      fail(ptr, "too many vertices", "more than " + std::to_string(kMaxGeoJsonVertices),
           "at most " + std::to_string(kMaxGeoJsonVertices));
    auto num = [&](std::size_t i, const Range& r) {
      const std::string p = ptr + "/" + std::to_string(i);
      if (!j[i].is_number()) fail(p, "not a number", j[i].dump(), "a number");
      const double v = j[i].get<double>();
      if (auto why = range_problem(v, r)) fail(p, *why);
      return v;
    };
    GeoVertex v;
    v.pointer = ptr;
    v.at.lon_deg = num(0, between(-180.0, 180.0, "deg longitude"));
    v.at.lat_deg = num(1, between(-90.0, 90.0, "deg latitude"));
    if (j.size() == 3) {
      if (!height_allowed) fail(ptr + "/2", "a height is not read here", j[2].dump(), "[longitude, latitude]");
      v.height_m = num(2, between(0.0, 11000.0, "m above the field"));
    }
    return v;
  }

  const json& coordinates(const json& g, const std::string& ptr) const {
    if (!g.contains("coordinates")) fail(ptr, "a geometry needs \"coordinates\"");
    return g["coordinates"];
  }

  void geometry(const json& g, const std::string& ptr, const json* props, const std::string& props_ptr) {
    if (!g.is_object()) fail(ptr, "not a geometry object", g.dump().substr(0, 40), "an object");
    check_crs(g, ptr);
    const std::string t = type_of(g);
    const std::string cp = ptr + "/coordinates";
    std::string role;
    if (props != nullptr && props->is_object() && props->contains("role")) {
      if (!(*props)["role"].is_string() || (*props)["role"] != "home")
        fail(props_ptr + "/role", "unknown role", (*props)["role"].dump(), "\"home\"");
      role = "home";
    }
    if (t == "Point") {
      GeoVertex v = position(coordinates(g, ptr), cp, false);
      if (props != nullptr && props->is_object() && props->contains("height_m")) {
        const json& h = (*props)["height_m"];
        if (!h.is_number()) fail(props_ptr + "/height_m", "not a number", h.dump(), "metres above the field");
        const double hv = h.get<double>();
        if (auto why = range_problem(hv, between(0.0, 11000.0, "m above the field")))
          fail(props_ptr + "/height_m", *why);
        v.height_m = hv;
      }
      if (role == "home") {
        if (out.home) fail(ptr, "a second home point", "", "one Point with \"role\": \"home\"");
        out.home = v;
      } else {
        if (!out.ring.empty()) fail(ptr, "route points and a field polygon in one file", "", "one of them");
        out.route.push_back(v);
      }
    } else if (t == "LineString") {
      if (role == "home") fail(props_ptr + "/role", "the home is a Point", "a LineString", "a Point");
      if (!out.route.empty() || !out.ring.empty())
        fail(ptr, "a second route or a field in the same file", "", "one LineString");
      const json& c = coordinates(g, ptr);
      if (!c.is_array() || c.size() < 2)
        fail(cp, "a LineString needs at least two positions", c.is_array() ? std::to_string(c.size()) : c.dump(), "2 or more");
      for (std::size_t i = 0; i < c.size(); ++i) out.route.push_back(position(c[i], cp + "/" + std::to_string(i), true));
    } else if (t == "Polygon") {
      if (role == "home") fail(props_ptr + "/role", "the home is a Point", "a Polygon", "a Point");
      if (!out.route.empty() || !out.ring.empty())
        fail(ptr, "a second field or a route in the same file", "", "one Polygon");
      const json& c = coordinates(g, ptr);
      if (!c.is_array() || c.empty()) fail(cp, "an empty polygon", c.dump().substr(0, 40), "one linear ring");
      if (c.size() > 1) fail(cp + "/1", "holes in the field are not supported", std::to_string(c.size() - 1) + " inner rings", "the outer ring only");
      const json& ring = c[0];
      const std::string rp = cp + "/0";
      // RFC 7946 §3.1.6: a linear ring is closed and has four or more positions.
      if (!ring.is_array() || ring.size() < 4)
        fail(rp, "a linear ring needs four or more positions, the last equal to the first",
             ring.is_array() ? std::to_string(ring.size()) + " positions" : ring.dump().substr(0, 40), "4 or more");
      std::vector<GeoVertex> pts;
      for (std::size_t i = 0; i < ring.size(); ++i) pts.push_back(position(ring[i], rp + "/" + std::to_string(i), false));
      if (pts.front().at.lon_deg != pts.back().at.lon_deg || pts.front().at.lat_deg != pts.back().at.lat_deg)
        fail(rp + "/" + std::to_string(ring.size() - 1), "the ring is not closed (last position differs from the first)", "", "the first position again");
      pts.pop_back();
      out.ring = std::move(pts);
      out.ring_pointer = rp;
    } else {
      fail(ptr + "/type", "unsupported geometry", "\"" + t + "\"", "Point, LineString or Polygon");
    }
  }

  void feature(const json& f, const std::string& ptr) {
    if (type_of(f) != "Feature") fail(ptr + "/type", "not a Feature", f.is_object() && f.contains("type") ? f["type"].dump() : "no type", "\"Feature\"");
    if (!f.contains("geometry") || f["geometry"].is_null()) fail(ptr + "/geometry", "a feature without a geometry", "", "a geometry");
    const json* props = f.contains("properties") && !f["properties"].is_null() ? &f["properties"] : nullptr;
    if (props != nullptr && !props->is_object()) fail(ptr + "/properties", "not an object", props->dump().substr(0, 40), "an object or null");
    check_crs(f, ptr);
    geometry(f["geometry"], ptr + "/geometry", props, ptr + "/properties");
  }

  void root(const json& j) {
    if (!j.is_object()) fail("", "not a GeoJSON object", j.dump().substr(0, 40), "an object with \"type\"");
    check_crs(j, "");
    const std::string t = type_of(j);
    if (t == "FeatureCollection") {
      if (!j.contains("features") || !j["features"].is_array()) fail("/features", "a FeatureCollection needs a \"features\" array");
      const json& fs = j["features"];
      for (std::size_t i = 0; i < fs.size(); ++i) feature(fs[i], "/features/" + std::to_string(i));
    } else if (t == "Feature") {
      feature(j, "");
    } else if (t == "Point" || t == "LineString" || t == "Polygon") {
      geometry(j, "", nullptr, "");
    } else {
      fail("/type", "unsupported GeoJSON type", t.empty() ? "no type" : "\"" + t + "\"",
           "FeatureCollection, Feature, Point, LineString or Polygon");
    }
    if (out.route.empty() && out.ring.empty()) fail("", "no route and no field in the file", "", "a LineString, Points or a Polygon");
    if (!out.ring.empty() && out.route.size() == 1) fail(out.route[0].pointer, "a point that is not the home beside a field", "", "\"role\": \"home\"");
    if (out.ring.empty() && out.route.size() < 2) fail(out.route[0].pointer, "a route needs at least two points", "1", "2 or more");
  }
};

}  // namespace

GeoInput parse_geojson_text(const std::string& text, const std::string& name) {
  Reader r;
  r.out.source = Source{name};
  r.root(parse_json_text(text, name));
  return std::move(r.out);
}

GeoInput load_geojson_file(const std::filesystem::path& path) {
  Reader r;
  r.out.source = Source{path.string(), path.parent_path()};
  r.root(load_json_file(path));
  return std::move(r.out);
}

}  // namespace sortie::io
