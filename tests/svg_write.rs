//! The cutter SVG read back by usvg (a general-purpose reference SVG library), and the rounding
//! bound of `svg_as_read`.

mod common;

use std::collections::HashSet;

use common::{distance_to, hausdorff, random_contour, samples, shifted, Rng, Shape};
use kurbo::{Line, ParamCurve, ParamCurveNearest, PathSeg, Point, Vec2};
use ratline::geom::{Conic, Contour, Segment, Source};
use ratline::write::svg::{svg_as_read, svg_document, SvgWriteOptions};

/// Millimetres per CSS px: 1 px = 1/96 in (CSS Values and Units Level 3, §6.2).
const MM_PER_PX: f64 = 25.4 / 96.0;

/// One arc quadrant as a cubic with the tangent length (4/3)·tan(θ/4) deviates from the circle
/// by at most 2.7253e-4·r (REFERENCES §3, derived from Goldapp 1991); usvg (kurbo's arc
/// conversion) uses pieces of at most 90°.
const CUBIC_QUARTER_ERROR: f64 = 2.7254e-4;

fn attr<'a>(tag: &'a str, name: &str) -> &'a str {
    let key = format!(" {name}=\"");
    let start = tag
        .find(&key)
        .unwrap_or_else(|| panic!("{name} missing in {tag}"))
        + key.len();
    &tag[start..start + tag[start..].find('"').unwrap()]
}

/// usvg's path in mm as kurbo segments.
fn usvg_segments(p: &usvg::Path) -> Vec<PathSeg> {
    let t = p.abs_transform();
    let map = |q: usvg::tiny_skia_path::Point| {
        let (x, y) = (q.x as f64, q.y as f64);
        Point::new(
            (t.sx as f64 * x + t.kx as f64 * y + t.tx as f64) * MM_PER_PX,
            (t.ky as f64 * x + t.sy as f64 * y + t.ty as f64) * MM_PER_PX,
        )
    };
    let mut out = Vec::new();
    let (mut pen, mut start) = (Point::ORIGIN, Point::ORIGIN);
    for s in p.data().segments() {
        use usvg::tiny_skia_path::PathSegment as S;
        let seg = match s {
            S::MoveTo(a) => {
                pen = map(a);
                start = pen;
                continue;
            }
            S::LineTo(a) => PathSeg::Line(Line::new(pen, map(a))),
            S::QuadTo(a, b) => PathSeg::Quad(kurbo::QuadBez::new(pen, map(a), map(b))),
            S::CubicTo(a, b, c) => {
                PathSeg::Cubic(kurbo::CubicBez::new(pen, map(a), map(b), map(c)))
            }
            S::Close if pen != start => PathSeg::Line(Line::new(pen, start)),
            S::Close => continue,
        };
        pen = seg.eval(1.0);
        out.push(seg);
    }
    out
}

/// Every path in the tree, depth first (usvg puts the viewBox transform on a group).
fn paths(g: &usvg::Group, out: &mut Vec<usvg::Path>) {
    for node in g.children() {
        match node {
            usvg::Node::Path(p) => out.push((**p).clone()),
            usvg::Node::Group(g) => paths(g, out),
            other => panic!("unexpected node {other:?}"),
        }
    }
}

/// The sampled two-sided distance between usvg's segments and ours.
fn usvg_distance(theirs: &[PathSeg], ours: &[Segment]) -> f64 {
    let n = 64;
    let a = theirs
        .iter()
        .flat_map(|s| (0..=n).map(move |i| s.eval(i as f64 / n as f64)))
        .map(|p| distance_to(p, ours))
        .fold(0.0, f64::max);
    let b = samples(ours, n)
        .into_iter()
        .map(|p| {
            theirs
                .iter()
                .map(|s| s.nearest(p, 1e-12).distance_sq.sqrt())
                .fold(f64::INFINITY, f64::min)
        })
        .fold(0.0, f64::max);
    a.max(b)
}

fn max_radius(c: &Contour) -> f64 {
    c.segments
        .iter()
        .map(|s| match s {
            Segment::Arc(a) => a.radius,
            _ => 0.0,
        })
        .fold(0.0, f64::max)
}

#[test]
fn usvg_reads_the_written_file_as_the_contours() {
    let mut rng = Rng::new(0x5EED_0003);
    let shape = Shape {
        min_radius: 0.05,
        max_radius: 100.0,
        max_line: 40.0,
        segments: 6,
    };
    let mut contours: Vec<Contour> = (0..12)
        .map(|i| {
            let c = random_contour(&mut rng, &shape, i % 3 != 0, i);
            // Keep the art in the positive quadrant, where page mm equal contour mm.
            let b = c.bounding_box().unwrap();
            shifted(&c, Vec2::new(5.0 - b.x0.min(0.0), 5.0 - b.y0.min(0.0)))
        })
        .collect();
    // Two contours from one element, with characters that need escaping and sanitising.
    contours[1].source = Source::new("job \"A&B\".svg", "'é' <glyph 36>", 0);
    contours[2].source = Source::new("job \"A&B\".svg", "'é' <glyph 36>", 0);
    // Quadratic and cubic Béziers pass through unchanged.
    contours.push(Contour::new(
        vec![
            Segment::Quad(kurbo::QuadBez::new(
                (10.0, 10.0),
                (30.0, 50.0),
                (50.0, 10.0),
            )),
            Segment::Cubic(kurbo::CubicBez::new(
                (50.0, 10.0),
                (60.0, 0.0),
                (70.0, 40.0),
                (80.0, 10.0),
            )),
        ],
        false,
        Source::new("b.svg", "#curves", 0),
    ));
    let opts = SvgWriteOptions {
        decimals: 4,
        stroke_mm: 0.2,
    };
    let doc = svg_document(&contours, &opts).unwrap();

    // Only the requested path commands appear, and ids are unique.
    let tags: Vec<&str> = doc.split('<').filter(|t| t.starts_with("path ")).collect();
    assert_eq!(tags.len(), contours.len());
    let mut ids = HashSet::new();
    for t in &tags {
        let d = attr(t, "d");
        assert!(
            d.chars()
                .filter(|c| c.is_ascii_alphabetic())
                .all(|c| "MLQCAZ".contains(c)),
            "{d}"
        );
        assert!(ids.insert(attr(t, "id").to_string()), "duplicate id in {t}");
        assert_eq!(attr(t, "fill"), "none");
    }
    assert!(doc.contains(
        "data-source=\"job &quot;A&amp;B&quot;.svg: &apos;é&apos; &lt;glyph 36&gt;, contour 0\""
    ));
    let svg_tag = doc.split('<').find(|t| t.starts_with("svg ")).unwrap();
    let (w, h) = (attr(svg_tag, "width"), attr(svg_tag, "height"));
    assert!(w.ends_with("mm") && h.ends_with("mm"));
    let vb: Vec<&str> = attr(svg_tag, "viewBox").split(' ').collect();
    assert_eq!(vb[..2], ["0.0000", "0.0000"]); // positive art: page origin at the origin
    assert_eq!((vb[2], vb[3]), (&w[..w.len() - 2], &h[..h.len() - 2]));

    // usvg, the reference: page size in px, and every path within the arc-to-cubic error plus
    // f32 and the writer's rounding.
    let tree = usvg::Tree::from_str(&doc, &usvg::Options::default()).unwrap();
    let w_mm: f64 = w[..w.len() - 2].parse().unwrap();
    assert!((tree.size().width() as f64 * MM_PER_PX - w_mm).abs() < 1e-3);
    let mut found = 0;
    let mut worst = 0.0f64;
    let mut all = Vec::new();
    paths(tree.root(), &mut all);
    for p in &all {
        let i = tags
            .iter()
            .position(|t| attr(t, "id") == p.id())
            .expect("id kept by usvg");
        assert!(p.fill().is_none() && p.stroke().is_some());
        let theirs = usvg_segments(p);
        let reread = svg_as_read(&contours[i], opts.decimals).unwrap();
        let f32_slack = 2e-4; // f32 coordinates of a few hundred px: ulp ≈ 6e-5 px
        let arc_slack = CUBIC_QUARTER_ERROR * max_radius(&contours[i]);
        let dev = usvg_distance(&theirs, &reread.segments);
        assert!(
            dev <= arc_slack + f32_slack,
            "{}: {dev} mm",
            contours[i].source
        );
        // Against the unrounded contour, the rounding bound (≤ 6.1·h, svg.rs) adds on.
        let dev_src = usvg_distance(&theirs, &contours[i].segments);
        assert!(dev_src <= arc_slack + f32_slack + 6.1 * 0.5e-4, "{dev_src}");
        worst = worst.max(dev);
        found += 1;
    }
    assert_eq!(found, contours.len());
    eprintln!("worst usvg vs svg_as_read: {worst:.2e} mm");
}

#[test]
fn reread_geometry_stays_within_the_rounding_bound() {
    // h = 0.5·10⁻ᵈ per coordinate (exact decimal rounding). Lines and Béziers: every point moves
    // by ≤ √2·h at the same parameter (Bernstein weights are non-negative and sum to 1). Arcs in
    // pieces ≤ 90°: ≤ 6.1·h (first order, derived in svg.rs), checked for radii from 2·h up (below a few h an arc may vanish altogether).
    let mut rng = Rng::new(0x5EED_0004);
    for d in 0..=6 {
        let h = 0.5 * 10f64.powi(-(d as i32));
        let shape = Shape {
            min_radius: 2.0 * h,
            max_radius: 1000.0 * h * 500.0,
            max_line: 50.0,
            segments: 8,
        };
        let mut worst = 0.0f64;
        for i in 0..40 {
            let c = random_contour(&mut rng, &shape, i % 2 == 0, i);
            let back = svg_as_read(&c, d).unwrap();
            worst = worst.max(hausdorff(&c.segments, &back.segments, 64) / h);
        }
        assert!(worst <= 6.1, "d = {d}: {worst}·h");
        eprintln!("d = {d}: worst reread deviation {worst:.3}·h");

        let b = Contour::new(
            vec![
                Segment::Cubic(kurbo::CubicBez::new(
                    (0.123456789, 0.0),
                    (10.987654321, 20.5555555),
                    (30.3333333, -5.7777777),
                    (40.1111111, 3.9999999),
                )),
                Segment::Quad(kurbo::QuadBez::new(
                    (40.1111111, 3.9999999),
                    (45.4444444, 12.6666666),
                    (50.0000004, 0.0000006),
                )),
            ],
            true,
            Source::new("b.svg", "#b", 0),
        );
        let back = svg_as_read(&b, d).unwrap();
        for (x, y) in b.segments.iter().zip(&back.segments) {
            for k in 0..=20 {
                let t = k as f64 / 20.0;
                assert!((x.eval(t) - y.eval(t)).hypot() <= 2f64.sqrt() * h * (1.0 + 1e-9));
            }
        }
        // Closed: Z adds a closing line from the rounded end to the rounded start unless they
        // coincide after rounding.
        let closing = back.segments.len() - b.segments.len();
        assert_eq!(
            closing,
            usize::from(back.segments[1].end() != back.segments[0].start())
        );
    }
}

#[test]
fn conics_and_bad_options_are_refused() {
    let conic = Conic::new(
        Point::new(0.0, 0.0),
        Point::new(1.0, 1.0),
        0.5,
        Point::new(2.0, 0.0),
    )
    .unwrap();
    let c = Contour::new(
        vec![Segment::Conic(conic)],
        false,
        Source::new("a.svg", "#c", 3),
    );
    let e = svg_document(std::slice::from_ref(&c), &SvgWriteOptions::default()).unwrap_err();
    assert_eq!(
        e.to_string(),
        "a.svg: #c, contour 3: segment 0: a conic (rational quadratic) cannot be written to SVG; \
         convert or fit it first"
    );
    assert!(svg_as_read(&c, 4).is_err());
    for opts in [
        SvgWriteOptions {
            decimals: 7,
            stroke_mm: 0.1,
        },
        SvgWriteOptions {
            decimals: 3,
            stroke_mm: 0.0,
        },
        SvgWriteOptions {
            decimals: 3,
            stroke_mm: f64::NAN,
        },
    ] {
        assert!(svg_document(&[], &opts).is_err());
    }
}

#[test]
fn page_covers_negative_coordinates_and_empty_documents_are_valid() {
    let c = Contour::new(
        vec![Segment::Line(Line::new((-10.0, -5.0), (20.0, 7.5)))],
        false,
        Source::new("n.svg", "9", 0),
    );
    let doc = svg_document(
        &[c],
        &SvgWriteOptions {
            decimals: 2,
            stroke_mm: 0.5,
        },
    )
    .unwrap();
    // Margin: stroke 0.5 + 2·10⁻² = 0.52; page from (−10.52, −5.52) to (20.52, 8.02).
    assert!(
        doc.contains("width=\"31.04mm\" height=\"13.54mm\" viewBox=\"-10.52 -5.52 31.04 13.54\""),
        "{doc}"
    );
    assert!(
        doc.contains("id=\"c9-0\""),
        "an id must not start with a digit: {doc}"
    );
    let empty = svg_document(&[], &SvgWriteOptions::default()).unwrap();
    let tree = usvg::Tree::from_str(&empty, &usvg::Options::default()).unwrap();
    let mut all = Vec::new();
    paths(tree.root(), &mut all);
    assert!(all.is_empty());
}
