use ratline::convert::fit_outline;
use ratline::fit::Target;
use ratline::geom::{Outline, Tolerance};
use ratline::read::font::{glyph_count, glyph_outline};
use ratline::verify::{verify, Align, VerifyOptions};
use std::time::Instant;
fn main() {
    let data = std::fs::read("tests/fonts/DejaVuSans.ttf").unwrap();
    let n = glyph_count("f", &data, 0).unwrap();
    let mut o = Outline::default();
    for g in 0..n {
        if let Ok(Some(cs)) = glyph_outline("f", &data, 0, g, 100.0) {
            let dx = (g % 80) as f64 * 120.0;
            let dy = (g / 80) as f64 * 120.0;
            o.contours.extend(
                cs.iter()
                    .map(|c| c.transformed(kurbo::Affine::translate((dx, dy)))),
            );
        }
    }
    let tol = Tolerance::new(0.01).unwrap();
    let t = Instant::now();
    let f = fit_outline(&o, Target::Cubic, tol, &[], &|| {});
    println!("contours {} fit {:?}", o.contours.len(), t.elapsed());
    let cand = Outline {
        contours: f.contours,
        ..Outline::default()
    };
    let t = Instant::now();
    let r = verify(
        &o,
        &cand,
        &VerifyOptions {
            tolerance: tol,
            align: Align::None,
        },
    );
    println!(
        "verify {:?} pairs {} missing {} extra {} h {}",
        t.elapsed(),
        r.pairs.len(),
        r.missing.len(),
        r.extra.len(),
        r.hausdorff_mm
    );
}
