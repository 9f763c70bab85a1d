#!/usr/bin/env python3
"""Read a font a second way, with fontTools, for tests/font_reader.rs.

Prints one JSON object: the font's metrics (head.unitsPerEm, hhea, OS/2), the advance widths
and cmap entries of a few letters, the 'A'+'V' and 'H'+'H' kerning from the kern table and from GPOS, and
per glyph (ids 0..FIRST-1 plus every STRIDE-th id after) the contours as fontTools' pen
protocol draws them (TrueType quadratics with implied on-curve points made explicit, CFF
cubics, composites decomposed), closed by the same rule ratline uses: a closing line when the
last point differs from the first, zero-length segments (all points equal) dropped, empty
contours dropped. Per contour: the count of lines, quadratics and cubics (the number of
segments of a closed contour is its number of on-curve points) and the tight bounding box from
fontTools.misc.bezierTools. Per glyph: the control-point bounding box and the lone points
(single-point contours, which draw nothing).

With axis settings such as wght=700 (a variable font), the font is first instantiated there
by fontTools.varLib.instancer and the instance is read.

Usage: fonttools_check.py FONT [FIRST [STRIDE]] [TAG=VALUE ...]
"""

import json
import sys

try:
    from fontTools.misc.bezierTools import calcCubicBounds, calcQuadraticBounds
    from fontTools.pens.basePen import BasePen
    from fontTools.ttLib import TTFont
except ImportError as e:  # the Rust test shows this message
    sys.exit(f"fontTools is not installed ({e}); run: pip install -r tests/requirements.txt")


class SegmentPen(BasePen):
    """Collects closed contours of ('line'|'quad'|'cubic', [points]) segments."""

    def __init__(self, glyphset):
        super().__init__(glyphset)
        self.contours = []
        self.start = self.last = None
        self.segs = []
        self.lone_points = []

    def _moveTo(self, p):
        self._finish()
        self.start = self.last = p

    def _add(self, kind, pts):
        p0 = self.last
        if any(q != p0 for q in pts):
            self.segs.append((kind, [p0] + list(pts)))
        self.last = pts[-1]

    def _lineTo(self, p):
        self._add("line", [p])

    def _qCurveToOne(self, p1, p2):
        self._add("quad", [p1, p2])

    def _curveToOne(self, p1, p2, p3):
        self._add("cubic", [p1, p2, p3])

    def _closePath(self):
        self._finish()

    def _endPath(self):
        self._finish()

    def _finish(self):
        if self.start is None:
            return
        if self.last != self.start:
            self.segs.append(("line", [self.last, self.start]))
        if self.segs:
            self.contours.append(self.segs)
        else:
            self.lone_points.append(self.start)
        self.start = self.last = None
        self.segs = []


def seg_bounds(kind, pts):
    if kind == "line":
        xs = [p[0] for p in pts]
        ys = [p[1] for p in pts]
        return (min(xs), min(ys), max(xs), max(ys))
    if kind == "quad":
        return calcQuadraticBounds(*pts)
    return calcCubicBounds(*pts)


def union(a, b):
    return (min(a[0], b[0]), min(a[1], b[1]), max(a[2], b[2]), max(a[3], b[3]))


def contour_record(segs):
    counts = {"line": 0, "quad": 0, "cubic": 0}
    box = None
    for kind, pts in segs:
        counts[kind] += 1
        b = seg_bounds(kind, pts)
        box = b if box is None else union(box, b)
    return {
        "lines": counts["line"],
        "quads": counts["quad"],
        "cubics": counts["cubic"],
        "bbox": list(box),
    }


def gpos_pair_x_advance(font, left, right):
    """The XAdvance of left's value record for the pair (left, right) in the GPOS lookups of
    the 'kern' feature (pair adjustment, formats 1 and 2, through extension lookups)."""
    if "GPOS" not in font:
        return None
    gpos = font["GPOS"].table
    lookups = set()
    for fr in gpos.FeatureList.FeatureRecord:
        if fr.FeatureTag == "kern":
            lookups.update(fr.Feature.LookupListIndex)
    for li in sorted(lookups):
        lookup = gpos.LookupList.Lookup[li]
        for st in lookup.SubTable:
            if lookup.LookupType == 9:
                st = st.ExtSubTable
            if st.LookupType != 2 or left not in st.Coverage.glyphs:
                continue
            if st.Format == 1:
                pair_set = st.PairSet[st.Coverage.glyphs.index(left)]
                for r in pair_set.PairValueRecord:
                    if r.SecondGlyph == right:
                        return getattr(r.Value1, "XAdvance", 0)
            else:
                c1 = st.ClassDef1.classDefs.get(left, 0)
                c2 = st.ClassDef2.classDefs.get(right, 0)
                return getattr(st.Class1Record[c1].Class2Record[c2].Value1, "XAdvance", 0)
    return None


def draw(font, glyphset, name):
    """The glyph's contours. TrueType glyphs are drawn from 'glyf' as stored: fontTools' glyph
    set would move a glyph whose hmtx left side bearing disagrees with its glyf xMin (DejaVu
    Sans's U+0EB1 by one unit), which the OpenType outline data does not ask for."""
    pen = SegmentPen(glyphset)
    if "glyf" in font:
        font["glyf"][name].draw(pen, font["glyf"])
    else:
        glyphset[name].draw(pen)
    pen._finish()
    return pen


def main():
    path = sys.argv[1]
    axes = dict(a.split("=") for a in sys.argv[2:] if "=" in a)
    numbers = [int(a) for a in sys.argv[2:] if "=" not in a]
    first = numbers[0] if numbers else 300
    stride = numbers[1] if len(numbers) > 1 else 20
    font = TTFont(path)
    if axes:
        from fontTools.varLib import instancer

        font = instancer.instantiateVariableFont(font, {k: float(v) for k, v in axes.items()})
    order = font.getGlyphOrder()
    glyphset = font.getGlyphSet()
    cmap = font.getBestCmap()
    os2 = font["OS/2"]
    hhea = font["hhea"]

    ids = list(range(min(first, len(order)))) + list(range(first, len(order), stride))
    glyphs = []
    for gid in ids:
        name = order[gid]
        pen = draw(font, glyphset, name)
        pts = [p for segs in pen.contours for _, seg in segs for p in seg]
        control = None
        if pts:
            control = [min(p[0] for p in pts), min(p[1] for p in pts),
                       max(p[0] for p in pts), max(p[1] for p in pts)]
        glyphs.append({
            "id": gid,
            "name": name,
            "advance": font["hmtx"][name][0],
            "contours": [contour_record(c) for c in pen.contours],
            "control_bbox": control,
            "lone_points": [list(p) for p in pen.lone_points],
            "composite": "glyf" in font and font["glyf"][name].isComposite(),
        })

    letters = {}
    for ch in "AHVx":
        name = cmap.get(ord(ch))
        boxes = [contour_record(c)["bbox"] for c in draw(font, glyphset, name).contours]
        box = boxes[0]
        for b in boxes[1:]:
            box = union(box, b)
        letters[ch] = {
            "glyph": font.getGlyphID(name),
            "advance": font["hmtx"][name][0],
            "bbox": list(box),
        }

    kern = {}
    for pair in ["AV", "HH"]:
        left, right = cmap[ord(pair[0])], cmap[ord(pair[1])]
        table = None
        if "kern" in font:
            table = font["kern"].kernTables[0].kernTable.get((left, right))
        kern[pair] = {"kern_table": table, "gpos": gpos_pair_x_advance(font, left, right)}

    print(json.dumps({
        "units_per_em": font["head"].unitsPerEm,
        "num_glyphs": len(order),
        "hhea": {"ascender": hhea.ascent, "descender": hhea.descent, "line_gap": hhea.lineGap},
        "os2": {
            "version": os2.version,
            "cap_height": getattr(os2, "sCapHeight", None),
            "use_typo_metrics": bool(os2.fsSelection & (1 << 7)),
        },
        "letters": letters,
        "kern": kern,
        "glyphs": glyphs,
    }))


if __name__ == "__main__":
    main()
