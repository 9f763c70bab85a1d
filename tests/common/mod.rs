//! Helpers shared by the integration tests: a seeded random source and dense distance checks.
#![allow(dead_code)]

use kurbo::{ParamCurveNearest, Point};
use ratline::geom::Segment;

/// xorshift64* (Vigna, "An experimental exploration of Marsaglia's xorshift generators",
/// ACM TOMS 2016): deterministic test data without a dependency.
pub struct Rng(u64);

impl Rng {
    pub fn new(seed: u64) -> Rng {
        Rng(seed.wrapping_mul(0x9E37_79B9_7F4A_7C15) | 1)
    }

    pub fn next_u64(&mut self) -> u64 {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        x.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * ((self.next_u64() >> 11) as f64 / (1u64 << 53) as f64)
    }

    pub fn point(&mut self, lo: f64, hi: f64) -> Point {
        Point::new(self.range(lo, hi), self.range(lo, hi))
    }

    pub fn bool(&mut self) -> bool {
        self.next_u64() & 1 == 1
    }
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
