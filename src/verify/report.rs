//! The verification report (serialised as the `verify` report JSON of the design) and its
//! plain-text terminal summary.

use std::fmt::Write;

use serde::Serialize;

use super::Align;
use crate::geom::{Skipped, Source};
use crate::write::summary::Paint;

/// One matched pair of contours and their certified deviation.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PairReport {
    pub reference: Source,
    pub candidate: Source,
    /// Index of the contour in the reference outline.
    pub reference_index: usize,
    /// Index of the contour in the candidate outline.
    pub candidate_index: usize,
    /// Certified upper bound on the symmetric Hausdorff distance, mm.
    pub hausdorff_mm: f64,
    /// A distance actually attained (at `at`), mm; `hausdorff_mm − sampled_mm` is at most the
    /// measuring slack.
    pub sampled_mm: f64,
    /// The worst point, in the reference's coordinates (the candidate already moved).
    pub at: [f64; 2],
    pub within_tolerance: bool,
}

impl PairReport {
    /// The fraction of the tolerance used (1 = exactly the tolerance).
    pub fn used(&self, tolerance_mm: f64) -> f64 {
        self.hausdorff_mm / tolerance_mm
    }
}

/// The result of comparing a candidate outline with a reference.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct VerifyReport {
    pub tolerance_mm: f64,
    /// Largest certified bound over all matched pairs (0 when there are none), mm.
    pub hausdorff_mm: f64,
    /// True when every pair is within tolerance and nothing is missing or extra.
    pub within_tolerance: bool,
    pub align: Align,
    /// The translation applied to the candidate before comparing, mm.
    pub moved_mm: [f64; 2],
    pub reference_contours: usize,
    pub candidate_contours: usize,
    /// Matched pairs, in reference order.
    pub pairs: Vec<PairReport>,
    /// Reference contours with no counterpart in the candidate.
    pub missing: Vec<Source>,
    /// Candidate contours with no counterpart in the reference.
    pub extra: Vec<Source>,
    /// Indices in the reference outline of the missing contours (same order as `missing`).
    pub missing_indices: Vec<usize>,
    /// Indices in the candidate outline of the extra contours (same order as `extra`).
    pub extra_indices: Vec<usize>,
    /// What the readers could not convert, on either side (reported, not judged).
    pub reference_skipped: Vec<Skipped>,
    pub candidate_skipped: Vec<Skipped>,
}

impl VerifyReport {
    /// The pairs from worst to best.
    pub fn worst_first(&self) -> Vec<&PairReport> {
        let mut v: Vec<&PairReport> = self.pairs.iter().collect();
        v.sort_by(|a, b| b.hausdorff_mm.total_cmp(&a.hausdorff_mm));
        v
    }

    pub fn pairs_over(&self) -> usize {
        self.pairs.iter().filter(|p| !p.within_tolerance).count()
    }
}

/// How many entries each list in the summary shows before "... and N more".
const LIST_LIMIT: usize = 10;
const WORST: usize = 5;

fn list(out: &mut String, title: &str, items: &[Source]) {
    if items.is_empty() {
        return;
    }
    let _ = writeln!(out, "{title} ({}):", items.len());
    for s in items.iter().take(LIST_LIMIT) {
        let _ = writeln!(out, "  {s}");
    }
    if items.len() > LIST_LIMIT {
        let _ = writeln!(out, "  ... and {} more", items.len() - LIST_LIMIT);
    }
}

/// A plain-text summary: counts, the worst pairs, what is missing or extra, and the verdict.
/// ANSI colour (green / red verdict, bold headings) only when `color` is true.
pub fn terminal_summary(report: &VerifyReport, color: bool) -> String {
    let p = Paint(color);
    let tol = report.tolerance_mm;
    let mut out = String::new();
    let _ = writeln!(
        out,
        "{} {} reference contours, {} candidate contours, tolerance {tol} mm",
        p.bold("verify:"),
        report.reference_contours,
        report.candidate_contours,
    );
    match report.align {
        Align::None => {
            let _ = writeln!(out, "alignment: none (compared as drawn)");
        }
        Align::BBox => {
            let [dx, dy] = report.moved_mm;
            let _ = writeln!(
                out,
                "alignment: bounding-box centres; candidate moved by ({dx:.4}, {dy:.4}) mm"
            );
        }
    }
    let _ = writeln!(
        out,
        "pairs: {} matched, {} over tolerance; missing: {}; extra: {}",
        report.pairs.len(),
        report.pairs_over(),
        report.missing.len(),
        report.extra.len()
    );
    let worst = report.worst_first();
    if !worst.is_empty() {
        let _ = writeln!(
            out,
            "{}",
            p.bold("worst pairs (certified Hausdorff distance):")
        );
        for w in worst.iter().take(WORST) {
            let line = format!(
                "  {:>10.5} mm {:>7.1}%  {}  <->  {}  at ({:.3}, {:.3})",
                w.hausdorff_mm,
                100.0 * w.used(tol),
                w.reference,
                w.candidate,
                w.at[0],
                w.at[1]
            );
            let _ = writeln!(
                out,
                "{}",
                if w.within_tolerance {
                    line
                } else {
                    p.bad(&line)
                }
            );
        }
    }
    list(&mut out, "missing from the candidate", &report.missing);
    list(&mut out, "extra in the candidate", &report.extra);
    for (side, skipped) in [
        ("reference", &report.reference_skipped),
        ("candidate", &report.candidate_skipped),
    ] {
        if !skipped.is_empty() {
            let _ = writeln!(out, "not read from the {side} ({}):", skipped.len());
            for s in skipped.iter().take(LIST_LIMIT) {
                let _ = writeln!(out, "  {}: {}", s.source, s.reason);
            }
            if skipped.len() > LIST_LIMIT {
                let _ = writeln!(out, "  ... and {} more", skipped.len() - LIST_LIMIT);
            }
        }
    }
    let verdict = if report.within_tolerance {
        p.good(&format!(
            "PASS: within tolerance (Hausdorff {:.5} mm <= {tol} mm)",
            report.hausdorff_mm
        ))
    } else {
        let mut why = Vec::new();
        if report.pairs_over() > 0 {
            why.push(format!(
                "{} pair(s) over tolerance, worst {:.5} mm",
                report.pairs_over(),
                report.hausdorff_mm
            ));
        }
        if !report.missing.is_empty() {
            why.push(format!("{} missing", report.missing.len()));
        }
        if !report.extra.is_empty() {
            why.push(format!("{} extra", report.extra.len()));
        }
        p.bad(&format!("FAIL: {}", why.join(", ")))
    };
    let _ = writeln!(out, "{verdict}");
    out
}
