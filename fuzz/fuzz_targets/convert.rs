//! The whole pipeline on arbitrary SVG: read, fit to each target with SVG and G-code output,
//! measure, write. The first byte picks the tolerance among a few coarse ones so a run stays
//! fast; the rest is the SVG. Whatever converts must account for every contour.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::convert::{run_job, JobOptions};
use ratline::fit::Target;
use ratline::geom::Tolerance;
use ratline::read::svg::{read_svg, SvgOptions};
use ratline::write::gcode::GcodeOptions;

fuzz_target!(|data: &[u8]| {
    let Some((&first, svg)) = data.split_first() else {
        return;
    };
    let Ok(outline) = read_svg("fuzz.svg", svg, &SvgOptions::default()) else {
        return;
    };
    // Keep a run short: small drawings only (the limit on output segments is tested elsewhere).
    if outline.contours.len() > 64 {
        return;
    }
    let tol = [0.01, 0.05, 0.1, 1.0][usize::from(first % 4)];
    let tolerance = Tolerance::new(tol).expect("a valid tolerance");
    for target in [Target::Lines, Target::Quadratic, Target::Cubic, Target::Arcs] {
        let job = JobOptions {
            target: Some(target),
            tolerance,
            svg: true,
            json: first & 0x10 != 0,
            gcode: Some(GcodeOptions::default()),
            max_segments: 200_000,
        };
        if let Ok(r) = run_job(&outline, &job, &|| {}) {
            let rep = &r.report;
            assert_eq!(rep.contours_in, rep.contours_out + rep.skipped.len());
        }
    }
});
