//! The parametric distance between a polynomial Bézier and the quadratic that replaces it,
//! and between any two cubics run over the same parameter (`merge.rs` bounds a merged cubic
//! interval by interval with it).
//!
//! Run two curves A and B over the same parameter: each point A(t) has the point B(t) of the
//! other curve within max_t |A(t) − B(t)|, and each B(t) has A(t), so that maximum bounds the
//! Hausdorff distance from above (it bounds the Fréchet distance, which bounds the Hausdorff
//! distance; Alt & Godau, "Computing the Fréchet distance between two polygonal curves", IJCGA
//! 1995). With B raised to the degree of A (degree elevation, Farin, *Curves and Surfaces for
//! CAGD*, 5th ed., §6.1), D = A − B is a Bézier whose control points hold every value D(t) in
//! their convex hull (Farin §5.3), so max|Dᵢ| bounds |D| on [0, 1], and after de Casteljau
//! subdivision on every subinterval. Intervals are refined best-first until the largest bound
//! is within the slack of a value |D(t)| actually reached.
//!
//! Most pieces need no refinement: writing the Bernstein form as
//! D(t) = (1 − t)³D₀ + t³D₃ + 3t(1 − t)·((1 − 2t)·D₁ + t·(D₁ + D₂)),
//! |D| ≤ max(|D₀|, |D₃|) + (√3/6)·|D₁| + (4/9)·|D₁ + D₂| (the largest values of
//! 3t(1 − t)|1 − 2t| and 3t²(1 − t) on [0, 1], at t = (3 ± √3)/6 and t = 2/3) [derived]. For the
//! quadratic through a cubic's ends and middle D₀ = D₃ = 0 and D₂ = −D₁, so the bound is the
//! value (√3/6)·|D₁| reached at t = (3 ± √3)/6: the known error √3/36·|P3 − 3P2 + 3P1 − P0| of
//! that approximation. It is used whenever it is within the slack of what is reached there.
//!
//! The parametric distance is at least the Hausdorff distance, and near it where the two
//! curves run at matching speeds, as a quadratic fitted through a cubic's ends and middle does.
//! The distance from A(t) to the nearest point of B, at the t where |D| is largest, is reported
//! as the value actually attained.

use arrayvec::ArrayVec;
use kurbo::{CubicBez, ParamCurve, QuadBez, Vec2};

use crate::geom::Segment;
use crate::measure::Deviation;

/// Most intervals one bound may hold at once; when they are all taken it settles for the
/// (still rigorous) bound it has.
const MAX_INTERVALS: usize = 48;

/// Relative allowance for floating-point evaluation of the control points.
const ROUNDING: f64 = 1e-12;

/// The difference A − B over [t0, t1] as the control points of a cubic, and the largest of
/// their squared norms.
#[derive(Clone, Copy)]
struct Interval {
    ub2: f64,
    t0: f64,
    t1: f64,
    d: [Vec2; 4],
}

impl Interval {
    fn new(t0: f64, t1: f64, d: [Vec2; 4]) -> Interval {
        let ub2 = d.iter().map(|v| v.hypot2()).fold(0.0, f64::max);
        Interval { ub2, t0, t1, d }
    }

    /// The two halves (de Casteljau at ½).
    fn split(&self) -> [Interval; 2] {
        let [a, b, c, d] = self.d;
        let (ab, bc, cd) = ((a + b) * 0.5, (b + c) * 0.5, (c + d) * 0.5);
        let (abc, bcd) = ((ab + bc) * 0.5, (bc + cd) * 0.5);
        let mid = (abc + bcd) * 0.5;
        let tm = 0.5 * (self.t0 + self.t1);
        [
            Interval::new(self.t0, tm, [a, ab, abc, mid]),
            Interval::new(tm, self.t1, [mid, bcd, cd, d]),
        ]
    }
}

/// A line, quadratic or cubic as a cubic (degree elevation); `None` for a conic or an arc.
pub fn as_cubic(s: &Segment) -> Option<CubicBez> {
    match s {
        Segment::Line(l) => Some(QuadBez::new(l.p0, l.p0.midpoint(l.p1), l.p1).raise()),
        Segment::Quad(q) => Some(q.raise()),
        Segment::Cubic(c) => Some(*c),
        Segment::Conic(_) | Segment::Arc(_) => None,
    }
}

/// The difference A − B of two cubics as a cubic's control points.
fn difference(a: &CubicBez, b: &CubicBez) -> [Vec2; 4] {
    [a.p0 - b.p0, a.p1 - b.p1, a.p2 - b.p2, a.p3 - b.p3]
}

/// The largest coordinate norm among the control points, for the rounding allowance.
fn scale(points: &[kurbo::Point]) -> f64 {
    points
        .iter()
        .map(|p| p.to_vec2().hypot())
        .fold(0.0, f64::max)
}

/// The parametric distance max_t |A(t) − B(t)| of two cubics run over the same parameter,
/// bounded from above within `slack` of a value reached, with rounding allowance (a certified
/// bound on their Hausdorff distance, module docs), and the t where the largest value is
/// reached.
pub fn cubic_pair_bound(a: &CubicBez, b: &CubicBez, slack: f64) -> (f64, f64) {
    let (bound, t) = refined_bound(difference(a, b), slack);
    let scale = scale(&[a.p0, a.p1, a.p2, a.p3, b.p0, b.p1, b.p2, b.p3]);
    (bound + ROUNDING * scale, t)
}

/// A certified bound on the Hausdorff distance between a quadratic or cubic `source` and the
/// quadratic `q` with the same parameter range, within `slack` of the parametric distance;
/// `None` for other sources.
pub fn quad_deviation(source: &Segment, q: &QuadBez, slack: f64) -> Option<Deviation> {
    let a = match source {
        Segment::Quad(_) | Segment::Cubic(_) => as_cubic(source)?,
        _ => return None,
    };
    let d = difference(&a, &q.raise());
    let (bound, best_t) = closed_bound(&d, slack).unwrap_or_else(|| refined_bound(d, slack));
    let scale = scale(&[a.p0, a.p1, a.p2, a.p3, q.p1]);
    let at = a.eval(best_t);
    let (sampled, _) = Segment::Quad(*q).nearest(at);
    Some(Deviation {
        bound: bound + ROUNDING * scale,
        sampled: sampled.min(bound),
        at: [at.x, at.y],
    })
}

/// The closed-form bound of the module doc and the t where the larger of its two peaks is
/// reached, when it is within `slack` of the value |D| reaches there.
fn closed_bound(d: &[Vec2; 4], slack: f64) -> Option<(f64, f64)> {
    let r3 = 3f64.sqrt();
    let bound = d[0].hypot().max(d[3].hypot())
        + r3 / 6.0 * d[1].hypot()
        + 4.0 / 9.0 * (d[1] + d[2]).hypot();
    let diff = CubicBez::new(
        d[0].to_point(),
        d[1].to_point(),
        d[2].to_point(),
        d[3].to_point(),
    );
    let value = |t: f64| diff.eval(t).to_vec2().hypot();
    let (lo, hi) = ((3.0 - r3) / 6.0, (3.0 + r3) / 6.0);
    let (at_lo, at_hi) = (value(lo), value(hi));
    let (t, reached) = if at_lo >= at_hi {
        (lo, at_lo)
    } else {
        (hi, at_hi)
    };
    (bound <= reached + slack).then_some((bound, t))
}

/// The bound by best-first subdivision of the difference's control points, and the t of the
/// largest value reached.
fn refined_bound(d: [Vec2; 4], slack: f64) -> (f64, f64) {
    // The largest |D(t)|² reached so far (at the ends, then at every split point), and where.
    let (mut best2, mut best_t) = if d[0].hypot2() >= d[3].hypot2() {
        (d[0].hypot2(), 0.0)
    } else {
        (d[3].hypot2(), 1.0)
    };
    // The intervals that cover [0, 1], in no particular order.
    let mut intervals: ArrayVec<Interval, MAX_INTERVALS> = ArrayVec::new();
    intervals.push(Interval::new(0.0, 1.0, d));
    let bound = loop {
        let k = (1..intervals.len()).fold(0, |k, i| {
            if intervals[i].ub2 > intervals[k].ub2 {
                i
            } else {
                k
            }
        });
        let top = intervals[k];
        let ub = top.ub2.sqrt();
        if ub <= best2.sqrt() + slack || intervals.is_full() {
            break ub;
        }
        let [left, right] = top.split();
        if left.d[3].hypot2() > best2 {
            (best2, best_t) = (left.d[3].hypot2(), left.t1);
        }
        intervals[k] = left;
        intervals.push(right);
    };
    (bound.max(best2.sqrt()), best_t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::measure::hausdorff;

    #[test]
    fn the_mid_point_quadratic_of_a_cubic() {
        // The quadratic through a cubic's ends and middle, control point (3(P1 + P2) − P0 − P3)/4,
        // is √3/36 · |P3 − 3P2 + 3P1 − P0| from it parametrically: D(t) = 3t(1 − t)(1 − 2t)·D1
        // with D1 = (P3 − 3P2 + 3P1 − P0)/6, largest at t = (3 − √3)/6 [derived].
        let c = CubicBez::new((0.0, 0.0), (1.0, 4.0), (5.0, 5.0), (8.0, 1.0));
        let ctrl = ((3.0 * (c.p1.to_vec2() + c.p2.to_vec2()) - c.p0.to_vec2() - c.p3.to_vec2())
            / 4.0)
            .to_point();
        let q = QuadBez::new(c.p0, ctrl, c.p3);
        let third = c.p3.to_vec2() - 3.0 * c.p2.to_vec2() + 3.0 * c.p1.to_vec2() - c.p0.to_vec2();
        let exact = 3f64.sqrt() / 36.0 * third.hypot();
        let dev = quad_deviation(&Segment::Cubic(c), &q, 1e-9).unwrap();
        assert!(
            dev.bound >= exact && dev.bound <= exact + 1e-8,
            "{dev:?} vs {exact}"
        );
        // It bounds the certified Hausdorff measurement, whose attained value it reports.
        let m = hausdorff(&[Segment::Cubic(c)], &[Segment::Quad(q)], 1e-9);
        assert!(dev.bound >= m.sampled, "{dev:?} vs {m:?}");
        assert!(dev.sampled <= m.bound, "{dev:?} vs {m:?}");
    }

    #[test]
    fn a_quadratic_against_itself_and_other_sources() {
        let q = QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0));
        let same = quad_deviation(&Segment::Quad(q), &q, 1e-9).unwrap();
        assert!(same.bound <= 1e-9, "{same:?}");
        // Moving the control point by v moves Q(t) by 2t(1 − t)·v, at most |v|/2 (at t = ½).
        let moved = QuadBez::new((0.0, 0.0), (5.0, 11.0), (10.0, 0.0));
        let d = quad_deviation(&Segment::Quad(q), &moved, 1e-9).unwrap();
        assert!((d.bound - 0.5).abs() < 1e-8, "{d:?}");
        assert!((d.sampled - 0.5).abs() < 1e-8, "{d:?}");
        let line = Segment::Line(kurbo::Line::new((0.0, 0.0), (10.0, 0.0)));
        assert!(quad_deviation(&line, &q, 1e-9).is_none());
    }
}
