#!/usr/bin/python3
"""Read a DXF file with ezdxf (Debian python3-ezdxf) and print, per layer,
the number of closed polylines and the sum of their areas in mm², arcs
(bulges) flattened to 0.1 µm. Also prints the drawing units ($INSUNITS).

Usage: dxf_areas.py FILE.dxf
Output lines: "units <n>", then "<layer> <closed> <open> <area_mm2>".
"""
import sys

import ezdxf
from ezdxf import path


def area(points):
    s = 0.0
    for (x0, y0), (x1, y1) in zip(points, points[1:] + points[:1]):
        s += x0 * y1 - x1 * y0
    return abs(s) / 2


def main():
    doc = ezdxf.readfile(sys.argv[1])
    print("units", doc.header.get("$INSUNITS", 0))
    layers = {}
    for e in doc.modelspace():
        if e.dxftype() not in ("POLYLINE", "LWPOLYLINE"):
            print("unexpected entity", e.dxftype())
            continue
        rec = layers.setdefault(e.dxf.layer, [0, 0, 0.0])
        if not e.is_closed:
            rec[1] += 1
            continue
        rec[0] += 1
        pts = [(v.x, v.y) for v in path.make_path(e).flattening(0.0001)]
        if len(pts) > 1 and pts[0] == pts[-1]:
            pts = pts[:-1]
        rec[2] += area(pts)
    for name in sorted(layers):
        c, o, a = layers[name]
        print(name, c, o, "%.9f" % a)


if __name__ == "__main__":
    main()
