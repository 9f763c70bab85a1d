//! The cutter SVG: one stroked `<path>` per contour, in millimetres.
//!
//! **Page.** One user unit is one millimetre and coordinates are written unchanged, so the file,
//! the G-code and the contours agree point for point. The page (viewBox, and width/height in `mm`
//! with the same numbers, so the viewBox scale is exactly 1) spans from the origin, or from the
//! artwork's minimum where that is negative, to the artwork's maximum, plus a margin of one
//! stroke width and two units of the last decimal on every side (the page origin, the page size
//! and the artwork are each rounded by at most half a unit), so no stroke is clipped. Artwork in the
//! positive quadrant therefore reads back at the same millimetre coordinates with any SVG reader.
//!
//! **Path data.** `M`, `L`, `Q`, `C`, `A` (rx = ry, rotation 0, large-arc 0) and `Z` for a closed
//! contour, all absolute, every number with the fixed count of decimals d, so every written
//! number is within h = 0.5·10⁻ᵈ of the computed one. An arc is written in pieces of at most
//! 90°: the reader rebuilds each centre from the rounded end points and the rounded radius (SVG
//! 1.1 Appendix F.6.5), and with the chord at most r·√2 < 2r that reconstruction stays well
//! conditioned (the centre is r/√2 or more from the chord). A conic cannot be written: the
//! caller converts it first.
//!
//! **Rounding bound** (derived, first order in h). Each coordinate moves by ≤ h, each point by
//! ≤ δ = √2·h. A line or Bézier is a convex (Bernstein) combination of its control points, so
//! each of its points moves by ≤ √2·h (rigorous). An arc piece of sweep θ ≤ 90° is fixed by its
//! chord (midpoint M, direction, length c) and its radius r; rounding translates M by ≤ δ,
//! turns the chord by ≤ 2δ/c about M (moving points, all within c/2 of M, by ≤ δ), stretches
//! it by ≤ 2δ (≤ δ per end) and changes the bulge s = r − √(r² − c²/4) by
//! ≤ (c/(4√(r² − c²/4)))·2δ + (r/√(r² − c²/4) − 1)·h ≤ δ + 0.42·h. So every point of the piece
//! moves by ≤ 4·√2·h + 0.42·h < 6.1·h, for any θ ≤ 90°. [`svg_as_read`] gives the exact reread
//! geometry, so the caller bounds the rounding of that geometry (`convert`) rather than trusts
//! this.
//!
//! **Ids.** Each path's id is built from its `Source` (element and index), reduced to the ASCII
//! letters, digits, `-`, `.` and `_` that every XML name allows, and made unique with a `.2`,
//! `.3`, ... suffix; `data-source` holds the full `Source` text, XML-escaped.

use std::collections::HashSet;
use std::fmt::Write as _;

use kurbo::{ParamCurve, Point, Rect};

use super::{
    arc_pieces, as_written, check_segment, fixed, point_as_written, push_fixed, WriteError,
    MAX_DECIMALS,
};
use crate::geom::{
    svg_arc_to_center, CircularArc, Contour, Segment, Source, SvgArcParams, SvgArcShape,
};

/// How the SVG is written.
#[derive(Clone, Debug, PartialEq)]
pub struct SvgWriteOptions {
    /// Digits after the decimal point for every number, at most [`MAX_DECIMALS`].
    pub decimals: u32,
    /// Stroke width in mm (a hairline for cutting; common practice, no source).
    pub stroke_mm: f64,
}

impl Default for SvgWriteOptions {
    fn default() -> SvgWriteOptions {
        SvgWriteOptions {
            decimals: 4,
            stroke_mm: 0.1,
        }
    }
}

/// One path command with its numbers already as written.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Cmd {
    Move(Point),
    Line(Point),
    Quad(Point, Point),
    Cubic(Point, Point, Point),
    /// Circular arc piece of at most 90°: radius, sweep flag (1 = positive angle direction, from
    /// +x towards +y), end point.
    Arc(f64, bool, Point),
    Close,
}

/// The commands for one contour, with every number as it will be written.
fn commands(contour: &Contour, decimals: u32) -> Result<Vec<Cmd>, WriteError> {
    let pw = |p: Point| point_as_written(p, decimals);
    let mut cmds: Vec<Cmd> = contour
        .start()
        .map(|p| Cmd::Move(pw(p)))
        .into_iter()
        .collect();
    for (i, seg) in contour.segments.iter().enumerate() {
        check_segment(seg, &contour.source, i)?;
        match seg {
            Segment::Line(l) => cmds.push(Cmd::Line(pw(l.p1))),
            Segment::Quad(q) => cmds.push(Cmd::Quad(pw(q.p1), pw(q.p2))),
            Segment::Cubic(c) => cmds.push(Cmd::Cubic(pw(c.p1), pw(c.p2), pw(c.p3))),
            Segment::Arc(a) => {
                let r = as_written(a.radius, decimals);
                for piece in arc_pieces(a) {
                    cmds.push(Cmd::Arc(r, a.sweep > 0.0, pw(piece.eval(1.0))));
                }
            }
            Segment::Conic(_) => {
                return Err(WriteError::Unsupported {
                    source: contour.source.clone(),
                    segment: i,
                    kind: seg.kind(),
                    format: "SVG",
                })
            }
        }
    }
    if contour.closed && !cmds.is_empty() {
        cmds.push(Cmd::Close);
    }
    Ok(cmds)
}

fn validate(opts: &SvgWriteOptions) -> Result<(), WriteError> {
    if opts.decimals > MAX_DECIMALS {
        return Err(WriteError::Options(format!(
            "SVG decimals {} is more than {MAX_DECIMALS}",
            opts.decimals
        )));
    }
    if !(opts.stroke_mm.is_finite() && opts.stroke_mm > 0.0 && opts.stroke_mm <= 1000.0) {
        return Err(WriteError::Options(format!(
            "stroke width {} mm is not in (0, 1000] mm",
            opts.stroke_mm
        )));
    }
    Ok(())
}

/// The SVG document for `contours` (see the module docs for page, ids and numbers). Contours
/// without segments are left out: they hold nothing to cut.
pub fn svg_document(contours: &[Contour], opts: &SvgWriteOptions) -> Result<String, WriteError> {
    validate(opts)?;
    let d = opts.decimals;
    let bbox = contours
        .iter()
        .filter_map(|c| c.bounding_box())
        .reduce(|a, b| a.union(b))
        .unwrap_or(Rect::ZERO);
    let margin = opts.stroke_mm + 2.0 * 10f64.powi(-(d as i32));
    let (x0, y0) = ((bbox.x0 - margin).min(0.0), (bbox.y0 - margin).min(0.0));
    let (x1, y1) = ((bbox.x1 + margin).max(0.0), (bbox.y1 + margin).max(0.0));
    let (w, h) = (fixed(x1 - x0, d), fixed(y1 - y0, d));

    let mut out = String::new();
    out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    let _ = writeln!(
        out,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{w}mm\" \
         height=\"{h}mm\" viewBox=\"{} {} {w} {h}\">",
        fixed(x0, d),
        fixed(y0, d)
    );
    let mut used = HashSet::new();
    let stroke = fixed(opts.stroke_mm, d.max(3));
    for contour in contours {
        // (One contour at a time: the commands of a whole job need not be held at once.)
        let cmds = commands(contour, d)?;
        if cmds.is_empty() {
            continue;
        }
        let _ = write!(
            out,
            "  <path id=\"{}\" data-source=\"{}\" fill=\"none\" stroke=\"black\" \
             stroke-width=\"{stroke}\" d=\"",
            unique_id(&contour.source, &mut used),
            escape(&contour.source.to_string()),
        );
        push_path_data(&mut out, &cmds, d);
        out.push_str("\"/>\n");
    }
    out.push_str("</svg>\n");
    Ok(out)
}

/// Append the path data of `cmds` (commands and numbers separated by single spaces).
fn push_path_data(out: &mut String, cmds: &[Cmd], d: u32) {
    let point = |out: &mut String, p: Point| {
        out.push(' ');
        push_fixed(out, p.x, d);
        out.push(' ');
        push_fixed(out, p.y, d);
    };
    for (i, c) in cmds.iter().enumerate() {
        if i > 0 {
            out.push(' ');
        }
        match *c {
            Cmd::Move(a) => {
                out.push('M');
                point(out, a);
            }
            Cmd::Line(a) => {
                out.push('L');
                point(out, a);
            }
            Cmd::Quad(a, b) => {
                out.push('Q');
                point(out, a);
                point(out, b);
            }
            Cmd::Cubic(a, b, e) => {
                out.push('C');
                point(out, a);
                point(out, b);
                point(out, e);
            }
            Cmd::Arc(r, sweep, e) => {
                let r = fixed(r, d);
                let _ = write!(out, "A {r} {r} 0 0 {}", u8::from(sweep));
                point(out, e);
            }
            Cmd::Close => out.push('Z'),
        }
    }
}

/// An XML id from the source's element and index (see the module docs), unique in `used`.
fn unique_id(source: &Source, used: &mut HashSet<String>) -> String {
    let raw = format!("{}-{}", source.element, source.index);
    let mut base = String::new();
    for ch in raw.chars() {
        let ch = if ch.is_ascii_alphanumeric() || matches!(ch, '-' | '.') {
            ch
        } else {
            '_'
        };
        if !(ch == '_' && (base.is_empty() || base.ends_with('_'))) {
            base.push(ch);
        }
    }
    if !base.starts_with(|c: char| c.is_ascii_alphabetic() || c == '_') {
        base.insert(0, 'c');
    }
    let mut id = base.clone();
    let mut k = 2;
    while used.contains(&id) {
        id = format!("{base}.{k}");
        k += 1;
    }
    used.insert(id.clone());
    id
}

/// Text fit for a double-quoted XML attribute. Characters XML 1.0 forbids even as references
/// (C0 controls other than tab, newline, return; U+FFFE, U+FFFF) become U+FFFD.
fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            '\t' => out.push_str("&#9;"),
            '\n' => out.push_str("&#10;"),
            '\r' => out.push_str("&#13;"),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => out.push('\u{FFFD}'),
            c => out.push(c),
        }
    }
    out
}

/// The geometry a reader of the written file gets back for `contour`: points as written, and
/// each arc piece rebuilt from its rounded end points and rounded radius by the SVG end-point
/// rules ([`svg_arc_to_center`]), exactly as a reader does (an arc whose rounded end points
/// coincide is omitted, one with a zero rounded radius is a line; `Z` adds a closing line when
/// the rounded end is not the rounded start). A contour smaller than the rounding step can
/// come back with no segments at all. Fails where [`svg_document`] fails.
pub fn svg_as_read(contour: &Contour, decimals: u32) -> Result<Contour, WriteError> {
    validate(&SvgWriteOptions {
        decimals,
        stroke_mm: 1.0,
    })?;
    let mut segments = Vec::new();
    let (mut pen, mut start) = (Point::ORIGIN, Point::ORIGIN);
    for cmd in commands(contour, decimals)? {
        match cmd {
            Cmd::Move(p) => {
                pen = p;
                start = p;
                continue;
            }
            Cmd::Line(p) => segments.push(Segment::Line(kurbo::Line::new(pen, p))),
            Cmd::Quad(a, p) => segments.push(Segment::Quad(kurbo::QuadBez::new(pen, a, p))),
            Cmd::Cubic(a, b, p) => {
                segments.push(Segment::Cubic(kurbo::CubicBez::new(pen, a, b, p)))
            }
            Cmd::Arc(r, sweep, p) => {
                let shape = svg_arc_to_center(&SvgArcParams {
                    from: pen,
                    rx: r,
                    ry: r,
                    x_rotation_deg: 0.0,
                    large_arc: false,
                    sweep,
                    to: p,
                });
                match shape {
                    SvgArcShape::Omitted => {}
                    SvgArcShape::Line => segments.push(Segment::Line(kurbo::Line::new(pen, p))),
                    SvgArcShape::Arc(e) => segments.push(Segment::Arc(CircularArc {
                        center: e.center,
                        radius: e.radii.x,
                        start_angle: e.start_angle,
                        sweep: e.sweep,
                    })),
                }
            }
            Cmd::Close => {
                if pen != start {
                    segments.push(Segment::Line(kurbo::Line::new(pen, start)));
                }
            }
        }
        if let Cmd::Line(p) | Cmd::Quad(_, p) | Cmd::Cubic(_, _, p) | Cmd::Arc(_, _, p) = cmd {
            pen = p;
        }
    }
    Ok(Contour::new(
        segments,
        contour.closed,
        contour.source.clone(),
    ))
}
