#include "geo/geodesy.hpp"

#include <GeographicLib/Geodesic.hpp>
#include <GeographicLib/LocalCartesian.hpp>
#include <cmath>

namespace sortie::geo {

Inverse inverse(const LonLat& a, const LonLat& b) {
  Inverse r;
  GeographicLib::Geodesic::WGS84().Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg,
                                           r.distance_m, r.azi1_deg, r.azi2_deg);
  return r;
}

LonLat direct(const LonLat& a, double azi1_deg, double distance_m, double* azi2_deg) {
  LonLat b;
  double azi2 = 0.0;
  GeographicLib::Geodesic::WGS84().Direct(a.lat_deg, a.lon_deg, azi1_deg, distance_m, b.lat_deg,
                                          b.lon_deg, azi2);
  if (azi2_deg != nullptr) *azi2_deg = azi2;
  return b;
}

double track_0_360(double deg) {
  double t = std::fmod(deg, 360.0);
  if (t < 0.0) t += 360.0;
  if (t >= 360.0) t = 0.0;  // -1e-17 + 360 rounds to 360
  return t;
}

LocalPlane::LocalPlane(const LonLat& origin) : origin_(origin) {}

Xy LocalPlane::forward(const LonLat& p) const {
  const GeographicLib::LocalCartesian lc(origin_.lat_deg, origin_.lon_deg, 0.0,
                                         GeographicLib::Geocentric::WGS84());
  double x = 0.0, y = 0.0, z = 0.0;
  lc.Forward(p.lat_deg, p.lon_deg, 0.0, x, y, z);
  return {x, y};
}

LonLat LocalPlane::reverse(const Xy& p) const {
  const GeographicLib::LocalCartesian lc(origin_.lat_deg, origin_.lon_deg, 0.0,
                                         GeographicLib::Geocentric::WGS84());
  // The point on the ellipsoid below the plane point: the plane point itself lies a little
  // above the ellipsoid (z = 0 in the plane), so the returned height is dropped.
  LonLat r;
  double h = 0.0;
  lc.Reverse(p.x, p.y, 0.0, r.lat_deg, r.lon_deg, h);
  return r;
}

}  // namespace sortie::geo
