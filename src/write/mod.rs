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

use std::f64::consts::FRAC_PI_2;

use kurbo::{ParamCurve, Point, Vec2};

use crate::geom::{CircularArc, Segment, Source};

/// `x` with exactly `decimals` digits after the point; a rounded zero is written without a sign.
/// The digits are those of Rust's `{:.d}`: the exact binary value rounded to the nearest
/// multiple of 10⁻ᵈ, ties to even.
fn fixed(x: f64, decimals: u32) -> String {
    let mut s = String::new();
    push_fixed(&mut s, x, decimals);
    s
}

/// Append `fixed(x, decimals)` to `out`.
fn push_fixed(out: &mut String, x: f64, decimals: u32) {
    let Some(n) = scaled(x, decimals) else {
        out.push_str(&formatted(x, decimals));
        return;
    };
    if n < 0 {
        out.push('-');
    }
    // The digits of |n|, last first, at least one before the point.
    let d = decimals as usize;
    let (mut digits, mut len, mut a) = ([0u8; 24], 0, n.unsigned_abs());
    while a > 0 || len <= d {
        digits[len] = b'0' + (a % 10) as u8;
        a /= 10;
        len += 1;
    }
    for i in (0..len).rev() {
        out.push(char::from(digits[i]));
        if i == d && d > 0 {
            out.push('.');
        }
    }
}

/// Rust's own `{:.d}` formatting (core's exact float-to-decimal, Steele & White / Dragon4 with
/// Grisu), with a negative zero written without its sign: slow, for the numbers [`scaled`]
/// leaves out.
fn formatted(x: f64, decimals: u32) -> String {
    let s = format!("{:.*}", decimals as usize, x);
    match s.strip_prefix('-') {
        Some(rest) if rest.bytes().all(|b| b == b'0' || b == b'.') => rest.to_string(),
        _ => s,
    }
}

/// The value a reader gets back from `fixed(x, decimals)`: n / 10ᵈ, correctly rounded like the
/// parse of the written decimal (both n and 10ᵈ are exact in f64, and IEEE 754 division is
/// correctly rounded).
fn as_written(x: f64, decimals: u32) -> f64 {
    match scaled(x, decimals) {
        Some(n) => n as f64 / POW10[decimals as usize],
        // A finite f64 formatted with `{:.d}` is a plain decimal, which always parses.
        None => fixed(x, decimals)
            .parse()
            .expect("a formatted finite number parses"),
    }
}

/// 10⁰ … 10²², each exact in f64 (5²² < 2⁵³).
const POW10: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// x·10ᵈ rounded to the nearest integer, ties to even, decided on the exact product; `None`
/// when it is not below 4·10¹⁵ in magnitude (or not finite). With p = fl(x·10ᵈ), the error
/// e = fma(x, 10ᵈ, −p) is exact, x·10ᵈ = p + e (Ogita, Rump & Oishi, "Accurate sum and dot
/// product", SIAM J. Sci. Comput. 26, 2005, TwoProduct). Below 2⁵² the ulp u of p is at most ½,
/// r = round(p) and p − r are exact, and |e| ≤ u/2: if |p − r| < ½ it is at most ½ − u, so the
/// exact product rounds to r too; if p sits on a half, the sign of e breaks the tie [derived].
fn scaled(x: f64, decimals: u32) -> Option<i64> {
    let s = *POW10.get(decimals as usize)?;
    let p = x * s;
    if p.is_nan() || p.abs() >= 4e15 {
        return None;
    }
    let e = x.mul_add(s, -p);
    let r = p.round_ties_even();
    let d = p - r;
    let n = if d.abs() == 0.5 && e != 0.0 && (d > 0.0) == (e > 0.0) {
        r + d.signum()
    } else {
        r
    };
    Some(n as i64)
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

/// An arc as both writers write it: in `n = ⌈|sweep| / 90°⌉` equal pieces (one piece for a
/// zero sweep). A quarter turn at most keeps an SVG arc's flags unambiguous and a G-code arc
/// clear of the half turn, where the centre format is ill-conditioned (each writer's module
/// docs).
pub(crate) fn arc_pieces(a: &CircularArc) -> impl Iterator<Item = CircularArc> + '_ {
    let n = ((a.sweep.abs() / FRAC_PI_2) - 1e-9).ceil().max(1.0) as usize;
    (0..n).map(move |i| a.subsegment(i as f64 / n as f64..(i + 1) as f64 / n as f64))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fixed_agrees_with_the_standard_formatting_on_ties_and_near_ties() {
        let mut values = vec![
            0.0, -0.0, 0.5, 1.5, 2.5, -2.5, 0.125, 0.375, -0.625, 1e6, -1e6,
        ];
        let mut rng = crate::testing::Rng::new(0x2545_F491_4F6C_DD1D);
        for _ in 0..20_000 {
            let x = (rng.unit() - 0.5) * 2e6 * 10f64.powi(-((rng.next_u64() % 7) as i32));
            values.push(x);
            // A decimal tie at 1–6 decimals, and its two neighbouring doubles.
            let d = 1 + (rng.next_u64() % 6) as i32;
            let tie = ((x * 10f64.powi(d)).trunc() + 0.5) / 10f64.powi(d);
            values.extend([tie, tie.next_up(), tie.next_down()]);
        }
        for x in values {
            for d in 0..=8 {
                // (`formatted` is the standard formatting, the reference for the fast path.)
                assert_eq!(fixed(x, d), formatted(x, d), "{x:e} at {d} decimals");
                let parsed: f64 = formatted(x, d).parse().unwrap();
                assert_eq!(as_written(x, d), parsed, "{x:e} at {d} decimals");
            }
        }
    }

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
