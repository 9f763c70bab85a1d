//! The inputs of the comparison and kurbo's side of every job, shared by the `compare` bench and
//! `tests/performance.rs`.
//!
//! - Fonts: every glyph (or the first N) of a vendored font, 1 em = 100 mm, one ratline
//!   [`Contour`] per glyph contour and the same contour as a kurbo [`BezPath`].
//! - kurbo's methods (kurbo 0.13): lines by [`kurbo::flatten`]; cubics by
//!   [`kurbo::simplify::simplify_bezpath`], the documented public driver of
//!   `fit_to_bezpath`/`fit_to_bezpath_opt` (it builds the `ParamCurveFit` source and splits at
//!   corners); quadratics by [`CubicBez::approx_spline`] (kurbo's port of fontTools' cu2qu) or
//!   [`CubicBez::to_quads`]; circles by `Circle::path_elements`; SVG arcs by
//!   [`kurbo::Arc::from_svg_arc`]. Where kurbo needs two approximations in a row (a circle or
//!   an arc is first made cubics, then flattened or made quadratics) the tolerance is split:
//!   a tenth for the first step, nine tenths for the second.
//! - Theoretical minimum counts for a full circle of radius r at tolerance t (shared
//!   REFERENCES §3): lines with their vertices at r + t and the error split evenly both sides
//!   (the method ratline uses), n = ⌈π / arccos((r − t)/(r + t))⌉ (standard geometry; vertices
//!   on the circle would need ⌈π / arccos(1 − t/r)⌉); quadratics with the control point at the tangents' intersection, error
//!   r(1 − c)²/(2c), c = cos(θ/2) [derived]; cubics with tangent length (4/3)·tan(θ/4)·r, exact
//!   error r(√(1 + (4/27)·sin⁶(θ/4)/cos²(θ/4)) − 1) [derived; first-order form in Goldapp, CAGD 8
//!   (1991) 227-238]. Computed here from the formulas, independently of `ratline::fit`.
//! - Random arcs come from the seeded SplitMix64 generator of `tests/common`.
#![allow(dead_code)] // the bench and the tests each use their own subset

use std::f64::consts::{PI, TAU};

use kurbo::simplify::{simplify_bezpath, SimplifyOptLevel, SimplifyOptions};
use kurbo::{BezPath, Circle, ParamCurve, PathEl, PathSeg, Point, Shape, SvgArc, Vec2};
use ratline::geom::{
    svg_arc_to_center, CircularArc, Contour, Segment, Source, SvgArcParams, SvgArcShape,
};
use ratline::read::font::{glyph_count, glyph_outline};
use ratline::InputError;

use crate::common::Rng;

/// The em size every glyph is set at.
pub const EM_MM: f64 = 100.0;

/// The vendored fonts, relative to the crate root.
pub const DEJAVU: &str = "tests/fonts/DejaVuSans.ttf";
pub const CANTARELL: &str = "tests/fonts/Cantarell-Regular.otf";

/// A font's contours: glyphs 0, 1, … (all, or the first `limit`), at 1 em = 100 mm. Glyphs
/// without an outline (spaces) add nothing; glyphs that fail to read are returned as errors
/// next to the contours, so the caller can say how many there were.
pub fn font_contours(
    path: &str,
    limit: Option<usize>,
) -> Result<(Vec<Contour>, usize, Vec<InputError>), InputError> {
    let full = format!("{}/{path}", env!("CARGO_MANIFEST_DIR"));
    let data = std::fs::read(&full).map_err(|e| InputError::at(path, "file", e.to_string()))?;
    let n = glyph_count(path, &data, 0)?;
    let n = limit.map_or(n, |l| n.min(u16::try_from(l).unwrap_or(u16::MAX)));
    let mut contours = Vec::new();
    let mut errors = Vec::new();
    for g in 0..n {
        match glyph_outline(path, &data, 0, g, EM_MM) {
            Ok(Some(c)) => contours.extend(c),
            Ok(None) => {}
            Err(e) => errors.push(e),
        }
    }
    Ok((contours, usize::from(n), errors))
}

/// A ratline segment as a kurbo path segment (lines and polynomial Béziers only).
pub fn path_seg(s: &Segment) -> Option<PathSeg> {
    match s {
        Segment::Line(l) => Some(PathSeg::Line(*l)),
        Segment::Quad(q) => Some(PathSeg::Quad(*q)),
        Segment::Cubic(c) => Some(PathSeg::Cubic(*c)),
        Segment::Conic(_) | Segment::Arc(_) => None,
    }
}

/// A kurbo path segment as a ratline segment.
pub fn segment(s: PathSeg) -> Segment {
    match s {
        PathSeg::Line(l) => Segment::Line(l),
        PathSeg::Quad(q) => Segment::Quad(q),
        PathSeg::Cubic(c) => Segment::Cubic(c),
    }
}

/// A contour of lines and Béziers (a font glyph's) as a closed kurbo path. `None` when it holds
/// a conic or an arc.
pub fn bezpath(c: &Contour) -> Option<BezPath> {
    let mut p = BezPath::new();
    p.move_to(c.start()?);
    for s in &c.segments {
        match path_seg(s)? {
            PathSeg::Line(l) => p.line_to(l.p1),
            PathSeg::Quad(q) => p.quad_to(q.p1, q.p2),
            PathSeg::Cubic(k) => p.curve_to(k.p1, k.p2, k.p3),
        }
    }
    if c.closed {
        p.close_path();
    }
    Some(p)
}

/// The segments of a kurbo path (a closing line only where the path does not end at its start).
pub fn segments_of(p: &BezPath) -> Vec<Segment> {
    p.segments().map(segment).collect()
}

/// kurbo's flattening of a path into lines.
pub fn kurbo_lines(path: impl IntoIterator<Item = PathEl>, tol: f64) -> BezPath {
    let mut out = BezPath::new();
    kurbo::flatten(path, tol, |el| out.push(el));
    out
}

/// kurbo's curve fitting of a path into cubics (`fit_to_bezpath_opt` when `optimize`, else
/// `fit_to_bezpath`, through `simplify_bezpath`).
pub fn kurbo_cubics(path: &BezPath, tol: f64, optimize: bool) -> BezPath {
    let level = if optimize {
        SimplifyOptLevel::Optimize
    } else {
        SimplifyOptLevel::Subdivide
    };
    simplify_bezpath(path, tol, &SimplifyOptions::default().opt_level(level))
}

/// How kurbo turns a cubic into quadratics.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum QuadMethod {
    /// `CubicBez::approx_spline` (cu2qu: the fewest equal splits within the accuracy),
    /// falling back to `to_quads` when no spline is found.
    Spline,
    /// `CubicBez::to_quads` (splits from the third-derivative estimate).
    ToQuads,
}

/// kurbo's conversion of a path's cubics into quadratics; lines and quadratics stay.
pub fn kurbo_quads(path: impl IntoIterator<Item = PathEl>, tol: f64, m: QuadMethod) -> BezPath {
    let mut out = BezPath::new();
    let mut last = None;
    for seg in kurbo::segments(path) {
        if last != Some(seg.start()) {
            out.move_to(seg.start());
        }
        last = Some(seg.end());
        match seg {
            PathSeg::Line(l) => out.line_to(l.p1),
            PathSeg::Quad(q) => out.quad_to(q.p1, q.p2),
            PathSeg::Cubic(c) => {
                let spline = match m {
                    QuadMethod::Spline => c.approx_spline(tol),
                    QuadMethod::ToQuads => None,
                };
                match spline {
                    Some(s) => s.to_quads().for_each(|q| out.quad_to(q.p1, q.p2)),
                    None => c
                        .to_quads(tol)
                        .for_each(|(_, _, q)| out.quad_to(q.p1, q.p2)),
                }
            }
        }
    }
    out
}

/// The primitive of a circle job.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CircleTarget {
    Lines,
    Quadratic,
    Cubic,
}

/// A full circle of radius r about the origin as ratline reads one from SVG: four exact conics.
pub fn circle_contour(r: f64) -> Contour {
    let a = CircularArc {
        center: Point::ORIGIN,
        radius: r,
        start_angle: 0.0,
        sweep: TAU,
    };
    let segs = a.to_conics().into_iter().map(Segment::Conic).collect();
    Contour::new(segs, true, Source::new("circle", format!("r = {r} mm"), 0))
}

/// The same circle, exactly, as one arc segment (the source the deviation is measured against).
pub fn circle_exact(r: f64) -> Segment {
    Segment::Arc(CircularArc {
        center: Point::ORIGIN,
        radius: r,
        start_angle: 0.0,
        sweep: TAU,
    })
}

/// kurbo's approximation of the circle: `Circle::path_elements` (cubics) used directly, flattened
/// or made quadratics.
pub fn kurbo_circle(r: f64, target: CircleTarget, tol: f64) -> BezPath {
    let c = Circle::new(Point::ORIGIN, r);
    match target {
        CircleTarget::Cubic => c.path_elements(tol).collect(),
        CircleTarget::Lines => kurbo_lines(c.path_elements(0.1 * tol), 0.9 * tol),
        CircleTarget::Quadratic => {
            kurbo_quads(c.path_elements(0.1 * tol), 0.9 * tol, QuadMethod::Spline)
        }
    }
}

/// The exact maximum radial error, relative to r, of the (4/3)·tan(θ/4) cubic over a sweep θ.
pub fn cubic_circle_error(theta: f64) -> f64 {
    let q = 0.25 * theta;
    (1.0 + (4.0 / 27.0) * q.sin().powi(6) / q.cos().powi(2)).sqrt() - 1.0
}

/// The fewest pieces of `target` for a full circle of radius r within tolerance t.
pub fn circle_minimum(target: CircleTarget, r: f64, t: f64) -> usize {
    let k = t / r;
    let max_sweep = match target {
        CircleTarget::Lines => 2.0 * ((1.0 - k) / (1.0 + k)).acos(),
        CircleTarget::Quadratic => {
            // r(1 − c)²/(2c) ≤ t with x = 1 − c: x² + 2kx − 2k ≤ 0.
            let x = -k + (k * k + 2.0 * k).sqrt();
            2.0 * (1.0 - x).max(-1.0).acos()
        }
        CircleTarget::Cubic => {
            // The error grows with θ on (0, 2π): invert it by bisection.
            let (mut lo, mut hi) = (0.0, TAU - 1e-9);
            for _ in 0..100 {
                let mid = 0.5 * (lo + hi);
                if cubic_circle_error(mid) <= k {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            lo
        }
    };
    ((2.0 * PI / max_sweep) - 1e-12).ceil().max(1.0) as usize
}

/// The seed of the random-arcs job.
pub const ARC_SEED: u64 = 0x5EED_A2C5;

/// `n` random SVG arcs: radii uniform in 1–200 mm, rotation uniform in 0–360°, random flags,
/// the start point in a 200 mm square and the end point at a distance up to twice the smaller
/// radius in a random direction (so most arcs keep their radii; some are scaled up by the
/// SVG out-of-range rule).
pub fn random_svg_arcs(n: usize, seed: u64) -> Vec<SvgArcParams> {
    let mut rng = Rng::new(seed);
    (0..n)
        .map(|_| {
            let rx = rng.range(1.0, 200.0);
            let ry = rng.range(1.0, 200.0);
            let from = Point::new(rng.range(0.0, 200.0), rng.range(0.0, 200.0));
            let d = rng.range(0.01, 2.0 * rx.min(ry));
            let to = from + d * Vec2::from_angle(rng.range(0.0, TAU));
            SvgArcParams {
                from,
                rx,
                ry,
                x_rotation_deg: rng.range(0.0, 360.0),
                large_arc: rng.unit() < 0.5,
                sweep: rng.unit() < 0.5,
                to,
            }
        })
        .collect()
}

/// ratline's exact reading of an SVG arc: centre form, then conics. `None` when the SVG rules
/// make it a line or omit it.
pub fn ratline_arc(a: &SvgArcParams, index: usize) -> Option<Contour> {
    match svg_arc_to_center(a) {
        SvgArcShape::Arc(e) => {
            let segs = e.to_conics().into_iter().map(Segment::Conic).collect();
            Some(Contour::new(
                segs,
                false,
                Source::new("random arcs", format!("arc {index}"), 0),
            ))
        }
        SvgArcShape::Line | SvgArcShape::Omitted => None,
    }
}

/// kurbo's reading of the same SVG arc.
pub fn kurbo_arc(a: &SvgArcParams) -> Option<kurbo::Arc> {
    kurbo::Arc::from_svg_arc(&SvgArc {
        from: a.from,
        to: a.to,
        radii: Vec2::new(a.rx, a.ry),
        x_rotation: a.x_rotation_deg.to_radians(),
        large_arc: a.large_arc,
        sweep: a.sweep,
    })
}

/// kurbo's flattening of an arc: cubics at a tenth of the tolerance, then `flatten`.
pub fn kurbo_arc_lines(a: &kurbo::Arc, tol: f64) -> BezPath {
    kurbo_lines(a.path_elements(0.1 * tol), 0.9 * tol)
}

/// Every coordinate of a set of segments, summed (to keep a timed result alive).
pub fn checksum(segs: &[Segment]) -> f64 {
    segs.iter()
        .map(|s| match s {
            Segment::Line(l) => l.p0.x + l.p0.y + l.p1.x + l.p1.y,
            Segment::Quad(q) => q.p0.x + q.p0.y + q.p1.x + q.p1.y + q.p2.x + q.p2.y,
            Segment::Cubic(c) => {
                c.p0.x + c.p0.y + c.p1.x + c.p1.y + c.p2.x + c.p2.y + c.p3.x + c.p3.y
            }
            Segment::Conic(k) => k.points().iter().map(|p| p.x + p.y).sum::<f64>() + k.weight(),
            Segment::Arc(a) => a.center.x + a.center.y + a.radius + a.start_angle + a.sweep,
        })
        .sum()
}

/// Every coordinate of a kurbo path, summed.
pub fn path_checksum(p: &BezPath) -> f64 {
    p.elements()
        .iter()
        .map(|el| match *el {
            PathEl::MoveTo(a) | PathEl::LineTo(a) => a.x + a.y,
            PathEl::QuadTo(a, b) => a.x + a.y + b.x + b.y,
            PathEl::CurveTo(a, b, c) => a.x + a.y + b.x + b.y + c.x + c.y,
            PathEl::ClosePath => 0.0,
        })
        .sum()
}
