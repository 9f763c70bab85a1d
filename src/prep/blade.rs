//! Drag-knife blade offset. A drag knife's tip trails the tool axis by the blade offset d and
//! swivels freely: the tip moves along the blade, towards the axis, so its path is the
//! tractrix ("dog curve") of the axis path (the classical caster model: the tip's velocity is
//! the component of the axis velocity along the blade).
//!
//! For the tip to follow a drawn contour p, the axis must run on a = p + d·T (T the unit
//! tangent): then |a − p| = d and a' · T = |p'|, so the tractrix velocity (a'·T)·T is exactly p'.
//! Pieces are displaced with `displace` (exact for lines and arcs: a line moves forward along
//! itself, a circle of radius r becomes the concentric circle of radius √(r² + d²) turned
//! forward by atan(d/r); Béziers fitted and measured). At a corner turning by more than the
//! threshold the axis sweeps the arc of radius d around the corner point from the incoming to
//! the outgoing direction, which swivels the blade with the tip standing on the corner (the
//! axis moves across the blade, so the tractrix does not move the tip). Smaller turns are
//! joined by a straight move and the blade finds its way; the tip's excursion there is what the
//! simulation below measures.
//!
//! Pre-alignment: a closed contour starts by retracing its own last `LEAD_IN` × d (the tail
//! before the start point), so a blade set down at an unknown angle θ₀ settles before the
//! contour proper: on a straight line the tractrix gives tan(θ/2) = tan(θ₀/2)·e^(−s/d), a factor
//! e⁻³ ≈ 0.05 after 3d.
//!
//! Measurement: the tip is simulated along the axis path (follow-the-leader steps of at most
//! d/`SIM_STEPS_PER_OFFSET`, tip ← a − d·(a − tip)/|a − tip|, the implicit discretisation of
//! the tractrix) and its largest distance to the drawn path is reported. This is a sampled
//! simulation, not a certified bound.

use kurbo::{Line, Point};

use super::displace::{displace, turn, Displacement};
use crate::geom::{CircularArc, Segment};

/// Length of the pre-alignment retrace, in blade offsets.
pub const LEAD_IN: f64 = 3.0;

/// Simulation steps per blade offset of axis travel.
const SIM_STEPS_PER_OFFSET: f64 = 200.0;

/// Most simulation steps per path.
const MAX_SIM_STEPS: usize = 200_000;

/// The axis path for one tip path.
#[derive(Clone, Debug, PartialEq)]
pub struct AxisPath {
    pub segments: Vec<Segment>,
    /// Corners swept by an arc around the tip.
    pub swivels: usize,
    /// Worst measured deviation of fitted axis pieces from p + d·T (mm).
    pub deviation: f64,
}

/// The axis path that makes the tip follow `tip` (segments joined end to start).
pub fn axis_path(tip: &[Segment], d: f64, threshold_rad: f64, tol: f64) -> AxisPath {
    let segs: Vec<(Segment, _)> = tip
        .iter()
        .filter_map(|s| Some((*s, displace(s, Displacement::Tangent(d), tol)?)))
        .collect();
    let mut out = AxisPath {
        segments: Vec::new(),
        swivels: 0,
        deviation: 0.0,
    };
    for (i, (s, disp)) in segs.iter().enumerate() {
        out.segments.extend(disp.pieces.iter().copied());
        out.deviation = out.deviation.max(disp.deviation);
        let Some((next, next_disp)) = segs.get(i + 1) else {
            break;
        };
        let (Some(t_in), Some(t_out)) = (s.tangent_at(1.0), next.tangent_at(0.0)) else {
            continue;
        };
        let phi = turn(t_in, t_out);
        if phi.abs() > threshold_rad {
            out.swivels += 1;
            out.segments.push(Segment::Arc(CircularArc {
                center: s.end(),
                radius: d,
                start_angle: t_in.atan2(),
                sweep: phi,
            }));
        } else if (next_disp.start - disp.end).hypot() > 1e-12 {
            out.segments
                .push(Segment::Line(Line::new(disp.end, next_disp.start)));
        }
    }
    out
}

/// The tip's path when the axis follows `axis`, starting at `tip0` (a blade set down aligned
/// has tip0 = axis start − d·T), as sample points.
pub fn simulate_tip(axis: &[Segment], d: f64, tip0: Point) -> Vec<Point> {
    let total: f64 = axis.iter().map(|s| s.arclen(1e-6)).sum();
    let step = (d / SIM_STEPS_PER_OFFSET).max(total / MAX_SIM_STEPS as f64);
    let mut tip = tip0;
    let mut out = vec![tip];
    for s in axis {
        let n = ((s.arclen(1e-6) / step).ceil() as usize).max(1);
        for i in 1..=n {
            let a = s.eval(i as f64 / n as f64);
            let v = a - tip;
            let len = v.hypot();
            if len > 0.0 {
                tip = a - (d / len) * v;
            }
            out.push(tip);
        }
    }
    out
}

/// The largest distance from the sample points to the path.
pub fn distance_to_path(points: &[Point], path: &[Segment]) -> f64 {
    let boxes: Vec<_> = path.iter().map(|s| s.bounding_box()).collect();
    let mut worst: f64 = 0.0;
    for p in points {
        let mut best = f64::INFINITY;
        for (s, b) in path.iter().zip(&boxes) {
            let dx = (b.x0 - p.x).max(p.x - b.x1).max(0.0);
            let dy = (b.y0 - p.y).max(p.y - b.y1).max(0.0);
            if dx.hypot(dy) >= best {
                continue;
            }
            best = best.min(s.nearest(*p).0);
        }
        worst = worst.max(best);
    }
    worst
}

/// Simulate the tip along the axis path of `tip` and measure its largest distance from it.
pub fn tip_deviation(tip: &[Segment], axis: &[Segment], d: f64) -> f64 {
    let Some(first) = tip.first() else {
        return 0.0;
    };
    distance_to_path(&simulate_tip(axis, d, first.start()), tip)
}
