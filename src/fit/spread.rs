//! Lines with the error spread to both sides of the curve.
//!
//! A chord with both ends on a convex curve lies wholly inside it, so its whole tolerance band is
//! used on one side only. Moving the polyline's vertices outwards by d (along the curve's normal,
//! away from the centre of curvature) lets each line cross the curve: it runs d outside at its
//! ends and s − d inside, s being the bulge of the curve over it. With d close to the tolerance
//! e a line may bulge by nearly 2e, so it can be √2 times as long as a chord (the bulge grows
//! with the square of the length): on a circle, vertices at r + e instead of r save about 30% of
//! the lines (shared REFERENCES §3, 71 → 50 chords for r = 10 mm at 0.01 mm).
//!
//! Vertices stay on the curve where the curve's side changes or where a shop expects the cut to
//! touch the drawing exactly: at corners, at straight lines, at inflections, at the x and y
//! extrema, and at the start of the contour. No vertex passes the tangent line at either end of
//! its span (its offset is capped by the curve's distance from that line), so at an extremum the
//! drawing's extent is kept exactly. Between two such
//! anchors the curve is one *span*: a run of source pieces, joined smoothly and all turning the
//! same way. Each span is split greedily, every line as long as the local curvature predicts
//! for the goal and kept once its certified deviation is within it (shortened and planned
//! again where it is not), the last one ending on the anchor. A span that does not
//! turn (a straight curve) keeps its vertices on the curve (d = 0).
//!
//! Every line is certified by the exact closed form of `lines.rs` (or by `measure` where the
//! span is not a graph over the line), so the reported deviation stays a certified bound.
//!
//! A contour that is one whole circle gets the regular n-gon with every vertex off the circle:
//! with circumradius R the error is R − r at the vertices and r − R·cos(π/n) at the edges'
//! middles; R = 2r / (1 + cos(π/n)) makes them equal, and the fewest sides with that error
//! within e is n = ⌈π / arccos((r − e) / (r + e))⌉ (standard geometry).

use std::f64::consts::PI;
use std::ops::Range;

use arrayvec::ArrayVec;
use kurbo::{Line, Point, Vec2, MAX_EXTREMA};

use super::lines;
use super::power::{self, PowerPiece};
use super::{search_end, At, OverLimit, Pieces, CERT_SLACK, SEARCH_GOAL, SEARCH_WINDOW};
use crate::geom::{CircularArc, Segment};
use crate::measure::{self, Deviation};

/// Offsets of the vertices as a share of the search goal: below the bottom of the search's
/// window, so the end offsets never decide a line's length (the bulge does).
const OFFSET_SHARE: f64 = 0.95;

/// Joins whose tangents differ by less than this (sine of the angle) are smooth.
const SMOOTH_SIN: f64 = 1e-6;

/// One piece of a span: source segment `index` over [t0, t1], in power form where it has one
/// (`power.rs`).
#[derive(Clone, Copy, Debug)]
struct Part {
    index: usize,
    t0: f64,
    t1: f64,
    power: Option<PowerPiece>,
    /// The segment's speed bound: the scale below which its velocity counts as vanishing.
    speed: f64,
}

impl Part {
    /// The point at t and the unit tangent there (see [`Segment::tangent_at`]).
    fn point_tangent(&self, segs: &[Segment], t: f64) -> (Point, Option<Vec2>) {
        if let Some(p) = &self.power {
            let (q, v) = p.point_velocity(t);
            let len = v.hypot();
            if len > 1e-9 * self.speed {
                return (q, Some(v / len));
            }
        }
        let s = &segs[self.index];
        (s.eval(t), s.tangent_at(t))
    }

    /// The parameter step over which the curve bulges by about `bulge` (see
    /// [`PowerPiece::bulge_step`]).
    fn bulge_step(&self, segs: &[Segment], t: f64, bulge: f64) -> f64 {
        match &self.power {
            Some(p) => p.bulge_step(t, bulge),
            None => (8.0 * bulge / segs[self.index].normal_acceleration_at(t).abs()).sqrt(),
        }
    }

    /// The source over [t0, t1] (inside the part's interval) as power-form pieces, into `out`.
    fn push_pieces(&self, segs: &[Segment], t0: f64, t1: f64, out: &mut Vec<PowerPiece>) {
        match self.power {
            Some(p) => out.push(p.over(t0, t1)),
            None => power::push_pieces(&segs[self.index], t0, t1, out),
        }
    }
}

/// A span position σ, located: the part under it and the parameter there.
#[derive(Clone, Copy)]
struct Position<'a> {
    sigma: f64,
    /// ⌊σ⌋, the index of `part` (but the last part's at the span's end).
    index: usize,
    part: &'a Part,
    t: f64,
}

/// A point of the curve and its outward unit normal (none where the tangent is undefined).
type Anchor = (Point, Option<Vec2>);

/// A run of parts between two anchors, turning one way (`turn` = +1 left, −1 right, 0 straight).
#[derive(Debug)]
struct Span<'a> {
    parts: &'a [Part],
    turn: f64,
}

/// The parameters where a segment must have a vertex on the curve: its x and y extrema and, for
/// a cubic, its inflections, in increasing order.
/// Roots this close to each other or to a segment's end are one (floating-point roots of an
/// extremum at an end point land a few ulps inside).
const SAME_T: f64 = 1e-9;

/// The most anchors inside one segment: its x and y extrema and a cubic's two inflections.
const MAX_ANCHORS: usize = MAX_EXTREMA + 2;

fn anchors_inside(s: &Segment) -> ArrayVec<f64, MAX_ANCHORS> {
    let mut ts: ArrayVec<f64, MAX_ANCHORS> = s.extrema().into_iter().collect();
    if let Segment::Cubic(c) = s {
        ts.extend(c.inflections());
    }
    ts.retain(|t| *t > SAME_T && *t < 1.0 - SAME_T);
    ts.sort_by(f64::total_cmp);
    let mut out = ArrayVec::new();
    for t in ts {
        if out.last().is_none_or(|&last: &f64| t - last >= SAME_T) {
            out.push(t);
        }
    }
    out
}

/// Which way a piece of curve turns, from three of its points (the piece has no inflection).
fn turn_of(s: &Segment, t0: f64, t1: f64) -> f64 {
    let (a, b, c) = (s.eval(t0), s.eval(0.5 * (t0 + t1)), s.eval(t1));
    let (u, v) = (b - a, c - b);
    let cross = u.cross(v);
    // (|u × v| ≤ 10⁻¹²·|u|·|v|, squared: no roots.)
    if cross * cross <= 1e-24 * u.hypot2() * v.hypot2() {
        0.0
    } else {
        cross.signum()
    }
}

/// Whether the join from `a`'s end into `b`'s start is smooth and not an extremum.
fn smooth_join(a: &Segment, b: &Segment) -> bool {
    let (Some(u), Some(v)) = (a.tangent_at(1.0), b.tangent_at(0.0)) else {
        return false;
    };
    let axis = u.x.abs().min(u.y.abs()) <= SMOOTH_SIN;
    u.dot(v) > 0.0 && u.cross(v).abs() <= SMOOTH_SIN && !axis
}

/// The spans of a contour's curves; straight lines and zero-length segments are left out (lines
/// are kept as they are by the caller).
/// Returned as every span's parts in order, and each span's range of them and turn.
fn spans(segs: &[Segment]) -> (Vec<Part>, Vec<(Range<usize>, f64)>) {
    let mut parts = Vec::with_capacity(2 * segs.len());
    let mut out: Vec<(Range<usize>, f64)> = Vec::with_capacity(segs.len());
    let mut open = false;
    for (i, s) in segs.iter().enumerate() {
        let speed = match s {
            Segment::Line(_) => 0.0,
            _ => s.speed_bound(),
        };
        if speed == 0.0 {
            open = false;
            continue;
        }
        let mut cuts: ArrayVec<f64, { MAX_ANCHORS + 2 }> = ArrayVec::new();
        cuts.push(0.0);
        cuts.extend(anchors_inside(s));
        cuts.push(1.0);
        for (k, w) in cuts.windows(2).enumerate() {
            let part = Part {
                index: i,
                t0: w[0],
                t1: w[1],
                power: PowerPiece::of(s, w[0], w[1]),
                speed,
            };
            let turn = turn_of(s, w[0], w[1]);
            let joins = k == 0 && open && i > 0 && smooth_join(&segs[i - 1], s);
            parts.push(part);
            match out.last_mut() {
                Some(span) if joins && span.1 == turn => span.0.end += 1,
                _ => out.push((parts.len() - 1..parts.len(), turn)),
            }
        }
        open = true;
    }
    (parts, out)
}

/// ⌊σ⌋ for a span position σ ≥ 0, as an index. (Through a 32-bit conversion, a few instructions
/// cheaper than a 64-bit one: no span comes near 2³² parts.)
fn floor_index(sigma: f64) -> usize {
    sigma as u32 as usize
}

impl Span<'_> {
    /// Span position σ ∈ [0, parts] (part k covers [k, k+1]) with the part there and its
    /// parameter.
    fn position(&self, sigma: f64) -> Position<'_> {
        let k = floor_index(sigma).min(self.parts.len() - 1);
        let part = &self.parts[k];
        let f = (sigma - k as f64).clamp(0.0, 1.0);
        Position {
            sigma,
            index: k,
            part,
            t: part.t0 + f * (part.t1 - part.t0),
        }
    }

    /// Source segment and parameter at span position σ.
    fn at(&self, sigma: f64) -> At {
        let p = self.position(sigma);
        At {
            segment: p.part.index,
            t: p.t,
        }
    }

    /// Every part under span positions a < b with the parameter interval it has there, in order.
    fn each_part(&self, a: f64, b: f64, mut f: impl FnMut(&Part, f64, f64)) {
        let last = self.parts.len() - 1;
        let (ka, kb) = (floor_index(a).min(last), floor_index(b).min(last));
        for (p, k) in self.parts[ka..=kb].iter().zip(ka..) {
            let f0 = if k == ka { a - k as f64 } else { 0.0 };
            let f1 = if k == kb {
                (b - k as f64).min(1.0)
            } else {
                1.0
            };
            if f1 > f0 {
                f(p, p.t0 + f0 * (p.t1 - p.t0), p.t0 + f1 * (p.t1 - p.t0));
            }
        }
    }

    /// The source under span positions a < b as one power-form piece and its parameter
    /// interval, when it lies within one part that has one.
    fn single_piece(&self, a: f64, b: f64) -> Option<(&PowerPiece, f64, f64)> {
        let k = floor_index(a).min(self.parts.len() - 1);
        let p = &self.parts[k];
        let (f0, f1) = (a - k as f64, b - k as f64);
        let piece = p.power.as_ref().filter(|_| f1 <= 1.0)?;
        Some((piece, p.t0 + f0 * (p.t1 - p.t0), p.t0 + f1 * (p.t1 - p.t0)))
    }

    /// A first guess at the length, in span positions, of a line from σ = `a` over which the
    /// curve bulges by `bulge`: over a parameter step h the curve bulges by about n·h²/8, n its
    /// acceleration across its direction (exact for a parabola, n taken at the step's middle),
    /// taken here half a step ahead: half the `previous` line's length ahead, or half the step
    /// predicted at `a` for the first line.
    fn guess(&self, segs: &[Segment], a: Position, bulge: f64, previous: Option<f64>) -> f64 {
        let p = a.part;
        let ahead = previous.map(|h| h * (p.t1 - p.t0));
        match self.parameter_steps(segs, a, [bulge; 2], ahead).0 {
            Some(h) => h * (p.t1 - p.t0).recip(),
            None => self.parts.len() as f64 - a.sigma,
        }
    }

    /// [`Span::guess`] as steps of the parameter of `a`'s part, `ahead` the previous line's
    /// step (in that part's parameter), for the line from `a` (aiming at `bulges[0]`) and for
    /// the one after it (at `bulges[1]`), whose middle is taken one and a half previous steps
    /// ahead; `None` where the curve does not turn there.
    /// The second does not wait for the first, so two planned lines cost one evaluation's
    /// latency in the chain from one planned line to the next (measured: a chain of two
    /// evaluations per line instead of one made the lines fit of DejaVu Sans 17% slower).
    fn parameter_steps(
        &self,
        segs: &[Segment],
        a: Position,
        bulges: [f64; 2],
        ahead: Option<f64>,
    ) -> (Option<f64>, Option<f64>) {
        let (p, t) = (a.part, a.t);
        let ahead = ahead.unwrap_or_else(|| p.bulge_step(segs, t, bulges[0]));
        let step = |middle: f64, bulge: f64| {
            let h = p.bulge_step(segs, middle.min(p.t1), bulge);
            (h.is_finite() && h > 0.0).then_some(h)
        };
        (
            step(t + 0.5 * ahead, bulges[0]),
            step(t + 1.5 * ahead, bulges[1]),
        )
    }

    /// The position a parameter step `h` of `s`'s part past `s` (the span's end for `None`),
    /// through `snap` where it comes near a part's end. Inside the part and clear of its ends
    /// it is found without the round trip through σ, which would lie in the chain of
    /// computations from one planned line to the next.
    fn advance<'s>(
        &'s self,
        s: Position<'s>,
        h: Option<f64>,
        snap: impl Fn(f64) -> f64,
    ) -> Position<'s> {
        let p = s.part;
        let room = p.t1 - p.t0;
        let Some(h) = h else {
            return self.position(snap(self.parts.len() as f64));
        };
        let t = s.t + h;
        if t < p.t1 - SAME_T * room && h > SAME_T * room {
            return Position {
                sigma: s.index as f64 + (t - p.t0) / room,
                t,
                ..s
            };
        }
        self.position(snap(s.sigma + h / room))
    }

    /// The point at span position σ and the curve's outward unit normal there, and the source
    /// position.
    fn point_normal(&self, segs: &[Segment], at: Position) -> (Anchor, At) {
        let (p, t) = (at.part, at.t);
        let (point, tangent) = p.point_tangent(segs, t);
        let at = At {
            segment: p.index,
            t,
        };
        (
            (point, tangent.map(|t| self.turn * Vec2::new(t.y, -t.x))),
            at,
        )
    }

    /// The vertex at span position σ: on the curve, or up to `d` outside it, but never past
    /// the tangent lines at the span's two anchors. At an x or y extremum that tangent line is
    /// the drawing's extent, so the lines never reach beyond it.
    /// `anchors` are [`Span::point_normal`] at the span's two ends.
    /// Returned with the source position at σ.
    fn vertex(&self, segs: &[Segment], anchors: &[Anchor; 2], at: Position, d: f64) -> (Point, At) {
        let ((p, normal), at) = self.point_normal(segs, at);
        let Some(n) = normal.filter(|_| d > 0.0) else {
            return (p, at);
        };
        // The largest offset e ≤ d with (p + e·n − c)·na ≤ 0 for both anchors c (normal na):
        // e ≤ (c − p)·na / cos, cos = n·na > 0, divided only where it binds.
        let mut e = d;
        for &(c, na) in anchors {
            if let Some(na) = na {
                let (cos, room) = (n.dot(na), (c - p).dot(na).max(0.0));
                if cos > 0.0 && room < e * cos {
                    e = room / cos;
                }
            }
        }
        (p + e * n, at)
    }
}

/// The bulge a line's first guess aims at (see [`fit_span`]), a little inside the search's
/// window: the goal g plus the offset d between two offset vertices; from a vertex on the curve,
/// where the line rises by d·u along its length while the curve bulges by about 4s·u(1 − u),
/// the largest s with max over u of (4s·u(1 − u) − d·u) = g, which is
/// s = ((d + 2g) + √((d + 2g)² − d²)) / 4 [derived].
fn aimed_bulge(from_curve: bool, g: f64, d: f64) -> f64 {
    let s = if from_curve {
        ((d + 2.0 * g) + ((d + 2.0 * g).powi(2) - d * d).sqrt()) / 4.0
    } else {
        g + d
    };
    (1.0 - 0.5 * SEARCH_WINDOW) * s
}

/// Lines planned ahead of their certification (see [`fit_span`]).
const PLAN_AHEAD: usize = 8;

/// A line that missed its goal is planned again, shorter by a power of its excess error e / s
/// (s the bulge aimed at, a share below it): first by the fourth root, which most often lands
/// just under the goal, then by the square root (the square law of the spread); after that it
/// is searched for. Measured at 0.01 mm: DejaVu Sans took 43,722 retries and 2 searches for
/// its 539,207 lines over curves, the 100,000 random arcs 379,289 retries and 216 searches for
/// 7.3 million lines (0.1% and 0.85% more lines than a search for every line gave; the square
/// root alone left 4.6% of the arcs' lines below 0.8 of the goal).
const RETRY_ROOTS: [f64; 2] = [0.25, 0.5];

/// The share of the aimed bulge a retried line aims at.
const RETRY_SHARE: f64 = 0.98;

/// Fit one span with lines, vertices `offset` outside the curve except at its two ends.
///
/// Each line is measured on the curve's spread across it (max y − min y in the line's frame),
/// which grows with the square of the line's length: a line between offset vertices may bulge
/// by the goal plus the offset. A line whose certified bound is over the goal counts as over
/// it, scaled to the same goal (the bound decides the first line, which starts on the curve
/// and tilts towards the offset vertex).
///
/// The lines are planned a few at a time, each as long as the local curvature predicts
/// ([`Span::guess`]), and then certified in order. Planning first keeps the certifications out
/// of the chain of computations from one line's end to the next (each needs only its two
/// planned vertices), so the processor can overlap them. A planned line is kept when it is
/// within the goal, however far below it. The first that misses drops the rest of its plan
/// and is planned again shorter ([`RETRY_ROOTS`]), and searched for ([`search_end`]) if that
/// misses too.
/// `source` is scratch space for the source under each line.
fn fit_span(
    segs: &[Segment],
    span: &Span,
    tol: f64,
    source: &mut Vec<PowerPiece>,
    out: &mut Pieces,
) -> Result<(), OverLimit> {
    let goal = SEARCH_GOAL * tol;
    let end = span.parts.len() as f64;
    let offset = if span.turn == 0.0 {
        0.0
    } else {
        OFFSET_SHARE * goal
    };
    let spread_goal = goal + offset;
    // The span's start: the first line's vertex there (on the curve) and source position.
    let (start, mut from) = span.point_normal(segs, span.position(0.0));
    let anchors = [start, span.point_normal(segs, span.position(end)).0];
    let vertex = |b: Position| {
        let d = if b.sigma >= end { 0.0 } else { offset };
        span.vertex(segs, &anchors, b, d)
    };
    let mut line_from = |a: f64, va: Point, b: f64, vb: Point| {
        let line = Line::new(va, vb);
        let found = match span.single_piece(a, b) {
            Some((p, t0, t1)) => lines::piece_deviation_and_spread(p, t0, t1, line),
            None => {
                source.clear();
                span.each_part(a, b, |p, t0, t1| p.push_pieces(segs, t0, t1, source));
                lines::line_deviation_and_spread(lines::over_own(source), line)
            }
        };
        (line, found)
    };
    // The error the search and the plan compare with the spread goal.
    let error = |found: &Option<(Deviation, f64)>| match found {
        Some((d, s)) if d.bound <= goal => *s,
        Some((d, s)) => s.max(d.bound / goal * spread_goal),
        None => f64::INFINITY,
    };
    // A line never ends a hair before a part's end: the sliver left over would be a piece too
    // short to evaluate reliably.
    let snap = |a: f64, b: f64| {
        let k = floor_index(b + 0.5) as f64;
        if (b - k).abs() < SAME_T && k > a {
            k.min(end)
        } else {
            b.min(end)
        }
    };
    let bulge_at = |a: Position| aimed_bulge(a.sigma == 0.0, goal, offset);
    let bulge_after = aimed_bulge(false, goal, offset);
    let guess = |a: Position, previous: Option<f64>| span.guess(segs, a, bulge_at(a), previous);
    let mut a = 0.0;
    let mut previous = None;
    // The current line's start: span position `a`, vertex `va` and source position `from`.
    let mut va = start.0;
    let mut plan: ArrayVec<(f64, Point, At), PLAN_AHEAD> = ArrayVec::new();
    let source_of = |a: f64, b: f64| {
        let mut pieces = Vec::new();
        span.each_part(a, b, |p, t0, t1| {
            pieces.push(segs[p.index].subsegment(t0, t1))
        });
        pieces
    };
    // The length of the first planned line after a miss, and how many misses in a row.
    let mut retry: Option<f64> = None;
    let mut retries = 0;
    while a < end {
        plan.clear();
        // (`h`: the last line's step in the parameter of the part where it ends.)
        let mut s = span.position(a);
        let mut h = previous.map(|h| h * (s.part.t1 - s.part.t0));
        // The next line's step, taken ahead with the current one's ([`Span::parameter_steps`]).
        let mut next = None;
        while !plan.is_full() && s.sigma < end {
            let b = match retry.filter(|_| s.sigma == a) {
                Some(step) => span.position(snap(s.sigma, s.sigma + step)),
                None => {
                    let step = next.take().unwrap_or_else(|| {
                        let (step, after) =
                            span.parameter_steps(segs, s, [bulge_at(s), bulge_after], h);
                        next = Some(after);
                        step
                    });
                    span.advance(s, step, |b| snap(s.sigma, b))
                }
            };
            let (vb, to) = vertex(b);
            plan.push((b.sigma, vb, to));
            h = Some(if b.index == s.index {
                b.t - s.t
            } else {
                // (A step taken ahead is one of the part left behind.)
                next = None;
                (b.sigma - s.sigma) * (b.part.t1 - b.part.t0)
            });
            s = b;
        }
        let mut missed = None;
        for &(b, vb, to) in &plan {
            let (line, found) = line_from(a, va, b, vb);
            match found {
                // (Within the spread goal, the bound is within the goal too: `error`.)
                Some((d, _)) if error(&found) <= spread_goal => {
                    out.push_one(Segment::Line(line), from, to, d)?;
                    (previous, a, va, from, retry, retries) = (Some(b - a), b, vb, to, None, 0);
                }
                _ => {
                    missed = Some((b - a, error(&found)));
                    break;
                }
            }
        }
        let Some((h, e)) = missed else {
            continue;
        };
        if let Some(&root) = RETRY_ROOTS.get(retries).filter(|_| e.is_finite()) {
            retries += 1;
            retry = Some(h * (aimed_bulge(false, goal, offset) / e * RETRY_SHARE).powf(root));
            continue;
        }
        retries = 0;
        retry = None;
        let (b, (mut line, mut found)) = search_end(
            a,
            end,
            guess(span.position(a), previous),
            spread_goal,
            |b| {
                let b = snap(a, b);
                let found = line_from(a, va, b, vertex(span.position(b)).0);
                (error(&found.1), found)
            },
        );
        let mut b = snap(a, b);
        let deviation = loop {
            match found {
                Some((d, _)) if d.bound <= tol => break d,
                _ if b - a < SAME_T => {
                    // No line this short has a closed form: one line to the span's end,
                    // measured as it is (and reported if over the tolerance).
                    b = end;
                    line = Line::new(va, vertex(span.position(b)).0);
                    let out = [Segment::Line(line)];
                    break measure::hausdorff_within(&source_of(a, b), &out, CERT_SLACK * tol, tol);
                }
                _ => {
                    b = snap(a, a + 0.8 * (b - a));
                    (line, found) = line_from(a, va, b, vertex(span.position(b)).0);
                }
            }
        };
        let to = span.at(b);
        out.push_one(Segment::Line(line), from, to, deviation)?;
        (previous, a, va, from) = (Some(b - a), b, line.p1, to);
    }
    Ok(())
}

/// The most lines [`expected_lines`] promises for one contour.
const MAX_EXPECTED: usize = 1 << 16;

/// About how many lines the parts need, for sizing the output: over each part, its parameter
/// length over the step the curvature at its middle predicts for a line that bulges by `bulge`
/// (as [`Span::guess`]).
fn expected_lines(segs: &[Segment], parts: &[Part], bulge: f64) -> usize {
    let lines: f64 = parts
        .iter()
        .map(|p| {
            let lines = (p.t1 - p.t0) / p.bulge_step(segs, 0.5 * (p.t0 + p.t1), bulge);
            if lines.is_finite() {
                lines
            } else {
                0.0
            }
        })
        .sum();
    // (A hint: capped, so a curve with a near-cusp at a part's middle cannot claim much.)
    (lines.ceil() as usize).min(MAX_EXPECTED)
}

/// Fit a contour with lines, the error spread to both sides of its curves.
pub(super) fn lines(segs: &[Segment], tol: f64, out: &mut Pieces) -> Result<(), OverLimit> {
    let (parts, ranges) = spans(segs);
    let goal = SEARCH_GOAL * tol;
    let expected = expected_lines(segs, &parts, aimed_bulge(false, goal, OFFSET_SHARE * goal));
    // (The estimate was within 4% of the count on DejaVu Sans, under it for 28 of 15,985
    // contours.)
    let lines_in = segs
        .iter()
        .filter(|s| matches!(s, Segment::Line(_)))
        .count();
    out.reserve(expected + ranges.len() + lines_in);
    let mut source = Vec::new();
    let mut next = ranges
        .into_iter()
        .map(|(r, turn)| Span {
            parts: &parts[r],
            turn,
        })
        .peekable();
    for (i, s) in segs.iter().enumerate() {
        // (A curve of zero length has no span.)
        if let Segment::Line(l) = s {
            if l.p0 != l.p1 {
                out.push(super::exact(*s, i))?;
            }
            continue;
        }
        while let Some(span) = next.next_if(|sp| sp.parts[0].index == i) {
            fit_span(segs, &span, tol, &mut source, out)?;
        }
    }
    Ok(())
}

/// A whole circle as the regular n-gon with its error split evenly inside and outside (module
/// docs); `at` maps a fraction of the turn to the source position.
pub(super) fn circle(
    arc: &CircularArc,
    tol: f64,
    at: impl Fn(f64) -> At,
    out: &mut Pieces,
) -> Result<(), OverLimit> {
    // The error is exact: aim at the tolerance itself, less the rounding allowance below.
    let allowance = 1e-12 * (arc.center.to_vec2().hypot() + 2.0 * arc.radius + tol);
    // (On a huge circle at a tiny tolerance the allowance could exceed the tolerance; the bound
    // is then reported over it, as it is.)
    let (r, e) = (arc.radius, (tol - allowance).max(0.5 * tol));
    let n = if e >= r {
        3.0
    } else {
        (PI / ((r - e) / (r + e)).acos() - 1e-12).ceil().max(3.0)
    };
    out.room(n.min(usize::MAX as f64) as usize)?;
    let n = n as usize;
    out.reserve(n);
    let big = 2.0 * r / (1.0 + (PI / n as f64).cos());
    let vertex = |k: usize| {
        let a = arc.start_angle + arc.sweep * k as f64 / n as f64;
        arc.center + big * Vec2::from_angle(a)
    };
    // Exact, with an allowance for the rounding of the trigonometry.
    let error = (big - r).abs() + allowance;
    for k in 0..n {
        // The last line ends exactly where the first starts.
        let (p, q) = (vertex(k), vertex((k + 1) % n));
        out.push_one(
            Segment::Line(Line::new(p, q)),
            at(k as f64 / n as f64),
            at((k + 1) as f64 / n as f64),
            Deviation {
                bound: error,
                sampled: (big - r).abs(),
                at: [p.x, p.y],
            },
        )?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn aimed_bulge_solves_its_equation() {
        // The derivation in `aimed_bulge`: from a vertex on the curve, the largest s with
        // max over u of (4s·u(1 − u) − d·u) = g, checked by dense sampling of u [derived]; between
        // two offset vertices the bulge is g + d.
        let window = 1.0 - 0.5 * SEARCH_WINDOW;
        for (g, d) in [(1.0, 0.95), (0.01, 0.0095), (1.0, 0.0)] {
            let s = aimed_bulge(true, g, d) / window;
            let peak = (0..=100_000)
                .map(|i| {
                    let u = f64::from(i) / 100_000.0;
                    4.0 * s * u * (1.0 - u) - d * u
                })
                .fold(f64::NEG_INFINITY, f64::max);
            assert!((peak - g).abs() < 1e-8 * g.max(1.0), "g {g}, d {d}: {peak}");
            assert!((aimed_bulge(false, g, d) / window - (g + d)).abs() < 1e-15);
        }
    }
}
