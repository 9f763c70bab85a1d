//! The convert pipeline as a library: fit every contour of an outline to a target, account for
//! the writers' rounding, and build the report.
//!
//! Error budget. The written file is what the machine follows, so the deviation that counts is
//! between the exact source S and the geometry R read back from the written numbers. With F the
//! fitted contour, the Hausdorff distance obeys the triangle inequality,
//! d_H(S, R) ≤ d_H(S, F) + d_H(F, R), and both terms are certified: the first while fitting, the
//! second against each writer's read-back geometry (`write::svg::svg_as_read`,
//! `write::gcode::gcode_as_read`), as follows. Fitting aims at 95% of the
//! tolerance; numbers are written with enough decimals that rounding (at most √2/2·10⁻ᵈ per point)
//! stays near 1% of it. A contour whose sum still exceeds the tolerance is refitted tighter once;
//! whatever remains is reported, never hidden.
//!
//! Rounding is bounded segment by segment when R pairs up with F (the same number of
//! segments): the distance from a point to a set is at most its distance to any subset,
//! so d_H(F, R) ≤ maxᵢ d_H(Fᵢ, Rᵢ). For a line or Bézier pair the term is closed form: every
//! point B(t) = Σ bₖ(t)·Pₖ is a convex combination of the control points (the Bernstein
//! polynomials are non-negative and sum to 1; Farin, *Curves and Surfaces for CAGD*, 5th ed.,
//! §4.3), so |Fᵢ(t) − Rᵢ(t)| ≤ maxₖ |Pₖ − P′ₖ| at every t, which bounds both directed
//! distances. An arc is paired piece by piece as the writers split it (at most 90° each), and a
//! pair of arc pieces is bounded the same way through their rational form (conics), plus a
//! term for the change of weight (`conic_moved`); where that bound is above the 1% of the
//! tolerance the rounding is written to stay near, or the kinds differ, the pair is measured.
//! Where R does not pair up (a writer dropped a segment), rounding is measured window by
//! window: the directed distance from a run of F to the part of R written from the same run
//! (with a margin of neighbours) bounds the directed distance to all of R from above, and the
//! maximum over runs (both ways) is still a certified bound on d_H(F, R), found in time linear
//! in the contour's length.
//!
//! Limits. A contour of more than [`MAX_SEGMENTS_PER_CONTOUR`] segments is refused before any
//! work; the output of a job may hold at most [`JobOptions::max_segments`] segments (default
//! [`DEFAULT_MAX_SEGMENTS`]): a tolerance far below what the machine resolves can multiply the
//! output without bound, so fitting stops as soon as the count passes the limit and the job
//! fails with [`JobError::TooManySegments`].

use std::borrow::Cow;
use std::fmt;
use std::sync::atomic::{AtomicUsize, Ordering};

use kurbo::Point;
use rayon::prelude::*;
use serde::Serialize;

use crate::fit::{fit_limited, OverLimit, Target};
use crate::geom::{
    CircularArc, Conic, Contour, Outline, Segment, SegmentCounts, SkipKind, Skipped, Source,
    Tolerance,
};
use crate::measure;
use crate::write;

/// A written format whose rounding enters the error budget.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Format {
    Svg,
    Gcode,
}

/// Decimals for written numbers: the fewest with √2/2·10⁻ᵈ ≤ tolerance/100, at least 4
/// (0.1 µm, finer than any machine; common practice, no source), at most the writers'
/// `MAX_DECIMALS` (a nanometre). Below about 0.1 µm of tolerance the rounding takes a larger
/// share of the budget, and the fit is tightened to leave room for it.
pub fn decimals_for(tol: Tolerance) -> u32 {
    let d = (std::f64::consts::FRAC_1_SQRT_2 * 100.0 / tol.mm())
        .log10()
        .ceil();
    (d as i64).clamp(4, i64::from(write::MAX_DECIMALS)) as u32
}

/// The report for one contour.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ContourReport {
    pub source: Source,
    pub closed: bool,
    pub segments_in: SegmentCounts,
    pub segments_out: SegmentCounts,
    /// Certified bound on the deviation of the written contour from the source.
    pub max_deviation_mm: f64,
    /// Of which: the fit's certified deviation.
    pub fit_deviation_mm: f64,
    /// Of which: the writers' rounding, certified.
    pub rounding_mm: f64,
    /// The worst point found (mm, y down).
    pub at: [f64; 2],
    pub within_tolerance: bool,
}

/// The result of fitting a whole outline: fitted contours and their reports, in input order.
#[derive(Clone, Debug)]
pub struct FittedOutline {
    pub target: Target,
    pub contours: Vec<Contour>,
    pub reports: Vec<ContourReport>,
}

impl FittedOutline {
    /// The worst contour's report.
    pub fn worst(&self) -> Option<&ContourReport> {
        self.reports
            .iter()
            .max_by(|a, b| a.max_deviation_mm.total_cmp(&b.max_deviation_mm))
    }

    pub fn max_deviation_mm(&self) -> f64 {
        self.worst().map_or(0.0, |r| r.max_deviation_mm)
    }

    pub fn within_tolerance(&self) -> bool {
        self.reports.iter().all(|r| r.within_tolerance)
    }
}

/// Share of the tolerance the fit aims at; the rest is left for the writers' rounding.
const FIT_SHARE: f64 = 0.95;

/// The share of the tolerance the rounding is written to stay near (`decimals_for`): an arc
/// piece's closed-form rounding bound above it is measured instead.
const ROUNDING_SHARE: f64 = 0.01;

/// The most segments one input contour may have (a limit against runaway inputs: no lettering
/// or artwork contour comes near it).
pub const MAX_SEGMENTS_PER_CONTOUR: usize = 1_000_000;

/// The default limit on the segments a whole job may write (`--max-segments` raises it).
pub const DEFAULT_MAX_SEGMENTS: usize = 5_000_000;

/// Segments per window when measuring the rounding of a long contour, and the margin of
/// neighbouring read-back segments searched on each side.
const ROUNDING_WINDOW: usize = 64;
const ROUNDING_MARGIN: usize = 16;

/// Why a job did not finish.
#[derive(Clone, Debug, PartialEq)]
pub enum JobError {
    /// A writer refused a contour.
    Write(write::WriteError),
    /// An input contour is longer than [`MAX_SEGMENTS_PER_CONTOUR`].
    ContourTooLong { source: Source, segments: usize },
    /// The output passed the job's segment limit; fitting stopped there.
    TooManySegments {
        limit: usize,
        /// Segments produced when fitting stopped (at least this many would be written).
        produced: usize,
        /// Contours fitted by then, of `total`.
        fitted: usize,
        total: usize,
    },
}

impl fmt::Display for JobError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            JobError::Write(e) => e.fmt(f),
            JobError::ContourTooLong { source, segments } => write!(
                f,
                "{source}: {segments} segments in one contour: over the limit of \
                 {MAX_SEGMENTS_PER_CONTOUR} segments per contour"
            ),
            JobError::TooManySegments {
                limit,
                produced,
                fitted,
                total,
            } => write!(
                f,
                "the output passed the limit of {limit} segments (--max-segments): \
                 at least {produced} segments after fitting {fitted} of {total} contours; stopped. \
                 Use a coarser --tolerance, or raise --max-segments"
            ),
        }
    }
}

impl std::error::Error for JobError {}

impl From<write::WriteError> for JobError {
    fn from(e: write::WriteError) -> JobError {
        JobError::Write(e)
    }
}

/// A certified bound on d_H(F, R) pair by pair (see the module docs), with F's arcs in the
/// pieces the writers write; `None` when R does not pair up with them. An arc term whose
/// closed form is above `measure_above` is measured instead (that bound can be loose). (No
/// writer holds conics: the caller fits them first.)
fn paired_hausdorff(f: &[Segment], r: &[Segment], slack: f64, measure_above: f64) -> Option<f64> {
    let pieces: Cow<[Segment]> = if f.iter().any(|s| matches!(s, Segment::Arc(_))) {
        let mut v = Vec::with_capacity(r.len());
        for s in f {
            match s {
                Segment::Arc(a) => v.extend(write::arc_pieces(a).map(Segment::Arc)),
                s => v.push(*s),
            }
        }
        Cow::Owned(v)
    } else {
        Cow::Borrowed(f)
    };
    if pieces.len() != r.len() {
        return None;
    }
    let measured = |a: &Segment, b: &Segment| {
        measure::hausdorff(std::slice::from_ref(a), std::slice::from_ref(b), slack).bound
    };
    let worst = pieces.iter().zip(r).fold(0.0, |worst: f64, (a, b)| {
        let d = match (a, b) {
            (Segment::Line(a), Segment::Line(b)) => moved(&[a.p0, a.p1], &[b.p0, b.p1]),
            (Segment::Quad(a), Segment::Quad(b)) => moved(&[a.p0, a.p1, a.p2], &[b.p0, b.p1, b.p2]),
            (Segment::Cubic(a), Segment::Cubic(b)) => {
                moved(&[a.p0, a.p1, a.p2, a.p3], &[b.p0, b.p1, b.p2, b.p3])
            }
            (Segment::Arc(p), Segment::Arc(q)) => arc_moved(p, q)
                .filter(|&d| d <= measure_above)
                .unwrap_or_else(|| measured(a, b)),
            // (A piece the writer turned into another kind, say a tiny arc into a line.)
            _ => measured(a, b),
        };
        worst.max(d)
    });
    Some(worst)
}

/// The largest distance between corresponding control points, rounded up: each difference and
/// `hypot` are correctly rounded or within an ulp, so 8 ε of relative margin covers them.
fn moved(a: &[Point], b: &[Point]) -> f64 {
    let d = a
        .iter()
        .zip(b)
        .map(|(p, q)| (*p - *q).hypot())
        .fold(0.0, f64::max);
    d * (1.0 + 8.0 * f64::EPSILON)
}

/// A bound on the distance between two conics compared at equal parameter, F with control
/// points P and middle weight w, R with Q and w′ (standard form, end weights 1). With R̃ the
/// conic of Q and w, F(t) − R̃(t) = Σ βₖ(t)·(Pₖ − Qₖ) with the same rational Bernstein weights
/// βₖ ≥ 0, Σ βₖ = 1 (positive weights), so |F(t) − R̃(t)| ≤ maxₖ |Pₖ − Qₖ|. And a conic of
/// weight w is C(t) = M(t) + λ(t)·(Q₁ − M(t)), M(t) on the chord Q₀Q₂,
/// λ = w·x/(1 + w·x), x = 2t(1 − t)/((1 − t)² + t²) ∈ [0, 1], so
/// |R̃(t) − R(t)| = |λ_w − λ_w′|·|Q₁ − M(t)| ≤ |w − w′|/((1 + w)(1 + w′))·max(|Q₁ − Q₀|, |Q₁ − Q₂|),
/// the difference of the λ being largest at x = 1 when w·w′ ≤ 1 [derived]. `None` for weights
/// above 1 (hyperbolas).
fn conic_moved(p: &Conic, q: &Conic) -> Option<f64> {
    let (w, v) = (p.weight(), q.weight());
    if w > 1.0 || v > 1.0 {
        return None;
    }
    let (a, b) = (p.points(), q.points());
    let legs = (b[1] - b[0]).hypot().max((b[1] - b[2]).hypot());
    Some(moved(&a, &b) + (w - v).abs() / ((1.0 + w) * (1.0 + v)) * legs)
}

/// [`conic_moved`] for two arc pieces of at most 90° (one conic each), plus an allowance for
/// the rounding in their conics' control points and in projecting them (a few ulps of the
/// coordinates involved; 450 ε here).
fn arc_moved(a: &CircularArc, b: &CircularArc) -> Option<f64> {
    let ([p], [q]) = (&a.to_conics()[..], &b.to_conics()[..]) else {
        return None;
    };
    let size = a.radius + b.radius + a.center.to_vec2().hypot() + b.center.to_vec2().hypot();
    Some(conic_moved(p, q)? + 1e-13 * size)
}

/// A certified bound on d_H(F, R), window by window (see the module docs).
fn windowed_hausdorff(f: &[Segment], r: &[Segment], slack: f64) -> f64 {
    if f.len() <= ROUNDING_WINDOW || r.is_empty() {
        return measure::hausdorff(f, r, slack).bound;
    }
    // R runs along F in the same order; its k-th segment was written near F's k·|F|/|R|-th.
    let directed = |a: &[Segment], b: &[Segment]| -> f64 {
        (0..a.len())
            .step_by(ROUNDING_WINDOW)
            .map(|i0| {
                let i1 = (i0 + ROUNDING_WINDOW).min(a.len());
                let scale = |i: usize| i * b.len() / a.len();
                let j0 = scale(i0).saturating_sub(ROUNDING_MARGIN);
                let j1 = (scale(i1) + ROUNDING_MARGIN).min(b.len());
                measure::directed(&a[i0..i1], &b[j0..j1], slack).bound
            })
            .fold(0.0, f64::max)
    };
    directed(f, r).max(directed(r, f))
}

/// The rounding deviation of a fitted contour for each format, certified.
fn rounding(fitted: &Contour, formats: &[Format], decimals: u32, tol: f64) -> f64 {
    formats
        .iter()
        .map(|f| {
            let read = match f {
                Format::Svg => write::svg::svg_as_read(fitted, decimals),
                Format::Gcode => write::gcode::gcode_as_read(fitted, decimals),
            };
            match read {
                Ok(r) => {
                    let (f, r, slack) = (&fitted.segments, &r.segments, 1e-3 * tol);
                    paired_hausdorff(f, r, slack, ROUNDING_SHARE * tol)
                        .unwrap_or_else(|| windowed_hausdorff(f, r, slack))
                }
                // A contour the format cannot hold is reported by the writer itself.
                Err(_) => 0.0,
            }
        })
        .fold(0.0, f64::max)
}

fn fit_one(
    c: &Contour,
    target: Target,
    tol: Tolerance,
    formats: &[Format],
    decimals: u32,
    limit: usize,
) -> Result<(Contour, ContourReport), OverLimit> {
    let t = tol.mm();
    let mut share = FIT_SHARE;
    loop {
        let budget = Tolerance::new((share * t).max(crate::geom::MIN_TOLERANCE_MM)).unwrap_or(tol);
        let f = fit_limited(c, target, budget, limit)?;
        let r = rounding(&f.contour, formats, decimals, t);
        let total = f.deviation.bound + r;
        if total <= t || share < 0.5 {
            let report = ContourReport {
                source: c.source.clone(),
                closed: c.closed,
                segments_in: SegmentCounts::of(&c.segments),
                segments_out: SegmentCounts::of(&f.contour.segments),
                max_deviation_mm: total,
                fit_deviation_mm: f.deviation.bound,
                rounding_mm: r,
                at: f.deviation.at,
                within_tolerance: total <= t,
            };
            return Ok((f.contour, report));
        }
        share *= 0.7;
    }
}

/// Fit every contour (in parallel, results in input order), with the rounding of `formats`
/// counted in each contour's deviation. `progress` is called once per finished contour. Once
/// the output holds more than `max_segments` segments no further contour is fitted, a contour
/// being fitted stops where it passes what is left of the limit, and the result is
/// [`JobError::TooManySegments`].
pub fn fit_outline(
    outline: &Outline,
    target: Target,
    tol: Tolerance,
    formats: &[Format],
    max_segments: usize,
    progress: &(dyn Fn() + Sync),
) -> Result<FittedOutline, JobError> {
    let decimals = decimals_for(tol);
    let produced = AtomicUsize::new(0);
    let results: Vec<Option<(Contour, ContourReport)>> = outline
        .contours
        .par_iter()
        .map(|c| {
            let left = max_segments.checked_sub(produced.load(Ordering::Relaxed))?;
            match fit_one(c, target, tol, formats, decimals, left) {
                Ok(r) => {
                    produced.fetch_add(r.0.segments.len(), Ordering::Relaxed);
                    progress();
                    Some(r)
                }
                Err(e) => {
                    // At least this many: the limit that was left, plus the one that passed it.
                    produced.fetch_add(e.limit + 1, Ordering::Relaxed);
                    None
                }
            }
        })
        .collect();
    let total = produced.into_inner();
    if total > max_segments {
        return Err(JobError::TooManySegments {
            limit: max_segments,
            produced: total,
            fitted: results.iter().flatten().count(),
            total: outline.contours.len(),
        });
    }
    let (contours, reports) = results.into_iter().flatten().unzip();
    Ok(FittedOutline {
        target,
        contours,
        reports,
    })
}

/// The convert report (field names are part of the interface, see DESIGN.md).
#[derive(Clone, Debug, Serialize)]
pub struct ConvertReport {
    pub tolerance_mm: f64,
    pub target: String,
    pub decimals: u32,
    /// Contours read plus items skipped:
    /// `contours_in + contours_added_by_prep = contours_out + skipped.len()`.
    pub contours_in: usize,
    pub contours_out: usize,
    /// Contours the preparation added (weed border and lines, kerf splits), or removed (< 0)
    /// beyond those it lists as skipped.
    pub contours_added_by_prep: i64,
    pub skipped: Vec<Skipped>,
    pub segments_in: SegmentCounts,
    pub segments_out: SegmentCounts,
    pub max_deviation_mm: f64,
    pub at: [f64; 2],
    pub worst_contour: Option<Source>,
    pub within_tolerance: bool,
    pub contours: Vec<ContourReport>,
    pub warnings: Vec<String>,
    /// The G-code output's own fit (lines, or arcs when the target is arcs), when written.
    pub gcode: Option<GcodeReport>,
    /// The preparation stage's report, when any step ran.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub prep: Option<serde_json::Value>,
}

/// The part of the report that covers the G-code file.
#[derive(Clone, Debug, Serialize)]
pub struct GcodeReport {
    pub target: String,
    pub segments_out: SegmentCounts,
    pub max_deviation_mm: f64,
    pub at: [f64; 2],
    pub within_tolerance: bool,
}

impl GcodeReport {
    pub fn of(f: &FittedOutline) -> GcodeReport {
        let mut segs = SegmentCounts::default();
        f.reports.iter().for_each(|r| segs.merge(&r.segments_out));
        GcodeReport {
            target: f.target.name().to_string(),
            segments_out: segs,
            max_deviation_mm: f.max_deviation_mm(),
            at: f.worst().map_or([0.0, 0.0], |r| r.at),
            within_tolerance: f.within_tolerance(),
        }
    }
}

impl ConvertReport {
    /// The report of a fitted outline (`fitted` is `None` for the exact target, where nothing
    /// is approximated).
    pub fn new(
        outline: &Outline,
        tol: Tolerance,
        target_name: &str,
        fitted: Option<&FittedOutline>,
    ) -> ConvertReport {
        let mut segments_in = SegmentCounts::default();
        let mut segments_out = SegmentCounts::default();
        let contours: Vec<ContourReport> = match fitted {
            Some(f) => f.reports.clone(),
            None => outline
                .contours
                .iter()
                .map(|c| {
                    let counts = SegmentCounts::of(&c.segments);
                    let at = c.start().map_or([0.0, 0.0], |p| [p.x, p.y]);
                    ContourReport {
                        source: c.source.clone(),
                        closed: c.closed,
                        segments_in: counts,
                        segments_out: counts,
                        max_deviation_mm: 0.0,
                        fit_deviation_mm: 0.0,
                        rounding_mm: 0.0,
                        at,
                        within_tolerance: true,
                    }
                })
                .collect(),
        };
        for r in &contours {
            segments_in.merge(&r.segments_in);
            segments_out.merge(&r.segments_out);
        }
        let worst = contours
            .iter()
            .max_by(|a, b| a.max_deviation_mm.total_cmp(&b.max_deviation_mm));
        ConvertReport {
            tolerance_mm: tol.mm(),
            target: target_name.to_string(),
            decimals: decimals_for(tol),
            contours_in: outline.contours.len() + outline.skipped.len(),
            contours_out: contours.len(),
            contours_added_by_prep: 0,
            skipped: outline.skipped.clone(),
            segments_in,
            segments_out,
            max_deviation_mm: worst.map_or(0.0, |w| w.max_deviation_mm),
            at: worst.map_or([0.0, 0.0], |w| w.at),
            worst_contour: worst.map(|w| w.source.clone()),
            within_tolerance: contours.iter().all(|c| c.within_tolerance),
            contours,
            warnings: outline.warnings.clone(),
            gcode: None,
            prep: None,
        }
    }

    /// Whether anything was skipped because it was broken (bad input).
    pub fn has_invalid(&self) -> bool {
        self.skipped.iter().any(|s| s.kind == SkipKind::Invalid)
    }

    /// Overall verdict: every output within tolerance.
    pub fn all_within_tolerance(&self) -> bool {
        self.within_tolerance && self.gcode.as_ref().is_none_or(|g| g.within_tolerance)
    }
}

/// What a convert job should produce.
#[derive(Clone, Debug)]
pub struct JobOptions {
    /// `None` for the exact outline (no fitting).
    pub target: Option<Target>,
    pub tolerance: Tolerance,
    /// Write the cutter SVG.
    pub svg: bool,
    /// Write the result as ratline JSON outlines.
    pub json: bool,
    /// Write G-code with these settings (its header gets the tolerance and deviation added).
    pub gcode: Option<write::gcode::GcodeOptions>,
    /// The most segments the job may produce per output (see [`DEFAULT_MAX_SEGMENTS`]).
    pub max_segments: usize,
}

/// A finished job: the report, the texts of the requested files, and the fitted contours.
#[derive(Debug)]
pub struct JobResult {
    pub report: ConvertReport,
    pub svg: Option<String>,
    pub json: Option<String>,
    pub gcode: Option<String>,
    pub fitted: Option<FittedOutline>,
}

/// Run a convert job on an outline: fit, measure (rounding included), write into memory.
pub fn run_job(
    outline: &Outline,
    job: &JobOptions,
    progress: &(dyn Fn() + Sync),
) -> Result<JobResult, JobError> {
    if let Some(c) = outline
        .contours
        .iter()
        .find(|c| c.segments.len() > MAX_SEGMENTS_PER_CONTOUR)
    {
        return Err(JobError::ContourTooLong {
            source: c.source.clone(),
            segments: c.segments.len(),
        });
    }
    // Every output point lies within the tolerance of the input, so an input the writers
    // cannot hold (NaN, beyond ±1e6 mm) is refused before any fitting, which on such a
    // contour could run for a very long time.
    for c in &outline.contours {
        for (i, seg) in c.segments.iter().enumerate() {
            write::check_segment(seg, &c.source, i)?;
        }
    }
    let tol = job.tolerance;
    let decimals = decimals_for(tol);
    // G-code holds lines and arcs: a lines or arcs job writes the fit itself, any other target
    // gets a lines fit of its own for the G-code.
    let gcode_of_main = matches!(job.target, Some(Target::Lines | Target::Arcs));
    let main_formats: Vec<Format> = [
        (job.svg, Format::Svg),
        (job.gcode.is_some() && gcode_of_main, Format::Gcode),
    ]
    .iter()
    .filter(|(on, _)| *on)
    .map(|(_, f)| *f)
    .collect();
    let fitted = job
        .target
        .map(|t| fit_outline(outline, t, tol, &main_formats, job.max_segments, progress))
        .transpose()?;
    let name = job.target.map_or("exact", |t| t.name());
    let mut report = ConvertReport::new(outline, tol, name, fitted.as_ref());
    let svg = match (&fitted, job.svg) {
        (Some(f), true) => Some(write::svg::svg_document(
            &f.contours,
            &write::svg::SvgWriteOptions {
                decimals,
                ..Default::default()
            },
        )?),
        _ => None,
    };
    let json = job.json.then(|| {
        let out = match &fitted {
            Some(f) => Outline {
                contours: f.contours.clone(),
                skipped: outline.skipped.clone(),
                warnings: outline.warnings.clone(),
            },
            None => outline.clone(),
        };
        write::json::outline_to_json(&out)
    });
    let gcode = match &job.gcode {
        Some(g) => {
            let lines;
            let gfit = match &fitted {
                Some(f) if gcode_of_main => f,
                _ => {
                    lines = fit_outline(
                        outline,
                        Target::Lines,
                        tol,
                        &[Format::Gcode],
                        job.max_segments,
                        progress,
                    )?;
                    &lines
                }
            };
            let gr = GcodeReport::of(gfit);
            let mut opts = g.clone();
            opts.decimals = decimals.max(write::gcode::MIN_GCODE_DECIMALS);
            opts.header.push(format!(
                "tolerance {} mm, fitted to {}",
                tol.mm(),
                gr.target
            ));
            opts.header.push(format!(
                "certified maximum deviation {:.6} mm ({})",
                gr.max_deviation_mm,
                if gr.within_tolerance {
                    "within tolerance"
                } else {
                    "OVER TOLERANCE"
                }
            ));
            let text = write::gcode::gcode_program(&gfit.contours, &opts)?;
            report.gcode = Some(gr);
            Some(text)
        }
        None => None,
    };
    Ok(JobResult {
        report,
        svg,
        json,
        gcode,
        fitted,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::testing::Rng;
    use kurbo::{CubicBez, Line, QuadBez, Vec2};
    use std::f64::consts::{PI, TAU};

    #[test]
    fn the_paired_rounding_bound_covers_the_measurement_within_the_half_unit_limit() {
        // Random open contours of lines, quadratics and cubics, written as SVG with 0–4
        // decimals and read back: the closed-form bound is at least the distance the certified
        // measurement attains, and at most the √2/2·10⁻ᵈ a coordinate rounding can move a point
        // (the module docs).
        let mut rng = Rng::new(7);
        for d in 0..=4 {
            for _ in 0..40 {
                let mut p = || Point::new(600.0 * rng.unit() - 300.0, 600.0 * rng.unit() - 300.0);
                let mut pen = p();
                let segments: Vec<Segment> = (0..8)
                    .map(|i| {
                        let s = match i % 3 {
                            0 => Segment::Line(Line::new(pen, p())),
                            1 => Segment::Quad(QuadBez::new(pen, p(), p())),
                            _ => Segment::Cubic(CubicBez::new(pen, p(), p(), p())),
                        };
                        pen = s.end();
                        s
                    })
                    .collect();
                let c = Contour::new(segments, false, Source::new("t.svg", "#p", 0));
                let r = write::svg::svg_as_read(&c, d).unwrap();
                let bound = paired_hausdorff(&c.segments, &r.segments, 1e-9, 1.0).unwrap();
                let m = measure::hausdorff(&c.segments, &r.segments, 1e-9);
                // (The measurement evaluates the curves in floating point: its attained value
                // carries errors of a few ulps of the 300 mm coordinates.)
                assert!(bound >= m.sampled - 1e-12, "{d} decimals: {bound} < {m:?}");
                let half_unit = 0.5 * std::f64::consts::SQRT_2 * 10f64.powi(-(d as i32));
                assert!(
                    bound <= half_unit * (1.0 + 1e-12),
                    "{d}: {bound} > {half_unit}"
                );
            }
        }
    }

    #[test]
    fn the_conic_bound_covers_the_measured_distance_of_moved_arcs_and_conics() {
        // Random arc pieces of up to 90° (radii 0.5–5000 mm, so flat ones too) and random
        // elliptic conics, against copies with the control points, weight, centre, radius or
        // angles moved by rounding-sized amounts: the closed form is at least the distance the
        // certified measurement attains.
        let mut rng = Rng::new(11);
        for i in 0..400 {
            let mut u = |lo: f64, hi: f64| lo + (hi - lo) * rng.unit();
            let (m, slack) = (u(1e-5, 1e-3), 1e-9);
            if i % 2 == 0 {
                let a = CircularArc {
                    center: Point::new(u(-300.0, 300.0), u(-300.0, 300.0)),
                    radius: 0.5 * 10f64.powf(u(0.0, 4.0)),
                    start_angle: u(-PI, PI),
                    sweep: u(-1.0, 1.0) * std::f64::consts::FRAC_PI_2,
                };
                let b = CircularArc {
                    center: a.center + Vec2::new(u(-m, m), u(-m, m)),
                    radius: a.radius + u(-m, m),
                    start_angle: a.start_angle + u(-m, m) / a.radius + TAU,
                    sweep: a.sweep + u(-m, m) / a.radius,
                };
                let bound = arc_moved(&a, &b).unwrap();
                let got = measure::hausdorff(&[Segment::Arc(a)], &[Segment::Arc(b)], slack);
                assert!(
                    bound >= got.sampled - 1e-12,
                    "{a:?} {b:?}: {bound} vs {got:?}"
                );
            } else {
                let mut p = |r: f64| Point::new(u(-r, r), u(-r, r));
                let [p0, p1, p2] = [p(300.0), p(300.0), p(300.0)];
                let [j0, j1, j2] = [p(m), p(m), p(m)].map(|q| q.to_vec2());
                let w = u(0.05, 1.0);
                let a = Conic::new(p0, p1, w, p2).unwrap();
                let b = Conic::new(p0 + j0, p1 + j1, (w + u(-m, m)).min(1.0), p2 + j2).unwrap();
                let bound = conic_moved(&a, &b).unwrap();
                let got = measure::hausdorff(&[Segment::Conic(a)], &[Segment::Conic(b)], slack);
                assert!(
                    bound >= got.sampled - 1e-12,
                    "{a:?} {b:?}: {bound} vs {got:?}"
                );
            }
        }
    }

    #[test]
    fn written_arcs_pair_up_with_their_pieces_within_the_derived_rounding_bound() {
        // Arcs of up to a full turn written as SVG with 3 and 4 decimals: the read-back pairs
        // up with the writer's pieces, the bound covers the measurement and stays within the
        // 6.1·h the SVG writer's module docs derive for a point of an arc piece.
        let mut rng = Rng::new(5);
        for d in [3, 4] {
            let h = 0.5 * 10f64.powi(-d);
            for _ in 0..60 {
                let mut u = |lo: f64, hi: f64| lo + (hi - lo) * rng.unit();
                let a = CircularArc {
                    center: Point::new(u(-300.0, 300.0), u(-300.0, 300.0)),
                    radius: 0.5 * 10f64.powf(u(0.0, 3.0)),
                    start_angle: u(-PI, PI),
                    sweep: u(-TAU, TAU),
                };
                let c = Contour::new(vec![Segment::Arc(a)], false, Source::new("t.svg", "#a", 0));
                let r = write::svg::svg_as_read(&c, d as u32).unwrap();
                let bound = paired_hausdorff(&c.segments, &r.segments, 1e-9, 1.0).unwrap();
                let got = measure::hausdorff(&c.segments, &r.segments, 1e-9);
                assert!(bound >= got.sampled - 1e-12, "{a:?}: {bound} vs {got:?}");
                assert!(bound <= 6.1 * h, "{a:?} at {d} decimals: {bound}");
            }
        }
    }

    #[test]
    fn a_read_back_that_does_not_pair_up_is_measured_instead() {
        let f = [Segment::Line(Line::new((0.0, 0.0), (10.0, 0.0)))];
        let r = [
            Segment::Line(Line::new((0.0, 0.0), (5.0, 0.001))),
            Segment::Line(Line::new((5.0, 0.001), (10.0, 0.0))),
        ];
        assert_eq!(paired_hausdorff(&f, &r, 1e-9, 1.0), None);
        let q = [Segment::Quad(QuadBez::new(
            (0.0, 0.0),
            (5.0, 0.0),
            (10.0, 0.0),
        ))];
        // A pair of different kinds is measured: a straight quadratic on the line is 0 away.
        assert!(paired_hausdorff(&f, &q, 1e-9, 1.0).unwrap() < 1e-8);
        // The fallback measures the two-piece read-back: its corner is 0.001 off the line.
        assert!((windowed_hausdorff(&f, &r, 1e-9) - 0.001).abs() < 1e-8);
        // Window by window on a long contour: a 300-line zigzag, one line written as two.
        let p = |i: usize| Point::new(i as f64, (i % 2) as f64);
        let long: Vec<Segment> = (0..300)
            .map(|i| Segment::Line(Line::new(p(i), p(i + 1))))
            .collect();
        let mut split = long.clone();
        let mid = Point::new(150.5, 0.5 + 0.002);
        split.splice(
            150..151,
            [
                Segment::Line(Line::new(p(150), mid)),
                Segment::Line(Line::new(mid, p(151))),
            ],
        );
        assert_eq!(paired_hausdorff(&long, &split, 1e-9, 1.0), None);
        // (The corner is 0.002 above the line y = x − 150 at x = 150.5: 0.002/√2 away.)
        let expected = 0.002 * std::f64::consts::FRAC_1_SQRT_2;
        assert!((windowed_hausdorff(&long, &split, 1e-9) - expected).abs() < 1e-8);
    }
}
