// GeoJSON in (RFC 7946): the shapes read, and every refusal as one line with the JSON pointer.
#include "io/geojson.hpp"

#include <doctest/doctest.h>

#include <string>

#include "core/error.hpp"

using sortie::InputError;
using sortie::io::parse_geojson_text;

namespace {

std::string error_of(const std::string& text) {
  try {
    parse_geojson_text(text, "f.geojson");
  } catch (const InputError& e) {
    return e.what();
  }
  return "(accepted)";
}

}  // namespace

TEST_CASE("geojson: a LineString route with heights and Points with height_m and a field with its home") {
  auto r = parse_geojson_text(R"({"type":"LineString","coordinates":[[8.6,46.3,50],[8.61,46.3],[8.61,46.31,80]]})", "r");
  REQUIRE(r.route.size() == 3);
  CHECK(*r.route[0].height_m == 50.0);
  CHECK(!r.route[1].height_m);
  CHECK(r.route[2].pointer == "/coordinates/2");
  auto p = parse_geojson_text(R"({"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"height_m":40},"geometry":{"type":"Point","coordinates":[8.6,46.3]}},
      {"type":"Feature","properties":null,"geometry":{"type":"Point","coordinates":[8.61,46.3]}}]})", "p");
  REQUIRE(p.route.size() == 2);
  CHECK(*p.route[0].height_m == 40.0);
  auto f = parse_geojson_text(R"({"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:OGC:1.3:CRS84"}},
      "features":[
      {"type":"Feature","properties":{},"geometry":{"type":"Polygon","coordinates":[[[8.6,46.3],[8.61,46.3],[8.61,46.31],[8.6,46.3]]]}},
      {"type":"Feature","properties":{"role":"home"},"geometry":{"type":"Point","coordinates":[8.59,46.3]}}]})", "f");
  CHECK(f.ring.size() == 3);
  REQUIRE(f.home);
  CHECK(f.home->at.lon_deg == 8.59);
  CHECK(f.ring_pointer == "/features/0/geometry/coordinates/0");
}

TEST_CASE("geojson: refusals name the file and the JSON pointer") {
  CHECK(error_of("{") .find("f.geojson") == 0);
  CHECK(error_of(R"({"type":"LineString","crs":{"type":"name","properties":{"name":"EPSG:3857"}},"coordinates":[[0,0],[1,1]]})") ==
        "f.geojson: /crs: only WGS 84 longitude/latitude is read (got \"EPSG:3857\", expected no crs member, or urn:ogc:def:crs:OGC:1.3:CRS84)");
  CHECK(error_of(R"({"type":"LineString","coordinates":[[0,0],[181,1]]})").find("f.geojson: /coordinates/1/0: ") == 0);
  CHECK(error_of(R"({"type":"LineString","coordinates":[[0,0],[1,-90.5]]})").find("f.geojson: /coordinates/1/1: ") == 0);
  CHECK(error_of(R"({"type":"LineString","coordinates":[[0,0]]})").find("/coordinates: a LineString needs at least two") != std::string::npos);
  CHECK(error_of(R"({"type":"Polygon","coordinates":[]})").find("/coordinates: an empty polygon") != std::string::npos);
  CHECK(error_of(R"({"type":"Polygon","coordinates":[[[0,0],[1,0],[0,0]]]})").find("/coordinates/0: a linear ring needs four") != std::string::npos);
  CHECK(error_of(R"({"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,1]]]})").find("/coordinates/0/3: the ring is not closed") != std::string::npos);
  CHECK(error_of(R"({"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]],[[0.1,0.1],[0.2,0.1],[0.2,0.2],[0.1,0.1]]]})")
            .find("/coordinates/1: holes") != std::string::npos);
  CHECK(error_of(R"({"type":"MultiPoint","coordinates":[[0,0]]})").find("f.geojson: /type: unsupported GeoJSON type") != std::string::npos);
  CHECK(error_of(R"({"type":"FeatureCollection","features":[{"type":"Feature","properties":{"role":"base"},"geometry":{"type":"Point","coordinates":[0,0]}}]})")
            .find("/features/0/properties/role: unknown role") != std::string::npos);
  CHECK(error_of(R"({"type":"LineString","coordinates":[[0,0],["1",1]]})").find("/coordinates/1/0: not a number") != std::string::npos);
  CHECK(error_of(R"({"type":"LineString","coordinates":[[0,0],[1,1,-5]]})").find("/coordinates/1/2: ") != std::string::npos);
}

TEST_CASE("geojson: more vertices than the documented limit are refused at the first one past it") {
  std::string t = R"({"type":"LineString","coordinates":[)";
  for (std::size_t i = 0; i <= sortie::io::kMaxGeoJsonVertices; ++i) t += (i ? ",[" : "[") + std::to_string(i * 1e-5) + ",1]";
  t += "]}";
  CHECK(error_of(t).find("/coordinates/" + std::to_string(sortie::io::kMaxGeoJsonVertices) + ": too many vertices") != std::string::npos);
  // One fewer is read.
  std::string ok = R"({"type":"LineString","coordinates":[)";
  for (std::size_t i = 0; i < sortie::io::kMaxGeoJsonVertices; ++i) ok += (i ? ",[" : "[") + std::to_string(i * 1e-5) + ",1]";
  ok += "]}";
  CHECK(parse_geojson_text(ok, "ok").route.size() == sortie::io::kMaxGeoJsonVertices);
}
