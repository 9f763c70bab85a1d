//! Fitting: one entry point, [`fit`], that replaces a contour by the primitives a machine accepts
//! (lines, quadratics, cubics or circular arcs) within a tolerance, and certifies every piece.
//!
//! Lines (`spread.rs`) spread the error to both sides of each curve: vertices sit just outside
//! the curve, except at corners, straight lines, inflections and x/y extrema, where they stay on
//! it; a contour that is one whole circle becomes the regular polygon with its error split
//! evenly inside and outside. The other targets work as follows.
//!
//! The contour is first read as a sequence of *runs*: consecutive circular conics around the
//! same centre merge into one circular arc (up to a full turn), every other segment is a run of
//! its own. Circular runs are split into the fewest equal pieces that the target's closed-form
//! error allows (`circle.rs`, shared REFERENCES §3); other runs are split greedily, each piece as
//! long as the target's approximation stays within the tolerance. Straight lines stay lines in
//! every target (every machine moves straight), quadratics stay quadratics for the quadratic
//! target and become exact cubics (degree elevation) for the cubic one.
//!
//! For the cubic target, consecutive cubic pieces that meet smoothly are then merged into one
//! cubic wherever it is certified within the tolerance (`merge.rs`: a fit towards the smallest
//! largest distance, certified through the fit's own nearest-point parameters).
//!
//! Every approximated piece is certified against the exact source interval it replaces: by a
//! closed form where one exists (one line over a curve that is a graph over it, `lines.rs`; a
//! quadratic over a polynomial piece by their parametric distance, `parametric.rs`), else
//! measured with [`crate::measure::hausdorff`]; a piece whose certified bound exceeds the
//! tolerance is made shorter. The reported deviation is therefore a certified bound, never an
//! estimate. The greedy searches (`search_end`) aim each piece within a few percent below the
//! tolerance, starting from a guess (the local curvature for lines, the previous piece
//! otherwise), so most pieces cost one or two evaluations.
//!
//! [`fit_limited`] stops as soon as the output passes a segment limit (a tolerance far below a
//! machine's resolution on a large drawing multiplies the output without bound), before the
//! pieces past the limit are built.

mod arcs;
mod circle;
mod cubic;
mod lines;
mod merge;
mod parametric;
mod power;
mod quadratic;
mod spread;

use std::f64::consts::TAU;

use arrayvec::ArrayVec;
use kurbo::{ParamCurve, Point};
use serde::Serialize;

use crate::geom::{CircularArc, Contour, Segment, Tolerance};
use crate::measure::{self, Deviation};

/// The primitive a machine accepts.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Target {
    Lines,
    Quadratic,
    Cubic,
    Arcs,
}

impl Target {
    pub fn name(self) -> &'static str {
        match self {
            Target::Lines => "lines",
            Target::Quadratic => "quadratic",
            Target::Cubic => "cubic",
            Target::Arcs => "arcs",
        }
    }
}

/// A position along a source contour: segment index and parameter.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct At {
    pub segment: usize,
    pub t: f64,
}

/// The output of one piece while fitting: one segment, or two for a biarc (kept inline: a fit
/// makes one piece per output segment or two, and a heap allocation each would cost more than
/// the piece).
type Out = ArrayVec<Segment, 2>;

/// One segment as an [`Out`].
fn one(s: Segment) -> Out {
    let mut out = Out::new();
    out.push(s);
    out
}

/// One piece while fitting: its output and the source interval it replaces, with its certified
/// deviation.
#[derive(Clone, Debug, PartialEq)]
struct Draft {
    out: Out,
    from: At,
    to: At,
    deviation: Deviation,
}

/// One piece of a fitted contour: how many of its output segments the piece holds (pieces
/// follow each other along the contour), the source interval they replace, and their
/// certified deviation from it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Piece {
    pub segments: usize,
    pub from: At,
    pub to: At,
    pub deviation: Deviation,
}

/// A fitted contour: the output contour, its pieces and the worst certified deviation.
#[derive(Clone, Debug, PartialEq)]
pub struct Fitted {
    pub contour: Contour,
    pub pieces: Vec<Piece>,
    pub deviation: Deviation,
}

impl Fitted {
    /// Every piece with its output segments.
    pub fn piece_segments(&self) -> impl Iterator<Item = (&Piece, &[Segment])> {
        with_segments(&self.pieces, &self.contour.segments)
    }
}

/// Every piece with its output segments, `segments` holding them in the pieces' order.
fn with_segments<'a>(
    pieces: &'a [Piece],
    segments: &'a [Segment],
) -> impl Iterator<Item = (&'a Piece, &'a [Segment])> {
    let mut start = 0;
    pieces.iter().map(move |p| {
        let end = start + p.segments;
        let out = segments.get(start..end).unwrap_or_default();
        start = end;
        (p, out)
    })
}

/// Slack of the certification relative to the tolerance: a certified bound is at most this much
/// above a distance actually attained.
const CERT_SLACK: f64 = 1e-3;

/// Greedy searches aim a little below the tolerance so the certified bound fits under it.
const SEARCH_GOAL: f64 = 0.995;

/// The output of a fit passed its segment limit; fitting stopped there.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct OverLimit {
    pub limit: usize,
}

impl std::fmt::Display for OverLimit {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "the fit passed its limit of {} segments", self.limit)
    }
}

impl std::error::Error for OverLimit {}

/// The pieces of a fit so far with their output segments, and the limit on the segments.
struct Pieces {
    segments: Vec<Segment>,
    pieces: Vec<Piece>,
    limit: usize,
}

impl Pieces {
    /// Fails if `n` more segments would pass the limit.
    fn room(&self, n: usize) -> Result<(), OverLimit> {
        if self.segments.len().saturating_add(n) > self.limit {
            Err(OverLimit { limit: self.limit })
        } else {
            Ok(())
        }
    }

    /// Room for about `n` more pieces of one segment each (a capacity hint, within the limit).
    fn reserve(&mut self, n: usize) {
        let n = n.min(self.limit.saturating_sub(self.segments.len()));
        self.segments.reserve(n);
        self.pieces.reserve(n);
    }

    /// A piece of one segment (as [`Pieces::push`], without building a [`Draft`]).
    fn push_one(
        &mut self,
        segment: Segment,
        from: At,
        to: At,
        deviation: Deviation,
    ) -> Result<(), OverLimit> {
        self.room(1)?;
        self.segments.push(segment);
        self.pieces.push(Piece {
            segments: 1,
            from,
            to,
            deviation,
        });
        Ok(())
    }

    fn push(&mut self, p: Draft) -> Result<(), OverLimit> {
        self.room(p.out.len())?;
        self.segments.extend(p.out.iter().copied());
        self.pieces.push(Piece {
            segments: p.out.len(),
            from: p.from,
            to: p.to,
            deviation: p.deviation,
        });
        Ok(())
    }
}

/// Fit a contour to the target within the tolerance.
pub fn fit(contour: &Contour, target: Target, tol: Tolerance) -> Fitted {
    match fit_limited(contour, target, tol, usize::MAX) {
        Ok(f) => f,
        Err(e) => unreachable!("{e}: no output can hold usize::MAX segments"),
    }
}

/// Fit a contour to the target within the tolerance, with at most `limit` output segments.
pub fn fit_limited(
    contour: &Contour,
    target: Target,
    tol: Tolerance,
    limit: usize,
) -> Result<Fitted, OverLimit> {
    let tol = tol.mm();
    let mut out = Pieces {
        segments: Vec::new(),
        pieces: Vec::new(),
        limit,
    };
    if target != Target::Lines {
        // (Every segment of length gives at least one piece, save for merged cubics; lines
        // size their output themselves.)
        out.reserve(contour.segments.len());
    }
    // (Lines need the runs only to find a contour that is one whole circle, which starts on it.)
    let runs = if target != Target::Lines || contour.segments.first().and_then(circle_of).is_some()
    {
        runs(&contour.segments)
    } else {
        Vec::new()
    };
    match (target, runs.as_slice()) {
        (Target::Lines, [Run::Circle { arc, parts }])
            if contour.closed && arc.sweep.abs() >= TAU - 1e-9 =>
        {
            spread::circle(arc, tol, |f| run_position(parts, f), &mut out)?
        }
        (Target::Lines, _) => spread::lines(&contour.segments, tol, &mut out)?,
        _ => {
            for run in runs {
                match run {
                    Run::Circle { arc, parts } => {
                        circular_run(&arc, &parts, target, tol, &mut out)?
                    }
                    Run::Single(i) => segment_run(&contour.segments[i], i, target, tol, &mut out)?,
                }
            }
        }
    }
    if out.segments.capacity() > 2 * out.segments.len() + 16 {
        // (A capacity hint that was far too generous.)
        out.segments.shrink_to_fit();
        out.pieces.shrink_to_fit();
    }
    let (segments, pieces) = if target == Target::Cubic {
        merge::merge_smooth(
            &contour.segments,
            &out.segments,
            &out.pieces,
            SEARCH_GOAL * tol,
        )
    } else {
        (out.segments, out.pieces)
    };
    let start = contour.start().unwrap_or(Point::ORIGIN);
    let deviation = pieces
        .iter()
        .map(|p| p.deviation)
        .fold(Deviation::zero(start), Deviation::max);
    Ok(Fitted {
        contour: Contour::new(segments, contour.closed, contour.source.clone()),
        pieces,
        deviation,
    })
}

/// A run of the source: a merged circular arc or one segment.
enum Run {
    Circle { arc: CircularArc, parts: Vec<Part> },
    Single(usize),
}

/// One source segment inside a circular run: its index, and its sweep (signed, radians).
#[derive(Clone, Copy)]
struct Part {
    index: usize,
    sweep: f64,
    conic: bool,
}

/// The circle a segment lies on, if it is an exact circular arc.
fn circle_of(s: &Segment) -> Option<CircularArc> {
    match s {
        Segment::Arc(a) => Some(*a),
        Segment::Conic(c) => {
            let f = c.as_circle(1e-9)?;
            let v = c.start() - f.center;
            Some(CircularArc {
                center: f.center,
                radius: f.radius,
                start_angle: v.atan2(),
                sweep: f.sweep,
            })
        }
        _ => None,
    }
}

fn same_circle(a: &CircularArc, b: &CircularArc) -> bool {
    let scale = a.radius.max(b.radius);
    (a.center - b.center).hypot() <= 1e-9 * scale
        && (a.radius - b.radius).abs() <= 1e-9 * scale
        && a.sweep.signum() == b.sweep.signum()
}

fn runs(segs: &[Segment]) -> Vec<Run> {
    let mut out = Vec::with_capacity(segs.len());
    let mut i = 0;
    while i < segs.len() {
        let Some(first) = circle_of(&segs[i]) else {
            out.push(Run::Single(i));
            i += 1;
            continue;
        };
        let mut arc = first;
        let mut parts = vec![Part {
            index: i,
            sweep: first.sweep,
            conic: matches!(segs[i], Segment::Conic(_)),
        }];
        let mut j = i + 1;
        while j < segs.len() {
            match circle_of(&segs[j]) {
                Some(next)
                    if same_circle(&arc, &next) && (arc.sweep + next.sweep).abs() <= TAU + 1e-9 =>
                {
                    arc.sweep += next.sweep;
                    parts.push(Part {
                        index: j,
                        sweep: next.sweep,
                        conic: matches!(segs[j], Segment::Conic(_)),
                    });
                    j += 1;
                }
                _ => break,
            }
        }
        arc.sweep = arc.sweep.clamp(-TAU, TAU);
        out.push(Run::Circle { arc, parts });
        i = j;
    }
    out
}

/// Map a fraction of a circular run's sweep back to a source segment and its parameter. For a
/// circular conic of sweep θ the parameter of the point at angle φ from its start is
/// t = (tan((φ − θ/2)/2) / tan(θ/4) + 1) / 2 (shared REFERENCES §2, derived from the standard
/// form with w = cos(θ/2)).
fn run_position(parts: &[Part], frac: f64) -> At {
    let total: f64 = parts.iter().map(|p| p.sweep.abs()).sum();
    let mut phi = frac * total;
    for p in parts {
        let th = p.sweep.abs();
        if phi <= th || p.index == parts[parts.len() - 1].index {
            let local = phi.clamp(0.0, th);
            let t = if p.conic && th > 0.0 {
                0.5 * (((local - 0.5 * th) * 0.5).tan() / (0.25 * th).tan() + 1.0)
            } else if th > 0.0 {
                local / th
            } else {
                0.0
            };
            return At {
                segment: p.index,
                t: t.clamp(0.0, 1.0),
            };
        }
        phi -= th;
    }
    At { segment: 0, t: 0.0 }
}

/// A certified deviation of a piece without a general measurement, where one exists: one line
/// over a piece that is a graph over it (exact, `lines.rs`), one quadratic over a polynomial
/// piece (the parametric distance, `parametric.rs`).
fn closed_form(source: &Segment, out: &[Segment], tol: f64) -> Option<Deviation> {
    match out {
        [Segment::Line(l)] => lines::line_deviation(std::slice::from_ref(source), *l),
        [Segment::Quad(q)] => parametric::quad_deviation(source, q, CERT_SLACK * tol),
        _ => None,
    }
}

/// The certified deviation of a piece from the exact source it replaces: its closed form
/// (`closed`, from [`closed_form`]) when that puts it within the tolerance, else the general
/// measurement.
fn certified(source: &Segment, out: &[Segment], closed: Option<Deviation>, tol: f64) -> Deviation {
    closed.filter(|d| d.bound <= tol).unwrap_or_else(|| {
        measure::hausdorff_within(std::slice::from_ref(source), out, CERT_SLACK * tol, tol)
    })
}

/// An exact piece (identity or degree elevation): no approximation, nothing to measure.
fn exact(out: Segment, index: usize) -> Draft {
    Draft {
        deviation: Deviation::zero(out.start()),
        out: one(out),
        from: At {
            segment: index,
            t: 0.0,
        },
        to: At {
            segment: index,
            t: 1.0,
        },
    }
}

fn circular_run(
    arc: &CircularArc,
    parts: &[Part],
    target: Target,
    tol: f64,
    out: &mut Pieces,
) -> Result<(), OverLimit> {
    if target == Target::Arcs {
        let whole = Segment::Arc(*arc);
        let from = run_position(parts, 0.0);
        let to = run_position(parts, 1.0);
        return out.push(Draft {
            out: one(whole),
            from,
            to,
            deviation: Deviation::zero(whole.start()),
        });
    }
    let max_piece = circle::max_piece_sweep(target, arc.radius, tol);
    let fewest = (arc.sweep.abs() / max_piece - 1e-12).ceil().max(1.0);
    // Checked before any piece is built (the count can be astronomical for a huge radius).
    out.room(fewest.min(usize::MAX as f64) as usize)?;
    let fewest = fewest as usize;
    // The closed form gives the fewest pieces; certification has the last word. A few more
    // pieces are tried only if a certified bound comes out above the tolerance.
    for n in fewest..fewest + 4 {
        let pieces: Vec<Draft> = (0..n)
            .map(|i| {
                let (f0, f1) = (i as f64 / n as f64, (i + 1) as f64 / n as f64);
                let sub = arc.subsegment(f0..f1);
                let out = circle::approximate(target, &sub);
                let closed = circle::deviation(target, &sub, &out);
                Draft {
                    deviation: certified(&Segment::Arc(sub), &out, closed, tol),
                    out,
                    from: run_position(parts, f0),
                    to: run_position(parts, f1),
                }
            })
            .collect();
        if pieces.iter().all(|p| p.deviation.bound <= tol) {
            return pieces.into_iter().try_for_each(|p| out.push(p));
        }
    }
    // Still over: fall back to the general greedy method on the source segments themselves.
    for p in parts {
        if let Some(s) = circle_of_part(arc, parts, p) {
            greedy(&s, p.index, target, tol, out)?;
        }
    }
    Ok(())
}

/// The exact sub-arc of a run that one part covers.
fn circle_of_part(arc: &CircularArc, parts: &[Part], part: &Part) -> Option<Segment> {
    let total: f64 = parts.iter().map(|p| p.sweep.abs()).sum();
    if total == 0.0 {
        return None;
    }
    let before: f64 = parts
        .iter()
        .take_while(|p| p.index != part.index)
        .map(|p| p.sweep.abs())
        .sum();
    let (f0, f1) = (before / total, (before + part.sweep.abs()) / total);
    Some(Segment::Arc(arc.subsegment(f0..f1)))
}

fn segment_run(
    s: &Segment,
    index: usize,
    target: Target,
    tol: f64,
    out: &mut Pieces,
) -> Result<(), OverLimit> {
    if s.speed_bound() == 0.0 {
        // A segment of zero length adds nothing to the drawing: it is its own start point.
        return Ok(());
    }
    match (target, s) {
        (_, Segment::Line(_)) => out.push(exact(*s, index)),
        (Target::Quadratic, Segment::Quad(_)) | (Target::Cubic, Segment::Cubic(_)) => {
            out.push(exact(*s, index))
        }
        (Target::Cubic, Segment::Quad(q)) => out.push(exact(Segment::Cubic(q.raise()), index)),
        _ => greedy(s, index, target, tol, out),
    }
}

/// The target's approximation of one source piece.
fn approximate(target: Target, s: &Segment) -> Out {
    match target {
        Target::Lines => one(Segment::Line(kurbo::Line::new(s.start(), s.end()))),
        Target::Quadratic => quadratic::approximate(s),
        Target::Cubic => cubic::approximate(s),
        Target::Arcs => arcs::biarc(s),
    }
}

/// Split one segment greedily: each piece as long as the approximation stays within tolerance.
/// A piece whose closed form already puts it within the tolerance is kept as the search left
/// it; any other is certified by the general measurement and shortened until it fits.
fn greedy(
    s: &Segment,
    index: usize,
    target: Target,
    tol: f64,
    out: &mut Pieces,
) -> Result<(), OverLimit> {
    let goal = SEARCH_GOAL * tol;
    let at = |t: f64| At { segment: index, t };
    // The piece over [t0, t1]: the exact source, its approximation and its closed form if any.
    let attempt = |t0: f64, t1: f64| {
        let sub = s.subsegment(t0, t1);
        let approx = approximate(target, &sub);
        let closed = closed_form(&sub, &approx, tol);
        (sub, approx, closed)
    };
    let mut t0 = 0.0;
    let mut step: f64 = 1.0;
    while t0 < 1.0 {
        let (mut t1, (mut sub, mut approx, mut closed)) = search_end(t0, 1.0, step, goal, |t1| {
            let (sub, approx, closed) = attempt(t0, t1);
            let e = closed.map_or_else(|| measure::estimate(&[sub], &approx, 16), |d| d.bound);
            (e, (sub, approx, closed))
        });
        let piece = loop {
            let deviation = certified(&sub, &approx, closed, tol);
            // Shorten until certified; a piece this short that still fails is kept and its
            // bound reported as it is (the contour is then flagged over tolerance).
            if deviation.bound <= tol || t1 - t0 < 1e-9 {
                break Draft {
                    out: approx,
                    from: at(t0),
                    to: at(t1),
                    deviation,
                };
            }
            t1 = t0 + 0.8 * (t1 - t0);
            (sub, approx, closed) = attempt(t0, t1);
        };
        step = t1 - t0;
        t0 = t1;
        out.push(piece)?;
    }
    Ok(())
}

/// A search settles for any length whose error is within this share below the goal.
const SEARCH_WINDOW: f64 = 0.03;

/// The largest t1 in (t0, end] whose error is within the goal, assuming the error grows with the
/// piece roughly as a power of its length (error ∝ hᵖ, p = 2 for chords, higher for curves): a
/// safeguarded secant on log(error) against log(h) inside a bracket [feasible, infeasible],
/// starting from `guess` (the previous piece's length, say) and stopping within
/// [`SEARCH_WINDOW`] below the goal. `error` returns the error of the piece ending at t1 and
/// what the caller keeps of that evaluation; the search returns the end it settled on with
/// that value (the last piece tried when none was within the goal).
fn search_end<T>(
    t0: f64,
    end: f64,
    guess: f64,
    goal: f64,
    mut error: impl FnMut(f64) -> (f64, T),
) -> (f64, T) {
    let whole = end - t0;
    let target = (1.0 - 0.5 * SEARCH_WINDOW) * goal;
    // The bracket: the longest piece within the goal so far (0 when none), the shortest over it.
    let (mut h_lo, mut e_lo) = (0.0, 0.0);
    let (mut h_hi, mut e_hi) = (f64::INFINITY, f64::INFINITY);
    let mut h = guess.clamp(1e-9_f64.min(whole), whole);
    let (mut e, value) = error(t0 + h);
    // What the search returns: the longest piece within the goal, else the last one tried.
    let mut best = (t0 + h, value, e <= goal);
    for _ in 0..32 {
        if e <= goal {
            (h_lo, e_lo) = (h, e);
            if e >= (1.0 - SEARCH_WINDOW) * goal || h >= whole {
                break;
            }
        } else {
            (h_hi, e_hi) = (h, e);
        }
        let next = if e_lo > 0.0 && e_hi.is_finite() && e_hi > e_lo {
            let p = (e_hi / e_lo).ln() / (h_hi / h_lo).ln();
            h_lo * (target / e_lo).powf(1.0 / p.max(0.5))
        } else if e_lo > 0.0 {
            h_lo * (target / e_lo).sqrt().min(4.0)
        } else if h_lo > 0.0 {
            2.0 * h_lo
        } else if e_hi.is_finite() {
            h_hi * (target / e_hi).sqrt().clamp(0.05, 0.9)
        } else {
            0.5 * h
        };
        h = if h_hi.is_finite() {
            // A bracket this narrow pins the length within half the window (the error grows at
            // least as fast as the length): the best within the goal is close enough.
            if h_hi - h_lo <= 0.5 * SEARCH_WINDOW * h_lo || h_hi - h_lo <= 1e-12 {
                break;
            }
            let margin = 0.01 * (h_hi - h_lo);
            next.clamp(h_lo + margin, h_hi - margin)
        } else {
            next.min(whole)
        };
        let (e_next, value) = error(t0 + h);
        if e_next <= goal || !best.2 {
            best = (t0 + h, value, e_next <= goal);
        }
        e = e_next;
    }
    (best.0, best.1)
}

#[cfg(test)]
mod tests;
