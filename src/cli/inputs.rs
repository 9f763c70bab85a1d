//! Loading what the user named: files by format, and text set in a font.

use std::path::{Path, PathBuf};

use super::args::{AlignArg, InputArgs, InputFormat};
use super::CliError;
use crate::geom::Outline;
use crate::read::font::{self, Align, TextOptions, TextSize};
use crate::read::{gcode, json, svg};

/// The largest input file read (a limit against runaway inputs; files this large are not
/// artwork).
pub const MAX_INPUT_BYTES: u64 = 256 * 1024 * 1024;

pub fn read_file(path: &Path) -> Result<Vec<u8>, CliError> {
    let label = path.display().to_string();
    let meta = std::fs::metadata(path)
        .map_err(|e| CliError::input(format!("{label}: cannot read: {e}")))?;
    if meta.is_dir() {
        return Err(CliError::input(format!("{label}: is a folder, not a file")));
    }
    if meta.len() > MAX_INPUT_BYTES {
        return Err(CliError::input(format!(
            "{label}: {} bytes is over the input limit of {MAX_INPUT_BYTES} bytes",
            meta.len()
        )));
    }
    std::fs::read(path).map_err(|e| CliError::input(format!("{label}: cannot read: {e}")))
}

/// The format of a file: as forced, else by extension, else by its first character.
fn format_of(
    path: &Path,
    bytes: &[u8],
    forced: Option<InputFormat>,
) -> Result<InputFormat, CliError> {
    if let Some(f) = forced {
        return Ok(f);
    }
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .map(|e| e.to_ascii_lowercase())
        .unwrap_or_default();
    Ok(match ext.as_str() {
        "svg" => InputFormat::Svg,
        "json" => InputFormat::Json,
        "nc" | "ngc" | "gcode" | "gc" | "tap" | "cnc" => InputFormat::Gcode,
        _ => match bytes.iter().find(|b| !b.is_ascii_whitespace()) {
            Some(b'<') => InputFormat::Svg,
            Some(b'{') => InputFormat::Json,
            _ => {
                return Err(CliError::input(format!(
                    "{}: cannot tell the format from the name; use --input-format svg|json|gcode",
                    path.display()
                )))
            }
        },
    })
}

/// Read one file into an outline.
pub fn read_outline(
    path: &Path,
    forced: Option<InputFormat>,
    px_per_inch: f64,
) -> Result<Outline, CliError> {
    let bytes = read_file(path)?;
    let label = path.display().to_string();
    let outline = match format_of(path, &bytes, forced)? {
        InputFormat::Svg => svg::read_svg(&label, &bytes, &svg::SvgOptions { px_per_inch }),
        InputFormat::Json => json::read_outline_json(&label, &bytes),
        InputFormat::Gcode => {
            let text = String::from_utf8(bytes).map_err(|e| {
                CliError::input(format!(
                    "{label}: not text (byte {}): G-code must be ASCII or UTF-8",
                    e.utf8_error().valid_up_to()
                ))
            })?;
            gcode::read_gcode(&label, &text)
        }
    };
    outline.map_err(|e| CliError::input(e.to_string()))
}

/// What the text job asked for, kept for warnings about letter size.
pub struct TextJob {
    pub cap_height_mm: f64,
}

/// Set the text of a font job.
pub fn read_text(
    font_path: &Path,
    text: String,
    cap_height: Option<f64>,
    em: Option<f64>,
    args: Option<&InputArgs>,
) -> Result<(Outline, TextJob), CliError> {
    let data = read_file(font_path)?;
    let label = font_path.display().to_string();
    let size = match (cap_height, em) {
        (_, Some(e)) => TextSize::Em(e),
        (Some(c), None) => TextSize::CapHeight(c),
        (None, None) => TextSize::CapHeight(10.0),
    };
    let mut opts = TextOptions {
        text,
        size,
        ..TextOptions::default()
    };
    if let Some(a) = args {
        opts.font_index = a.font_index;
        opts.align = match a.text_align {
            AlignArg::Left => Align::Left,
            AlignArg::Center => Align::Center,
            AlignArg::Right => Align::Right,
        };
        opts.line_spacing = a.line_spacing;
        opts.letter_spacing_mm = a.letter_spacing.map_or(0.0, |l| l.mm());
        opts.variations = a
            .font_variations
            .iter()
            .map(|v| parse_variation(v))
            .collect::<Result<_, _>>()?;
    }
    let outline =
        font::set_text(&label, &data, &opts).map_err(|e| CliError::input(e.to_string()))?;
    let cap_height_mm = match size {
        TextSize::CapHeight(c) => c,
        TextSize::Em(_) => font::set_text(
            &label,
            &data,
            &TextOptions {
                text: "H".into(),
                ..opts.clone()
            },
        )
        .ok()
        .and_then(|o| o.bounding_box())
        .map_or(0.0, |b| b.height()),
    };
    Ok((outline, TextJob { cap_height_mm }))
}

fn parse_variation(s: &str) -> Result<(String, f32), CliError> {
    let bad = || {
        CliError::usage(format!(
            "--font-variation '{s}': expected AXIS=VALUE such as wght=700"
        ))
    };
    let (tag, value) = s.split_once('=').ok_or_else(bad)?;
    let v: f32 = value.trim().parse().map_err(|_| bad())?;
    if !v.is_finite() {
        return Err(bad());
    }
    Ok((tag.trim().to_string(), v))
}

/// Everything the input options name, as one outline, plus the text job if any.
pub fn load(args: &InputArgs) -> Result<(Outline, Vec<PathBuf>, Option<TextJob>), CliError> {
    if !(args.px_per_inch.is_finite() && args.px_per_inch > 0.0) {
        return Err(CliError::usage(format!(
            "--px-per-inch {} must be a positive number",
            args.px_per_inch
        )));
    }
    let mut outline = Outline::default();
    let mut read = args.inputs.clone();
    for p in &args.inputs {
        outline.extend(read_outline(p, args.input_format, args.px_per_inch)?);
    }
    let text = match (&args.text, &args.text_file) {
        (Some(t), _) => Some(t.replace("\\n", "\n")),
        (None, Some(f)) => {
            let bytes = read_file(f)?;
            read.push(f.clone());
            Some(
                String::from_utf8(bytes)
                    .map_err(|_| CliError::input(format!("{}: not UTF-8 text", f.display())))?,
            )
        }
        (None, None) => None,
    };
    let mut job = None;
    match (&args.font, text) {
        (Some(font), Some(text)) => {
            read.push(font.clone());
            let (o, j) = read_text(
                font,
                text,
                args.cap_height.map(|l| l.mm()),
                args.em.map(|l| l.mm()),
                Some(args),
            )?;
            outline.extend(o);
            job = Some(j);
        }
        (Some(_), None) => return Err(CliError::usage("--font needs --text or --text-file")),
        (None, Some(_)) => {
            return Err(CliError::usage(
                "--text needs --font (a TrueType or OpenType file)",
            ))
        }
        (None, None) => {}
    }
    if read.is_empty() {
        return Err(CliError::usage(
            "no input: name SVG/JSON/G-code files, or --font with --text",
        ));
    }
    Ok((outline, read, job))
}
