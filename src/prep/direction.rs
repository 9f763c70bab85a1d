//! Cutting direction of closed contours. Outer contours (even nesting depth) run the requested
//! way and holes (odd depth) the other way, so the tool keeps the material on the same side.
//!
//! Clockwise is as seen on the drawing. ratline's y axis points down (as in SVG), so a contour
//! that turns from +x towards +y, i.e. has a positive `Contour::signed_area` (Green's theorem),
//! looks clockwise on screen; the writers' y flip for machines (y up) keeps it clockwise as seen
//! from above the bed.

use serde::Serialize;

use crate::geom::Contour;

/// The requested direction of outer contours.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Direction {
    #[default]
    Keep,
    Cw,
    Ccw,
}

/// Whether a contour with this signed area runs clockwise as seen on the drawing.
pub fn is_clockwise(signed_area: f64) -> bool {
    signed_area > 0.0
}

/// The contour turned to run the wanted way (`hole` flips the wish), and whether it was
/// reversed. Open contours and `Keep` are left as they are.
pub fn orient(c: Contour, hole: bool, want: Direction) -> (Contour, bool) {
    let want_cw = match want {
        Direction::Keep => return (c, false),
        Direction::Cw => !hole,
        Direction::Ccw => hole,
    };
    if !c.closed || is_clockwise(c.signed_area()) == want_cw {
        return (c, false);
    }
    (c.reversed(), true)
}
