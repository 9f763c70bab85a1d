//! Circular arcs: a piece of curve becomes a biarc, two circular arcs meeting with a common
//! tangent, matching the piece's end points and end tangents (Bolton, "Biarc curves", CAD 7(2)
//! 1975; Meek & Walton, CAD 1993). With unit end tangents t0, t1 and v = P1 − P0, the equal-length
//! biarc puts V0 = P0 + α·t0 and V1 = P1 − α·t1 with |V1 − V0| = 2α, i.e.
//! 2(1 − t0·t1)α² + 2(v·(t0 + t1))α − v·v = 0, and the junction J at the midpoint of V0V1 (all
//! junctions lie on one circle through P0 and P1; Bolton). Each arc is the circle through a
//! point with a given tangent and a second point: its centre lies on the normal at the first
//! point at signed distance |d|² / (2 n·d), d the chord. A nearly straight arc is a line.

use std::f64::consts::TAU;

use kurbo::{Line, Point, Vec2};

use super::Out;
use crate::geom::{CircularArc, Segment};

/// The equal-length biarc for a piece, or its chord where no biarc exists.
pub fn biarc(s: &Segment) -> Out {
    let (p0, p1) = (s.start(), s.end());
    let chord = super::one(Segment::Line(Line::new(p0, p1)));
    let (Some(t0), Some(t1)) = (s.tangent_at(0.0), s.tangent_at(1.0)) else {
        return chord;
    };
    match junction(p0, t0, p1, t1) {
        Some((j, tj)) => Out::from([arc_through(p0, t0, j), arc_through(j, tj, p1)]),
        None => chord,
    }
}

/// The junction point and its tangent of the equal-length biarc.
pub fn junction(p0: Point, t0: Vec2, p1: Point, t1: Vec2) -> Option<(Point, Vec2)> {
    let v = p1 - p0;
    let vv = v.dot(v);
    if vv == 0.0 {
        return None;
    }
    let vt = v.dot(t0 + t1);
    let a = 2.0 * (1.0 - t0.dot(t1));
    let alpha = if a.abs() <= 1e-12 {
        if vt <= 0.0 {
            return None;
        }
        vv / (2.0 * vt)
    } else {
        (-2.0 * vt + (4.0 * vt * vt + 4.0 * a * vv).sqrt()) / (2.0 * a)
    };
    if !(alpha.is_finite() && alpha > 0.0) {
        return None;
    }
    let (v0, v1) = (p0 + alpha * t0, p1 - alpha * t1);
    let d = v1 - v0;
    let len = d.hypot();
    (len > 0.0).then(|| (v0.midpoint(v1), d / len))
}

/// The circular arc from p with unit tangent t through q (a line when nearly straight).
pub fn arc_through(p: Point, t: Vec2, q: Point) -> Segment {
    let d = q - p;
    let n = Vec2::new(-t.y, t.x);
    let k = n.dot(d);
    let dd = d.hypot2();
    if k.abs() <= 1e-9 * dd.sqrt() || dd == 0.0 {
        return Segment::Line(Line::new(p, q));
    }
    let rho = dd / (2.0 * k);
    let center = p + rho * n;
    let (u, w) = (p - center, q - center);
    let raw = u.cross(w).atan2(u.dot(w));
    let sweep = if rho > 0.0 {
        raw.rem_euclid(TAU)
    } else {
        -(-raw).rem_euclid(TAU)
    };
    Segment::Arc(CircularArc {
        center,
        radius: rho.abs(),
        start_angle: u.atan2(),
        sweep,
    })
}
