//! Contours, outlines and the `Source` that names where every contour came from.

use std::fmt;

use kurbo::{Affine, Point, Rect};
use serde::Serialize;

use super::Segment;

/// Where a contour came from: the file, the element or glyph, and its index there.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash, Serialize)]
pub struct Source {
    /// The input file (or a label such as `text` for a font job).
    pub file: String,
    /// The element (`#id`, or tag and document order such as `circle[3]`) or glyph
    /// (`'A' (glyph 36), line 1 char 3`).
    pub element: String,
    /// Subpath (or glyph contour) index within the element.
    pub index: usize,
}

impl Source {
    pub fn new(file: impl Into<String>, element: impl Into<String>, index: usize) -> Source {
        Source {
            file: file.into(),
            element: element.into(),
            index,
        }
    }

    /// A short identifier fit for an XML id or a table row: element and index.
    pub fn label(&self) -> String {
        format!("{} #{}", self.element, self.index)
    }
}

impl fmt::Display for Source {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}, contour {}", self.file, self.element, self.index)
    }
}

/// A connected sequence of segments, each starting where the previous ends.
#[derive(Clone, Debug, PartialEq)]
pub struct Contour {
    pub segments: Vec<Segment>,
    pub closed: bool,
    pub source: Source,
}

impl Contour {
    pub fn new(segments: Vec<Segment>, closed: bool, source: Source) -> Contour {
        Contour {
            segments,
            closed,
            source,
        }
    }

    pub fn start(&self) -> Option<Point> {
        self.segments.first().map(|s| s.start())
    }

    pub fn end(&self) -> Option<Point> {
        self.segments.last().map(|s| s.end())
    }

    pub fn bounding_box(&self) -> Option<Rect> {
        self.segments
            .iter()
            .map(|s| s.bounding_box())
            .reduce(|a, b| a.union(b))
    }

    /// The contour under an affine map, exactly.
    pub fn transformed(&self, a: Affine) -> Contour {
        let mut segments = Vec::with_capacity(self.segments.len());
        for s in &self.segments {
            s.transform(a, &mut segments);
        }
        Contour {
            segments,
            closed: self.closed,
            source: self.source.clone(),
        }
    }

    /// The same contour traversed the other way.
    pub fn reversed(&self) -> Contour {
        Contour {
            segments: self.segments.iter().rev().map(|s| s.reversed()).collect(),
            closed: self.closed,
            source: self.source.clone(),
        }
    }

    /// Twice the signed area enclosed (for a closed contour), by Green's theorem over a fine
    /// flattening: positive when the contour turns from +x towards +y.
    pub fn signed_area(&self) -> f64 {
        let mut area = 0.0;
        for s in &self.segments {
            let n = 32;
            let mut prev = s.start();
            for i in 1..=n {
                let p = s.eval(i as f64 / n as f64);
                area += prev.x * p.y - p.x * prev.y;
                prev = p;
            }
        }
        0.5 * area
    }

    pub fn length(&self) -> f64 {
        self.segments.iter().map(|s| s.arclen(1e-6)).sum()
    }
}

/// Why something was not turned into contours: on purpose (hidden, not a drawing, a space) or
/// because it is broken (bad path data, a glyph that fails to outline). Broken input makes the
/// command's exit code say so even though the rest converts.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum SkipKind {
    Hidden,
    Invalid,
}

/// Something a reader saw and did not turn into contours, with the reason.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Skipped {
    pub source: Source,
    pub reason: String,
    pub kind: SkipKind,
}

impl Skipped {
    /// Left out on purpose (hidden, not a drawing element, nothing to draw).
    pub fn hidden(source: Source, reason: impl Into<String>) -> Skipped {
        Skipped {
            source,
            reason: reason.into(),
            kind: SkipKind::Hidden,
        }
    }

    /// Left out because it is broken.
    pub fn invalid(source: Source, reason: impl Into<String>) -> Skipped {
        Skipped {
            source,
            reason: reason.into(),
            kind: SkipKind::Invalid,
        }
    }
}

/// A whole drawing or text job: its contours, what was skipped and warnings, in millimetres.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Outline {
    pub contours: Vec<Contour>,
    pub skipped: Vec<Skipped>,
    pub warnings: Vec<String>,
}

impl Outline {
    pub fn bounding_box(&self) -> Option<Rect> {
        self.contours
            .iter()
            .filter_map(|c| c.bounding_box())
            .reduce(|a, b| a.union(b))
    }

    /// Append another outline's contours, skips and warnings.
    pub fn extend(&mut self, other: Outline) {
        self.contours.extend(other.contours);
        self.skipped.extend(other.skipped);
        self.warnings.extend(other.warnings);
    }
}
