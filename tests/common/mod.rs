//! Shared test helpers: a seeded generator, random line-and-arc contours and a sampled
//! two-sided (Hausdorff) distance between contours.
#![allow(dead_code)] // each test file uses its own subset

use std::f64::consts::{PI, TAU};

use kurbo::{Line, ParamCurve, ParamCurveNearest, Point, Vec2};
use ratline::geom::{CircularArc, Contour, Segment, Source};

/// SplitMix64 (Steele, Lea, Flood, "Fast splittable pseudorandom number generators", OOPSLA
/// 2014): a small seeded generator, so the tests need no extra dependency.
pub struct Rng(u64);

impl Rng {
    pub fn new(seed: u64) -> Rng {
        Rng(seed)
    }

    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    pub fn range(&mut self, a: f64, b: f64) -> f64 {
        a + (b - a) * self.unit()
    }

    pub fn point(&mut self, lo: f64, hi: f64) -> Point {
        Point::new(self.range(lo, hi), self.range(lo, hi))
    }

    pub fn bool(&mut self) -> bool {
        self.next_u64() & 1 == 1
    }

    /// Log-uniform in [a, b].
    pub fn log_range(&mut self, a: f64, b: f64) -> f64 {
        (a.ln() + (b.ln() - a.ln()) * self.unit()).exp()
    }
}

/// What random contours may contain.
pub struct Shape {
    pub min_radius: f64,
    pub max_radius: f64,
    pub max_line: f64,
    pub segments: usize,
}

/// A contour of random lines and arcs (radii log-uniform, sweeps up to a full turn either
/// way), half of the time tangent-continuous, closed by a final line when `closed`.
pub fn random_contour(rng: &mut Rng, shape: &Shape, closed: bool, index: usize) -> Contour {
    let mut pen = Point::new(rng.range(0.0, 200.0), rng.range(0.0, 200.0));
    let start = pen;
    let mut heading = rng.range(0.0, TAU);
    let mut segs = Vec::new();
    for _ in 0..shape.segments {
        if rng.unit() < 0.5 {
            heading = rng.range(0.0, TAU);
        }
        if rng.unit() < 0.3 {
            let e = pen + rng.range(0.01, shape.max_line) * Vec2::from_angle(heading);
            segs.push(Segment::Line(Line::new(pen, e)));
            pen = e;
        } else {
            let r = rng.log_range(shape.min_radius, shape.max_radius);
            let sweep =
                rng.range(0.5f64.to_radians(), TAU) * if rng.unit() < 0.5 { 1.0 } else { -1.0 };
            // Tangent along `heading`: the centre is a quarter turn from it, on the turning side.
            let to_centre = heading + sweep.signum() * 0.5 * PI;
            let center = pen + r * Vec2::from_angle(to_centre);
            let a = CircularArc {
                center,
                radius: r,
                start_angle: to_centre + PI,
                sweep,
            };
            pen = a.eval(1.0);
            heading += sweep;
            segs.push(Segment::Arc(a));
        }
    }
    if closed {
        segs.push(Segment::Line(Line::new(pen, start)));
    }
    Contour::new(
        segs,
        closed,
        Source::new("random.svg", format!("#shape-{index}"), 0),
    )
}

/// The contour moved by `v` (exactly: lines and arcs only).
pub fn shifted(c: &Contour, v: Vec2) -> Contour {
    let segs = c
        .segments
        .iter()
        .map(|s| match *s {
            Segment::Line(l) => Segment::Line(Line::new(l.p0 + v, l.p1 + v)),
            Segment::Arc(a) => Segment::Arc(CircularArc {
                center: a.center + v,
                ..a
            }),
            other => panic!("shifted: lines and arcs only, got {other:?}"),
        })
        .collect();
    Contour::new(segs, c.closed, c.source.clone())
}

/// Points along every segment: `n` equal parameter steps per segment.
pub fn samples(segs: &[Segment], n: usize) -> Vec<Point> {
    segs.iter()
        .flat_map(|s| (0..=n).map(move |i| s.eval(i as f64 / n as f64)))
        .collect()
}

/// Distance from `p` to the nearest of `segs` (exact for lines and arcs).
pub fn distance_to(p: Point, segs: &[Segment]) -> f64 {
    segs.iter()
        .map(|s| s.nearest(p).0)
        .fold(f64::INFINITY, f64::min)
}

/// The sampled two-sided distance between two contours: the largest distance from a sample of
/// either to the other (a lower bound of the Hausdorff distance, REFERENCES §5, that converges
/// to it as `n` grows).
pub fn hausdorff(a: &[Segment], b: &[Segment], n: usize) -> f64 {
    let ab = samples(a, n)
        .into_iter()
        .map(|p| distance_to(p, b))
        .fold(0.0, f64::max);
    let ba = samples(b, n)
        .into_iter()
        .map(|p| distance_to(p, a))
        .fold(0.0, f64::max);
    ab.max(ba)
}

/// The distance from p to a segment, computed independently of ratline's own solvers: kurbo's
/// nearest point for lines and polynomial Béziers, |‖p − c‖ − r| for a point inside a circular
/// arc's angular range (else the nearer end), and for conics the distance to a polyline of
/// `dense` chords (an over-estimate by at most the chords' sagitta).
pub fn independent_distance(s: &Segment, p: Point, dense: usize) -> f64 {
    match s {
        Segment::Line(l) => l.nearest(p, 1e-12).distance_sq.sqrt(),
        Segment::Quad(q) => q.nearest(p, 1e-12).distance_sq.sqrt(),
        Segment::Cubic(c) => c.nearest(p, 1e-12).distance_sq.sqrt(),
        Segment::Arc(a) => {
            let v = p - a.center;
            let rel =
                ((v.atan2() - a.start_angle) * a.sweep.signum()).rem_euclid(std::f64::consts::TAU);
            let ends = (s.start() - p).hypot().min((s.end() - p).hypot());
            if rel <= a.sweep.abs() {
                (v.hypot() - a.radius).abs().min(ends)
            } else {
                ends
            }
        }
        Segment::Conic(_) => {
            let mut best = f64::INFINITY;
            let mut prev = s.eval(0.0);
            for i in 1..=dense {
                let q = s.eval(i as f64 / dense as f64);
                let l = kurbo::Line::new(prev, q);
                best = best.min(l.nearest(p, 1e-12).distance_sq.sqrt());
                prev = q;
            }
            best
        }
    }
}

/// A dense, independent estimate of the symmetric Hausdorff distance between a source piece
/// `a` and its replacement `b`: `samples` points on each segment of `a` against `b`, and
/// `samples / 10` points on `b` against `a`.
pub fn dense_hausdorff(a: &[Segment], b: &[Segment], samples: usize) -> f64 {
    let one = |x: &[Segment], y: &[Segment], n: usize| {
        let mut worst: f64 = 0.0;
        for s in x {
            for i in 0..=n {
                let p = s.eval(i as f64 / n as f64);
                let d = y
                    .iter()
                    .map(|t| independent_distance(t, p, 2048))
                    .fold(f64::INFINITY, f64::min);
                worst = worst.max(d);
            }
        }
        worst
    };
    one(a, b, samples).max(one(b, a, (samples / 10).max(10)))
}

/// Write a small SVG drawing whose user unit is 1 mm: a `size` mm square page holding `body`.
pub fn write_mm_svg(path: &std::path::Path, size: u32, body: &str) {
    let doc = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{size}mm\" height=\"{size}mm\" \
         viewBox=\"0 0 {size} {size}\">{body}</svg>"
    );
    std::fs::write(path, doc).expect("the test folder is writable");
}
