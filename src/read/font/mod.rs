//! Font reader and text setting: a font file (TrueType, OpenType/CFF, CFF2, collections,
//! variable fonts) plus text into an [`Outline`] in millimetres, y pointing down.
//!
//! # Coordinates
//! Millimetres, y down as in SVG. The origin is the alignment point of the first line's
//! baseline: the baseline of line 1 is y = 0 (capitals rise to negative y, descenders go to
//! positive y), line n's baseline is at y = (n − 1) × pitch, and each line starts (left), is
//! centred (center) or ends (right) at x = 0. [`glyph_outline`] puts a single glyph's origin
//! (its left side bearing point on the baseline) at (0, 0).
//!
//! # Scale
//! Font outlines are in font units: integers on the em grid of `head.unitsPerEm` (OpenType 1.9,
//! "head — Font Header Table"). With s the millimetres per font unit, a point (x, y) of a glyph
//! placed with its origin at (x₀, y₀) lands at (x₀ + s·x, y₀ − s·y), and
//! - [`TextSize::Em`]`(e)`: s = e / unitsPerEm (the em square is e mm tall);
//! - [`TextSize::CapHeight`]`(h)`: s = h / capHeight, capHeight being `OS/2.sCapHeight`
//!   ("OS/2 — OS/2 and Windows Metrics Table", from version 2) when present and > 0, else the top
//!   of the 'H' outline (see `face.rs`); flat-topped capitals are then h mm tall.
//!
//! The line pitch is line spacing × (ascender − descender + lineGap) × s, from `hhea`
//! ("hhea — Horizontal Header Table") or the `OS/2` typographic metrics when the font asks for
//! them (`OS/2.fsSelection` bit 7). Letter spacing is in mm after each cluster but a line's
//! last (`layout.rs`).
//!
//! # What is reported
//! Every contour carries a [`Source`](crate::geom::Source): the file label, the element
//! `'A' (glyph 36) line 1 col 3` (the cluster's text, its glyph id, the 1-based line and
//! character column) and the contour index within the glyph. A character the font has no glyph
//! for (glyph 0, `.notdef`), a glyph whose outline fails to read and a visible character whose
//! glyph is empty go to [`Outline::skipped`] with that element and the reason, and are not
//! drawn. White space draws nothing and is not reported.
//!
//! Glyph outlines go through ttf-parser's `OutlineBuilder` (`pen.rs`): TrueType quadratics,
//! CFF and CFF2 cubics, composite glyphs resolved by ttf-parser, every contour closed.

mod face;
mod layout;
mod pen;

use kurbo::Affine;
use ttf_parser::GlyphId;

use crate::geom::{Contour, Outline, Source};
use crate::InputError;
use face::CapHeight;
use pen::GlyphShape;

/// The largest size accepted, in mm (100 m): beyond it a job is surely a units mistake.
pub const MAX_SIZE_MM: f64 = 1e5;

/// How big the text is, in mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum TextSize {
    /// The height of flat-topped capitals above the baseline.
    CapHeight(f64),
    /// The em size (what a point size names, here in mm).
    Em(f64),
}

/// Where each line sits relative to x = 0.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Align {
    /// Lines start at x = 0.
    #[default]
    Left,
    /// Lines are centred on x = 0.
    Center,
    /// Lines end at x = 0.
    Right,
}

/// A text job.
#[derive(Clone, Debug, PartialEq)]
pub struct TextOptions {
    /// The text; `\n` starts a new line (`\r\n` too).
    pub text: String,
    pub size: TextSize,
    /// Which font of a collection (`.ttc`, `.otc`); 0 for a single font.
    pub font_index: u32,
    pub align: Align,
    /// Distance between baselines as a factor of the font's line height (> 0).
    pub line_spacing: f64,
    /// Tracking: mm added after each letter (may be negative).
    pub letter_spacing_mm: f64,
    /// Variable-font axis settings such as `("wght", 700.0)`; unnamed axes keep their default.
    pub variations: Vec<(String, f32)>,
}

impl Default for TextOptions {
    fn default() -> TextOptions {
        TextOptions {
            text: String::new(),
            size: TextSize::CapHeight(10.0),
            font_index: 0,
            align: Align::Left,
            line_spacing: 1.0,
            letter_spacing_mm: 0.0,
            variations: Vec::new(),
        }
    }
}

/// Set `opts.text` in the font `font_data` (named `file_label` in sources and errors).
pub fn set_text(
    file_label: &str,
    font_data: &[u8],
    opts: &TextOptions,
) -> Result<Outline, InputError> {
    let err = |place: &str, msg: &str| InputError::at(file_label, place, msg);
    if opts.text.is_empty() {
        return Err(err("text", "the text is empty"));
    }
    let size_mm = match opts.size {
        TextSize::CapHeight(v) | TextSize::Em(v) => v,
    };
    check_size(file_label, "size", size_mm)?;
    if !(opts.line_spacing.is_finite() && opts.line_spacing > 0.0) {
        return Err(err(
            "line spacing",
            "must be a finite number greater than 0",
        ));
    }
    if !opts.letter_spacing_mm.is_finite() {
        return Err(err("letter spacing", "must be a finite number of mm"));
    }

    let mut face = face::open(file_label, font_data, opts.font_index)?;
    face::set_variations(file_label, &mut face, &opts.variations)?;
    let mut out = Outline::default();
    let upem = f64::from(face.units_per_em());
    let s = match opts.size {
        TextSize::Em(e) => e / upem,
        TextSize::CapHeight(h) => match face::cap_height(&face) {
            Some(cap) => {
                if let CapHeight::Measured(v) = cap {
                    out.warnings.push(format!(
                        "{file_label}: the font has no OS/2 cap height; measured the top of 'H' at {v} font units"
                    ));
                }
                h / cap.units()
            }
            None => {
                return Err(err(
                    "cap height",
                    "the font has no OS/2 cap height and no 'H' outline to measure; give an em size instead",
                ))
            }
        },
    };
    let line_height = face::line_height(&face).unwrap_or_else(|| {
        out.warnings.push(format!(
            "{file_label}: the font's ascender − descender + line gap is not positive; lines are 1 em apart"
        ));
        upem
    });
    layout::set(
        file_label,
        &face,
        s,
        opts.line_spacing * line_height * s,
        opts,
        &mut out,
    )?;
    if out.contours.is_empty() && out.skipped.is_empty() {
        out.warnings
            .push(format!("{file_label}: the text has no visible characters"));
    }
    Ok(out)
}

/// One glyph by id, its origin at (0, 0), y down, the em `em_mm` tall, at the font's default
/// instance. `Ok(None)` for a glyph with no outline (a space); an error for a glyph id out of
/// range or an outline that cannot be read. Sources name the file, `glyph N` and the contour.
pub fn glyph_outline(
    file_label: &str,
    font_data: &[u8],
    font_index: u32,
    glyph_id: u16,
    em_mm: f64,
) -> Result<Option<Vec<Contour>>, InputError> {
    check_size(file_label, "em size", em_mm)?;
    let face = face::open(file_label, font_data, font_index)?;
    let place = format!("glyph {glyph_id}");
    let n = face.number_of_glyphs();
    if glyph_id >= n {
        return Err(InputError::at(
            file_label,
            place,
            format!(
                "out of range: the font has {n} glyphs (0 to {})",
                n.saturating_sub(1)
            ),
        ));
    }
    let s = em_mm / f64::from(face.units_per_em());
    let a = Affine::new([s, 0.0, 0.0, -s, 0.0, 0.0]);
    match pen::outline(&face, GlyphId(glyph_id)) {
        GlyphShape::Contours(c) => Ok(Some(
            c.into_iter()
                .enumerate()
                .map(|(k, segs)| {
                    Contour::new(segs, true, Source::new(file_label, &place, k)).transformed(a)
                })
                .collect(),
        )),
        GlyphShape::Empty | GlyphShape::Points => Ok(None),
        GlyphShape::Failed(reason) => Err(InputError::at(file_label, place, reason)),
    }
}

/// The number of glyphs in face `font_index` (`maxp.numGlyphs`).
pub fn glyph_count(file_label: &str, font_data: &[u8], font_index: u32) -> Result<u16, InputError> {
    Ok(face::open(file_label, font_data, font_index)?.number_of_glyphs())
}

/// The number of fonts in the file: the collection's count, or 1 for a single font.
pub fn font_count(font_data: &[u8]) -> u32 {
    ttf_parser::fonts_in_collection(font_data).unwrap_or(1)
}

fn check_size(file_label: &str, place: &str, mm: f64) -> Result<(), InputError> {
    if mm.is_finite() && mm > 0.0 && mm <= MAX_SIZE_MM {
        Ok(())
    } else {
        Err(InputError::at(
            file_label,
            place,
            format!(
                "{} mm: a size must be a finite number greater than 0 and at most {MAX_SIZE_MM} mm",
                short(mm)
            ),
        ))
    }
}

/// A number as a person reads it: plain when moderate, else in exponent form (1e308, not 309
/// digits).
fn short(v: f64) -> String {
    if v != 0.0 && !(1e-4..1e9).contains(&v.abs()) {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}
