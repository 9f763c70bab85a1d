//! The terminal summary of a convert job: what went in, what came out, the certified worst
//! deviation and where, the worst five contours and everything skipped. Colour only when asked
//! (the caller decides: a terminal, and `NO_COLOR` unset, per no-color.org).

use std::fmt::Write;

use crate::convert::ConvertReport;
use crate::geom::SegmentCounts;

/// ANSI styling that is a no-op when colour is off: bold blue for good news, bold yellow for
/// bad, which stay apart for the common colour-vision deficiencies (red–green).
pub struct Paint(pub bool);

impl Paint {
    fn wrap(&self, code: &str, s: &str) -> String {
        if self.0 {
            format!("\x1b[{code}m{s}\x1b[0m")
        } else {
            s.to_string()
        }
    }
    pub fn good(&self, s: &str) -> String {
        self.wrap("1;34", s)
    }
    pub fn bad(&self, s: &str) -> String {
        self.wrap("1;33", s)
    }
    pub fn bold(&self, s: &str) -> String {
        self.wrap("1", s)
    }
}

/// Counts by kind as `3 lines, 12 arcs`, kinds with none left out.
pub fn counts(c: &SegmentCounts) -> String {
    let parts: Vec<String> = [
        (c.line, "line"),
        (c.quadratic, "quadratic"),
        (c.cubic, "cubic"),
        (c.conic, "conic"),
        (c.arc, "arc"),
    ]
    .iter()
    .filter(|(n, _)| *n > 0)
    .map(|(n, k)| format!("{n} {k}"))
    .collect();
    if parts.is_empty() {
        "none".into()
    } else {
        parts.join(", ")
    }
}

/// A length in mm with enough decimals to show it against the tolerance.
fn mm(x: f64, tol: f64) -> String {
    let d = ((-tol.log10()).ceil() as i64 + 3).clamp(4, 9) as usize;
    format!("{x:.d$} mm")
}

fn verdict(ok: bool, p: &Paint) -> String {
    if ok {
        p.good("within tolerance")
    } else {
        p.bad("OVER TOLERANCE")
    }
}

/// The summary text.
pub fn convert_summary(r: &ConvertReport, p: &Paint) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "{} to {} at tolerance {} mm (numbers written with {} decimals)",
        p.bold("ratline convert"),
        r.target,
        r.tolerance_mm,
        r.decimals
    );
    let _ = writeln!(
        s,
        "  contours   {} in, {} out, {} skipped{}",
        r.contours_in,
        r.contours_out,
        r.skipped.len(),
        match r.contours_added_by_prep {
            0 => String::new(),
            n => format!(" ({n:+} by preparation)"),
        }
    );
    let _ = writeln!(s, "  segments   in: {}", counts(&r.segments_in));
    let _ = writeln!(s, "             out: {}", counts(&r.segments_out));
    let _ = writeln!(
        s,
        "  deviation  {} certified maximum at ({:.3}, {:.3}) mm: {}",
        mm(r.max_deviation_mm, r.tolerance_mm),
        r.at[0],
        r.at[1],
        verdict(r.within_tolerance, p)
    );
    if let Some(w) = &r.worst_contour {
        let _ = writeln!(s, "             worst contour: {w}");
    }
    if let Some(g) = &r.gcode {
        let _ = writeln!(
            s,
            "  G-code     {} ({}), {} certified maximum: {}",
            g.target,
            counts(&g.segments_out),
            mm(g.max_deviation_mm, r.tolerance_mm),
            verdict(g.within_tolerance, p)
        );
    }
    if let Some(p) = &r.prep {
        let steps: Vec<&str> = p["steps"]
            .as_array()
            .map(|a| a.iter().filter_map(|v| v.as_str()).collect())
            .unwrap_or_default();
        let _ = writeln!(
            s,
            "  prepared   {}; pen-up travel {:.1} mm before, {:.1} mm after",
            steps.join(", "),
            p["travel_before_mm"].as_f64().unwrap_or(0.0),
            p["travel_after_mm"].as_f64().unwrap_or(0.0)
        );
    }
    let mut worst: Vec<_> = r.contours.iter().collect();
    worst.sort_by(|a, b| b.max_deviation_mm.total_cmp(&a.max_deviation_mm));
    if !worst.is_empty() {
        let _ = writeln!(
            s,
            "  worst contours (certified deviation, of which rounding):"
        );
        for c in worst.iter().take(5) {
            let _ = writeln!(
                s,
                "    {} ({})  {}",
                mm(c.max_deviation_mm, r.tolerance_mm),
                mm(c.rounding_mm, r.tolerance_mm),
                c.source
            );
        }
    }
    if !r.skipped.is_empty() {
        let _ = writeln!(s, "  skipped:");
        for k in &r.skipped {
            let _ = writeln!(s, "    {}: {}", k.source, k.reason);
        }
    }
    for w in &r.warnings {
        let _ = writeln!(s, "  {} {w}", p.bad("warning:"));
    }
    s
}
