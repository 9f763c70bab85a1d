//! What `inspect` tells about an outline: per contour its source, whether it is closed, its
//! segment kinds, bounding box, length and direction, and the problems a shop cares about.
//!
//! - Direction: the sign of the enclosed signed area (Green's theorem, `Contour::signed_area`).
//!   With y pointing down, a positive area in (x, y) turns clockwise on the page.
//! - Self-intersections: searched on a flattening certified within 0.01 mm (`fit` to lines), by
//!   pairwise segment tests of non-adjacent chords (standard orientation predicates). Crossings
//!   that only exist within that 0.01 mm are not resolved, so the flag is "found on a 0.01 mm
//!   flattening".
//! - Small features: contours whose bounding box is under 0.5 mm on its longer side (common
//!   practice for vinyl and knives, no source).

use kurbo::Point;
use serde::Serialize;

use crate::fit::{fit_limited, Target};
use crate::geom::{Contour, Outline, Segment, SegmentCounts, Skipped, Source, Tolerance};

/// Contours smaller than this are flagged (common practice, no source).
pub const SMALL_FEATURE_MM: f64 = 0.5;

/// Contours with more chords than this are not searched for self-intersections (quadratic
/// search); the report says so.
const MAX_CHORDS_FOR_CROSSINGS: usize = 20_000;

#[derive(Clone, Debug, Serialize)]
pub struct ContourInfo {
    pub source: Source,
    pub closed: bool,
    pub segments: SegmentCounts,
    /// [x0, y0, x1, y1] in mm.
    pub bbox: [f64; 4],
    pub length_mm: f64,
    /// `clockwise` or `counter-clockwise` as seen on the page (y down); `open` for open contours.
    pub direction: String,
    pub flags: Vec<String>,
}

#[derive(Clone, Debug, Serialize)]
pub struct InspectReport {
    pub contours: Vec<ContourInfo>,
    pub skipped: Vec<Skipped>,
    pub warnings: Vec<String>,
    /// [x0, y0, x1, y1] of everything, in mm.
    pub bbox: Option<[f64; 4]>,
}

fn orient(a: Point, b: Point, c: Point) -> f64 {
    (b - a).cross(c - a)
}

/// Whether segments ab and cd cross (proper intersection or touching), by orientation tests.
fn crosses(a: Point, b: Point, c: Point, d: Point) -> bool {
    let (d1, d2) = (orient(c, d, a), orient(c, d, b));
    let (d3, d4) = (orient(a, b, c), orient(a, b, d));
    (d1 * d2 < 0.0) && (d3 * d4 < 0.0)
}

fn self_intersects(c: &Contour) -> Option<bool> {
    let tol = Tolerance::new(0.01).ok()?;
    // A contour that needs more chords than the crossing test takes is not flattened at all.
    let flat = fit_limited(c, Target::Lines, tol, MAX_CHORDS_FOR_CROSSINGS)
        .ok()?
        .contour;
    let pts: Vec<(Point, Point)> = flat
        .segments
        .iter()
        .filter_map(|s| match s {
            Segment::Line(l) => Some((l.p0, l.p1)),
            _ => None,
        })
        .collect();
    let n = pts.len();
    for i in 0..n {
        for j in i + 2..n {
            if c.closed && i == 0 && j == n - 1 {
                continue;
            }
            let (a, b) = pts[i];
            let (p, q) = pts[j];
            if a.x.max(b.x) < p.x.min(q.x)
                || p.x.max(q.x) < a.x.min(b.x)
                || a.y.max(b.y) < p.y.min(q.y)
                || p.y.max(q.y) < a.y.min(b.y)
            {
                continue;
            }
            if crosses(a, b, p, q) {
                return Some(true);
            }
        }
    }
    Some(false)
}

pub fn contour_info(c: &Contour) -> ContourInfo {
    let bb = c.bounding_box().unwrap_or_default();
    let mut flags = Vec::new();
    if !c.closed {
        flags.push("open contour (cannot be weeded as a shape)".to_string());
    }
    let zero = c.segments.iter().filter(|s| s.speed_bound() == 0.0).count();
    if zero > 0 {
        flags.push(format!("{zero} zero-length segment(s)"));
    }
    if bb.width().max(bb.height()) < SMALL_FEATURE_MM {
        flags.push(format!("smaller than {SMALL_FEATURE_MM} mm"));
    }
    match self_intersects(c) {
        Some(true) => flags.push("self-intersecting (found on a 0.01 mm flattening)".to_string()),
        Some(false) => {}
        None => flags.push("too many segments to search for self-intersections".to_string()),
    }
    let direction = if !c.closed {
        "open"
    } else if c.signed_area() > 0.0 {
        "clockwise"
    } else {
        "counter-clockwise"
    };
    ContourInfo {
        source: c.source.clone(),
        closed: c.closed,
        segments: SegmentCounts::of(&c.segments),
        bbox: [bb.x0, bb.y0, bb.x1, bb.y1],
        length_mm: c.length(),
        direction: direction.to_string(),
        flags,
    }
}

pub fn inspect(outline: &Outline) -> InspectReport {
    use rayon::prelude::*;
    InspectReport {
        contours: outline.contours.par_iter().map(contour_info).collect(),
        skipped: outline.skipped.clone(),
        warnings: outline.warnings.clone(),
        bbox: outline.bounding_box().map(|b| [b.x0, b.y0, b.x1, b.y1]),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use kurbo::Line;

    fn poly(pts: &[(f64, f64)]) -> Contour {
        let segs = pts
            .windows(2)
            .map(|w| Segment::Line(Line::new(w[0], w[1])))
            .collect();
        Contour::new(segs, true, Source::new("t", "p", 0))
    }

    #[test]
    fn bow_tie_crosses_and_square_does_not() {
        let bow = poly(&[
            (0.0, 0.0),
            (10.0, 10.0),
            (10.0, 0.0),
            (0.0, 10.0),
            (0.0, 0.0),
        ]);
        assert_eq!(self_intersects(&bow), Some(true));
        let sq = poly(&[
            (0.0, 0.0),
            (10.0, 0.0),
            (10.0, 10.0),
            (0.0, 10.0),
            (0.0, 0.0),
        ]);
        assert_eq!(self_intersects(&sq), Some(false));
        // (0,0) → (10,0) → (10,10) with y down turns clockwise on the page.
        assert_eq!(contour_info(&sq).direction, "clockwise");
        assert_eq!(contour_info(&sq.reversed()).direction, "counter-clockwise");
    }
}
