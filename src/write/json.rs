//! Writer for ratline's own outline format (`ratline-outline`, version 1), specified in
//! `docs/outline-format.md` and read back by `read::json`.
//!
//! The document is an object `{"format", "version", "units", "contours", "skipped",
//! "warnings"}`, always in millimetres. Each contour is `{"closed", "source", "segments"}`, each
//! segment a one-field object naming its kind: `{"line": [P0, P1]}`, `{"quadratic": [P0, P1,
//! P2]}`, `{"cubic": [P0, P1, P2, P3]}`, `{"arc": {"center", "radius", "start_angle",
//! "sweep"}}` (radians) or `{"conic": {"homogeneous": [H0, H1, H2]}}`, every point `[x, y]`.
//!
//! Conics are written in ONE convention: homogeneous control points `[w·x, w·y, w]` in standard
//! form (end weights 1, middle weight `w1' = w1 / √(w0·w2)`: Farin, *Curves and Surfaces for
//! CAGD*, 5th ed., 2002, ch. 13; Piegl & Tiller, *The NURBS Book*, 2nd ed., 1997, ch. 7). That
//! is how `geom::Conic` stores them, so nothing is recomputed on the way out; projected points
//! would need a division here and a multiplication when reading, and the pair does not always
//! give back the same bits.
//!
//! Numbers are written by serde_json as the shortest decimal that parses back to the same
//! `f64` (Ryū), and the crate enables serde_json's `float_roundtrip` so that parsing is
//! correctly rounded too: `read_outline_json(outline_to_json(o)) == o` bit for bit. A
//! non-finite number (which no reader produces) would be written as `null`, and the reader
//! rejects it.
//!
//! Layout: indented at the level of documents, contours and lists, one segment, source or
//! skipped item per line.

use std::io;

use serde::Serialize;
use serde_json::ser::Formatter;

use crate::geom::{Contour, Outline, Segment};
use crate::read::json::{FORMAT_TAG, FORMAT_VERSION};

/// A segment as it appears in the file: externally tagged by its kind.
#[derive(Serialize)]
#[serde(rename_all = "lowercase")]
enum SegmentJson {
    Line([[f64; 2]; 2]),
    Quadratic([[f64; 2]; 3]),
    Cubic([[f64; 2]; 4]),
    Arc(ArcJson),
    Conic(ConicJson),
}

#[derive(Serialize)]
struct ArcJson {
    center: [f64; 2],
    radius: f64,
    start_angle: f64,
    sweep: f64,
}

#[derive(Serialize)]
struct ConicJson {
    homogeneous: [[f64; 3]; 3],
}

fn xy(p: kurbo::Point) -> [f64; 2] {
    [p.x, p.y]
}

impl From<&Segment> for SegmentJson {
    fn from(s: &Segment) -> SegmentJson {
        match s {
            Segment::Line(l) => SegmentJson::Line([xy(l.p0), xy(l.p1)]),
            Segment::Quad(q) => SegmentJson::Quadratic([xy(q.p0), xy(q.p1), xy(q.p2)]),
            Segment::Cubic(c) => SegmentJson::Cubic([xy(c.p0), xy(c.p1), xy(c.p2), xy(c.p3)]),
            Segment::Arc(a) => SegmentJson::Arc(ArcJson {
                center: xy(a.center),
                radius: a.radius,
                start_angle: a.start_angle,
                sweep: a.sweep,
            }),
            Segment::Conic(c) => SegmentJson::Conic(ConicJson {
                homogeneous: c.homogeneous().map(|h| [h.x, h.y, h.z]),
            }),
        }
    }
}

/// serde_json's compact output with a space after each `,` and `:`, for one-line items.
struct OneLine;

impl Formatter for OneLine {
    fn begin_array_value<W: ?Sized + io::Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> io::Result<()> {
        if first {
            Ok(())
        } else {
            w.write_all(b", ")
        }
    }

    fn begin_object_key<W: ?Sized + io::Write>(
        &mut self,
        w: &mut W,
        first: bool,
    ) -> io::Result<()> {
        if first {
            Ok(())
        } else {
            w.write_all(b", ")
        }
    }

    fn begin_object_value<W: ?Sized + io::Write>(&mut self, w: &mut W) -> io::Result<()> {
        w.write_all(b": ")
    }
}

/// One value on one line.
fn one_line<T: Serialize>(value: &T) -> String {
    let mut out = Vec::new();
    let mut ser = serde_json::Serializer::with_formatter(&mut out, OneLine);
    // Writing plain structs, strings and f64 arrays into a Vec cannot fail: there are no maps
    // with non-string keys and no I/O.
    value
        .serialize(&mut ser)
        .expect("serialising outline data into memory cannot fail");
    String::from_utf8(out).expect("serde_json writes UTF-8")
}

/// A JSON array of already written items, one per line at `indent` + 2 spaces.
fn block(items: &[String], indent: usize) -> String {
    if items.is_empty() {
        return "[]".to_string();
    }
    let pad = " ".repeat(indent + 2);
    let body: Vec<String> = items.iter().map(|i| format!("{pad}{i}")).collect();
    format!("[\n{}\n{}]", body.join(",\n"), " ".repeat(indent))
}

fn contour_json(c: &Contour, indent: usize) -> String {
    let pad = " ".repeat(indent + 2);
    let segments: Vec<String> = c
        .segments
        .iter()
        .map(|s| one_line(&SegmentJson::from(s)))
        .collect();
    format!(
        "{{\n{pad}\"closed\": {},\n{pad}\"source\": {},\n{pad}\"segments\": {}\n{}}}",
        c.closed,
        one_line(&c.source),
        block(&segments, indent + 2),
        " ".repeat(indent)
    )
}

/// The outline in ratline's outline format, indented, millimetres, conics in homogeneous
/// standard form. `read::json::read_outline_json` reads it back bit for bit.
pub fn outline_to_json(outline: &Outline) -> String {
    let contours: Vec<String> = outline
        .contours
        .iter()
        .map(|c| contour_json(c, 4))
        .collect();
    let skipped: Vec<String> = outline.skipped.iter().map(one_line).collect();
    let warnings: Vec<String> = outline.warnings.iter().map(one_line).collect();
    format!(
        "{{\n  \"format\": {},\n  \"version\": {},\n  \"units\": \"mm\",\n  \"contours\": {},\n  \"skipped\": {},\n  \"warnings\": {}\n}}\n",
        one_line(&FORMAT_TAG),
        FORMAT_VERSION,
        block(&contours, 2),
        block(&skipped, 2),
        block(&warnings, 2)
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::{Conic, Skipped, Source};
    use kurbo::{Line, Point};

    fn sample() -> Outline {
        let conic = Conic::from_weighted(
            [
                Point::new(10.0, 0.0),
                Point::new(10.0, 10.0),
                Point::new(0.0, 10.0),
            ],
            [2.0, std::f64::consts::SQRT_2, 2.0],
        )
        .unwrap();
        Outline {
            contours: vec![Contour::new(
                vec![
                    Segment::Conic(conic),
                    Segment::Line(Line::new((0.0, 10.0), (10.0, 0.0))),
                ],
                true,
                Source::new("a \"quoted\".svg", "#ring", 2),
            )],
            skipped: vec![Skipped::hidden(
                Source::new("a.svg", "image[1]", 0),
                "raster image",
            )],
            warnings: vec![],
        }
    }

    #[test]
    fn writes_a_standard_json_document() {
        let text = outline_to_json(&sample());
        // Any conforming JSON parser must accept it (RFC 8259); serde_json is one.
        let v: serde_json::Value = serde_json::from_str(&text).unwrap();
        assert_eq!(v["format"], "ratline-outline");
        assert_eq!(v["version"], 1);
        assert_eq!(v["units"], "mm");
        assert_eq!(v["contours"][0]["source"]["file"], "a \"quoted\".svg");
        assert_eq!(v["contours"][0]["source"]["index"], 2);
        assert_eq!(v["skipped"][0]["reason"], "raster image");
        assert_eq!(v["warnings"], serde_json::json!([]));
        // Standard form: end weights 1, middle weight √2/(√(2·2)) = √2/2 (Farin ch. 13).
        let h = &v["contours"][0]["segments"][0]["conic"]["homogeneous"];
        assert_eq!(h[0], serde_json::json!([10.0, 0.0, 1.0]));
        assert_eq!(h[2], serde_json::json!([0.0, 10.0, 1.0]));
        let w = h[1][2].as_f64().unwrap();
        assert!((w - std::f64::consts::FRAC_1_SQRT_2).abs() < 1e-16);
        assert_eq!(
            v["contours"][0]["segments"][1],
            serde_json::json!({"line": [[0.0, 10.0], [10.0, 0.0]]})
        );
    }

    #[test]
    fn one_item_per_line() {
        let text = outline_to_json(&sample());
        let lines: Vec<&str> = text.lines().collect();
        assert!(lines.contains(&"        {\"line\": [[0.0, 10.0], [10.0, 0.0]]}"));
        assert!(lines.contains(
            &"      \"source\": {\"file\": \"a \\\"quoted\\\".svg\", \"element\": \"#ring\", \"index\": 2},"
        ));
        assert!(lines.contains(&"  \"warnings\": []"));
    }
}
