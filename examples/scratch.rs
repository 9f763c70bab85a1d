use kurbo::{BezPath, PathEl};
use ratline::fit::{fit, Target};
use ratline::geom::{Segment, Tolerance};
use ratline::read::font::{glyph_count, glyph_outline};
use std::time::Instant;

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let font = &args[1];
    let n: usize = args
        .get(2)
        .and_then(|s| s.parse().ok())
        .unwrap_or(usize::MAX);
    let target = match args.get(3).map(|s| s.as_str()) {
        Some("lines") => Target::Lines,
        Some("quad") => Target::Quadratic,
        Some("arcs") => Target::Arcs,
        _ => Target::Cubic,
    };
    let data = std::fs::read(font).unwrap();
    let count = glyph_count("f", &data, 0).unwrap() as usize;
    let tol = Tolerance::new(0.01).unwrap();
    let mut contours = Vec::new();
    for g in 0..count.min(n) {
        if let Ok(Some(cs)) = glyph_outline("f", &data, 0, g as u16, 100.0) {
            contours.extend(cs);
        }
    }
    let segs_in: usize = contours.iter().map(|c| c.segments.len()).sum();
    let t = Instant::now();
    let mut out = 0;
    let mut over = 0;
    let mut worst: f64 = 0.0;
    for c in &contours {
        let f = fit(c, target, tol);
        out += f.contour.segments.len();
        if f.deviation.bound > 0.01 {
            over += 1;
        }
        worst = worst.max(f.deviation.bound);
    }
    let el = t.elapsed();
    // kurbo flatten
    let t2 = Instant::now();
    let mut kl = 0;
    for c in &contours {
        let mut p = BezPath::new();
        p.move_to(c.segments[0].start());
        for s in &c.segments {
            match s {
                Segment::Line(l) => p.line_to(l.p1),
                Segment::Quad(q) => p.quad_to(q.p1, q.p2),
                Segment::Cubic(q) => p.curve_to(q.p1, q.p2, q.p3),
                _ => {}
            }
        }
        kurbo::flatten(p, 0.01, |e| {
            if matches!(e, PathEl::LineTo(_)) {
                kl += 1
            }
        });
    }
    let el2 = t2.elapsed();
    println!("contours {} segs_in {} out {} over {} worst {:.5} time {:?} | kurbo flatten lines {} time {:?}", contours.len(), segs_in, out, over, worst, el, kl, el2);
}
