//! Glyph outlines from ttf-parser's `OutlineBuilder` callbacks into closed contours of lines,
//! quadratic Béziers (TrueType `glyf`) and cubic Béziers (CFF, CFF2), in font units, y up.
//!
//! Every glyph contour is closed: the OpenType `glyf` and CFF charstring formats define only
//! closed contours (OpenType 1.9, "glyf — Glyph Data": "contours are closed"; CFF2 charstrings
//! have no `closepath` and close implicitly at the next `moveto` or the end). ttf-parser reports
//! that with `close()` for `glyf` and CFF but may end a CFF2 glyph without one, so the pen closes
//! each contour itself: on `close()`, on the next `move_to` and at the end of the glyph, adding
//! a straight closing line when the last point differs from the first. Segments whose control
//! points all coincide (zero length) are dropped; a contour left with no segment (a lone point,
//! as TrueType uses for hinting anchors) draws nothing and is dropped. A contour whose control
//! points all lie on one line lies on that line itself (convex hull property) and encloses no
//! area: [`encloses_no_area`] tells the layout to skip it with that reason.
//!
//! ttf-parser returns `None` for an empty glyph (a space) and also for a malformed one, after
//! possibly having emitted part of its outline. The pen records whether anything was emitted,
//! so [`outline`] tells an empty glyph from one that failed part way.

use kurbo::{CubicBez, Line, Point, QuadBez};
use ttf_parser::{Face, GlyphId, OutlineBuilder};

use crate::geom::Segment;

/// What a glyph's outline turned out to be, in font units with y up.
#[derive(Clone, Debug, PartialEq)]
pub(crate) enum GlyphShape {
    /// One or more closed contours, each a non-empty list of segments.
    Contours(Vec<Vec<Segment>>),
    /// No outline data at all (a space, or an empty glyph).
    Empty,
    /// Contours that are single points (all their points coincide): zero length, nothing drawn.
    Points,
    /// The outline could not be read; the reason.
    Failed(&'static str),
}

/// Outline one glyph of `face` (at its current variation coordinates).
pub(crate) fn outline(face: &Face<'_>, glyph: GlyphId) -> GlyphShape {
    let mut pen = Pen::default();
    let bbox = face.outline_glyph(glyph, &mut pen);
    let contours = pen.finish();
    match (bbox, contours.is_empty()) {
        (Some(_), false) => GlyphShape::Contours(contours),
        (Some(_), true) => GlyphShape::Points,
        (None, _) if pen.emitted => GlyphShape::Failed(
            "the glyph's outline data is malformed (reading stopped part way through)",
        ),
        (None, _) => GlyphShape::Empty,
    }
}

/// Collects ttf-parser's callbacks into closed contours.
#[derive(Debug, Default)]
struct Pen {
    contours: Vec<Vec<Segment>>,
    current: Vec<Segment>,
    /// Start and current point of the open contour, if one is open.
    open: Option<(Point, Point)>,
    /// Whether any callback arrived at all.
    emitted: bool,
}

impl Pen {
    fn close_current(&mut self) {
        if let Some((start, last)) = self.open.take() {
            if last != start {
                self.current.push(Segment::Line(Line::new(last, start)));
            }
            if !self.current.is_empty() {
                self.contours.push(std::mem::take(&mut self.current));
            }
        }
    }

    /// Append a segment from the current point through `points` (the last is the new current
    /// point). A segment before any `move_to` starts at the origin, as in PostScript-style
    /// outline formats (CFF charstrings start at (0, 0)).
    fn push(&mut self, points: &[Point], make: impl FnOnce(Point) -> Segment) {
        self.emitted = true;
        let (start, last) = self.open.unwrap_or((Point::ORIGIN, Point::ORIGIN));
        let end = points[points.len() - 1];
        if points.iter().any(|p| *p != last) {
            self.current.push(make(last));
        }
        self.open = Some((start, end));
    }

    fn finish(&mut self) -> Vec<Vec<Segment>> {
        self.close_current();
        std::mem::take(&mut self.contours)
    }
}

/// Whether every control point of a contour lies on one line, so that the contour (inside the
/// hull of its control points) encloses no area and a filled glyph draws nothing there. Font
/// coordinates are small integers or f32 values, so the cross products are exact in f64.
pub(crate) fn encloses_no_area(contour: &[Segment]) -> bool {
    let points: Vec<Point> = contour.iter().flat_map(Segment::control_points).collect();
    let Some(&a) = points.first() else {
        return true;
    };
    let Some(&b) = points.iter().find(|p| **p != a) else {
        return true;
    };
    points.iter().all(|&p| (b - a).cross(p - a) == 0.0)
}

fn pt(x: f32, y: f32) -> Point {
    Point::new(f64::from(x), f64::from(y))
}

impl OutlineBuilder for Pen {
    fn move_to(&mut self, x: f32, y: f32) {
        self.emitted = true;
        self.close_current();
        let p = pt(x, y);
        self.open = Some((p, p));
    }

    fn line_to(&mut self, x: f32, y: f32) {
        let p = pt(x, y);
        self.push(&[p], |p0| Segment::Line(Line::new(p0, p)));
    }

    fn quad_to(&mut self, x1: f32, y1: f32, x: f32, y: f32) {
        let (p1, p2) = (pt(x1, y1), pt(x, y));
        self.push(&[p1, p2], |p0| Segment::Quad(QuadBez::new(p0, p1, p2)));
    }

    fn curve_to(&mut self, x1: f32, y1: f32, x2: f32, y2: f32, x: f32, y: f32) {
        let (p1, p2, p3) = (pt(x1, y1), pt(x2, y2), pt(x, y));
        self.push(&[p1, p2, p3], |p0| {
            Segment::Cubic(CubicBez::new(p0, p1, p2, p3))
        });
    }

    fn close(&mut self) {
        self.emitted = true;
        self.close_current();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn kinds(c: &[Segment]) -> Vec<&'static str> {
        c.iter()
            .map(|s| match s {
                Segment::Line(_) => "L",
                Segment::Quad(_) => "Q",
                Segment::Cubic(_) => "C",
                _ => "?",
            })
            .collect()
    }

    #[test]
    fn open_contour_gets_a_closing_line() {
        // A CFF2-style glyph: no close() at the end.
        let mut p = Pen::default();
        p.move_to(0.0, 0.0);
        p.line_to(10.0, 0.0);
        p.curve_to(10.0, 5.0, 5.0, 10.0, 0.0, 10.0);
        let c = p.finish();
        assert_eq!(c.len(), 1);
        assert_eq!(kinds(&c[0]), ["L", "C", "L"]);
        assert_eq!(c[0][2].end(), Point::ORIGIN);
        assert!(p.emitted);
    }

    #[test]
    fn contour_already_back_at_start_gets_no_extra_line() {
        let mut p = Pen::default();
        p.move_to(0.0, 0.0);
        p.line_to(10.0, 0.0);
        p.quad_to(10.0, 10.0, 0.0, 0.0);
        p.close();
        let c = p.finish();
        assert_eq!(kinds(&c[0]), ["L", "Q"]);
    }

    #[test]
    fn zero_length_segments_and_lone_points_are_dropped() {
        let mut p = Pen::default();
        p.move_to(5.0, 5.0); // a lone point (TrueType hinting anchor)
        p.close();
        p.move_to(0.0, 0.0);
        p.line_to(0.0, 0.0);
        p.quad_to(0.0, 0.0, 0.0, 0.0);
        p.line_to(3.0, 0.0);
        p.curve_to(3.0, 0.0, 3.0, 0.0, 3.0, 0.0);
        p.line_to(3.0, 4.0);
        // A new move_to closes the previous contour (implicit close, CFF2).
        p.move_to(20.0, 0.0);
        p.quad_to(25.0, 5.0, 20.0, 0.0); // a loop back to the start is not zero length
        let c = p.finish();
        assert_eq!(c.len(), 2);
        assert_eq!(kinds(&c[0]), ["L", "L", "L"]);
        assert_eq!(kinds(&c[1]), ["Q"]);
    }

    #[test]
    fn contours_on_one_line_enclose_no_area() {
        let line = |a: (f64, f64), b: (f64, f64)| Segment::Line(Line::new(a, b));
        let flat = [line((0.0, 0.0), (10.0, 5.0)), line((10.0, 5.0), (0.0, 0.0))];
        assert!(encloses_no_area(&flat));
        let bent = [
            Segment::Quad(QuadBez::new((0.0, 0.0), (5.0, 2.5), (10.0, 5.0))),
            line((10.0, 5.0), (0.0, 0.0)),
        ];
        assert!(encloses_no_area(&bent));
        let triangle = [
            line((0.0, 0.0), (10.0, 0.0)),
            line((10.0, 0.0), (0.0, 1.0)),
            line((0.0, 1.0), (0.0, 0.0)),
        ];
        assert!(!encloses_no_area(&triangle));
        // A control point off the line makes a curve that bulges: not flat.
        let bulge = [
            Segment::Quad(QuadBez::new((0.0, 0.0), (5.0, 1.0), (10.0, 0.0))),
            line((10.0, 0.0), (0.0, 0.0)),
        ];
        assert!(!encloses_no_area(&bulge));
    }

    #[test]
    fn nothing_emitted_is_empty() {
        let mut p = Pen::default();
        assert!(p.finish().is_empty());
        assert!(!p.emitted);
    }
}
