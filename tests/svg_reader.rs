//! Integration tests of the SVG reader (`ratline::read::svg`).
//!
//! Every case under tests/svg/ is read by ratline and by usvg 0.45 (a general-purpose SVG
//! library, used here only as a reference) and the two must agree as point sets: a dense-sample
//! symmetric Hausdorff distance within usvg's own arc-to-cubic tolerance (0.1 user units, see
//! usvg `parser/shapes.rs`, `to_cubic_beziers(0.1, ..)`) scaled by the path's transform and
//! converted to mm, plus 1e-3 mm for usvg's f32 coordinates and the sampling.

use std::f64::consts::PI;
use std::path::Path;

use kurbo::{Affine, CubicBez, Line, ParamCurve, ParamCurveExtrema, ParamCurveNearest, PathSeg, Point, QuadBez};
use ratline::geom::{Outline, Segment};
use ratline::read::svg::{read_svg, SvgOptions, MAX_DEPTH, MAX_ELEMENTS, MAX_USE_DEPTH};

const MM_PER_PX: f64 = 25.4 / 96.0;

fn load(name: &str) -> Vec<u8> {
    std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/svg").join(name))
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
    let affine = |t: usvg::Transform| Affine::new([t.sx, t.ky, t.kx, t.sy, t.tx, t.ty].map(f64::from));
    let mut stack = vec![(tree.root(), Affine::scale(mm) * affine(tree.root().transform()))];
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
            let d = segs.iter().map(|s| s.nearest(q).0).fold(f64::INFINITY, f64::min);
            backward = backward.max(d);
        }
    }
    (forward, backward)
}

fn cross_check(name: &str, contours: usize, opts: &SvgOptions) -> Outline {
    let data = load(name);
    let ours = read_svg(name, &data, opts).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(ours.contours.len(), contours, "{name}: contours {:#?}", ours.contours);
    let (theirs, tol) = usvg_paths(&data, opts.px_per_inch as f32);
    assert!(!theirs.is_empty(), "{name}: usvg found nothing");
    let (f, b) = hausdorff(&ours, &theirs);
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

#[test]
fn debug_dump() {
    let data = load("use_basic.svg");
    let o = read_svg("x", &data, &SvgOptions::default()).unwrap();
    for c in &o.contours {
        println!("ours {} {:?}", c.source, c.bounding_box().unwrap());
    }
    let (t, _) = usvg_paths(&data, 96.0);
    for s in t {
        println!("usvg {:?}", s.bounding_box());
    }
}
