//! The font reader against the fonts read a second way (Python fontTools, through
//! tests/fonttools_check.py) and against the fonts' own tables: glyph contours, metrics,
//! kerning, line layout, and bad input.
//!
//! fontTools is required (`pip install -r tests/requirements.txt`); the tests fail, naming
//! what is missing, when python3 or fontTools is not there.

use std::path::PathBuf;
use std::process::Command;

use kurbo::{Point, Rect};
use ratline::geom::{Contour, Outline, Segment};
use ratline::read::font::{
    font_count, glyph_count, glyph_outline, set_text, Align, TextOptions, TextSize,
};
use serde_json::Value;

const DEJAVU: &str = "DejaVuSans.ttf";
const CANTARELL: &str = "Cantarell-Regular.otf";
/// Our own variable font (tests/fonts/make_test_variable_font.py): axis wght 100..400..900.
const VAR: &str = "RatlineTestVar.ttf";

fn path(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/fonts")
        .join(name)
}

fn font(name: &str) -> Vec<u8> {
    std::fs::read(path(name)).unwrap_or_else(|e| panic!("{}: {e}", path(name).display()))
}

/// The fontTools reading of a font (see tests/fonttools_check.py).
fn fonttools(name: &str) -> Value {
    fonttools_at(name, &[])
}

/// The fontTools reading of a variable font's instance at `axes` (such as `wght=700`).
fn fonttools_at(name: &str, axes: &[&str]) -> Value {
    let script = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/fonttools_check.py");
    let out = Command::new("python3")
        .arg(&script)
        .arg(path(name))
        .args(axes)
        .output()
        .unwrap_or_else(|e| {
            panic!(
                "cannot run python3 ({e}): these tests need Python 3 with fontTools \
                 (pip install -r tests/requirements.txt)"
            )
        });
    assert!(
        out.status.success(),
        "{} failed: {}\n(these tests need fontTools: pip install -r tests/requirements.txt)",
        script.display(),
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("fonttools_check.py prints JSON")
}

fn f(v: &Value) -> f64 {
    v.as_f64().unwrap_or_else(|| panic!("not a number: {v}"))
}

fn opts(text: &str, size: TextSize) -> TextOptions {
    TextOptions {
        text: text.to_string(),
        size,
        ..TextOptions::default()
    }
}

fn points(s: &Segment) -> Vec<Point> {
    match s {
        Segment::Line(l) => vec![l.p0, l.p1],
        Segment::Quad(q) => vec![q.p0, q.p1, q.p2],
        Segment::Cubic(c) => vec![c.p0, c.p1, c.p2, c.p3],
        other => panic!("a font gives no {other:?}"),
    }
}

/// The bounding box of contours whose element contains `pat` (e.g. `line 2`, `'V'`).
fn bbox_of(o: &Outline, pat: &str) -> Rect {
    o.contours
        .iter()
        .filter(|c| c.source.element.contains(pat))
        .filter_map(Contour::bounding_box)
        .reduce(|a, b| a.union(b))
        .unwrap_or_else(|| panic!("no contour for {pat}"))
}

/// Every glyph fontTools lists, outlined by ratline at 1 mm per font unit, against fontTools'
/// contours (count, segment kinds per contour, tight bounding box) and against ttf-parser's
/// glyph bounding box (the box of all outline points, truncated to integers).
fn glyphs_match_fonttools(name: &str, min_glyphs: usize) {
    let data = font(name);
    let ft = fonttools(name);
    let upem = f(&ft["units_per_em"]);
    assert_eq!(
        glyph_count(name, &data, 0).unwrap() as u64,
        ft["num_glyphs"].as_u64().unwrap()
    );
    let face = ttf_parser::Face::parse(&data, 0).unwrap();
    let glyphs = ft["glyphs"].as_array().unwrap();
    assert!(
        glyphs.len() >= min_glyphs,
        "only {} glyphs checked",
        glyphs.len()
    );
    let mut bad = Vec::new();
    let mut kinds_seen = [0usize; 3];
    for g in glyphs {
        let id = g["id"].as_u64().unwrap() as u16;
        let want = g["contours"].as_array().unwrap();
        let got = glyph_outline(name, &data, 0, id, upem)
            .unwrap_or_else(|e| panic!("glyph {id}: {e}"))
            .unwrap_or_default();
        if got.len() != want.len() {
            bad.push(format!(
                "glyph {id} {}: {} contours, fontTools {}",
                g["name"],
                got.len(),
                want.len()
            ));
            continue;
        }
        let mut control: Option<Rect> = None;
        for (k, (c, w)) in got.iter().zip(want).enumerate() {
            assert!(c.closed);
            assert_eq!(c.source.element, format!("glyph {id}"));
            assert_eq!(c.source.index, k);
            // Connected and closed, exactly.
            for (a, b) in c.segments.iter().zip(c.segments.iter().cycle().skip(1)) {
                assert_eq!(a.end(), b.start(), "glyph {id} contour {k} has a gap");
            }
            let mut n = [0usize; 3];
            for s in &c.segments {
                let i = match s {
                    Segment::Line(_) => 0,
                    Segment::Quad(_) => 1,
                    _ => 2,
                };
                n[i] += 1;
                kinds_seen[i] += 1;
                for p in points(s) {
                    let r = Rect::from_points(p, p);
                    control = Some(control.map_or(r, |b| b.union(r)));
                }
            }
            let wn = [&w["lines"], &w["quads"], &w["cubics"]].map(|v| v.as_u64().unwrap() as usize);
            if n != wn {
                bad.push(format!(
                    "glyph {id} contour {k}: lines/quads/cubics {n:?}, fontTools {wn:?}"
                ));
            }
            // ratline is y down: font box (x0, y0, x1, y1) is (x0, -y1, x1, -y0) here.
            let b = c.bounding_box().unwrap();
            let wb: Vec<f64> = w["bbox"].as_array().unwrap().iter().map(f).collect();
            let mine = [b.x0, -b.y1, b.x1, -b.y0];
            if mine.iter().zip(&wb).any(|(a, b)| (a - b).abs() > 1e-3) {
                bad.push(format!(
                    "glyph {id} contour {k}: bbox {mine:?}, fontTools {wb:?}"
                ));
            }
        }
        if let Some(cb) = control {
            let mine = [cb.x0, -cb.y1, cb.x1, -cb.y0];
            let wb: Vec<f64> = g["control_bbox"]
                .as_array()
                .unwrap()
                .iter()
                .map(f)
                .collect();
            if mine.iter().zip(&wb).any(|(a, b)| (a - b).abs() > 1e-3) {
                bad.push(format!(
                    "glyph {id}: control bbox {mine:?}, fontTools {wb:?}"
                ));
            }
            let t = face
                .glyph_bounding_box(ttf_parser::GlyphId(id))
                .unwrap_or_else(|| panic!("glyph {id}: ttf-parser gives no bbox"));
            let tp = [t.x_min, t.y_min, t.x_max, t.y_max].map(f64::from);
            // ttf-parser's box also holds single-point contours (TrueType hinting anchors,
            // as in DejaVu Sans 'u'), which draw nothing; add them as fontTools lists them.
            let mut mine = mine;
            for p in g["lone_points"].as_array().unwrap() {
                let (x, y) = (f(&p[0]), f(&p[1]));
                mine = [
                    mine[0].min(x),
                    mine[1].min(y),
                    mine[2].max(x),
                    mine[3].max(y),
                ];
            }
            if mine.iter().zip(&tp).any(|(a, b)| (a - b).abs() >= 1.0) {
                bad.push(format!(
                    "glyph {id}: control bbox {mine:?}, ttf-parser {tp:?}"
                ));
            }
        }
    }
    assert!(
        bad.is_empty(),
        "{} mismatches in {name}:\n{}",
        bad.len(),
        bad[..bad.len().min(20)].join("\n")
    );
    eprintln!(
        "{name}: {} glyphs, segments lines/quads/cubics {kinds_seen:?}",
        glyphs.len()
    );
}

#[test]
fn dejavu_glyphs_match_fonttools() {
    glyphs_match_fonttools(DEJAVU, 500);
    // The sample holds composite glyphs (accented letters built from components).
    let ft = fonttools(DEJAVU);
    let composites = ft["glyphs"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|g| g["composite"] == true)
        .count();
    assert!(composites > 50, "{composites} composites");
}

#[test]
fn cantarell_glyphs_match_fonttools() {
    glyphs_match_fonttools(CANTARELL, 300);
}

#[test]
fn variable_font_default_instance_matches_fonttools() {
    glyphs_match_fonttools(VAR, 6);
}

/// Text set at a variation instance against fontTools' instancer at the same axis value:
/// each letter's outline box, placed at the sum of the preceding advances (the instance's
/// hmtx; the font has no HVAR, so both take advances from gvar's phantom points).
#[test]
fn variations_match_fonttools_instancer() {
    let data = font(VAR);
    for wght in [100.0f32, 400.0, 700.0, 900.0] {
        let ft = fonttools_at(VAR, &[&format!("wght={wght}")]);
        let mut o = opts("HxAV", TextSize::Em(1000.0)); // 1 mm per font unit
        o.variations = vec![("wght".to_string(), wght)];
        let out = set_text(VAR, &data, &o).unwrap();
        let mut pen = 0.0;
        for ch in ["H", "x", "A", "V"] {
            let b = bbox_of(&out, &format!("'{ch}'"));
            let w: Vec<f64> = ft["letters"][ch]["bbox"]
                .as_array()
                .unwrap()
                .iter()
                .map(f)
                .collect();
            let want = [pen + w[0], -w[3], pen + w[2], -w[1]];
            let got = [b.x0, b.y0, b.x1, b.y1];
            for (g, e) in got.iter().zip(want) {
                assert!(
                    (g - e).abs() < 0.01,
                    "wght {wght} '{ch}': {got:?} vs fontTools {want:?}"
                );
            }
            pen += f(&ft["letters"][ch]["advance"]);
        }
    }
    // The default instance is wght 400.
    let mut o = opts("HxAV", TextSize::Em(10.0));
    let plain = set_text(VAR, &data, &o).unwrap();
    o.variations = vec![("wght".to_string(), 400.0)];
    assert_eq!(set_text(VAR, &data, &o).unwrap(), plain);
    // Bad settings name the axis.
    for (tag, v, msg) in [
        ("wght", 1000.0, "outside the axis range 100 to 900"),
        ("wdth", 100.0, "no such axis (its axes: wght)"),
        ("toolong", 1.0, "1 to 4 ASCII"),
        ("wght", f32::NAN, "not a finite number"),
    ] {
        o.variations = vec![(tag.to_string(), v)];
        let e = set_text(VAR, &data, &o).unwrap_err();
        assert_eq!(e.place, Some(format!("variation {tag}={v}")));
        assert!(e.message.contains(msg), "{e}");
    }
}

#[test]
fn truetype_gives_quadratics_and_cff_gives_cubics() {
    for (name, quad) in [(DEJAVU, true), (CANTARELL, false)] {
        let o = set_text(name, &font(name), &opts("Ooh", TextSize::Em(10.0))).unwrap();
        let segs: Vec<&Segment> = o.contours.iter().flat_map(|c| &c.segments).collect();
        assert!(
            segs.iter().any(|s| matches!(s, Segment::Quad(_))) == quad,
            "{name}"
        );
        assert!(
            segs.iter().any(|s| matches!(s, Segment::Cubic(_))) != quad,
            "{name}"
        );
    }
}

#[test]
fn cap_height_50mm_puts_the_top_of_h_at_50mm_in_dejavu() {
    let o = set_text(DEJAVU, &font(DEJAVU), &opts("H", TextSize::CapHeight(50.0))).unwrap();
    let b = o.bounding_box().unwrap();
    assert!((b.y0 + 50.0).abs() < 1e-6, "top {}", b.y0);
    assert!(b.y1.abs() < 1e-6, "baseline {}", b.y1);
    // The top is flat: a horizontal line at y = -50.
    let flat = o.contours[0].segments.iter().any(|s| {
        matches!(s, Segment::Line(l) if (l.p0.y + 50.0).abs() < 1e-6 && (l.p1.y + 50.0).abs() < 1e-6)
    });
    assert!(flat);
    // DejaVu Sans has OS/2 version 1 (no sCapHeight), so the scale is 50 mm over the top of
    // 'H' as fontTools reads it; the stem-to-stem width follows from that scale.
    let ft = fonttools(DEJAVU);
    assert_eq!(ft["os2"]["cap_height"], Value::Null);
    let hb: Vec<f64> = ft["letters"]["H"]["bbox"]
        .as_array()
        .unwrap()
        .iter()
        .map(f)
        .collect();
    let s = 50.0 / hb[3];
    assert!((b.width() - (hb[2] - hb[0]) * s).abs() < 1e-9);
    assert!(o.warnings.iter().any(|w| w.contains("no OS/2 cap height")));
}

#[test]
fn cap_height_uses_os2_cap_height_in_cantarell() {
    let ft = fonttools(CANTARELL);
    let cap = f(&ft["os2"]["cap_height"]);
    let o = set_text(
        CANTARELL,
        &font(CANTARELL),
        &opts("x", TextSize::CapHeight(50.0)),
    )
    .unwrap();
    let top = f(&ft["letters"]["x"]["bbox"][3]);
    // The x-height in mm is its height in font units times 50 / sCapHeight.
    let b = o.bounding_box().unwrap();
    assert!(
        (-b.y0 - top * 50.0 / cap).abs() < 1e-6,
        "{} vs {}",
        -b.y0,
        top * 50.0 / cap
    );
    assert!(o.warnings.is_empty(), "{:?}", o.warnings);
}

#[test]
fn em_size_scales_by_units_per_em() {
    let ft = fonttools(CANTARELL);
    let upem = f(&ft["units_per_em"]);
    let o = set_text(CANTARELL, &font(CANTARELL), &opts("H", TextSize::Em(20.0))).unwrap();
    let hb = &ft["letters"]["H"]["bbox"];
    let b = o.bounding_box().unwrap();
    assert!((-b.y0 - f(&hb[3]) * 20.0 / upem).abs() < 1e-9);
    assert!((b.x0 - f(&hb[0]) * 20.0 / upem).abs() < 1e-9);
}

#[test]
fn kerning_pulls_v_towards_a_in_dejavu() {
    let data = font(DEJAVU);
    let ft = fonttools(DEJAVU);
    let upem = f(&ft["units_per_em"]);
    // Both the kern table and GPOS (feature 'kern', pair adjustment) give A+V -131 units.
    let kern = f(&ft["kern"]["AV"]["gpos"]);
    assert_eq!(ft["kern"]["AV"]["kern_table"], ft["kern"]["AV"]["gpos"]);
    assert!(kern < 0.0);
    let adv_a = f(&ft["letters"]["A"]["advance"]);
    let adv_v = f(&ft["letters"]["V"]["advance"]);
    let em = |text: &str, align| {
        let mut o = opts(text, TextSize::Em(upem)); // 1 mm per font unit
        o.align = align;
        set_text(DEJAVU, &data, &o).unwrap()
    };
    let av = em("AV", Align::Left);
    let v_alone = em("V", Align::Left);
    let shift = bbox_of(&av, "'V'").x0 - bbox_of(&v_alone, "'V'").x0;
    assert!((shift - (adv_a + kern)).abs() < 1e-9, "V starts at {shift}");
    // The line width (from right alignment) is the two advances plus the kerning.
    let width = bbox_of(&av, "'A'").x0 - bbox_of(&em("AV", Align::Right), "'A'").x0;
    assert!(
        (width - (adv_a + adv_v + kern)).abs() < 1e-9,
        "width {width}"
    );
    assert!(width < adv_a + adv_v);
}

#[test]
fn sources_name_character_glyph_line_and_column() {
    let ft = fonttools(DEJAVU);
    let o = set_text(
        "sign.ttf",
        &font(DEJAVU),
        &opts("A B\nV", TextSize::CapHeight(10.0)),
    )
    .unwrap();
    let ga = ft["letters"]["A"]["glyph"].as_u64().unwrap();
    let gv = ft["letters"]["V"]["glyph"].as_u64().unwrap();
    let a: Vec<_> = o
        .contours
        .iter()
        .filter(|c| c.source.element.starts_with("'A'"))
        .collect();
    assert_eq!(a.len(), 2); // the outer shape and the counter
    assert_eq!(
        a[0].source.element,
        format!("'A' (glyph {ga}) line 1 col 1")
    );
    assert_eq!(a[0].source.file, "sign.ttf");
    assert_eq!((a[0].source.index, a[1].source.index), (0, 1));
    assert!(o
        .contours
        .iter()
        .any(|c| c.source.element.ends_with("line 1 col 3")));
    assert!(o
        .contours
        .iter()
        .any(|c| c.source.element == format!("'V' (glyph {gv}) line 2 col 1")));
    assert!(
        o.skipped.is_empty(),
        "a space is not skipped: {:?}",
        o.skipped
    );
}

/// Lines of capital H (which sits on the baseline) in both fonts: baselines at multiples of
/// line spacing × (ascender − descender + lineGap) from hhea as fontTools reads it (neither
/// font sets USE_TYPO_METRICS), and each alignment puts the line's advance box where it says.
#[test]
fn lines_and_alignment() {
    for name in [DEJAVU, CANTARELL] {
        let data = font(name);
        let ft = fonttools(name);
        assert_eq!(ft["os2"]["use_typo_metrics"], false);
        assert_eq!(f(&ft["kern"]["HH"]["gpos"].clone().max_or_zero()), 0.0);
        let upem = f(&ft["units_per_em"]);
        let hhea = &ft["hhea"];
        let line_h = f(&hhea["ascender"]) - f(&hhea["descender"]) + f(&hhea["line_gap"]);
        let hb = &ft["letters"]["H"]["bbox"];
        let (lsb, bottom) = (f(&hb[0]), f(&hb[1]));
        assert_eq!(bottom, 0.0);
        let adv = f(&ft["letters"]["H"]["advance"]);
        for (align, start) in [
            (Align::Left, 0.0),
            (Align::Center, -0.5),
            (Align::Right, -1.0),
        ] {
            let mut o = opts("H\nHH\nHHH", TextSize::Em(upem));
            o.line_spacing = 1.5;
            o.align = align;
            let out = set_text(name, &data, &o).unwrap();
            for n in 1..=3 {
                let b = bbox_of(&out, &format!("line {n} col 1"));
                let want_y = (n - 1) as f64 * 1.5 * line_h;
                assert!(
                    (b.y1 - want_y).abs() < 1e-9,
                    "{name} line {n}: baseline {} vs {want_y}",
                    b.y1
                );
                let want_x = start * n as f64 * adv + lsb;
                assert!(
                    (b.x0 - want_x).abs() < 1e-9,
                    "{name} {align:?} line {n}: x {} vs {want_x}",
                    b.x0
                );
            }
        }
    }
}

trait MaxOrZero {
    fn max_or_zero(self) -> Value;
}

impl MaxOrZero for Value {
    /// A missing pair (null) is no adjustment.
    fn max_or_zero(self) -> Value {
        if self.is_null() {
            Value::from(0.0)
        } else {
            self
        }
    }
}

#[test]
fn letter_spacing_adds_mm_between_letters_only() {
    let ft = fonttools(DEJAVU);
    let upem = f(&ft["units_per_em"]);
    let adv = f(&ft["letters"]["H"]["advance"]) * 10.0 / upem;
    for align in [Align::Left, Align::Right] {
        let mut o = opts("HHH", TextSize::Em(10.0));
        o.letter_spacing_mm = 5.0;
        o.align = align;
        let out = set_text(DEJAVU, &font(DEJAVU), &o).unwrap();
        let x: Vec<f64> = (1..=3)
            .map(|c| bbox_of(&out, &format!("col {c}")).x0)
            .collect();
        assert!((x[1] - x[0] - (adv + 5.0)).abs() < 1e-9);
        assert!((x[2] - x[1] - (adv + 5.0)).abs() < 1e-9);
        if align == Align::Right {
            // The line ends at 0 with no tracking after the last letter.
            let lsb = f(&ft["letters"]["H"]["bbox"][0]) * 10.0 / upem;
            assert!((x[2] - (-adv + lsb)).abs() < 1e-9, "{}", x[2]);
        }
    }
}

#[test]
fn missing_character_is_skipped_with_its_position() {
    let data = font(DEJAVU);
    let face = ttf_parser::Face::parse(&data, 0).unwrap();
    assert!(
        face.glyph_index('中').is_none(),
        "DejaVu Sans has no CJK ideographs"
    );
    let o = set_text(DEJAVU, &data, &opts("AB\nx中y", TextSize::CapHeight(10.0))).unwrap();
    assert_eq!(o.skipped.len(), 1, "{:?}", o.skipped);
    let s = &o.skipped[0];
    assert_eq!(s.source.element, "'中' (glyph 0) line 2 col 2");
    assert_eq!(s.source.file, DEJAVU);
    assert!(s.reason.contains("U+4E2D"), "{}", s.reason);
    // The rest is drawn; nothing is drawn for the missing character.
    assert!(o
        .contours
        .iter()
        .any(|c| c.source.element.ends_with("line 2 col 3")));
    assert!(!o
        .contours
        .iter()
        .any(|c| c.source.element.contains("glyph 0")));
}

#[test]
fn bad_input_gives_errors_naming_the_file() {
    let data = font(DEJAVU);
    let o = opts("Hi", TextSize::CapHeight(10.0));
    let e = set_text("a.ttf", &[], &o).unwrap_err();
    assert_eq!(e.file, "a.ttf");
    assert!(e.message.contains("empty"), "{e}");

    let e = set_text("a.ttf", &data[..1000], &o).unwrap_err();
    assert!(e.message.contains("truncated"), "{e}");

    // The PNG signature and the start of an IHDR chunk (PNG specification, 3rd ed., §5.2, §11.2.2).
    let png = b"\x89PNG\r\n\x1a\n\x00\x00\x00\x0dIHDR\x00\x00\x00\x10\x00\x00\x00\x10\x08\x06\x00\x00\x00";
    let e = set_text("logo.png", png, &o).unwrap_err();
    assert!(e.message.starts_with("not a font"), "{e}");

    let mut o1 = o.clone();
    o1.font_index = 1;
    let e = set_text("a.ttf", &data, &o1).unwrap_err();
    assert_eq!(e.place.as_deref(), Some("font index 1"));
    assert!(e.message.contains("single font"), "{e}");

    let e = set_text("a.ttf", &data, &opts("", TextSize::Em(5.0))).unwrap_err();
    assert_eq!(e.place.as_deref(), Some("text"));

    for size in [f64::NAN, f64::INFINITY, -1.0, 0.0, 1e9] {
        for s in [TextSize::Em(size), TextSize::CapHeight(size)] {
            let e = set_text("a.ttf", &data, &opts("H", s)).unwrap_err();
            assert_eq!(e.place.as_deref(), Some("size"), "{size}");
        }
        let e = glyph_outline("a.ttf", &data, 0, 36, size).unwrap_err();
        assert_eq!(e.place.as_deref(), Some("em size"));
    }
    let mut o2 = o.clone();
    o2.line_spacing = f64::NAN;
    assert_eq!(
        set_text("a.ttf", &data, &o2).unwrap_err().place.as_deref(),
        Some("line spacing")
    );
    let mut o3 = o.clone();
    o3.letter_spacing_mm = f64::INFINITY;
    assert_eq!(
        set_text("a.ttf", &data, &o3).unwrap_err().place.as_deref(),
        Some("letter spacing")
    );
    let mut o4 = o.clone();
    o4.variations = vec![("wght".into(), 700.0)];
    let e = set_text("a.ttf", &data, &o4).unwrap_err();
    assert!(e.message.contains("not a variable font"), "{e}");

    let n = glyph_count("a.ttf", &data, 0).unwrap();
    let e = glyph_outline("a.ttf", &data, 0, n, 10.0).unwrap_err();
    assert_eq!(e.place, Some(format!("glyph {n}")));
    assert_eq!(
        glyph_outline("a.ttf", &data, 0, 3, 10.0).unwrap(),
        None,
        "glyph 3 is the space"
    );
}

/// A font collection made byte by byte from the two fonts: the 'ttcf' header (OpenType 1.9,
/// "Font Collections": TTC header version 1.0) followed by both fonts, each table record's
/// offset moved to count from the start of the collection.
fn collection(fonts: &[Vec<u8>]) -> Vec<u8> {
    let header = 12 + 4 * fonts.len();
    let mut out = b"ttcf\x00\x01\x00\x00".to_vec();
    out.extend((fonts.len() as u32).to_be_bytes());
    let mut base = header;
    for f in fonts {
        out.extend((base as u32).to_be_bytes());
        base += f.len().next_multiple_of(4);
    }
    for f in fonts {
        let start = out.len();
        out.extend(f);
        let tables = u16::from_be_bytes([f[4], f[5]]) as usize;
        for i in 0..tables {
            let at = start + 12 + 16 * i + 8;
            let off = u32::from_be_bytes(out[at..at + 4].try_into().unwrap()) + start as u32;
            out[at..at + 4].copy_from_slice(&off.to_be_bytes());
        }
        out.resize(out.len().next_multiple_of(4), 0);
    }
    out
}

#[test]
fn font_collection_index_picks_the_font() {
    let (d, c) = (font(DEJAVU), font(CANTARELL));
    let ttc = collection(&[d.clone(), c.clone()]);
    assert_eq!(font_count(&ttc), 2);
    assert_eq!(font_count(&d), 1);
    let mut o = opts("Rag", TextSize::CapHeight(12.0));
    for (i, single) in [(0, &d), (1, &c)] {
        o.font_index = i;
        let from_ttc = set_text("x.ttc", &ttc, &o).unwrap();
        o.font_index = 0;
        let alone = set_text("x.ttc", single, &o).unwrap();
        assert_eq!(from_ttc, alone, "font {i}");
    }
    o.font_index = 2;
    let e = set_text("x.ttc", &ttc, &o).unwrap_err();
    assert_eq!(e.place.as_deref(), Some("font index 2"));
    assert!(e.message.contains("holds 2 fonts"), "{e}");
}

/// Cut and corrupted fonts never panic; whatever is set accounts for every visible character
/// (drawn or listed as skipped).
#[test]
fn damaged_fonts_never_panic_and_lose_nothing_silently() {
    let text = "Hamburgefonstiv 0123";
    let mut tally = [0usize; 3]; // errors, clean results, results with skips
    let mut check = |data: &[u8]| match set_text("d.ttf", data, &opts(text, TextSize::Em(10.0))) {
        Err(e) => {
            assert_eq!(e.file, "d.ttf");
            tally[0] += 1;
        }
        Ok(o) => {
            tally[if o.skipped.is_empty() { 1 } else { 2 }] += 1;
            for (i, ch) in text.chars().enumerate() {
                let col = format!("line 1 col {}", i + 1);
                let drawn = o.contours.iter().any(|c| c.source.element.ends_with(&col));
                let skipped = o.skipped.iter().any(|s| s.source.element.ends_with(&col));
                assert!(ch == ' ' || drawn || skipped, "{ch:?} at {col} lost");
            }
        }
    };
    for name in [DEJAVU, CANTARELL] {
        let data = font(name);
        for k in 0..64 {
            check(&data[..data.len() * k / 64]);
        }
        // Deterministic byte corruption (a linear congruential generator, Knuth's MMIX constants).
        let mut x: u64 = 0x2545_f491_4f6c_dd1d;
        for _ in 0..200 {
            let mut d = data.clone();
            for _ in 0..16 {
                x = x
                    .wrapping_mul(6364136223846793005)
                    .wrapping_add(1442695040888963407);
                let i = (x >> 33) as usize % d.len();
                d[i] = (x >> 17) as u8;
            }
            check(&d);
        }
    }
    eprintln!("errors, clean, with skips: {tally:?}");
    assert!(
        tally.iter().all(|&n| n > 0),
        "every outcome occurs: {tally:?}"
    );
}
