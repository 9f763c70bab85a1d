//! Intersections of two segments by recursive subdivision of parameter intervals with bounding
//! box rejection (Bézier clipping's simpler cousin; Sederberg & Nishita, "Curve intersection
//! using Bézier clipping", CAD 22 (1990), describe the family; from memory for the issue), finished by Newton's method on
//! A(u) − B(v) = 0. Work is bounded: at most `MAX_VISITS` box pairs per call, so overlapping
//! (collinear or concentric) pieces cannot run away; such overlaps yield their end points.

use kurbo::{Point, Rect};

use crate::geom::Segment;

const MAX_VISITS: usize = 20_000;
const MAX_DEPTH: u32 = 52;

/// One intersection: parameters on `a` and `b` and the point.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Hit {
    pub ta: f64,
    pub tb: f64,
    pub at: Point,
}

fn inflate(r: Rect, e: f64) -> Rect {
    Rect::new(r.x0 - e, r.y0 - e, r.x1 + e, r.y1 + e)
}

fn far_corner(r: Rect, p: Point) -> f64 {
    let dx = (p.x - r.x0).abs().max((p.x - r.x1).abs());
    let dy = (p.y - r.y0).abs().max((p.y - r.y1).abs());
    dx.hypot(dy)
}

/// The intersections of `a` and `b`, points closer than `eps` merged. Hits within `eps` of
/// `skip` (the point two consecutive pieces share) are left out.
pub fn intersections(a: &Segment, b: &Segment, eps: f64, skip: Option<Point>) -> Vec<Hit> {
    let mut hits: Vec<Hit> = Vec::new();
    let mut visits = 0;
    let mut stack = vec![(0.0, 1.0, 0.0, 1.0, 0u32)];
    while let Some((a0, a1, b0, b1, depth)) = stack.pop() {
        visits += 1;
        if visits > MAX_VISITS {
            break;
        }
        let (sa, sb) = (a.subsegment(a0, a1), b.subsegment(b0, b1));
        let (ra, rb) = (sa.bounding_box(), sb.bounding_box());
        if !overlaps(inflate(ra, eps), inflate(rb, eps)) {
            continue;
        }
        if let Some(p) = skip {
            if far_corner(ra, p) <= 10.0 * eps && far_corner(rb, p) <= 10.0 * eps {
                continue;
            }
        }
        let small = |r: Rect| r.width().max(r.height()) <= eps;
        if (small(ra) && small(rb)) || depth >= MAX_DEPTH {
            let (ta, tb) = newton(a, b, 0.5 * (a0 + a1), 0.5 * (b0 + b1));
            let at = a.eval(ta);
            if (at - b.eval(tb)).hypot() > 10.0 * eps {
                continue;
            }
            if skip.is_some_and(|p| (at - p).hypot() <= 10.0 * eps) {
                continue;
            }
            if !hits.iter().any(|h| (h.at - at).hypot() <= 10.0 * eps) {
                hits.push(Hit { ta, tb, at });
            }
            continue;
        }
        let (am, bm) = (0.5 * (a0 + a1), 0.5 * (b0 + b1));
        let split_a = !small(ra);
        let split_b = !small(rb);
        match (split_a, split_b) {
            (true, true) => {
                stack.push((a0, am, b0, bm, depth + 1));
                stack.push((a0, am, bm, b1, depth + 1));
                stack.push((am, a1, b0, bm, depth + 1));
                stack.push((am, a1, bm, b1, depth + 1));
            }
            (true, false) => {
                stack.push((a0, am, b0, b1, depth + 1));
                stack.push((am, a1, b0, b1, depth + 1));
            }
            _ => {
                stack.push((a0, a1, b0, bm, depth + 1));
                stack.push((a0, a1, bm, b1, depth + 1));
            }
        }
    }
    hits
}

fn overlaps(a: Rect, b: Rect) -> bool {
    a.x0 <= b.x1 && b.x0 <= a.x1 && a.y0 <= b.y1 && b.y0 <= a.y1
}

/// Newton's method on A(u) − B(v) = 0 from (u, v), kept inside [0, 1]²; returns the start when
/// the Jacobian is singular (tangential contact).
fn newton(a: &Segment, b: &Segment, mut u: f64, mut v: f64) -> (f64, f64) {
    for _ in 0..16 {
        let f = a.eval(u) - b.eval(v);
        if f.hypot() == 0.0 {
            break;
        }
        let (da, db) = (a.deriv_at(u), b.deriv_at(v));
        let det = -da.cross(db);
        if det.abs() <= 1e-14 * (da.hypot() * db.hypot()).max(1e-300) {
            break;
        }
        // Solve [da, −db]·(du, dv) = −f by Cramer's rule.
        let du = (-f).cross(-db) / det;
        let dv = da.cross(-f) / det;
        let (nu, nv) = ((u + du).clamp(0.0, 1.0), (v + dv).clamp(0.0, 1.0));
        if (nu - u).abs() < 1e-16 && (nv - v).abs() < 1e-16 {
            break;
        }
        u = nu;
        v = nv;
    }
    (u, v)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::CircularArc;
    use kurbo::Line;

    #[test]
    fn line_meets_circle_at_two_points() {
        // The line y = 3 meets the circle x² + y² = 25 at (±4, 3) (Pythagoras).
        let l = Segment::Line(Line::new((-10.0, 3.0), (10.0, 3.0)));
        let c = Segment::Arc(CircularArc {
            center: Point::ORIGIN,
            radius: 5.0,
            start_angle: 0.0,
            sweep: std::f64::consts::TAU,
        });
        let mut xs: Vec<f64> = intersections(&l, &c, 1e-9, None)
            .iter()
            .map(|h| h.at.x)
            .collect();
        xs.sort_by(f64::total_cmp);
        assert_eq!(xs.len(), 2);
        assert!(
            (xs[0] + 4.0).abs() < 1e-9 && (xs[1] - 4.0).abs() < 1e-9,
            "{xs:?}"
        );
    }
}
