//! Lines: a piece of curve becomes its chord, with both vertices on the curve.
//!
//! Exact deviation of a chord. Let u be the unit chord direction and write the piece in chord
//! coordinates x(t) = (C(t) − P0)·u, y(t) = (C(t) − P0) × u. When x(t) is non-decreasing (the
//! piece is a graph over its chord) every curve point projects inside the chord at distance
//! |y(t)|, and every chord point has a curve point straight above it, so the symmetric Hausdorff
//! distance is exactly max|y(t)|. x(t) is non-decreasing when the hodograph's control points all
//! point forward along u (convex hull property; for a conic its derivative numerator's Bernstein
//! coefficients, `conic.rs`). Then:
//! - quadratic: y(t) = 2t(1−t)·y₁, maximum |y₁|/2 at t = ½;
//! - cubic: y(t) = 3t(1−t)((1−t)y₁ + t·y₂), maximum at a root of the quadratic y'(t);
//! - conic in standard form: y(t) = 2w·t(1−t)·y₁ / W(t), increasing in t(1−t), maximum
//!   |y₁|·w/(1+w) at the shoulder point t = ½ (whose tangent is parallel to the chord, Farin,
//!   *Curves and Surfaces for CAGD*, ch. 13).
//!
//! Pieces that are not graphs over their chord are measured by `measure` instead.

use kurbo::common::solve_quadratic;
use kurbo::{Line, Point, Vec2};

use crate::geom::Segment;
use crate::measure::Deviation;

/// The chord of a piece.
pub fn chord(s: &Segment) -> Vec<Segment> {
    vec![Segment::Line(Line::new(s.start(), s.end()))]
}

/// Relative allowance for floating-point evaluation of the closed forms.
const ROUNDING: f64 = 1e-12;

/// The exact Hausdorff distance between a piece and its chord, when the piece is a graph over
/// the chord; `None` otherwise (or for a piece with coincident ends).
pub fn chord_deviation(s: &Segment) -> Option<Deviation> {
    let (p0, p1) = (s.start(), s.end());
    let d = p1 - p0;
    let len = d.hypot();
    if len == 0.0 {
        return None;
    }
    let u = d / len;
    let forward = |v: Vec2| v.dot(u) >= 0.0;
    let y = |p: Point| (p - p0).cross(u);
    let (h, t) = match s {
        Segment::Line(_) => (0.0, 0.5),
        Segment::Quad(q) => {
            if !(forward(q.p1 - q.p0) && forward(q.p2 - q.p1)) {
                return None;
            }
            (0.5 * y(q.p1).abs(), 0.5)
        }
        Segment::Cubic(c) => {
            if !(forward(c.p1 - c.p0) && forward(c.p2 - c.p1) && forward(c.p3 - c.p2)) {
                return None;
            }
            let (y1, y2) = (y(c.p1), y(c.p2));
            // y(t) = 3[(1−t)²t·y1 + (1−t)t²·y2]; y'(t)/3 = y1(1 − 4t + 3t²) + y2(2t − 3t²).
            let f = |t: f64| 3.0 * t * (1.0 - t) * ((1.0 - t) * y1 + t * y2);
            let roots = solve_quadratic(y1, 2.0 * y2 - 4.0 * y1, 3.0 * y1 - 3.0 * y2);
            roots
                .iter()
                .copied()
                .filter(|t| (0.0..=1.0).contains(t))
                .map(|t| (f(t).abs(), t))
                .fold((0.0, 0.5), |a, b| if b.0 > a.0 { b } else { a })
        }
        Segment::Conic(k) => {
            let [q0, q1, q2] = k.points();
            if !(forward(q1 - q0) && forward(q2 - q1)) {
                return None;
            }
            let w = k.weight();
            (y(q1).abs() * w / (1.0 + w), 0.5)
        }
        Segment::Arc(a) => {
            if a.sweep.abs() > std::f64::consts::PI {
                return None;
            }
            (a.radius * (1.0 - (0.5 * a.sweep).cos()), 0.5)
        }
    };
    let at = s.eval(t);
    let scale = p0.to_vec2().hypot().max(p1.to_vec2().hypot()).max(len);
    Some(Deviation {
        bound: h + ROUNDING * scale,
        sampled: h,
        at: [at.x, at.y],
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::measure::hausdorff;
    use kurbo::{CubicBez, QuadBez};

    #[test]
    fn closed_forms_agree_with_the_certified_measurement() {
        let cases = [
            Segment::Quad(QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0))),
            Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (2.0, 3.0),
                (7.0, -2.0),
                (10.0, 0.0),
            )),
            Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (3.0, 4.0),
                (6.0, 4.0),
                (10.0, 1.0),
            )),
            Segment::Conic(
                crate::geom::Conic::new(
                    Point::new(0.0, 0.0),
                    Point::new(4.0, 6.0),
                    0.6,
                    Point::new(10.0, 1.0),
                )
                .unwrap(),
            ),
            Segment::Conic(
                crate::geom::Conic::new(
                    Point::new(0.0, 0.0),
                    Point::new(4.0, 6.0),
                    3.0,
                    Point::new(10.0, 1.0),
                )
                .unwrap(),
            ),
        ];
        for s in cases {
            let exact = chord_deviation(&s).expect("a graph over its chord");
            let m = hausdorff(&[s], &chord(&s), 1e-9);
            assert!(
                (exact.sampled - m.sampled).abs() < 1e-8,
                "{s:?}: {exact:?} vs {m:?}"
            );
            assert!(exact.bound >= m.sampled);
        }
        // Shared REFERENCES §5: the quadratic (0,0),(5,10),(10,0) is 5 from its chord.
        let q = Segment::Quad(QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0)));
        assert!((chord_deviation(&q).unwrap().sampled - 5.0).abs() < 1e-12);
        // A piece that doubles back over its chord is not a graph: no closed form.
        let back = Segment::Quad(QuadBez::new((0.0, 0.0), (-5.0, 3.0), (10.0, 0.0)));
        assert!(chord_deviation(&back).is_none());
    }
}
