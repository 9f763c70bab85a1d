//! A reader for the G-code subset ratline writes, and for typical hand-written XY programs.
//!
//! Words follow the NIST RS274NGC Interpreter, Version 3 (Kramer, Proctor, Messina, NISTIR 6556,
//! 2000): G0 rapid, G1 line, G2 clockwise and G3 counter-clockwise arcs as seen from +Z (§3.5.3),
//! G17 XY plane (§3.5.6), G20/G21 inches/millimetres (§3.5.7), G90/G91 absolute/incremental
//! (§3.5.17); comments in parentheses, and after `;` as many controllers accept; N line numbers;
//! modal motion (a line with coordinates only repeats the last motion). F, S, T and M words are
//! accepted and do not change geometry; M2 and M30 end the program. G40, G49, G54, G80 and G94
//! (the power-on states: no cutter compensation, no length offset, the first work system, no
//! canned cycle, feed per minute) are accepted; every other word is an error naming its line.
//!
//! Arcs in centre format: I and J are the centre's offsets from the start point. The start and
//! end radii may differ by at most 0.002 mm (0.0002 in under G20), §3.5.3; equal end points give
//! a full circle. Radius format (R): the centre lies on the chord's perpendicular bisector, on the
//! side that makes the arc at most a half circle for R > 0 and more for R < 0; a radius shorter
//! than half the chord (beyond the same 0.002 mm) is an error, and R with equal end points is
//! refused (§3.5.3: the radius format cannot describe a full circle).
//!
//! Contours: every run of G1/G2/G3 moves that change X or Y, between G0 moves that change X or Y,
//! is one contour (Z-only moves split nothing), with `Source { file, "line N" (its first XY move),
//! index (its order in the file) }`, closed when it ends within 1e-6 mm of its start. Machine y
//! points up; contours come out in mm with y down (y = −y_machine).

use std::f64::consts::TAU;

use kurbo::{Line, Point, Vec2};

use crate::geom::{CircularArc, Contour, Outline, Segment, Source};
use crate::InputError;

/// The largest number accepted in a word (in the file's units): beyond it a program is not a
/// drawing, and the limit keeps every square and sum far from overflow.
const MAX_NUMBER: f64 = 1e9;

/// How close a contour's end must be to its start to count as closed, in mm.
const CLOSE_EPS_MM: f64 = 1e-6;

/// The arc radius rule of NISTIR 6556 §3.5.3, in mm.
const RADIUS_RULE_MM: f64 = 0.002;
/// The same rule under G20, in inches.
const RADIUS_RULE_IN: f64 = 0.0002;

const MM_PER_IN: f64 = crate::geom::MM_PER_IN;

/// The arc a controller traces for G2 (`clockwise`) or G3 from `start` to `end` about `centre`,
/// all in machine coordinates (mm, y up), returned in ratline's frame (y down): centre, the start
/// radius, and the sweep from the start direction to the end direction (a full turn when the
/// directions agree).
pub fn centre_format_arc(start: Point, end: Point, centre: Point, clockwise: bool) -> CircularArc {
    let a0 = (start - centre).atan2();
    let a1 = (end - centre).atan2();
    let turn = |x: f64| if x == 0.0 { TAU } else { x };
    // Sweep in the machine frame: negative for clockwise.
    let sweep_m = if clockwise {
        -turn((a0 - a1).rem_euclid(TAU))
    } else {
        turn((a1 - a0).rem_euclid(TAU))
    };
    // Mirroring y maps angle a to −a and reverses the sense of turning.
    CircularArc {
        center: Point::new(centre.x, -centre.y),
        radius: (start - centre).hypot(),
        start_angle: -a0,
        sweep: -sweep_m,
    }
}

/// A G-code word as written: its letter (upper case) and the number text after it.
struct Word {
    letter: char,
    number: String,
}

impl Word {
    fn text(&self) -> String {
        format!("{}{}", self.letter, self.number)
    }

    /// The word's number, checked: digits with at most one point, within ±`MAX_NUMBER`.
    fn value(&self) -> Result<f64, String> {
        let n = &self.number;
        let value = if n.bytes().any(|b| b.is_ascii_digit()) && n.matches('.').count() <= 1 {
            n.parse::<f64>().ok()
        } else {
            None
        };
        match value {
            Some(v) if v.abs() <= MAX_NUMBER => Ok(v),
            Some(_) => Err(format!(
                "number in {} is beyond ±{MAX_NUMBER:e}",
                self.text()
            )),
            None => Err(format!("word {:?} has no valid number", self.text())),
        }
    }
}

/// The words of one line, comments removed. Spaces may stand between a letter and its number.
fn words(line: &str) -> Result<Vec<Word>, String> {
    if line.trim() == "%" {
        return Ok(Vec::new());
    }
    let chars: Vec<char> = line.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        if c == ';' {
            break;
        }
        if c == '(' {
            match chars[i..].iter().position(|&x| x == ')') {
                Some(n) => i += n + 1,
                None => return Err("comment without a closing ')'".into()),
            }
            continue;
        }
        if c.is_whitespace() {
            i += 1;
            continue;
        }
        if !c.is_ascii_alphabetic() {
            return Err(format!("unexpected character {c:?}"));
        }
        i += 1;
        let mut number = String::new();
        while let Some(&d) = chars.get(i) {
            let sign_ok = (d == '+' || d == '-') && number.is_empty();
            if d.is_ascii_digit() || d == '.' || sign_ok {
                number.push(d);
            } else if !d.is_whitespace()
                || number.ends_with(|x: char| x.is_ascii_digit() || x == '.')
            {
                break;
            }
            i += 1;
        }
        out.push(Word {
            letter: c.to_ascii_uppercase(),
            number,
        });
    }
    Ok(out)
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Motion {
    Rapid,
    Line,
    Cw,
    Ccw,
}

/// The values a line sets; `None` where the word is absent.
#[derive(Default)]
struct Block {
    motion: Option<Motion>,
    inches: Option<bool>,
    incremental: Option<bool>,
    x: Option<f64>,
    y: Option<f64>,
    z: Option<f64>,
    i: Option<f64>,
    j: Option<f64>,
    r: Option<f64>,
    ends_program: bool,
}

fn block(words: &[Word]) -> Result<Block, String> {
    let mut b = Block::default();
    for w in words {
        let unsupported = || format!("unsupported word {}", w.text());
        let integer = || {
            let v = w.value()?;
            (v.fract() == 0.0)
                .then_some(v as i64)
                .ok_or_else(unsupported)
        };
        let set = |slot: &mut Option<f64>| {
            if slot.replace(w.value()?).is_some() {
                Err(format!("word {} appears twice", w.letter))
            } else {
                Ok(())
            }
        };
        match w.letter {
            'G' => {
                let motion = match integer()? {
                    0 => Some(Motion::Rapid),
                    1 => Some(Motion::Line),
                    2 => Some(Motion::Cw),
                    3 => Some(Motion::Ccw),
                    20 => {
                        b.inches = Some(true);
                        None
                    }
                    21 => {
                        b.inches = Some(false);
                        None
                    }
                    90 => {
                        b.incremental = Some(false);
                        None
                    }
                    91 => {
                        b.incremental = Some(true);
                        None
                    }
                    17 | 40 | 49 | 54 | 80 | 94 => None,
                    18 | 19 => {
                        return Err(format!(
                            "unsupported word {} (only the XY plane, G17, is read)",
                            w.text()
                        ))
                    }
                    _ => return Err(unsupported()),
                };
                if let Some(m) = motion {
                    if b.motion.replace(m).is_some() {
                        return Err("two motion words (G0/G1/G2/G3) on one line".into());
                    }
                }
            }
            'M' => {
                if matches!(integer()?, 2 | 30) {
                    b.ends_program = true;
                }
            }
            'N' | 'F' | 'S' | 'T' => {
                w.value()?;
            }
            'X' => set(&mut b.x)?,
            'Y' => set(&mut b.y)?,
            'Z' => set(&mut b.z)?,
            'I' => set(&mut b.i)?,
            'J' => set(&mut b.j)?,
            'R' => set(&mut b.r)?,
            _ => return Err(unsupported()),
        }
    }
    Ok(b)
}

/// The reader's state between lines.
struct Machine {
    file: String,
    /// Position in mm, machine frame (y up).
    pos: Point,
    inches: bool,
    incremental: bool,
    motion: Option<Motion>,
    /// The contour being built: its first line and segments (y down).
    run: Option<(usize, Vec<Segment>)>,
    contours: Vec<Contour>,
}

fn y_down(p: Point) -> Point {
    Point::new(p.x, -p.y)
}

impl Machine {
    fn unit(&self) -> f64 {
        if self.inches {
            MM_PER_IN
        } else {
            1.0
        }
    }

    fn finish_run(&mut self) {
        if let Some((line, segments)) = self.run.take() {
            let source = Source::new(
                self.file.clone(),
                format!("line {line}"),
                self.contours.len(),
            );
            let start = segments[0].start();
            let end = segments[segments.len() - 1].end();
            let closed = (end - start).hypot() <= CLOSE_EPS_MM;
            self.contours.push(Contour::new(segments, closed, source));
        }
    }

    fn push(&mut self, line: usize, seg: Segment) {
        self.run
            .get_or_insert_with(|| (line, Vec::new()))
            .1
            .push(seg);
    }

    /// Apply one line's words.
    fn apply(&mut self, line: usize, b: &Block) -> Result<(), String> {
        if let Some(i) = b.inches {
            self.inches = i;
        }
        if let Some(i) = b.incremental {
            self.incremental = i;
        }
        if b.motion.is_some() {
            self.motion = b.motion;
        }
        let has_xy = b.x.is_some() || b.y.is_some();
        let has_arc_words = b.i.is_some() || b.j.is_some() || b.r.is_some();
        if !(has_xy || has_arc_words || b.z.is_some()) {
            return Ok(());
        }
        let Some(motion) = self.motion else {
            return Err("coordinates without a motion mode (G0, G1, G2 or G3)".into());
        };
        let u = self.unit();
        let axis = |v: Option<f64>, cur: f64| match v {
            Some(v) if self.incremental => cur + v * u,
            Some(v) => v * u,
            None => cur,
        };
        let to = Point::new(axis(b.x, self.pos.x), axis(b.y, self.pos.y));
        let from = self.pos;
        match motion {
            Motion::Rapid | Motion::Line if has_arc_words => {
                return Err("I, J or R words need G2 or G3".into())
            }
            Motion::Rapid => {
                if to != from {
                    self.finish_run();
                }
            }
            Motion::Line => {
                if to != from {
                    self.push(line, Segment::Line(Line::new(y_down(from), y_down(to))));
                }
            }
            Motion::Cw | Motion::Ccw => {
                if has_arc_words {
                    let arc = self.arc(from, to, b, motion == Motion::Cw)?;
                    self.push(line, Segment::Arc(arc));
                } else if has_xy {
                    return Err("an arc (G2/G3) needs I/J or R".into());
                }
            }
        }
        self.pos = to;
        Ok(())
    }

    fn arc(&self, from: Point, to: Point, b: &Block, cw: bool) -> Result<CircularArc, String> {
        let u = self.unit();
        let rule = if self.inches {
            RADIUS_RULE_IN * MM_PER_IN
        } else {
            RADIUS_RULE_MM
        };
        let centre = match b.r {
            Some(_) if b.i.is_some() || b.j.is_some() => {
                return Err("an arc has both I/J and R".into())
            }
            Some(r) => radius_format_centre(from, to, r * u, cw, rule)?,
            None => from + Vec2::new(b.i.unwrap_or(0.0), b.j.unwrap_or(0.0)) * u,
        };
        let (r0, r1) = ((from - centre).hypot(), (to - centre).hypot());
        if r0 == 0.0 {
            return Err("an arc with zero radius (I = J = 0)".into());
        }
        if (r0 - r1).abs() > rule {
            return Err(format!(
                "arc start and end radii differ by {:.6} mm ({r0:.6} and {r1:.6}), more than the \
                 {rule} mm allowed (NISTIR 6556 §3.5.3)",
                (r0 - r1).abs()
            ));
        }
        Ok(centre_format_arc(from, to, centre, cw))
    }
}

/// The centre of a radius-format arc (see the module docs), machine frame.
fn radius_format_centre(
    from: Point,
    to: Point,
    r: f64,
    cw: bool,
    rule: f64,
) -> Result<Point, String> {
    let chord = to - from;
    let c = chord.hypot();
    if c == 0.0 {
        return Err("a radius-format arc (R) cannot have equal end points".into());
    }
    if r.abs() < 0.5 * c - rule {
        return Err(format!(
            "arc radius {:.6} mm is shorter than half the chord ({:.6} mm)",
            r.abs(),
            0.5 * c
        ));
    }
    let k = (r * r - 0.25 * c * c).max(0.0).sqrt();
    // Left normal of the chord (machine frame, y up). A clockwise minor arc has its centre on the
    // right of the chord, a counter-clockwise one on the left; R < 0 asks for the major arc.
    let n = Vec2::new(-chord.y, chord.x) / c;
    let side = if cw == (r > 0.0) { -1.0 } else { 1.0 };
    Ok(from.midpoint(to) + side * k * n)
}

/// Read a G-code program (see the module docs). `file_label` names the file in sources and
/// errors. A program without cutting moves gives an empty outline with a warning.
pub fn read_gcode(file_label: &str, text: &str) -> Result<Outline, InputError> {
    let mut m = Machine {
        file: file_label.to_string(),
        pos: Point::ORIGIN,
        inches: false,
        incremental: false,
        motion: None,
        run: None,
        contours: Vec::new(),
    };
    let mut warnings = Vec::new();
    let mut lines = text.lines().enumerate();
    for (idx, line) in lines.by_ref() {
        let n = idx + 1;
        let at = |msg: String| InputError::at(file_label, format!("line {n}"), msg);
        let ws = words(line).map_err(at)?;
        let b = block(&ws).map_err(at)?;
        m.apply(n, &b).map_err(at)?;
        if b.ends_program {
            break;
        }
    }
    if let Some((idx, _)) = lines.find(|(_, l)| words(l).map_or(true, |w| !w.is_empty())) {
        warnings.push(format!(
            "{file_label}: line {}: text after the program end (M2/M30) is ignored",
            idx + 1
        ));
    }
    m.finish_run();
    if m.contours.is_empty() {
        warnings.push(format!(
            "{file_label}: no cutting moves (G1/G2/G3 changing X or Y) found"
        ));
    }
    Ok(Outline {
        contours: m.contours,
        skipped: Vec::new(),
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;
    use kurbo::ParamCurve;
    use std::f64::consts::PI;

    fn err(text: &str) -> InputError {
        read_gcode("t.nc", text).unwrap_err()
    }

    fn only_arc(o: &Outline) -> CircularArc {
        assert_eq!(o.contours.len(), 1);
        match o.contours[0].segments.as_slice() {
            [Segment::Arc(a)] => *a,
            other => panic!("expected one arc, got {other:?}"),
        }
    }

    #[test]
    fn nist_centre_format_example() {
        // NISTIR 6556 §3.5.3 (as quoted in REFERENCES §7): from (7,7), G17 G2 X10 Y16 I3 J4 has
        // centre (10,11) and radius 5 at both ends.
        let o = read_gcode("nist.nc", "G21 G90 G0 X7 Y7\nG17 G2 X10 Y16 I3 J4\n").unwrap();
        let a = only_arc(&o);
        assert_abs_diff_eq!(a.center.x, 10.0, epsilon = 1e-12);
        assert_abs_diff_eq!(a.center.y, -11.0, epsilon = 1e-12); // y down
        assert_abs_diff_eq!(a.radius, 5.0, epsilon = 1e-12);
        let (s, e) = (a.eval(0.0), a.eval(1.0));
        assert_abs_diff_eq!(s.x, 7.0, epsilon = 1e-12);
        assert_abs_diff_eq!(s.y, -7.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.x, 10.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.y, -16.0, epsilon = 1e-12);
        // Clockwise seen from +Z (y up): the start direction (−3,−4) is at −(180° − atan2(4,3))
        // = −126.87°, the end direction (0,5) at 90°; turning clockwise from −126.87° down to
        // 90° − 360° sweeps 90° + atan2(4,3) = 143.13° (derived).
        let expected = 90.0 + 4f64.atan2(3.0).to_degrees();
        // In y-down coordinates a clockwise machine arc turns from +x towards +y: positive.
        assert_abs_diff_eq!(a.sweep.to_degrees(), expected, epsilon = 1e-9);
        // Its middle, at machine angle −126.87° − 71.57° = 161.57°, is (10 + 5·cos, 11 + 5·sin)
        // = (5.2566, 12.5811) (derived): the arc bulges towards −x.
        let mid = a.eval(0.5);
        let phi = (-126.869_897_645_844_02f64 - 0.5 * expected).to_radians();
        assert_abs_diff_eq!(mid.x, 10.0 + 5.0 * phi.cos(), epsilon = 1e-9);
        assert_abs_diff_eq!(mid.y, -(11.0 + 5.0 * phi.sin()), epsilon = 1e-9);
        assert_abs_diff_eq!(mid.x, 5.2566, epsilon = 1e-4);
        assert_eq!(o.contours[0].source, Source::new("nist.nc", "line 2", 0));
    }

    #[test]
    fn radius_format_matches_centre_format() {
        // The same NIST arc in radius format: its sweep, 143°, is below 180°, so R5 (the minor
        // arc) has the same centre (NISTIR 6556 §3.5.3, radius format).
        let o = read_gcode("r.nc", "G0 X7 Y7\nG2 X10 Y16 R5\n").unwrap();
        let a = only_arc(&o);
        assert_abs_diff_eq!(a.center.x, 10.0, epsilon = 1e-9);
        assert_abs_diff_eq!(a.center.y, -11.0, epsilon = 1e-9);
        // R−5 asks for the major arc: centre mirrored across the chord.
        let b = only_arc(&read_gcode("r.nc", "G0 X7 Y7\nG2 X10 Y16 R-5\n").unwrap());
        assert!((b.center - a.center).hypot() > 1.0);
        assert!(b.sweep.abs() > PI);
        assert_abs_diff_eq!(
            (b.eval(1.0) - Point::new(10.0, -16.0)).hypot(),
            0.0,
            epsilon = 1e-9
        );
    }

    #[test]
    fn units_modes_comments_and_contours() {
        let text = "%\n(header, inches)\nN10 G20 G91 ; inches, incremental\n\
                    G0 X1 Y1\nG1 Z-0.1 F10\nG1 X1\nY 1 (modal G1)\nX-1 Y-1\nG0 Z0.2\n\
                    g0 x5\nG1 X1 S100 M3 T1\nM2\nG1 X100\n";
        let o = read_gcode("u.nc", text).unwrap();
        assert_eq!(o.contours.len(), 2);
        let c = &o.contours[0];
        assert!(c.closed);
        assert_eq!(c.segments.len(), 3);
        assert_eq!(c.source.element, "line 6");
        assert_abs_diff_eq!(c.start().unwrap().x, 25.4, epsilon = 1e-12);
        assert_abs_diff_eq!(c.start().unwrap().y, -25.4, epsilon = 1e-12);
        assert_abs_diff_eq!(c.segments[1].end().y, -50.8, epsilon = 1e-12);
        let d = &o.contours[1];
        assert!(!d.closed);
        assert_eq!(d.source.index, 1);
        assert_abs_diff_eq!(d.end().unwrap().x, (1.0 + 5.0 + 1.0) * 25.4, epsilon = 1e-9);
        assert_eq!(o.warnings.len(), 1, "{:?}", o.warnings); // text after M2
        assert!(o.warnings[0].contains("line 13"));
    }

    #[test]
    fn full_circle_from_equal_end_points() {
        let o = read_gcode("c.nc", "G0 X10 Y0\nG3 X10 Y0 I-10 J0\n").unwrap();
        let a = only_arc(&o);
        assert_abs_diff_eq!(a.sweep.abs(), TAU, epsilon = 1e-15);
        assert!(a.sweep < 0.0); // counter-clockwise in y up is negative in y down
        assert!(o.contours[0].closed);
    }

    #[test]
    fn unsupported_words_name_their_line() {
        for (text, line, what) in [
            ("G0 X0 Y0\nG1 X1\nG81 X1 Y1 Z-1 R1\n", 3, "G81"),
            ("G18\n", 1, "G18"),
            ("G0 X0\nG41 D1\n", 2, "G41"),
            ("G1 X1 P2\n", 1, "P2"),
            ("G61.1\n", 1, "G61.1"),
            ("G1 X1 K5\n", 1, "K5"),
        ] {
            let e = err(text);
            assert_eq!(
                e.place.as_deref(),
                Some(format!("line {line}").as_str()),
                "{e}"
            );
            assert!(
                e.message.contains(&format!("unsupported word {what}")),
                "{e}"
            );
            assert!(e.to_string().starts_with("t.nc: line "));
        }
    }

    #[test]
    fn radius_rule_violation_is_an_error() {
        // From (0,0) about (5,0): start radius 5; an end at (10.0019, 0) has radius 5.0019
        // (within 0.002 mm), one at (10.0021, 0) has 5.0021 (beyond): NISTIR 6556 §3.5.3.
        assert!(read_gcode("ok.nc", "G0 X0 Y0\nG1 Z-1\nG2 X10.0019 Y0 I5 J0\n").is_ok());
        let e = err("G0 X0 Y0\nG1 Z-1\nG2 X10.0021 Y0 I5 J0\n");
        assert_eq!(e.place.as_deref(), Some("line 3"));
        assert!(e.message.contains("radii differ"), "{e}");
        // Inches: the rule is 0.0002 in.
        assert!(read_gcode("in.nc", "G20 G0 X0 Y0\nG2 X1.00015 Y0 I0.5\n").is_ok());
        assert!(read_gcode("in.nc", "G20 G0 X0 Y0\nG2 X1.0003 Y0 I0.5\n").is_err());
    }

    #[test]
    fn garbage_and_bad_numbers() {
        for (text, msg) in [
            ("hello world\n", "unsupported word H"),
            ("G1 X\n", "no valid number"),
            ("G1 X-\n", "no valid number"),
            ("G1 XNaN\n", "no valid number"),
            ("G1 X1.2.3\n", "no valid number"),
            ("G1 Xinf\n", "no valid number"),
            ("G1 X1e5\n", "unsupported word E5"),
            ("G1 X1000000000000\n", "beyond"),
            ("G1 X1 X2\n", "appears twice"),
            ("G0 G1 X1\n", "two motion words"),
            ("X1 Y1\n", "without a motion mode"),
            ("G1 X1 (open comment\n", "closing"),
            ("G1 X1 I1\n", "need G2 or G3"),
            ("G2 X1 Y1\n", "needs I/J or R"),
            ("G2 X1 Y0 I0 J0\n", "zero radius"),
            ("G2 X1 Y0 R0.1\n", "shorter than half the chord"),
            ("G2 X0 Y0 R1\n", "equal end points"),
            ("G1 X1 € \n", "unexpected character"),
        ] {
            let e = err(text);
            assert!(e.message.contains(msg), "{text:?}: {e}");
            assert_eq!(e.place.as_deref(), Some("line 1"));
        }
        let huge = format!("G1 X1{}\n", "0".repeat(400));
        assert!(err(&huge).message.contains("beyond"));
    }

    #[test]
    fn arbitrary_text_never_panics() {
        // Random lines over the characters the reader reacts to: every outcome must be a value.
        let alphabet: Vec<char> = "GXYZIJRNMF0123456789.-+ ();%\n\tg23e€".chars().collect();
        let mut rng = crate::testing::Rng::new(0x2545_F491_4F6C_DD1D);
        let mut read_ok = 0;
        for _ in 0..3000 {
            let text: String = (0..40)
                .map(|_| alphabet[(rng.next_u64() % alphabet.len() as u64) as usize])
                .collect();
            read_ok += usize::from(read_gcode("fuzz.nc", &text).is_ok());
        }
        // Most random text is rejected, with an error value.
        assert!(read_ok < 3000);
        // Trailing points and leading signs are plain decimals (RS274NGC numbers).
        let o = read_gcode("n.nc", "G0 X5. Y-.5\nG1 X+6\n").unwrap();
        assert_abs_diff_eq!(o.contours[0].segments[0].start().y, 0.5, epsilon = 1e-15);
    }

    #[test]
    fn empty_and_rapid_only_programs_give_an_empty_outline_with_a_warning() {
        for text in ["", "(nothing)\n", "G21 G90\nG0 X10 Y10\nG0 Z5\nM2\n"] {
            let o = read_gcode("e.nc", text).unwrap();
            assert!(o.contours.is_empty());
            assert_eq!(o.warnings.len(), 1);
            assert!(o.warnings[0].contains("no cutting moves"));
        }
    }
}
