//! An independent dense check of a deviation, next to ratline's certified one: sample both
//! sides densely (64 points per segment) and take the largest distance from a sample of one
//! side to the other side, each distance found by kurbo's nearest-point solvers
//! (`ParamCurveNearest` for lines and Béziers) or in closed form for circular arcs (a point's
//! distance to a circle is |‖p − c‖ − r|, shared REFERENCES §5; outside the arc's angular span
//! the nearest point is an end point). The value is a sampled lower estimate of the Hausdorff
//! distance, so a result above the tolerance proves a miss; it does not use `ratline::measure`.
#![allow(dead_code)] // the bench and the tests each use their own subset

use kurbo::{ParamCurve, ParamCurveExtrema, ParamCurveNearest, PathSeg, Point, Rect, Vec2};
use ratline::geom::{CircularArc, Segment};

/// Samples per segment.
pub const SAMPLES: usize = 64;

/// One piece of either side.
#[derive(Clone, Copy, Debug)]
pub enum Piece {
    Seg(PathSeg),
    Arc(CircularArc),
}

impl Piece {
    /// A fitted ratline segment (lines, Béziers, arcs; a conic is not a fitting output).
    pub fn of(s: &Segment) -> Piece {
        match s {
            Segment::Line(l) => Piece::Seg(PathSeg::Line(*l)),
            Segment::Quad(q) => Piece::Seg(PathSeg::Quad(*q)),
            Segment::Cubic(c) => Piece::Seg(PathSeg::Cubic(*c)),
            Segment::Arc(a) => Piece::Arc(*a),
            Segment::Conic(_) => panic!("a conic is not an output of fitting"),
        }
    }

    fn eval(&self, t: f64) -> Point {
        match self {
            Piece::Seg(s) => s.eval(t),
            Piece::Arc(a) => a.center + a.radius * Vec2::from_angle(a.start_angle + t * a.sweep),
        }
    }

    fn bounding_box(&self) -> Rect {
        match self {
            Piece::Seg(s) => s.bounding_box(),
            // The whole circle's box contains the arc's.
            Piece::Arc(a) => Rect::from_center_size(a.center, (2.0 * a.radius, 2.0 * a.radius)),
        }
    }

    fn distance(&self, p: Point) -> f64 {
        match self {
            Piece::Seg(s) => s.nearest(p, 1e-12).distance_sq.sqrt(),
            Piece::Arc(a) => {
                let v = p - a.center;
                let (lo, hi) = if a.sweep >= 0.0 {
                    (a.start_angle, a.start_angle + a.sweep)
                } else {
                    (a.start_angle + a.sweep, a.start_angle)
                };
                let ang = v.atan2();
                let inside = a.sweep.abs() >= std::f64::consts::TAU - 1e-12 || {
                    let k = ((ang - lo) / std::f64::consts::TAU).floor();
                    ang - k * std::f64::consts::TAU <= hi
                };
                if inside {
                    (v.hypot() - a.radius).abs()
                } else {
                    (p - self.eval(0.0))
                        .hypot()
                        .min((p - self.eval(1.0)).hypot())
                }
            }
        }
    }
}

/// The pieces of one side, with their boxes for pruning.
pub struct Set {
    pieces: Vec<Piece>,
    boxes: Vec<Rect>,
}

impl Set {
    pub fn new(pieces: Vec<Piece>) -> Set {
        let boxes = pieces.iter().map(|p| p.bounding_box()).collect();
        Set { pieces, boxes }
    }

    pub fn from_segments(segs: &[Segment]) -> Set {
        Set::new(segs.iter().map(Piece::of).collect())
    }

    /// `SAMPLES` + 1 evenly spaced points of every piece (both ends included).
    pub fn samples(&self) -> Vec<Point> {
        self.pieces
            .iter()
            .flat_map(|p| (0..=SAMPLES).map(move |i| p.eval(i as f64 / SAMPLES as f64)))
            .collect()
    }

    /// The largest distance from the points to this set. The piece nearest to the previous
    /// point is tried first, so the boxes prune almost every other piece.
    pub fn farthest(&self, points: &[Point]) -> f64 {
        let mut hint = 0;
        let mut worst: f64 = 0.0;
        for &p in points {
            let mut best = self
                .pieces
                .get(hint)
                .map_or(f64::INFINITY, |s| s.distance(p));
            for (i, s) in self.pieces.iter().enumerate() {
                if i == hint || box_distance(self.boxes[i], p) >= best {
                    continue;
                }
                let d = s.distance(p);
                if d < best {
                    best = d;
                    hint = i;
                }
            }
            worst = worst.max(best);
        }
        worst
    }
}

fn box_distance(r: Rect, p: Point) -> f64 {
    let dx = (r.x0 - p.x).max(p.x - r.x1).max(0.0);
    let dy = (r.y0 - p.y).max(p.y - r.y1).max(0.0);
    dx.hypot(dy)
}

/// The dense two-sided distance between a source (its samples and its set) and an output.
pub fn dense(source_samples: &[Point], source: &Set, out: &Set) -> f64 {
    source
        .farthest(&out.samples())
        .max(out.farthest(source_samples))
}

/// The reference side for an SVG arc, which no ratline type holds outside its own reading:
/// kurbo's own arc, sampled exactly, and for nearest points its cubics at 1e-7 mm (far below
/// any tolerance checked).
pub fn arc_reference(arc: &kurbo::Arc) -> (Vec<Point>, Set) {
    let pieces = (arc.sweep_angle.abs() / std::f64::consts::FRAC_PI_2).ceil() as usize;
    let m = pieces.max(1) * SAMPLES;
    let samples = (0..=m).map(|j| arc.eval(j as f64 / m as f64)).collect();
    let set = Set::new(
        kurbo::segments(kurbo::Shape::path_elements(arc, 1e-7))
            .map(Piece::Seg)
            .collect(),
    );
    (samples, set)
}
