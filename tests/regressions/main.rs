//! Regression tests, each named for the defect it pins, each in its own temporary folder.
//! Inputs found by the fuzz targets are kept in this folder as files, each with a test here
//! that runs it through the binary.

use std::fmt::Write;
use std::process::Command;
use std::time::{Duration, Instant};

fn polygon_svg(n: usize) -> String {
    let mut pts = String::new();
    for i in 0..n {
        let a = std::f64::consts::TAU * i as f64 / n as f64;
        let r = 40.0 + 0.3 * (37.0 * a).sin();
        let _ = write!(pts, "{:.6},{:.6} ", 50.0 + r * a.cos(), 50.0 + r * a.sin());
    }
    format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="100mm" height="100mm" viewBox="0 0 100 100"><polygon id="long" points="{pts}"/></svg>"#
    )
}

/// Measuring the writers' rounding on one long contour took time quadratic in its length
/// (every sample searched the whole read-back contour): a 10,000-point polygon took about four
/// minutes. Measured window by window it is linear; the bound stays certified.
#[test]
fn long_contour_rounding_is_measured_in_linear_time() {
    let dir = tempfile::tempdir().unwrap();
    let input = dir.path().join("long.svg");
    std::fs::write(&input, polygon_svg(20_000)).unwrap();
    let report = dir.path().join("report.json");
    let start = Instant::now();
    let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
        .arg("convert")
        .arg(&input)
        .arg("-o")
        .arg(dir.path().join("out.svg"))
        .arg("--gcode")
        .arg(dir.path().join("out.nc"))
        .arg("--report")
        .arg(&report)
        .arg("-q")
        .output()
        .unwrap();
    let took = start.elapsed();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    // Generous for a shared 2-core machine; the quadratic version needed many minutes.
    assert!(took < Duration::from_secs(120), "took {took:?}");
    let r: serde_json::Value = serde_json::from_slice(&std::fs::read(&report).unwrap()).unwrap();
    assert_eq!(r["within_tolerance"], true);
    let c = &r["contours"][0];
    assert_eq!(c["segments_out"]["line"], 20_000);
    let rounding = c["rounding_mm"].as_f64().unwrap();
    // Points given with 6 decimals and written with 4 move by at most √2/2·10⁻⁴ mm (derived:
    // half a unit in the last place on each axis), and some of them by nearly that much.
    let half_unit = std::f64::consts::FRAC_1_SQRT_2 * 1e-4;
    assert!(
        rounding > 0.9 * half_unit && rounding <= half_unit * (1.0 + 1e-12),
        "{rounding}"
    );
}

/// A contour longer than the per-contour limit is refused before any work, naming the
/// element and the limit, and nothing is written.
#[test]
fn contour_over_the_segment_limit_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let input = dir.path().join("huge.svg");
    std::fs::write(
        &input,
        polygon_svg(ratline::convert::MAX_SEGMENTS_PER_CONTOUR + 1),
    )
    .unwrap();
    let out = dir.path().join("out.svg");
    let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
        .arg("convert")
        .arg(&input)
        .arg("-o")
        .arg(&out)
        .output()
        .unwrap();
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains("huge.svg: #long")
            && stderr.contains("over the limit of 1000000 segments per contour"),
        "{stderr}"
    );
    assert!(!out.exists());
}

/// The ellipse a rounded rectangle becomes when its radii are clamped: an x extremum found a few
/// ulps inside a conic's end made a span of zero length, whose line the closed form could never
/// certify, and the lines target stepped through it by 1e-9 until the output limit stopped the
/// job (5,000,000 lines). Roots that close to an end are the end now, and a span that cannot be
/// certified ends in one measured line.
#[test]
fn extremum_at_a_segment_end_makes_no_empty_span() {
    let svg = br#"<svg xmlns="http://www.w3.org/2000/svg" width="200mm" height="120mm" viewBox="0 0 200 120"><rect id="clamped" x="90" y="60" width="60" height="40" rx="100" ry="100"/></svg>"#;
    let outline = ratline::read::svg::read_svg("clamped.svg", svg, &Default::default()).unwrap();
    let f = ratline::fit::fit_limited(
        &outline.contours[0],
        ratline::fit::Target::Lines,
        ratline::geom::Tolerance::new(0.01).unwrap(),
        10_000,
    )
    .expect("far fewer than 10,000 lines");
    // An ellipse of semi-axes 30 and 20 mm: on-curve chords need about 4·18 at 0.01 mm (a
    // quarter of a 20–30 mm circle, REFERENCES §3); lines split both sides need fewer.
    assert!(
        f.contour.segments.len() <= 90,
        "{}",
        f.contour.segments.len()
    );
    assert!(f.deviation.bound <= 0.01);
}

/// Found by the `convert` fuzz target (a libFuzzer timeout): an SVG arc with ry = 1.2e43 becomes
/// a conic with coordinates near 1e43 mm, which the writers refuse, but fitting it first ran
/// for minutes (quadratic, cubic and arcs targets). Inputs the writers cannot hold are now
/// refused before any fitting, naming the element and segment.
#[test]
fn coordinates_beyond_the_writers_limit_are_refused_before_fitting() {
    let input = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/regressions/fuzz-convert-huge-arc-radius.svg"
    );
    for target in ["lines", "quadratic", "cubic", "arcs"] {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("out.svg");
        let start = Instant::now();
        let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
            .args([
                "convert",
                input,
                "--to",
                target,
                "--tolerance",
                "0.05mm",
                "-o",
            ])
            .arg(&out)
            .output()
            .unwrap();
        let took = start.elapsed();
        let stderr = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{target}: {stderr}");
        assert!(
            stderr.contains("path[1], contour 0: segment 4: a coordinate is beyond ±1e6 mm"),
            "{target}: {stderr}"
        );
        assert!(!out.exists());
        // Generous for a shared machine; before, every one of the three ran for minutes.
        assert!(took < Duration::from_secs(10), "{target}: {took:?}");
    }
}
