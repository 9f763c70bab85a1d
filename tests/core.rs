//! The exact core against outside references: kurbo's SVG arc conversion, independent dense
//! sampling with kurbo's nearest-point solver, Wang's formula, and the closed-form minimum counts
//! of shared REFERENCES §3-§4.

mod common;

use std::f64::consts::{FRAC_PI_2, PI, TAU};

use common::{dense_hausdorff, Rng};
use kurbo::{CubicBez, Line, ParamCurve, Point, QuadBez, Vec2};
use ratline::fit::{fit, Target};
use ratline::geom::{
    ellipse_conics, svg_arc_to_center, CircularArc, Conic, Contour, Segment, Source, SvgArcParams,
    SvgArcShape, Tolerance,
};

const TARGETS: [Target; 4] = [
    Target::Lines,
    Target::Quadratic,
    Target::Cubic,
    Target::Arcs,
];

fn tol(x: f64) -> Tolerance {
    Tolerance::new(x).unwrap()
}

fn contour(segs: Vec<Segment>, name: &str) -> Contour {
    Contour::new(segs, false, Source::new("test", name, 0))
}

#[test]
fn svg_arcs_agree_with_kurbo() {
    // Reference library: kurbo::Arc::from_svg_arc (SVG 1.1 F.6.5) on 3,000 seeded random arcs:
    // every point of ratline's exact conics lies on kurbo's ellipse, and the end points match.
    let mut rng = Rng::new(7);
    let mut checked = 0;
    for _ in 0..3000 {
        let p = SvgArcParams {
            from: rng.point(-100.0, 100.0),
            rx: rng.range(0.5, 120.0),
            ry: rng.range(0.5, 120.0),
            x_rotation_deg: rng.range(-360.0, 720.0),
            large_arc: rng.bool(),
            sweep: rng.bool(),
            to: rng.point(-100.0, 100.0),
        };
        let svg = kurbo::SvgArc {
            from: p.from,
            to: p.to,
            radii: Vec2::new(p.rx, p.ry),
            x_rotation: p.x_rotation_deg.to_radians(),
            large_arc: p.large_arc,
            sweep: p.sweep,
        };
        let (SvgArcShape::Arc(mine), Some(theirs)) =
            (svg_arc_to_center(&p), kurbo::Arc::from_svg_arc(&svg))
        else {
            continue;
        };
        let scale = theirs.radii.x.max(theirs.radii.y);
        assert!(
            (mine.center - theirs.center).hypot() <= 1e-7 * scale,
            "{p:?}"
        );
        assert!((mine.sweep - theirs.sweep_angle).abs() <= 1e-7, "{p:?}");
        let frame = kurbo::Affine::translate(theirs.center.to_vec2())
            * kurbo::Affine::rotate(theirs.x_rotation)
            * kurbo::Affine::scale_non_uniform(theirs.radii.x, theirs.radii.y);
        let inv = frame.inverse();
        let conics = mine.to_conics();
        assert!((conics[0].start() - p.from).hypot() <= 1e-7 * scale);
        assert!((conics[conics.len() - 1].end() - p.to).hypot() <= 1e-7 * scale);
        for c in &conics {
            for i in 0..=8 {
                let q = inv * c.eval(i as f64 / 8.0);
                assert!((q.to_vec2().hypot() - 1.0).abs() < 1e-7, "{p:?}");
            }
        }
        checked += 1;
    }
    assert!(checked > 2900, "only {checked} arcs compared");
}

/// Random test shapes of every input kind.
fn random_contours(rng: &mut Rng, n: usize) -> Vec<Contour> {
    let mut out = Vec::new();
    for i in 0..n {
        let seg = match i % 5 {
            0 => Segment::Quad(QuadBez::new(
                rng.point(0.0, 20.0),
                rng.point(0.0, 20.0),
                rng.point(0.0, 20.0),
            )),
            1 => Segment::Cubic(CubicBez::new(
                rng.point(0.0, 20.0),
                rng.point(0.0, 20.0),
                rng.point(0.0, 20.0),
                rng.point(0.0, 20.0),
            )),
            2 => Segment::Conic(
                Conic::new(
                    rng.point(0.0, 20.0),
                    rng.point(0.0, 20.0),
                    rng.range(0.05, 4.0),
                    rng.point(0.0, 20.0),
                )
                .unwrap(),
            ),
            3 => Segment::Line(Line::new(rng.point(0.0, 20.0), rng.point(0.0, 20.0))),
            _ => Segment::Conic(
                ellipse_conics(
                    rng.point(0.0, 20.0),
                    rng.range(0.5, 15.0),
                    rng.range(0.5, 15.0),
                    rng.range(0.0, PI),
                )[0],
            ),
        };
        out.push(contour(vec![seg], &format!("random {i}")));
    }
    out
}

#[test]
fn dense_sampling_never_exceeds_the_certified_bound() {
    // Independent check: 10,000 samples per piece (kurbo's nearest point, or dense polylines for
    // conics and arcs) must never find a distance above the certified bound of that piece.
    let mut rng = Rng::new(11);
    let shapes = random_contours(&mut rng, 10);
    for c in &shapes {
        for target in TARGETS {
            for t in [0.1, 0.01] {
                let f = fit(c, target, tol(t));
                assert!(
                    f.deviation.bound <= t,
                    "{} {target:?} {t}",
                    c.source.element
                );
                for (p, out) in f.piece_segments() {
                    let src = c.segments[p.from.segment].subsegment(p.from.t, p.to.t);
                    let dense = dense_hausdorff(&[src], out, 10_000);
                    assert!(
                        dense <= p.deviation.bound + 1e-7,
                        "{} {target:?} {t}: dense {dense} > certified {}",
                        c.source.element,
                        p.deviation.bound
                    );
                }
            }
        }
    }
}

#[test]
fn tolerance_sweep_from_1mm_to_1e5mm() {
    // Every target, every input kind, tolerances over five decades: certified ≤ tolerance and
    // an independent dense check ≤ certified.
    let mut rng = Rng::new(23);
    let shapes = random_contours(&mut rng, 5);
    for c in &shapes {
        for target in TARGETS {
            for t in [1.0, 0.1, 0.01, 1e-3, 1e-4, 1e-5] {
                let f = fit(c, target, tol(t));
                assert!(
                    f.deviation.bound <= t,
                    "{} {target:?} {t}: {}",
                    c.source.element,
                    f.deviation.bound
                );
                let samples = if t < 1e-3 { 200 } else { 1000 };
                for (p, out) in f.piece_segments().step_by(1 + f.pieces.len() / 40) {
                    let src = c.segments[p.from.segment].subsegment(p.from.t, p.to.t);
                    let dense = dense_hausdorff(&[src], out, samples);
                    // 1e-7 mm covers the reference solvers' own accuracy (kurbo's nearest point).
                    assert!(
                        dense <= p.deviation.bound + 1e-7,
                        "{} {target:?} {t}: dense {dense} > {}",
                        c.source.element,
                        p.deviation.bound
                    );
                }
            }
        }
    }
}

/// Wang's formula: N = ⌈√(n(n−1)/8 · max‖Pᵢ − 2Pᵢ₊₁ + Pᵢ₊₂‖ / tol)⌉ uniform chords suffice
/// (Goldman, Pyramid Algorithms, 2003, §5.6.3).
fn wang(points: &[Point], t: f64) -> usize {
    let n = (points.len() - 1) as f64;
    let m = points
        .windows(3)
        .map(|w| (w[0].to_vec2() - 2.0 * w[1].to_vec2() + w[2].to_vec2()).hypot())
        .fold(0.0, f64::max);
    ((n * (n - 1.0) / 8.0 * m / t).sqrt()).ceil().max(1.0) as usize
}

#[test]
fn line_counts_never_exceed_wangs_formula() {
    let mut rng = Rng::new(5);
    for _ in 0..200 {
        let q = QuadBez::new(
            rng.point(0.0, 30.0),
            rng.point(0.0, 30.0),
            rng.point(0.0, 30.0),
        );
        let c = CubicBez::new(
            rng.point(0.0, 30.0),
            rng.point(0.0, 30.0),
            rng.point(0.0, 30.0),
            rng.point(0.0, 30.0),
        );
        for t in [0.1, 0.01] {
            let fq = fit(&contour(vec![Segment::Quad(q)], "q"), Target::Lines, tol(t));
            assert!(fq.contour.segments.len() <= wang(&[q.p0, q.p1, q.p2], t));
            let fc = fit(
                &contour(vec![Segment::Cubic(c)], "c"),
                Target::Lines,
                tol(t),
            );
            assert!(fc.contour.segments.len() <= wang(&[c.p0, c.p1, c.p2, c.p3], t));
        }
    }
}

#[test]
fn parabola_and_quarter_circle_chord_counts() {
    // Shared REFERENCES §4 [derived]: y = x² from (−1,1) via (0,−1) to (1,1): fewest chords
    // with their vertices on the curve 9 at 0.01 (Wang 10) and 27 at 0.001 (Wang 32); the exact
    // quarter circle r = 10: 18 chords at 0.01. ratline's lines cross the curve (vertices off
    // it except at the ends and the extremum), so they may only be fewer.
    let q = QuadBez::new((-1.0, 1.0), (0.0, -1.0), (1.0, 1.0));
    let n = |t| {
        fit(
            &contour(vec![Segment::Quad(q)], "parabola"),
            Target::Lines,
            tol(t),
        )
        .contour
        .segments
        .len()
    };
    let (coarse, fine) = (n(0.01), n(0.001));
    assert!(coarse <= 9, "{coarse}");
    assert_eq!(wang(&[q.p0, q.p1, q.p2], 0.01), 10);
    assert!(fine <= 27, "{fine}");
    assert_eq!(wang(&[q.p0, q.p1, q.p2], 0.001), 32);
    // With the error split both sides a line may bulge twice as far, so it can be √2 times as
    // long (the bulge grows with the square of the length): about 27/√2 ≈ 19 lines, plus the
    // shorter ones that end on the three vertices kept on the curve.
    assert!(fine <= 23, "{fine}");
    let quarter = ellipse_conics(Point::ORIGIN, 10.0, 10.0, 0.0)[0];
    let f = fit(
        &contour(vec![Segment::Conic(quarter)], "quarter"),
        Target::Lines,
        tol(0.01),
    );
    let quarter_lines = f.contour.segments.len();
    assert!((13..=18).contains(&quarter_lines), "{quarter_lines}");
}

/// The theoretical fewest pieces for an arc of sweep θ and radius r (shared REFERENCES §3).
fn theoretical_min(target: Target, r: f64, theta: f64, t: f64) -> usize {
    let per = match target {
        Target::Lines => 2.0 * (1.0 - t / r).max(-1.0).acos(),
        Target::Quadratic => {
            let k = t / r;
            2.0 * (1.0 - (-k + (k * k + 2.0 * k).sqrt())).max(-1.0).acos()
        }
        Target::Cubic => {
            let e = |th: f64| {
                let q = th / 4.0;
                (1.0 + 4.0 / 27.0 * q.sin().powi(6) / q.cos().powi(2)).sqrt() - 1.0
            };
            let (mut lo, mut hi) = (0.0, PI);
            for _ in 0..80 {
                let m = 0.5 * (lo + hi);
                if e(m) <= t / r {
                    lo = m
                } else {
                    hi = m
                }
            }
            lo
        }
        Target::Arcs => TAU,
    };
    (theta / per).ceil().max(1.0) as usize
}

#[test]
fn circular_arcs_stay_within_one_of_the_minimum() {
    // Radii from 0.5 mm to 400 mm (and extremes 1e-4 / 1e4 mm), arcs of random sweep built from
    // exact conics: no more than the theoretical minimum plus one, and arcs stay one arc.
    let mut rng = Rng::new(99);
    let mut radii = vec![1e-4, 0.5, 1.0, 10.0, 100.0, 400.0, 1e4];
    for _ in 0..20 {
        radii.push(rng.range(0.5, 400.0));
    }
    for &r in &radii {
        let sweep = rng.range(0.1, TAU);
        let arc = CircularArc {
            center: rng.point(-50.0, 50.0),
            radius: r,
            start_angle: rng.range(-PI, PI),
            sweep: if rng.bool() { sweep } else { -sweep },
        };
        let segs: Vec<Segment> = arc.to_conics().into_iter().map(Segment::Conic).collect();
        let c = contour(segs, "arc");
        for t in [0.01, 0.001] {
            for target in [Target::Lines, Target::Quadratic, Target::Cubic] {
                let f = fit(&c, target, tol(t));
                let min = theoretical_min(target, r, sweep, t);
                let cap = match target {
                    // The lines target keeps at least three chords per turn; quadratics at most 90°.
                    Target::Lines => (sweep / (TAU / 3.0)).ceil() as usize,
                    Target::Quadratic => (sweep / (PI / 2.0)).ceil() as usize,
                    _ => (sweep / PI).ceil() as usize,
                };
                // Lines keep a vertex on the curve at every x and y extremum, one more chord
                // at most for each inside the arc.
                let (lo, hi) = (
                    arc.start_angle.min(arc.start_angle + arc.sweep),
                    arc.start_angle.max(arc.start_angle + arc.sweep),
                );
                let extrema = ((hi / FRAC_PI_2).ceil() - (lo / FRAC_PI_2).floor() - 1.0) as usize;
                let kept = if target == Target::Lines { extrema } else { 0 };
                let n = f.contour.segments.len();
                assert!(
                    n <= min.max(cap) + 1 + kept,
                    "r {r} sweep {sweep} {target:?} {t}: {n} > {min}+1"
                );
                assert!(
                    f.deviation.bound <= t,
                    "r {r} sweep {sweep} {target:?} {t}: {:?}",
                    f.deviation
                );
            }
            let a = fit(&c, Target::Arcs, tol(t));
            assert_eq!(a.contour.segments.len(), 1);
        }
    }
}

#[test]
fn degenerate_inputs() {
    let p = Point::new(3.0, 4.0);
    let cases = vec![
        // Zero-length line and cubic, collinear control points, a cusp, coincident conic
        // control points, sweeps near 0 and near 360°.
        vec![Segment::Line(Line::new(p, p))],
        vec![Segment::Cubic(CubicBez::new(p, p, p, p))],
        vec![Segment::Cubic(CubicBez::new(
            (0.0, 0.0),
            (1.0, 0.0),
            (2.0, 0.0),
            (3.0, 0.0),
        ))],
        vec![Segment::Cubic(CubicBez::new(
            (0.0, 0.0),
            (3.0, 0.0),
            (0.0, 0.0),
            (3.0, 0.0),
        ))],
        vec![Segment::Cubic(CubicBez::new(
            (0.0, 0.0),
            (10.0, 10.0),
            (0.0, 10.0),
            (10.0, 0.0),
        ))],
        vec![Segment::Conic(
            Conic::new(p, p, 0.7, Point::new(5.0, 5.0)).unwrap(),
        )],
        vec![Segment::Conic(
            Conic::new(p, Point::new(5.0, 5.0), 0.7, Point::new(5.0, 5.0)).unwrap(),
        )],
        vec![Segment::Conic(
            Conic::new(
                Point::new(0.0, 0.0),
                Point::new(5.0, 0.0),
                2.0,
                Point::new(10.0, 0.0),
            )
            .unwrap(),
        )],
        CircularArc {
            center: p,
            radius: 5.0,
            start_angle: 0.0,
            sweep: 1e-7,
        }
        .to_conics()
        .into_iter()
        .map(Segment::Conic)
        .collect(),
        CircularArc {
            center: p,
            radius: 5.0,
            start_angle: 0.0,
            sweep: TAU - 1e-7,
        }
        .to_conics()
        .into_iter()
        .map(Segment::Conic)
        .collect(),
    ];
    for (i, segs) in cases.into_iter().enumerate() {
        let c = contour(segs, &format!("degenerate {i}"));
        for target in TARGETS {
            for t in [0.1, 1e-4] {
                let f = fit(&c, target, tol(t));
                assert!(
                    f.deviation.bound <= t,
                    "case {i} {target:?} {t}: {}",
                    f.deviation.bound
                );
                assert!(f.contour.segments.iter().all(|s| s.is_finite()));
            }
        }
    }
}
