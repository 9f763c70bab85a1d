//! Weeding: a border rectangle around the whole design at a margin, and optional weed lines,
//! vertical cuts that split the waste between the border and the design into strips. A weed
//! line runs from the border's top to its bottom and is cut only where it lies outside every
//! top-level contour: its crossings with those contours (flattened within
//! `nesting::FLAT_TOL`) are sorted along the line and the even-odd rule picks the waste
//! intervals, so a line stops on a part's edge (within the flattening tolerance) and never
//! crosses it.

use kurbo::{Line, Point, Rect};

use super::nesting::Polygon;
use crate::geom::{Contour, Segment, Source};

/// The border rectangle at `margin` around `bbox`, turning from +x towards +y.
pub fn border(bbox: Rect, margin: f64) -> Contour {
    let r = bbox.inflate(margin, margin);
    let p = [
        Point::new(r.x0, r.y0),
        Point::new(r.x1, r.y0),
        Point::new(r.x1, r.y1),
        Point::new(r.x0, r.y1),
    ];
    let segs = (0..4)
        .map(|i| Segment::Line(Line::new(p[i], p[(i + 1) % 4])))
        .collect();
    Contour::new(segs, true, Source::new("prep", "weed border", 0))
}

/// `count` evenly spaced vertical weed lines inside `frame`, cut only outside the given
/// (top-level) polygons. Each waste interval is one open contour.
pub fn weed_lines(frame: Rect, outers: &[&Polygon], count: usize) -> Vec<Contour> {
    let mut out = Vec::new();
    for i in 0..count {
        let x = frame.x0 + frame.width() * (i + 1) as f64 / (count + 1) as f64;
        let mut ys: Vec<f64> = Vec::new();
        for poly in outers {
            if x < poly.bbox.x0 || x > poly.bbox.x1 {
                continue;
            }
            for (a, b) in poly.edges() {
                // Half-open rule so a vertex on the line counts once.
                if (a.x > x) != (b.x > x) {
                    ys.push(a.y + (x - a.x) / (b.x - a.x) * (b.y - a.y));
                }
            }
        }
        ys.sort_by(f64::total_cmp);
        let mut cuts = vec![frame.y0];
        cuts.extend(ys);
        cuts.push(frame.y1);
        for (k, w) in cuts.chunks(2).enumerate() {
            if let [y0, y1] = *w {
                if y1 - y0 > 1e-9 {
                    out.push(Contour::new(
                        vec![Segment::Line(Line::new((x, y0), (x, y1)))],
                        false,
                        Source::new("prep", format!("weed line {}", i + 1), k),
                    ));
                }
            }
        }
    }
    out
}
