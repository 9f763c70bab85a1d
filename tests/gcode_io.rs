//! G-code written by ratline, checked by an independent parser (NISTIR 6556 §3.5.3 radius rule)
//! and read back by ratline's reader.

mod common;

use common::{hausdorff, random_contour, Rng, Shape};
use kurbo::{Line, Point};
use ratline::geom::{Contour, Segment, Source};
use ratline::read::gcode::read_gcode;
use ratline::write::gcode::{gcode_as_read, gcode_program, GcodeOptions};

/// What the independent parser found in a program.
struct Checked {
    arcs: usize,
    worst_radius_mismatch: f64,
}

/// A deliberately small parser, separate from the crate's reader: words are a letter and a
/// decimal number, comments are `( ... )`; it tracks absolute X, Y (the writer always emits
/// G21 G90) and for every G2/G3 compares the distance from the centre (start + I, J) to the
/// start and to the end, which NISTIR 6556 §3.5.3 requires to agree within 0.002 mm.
fn check_program(text: &str) -> Checked {
    assert!(
        text.lines().any(|l| l == "G21 G90 G17"),
        "units and modes line missing"
    );
    let (mut x, mut y) = (0.0f64, 0.0f64);
    let mut out = Checked {
        arcs: 0,
        worst_radius_mismatch: 0.0,
    };
    for line in text.lines() {
        let code = match line.find('(') {
            Some(i) => &line[..i],
            None => line,
        };
        let word = |letter: char| -> Option<f64> {
            code.split_whitespace()
                .find(|w| w.starts_with(letter))
                .map(|w| w[1..].parse::<f64>().expect("a number after the letter"))
        };
        let g = word('G');
        let (nx, ny) = (word('X').unwrap_or(x), word('Y').unwrap_or(y));
        if g == Some(2.0) || g == Some(3.0) {
            let (i, j) = (word('I').expect("I"), word('J').expect("J"));
            let (cx, cy) = (x + i, y + j);
            let r0 = ((x - cx).powi(2) + (y - cy).powi(2)).sqrt();
            let r1 = ((nx - cx).powi(2) + (ny - cy).powi(2)).sqrt();
            out.arcs += 1;
            out.worst_radius_mismatch = out.worst_radius_mismatch.max((r0 - r1).abs());
        }
        (x, y) = (nx, ny);
    }
    out
}

fn opts(decimals: u32) -> GcodeOptions {
    GcodeOptions {
        decimals,
        header: vec!["round-trip test".into()],
        ..GcodeOptions::default()
    }
}

fn shape() -> Shape {
    Shape {
        min_radius: 0.01,
        max_radius: 500.0,
        max_line: 50.0,
        segments: 8,
    }
}

#[test]
fn random_programs_meet_the_radius_rule_and_read_back_within_a_micrometre() {
    let mut rng = Rng::new(0x5EED_0001);
    let (mut arcs, mut worst_rule, mut worst_dev) = (0, 0.0f64, 0.0f64);
    for round in 0..40 {
        let contours: Vec<Contour> = (0..4)
            .map(|i| random_contour(&mut rng, &shape(), (round + i) % 2 == 0, i))
            .collect();
        for d in [3, 4, 5] {
            let prog = gcode_program(&contours, &opts(d)).unwrap();
            let checked = check_program(&prog);
            // NISTIR 6556 §3.5.3: start and end radius differ by at most 0.002 mm; the writer
            // derives ≤ 10⁻ᵈ (module docs of write::gcode).
            assert!(
                checked.worst_radius_mismatch <= 0.002,
                "d = {d}: {}",
                checked.worst_radius_mismatch
            );
            assert!(checked.worst_radius_mismatch <= 10f64.powi(-(d as i32)) * (1.0 + 1e-6));
            worst_rule = worst_rule.max(checked.worst_radius_mismatch * 10f64.powi(d as i32));
            arcs += checked.arcs;

            let back = read_gcode("rt.nc", &prog).unwrap();
            assert_eq!(back.contours.len(), contours.len(), "d = {d}");
            for (src, got) in contours.iter().zip(&back.contours) {
                assert_eq!(got.closed, src.closed);
                // The reader and gcode_as_read see the same traced geometry.
                let expected = gcode_as_read(src, d).unwrap();
                assert!(hausdorff(&expected.segments, &got.segments, 8) <= 1e-9);
                if d >= 4 {
                    let dev = hausdorff(&src.segments, &got.segments, 64);
                    assert!(dev <= 1e-3, "d = {d}: {} deviates by {dev} mm", src.source);
                    worst_dev = worst_dev.max(dev);
                }
            }
        }
    }
    assert!(arcs > 1000, "only {arcs} arcs written");
    eprintln!("{arcs} arcs; worst radius mismatch {worst_rule:.3}·10^-d; worst deviation at 4+ decimals {worst_dev:.2e} mm");
}

#[test]
fn traced_geometry_stays_within_the_rounding_bound() {
    // Each written coordinate is within h = 0.5·10⁻ᵈ (exact decimal rounding); lines then move
    // by ≤ √2·h and arc pieces by ≤ 6·√2·h (derived in write::gcode's module docs).
    let mut rng = Rng::new(0x5EED_0002);
    for d in 3..=6 {
        let h = 0.5 * 10f64.powi(-(d as i32));
        let mut worst = 0.0f64;
        for i in 0..60 {
            let s = Shape {
                min_radius: 2.0 * h,
                ..shape()
            };
            let c = random_contour(&mut rng, &s, i % 2 == 0, i);
            let traced = gcode_as_read(&c, d).unwrap();
            worst = worst.max(hausdorff(&c.segments, &traced.segments, 64) / h);
        }
        assert!(worst <= 6.0 * 2f64.sqrt(), "d = {d}: {worst}·h");
        eprintln!("d = {d}: worst traced deviation {worst:.3}·h");

        let lines = Contour::new(
            (0..50)
                .map(|k| {
                    let p = |t: f64| Point::new(100.0 * (t * 0.37).sin(), 80.0 * (t * 0.23).cos());
                    Segment::Line(Line::new(p(k as f64), p(k as f64 + 1.0)))
                })
                .collect(),
            false,
            Source::new("l.svg", "#l", 0),
        );
        let traced = gcode_as_read(&lines, d).unwrap();
        for (a, b) in lines.segments.iter().zip(&traced.segments) {
            for t in [0.0, 0.3, 1.0] {
                let e = (a.eval(t) - b.eval(t)).hypot();
                assert!(e <= 2f64.sqrt() * h * (1.0 + 1e-9), "d = {d}: {e}");
            }
        }
    }
}

#[test]
fn errors_name_the_contour() {
    let c = Contour::new(
        vec![Segment::Cubic(kurbo::CubicBez::new(
            (0.0, 0.0),
            (1.0, 1.0),
            (2.0, 1.0),
            (3.0, 0.0),
        ))],
        false,
        Source::new("sign.svg", "#letter-R", 1),
    );
    let e = gcode_program(std::slice::from_ref(&c), &opts(4)).unwrap_err();
    assert_eq!(
        e.to_string(),
        "sign.svg: #letter-R, contour 1: segment 0: a cubic Bézier cannot be written to G-code \
         (lines and arcs only); convert or fit it first"
    );
    assert!(gcode_as_read(&c, 4).is_err());
    let nan = Contour::new(
        vec![Segment::Line(Line::new((0.0, 0.0), (f64::NAN, 1.0)))],
        false,
        Source::new("sign.svg", "#bad", 0),
    );
    assert!(gcode_program(&[nan], &opts(4))
        .unwrap_err()
        .to_string()
        .contains("NaN"));
    let far = Contour::new(
        vec![Segment::Line(Line::new((0.0, 0.0), (2e6, 1.0)))],
        false,
        Source::new("sign.svg", "#far", 0),
    );
    assert!(gcode_program(&[far], &opts(4))
        .unwrap_err()
        .to_string()
        .contains("1e6"));
}
