#pragma once
/// Geodesics on the WGS 84 ellipsoid and a local tangent plane, both from GeographicLib
/// (Karney 2013); nothing here solves a geodesic itself.
#include <vector>

namespace sortie::geo {

/// A point in WGS 84 degrees (GeoJSON order is longitude, latitude).
struct LonLat {
  double lon_deg = 0.0;
  double lat_deg = 0.0;
};

/// The inverse problem between two points: distance along the geodesic and its azimuths.
struct Inverse {
  double distance_m = 0.0;  ///< s12, m
  double azi1_deg = 0.0;    ///< azimuth at the first point, degrees clockwise from north
  double azi2_deg = 0.0;    ///< forward azimuth at the second point, degrees
};

/// GeographicLib::Geodesic::WGS84().Inverse.
Inverse inverse(const LonLat& a, const LonLat& b);
/// GeographicLib::Geodesic::WGS84().Direct: the point `distance_m` from `a` along `azi1_deg`.
LonLat direct(const LonLat& a, double azi1_deg, double distance_m, double* azi2_deg = nullptr);

/// An azimuth in [0, 360).
double track_0_360(double deg);

/// East/north metres in the plane tangent to the ellipsoid at an origin (GeographicLib
/// LocalCartesian at height 0). Over a field of a few km the plane's distances differ from the
/// geodesic ones by parts per million; routes are measured on the ellipsoid, not here.
struct Xy {
  double x = 0.0;  ///< east, m
  double y = 0.0;  ///< north, m
};

class LocalPlane {
 public:
  explicit LocalPlane(const LonLat& origin);
  Xy forward(const LonLat& p) const;
  LonLat reverse(const Xy& p) const;

 private:
  LonLat origin_;
};

}  // namespace sortie::geo
