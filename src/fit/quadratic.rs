//! Quadratics: a piece of curve becomes the quadratic through its end points whose control
//! point is either
//! - the intersection of the end tangents (G1 continuous with its neighbours; exact for a
//!   parabola arc), valid when the tangents meet ahead of the start and behind the end, or
//! - the point that makes the quadratic pass through the piece's midpoint,
//!   P1 = 2·C(½) − (P0 + P2)/2 (for a cubic this is (3(P1 + P2) − P0 − P3)/4, the usual
//!   mid-point approximation).
//!
//! A polynomial piece is certified by its parametric distance (`parametric.rs`), for which the
//! mid-point quadratic is the best of all: with Q's control point moved by δ from it, the
//! difference is D(t) = 3t(1 − t)·((1 − 2t)·D₁ − (2/3)·δ), D₁ = (P3 − 3P2 + 3P1 − P0)/6, and
//! max|D| is a convex function of δ (a maximum of convex functions) that is smallest at δ = 0:
//! at δ = 0 its two lobes peak at t = (3 ± √3)/6 with opposite values ±(√3/6)·D₁, and a move
//! of δ shifts both peaks by the same vector, so moving δ along D₁ grows one peak as much as it
//! shrinks the other, and moving it across D₁ grows both [derived]. Other
//! pieces (conics, arcs) get the one of the two with the smaller estimated Hausdorff distance;
//! `fit` certifies it.

use kurbo::QuadBez;

use super::Out;
use crate::geom::Segment;
use crate::measure;

/// The quadratic for a piece (see the module doc).
pub fn approximate(s: &Segment) -> Out {
    let (p0, p2) = (s.start(), s.end());
    let mid = s.eval(0.5);
    let through_mid = QuadBez::new(
        p0,
        (2.0 * mid.to_vec2() - 0.5 * (p0.to_vec2() + p2.to_vec2())).to_point(),
        p2,
    );
    if matches!(s, Segment::Quad(_) | Segment::Cubic(_)) {
        return super::one(Segment::Quad(through_mid));
    }
    let error = |q: QuadBez| measure::estimate(std::slice::from_ref(s), &[Segment::Quad(q)], 8);
    let best = match tangent_quad(s) {
        Some(t) if error(t) < error(through_mid) => t,
        _ => through_mid,
    };
    super::one(Segment::Quad(best))
}

/// The quadratic whose control point is the intersection of the end tangents, if they meet
/// on the inside of the piece.
fn tangent_quad(s: &Segment) -> Option<QuadBez> {
    let (p0, p2) = (s.start(), s.end());
    let (t0, t1) = (s.tangent_at(0.0)?, s.tangent_at(1.0)?);
    let denom = t0.cross(t1);
    let chord = p2 - p0;
    if denom.abs() <= 1e-9 * (1.0 + chord.hypot()) {
        return None;
    }
    let a = chord.cross(t1) / denom;
    let b = t0.cross(chord) / denom;
    (a > 0.0 && b > 0.0).then(|| QuadBez::new(p0, p0 + a * t0, p2))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::fit::parametric::quad_deviation;
    use kurbo::{CubicBez, Vec2};

    #[test]
    fn the_mid_point_quadratic_has_the_least_parametric_distance() {
        // The module doc's claim [derived]: moving the control point off the mid-point choice in
        // any direction makes the parametric distance larger.
        let c = Segment::Cubic(CubicBez::new(
            (0.0, 0.0),
            (1.0, 4.0),
            (5.0, 5.0),
            (8.0, 1.0),
        ));
        let [Segment::Quad(mid)] = approximate(&c)[..] else {
            panic!("a cubic piece gets one quadratic");
        };
        let best = quad_deviation(&c, &mid, 1e-9).unwrap().bound;
        for k in 0..16 {
            for r in [1e-3, 0.1, 1.0] {
                let v = r * Vec2::from_angle(f64::from(k) * std::f64::consts::PI / 8.0);
                let moved = QuadBez::new(mid.p0, mid.p1 + v, mid.p2);
                let d = quad_deviation(&c, &moved, 1e-9).unwrap();
                assert!(d.bound > best, "moved by {v:?}: {} <= {best}", d.bound);
            }
        }
    }
}
