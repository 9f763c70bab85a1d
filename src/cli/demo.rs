//! `ratline demo`: the bundled sample job, a door badge for an invented honey farm with its
//! name set in the vendored DejaVu Sans, converted to every target. Writes into `--out`:
//! `badge-<target>.svg` for lines, quadratic, cubic and arcs, `badge-arcs.nc` (G-code from the
//! arcs fit), `report.json` (one report per target) and `summary.txt` (what is printed).

use std::collections::BTreeMap;

use kurbo::Affine;

use super::args::DemoArgs;
use super::{stdout_color, CliError, Outcome};
use crate::convert::{run_job, ConvertReport, JobOptions, DEFAULT_MAX_SEGMENTS};
use crate::fit::Target;
use crate::geom::{Outline, Tolerance};
use crate::read::font::{set_text, Align, TextOptions, TextSize};
use crate::read::svg::{read_svg, SvgOptions};
use crate::write::atomic::write_atomic;
use crate::write::gcode::GcodeOptions;
use crate::write::summary::{convert_summary, Paint};

const BADGE: &[u8] = include_bytes!("../../demo-outlines/marrow-creek-badge.svg");
const FONT: &[u8] = include_bytes!("../../tests/fonts/DejaVuSans.ttf");
const NAME: &str = "MARROW CREEK APIARY";

/// The demo's outline: the badge artwork plus the name centred in its banner.
pub fn demo_outline() -> Result<Outline, CliError> {
    let mut outline = read_svg(
        "demo-outlines/marrow-creek-badge.svg",
        BADGE,
        &SvgOptions::default(),
    )
    .map_err(|e| CliError::input(e.to_string()))?;
    let text = set_text(
        "tests/fonts/DejaVuSans.ttf",
        FONT,
        &TextOptions {
            text: NAME.into(),
            size: TextSize::CapHeight(6.5),
            align: Align::Center,
            ..TextOptions::default()
        },
    )
    .map_err(|e| CliError::input(e.to_string()))?;
    // Centre of the banner is x = 80; the baseline sits 3.25 mm below its middle (y = 97).
    let place = Affine::translate((80.0, 100.25));
    outline
        .contours
        .extend(text.contours.iter().map(|c| c.transformed(place)));
    outline.skipped.extend(text.skipped);
    outline.warnings.extend(text.warnings);
    Ok(outline)
}

pub fn run(a: DemoArgs) -> Result<Outcome, CliError> {
    let outline = demo_outline()?;
    let tolerance = Tolerance::new(0.01).map_err(|e| CliError::input(e.to_string()))?;
    std::fs::create_dir_all(&a.out).map_err(|e| {
        CliError::input(format!(
            "{}: cannot create the folder: {e}",
            a.out.display()
        ))
    })?;
    let mut reports = Vec::new();
    let mut all_ok = true;
    for target in [
        Target::Lines,
        Target::Quadratic,
        Target::Cubic,
        Target::Arcs,
    ] {
        let job = JobOptions {
            target: Some(target),
            tolerance,
            svg: true,
            json: false,
            gcode: (target == Target::Arcs).then(|| GcodeOptions {
                header: vec!["source: ratline demo (Marrow Creek Apiary badge)".into()],
                ..GcodeOptions::default()
            }),
            max_segments: DEFAULT_MAX_SEGMENTS,
        };
        let r = run_job(&outline, &job, &|| {}).map_err(|e| CliError::input(e.to_string()))?;
        let name = target.name();
        let write = |file: String, bytes: &[u8]| {
            let p = a.out.join(file);
            write_atomic(&p, bytes)
                .map_err(|e| CliError::input(format!("{}: cannot write: {e}", p.display())))
        };
        if let Some(svg) = &r.svg {
            write(format!("badge-{name}.svg"), svg.as_bytes())?;
        }
        if let Some(g) = &r.gcode {
            write(format!("badge-{name}.nc"), g.as_bytes())?;
        }
        all_ok &= r.report.all_within_tolerance() && !r.report.has_invalid();
        reports.push((name, r.report));
    }
    let by_name: BTreeMap<&str, &ConvertReport> = reports.iter().map(|(n, r)| (*n, r)).collect();
    let json = serde_json::to_string_pretty(&by_name).unwrap_or_default() + "\n";
    write_atomic(&a.out.join("report.json"), json.as_bytes())
        .map_err(|e| CliError::input(format!("report.json: cannot write: {e}")))?;
    let plain = summaries(&reports, &Paint(false));
    write_atomic(&a.out.join("summary.txt"), plain.as_bytes())
        .map_err(|e| CliError::input(format!("summary.txt: cannot write: {e}")))?;
    print!("{}", summaries(&reports, &Paint(stdout_color())));
    println!("files written to {}", a.out.display());
    Ok(if all_ok {
        Outcome::Done
    } else {
        Outcome::OverTolerance
    })
}

/// The terminal summaries of every target, in the order they ran.
fn summaries(reports: &[(&str, ConvertReport)], paint: &Paint) -> String {
    reports
        .iter()
        .map(|(_, r)| convert_summary(r, paint) + "\n")
        .collect()
}
