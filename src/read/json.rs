//! Reader for ratline's own outline format (`ratline-outline`, version 1), specified in full in
//! `docs/outline-format.md`; `write::json` writes it.
//!
//! ```json
//! {"format": "ratline-outline", "version": 1, "units": "mm",
//!  "contours": [{"closed": false, "source": {"file": "a.svg", "element": "#r", "index": 0},
//!                "segments": [{"line": [[0, 0], [10, 0]]}]}],
//!  "skipped": [], "warnings": []}
//! ```
//!
//! Segments are one-field objects: `line` (2 points), `quadratic` (3), `cubic` (4), `arc`
//! (`center`, `radius`, `start_angle`, `sweep`, radians, |sweep| ≤ 2π) and `conic`, a rational
//! quadratic Bézier given either as `{"homogeneous": [[w·x, w·y, w] × 3]}` or as
//! `{"points": [[x, y] × 3], "weights": [w0, w1, w2]}`, every weight > 0. Any positive weights
//! are accepted and brought to standard form, end weights 1 and middle weight
//! `w1' = w1 / √(w0·w2)`. The curve is unchanged: multiplying all weights by one λ > 0 leaves
//! every point unchanged, and a rational linear (Möbius) reparametrisation multiplies them by
//! (1, c, c²); λ = 1/w0 and c = √(w0/w2) give end weights 1 (Farin, *Curves and Surfaces for
//! CAGD*, 5th ed., 2002, ch. 13; Piegl & Tiller, *The NURBS Book*, 2nd ed., 1997, ch. 7).
//! `geom::Conic::from_weighted` and `from_homogeneous` do it. Only the parametrisation
//! changes, so a conic read from non-standard weights traces the same points at other t.
//!
//! `units` is `mm`, `in` (25.4 mm) or `pt` (1/72 in); lengths are converted to millimetres on
//! reading (angles and weights are not lengths). Everything is validated: every number finite
//! in mm, weights and radii positive, each segment starting within 1e-9 mm of where the
//! previous one ends, a closed contour ending where it starts, no unknown fields. The document
//! is parsed into a `serde_json::Value` first, so each error names the JSON path of the
//! offending value (`contours[3].segments[7].conic.weights[1]`); a syntax error names its line
//! and column. Numbers parse correctly rounded (serde_json's `float_roundtrip`), so what
//! `write::json` writes comes back bit for bit.

use std::f64::consts::TAU;

use kurbo::{CubicBez, Line, Point, QuadBez};
use nalgebra::Vector3;
use serde_json::{Map, Value};

use crate::geom::{
    mm_per_unit, CircularArc, Conic, Contour, GeomError, Outline, Segment, Skipped, Source,
};
use crate::InputError;

/// The value of the `format` field.
pub const FORMAT_TAG: &str = "ratline-outline";

/// The format version this reader reads and `write::json` writes.
pub const FORMAT_VERSION: u64 = 1;

/// How far (mm) a segment may start from where the previous one ends, and a closed contour end
/// from where it starts: far below any machine's resolution (common practice, no source), far
/// above the rounding of an arc's end point computed from its angle.
pub const JOIN_TOLERANCE_MM: f64 = 1e-9;

/// The units a file may declare.
const UNITS: [&str; 3] = ["mm", "in", "pt"];

type Object = Map<String, Value>;

/// Read an outline in ratline's outline format. `file_label` names the file in errors; the
/// contours keep the `source` written in the file.
pub fn read_outline_json(file_label: &str, data: &[u8]) -> Result<Outline, InputError> {
    let doc: Value = serde_json::from_slice(data).map_err(|e| syntax_error(file_label, &e))?;
    Reader {
        file: file_label,
        mm: 1.0,
    }
    .document(&doc)
}

fn syntax_error(file: &str, e: &serde_json::Error) -> InputError {
    let full = e.to_string();
    let suffix = format!(" at line {} column {}", e.line(), e.column());
    let what = full.strip_suffix(&suffix).unwrap_or(&full);
    InputError::at(
        file,
        format!("line {}, column {}", e.line(), e.column()),
        format!("not valid JSON: {what}"),
    )
}

/// The path of field `k` of the value at `path`.
fn key(path: &str, k: &str) -> String {
    if path.is_empty() {
        k.to_string()
    } else {
        format!("{path}.{k}")
    }
}

/// The path of element `i` of the array at `path`.
fn index(path: &str, i: usize) -> String {
    format!("{path}[{i}]")
}

fn describe(v: &Value) -> &'static str {
    match v {
        Value::Null => "null",
        Value::Bool(_) => "a boolean",
        Value::Number(_) => "a number",
        Value::String(_) => "a string",
        Value::Array(_) => "an array",
        Value::Object(_) => "an object",
    }
}

fn show(p: Point) -> String {
    format!("({}, {})", p.x, p.y)
}

struct Reader<'a> {
    file: &'a str,
    /// Millimetres per unit of the file's lengths.
    mm: f64,
}

impl Reader<'_> {
    fn err(&self, path: &str, message: impl Into<String>) -> InputError {
        let place = if path.is_empty() { "$" } else { path };
        InputError::at(self.file, place, message)
    }

    fn object<'v>(&self, v: &'v Value, path: &str, what: &str) -> Result<&'v Object, InputError> {
        v.as_object().ok_or_else(|| {
            self.err(
                path,
                format!("expected {what} (a JSON object), found {}", describe(v)),
            )
        })
    }

    /// Reject fields other than `allowed`.
    fn known_fields(&self, m: &Object, path: &str, allowed: &[&str]) -> Result<(), InputError> {
        match m.keys().find(|k| !allowed.contains(&k.as_str())) {
            Some(k) => Err(self.err(
                &key(path, k),
                format!("unknown field \"{k}\" (expected {})", allowed.join(", ")),
            )),
            None => Ok(()),
        }
    }

    fn field<'v>(&self, m: &'v Object, path: &str, k: &str) -> Result<&'v Value, InputError> {
        m.get(k)
            .ok_or_else(|| self.err(path, format!("missing field \"{k}\"")))
    }

    fn array<'v>(&self, v: &'v Value, path: &str) -> Result<&'v [Value], InputError> {
        v.as_array()
            .map(Vec::as_slice)
            .ok_or_else(|| self.err(path, format!("expected an array, found {}", describe(v))))
    }

    /// An array of exactly `n` elements, `what` naming them in the message.
    fn array_of<'v>(
        &self,
        v: &'v Value,
        path: &str,
        n: usize,
        what: &str,
    ) -> Result<&'v [Value], InputError> {
        let a = self.array(v, path)?;
        if a.len() != n {
            return Err(self.err(path, format!("expected {n} {what}, found {}", a.len())));
        }
        Ok(a)
    }

    fn string<'v>(&self, v: &'v Value, path: &str) -> Result<&'v str, InputError> {
        v.as_str()
            .ok_or_else(|| self.err(path, format!("expected a string, found {}", describe(v))))
    }

    fn number(&self, v: &Value, path: &str) -> Result<f64, InputError> {
        match v.as_f64() {
            Some(x) if x.is_finite() => Ok(x),
            Some(x) => Err(self.err(path, format!("{x} is not a finite number"))),
            None => Err(self.err(path, format!("expected a number, found {}", describe(v)))),
        }
    }

    /// A length in the file's units, converted to millimetres.
    fn length(&self, v: &Value, path: &str) -> Result<f64, InputError> {
        let x = self.number(v, path)?;
        let mm = x * self.mm;
        if !mm.is_finite() {
            return Err(self.err(path, format!("{x} is too large: not finite in millimetres")));
        }
        Ok(mm)
    }

    fn point(&self, v: &Value, path: &str) -> Result<Point, InputError> {
        let a = self.array_of(v, path, 2, "coordinates [x, y]")?;
        Ok(Point::new(
            self.length(&a[0], &index(path, 0))?,
            self.length(&a[1], &index(path, 1))?,
        ))
    }

    fn points<const N: usize>(&self, v: &Value, path: &str) -> Result<[Point; N], InputError> {
        let a = self.array_of(v, path, N, "control points [x, y]")?;
        let mut out = [Point::ORIGIN; N];
        for (i, (p, q)) in out.iter_mut().zip(a).enumerate() {
            *p = self.point(q, &index(path, i))?;
        }
        Ok(out)
    }

    fn weight(&self, v: &Value, path: &str) -> Result<f64, InputError> {
        let w = self.number(v, path)?;
        if w <= 0.0 {
            return Err(self.err(
                path,
                format!("weight {w} is not positive (weights must be > 0)"),
            ));
        }
        Ok(w)
    }

    fn document(mut self, doc: &Value) -> Result<Outline, InputError> {
        let m = self.object(doc, "", "a ratline outline")?;
        // Format and version come first: a file of another kind or version should say so, not
        // fail on its first unfamiliar field.
        match self.field(m, "", "format")? {
            Value::String(s) if s == FORMAT_TAG => {}
            other => {
                return Err(self.err(
                    "format",
                    format!("not a ratline outline: format is {other}, expected \"{FORMAT_TAG}\""),
                ))
            }
        }
        let version = self.field(m, "", "version")?;
        if version.as_u64() != Some(FORMAT_VERSION) {
            return Err(self.err(
                "version",
                format!(
                    "unsupported version {version}: this ratline reads version {FORMAT_VERSION}"
                ),
            ));
        }
        self.known_fields(
            m,
            "",
            &[
                "format", "version", "units", "contours", "skipped", "warnings",
            ],
        )?;
        let units = self.string(self.field(m, "", "units")?, "units")?;
        self.mm = match mm_per_unit(units) {
            Some(k) if UNITS.contains(&units) => k,
            _ => {
                return Err(self.err(
                    "units",
                    format!(
                        "unsupported units \"{units}\" (expected {})",
                        UNITS.join(", ")
                    ),
                ))
            }
        };
        let contours = self
            .array(self.field(m, "", "contours")?, "contours")?
            .iter()
            .enumerate()
            .map(|(i, c)| self.contour(c, &index("contours", i)))
            .collect::<Result<_, _>>()?;
        let skipped = match m.get("skipped") {
            None => Vec::new(),
            Some(v) => self
                .array(v, "skipped")?
                .iter()
                .enumerate()
                .map(|(i, s)| self.skipped(s, &index("skipped", i)))
                .collect::<Result<_, _>>()?,
        };
        let warnings = match m.get("warnings") {
            None => Vec::new(),
            Some(v) => self
                .array(v, "warnings")?
                .iter()
                .enumerate()
                .map(|(i, s)| self.string(s, &index("warnings", i)).map(str::to_string))
                .collect::<Result<_, _>>()?,
        };
        Ok(Outline {
            contours,
            skipped,
            warnings,
        })
    }

    fn source(&self, v: &Value, path: &str) -> Result<Source, InputError> {
        let m = self.object(v, path, "a source")?;
        self.known_fields(m, path, &["file", "element", "index"])?;
        let file = self.string(self.field(m, path, "file")?, &key(path, "file"))?;
        let element = self.string(self.field(m, path, "element")?, &key(path, "element"))?;
        let ip = key(path, "index");
        let iv = self.field(m, path, "index")?;
        let index = iv
            .as_u64()
            .and_then(|i| usize::try_from(i).ok())
            .ok_or_else(|| self.err(&ip, format!("expected a non-negative integer, found {iv}")))?;
        Ok(Source::new(file, element, index))
    }

    fn skipped(&self, v: &Value, path: &str) -> Result<Skipped, InputError> {
        let m = self.object(v, path, "a skipped item")?;
        self.known_fields(m, path, &["source", "reason", "kind"])?;
        let source = self.source(self.field(m, path, "source")?, &key(path, "source"))?;
        let reason = self
            .string(self.field(m, path, "reason")?, &key(path, "reason"))?
            .to_string();
        match m.get("kind") {
            None => Ok(Skipped::hidden(source, reason)),
            Some(k) => match self.string(k, &key(path, "kind"))? {
                "hidden" => Ok(Skipped::hidden(source, reason)),
                "invalid" => Ok(Skipped::invalid(source, reason)),
                other => Err(self.err(
                    &key(path, "kind"),
                    format!("unknown kind '{other}' (expected \"hidden\" or \"invalid\")"),
                )),
            },
        }
    }

    fn contour(&self, v: &Value, path: &str) -> Result<Contour, InputError> {
        let m = self.object(v, path, "a contour")?;
        self.known_fields(m, path, &["closed", "source", "segments"])?;
        let cp = key(path, "closed");
        let closed = self
            .field(m, path, "closed")?
            .as_bool()
            .ok_or_else(|| self.err(&cp, "expected true or false"))?;
        let source = self.source(self.field(m, path, "source")?, &key(path, "source"))?;
        let sp = key(path, "segments");
        let segments: Vec<Segment> = self
            .array(self.field(m, path, "segments")?, &sp)?
            .iter()
            .enumerate()
            .map(|(i, s)| self.segment(s, &index(&sp, i)))
            .collect::<Result<_, _>>()?;
        for (i, pair) in segments.windows(2).enumerate() {
            let (end, start) = (pair[0].end(), pair[1].start());
            let gap = (start - end).hypot();
            // Written so that a NaN gap counts as not joined.
            let joined = gap <= JOIN_TOLERANCE_MM;
            if !joined {
                return Err(self.err(
                    &index(&sp, i + 1),
                    format!(
                        "segment starts at {}, {gap:e} mm from where the previous segment ends, {} (allowed: {JOIN_TOLERANCE_MM:e} mm)",
                        show(start),
                        show(end)
                    ),
                ));
            }
        }
        if let (true, Some(first), Some(last)) = (closed, segments.first(), segments.last()) {
            let gap = (last.end() - first.start()).hypot();
            let joined = gap <= JOIN_TOLERANCE_MM;
            if !joined {
                return Err(self.err(
                    &index(&sp, segments.len() - 1),
                    format!(
                        "the contour is closed, but its last segment ends at {}, {gap:e} mm from where it starts, {}: add a closing segment or set \"closed\": false",
                        show(last.end()),
                        show(first.start())
                    ),
                ));
            }
        }
        Ok(Contour::new(segments, closed, source))
    }

    fn segment(&self, v: &Value, path: &str) -> Result<Segment, InputError> {
        let m = self.object(v, path, "a segment")?;
        let mut fields = m.iter();
        let (kind, body) = match (fields.next(), fields.next()) {
            (Some(f), None) => f,
            _ => {
                let keys: Vec<&str> = m.keys().map(String::as_str).collect();
                return Err(self.err(
                    path,
                    format!(
                        "a segment has exactly one field, its kind (line, quadratic, cubic, arc or conic); found {} fields [{}]",
                        keys.len(),
                        keys.join(", ")
                    ),
                ));
            }
        };
        let p = key(path, kind);
        Ok(match kind.as_str() {
            "line" => {
                let [a, b] = self.points(body, &p)?;
                Segment::Line(Line::new(a, b))
            }
            "quadratic" => {
                let [a, b, c] = self.points(body, &p)?;
                Segment::Quad(QuadBez::new(a, b, c))
            }
            "cubic" => {
                let [a, b, c, d] = self.points(body, &p)?;
                Segment::Cubic(CubicBez::new(a, b, c, d))
            }
            "arc" => Segment::Arc(self.arc(body, &p)?),
            "conic" => Segment::Conic(self.conic(body, &p)?),
            other => {
                return Err(self.err(
                    &p,
                    format!(
                        "unknown segment kind \"{other}\" (expected line, quadratic, cubic, arc or conic)"
                    ),
                ))
            }
        })
    }

    fn arc(&self, v: &Value, path: &str) -> Result<CircularArc, InputError> {
        let m = self.object(v, path, "an arc")?;
        self.known_fields(m, path, &["center", "radius", "start_angle", "sweep"])?;
        let center = self.point(self.field(m, path, "center")?, &key(path, "center"))?;
        let rp = key(path, "radius");
        let radius = self.length(self.field(m, path, "radius")?, &rp)?;
        if radius <= 0.0 {
            return Err(self.err(&rp, format!("radius {radius} is not positive")));
        }
        if !(center.x.abs() + radius).is_finite() || !(center.y.abs() + radius).is_finite() {
            return Err(self.err(
                &rp,
                format!("the arc reaches beyond the largest finite coordinate (radius {radius})"),
            ));
        }
        let start_angle = self.number(
            self.field(m, path, "start_angle")?,
            &key(path, "start_angle"),
        )?;
        let sp = key(path, "sweep");
        let sweep = self.number(self.field(m, path, "sweep")?, &sp)?;
        if sweep.abs() > TAU {
            return Err(self.err(
                &sp,
                format!("sweep {sweep} rad is more than a full turn (|sweep| ≤ 2π)"),
            ));
        }
        Ok(CircularArc {
            center,
            radius,
            start_angle,
            sweep,
        })
    }

    fn conic(&self, v: &Value, path: &str) -> Result<Conic, InputError> {
        let m = self.object(v, path, "a conic")?;
        let built = if m.contains_key("homogeneous") {
            self.known_fields(m, path, &["homogeneous"])?;
            let hp = key(path, "homogeneous");
            let a = self.array_of(
                &m["homogeneous"],
                &hp,
                3,
                "homogeneous control points [w·x, w·y, w]",
            )?;
            let mut h = [Vector3::zeros(); 3];
            for (i, (hi, v)) in h.iter_mut().zip(a).enumerate() {
                *hi = self.homogeneous_point(v, &index(&hp, i))?;
            }
            Conic::from_homogeneous(h)
        } else if m.contains_key("points") || m.contains_key("weights") {
            self.known_fields(m, path, &["points", "weights"])?;
            let points = self.points(self.field(m, path, "points")?, &key(path, "points"))?;
            let wp = key(path, "weights");
            let a = self.array_of(self.field(m, path, "weights")?, &wp, 3, "weights")?;
            let mut w = [0.0; 3];
            for (i, (wi, v)) in w.iter_mut().zip(a).enumerate() {
                *wi = self.weight(v, &index(&wp, i))?;
            }
            Conic::from_weighted(points, w)
        } else {
            return Err(self.err(
                path,
                "a conic needs either \"homogeneous\": [[w·x, w·y, w] × 3] or \"points\": [[x, y] × 3] with \"weights\": [w0, w1, w2]",
            ));
        };
        // Every value was checked above, so what remains is the normalisation itself failing:
        // w1 / √(w0·w2) overflowing or underflowing for extreme weight ratios.
        built.map_err(|e: GeomError| {
            self.err(
                path,
                format!("weights too extreme to bring to standard form w1/√(w0·w2): {e}"),
            )
        })
    }

    /// A homogeneous point [w·x, w·y, w] with w > 0 whose projection is finite.
    fn homogeneous_point(&self, v: &Value, path: &str) -> Result<Vector3<f64>, InputError> {
        let a = self.array_of(v, path, 3, "homogeneous coordinates [w·x, w·y, w]")?;
        let wx = self.length(&a[0], &index(path, 0))?;
        let wy = self.length(&a[1], &index(path, 1))?;
        let w = self.weight(&a[2], &index(path, 2))?;
        if !(wx / w).is_finite() || !(wy / w).is_finite() {
            return Err(self.err(
                path,
                format!("the projected point ({}, {}) is not finite", wx / w, wy / w),
            ));
        }
        Ok(Vector3::new(wx, wy, w))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A document with one open contour of the given segments.
    fn with_segments(segments: &str) -> String {
        format!(
            r##"{{"format": "ratline-outline", "version": 1, "units": "mm", "contours": [
  {{"closed": false, "source": {{"file": "a.svg", "element": "#e", "index": 0}},
   "segments": [{segments}]}}]}}"##
        )
    }

    /// The error for a document, asserting its place; returns the message.
    fn error_at(text: &str, place: &str) -> String {
        let e = read_outline_json("bad.json", text.as_bytes()).expect_err("should be rejected");
        assert_eq!(e.file, "bad.json");
        assert_eq!(e.place.as_deref(), Some(place), "message: {}", e.message);
        e.message
    }

    const LINE: &str = r#"{"line": [[0, 0], [10, 0]]}"#;

    #[test]
    fn reads_a_minimal_document() {
        let o = read_outline_json("ok.json", with_segments(LINE).as_bytes()).unwrap();
        assert_eq!(o.contours.len(), 1);
        assert_eq!(o.contours[0].source, Source::new("a.svg", "#e", 0));
        assert_eq!(
            o.contours[0].segments,
            vec![Segment::Line(Line::new((0.0, 0.0), (10.0, 0.0)))]
        );
        assert!(o.skipped.is_empty() && o.warnings.is_empty());
    }

    #[test]
    fn bad_weights_name_their_path() {
        let conic = |w: &str| {
            with_segments(&format!(
                r#"{LINE}, {{"conic": {{"points": [[10, 0], [20, 0], [20, 10]], "weights": {w}}}}}"#
            ))
        };
        let place = "contours[0].segments[1].conic.weights[1]";
        assert!(error_at(&conic("[1, 0, 1]"), place).contains("not positive"));
        assert!(error_at(&conic("[1, -0.5, 1]"), place).contains("not positive"));
        assert!(error_at(&conic("[1, -0.0, 1]"), place).contains("not positive"));
        assert!(error_at(&conic(r#"[1, "w", 1]"#), place).contains("expected a number"));
        // serde_json writes NaN and infinities as null.
        assert!(error_at(&conic("[1, null, 1]"), place).contains("found null"));
        let m = error_at(&conic("[1, 1]"), "contours[0].segments[1].conic.weights");
        assert_eq!(m, "expected 3 weights, found 2");
        // Normalisation failing: w0·w2 underflows to 0, so w1/√(w0·w2) is infinite.
        let m = error_at(
            &conic("[1e-200, 1, 1e-200]"),
            "contours[0].segments[1].conic",
        );
        assert!(m.contains("standard form"), "{m}");
    }

    #[test]
    fn out_of_range_literal_is_a_syntax_error_with_line_and_column() {
        // serde_json refuses 1e400 ("number out of range") rather than reading it as infinity;
        // the literal fills columns 36 to 40 of line 3 here, and the error points at its end.
        let text = with_segments(r#"{"line": [[0, 0], [1e400, 0]]}"#);
        let m = error_at(&text, "line 3, column 40");
        assert!(m.contains("number out of range"), "{m}");
        // JSON (RFC 8259 §6) has no NaN literal.
        let m = error_at(
            &with_segments(r#"{"line": [[0, 0], [NaN, 0]]}"#),
            "line 3, column 36",
        );
        assert!(m.contains("expected value"), "{m}");
    }

    #[test]
    fn syntax_errors_name_line_and_column() {
        let m = error_at(
            "{\n  \"format\": \"ratline-outline\",\n}",
            "line 3, column 1",
        );
        assert_eq!(m, "not valid JSON: trailing comma");
        let m = error_at("{\"format\"", "line 1, column 9");
        assert!(m.starts_with("not valid JSON: EOF"), "{m}");
        error_at("\u{feff}{}", "line 1, column 1");
    }

    #[test]
    fn bad_homogeneous_points() {
        let conic = |h: &str| with_segments(&format!(r#"{{"conic": {{"homogeneous": {h}}}}}"#));
        let m = error_at(
            &conic("[[0, 0, 1], [5, 5, 0], [10, 0, 1]]"),
            "contours[0].segments[0].conic.homogeneous[1][2]",
        );
        assert!(m.contains("weight 0 is not positive"), "{m}");
        error_at(
            &conic("[[0, 0, 1], [5, 5, 1], [-10, 0, -1]]"),
            "contours[0].segments[0].conic.homogeneous[2][2]",
        );
        let m = error_at(
            &conic("[[0, 0, 1], [5, 5, 1]]"),
            "contours[0].segments[0].conic.homogeneous",
        );
        assert!(m.contains("expected 3 homogeneous control points"), "{m}");
        error_at(
            &conic("[[0, 0, 1], [5, 5], [10, 0, 1]]"),
            "contours[0].segments[0].conic.homogeneous[1]",
        );
        let m = error_at(
            &conic("[[0, 0, 1], [1e300, 5, 1e-300], [10, 0, 1]]"),
            "contours[0].segments[0].conic.homogeneous[1]",
        );
        assert!(m.contains("not finite"), "{m}");
    }

    #[test]
    fn conic_forms_are_exclusive_and_complete() {
        let conic = |body: &str| with_segments(&format!(r#"{{"conic": {body}}}"#));
        let both =
            conic(r#"{"homogeneous": [[0, 0, 1], [5, 5, 1], [10, 0, 1]], "weights": [1, 1, 1]}"#);
        let m = error_at(&both, "contours[0].segments[0].conic.weights");
        assert!(m.contains("unknown field"), "{m}");
        let m = error_at(
            &conic(r#"{"weights": [1, 1, 1]}"#),
            "contours[0].segments[0].conic",
        );
        assert_eq!(m, "missing field \"points\"");
        error_at(&conic("{}"), "contours[0].segments[0].conic");
    }

    #[test]
    fn wrong_numbers_of_points() {
        for (seg, n) in [
            (
                r#"{"line": [[0, 0], [1, 0], [2, 0]]}"#,
                "expected 2 control points [x, y], found 3",
            ),
            (
                r#"{"quadratic": [[0, 0], [1, 0]]}"#,
                "expected 3 control points [x, y], found 2",
            ),
            (
                r#"{"cubic": [[0, 0], [1, 0], [2, 0]]}"#,
                "expected 4 control points [x, y], found 3",
            ),
            (
                r#"{"conic": {"points": [[0, 0], [1, 0], [2, 0], [3, 0]], "weights": [1, 1, 1]}}"#,
                "expected 3 control points [x, y], found 4",
            ),
        ] {
            let kind = seg[2..].split('"').next().unwrap();
            let path = if kind == "conic" {
                "contours[0].segments[0].conic.points".to_string()
            } else {
                format!("contours[0].segments[0].{kind}")
            };
            assert_eq!(error_at(&with_segments(seg), &path), n);
        }
        let m = error_at(
            &with_segments(r#"{"line": [[0, 0], [1, 0, 2]]}"#),
            "contours[0].segments[0].line[1]",
        );
        assert_eq!(m, "expected 2 coordinates [x, y], found 3");
    }

    #[test]
    fn unknown_or_ambiguous_segment_kinds() {
        let m = error_at(
            &with_segments(&format!(r#"{LINE}, {{"spline": [[10, 0], [20, 0]]}}"#)),
            "contours[0].segments[1].spline",
        );
        assert!(m.starts_with("unknown segment kind \"spline\""), "{m}");
        let m = error_at(
            &with_segments(r#"{"line": [[0, 0], [1, 0]], "cubic": []}"#),
            "contours[0].segments[0]",
        );
        assert!(m.contains("found 2 fields"), "{m}");
        error_at(&with_segments("{}"), "contours[0].segments[0]");
        error_at(
            &with_segments("[[0, 0], [1, 0]]"),
            "contours[0].segments[0]",
        );
    }

    #[test]
    fn header_is_checked() {
        let text = with_segments(LINE);
        let m = error_at(&text.replace("\"version\": 1", "\"version\": 2"), "version");
        assert_eq!(m, "unsupported version 2: this ratline reads version 1");
        error_at(
            &text.replace("\"version\": 1", "\"version\": \"1\""),
            "version",
        );
        error_at(
            &text.replace("\"version\": 1", "\"version\": 1.5"),
            "version",
        );
        let m = error_at(&text.replace("ratline-outline", "svg"), "format");
        assert!(m.starts_with("not a ratline outline"), "{m}");
        let m = error_at(&text.replace("\"mm\"", "\"furlong\""), "units");
        assert_eq!(m, "unsupported units \"furlong\" (expected mm, in, pt)");
        // cm and px are lengths elsewhere in ratline, but not units of this format.
        error_at(&text.replace("\"mm\"", "\"px\""), "units");
        let m = error_at("[]", "$");
        assert!(m.contains("found an array"), "{m}");
        let m = error_at(r#"{"version": 1}"#, "$");
        assert_eq!(m, "missing field \"format\"");
        // A newer version's fields are not blamed before its version.
        let m = error_at(
            r#"{"format": "ratline-outline", "version": 7, "layers": []}"#,
            "version",
        );
        assert!(m.contains("unsupported version 7"), "{m}");
        let m = error_at(
            &text.replace("\"units\"", "\"layers\": [], \"units\""),
            "layers",
        );
        assert!(m.starts_with("unknown field \"layers\""), "{m}");
    }

    #[test]
    fn gaps_between_segments_are_errors() {
        // 2e-9 mm apart: beyond the 1e-9 mm join tolerance.
        let text = with_segments(&format!(
            r#"{LINE}, {{"line": [[10, 0], [20, 0]]}}, {{"line": [[20.000000002, 0], [30, 0]]}}"#
        ));
        let m = error_at(&text, "contours[0].segments[2]");
        assert!(
            m.starts_with("segment starts at (20.000000002, 0), 2"),
            "{m}"
        );
        // Within it: accepted as written.
        let ok = with_segments(&format!(
            r#"{LINE}, {{"line": [[10.0000000005, 0], [20, 0]]}}"#
        ));
        assert!(read_outline_json("ok.json", ok.as_bytes()).is_ok());
        // An arc's end is computed from its angles: (10, 0) + 5·(cos π, sin π) ≈ (5, 0).
        let arc = with_segments(
            r#"{"arc": {"center": [10, 0], "radius": 5, "start_angle": 0, "sweep": 3.141592653589793}}, {"line": [[5, 0], [5, 5]]}"#,
        );
        assert!(read_outline_json("ok.json", arc.as_bytes()).is_ok());
        let open_ring = with_segments(&format!(r#"{LINE}, {{"line": [[10, 0], [10, 10]]}}"#))
            .replace("\"closed\": false", "\"closed\": true");
        let m = error_at(&open_ring, "contours[0].segments[1]");
        assert!(m.starts_with("the contour is closed, but"), "{m}");
    }

    #[test]
    fn non_finite_coordinates_after_unit_conversion() {
        // 1e307 in is 2.54e308 mm, beyond f64::MAX ≈ 1.797e308.
        let text = with_segments(r#"{"line": [[0, 0], [1e307, 0]]}"#).replace("\"mm\"", "\"in\"");
        let m = error_at(&text, "contours[0].segments[0].line[1][0]");
        assert!(m.contains("not finite in millimetres"), "{m}");
        let text = with_segments(
            r#"{"arc": {"center": [0, 0], "radius": 1e307, "start_angle": 0, "sweep": 1}}"#,
        )
        .replace("\"mm\"", "\"in\"");
        error_at(&text, "contours[0].segments[0].arc.radius");
        // Each value finite, but the circle not: 1e308 + 1e308 overflows.
        let text = with_segments(
            r#"{"arc": {"center": [1e308, 0], "radius": 1e308, "start_angle": 0, "sweep": 1}}"#,
        );
        let m = error_at(&text, "contours[0].segments[0].arc.radius");
        assert!(m.contains("beyond the largest finite"), "{m}");
    }

    #[test]
    fn units_are_converted_to_mm() {
        // 1 in = 25.4 mm, 1 pt = 1/72 in (CSS Values and Units Level 3, §6.2).
        let text = with_segments(
            r#"{"line": [[0, 0], [1, 2]]}, {"arc": {"center": [1, 3], "radius": 1, "start_angle": -1.5707963267948966, "sweep": 1}}"#,
        );
        for (unit, k) in [("in", 25.4), ("pt", 25.4 / 72.0)] {
            let o = read_outline_json(
                "u.json",
                text.replace("\"mm\"", &format!("\"{unit}\"")).as_bytes(),
            )
            .unwrap();
            let s = &o.contours[0].segments;
            assert_eq!(s[0], Segment::Line(Line::new((0.0, 0.0), (k, 2.0 * k))));
            match s[1] {
                Segment::Arc(a) => {
                    assert_eq!((a.center, a.radius), (Point::new(k, 3.0 * k), k));
                    // Angles are not lengths.
                    assert_eq!(
                        (a.start_angle, a.sweep),
                        (-std::f64::consts::FRAC_PI_2, 1.0)
                    );
                }
                other => panic!("expected an arc, got {other:?}"),
            }
        }
    }

    #[test]
    fn bad_arcs_sources_and_fields() {
        let arc = |body: &str| with_segments(&format!(r#"{{"arc": {body}}}"#));
        error_at(
            &arc(r#"{"center": [0, 0], "radius": 0, "start_angle": 0, "sweep": 1}"#),
            "contours[0].segments[0].arc.radius",
        );
        error_at(
            &arc(r#"{"center": [0, 0], "radius": 1, "start_angle": 0, "sweep": 6.3}"#),
            "contours[0].segments[0].arc.sweep",
        );
        let m = error_at(
            &arc(r#"{"center": [0, 0], "radius": 1, "start_angle": 0}"#),
            "contours[0].segments[0].arc",
        );
        assert_eq!(m, "missing field \"sweep\"");
        let text = with_segments(LINE);
        error_at(
            &text.replace("\"index\": 0", "\"index\": -1"),
            "contours[0].source.index",
        );
        error_at(
            &text.replace("\"index\": 0", "\"index\": 0.5"),
            "contours[0].source.index",
        );
        error_at(
            &text.replace("\"closed\": false", "\"closed\": 0"),
            "contours[0].closed",
        );
        error_at(
            &text.replace("\"closed\"", "\"close\""),
            "contours[0].close",
        );
        error_at(
            &text.replace("\"file\": \"a.svg\"", "\"file\": 3"),
            "contours[0].source.file",
        );
        let skipped = text.replace(
            "\"units\"",
            r#""skipped": [{"source": {"file": "a", "element": "b", "index": 0}, "reason": 5}], "units""#,
        );
        error_at(&skipped, "skipped[0].reason");
        let warnings = text.replace("\"units\"", r#""warnings": ["ok", 1], "units""#);
        error_at(&warnings, "warnings[1]");
    }

    #[test]
    fn error_display_names_file_and_place() {
        let e = read_outline_json("shop/sign.json", with_segments("{}").as_bytes()).unwrap_err();
        assert!(e.to_string().starts_with(
            "shop/sign.json: contours[0].segments[0]: a segment has exactly one field"
        ));
    }
}
