//! Nesting: which closed contours lie inside which. Each closed contour is flattened to a
//! polygon (chords within `FLAT_TOL` of the curve, from the second-derivative bound: a chord
//! over a parameter step h is within h²·max|p''|/8 of the curve, the linear-interpolation
//! remainder) and a test point of every contour (the midpoint of its first segment) is tested
//! against the others by the even-odd crossing rule (Jordan curve theorem; Shimrat, "Algorithm
//! 112: position of point relative to polygon", CACM 5(8) 1962, from memory for the issue).
//!
//! The depth of a contour is the number of closed contours around it: even depth is an outer
//! contour (material inside), odd depth a hole. The parent is the smallest contour around it.

use kurbo::{Point, Rect};

use crate::geom::Contour;

/// Chord tolerance of the flattening used for containment tests, in mm.
pub const FLAT_TOL: f64 = 1e-3;

/// A closed contour flattened to a polygon, with its bounding box and signed area.
#[derive(Clone, Debug)]
pub struct Polygon {
    pub points: Vec<Point>,
    pub bbox: Rect,
    pub area: f64,
}

impl Polygon {
    pub fn of(c: &Contour) -> Polygon {
        let mut points = Vec::new();
        for s in &c.segments {
            let n = ((s.accel_bound() / (8.0 * FLAT_TOL)).sqrt().ceil() as usize).clamp(1, 512);
            for i in 0..n {
                points.push(s.eval(i as f64 / n as f64));
            }
        }
        let bbox = points
            .iter()
            .fold(Rect::from_points(points[0], points[0]), |r, p| {
                r.union_pt(*p)
            });
        let area = 0.5
            * (0..points.len())
                .map(|i| {
                    let (a, b) = (points[i], points[(i + 1) % points.len()]);
                    a.x * b.y - b.x * a.y
                })
                .sum::<f64>();
        Polygon { points, bbox, area }
    }

    /// The edges, each as (from, to), closing back to the first point.
    pub fn edges(&self) -> impl Iterator<Item = (Point, Point)> + '_ {
        let n = self.points.len();
        (0..n).map(move |i| (self.points[i], self.points[(i + 1) % n]))
    }

    /// Even-odd containment.
    pub fn contains(&self, p: Point) -> bool {
        if p.x < self.bbox.x0 || p.x > self.bbox.x1 || p.y < self.bbox.y0 || p.y > self.bbox.y1 {
            return false;
        }
        let mut inside = false;
        for (a, b) in self.edges() {
            if (a.y > p.y) != (b.y > p.y) {
                let x = a.x + (p.y - a.y) / (b.y - a.y) * (b.x - a.x);
                if x > p.x {
                    inside = !inside;
                }
            }
        }
        inside
    }
}

/// Nesting of every contour of a list (open contours get a depth and parent too, but contain
/// nothing).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Nesting {
    pub depth: Vec<usize>,
    pub parent: Vec<Option<usize>>,
}

impl Nesting {
    pub fn is_hole(&self, i: usize) -> bool {
        self.depth[i] % 2 == 1
    }
}

/// The polygons of the closed, non-empty contours (`None` for the others).
pub fn polygons(contours: &[Contour]) -> Vec<Option<Polygon>> {
    contours
        .iter()
        .map(|c| (c.closed && !c.segments.is_empty()).then(|| Polygon::of(c)))
        .collect()
}

pub fn nesting(contours: &[Contour]) -> Nesting {
    let polys = polygons(contours);
    let mut depth = vec![0; contours.len()];
    let mut parent = vec![None; contours.len()];
    for (i, c) in contours.iter().enumerate() {
        let Some(s) = c.segments.first() else {
            continue;
        };
        let p = s.eval(0.5);
        let mut best: Option<(usize, f64)> = None;
        for (j, poly) in polys.iter().enumerate() {
            let Some(poly) = poly else { continue };
            if j == i || !poly.contains(p) {
                continue;
            }
            depth[i] += 1;
            let a = poly.area.abs();
            if best.is_none_or(|(_, b)| a < b) {
                best = Some((j, a));
            }
        }
        parent[i] = best.map(|(j, _)| j);
    }
    Nesting { depth, parent }
}
