//! Circular arcs in closed form: the largest sweep one piece of each target may have at radius
//! r and tolerance e, and that piece itself (shared REFERENCES §3).
//!
//! - Chord: sagitta r(1 − cos(θ/2)) ≤ e, so θ ≤ 2·arccos(1 − e/r) (standard geometry).
//! - Quadratic with its control point at the tangents' intersection: the error is
//!   r(1 − c)²/(2c), c = cos(θ/2), largest at t = 1/2, outward [derived]; with x = 1 − c and
//!   k = e/r this is x² + 2kx − 2k ≤ 0, so x ≤ −k + √(k² + 2k).
//! - Cubic with tangent length (4/3)·tan(θ/4)·r: the exact maximum radial error is
//!   r(√(1 + (4/27)·sin⁶(θ/4)/cos²(θ/4)) − 1) [derived; first-order form in Goldapp, CAGD 8
//!   (1991) 227-238], increasing in θ, inverted here by bisection.
//!
//! The certified measurement in `fit` has the last word on every piece.

use std::f64::consts::{FRAC_PI_2, PI};

use kurbo::{CubicBez, Line, ParamCurve, Point, QuadBez, Vec2};

use super::{Out, Target};
use crate::geom::{CircularArc, Segment};

/// The largest sweep of one piece of `target` on a circle of radius r within tolerance e.
pub fn max_piece_sweep(target: Target, r: f64, e: f64) -> f64 {
    let k = e / r;
    match target {
        // A chord is kept to at most 120° so a circle never collapses below a triangle.
        Target::Lines => {
            if k >= 1.0 {
                2.0 * PI / 3.0
            } else {
                (2.0 * (1.0 - k).acos()).min(2.0 * PI / 3.0)
            }
        }
        Target::Quadratic => {
            let x = -k + (k * k + 2.0 * k).sqrt();
            if x >= 1.0 {
                FRAC_PI_2
            } else {
                (2.0 * (1.0 - x).acos()).min(FRAC_PI_2)
            }
        }
        Target::Cubic => {
            // One cubic can follow up to half a turn; beyond that two are always better.
            let cap = PI;
            if cubic_error(cap) <= k {
                return cap;
            }
            let (mut lo, mut hi) = (0.0, cap);
            for _ in 0..60 {
                let mid = 0.5 * (lo + hi);
                if cubic_error(mid) <= k {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            lo
        }
        Target::Arcs => 2.0 * PI,
    }
}

/// The exact maximum radial error of the (4/3)tan(θ/4) cubic on the unit circle.
pub fn cubic_error(theta: f64) -> f64 {
    let q = 0.25 * theta;
    (1.0 + (4.0 / 27.0) * q.sin().powi(6) / q.cos().powi(2)).sqrt() - 1.0
}

/// One piece of the target for a circular arc (chord, tangent-intersection quadratic, or the
/// (4/3)tan(θ/4) cubic; the arc itself for the arcs target).
pub fn approximate(target: Target, a: &CircularArc) -> Out {
    let (p0, p1) = (a.eval(0.0), a.eval(1.0));
    let theta = a.sweep;
    let seg = match target {
        Target::Lines => Segment::Line(Line::new(p0, p1)),
        Target::Quadratic => {
            let mid = a.start_angle + 0.5 * theta;
            let c = a.center + (a.radius / (0.5 * theta).cos()) * Vec2::from_angle(mid);
            Segment::Quad(QuadBez::new(p0, c, p1))
        }
        Target::Cubic => {
            let k = (4.0 / 3.0) * (0.25 * theta).tan() * a.radius;
            let t0 = tangent(a.start_angle);
            let t1 = tangent(a.start_angle + theta);
            let c1: Point = p0 + k * t0;
            let c2: Point = p1 - k * t1;
            Segment::Cubic(CubicBez::new(p0, c1, c2, p1))
        }
        Target::Arcs => Segment::Arc(*a),
    };
    super::one(seg)
}

/// The unit tangent at angle φ, turning from +x towards +y; with a signed tangent length the
/// direction of travel follows the sweep's sign.
fn tangent(phi: f64) -> Vec2 {
    Vec2::new(-phi.sin(), phi.cos())
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn cubic_error_check_values() {
        // Shared REFERENCES §3 [derived from the exact error formula; Goldapp 1991 first-order].
        assert_relative_eq!(
            cubic_error(FRAC_PI_2),
            2.72530007428e-4,
            max_relative = 1e-9
        );
        assert_relative_eq!(cubic_error(PI / 6.0), 3.7266e-7, max_relative = 1e-4);
        assert_relative_eq!(cubic_error(PI / 3.0), 2.38644e-5, max_relative = 1e-5);
        assert_relative_eq!(cubic_error(2.0 * PI / 3.0), 1.54202e-3, max_relative = 1e-5);
        assert_relative_eq!(cubic_error(PI), 1.83502e-2, max_relative = 1e-5);
    }

    #[test]
    fn quadratic_sweep_inverts_the_error() {
        // e = r(1 − c)²/(2c) at the returned sweep equals the tolerance.
        for (r, e) in [(10.0, 0.01), (1.0, 1e-4), (400.0, 0.001)] {
            let th = max_piece_sweep(Target::Quadratic, r, e);
            let c = (0.5 * th).cos();
            assert_relative_eq!(r * (1.0 - c).powi(2) / (2.0 * c), e, max_relative = 1e-9);
        }
    }
}
