//! Alignment: where to put the candidate before it is compared with the reference.
//!
//! `Align::BBox` moves the candidate so that the centre of its bounding box sits on the centre
//! of the reference's bounding box. The centre (rather than the min corner) is used because a
//! candidate that deviates evenly on all sides (a fit that stays within ±tolerance, a uniform
//! offset) keeps its deviation centred: the min corner would push all of it to one side and
//! double it on the other. Moving is a translation, which every segment kind survives exactly
//! (a circular arc keeps its radius and only its centre moves).

use kurbo::{Affine, Vec2};
use serde::Serialize;

use crate::geom::{Outline, Segment};

/// How the candidate is placed on the reference before comparing.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Align {
    /// Compare as drawn: both outlines in their own coordinates.
    #[default]
    None,
    /// Move the candidate so its bounding-box centre sits on the reference's.
    BBox,
}

impl Align {
    pub fn name(self) -> &'static str {
        match self {
            Align::None => "none",
            Align::BBox => "bbox",
        }
    }
}

/// The translation applied to the candidate (zero for `Align::None`, or when either outline
/// has no geometry to take a bounding box of).
pub fn offset(reference: &Outline, candidate: &Outline, align: Align) -> Vec2 {
    match (align, reference.bounding_box(), candidate.bounding_box()) {
        (Align::BBox, Some(r), Some(c)) => r.center() - c.center(),
        _ => Vec2::ZERO,
    }
}

/// The segments moved by `v`, each keeping its kind.
pub fn translated(segments: &[Segment], v: Vec2) -> Vec<Segment> {
    if v == Vec2::ZERO {
        return segments.to_vec();
    }
    let a = Affine::translate(v);
    segments
        .iter()
        .map(|s| match s {
            Segment::Line(l) => Segment::Line(a * *l),
            Segment::Quad(q) => Segment::Quad(a * *q),
            Segment::Cubic(c) => Segment::Cubic(a * *c),
            Segment::Conic(c) => Segment::Conic(c.transform(a)),
            Segment::Arc(arc) => {
                let mut arc = *arc;
                arc.center += v;
                Segment::Arc(arc)
            }
        })
        .collect()
}
