//! Cut order and start points.
//!
//! - `InsideFirst`: every contour is cut after everything nested inside it (a post-order walk
//!   of the nesting tree, siblings as drawn), so a hole is never cut from a part that has
//!   already come loose.
//! - `ShortTravel`: the same precedence, and the pen-up travel is shortened: nearest neighbour
//!   (each step goes to the nearest contour whose nested contours are all cut), then 2-opt
//!   (Croes, "A method for solving traveling-salesman problems", Operations Research 6(6) 1958)
//!   restricted to reversals that keep every contour after its nested ones (a reversal is
//!   allowed unless it holds a contour together with its parent), alternating with a pass that
//!   moves each closed contour's start to its point nearest the previous end (exact nearest
//!   points per segment) when that shortens the two legs it touches. The as-drawn order is
//!   improved the same way when it already respects the precedence, and the shorter plan wins,
//!   so the result is never longer than the as-drawn travel in that case. Open contours may be
//!   entered from either end.
//!
//! Travel is measured from the machine origin (0, 0) to the first start and from each end to
//! the next start; there is no return leg.

use kurbo::{Point, Vec2};
use serde::Serialize;

use crate::geom::{Contour, Segment};

#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Order {
    #[default]
    AsDrawn,
    InsideFirst,
    ShortTravel,
}

/// Above this many contours the 2-opt pass is skipped (its cost grows as n³ here).
const MAX_TWO_OPT: usize = 1500;

/// Rounds of 2-opt and start-point moves.
const MAX_ROUNDS: usize = 30;

/// Pen-up travel of contours cut in this order.
pub fn travel(contours: &[Contour]) -> f64 {
    let mut at = Point::ORIGIN;
    let mut sum = 0.0;
    for c in contours {
        if let (Some(s), Some(e)) = (c.start(), c.end()) {
            sum += (s - at).hypot();
            at = e;
        }
    }
    sum
}

/// Post-order of the nesting forest: children (as drawn) before their parent.
pub fn inside_first(parent: &[Option<usize>]) -> Vec<usize> {
    let n = parent.len();
    let mut children = vec![Vec::new(); n];
    let mut roots = Vec::new();
    for (i, p) in parent.iter().enumerate() {
        match p {
            Some(p) => children[*p].push(i),
            None => roots.push(i),
        }
    }
    let mut out = Vec::with_capacity(n);
    for r in roots {
        // Iterative post-order: (node, next child index).
        let mut stack = vec![(r, 0)];
        while let Some((v, k)) = stack.pop() {
            if k < children[v].len() {
                stack.push((v, k + 1));
                stack.push((children[v][k], 0));
            } else {
                out.push(v);
            }
        }
    }
    out
}

/// The nearest point of a contour to p: (distance, segment, parameter).
fn nearest_on(c: &Contour, p: Point) -> (f64, usize, f64) {
    let mut best = (f64::INFINITY, 0, 0.0);
    for (i, s) in c.segments.iter().enumerate() {
        let b = s.bounding_box();
        let dx = (b.x0 - p.x).max(p.x - b.x1).max(0.0);
        let dy = (b.y0 - p.y).max(p.y - b.y1).max(0.0);
        if dx.hypot(dy) >= best.0 {
            continue;
        }
        let (d, t) = s.nearest(p);
        if d < best.0 {
            best = (d, i, t);
        }
    }
    best
}

/// One contour in a plan: where it is entered (closed) or which way it runs (open).
#[derive(Clone, Copy, Debug)]
struct Step {
    idx: usize,
    at: (usize, f64),
    reversed: bool,
    entry: Point,
    exit: Point,
}

fn step(c: &Contour, idx: usize, at: (usize, f64), reversed: bool) -> Step {
    let (s, e) = (c.start().unwrap_or_default(), c.end().unwrap_or_default());
    if c.closed {
        let p = c.segments[at.0].eval(at.1);
        Step {
            idx,
            at,
            reversed: false,
            entry: p,
            exit: p,
        }
    } else if reversed {
        Step {
            idx,
            at,
            reversed,
            entry: e,
            exit: s,
        }
    } else {
        Step {
            idx,
            at,
            reversed,
            entry: s,
            exit: e,
        }
    }
}

fn cost(plan: &[Step]) -> f64 {
    let mut at = Point::ORIGIN;
    plan.iter()
        .map(|s| {
            let d = (s.entry - at).hypot();
            at = s.exit;
            d
        })
        .sum()
}

fn dist(a: Point, b: Point) -> f64 {
    (a - b).hypot()
}

/// Nearest neighbour under the precedence.
fn greedy(cs: &[Contour], parent: &[Option<usize>]) -> Vec<Step> {
    let n = cs.len();
    let mut pending = vec![0usize; n];
    for p in parent.iter().flatten() {
        pending[*p] += 1;
    }
    let mut done = vec![false; n];
    let mut at = Point::ORIGIN;
    let mut plan = Vec::with_capacity(n);
    let boxes: Vec<_> = cs.iter().map(|c| c.bounding_box()).collect();
    for _ in 0..n {
        let mut best: Option<(f64, Step)> = None;
        for i in 0..n {
            if done[i] || pending[i] > 0 || cs[i].segments.is_empty() {
                continue;
            }
            if let (Some(b), Some((bd, _))) = (boxes[i], &best) {
                let dx = (b.x0 - at.x).max(at.x - b.x1).max(0.0);
                let dy = (b.y0 - at.y).max(at.y - b.y1).max(0.0);
                if Vec2::new(dx, dy).hypot() >= *bd {
                    continue;
                }
            }
            let c = &cs[i];
            let s = if c.closed {
                let (_, seg, t) = nearest_on(c, at);
                step(c, i, (seg, t), false)
            } else {
                let fwd = step(c, i, (0, 0.0), false);
                let rev = step(c, i, (0, 0.0), true);
                if dist(at, rev.entry) < dist(at, fwd.entry) {
                    rev
                } else {
                    fwd
                }
            };
            let d = dist(at, s.entry);
            if best.as_ref().is_none_or(|(bd, _)| d < *bd) {
                best = Some((d, s));
            }
        }
        let Some((_, s)) = best else { break };
        done[s.idx] = true;
        if let Some(p) = parent[s.idx] {
            pending[p] -= 1;
        }
        at = s.exit;
        plan.push(s);
    }
    plan
}

/// One pass of precedence-keeping 2-opt; whether anything improved.
fn two_opt(cs: &[Contour], parent: &[Option<usize>], plan: &mut [Step]) -> bool {
    let n = plan.len();
    if n > MAX_TWO_OPT {
        return false;
    }
    let mut pos = vec![0; cs.len()];
    for (k, s) in plan.iter().enumerate() {
        pos[s.idx] = k;
    }
    let mut improved = false;
    for i in 0..n {
        for j in i + 1..n {
            let e = if i == 0 {
                Point::ORIGIN
            } else {
                plan[i - 1].exit
            };
            let (ni, xj) = (plan[i].entry, plan[j].exit);
            let (old, new) = match plan.get(j + 1) {
                Some(next) => (
                    dist(e, ni) + dist(xj, next.entry),
                    dist(e, xj) + dist(ni, next.entry),
                ),
                None => (dist(e, ni), dist(e, xj)),
            };
            if new >= old - 1e-9 {
                continue;
            }
            let legal =
                (i..=j).all(|k| parent[plan[k].idx].is_none_or(|p| !(i..=j).contains(&pos[p])));
            if !legal {
                continue;
            }
            plan[i..=j].reverse();
            for (k, slot) in plan.iter_mut().enumerate().take(j + 1).skip(i) {
                let s = *slot;
                *slot = step(&cs[s.idx], s.idx, s.at, !s.reversed && !cs[s.idx].closed);
                pos[s.idx] = k;
            }
            improved = true;
        }
    }
    improved
}

/// Move each closed contour's start to its point nearest the previous end when that shortens
/// the two legs it touches; whether anything improved.
fn restart(cs: &[Contour], plan: &mut [Step]) -> bool {
    let mut improved = false;
    for k in 0..plan.len() {
        let c = &cs[plan[k].idx];
        if !c.closed {
            continue;
        }
        let e = if k == 0 {
            Point::ORIGIN
        } else {
            plan[k - 1].exit
        };
        let (_, seg, t) = nearest_on(c, e);
        let cand = step(c, plan[k].idx, (seg, t), false);
        let legs =
            |s: &Step| dist(e, s.entry) + plan.get(k + 1).map_or(0.0, |n| dist(s.exit, n.entry));
        if legs(&cand) < legs(&plan[k]) - 1e-9 {
            plan[k] = cand;
            improved = true;
        }
    }
    improved
}

fn improve(cs: &[Contour], parent: &[Option<usize>], plan: &mut [Step]) {
    for _ in 0..MAX_ROUNDS {
        let a = restart(cs, plan);
        let b = two_opt(cs, parent, plan);
        if !a && !b {
            break;
        }
    }
}

/// The contour rotated to start at (segment, t) (closed), or reversed (open).
fn apply(c: &Contour, s: &Step) -> Contour {
    if !c.closed {
        return if s.reversed { c.reversed() } else { c.clone() };
    }
    let (k, t) = s.at;
    let n = c.segments.len();
    let mut segs: Vec<Segment> = Vec::with_capacity(n + 1);
    if t <= 1e-12 || t >= 1.0 - 1e-12 {
        let first = if t <= 1e-12 { k } else { (k + 1) % n };
        segs.extend((0..n).map(|i| c.segments[(first + i) % n]));
    } else {
        segs.push(c.segments[k].subsegment(t, 1.0));
        segs.extend((1..n).map(|i| c.segments[(k + i) % n]));
        segs.push(c.segments[k].subsegment(0.0, t));
    }
    Contour::new(segs, true, c.source.clone())
}

/// The result of ordering: the contours in cut order and how many were restarted.
pub struct Ordered {
    pub contours: Vec<Contour>,
    pub restarted: usize,
    pub reversed_open: usize,
}

/// Order contours (with their nesting parents) as requested.
pub fn order(cs: Vec<Contour>, parent: &[Option<usize>], how: Order) -> Ordered {
    let idx: Vec<usize> = match how {
        Order::AsDrawn => (0..cs.len()).collect(),
        Order::InsideFirst => inside_first(parent),
        Order::ShortTravel => return short_travel(cs, parent),
    };
    let mut slots: Vec<Option<Contour>> = cs.into_iter().map(Some).collect();
    Ordered {
        contours: idx.into_iter().filter_map(|i| slots[i].take()).collect(),
        restarted: 0,
        reversed_open: 0,
    }
}

fn short_travel(cs: Vec<Contour>, parent: &[Option<usize>]) -> Ordered {
    // Empty contours take no part in the tour; they go to the end.
    let mut plan = greedy(&cs, parent);
    improve(&cs, parent, &mut plan);
    let pos_ok = (0..cs.len()).all(|i| parent[i].is_none_or(|p| p > i));
    if pos_ok {
        let mut drawn: Vec<Step> = cs
            .iter()
            .enumerate()
            .filter(|(_, c)| !c.segments.is_empty())
            .map(|(i, c)| step(c, i, (0, 0.0), false))
            .collect();
        improve(&cs, parent, &mut drawn);
        if cost(&drawn) < cost(&plan) {
            plan = drawn;
        }
    }
    let mut seen = vec![false; cs.len()];
    let mut out = Vec::with_capacity(cs.len());
    let (mut restarted, mut reversed_open) = (0, 0);
    for s in &plan {
        let c = &cs[s.idx];
        seen[s.idx] = true;
        if c.closed && s.at != (0, 0.0) {
            restarted += 1;
        }
        if s.reversed {
            reversed_open += 1;
        }
        out.push(apply(c, s));
    }
    out.extend(cs.into_iter().zip(seen).filter(|(_, s)| !s).map(|(c, _)| c));
    Ordered {
        contours: out,
        restarted,
        reversed_open,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn post_order_puts_children_first() {
        // 0 contains 1 and 2; 1 contains 3.
        let parent = [None, Some(0), Some(0), Some(1)];
        assert_eq!(inside_first(&parent), vec![3, 1, 2, 0]);
    }
}
