//! What a writer cannot write: it names the contour's `Source` and the reason.

use std::fmt;

use crate::geom::{SegmentKind, Source};

/// Why a writer refused its input.
#[derive(Clone, Debug, PartialEq)]
pub enum WriteError {
    /// A segment the format cannot hold (a conic anywhere; a Bézier in G-code): the caller
    /// converts or fits it first.
    Unsupported {
        source: Source,
        segment: usize,
        kind: SegmentKind,
        format: &'static str,
    },
    /// A NaN, infinite or out-of-range coordinate, or a non-positive arc radius.
    Invalid {
        source: Source,
        segment: usize,
        reason: &'static str,
    },
    /// An option outside its range.
    Options(String),
}

fn kind_name(k: SegmentKind) -> &'static str {
    match k {
        SegmentKind::Line => "line",
        SegmentKind::Quadratic => "quadratic Bézier",
        SegmentKind::Cubic => "cubic Bézier",
        SegmentKind::Conic => "conic (rational quadratic)",
        SegmentKind::Arc => "circular arc",
    }
}

impl fmt::Display for WriteError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            WriteError::Unsupported {
                source,
                segment,
                kind,
                format,
            } => write!(
                f,
                "{source}: segment {segment}: a {} cannot be written to {format}; \
                 convert or fit it first",
                kind_name(*kind)
            ),
            WriteError::Invalid {
                source,
                segment,
                reason,
            } => write!(f, "{source}: segment {segment}: {reason}"),
            WriteError::Options(m) => write!(f, "bad writer options: {m}"),
        }
    }
}

impl std::error::Error for WriteError {}
