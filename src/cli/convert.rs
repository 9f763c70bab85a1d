//! `ratline convert`: load, fit, measure, write, summarise.

use std::io::IsTerminal;
use std::path::Path;
use std::sync::atomic::{AtomicUsize, Ordering};

use super::args::{ConvertArgs, DirectionArg, KerfSideArg, MachineArgs, OrderArg, PrepArgs, ToArg};
use super::outputs::Outputs;
use super::{inputs, stdout_color, CliError, Outcome};
use crate::convert::{run_job, ConvertReport, FittedOutline, JobOptions};
use crate::fit::Target;
use crate::geom::Outline;
use crate::prep::{prepare, Direction, KerfSide, Order, PrepOptions};
use crate::verify::{verify, Align, VerifyOptions};
use crate::write::gcode::GcodeOptions;
use crate::write::html::verify_html;
use crate::write::summary::{convert_summary, Paint};

/// Letters below this cap height are hard to weed in vinyl (common practice, no source).
pub const MIN_VINYL_CAP_HEIGHT_MM: f64 = 6.0;

/// Contours above which a progress line is shown on a terminal.
const PROGRESS_ABOVE: usize = 300;

pub fn target_of(to: ToArg) -> Option<Target> {
    match to {
        ToArg::Lines => Some(Target::Lines),
        ToArg::Quadratic => Some(Target::Quadratic),
        ToArg::Cubic => Some(Target::Cubic),
        ToArg::Arcs => Some(Target::Arcs),
        ToArg::Exact => None,
    }
}

pub fn gcode_options(m: &MachineArgs, header: Vec<String>) -> GcodeOptions {
    GcodeOptions {
        safe_z: m.safe_z.mm(),
        cut_z: m.cut_z.mm(),
        feed: m.feed,
        plunge_rate: m.plunge_rate,
        spindle_rpm: m.spindle_rpm,
        header,
        ..GcodeOptions::default()
    }
}

/// The preparation options, or `None` when no step was asked for.
pub fn prep_options(p: &PrepArgs) -> Option<PrepOptions> {
    let mm = |l: Option<crate::geom::Length>| l.map_or(0.0, |l| l.mm());
    let opts = PrepOptions {
        kerf_mm: mm(p.kerf),
        kerf_side: match (p.kerf, p.kerf_side) {
            (None, _) | (_, KerfSideArg::None) => KerfSide::None,
            (_, KerfSideArg::Outside) => KerfSide::Outside,
            (_, KerfSideArg::Inside) => KerfSide::Inside,
        },
        blade_offset_mm: mm(p.blade_offset),
        corner_threshold_deg: p.corner_threshold,
        overcut_mm: mm(p.overcut),
        weed_border_mm: mm(p.weed_border),
        weed_lines: p.weed_lines,
        direction: match p.direction {
            DirectionArg::Keep => Direction::Keep,
            DirectionArg::Cw => Direction::Cw,
            DirectionArg::Ccw => Direction::Ccw,
        },
        order: match p.order {
            OrderArg::AsDrawn => Order::AsDrawn,
            OrderArg::InsideFirst => Order::InsideFirst,
            OrderArg::ShortTravel => Order::ShortTravel,
        },
        warnings: true,
    };
    let any = opts.kerf_side != KerfSide::None
        || opts.blade_offset_mm > 0.0
        || opts.overcut_mm > 0.0
        || opts.weed_border_mm > 0.0
        || opts.weed_lines > 0
        || opts.direction != Direction::Keep
        || opts.order != Order::AsDrawn;
    any.then_some(opts)
}

fn extension(p: &Path) -> String {
    p.extension()
        .and_then(|e| e.to_str())
        .map(|e| e.to_ascii_lowercase())
        .unwrap_or_default()
}

/// A progress line on stderr for large jobs, only on a terminal.
pub struct Progress {
    total: usize,
    done: AtomicUsize,
    show: bool,
}

impl Progress {
    pub fn new(total: usize) -> Progress {
        Progress {
            total,
            done: AtomicUsize::new(0),
            show: total > PROGRESS_ABOVE && std::io::stderr().is_terminal(),
        }
    }

    pub fn tick(&self) {
        let n = self.done.fetch_add(1, Ordering::Relaxed) + 1;
        if self.show && (n.is_multiple_of((self.total / 100).max(1)) || n == self.total) {
            eprint!("\rfitting contours: {n}/{}", self.total);
            if n == self.total {
                eprintln!();
            }
        }
    }
}

pub fn run(a: ConvertArgs) -> Result<Outcome, CliError> {
    let target = target_of(a.to);
    let outputs: Vec<&Path> = [&a.output, &a.gcode, &a.report, &a.html]
        .into_iter()
        .flatten()
        .map(|p| p.as_path())
        .collect();
    if outputs.is_empty() {
        return Err(CliError::usage(
            "nothing to write: give -o OUT.svg (or OUT.json), --gcode OUT.nc, --report OUT.json or --html OUT.html",
        ));
    }
    let (want_svg, want_json) = match &a.output {
        Some(p) => match (extension(p).as_str(), target) {
            ("svg", Some(_)) => (true, false),
            ("svg", None) => {
                return Err(CliError::usage(format!(
                    "{}: SVG cannot hold exact conics; write --to exact as JSON (-o OUT.json)",
                    p.display()
                )))
            }
            ("json", _) => (false, true),
            _ => {
                return Err(CliError::usage(format!(
                    "{}: the output must end in .svg or .json",
                    p.display()
                )))
            }
        },
        None => (false, false),
    };
    let (read, inputs, job) = inputs::load(&a.input)?;
    Outputs::check(&inputs, &outputs)?;
    let read_count = read.contours.len() + read.skipped.len();
    let (outline, prep_report) = match prep_options(&a.prep) {
        Some(p) => {
            let done =
                prepare(read, &p, a.tolerance).map_err(|e| CliError::usage(e.to_string()))?;
            (done.outline, Some(done.report))
        }
        None => (read, None),
    };
    let sources: Vec<String> = inputs
        .iter()
        .map(|p| format!("source: {}", p.display()))
        .collect();
    let opts = JobOptions {
        target,
        tolerance: a.tolerance,
        svg: want_svg,
        json: want_json,
        gcode: a.gcode.as_ref().map(|_| gcode_options(&a.machine, sources)),
        max_segments: a.max_segments,
    };
    let progress = Progress::new(outline.contours.len() * (1 + usize::from(a.gcode.is_some())));
    let result = run_job(&outline, &opts, &|| progress.tick())
        .map_err(|e| CliError::input(e.to_string()))?;
    let mut report = result.report;
    report.contours_in = read_count;
    report.contours_added_by_prep =
        report.contours_out as i64 + report.skipped.len() as i64 - read_count as i64;
    if let Some(p) = prep_report {
        for w in &p.warnings {
            report.warnings.push(format!("{}: {}", w.source, w.message));
        }
        report.prep = serde_json::to_value(&p).ok();
    }
    if let Some(j) = &job {
        if j.cap_height_mm < MIN_VINYL_CAP_HEIGHT_MM {
            report.warnings.push(format!(
                "letters are {:.2} mm tall (cap height): below {MIN_VINYL_CAP_HEIGHT_MM} mm they are hard to weed in vinyl",
                j.cap_height_mm
            ));
        }
    }
    let mut files = Outputs::default();
    if let (Some(p), Some(s)) = (&a.output, result.svg.or(result.json)) {
        files.add(p, s.into_bytes());
    }
    if let (Some(p), Some(g)) = (&a.gcode, result.gcode) {
        files.add(p, g.into_bytes());
    }
    if let Some(p) = &a.report {
        files.add(p, report_json(&report).into_bytes());
    }
    if let Some(p) = &a.html {
        files.add(
            p,
            overlay_page(&outline, result.fitted.as_ref(), a.tolerance).into_bytes(),
        );
    }
    files.write()?;
    if !a.quiet {
        print!("{}", convert_summary(&report, &Paint(stdout_color())));
    }
    Ok(outcome(&report))
}

/// The HTML page of a convert job: the output verified against the (prepared) source, so each
/// contour is coloured by its own certified deviation.
fn overlay_page(
    source: &Outline,
    fitted: Option<&FittedOutline>,
    tolerance: crate::geom::Tolerance,
) -> String {
    let output = Outline {
        contours: fitted.map_or_else(|| source.contours.clone(), |f| f.contours.clone()),
        ..Outline::default()
    };
    let opts = VerifyOptions {
        tolerance,
        align: Align::None,
    };
    let report = verify(source, &output, &opts);
    verify_html(source, &output, &report)
}

pub fn report_json(r: &ConvertReport) -> String {
    // Serialising plain data with string keys cannot fail.
    serde_json::to_string_pretty(r).unwrap_or_default() + "\n"
}

pub fn outcome(r: &ConvertReport) -> Outcome {
    if r.has_invalid() {
        Outcome::InvalidInputSkipped
    } else if !r.all_within_tolerance() {
        Outcome::OverTolerance
    } else {
        Outcome::Done
    }
}
