//! Cubics: a conic piece in standard form (P0, P1, P2; w) becomes the cubic with control points
//! P0 + λ(P1 − P0) and P2 + λ(P1 − P2), λ = 4w / (3(1 + w)). It shares the conic's end points and
//! end tangents and passes through its shoulder point C(½) (which divides the segment from the
//! chord's midpoint to P1 in the ratio w : 1, Farin, *Curves and Surfaces for CAGD*, ch. 13); for
//! a circular arc it is the classical (4/3)tan(θ/4) cubic, for a parabola (w = 1) it is exact.
//! Other pieces use Hermite interpolation of the end derivatives (exact for cubics).

use kurbo::CubicBez;

use super::Out;
use crate::geom::Segment;

pub fn approximate(s: &Segment) -> Out {
    let c = match s {
        Segment::Conic(k) => {
            let [p0, p1, p2] = k.points();
            let w = k.weight();
            let lambda = 4.0 * w / (3.0 * (1.0 + w));
            CubicBez::new(p0, p0.lerp(p1, lambda), p2.lerp(p1, lambda), p2)
        }
        _ => {
            let (p0, p3) = (s.start(), s.end());
            CubicBez::new(
                p0,
                p0 + s.deriv_at(0.0) / 3.0,
                p3 - s.deriv_at(1.0) / 3.0,
                p3,
            )
        }
    };
    super::one(Segment::Cubic(c))
}
