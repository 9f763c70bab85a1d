//! The exact model: segments (lines, Béziers, conics, circular arcs), contours and outlines, in
//! millimetres with y pointing down, plus lengths and the validated tolerance.

mod arc;
mod conic;
mod contour;
mod segment;
mod units;

pub use arc::{
    ellipse_conics, rounded_corner, svg_arc_to_center, CircularArc, EllipseArc, SvgArcParams,
    SvgArcShape,
};
pub use conic::{CircleFit, Conic, ConicKind};
pub use contour::{Contour, Outline, SkipKind, Skipped, Source};
pub use segment::{Segment, SegmentCounts, SegmentKind};
pub use units::{mm_per_unit, Length, LengthError, Tolerance, MIN_TOLERANCE_MM, MM_PER_IN};

/// Why a geometric object could not be built.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum GeomError {
    /// A weight that is zero or negative.
    NonPositiveWeight,
    /// A coordinate or weight that is NaN or infinite.
    NonFinite,
}

impl std::fmt::Display for GeomError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            GeomError::NonPositiveWeight => {
                "a conic weight is zero or negative (weights must be > 0)"
            }
            GeomError::NonFinite => "a coordinate or weight is NaN or infinite",
        })
    }
}

impl std::error::Error for GeomError {}
