//! Lengths with units and the validated `Tolerance`.
//!
//! Conversions: 1 in = 25.4 mm (international inch, 1959); 1 pt = 1/72 in and 1 pc = 12 pt
//! (CSS Values and Units Level 3, §6.2, absolute lengths); 1 px = 1/96 in (CSS, the same section).

use std::fmt;
use std::str::FromStr;

/// Millimetres per inch.
pub const MM_PER_IN: f64 = 25.4;

/// The smallest tolerance accepted: finer than a micrometre is far below any machine's
/// resolution (common practice, no source) and only multiplies the output.
pub const MIN_TOLERANCE_MM: f64 = 1e-6;

/// A length in millimetres, parsed from a number with a unit (`mm`, `cm`, `in`, `pt`, `pc`,
/// `px`); a bare number is millimetres.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
pub struct Length(pub f64);

#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LengthError(pub String);

impl fmt::Display for LengthError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for LengthError {}

impl Length {
    pub fn mm(self) -> f64 {
        self.0
    }
}

/// Millimetres per unit, for the units ratline accepts.
pub fn mm_per_unit(unit: &str) -> Option<f64> {
    Some(match unit {
        "" | "mm" => 1.0,
        "cm" => 10.0,
        "in" => MM_PER_IN,
        "pt" => MM_PER_IN / 72.0,
        "pc" => MM_PER_IN / 6.0,
        "px" => MM_PER_IN / 96.0,
        _ => return None,
    })
}

impl FromStr for Length {
    type Err = LengthError;

    fn from_str(s: &str) -> Result<Length, LengthError> {
        let t = s.trim();
        let split = t
            .find(|c: char| c.is_ascii_alphabetic() && c != 'e' && c != 'E')
            .unwrap_or(t.len());
        let (num, unit) = t.split_at(split);
        let value: f64 = num.trim().parse().map_err(|_| {
            LengthError(format!(
                "'{s}' is not a length: expected a number with an optional unit (mm, cm, in, pt, pc, px), e.g. 0.01mm"
            ))
        })?;
        let k = mm_per_unit(unit.trim()).ok_or_else(|| {
            LengthError(format!(
                "'{s}': unknown unit '{}' (use mm, cm, in, pt, pc or px)",
                unit.trim()
            ))
        })?;
        let mm = value * k;
        if !mm.is_finite() {
            return Err(LengthError(format!("'{s}' is not a finite length")));
        }
        Ok(Length(mm))
    }
}

/// A fitting tolerance in millimetres: finite, positive and at least `MIN_TOLERANCE_MM`.
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
pub struct Tolerance(f64);

impl Tolerance {
    pub fn new(mm: f64) -> Result<Tolerance, LengthError> {
        if !mm.is_finite() || mm <= 0.0 {
            return Err(LengthError(format!(
                "tolerance must be a positive, finite length; got {mm} mm"
            )));
        }
        if mm < MIN_TOLERANCE_MM {
            return Err(LengthError(format!(
                "tolerance {mm} mm is below the smallest accepted, {MIN_TOLERANCE_MM} mm: no machine resolves that, and the output would explode"
            )));
        }
        Ok(Tolerance(mm))
    }

    pub fn mm(self) -> f64 {
        self.0
    }
}

impl FromStr for Tolerance {
    type Err = LengthError;

    fn from_str(s: &str) -> Result<Tolerance, LengthError> {
        Tolerance::new(s.parse::<Length>()?.mm())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_units() {
        assert_eq!("2".parse::<Length>().unwrap().mm(), 2.0);
        assert_eq!("1in".parse::<Length>().unwrap().mm(), 25.4);
        assert_eq!("1.5 cm".parse::<Length>().unwrap().mm(), 15.0);
        assert!(("96px".parse::<Length>().unwrap().mm() - 25.4).abs() < 1e-12);
        assert!(("72pt".parse::<Length>().unwrap().mm() - 25.4).abs() < 1e-12);
        assert_eq!("1e-2mm".parse::<Length>().unwrap().mm(), 0.01);
        assert!("3furlong".parse::<Length>().is_err());
        assert!("mm".parse::<Length>().is_err());
        assert!("1e400".parse::<Length>().is_err());
    }

    #[test]
    fn tolerance_is_validated() {
        assert!("0".parse::<Tolerance>().is_err());
        assert!("-0.01".parse::<Tolerance>().is_err());
        assert!("NaN".parse::<Tolerance>().is_err());
        assert!("1e-7mm".parse::<Tolerance>().is_err());
        assert_eq!("0.01mm".parse::<Tolerance>().unwrap().mm(), 0.01);
    }
}
