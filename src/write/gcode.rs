//! G-code for routers, engravers and lasers: ISO 6983 words as specified by the NIST RS274NGC
//! Interpreter, Version 3 (Kramer, Proctor, Messina, NISTIR 6556, 2000).
//!
//! **Program.** A comment header (units, the bounding box in machine coordinates, Z levels and
//! feeds, safety cautions, the caller's lines), then `G21 G90 G17` (millimetres §3.5.7,
//! absolute §3.5.17, XY plane §3.5.6), `M3 S…` only when a spindle speed is given, and per
//! contour: `G0` to safe Z, `G0` to the start, `G1` plunge to cut Z at the plunge rate, the cut at
//! the feed rate, `G0` back to safe Z. The end lifts the tool, stops the spindle (`M5`) and ends
//! the program (`M2`). `G0` moves only travel, never cut (NISTIR 6556: no cutting is expected
//! during G0).
//!
//! **Frames.** Contours are in mm with y down; the machine's y points up: y_m = −y. Mirroring
//! reverses the sense of turning, so an arc with positive sweep in y-down coordinates (from +x
//! towards +y, clockwise on screen, SVG sweep-flag 1) is clockwise seen from +Z: `G2`; a negative
//! sweep is `G3` (§3.5.3).
//!
//! **Arcs.** Each arc is written in pieces of at most 90°, in centre format (I, J: the centre's
//! offset from the current point). The controller starts a piece at the previous *rounded* end
//! point S and must end at the rounded end point E, and NISTIR 6556 §3.5.3 requires |CS| and |CE|
//! to differ by at most 0.002 mm. The centre is therefore placed as a reader of an SVG arc would:
//! on the perpendicular bisector of S and E, at distance √(r² − |SE|²/4) from the chord, on the
//! side that makes a minor arc in the arc's direction, so that it is exactly equidistant; then I
//! and J are rounded. Rounding moves the centre by ≤ √2·h (h = 0.5·10⁻ᵈ), and the radius
//! difference f(C) = |CS| − |CE| has gradient of norm 2·sin(∠SCE/2) ≤ 2·sin 45° = √2 for a piece
//! of ≤ 90°, so |CS| − |CE| ≤ √2·√2·h = 10⁻ᵈ ≤ 0.001 mm with the ≥ 3 decimals required here
//! (derived). Should rounding put the centre across the chord (possible only when |SE| is a few
//! h, where the piece is within its chord length of the chord), the piece is written as a `G1`
//! line instead, since the controller would otherwise trace the major arc. A piece whose rounded
//! end equals its start is left out: in centre format it would be a full circle.
//!
//! **Rounding bound** (derived, first order in h). Lines move by ≤ √2·h. An arc piece moves by
//! ≤ 4·√2·h from its rounded end points (the chord argument of `svg.rs`, with the radius exact),
//! and by ≤ 2·√2·h more from the rounded I, J (the centre by ≤ √2·h, the start radius by
//! ≤ √2·h): ≤ 6·√2·h ≈ 8.5·h in all. [`gcode_as_read`] gives the traced geometry exactly, so the
//! caller measures it.

use std::f64::consts::PI;

use kurbo::{Line, ParamCurve, Point, Rect, Vec2};

use super::WriteError;
use super::{arc_pieces, as_written, check_segment, fixed, point_as_written, push_fixed};
use super::{MAX_COORDINATE_MM, MAX_DECIMALS};
use crate::geom::{Contour, Segment};
use crate::read::gcode::centre_format_arc;

/// The fewest decimals that keep every arc within the 0.002 mm radius rule (module docs).
pub const MIN_GCODE_DECIMALS: u32 = 3;

/// How the program is written. Lengths in mm, rates in mm/min.
#[derive(Clone, Debug, PartialEq)]
pub struct GcodeOptions {
    /// Digits after the decimal point, from [`MIN_GCODE_DECIMALS`] to [`MAX_DECIMALS`].
    pub decimals: u32,
    /// Z for travel moves, above the work.
    pub safe_z: f64,
    /// Z while cutting; below `safe_z`.
    pub cut_z: f64,
    /// Cutting feed rate, mm/min.
    pub feed: f64,
    /// Plunge feed rate, mm/min.
    pub plunge_rate: f64,
    /// Spindle speed in rpm; `None` writes no spindle start (lasers, drag knives, pens).
    pub spindle_rpm: Option<f64>,
    /// Extra comment lines for the header (tolerance, source, ...).
    pub header: Vec<String>,
}

impl Default for GcodeOptions {
    /// Placeholder values for a dry run (common practice, no source): set Z levels and rates
    /// for the real machine, tool and material.
    fn default() -> GcodeOptions {
        GcodeOptions {
            decimals: 4,
            safe_z: 5.0,
            cut_z: -0.5,
            feed: 600.0,
            plunge_rate: 100.0,
            spindle_rpm: None,
            header: Vec::new(),
        }
    }
}

/// One cutting move in machine coordinates (mm, y up), numbers as written.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Move {
    Line(Point),
    /// End point, centre offset (I, J) from the start, clockwise (G2).
    Arc(Point, Vec2, bool),
}

/// A contour as the program moves: its rounded start and cutting moves.
struct Plan {
    start: Point,
    moves: Vec<Move>,
}

fn machine(p: Point) -> Point {
    Point::new(p.x, -p.y)
}

/// The centre for a minor arc of radius `r` from `s` to `e` (machine frame), on the bisector.
fn bisector_centre(s: Point, e: Point, r: f64, clockwise: bool) -> Point {
    let chord = e - s;
    let c = chord.hypot();
    let k = (r * r - 0.25 * c * c).max(0.0).sqrt();
    // Left normal of the chord (y up): a clockwise minor arc has its centre on the right.
    let n = Vec2::new(-chord.y, chord.x) / c;
    s.midpoint(e) + if clockwise { -k } else { k } * n
}

fn plan(contour: &Contour, d: u32) -> Result<Option<Plan>, WriteError> {
    let pw = |p: Point| point_as_written(machine(p), d);
    let Some(first) = contour.start() else {
        return Ok(None);
    };
    let start = pw(first);
    let (mut pen, mut moves) = (start, Vec::new());
    for (i, seg) in contour.segments.iter().enumerate() {
        check_segment(seg, &contour.source, i)?;
        match seg {
            Segment::Line(l) => {
                let e = pw(l.p1);
                if e != pen {
                    moves.push(Move::Line(e));
                    pen = e;
                }
            }
            Segment::Arc(a) => {
                let clockwise = a.sweep > 0.0;
                for piece in arc_pieces(a) {
                    let e = pw(piece.eval(1.0));
                    if e == pen {
                        continue;
                    }
                    let c = bisector_centre(pen, e, a.radius, clockwise);
                    let ij = Vec2::new(as_written(c.x - pen.x, d), as_written(c.y - pen.y, d));
                    let traced = centre_format_arc(pen, e, pen + ij, clockwise);
                    moves.push(if ij == Vec2::ZERO || traced.sweep.abs() > PI {
                        Move::Line(e)
                    } else {
                        Move::Arc(e, ij, clockwise)
                    });
                    pen = e;
                }
            }
            Segment::Quad(_) | Segment::Cubic(_) | Segment::Conic(_) => {
                return Err(WriteError::Unsupported {
                    source: contour.source.clone(),
                    segment: i,
                    kind: seg.kind(),
                    format: "G-code (lines and arcs only)",
                })
            }
        }
    }
    if contour.closed && pen != start {
        moves.push(Move::Line(start));
    }
    Ok(Some(Plan { start, moves }))
}

fn validate(opts: &GcodeOptions) -> Result<(), WriteError> {
    let bad = |m: String| Err(WriteError::Options(m));
    if !(MIN_GCODE_DECIMALS..=MAX_DECIMALS).contains(&opts.decimals) {
        return bad(format!(
            "G-code decimals {} is not in {MIN_GCODE_DECIMALS}..={MAX_DECIMALS} (fewer than \
             {MIN_GCODE_DECIMALS} cannot keep arcs within the 0.002 mm radius rule)",
            opts.decimals
        ));
    }
    let z_ok = |z: f64| z.is_finite() && z.abs() <= MAX_COORDINATE_MM;
    if !(z_ok(opts.safe_z) && z_ok(opts.cut_z) && opts.safe_z > opts.cut_z) {
        return bad(format!(
            "safe Z {} and cut Z {} must be finite with safe Z above cut Z",
            opts.safe_z, opts.cut_z
        ));
    }
    let rate_ok = |f: f64| f.is_finite() && f > 0.0 && f <= 1e6;
    if !(rate_ok(opts.feed) && rate_ok(opts.plunge_rate)) {
        return bad(format!(
            "feed {} and plunge rate {} mm/min must be in (0, 1e6]",
            opts.feed, opts.plunge_rate
        ));
    }
    if let Some(s) = opts.spindle_rpm {
        if !rate_ok(s) {
            return bad(format!("spindle speed {s} rpm must be in (0, 1e6]"));
        }
    }
    Ok(())
}

/// Text fit for an RS274NGC comment: no parentheses (a comment ends at the first `)`), no line
/// breaks or control characters.
fn comment(s: &str) -> String {
    let body: String = s
        .chars()
        .map(|c| match c {
            '(' => '[',
            ')' => ']',
            c if c.is_control() => ' ',
            c => c,
        })
        .collect();
    format!("({body})")
}

/// The safety notes every program carries (REFERENCES §8, common practice, no source).
const CAUTIONS: [&str; 4] = [
    "CAUTION: follow the machine maker's instructions for lasers, spindles and blades",
    "CAUTION: never laser-cut PVC or vinyl: it gives off chlorine fumes",
    "CAUTION: wear eye and hearing protection, clamp the work, keep hands clear",
    "CAUTION: air-cut first with the tool raised; check the zero point and safe Z",
];

/// The G-code program for `contours` (see the module docs). Quadratic and cubic Béziers and
/// conics are refused: fit them to lines or arcs first. Contours without segments are left out.
pub fn gcode_program(contours: &[Contour], opts: &GcodeOptions) -> Result<String, WriteError> {
    validate(opts)?;
    let d = opts.decimals;
    // (`plan` leaves out exactly the contours without a start point.)
    let planned = contours.iter().filter(|c| c.start().is_some()).count();
    let n = |x: f64| fixed(x, d);
    let mut out = String::new();
    let line = |out: &mut String, s: &str| {
        out.push_str(s);
        out.push('\n');
    };
    line(
        &mut out,
        &comment("ratline G-code: millimetres [G21], absolute [G90], XY plane [G17]"),
    );
    let bbox = contours
        .iter()
        .filter_map(|c| c.bounding_box())
        .reduce(|a, b| a.union(b))
        .map(|b| Rect::new(b.x0, -b.y1, b.x1, -b.y0));
    line(
        &mut out,
        &comment(&match bbox {
            Some(b) => format!(
                "bounding box, machine coordinates: X {} to {}, Y {} to {} mm",
                n(b.x0),
                n(b.x1),
                n(b.y0),
                n(b.y1)
            ),
            None => "no contours".to_string(),
        }),
    );
    line(
        &mut out,
        &comment(&format!(
            "Z safe {} cut {} mm; feed {} plunge {} mm/min; contours: {}",
            n(opts.safe_z),
            n(opts.cut_z),
            n(opts.feed),
            n(opts.plunge_rate),
            planned
        )),
    );
    for c in CAUTIONS {
        line(&mut out, &comment(c));
    }
    for h in &opts.header {
        line(&mut out, &comment(h));
    }
    line(&mut out, "G21 G90 G17");
    let safe = format!("G0 Z{}", n(opts.safe_z));
    line(&mut out, &safe);
    if let Some(rpm) = opts.spindle_rpm {
        line(&mut out, &format!("M3 S{}", fixed(rpm, 0)));
    }
    for contour in contours {
        // (Planned one contour at a time: the moves of a whole job need not be held at once.)
        let Some(p) = plan(contour, d)? else {
            continue;
        };
        line(&mut out, &comment(&contour.source.to_string()));
        line(&mut out, &safe);
        line(&mut out, &format!("G0 X{} Y{}", n(p.start.x), n(p.start.y)));
        line(
            &mut out,
            &format!("G1 Z{} F{}", n(opts.cut_z), n(opts.plunge_rate)),
        );
        let mut feed = format!(" F{}", n(opts.feed));
        for m in &p.moves {
            let (w, e, ij) = match *m {
                Move::Line(e) => ("G1", e, None),
                Move::Arc(e, ij, cw) => (if cw { "G2" } else { "G3" }, e, Some(ij)),
            };
            let word = |out: &mut String, letter: &str, x: f64| {
                out.push_str(letter);
                push_fixed(out, x, d);
            };
            out.push_str(w);
            word(&mut out, " X", e.x);
            word(&mut out, " Y", e.y);
            if let Some(ij) = ij {
                word(&mut out, " I", ij.x);
                word(&mut out, " J", ij.y);
            }
            out.push_str(&feed);
            out.push('\n');
            feed.clear();
        }
        line(&mut out, &safe);
    }
    line(&mut out, "M5");
    line(&mut out, "M2");
    Ok(out)
}

/// The geometry a controller traces from the written numbers of `contour`, in mm with y down:
/// lines between rounded points and, for each arc piece, the arc about the written centre from
/// the rounded start with the start radius ([`centre_format_arc`]). Fails where
/// [`gcode_program`] fails on `contour`.
pub fn gcode_as_read(contour: &Contour, decimals: u32) -> Result<Contour, WriteError> {
    validate(&GcodeOptions {
        decimals,
        ..GcodeOptions::default()
    })?;
    let mut segments = Vec::new();
    if let Some(p) = plan(contour, decimals)? {
        let mut pen = p.start;
        for m in p.moves {
            let (seg, e) = match m {
                Move::Line(e) => (Segment::Line(Line::new(machine(pen), machine(e))), e),
                Move::Arc(e, ij, cw) => (Segment::Arc(centre_format_arc(pen, e, pen + ij, cw)), e),
            };
            segments.push(seg);
            pen = e;
        }
    }
    Ok(Contour::new(
        segments,
        contour.closed,
        contour.source.clone(),
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::{CircularArc, Source};

    fn arc_contour(a: CircularArc) -> Contour {
        Contour::new(vec![Segment::Arc(a)], false, Source::new("t.svg", "#a", 0))
    }

    #[test]
    fn positive_sweep_in_y_down_is_g2() {
        // y down: from (10,0) about the origin by +90° reaches (0,10), clockwise on screen. In
        // the machine frame that is (10,0) → (0,−10) about the origin: clockwise seen from +Z,
        // G2 (NISTIR 6556 §3.5.3; REFERENCES §7: SVG sweep-flag 1 becomes G2).
        let a = CircularArc {
            center: Point::ORIGIN,
            radius: 10.0,
            start_angle: 0.0,
            sweep: std::f64::consts::FRAC_PI_2,
        };
        let prog = gcode_program(&[arc_contour(a)], &GcodeOptions::default()).unwrap();
        assert!(
            prog.contains("G2 X0.0000 Y-10.0000 I-10.0000 J0.0000 F600.0000"),
            "{prog}"
        );
        let prog = gcode_program(&[arc_contour(a.reversed())], &GcodeOptions::default()).unwrap();
        assert!(
            prog.contains("G3 X10.0000 Y0.0000 I0.0000 J10.0000"),
            "{prog}"
        );
    }

    #[test]
    fn program_frame_and_order() {
        let c = Contour::new(
            vec![Segment::Line(Line::new((1.0, 2.0), (3.0, 2.0)))],
            false,
            Source::new("job (1).svg", "#x", 0),
        );
        let opts = GcodeOptions {
            spindle_rpm: Some(18000.0),
            header: vec!["tolerance 0.01 mm\nsecond line".into()],
            ..GcodeOptions::default()
        };
        let prog = gcode_program(&[c], &opts).unwrap();
        let lines: Vec<&str> = prog.lines().collect();
        let pos = |s: &str| {
            lines
                .iter()
                .position(|l| *l == s)
                .unwrap_or_else(|| panic!("{s}: {prog}"))
        };
        assert!(lines
            .iter()
            .any(|l| l.contains("X 1.0000 to 3.0000, Y -2.0000 to -2.0000")));
        assert!(pos("G21 G90 G17") < pos("M3 S18000"));
        assert!(pos("M3 S18000") < pos("G0 X1.0000 Y-2.0000"));
        assert!(pos("G0 X1.0000 Y-2.0000") < pos("G1 Z-0.5000 F100.0000"));
        assert!(pos("G1 Z-0.5000 F100.0000") < pos("G1 X3.0000 Y-2.0000 F600.0000"));
        assert_eq!(lines[lines.len() - 3..], ["G0 Z5.0000", "M5", "M2"]);
        assert!(pos("(job [1].svg: #x, contour 0)") > pos("G21 G90 G17"));
        assert!(lines.contains(&"(tolerance 0.01 mm second line)"));
        assert!(prog.contains("PVC or vinyl"));
        // Every comment is one parenthesised span: no stray parentheses.
        for l in lines.iter().filter(|l| l.starts_with('(')) {
            assert!(l.ends_with(')') && l.matches('(').count() == 1 && l.matches(')').count() == 1);
        }
        let no_spindle = gcode_program(&[], &GcodeOptions::default()).unwrap();
        assert!(!no_spindle.contains("M3"));
    }

    #[test]
    fn beziers_and_bad_options_are_refused() {
        let q = Contour::new(
            vec![Segment::Quad(kurbo::QuadBez::new(
                (0.0, 0.0),
                (1.0, 1.0),
                (2.0, 0.0),
            ))],
            false,
            Source::new("f.svg", "#q", 2),
        );
        let e = gcode_program(&[q], &GcodeOptions::default()).unwrap_err();
        assert!(e
            .to_string()
            .starts_with("f.svg: #q, contour 2: segment 0: a quadratic Bézier"));
        for opts in [
            GcodeOptions {
                decimals: 2,
                ..GcodeOptions::default()
            },
            GcodeOptions {
                safe_z: -1.0,
                ..GcodeOptions::default()
            },
            GcodeOptions {
                feed: f64::NAN,
                ..GcodeOptions::default()
            },
            GcodeOptions {
                spindle_rpm: Some(0.0),
                ..GcodeOptions::default()
            },
        ] {
            assert!(matches!(
                gcode_program(&[], &opts),
                Err(WriteError::Options(_))
            ));
        }
    }

    #[test]
    fn tiny_arc_pieces_stay_minor_or_become_lines() {
        // Arcs of a few rounding steps: the traced piece must never be a major arc.
        for k in 1..200 {
            let r = 1e-4 * k as f64;
            let a = CircularArc {
                center: Point::new(0.3, 0.7),
                radius: r,
                start_angle: 0.1 * k as f64,
                sweep: if k % 2 == 0 { 1.3 } else { -2.9 },
            };
            let got = gcode_as_read(&arc_contour(a), 3).unwrap();
            for s in &got.segments {
                if let Segment::Arc(t) = s {
                    assert!(t.sweep.abs() <= PI, "r = {r}: {t:?}");
                }
            }
            // The traced end is the rounded end (within √2·h) up to the radius mismatch of the
            // last arc piece (≤ 10⁻ᵈ, module docs).
            let end = got
                .end()
                .map_or(0.0, |e| (e - Segment::Arc(a).end()).hypot());
            assert!(
                end <= 2f64.sqrt() * 0.5e-3 + 1e-3 + 1e-12,
                "r = {r}: end off by {end}"
            );
        }
    }
}
