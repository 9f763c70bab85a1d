#!/usr/bin/env python3
"""Build tests/fonts/RatlineTestVar.ttf: a tiny variable TrueType font of our own for the
variation tests, with fontTools.fontBuilder.

One axis, wght 100..400..900 (default 400). Glyphs: .notdef, space, A, H, V, x, drawn as
straight-sided polygons (em 1000, cap height 700, x-height 500), and two degenerate ones for the
bad-input tests: hyphen, a closed contour whose points lie on one line (it encloses no area),
and period, a contour whose points all coincide. Going to wght 900 the stems
widen by 100 units and the advances grow by 100 (gvar deltas on the outline points and on the
right phantom point; no HVAR, so readers take the advance from the phantom point).

Run from the repository root: python3 tests/fonts/make_test_variable_font.py
"""

from fontTools.fontBuilder import FontBuilder
from fontTools.pens.ttGlyphPen import TTGlyphPen
from fontTools.ttLib.tables.TupleVariation import TupleVariation


def polygons(*polys):
    pen = TTGlyphPen(None)
    for poly in polys:
        pen.moveTo(poly[0])
        for p in poly[1:]:
            pen.lineTo(p)
        pen.closePath()
    return pen.glyph()


def rect(x0, y0, x1, y1):
    return [(x0, y0), (x0, y1), (x1, y1), (x1, y0)]


# name: (advance, contours, per-point x deltas at wght 900)
GLYPHS = {
    ".notdef": (500, [rect(50, 0, 450, 700)], [0, 0, 100, 100]),
    "space": (250, [], []),
    "A": (640, [[(20, 0), (300, 700), (340, 700), (620, 0), (540, 0), (320, 560), (100, 0)]],
          [0, 0, 100, 100, 100, 50, 0]),
    "H": (700, [rect(80, 0, 160, 700), rect(160, 320, 540, 400), rect(540, 0, 620, 700)],
          [0, 0, 100, 100, 100, 100, 100, 100, 100, 100, 100, 100]),
    "V": (640, [[(20, 700), (100, 700), (320, 140), (540, 700), (620, 700), (340, 0), (300, 0)]],
          [0, 0, 50, 100, 100, 100, 100]),
    "x": (520, [[(30, 0), (230, 250), (30, 500), (120, 500), (260, 320), (400, 500), (490, 500),
                 (290, 250), (490, 0), (400, 0), (260, 180), (120, 0)]],
          [0, 0, 0, 0, 50, 100, 100, 100, 100, 100, 50, 0]),
    "hyphen": (400, [[(50, 300), (200, 300), (350, 300)]], [0, 50, 100]),
    "period": (300, [[(150, 0), (150, 0), (150, 0)]], [0, 0, 0]),
}


def main():
    fb = FontBuilder(1000, isTTF=True)
    order = list(GLYPHS)
    fb.setupGlyphOrder(order)
    fb.setupCharacterMap({32: "space", 45: "hyphen", 46: "period", 65: "A", 72: "H", 86: "V",
                          120: "x"})
    fb.setupGlyf({n: polygons(*GLYPHS[n][1]) for n in order})
    glyf = fb.font["glyf"]
    fb.setupHorizontalMetrics({n: (GLYPHS[n][0], getattr(glyf[n], "xMin", 0)) for n in order})
    fb.setupHorizontalHeader(ascent=900, descent=-250)
    fb.setupNameTable({"familyName": "Ratline Test Var", "styleName": "Regular"})
    fb.setupOS2(sTypoAscender=900, sTypoDescender=-250, usWinAscent=900, usWinDescent=250,
                sCapHeight=700, sxHeight=500, version=4)
    fb.setupPost()
    fb.setupFvar([("wght", 100, 400, 900, "Weight")], [])
    variations = {}
    for name, (_, _, dx) in GLYPHS.items():
        # One delta per point the pen kept (it drops a closing point equal to the first), then
        # the four phantom points: left, right, top, bottom.
        n = glyf[name].numberOfContours and len(glyf[name].coordinates)
        deltas = [(d, 0) for d in (dx + [0] * n)[:n]] + [(0, 0), (100, 0), (0, 0), (0, 0)]
        variations[name] = [TupleVariation({"wght": (0.0, 1.0, 1.0)}, deltas)]
    fb.setupGvar(variations)
    fb.save("tests/fonts/RatlineTestVar.ttf")


if __name__ == "__main__":
    main()
