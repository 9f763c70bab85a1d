//! Integration tests of `ratline::verify` and the verification page (`write::html`).
//!
//! Outside sources: the point-to-circle distance |‖p − c‖ − r| and the sagitta of an inscribed
//! regular n-gon r(1 − cos(π/n)) (standard geometry, shared REFERENCES §3 and §5); the
//! Hausdorff distance between a convex body and its translate by v is |v| (support functions:
//! h_{K+v}(u) = h_K(u) + ⟨u, v⟩ and d_H(K, L) = max_{|u|=1} |h_K(u) − h_L(u)|; Schneider,
//! *Convex Bodies: The Brunn–Minkowski Theory*, §1.8, from memory for the section); the geo
//! crate's `HausdorffDistance` as a reference implementation; the report field names of
//! /work/shared/DESIGN.md; usvg for reading the overlay SVG back.

mod common;

use std::f64::consts::{PI, TAU};
use std::path::Path;
use std::time::Instant;

use common::Rng;
use geo::HausdorffDistance;
use kurbo::{CubicBez, Line, ParamCurve, ParamCurveNearest, PathSeg, Point, QuadBez, Vec2};
use ratline::fit::{fit, Target};
use ratline::geom::{CircularArc, Conic, Contour, Outline, Segment, Source, Tolerance};
use ratline::read::svg::{read_svg, SvgOptions};
use ratline::verify::{terminal_summary, verify, Align, VerifyOptions, VerifyReport, SLACK};
use ratline::write::html::{overlay_svg, verify_html, Strokes};

fn opts(tol: f64, align: Align) -> VerifyOptions {
    VerifyOptions {
        tolerance: Tolerance::new(tol).unwrap(),
        align,
    }
}

fn outline(contours: Vec<Contour>) -> Outline {
    Outline {
        contours,
        ..Outline::default()
    }
}

fn src(file: &str, name: &str) -> Source {
    Source::new(file, name, 0)
}

/// A full circle as one circular arc (as a G-code G2/G3 full turn reads back).
fn circle_arc(c: Point, r: f64, source: Source) -> Contour {
    let arc = CircularArc {
        center: c,
        radius: r,
        start_angle: 0.0,
        sweep: TAU,
    };
    Contour::new(vec![Segment::Arc(arc)], true, source)
}

/// A full circle as four exact conics (as an SVG circle reads).
fn circle_conics(c: Point, r: f64, source: Source) -> Contour {
    let arc = CircularArc {
        center: c,
        radius: r,
        start_angle: 0.3,
        sweep: -TAU,
    };
    let segs = arc.to_conics().into_iter().map(Segment::Conic).collect();
    Contour::new(segs, true, source)
}

fn polygon(points: &[Point], source: Source) -> Contour {
    let n = points.len();
    let segs = (0..n)
        .map(|i| Segment::Line(Line::new(points[i], points[(i + 1) % n])))
        .collect();
    Contour::new(segs, true, source)
}

/// The regular n-gon inscribed in the circle (c, r).
fn ngon(c: Point, r: f64, n: usize, phase: f64, source: Source) -> Contour {
    let pts: Vec<Point> = (0..n)
        .map(|i| c + r * Vec2::from_angle(phase + TAU * i as f64 / n as f64))
        .collect();
    polygon(&pts, source)
}

/// A convex rounded rectangle of lines and quarter arcs (G-code-like), corner radius `rad`.
fn rounded_rect(x0: f64, y0: f64, w: f64, h: f64, rad: f64, source: Source) -> Contour {
    let (x1, y1) = (x0 + w, y0 + h);
    let arc = |cx: f64, cy: f64, a0: f64| {
        Segment::Arc(CircularArc {
            center: Point::new(cx, cy),
            radius: rad,
            start_angle: a0,
            sweep: PI / 2.0,
        })
    };
    let line = |a: (f64, f64), b: (f64, f64)| Segment::Line(Line::new(a, b));
    let segs = vec![
        line((x0 + rad, y0), (x1 - rad, y0)),
        arc(x1 - rad, y0 + rad, -PI / 2.0),
        line((x1, y0 + rad), (x1, y1 - rad)),
        arc(x1 - rad, y1 - rad, 0.0),
        line((x1 - rad, y1), (x0 + rad, y1)),
        arc(x0 + rad, y1 - rad, PI / 2.0),
        line((x0, y1 - rad), (x0, y0 + rad)),
        arc(x0 + rad, y0 + rad, PI),
    ];
    Contour::new(segs, true, source)
}

fn moved(c: &Contour, v: Vec2, source: Source) -> Contour {
    let mut m = c.transformed(kurbo::Affine::translate(v));
    m.source = source;
    m
}

fn shuffle<T>(rng: &mut Rng, v: &mut [T]) {
    for i in (1..v.len()).rev() {
        let j = (rng.next_u64() % (i as u64 + 1)) as usize;
        v.swap(i, j);
    }
}

// ---------------------------------------------------------------------------------------------
// Analytic cases

#[test]
fn concentric_circles_differ_by_the_radius_difference() {
    // A point's distance to a circle is |‖p − c‖ − r| (REFERENCES §5), so two concentric
    // circles are exactly |r1 − r2| apart, whichever way either is represented.
    let c = Point::new(30.0, -12.0);
    let tol = 0.01;
    let reference = outline(vec![circle_conics(c, 10.0, src("ref", "circle"))]);
    for dr in [0.0, 1e-4, 0.003, 0.00999, 0.0101, -0.02, 0.5, -3.0] {
        let cand = outline(vec![circle_arc(c, 10.0 + dr, src("cand", "circle"))]);
        let r = verify(&reference, &cand, &opts(tol, Align::None));
        assert_eq!(r.pairs.len(), 1, "dr = {dr}");
        let p = &r.pairs[0];
        let expected = dr.abs();
        assert!(
            p.hausdorff_mm >= expected - 1e-12 && p.hausdorff_mm <= expected + SLACK * tol,
            "dr = {dr}: bound {} vs exact {expected}",
            p.hausdorff_mm
        );
        assert!(p.sampled_mm <= expected + 1e-12 && p.sampled_mm >= expected - SLACK * tol);
        let at = Point::new(p.at[0], p.at[1]);
        // The worst point lies on one of the two circles.
        let dist_c = (at - c).hypot();
        assert!(
            (dist_c - 10.0).abs() < 1e-9 || (dist_c - 10.0 - dr).abs() < 1e-9,
            "worst point {at:?} at {dist_c} from the centre"
        );
        assert_eq!(r.within_tolerance, expected <= tol, "dr = {dr}");
        assert_eq!(r.hausdorff_mm, p.hausdorff_mm);
        eprintln!(
            "concentric dr = {dr:>8}: certified {:.9} mm",
            p.hausdorff_mm
        );
    }
}

#[test]
fn inscribed_regular_polygons() {
    // The inscribed regular n-gon is r(1 − cos(π/n)) from its circle at the middle of each
    // side, and no farther anywhere (standard geometry, REFERENCES §3, the chord sagitta).
    let c = Point::new(5.0, 5.0);
    let r = 10.0;
    let tol = 0.01;
    let reference = outline(vec![circle_conics(c, r, src("ref", "circle"))]);
    for n in [5, 6, 12, 50, 71, 200, 1000] {
        let cand = outline(vec![ngon(c, r, n, 0.1, src("cand", "ngon"))]);
        let rep = verify(&reference, &cand, &opts(tol, Align::None));
        assert_eq!(rep.pairs.len(), 1, "n = {n}");
        let exact = r * (1.0 - (PI / n as f64).cos());
        let got = rep.hausdorff_mm;
        assert!(
            got >= exact - 1e-12 && got <= exact + SLACK * tol,
            "n = {n}: {got} vs {exact}"
        );
        // 71 chords is the fewest with vertices on the circle for 0.01 mm at r = 10
        // (REFERENCES §3 table): 70 must fail, 71 pass.
        assert_eq!(rep.within_tolerance, exact <= tol, "n = {n}");
        eprintln!("{n:>5}-gon: certified {got:.9} mm, exact {exact:.9} mm");
    }
    let seventy = verify(
        &reference,
        &outline(vec![ngon(c, r, 70, 0.0, src("cand", "70"))]),
        &opts(tol, Align::None),
    );
    assert!(!seventy.within_tolerance);
}

#[test]
fn shifted_shape_and_bbox_alignment() {
    // Convex body and its translate by v: d_H = |v| (support functions, see the file doc).
    let shape = rounded_rect(2.0, 3.0, 40.0, 25.0, 6.0, src("ref", "plate"));
    let reference = outline(vec![shape.clone()]);
    for v in [
        Vec2::new(0.3, -0.4),
        Vec2::new(-2.0, 1.5),
        Vec2::new(0.004, 0.0),
    ] {
        let cand = outline(vec![moved(&shape, v, src("cand", "plate"))]);
        let none = verify(&reference, &cand, &opts(0.01, Align::None));
        assert_eq!(none.pairs.len(), 1);
        assert!(
            (none.hausdorff_mm - v.hypot()).abs() <= ratline::verify::SLACK * 0.01,
            "{v:?}: {} vs {}",
            none.hausdorff_mm,
            v.hypot()
        );
        assert_eq!(none.moved_mm, [0.0, 0.0]);
        assert_eq!(none.within_tolerance, v.hypot() <= 0.01);

        let bbox = verify(&reference, &cand, &opts(0.01, Align::BBox));
        // moved_mm is what was applied to the candidate: minus the shift.
        assert!((bbox.moved_mm[0] + v.x).abs() < 1e-9 && (bbox.moved_mm[1] + v.y).abs() < 1e-9);
        // Zero up to rounding, certified within the measuring slack.
        assert!(bbox.pairs[0].sampled_mm <= 1e-9, "{:?}", bbox.pairs[0]);
        assert!(
            bbox.hausdorff_mm <= SLACK * 0.01 + 1e-9,
            "{}",
            bbox.hausdorff_mm
        );
        assert!(bbox.within_tolerance);
        eprintln!(
            "shift {v:?}: none {:.9} mm, bbox {:.3e} mm, moved {:?}",
            none.hausdorff_mm, bbox.hausdorff_mm, bbox.moved_mm
        );
    }
}

// ---------------------------------------------------------------------------------------------
// geo as a reference implementation

/// A random closed, star-shaped contour around `c`: its vertices and, per side, a kind and
/// four shape parameters in [−1, 1].
fn random_loop(rng: &mut Rng, c: Point) -> (Vec<Point>, Vec<(u8, [f64; 4])>) {
    let k = 3 + (rng.next_u64() % 5) as usize;
    let pts: Vec<Point> = (0..k)
        .map(|i| {
            let a = TAU * (i as f64 + rng.range(0.1, 0.9)) / k as f64;
            c + rng.range(3.0, 7.0) * Vec2::from_angle(a)
        })
        .collect();
    let sides = (0..k)
        .map(|_| {
            let kind = (rng.next_u64() % 5) as u8;
            (kind, [0; 4].map(|_| rng.range(-1.0, 1.0)))
        })
        .collect();
    (pts, sides)
}

/// Build the contour: lines, quadratics, cubics, conics (w from 0.3 to 2, so elliptic and
/// hyperbolic) and circular arcs (sweeps of 0.3 to 2 rad either way).
fn loop_from(pts: &[Point], sides: &[(u8, [f64; 4])], source: Source) -> Contour {
    let k = pts.len();
    let segs = (0..k)
        .map(|i| {
            let (a, b) = (pts[i], pts[(i + 1) % k]);
            let (kind, q) = sides[i];
            let d = b - a;
            let n = Vec2::new(-d.y, d.x).normalize();
            let off = |x: f64| 0.3 * x * d.hypot() * n;
            match kind {
                0 => Segment::Line(Line::new(a, b)),
                1 => Segment::Quad(QuadBez::new(a, a.midpoint(b) + off(q[0]), b)),
                2 => Segment::Cubic(CubicBez::new(
                    a,
                    a + d / 3.0 + off(q[0]),
                    a + 2.0 * d / 3.0 + off(q[1]),
                    b,
                )),
                3 => Segment::Conic(
                    Conic::new(a, a.midpoint(b) + off(q[0]), 1.15 + 0.85 * q[1], b).unwrap(),
                ),
                _ => {
                    let sweep = q[0].signum() * (0.3 + 1.7 * q[1].abs());
                    let r = 0.5 * d.hypot() / (0.5 * sweep).sin().abs();
                    let h = (r * r - 0.25 * d.hypot2()).max(0.0).sqrt();
                    let centre = a.midpoint(b) + sweep.signum() * h * n;
                    let arc = CircularArc {
                        center: centre,
                        radius: r,
                        start_angle: (a - centre).atan2(),
                        sweep,
                    };
                    assert!((arc.eval(1.0) - b).hypot() < 1e-9, "arc construction");
                    Segment::Arc(arc)
                }
            }
        })
        .collect();
    Contour::new(segs, true, source)
}

/// Points on the segments every `step` of their speed bound or closer, and the largest
/// distance from a point of the curve to the nearest sample (half a step's travel).
fn flatten(c: &Contour, step: f64) -> (geo::LineString<f64>, f64) {
    let mut pts = Vec::new();
    let mut err: f64 = 0.0;
    for s in &c.segments {
        let n = (s.speed_bound() / step).ceil().max(1.0) as usize;
        err = err.max(0.5 * s.speed_bound() / n as f64);
        for i in 0..=n {
            let p = s.eval(i as f64 / n as f64);
            pts.push((p.x, p.y));
        }
    }
    (geo::LineString::from(pts), err)
}

#[test]
fn agrees_with_geo_on_random_cases() {
    // geo's Hausdorff distance is the exact one between two finite point sets; on dense
    // samples X ⊂ A and Y ⊂ B, |d_H(X, Y) − d_H(A, B)| ≤ d_H(X, A) + d_H(Y, B) (the triangle
    // inequality of the Hausdorff metric), and d_H(X, A) is at most half a sample step of
    // travel. ratline's bound must lie within that plus its own slack of geo's value.
    let mut rng = Rng::new(2024);
    let tol = 0.05;
    let mut cases = 0;
    let mut worst_ratio: f64 = 0.0;
    let mut checked_far = 0;
    for case in 0..120 {
        let m = 1 + case % 3;
        let mut refs = Vec::new();
        let mut cands = Vec::new();
        for i in 0..m {
            let c = Point::new(30.0 * i as f64, 10.0 * (case % 4) as f64);
            let (pts, sides) = random_loop(&mut rng, c);
            let r = loop_from(&pts, &sides, src("ref", &format!("loop{i}")));
            // The candidate: the same structure with every vertex and parameter jittered.
            let amount = if rng.bool() { 0.01 } else { 0.1 };
            let jittered: Vec<Point> = pts
                .iter()
                .map(|p| *p + Vec2::new(rng.range(-amount, amount), rng.range(-amount, amount)))
                .collect();
            // Jitter that keeps every sign, so no arc or bulge flips to the other side.
            let jsides: Vec<(u8, [f64; 4])> = sides
                .iter()
                .map(|(k, q)| {
                    let j = q.map(|x| {
                        let y = (x + rng.range(-amount, amount)).clamp(-1.0, 1.0);
                        if y.signum() == x.signum() {
                            y
                        } else {
                            x
                        }
                    });
                    (*k, j)
                })
                .collect();
            let mut cand = loop_from(&jittered, &jsides, src("cand", &format!("loop{i}")));
            if rng.bool() {
                cand = cand.reversed();
            }
            refs.push(r);
            cands.push(cand);
        }
        shuffle(&mut rng, &mut cands);
        let reference = outline(refs);
        let candidate = outline(cands);
        let rep = verify(&reference, &candidate, &opts(tol, Align::None));
        assert!(
            rep.missing.is_empty() && rep.extra.is_empty(),
            "case {case}: {}",
            terminal_summary(&rep, false)
        );
        for p in &rep.pairs {
            assert_eq!(
                p.reference.element, p.candidate.element,
                "case {case}: wrong match"
            );
            let (x, ex) = flatten(&reference.contours[p.reference_index], 0.05);
            let (y, ey) = flatten(&candidate.contours[p.candidate_index], 0.05);
            let g = x.hausdorff_distance(&y);
            let allowed = ex + ey + SLACK * tol + 1e-9;
            let diff = (p.hausdorff_mm - g).abs();
            assert!(
                diff <= allowed,
                "case {case} {}: ratline {} vs geo {g} (allowed {allowed})",
                p.reference.element,
                p.hausdorff_mm
            );
            // The certified bound is never below what geo saw, less the sampling error.
            assert!(p.hausdorff_mm >= g - ex - ey - 1e-12);
            worst_ratio = worst_ratio.max(diff / (ex + ey));
            if g > tol {
                checked_far += 1;
            }
            cases += 1;
        }
    }
    eprintln!(
        "geo: {cases} pairs, |ratline − geo| at most {worst_ratio:.3} of the sampling error, {checked_far} over the tolerance"
    );
    assert!(cases >= 200, "{cases}");
    assert!(checked_far > 20 && checked_far < cases - 20);
}

// ---------------------------------------------------------------------------------------------
// Round trip through fit

fn load_svg(name: &str) -> Outline {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/svg")
        .join(name);
    let data = std::fs::read(&path).unwrap();
    read_svg(name, &data, &SvgOptions::default()).unwrap()
}

#[test]
fn fitted_outlines_verify_within_tolerance() {
    // fit certifies each piece; the Hausdorff distance of a union is at most the largest over
    // its parts (from the definition of d_H), so verify must find every contour within the
    // tolerance, and no higher than fit's own certified bound.
    let tol = 0.01;
    let mut rng = Rng::new(7);
    for name in [
        "circle_ellipse.svg",
        "rect_rounded.svg",
        "path_curves.svg",
        "rotated_arcs.svg",
        "arcs_spec.svg",
    ] {
        let source = load_svg(name);
        assert!(!source.contours.is_empty(), "{name}");
        for target in [
            Target::Lines,
            Target::Quadratic,
            Target::Cubic,
            Target::Arcs,
        ] {
            let fitted: Vec<_> = source
                .contours
                .iter()
                .map(|c| fit(c, target, Tolerance::new(tol).unwrap()))
                .collect();
            let mut contours: Vec<Contour> = fitted.iter().map(|f| f.contour.clone()).collect();
            shuffle(&mut rng, &mut contours);
            let rep = verify(&source, &outline(contours), &opts(tol, Align::None));
            assert!(
                rep.missing.is_empty() && rep.extra.is_empty(),
                "{name} {target:?}"
            );
            assert_eq!(rep.pairs.len(), source.contours.len());
            for p in &rep.pairs {
                assert_eq!(p.reference, p.candidate, "{name} {target:?}: wrong match");
                let fit_bound = fitted[p.reference_index].deviation.bound;
                assert!(
                    p.hausdorff_mm <= fit_bound + SLACK * tol + 1e-12,
                    "{name} {target:?} {}: verify {} above fit's {fit_bound}",
                    p.reference,
                    p.hausdorff_mm
                );
            }
            assert!(
                rep.within_tolerance,
                "{name} {target:?}: {}",
                rep.hausdorff_mm
            );
            eprintln!(
                "{name:<20} {:<9}: {} pairs, worst {:.6} mm",
                target.name(),
                rep.pairs.len(),
                rep.hausdorff_mm
            );
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Matching

/// Six shapes, two of them (a circle and the square around it) with the same bounding box,
/// so only their shape tells them apart.
fn six(file: &str) -> Vec<Contour> {
    let c = Point::new(20.0, 20.0);
    vec![
        circle_conics(c, 5.0, src(file, "circle")),
        polygon(
            &[
                Point::new(15.0, 15.0),
                Point::new(25.0, 15.0),
                Point::new(25.0, 25.0),
                Point::new(15.0, 25.0),
            ],
            src(file, "square"),
        ),
        circle_conics(Point::new(60.0, 20.0), 8.0, src(file, "big")),
        circle_conics(Point::new(60.0, 20.0), 2.0, src(file, "hole")),
        rounded_rect(0.0, 40.0, 30.0, 10.0, 3.0, src(file, "bar")),
        ngon(Point::new(60.0, 50.0), 6.0, 6, 0.0, src(file, "hex")),
    ]
}

/// Represent the same shapes differently: circles as arcs, reversed, shuffled.
fn as_candidate(rng: &mut Rng, shapes: Vec<Contour>) -> Vec<Contour> {
    let mut v: Vec<Contour> = shapes
        .into_iter()
        .map(|c| {
            let c = if c.segments.len() == 4 && matches!(c.segments[0], Segment::Conic(_)) {
                let b = c.bounding_box().unwrap();
                circle_arc(b.center(), 0.5 * b.width(), c.source.clone())
            } else {
                c
            };
            if rng.bool() {
                c.reversed()
            } else {
                c
            }
        })
        .collect();
    shuffle(rng, &mut v);
    v
}

fn names(s: &[Source]) -> Vec<&str> {
    s.iter().map(|s| s.element.as_str()).collect()
}

fn all_matched_by_name(rep: &VerifyReport) {
    for p in &rep.pairs {
        assert_eq!(p.reference.element, p.candidate.element, "{rep:?}");
    }
}

#[test]
fn matching_ignores_order_and_direction() {
    let mut rng = Rng::new(11);
    for _ in 0..10 {
        let reference = outline(six("ref"));
        let candidate = outline(as_candidate(&mut rng, six("cand")));
        let rep = verify(&reference, &candidate, &opts(0.01, Align::None));
        assert_eq!(rep.pairs.len(), 6);
        all_matched_by_name(&rep);
        assert!(rep.missing.is_empty() && rep.extra.is_empty());
        assert!(rep.within_tolerance, "{}", rep.hausdorff_mm);
    }
}

#[test]
fn missing_and_extra_are_reported() {
    let mut rng = Rng::new(5);
    let reference = outline(six("ref"));

    // Drop the square (the circle with the same box must not be mistaken for it).
    let mut cand = as_candidate(&mut rng, six("cand"));
    cand.retain(|c| c.source.element != "square");
    let rep = verify(&reference, &outline(cand.clone()), &opts(0.01, Align::None));
    assert_eq!(names(&rep.missing), ["square"]);
    assert!(rep.extra.is_empty());
    assert_eq!(rep.pairs.len(), 5);
    all_matched_by_name(&rep);
    assert!(
        !rep.within_tolerance,
        "a missing contour fails verification"
    );
    assert!(rep.hausdorff_mm <= 0.01, "the pairs themselves fit");

    // Drop the hole of the ring: the big circle keeps its own partner.
    let mut cand2 = as_candidate(&mut rng, six("cand"));
    cand2.retain(|c| c.source.element != "hole");
    let rep = verify(&reference, &outline(cand2), &opts(0.01, Align::None));
    assert_eq!(names(&rep.missing), ["hole"]);
    all_matched_by_name(&rep);

    // An extra triangle far away, and a small extra circle inside the big one.
    let mut cand3 = as_candidate(&mut rng, six("cand"));
    cand3.push(polygon(
        &[
            Point::new(100.0, 0.0),
            Point::new(110.0, 0.0),
            Point::new(105.0, 8.0),
        ],
        src("cand", "triangle"),
    ));
    cand3.insert(
        2,
        circle_arc(Point::new(62.0, 21.0), 3.0, src("cand", "stray")),
    );
    let rep = verify(&reference, &outline(cand3), &opts(0.01, Align::None));
    let mut extra = names(&rep.extra);
    extra.sort();
    assert_eq!(extra, ["stray", "triangle"]);
    assert!(rep.missing.is_empty());
    assert_eq!(rep.pairs.len(), 6);
    all_matched_by_name(&rep);
    assert!(!rep.within_tolerance, "an extra contour fails verification");

    // Both at once, plus an empty candidate.
    cand.push(polygon(
        &[
            Point::new(-50.0, 0.0),
            Point::new(-40.0, 0.0),
            Point::new(-45.0, 8.0),
        ],
        src("cand", "triangle"),
    ));
    let rep = verify(&reference, &outline(cand), &opts(0.01, Align::None));
    assert_eq!(names(&rep.missing), ["square"]);
    assert_eq!(names(&rep.extra), ["triangle"]);
    assert!(!rep.within_tolerance);
    let empty = verify(&reference, &Outline::default(), &opts(0.01, Align::BBox));
    assert_eq!(empty.missing.len(), 6);
    assert_eq!(empty.moved_mm, [0.0, 0.0]);
    assert!(!empty.within_tolerance);
    let both_empty = verify(
        &Outline::default(),
        &Outline::default(),
        &opts(0.01, Align::None),
    );
    assert!(both_empty.within_tolerance && both_empty.pairs.is_empty());
}

#[test]
fn a_badly_fitted_contour_is_over_tolerance_not_missing() {
    // 0.3 mm off at tolerance 0.01 mm (30 tolerances): still the same letter, badly cut.
    let reference = outline(six("ref"));
    let mut cand = six("cand");
    cand[5] = ngon(Point::new(60.3, 50.0), 6.0, 6, 0.0, src("cand", "hex"));
    let rep = verify(&reference, &outline(cand), &opts(0.01, Align::None));
    assert!(rep.missing.is_empty() && rep.extra.is_empty());
    let hex = rep
        .pairs
        .iter()
        .find(|p| p.reference.element == "hex")
        .unwrap();
    assert!(
        (hex.hausdorff_mm - 0.3).abs() <= ratline::verify::SLACK * 0.01,
        "{}",
        hex.hausdorff_mm
    );
    assert!(!hex.within_tolerance && !rep.within_tolerance);
    assert_eq!(rep.pairs_over(), 1);

    let text = terminal_summary(&rep, false);
    assert!(
        text.contains("FAIL") && text.contains("1 pair(s) over tolerance"),
        "{text}"
    );
    assert!(text.contains("cand: hex, contour 0"), "{text}");
    assert!(!text.contains('\x1b'));
    // The bad verdict is in the shared warning style (bold yellow, `write::summary::Paint`).
    assert!(terminal_summary(&rep, true).contains("\x1b[1;33m"));
    eprintln!("{text}");
}

#[test]
fn report_json_has_the_documented_fields() {
    // Field names from /work/shared/DESIGN.md, "Report JSON".
    let mut rng = Rng::new(3);
    let mut cand = as_candidate(&mut rng, six("cand"));
    // Drop the hole inside the big circle: the bounding box, and so the alignment, stays.
    cand.retain(|c| c.source.element != "hole");
    let rep = verify(
        &outline(six("ref")),
        &outline(cand),
        &opts(0.01, Align::BBox),
    );
    let v = serde_json::to_value(&rep).unwrap();
    for key in [
        "tolerance_mm",
        "hausdorff_mm",
        "within_tolerance",
        "pairs",
        "missing",
        "extra",
        "moved_mm",
        "align",
    ] {
        assert!(v.get(key).is_some(), "{key}");
    }
    for key in ["reference", "candidate", "hausdorff_mm", "at"] {
        assert!(v["pairs"][0].get(key).is_some(), "pairs[0].{key}");
    }
    assert_eq!(v["align"], "bbox");
    assert_eq!(v["missing"].as_array().unwrap().len(), 1);
    assert!(v["missing"][0]["element"].is_string());
    assert_eq!(v["pairs"][0]["at"].as_array().unwrap().len(), 2);
}

// ---------------------------------------------------------------------------------------------
// HTML

fn page_case() -> (Outline, Outline, VerifyReport) {
    let reference = outline(six("ref"));
    let mut cand = six("cand");
    cand[5] = ngon(
        Point::new(60.004, 50.0),
        6.0,
        6,
        0.0,
        src("cand", "hex <&>"),
    );
    cand.remove(1);
    cand.push(polygon(
        &[
            Point::new(100.0, 0.0),
            Point::new(110.0, 0.0),
            Point::new(105.0, 8.0),
        ],
        src("cand", "triangle"),
    ));
    let rep = verify(&reference, &outline(cand.clone()), &opts(0.01, Align::None));
    (reference, outline(cand), rep)
}

#[test]
fn html_page_is_self_contained() {
    let (reference, candidate, rep) = page_case();
    let html = verify_html(&reference, &candidate, &rep);
    assert!(html.starts_with("<!DOCTYPE html>"));
    assert!(html.contains("<svg") && html.contains("</svg>"));
    assert!(html.contains("<table") && html.contains("<th"));
    assert_eq!(
        html.matches("<tr class=").count(),
        rep.pairs.len() + rep.missing.len() + rep.extra.len()
    );
    assert!(html.contains("class=\"missing\"") && html.contains("class=\"extra\""));
    assert_eq!(html.matches("class=\"mk\"").count(), rep.pairs.len());
    let lower = html.to_ascii_lowercase();
    let stripped = lower.replace("xmlns=\"http://www.w3.org/2000/svg\"", "");
    assert!(!stripped.contains("http://") && !stripped.contains("https://"));
    assert!(!lower.contains("<script src") && !lower.contains("<link"));
    assert!(!lower.contains("url(") && !lower.contains("@import"));
    assert!(html.contains("hex &lt;&amp;&gt;") && !html.contains("hex <&>"));
}

fn usvg_affine(t: usvg::Transform) -> kurbo::Affine {
    kurbo::Affine::new([t.sx, t.ky, t.kx, t.sy, t.tx, t.ty].map(f64::from))
}

/// usvg's path segments of an SVG document, in its user units (here mm).
fn usvg_segments(svg: &str) -> Vec<PathSeg> {
    let tree = usvg::Tree::from_str(svg, &usvg::Options::default()).expect("usvg reads it");
    // usvg maps the viewBox (mm) onto width × height in px; undo that map to get back to mm.
    let vb: Vec<f64> = svg
        .split("viewBox=\"")
        .nth(1)
        .and_then(|r| r.split('"').next())
        .expect("a viewBox")
        .split(' ')
        .map(|v| v.parse().unwrap())
        .collect();
    let px_per_mm = tree.size().width() as f64 / vb[2];
    let root = kurbo::Affine::translate((vb[0], vb[1])) * kurbo::Affine::scale(1.0 / px_per_mm);
    let mut out = Vec::new();
    let mut stack = vec![tree.root().clone()];
    while let Some(g) = stack.pop() {
        for node in g.children() {
            match node {
                usvg::Node::Group(g) => stack.push((**g).clone()),
                usvg::Node::Path(p) => {
                    let t = p.abs_transform();
                    let a = root * usvg_affine(t);
                    let mut start = Point::ZERO;
                    let mut cur = Point::ZERO;
                    let f = |p: usvg::tiny_skia_path::Point| a * Point::new(p.x as f64, p.y as f64);
                    for s in p.data().segments() {
                        use usvg::tiny_skia_path::PathSegment as S;
                        match s {
                            S::MoveTo(p) => {
                                start = f(p);
                                cur = start;
                            }
                            S::LineTo(p) => {
                                out.push(PathSeg::Line(Line::new(cur, f(p))));
                                cur = f(p);
                            }
                            S::QuadTo(p1, p) => {
                                out.push(PathSeg::Quad(QuadBez::new(cur, f(p1), f(p))));
                                cur = f(p);
                            }
                            S::CubicTo(p1, p2, p) => {
                                out.push(PathSeg::Cubic(CubicBez::new(cur, f(p1), f(p2), f(p))));
                                cur = f(p);
                            }
                            S::Close => {
                                out.push(PathSeg::Line(Line::new(cur, start)));
                                cur = start;
                            }
                        }
                    }
                }
                _ => {}
            }
        }
    }
    out
}

#[test]
fn overlay_svg_reads_back_with_usvg() {
    // usvg (a general-purpose SVG library) reads the overlay; every contour drawn must lie
    // on usvg's paths within usvg's own arc-to-cubic tolerance (0.1 user units = 0.1 mm here,
    // see usvg parser/shapes.rs) plus 1e-3 mm for its f32 coordinates and our 5 decimals.
    let (reference, candidate, rep) = page_case();
    let svg = overlay_svg(
        &reference,
        &candidate,
        &rep,
        Strokes::Raster { px_per_mm: 4.0 },
    );
    let segs = usvg_segments(&svg);
    assert!(!segs.is_empty());
    let shift = Vec2::new(rep.moved_mm[0], rep.moved_mm[1]);
    let mut worst: f64 = 0.0;
    for (c, v) in reference
        .contours
        .iter()
        .map(|c| (c, Vec2::ZERO))
        .chain(candidate.contours.iter().map(|c| (c, shift)))
    {
        for s in &c.segments {
            for i in 0..=32 {
                let p = s.eval(i as f64 / 32.0) + v;
                let d = segs
                    .iter()
                    .map(|t| t.nearest(p, 1e-9).distance_sq.sqrt())
                    .fold(f64::INFINITY, f64::min);
                worst = worst.max(d);
            }
        }
    }
    eprintln!("overlay vs usvg: worst {worst:.2e} mm");
    if worst > 0.1 {
        eprintln!("{svg}");
        for s in &segs {
            eprintln!("{s:?}");
        }
    }
    assert!(worst <= 0.1 + 1e-3, "{worst}");
}

// ---------------------------------------------------------------------------------------------
// Speed

#[test]
fn two_thousand_contours() {
    let mut rng = Rng::new(99);
    let mut refs = Vec::new();
    let mut cands = Vec::new();
    let mut expected = Vec::new();
    for i in 0..2000 {
        let c = Point::new(15.0 * (i % 50) as f64, 15.0 * (i / 50) as f64);
        let name = format!("c{i}");
        // Expected distances: a 96-gon in a 5 mm circle is 5(1 − cos(π/96)) away
        // (REFERENCES §3 sagitta); a convex shape and its translate by v are |v| apart (file
        // doc); a pentagon against itself reversed is 0 apart.
        let exact = match i % 3 {
            0 => {
                refs.push(circle_conics(c, 5.0, src("ref", &name)));
                cands.push(ngon(c, 5.0, 96, 0.0, src("cand", &name)));
                5.0 * (1.0 - (PI / 96.0).cos())
            }
            1 => {
                let r = rounded_rect(c.x - 5.0, c.y - 3.0, 10.0, 6.0, 1.5, src("ref", &name));
                let jitter = Vec2::new(rng.range(-0.003, 0.003), rng.range(-0.003, 0.003));
                cands.push(moved(&r, jitter, src("cand", &name)));
                refs.push(r);
                jitter.hypot()
            }
            _ => {
                refs.push(ngon(c, 4.0, 5, 0.2, src("ref", &name)));
                cands.push(ngon(c, 4.0, 5, 0.2, src("cand", &name)).reversed());
                0.0
            }
        };
        expected.push(exact);
    }
    shuffle(&mut rng, &mut cands);
    let reference = outline(refs);
    let candidate = outline(cands);
    let t = Instant::now();
    let rep = verify(&reference, &candidate, &opts(0.01, Align::None));
    let elapsed = t.elapsed();
    assert_eq!(rep.pairs.len(), 2000);
    all_matched_by_name(&rep);
    for p in &rep.pairs {
        let exact = expected[p.reference_index];
        assert!(
            p.hausdorff_mm >= exact - 1e-9 && p.hausdorff_mm <= exact + SLACK * 0.01 + 1e-9,
            "{}: {} vs {exact}",
            p.reference,
            p.hausdorff_mm
        );
    }
    assert!(rep.within_tolerance);
    let t = Instant::now();
    let html = verify_html(&reference, &candidate, &rep);
    eprintln!(
        "2000 contours: verify {:.2} s, html {:.2} s ({} kB)",
        elapsed.as_secs_f64(),
        t.elapsed().as_secs_f64(),
        html.len() / 1024
    );
}
