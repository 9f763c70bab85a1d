//! Circular arcs in closed form: the largest sweep one piece of each target may have at radius
//! r and tolerance e, and that piece itself (shared REFERENCES §3).
//!
//! - Chord: sagitta r(1 − cos(θ/2)) ≤ e, so θ ≤ 2·arccos(1 − e/r) (standard geometry).
//! - Quadratic with its control point at the tangents' intersection: the error is
//!   r(1 − c)²/(2c), c = cos(θ/2), largest at t = 1/2, outward [derived]; with x = 1 − c and
//!   k = e/r this is x² + 2kx − 2k ≤ 0, so x ≤ −k + √(k² + 2k).
//! - Cubic with tangent length (4/3)·tan(θ/4)·r: the exact maximum radial error is
//!   r(√(1 + (4/27)·sin⁶(θ/4)/cos²(θ/4)) − 1) [derived; first-order form in Goldapp, CAGD 8
//!   (1991) 227-238], increasing in θ. Inverted in closed form: with u = sin²(θ/4) and
//!   m = (1 + e/r)² − 1 the bound is 4u³/(27(1 − u)) = m, the cubic 4u³ + 27m·u − 27m = 0 with
//!   one real root (its derivative is positive), taken by Cardano's formula in the form
//!   u = A − p/(3A), A = ∛(−q/2 + √(q²/4 + p³/27)), p = 27m/4, q = −27m/4, which does not
//!   cancel [derived]; one Newton step polishes it, and the sweep is shortened (by a part in
//!   10¹², then doubling) until the error at it is within e as computed.
//!
//! These pieces are certified in closed form ([`deviation`]). Each is convex and starts and ends
//! on the arc, so seen from the centre its angle runs monotonically over the arc's angles: every
//! point of the piece is |ρ − r| from the arc (ρ its distance from the centre; the nearest point
//! of the circle lies straight out, inside the arc), and every point of the arc has the piece's
//! point at the same angle |ρ − r| away. The Hausdorff distance is therefore the largest radial
//! error, given above for the exact pieces. The computed piece's control points differ from the
//! exact ones by rounding only, and a Bézier moves by at most the largest move of its control
//! points (its basis functions are non-negative and sum to one; Farin, *Curves and Surfaces for
//! CAGD*, 5th ed., §5.2, convex hull property), so an allowance for that rounding makes the bound
//! certain. Where the closed form does not put a piece within the tolerance, the general
//! measurement in `fit` decides.

use std::f64::consts::{FRAC_PI_2, PI};

use kurbo::{CubicBez, Line, ParamCurve, Point, QuadBez, Vec2};

use super::{Out, Target};
use crate::geom::{CircularArc, Segment};
use crate::measure::Deviation;

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
            let m = k * (2.0 + k);
            let (p, q) = (6.75 * m, -6.75 * m);
            let a = (-0.5 * q + (0.25 * q * q + p * p * p / 27.0).sqrt()).cbrt();
            let mut u = a - p / (3.0 * a);
            u -= (4.0 * u * u * u + 27.0 * m * (u - 1.0)) / (12.0 * u * u + 27.0 * m);
            let mut theta = (4.0 * u.clamp(0.0, 1.0).sqrt().asin()).min(cap);
            let mut step: f64 = 1e-12;
            while theta > 0.0 && cubic_error(theta) > k {
                theta *= 1.0 - step.min(1.0);
                step *= 2.0;
            }
            theta
        }
        Target::Arcs => 2.0 * PI,
    }
}

/// The exact maximum radial error of the (4/3)tan(θ/4) cubic on the unit circle.
pub fn cubic_error(theta: f64) -> f64 {
    let q = 0.25 * theta;
    let x = (4.0 / 27.0) * q.sin().powi(6) / q.cos().powi(2);
    // √(1 + x) − 1 without the cancellation for small x.
    x / ((1.0 + x).sqrt() + 1.0)
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

/// The certified deviation of `out`, the [`approximate`] quadratic or cubic of arc `a`, from it
/// (module docs); `None` for other pieces, or sweeps beyond those the closed forms cover.
pub fn deviation(target: Target, a: &CircularArc, out: &[Segment]) -> Option<Deviation> {
    let (r, theta) = (a.radius, a.sweep.abs());
    let exact = match (target, out) {
        (Target::Quadratic, [Segment::Quad(_)]) if theta <= FRAC_PI_2 => {
            let c = (0.5 * theta).cos();
            r * (1.0 - c).powi(2) / (2.0 * c)
        }
        (Target::Cubic, [Segment::Cubic(_)]) if theta <= PI => r * cubic_error(theta),
        _ => return None,
    };
    if !(r > 0.0 && theta > 0.0 && exact.is_finite()) {
        return None;
    }
    // Rounding of the control points (a few ulps of the coordinates; the trigonometry within
    // an ulp of the radius), with a wide margin.
    let allowance = 1e-12 * (a.center.x.abs() + a.center.y.abs() + 4.0 * r);
    // Where the computed piece is farthest from the circle: its radial error on the first half
    // (the pieces are symmetric), maximised by golden-section search (the error rises from
    // the start to one peak: at the middle for the quadratic, inside the half for the cubic).
    let seg = &out[0];
    let radial = |t: f64| ((seg.eval(t) - a.center).hypot() - r).abs();
    let peak = golden_max(radial, 0.0, 0.5);
    let peak = if radial(0.5) >= radial(peak) {
        0.5
    } else {
        peak
    };
    let at = seg.eval(peak);
    Some(Deviation {
        bound: exact + allowance,
        sampled: radial(peak),
        at: [at.x, at.y],
    })
}

/// The argument of the maximum of a unimodal `f` on [lo, hi], by golden-section search
/// (Kiefer 1953) to within 1e-9 of the interval.
fn golden_max(f: impl Fn(f64) -> f64, mut lo: f64, mut hi: f64) -> f64 {
    const INV_PHI: f64 = 0.618_033_988_749_894_9;
    let (mut a, mut b) = (hi - INV_PHI * (hi - lo), lo + INV_PHI * (hi - lo));
    let (mut fa, mut fb) = (f(a), f(b));
    while hi - lo > 1e-9 {
        if fa < fb {
            (lo, a, fa) = (a, b, fb);
            b = lo + INV_PHI * (hi - lo);
            fb = f(b);
        } else {
            (hi, b, fb) = (b, a, fa);
            a = hi - INV_PHI * (hi - lo);
            fa = f(a);
        }
    }
    0.5 * (lo + hi)
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
    fn the_cubic_sweep_in_closed_form_is_the_root_of_the_error() {
        // Against bisection on the error formula itself, for e/r from 10⁻¹² to 10⁻¹: the
        // sweep's error is within e, and the root agrees to a part in 10⁹.
        for i in 0..=220 {
            let k = 10f64.powf(-12.0 + i as f64 * 11.0 / 220.0);
            let theta = max_piece_sweep(Target::Cubic, 1.0, k);
            assert!(cubic_error(theta) <= k, "e/r = {k:e}: {theta}");
            let (mut lo, mut hi) = (0.0, PI);
            for _ in 0..200 {
                let mid = 0.5 * (lo + hi);
                if cubic_error(mid) <= k {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            assert_relative_eq!(theta, lo, max_relative = 1e-9);
        }
        // Beyond 1.835·10⁻² one cubic follows the whole half turn.
        assert_eq!(max_piece_sweep(Target::Cubic, 1.0, 0.02), PI);
    }

    #[test]
    fn closed_form_deviation_agrees_with_the_certified_measurement() {
        // Arcs of radius 0.5 to 400 mm around centres up to 500 mm out, both directions, sweeps
        // up to each closed form's limit: the closed-form bound covers the distance the general
        // measurement attains, the closed form's attained distance is within the measurement's
        // bound, and the two agree to within the measurement's slack.
        let mut k = 0u32;
        let mut next = move || {
            // A Weyl sequence on the golden ratio (equidistributed, from memory).
            k += 1;
            (f64::from(k) * 0.618_033_988_749_895).fract()
        };
        for i in 0..120 {
            let target = if i % 2 == 0 {
                Target::Quadratic
            } else {
                Target::Cubic
            };
            let limit = if target == Target::Quadratic {
                FRAC_PI_2
            } else {
                PI
            };
            let r = 0.5 * 800f64.powf(next());
            let sign = if i % 4 < 2 { 1.0 } else { -1.0 };
            let arc = CircularArc {
                center: Point::new(1000.0 * next() - 500.0, 1000.0 * next() - 500.0),
                radius: r,
                start_angle: 2.0 * PI * next(),
                sweep: sign * limit * (0.02 + 0.98 * next()),
            };
            let out = approximate(target, &arc);
            let d = deviation(target, &arc, &out).expect("within the closed form's sweeps");
            let slack = 1e-7 * r;
            let m = crate::measure::hausdorff(&[Segment::Arc(arc)], &out, slack);
            assert!(d.bound >= m.sampled, "{arc:?}: {d:?} vs {m:?}");
            assert!(d.sampled <= m.bound, "{arc:?}: {d:?} vs {m:?}");
            assert!(
                d.bound - m.sampled <= 2.0 * slack,
                "{arc:?}: {d:?} vs {m:?}"
            );
        }
        // Beyond the sweeps the closed forms cover, nothing is claimed.
        let wide = CircularArc {
            center: Point::ORIGIN,
            radius: 1.0,
            start_angle: 0.0,
            sweep: 0.6 * PI,
        };
        let out = approximate(Target::Quadratic, &wide);
        assert!(deviation(Target::Quadratic, &wide, &out).is_none());
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
