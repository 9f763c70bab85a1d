//! Writers: cutter SVG, G-code, the JSON outline format, the report page (HTML) and the
//! terminal summary, all files written atomically.
//!
//! Numbers are written with a fixed count of decimals `d`. Rust's `{:.d}` formatting rounds the
//! exact binary value correctly, so every written coordinate differs from the computed one by at
//! most h = 0.5·10⁻ᵈ. The `*_as_read` functions of the SVG and G-code writers parse the written
//! text back, so they return exactly what a reader of the file gets.

pub mod atomic;
mod error;
pub mod gcode;
pub mod html;
pub mod json;
pub mod summary;
pub mod svg;

pub use error::WriteError;

use kurbo::{ParamCurve, Point, Vec2};

use crate::geom::{CircularArc, Segment, Source};

/// `x` with exactly `decimals` digits after the point; a rounded zero is written without a sign.
fn fixed(x: f64, decimals: u32) -> String {
    let s = format!("{:.*}", decimals as usize, x);
    match s.strip_prefix('-') {
        Some(rest) if rest.bytes().all(|b| b == b'0' || b == b'.') => rest.to_string(),
        _ => s,
    }
}

/// The value a reader gets back from `fixed(x, decimals)`.
fn as_written(x: f64, decimals: u32) -> f64 {
    // A finite f64 formatted with `{:.d}` is a plain decimal, which always parses.
    fixed(x, decimals)
        .parse()
        .expect("a formatted finite number parses")
}

/// The largest coordinate (in mm, absolute value) the writers accept: a kilometre is far beyond
/// any cutting bed, and the limit keeps every written number exactly reproducible (with at most
/// `MAX_DECIMALS` decimals, f64 resolves 10⁶ to about 10⁻¹⁰).
pub const MAX_COORDINATE_MM: f64 = 1e6;

/// The most decimals the writers accept (a nanometre).
pub const MAX_DECIMALS: u32 = 6;

/// `p` with both coordinates as written.
fn point_as_written(p: Point, decimals: u32) -> Point {
    Point::new(as_written(p.x, decimals), as_written(p.y, decimals))
}

/// Refuse NaN, infinite or out-of-range numbers and non-positive arc radii: the points checked
/// are the ones a writer prints (control points, arc end points, the arc's circle).
pub(crate) fn check_segment(
    seg: &Segment,
    source: &Source,
    segment: usize,
) -> Result<(), WriteError> {
    let invalid = |reason: &'static str| WriteError::Invalid {
        source: source.clone(),
        segment,
        reason,
    };
    let ok = |v: f64| v.is_finite() && v.abs() <= MAX_COORDINATE_MM;
    let mut pts = seg.control_points();
    if let Segment::Arc(a) = seg {
        if !(a.radius.is_finite() && a.start_angle.is_finite() && a.sweep.is_finite()) {
            return Err(invalid("a coordinate is NaN or infinite"));
        }
        if a.radius <= 0.0 {
            return Err(invalid("the arc radius is not positive"));
        }
        let r = Vec2::new(a.radius, a.radius);
        pts.extend([a.center - r, a.center + r]);
    }
    if pts.iter().any(|p| !(p.x.is_finite() && p.y.is_finite())) {
        return Err(invalid("a coordinate is NaN or infinite"));
    }
    if pts.iter().any(|p| !(ok(p.x) && ok(p.y))) {
        return Err(invalid("a coordinate is beyond ±1e6 mm"));
    }
    Ok(())
}

/// An arc in `n = ⌈|sweep| / max_sweep⌉` equal pieces (one piece for a zero sweep).
fn arc_pieces(a: &CircularArc, max_sweep: f64) -> impl Iterator<Item = CircularArc> + '_ {
    let n = ((a.sweep.abs() / max_sweep) - 1e-9).ceil().max(1.0) as usize;
    (0..n).map(move |i| a.subsegment(i as f64 / n as f64..(i + 1) as f64 / n as f64))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fixed_rounds_within_half_a_unit_and_drops_negative_zero() {
        assert_eq!(fixed(1.23456, 4), "1.2346");
        assert_eq!(fixed(-0.00004, 4), "0.0000");
        assert_eq!(fixed(-0.00006, 4), "-0.0001");
        assert_eq!(fixed(12.5, 0), "12"); // round half to even on the exact value 12.5
        assert_eq!(fixed(-3.0, 0), "-3");
        for i in 0..1000 {
            let x = (i as f64 * 0.7390851332151607).sin() * 1234.5;
            for d in 0..8 {
                assert!(
                    (as_written(x, d) - x).abs() <= 0.5 * 10f64.powi(-(d as i32)) * (1.0 + 1e-9)
                );
            }
        }
    }
}
