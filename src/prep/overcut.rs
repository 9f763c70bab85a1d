//! Overcut: a closed contour continues past its start along its first segments by a given
//! length, so the cut closes cleanly. The end of the extension is found by inverse arc length:
//! exactly for lines and circular arcs (constant speed), by kurbo's `inv_arclen` for Béziers and
//! by bisection on the measured arc length of the sub-conic (arc length grows monotonically with
//! the parameter) for conics.

use kurbo::ParamCurveArclen;

use crate::geom::Segment;

/// Arc-length accuracy used here, in mm.
const ARCLEN_ACC: f64 = 1e-9;

/// The parameter at which `s` has run `len` mm from its start.
pub fn param_at_length(s: &Segment, len: f64) -> f64 {
    let total = s.arclen(ARCLEN_ACC);
    if total <= 0.0 || len >= total {
        return 1.0;
    }
    if len <= 0.0 {
        return 0.0;
    }
    match s {
        Segment::Line(_) | Segment::Arc(_) => len / total,
        Segment::Quad(q) => q.inv_arclen(len, ARCLEN_ACC),
        Segment::Cubic(c) => c.inv_arclen(len, ARCLEN_ACC),
        Segment::Conic(_) => {
            let (mut lo, mut hi) = (0.0, 1.0);
            for _ in 0..60 {
                let mid = 0.5 * (lo + hi);
                if s.subsegment(0.0, mid).arclen(ARCLEN_ACC) < len {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            0.5 * (lo + hi)
        }
    }
}

/// The first `len` mm of a path (at most all of it), and its measured length.
pub fn head(segs: &[Segment], len: f64) -> (Vec<Segment>, f64) {
    let mut out = Vec::new();
    let mut left = len;
    for s in segs {
        if left <= 0.0 {
            break;
        }
        let l = s.arclen(ARCLEN_ACC);
        if l <= left {
            out.push(*s);
            left -= l;
        } else {
            out.push(s.subsegment(0.0, param_at_length(s, left)));
            left = 0.0;
        }
    }
    let measured = out.iter().map(|s| s.arclen(ARCLEN_ACC)).sum();
    (out, measured)
}

/// The last `len` mm of a path (at most all of it), in the path's direction.
pub fn tail(segs: &[Segment], len: f64) -> Vec<Segment> {
    let rev: Vec<Segment> = segs.iter().rev().map(|s| s.reversed()).collect();
    let (h, _) = head(&rev, len);
    h.iter().rev().map(|s| s.reversed()).collect()
}

/// The contour's segments followed by its overcut, and the overcut's measured length. The
/// overcut is capped at one full turn of the contour.
pub fn overcut(segs: &[Segment], len: f64) -> (Vec<Segment>, f64) {
    let (extra, measured) = head(segs, len);
    let mut out = segs.to_vec();
    out.extend(extra);
    (out, measured)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::CircularArc;
    use approx::assert_abs_diff_eq;
    use kurbo::{CubicBez, Line, Point};

    #[test]
    fn head_lengths_are_exact_for_every_kind() {
        let segs = [
            Segment::Line(Line::new((0.0, 0.0), (3.0, 4.0))),
            Segment::Arc(CircularArc {
                center: Point::new(3.0, 0.0),
                radius: 4.0,
                start_angle: std::f64::consts::FRAC_PI_2,
                sweep: -1.0,
            }),
            Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (1.0, 5.0),
                (4.0, 5.0),
                (6.0, 0.0),
            )),
        ];
        for s in &segs {
            let total = s.arclen(1e-12);
            let (h, m) = head(std::slice::from_ref(s), 0.37 * total);
            assert_eq!(h.len(), 1);
            // The measured length of the piece is the requested one.
            assert_abs_diff_eq!(m, 0.37 * total, epsilon = 1e-7);
        }
        // Across segments: 5 (the line, 3-4-5 triangle) + 1 mm of the arc.
        let (h, m) = head(&segs, 6.0);
        assert_eq!(h.len(), 2);
        assert_abs_diff_eq!(m, 6.0, epsilon = 1e-9);
    }
}
