//! Rational quadratic Bézier curves (conics), computed in homogeneous coordinates.
//!
//! A weighted control point (P, w) is stored as the homogeneous point (w·P, w). The curve is
//! `H(t) = Σ Bᵢ²(t)·Hᵢ`, a polynomial quadratic in 3-space, and its points are the projections
//! `C(t) = (H.x / H.z, H.y / H.z)`. Evaluation and subdivision are de Casteljau (or, equivalently,
//! blossoming) on `H`; derivatives use the quotient rule on `H`. The representation is kept in
//! standard form, end weights 1 and middle weight w > 0: a conic with weights (w0, w1, w2) is the
//! same curve as the one with w1' = w1 / √(w0·w2) (Farin, *Curves and Surfaces for CAGD*, 5th ed.,
//! 2002, ch. 13; Piegl & Tiller, *The NURBS Book*, 2nd ed., 1997, ch. 7).
//!
//! w < 1 is an ellipse arc, w = 1 a parabola arc, w > 1 a hyperbola arc (Lee, SIAM 1987). A
//! circular arc of sweep θ has w = cos(θ/2) and an isosceles control triangle (NURBS Book §7.3).
//!
//! Derivative numerator: with `W(t)` the weight polynomial and `N(t)` the first two homogeneous
//! coordinates, `C' = (N'W − NW') / W²`, and `N'W − NW'` is a quadratic with Bernstein
//! coefficients `2w0w1(P1−P0), w0w2(P2−P0), 2w1w2(P2−P1)` (Farin, ch. 13, derivative of a
//! rational quadratic). Its coefficients bound the speed rigorously (convex hull property), and
//! `W(t) ≥ min(1, (1+w)/2)` on [0, 1] in standard form, so `|C'| ≤ max|dᵢ| / min W²`.

use arrayvec::ArrayVec;
use kurbo::common::{solve_quadratic, solve_quartic};
use kurbo::{
    Affine, ParamCurve, ParamCurveArclen, ParamCurveExtrema, ParamCurveNearest, Point, Vec2,
};
use nalgebra::Vector3;

use super::GeomError;

/// A rational quadratic Bézier in standard form (end weights 1, middle weight `w > 0`).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Conic {
    /// Homogeneous control points (w·x, w·y, w); `h[0].z == h[2].z == 1`.
    h: [Vector3<f64>; 3],
}

/// What kind of conic section an arc belongs to, decided by its standard-form weight.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ConicKind {
    Ellipse,
    Parabola,
    Hyperbola,
}

/// Centre, radius and signed sweep (radians, positive from +x towards +y) of a circular conic.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CircleFit {
    pub center: Point,
    pub radius: f64,
    pub sweep: f64,
}

fn finite(p: Point) -> bool {
    p.x.is_finite() && p.y.is_finite()
}

impl Conic {
    /// A conic from projected control points and a middle weight (end weights 1).
    pub fn new(p0: Point, p1: Point, w: f64, p2: Point) -> Result<Conic, GeomError> {
        Conic::from_weighted([p0, p1, p2], [1.0, w, 1.0])
    }

    /// A conic from projected control points and arbitrary positive weights, normalised to
    /// standard form (the curve is unchanged).
    pub fn from_weighted(p: [Point; 3], w: [f64; 3]) -> Result<Conic, GeomError> {
        if !p.iter().all(|&q| finite(q)) {
            return Err(GeomError::NonFinite);
        }
        if !w.iter().all(|x| x.is_finite()) {
            return Err(GeomError::NonFinite);
        }
        if !w.iter().all(|&x| x > 0.0) {
            return Err(GeomError::NonPositiveWeight);
        }
        let wm = w[1] / (w[0] * w[2]).sqrt();
        if !(wm.is_finite() && wm > 0.0) {
            return Err(GeomError::NonPositiveWeight);
        }
        Ok(Conic {
            h: [
                Vector3::new(p[0].x, p[0].y, 1.0),
                Vector3::new(p[1].x * wm, p[1].y * wm, wm),
                Vector3::new(p[2].x, p[2].y, 1.0),
            ],
        })
    }

    /// A conic from homogeneous control points (w·x, w·y, w), each w > 0, normalised to
    /// standard form. Points already in standard form (end weights exactly 1) are kept bit for
    /// bit: projecting and re-weighting the middle point would round, so `homogeneous()` and
    /// `from_homogeneous` round-trip exactly.
    pub fn from_homogeneous(h: [Vector3<f64>; 3]) -> Result<Conic, GeomError> {
        if !h.iter().all(|v| v.iter().all(|c| c.is_finite())) {
            return Err(GeomError::NonFinite);
        }
        if !h.iter().all(|v| v.z > 0.0) {
            return Err(GeomError::NonPositiveWeight);
        }
        let p = h.map(|v| Point::new(v.x / v.z, v.y / v.z));
        if h[0].z == 1.0 && h[2].z == 1.0 && p.iter().all(|&q| finite(q)) {
            return Ok(Conic { h });
        }
        Conic::from_weighted(p, h.map(|v| v.z))
    }

    /// The homogeneous control points (standard form).
    pub fn homogeneous(&self) -> [Vector3<f64>; 3] {
        self.h
    }

    /// The projected control points.
    pub fn points(&self) -> [Point; 3] {
        self.h.map(|v| Point::new(v.x / v.z, v.y / v.z))
    }

    /// The middle weight of the standard form.
    pub fn weight(&self) -> f64 {
        self.h[1].z
    }

    /// Ellipse, parabola or hyperbola (κ = w² compared with 1 in standard form).
    pub fn kind(&self) -> ConicKind {
        let w = self.weight();
        if (w - 1.0).abs() <= 1e-12 {
            ConicKind::Parabola
        } else if w < 1.0 {
            ConicKind::Ellipse
        } else {
            ConicKind::Hyperbola
        }
    }

    /// The homogeneous point H(t) by de Casteljau.
    pub fn eval_homogeneous(&self, t: f64) -> Vector3<f64> {
        self.blossom(t, t)
    }

    /// The polar form b(u, v) of H; b(t, t) = H(t), and the control points of the piece
    /// [t0, t1] are b(t0, t0), b(t0, t1), b(t1, t1).
    fn blossom(&self, u: f64, v: f64) -> Vector3<f64> {
        let a = self.h[0].lerp(&self.h[1], u);
        let b = self.h[1].lerp(&self.h[2], u);
        a.lerp(&b, v)
    }

    /// The derivative numerator's Bernstein coefficients (see the module doc), for the basis
    /// (1 − t)², 2t(1 − t), t².
    pub fn deriv_numerator(&self) -> [Vec2; 3] {
        let [p0, p1, p2] = self.points();
        let w = self.weight();
        [2.0 * w * (p1 - p0), p2 - p0, 2.0 * w * (p2 - p1)]
    }

    /// First derivative C'(t), by the quotient rule on the homogeneous curve.
    pub fn deriv_at(&self, t: f64) -> Vec2 {
        let h = self.eval_homogeneous(t);
        let d = 2.0 * (self.h[1] - self.h[0]).lerp(&(self.h[2] - self.h[1]), t);
        let w2 = h.z * h.z;
        Vec2::new((d.x * h.z - h.x * d.z) / w2, (d.y * h.z - h.y * d.z) / w2)
    }

    /// The signed acceleration across the direction of travel at t, (C′ × C″) / |C′| (positive
    /// turning left; the curvature times the squared speed). For a rational curve
    /// C = (H.x, H.y) / H.z, C′ × C″ = det(H, H′, H″) / H.z³; for a quadratic H that determinant is
    /// constant (its derivative is det(H, H′, H‴) = 0), 4·det(H₀, H₁, H₂) at t = 0 [derived].
    pub fn normal_acceleration_at(&self, t: f64) -> f64 {
        let det = self.h[0].dot(&self.h[1].cross(&self.h[2]));
        let w = self.eval_homogeneous(t).z;
        4.0 * det / (w * w * w * self.deriv_at(t).hypot())
    }

    /// A rigorous upper bound on |C'(t)| over t in [0, 1].
    pub fn speed_bound(&self) -> f64 {
        let dmax = self
            .deriv_numerator()
            .iter()
            .map(|d| d.hypot())
            .fold(0.0, f64::max);
        let wmin = (0.5 * (1.0 + self.weight())).min(1.0);
        dmax / (wmin * wmin)
    }

    /// A rigorous upper bound on |C''(t)| over t in [0, 1]. From C = N/W,
    /// C'' = (N'' − W''·C − 2W'·C') / W, with the origin moved to the centroid O of the control
    /// points (C'' does not change): |N''| is constant, |W''| = 4|1 − w|, |W'| ≤ 2|1 − w|,
    /// |C − O| ≤ max|Pᵢ − O| (convex hull) and |C'| ≤ `speed_bound`.
    pub fn accel_bound(&self) -> f64 {
        let [p0, p1, p2] = self.points();
        let w = self.weight();
        let o = Point::new((p0.x + p1.x + p2.x) / 3.0, (p0.y + p1.y + p2.y) / 3.0);
        let n2 = 2.0 * ((p0 - o) - 2.0 * w * (p1 - o) + (p2 - o));
        let r = [p0, p1, p2]
            .iter()
            .map(|p| (*p - o).hypot())
            .fold(0.0, f64::max);
        let dw = (1.0 - w).abs();
        let wmin = (0.5 * (1.0 + w)).min(1.0);
        (n2.hypot() + 4.0 * dw * r + 4.0 * dw * self.speed_bound()) / wmin
    }

    /// Split at t into two conics, each in standard form.
    pub fn split(&self, t: f64) -> (Conic, Conic) {
        (self.subconic(0.0, t), self.subconic(t, 1.0))
    }

    /// The piece over [t0, t1], re-parametrised to [0, 1] and normalised to standard form.
    pub fn subconic(&self, t0: f64, t1: f64) -> Conic {
        let h = [
            self.blossom(t0, t0),
            self.blossom(t0, t1),
            self.blossom(t1, t1),
        ];
        // Weights of sub-pieces of a positive-weight conic are convex combinations of positive
        // weights, hence positive; normalisation cannot fail for t in [0, 1].
        let p = h.map(|v| Point::new(v.x / v.z, v.y / v.z));
        let wm = h[1].z / (h[0].z * h[2].z).sqrt();
        Conic {
            h: [
                Vector3::new(p[0].x, p[0].y, 1.0),
                Vector3::new(p[1].x * wm, p[1].y * wm, wm),
                Vector3::new(p[2].x, p[2].y, 1.0),
            ],
        }
    }

    /// The same curve traversed backwards.
    pub fn reversed(&self) -> Conic {
        Conic {
            h: [self.h[2], self.h[1], self.h[0]],
        }
    }

    /// Apply an affine map exactly: control points move, weights stay.
    pub fn transform(&self, a: Affine) -> Conic {
        let [p0, p1, p2] = self.points();
        let w = self.weight();
        let (q0, q1, q2) = (a * p0, a * p1, a * p2);
        Conic {
            h: [
                Vector3::new(q0.x, q0.y, 1.0),
                Vector3::new(q1.x * w, q1.y * w, w),
                Vector3::new(q2.x, q2.y, 1.0),
            ],
        }
    }

    /// Centre, radius and sweep when this conic is exactly a circular arc: an isosceles control
    /// triangle with w = cos(θ/2), θ the sweep (NURBS Book §7.3). `rel` is the relative
    /// tolerance on both conditions.
    pub fn as_circle(&self, rel: f64) -> Option<CircleFit> {
        let [p0, p1, p2] = self.points();
        let (a, b) = (p1 - p0, p2 - p1);
        let (la, lb) = (a.hypot(), b.hypot());
        let scale = la.max(lb);
        if scale == 0.0 || (la - lb).abs() > rel * scale {
            return None;
        }
        let chord = p2 - p0;
        let lc = chord.hypot();
        if lc == 0.0 {
            return None;
        }
        // Base angle α between the chord and the tangent at P0; the sweep is 2α.
        let cos_alpha = (chord.dot(a) / (lc * la)).clamp(-1.0, 1.0);
        if (cos_alpha - self.weight()).abs() > rel {
            return None;
        }
        let alpha = cos_alpha.acos();
        if alpha <= 0.0 {
            return None;
        }
        let cross = a.cross(b);
        let sign = if cross >= 0.0 { 1.0 } else { -1.0 };
        let radius = 0.5 * lc / alpha.sin();
        let tangent = a / la;
        let normal = Vec2::new(-tangent.y, tangent.x) * sign;
        Some(CircleFit {
            center: p0 + normal * radius,
            radius,
            sweep: 2.0 * alpha * sign,
        })
    }

    /// Parameter values in (0, 1) where x' = 0 or y' = 0.
    fn extrema_params(&self) -> ArrayVec<f64, 4> {
        let [d0, d1, d2] = self.deriv_numerator();
        let mut out = ArrayVec::new();
        for (a, b, c) in [(d0.x, d1.x, d2.x), (d0.y, d1.y, d2.y)] {
            // Bernstein to power basis: a + 2(b − a)t + (a − 2b + c)t².
            for t in solve_quadratic(a, 2.0 * (b - a), a - 2.0 * b + c) {
                if t > 0.0 && t < 1.0 {
                    out.push(t);
                }
            }
        }
        out.sort_by(f64::total_cmp);
        out
    }
}

/// Bernstein coefficients of a quadratic to power-basis coefficients [c0, c1, c2].
fn power2(a: f64, b: f64, c: f64) -> [f64; 3] {
    [a, 2.0 * (b - a), a - 2.0 * b + c]
}

fn mul2(p: [f64; 3], q: [f64; 3]) -> [f64; 5] {
    let mut r = [0.0; 5];
    for (i, pi) in p.iter().enumerate() {
        for (j, qj) in q.iter().enumerate() {
            r[i + j] += pi * qj;
        }
    }
    r
}

impl ParamCurve for Conic {
    fn eval(&self, t: f64) -> Point {
        let h = self.eval_homogeneous(t);
        Point::new(h.x / h.z, h.y / h.z)
    }

    fn subsegment(&self, range: core::ops::Range<f64>) -> Conic {
        self.subconic(range.start, range.end)
    }

    fn start(&self) -> Point {
        Point::new(self.h[0].x, self.h[0].y)
    }

    fn end(&self) -> Point {
        Point::new(self.h[2].x, self.h[2].y)
    }
}

impl ParamCurveNearest for Conic {
    /// The nearest point: the stationary points of |C(t) − p|² are the roots in [0, 1] of the
    /// quartic (N − pW)·(N'W − NW') = 0, compared with the end points. The accuracy argument
    /// is not needed: the roots are found in closed form (kurbo's `solve_quartic`).
    fn nearest(&self, p: Point, _accuracy: f64) -> kurbo::Nearest {
        let [q0, q1, q2] = self.points();
        let w = self.weight();
        let e = [q0 - p, w * (q1 - p), q2 - p];
        let d = self.deriv_numerator();
        let ex = power2(e[0].x, e[1].x, e[2].x);
        let ey = power2(e[0].y, e[1].y, e[2].y);
        let dx = power2(d[0].x, d[1].x, d[2].x);
        let dy = power2(d[0].y, d[1].y, d[2].y);
        let (px, py) = (mul2(ex, dx), mul2(ey, dy));
        let c: Vec<f64> = (0..5).map(|i| px[i] + py[i]).collect();
        let mut best = kurbo::Nearest {
            distance_sq: (self.start() - p).hypot2(),
            t: 0.0,
        };
        let mut consider = |t: f64| {
            let d2 = (self.eval(t) - p).hypot2();
            if d2 < best.distance_sq {
                best = kurbo::Nearest { distance_sq: d2, t };
            }
        };
        consider(1.0);
        for t in solve_quartic(c[0], c[1], c[2], c[3], c[4]) {
            if (0.0..=1.0).contains(&t) {
                consider(t);
            }
        }
        best
    }
}

impl ParamCurveArclen for Conic {
    /// Arc length by adaptive subdivision: a positive-weight conic arc is convex and lies in its
    /// control triangle, so its length lies between the chord and the control polygon's length;
    /// pieces are split until the two agree within the accuracy, and their mean is summed.
    fn arclen(&self, accuracy: f64) -> f64 {
        fn rec(c: &Conic, acc: f64, depth: u32) -> f64 {
            let [p0, p1, p2] = c.points();
            let chord = (p2 - p0).hypot();
            let poly = (p1 - p0).hypot() + (p2 - p1).hypot();
            if poly - chord <= acc || depth >= 24 {
                return 0.5 * (poly + chord);
            }
            let (l, r) = c.split(0.5);
            rec(&l, 0.5 * acc, depth + 1) + rec(&r, 0.5 * acc, depth + 1)
        }
        rec(self, accuracy.max(1e-12), 0)
    }
}

impl ParamCurveExtrema for Conic {
    fn extrema(&self) -> ArrayVec<f64, { kurbo::MAX_EXTREMA }> {
        self.extrema_params()
    }
}

#[cfg(test)]
// The check values are the published decimals of REFERENCES §2, not the constants they approach.
#[allow(clippy::approx_constant)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;
    use std::f64::consts::{FRAC_1_SQRT_2, PI};

    fn quarter() -> Conic {
        Conic::new(
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
            FRAC_1_SQRT_2,
            Point::new(0.0, 1.0),
        )
        .unwrap()
    }

    #[test]
    fn quarter_circle_check_values() {
        // Check values: shared REFERENCES §2, derived from The NURBS Book ch. 7 (w = cos 45°).
        let c = quarter();
        let m = c.eval(0.5);
        assert_abs_diff_eq!(m.x, 0.707106781187, epsilon = 1e-12);
        assert_abs_diff_eq!(m.y, 0.707106781187, epsilon = 1e-12);
        let t3 = c.eval(1.0 / 3.0);
        assert_abs_diff_eq!(t3.x, 0.872260419103, epsilon = 1e-12);
        assert_abs_diff_eq!(t3.y, 0.489041676411, epsilon = 1e-12);
        let d0 = c.deriv_at(0.0);
        assert_abs_diff_eq!(d0.x, 0.0, epsilon = 1e-12);
        assert_abs_diff_eq!(d0.y, 1.414213562, epsilon = 1e-9);
        let q = c.eval(0.25);
        assert_abs_diff_eq!(q.y.atan2(q.x).to_degrees(), 21.5981609837, epsilon = 1e-9);
        for i in 0..=100 {
            let p = c.eval(i as f64 / 100.0);
            assert_abs_diff_eq!(p.to_vec2().hypot(), 1.0, epsilon = 1e-14);
        }
    }

    #[test]
    fn third_circle_check_value() {
        // 120° arc with w = 1/2: REFERENCES §2 (NURBS Book ch. 7, three-piece circle).
        let s3 = 3f64.sqrt();
        let c = Conic::new(
            Point::new(1.0, 0.0),
            Point::new(1.0, s3),
            0.5,
            Point::new(-0.5, s3 / 2.0),
        )
        .unwrap();
        let m = c.eval(0.5);
        assert_abs_diff_eq!(m.x, 0.5, epsilon = 1e-12);
        assert_abs_diff_eq!(m.y, 0.866025403784, epsilon = 1e-12);
        let f = c.as_circle(1e-9).unwrap();
        assert_abs_diff_eq!(f.radius, 1.0, epsilon = 1e-12);
        assert_abs_diff_eq!(f.sweep, 2.0 * PI / 3.0, epsilon = 1e-12);
        assert_abs_diff_eq!(f.center.x, 0.0, epsilon = 1e-12);
    }

    #[test]
    fn weights_scale_and_normalise() {
        // Scaling all weights leaves the curve unchanged (Farin ch. 13); (1, w, 1)·3 and the
        // non-standard (4, 2√2, 1) → w' = 2√2/√4 = √2 both check against the standard form.
        let p = [
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
            Point::new(0.0, 1.0),
        ];
        let a = Conic::from_weighted(p, [3.0, 3.0 * FRAC_1_SQRT_2, 3.0]).unwrap();
        assert_abs_diff_eq!(a.weight(), FRAC_1_SQRT_2, epsilon = 1e-15);
        let b = Conic::from_weighted(p, [4.0, 2.0, 1.0]).unwrap();
        assert_abs_diff_eq!(b.weight(), 1.0, epsilon = 1e-15);
        // Reparametrisation maps points onto the same curve: b lies on the parabola through
        // the same control points, so its points are points of the standard-form parabola.
        let s = Conic::new(p[0], p[1], 1.0, p[2]).unwrap();
        for i in 0..=20 {
            let q = b.eval(i as f64 / 20.0);
            assert!(s.nearest(q, 1e-12).distance_sq.sqrt() < 1e-12);
        }
    }

    #[test]
    fn rejects_bad_weights() {
        let p = Point::ORIGIN;
        assert_eq!(Conic::new(p, p, 0.0, p), Err(GeomError::NonPositiveWeight));
        assert_eq!(Conic::new(p, p, -1.0, p), Err(GeomError::NonPositiveWeight));
        assert_eq!(Conic::new(p, p, f64::NAN, p), Err(GeomError::NonFinite));
        let q = Point::new(f64::INFINITY, 0.0);
        assert_eq!(Conic::new(p, q, 1.0, p), Err(GeomError::NonFinite));
        let h = [
            Vector3::new(0.0, 0.0, 1.0),
            Vector3::new(1.0, 1.0, -1.0),
            Vector3::z(),
        ];
        assert_eq!(
            Conic::from_homogeneous(h),
            Err(GeomError::NonPositiveWeight)
        );
    }

    #[test]
    fn subdivision_stays_on_curve() {
        let c = quarter();
        let (l, r) = c.split(0.3);
        assert_abs_diff_eq!(l.end().x, c.eval(0.3).x, epsilon = 1e-15);
        for i in 0..=10 {
            let t = i as f64 / 10.0;
            assert_abs_diff_eq!(l.eval(t).to_vec2().hypot(), 1.0, epsilon = 1e-14);
            assert_abs_diff_eq!(r.eval(t).to_vec2().hypot(), 1.0, epsilon = 1e-14);
        }
        // A piece of a circle is a circle: its weight is cos of half its own sweep.
        let s = c.subconic(0.2, 0.7);
        let f = s.as_circle(1e-9).expect("piece of a circle");
        assert_abs_diff_eq!(f.radius, 1.0, epsilon = 1e-12);
        let a0 = c.eval(0.2).to_vec2().atan2();
        let a1 = c.eval(0.7).to_vec2().atan2();
        assert_abs_diff_eq!(f.sweep, a1 - a0, epsilon = 1e-12);
    }

    #[test]
    fn derivative_matches_finite_difference_and_bound() {
        let c = Conic::new(
            Point::new(0.0, 0.0),
            Point::new(3.0, 5.0),
            2.5,
            Point::new(7.0, -1.0),
        )
        .unwrap();
        let bound = c.speed_bound();
        for i in 0..=200 {
            let t = i as f64 / 200.0;
            let h = 1e-6;
            let fd = (c.eval((t + h).min(1.0)) - c.eval((t - h).max(0.0)))
                / ((t + h).min(1.0) - (t - h).max(0.0));
            let d = c.deriv_at(t);
            assert!((fd - d).hypot() < 1e-4 * d.hypot().max(1.0), "t = {t}");
            assert!(d.hypot() <= bound * (1.0 + 1e-12));
            let acc = (c.deriv_at((t + h).min(1.0)) - c.deriv_at((t - h).max(0.0)))
                / ((t + h).min(1.0) - (t - h).max(0.0));
            assert!(acc.hypot() <= c.accel_bound() * (1.0 + 1e-6), "t = {t}");
        }
    }

    #[test]
    fn nearest_point_against_dense_search() {
        let c = Conic::new(
            Point::new(0.0, 0.0),
            Point::new(3.0, 5.0),
            0.3,
            Point::new(7.0, -1.0),
        )
        .unwrap();
        for (x, y) in [
            (1.0, 1.0),
            (5.0, 5.0),
            (-3.0, 2.0),
            (3.5, 0.0),
            (10.0, -4.0),
        ] {
            let p = Point::new(x, y);
            let n = c.nearest(p, 1e-12);
            let dense = (0..=100_000)
                .map(|i| (c.eval(i as f64 / 100_000.0) - p).hypot2())
                .fold(f64::INFINITY, f64::min);
            assert!(n.distance_sq <= dense + 1e-12);
            assert!(n.distance_sq >= dense - 1e-6);
        }
    }

    #[test]
    fn affine_map_is_exact() {
        let a = Affine::new([2.0, 0.5, -0.3, 1.5, 10.0, -4.0]);
        let c = quarter().transform(a);
        let q = quarter();
        for i in 0..=10 {
            let t = i as f64 / 10.0;
            let d = c.eval(t) - a * q.eval(t);
            assert!(d.hypot() < 1e-13);
        }
    }

    #[test]
    fn classification() {
        let p = [
            Point::new(0.0, 0.0),
            Point::new(1.0, 1.0),
            Point::new(2.0, 0.0),
        ];
        let k = |w| Conic::new(p[0], p[1], w, p[2]).unwrap().kind();
        assert_eq!(k(0.5), ConicKind::Ellipse);
        assert_eq!(k(1.0), ConicKind::Parabola);
        assert_eq!(k(2.0), ConicKind::Hyperbola);
    }

    #[test]
    fn bounding_box_of_quarter_circle_piece() {
        let c = Conic::new(
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
            FRAC_1_SQRT_2,
            Point::new(0.0, 1.0),
        )
        .unwrap()
        .transform(Affine::rotate(PI / 8.0));
        let bb = c.bounding_box();
        // Rotated by 22.5°, the arc spans angles 22.5°..112.5° and passes the top (y = 1).
        assert_abs_diff_eq!(bb.y1, 1.0, epsilon = 1e-12);
        assert_abs_diff_eq!(bb.x0, (112.5f64).to_radians().cos(), epsilon = 1e-12);
    }
}
