//! Integration tests of the SVG reader (`ratline::read::svg`).
//!
//! Every case under tests/svg/ is read by ratline and by usvg 0.45 (a general-purpose SVG
//! library, used here only as a reference) and the two must agree as point sets: a dense-sample
//! symmetric Hausdorff distance within usvg's own arc-to-cubic tolerance (0.1 user units, see
//! usvg `parser/shapes.rs`, `to_cubic_beziers(0.1, ..)`) scaled by the path's transform and
//! converted to mm, plus 1e-3 mm for usvg's f32 coordinates and the sampling.

use std::f64::consts::{FRAC_1_SQRT_2, PI};
use std::path::Path;

use kurbo::{
    Affine, CubicBez, Line, ParamCurve, ParamCurveExtrema, ParamCurveNearest, PathSeg, Point,
    QuadBez,
};
use ratline::geom::{Conic, Outline, Segment};
use ratline::read::svg::{read_svg, SvgOptions, MAX_DEPTH, MAX_ELEMENTS, MAX_USE_DEPTH};

fn load(name: &str) -> Vec<u8> {
    std::fs::read(
        Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("tests/svg")
            .join(name),
    )
    .unwrap_or_else(|e| panic!("{name}: {e}"))
}

fn read(name: &str) -> Outline {
    read_svg(name, &load(name), &SvgOptions::default()).unwrap_or_else(|e| panic!("{e}"))
}

fn read_str(svg: &str) -> Result<Outline, ratline::InputError> {
    read_svg("test.svg", svg.as_bytes(), &SvgOptions::default())
}

/// usvg's paths in mm (visible ones), each segment as a kurbo segment, and the tolerance:
/// 0.1 user units times the largest stretch of any path's transform.
fn usvg_paths(data: &[u8], dpi: f32) -> (Vec<PathSeg>, f64) {
    let opt = usvg::Options {
        dpi,
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_data(data, &opt).expect("usvg parses the case");
    let mm = 25.4 / dpi as f64;
    let mut segs = Vec::new();
    let mut stretch: f64 = 0.0;
    // Compose `Group::transform` down the tree rather than reading `abs_transform`: usvg 0.45
    // applies a `use` element's own transform twice in `abs_transform` (parser/use_node.rs,
    // `convert_children` pre-concatenates it and `convert_group` resolves it again), while the
    // relative `transform` of each group is right.
    let affine =
        |t: usvg::Transform| Affine::new([t.sx, t.ky, t.kx, t.sy, t.tx, t.ty].map(f64::from));
    let mut stack = vec![(
        tree.root(),
        Affine::scale(mm) * affine(tree.root().transform()),
    )];
    while let Some((g, at)) = stack.pop() {
        for node in g.children() {
            match node {
                usvg::Node::Group(g) => stack.push((g, at * affine(g.transform()))),
                usvg::Node::Path(p) if p.is_visible() => {
                    stretch = stretch.max(max_stretch(at));
                    collect(p.data(), at, &mut segs);
                }
                _ => {}
            }
        }
    }
    // ratline drops what has nothing to cut (a lone moveto, a zero-length close); so does this.
    segs.retain(|s| {
        let b = s.bounding_box();
        b.width() > 1e-9 || b.height() > 1e-9
    });
    (segs, 0.1 * stretch + 1e-3)
}

/// The largest singular value of the linear part.
fn max_stretch(a: Affine) -> f64 {
    let [a, b, c, d, _, _] = a.as_coeffs();
    let s = a * a + b * b + c * c + d * d;
    let det = a * d - b * c;
    (0.5 * (s + (s * s - 4.0 * det * det).max(0.0).sqrt())).sqrt()
}

fn collect(path: &usvg::tiny_skia_path::Path, a: Affine, out: &mut Vec<PathSeg>) {
    use usvg::tiny_skia_path::PathSegment as S;
    let p = |q: usvg::tiny_skia_path::Point| a * Point::new(q.x as f64, q.y as f64);
    let (mut cur, mut start) = (Point::ORIGIN, Point::ORIGIN);
    for s in path.segments() {
        match s {
            S::MoveTo(q) => {
                cur = p(q);
                start = cur;
            }
            S::LineTo(q) => {
                out.push(PathSeg::Line(Line::new(cur, p(q))));
                cur = p(q);
            }
            S::QuadTo(c, q) => {
                out.push(PathSeg::Quad(QuadBez::new(cur, p(c), p(q))));
                cur = p(q);
            }
            S::CubicTo(c1, c2, q) => {
                out.push(PathSeg::Cubic(CubicBez::new(cur, p(c1), p(c2), p(q))));
                cur = p(q);
            }
            S::Close => {
                out.push(PathSeg::Line(Line::new(cur, start)));
                cur = start;
            }
        }
    }
}

const SAMPLES: usize = 48;

/// max over ratline's samples of the distance to usvg's segments, and the reverse.
fn hausdorff(ours: &Outline, theirs: &[PathSeg]) -> (f64, f64) {
    let segs: Vec<&Segment> = ours.contours.iter().flat_map(|c| &c.segments).collect();
    let mut forward: f64 = 0.0;
    for s in &segs {
        for i in 0..=SAMPLES {
            let q = s.eval(i as f64 / SAMPLES as f64);
            let d = theirs
                .iter()
                .map(|t| t.nearest(q, 1e-9).distance_sq)
                .fold(f64::INFINITY, f64::min);
            forward = forward.max(d.sqrt());
        }
    }
    let mut backward: f64 = 0.0;
    for t in theirs {
        for i in 0..=SAMPLES {
            let q = t.eval(i as f64 / SAMPLES as f64);
            let d = segs
                .iter()
                .map(|s| s.nearest(q).0)
                .fold(f64::INFINITY, f64::min);
            backward = backward.max(d);
        }
    }
    (forward, backward)
}

fn cross_check(name: &str, contours: usize, opts: &SvgOptions) -> Outline {
    let data = load(name);
    let ours = read_svg(name, &data, opts).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        ours.contours.len(),
        contours,
        "{name}: contours {:#?}",
        ours.contours
    );
    let (theirs, tol) = usvg_paths(&data, opts.px_per_inch as f32);
    assert!(!theirs.is_empty(), "{name}: usvg found nothing");
    let (f, b) = hausdorff(&ours, &theirs);
    println!("{name}: ratline→usvg {f:.2e} mm, usvg→ratline {b:.2e} mm, tolerance {tol:.3e} mm");
    assert!(
        f <= tol && b <= tol,
        "{name}: ratline→usvg {f} mm, usvg→ratline {b} mm, tolerance {tol} mm"
    );
    for c in &ours.contours {
        for s in &c.segments {
            assert!(s.is_finite(), "{name}: non-finite segment in {}", c.source);
        }
        assert_eq!(c.source.file, name);
    }
    ours
}

/// (file, contours expected): each is cross-checked against usvg.
const CASES: &[(&str, usize)] = &[
    ("path_lines.svg", 4),
    ("path_curves.svg", 3),
    ("arcs_spec.svg", 3),
    ("arcs_out_of_range.svg", 4),
    ("rect_plain.svg", 2),
    ("rect_rounded.svg", 5),
    ("circle_ellipse.svg", 3),
    ("lines_polys.svg", 4),
    ("group_transforms.svg", 3),
    ("units_mm.svg", 2),
    ("units_in.svg", 1),
    ("units_pt.svg", 1),
    ("units_cm_pc.svg", 1),
    ("no_size.svg", 2),
    ("percent_viewbox.svg", 2),
    ("aspect_meet.svg", 2),
    ("aspect_slice.svg", 2),
    ("aspect_none.svg", 1),
    ("use_basic.svg", 6),
    ("use_symbol.svg", 4),
    ("nested_svg.svg", 3),
    ("hidden.svg", 2),
    ("style_sheet.svg", 2),
    ("degenerate.svg", 1),
    ("switch_a.svg", 2),
    ("rotated_arcs.svg", 2),
];

#[test]
fn every_case_agrees_with_usvg() {
    for (name, n) in CASES {
        cross_check(name, *n, &SvgOptions::default());
    }
}

#[test]
fn px_per_inch_90_agrees_with_usvg_at_90_dpi() {
    let o = cross_check("px90.svg", 2, &SvgOptions { px_per_inch: 90.0 });
    // 90 px at 90 px per inch is one inch: 25.4 mm (SVG 1.1 §7.10 assumed 90 px per inch).
    let b = o.contours[0].bounding_box().unwrap();
    assert!((b.width() - 25.4).abs() < 1e-9, "{b:?}");
}

fn conics(o: &Outline, contour: usize) -> Vec<Conic> {
    o.contours[contour]
        .segments
        .iter()
        .filter_map(|s| match s {
            Segment::Conic(c) => Some(*c),
            _ => None,
        })
        .collect()
}

// SVG 1.1 §8.3.8 arc example, values from Appendix F.6.5/F.6.6 as worked in REFERENCES.md §1
// (derived): `M300,200 h-150 a150,150 0 1,0 150,-150` has centre (300,200), Δθ = −270°;
// `M275,175 v-150 a150,150 0 0,0 -150,150` has centre (275,175), Δθ = −90°. The file maps
// the 1200 × 400 viewBox into 12 cm × 5.25 cm, xMidYMid meet: 1 user unit is 0.1 mm and
// y is shifted by (52.5 − 40)/2 = 6.25 mm (§7.8).
#[test]
fn spec_arc_example_through_the_reader() {
    let o = read("arcs_spec.svg");
    for (contour, centre, sweep_deg, pieces) in
        [(0, (30.0, 26.25), -270.0, 3), (1, (27.5, 23.75), -90.0, 1)]
    {
        let cs = conics(&o, contour);
        assert_eq!(cs.len(), pieces);
        let mut total = 0.0;
        for c in &cs {
            let f = c.as_circle(1e-9).expect("a circular arc stays circular");
            assert!((f.radius - 15.0).abs() < 1e-9, "radius {}", f.radius);
            assert!((f.center - Point::new(centre.0, centre.1)).hypot() < 1e-9);
            total += f.sweep;
        }
        // y points down in both SVG and ratline, so the signs are as in F.6.5.
        assert!(
            (total.to_degrees() - sweep_deg).abs() < 1e-9,
            "sweep {}",
            total.to_degrees()
        );
        assert!(o.contours[contour].closed);
    }
    // The third path: from (650,325) `a25,25 -30 0,1 50,-25` has its radius scaled to
    // 27.9508497187 and centre (675,312.5), Δθ = +180° (REFERENCES.md §1, derived).
    let first = conics(&o, 2);
    let mut total = 0.0;
    for c in &first[..2] {
        let f = c.as_circle(1e-9).unwrap();
        assert!((f.radius - 2.79508497187).abs() < 1e-9);
        assert!((f.center - Point::new(67.5, 37.5)).hypot() < 1e-9);
        total += f.sweep;
    }
    assert!((total - PI).abs() < 1e-9);
    assert!(!o.contours[2].closed);
}

// REFERENCES.md §1 (derived from SVG 1.1 F.6.5): `M10,20 A30,15 30 0,1 50,40` has centre
// (27.1196670586, 39.7243008422), Δθ = 97.0697323050°; every point of the conics lies on that
// rotated ellipse. The file has no viewBox and unitless width, so 1 user unit = 25.4/96 mm.
#[test]
fn rotated_ellipse_arc_stays_on_its_ellipse() {
    let o = read("arcs_out_of_range.svg");
    let rot = o
        .contours
        .iter()
        .find(|c| c.source.element == "#rot")
        .unwrap();
    let to_user = Affine::scale(96.0 / 25.4);
    let (c, phi) = (Point::new(27.1196670586, 39.7243008422), 30f64.to_radians());
    let Segment::Conic(first) = rot.segments[0] else {
        panic!("an arc is a conic")
    };
    assert!((to_user * first.eval(0.0) - Point::new(10.0, 20.0)).hypot() < 1e-9);
    for i in 0..=50 {
        let q = to_user * first.eval(i as f64 / 50.0) - c;
        let (u, v) = (
            q.x * phi.cos() + q.y * phi.sin(),
            -q.x * phi.sin() + q.y * phi.cos(),
        );
        assert!(((u / 30.0).powi(2) + (v / 15.0).powi(2) - 1.0).abs() < 1e-9);
    }
    // `M0,50 A1,1 0 0,1 10,50`: Λ = 25, the radius is scaled to 5 (REFERENCES.md §1).
    let scaled = o
        .contours
        .iter()
        .find(|c| c.source.element == "#scaled")
        .unwrap();
    for s in &scaled.segments {
        let Segment::Conic(k) = s else {
            panic!("expected conics")
        };
        let f = k.transform(to_user).as_circle(1e-9).unwrap();
        assert!((f.radius - 5.0).abs() < 1e-9 && (f.center - Point::new(5.0, 50.0)).hypot() < 1e-9);
    }
    // rx = 0 is a line; equal end points omit the arc (F.6.2): `#zero` is line, line.
    let zero = o
        .contours
        .iter()
        .find(|c| c.source.element == "#zero")
        .unwrap();
    assert_eq!(zero.segments.len(), 2);
    assert!(zero.segments.iter().all(|s| matches!(s, Segment::Line(_))));
}

// SVG 1.1 §9.2: a missing ry equals rx; radii are clamped to half the width and height. The
// corners are quarter ellipses: conics of weight cos(45°) = √2/2 (NURBS Book §7.3).
#[test]
fn rounded_rect_rules() {
    let o = read("rect_rounded.svg");
    let k = 96.0 / 25.4;
    let radius = |id: &str| -> Vec<(f64, f64)> {
        let c = o.contours.iter().find(|c| c.source.element == id).unwrap();
        assert!(c.closed);
        c.segments
            .iter()
            .filter_map(|s| match s {
                Segment::Conic(q) => {
                    assert!((q.weight() - FRAC_1_SQRT_2).abs() < 1e-15);
                    let [a, b, z] = q.points();
                    Some(((b - a).hypot() * k, (z - b).hypot() * k))
                }
                _ => None,
            })
            .collect()
    };
    let approx = |v: &[(f64, f64)], rx: f64, ry: f64| {
        assert_eq!(v.len(), 4);
        // Corners alternate: the first runs (x+w−rx, y) → (x+w, y+ry): legs rx then ry.
        for (i, (a, b)) in v.iter().enumerate() {
            let (ea, eb) = if i % 2 == 0 { (rx, ry) } else { (ry, rx) };
            assert!((a - ea).abs() < 1e-9 && (b - eb).abs() < 1e-9, "{v:?}");
        }
    };
    approx(&radius("#both"), 10.0, 5.0);
    approx(&radius("#rxonly"), 8.0, 8.0);
    approx(&radius("#ryonly"), 12.0, 12.0);
    approx(&radius("#clamped"), 30.0, 20.0);
    // rx = w/2 leaves no straight top and bottom: 2 sides and 4 corners.
    let half = o
        .contours
        .iter()
        .find(|c| c.source.element == "#half")
        .unwrap();
    assert_eq!(half.segments.len(), 6);
}

// Absolute units: 1 in = 25.4 mm, 1 pt = 1/72 in, 1 pc = 12 pt (CSS Values and Units 3 §6.2).
#[test]
fn root_units_give_exact_millimetres() {
    let size = |name: &str| read(name).bounding_box().unwrap();
    let b = size("units_mm.svg");
    assert!(
        (b.x1 - 100.0).abs() < 1e-9 && (b.y1 - 50.0).abs() < 1e-9,
        "{b:?}"
    );
    let b = size("units_in.svg"); // rect 100..300 of a 400-unit, 4 in wide drawing
    assert!(
        (b.x0 - 25.4).abs() < 1e-9 && (b.width() - 50.8).abs() < 1e-9,
        "{b:?}"
    );
    let b = size("units_pt.svg"); // 60 of 72 pt
    assert!((b.width() - 60.0 / 72.0 * 25.4).abs() < 1e-9, "{b:?}");
    let b = size("units_cm_pc.svg"); // 80% of 10 cm by 80% of 6 pc = 1 in
    assert!(
        (b.width() - 80.0).abs() < 1e-9 && (b.height() - 0.8 * 25.4).abs() < 1e-9,
        "{b:?}"
    );
    let b = size("no_size.svg"); // 96 px = 1 in
    assert!((b.width() - 25.4).abs() < 1e-9, "{b:?}");
    let b = read("percent_viewbox.svg").contours[0]
        .bounding_box()
        .unwrap();
    // width 100% and height 50% of the viewBox: 200 × 50 px; xMidYMid meet scales the
    // 200 × 100 viewBox by 0.5 and centres it (x + 50 px). The rect is 50% of 200 = 100 units
    // wide at x = 10: 50 px wide at x = 55 px (SVG 1.1 §7.8, worked by hand).
    let px = 25.4 / 96.0;
    assert!(
        (b.width() - 50.0 * px).abs() < 1e-9 && (b.x0 - 55.0 * px).abs() < 1e-9,
        "{b:?}"
    );
}

#[test]
fn sources_name_element_and_subpath() {
    let o = read("path_lines.svg");
    let names: Vec<(String, usize, bool)> = o
        .contours
        .iter()
        .map(|c| (c.source.element.clone(), c.source.index, c.closed))
        .collect();
    assert_eq!(
        names,
        [
            ("#abs".to_string(), 0, true),
            ("path[2]".to_string(), 0, true),
            ("path[2]".to_string(), 1, true),
            ("path[3]".to_string(), 0, false),
        ]
    );
    assert!(o.contours.iter().all(|c| c.source.file == "path_lines.svg"));
    let u = read("use_basic.svg");
    let names: Vec<&str> = u
        .contours
        .iter()
        .map(|c| c.source.element.as_str())
        .collect();
    assert_eq!(
        names,
        [
            "#tri via #u1",
            "#tri via use[3]",
            "#tri via use[1] via #u3",
            "circle[1] via #u3",
            "#tri via use[1] via #u3 via #u4",
            "circle[1] via #u3 via #u4",
        ]
    );
    let shapes = read("circle_ellipse.svg");
    assert!(shapes
        .contours
        .iter()
        .all(|c| c.closed && c.segments.len() == 4));
    let lp = read("lines_polys.svg");
    let closed: Vec<bool> = lp.contours.iter().map(|c| c.closed).collect();
    assert_eq!(closed, [false, false, true, true]);
}

fn reasons(o: &Outline) -> Vec<(String, usize, String)> {
    o.skipped
        .iter()
        .map(|s| (s.source.element.clone(), s.source.index, s.reason.clone()))
        .collect()
}

fn reason_of<'a>(r: &'a [(String, usize, String)], element: &str) -> &'a str {
    &r.iter()
        .find(|(e, _, _)| e == element)
        .unwrap_or_else(|| panic!("{element} not in skipped: {r:#?}"))
        .2
}

#[test]
fn hidden_things_are_listed() {
    let o = read("hidden.svg");
    let r = reasons(&o);
    let ids: Vec<&str> = o
        .contours
        .iter()
        .map(|c| c.source.element.as_str())
        .collect();
    assert_eq!(ids, ["#shown", "#back"]);
    assert!(reason_of(&r, "#gone").contains("display: none"));
    assert!(reason_of(&r, "g[1]").contains("display: none"));
    assert!(reason_of(&r, "#ghost").contains("visibility"));
    assert!(reason_of(&r, "#styled").contains("visibility"));
    assert!(reason_of(&r, "#label").contains("convert text to outlines"));
    assert!(reason_of(&r, "#label").contains("--font/--text"));
    assert!(reason_of(&r, "#photo").contains("raster image"));
    assert!(reason_of(&r, "rect[1]").contains("<clipPath> #clip"));
    assert!(reason_of(&r, "circle[1]").contains("<mask> #mask"));
    assert!(reason_of(&r, "path[1]").contains("<pattern> #pat"));
    assert!(reason_of(&r, "path[2]").contains("<marker> #mark"));
    assert!(reason_of(&r, "#unused").contains("never drawn by a <use>"));
    // Nothing inside the display:none group is listed twice.
    assert!(r.iter().all(|(e, _, _)| e != "#inner"));
    assert_eq!(r.len(), 11, "{r:#?}");
    assert!(o.warnings.is_empty());
}

#[test]
fn style_sheet_is_a_warning() {
    let o = read("style_sheet.svg");
    assert_eq!(o.warnings.len(), 1);
    assert!(
        o.warnings[0].contains("<style>") && o.warnings[0].contains("line 2"),
        "{:?}",
        o.warnings
    );
}

#[test]
fn degenerate_subpaths_are_dropped_and_listed() {
    let o = read("degenerate.svg");
    assert_eq!(o.contours.len(), 1);
    assert_eq!(
        (
            o.contours[0].source.element.as_str(),
            o.contours[0].source.index
        ),
        ("#lone", 1)
    );
    let r = reasons(&o);
    let lone: Vec<usize> = r
        .iter()
        .filter(|(e, _, _)| e == "#lone")
        .map(|x| x.1)
        .collect();
    assert_eq!(lone, [0, 2]);
    for id in ["#dot", "#empty", "#zeroline"] {
        assert!(reason_of(&r, id).contains("zero length"), "{id}");
    }
    for id in ["#zerow", "#zeror"] {
        assert!(reason_of(&r, id).contains("disables rendering"), "{id}");
    }
}

#[test]
fn bad_elements_are_refused_and_the_rest_converts() {
    let o = read("bad_path.svg");
    let ids: Vec<&str> = o
        .contours
        .iter()
        .map(|c| c.source.element.as_str())
        .collect();
    assert_eq!(ids, ["#good", "#after"]);
    let r = reasons(&o);
    // `M10,60 L50,60 L50,x90 Z`: the 'x' is character 19 (counting from 1).
    let broken = reason_of(&r, "#broken");
    assert!(
        broken.contains("character 19") && broken.contains("near 'x90 Z'"),
        "{broken}"
    );
    assert!(reason_of(&r, "#nan").contains("not a length"));
    assert!(reason_of(&r, "#huge").contains("width"));
    assert!(reason_of(&r, "g[1]").contains("transform"));
    for c in &o.contours {
        assert!(c.segments.iter().all(|s| s.is_finite()));
    }
}

// ---- bad input: an InputError naming the file and the place ----

fn err(svg: &[u8]) -> ratline::InputError {
    read_svg("bad.svg", svg, &SvgOptions::default()).expect_err("must be refused")
}

#[test]
fn not_svg_input_is_refused() {
    for (data, what) in [
        (&b""[..], "empty"),
        (b"  \n ", "empty"),
        (b"\x89PNG\r\n\x1a\n\0\0\0\rIHDR", "PNG"),
        (b"\xff\xfe<\0s\0", "UTF-8"),
        (b"<html><body/></html>", "<html>"),
        (b"<svg xmlns=\"http://example.invalid/\"/>", "SVG namespace"),
    ] {
        let e = err(data);
        assert_eq!(e.file, "bad.svg");
        assert!(e.to_string().contains(what), "{e}");
    }
}

#[test]
fn malformed_xml_names_line_and_column() {
    let e = err(b"<svg xmlns=\"http://www.w3.org/2000/svg\">\n  <g>\n  <rect/>\n</svg>");
    assert_eq!(e.place.as_deref(), Some("line 4, column 1"), "{e}");
    let e = err(b"<svg xmlns=\"http://www.w3.org/2000/svg\">\n <path d=\"M0 0/>\n");
    assert!(e.place.as_deref().unwrap().starts_with("line "), "{e}");
}

// The "billion laughs" entity expansion: roxmltree refuses entity references nested more than
// 10 deep or expanding more than 255 references (roxmltree 0.20 src/parse.rs LoopDetector).
#[test]
fn entity_bomb_fails_cleanly() {
    let mut s = String::from("<?xml version=\"1.0\"?>\n<!DOCTYPE svg [\n<!ENTITY l0 \"lol\">\n");
    for i in 1..10 {
        let prev = format!("&l{};", i - 1).repeat(10);
        s.push_str(&format!("<!ENTITY l{i} \"{prev}\">\n"));
    }
    s.push_str("]>\n<svg xmlns=\"http://www.w3.org/2000/svg\"><desc>&l9;</desc></svg>");
    let e = err(s.as_bytes());
    assert!(e.message.contains("entit"), "{e}");
    assert!(e.place.is_some());
    // A harmless DTD with one entity is fine.
    let ok = "<!DOCTYPE svg [<!ENTITY w \"20\">]><svg xmlns=\"http://www.w3.org/2000/svg\"><rect width=\"&w;\" height=\"5\"/></svg>";
    assert_eq!(read_str(ok).unwrap().contours.len(), 1);
}

const HEAD: &str =
    "<svg xmlns=\"http://www.w3.org/2000/svg\" xmlns:xlink=\"http://www.w3.org/1999/xlink\">";

#[test]
fn use_cycles_are_refused_naming_the_element() {
    let me = format!("{HEAD}<use id=\"me\" href=\"#me\"/></svg>");
    let e = read_str(&me).unwrap_err();
    assert!(
        e.message.contains("cycle") && e.place.as_deref().unwrap().starts_with("#me"),
        "{e}"
    );
    let pair = format!(
        "{HEAD}<g id=\"a\"><use id=\"ua\" href=\"#b\"/></g><g id=\"b\"><use id=\"ub\" xlink:href=\"#a\"/></g></svg>"
    );
    let e = read_str(&pair).unwrap_err();
    assert!(e.message.contains("cycle"), "{e}");
    assert!(e.to_string().contains("#u"), "{e}");
}

#[test]
fn use_depth_and_expansion_are_limited() {
    let mut s = String::from(HEAD);
    s.push_str("<defs><rect id=\"u0\" width=\"1\" height=\"1\"/>");
    for i in 1..=MAX_USE_DEPTH + 1 {
        s.push_str(&format!("<use id=\"u{i}\" href=\"#u{}\"/>", i - 1));
    }
    s.push_str(&format!(
        "</defs><use href=\"#u{}\"/></svg>",
        MAX_USE_DEPTH + 1
    ));
    let e = read_str(&s).unwrap_err();
    assert!(
        e.message.contains(&format!("more than {MAX_USE_DEPTH}")),
        "{e}"
    );
    // Exactly the limit is fine.
    let ok = s.replace(
        &format!("<use href=\"#u{}\"/></svg>", MAX_USE_DEPTH + 1),
        &format!("<use href=\"#u{}\"/></svg>", MAX_USE_DEPTH - 1),
    );
    assert_eq!(read_str(&ok).unwrap().contours.len(), 1);
    // Ten levels of ten uses each would draw 10^10 rectangles.
    let mut bomb = String::from(HEAD);
    bomb.push_str("<defs><rect id=\"g0\" width=\"1\" height=\"1\"/>");
    for i in 1..=10 {
        bomb.push_str(&format!("<g id=\"g{i}\">"));
        for _ in 0..10 {
            bomb.push_str(&format!("<use href=\"#g{}\"/>", i - 1));
        }
        bomb.push_str("</g>");
    }
    bomb.push_str("</defs><use href=\"#g10\"/></svg>");
    let e = read_str(&bomb).unwrap_err();
    assert!(
        e.message.contains(&format!("more than {MAX_ELEMENTS}")),
        "{e}"
    );
}

#[test]
fn deep_nesting_is_refused_without_overflow() {
    for depth in [MAX_DEPTH + 1, 100_000] {
        let s = format!(
            "{HEAD}{}<rect width=\"1\" height=\"1\"/>{}</svg>",
            "<g>".repeat(depth),
            "</g>".repeat(depth)
        );
        let e = read_str(&s).unwrap_err();
        assert!(
            e.message.contains(&format!("more than {MAX_DEPTH} deep")),
            "{e}"
        );
        assert!(e.place.as_deref().unwrap().starts_with("line 1"), "{e}");
    }
    let ok = format!(
        "{HEAD}{}<rect width=\"1\" height=\"1\"/>{}</svg>",
        "<g>".repeat(MAX_DEPTH - 2),
        "</g>".repeat(MAX_DEPTH - 2)
    );
    assert_eq!(read_str(&ok).unwrap().contours.len(), 1);
}

#[test]
fn out_of_range_numbers_never_reach_the_output() {
    for body in [
        "<path id=\"e\" d=\"M0,0 L1e400,5\"/>",
        "<path id=\"e\" d=\"M0,0 LNaN,5\"/>",
        "<path id=\"e\" d=\"M1e308,0 l1e308,5\"/>",
        "<circle id=\"e\" r=\"1e400\"/>",
        "<rect id=\"e\" width=\"NaN\" height=\"1\"/>",
        "<polygon id=\"e\" points=\"0,0 1e400,1 2,2\"/>",
        "<g transform=\"scale(1e200)\"><rect id=\"e\" width=\"1e200\" height=\"1e200\"/></g>",
        "<path id=\"e\" d=\"M0,0 A1e400,1 0 0,1 5,5\"/>",
    ] {
        let o = read_str(&format!(
            "{HEAD}{body}<rect width=\"1\" height=\"1\"/></svg>"
        ))
        .unwrap();
        assert_eq!(o.contours.len(), 1, "{body}");
        assert_eq!(o.skipped.len(), 1, "{body}: {:?}", o.skipped);
        assert!(
            o.skipped[0].source.element == "#e" || o.skipped[0].source.element == "g[1]",
            "{body}"
        );
        assert!(o.contours[0].segments.iter().all(|s| s.is_finite()));
    }
}

#[test]
fn bad_px_per_inch_is_refused() {
    let e = read_svg("x.svg", HEAD.as_bytes(), &SvgOptions { px_per_inch: 0.0 }).unwrap_err();
    assert!(e.message.contains("px per inch"));
    assert_eq!(SvgOptions::default().px_per_inch, 96.0);
}
