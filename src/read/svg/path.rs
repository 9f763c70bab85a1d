//! SVG path data (SVG 1.1 Second Edition §8.3) into subpaths of exact segments, in user units.
//!
//! Tokens come from `svgtypes::PathParser`, which spells out implicit repeated commands; this
//! module resolves everything else itself, so that `A` commands stay arcs:
//! - relative commands are offsets from the current point (§8.3.2);
//! - `H`/`V` keep the other coordinate (§8.3.4);
//! - `S` reflects the previous `C`/`S` second control point about the current point, `T` the
//!   previous `Q`/`T` control point; after any other command the control point is the current
//!   point (§8.3.6, §8.3.7);
//! - `Z` draws a line back to the subpath start when it is not already there and marks the
//!   subpath closed; a command after `Z` other than `M` starts a new subpath at that same start
//!   point (§8.3.3);
//! - `A` goes through `svg_arc_to_center` (Appendix F.6) and becomes exact conics of at most 90°.
//!
//! Malformed data (§F.2 "error processing") would render up to the error; this reader instead
//! refuses the whole element, so nothing is cut from a path the file does not fully describe.

use kurbo::{CubicBez, Line, Point, QuadBez, Vec2};
use svgtypes::{PathParser, PathSegment};

use crate::geom::{svg_arc_to_center, Conic, Segment, SvgArcParams, SvgArcShape};

/// One subpath: its segments (possibly none, for a lone moveto) and whether `Z` closed it.
#[derive(Clone, Debug, Default, PartialEq)]
pub(super) struct Subpath {
    pub segments: Vec<Segment>,
    pub closed: bool,
}

impl Subpath {
    /// Appends a segment unless it has zero extent (all its points coincide).
    pub fn push(&mut self, s: Segment) {
        let zero = match &s {
            Segment::Line(l) => l.p0 == l.p1,
            Segment::Quad(q) => q.p0 == q.p1 && q.p1 == q.p2,
            Segment::Cubic(c) => c.p0 == c.p1 && c.p1 == c.p2 && c.p2 == c.p3,
            Segment::Conic(k) => {
                let [a, b, c] = k.points();
                a == b && b == c
            }
            Segment::Arc(a) => a.radius == 0.0 || a.sweep == 0.0,
        };
        if !zero {
            self.segments.push(s);
        }
    }

    pub fn line(&mut self, a: Point, b: Point) {
        self.push(Segment::Line(Line::new(a, b)));
    }
}

/// Where path data went wrong.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(super) struct PathError(pub String);

fn error_position(e: &svgtypes::Error) -> Option<usize> {
    use svgtypes::Error as E;
    match e {
        E::UnexpectedData(p) | E::InvalidNumber(p) => Some(*p),
        E::InvalidChar(_, p) | E::InvalidString(_, p) => Some(*p),
        _ => None,
    }
}

/// The message for a token svgtypes refused: the character offset (from 1, as svgtypes counts)
/// and the text found there.
fn token_error(d: &str, e: &svgtypes::Error) -> PathError {
    match error_position(e) {
        Some(p) => {
            let near: String = d.chars().skip(p.saturating_sub(1)).take(12).collect();
            PathError(format!(
                "malformed path data at character {p} (counting from 1), near '{near}': {e}"
            ))
        }
        None => PathError(format!("malformed path data: {e}")),
    }
}

/// The state of the pen while walking the commands.
struct Pen {
    done: Vec<Subpath>,
    open: Option<Subpath>,
    cur: Point,
    start: Point,
    /// The reflection point for `S` (after `C`/`S`) or `T` (after `Q`/`T`).
    last_cubic: Option<Point>,
    last_quad: Option<Point>,
}

impl Pen {
    fn at(&self, abs: bool, x: f64, y: f64) -> Point {
        if abs {
            Point::new(x, y)
        } else {
            self.cur + Vec2::new(x, y)
        }
    }

    /// The subpath being drawn, starting a new one at the last start point after a `Z`.
    fn open(&mut self) -> &mut Subpath {
        self.open.get_or_insert_with(Subpath::default)
    }

    fn finish(&mut self) {
        if let Some(s) = self.open.take() {
            self.done.push(s);
        }
    }
}

/// Exact conics for an SVG arc from `from` to `to`, with the end points snapped to the given
/// ones so that consecutive segments meet exactly.
fn arc_segments(p: &SvgArcParams, out: &mut Subpath) {
    match svg_arc_to_center(p) {
        SvgArcShape::Omitted => {}
        SvgArcShape::Line => out.line(p.from, p.to),
        SvgArcShape::Arc(e) => {
            let conics = e.to_conics();
            let n = conics.len();
            for (i, c) in conics.into_iter().enumerate() {
                let [mut a, b, mut z] = c.points();
                if i == 0 {
                    a = p.from;
                }
                if i + 1 == n {
                    z = p.to;
                }
                let c = Conic::new(a, b, c.weight(), z).unwrap_or(c);
                out.push(Segment::Conic(c));
            }
        }
    }
}

/// Parses path data into subpaths (index = position in the result, lone movetos included).
pub(super) fn parse_path(d: &str) -> Result<Vec<Subpath>, PathError> {
    let mut pen = Pen {
        done: Vec::new(),
        open: None,
        cur: Point::ORIGIN,
        start: Point::ORIGIN,
        last_cubic: None,
        last_quad: None,
    };
    for (k, seg) in PathParser::from(d).enumerate() {
        let seg = seg.map_err(|e| token_error(d, &e))?;
        let (mut cubic, mut quad) = (None, None);
        let cur = pen.cur;
        use PathSegment as P;
        let to = match seg {
            P::MoveTo { abs, x, y } => {
                pen.finish();
                let p = pen.at(abs, x, y);
                pen.start = p;
                pen.open = Some(Subpath::default());
                p
            }
            P::LineTo { abs, x, y } => {
                let p = pen.at(abs, x, y);
                pen.open().line(cur, p);
                p
            }
            P::HorizontalLineTo { abs, x } => {
                let p = Point::new(if abs { x } else { cur.x + x }, cur.y);
                pen.open().line(cur, p);
                p
            }
            P::VerticalLineTo { abs, y } => {
                let p = Point::new(cur.x, if abs { y } else { cur.y + y });
                pen.open().line(cur, p);
                p
            }
            P::CurveTo {
                abs,
                x1,
                y1,
                x2,
                y2,
                x,
                y,
            } => {
                let (c1, c2, p) = (pen.at(abs, x1, y1), pen.at(abs, x2, y2), pen.at(abs, x, y));
                pen.open()
                    .push(Segment::Cubic(CubicBez::new(cur, c1, c2, p)));
                cubic = Some(c2);
                p
            }
            P::SmoothCurveTo { abs, x2, y2, x, y } => {
                let c1 = pen.last_cubic.map_or(cur, |c| cur + (cur - c));
                let (c2, p) = (pen.at(abs, x2, y2), pen.at(abs, x, y));
                pen.open()
                    .push(Segment::Cubic(CubicBez::new(cur, c1, c2, p)));
                cubic = Some(c2);
                p
            }
            P::Quadratic { abs, x1, y1, x, y } => {
                let (c1, p) = (pen.at(abs, x1, y1), pen.at(abs, x, y));
                pen.open().push(Segment::Quad(QuadBez::new(cur, c1, p)));
                quad = Some(c1);
                p
            }
            P::SmoothQuadratic { abs, x, y } => {
                let c1 = pen.last_quad.map_or(cur, |c| cur + (cur - c));
                let p = pen.at(abs, x, y);
                pen.open().push(Segment::Quad(QuadBez::new(cur, c1, p)));
                quad = Some(c1);
                p
            }
            P::EllipticalArc {
                abs,
                rx,
                ry,
                x_axis_rotation,
                large_arc,
                sweep,
                x,
                y,
            } => {
                let p = pen.at(abs, x, y);
                let params = SvgArcParams {
                    from: cur,
                    rx,
                    ry,
                    x_rotation_deg: x_axis_rotation,
                    large_arc,
                    sweep,
                    to: p,
                };
                arc_segments(&params, pen.open());
                p
            }
            P::ClosePath { .. } => {
                let start = pen.start;
                let sub = pen.open();
                sub.line(cur, start);
                sub.closed = true;
                pen.finish();
                start
            }
        };
        if !(to.x.is_finite() && to.y.is_finite()) {
            return Err(PathError(format!(
                "path command {} leads to a coordinate out of range",
                k + 1
            )));
        }
        pen.cur = to;
        pen.last_cubic = cubic;
        pen.last_quad = quad;
    }
    pen.finish();
    Ok(pen.done)
}

#[cfg(test)]
mod tests {
    use super::*;

    // SVG 1.1 §8.3.6: the first control point of S is the reflection of the previous second
    // control point about the current point.
    #[test]
    fn smooth_cubic_reflects() {
        let s = parse_path("M0,0 C0,10 10,10 10,0 s10,-10 10,0").unwrap();
        match s[0].segments[1] {
            Segment::Cubic(c) => {
                assert_eq!(c.p1, Point::new(10.0, -10.0));
                assert_eq!(c.p2, Point::new(20.0, -10.0));
                assert_eq!(c.p3, Point::new(20.0, 0.0));
            }
            ref o => panic!("expected a cubic, got {o:?}"),
        }
    }

    // SVG 1.1 §8.3.7: T after a non-quadratic takes the current point as control point.
    #[test]
    fn smooth_quad_without_previous_quad() {
        let s = parse_path("M0,0 L5,5 T10,0").unwrap();
        match s[0].segments[1] {
            Segment::Quad(q) => assert_eq!(q.p1, Point::new(5.0, 5.0)),
            ref o => panic!("expected a quadratic, got {o:?}"),
        }
    }

    // SVG 1.1 §8.3.3: after Z, a drawing command starts a new subpath at the same start.
    #[test]
    fn command_after_close_starts_at_subpath_start() {
        let s = parse_path("M1,1 h4 v4 z l2,0").unwrap();
        assert_eq!(s.len(), 2);
        assert!(s[0].closed && !s[1].closed);
        assert_eq!(s[1].segments[0].start(), Point::new(1.0, 1.0));
        assert_eq!(s[1].segments[0].end(), Point::new(3.0, 1.0));
    }

    #[test]
    fn bad_token_is_located() {
        let e = parse_path("M0,0 L10,10 L20,x").unwrap_err();
        assert!(e.0.contains("character"), "{}", e.0);
        assert!(
            e.0.contains("character 17 (counting from 1), near 'x'"),
            "{}",
            e.0
        );
        // svgtypes refuses a number that overflows f64; a sum that overflows is caught here.
        let e = parse_path("M0,0 L1e400,0").unwrap_err();
        assert!(e.0.contains("character 7"), "{}", e.0);
        let e = parse_path("M1e308,0 l1e308,0").unwrap_err();
        assert!(e.0.contains("out of range"), "{}", e.0);
    }
}
