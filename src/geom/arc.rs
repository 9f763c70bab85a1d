//! Circular and elliptical arcs, and their exact conversion into conics.
//!
//! An elliptical arc is the image of a unit-circle arc under the affine map
//! `translate(c) · rotate(φ) · scale(rx, ry)`. A unit-circle arc of sweep θ ≤ 90° is the conic with
//! end points on the circle, middle control point at the tangents' intersection (distance
//! 1 / cos(θ/2) from the centre) and weight cos(θ/2) (Piegl & Tiller, *The NURBS Book*, 2nd ed.,
//! 1997, §7.3). Affine maps carry conics to conics exactly, so every ellipse arc becomes
//! ⌈|sweep| / 90°⌉ conics with no approximation.
//!
//! SVG end-point arcs are converted to centre form by the SVG 1.1 (Second Edition) implementation
//! notes, Appendix F.6.5 (conversion) and F.6.6 (out-of-range radii), with the rules of F.6.2 in
//! order: identical end points omit the arc; rx = 0 or ry = 0 is a line; radii are taken as
//! absolute values; Λ = x1'²/rx² + y1'²/ry² > 1 scales both radii by √Λ; φ is taken modulo 360°;
//! any non-zero flag means 1.

use std::f64::consts::{FRAC_PI_2, TAU};

use kurbo::{Affine, ParamCurve, ParamCurveNearest, Point, Vec2};

use super::Conic;

/// A circular arc: centre, radius, start angle and signed sweep in radians (positive from +x
/// towards +y), |sweep| ≤ 2π. Parametrised uniformly in angle over t ∈ [0, 1].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CircularArc {
    pub center: Point,
    pub radius: f64,
    pub start_angle: f64,
    pub sweep: f64,
}

impl CircularArc {
    /// The point at angle `a`.
    fn at_angle(&self, a: f64) -> Point {
        self.center + self.radius * Vec2::from_angle(a)
    }

    /// Velocity at t (constant speed r·|sweep|).
    pub fn deriv_at(&self, t: f64) -> Vec2 {
        let a = self.start_angle + t * self.sweep;
        self.radius * self.sweep * Vec2::new(-a.sin(), a.cos())
    }

    /// The speed, which is constant.
    pub fn speed(&self) -> f64 {
        self.radius * self.sweep.abs()
    }

    /// The arc in conics of at most 90° each, exactly.
    pub fn to_conics(&self) -> Vec<Conic> {
        let n = pieces_for(self.sweep);
        let step = self.sweep / n as f64;
        let w = (0.5 * step).cos();
        (0..n)
            .filter_map(|i| {
                let a0 = self.start_angle + step * i as f64;
                let a1 = a0 + step;
                let mid = self.center + (self.radius / w) * Vec2::from_angle(a0 + 0.5 * step);
                Conic::new(self.at_angle(a0), mid, w, self.at_angle(a1)).ok()
            })
            .collect()
    }

    pub fn reversed(&self) -> CircularArc {
        CircularArc {
            start_angle: self.start_angle + self.sweep,
            sweep: -self.sweep,
            ..*self
        }
    }

    /// Whether angle `a` lies within the swept range.
    fn contains_angle(&self, a: f64) -> bool {
        let rel = (a - self.start_angle) * self.sweep.signum();
        rel.rem_euclid(TAU) <= self.sweep.abs() + 1e-15
    }
}

/// How many conics of at most 90° a sweep needs (allowing for rounding just above 90°).
fn pieces_for(sweep: f64) -> usize {
    ((sweep.abs() / FRAC_PI_2) - 1e-9).ceil().max(1.0) as usize
}

impl ParamCurve for CircularArc {
    fn eval(&self, t: f64) -> Point {
        self.at_angle(self.start_angle + t * self.sweep)
    }

    fn subsegment(&self, range: core::ops::Range<f64>) -> CircularArc {
        CircularArc {
            start_angle: self.start_angle + range.start * self.sweep,
            sweep: (range.end - range.start) * self.sweep,
            ..*self
        }
    }
}

impl ParamCurveNearest for CircularArc {
    /// Exact: a point's distance to a circle is |‖p − c‖ − r| (for the nearest point inside the
    /// swept range), otherwise the nearer end point.
    fn nearest(&self, p: Point, _accuracy: f64) -> kurbo::Nearest {
        let v = p - self.center;
        let mut best = {
            let (d0, d1) = ((self.eval(0.0) - p).hypot2(), (self.eval(1.0) - p).hypot2());
            if d0 <= d1 {
                kurbo::Nearest {
                    distance_sq: d0,
                    t: 0.0,
                }
            } else {
                kurbo::Nearest {
                    distance_sq: d1,
                    t: 1.0,
                }
            }
        };
        if v.hypot2() > 0.0 && self.sweep != 0.0 {
            let a = v.atan2();
            if self.contains_angle(a) {
                let d = v.hypot() - self.radius;
                if d * d < best.distance_sq {
                    let rel = ((a - self.start_angle) * self.sweep.signum()).rem_euclid(TAU);
                    best = kurbo::Nearest {
                        distance_sq: d * d,
                        t: (rel / self.sweep.abs()).clamp(0.0, 1.0),
                    };
                }
            }
        }
        best
    }
}

/// An elliptical arc in centre form: centre, radii, x-axis rotation (radians), start angle and
/// signed sweep of the ellipse's own parameter (radians).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct EllipseArc {
    pub center: Point,
    pub radii: Vec2,
    pub rotation: f64,
    pub start_angle: f64,
    pub sweep: f64,
}

impl EllipseArc {
    /// The affine map that carries the unit circle onto this ellipse.
    fn frame(&self) -> Affine {
        Affine::translate(self.center.to_vec2())
            * Affine::rotate(self.rotation)
            * Affine::scale_non_uniform(self.radii.x, self.radii.y)
    }

    /// The arc as conics of at most 90° of the ellipse's parameter each, exactly.
    pub fn to_conics(&self) -> Vec<Conic> {
        let unit = CircularArc {
            center: Point::ORIGIN,
            radius: 1.0,
            start_angle: self.start_angle,
            sweep: self.sweep,
        };
        let frame = self.frame();
        unit.to_conics()
            .iter()
            .map(|c| c.transform(frame))
            .collect()
    }
}

/// A full ellipse (a circle when rx = ry) as four exact quarter conics, starting at angle 0 and
/// turning from +x towards +y.
pub fn ellipse_conics(center: Point, rx: f64, ry: f64, rotation: f64) -> Vec<Conic> {
    EllipseArc {
        center,
        radii: Vec2::new(rx, ry),
        rotation,
        start_angle: 0.0,
        sweep: TAU,
    }
    .to_conics()
}

/// What an SVG end-point arc command stands for, after the out-of-range rules.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SvgArcShape {
    /// Identical end points: the arc is omitted.
    Omitted,
    /// A zero radius: a straight line to the end point.
    Line,
    /// A genuine elliptical arc.
    Arc(EllipseArc),
}

/// The parameters of an SVG `A` command from `from`: radii, x-axis rotation in degrees, flags,
/// end point.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SvgArcParams {
    pub from: Point,
    pub rx: f64,
    pub ry: f64,
    pub x_rotation_deg: f64,
    pub large_arc: bool,
    pub sweep: bool,
    pub to: Point,
}

/// Angle from u to v, signed, in (−π, π].
fn angle_between(u: Vec2, v: Vec2) -> f64 {
    u.cross(v).atan2(u.dot(v))
}

/// End-point to centre conversion, SVG 1.1 Appendix F.6.5 and F.6.6.
pub fn svg_arc_to_center(a: &SvgArcParams) -> SvgArcShape {
    if a.from == a.to {
        return SvgArcShape::Omitted;
    }
    let (mut rx, mut ry) = (a.rx.abs(), a.ry.abs());
    if rx == 0.0 || ry == 0.0 {
        return SvgArcShape::Line;
    }
    let phi = a.x_rotation_deg.rem_euclid(360.0).to_radians();
    let (s, c) = phi.sin_cos();
    // Step 1: (x1', y1').
    let h = 0.5 * (a.from - a.to);
    let x1 = c * h.x + s * h.y;
    let y1 = -s * h.x + c * h.y;
    // F.6.6: scale radii up when they cannot reach.
    let lambda = (x1 * x1) / (rx * rx) + (y1 * y1) / (ry * ry);
    if lambda > 1.0 {
        let k = lambda.sqrt();
        rx *= k;
        ry *= k;
    }
    // Step 2: (cx', cy'); clamp a slightly negative radicand to 0.
    let num = rx * rx * ry * ry - rx * rx * y1 * y1 - ry * ry * x1 * x1;
    let den = rx * rx * y1 * y1 + ry * ry * x1 * x1;
    let mut coef = (num / den).max(0.0).sqrt();
    if a.large_arc == a.sweep {
        coef = -coef;
    }
    let cx1 = coef * rx * y1 / ry;
    let cy1 = -coef * ry * x1 / rx;
    // Step 3: centre.
    let mid = a.from.midpoint(a.to);
    let center = Point::new(c * cx1 - s * cy1 + mid.x, s * cx1 + c * cy1 + mid.y);
    // Step 4: angles.
    let u = Vec2::new((x1 - cx1) / rx, (y1 - cy1) / ry);
    let v = Vec2::new((-x1 - cx1) / rx, (-y1 - cy1) / ry);
    let theta1 = angle_between(Vec2::new(1.0, 0.0), u);
    let mut dtheta = angle_between(u, v).rem_euclid(TAU);
    if !a.sweep && dtheta > 0.0 {
        dtheta -= TAU;
    }
    if a.sweep && dtheta <= 0.0 {
        dtheta += TAU;
    }
    if dtheta.abs() > TAU {
        dtheta = dtheta.signum() * TAU;
    }
    SvgArcShape::Arc(EllipseArc {
        center,
        radii: Vec2::new(rx, ry),
        rotation: phi,
        start_angle: theta1,
        sweep: if a.sweep { dtheta.abs() } else { -dtheta.abs() },
    })
}

/// A rounded-rectangle corner: a quarter ellipse from the end of one side to the start of the
/// next, as one exact conic. `corner` is the rectangle's sharp corner.
pub fn rounded_corner(from: Point, corner: Point, to: Point) -> Option<Conic> {
    Conic::new(from, corner, std::f64::consts::FRAC_1_SQRT_2, to).ok()
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn arc(
        from: (f64, f64),
        rx: f64,
        ry: f64,
        rot: f64,
        la: bool,
        sw: bool,
        to: (f64, f64),
    ) -> SvgArcShape {
        svg_arc_to_center(&SvgArcParams {
            from: from.into(),
            rx,
            ry,
            x_rotation_deg: rot,
            large_arc: la,
            sweep: sw,
            to: to.into(),
        })
    }

    fn expect_arc(s: SvgArcShape) -> EllipseArc {
        match s {
            SvgArcShape::Arc(e) => e,
            other => panic!("expected an arc, got {other:?}"),
        }
    }

    // Worked examples: shared REFERENCES §1, derived from SVG 1.1 (Second Edition) Appendix
    // F.6.5/F.6.6; the first two paths are the arc example of SVG 1.1 §8.3.8.
    #[test]
    fn svg_spec_path_example_one() {
        // from (150,200): a150,150 0 1,0 150,-150
        let e = expect_arc(arc(
            (150.0, 200.0),
            150.0,
            150.0,
            0.0,
            true,
            false,
            (300.0, 50.0),
        ));
        assert_abs_diff_eq!(e.center.x, 300.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.center.y, 200.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.start_angle.to_degrees().abs(), 180.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.sweep.to_degrees(), -270.0, epsilon = 1e-9);
    }

    #[test]
    fn svg_spec_path_example_two() {
        // M275,175 v-150 a150,150 0 0,0 -150,150
        let e = expect_arc(arc(
            (275.0, 25.0),
            150.0,
            150.0,
            0.0,
            false,
            false,
            (125.0, 175.0),
        ));
        assert_abs_diff_eq!(e.center.x, 275.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.center.y, 175.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.start_angle.to_degrees(), -90.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.sweep.to_degrees(), -90.0, epsilon = 1e-9);
    }

    #[test]
    fn svg_radii_scaled_up() {
        // from (650,325): a25,25 -30 0,1 50,-25 → Λ = 1.25, r = 27.9508497187
        let e = expect_arc(arc(
            (650.0, 325.0),
            25.0,
            25.0,
            -30.0,
            false,
            true,
            (700.0, 300.0),
        ));
        assert_abs_diff_eq!(e.radii.x, 27.9508497187, epsilon = 1e-9);
        assert_abs_diff_eq!(e.center.x, 675.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.center.y, 312.5, epsilon = 1e-9);
        assert_abs_diff_eq!(e.sweep.to_degrees(), 180.0, epsilon = 1e-9);
        let e = expect_arc(arc((0.0, 0.0), 1.0, 1.0, 0.0, false, true, (10.0, 0.0)));
        assert_abs_diff_eq!(e.radii.x, 5.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.center.x, 5.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.start_angle.to_degrees().abs(), 180.0, epsilon = 1e-9);
        assert_abs_diff_eq!(e.sweep.to_degrees(), 180.0, epsilon = 1e-9);
    }

    #[test]
    fn svg_rotated_ellipse() {
        // M10,20 A30,15 30 0,1 50,40 and the same with large-arc = 1.
        let e = expect_arc(arc(
            (10.0, 20.0),
            30.0,
            15.0,
            30.0,
            false,
            true,
            (50.0, 40.0),
        ));
        assert_abs_diff_eq!(e.center.x, 27.1196670586, epsilon = 1e-9);
        assert_abs_diff_eq!(e.center.y, 39.7243008422, epsilon = 1e-9);
        assert_abs_diff_eq!(e.start_angle.to_degrees(), -145.380248401, epsilon = 1e-8);
        assert_abs_diff_eq!(e.sweep.to_degrees(), 97.0697323050, epsilon = 1e-8);
        let l = expect_arc(arc(
            (10.0, 20.0),
            30.0,
            15.0,
            30.0,
            true,
            true,
            (50.0, 40.0),
        ));
        assert_abs_diff_eq!(l.center.x, 32.8803329414, epsilon = 1e-9);
        assert_abs_diff_eq!(l.center.y, 20.2756991578, epsilon = 1e-9);
        assert_abs_diff_eq!(l.start_angle.to_degrees(), 131.689483904, epsilon = 1e-8);
        assert_abs_diff_eq!(l.sweep.to_degrees(), 262.930267695, epsilon = 1e-8);
        // Negative radii and φ = 390° give the same arc.
        let n = expect_arc(arc(
            (10.0, 20.0),
            -30.0,
            -15.0,
            390.0,
            false,
            true,
            (50.0, 40.0),
        ));
        assert_abs_diff_eq!(n.center.x, e.center.x, epsilon = 1e-9);
        assert_abs_diff_eq!(n.sweep, e.sweep, epsilon = 1e-12);
    }

    #[test]
    fn svg_degenerate_rules() {
        assert_eq!(
            arc((0.0, 0.0), 0.0, 5.0, 0.0, false, true, (3.0, 1.0)),
            SvgArcShape::Line
        );
        assert_eq!(
            arc((3.0, 4.0), 5.0, 5.0, 0.0, false, true, (3.0, 4.0)),
            SvgArcShape::Omitted
        );
    }

    #[test]
    fn svg_arc_conics_hit_end_points_and_stay_on_ellipse() {
        let e = expect_arc(arc(
            (10.0, 20.0),
            30.0,
            15.0,
            30.0,
            true,
            true,
            (50.0, 40.0),
        ));
        let cs = e.to_conics();
        assert_eq!(cs.len(), 3); // 262.9° in pieces of at most 90°
        assert!((cs[0].start() - Point::new(10.0, 20.0)).hypot() < 1e-9);
        assert!((cs[2].end() - Point::new(50.0, 40.0)).hypot() < 1e-9);
        let inv = e.frame().inverse();
        for c in &cs {
            for i in 0..=20 {
                let q = inv * c.eval(i as f64 / 20.0);
                assert_abs_diff_eq!(q.to_vec2().hypot(), 1.0, epsilon = 1e-12);
            }
        }
    }

    #[test]
    fn full_circle_is_four_circular_conics() {
        let cs = ellipse_conics(Point::new(3.0, 4.0), 10.0, 10.0, 0.0);
        assert_eq!(cs.len(), 4);
        for c in &cs {
            let f = c.as_circle(1e-9).unwrap();
            assert_abs_diff_eq!(f.radius, 10.0, epsilon = 1e-12);
            assert_abs_diff_eq!(f.sweep, FRAC_PI_2, epsilon = 1e-12);
            assert_abs_diff_eq!(c.weight(), std::f64::consts::FRAC_1_SQRT_2, epsilon = 1e-15);
        }
    }

    #[test]
    fn circular_arc_nearest_is_exact() {
        let a = CircularArc {
            center: Point::new(1.0, 1.0),
            radius: 2.0,
            start_angle: 0.0,
            sweep: FRAC_PI_2,
        };
        let n = a.nearest(Point::new(4.0, 4.0), 0.0);
        assert_abs_diff_eq!(n.distance_sq.sqrt(), 18f64.sqrt() - 2.0, epsilon = 1e-12);
        assert_abs_diff_eq!(n.t, 0.5, epsilon = 1e-12);
        // Outside the swept range: nearest end point.
        let n = a.nearest(Point::new(1.0, -5.0), 0.0);
        assert_abs_diff_eq!(
            n.distance_sq,
            (Point::new(3.0, 1.0) - Point::new(1.0, -5.0)).hypot2(),
            epsilon = 1e-12
        );
    }
}
