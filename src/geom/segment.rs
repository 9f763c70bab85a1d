//! One piece of a contour: a line, a polynomial Bézier (kurbo's types), a conic or a circular arc.
//!
//! Speed bounds, used by `measure` to certify deviations, come from the hodograph: the derivative
//! of a degree-n Bézier is a degree-(n−1) Bézier with control points n(Pᵢ₊₁ − Pᵢ), so by the convex
//! hull property its norm never exceeds the largest of theirs (Farin, *Curves and Surfaces for
//! CAGD*, 5th ed., 2002, §5.3). Conics bound their speed in `conic.rs`; an arc's speed is r·|θ|.

use std::f64::consts::FRAC_PI_2;

use arrayvec::ArrayVec;
use kurbo::{
    Affine, CubicBez, Line, ParamCurve, ParamCurveArclen, ParamCurveDeriv, ParamCurveExtrema,
    ParamCurveNearest, Point, QuadBez, Rect, Vec2, MAX_EXTREMA,
};
use serde::Serialize;

use super::{CircularArc, Conic};

/// A contour segment, in millimetres.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Segment {
    Line(Line),
    Quad(QuadBez),
    Cubic(CubicBez),
    Conic(Conic),
    Arc(CircularArc),
}

/// The kind of a segment, for counts in reports.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum SegmentKind {
    Line,
    Quadratic,
    Cubic,
    Conic,
    Arc,
}

/// Segment counts by kind.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
pub struct SegmentCounts {
    pub line: usize,
    pub quadratic: usize,
    pub cubic: usize,
    pub conic: usize,
    pub arc: usize,
}

impl SegmentCounts {
    pub fn of(segments: &[Segment]) -> SegmentCounts {
        let mut c = SegmentCounts::default();
        for s in segments {
            c.add(s.kind());
        }
        c
    }

    pub fn add(&mut self, k: SegmentKind) {
        match k {
            SegmentKind::Line => self.line += 1,
            SegmentKind::Quadratic => self.quadratic += 1,
            SegmentKind::Cubic => self.cubic += 1,
            SegmentKind::Conic => self.conic += 1,
            SegmentKind::Arc => self.arc += 1,
        }
    }

    pub fn merge(&mut self, o: &SegmentCounts) {
        self.line += o.line;
        self.quadratic += o.quadratic;
        self.cubic += o.cubic;
        self.conic += o.conic;
        self.arc += o.arc;
    }

    pub fn total(&self) -> usize {
        self.line + self.quadratic + self.cubic + self.conic + self.arc
    }
}

fn max_norm(v: &[Vec2]) -> f64 {
    // (The root of the largest square: one root, the same value.)
    v.iter().map(|d| d.hypot2()).fold(0.0, f64::max).sqrt()
}

impl Segment {
    pub fn kind(&self) -> SegmentKind {
        match self {
            Segment::Line(_) => SegmentKind::Line,
            Segment::Quad(_) => SegmentKind::Quadratic,
            Segment::Cubic(_) => SegmentKind::Cubic,
            Segment::Conic(_) => SegmentKind::Conic,
            Segment::Arc(_) => SegmentKind::Arc,
        }
    }

    pub fn eval(&self, t: f64) -> Point {
        match self {
            Segment::Line(s) => s.eval(t),
            Segment::Quad(s) => s.eval(t),
            Segment::Cubic(s) => s.eval(t),
            Segment::Conic(s) => s.eval(t),
            Segment::Arc(s) => s.eval(t),
        }
    }

    pub fn start(&self) -> Point {
        self.eval(0.0)
    }

    pub fn end(&self) -> Point {
        self.eval(1.0)
    }

    /// The velocity at t.
    pub fn deriv_at(&self, t: f64) -> Vec2 {
        match self {
            Segment::Line(s) => s.p1 - s.p0,
            Segment::Quad(s) => s.deriv().eval(t).to_vec2(),
            Segment::Cubic(s) => s.deriv().eval(t).to_vec2(),
            Segment::Conic(s) => s.deriv_at(t),
            Segment::Arc(s) => s.deriv_at(t),
        }
    }

    /// The signed acceleration across the direction of travel at t, (v × a) / |v| (positive
    /// turning left): the curvature times the squared speed, so a chord over a parameter step h
    /// bulges by about this · h²/8 (exactly, for a parabola with the value at the step's middle).
    /// Infinite or NaN where the velocity vanishes.
    pub fn normal_acceleration_at(&self, t: f64) -> f64 {
        let across = |v: Vec2, a: Vec2| v.cross(a) / v.hypot();
        match self {
            Segment::Line(_) => 0.0,
            Segment::Quad(s) => across(
                s.deriv().eval(t).to_vec2(),
                s.deriv().deriv().eval(t).to_vec2(),
            ),
            Segment::Cubic(s) => across(
                s.deriv().eval(t).to_vec2(),
                s.deriv().deriv().eval(t).to_vec2(),
            ),
            Segment::Conic(s) => s.normal_acceleration_at(t),
            Segment::Arc(s) => s.sweep.signum() * s.radius * s.sweep * s.sweep,
        }
    }

    /// The direction of travel at t, looking past vanishing derivatives (cusps, coincident
    /// control points) to the next non-zero one; `None` for a segment of zero length.
    pub fn tangent_at(&self, t: f64) -> Option<Vec2> {
        let d = self.deriv_at(t);
        let scale = self.speed_bound();
        if scale > 0.0 && d.hypot() > 1e-9 * scale {
            return Some(d.normalize());
        }
        // Step inside the segment and take the chord direction, which tends to the tangent.
        let h = 1e-6;
        let (a, b) = if t < 0.5 { (t, t + h) } else { (t - h, t) };
        let c = self.eval(b) - self.eval(a);
        (c.hypot() > 0.0).then(|| c.normalize())
    }

    /// A rigorous upper bound on |d/dt segment(t)| over t in [0, 1].
    pub fn speed_bound(&self) -> f64 {
        match self {
            Segment::Line(s) => (s.p1 - s.p0).hypot(),
            Segment::Quad(s) => 2.0 * max_norm(&[s.p1 - s.p0, s.p2 - s.p1]),
            Segment::Cubic(s) => 3.0 * max_norm(&[s.p1 - s.p0, s.p2 - s.p1, s.p3 - s.p2]),
            Segment::Conic(s) => s.speed_bound(),
            Segment::Arc(s) => s.speed(),
        }
    }

    /// A rigorous upper bound on |d²/dt² segment(t)| over t in [0, 1] (second hodograph).
    pub fn accel_bound(&self) -> f64 {
        match self {
            Segment::Line(_) => 0.0,
            Segment::Quad(s) => {
                2.0 * (s.p0.to_vec2() - 2.0 * s.p1.to_vec2() + s.p2.to_vec2()).hypot()
            }
            Segment::Cubic(s) => {
                let a = s.p0.to_vec2() - 2.0 * s.p1.to_vec2() + s.p2.to_vec2();
                let b = s.p1.to_vec2() - 2.0 * s.p2.to_vec2() + s.p3.to_vec2();
                6.0 * max_norm(&[a, b])
            }
            Segment::Conic(s) => s.accel_bound(),
            Segment::Arc(s) => s.radius * s.sweep * s.sweep,
        }
    }

    /// The piece over [t0, t1], reparametrised to [0, 1].
    pub fn subsegment(&self, t0: f64, t1: f64) -> Segment {
        let r = t0..t1;
        match self {
            Segment::Line(s) => Segment::Line(s.subsegment(r)),
            Segment::Quad(s) => Segment::Quad(s.subsegment(r)),
            Segment::Cubic(s) => Segment::Cubic(s.subsegment(r)),
            Segment::Conic(s) => Segment::Conic(s.subconic(t0, t1)),
            Segment::Arc(s) => Segment::Arc(s.subsegment(r)),
        }
    }

    pub fn reversed(&self) -> Segment {
        match self {
            Segment::Line(s) => Segment::Line(Line::new(s.p1, s.p0)),
            Segment::Quad(s) => Segment::Quad(QuadBez::new(s.p2, s.p1, s.p0)),
            Segment::Cubic(s) => Segment::Cubic(CubicBez::new(s.p3, s.p2, s.p1, s.p0)),
            Segment::Conic(s) => Segment::Conic(s.reversed()),
            Segment::Arc(s) => Segment::Arc(s.reversed()),
        }
    }

    /// The distance from p to the segment and the parameter of the nearest point. Exact for
    /// lines, conics and arcs (closed-form roots); kurbo's solver for quadratics and cubics.
    /// Whatever the solver returns is the distance to a point of the segment, so it never
    /// underestimates the true distance.
    pub fn nearest(&self, p: Point) -> (f64, f64) {
        const ACCURACY: f64 = 1e-12;
        let n = match self {
            Segment::Line(s) => s.nearest(p, ACCURACY),
            Segment::Quad(s) => s.nearest(p, ACCURACY),
            Segment::Cubic(s) => s.nearest(p, ACCURACY),
            Segment::Conic(s) => s.nearest(p, ACCURACY),
            Segment::Arc(s) => s.nearest(p, ACCURACY),
        };
        (n.distance_sq.sqrt(), n.t)
    }

    /// The tight bounding box.
    pub fn bounding_box(&self) -> Rect {
        match self {
            Segment::Line(s) => s.bounding_box(),
            Segment::Quad(s) => s.bounding_box(),
            Segment::Cubic(s) => s.bounding_box(),
            Segment::Conic(s) => s.bounding_box(),
            Segment::Arc(s) => s
                .to_conics()
                .iter()
                .fold(Rect::from_points(s.eval(0.0), s.eval(1.0)), |r, c| {
                    r.union(c.bounding_box())
                }),
        }
    }

    /// The arc length, to the given accuracy.
    pub fn arclen(&self, accuracy: f64) -> f64 {
        match self {
            Segment::Line(s) => s.arclen(accuracy),
            Segment::Quad(s) => s.arclen(accuracy),
            Segment::Cubic(s) => s.arclen(accuracy),
            Segment::Arc(s) => s.speed(),
            Segment::Conic(s) => s.arclen(accuracy),
        }
    }

    /// Apply an affine map exactly. A circular arc stays an arc under a similarity and becomes
    /// conics otherwise, so the result may hold more than one segment.
    pub fn transform(&self, a: Affine, out: &mut Vec<Segment>) {
        match (self, self.transform_one(a)) {
            (_, Some(s)) => out.push(s),
            (Segment::Arc(s), None) => {
                out.extend(s.to_conics().iter().map(|c| Segment::Conic(c.transform(a))))
            }
            (_, None) => {}
        }
    }

    /// An affine map applied exactly to a line, Bézier or conic; `None` for a circular arc
    /// (see [`Segment::transform`]).
    pub fn transform_one(&self, a: Affine) -> Option<Segment> {
        match self {
            Segment::Line(s) => Some(Segment::Line(a * *s)),
            Segment::Quad(s) => Some(Segment::Quad(a * *s)),
            Segment::Cubic(s) => Some(Segment::Cubic(a * *s)),
            Segment::Conic(s) => Some(Segment::Conic(s.transform(a))),
            Segment::Arc(_) => None,
        }
    }

    /// The control points of a line, Bézier or conic (a conic's as projected points, its weight
    /// aside); none for a circular arc, which has a centre and radius instead.
    pub fn control_points(&self) -> ArrayVec<Point, 4> {
        let mut out = ArrayVec::new();
        match self {
            Segment::Line(l) => out.extend([l.p0, l.p1]),
            Segment::Quad(q) => out.extend([q.p0, q.p1, q.p2]),
            Segment::Cubic(c) => out.extend([c.p0, c.p1, c.p2, c.p3]),
            Segment::Conic(k) => out.extend(k.points()),
            Segment::Arc(_) => {}
        }
        out
    }

    /// The parameters in (0, 1) where x or y has an extremum, in increasing order (for an arc,
    /// where its angle passes a multiple of 90°).
    pub fn extrema(&self) -> ArrayVec<f64, MAX_EXTREMA> {
        let mut out: ArrayVec<f64, MAX_EXTREMA> = match self {
            Segment::Line(_) => ArrayVec::new(),
            Segment::Quad(s) => s.extrema(),
            Segment::Cubic(s) => s.extrema(),
            Segment::Conic(s) => s.extrema(),
            Segment::Arc(a) => {
                let (lo, hi) = if a.sweep >= 0.0 {
                    (a.start_angle, a.start_angle + a.sweep)
                } else {
                    (a.start_angle + a.sweep, a.start_angle)
                };
                let first = (lo / FRAC_PI_2).floor() as i64 + 1;
                (first..)
                    .map(|k| k as f64 * FRAC_PI_2)
                    .take_while(|&q| q < hi)
                    .map(|q| (q - a.start_angle) / a.sweep)
                    .filter(|t| *t > 0.0 && *t < 1.0)
                    .take(MAX_EXTREMA)
                    .collect()
            }
        };
        out.sort_by(f64::total_cmp);
        out
    }

    /// Whether every coordinate is finite.
    pub fn is_finite(&self) -> bool {
        let b = self.bounding_box();
        b.x0.is_finite() && b.x1.is_finite() && b.y0.is_finite() && b.y1.is_finite()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn quarter_circle_length() {
        let a = CircularArc {
            center: Point::ORIGIN,
            radius: 10.0,
            start_angle: 0.0,
            sweep: std::f64::consts::FRAC_PI_2,
        };
        let c = Segment::Conic(a.to_conics()[0]);
        // Circumference 2πr (Euclid); a quarter is 5π.
        assert_abs_diff_eq!(c.arclen(1e-9), 5.0 * std::f64::consts::PI, epsilon = 1e-8);
        assert_abs_diff_eq!(
            Segment::Arc(a).arclen(1e-9),
            5.0 * std::f64::consts::PI,
            epsilon = 1e-12
        );
    }

    #[test]
    fn curvature_of_every_kind() {
        use kurbo::ParamCurveCurvature;
        let curvature = |s: &Segment, t: f64| s.normal_acceleration_at(t) / s.deriv_at(t).hypot2();
        let quarter = |r: f64| CircularArc {
            center: Point::ORIGIN,
            radius: r,
            start_angle: 0.0,
            sweep: std::f64::consts::FRAC_PI_2,
        };
        // A circle of radius r bends by 1/r, turning left when the sweep is positive (standard
        // geometry), as an arc and as its exact conic.
        let arc = quarter(10.0);
        let conic = Segment::Conic(arc.to_conics()[0]);
        for t in [0.0, 0.3, 1.0] {
            assert_abs_diff_eq!(curvature(&Segment::Arc(arc), t), 0.1, epsilon = 1e-15);
            assert_abs_diff_eq!(curvature(&conic, t), 0.1, epsilon = 1e-12);
            assert_abs_diff_eq!(curvature(&conic.reversed(), t), -0.1, epsilon = 1e-12);
        }
        // The ellipse x = a·cos θ, y = b·sin θ bends by a/b² at (a, 0) and b/a² at (0, b)
        // (standard formula κ = ab / (a²sin²θ + b²cos²θ)^(3/2)); its quarter is the unit
        // quarter circle's conic scaled, exactly.
        let (a, b) = (5.0, 2.0);
        let ellipse =
            Segment::Conic(quarter(1.0).to_conics()[0].transform(Affine::scale_non_uniform(a, b)));
        assert_abs_diff_eq!(curvature(&ellipse, 0.0), a / (b * b), epsilon = 1e-12);
        assert_abs_diff_eq!(curvature(&ellipse, 1.0), b / (a * a), epsilon = 1e-12);
        // Polynomial Béziers agree with kurbo's own curvature (whose sign is the opposite:
        // kurbo 0.13 computes a × v).
        let q = QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0));
        let c = CubicBez::new((0.0, 0.0), (0.0, 10.0), (10.0, -10.0), (10.0, 0.0));
        for t in [0.0, 0.25, 0.5, 0.9] {
            assert_abs_diff_eq!(
                curvature(&Segment::Quad(q), t),
                -q.curvature(t),
                epsilon = 1e-12
            );
            assert_abs_diff_eq!(
                curvature(&Segment::Cubic(c), t),
                -c.curvature(t),
                epsilon = 1e-12
            );
        }
        assert_eq!(
            Segment::Line(Line::new((0.0, 0.0), (1.0, 1.0))).normal_acceleration_at(0.5),
            0.0
        );
    }

    #[test]
    fn speed_bounds_hold() {
        let segs = [
            Segment::Quad(QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0))),
            Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (0.0, 10.0),
                (10.0, -10.0),
                (10.0, 0.0),
            )),
        ];
        for s in segs {
            let b = s.speed_bound();
            let a = s.accel_bound();
            for i in 0..=100 {
                let t = i as f64 / 100.0;
                assert!(s.deriv_at(t).hypot() <= b * (1.0 + 1e-12));
                let h = 1e-5;
                let (t0, t1) = ((t - h).max(0.0), (t + h).min(1.0));
                let acc = (s.deriv_at(t1) - s.deriv_at(t0)) / (t1 - t0);
                assert!(acc.hypot() <= a * (1.0 + 1e-6));
            }
        }
    }

    #[test]
    fn tangent_at_cusp_looks_past_zero_derivative() {
        let s = Segment::Cubic(CubicBez::new(
            (0.0, 0.0),
            (0.0, 0.0),
            (10.0, 5.0),
            (10.0, 0.0),
        ));
        let t = s.tangent_at(0.0).unwrap();
        assert_abs_diff_eq!(t.y / t.x, 0.5, epsilon = 1e-4);
        let z = Segment::Line(Line::new((1.0, 1.0), (1.0, 1.0)));
        assert!(z.tangent_at(0.0).is_none());
    }
}
