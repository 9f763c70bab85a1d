//! `ratline verify REFERENCE CANDIDATE`: match the contours of a converted file to its
//! reference, certify each pair's deviation, and report it (terminal, JSON, HTML).

use std::path::Path;

use super::args::{VerifyAlign, VerifyArgs};
use super::outputs::Outputs;
use super::{inputs, stdout_color, CliError, Outcome};
use crate::verify::{terminal_summary, verify, Align, VerifyOptions};
use crate::write::html::verify_html;

pub fn run(a: VerifyArgs) -> Result<Outcome, CliError> {
    let candidate_path = a.candidate().clone();
    let mut read = vec![candidate_path.clone()];
    let reference = match (a.reference(), &a.text.font, &a.text.text) {
        (Some(r), None, None) => {
            read.push(r.clone());
            inputs::read_outline(r, None, a.px_per_inch)?
        }
        (None, Some(font), Some(text)) => {
            read.push(font.clone());
            let (o, _) = inputs::read_text(
                font,
                text.replace("\\n", "\n"),
                a.text.cap_height.map(|l| l.mm()),
                a.text.em.map(|l| l.mm()),
                None,
            )?;
            o
        }
        (Some(_), Some(_), _) | (Some(_), _, Some(_)) => {
            return Err(CliError::usage(
                "give either a REFERENCE file or --font with --text, not both",
            ))
        }
        _ => {
            return Err(CliError::usage(
                "verify needs a REFERENCE file (or --font with --text) and a CANDIDATE file",
            ))
        }
    };
    let candidate = inputs::read_outline(&candidate_path, None, a.px_per_inch)?;
    if candidate.contours.is_empty() {
        return Err(CliError::input(format!(
            "{}: the candidate has no contours to compare",
            candidate_path.display()
        )));
    }
    let outputs: Vec<&Path> = [&a.report, &a.html]
        .into_iter()
        .flatten()
        .map(|p| p.as_path())
        .collect();
    Outputs::check(&read, &outputs)?;
    let opts = VerifyOptions {
        tolerance: a.tolerance,
        align: match a.align {
            VerifyAlign::None => Align::None,
            VerifyAlign::Bbox => Align::BBox,
        },
    };
    let report = verify(&reference, &candidate, &opts);
    let mut files = Outputs::default();
    if let Some(p) = &a.report {
        files.add(
            p,
            (serde_json::to_string_pretty(&report).unwrap_or_default() + "\n").into_bytes(),
        );
    }
    if let Some(p) = &a.html {
        files.add(p, verify_html(&reference, &candidate, &report).into_bytes());
    }
    files.write()?;
    if !a.quiet {
        print!("{}", terminal_summary(&report, stdout_color()));
    }
    Ok(if report.within_tolerance {
        Outcome::Done
    } else {
        Outcome::OverTolerance
    })
}
