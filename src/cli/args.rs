//! The command line as typed: clap definitions, validated into ratline's own types on parsing
//! (lengths with units, the tolerance newtype, enums). Turning them into work happens in the
//! sibling modules.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand, ValueEnum};

use crate::geom::{Length, Tolerance};

#[derive(Parser, Debug)]
#[command(
    name = "ratline",
    version,
    about = "Outlines from SVG artwork and fonts to cutter-ready paths, with the deviation measured and certified",
    long_about = None
)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Fit artwork and/or text to the primitives a machine accepts and write SVG, G-code, a report.
    Convert(Box<ConvertArgs>),
    /// Measure how far a converted file strays from its reference.
    Verify(VerifyArgs),
    /// List the contours of an input with their sizes, direction and problems.
    Inspect(InspectArgs),
    /// Run the bundled sample sign job and write its files.
    Demo(DemoArgs),
}

/// What the output is made of.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum ToArg {
    Lines,
    Quadratic,
    Cubic,
    Arcs,
    /// No fitting: the exact outline (conics kept) in ratline's JSON format.
    Exact,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum InputFormat {
    Svg,
    Json,
    Gcode,
}

#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, ValueEnum)]
pub enum AlignArg {
    #[default]
    Left,
    Center,
    Right,
}

/// Where outlines come from: files and/or a line of text set in a font.
#[derive(Args, Debug, Clone)]
pub struct InputArgs {
    /// SVG artwork, ratline JSON outlines or G-code (by extension, or --input-format).
    pub inputs: Vec<PathBuf>,
    /// Read every input file as this format instead of guessing from its extension.
    #[arg(long, value_enum)]
    pub input_format: Option<InputFormat>,
    /// SVG pixels per inch for files without physical units (CSS uses 96; some older files 90).
    #[arg(long, default_value_t = 96.0)]
    pub px_per_inch: f64,
    /// A TrueType or OpenType font file for --text.
    #[arg(long)]
    pub font: Option<PathBuf>,
    /// Text to set in --font ("\n" starts a new line).
    #[arg(long, conflicts_with = "text_file")]
    pub text: Option<String>,
    /// Read the text to set from a file.
    #[arg(long)]
    pub text_file: Option<PathBuf>,
    /// Height of the capital letters (how sign letters are specified), e.g. 50mm.
    #[arg(long, conflicts_with = "em")]
    pub cap_height: Option<Length>,
    /// Size of the font's em square instead of the cap height.
    #[arg(long)]
    pub em: Option<Length>,
    /// Which font of a collection (.ttc/.otc).
    #[arg(long, default_value_t = 0)]
    pub font_index: u32,
    /// A variable-font axis setting such as wght=700 (repeatable).
    #[arg(long = "font-variation", value_name = "AXIS=VALUE")]
    pub font_variations: Vec<String>,
    /// How the lines of text line up with each other.
    #[arg(long = "align", value_enum, default_value_t = AlignArg::Left)]
    pub text_align: AlignArg,
    /// Distance between baselines as a factor of the font's line height.
    #[arg(long, default_value_t = 1.0)]
    pub line_spacing: f64,
    /// Extra space after each letter (tracking), e.g. 0.5mm.
    #[arg(long)]
    pub letter_spacing: Option<Length>,
}

#[derive(Args, Debug)]
pub struct ConvertArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// The primitive to fit to.
    #[arg(long, value_enum, default_value_t = ToArg::Cubic)]
    pub to: ToArg,
    /// Largest allowed deviation from the exact outline, e.g. 0.01mm (bare numbers are mm).
    #[arg(long, default_value = "0.01mm")]
    pub tolerance: Tolerance,
    /// The cutter SVG (.svg), or ratline JSON outlines (.json; required for --to exact).
    #[arg(short = 'o', long = "output")]
    pub output: Option<PathBuf>,
    /// Also write G-code: arcs as G2/G3 when --to arcs, straight G1 moves otherwise.
    #[arg(long)]
    pub gcode: Option<PathBuf>,
    /// Write the deviation report as JSON.
    #[arg(long)]
    pub report: Option<PathBuf>,
    /// Write a self-contained HTML page overlaying the source and the output, contour by
    /// contour, coloured by how much of the tolerance each uses.
    #[arg(long)]
    pub html: Option<PathBuf>,
    #[command(flatten)]
    pub prep: PrepArgs,
    /// Stop with an error once an output passes this many segments (a tolerance far finer than
    /// the machine resolves can multiply the output).
    #[arg(long, default_value_t = crate::convert::DEFAULT_MAX_SEGMENTS, value_parser = clap::value_parser!(usize))]
    pub max_segments: usize,
    #[command(flatten)]
    pub machine: MachineArgs,
    /// Print nothing on success (errors still go to stderr).
    #[arg(short, long)]
    pub quiet: bool,
}

/// G-code motion settings. The defaults are placeholders for a dry run: set them for the real
/// machine, tool and material.
#[derive(Args, Debug, Clone)]
pub struct MachineArgs {
    /// Z for travel moves, above the work.
    #[arg(long, default_value = "5mm")]
    pub safe_z: Length,
    /// Z while cutting (negative is into the material).
    #[arg(long, default_value = "-0.5mm", allow_hyphen_values = true)]
    pub cut_z: Length,
    /// Cutting feed in mm/min.
    #[arg(long, default_value_t = 600.0)]
    pub feed: f64,
    /// Plunge feed in mm/min.
    #[arg(long, default_value_t = 100.0)]
    pub plunge_rate: f64,
    /// Spindle speed in rpm (omit for lasers, drag knives and pens).
    #[arg(long)]
    pub spindle_rpm: Option<f64>,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum VerifyAlign {
    /// Compare as placed.
    None,
    /// First move the candidate so its bounding box sits on the reference's.
    Bbox,
}

#[derive(Args, Debug)]
pub struct VerifyArgs {
    /// REFERENCE CANDIDATE: the reference artwork (SVG, JSON outlines, G-code) and the converted
    /// file to check (SVG, JSON outlines or G-code); with --font/--text, only CANDIDATE.
    #[arg(required = true, num_args = 1..=2, value_name = "FILE")]
    pub files: Vec<PathBuf>,
    #[arg(long, default_value = "0.01mm")]
    pub tolerance: Tolerance,
    #[arg(long, value_enum, default_value_t = VerifyAlign::None)]
    pub align: VerifyAlign,
    #[arg(long)]
    pub report: Option<PathBuf>,
    #[arg(long)]
    pub html: Option<PathBuf>,
    /// Font job for the reference side.
    #[command(flatten)]
    pub text: TextOnlyArgs,
    #[arg(long, default_value_t = 96.0)]
    pub px_per_inch: f64,
    #[arg(short, long)]
    pub quiet: bool,
}

impl VerifyArgs {
    /// The reference file, when two files are given.
    pub fn reference(&self) -> Option<&PathBuf> {
        (self.files.len() == 2).then(|| &self.files[0])
    }

    /// The candidate: the last file given.
    pub fn candidate(&self) -> &PathBuf {
        &self.files[self.files.len() - 1]
    }
}

/// The font options of a reference given as text.
#[derive(Args, Debug, Clone, Default)]
pub struct TextOnlyArgs {
    #[arg(long)]
    pub font: Option<PathBuf>,
    #[arg(long)]
    pub text: Option<String>,
    #[arg(long, conflicts_with = "em")]
    pub cap_height: Option<Length>,
    #[arg(long)]
    pub em: Option<Length>,
}

#[derive(Args, Debug)]
pub struct InspectArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// Print JSON instead of a table.
    #[arg(long)]
    pub json: bool,
}

#[derive(Args, Debug)]
pub struct DemoArgs {
    /// Folder to write the sample job's files into.
    #[arg(long, default_value = "output")]
    pub out: PathBuf,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum KerfSideArg {
    /// Outer contours out, holes in: the part keeps its drawn size.
    Outside,
    /// Outer contours in, holes out: the opening keeps its size.
    Inside,
    /// No offset.
    None,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum DirectionArg {
    Keep,
    Cw,
    Ccw,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum OrderArg {
    AsDrawn,
    InsideFirst,
    ShortTravel,
}

/// Cut preparation, applied to the exact outline before fitting. Every step is off unless asked.
#[derive(Args, Debug, Clone)]
pub struct PrepArgs {
    /// Tool width (kerf): contours move by half of it, to the side --kerf-side says.
    #[arg(long)]
    pub kerf: Option<Length>,
    #[arg(long, value_enum, default_value_t = KerfSideArg::Outside)]
    pub kerf_side: KerfSideArg,
    /// Drag-knife blade offset, the tip's distance behind the knife axis (about 0.25mm for 45°
    /// blades, 0.5mm for 60°; check the blade maker's figure).
    #[arg(long)]
    pub blade_offset: Option<Length>,
    /// With --blade-offset: corners turning more than this many degrees get a swivel arc.
    #[arg(long, default_value_t = 30.0)]
    pub corner_threshold: f64,
    /// Closed contours continue this far past their start so the cut closes.
    #[arg(long)]
    pub overcut: Option<Length>,
    /// A rectangle around the whole design at this margin, for weeding.
    #[arg(long)]
    pub weed_border: Option<Length>,
    /// With --weed-border: this many vertical lines splitting the waste into strips.
    #[arg(long, default_value_t = 0)]
    pub weed_lines: usize,
    /// Direction of outer contours (holes run the other way).
    #[arg(long, value_enum, default_value_t = DirectionArg::Keep)]
    pub direction: DirectionArg,
    /// Cut order: as drawn, every hole before the contour around it, or also the shortest
    /// pen-up travel.
    #[arg(long, value_enum, default_value_t = OrderArg::AsDrawn)]
    pub order: OrderArg,
}
