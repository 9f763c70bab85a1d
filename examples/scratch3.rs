use kurbo::Point;
use ratline::fit::{fit, Target};
use ratline::geom::*;
fn main() {
    for t in [0.01, 0.001] {
        let segs = ellipse_conics(Point::new(0.0, 0.0), 10.0, 10.0, 0.0)
            .into_iter()
            .map(Segment::Conic)
            .collect();
        let c = Contour::new(segs, true, Source::default());
        for target in [
            Target::Lines,
            Target::Quadratic,
            Target::Cubic,
            Target::Arcs,
        ] {
            let f = fit(&c, target, Tolerance::new(t).unwrap());
            let n = f.contour.segments.len();
            let th = std::f64::consts::TAU / n as f64;
            let exact = match target {
                Target::Lines => 10.0 * (1.0 - (th / 2.0).cos()),
                Target::Quadratic => {
                    let cc = (th / 2.0).cos();
                    10.0 * (1.0 - cc).powi(2) / (2.0 * cc)
                }
                Target::Cubic => {
                    let q = th / 4.0;
                    10.0 * ((1.0 + 4.0 / 27.0 * q.sin().powi(6) / q.cos().powi(2)).sqrt() - 1.0)
                }
                Target::Arcs => 0.0,
            };
            println!(
                "tol {t} {:?}: {n} pieces, certified {:.7}, exact {:.7}, gap {:.2}% of tol",
                target,
                f.deviation.bound,
                exact,
                100.0 * (f.deviation.bound - exact) / t
            );
        }
    }
}
