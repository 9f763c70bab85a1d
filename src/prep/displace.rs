//! Curves displaced from a segment, point by point: the normal offset q(t) = p(t) + δ·n(t)
//! (n the left unit normal, n = T rotated by +90°) and the tangent lead q(t) = p(t) + d·T(t),
//! T the unit tangent.
//!
//! Exact cases (classical offset-curve geometry, e.g. Farouki & Neff, "Analytic properties of
//! plane offset curves", CAGD 7 (1990) 83-99, from memory for the pages):
//! - a line moves along its normal (or its direction) and stays a line;
//! - a circle of radius r offset by δ towards its centre is the concentric circle of radius
//!   r − δ (a negative radius is the circle of radius |r − δ| traversed through the opposite
//!   points); circular conics are turned into [`CircularArc`]s first;
//! - a circle's tangent lead p + d·T is the concentric circle of radius √(r² + d²), turned
//!   forward by atan(d / r) (Pythagoras).
//!
//! Everything else (polynomial Béziers, non-circular conics) is fitted: cubic Hermite pieces
//! that interpolate q and q' at both ends (q' = |p'|·T·(1 − δκ) for the normal offset and
//! p' + d·κ·|p'|·n for the tangent lead, κ the signed curvature), split in halves until they
//! fit. The normal offset is first split where 1 − δκ changes sign (the offset's cusps). Each
//! piece is MEASURED against the true displaced curve: the certified Hausdorff bound of
//! [`crate::measure::hausdorff`] between the piece and a dense polyline through exact points of
//! q, plus the polyline's own distance to q, estimated at the midpoints of its chords (refined
//! until that estimate is below a hundredth of the tolerance). The second term is sampled, not
//! certified; the report says so.

use kurbo::{CubicBez, Line, ParamCurve, Point, Vec2};

use crate::geom::{CircularArc, Segment};
use crate::measure;

/// How a segment is displaced.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Displacement {
    /// Along the left normal by this signed distance.
    Normal(f64),
    /// Along the unit tangent by this distance.
    Tangent(f64),
}

/// A displaced segment: its pieces, the exact displaced end points and the measured deviation
/// (0 when exact).
#[derive(Clone, Debug, PartialEq)]
pub struct Displaced {
    pub pieces: Vec<Segment>,
    pub start: Point,
    pub end: Point,
    pub deviation: f64,
    pub exact: bool,
}

/// Deepest halving of a fitted piece: 2¹² pieces per segment at most.
const MAX_DEPTH: u32 = 12;

/// The left unit normal of a unit tangent.
pub fn left(t: Vec2) -> Vec2 {
    Vec2::new(-t.y, t.x)
}

/// The signed angle from a to b, in (−π, π].
pub fn turn(a: Vec2, b: Vec2) -> f64 {
    a.cross(b).atan2(a.dot(b))
}

/// The circle a segment lies on, if it is exactly a circular arc.
pub fn as_arc(s: &Segment) -> Option<CircularArc> {
    match s {
        Segment::Arc(a) => Some(*a),
        Segment::Conic(c) => {
            let f = c.as_circle(1e-9)?;
            Some(CircularArc {
                center: f.center,
                radius: f.radius,
                start_angle: (c.start() - f.center).atan2(),
                sweep: f.sweep,
            })
        }
        _ => None,
    }
}

/// The displaced point at t, or `None` where the segment has no direction (zero length).
pub fn displaced_point(s: &Segment, how: Displacement, t: f64) -> Option<Point> {
    let tan = s.tangent_at(t)?;
    Some(match how {
        Displacement::Normal(d) => s.eval(t) + d * left(tan),
        Displacement::Tangent(d) => s.eval(t) + d * tan,
    })
}

/// Signed curvature at t (second derivative by a central difference of the exact first).
fn curvature(s: &Segment, t: f64) -> (Vec2, f64) {
    let d1 = s.deriv_at(t);
    let h = 1e-6;
    let (a, b) = ((t - h).max(0.0), (t + h).min(1.0));
    let d2 = (s.deriv_at(b) - s.deriv_at(a)) / (b - a);
    let speed = d1.hypot();
    if speed == 0.0 {
        return (d1, 0.0);
    }
    (d1, d1.cross(d2) / (speed * speed * speed))
}

/// The derivative of the displaced curve at t.
fn displaced_deriv(s: &Segment, how: Displacement, t: f64) -> Vec2 {
    let (d1, k) = curvature(s, t);
    let speed = d1.hypot();
    let Some(tan) = s.tangent_at(t) else {
        return Vec2::ZERO;
    };
    match how {
        Displacement::Normal(d) => speed * (1.0 - d * k) * tan,
        Displacement::Tangent(d) => d1 + d * k * speed * left(tan),
    }
}

/// Displace one segment, exactly where the geometry allows and fitted within `tol` otherwise.
pub fn displace(s: &Segment, how: Displacement, tol: f64) -> Option<Displaced> {
    let start = displaced_point(s, how, 0.0)?;
    let end = displaced_point(s, how, 1.0)?;
    if let Some(pieces) = exact(s, how) {
        return Some(Displaced {
            pieces,
            start,
            end,
            deviation: 0.0,
            exact: true,
        });
    }
    let mut pieces = Vec::new();
    let mut deviation: f64 = 0.0;
    let cuts = match how {
        Displacement::Normal(d) => cusps(s, d),
        Displacement::Tangent(_) => Vec::new(),
    };
    let mut bounds = vec![0.0];
    bounds.extend(cuts);
    bounds.push(1.0);
    for w in bounds.windows(2) {
        deviation = deviation.max(fit_piece(s, how, w[0], w[1], tol, 0, &mut pieces));
    }
    Some(Displaced {
        pieces,
        start,
        end,
        deviation,
        exact: false,
    })
}

/// The exact displaced segment for lines and circular arcs.
fn exact(s: &Segment, how: Displacement) -> Option<Vec<Segment>> {
    if let Segment::Line(l) = s {
        let tan = (l.p1 - l.p0).normalize();
        let v = match how {
            Displacement::Normal(d) => d * left(tan),
            Displacement::Tangent(d) => d * tan,
        };
        return Some(vec![Segment::Line(Line::new(l.p0 + v, l.p1 + v))]);
    }
    let a = as_arc(s)?;
    let turn_sign = a.sweep.signum();
    Some(match how {
        Displacement::Normal(d) => {
            // The left normal points to the centre when the arc turns left (sweep > 0).
            let r = a.radius - d * turn_sign;
            if r.abs() <= 1e-12 * a.radius.max(d.abs()) {
                Vec::new()
            } else if r > 0.0 {
                vec![Segment::Arc(CircularArc { radius: r, ..a })]
            } else {
                vec![Segment::Arc(CircularArc {
                    radius: -r,
                    start_angle: a.start_angle + std::f64::consts::PI,
                    ..a
                })]
            }
        }
        Displacement::Tangent(d) => vec![Segment::Arc(CircularArc {
            radius: a.radius.hypot(d),
            start_angle: a.start_angle + turn_sign * d.atan2(a.radius),
            ..a
        })],
    })
}

/// Parameters in (0, 1) where the normal offset has a cusp (1 − δκ = 0), by sampling for sign
/// changes and bisection.
fn cusps(s: &Segment, d: f64) -> Vec<f64> {
    let g = |t: f64| 1.0 - d * curvature(s, t).1;
    let n = 64;
    let mut out = Vec::new();
    let mut prev = (0.0, g(0.0));
    for i in 1..=n {
        let t = i as f64 / n as f64;
        let v = g(t);
        if prev.1 * v < 0.0 {
            let (mut lo, mut hi) = (prev.0, t);
            for _ in 0..50 {
                let mid = 0.5 * (lo + hi);
                if g(mid) * prev.1 > 0.0 {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            let c = 0.5 * (lo + hi);
            if c > 1e-9 && c < 1.0 - 1e-9 {
                out.push(c);
            }
        }
        prev = (t, v);
    }
    out
}

/// Fit [t0, t1] by a Hermite cubic, halving until the measured deviation is within `tol`;
/// returns the worst measured deviation of the pieces pushed.
fn fit_piece(
    s: &Segment,
    how: Displacement,
    t0: f64,
    t1: f64,
    tol: f64,
    depth: u32,
    out: &mut Vec<Segment>,
) -> f64 {
    let q = |t: f64| displaced_point(s, how, t).unwrap_or_else(|| s.eval(t));
    let h = t1 - t0;
    let (q0, q1) = (q(t0), q(t1));
    let cubic = Segment::Cubic(CubicBez::new(
        q0,
        q0 + displaced_deriv(s, how, t0) * (h / 3.0),
        q1 - displaced_deriv(s, how, t1) * (h / 3.0),
        q1,
    ));
    let dev = deviation_from_true(&cubic, &q, t0, t1, tol);
    if dev <= tol || depth >= MAX_DEPTH {
        out.push(cubic);
        return dev;
    }
    let mid = 0.5 * (t0 + t1);
    let a = fit_piece(s, how, t0, mid, tol, depth + 1, out);
    let b = fit_piece(s, how, mid, t1, tol, depth + 1, out);
    a.max(b)
}

/// The deviation of `piece` from the true curve q over [t0, t1]: certified against a dense
/// polyline through exact points of q, plus that polyline's sampled distance to q.
pub fn deviation_from_true(
    piece: &Segment,
    q: &impl Fn(f64) -> Point,
    t0: f64,
    t1: f64,
    tol: f64,
) -> f64 {
    let mut n = 32;
    loop {
        let pts: Vec<Point> = (0..=n)
            .map(|i| q(t0 + (t1 - t0) * i as f64 / n as f64))
            .collect();
        // The polyline's own error: distance of q at the chord midpoints to their chords.
        let chord_err = (0..n)
            .map(|i| {
                let m = q(t0 + (t1 - t0) * (i as f64 + 0.5) / n as f64);
                Segment::Line(Line::new(pts[i], pts[i + 1])).nearest(m).0
            })
            .fold(0.0, f64::max);
        if chord_err <= 0.01 * tol || n >= 4096 {
            let poly: Vec<Segment> = pts
                .windows(2)
                .filter(|w| w[0] != w[1])
                .map(|w| Segment::Line(Line::new(w[0], w[1])))
                .collect();
            if poly.is_empty() {
                return (piece.start() - pts[0]).hypot();
            }
            let d = measure::hausdorff(std::slice::from_ref(piece), &poly, 1e-3 * tol);
            return d.bound + chord_err;
        }
        n *= 2;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;
    use kurbo::QuadBez;

    #[test]
    fn arc_normal_offset_changes_radius() {
        // Concentric circles: offsetting a circle by δ changes its radius by δ.
        let a = CircularArc {
            center: Point::new(1.0, 2.0),
            radius: 5.0,
            start_angle: 0.3,
            sweep: 1.2,
        };
        let d = displace(&Segment::Arc(a), Displacement::Normal(1.5), 1e-3).unwrap();
        let Segment::Arc(b) = d.pieces[0] else {
            panic!("not an arc")
        };
        assert_abs_diff_eq!(b.radius, 3.5, epsilon = 1e-15);
        assert!(d.exact);
        // Collapsed through the centre: radius |5 − 6.5| on the opposite side.
        let d = displace(&Segment::Arc(a), Displacement::Normal(6.5), 1e-3).unwrap();
        let Segment::Arc(c) = d.pieces[0] else {
            panic!("not an arc")
        };
        assert_abs_diff_eq!(c.radius, 1.5, epsilon = 1e-15);
        assert!((c.eval(0.0) - d.start).hypot() < 1e-12);
    }

    #[test]
    fn tangent_lead_on_a_circle_is_pythagoras() {
        // |p + d·T − c|² = r² + d² (the tangent is perpendicular to the radius).
        let a = CircularArc {
            center: Point::ORIGIN,
            radius: 4.0,
            start_angle: 0.0,
            sweep: -2.0,
        };
        let d = displace(&Segment::Arc(a), Displacement::Tangent(3.0), 1e-3).unwrap();
        assert!((d.pieces[0].start() - d.start).hypot() < 1e-12);
        assert!((d.pieces[0].end() - d.end).hypot() < 1e-12);
        assert_abs_diff_eq!(d.start.to_vec2().hypot(), 5.0, epsilon = 1e-12);
    }

    #[test]
    fn fitted_offset_is_measured_within_tolerance() {
        let q = Segment::Quad(QuadBez::new((0.0, 0.0), (10.0, 8.0), (20.0, 0.0)));
        for tol in [1e-2, 1e-3, 1e-4] {
            let d = displace(&q, Displacement::Normal(-1.0), tol).unwrap();
            assert!(!d.exact);
            assert!(d.deviation <= tol, "{} > {tol}", d.deviation);
        }
    }
}
