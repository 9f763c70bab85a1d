//! Warnings about the drawing, each naming the contour's `Source`:
//! - narrow features: strokes of material, or gaps of waste, narrower than a limit (twice the
//!   blade offset, or the kerf). The width at a sample point is the distance along the normal
//!   (into the material for a stroke, into the waste for a gap) to the first boundary crossed,
//!   on the flattened contours, counted only when that boundary faces back within 30° (two
//!   nearly parallel walls). Tips of corners sharper than 30° are therefore reported too; blunter
//!   corners, whose walls meet at a wide angle, are not. Samples sit inside segments (eight per
//!   segment), never on the corners themselves.
//! - open contours: a slit encloses nothing, so there is nothing to weed.

use kurbo::{Point, Rect, Vec2};
use serde::Serialize;

use super::displace::left;
use super::nesting::{Nesting, Polygon};
use crate::geom::{Contour, Source};

/// A warning about one contour.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Warning {
    pub source: Source,
    pub message: String,
}

impl std::fmt::Display for Warning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.source, self.message)
    }
}

/// Samples per segment for the width test.
const SAMPLES: usize = 8;

/// cos 30°: how nearly the opposite wall must face back.
const FACING: f64 = 0.866_025_403_784_438_6;

/// Material side of contour j: +1 when its left normal points into material.
fn material_sign(poly: &Polygon, hole: bool) -> f64 {
    poly.area.signum() * if hole { -1.0 } else { 1.0 }
}

/// The first crossing of the ray p + s·u, 0 < s ≤ limit, with the polygons: (s, the crossed
/// wall's material normal).
fn first_hit(p: Point, u: Vec2, limit: f64, polys: &[(&Polygon, f64)]) -> Option<(f64, Vec2)> {
    let q = p + limit * u;
    let ray_box = Rect::from_points(p, q);
    let skip = 3.0 * super::nesting::FLAT_TOL;
    let mut best: Option<(f64, Vec2)> = None;
    for (poly, sign) in polys {
        let b = poly.bbox;
        if b.x0 > ray_box.x1 || b.x1 < ray_box.x0 || b.y0 > ray_box.y1 || b.y1 < ray_box.y0 {
            continue;
        }
        for (a, c) in poly.edges() {
            let e = c - a;
            let den = u.cross(e);
            if den == 0.0 {
                continue;
            }
            let w = a - p;
            let s = w.cross(e) / den;
            let r = w.cross(u) / den;
            if s > skip
                && s <= limit
                && (0.0..=1.0).contains(&r)
                && best.is_none_or(|(bs, _)| s < bs)
            {
                let len = e.hypot();
                best = Some((s, *sign * left(e / len)));
            }
        }
    }
    best
}

/// Narrow strokes and gaps, one warning per contour and kind (the narrowest place).
pub fn narrow(
    contours: &[Contour],
    nest: &Nesting,
    polys: &[Option<Polygon>],
    limit: f64,
) -> Vec<Warning> {
    let walls: Vec<(&Polygon, f64)> = polys
        .iter()
        .enumerate()
        .filter_map(|(j, p)| p.as_ref().map(|p| (p, material_sign(p, nest.is_hole(j)))))
        .collect();
    let mut out = Vec::new();
    for (i, c) in contours.iter().enumerate() {
        let Some(poly) = &polys[i] else { continue };
        let sign = material_sign(poly, nest.is_hole(i));
        // (kind, direction into it, facing test) — stroke: into material, the far wall's
        // material normal points back; gap: into waste, the far wall's points onward.
        for (kind, dir, facing) in [("stroke", 1.0, -1.0), ("gap", -1.0, 1.0)] {
            let mut worst: Option<(f64, Point)> = None;
            for s in &c.segments {
                for k in 0..SAMPLES {
                    let t = (k as f64 + 0.5) / SAMPLES as f64;
                    let Some(tan) = s.tangent_at(t) else { continue };
                    let p = s.eval(t);
                    let u = dir * sign * left(tan);
                    if let Some((w, n)) = first_hit(p, u, limit, &walls) {
                        if facing * n.dot(u) >= FACING && worst.is_none_or(|(bw, _)| w < bw) {
                            worst = Some((w, p));
                        }
                    }
                }
            }
            if let Some((w, p)) = worst {
                out.push(Warning {
                    source: c.source.clone(),
                    message: format!(
                        "{kind} {w:.3} mm wide at ({:.3}, {:.3}) mm, narrower than {limit:.3} mm (twice the blade offset or the kerf)",
                        p.x, p.y
                    ),
                });
            }
        }
    }
    out
}

/// Open contours, which cannot be weeded.
pub fn open_contours(contours: &[Contour]) -> Vec<Warning> {
    contours
        .iter()
        .filter(|c| !c.closed && !c.segments.is_empty())
        .map(|c| Warning {
            source: c.source.clone(),
            message: "open contour: it encloses nothing, so the cut cannot be weeded".into(),
        })
        .collect()
}
