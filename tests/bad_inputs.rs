//! A catalogue of malformed and hostile inputs, each driven through the binary in a temporary
//! folder: the exit code, a message that names the file and the place, no panic, and the
//! file rules (README "Exit codes"): a hard error writes nothing and leaves an existing output
//! untouched; whatever converts accounts for every contour (`contours_in = contours_out +
//! skipped`). The expected messages are ratline's own wording; the rules they check come from
//! the specifications named beside each case.

use std::path::{Path, PathBuf};
use std::process::Command;

/// What a case must end in.
enum Expect {
    /// Exit 2, nothing written; stderr holds every fragment.
    Refused(&'static [&'static str]),
    /// The job runs (exit `code`), the report is written, and the skipped entries' sources and
    /// reasons, joined, hold every fragment.
    Skipped(i32, &'static [&'static str]),
}

struct Case {
    name: &'static str,
    /// Files to create in the folder: (name, content).
    files: Vec<(&'static str, Vec<u8>)>,
    /// Arguments after `convert`; `{dir}` is the folder, `{fonts}` the vendored fonts.
    args: &'static [&'static str],
    expect: Expect,
}

const SVG_HEAD: &str = r#"<svg xmlns="http://www.w3.org/2000/svg" width="100mm" height="100mm" viewBox="0 0 100 100">"#;

fn svg(body: &str) -> Vec<u8> {
    format!("{SVG_HEAD}{body}</svg>").into_bytes()
}

const SQUARE: &str = r#"<rect width="3" height="3"/>"#;

fn json_outline(segments: &str) -> Vec<u8> {
    format!(
        r#"{{"format":"ratline-outline","version":1,"units":"mm","contours":[{{"closed":false,"source":{{"file":"x","element":"e","index":0}},"segments":[{segments}]}}]}}"#
    )
    .into_bytes()
}

fn fonts() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fonts")
}

/// A copy of the vendored DejaVu Sans with bytes overwritten at the start of one table (found
/// through the table directory: OpenType 1.9, "Organization of an OpenType Font": numTables at
/// offset 4, 16-byte records from offset 12: tag, checksum, offset, length).
fn font_with_broken_table(tag: &[u8; 4], patch: &[u8], at: usize) -> Vec<u8> {
    let (mut f, off, _) = font_table(tag);
    f[off + at..off + at + patch.len()].copy_from_slice(patch);
    f
}

/// DejaVu Sans with one whole table filled with `byte`.
fn font_with_filled_table(tag: &[u8; 4], byte: u8) -> Vec<u8> {
    let (mut f, off, len) = font_table(tag);
    f[off..off + len].fill(byte);
    f
}

/// The font's bytes and the offset and length of one table.
fn font_table(tag: &[u8; 4]) -> (Vec<u8>, usize, usize) {
    let f = std::fs::read(fonts().join("DejaVuSans.ttf")).unwrap();
    let n = u16::from_be_bytes([f[4], f[5]]) as usize;
    let rec = (0..n)
        .map(|i| 12 + 16 * i)
        .find(|&r| &f[r..r + 4] == tag)
        .expect("the table exists");
    let word = |at: usize| u32::from_be_bytes(f[at..at + 4].try_into().unwrap()) as usize;
    let (off, len) = (word(rec + 8), word(rec + 12));
    (f, off, len)
}

fn cases() -> Vec<Case> {
    let entity_bomb = {
        // The "billion laughs" pattern (W3C XML 1.0 §4 entities expanding tenfold per level).
        let mut dtd = String::from(r#"<!ENTITY a "aaaaaaaaaa">"#);
        let names = ["a", "b", "c", "d", "e", "f", "g", "h"];
        for w in names.windows(2) {
            dtd.push_str(&format!(
                r#"<!ENTITY {} "{}">"#,
                w[1],
                format!("&{};", w[0]).repeat(10)
            ));
        }
        format!(
            r#"<?xml version="1.0"?><!DOCTYPE svg [{dtd}]><svg xmlns="http://www.w3.org/2000/svg"><desc>&h;</desc></svg>"#
        )
        .into_bytes()
    };
    let deep = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg">{}{}</svg>"#,
        "<g>".repeat(300),
        "</g>".repeat(300)
    );
    let many = format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg">{}</svg>"#,
        "<g/>".repeat(1_000_001)
    );
    let dejavu = std::fs::read(fonts().join("DejaVuSans.ttf")).unwrap();
    vec![
        // ---- SVG: the file as a whole
        Case { name: "empty svg", files: vec![("in.svg", b"  \n".to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: not an SVG file: the file is empty"]) },
        Case { name: "unclosed xml", files: vec![("in.svg", format!("{SVG_HEAD}<path d=\"M0 0 L1 1\"").into_bytes())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: line 1, column 1: malformed XML", "never closed"]) },
        Case { name: "entity bomb", files: vec![("in.svg", entity_bomb)], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: line 1, column", "entit"]) },
        Case { name: "nesting 300 deep", files: vec![("in.svg", deep.into_bytes())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: line 1, column", "nested more than 256 deep"]) },
        Case { name: "a million and one elements", files: vec![("in.svg", many.into_bytes())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: line 1, column", "more than 1000000 elements"]) },
        Case { name: "html root", files: vec![("in.svg", b"<html><body/></html>".to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: line 1, column 1: not an SVG file", "<html>"]) },
        Case { name: "png bytes", files: vec![("in.svg", b"\x89PNG\r\n\x1a\n\0\0".to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: not an SVG file: it is a PNG image"]) },
        Case { name: "gzip bytes", files: vec![("in.svg", vec![0x1f, 0x8b, 8, 0, 0])], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: not an SVG file", "gzip"]) },
        Case { name: "not utf-8", files: vec![("in.svg", b"<svg>\xff\xfe</svg>".to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: not an SVG file: it is not UTF-8 text (invalid byte at offset 5)"]) },
        Case { name: "use cycle", files: vec![("in.svg", svg(r##"<g id="k"><use href="#k"/></g>"##))], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: ", "line 1, column", "reference cycle"]) },
        Case { name: "1e308 mm wide", files: vec![("in.svg", br#"<svg xmlns="http://www.w3.org/2000/svg" width="1e308mm" height="1e308mm"><rect width="1" height="1"/></svg>"#.to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: root svg, line 1, column 1: width", "out of range"]) },
        Case { name: "NaN in viewBox", files: vec![("in.svg", br#"<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 NaN 10"><rect width="1" height="1"/></svg>"#.to_vec())], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: root svg, line 1, column 1", "viewBox"]) },
        Case { name: "rect 1e308 user units", files: vec![("in.svg", svg(r#"<rect width="1e308" height="1e308"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: rect[1], contour 0: segment 0", "beyond ±1e6 mm"]) },
        Case { name: "path to 1e308", files: vec![("in.svg", svg(r#"<path id="far" d="M0,0 L1e308,0 L3,4"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Refused(&["in.svg: #far, contour 0: segment 0", "beyond ±1e6 mm"]) },
        // ---- SVG: one element broken or empty, the rest converts (SVG 1.1 Appendix F.2: an
        // element in error is not rendered)
        Case { name: "empty path data", files: vec![("in.svg", svg(&format!(r#"<path d=""/>{SQUARE}"#)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(0, &["path[1]", "no path data"]) },
        Case { name: "only moveto commands", files: vec![("in.svg", svg(r#"<path id="m" d="M1,1 M2,2 m3 3"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(0, &["#m", "zero length"]) },
        Case { name: "arc to its own start", files: vec![("in.svg", svg(r#"<path id="a" d="M3,4 A5,5 0 0,1 3,4"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(0, &["#a", "zero length"]) },
        Case { name: "NaN circle centre", files: vec![("in.svg", svg(&format!(r#"<circle cx="NaN" cy="5" r="3"/>{SQUARE}"#)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["circle[1]", r#"cx="NaN""#]) },
        Case { name: "unknown unit in rx", files: vec![("in.svg", svg(r#"<rect width="10" height="10" rx="1furlong"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["rect[1]", r#"rx="1furlong""#]) },
        Case { name: "path data cut short", files: vec![("in.svg", svg(&format!(r#"<path d="M0,0 L10,10 L 5"/>{SQUARE}"#)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["path[1]", "malformed path data"]) },
        Case { name: "NaN arc radius", files: vec![("in.svg", svg(r#"<path d="M0 0 A nan 5 0 0 1 10 10"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["path[1]", "malformed path data at character 8"]) },
        Case { name: "negative radius", files: vec![("in.svg", svg(r#"<circle r="-5"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["circle[1]", "r is negative"]) },
        Case { name: "negative width", files: vec![("in.svg", svg(r#"<rect width="-3" height="3"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["rect[1]", "width is negative"]) },
        Case { name: "zero ellipse radius", files: vec![("in.svg", svg(&format!(r#"<ellipse rx="0" ry="3"/>{SQUARE}"#)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["ellipse[1]", "rx is zero"]) },
        Case { name: "odd polygon points", files: vec![("in.svg", svg(r#"<polygon points="1,2 3"/>"#))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["polygon[1]", "odd number of coordinates"]) },
        Case { name: "NaN transform", files: vec![("in.svg", svg(&format!(r#"<g transform="scale(NaN)">{SQUARE}</g>"#)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(2, &["g[1]", "scale(NaN)"]) },
        Case { name: "use of a missing id", files: vec![("in.svg", svg(&format!(r##"<use href="#nope"/>{SQUARE}"##)))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(0, &["use[1]", "#nope, which does not exist"]) },
        Case { name: "text element", files: vec![("in.svg", svg(&format!("<text>hi</text>{SQUARE}")))], args: &["{dir}/in.svg"],
            expect: Expect::Skipped(0, &["text[1]", "text is not converted"]) },
        // ---- Fonts (OpenType 1.9)
        Case { name: "not a font", files: vec![("f.ttf", b"not a font at all".to_vec())], args: &["--font", "{dir}/f.ttf", "--text", "A"],
            expect: Expect::Refused(&["f.ttf: not a font"]) },
        Case { name: "empty font file", files: vec![("f.ttf", vec![])], args: &["--font", "{dir}/f.ttf", "--text", "A"],
            expect: Expect::Refused(&["f.ttf: the font file is empty"]) },
        Case { name: "truncated font", files: vec![("f.ttf", dejavu[..2000].to_vec())], args: &["--font", "{dir}/f.ttf", "--text", "A"],
            expect: Expect::Refused(&["f.ttf: ", "past the end of the file (2000 bytes; truncated?)"]) },
        Case { name: "head with zero unitsPerEm", files: vec![("f.ttf", font_with_broken_table(b"head", &[0, 0], 18))], args: &["--font", "{dir}/f.ttf", "--text", "A"],
            expect: Expect::Refused(&["f.ttf: "]) },
        Case { name: "cmap table overwritten", files: vec![("f.ttf", font_with_broken_table(b"cmap", &[0xff; 64], 0))], args: &["--font", "{dir}/f.ttf", "--text", "AB", "--em", "10mm"],
            expect: Expect::Skipped(2, &["f.ttf", "'A' (glyph 0) line 1 col 1", "no glyph for U+0041"]) },
        Case { name: "glyf table overwritten", files: vec![("f.ttf", font_with_filled_table(b"glyf", 0x7f))], args: &["--font", "{dir}/f.ttf", "--text", "A", "--em", "10mm"],
            expect: Expect::Skipped(2, &["f.ttf", "'A' (glyph 36) line 1 col 1"]) },
        Case { name: "characters missing from the font", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "AZ€"],
            expect: Expect::Skipped(2, &["RatlineTestVar.ttf", "'Z' (glyph 0) line 1 col 2", "no glyph for U+005A", "no glyph for U+20AC"]) },
        // A closed glyph contour on one line and one of coincident points enclose no area: a
        // filled glyph draws nothing there (OpenType 1.9, "glyf": contours are filled by the
        // non-zero winding rule), so they are skipped as drawing nothing, and the job succeeds.
        Case { name: "zero-area glyphs", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A-."],
            expect: Expect::Skipped(0, &["'-' (glyph 6) line 1 col 2", "encloses no area", "'.' (glyph 7) line 1 col 3", "single points (zero length)"]) },
        Case { name: "cap height 1e308", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A", "--cap-height", "1e308mm"],
            expect: Expect::Refused(&["RatlineTestVar.ttf: size: 1e308 mm", "at most 100000 mm"]) },
        Case { name: "cap height zero", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A", "--cap-height", "0"],
            expect: Expect::Refused(&["RatlineTestVar.ttf: size: 0 mm"]) },
        Case { name: "font index out of range", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A", "--font-index", "5"],
            expect: Expect::Refused(&["RatlineTestVar.ttf: font index 5: out of range"]) },
        Case { name: "line spacing NaN", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A\\nA", "--line-spacing", "NaN"],
            expect: Expect::Refused(&["RatlineTestVar.ttf: line spacing: must be a finite number"]) },
        Case { name: "empty text", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", ""],
            expect: Expect::Refused(&["RatlineTestVar.ttf: text: the text is empty"]) },
        Case { name: "text file not utf-8", files: vec![("t.txt", b"A\xffB".to_vec())], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text-file", "{dir}/t.txt"],
            expect: Expect::Refused(&["t.txt: not UTF-8 text"]) },
        Case { name: "bad variation value", files: vec![], args: &["--font", "{fonts}/RatlineTestVar.ttf", "--text", "A", "--font-variation", "wght=abc"],
            expect: Expect::Refused(&["--font-variation 'wght=abc'"]) },
        Case { name: "font given as an input file", files: vec![("f.ttf", dejavu[..4096].to_vec())], args: &["{dir}/f.ttf"],
            expect: Expect::Refused(&["f.ttf: cannot tell the format from the name"]) },
        // ---- G-code (NISTIR 6556, RS274NGC)
        Case { name: "gcode exponent", files: vec![("in.nc", b"G1 X10 Y10 F100\nG1 X1e400\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: line 2: "]) },
        Case { name: "gcode R arc to its start", files: vec![("in.nc", b"G21 G90\nG0 X0 Y0\nG1 X10 F100\nG2 X10 Y0 R5\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: line 4: ", "equal end points"]) },
        Case { name: "gcode word without number", files: vec![("in.nc", b"G20\nG1 X NaN\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: line 2: word \"X\" has no valid number"]) },
        Case { name: "gcode unclosed comment", files: vec![("in.nc", b"G1 X10 (unclosed\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: line 1: comment without a closing ')'"]) },
        Case { name: "gcode unknown G word", files: vec![("in.nc", b"G7 X1\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: line 1: unsupported word G7"]) },
        Case { name: "gcode not text", files: vec![("in.nc", b"G1 X\xff\n".to_vec())], args: &["{dir}/in.nc"],
            expect: Expect::Refused(&["in.nc: not text (byte 4)"]) },
        // ---- JSON outlines (docs/outline-format.md; RFC 8259 numbers)
        Case { name: "json string for a number", files: vec![("in.json", json_outline(r#"{"line":[[0,0],[1,"x"]]}"#))], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: contours[0]"]) },
        Case { name: "json negative weight", files: vec![("in.json", json_outline(r#"{"conic":{"homogeneous":[[0,0,1],[1,1,-0.5],[2,0,1]]}}"#))], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: contours[0]"]) },
        Case { name: "json number out of range", files: vec![("in.json", json_outline(r#"{"line":[[0,0],[1e400,0]]}"#))], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: line 1, column", "number out of range"]) },
        Case { name: "json future version", files: vec![("in.json", br#"{"format":"ratline-outline","version":99,"contours":[]}"#.to_vec())], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: version: unsupported version 99"]) },
        Case { name: "json unknown units", files: vec![("in.json", br#"{"format":"ratline-outline","version":1,"units":"furlong","contours":[]}"#.to_vec())], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: units: unsupported units \"furlong\""]) },
        Case { name: "json cut short", files: vec![("in.json", br#"{"format":"ratline-outline""#.to_vec())], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: line 1, column 27: not valid JSON"]) },
        Case { name: "json array", files: vec![("in.json", b"[1,2,3]".to_vec())], args: &["{dir}/in.json"],
            expect: Expect::Refused(&["in.json: $: expected a ratline outline"]) },
        // ---- Command-line values
        Case { name: "zero tolerance", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--tolerance", "0"],
            expect: Expect::Refused(&["--tolerance", "must be a positive, finite length"]) },
        Case { name: "negative tolerance", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--tolerance=-1mm"],
            expect: Expect::Refused(&["--tolerance", "must be a positive, finite length"]) },
        Case { name: "tolerance below the limit", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--tolerance", "1e-9mm"],
            expect: Expect::Refused(&["--tolerance", "below the smallest accepted, 0.000001 mm"]) },
        Case { name: "unknown unit", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--tolerance", "0.01furlong"],
            expect: Expect::Refused(&["--tolerance", "unknown unit 'furlong'"]) },
        Case { name: "infinite cut depth", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--gcode", "{dir}/out.nc", "--cut-z", "1e400"],
            expect: Expect::Refused(&["--cut-z", "not a finite length"]) },
        Case { name: "NaN feed", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--gcode", "{dir}/out.nc", "--feed", "NaN"],
            expect: Expect::Refused(&["feed NaN"]) },
        Case { name: "zero px per inch", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--px-per-inch", "0"],
            expect: Expect::Refused(&["--px-per-inch 0 must be a positive number"]) },
        Case { name: "max segments not a number", files: vec![("in.svg", svg(SQUARE))], args: &["{dir}/in.svg", "--max-segments", "abc"],
            expect: Expect::Refused(&["--max-segments"]) },
        Case { name: "output segment limit", files: vec![("in.svg", svg(r#"<circle cx="50" cy="50" r="40"/>"#))], args: &["{dir}/in.svg", "--to", "lines", "--tolerance", "0.000001mm", "--max-segments", "1000"],
            expect: Expect::Refused(&["the output passed the limit of 1000 segments (--max-segments)", "after fitting 0 of 1 contours"]) },
        // One contour alone that would need about 1.5e6 lines (a circle of radius 900 m at
        // 1e-6 mm, error split both sides: n = ⌈π / arccos((r − t)/(r + t))⌉ ≈ π/√(4t/r),
        // REFERENCES §3):
        // stopped inside the fit, before the lines are built.
        Case { name: "one huge circle at a micrometre", files: vec![("in.svg", svg(r#"<circle cx="0" cy="0" r="9e5"/>"#))], args: &["{dir}/in.svg", "--to", "lines", "--tolerance", "0.000001mm", "--max-segments", "100000"],
            expect: Expect::Refused(&["the output passed the limit of 100000 segments (--max-segments)", "after fitting 0 of 1 contours"]) },
        Case { name: "one huge curve at a micrometre", files: vec![("in.svg", svg(r#"<path d="M0 0 C 3e5 3e5 6e5 -3e5 9e5 0"/>"#))], args: &["{dir}/in.svg", "--to", "arcs", "--tolerance", "0.000001mm", "--max-segments", "2000"],
            expect: Expect::Refused(&["the output passed the limit of 2000 segments (--max-segments)", "after fitting 0 of 1 contours"]) },
        Case { name: "missing input", files: vec![], args: &["{dir}/nope.svg"],
            expect: Expect::Refused(&["nope.svg: cannot read"]) },
        Case { name: "input is a folder", files: vec![], args: &["{dir}"],
            expect: Expect::Refused(&["is a folder, not a file"]) },
    ]
}

struct Run {
    code: Option<i32>,
    stderr: String,
    dir: tempfile::TempDir,
}

const OLD: &[u8] = b"an existing output that a failed job must leave alone\n";

/// Run one case with `-o out.svg --report report.json`, `out.svg` existing beforehand.
fn run(c: &Case) -> Run {
    let dir = tempfile::tempdir().unwrap();
    for (name, bytes) in &c.files {
        std::fs::write(dir.path().join(name), bytes).unwrap();
    }
    std::fs::write(dir.path().join("out.svg"), OLD).unwrap();
    let d = dir.path().display().to_string();
    let f = fonts().display().to_string();
    let mut args: Vec<String> = vec!["convert".into()];
    args.extend(
        c.args
            .iter()
            .map(|a| a.replace("{dir}", &d).replace("{fonts}", &f)),
    );
    args.extend(
        ["-o", "{dir}/out.svg", "--report", "{dir}/report.json", "-q"]
            .map(|a| a.replace("{dir}", &d)),
    );
    let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
        .args(&args)
        .env("NO_COLOR", "1")
        .output()
        .unwrap();
    Run {
        code: o.status.code(),
        stderr: String::from_utf8_lossy(&o.stderr).into_owned(),
        dir,
    }
}

/// The report's contour accounting balances; returns the skipped entries as text.
fn check_balance(name: &str, report: &Path) -> String {
    let r: serde_json::Value = serde_json::from_slice(&std::fs::read(report).unwrap()).unwrap();
    let skipped = r["skipped"].as_array().unwrap();
    assert_eq!(
        r["contours_in"].as_u64().unwrap(),
        r["contours_out"].as_u64().unwrap() + skipped.len() as u64,
        "{name}: contours_in = contours_out + skipped"
    );
    assert_eq!(
        r["contours_out"].as_u64().unwrap() as usize,
        r["contours"].as_array().unwrap().len(),
        "{name}: one contour report per contour out"
    );
    serde_json::to_string(skipped).unwrap()
}

#[test]
fn catalogue_of_bad_inputs() {
    let cases = cases();
    assert!(cases.len() >= 40, "{} cases", cases.len());
    let mut failures = Vec::new();
    for c in &cases {
        let r = run(c);
        let inputs_before: Vec<Vec<u8>> = c.files.iter().map(|(_, b)| b.clone()).collect();
        let mut fail = |m: String| failures.push(format!("{}: {m}", c.name));
        if r.stderr.contains("panicked") {
            fail(format!("panicked: {}", r.stderr));
        }
        // Inputs are never modified.
        for ((name, _), before) in c.files.iter().zip(&inputs_before) {
            if std::fs::read(r.dir.path().join(name)).ok().as_ref() != Some(before) {
                fail(format!("input {name} changed"));
            }
        }
        let report = r.dir.path().join("report.json");
        match &c.expect {
            Expect::Refused(fragments) => {
                if r.code != Some(2) {
                    fail(format!("exit {:?}, expected 2: {}", r.code, r.stderr));
                }
                for f in *fragments {
                    if !r.stderr.contains(f) {
                        fail(format!("stderr lacks {f:?}: {}", r.stderr));
                    }
                }
                if report.exists() || r.dir.path().join("out.nc").exists() {
                    fail("a hard error wrote an output".into());
                }
                if std::fs::read(r.dir.path().join("out.svg")).unwrap() != OLD {
                    fail("the existing output was touched".into());
                }
            }
            Expect::Skipped(code, fragments) => {
                if r.code != Some(*code) {
                    fail(format!("exit {:?}, expected {code}: {}", r.code, r.stderr));
                }
                if !report.exists() {
                    fail(format!("no report: {}", r.stderr));
                    continue;
                }
                let skipped = check_balance(c.name, &report);
                for f in *fragments {
                    if !skipped.contains(&f.replace('"', "\\\"")) {
                        fail(format!("skipped lacks {f:?}: {skipped}"));
                    }
                }
                let written = std::fs::read(r.dir.path().join("out.svg")).unwrap();
                if written == OLD || !written.starts_with(b"<?xml") && !written.starts_with(b"<svg")
                {
                    fail("the output was not replaced by a whole SVG".into());
                }
            }
        }
    }
    assert!(
        failures.is_empty(),
        "{} failures:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

/// Nothing lost on the demo: every target's report balances (README "Exit codes").
#[test]
fn demo_accounting_balances() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
        .args(["demo", "--out", &out.display().to_string()])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0));
    let r: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("report.json")).unwrap()).unwrap();
    let targets = r.as_object().unwrap();
    assert_eq!(targets.len(), 4);
    for (name, t) in targets {
        let skipped = t["skipped"].as_array().unwrap().len() as u64;
        assert!(t["contours_in"].as_u64().unwrap() > 0, "{name}");
        assert_eq!(
            t["contours_in"].as_u64().unwrap(),
            t["contours_out"].as_u64().unwrap() + skipped,
            "{name}"
        );
    }
}

/// A job that fails after its outputs are known (the second output cannot be written: its
/// folder does not exist) leaves an existing output either as it was or wholly replaced, never
/// cut short, and leaves no temporary file behind (write::atomic: temp file, fsync, rename).
#[test]
fn failed_job_never_leaves_a_half_written_output() {
    let dir = tempfile::tempdir().unwrap();
    let input = dir.path().join("in.svg");
    // Enough contours that a partial write would be visible.
    let body: String = (0..400)
        .map(|i| {
            format!(
                r#"<circle cx="{}" cy="{}" r="2"/>"#,
                5 + (i % 20) * 5,
                5 + (i / 20) * 5
            )
        })
        .collect();
    std::fs::write(&input, svg(&body)).unwrap();
    let input_before = std::fs::read(&input).unwrap();
    let out = dir.path().join("out.svg");
    std::fs::write(&out, OLD).unwrap();
    let job = || {
        Command::new(env!("CARGO_BIN_EXE_ratline"))
            .arg("convert")
            .arg(&input)
            .arg("-o")
            .arg(&out)
            .arg("--gcode")
            .arg(dir.path().join("missing-folder/out.nc"))
            .arg("-q")
            .output()
            .unwrap()
    };
    let o = job();
    let stderr = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "{stderr}");
    assert!(stderr.contains("out.nc: cannot write"), "{stderr}");
    assert!(!stderr.contains("panicked"));
    // The missing folder is found before anything is written: the old output stays as it was.
    assert_eq!(std::fs::read(&out).unwrap(), OLD);
    // With the folder there, the same job replaces it as a whole document that a reference SVG
    // parser (usvg) reads, every one of the 400 circles present.
    std::fs::create_dir(dir.path().join("missing-folder")).unwrap();
    let o = job();
    assert_eq!(o.status.code(), Some(0));
    let tree = usvg::Tree::from_data(&std::fs::read(&out).unwrap(), &usvg::Options::default())
        .expect("a whole SVG");
    assert_eq!(count_paths(tree.root()), 400);
    assert_eq!(
        std::fs::read(&input).unwrap(),
        input_before,
        "input untouched"
    );
    let leftovers: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .filter_map(|e| e.ok())
        .filter(|e| e.file_name().to_string_lossy().ends_with(".tmp"))
        .collect();
    assert!(leftovers.is_empty(), "temporary files left: {leftovers:?}");
}

fn count_paths(g: &usvg::Group) -> usize {
    g.children()
        .iter()
        .map(|n| match n {
            usvg::Node::Group(g) => count_paths(g),
            usvg::Node::Path(_) => 1,
            _ => 0,
        })
        .sum()
}
