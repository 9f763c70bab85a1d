//! The basic shapes of SVG 1.1 Second Edition chapter 9, as exact subpaths in user units.
//!
//! - `rect` (§9.2): a zero width or height disables rendering, a negative one is an error. For
//!   the corner radii the SVG 2 rules are used (SVG 2 §10.2, which agree with SVG 1.1 for valid
//!   values): a missing or negative (invalid, hence `auto`) radius takes the other one; both
//!   missing means square corners; then rx is clamped to width/2 and ry to height/2. Each corner
//!   is a quarter ellipse, one exact conic (`rounded_corner`). The outline starts at (x + rx, y)
//!   and runs clockwise on screen, as in §9.2's equivalent path.
//! - `circle` (§9.3), `ellipse` (§9.4): r (rx, ry) of zero disables rendering, negative is an
//!   error; an ellipse with one radius missing takes the other (SVG 2 `auto`). Four exact
//!   quarter conics from (cx + rx, cy), clockwise on screen.
//! - `line` (§9.5), `polyline` (§9.6), `polygon` (§9.7): `points` is a list of coordinate pairs;
//!   an odd count or a malformed number is an error (§9.7.1, F.2); the element is then refused
//!   whole, like bad path data.

use kurbo::{Point, Vec2};
use roxmltree::Node;
use svgtypes::NumberListParser;

use super::attrs::{user_attr, Axis, Viewport};
use super::path::Subpath;
use crate::geom::{ellipse_conics, rounded_corner, Segment};

/// The user-space context shape attributes are resolved in.
#[derive(Clone, Copy, Debug)]
pub(super) struct Env {
    pub viewport: Viewport,
    pub ppi: f64,
}

impl Env {
    fn get(&self, node: Node, name: &str, axis: Axis) -> Result<Option<f64>, String> {
        user_attr(node, name, axis, self.viewport, self.ppi)
    }

    fn get_or_zero(&self, node: Node, name: &str, axis: Axis) -> Result<f64, String> {
        Ok(self.get(node, name, axis)?.unwrap_or(0.0))
    }
}

/// A size attribute that must be present and positive; zero or absent disables rendering.
fn size(env: &Env, node: Node, name: &str, axis: Axis) -> Result<f64, String> {
    match env.get(node, name, axis)? {
        Some(v) if v > 0.0 => Ok(v),
        Some(v) if v < 0.0 => Err(format!(
            "{name} is negative ({v}): an error (SVG 1.1 ch. 9)"
        )),
        _ => Err(format!(
            "{name} is zero or missing, which disables rendering of the element"
        )),
    }
}

pub(super) fn rect(env: &Env, node: Node) -> Result<Vec<Subpath>, String> {
    let x = env.get_or_zero(node, "x", Axis::X)?;
    let y = env.get_or_zero(node, "y", Axis::Y)?;
    let w = size(env, node, "width", Axis::X)?;
    let h = size(env, node, "height", Axis::Y)?;
    let valid = |v: Option<f64>| v.filter(|r| *r >= 0.0);
    let rx = valid(env.get(node, "rx", Axis::X)?);
    let ry = valid(env.get(node, "ry", Axis::Y)?);
    let (rx, ry) = match (rx, ry) {
        (None, None) => (0.0, 0.0),
        (Some(r), None) | (None, Some(r)) => (r, r),
        (Some(a), Some(b)) => (a, b),
    };
    let (rx, ry) = (rx.min(w / 2.0), ry.min(h / 2.0));
    let p = |px: f64, py: f64| Point::new(px, py);
    let mut s = Subpath {
        segments: Vec::new(),
        closed: true,
    };
    if rx == 0.0 || ry == 0.0 {
        let c = [p(x, y), p(x + w, y), p(x + w, y + h), p(x, y + h)];
        for i in 0..4 {
            s.line(c[i], c[(i + 1) % 4]);
        }
        return Ok(vec![s]);
    }
    // Each side runs from (a) to (b), then a corner to the next side's start.
    let sides = [
        (p(x + rx, y), p(x + w - rx, y), p(x + w, y)),
        (p(x + w, y + ry), p(x + w, y + h - ry), p(x + w, y + h)),
        (p(x + w - rx, y + h), p(x + rx, y + h), p(x, y + h)),
        (p(x, y + h - ry), p(x, y + ry), p(x, y)),
    ];
    for i in 0..4 {
        let (a, b, corner) = sides[i];
        let next = sides[(i + 1) % 4].0;
        s.line(a, b);
        let c = rounded_corner(b, corner, next)
            .ok_or_else(|| "a corner radius is out of range".to_string())?;
        s.push(Segment::Conic(c));
    }
    Ok(vec![s])
}

fn ellipse_subpath(c: Point, rx: f64, ry: f64) -> Vec<Subpath> {
    vec![Subpath {
        segments: ellipse_conics(c, rx, ry, 0.0)
            .into_iter()
            .map(Segment::Conic)
            .collect(),
        closed: true,
    }]
}

pub(super) fn circle(env: &Env, node: Node) -> Result<Vec<Subpath>, String> {
    let cx = env.get_or_zero(node, "cx", Axis::X)?;
    let cy = env.get_or_zero(node, "cy", Axis::Y)?;
    let r = size(env, node, "r", Axis::Other)?;
    Ok(ellipse_subpath(Point::new(cx, cy), r, r))
}

pub(super) fn ellipse(env: &Env, node: Node) -> Result<Vec<Subpath>, String> {
    let cx = env.get_or_zero(node, "cx", Axis::X)?;
    let cy = env.get_or_zero(node, "cy", Axis::Y)?;
    let (rx, ry) = match (env.get(node, "rx", Axis::X)?, env.get(node, "ry", Axis::Y)?) {
        (Some(a), None) => (a, a),
        (None, Some(b)) => (b, b),
        _ => (
            size(env, node, "rx", Axis::X)?,
            size(env, node, "ry", Axis::Y)?,
        ),
    };
    for (name, r) in [("rx", rx), ("ry", ry)] {
        if r < 0.0 {
            return Err(format!("{name} is negative ({r}): an error (SVG 1.1 §9.4)"));
        }
        if r == 0.0 {
            return Err(format!(
                "{name} is zero, which disables rendering of the element"
            ));
        }
    }
    Ok(ellipse_subpath(Point::new(cx, cy), rx, ry))
}

pub(super) fn line(env: &Env, node: Node) -> Result<Vec<Subpath>, String> {
    let a = Point::new(
        env.get_or_zero(node, "x1", Axis::X)?,
        env.get_or_zero(node, "y1", Axis::Y)?,
    );
    let b = Point::new(
        env.get_or_zero(node, "x2", Axis::X)?,
        env.get_or_zero(node, "y2", Axis::Y)?,
    );
    let mut s = Subpath::default();
    s.line(a, b);
    Ok(vec![s])
}

/// `polyline` (open) or `polygon` (closed).
pub(super) fn poly(node: Node, closed: bool) -> Result<Vec<Subpath>, String> {
    let text = node.attribute("points").unwrap_or("");
    let mut nums = Vec::new();
    for (i, n) in NumberListParser::from(text).enumerate() {
        let v = n.map_err(|e| format!("malformed points list at number {}: {e}", i + 1))?;
        if !v.is_finite() {
            return Err(format!(
                "points list: number {} is out of range (infinite or too large)",
                i + 1
            ));
        }
        nums.push(v);
    }
    if nums.len() % 2 == 1 {
        return Err(format!(
            "points list has an odd number of coordinates ({}), an error (SVG 1.1 §9.7.1)",
            nums.len()
        ));
    }
    let pts: Vec<Point> = nums.chunks(2).map(|c| Point::new(c[0], c[1])).collect();
    let mut s = Subpath {
        segments: Vec::new(),
        closed,
    };
    for w in pts.windows(2) {
        s.line(w[0], w[1]);
    }
    if closed {
        if let (Some(&first), Some(&last)) = (pts.first(), pts.last()) {
            s.line(last, first);
        }
    }
    Ok(vec![s])
}

/// Offset by (x, y), for `use`.
pub(super) fn offset(env: &Env, node: Node) -> Result<Vec2, String> {
    Ok(Vec2::new(
        env.get_or_zero(node, "x", Axis::X)?,
        env.get_or_zero(node, "y", Axis::Y)?,
    ))
}
