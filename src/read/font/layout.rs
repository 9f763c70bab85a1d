//! Text setting: each line shaped by rustybuzz (the font's `cmap`, its default `GSUB` features
//! such as ligatures and its `GPOS` or `kern` kerning, as HarfBuzz's default shaping does), then
//! placed on its baseline with tracking and alignment, each glyph's contours scaled to mm.
//!
//! Coordinates (mm, y down): baseline of line n (1-based) at y = (n − 1)·pitch, where
//! pitch = line spacing × line height × mm per unit (line height as in `face.rs`). Lines align
//! to x = 0: a left-aligned line starts there, a centred line has its middle there, a
//! right-aligned line ends there. A line's width is the sum of its advances plus the tracking.
//! Tracking (letter spacing) is added after every cluster but a line's last, so a mark attached
//! to its base letter stays with it and alignment is not thrown off by a trailing gap.
//!
//! rustybuzz is not free of panics on malformed layout tables (a corrupted `GSUB` coverage range
//! overflows an integer subtraction in its set digest, found by this crate's corruption test),
//! so the face is built (`face.rs`) and each line shaped under `catch_unwind`, and a panic becomes
//! an `InputError` naming the file (and the line).
//! The process's panic hook still prints its message to stderr when that happens, and a build
//! with `panic = "abort"` would abort there.
//!
//! A glyph in font units (x, y) lands at (pen + x_offset + x·s, baseline − y_offset − y·s) with
//! s mm per unit: the flip turns the font's y up into y down.

use std::collections::HashMap;
use std::panic::{catch_unwind, AssertUnwindSafe};

use kurbo::Affine;
use ttf_parser::GlyphId;

use super::face::Face;
use super::pen::{self, GlyphShape};
use super::{Align, TextOptions};
use crate::geom::{Contour, Outline, Skipped, Source};
use crate::InputError;

/// One glyph as placed by the shaper, before alignment.
struct Placed {
    glyph: u16,
    /// Pen position plus the shaper's offsets, in mm.
    x: f64,
    y: f64,
    /// Byte offset of its cluster in the line.
    cluster: usize,
}

/// Set `opts.text` with `s` mm per font unit and `pitch` mm between baselines, appending to
/// `out`.
pub(crate) fn set(
    label: &str,
    face: &Face<'_>,
    s: f64,
    pitch: f64,
    opts: &TextOptions,
    out: &mut Outline,
) -> Result<(), InputError> {
    let mut shapes: HashMap<u16, GlyphShape> = HashMap::new();
    for (i, line) in opts.text.split('\n').enumerate() {
        let line = line.strip_suffix('\r').unwrap_or(line);
        let (placed, width) = catch_unwind(AssertUnwindSafe(|| {
            shape_line(face, line, s, i as f64 * pitch, opts.letter_spacing_mm)
        }))
        .map_err(|_| {
            InputError::at(
                label,
                format!("text line {}", i + 1),
                "the font's layout tables (GSUB, GPOS or kern) are malformed: shaping failed",
            )
        })?;
        let shift = match opts.align {
            Align::Left => 0.0,
            Align::Center => -0.5 * width,
            Align::Right => -width,
        };
        let mut starts: Vec<usize> = placed.iter().map(|p| p.cluster).collect();
        starts.sort_unstable();
        starts.dedup();
        for p in &placed {
            let end = starts
                .iter()
                .find(|&&c| c > p.cluster)
                .map_or(line.len(), |&c| c);
            let text = &line[p.cluster..end];
            let col = line[..p.cluster].chars().count() + 1;
            let element = format!(
                "{} (glyph {}) line {} col {}",
                quoted(text),
                p.glyph,
                i + 1,
                col
            );
            let skip =
                |reason: String| Skipped::invalid(Source::new(label, element.clone(), 0), reason);
            if p.glyph == 0 {
                out.skipped.push(skip(format!(
                    "the font has no glyph for {}; not drawn (its advance is kept)",
                    code_points(text)
                )));
                continue;
            }
            let shape = shapes
                .entry(p.glyph)
                .or_insert_with(|| pen::outline(face, GlyphId(p.glyph)));
            match shape {
                GlyphShape::Contours(contours) => {
                    let a = Affine::new([s, 0.0, 0.0, -s, p.x + shift, p.y]);
                    for (k, segs) in contours.iter().enumerate() {
                        let source = Source::new(label, element.clone(), k);
                        if pen::encloses_no_area(segs) {
                            out.skipped.push(Skipped::hidden(
                                source,
                                "the contour encloses no area (its points lie on one line): \
                                 filled, it draws nothing; not cut",
                            ));
                        } else {
                            out.contours
                                .push(Contour::new(segs.clone(), true, source).transformed(a));
                        }
                    }
                }
                GlyphShape::Empty if text.chars().all(invisible) => {}
                GlyphShape::Empty => out.skipped.push(skip(format!(
                    "the glyph for {} has no outline; nothing drawn",
                    code_points(text)
                ))),
                GlyphShape::Points => out.skipped.push(Skipped::hidden(
                    Source::new(label, element.clone(), 0),
                    "the glyph's contours are single points (zero length): nothing drawn",
                )),
                GlyphShape::Failed(reason) => out.skipped.push(skip((*reason).to_string())),
            }
        }
    }
    Ok(())
}

/// Shape one line; returns the placed glyphs and the line's width in mm.
fn shape_line(
    face: &Face<'_>,
    line: &str,
    s: f64,
    baseline: f64,
    tracking: f64,
) -> (Vec<Placed>, f64) {
    let mut buf = rustybuzz::UnicodeBuffer::new();
    buf.push_str(line);
    buf.guess_segment_properties();
    let shaped = rustybuzz::shape(face, &[], buf);
    let infos = shaped.glyph_infos();
    let mut pen = 0.0;
    let mut placed = Vec::with_capacity(infos.len());
    for (k, (info, pos)) in infos.iter().zip(shaped.glyph_positions()).enumerate() {
        placed.push(Placed {
            // rustybuzz takes glyph ids from the font's tables, which are 16-bit.
            glyph: info.glyph_id as u16,
            x: pen + f64::from(pos.x_offset) * s,
            y: baseline - f64::from(pos.y_offset) * s,
            cluster: info.cluster as usize,
        });
        pen += f64::from(pos.x_advance) * s;
        if infos
            .get(k + 1)
            .is_some_and(|next| next.cluster != info.cluster)
        {
            pen += tracking;
        }
    }
    (placed, pen)
}

/// A cluster's text in single quotes, with control and invisible characters escaped.
fn quoted(text: &str) -> String {
    format!("'{}'", text.escape_debug())
}

/// The code points of a cluster, as `U+0041` and the character.
fn code_points(text: &str) -> String {
    text.chars()
        .map(|c| {
            format!(
                "U+{:04X} {}",
                u32::from(c),
                quoted(c.encode_utf8(&mut [0; 4]))
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// Characters that draw nothing by design: white space, controls and the Unicode
/// Default_Ignorable_Code_Point ranges (Unicode DerivedCoreProperties.txt; the list is from
/// memory). A glyph without an outline for any other character is reported as skipped.
fn invisible(c: char) -> bool {
    c.is_whitespace()
        || c.is_control()
        || matches!(u32::from(c),
            0x00AD | 0x034F | 0x061C | 0x115F..=0x1160 | 0x17B4..=0x17B5 | 0x180B..=0x180F
            | 0x200B..=0x200F | 0x202A..=0x202E | 0x2060..=0x206F | 0x3164 | 0xFE00..=0xFE0F
            | 0xFEFF | 0xFFA0 | 0xFFF0..=0xFFF8 | 0x1BCA0..=0x1BCA3 | 0x1D173..=0x1D17A
            | 0xE0000..=0xE0FFF)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn labels_escape_what_does_not_print() {
        assert_eq!(quoted("A"), "'A'");
        assert_eq!(quoted("fi"), "'fi'");
        assert_eq!(quoted("\t"), "'\\t'");
        assert_eq!(code_points("中"), "U+4E2D '中'");
    }

    #[test]
    fn invisible_characters() {
        for c in [' ', '\u{a0}', '\u{2003}', '\u{200b}', '\u{feff}', '\t'] {
            assert!(invisible(c), "{c:?}");
        }
        for c in ['A', '.', '中', '\u{301}'] {
            assert!(!invisible(c), "{c:?}");
        }
    }
}
