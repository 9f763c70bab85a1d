//! Lines: a piece of curve becomes its chord, with both vertices on the curve. The chord's
//! deviation is measured, not estimated (for a circular arc it is the sagitta, see `circle.rs`).

use kurbo::Line;

use crate::geom::Segment;

/// The chord of a piece.
pub fn chord(s: &Segment) -> Vec<Segment> {
    vec![Segment::Line(Line::new(s.start(), s.end()))]
}
