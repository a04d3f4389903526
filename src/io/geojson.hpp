#pragma once
/// GeoJSON in (RFC 7946): WGS 84 longitude/latitude in decimal degrees, nothing else.
/// Accepted shapes (a bare geometry, a Feature, or a FeatureCollection of Features):
///   - a route: one LineString, or Point features in file order (the vertices);
///   - a field: one Polygon (outer ring only; holes are refused);
///   - with either, at most one Point feature whose properties say "role": "home".
/// A vertex's height above the field, in metres, is a LineString position's third number or a
/// Point feature's "height_m" property (RFC 7946 leaves the third number's datum open; here it is
/// always height above the take-off field, never above the ellipsoid or sea level).
/// A "crs" member (removed from RFC 7946, still written by older tools) is refused unless it
/// names WGS 84 longitude/latitude (OGC CRS84 or EPSG 4326, read in longitude, latitude order).
#include <cstddef>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "geo/geodesy.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

/// Most vertices one file may hold (route vertices plus ring vertices).
inline constexpr std::size_t kMaxGeoJsonVertices = 10000;

struct GeoVertex {
  geo::LonLat at;
  std::optional<double> height_m;  ///< above the field, m
  std::string pointer;             ///< where it was read, for messages
};

struct GeoInput {
  Source source;
  std::vector<GeoVertex> route;             ///< empty when the file holds a field
  std::vector<GeoVertex> ring;              ///< the field's outer ring, not closed again
  std::string ring_pointer;                 ///< "/features/0/geometry/coordinates/0"
  std::optional<GeoVertex> home;
};

GeoInput load_geojson_file(const std::filesystem::path& path);
/// From text (tests); `name` is shown in messages.
GeoInput parse_geojson_text(const std::string& text, const std::string& name);

}  // namespace sortie::io
