//! Quadratics: a piece of curve becomes the quadratic through its end points whose control
//! point is either
//! - the intersection of the end tangents (G1 continuous with its neighbours; exact for a
//!   parabola arc), valid when the tangents meet ahead of the start and behind the end, or
//! - the point that makes the quadratic pass through the piece's midpoint,
//!   P1 = 2·C(½) − (P0 + P2)/2 (for a cubic this is (3(P1 + P2) − P0 − P3)/4, the usual
//!   mid-point approximation).
//!
//! The one with the smaller estimated error is used (the parametric distance of `parametric.rs`
//! for a polynomial piece, the Hausdorff distance otherwise); `fit` certifies it.

use kurbo::QuadBez;

use super::parametric;
use crate::geom::Segment;
use crate::measure;

/// The better of the tangent-intersection and the mid-point quadratic for a piece.
pub fn approximate(s: &Segment) -> Vec<Segment> {
    let (p0, p2) = (s.start(), s.end());
    let mid = s.eval(0.5);
    let through_mid = QuadBez::new(
        p0,
        (2.0 * mid.to_vec2() - 0.5 * (p0.to_vec2() + p2.to_vec2())).to_point(),
        p2,
    );
    let candidates = [tangent_quad(s), Some(through_mid)];
    candidates
        .into_iter()
        .flatten()
        .map(|q| {
            let out = [Segment::Quad(q)];
            let error = parametric::estimate(s, &q)
                .unwrap_or_else(|| measure::estimate(std::slice::from_ref(s), &out, 8));
            (error, out)
        })
        .min_by(|a, b| a.0.total_cmp(&b.0))
        .map(|(_, out)| out.to_vec())
        .unwrap_or_default()
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
