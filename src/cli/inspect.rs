//! `ratline inspect`: a table (or JSON) of the contours of an input.

use std::fmt::Write;

use super::args::InspectArgs;
use super::convert::MIN_VINYL_CAP_HEIGHT_MM;
use super::{inputs, stdout_color, CliError, Outcome};
use crate::inspect::inspect;
use crate::write::summary::{counts, Paint};

pub fn run(a: InspectArgs) -> Result<Outcome, CliError> {
    let (outline, _, job) = inputs::load(&a.input)?;
    let mut report = inspect(&outline);
    if let Some(j) = job {
        if j.cap_height_mm < MIN_VINYL_CAP_HEIGHT_MM {
            report.warnings.push(format!(
                "letters are {:.2} mm tall (cap height): below {MIN_VINYL_CAP_HEIGHT_MM} mm they are hard to weed in vinyl",
                j.cap_height_mm
            ));
        }
    }
    if a.json {
        println!(
            "{}",
            serde_json::to_string_pretty(&report).unwrap_or_default()
        );
        return Ok(Outcome::Done);
    }
    let p = Paint(stdout_color());
    let mut s = String::new();
    let _ = writeln!(s, "{} contours", report.contours.len());
    if let Some(b) = report.bbox {
        let _ = writeln!(
            s,
            "extent {:.3} × {:.3} mm, from ({:.3}, {:.3}) to ({:.3}, {:.3})",
            b[2] - b[0],
            b[3] - b[1],
            b[0],
            b[1],
            b[2],
            b[3]
        );
    }
    for c in &report.contours {
        let _ = writeln!(
            s,
            "{}\n    {}, {}; {:.3} × {:.3} mm at ({:.3}, {:.3}); length {:.3} mm; {}",
            p.bold(&c.source.to_string()),
            if c.closed { "closed" } else { "open" },
            counts(&c.segments),
            c.bbox[2] - c.bbox[0],
            c.bbox[3] - c.bbox[1],
            c.bbox[0],
            c.bbox[1],
            c.length_mm,
            c.direction
        );
        for f in &c.flags {
            let _ = writeln!(s, "    {} {f}", p.bad("!"));
        }
    }
    for k in &report.skipped {
        let _ = writeln!(s, "skipped {}: {}", k.source, k.reason);
    }
    for w in &report.warnings {
        let _ = writeln!(s, "{} {w}", p.bad("warning:"));
    }
    print!("{s}");
    Ok(Outcome::Done)
}
