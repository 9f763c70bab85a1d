//! Verification: compare a candidate outline (a fitted file, a G-code program read back) with a
//! reference, contour by contour, and certify the deviation.
//!
//! 1. Alignment (`align`): optionally move the candidate so the bounding-box centres coincide.
//! 2. Matching (`matching`): pair contours by position and shape (bounding boxes, then a
//!    sampled Hausdorff estimate), greedy by increasing cost; what finds no partner is missing
//!    (reference side) or extra (candidate side).
//! 3. Measuring: every matched pair gets the certified symmetric Hausdorff bound of
//!    [`measure::hausdorff_within`] (Alt & Scharf, IJCGA 2008, for the distance; the bound is
//!    rigorous, see `measure`), with slack 10⁻² of the tolerance (a whole font verifies in seconds) and refined near the tolerance
//!    so the verdict is not decided by the slack; pairs run in parallel (rayon).
//! 4. The report (`report`): JSON-serialisable, plus a terminal summary.
//!
//! The outline is within tolerance when every pair's certified bound is at most the tolerance
//! and nothing is missing or extra. Skipped input on either side is carried into the report but
//! does not decide the verdict: it never reached either outline.

mod align;
mod matching;
mod report;

use rayon::prelude::*;

pub use align::Align;
pub use matching::{REJECT_SIZE, REJECT_TOLERANCES};
pub use report::{terminal_summary, PairReport, VerifyReport};

use crate::geom::{Outline, Segment, Tolerance};
use crate::measure;

/// Measuring slack as a fraction of the tolerance.
pub const SLACK: f64 = 1e-2;

/// How to verify.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct VerifyOptions {
    pub tolerance: Tolerance,
    pub align: Align,
}

/// Compare `candidate` with `reference`.
pub fn verify(reference: &Outline, candidate: &Outline, opts: &VerifyOptions) -> VerifyReport {
    let tol = opts.tolerance.mm();
    let moved = align::offset(reference, candidate, opts.align);
    let cand: Vec<Vec<Segment>> = candidate
        .contours
        .par_iter()
        .map(|c| align::translated(&c.segments, moved))
        .collect();
    let rsegs: Vec<&[Segment]> = reference
        .contours
        .iter()
        .map(|c| c.segments.as_slice())
        .collect();
    let csegs: Vec<&[Segment]> = cand.iter().map(|s| s.as_slice()).collect();
    let m = matching::match_contours(&rsegs, &csegs, tol);

    let pairs: Vec<PairReport> = m
        .pairs
        .par_iter()
        .map(|&(i, j)| {
            let d = measure::hausdorff_within(rsegs[i], csegs[j], SLACK * tol, tol);
            PairReport {
                reference: reference.contours[i].source.clone(),
                candidate: candidate.contours[j].source.clone(),
                reference_index: i,
                candidate_index: j,
                hausdorff_mm: d.bound,
                sampled_mm: d.sampled,
                at: d.at,
                within_tolerance: d.bound <= tol,
            }
        })
        .collect();
    let hausdorff_mm = pairs.iter().map(|p| p.hausdorff_mm).fold(0.0, f64::max);
    let missing: Vec<_> = m
        .missing
        .iter()
        .map(|&i| reference.contours[i].source.clone())
        .collect();
    let extra: Vec<_> = m
        .extra
        .iter()
        .map(|&j| candidate.contours[j].source.clone())
        .collect();
    VerifyReport {
        tolerance_mm: tol,
        hausdorff_mm,
        within_tolerance: missing.is_empty()
            && extra.is_empty()
            && pairs.iter().all(|p| p.within_tolerance),
        align: opts.align,
        moved_mm: [moved.x, moved.y],
        reference_contours: reference.contours.len(),
        candidate_contours: candidate.contours.len(),
        pairs,
        missing,
        extra,
        missing_indices: m.missing,
        extra_indices: m.extra,
        reference_skipped: reference.skipped.clone(),
        candidate_skipped: candidate.skipped.clone(),
    }
}
