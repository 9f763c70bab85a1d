//! Opening a font (single file or collection), choosing a variation instance and reading the
//! metrics that size and space the text.
//!
//! Metrics, from the OpenType specification 1.9:
//! - units per em: `head.unitsPerEm` ("head — Font Header Table"), 16 to 16384;
//! - cap height: `OS/2.sCapHeight` ("OS/2 — OS/2 and Windows Metrics Table", field present from
//!   table version 2), the height of flat-topped capitals above the baseline. Fonts with an older
//!   OS/2 table (DejaVu Sans has version 1) or a zero value get it measured instead: the top of
//!   the outline of the glyph for 'H' (U+0048), the letter the same section suggests measuring
//!   (the wording of that advice is from memory);
//! - line height: ascender − descender + line gap, in the `hhea` table ("hhea — Horizontal Header
//!   Table": ascender, descender, lineGap), or the `OS/2` typographic values (sTypoAscender,
//!   sTypoDescender, sTypoLineGap) when `OS/2.fsSelection` bit 7 USE_TYPO_METRICS is set, as
//!   ttf-parser's `ascender`, `descender` and `line_gap` choose (with `MVAR` deltas applied in
//!   variable fonts).

use std::panic::{catch_unwind, AssertUnwindSafe};

use ttf_parser::{FaceParsingError, Tag};

use super::pen::{self, GlyphShape};
use crate::InputError;

/// The font's face, shared by the shaper and the outline reader (rustybuzz's face derefs to
/// ttf-parser's, so variation coordinates set once serve both).
pub(crate) type Face<'a> = rustybuzz::Face<'a>;

/// Parse face `index` of `data`.
pub(crate) fn open<'a>(label: &str, data: &'a [u8], index: u32) -> Result<Face<'a>, InputError> {
    if data.is_empty() {
        return Err(InputError::new(label, "the font file is empty"));
    }
    let count = ttf_parser::fonts_in_collection(data);
    let face = ttf_parser::Face::parse(data, index).map_err(|e| {
        let missing = |table: &str| {
            InputError::new(
                label,
                format!(
                    "the required '{table}' table is missing or lies past the end of the file \
                     ({} bytes; truncated?)",
                    data.len()
                ),
            )
        };
        match e {
            FaceParsingError::UnknownMagic => InputError::new(
                label,
                "not a font: the file does not start with a TrueType, OpenType or font \
                 collection signature",
            ),
            FaceParsingError::FaceIndexOutOfBounds => InputError::at(
                label,
                format!("font index {index}"),
                match count {
                    Some(n) => format!(
                        "out of range: the collection holds {n} fonts (0 to {})",
                        n.saturating_sub(1)
                    ),
                    None => "out of range: the file holds a single font (index 0)".to_string(),
                },
            ),
            FaceParsingError::MalformedFont => InputError::new(
                label,
                format!(
                    "truncated or malformed font: its table directory runs past the end of the \
                     file ({} bytes)",
                    data.len()
                ),
            ),
            FaceParsingError::NoHeadTable => missing("head"),
            FaceParsingError::NoHheaTable => missing("hhea"),
            FaceParsingError::NoMaxpTable => missing("maxp"),
        }
    })?;
    // rustybuzz parses GSUB and GPOS here and can panic on corrupted ones (see layout.rs).
    catch_unwind(AssertUnwindSafe(|| rustybuzz::Face::from_face(face))).map_err(|_| {
        InputError::new(
            label,
            "the font's layout tables (GSUB or GPOS) are malformed: the shaper could not read them",
        )
    })
}

/// Set variation axes (`wght=700` is `("wght", 700.0)`); the font's default instance is used
/// for axes not named.
pub(crate) fn set_variations(
    label: &str,
    face: &mut Face<'_>,
    variations: &[(String, f32)],
) -> Result<(), InputError> {
    for (name, value) in variations {
        let place = format!("variation {name}={value}");
        let tag = parse_tag(name).ok_or_else(|| {
            InputError::at(label, &place, "an axis tag is 1 to 4 ASCII characters")
        })?;
        if !value.is_finite() {
            return Err(InputError::at(
                label,
                &place,
                "the axis value is not a finite number",
            ));
        }
        if !face.is_variable() {
            return Err(InputError::at(
                label,
                &place,
                "the font is not a variable font",
            ));
        }
        let axes = face.variation_axes();
        let Some(axis) = axes.into_iter().find(|a| a.tag == tag) else {
            let names: Vec<String> = axes.into_iter().map(|a| a.tag.to_string()).collect();
            return Err(InputError::at(
                label,
                &place,
                format!("the font has no such axis (its axes: {})", names.join(", ")),
            ));
        };
        if *value < axis.min_value || *value > axis.max_value {
            return Err(InputError::at(
                label,
                &place,
                format!(
                    "outside the axis range {} to {}",
                    axis.min_value, axis.max_value
                ),
            ));
        }
        face.set_variation(tag, *value).ok_or_else(|| {
            InputError::at(label, &place, "the font has too many axes to set (over 64)")
        })?;
    }
    Ok(())
}

/// An OpenType tag from 1 to 4 printable ASCII characters, padded with spaces (OpenType 1.9,
/// "Data types": Tag).
fn parse_tag(s: &str) -> Option<Tag> {
    if s.is_empty() || s.len() > 4 || !s.bytes().all(|b| (0x20..=0x7e).contains(&b)) {
        return None;
    }
    let mut b = [b' '; 4];
    b[..s.len()].copy_from_slice(s.as_bytes());
    Some(Tag::from_bytes(&b))
}

/// Where the cap height came from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) enum CapHeight {
    /// `OS/2.sCapHeight`, in font units.
    Os2(f64),
    /// The top of the 'H' outline, in font units.
    Measured(f64),
}

impl CapHeight {
    pub(crate) fn units(self) -> f64 {
        match self {
            CapHeight::Os2(v) | CapHeight::Measured(v) => v,
        }
    }
}

/// The cap height in font units: `OS/2.sCapHeight` if present and positive, else the top of
/// the glyph for 'H'; `None` when neither is there.
pub(crate) fn cap_height(face: &Face<'_>) -> Option<CapHeight> {
    if let Some(v) = face.capital_height().filter(|v| *v > 0) {
        return Some(CapHeight::Os2(f64::from(v)));
    }
    let h = face.glyph_index('H')?;
    match pen::outline(face, h) {
        GlyphShape::Contours(c) => c
            .iter()
            .flatten()
            .map(|s| s.bounding_box().y1)
            .reduce(f64::max)
            .filter(|top| *top > 0.0)
            .map(CapHeight::Measured),
        GlyphShape::Empty | GlyphShape::Points | GlyphShape::Failed(_) => None,
    }
}

/// The distance between baselines at line spacing 1, in font units: ascender − descender +
/// line gap; `None` if the font's values are not positive.
pub(crate) fn line_height(face: &Face<'_>) -> Option<f64> {
    let h = i32::from(face.ascender()) - i32::from(face.descender()) + i32::from(face.line_gap());
    (h > 0).then_some(f64::from(h))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn tags_are_padded_and_checked() {
        assert_eq!(parse_tag("wght"), Some(Tag::from_bytes(b"wght")));
        assert_eq!(parse_tag("ab"), Some(Tag::from_bytes(b"ab  ")));
        assert_eq!(parse_tag(""), None);
        assert_eq!(parse_tag("weight"), None);
        assert_eq!(parse_tag("wé"), None);
    }

    fn open_err(data: &[u8], index: u32) -> InputError {
        match open("x.ttf", data, index) {
            Ok(_) => panic!("{data:?} opened as a font"),
            Err(e) => e,
        }
    }

    #[test]
    fn bad_bytes_are_errors_not_panics() {
        assert!(open_err(&[], 0).message.contains("empty"));
        let e = open_err(b"GIF89a this is not a font", 0);
        assert!(e.message.starts_with("not a font"), "{e}");
        // A TrueType signature (0x00010000) with a table directory claiming 16 tables and
        // nothing after it (OpenType 1.9, "Organization of an OpenType font": table directory).
        let e = open_err(&[0, 1, 0, 0, 0, 16, 0, 0, 0, 0, 0, 0], 0);
        assert!(e.message.contains("truncated"), "{e}");
        // A collection header ('ttcf', version 1.0) saying it holds one font, cut short.
        let e = open_err(b"ttcf\x00\x01\x00\x00\x00\x00\x00\x01", 3);
        assert!(e.to_string().starts_with("x.ttf: "), "{e}");
    }
}
