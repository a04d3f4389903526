#!/usr/bin/python3
"""Write profiles/demo-fixed-wing-field.geojson: an invented 1.5 km by 1.6 km field whose
corners lie at geodesic offsets from an invented home point (python3-geographiclib), laid out so
that north-south lines 250 m apart reproduce the hand-written legs of
profiles/demo-fixed-wing-field-survey.json (six 1600 m lines, 250 m steps, 1500 m home upwind)."""
import json
import sys
from geographiclib.geodesic import Geodesic

g = Geodesic.WGS84
home = (8.6102, 46.3123)  # invented: lon, lat


def move(p, azi, s):
    r = g.Direct(p[1], p[0], azi, s)
    return (round(r["lon2"], 8), round(r["lat2"], 8))


sw = move(home, 90, 125)   # the first line is 125 m inside the west edge: 250 m east of home
se = move(sw, 90, 1500)
ne = move(se, 0, 1600)
nw = move(sw, 0, 1600)
doc = {
    "type": "FeatureCollection",
    "features": [
        {"type": "Feature", "properties": {"name": "demo field (invented)", "note": "invented field for trying sortie route"},
         "geometry": {"type": "Polygon", "coordinates": [[list(sw), list(se), list(ne), list(nw), list(sw)]]}},
        {"type": "Feature", "properties": {"role": "home", "name": "demo home (invented)"},
         "geometry": {"type": "Point", "coordinates": list(home)}},
    ],
}
out = sys.argv[1] if len(sys.argv) > 1 else "profiles/demo-fixed-wing-field.geojson"
with open(out, "w") as f:
    json.dump(doc, f, indent=2)
    f.write("\n")
