//! Matching the candidate's contours to the reference's by position and shape, not by order
//! or id.
//!
//! The cost of a pair is a lower-bound-flavoured estimate of their Hausdorff distance:
//! `max(L, E)`, where
//! - `L` is the largest difference between corresponding sides of the two bounding boxes. It is
//!   a rigorous lower bound: if A's leftmost point lies a distance δ left of all of B, that point
//!   is at least δ from B, so d_H(A, B) ≥ δ (from the definition of d_H, Alt & Scharf, IJCGA
//!   2008; derived).
//! - `E` is [`measure::estimate`], a sampled (uncertified) value of d_H.
//!
//! A pair is admissible only when its cost is at most `max(REJECT_TOLERANCES · tolerance,
//! REJECT_SIZE · diagonal of the reference contour's bounding box)`: a contour that far from
//! every candidate is missing rather than badly fitted. Since `L` needs only the boxes, the
//! candidates are sorted by their left side and each reference contour looks only at the slab
//! whose left side is within its threshold, so whole fonts' worth of contours stay fast; the
//! estimates run in parallel (rayon).
//!
//! Assignment is greedy by increasing cost (ties broken by index, so the result does not depend
//! on thread timing): the cheapest pair is fixed first and both contours leave the pool. Greedy
//! is not the optimal assignment in general, but when contours are as far apart as they are
//! different (letters, parts of a sign) the cheapest pair is the right one, and every matched
//! pair is then certified separately, so a wrong match can only show up as a large deviation,
//! never hide one.

use kurbo::Rect;
use rayon::prelude::*;

use crate::geom::Segment;
use crate::measure;

/// A pair costing more than this many tolerances ...
pub const REJECT_TOLERANCES: f64 = 20.0;
/// ... and more than this fraction of the reference contour's bounding-box diagonal is no match.
pub const REJECT_SIZE: f64 = 0.25;

/// About this many sample points per contour for the estimate (at least one interval per
/// segment of the larger contour).
const ESTIMATE_SAMPLES: usize = 64;

/// The outcome: matched pairs (reference index, candidate index), in reference order, and the
/// indices left over on either side.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Matching {
    pub pairs: Vec<(usize, usize)>,
    pub missing: Vec<usize>,
    pub extra: Vec<usize>,
}

struct Edge {
    cost: f64,
    r: usize,
    c: usize,
}

fn bbox(segs: &[Segment]) -> Option<Rect> {
    segs.iter()
        .map(|s| s.bounding_box())
        .reduce(|a, b| a.union(b))
}

/// The rigorous lower bound `L` on d_H from two bounding boxes.
fn box_lower_bound(a: Rect, b: Rect) -> f64 {
    (a.x0 - b.x0)
        .abs()
        .max((a.y0 - b.y0).abs())
        .max((a.x1 - b.x1).abs())
        .max((a.y1 - b.y1).abs())
}

/// Match candidate contours to reference contours (both given as their segments, the candidate
/// already aligned).
pub fn match_contours(reference: &[&[Segment]], candidate: &[&[Segment]], tol: f64) -> Matching {
    let rbox: Vec<Option<Rect>> = reference.iter().map(|s| bbox(s)).collect();
    let cbox: Vec<Option<Rect>> = candidate.iter().map(|s| bbox(s)).collect();
    // Candidates with geometry, sorted by their left side.
    let mut order: Vec<usize> = (0..candidate.len())
        .filter(|&j| cbox[j].is_some())
        .collect();
    order.sort_by(|&i, &j| {
        let (a, b) = (cbox[i].unwrap_or_default(), cbox[j].unwrap_or_default());
        a.x0.total_cmp(&b.x0).then(i.cmp(&j))
    });
    let lefts: Vec<f64> = order
        .iter()
        .map(|&j| cbox[j].unwrap_or_default().x0)
        .collect();

    let mut edges: Vec<Edge> = (0..reference.len())
        .into_par_iter()
        .flat_map_iter(|r| {
            let mut out = Vec::new();
            let Some(rb) = rbox[r] else {
                return out;
            };
            let limit = (REJECT_TOLERANCES * tol).max(REJECT_SIZE * rb.size().to_vec2().hypot());
            let lo = lefts.partition_point(|&x| x < rb.x0 - limit);
            let hi = lefts.partition_point(|&x| x <= rb.x0 + limit);
            for &c in &order[lo..hi] {
                let Some(cb) = cbox[c] else { continue };
                let l = box_lower_bound(rb, cb);
                if l > limit {
                    continue;
                }
                let segs = reference[r].len().max(candidate[c].len()).max(1);
                let n = (ESTIMATE_SAMPLES / segs).max(1);
                let cost = l.max(measure::estimate(reference[r], candidate[c], n));
                if cost <= limit {
                    out.push(Edge { cost, r, c });
                }
            }
            out
        })
        .collect();
    edges.sort_by(|a, b| {
        a.cost
            .total_cmp(&b.cost)
            .then(a.r.cmp(&b.r))
            .then(a.c.cmp(&b.c))
    });

    let mut r_used = vec![false; reference.len()];
    let mut c_used = vec![false; candidate.len()];
    let mut pairs = Vec::new();
    for e in edges {
        if !r_used[e.r] && !c_used[e.c] {
            r_used[e.r] = true;
            c_used[e.c] = true;
            pairs.push((e.r, e.c));
        }
    }
    // Contours without geometry can only stand for each other: pair them in order.
    let r_empty = (0..reference.len()).filter(|&i| rbox[i].is_none());
    let c_empty = (0..candidate.len()).filter(|&j| cbox[j].is_none());
    for (i, j) in r_empty.zip(c_empty) {
        r_used[i] = true;
        c_used[j] = true;
        pairs.push((i, j));
    }
    pairs.sort_unstable();
    Matching {
        pairs,
        missing: (0..reference.len()).filter(|&i| !r_used[i]).collect(),
        extra: (0..candidate.len()).filter(|&j| !c_used[j]).collect(),
    }
}
