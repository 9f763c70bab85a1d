//! Certified deviation between two sets of segments: a rigorous upper bound on the symmetric
//! Hausdorff distance `d_H(A, B) = max{sup_a inf_b |a − b|, sup_b inf_a |a − b|}` (Alt & Scharf,
//! "Computing the Hausdorff distance between curved objects", IJCGA 2008), with the place where
//! it is reached.
//!
//! One direction, `sup_{a ∈ A} dist(a, B)`, is bounded over each parameter interval [tₐ, t_b] of a
//! segment of A, from the distances fₐ, f_b at its ends, in two rigorous ways:
//!
//! 1. Lipschitz: dist(·, B) is 1-Lipschitz, so f(t) = dist(A(t), B) is L-Lipschitz with L a bound
//!    on |A'|, and `f ≤ (fₐ + f_b + L·h) / 2` on the interval (h = t_b − tₐ).
//! 2. Second order: when the nearest points at both ends lie on one segment S of B, at parameters
//!    uₐ and u_b, then for u(t) linear between them, E(t) = A(t) − S(u(t)) satisfies
//!    dist(A(t), B) ≤ |E(t)| ≤ max(fₐ, f_b) + h²·M_A/8 + (u_b − uₐ)²·M_S/8, where M bounds the
//!    second derivative (linear-interpolation remainder, |E − lerp| ≤ (t − tₐ)(t_b − t)/2·|E''|).
//!
//! Intervals are refined best-first until the largest bound is within `slack` of the largest
//! sampled distance, so the bound is at most `slack` above a value that is actually attained.
//! Distances are evaluated by nearest-point solvers that return the distance to a real point of
//! B, never less than the true distance, which keeps both bounds rigorous. Speed and second
//! derivative bounds come from the (rational) hodographs (`geom::Segment::speed_bound`,
//! `accel_bound`); see shared REFERENCES §5.

use std::collections::BinaryHeap;

use kurbo::{Point, Rect};
use serde::Serialize;

use crate::geom::Segment;

/// A certified deviation: `bound` provably covers the true value, `sampled` is a distance
/// actually attained (at `at`), and `bound − sampled` is at most the requested slack unless the
/// evaluation budget ran out or the bound came from a closed form that may run above the
/// Hausdorff distance (a quadratic's parametric distance, `fit::parametric`).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Deviation {
    pub bound: f64,
    pub sampled: f64,
    pub at: [f64; 2],
}

impl Deviation {
    pub fn zero(at: Point) -> Deviation {
        Deviation {
            bound: 0.0,
            sampled: 0.0,
            at: [at.x, at.y],
        }
    }

    /// The larger of two deviations (the union of two pieces).
    pub fn max(self, o: Deviation) -> Deviation {
        let mut r = if o.sampled > self.sampled { o } else { self };
        r.bound = self.bound.max(o.bound);
        r
    }
}

/// Most distance evaluations one directed measurement may spend before it settles for the
/// (still rigorous, but looser) bound it has.
const MAX_EVALS: usize = 200_000;

/// Initial intervals per segment.
const INITIAL: usize = 8;

struct Target<'a> {
    segs: &'a [Segment],
    boxes: Vec<Rect>,
    accel: Vec<f64>,
}

#[derive(Clone, Copy)]
struct Sample {
    t: f64,
    f: f64,
    seg: usize,
    u: f64,
}

impl<'a> Target<'a> {
    fn new(segs: &'a [Segment]) -> Target<'a> {
        Target {
            segs,
            boxes: segs.iter().map(|s| s.bounding_box()).collect(),
            accel: segs.iter().map(|s| s.accel_bound()).collect(),
        }
    }

    /// Distance from p to the set, the segment that attains it and its parameter. `hint` is
    /// tried first (the previous sample's nearest segment, usually the answer again), so the
    /// bounding-box test prunes most of the others.
    fn nearest_from(&self, p: Point, hint: usize) -> (f64, usize, f64) {
        let mut best = (f64::INFINITY, 0, 0.0);
        if let Some(s) = self.segs.get(hint) {
            let (d, u) = s.nearest(p);
            best = (d, hint, u);
        }
        for (i, s) in self.segs.iter().enumerate() {
            if i == hint {
                continue;
            }
            if box_distance_sq(self.boxes[i], p) >= best.0 * best.0 {
                continue;
            }
            let (d, u) = s.nearest(p);
            if d < best.0 {
                best = (d, i, u);
            }
        }
        best
    }
}

/// The squared distance from p to a box (0 inside): a lower bound for every point in it.
fn box_distance_sq(r: Rect, p: Point) -> f64 {
    let dx = (r.x0 - p.x).max(p.x - r.x1).max(0.0);
    let dy = (r.y0 - p.y).max(p.y - r.y1).max(0.0);
    dx * dx + dy * dy
}

struct Interval {
    ub: f64,
    seg: usize,
    a: Sample,
    b: Sample,
}

impl PartialEq for Interval {
    fn eq(&self, o: &Self) -> bool {
        self.ub == o.ub
    }
}
impl Eq for Interval {}
impl PartialOrd for Interval {
    fn partial_cmp(&self, o: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(o))
    }
}
impl Ord for Interval {
    fn cmp(&self, o: &Self) -> std::cmp::Ordering {
        self.ub.total_cmp(&o.ub)
    }
}

/// A rigorous bound on `sup_{a ∈ A} dist(a, B)`, refined until it is within `slack` of a
/// sampled value. An empty B gives an infinite bound; an empty A gives zero.
pub fn directed(a: &[Segment], b: &[Segment], slack: f64) -> Deviation {
    directed_within(a, b, slack, f64::INFINITY)
}

/// As [`directed`], and when the answer is close to `goal`, refined until the bound settles on
/// one side of it (to within a thousandth of the slack), so a piece that truly fits is not
/// rejected for the slack alone.
pub fn directed_within(a: &[Segment], b: &[Segment], slack: f64, goal: f64) -> Deviation {
    let origin = a.first().map(|s| s.start()).unwrap_or(Point::ORIGIN);
    if a.is_empty() {
        return Deviation::zero(origin);
    }
    if b.is_empty() {
        return Deviation {
            bound: f64::INFINITY,
            sampled: f64::INFINITY,
            at: [origin.x, origin.y],
        };
    }
    let target = Target::new(b);
    let speed: Vec<f64> = a.iter().map(|s| s.speed_bound()).collect();
    let accel: Vec<f64> = a.iter().map(|s| s.accel_bound()).collect();
    let evals = std::cell::Cell::new(0usize);
    let hint = std::cell::Cell::new(0usize);
    let mut best = Deviation::zero(origin);
    let sample = |seg: usize, t: f64, best: &mut Deviation| -> Sample {
        let p = a[seg].eval(t);
        let (f, s, u) = target.nearest_from(p, hint.get());
        hint.set(s);
        evals.set(evals.get() + 1);
        if f > best.sampled {
            *best = Deviation {
                bound: f,
                sampled: f,
                at: [p.x, p.y],
            };
        }
        Sample { t, f, seg: s, u }
    };
    let interval = |seg: usize, x: Sample, y: Sample| -> Interval {
        let h = y.t - x.t;
        let lipschitz = 0.5 * (x.f + y.f + speed[seg] * h);
        let second = if x.seg == y.seg {
            let du = y.u - x.u;
            x.f.max(y.f) + 0.125 * (h * h * accel[seg] + du * du * target.accel[x.seg])
        } else {
            f64::INFINITY
        };
        Interval {
            ub: lipschitz.min(second),
            seg,
            a: x,
            b: y,
        }
    };
    let mut heap = BinaryHeap::new();
    for (seg, &v) in speed.iter().enumerate() {
        let n = if v == 0.0 { 1 } else { INITIAL };
        let mut prev = sample(seg, 0.0, &mut best);
        for i in 1..=n {
            let next = sample(seg, i as f64 / n as f64, &mut best);
            heap.push(interval(seg, prev, next));
            prev = next;
        }
    }
    let mut bound = best.sampled;
    while let Some(top) = heap.pop() {
        let near_goal = best.sampled <= goal && best.sampled + slack > goal && top.ub > goal;
        let gap = if near_goal { 1e-3 * slack } else { slack };
        if top.ub <= best.sampled + gap || evals.get() >= MAX_EVALS {
            bound = bound.max(top.ub);
            break;
        }
        let h = top.b.t - top.a.t;
        if h <= 1e-12 {
            bound = bound.max(top.ub);
            continue;
        }
        let mid = sample(top.seg, top.a.t + 0.5 * h, &mut best);
        heap.push(interval(top.seg, top.a, mid));
        heap.push(interval(top.seg, mid, top.b));
    }
    best.bound = bound.max(best.sampled);
    best
}

/// A quick, uncertified estimate of the Hausdorff distance from `n` evenly spaced samples of
/// each side (used to steer searches; every result is then certified by `hausdorff`).
pub fn estimate(a: &[Segment], b: &[Segment], n: usize) -> f64 {
    fn one(a: &[Segment], b: &Target, n: usize) -> f64 {
        let mut hint = 0;
        let mut worst: f64 = 0.0;
        for s in a {
            for i in 0..=n {
                let (d, seg, _) = b.nearest_from(s.eval(i as f64 / n as f64), hint);
                hint = seg;
                worst = worst.max(d);
            }
        }
        worst
    }
    if a.is_empty() || b.is_empty() {
        return if a.is_empty() && b.is_empty() {
            0.0
        } else {
            f64::INFINITY
        };
    }
    one(a, &Target::new(b), n).max(one(b, &Target::new(a), n / 2 + 1))
}

/// A rigorous bound on the symmetric Hausdorff distance between A and B.
pub fn hausdorff(a: &[Segment], b: &[Segment], slack: f64) -> Deviation {
    hausdorff_within(a, b, slack, f64::INFINITY)
}

/// As [`hausdorff`], refined near `goal` as in [`directed_within`].
pub fn hausdorff_within(a: &[Segment], b: &[Segment], slack: f64, goal: f64) -> Deviation {
    directed_within(a, b, slack, goal).max(directed_within(b, a, slack, goal))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::CircularArc;
    use approx::assert_abs_diff_eq;
    use kurbo::{Line, ParamCurve, QuadBez};

    #[test]
    fn parabola_against_chord() {
        // REFERENCES §5: Q = (0,0),(5,10),(10,0) against its chord: the true d_H is 5 (the apex
        // at t = 1/2 is 5 above the chord).
        let q = [Segment::Quad(QuadBez::new(
            (0.0, 0.0),
            (5.0, 10.0),
            (10.0, 0.0),
        ))];
        let l = [Segment::Line(Line::new((0.0, 0.0), (10.0, 0.0)))];
        let d = hausdorff(&q, &l, 1e-6);
        assert!(d.bound >= 5.0 && d.bound <= 5.0 + 1e-6, "{d:?}");
        assert_abs_diff_eq!(d.sampled, 5.0, epsilon = 1e-9);
        assert_abs_diff_eq!(d.at[0], 5.0, epsilon = 1e-3);
    }

    #[test]
    fn concentric_arcs() {
        // A point's distance to a circle is |‖p − c‖ − r|, so concentric arcs over the same
        // angles are exactly |r1 − r2| apart.
        let arc = |r| CircularArc {
            center: Point::new(3.0, 4.0),
            radius: r,
            start_angle: 0.3,
            sweep: 2.0,
        };
        let d = hausdorff(
            &[Segment::Arc(arc(10.0))],
            &[Segment::Arc(arc(10.25))],
            1e-9,
        );
        assert!(d.bound >= 0.25 - 1e-12 && d.bound <= 0.25 + 1e-8, "{d:?}");
    }

    #[test]
    fn chord_of_circle_sagitta() {
        // Chord of a circular arc of angle θ: sagitta r(1 − cos(θ/2)) (standard geometry).
        let a = CircularArc {
            center: Point::ORIGIN,
            radius: 10.0,
            start_angle: 0.0,
            sweep: 0.0885,
        };
        let chord = Segment::Line(Line::new(a.eval(0.0), a.eval(1.0)));
        let sag = 10.0 * (1.0 - (0.0885f64 / 2.0).cos());
        for conic in a.to_conics() {
            let d = hausdorff(&[Segment::Conic(conic)], &[chord], 1e-7);
            assert!(
                d.bound >= sag - 1e-12 && d.bound <= sag + 1e-7,
                "{d:?} vs {sag}"
            );
        }
    }

    #[test]
    fn empty_sets() {
        let l = [Segment::Line(Line::new((0.0, 0.0), (1.0, 0.0)))];
        assert_eq!(directed(&[], &l, 1e-3).bound, 0.0);
        assert!(directed(&l, &[], 1e-3).bound.is_infinite());
    }
}
