//! Cut preparation against outside references: classical offset-curve geometry (an offset
//! circle is a concentric circle; the outward offset of a convex polygon has round corners of
//! the offset radius and the area of Steiner's formula A + P·k + πk²), geo's polygon buffer, the
//! circumference 2πr, the caster (tractrix) model of a drag knife, and the minimum spanning
//! tree lower bound on a shortest tour.

mod common;

use std::f64::consts::PI;

use common::{independent_distance, Rng};
use kurbo::{CubicBez, Line, ParamCurve, ParamCurveDeriv, Point, Vec2};
use ratline::geom::{ellipse_conics, Contour, Outline, Segment, Source, Tolerance};
use ratline::prep::{prepare, travel, Direction, KerfSide, Order, PrepOptions, Prepared};

fn tol(x: f64) -> Tolerance {
    Tolerance::new(x).unwrap()
}

fn src(name: &str) -> Source {
    Source::new("test", name, 0)
}

fn circle(c: (f64, f64), r: f64, name: &str) -> Contour {
    let segs = ellipse_conics(Point::new(c.0, c.1), r, r, 0.0)
        .into_iter()
        .map(Segment::Conic)
        .collect();
    Contour::new(segs, true, src(name))
}

fn polygon(pts: &[(f64, f64)], name: &str) -> Contour {
    let n = pts.len();
    let segs = (0..n)
        .map(|i| Segment::Line(Line::new(pts[i], pts[(i + 1) % n])))
        .collect();
    Contour::new(segs, true, src(name))
}

fn rect(x0: f64, y0: f64, x1: f64, y1: f64, name: &str) -> Contour {
    polygon(&[(x0, y0), (x1, y0), (x1, y1), (x0, y1)], name)
}

fn outline(contours: Vec<Contour>) -> Outline {
    Outline {
        contours,
        ..Outline::default()
    }
}

fn run(contours: Vec<Contour>, opts: &PrepOptions, t: f64) -> Prepared {
    prepare(outline(contours), opts, tol(t)).expect("valid options")
}

fn kerf(k: f64, side: KerfSide) -> PrepOptions {
    PrepOptions {
        kerf_mm: k,
        kerf_side: side,
        warnings: false,
        ..PrepOptions::default()
    }
}

/// Dense points of a contour.
fn samples(c: &Contour, per_segment: usize) -> Vec<Point> {
    c.segments
        .iter()
        .flat_map(|s| (0..=per_segment).map(move |i| s.eval(i as f64 / per_segment as f64)))
        .collect()
}

fn dist_to(c: &[Segment], p: Point) -> f64 {
    c.iter()
        .map(|s| {
            // Conics: a polyline of 1024 chords; its sagitta on a quarter circle of r = 10 is
            // r(1 − cos(π/4096)) ≈ 3e-6 mm, an over-estimate at most that large.
            if let Segment::Conic(_) = s {
                let b = s.bounding_box();
                let dx = (b.x0 - p.x).max(p.x - b.x1).max(0.0);
                let dy = (b.y0 - p.y).max(p.y - b.y1).max(0.0);
                if dx.hypot(dy) > 1.0 {
                    return dx.hypot(dy);
                }
            }
            independent_distance(s, p, 1024)
        })
        .fold(f64::INFINITY, f64::min)
}

#[test]
fn offset_circle_is_concentric_circle() {
    // Classical offset-curve geometry: the offset of a circle of radius r by k is the
    // concentric circle of radius r + k (outward) or r − k (inward, for a hole).
    let k = 0.35;
    let p = run(
        vec![
            rect(0.0, 0.0, 60.0, 60.0, "plate"),
            circle((30.0, 30.0), 10.0, "hole"),
            circle((100.0, 30.0), 7.5, "disc"),
        ],
        &kerf(2.0 * k, KerfSide::Outside),
        0.01,
    );
    let cs = &p.outline.contours;
    assert_eq!(cs.len(), 3);
    for (c, centre, r) in [
        (&cs[1], (30.0, 30.0), 10.0 - k),
        (&cs[2], (100.0, 30.0), 7.5 + k),
    ] {
        for s in &c.segments {
            let Segment::Arc(a) = s else {
                panic!("{}: not an exact arc: {s:?}", c.source)
            };
            assert!((a.radius - r).abs() <= 1e-9, "{} vs {r}", a.radius);
            assert!((a.center - Point::new(centre.0, centre.1)).hypot() <= 1e-9);
        }
        for q in samples(c, 200) {
            let d = (q - Point::new(centre.0, centre.1)).hypot();
            assert!((d - r).abs() <= 1e-9, "{d} vs {r}");
        }
    }
    let kr = p.report.kerf.as_ref().unwrap();
    assert_eq!(kr.max_deviation_mm, 0.0);
    assert_eq!(kr.fitted_segments, 0);
    println!("circle offsets: {kr:?}");
}

#[test]
fn square_outward_gets_round_corners_and_steiner_area() {
    // Outward offset of a convex polygon = boundary of its Minkowski sum with a disc: straight
    // sides moved out by k, corners rounded with radius k about the corners, area
    // A + P·k + π·k² (Steiner's formula).
    let (a, k) = (10.0, 1.5);
    let p = run(
        vec![rect(5.0, 5.0, 5.0 + a, 5.0 + a, "square")],
        &kerf(2.0 * k, KerfSide::Outside),
        0.01,
    );
    let c = &p.outline.contours[0];
    let corners = [(5.0, 5.0), (15.0, 5.0), (15.0, 15.0), (5.0, 15.0)];
    let arcs: Vec<_> = c
        .segments
        .iter()
        .filter_map(|s| match s {
            Segment::Arc(a) => Some(*a),
            _ => None,
        })
        .collect();
    assert_eq!(arcs.len(), 4);
    assert_eq!(c.segments.len(), 8);
    for arc in &arcs {
        assert!((arc.radius - k).abs() < 1e-12);
        assert!((arc.sweep.abs() - PI / 2.0).abs() < 1e-12);
        assert!(corners
            .iter()
            .any(|q| (arc.center - Point::new(q.0, q.1)).hypot() < 1e-12));
    }
    let steiner = a * a + 4.0 * a * k + PI * k * k;
    let area = c.signed_area().abs();
    // signed_area flattens each segment into 32 chords: a 90° arc loses r²(Δ − sin Δ)/2 per
    // chord, Δ = π/64, about 1.8e-3 mm² in all here.
    assert!((area - steiner).abs() < 5e-3, "{area} vs {steiner}");
    // Every point of the result is k from the square (distance to a set).
    let square = rect(5.0, 5.0, 5.0 + a, 5.0 + a, "square");
    for q in samples(c, 50) {
        assert!((dist_to(&square.segments, q) - k).abs() < 1e-9);
    }
}

#[test]
fn concave_polygon_offsets_match_exact_areas_and_geo_buffer() {
    // An L-shaped part (area 256, perimeter 80, five convex 90° corners and one reflex corner
    // at (8, 8)) has a concave corner where the offset pieces overlap and must be trimmed.
    // Exact areas [derived, strip decomposition: each side sweeps a strip of its length × k;
    // outward, convex corners add quarter discs and the reflex corner's strips overlap in a
    // k × k square; inward, convex corners' strips overlap in k × k squares and the reflex
    // corner removes a quarter disc]:
    //   out 1:   256 + 80 + 5π/4 − 1              = 338.926990817
    //   in 1:    256 − 80 + 5 − π/4                = 180.214601837
    //   in 3.5:  two 13 × 1 arms overlapping in 1 × 1, plus the 3.5 × 3.5 square at the
    //            reflex corner minus its quarter disc: 25 + 12.25(1 − π/4) = 27.628940581
    // Reference library: geo's polygon buffer (round joins, polyline arcs) agrees loosely.
    use geo::{Area, Buffer};
    let pts = [
        (0.0, 0.0),
        (20.0, 0.0),
        (20.0, 8.0),
        (8.0, 8.0),
        (8.0, 20.0),
        (0.0, 20.0),
    ];
    let cases = [
        (1.0, KerfSide::Outside, 335.0 + 1.25 * PI),
        (1.0, KerfSide::Inside, 181.0 - 0.25 * PI),
        (3.5, KerfSide::Inside, 25.0 + 12.25 * (1.0 - 0.25 * PI)),
    ];
    for (k, side, exact) in cases {
        let p = run(vec![polygon(&pts, "L")], &kerf(2.0 * k, side), 0.01);
        assert_eq!(p.outline.contours.len(), 1);
        let mine = p.outline.contours[0].signed_area().abs();
        let poly = geo::Polygon::new(
            geo::LineString::from(pts.iter().map(|&(x, y)| (x, y)).collect::<Vec<_>>()),
            vec![],
        );
        let grow = if side == KerfSide::Outside { k } else { -k };
        let theirs = poly.buffer(grow).unsigned_area();
        println!(
            "L offset {grow}: ratline area {mine:.6}, exact {exact:.6}, geo buffer {theirs:.6}"
        );
        // signed_area's 32 chords per segment shift an arc's area by under 5e-3 mm² here.
        assert!((mine - exact).abs() < 5e-3, "{mine} vs {exact}");
        assert!((mine - theirs).abs() / theirs < 3e-3, "{mine} vs {theirs}");
        // No point of the result is nearer the L than k (trimming removed the overlaps), and
        // none farther (no gaps).
        let l = polygon(&pts, "L");
        for q in samples(&p.outline.contours[0], 40) {
            assert!((dist_to(&l.segments, q) - k).abs() < 1e-9);
        }
    }
}

#[test]
fn small_hole_collapses_and_is_reported() {
    // A 2 mm hole (radius 1 mm) with a half-kerf of 1.5 mm: the hole would shrink to radius
    // −0.5 mm, so nothing is left of it.
    let p = run(
        vec![
            rect(0.0, 0.0, 20.0, 20.0, "plate"),
            circle((10.0, 10.0), 1.0, "small hole"),
        ],
        &kerf(3.0, KerfSide::Outside),
        0.01,
    );
    assert_eq!(p.outline.contours.len(), 1);
    assert_eq!(p.outline.contours[0].source.element, "plate");
    assert_eq!(p.report.removed.len(), 1);
    let s = &p.outline.skipped[0];
    assert_eq!(s.source.element, "small hole");
    assert!(s.reason.contains("kerf"), "{}", s.reason);
    // The same hole with a smaller kerf survives as a circle of radius 1 − 0.4.
    let q = run(
        vec![
            rect(0.0, 0.0, 20.0, 20.0, "plate"),
            circle((10.0, 10.0), 1.0, "small hole"),
        ],
        &kerf(0.8, KerfSide::Outside),
        0.01,
    );
    assert_eq!(q.outline.contours.len(), 2);
    assert!(q.outline.skipped.is_empty());
}

/// A smooth convex blob of four cubics (no circular pieces, so the offset is fitted).
fn blob() -> Contour {
    let c = [
        CubicBez::new((0.0, -10.0), (7.0, -10.0), (12.0, -5.0), (12.0, 0.0)),
        CubicBez::new((12.0, 0.0), (12.0, 6.0), (6.0, 8.0), (0.0, 8.0)),
        CubicBez::new((0.0, 8.0), (-5.0, 8.0), (-9.0, 4.0), (-9.0, 0.0)),
        CubicBez::new((-9.0, 0.0), (-9.0, -6.0), (-6.0, -10.0), (0.0, -10.0)),
    ];
    Contour::new(
        c.iter().map(|&b| Segment::Cubic(b)).collect(),
        true,
        src("blob"),
    )
}

/// The true offset of a cubic by k along its outward normal, from kurbo's own derivative.
fn true_offset(b: &CubicBez, k: f64, outward_sign: f64, t: f64) -> Point {
    let d = b.deriv().eval(t).to_vec2().normalize();
    b.eval(t) + outward_sign * k * Vec2::new(-d.y, d.x)
}

#[test]
fn bezier_offset_is_within_tolerance_of_true_offset() {
    // The offset curve of a Bézier is p(t) + k·n(t) (classical definition); sampled densely on
    // both sides and compared with the fitted result, over three decades of tolerance.
    let b = blob();
    let sign = -b.signed_area().signum(); // the left normal points inside when area > 0
    for (k, t) in [(0.5, 1e-2), (0.5, 1e-3), (2.0, 1e-4)] {
        let p = run(vec![b.clone()], &kerf(2.0 * k, KerfSide::Outside), t);
        let out = &p.outline.contours[0];
        let kr = p.report.kerf.as_ref().unwrap();
        assert!(kr.fitted_segments > 0);
        assert!(
            kr.max_deviation_mm <= t,
            "reported {} > {t}",
            kr.max_deviation_mm
        );
        let mut truth = Vec::new();
        let mut worst_true_to_fit: f64 = 0.0;
        for s in &b.segments {
            let Segment::Cubic(c) = s else { unreachable!() };
            for i in 0..=2000 {
                let q = true_offset(c, k, sign, i as f64 / 2000.0);
                worst_true_to_fit = worst_true_to_fit.max(dist_to(&out.segments, q));
                truth.push(q);
            }
        }
        let poly: Vec<Segment> = truth
            .windows(2)
            .filter(|w| w[0] != w[1])
            .map(|w| Segment::Line(Line::new(w[0], w[1])))
            .collect();
        let worst_fit_to_true = samples(out, 300)
            .into_iter()
            .map(|q| dist_to(&poly, q))
            .fold(0.0, f64::max);
        println!(
            "k = {k}, tol = {t}: reported {:.3e}, dense true→fit {worst_true_to_fit:.3e}, fit→true {worst_fit_to_true:.3e}, {} cubics",
            kr.max_deviation_mm, kr.fitted_segments
        );
        // The polyline of 2000 chords per cubic is within ~1e-6 mm of the true curve.
        assert!(worst_true_to_fit <= t && worst_fit_to_true <= t + 1e-6);
    }
}

/// Letters built from simple shapes: (name, contours, depth of each).
fn letters() -> Vec<(&'static str, Vec<Contour>, Vec<usize>)> {
    vec![
        (
            "o",
            vec![
                circle((10.0, 10.0), 8.0, "o outer"),
                circle((10.0, 10.0), 5.0, "o hole"),
            ],
            vec![0, 1],
        ),
        (
            "B",
            vec![
                rect(30.0, 0.0, 45.0, 20.0, "B outer"),
                rect(33.0, 3.0, 41.0, 8.5, "B upper hole"),
                rect(33.0, 11.5, 42.0, 17.0, "B lower hole"),
            ],
            vec![0, 1, 1],
        ),
        (
            "8",
            vec![
                polygon(
                    &[
                        (52.0, 0.0),
                        (64.0, 0.0),
                        (66.0, 10.0),
                        (64.0, 20.0),
                        (52.0, 20.0),
                        (50.0, 10.0),
                    ],
                    "8 outer",
                ),
                circle((58.0, 5.5), 3.0, "8 upper hole"),
                circle((58.0, 14.5), 3.5, "8 lower hole"),
            ],
            vec![0, 1, 1],
        ),
        (
            "e",
            vec![
                circle((80.0, 10.0), 9.0, "e outer"),
                polygon(&[(74.0, 8.0), (86.0, 8.0), (80.0, 3.0)], "e hole"),
            ],
            vec![0, 1],
        ),
        (
            "@",
            vec![
                circle((110.0, 10.0), 10.0, "@ outer"),
                circle((110.0, 10.0), 8.5, "@ ring hole"),
                circle((110.0, 10.0), 5.0, "@ a bowl"),
                circle((110.0, 10.0), 3.0, "@ a counter"),
            ],
            vec![0, 1, 2, 3],
        ),
    ]
}

#[test]
fn nesting_direction_by_signed_area() {
    // Outer contours (even depth) clockwise as seen on the drawing (positive signed area with
    // y down, Green's theorem), holes (odd depth) the other way; and the reverse for Ccw.
    for want in [Direction::Cw, Direction::Ccw] {
        for (name, cs, depths) in letters() {
            // Mix the input directions: reverse every other contour.
            let mixed: Vec<Contour> = cs
                .iter()
                .enumerate()
                .map(|(i, c)| if i % 2 == 1 { c.reversed() } else { c.clone() })
                .collect();
            let p = run(
                mixed,
                &PrepOptions {
                    direction: want,
                    warnings: false,
                    ..PrepOptions::default()
                },
                0.01,
            );
            for (c, d) in p.outline.contours.iter().zip(&depths) {
                let cw = c.signed_area() > 0.0;
                let outer = d % 2 == 0;
                assert_eq!(cw, outer == (want == Direction::Cw), "{name}: {}", c.source);
            }
        }
    }
}

#[test]
fn holes_are_cut_before_their_outer_contour() {
    for how in [Order::InsideFirst, Order::ShortTravel] {
        let mut all = Vec::new();
        for (_, cs, _) in letters() {
            all.extend(cs);
        }
        let p = run(
            all,
            &PrepOptions {
                order: how,
                warnings: false,
                ..PrepOptions::default()
            },
            0.01,
        );
        let pos = |name: &str| {
            p.outline
                .contours
                .iter()
                .position(|c| c.source.element == name)
                .unwrap_or_else(|| panic!("{name} lost"))
        };
        for (hole, outer) in [
            ("o hole", "o outer"),
            ("B upper hole", "B outer"),
            ("B lower hole", "B outer"),
            ("8 upper hole", "8 outer"),
            ("8 lower hole", "8 outer"),
            ("e hole", "e outer"),
            ("@ a counter", "@ a bowl"),
            ("@ a bowl", "@ ring hole"),
            ("@ ring hole", "@ outer"),
        ] {
            assert!(pos(hole) < pos(outer), "{how:?}: {hole} after {outer}");
        }
        let r = p.report.order.as_ref().unwrap();
        println!(
            "{how:?}: travel {:.3} -> {:.3} mm",
            r.travel_before_mm, r.travel_after_mm
        );
    }
}

/// Minimum spanning tree (Prim) over the origin and the circles, with the gap between circles
/// (centre distance minus both radii) as the weight: a lower bound on any pen-up travel that
/// visits them all from the origin (a path is a spanning tree).
fn mst_bound(circles: &[(Point, f64)]) -> f64 {
    let n = circles.len() + 1;
    let w = |i: usize, j: usize| {
        let (a, ra) = if i == 0 {
            (Point::ORIGIN, 0.0)
        } else {
            circles[i - 1]
        };
        let (b, rb) = if j == 0 {
            (Point::ORIGIN, 0.0)
        } else {
            circles[j - 1]
        };
        ((a - b).hypot() - ra - rb).max(0.0)
    };
    let mut best = vec![f64::INFINITY; n];
    let mut done = vec![false; n];
    best[0] = 0.0;
    let mut total = 0.0;
    for _ in 0..n {
        let u = (0..n)
            .filter(|&i| !done[i])
            .min_by(|&a, &b| best[a].total_cmp(&best[b]))
            .unwrap();
        done[u] = true;
        total += best[u];
        for v in 0..n {
            if !done[v] {
                best[v] = best[v].min(w(u, v));
            }
        }
    }
    total
}

#[test]
fn short_travel_on_shuffled_grid() {
    let mut rng = Rng::new(42);
    let mut circles: Vec<(Point, f64)> = (0..100)
        .map(|i| {
            (
                Point::new(10.0 + 10.0 * (i % 10) as f64, 10.0 + 10.0 * (i / 10) as f64),
                2.0,
            )
        })
        .collect();
    // Fisher-Yates shuffle.
    for i in (1..circles.len()).rev() {
        let j = (rng.next_u64() % (i as u64 + 1)) as usize;
        circles.swap(i, j);
    }
    let cs: Vec<Contour> = circles
        .iter()
        .enumerate()
        .map(|(i, (c, r))| circle((c.x, c.y), *r, &format!("c{i}")))
        .collect();
    let before = travel(&cs);
    let p = run(
        cs,
        &PrepOptions {
            order: Order::ShortTravel,
            warnings: false,
            ..PrepOptions::default()
        },
        0.01,
    );
    let after = travel(&p.outline.contours);
    let bound = mst_bound(&circles);
    println!(
        "grid: as drawn {before:.1} mm, short travel {after:.1} mm, MST lower bound {bound:.1} mm"
    );
    assert_eq!(p.outline.contours.len(), 100);
    assert!(after <= 0.8 * before);
    // The bound is not tight here: a closed contour is left where it was entered, so a row
    // of ten circles costs at least 90 − 4 mm end to end, not nine gaps of 6 mm.
    assert!(after >= bound - 1e-9);
    assert_eq!(p.report.order.as_ref().unwrap().travel_after_mm, after);
}

#[test]
fn short_travel_against_brute_force_on_eight_points() {
    // Brute force over all 8! orders of eight tiny closed contours (squares of 1 µm, so the
    // start point hardly matters): short travel is never shorter than the optimum and close
    // to it.
    let mut rng = Rng::new(3);
    for trial in 0..5 {
        let pts: Vec<Point> = (0..8).map(|_| rng.point(0.0, 100.0)).collect();
        let cs: Vec<Contour> = pts
            .iter()
            .enumerate()
            .map(|(i, p)| rect(p.x, p.y, p.x + 1e-3, p.y + 1e-3, &format!("p{i}")))
            .collect();
        let p = run(
            cs,
            &PrepOptions {
                order: Order::ShortTravel,
                warnings: false,
                ..PrepOptions::default()
            },
            0.01,
        );
        let after = travel(&p.outline.contours);
        let mut perm: Vec<usize> = (0..8).collect();
        let mut best = f64::INFINITY;
        // Heap's algorithm enumerates every permutation.
        fn heap(k: usize, perm: &mut Vec<usize>, pts: &[Point], best: &mut f64) {
            if k == 1 {
                let mut at = Point::ORIGIN;
                let mut sum = 0.0;
                for &i in perm.iter() {
                    sum += (pts[i] - at).hypot();
                    at = pts[i];
                }
                *best = best.min(sum);
                return;
            }
            for i in 0..k {
                heap(k - 1, perm, pts, best);
                if k.is_multiple_of(2) {
                    perm.swap(i, k - 1);
                } else {
                    perm.swap(0, k - 1);
                }
            }
        }
        heap(8, &mut perm, &pts, &mut best);
        println!("trial {trial}: short travel {after:.3} mm, optimum {best:.3} mm");
        assert!(after >= best - 0.01);
        assert!(after <= 1.1 * best + 0.01, "{after} vs {best}");
    }
}

#[test]
fn short_travel_never_increases_travel() {
    let mut rng = Rng::new(9);
    for trial in 0..20 {
        let n = 3 + (rng.next_u64() % 30) as usize;
        let cs: Vec<Contour> = (0..n)
            .map(|i| {
                let c = rng.point(0.0, 200.0);
                if rng.bool() {
                    circle((c.x, c.y), rng.range(0.5, 3.0), &format!("c{i}"))
                } else {
                    let s = rng.range(0.5, 3.0);
                    rect(c.x, c.y, c.x + s, c.y + s, &format!("r{i}"))
                }
            })
            .collect();
        let before = travel(&cs);
        let p = run(
            cs,
            &PrepOptions {
                order: Order::ShortTravel,
                warnings: false,
                ..PrepOptions::default()
            },
            0.01,
        );
        let after = travel(&p.outline.contours);
        assert!(after <= before + 1e-9, "trial {trial}: {after} > {before}");
        assert_eq!(p.outline.contours.len(), n);
    }
}

/// An independent caster simulation: the tip moves by the component of the axis displacement
/// along the blade (midpoint rule on fine steps), the classical tractrix model.
fn caster(axis: &[Segment], d: f64, tip0: Point) -> Vec<Point> {
    let mut tip = tip0;
    let mut out = vec![tip];
    for s in axis {
        let n = ((s.arclen(1e-6) / (d / 400.0)).ceil() as usize).max(1);
        for i in 0..n {
            let (a0, a1) = (
                s.eval(i as f64 / n as f64),
                s.eval((i + 1) as f64 / n as f64),
            );
            let mid = a0.midpoint(a1);
            let u = (mid - tip).normalize();
            tip += (a1 - a0).dot(u) * u;
            out.push(tip);
        }
    }
    out
}

#[test]
fn blade_offset_tip_follows_drawn_contour() {
    // Blade offsets 0.25 mm for 45° blades and 0.5 mm for 60° blades: common practice, no
    // source. Shapes: a square (four swivels), a circle (exact axis circle), the cubic blob.
    for d in [0.25, 0.5] {
        for shape in [
            rect(10.0, 10.0, 30.0, 30.0, "square"),
            circle((60.0, 20.0), 5.0, "circle"),
            blob(),
        ] {
            let drawn = shape.segments.clone();
            let p = run(
                vec![shape.clone()],
                &PrepOptions {
                    blade_offset_mm: d,
                    warnings: false,
                    ..PrepOptions::default()
                },
                0.01,
            );
            let axis = &p.outline.contours[0].segments;
            let br = p.report.blade.as_ref().unwrap();
            // The axis starts d ahead of the tip, at the start of the lead-in (a retrace of
            // the contour's last 3d): the tip is set down on the drawn contour, aligned.
            let first = axis[0].start();
            let lead_start = drawn
                .iter()
                .map(|s| s.nearest(first).0)
                .fold(f64::INFINITY, f64::min);
            assert!((lead_start - d).abs() < 1e-9 || lead_start < d);
            let tip0 = {
                // The tip under the axis start: the drawn point d behind it.
                let mut best = (f64::INFINITY, Point::ORIGIN);
                for s in &drawn {
                    for i in 0..=20000 {
                        let q = s.eval(i as f64 / 20000.0);
                        let e = ((q - first).hypot() - d).abs();
                        let ahead = s.tangent_at(i as f64 / 20000.0).unwrap().dot(first - q);
                        if ahead > 0.0 && e < best.0 {
                            best = (e, q);
                        }
                    }
                }
                best.1
            };
            let tips = caster(axis, d, tip0);
            let worst = tips
                .iter()
                .step_by(7)
                .map(|q| dist_to(&drawn, *q))
                .fold(0.0, f64::max);
            println!(
                "{} d = {d}: swivels {}, simulated tip deviation {worst:.2e} mm (library's own simulation {:.2e}), axis fit {:.2e}",
                shape.source.element, br.swivels, br.max_tip_deviation_mm, br.max_fit_deviation_mm
            );
            assert!(worst <= 0.01, "{} d = {d}: {worst}", shape.source.element);
            assert!(br.max_tip_deviation_mm <= 0.01);
            if shape.source.element == "square" {
                assert_eq!(br.swivels, 4);
                // On straight parts the tip is the axis minus d along the direction of travel.
                for s in axis {
                    if let Segment::Line(l) = s {
                        let dir = (l.p1 - l.p0).normalize();
                        for t in [0.0, 0.5, 1.0] {
                            assert!(dist_to(&drawn, l.eval(t) - d * dir) < 1e-9);
                        }
                    }
                }
            }
            if shape.source.element == "circle" {
                // The axis runs on the concentric circle of radius √(r² + d²) (Pythagoras).
                for s in axis.iter().filter(|s| matches!(s, Segment::Arc(a) if (a.center - Point::new(60.0, 20.0)).hypot() < 1e-9)) {
                    let Segment::Arc(a) = s else { unreachable!() };
                    assert!((a.radius - (25.0 + d * d).sqrt()).abs() < 1e-12);
                }
            }
        }
    }
}

#[test]
fn small_turns_below_threshold_get_no_swivel() {
    // A 20° turn, below the 30° threshold: joined by a straight axis move; the tip's excursion
    // there is measured by the simulation and reported.
    let a = 20f64.to_radians();
    let open = Contour::new(
        vec![
            Segment::Line(Line::new((0.0, 0.0), (20.0, 0.0))),
            Segment::Line(Line::new(
                (20.0, 0.0),
                (20.0 + 20.0 * a.cos(), 20.0 * a.sin()),
            )),
        ],
        false,
        src("bend"),
    );
    let p = run(
        vec![open.clone()],
        &PrepOptions {
            blade_offset_mm: 0.25,
            warnings: false,
            ..PrepOptions::default()
        },
        0.01,
    );
    let br = p.report.blade.as_ref().unwrap();
    assert_eq!(br.swivels, 0);
    let tips = caster(&p.outline.contours[0].segments, 0.25, Point::ORIGIN);
    let worst = tips
        .iter()
        .map(|q| dist_to(&open.segments, *q))
        .fold(0.0, f64::max);
    println!(
        "20° bend, d = 0.25: tip excursion {worst:.4} mm (library {:.4})",
        br.max_tip_deviation_mm
    );
    // The excursion is positive (the corner is cut short) and below d·(1 − cos 20°) ≈ 0.015,
    // what a tip swinging straight from one direction to the other could lose at most.
    assert!(worst > 0.0 && worst < 0.25 * (1.0 - a.cos()));
    assert!((br.max_tip_deviation_mm - worst).abs() < 1e-3);
}

#[test]
fn overcut_adds_the_requested_length() {
    // Circumference 2πr: a circle of radius 10 with a 1 mm overcut is 20π + 1 mm long and
    // ends at angle 1/r past its start (arc length s = r·θ).
    let p = run(
        vec![
            circle((0.0, 0.0), 10.0, "circle"),
            rect(30.0, 0.0, 30.5, 0.5, "tiny"),
        ],
        &PrepOptions {
            overcut_mm: 1.0,
            warnings: false,
            ..PrepOptions::default()
        },
        0.01,
    );
    let c = &p.outline.contours[0];
    assert!(!c.closed);
    assert!(
        (c.length() - (20.0 * PI + 1.0)).abs() < 1e-5,
        "{}",
        c.length()
    );
    let end = c.end().unwrap();
    let angle = end.to_vec2().atan2();
    assert!((angle - 0.1).abs() < 1e-7, "{angle}");
    let r = p.report.overcut.as_ref().unwrap();
    assert!((r.max_added_mm - 1.0).abs() < 1e-6);
    // The small square's perimeter, 2 mm, exceeds the 1 mm overcut: nothing is capped.
    assert_eq!(r.capped, 0);
    assert!((r.min_added_mm - 1.0).abs() < 1e-6);
    let t = &p.outline.contours[1];
    assert!((t.length() - 3.0).abs() < 1e-9);
}

#[test]
fn weed_border_and_lines_stay_in_the_waste() {
    let (_, cs, _) = letters().remove(0); // "o"
    let mut all = cs;
    all.push(rect(25.0, 2.0, 35.0, 18.0, "bar"));
    let p = run(
        all.clone(),
        &PrepOptions {
            weed_border_mm: 5.0,
            weed_lines: 4,
            warnings: false,
            ..PrepOptions::default()
        },
        0.01,
    );
    let w = p.report.weed.as_ref().unwrap();
    // The design spans x 2..35, y 2..18; 5 mm around it.
    assert_eq!(w.border, [-3.0, -3.0, 40.0, 23.0]);
    let border = p.outline.contours.last().unwrap();
    assert_eq!(border.source.element, "weed border");
    assert!(border.closed);
    let lines: Vec<&Contour> = p
        .outline
        .contours
        .iter()
        .filter(|c| c.source.element.starts_with("weed line"))
        .collect();
    assert_eq!(lines.len(), w.line_pieces);
    assert!(lines.len() >= 4);
    // No point of a weed line lies strictly inside a part (even-odd with dense sampling of
    // the exact contours, independent of the flattening used by the step).
    let inside = |q: Point| {
        all.iter()
            .filter(|c| c.source.element != "o hole")
            .any(|c| {
                let poly: Vec<Point> = samples(c, 400);
                let mut inside = false;
                for k in 0..poly.len() {
                    let (a, b) = (poly[k], poly[(k + 1) % poly.len()]);
                    if (a.y > q.y) != (b.y > q.y)
                        && a.x + (q.y - a.y) / (b.y - a.y) * (b.x - a.x) > q.x
                    {
                        inside = !inside;
                    }
                }
                inside && dist_to(&c.segments, q) > 2e-3
            })
    };
    for l in &lines {
        for q in samples(l, 200) {
            assert!(!inside(q), "{} enters a part at {q:?}", l.source);
        }
    }
}

#[test]
fn warnings_name_narrow_features_and_open_contours() {
    let p = run(
        vec![
            rect(0.0, 0.0, 30.0, 0.3, "hairline"),
            rect(0.0, 10.0, 30.0, 20.0, "block"),
            Contour::new(
                vec![Segment::Line(Line::new((0.0, 30.0), (10.0, 30.0)))],
                false,
                src("slit"),
            ),
        ],
        &PrepOptions {
            blade_offset_mm: 0.25,
            ..PrepOptions::default()
        },
        0.01,
    );
    let w = &p.report.warnings;
    println!("{w:#?}");
    assert!(w
        .iter()
        .any(|w| w.source.element == "hairline" && w.message.contains("stroke 0.300")));
    assert!(!w.iter().any(|w| w.source.element == "block"));
    assert!(w
        .iter()
        .any(|w| w.source.element == "slit" && w.message.contains("open")));
    assert_eq!(p.outline.warnings.len(), w.len());
}

#[test]
fn bad_options_are_errors_and_report_serialises() {
    let bad = PrepOptions {
        kerf_mm: -1.0,
        ..PrepOptions::default()
    };
    let e = prepare(outline(vec![]), &bad, tol(0.01)).unwrap_err();
    assert_eq!(e.place.as_deref(), Some("kerf"));
    let nan = PrepOptions {
        overcut_mm: f64::NAN,
        ..PrepOptions::default()
    };
    assert!(prepare(outline(vec![]), &nan, tol(0.01)).is_err());
    let p = run(
        vec![circle((10.0, 10.0), 5.0, "c")],
        &PrepOptions {
            kerf_mm: 0.2,
            kerf_side: KerfSide::Outside,
            overcut_mm: 0.5,
            order: Order::ShortTravel,
            direction: Direction::Ccw,
            ..PrepOptions::default()
        },
        0.01,
    );
    let v = serde_json::to_value(&p.report).unwrap();
    for key in [
        "steps",
        "travel_before_mm",
        "travel_after_mm",
        "kerf",
        "order",
        "overcut",
        "warnings",
        "removed",
    ] {
        assert!(v.get(key).is_some(), "{key}");
    }
    assert_eq!(
        v["steps"],
        serde_json::json!(["warnings", "kerf", "direction", "order", "overcut"])
    );
}
