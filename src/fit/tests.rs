//! Tests of the fitting targets against published closed forms (shared REFERENCES §3, §6).

use std::f64::consts::PI;

use kurbo::{CubicBez, Point, QuadBez, Vec2};

use super::*;
use crate::geom::{ellipse_conics, Contour, Source};

fn circle(r: f64) -> Contour {
    let segs = ellipse_conics(Point::new(20.0, 30.0), r, r, 0.0)
        .into_iter()
        .map(Segment::Conic)
        .collect();
    Contour::new(segs, true, Source::new("test", "circle", 0))
}

fn tol(x: f64) -> Tolerance {
    Tolerance::new(x).unwrap()
}

#[test]
fn full_circle_counts_meet_the_theoretical_minimum() {
    // Shared REFERENCES §3, table "Full circle, r = 10 mm" [derived from the closed forms]:
    // lines with the error split both sides 50 (158), quadratics 11 (19), cubics 4 (5), arcs
    // exact.
    for (t, lines, quads, cubics) in [(0.01, 50, 11, 4), (0.001, 158, 19, 5)] {
        let c = circle(10.0);
        let n = |target| fit(&c, target, tol(t));
        let l = n(Target::Lines);
        assert_eq!(l.contour.segments.len(), lines, "lines at {t}");
        assert!(l.deviation.bound <= t);
        let q = n(Target::Quadratic);
        assert_eq!(q.contour.segments.len(), quads, "quadratics at {t}");
        assert!(q.deviation.bound <= t);
        let cu = n(Target::Cubic);
        assert_eq!(cu.contour.segments.len(), cubics, "cubics at {t}");
        assert!(cu.deviation.bound <= t);
        let a = n(Target::Arcs);
        assert_eq!(a.contour.segments.len(), 1);
        assert_eq!(a.deviation.bound, 0.0);
    }
}

#[test]
fn certified_bound_is_tight_on_circles() {
    // The certified bound may exceed the exact analytic error by at most 5% of the tolerance.
    // Exact errors: the regular n-gon of circumradius R = 2r/(1 + cos(π/n)) is R − r away
    // (standard geometry); quadratic r(1 − c)²/(2c); cubic via `circle::cubic_error`
    // (REFERENCES §3).
    let r = 10.0;
    for t in [0.01, 0.001] {
        let c = circle(r);
        let l = fit(&c, Target::Lines, tol(t));
        let n = l.contour.segments.len() as f64;
        let exact = 2.0 * r / (1.0 + (PI / n).cos()) - r;
        assert!(l.deviation.bound >= exact - 1e-12);
        assert!(
            l.deviation.bound - exact <= 0.05 * t,
            "lines {} vs {}",
            l.deviation.bound,
            exact
        );
        let q = fit(&c, Target::Quadratic, tol(t));
        let th = 2.0 * PI / q.contour.segments.len() as f64;
        let cc = (0.5 * th).cos();
        let exact = r * (1.0 - cc).powi(2) / (2.0 * cc);
        assert!(q.deviation.bound >= exact - 1e-12);
        assert!(q.deviation.bound - exact <= 0.05 * t);
        let cu = fit(&c, Target::Cubic, tol(t));
        let th = 2.0 * PI / cu.contour.segments.len() as f64;
        let exact = r * circle::cubic_error(th);
        assert!(cu.deviation.bound >= exact - 1e-12);
        assert!(cu.deviation.bound - exact <= 0.05 * t);
    }
}

#[test]
fn biarc_check_values() {
    // Shared REFERENCES §6 [derived from Bolton 1975]: P0 = (0,0) tangent 50°, P1 = (10,0)
    // tangent −20°: α = β = 2.82724331249, J = (4.580288646, 1.566384096), radii 4.683050735
    // and 41.68752406.
    let t0 = Vec2::from_angle(50f64.to_radians());
    let t1 = Vec2::from_angle(-20f64.to_radians());
    let (j, tj) = arcs::junction(Point::ORIGIN, t0, Point::new(10.0, 0.0), t1).unwrap();
    assert!((j - Point::new(4.580288646, 1.566384096)).hypot() < 1e-8);
    let r = |s: Segment| match s {
        Segment::Arc(a) => a.radius,
        other => panic!("{other:?}"),
    };
    assert!((r(arcs::arc_through(Point::ORIGIN, t0, j)) - 4.683050735).abs() < 1e-8);
    assert!((r(arcs::arc_through(j, tj, Point::new(10.0, 0.0))) - 41.68752406).abs() < 1e-6);
}

fn sample_contours() -> Vec<Contour> {
    let src = |n| Source::new("test", n, 0);
    let ellipse = ellipse_conics(Point::new(5.0, 5.0), 12.0, 4.0, 0.4)
        .into_iter()
        .map(Segment::Conic)
        .collect();
    vec![
        Contour::new(ellipse, true, src("ellipse")),
        Contour::new(
            vec![Segment::Quad(QuadBez::new(
                (0.0, 0.0),
                (5.0, 10.0),
                (10.0, 0.0),
            ))],
            false,
            src("quad"),
        ),
        Contour::new(
            vec![Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (0.0, 10.0),
                (10.0, -10.0),
                (10.0, 0.0),
            ))],
            false,
            src("s-cubic"),
        ),
        Contour::new(
            vec![Segment::Cubic(CubicBez::new(
                (0.0, 0.0),
                (10.0, 10.0),
                (0.0, 10.0),
                (10.0, 0.0),
            ))],
            false,
            src("cusp-cubic"),
        ),
        Contour::new(
            vec![Segment::Conic(
                crate::geom::Conic::new(
                    Point::new(0.0, 0.0),
                    Point::new(4.0, 9.0),
                    3.0,
                    Point::new(9.0, 1.0),
                )
                .unwrap(),
            )],
            false,
            src("hyperbola"),
        ),
    ]
}

#[test]
fn tolerance_sweep_every_target_every_kind() {
    // Certified bound ≤ tolerance for tolerances over five decades.
    for c in sample_contours() {
        for target in [
            Target::Lines,
            Target::Quadratic,
            Target::Cubic,
            Target::Arcs,
        ] {
            for t in [1.0, 0.1, 0.01, 1e-3, 1e-4] {
                let f = fit(&c, target, tol(t));
                assert!(
                    f.deviation.bound <= t,
                    "{} {:?} at {t}: {}",
                    c.source.element,
                    target,
                    f.deviation.bound
                );
                // Output is connected; an open one ends where the source ends, a closed one
                // closes (its start may lie off the curve, within the tolerance).
                let segs = &f.contour.segments;
                for w in segs.windows(2) {
                    assert!((w[0].end() - w[1].start()).hypot() < 1e-9);
                }
                let (start, end) = (segs[0].start(), segs[segs.len() - 1].end());
                if c.closed {
                    assert!((end - start).hypot() < 1e-9);
                    assert!((start - c.start().unwrap()).hypot() <= t);
                } else {
                    assert!((start - c.start().unwrap()).hypot() < 1e-9);
                    assert!((end - c.end().unwrap()).hypot() < 1e-9);
                }
            }
        }
    }
}
