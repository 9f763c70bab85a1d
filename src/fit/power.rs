//! Source segments in power form, evaluated over any parameter interval without cutting them.
//!
//! A line, a Bézier or a conic is C(t) = N(t) / W(t), N(t) = Σ nᵢ·tⁱ (degree ≤ 3) and
//! W(t) = Σ wᵢ·tⁱ: W = 1 for a line or a Bézier, the weight polynomial of the homogeneous curve
//! H = (N, W) for a conic (positive on [0, 1] in standard form, `conic.rs`). The power
//! coefficients of a Bernstein polynomial with coefficients b₀ … b₃ are b₀, 3(b₁ − b₀),
//! 3(b₀ − 2b₁ + b₂), b₃ − 3b₂ + 3b₁ − b₀ for degree 3 and b₀, 2(b₁ − b₀), b₀ − 2b₁ + b₂ for
//! degree 2 (Farin, *Curves and Surfaces for CAGD*, 5th ed., §4.7, change of basis).
//!
//! Derivatives by the quotient rule: C′ = (N′W − NW′) / W². The acceleration across the
//! direction of travel is (C′ × C″) / |C′|, and for a rational curve C′ × C″ = det(H, H′, H″) / W³
//! (the identity `conic.rs` uses for its constant determinant; it holds for any degree
//! [derived]), so (C′ × C″) / |C′| = det(H, H′, H″) / (W·|N′W − NW′|), the determinant
//! expanded along W's row: W·(N′ × N″) − W′·(N × N″) + W″·(N × N′).
//!
//! A circular arc, parametrised by its angle, has no power form: it is written as the conics
//! of its sub-arc ([`push_pieces`]).

use kurbo::{Point, Vec2};

use crate::geom::Segment;

/// A source segment over [t0, t1] in power form (module docs).
#[derive(Clone, Copy, Debug)]
pub struct PowerPiece {
    pub n: [Vec2; 4],
    pub w: [f64; 3],
    pub t0: f64,
    pub t1: f64,
    /// Whether W = 1 (a line or a Bézier), decided once by [`PowerPiece::of`]: the test runs in
    /// every evaluation (as a comparison of the weights: 659 M instead of 619 M instructions
    /// for the lines fit of DejaVu Sans).
    polynomial: bool,
}

impl PowerPiece {
    /// Segment `s` over [t0, t1]; `None` for a circular arc.
    pub fn of(s: &Segment, t0: f64, t1: f64) -> Option<PowerPiece> {
        let v = |p: Point| p.to_vec2();
        let (n, w) = match s {
            Segment::Line(l) => (
                [v(l.p0), l.p1 - l.p0, Vec2::ZERO, Vec2::ZERO],
                [1.0, 0.0, 0.0],
            ),
            Segment::Quad(q) => (
                [
                    v(q.p0),
                    2.0 * (q.p1 - q.p0),
                    v(q.p0) - 2.0 * v(q.p1) + v(q.p2),
                    Vec2::ZERO,
                ],
                [1.0, 0.0, 0.0],
            ),
            Segment::Cubic(c) => (
                [
                    v(c.p0),
                    3.0 * (c.p1 - c.p0),
                    3.0 * (v(c.p0) - 2.0 * v(c.p1) + v(c.p2)),
                    v(c.p3) - 3.0 * v(c.p2) + 3.0 * v(c.p1) - v(c.p0),
                ],
                [1.0, 0.0, 0.0],
            ),
            Segment::Conic(k) => {
                let [h0, h1, h2] = k.homogeneous();
                let (a, b) = (2.0 * (h1 - h0), h0 - 2.0 * h1 + h2);
                let xy = |h: nalgebra::Vector3<f64>| Vec2::new(h.x, h.y);
                ([xy(h0), xy(a), xy(b), Vec2::ZERO], [h0.z, a.z, b.z])
            }
            Segment::Arc(_) => return None,
        };
        Some(PowerPiece {
            n,
            w,
            t0,
            t1,
            polynomial: !matches!(s, Segment::Conic(_)),
        })
    }

    /// Whether W = 1 (a line or a Bézier).
    pub fn is_polynomial(&self) -> bool {
        self.polynomial
    }

    /// The same segment over [t0, t1].
    pub fn over(self, t0: f64, t1: f64) -> PowerPiece {
        PowerPiece { t0, t1, ..self }
    }

    /// N, N′, N″ and W, W′, W″ at t.
    fn jets(&self, t: f64) -> ([Vec2; 3], [f64; 3]) {
        let [n0, n1, n2, n3] = self.n;
        let [w0, w1, w2] = self.w;
        let n = [
            n0 + t * (n1 + t * (n2 + t * n3)),
            n1 + t * (2.0 * n2 + t * 3.0 * n3),
            2.0 * n2 + t * 6.0 * n3,
        ];
        (n, [w0 + t * (w1 + t * w2), w1 + 2.0 * t * w2, 2.0 * w2])
    }

    /// The parameter of a point near `q`, by `steps` Newton steps on |C − q|² from t, kept in
    /// [t0, t1] (a local answer). For a polynomial piece (W = 1); `None` for a conic.
    pub fn nearest_from(&self, q: Point, mut t: f64, steps: usize) -> Option<f64> {
        if !self.is_polynomial() {
            return None;
        }
        for _ in 0..steps {
            let ([c, v, a], _) = self.jets(t);
            let e = c - q.to_vec2();
            let den = v.dot(v) + e.dot(a);
            if den > 0.0 {
                t = (t - e.dot(v) / den).clamp(self.t0, self.t1);
            }
        }
        Some(t)
    }

    /// The point and the velocity C′ at t.
    pub fn point_velocity(&self, t: f64) -> (Point, Vec2) {
        let ([n, d, _], [w, dw, _]) = self.jets(t);
        if self.is_polynomial() {
            return (n.to_point(), d);
        }
        ((n / w).to_point(), (d * w - n * dw) / (w * w))
    }

    /// The parameter step over which the curve bulges by about `bulge` from its chord:
    /// √(8·bulge / |a|), a the acceleration across the direction of travel at t, as
    /// [`Segment::normal_acceleration_at`] (exact for a parabola with a taken at the step's
    /// middle, whose tangent is parallel to the chord, while the curve's midpoint lies B″h²/8
    /// off the chord's [derived]); infinite where the curve does not turn, NaN where its
    /// velocity vanishes. Written as √(8·bulge·s / |c|) with a = c / s (module docs), so that
    /// only one division waits on the square root of the speed.
    #[inline(always)]
    pub fn bulge_step(&self, t: f64, bulge: f64) -> f64 {
        let ([n, d, dd], [w, dw, ddw]) = self.jets(t);
        let (c, s) = if self.is_polynomial() {
            (d.cross(dd), d.hypot())
        } else {
            let det = w * d.cross(dd) - dw * n.cross(dd) + ddw * n.cross(d);
            (det, w * (d * w - n * dw).hypot())
        };
        (8.0 * bulge * s / c.abs()).sqrt()
    }
}

/// Segment `s` over [t0, t1] as power-form pieces, into `out`: one piece, or the conics of a
/// circular arc's sub-arc.
pub fn push_pieces(s: &Segment, t0: f64, t1: f64, out: &mut Vec<PowerPiece>) {
    match (s, PowerPiece::of(s, t0, t1)) {
        (_, Some(p)) => out.push(p),
        (Segment::Arc(_), None) => {
            let mut conics = Vec::new();
            s.subsegment(t0, t1)
                .transform(kurbo::Affine::IDENTITY, &mut conics);
            out.extend(conics.iter().filter_map(|c| PowerPiece::of(c, 0.0, 1.0)));
        }
        (_, None) => {}
    }
}

/// Curves of every kind with a power form, for tests: the quadratic of shared REFERENCES §5, a
/// cubic with an inflection, an elliptic (w = 0.6) and a hyperbolic (w = 3) conic.
#[cfg(test)]
pub(super) fn sample_curves() -> [Segment; 4] {
    let conic = |w: f64| {
        let [p0, p1, p2] = [(0.0, 0.0), (4.0, 6.0), (10.0, 1.0)].map(Point::from);
        Segment::Conic(crate::geom::Conic::new(p0, p1, w, p2).expect("positive weight"))
    };
    [
        Segment::Quad(kurbo::QuadBez::new((0.0, 0.0), (5.0, 10.0), (10.0, 0.0))),
        Segment::Cubic(kurbo::CubicBez::new(
            (0.0, 0.0),
            (2.0, 3.0),
            (7.0, -2.0),
            (10.0, 0.0),
        )),
        conic(0.6),
        conic(3.0),
    ]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn power_form_agrees_with_the_segments_own_evaluation() {
        // Each kind's own de Casteljau evaluation, derivative and normal acceleration (the
        // conic's by its constant determinant, `conic.rs`; kurbo's hodographs otherwise)
        // against the power form at interior parameters, the acceleration through the bulge
        // step √(8·bulge / |a|).
        let line = Segment::Line(kurbo::Line::new((1.0, 2.0), (7.0, -3.0)));
        for s in std::iter::once(line).chain(sample_curves()) {
            let p = PowerPiece::of(&s, 0.0, 1.0).unwrap();
            for t in [0.0, 0.13, 0.5, 0.77, 1.0] {
                let (point, velocity) = p.point_velocity(t);
                assert!((point - s.eval(t)).hypot() < 1e-12, "{s:?} at {t}");
                assert!((velocity - s.deriv_at(t)).hypot() < 1e-10, "{s:?} at {t}");
                let a = p.bulge_step(t, 0.01);
                let b = (0.08 / s.normal_acceleration_at(t).abs()).sqrt();
                assert!(
                    a == b || (a - b).abs() < 1e-9 * b.abs().max(1.0),
                    "{s:?} at {t}: {a} vs {b}"
                );
            }
        }
    }
}
