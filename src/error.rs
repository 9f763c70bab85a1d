//! The one error type for bad input: it names the file and, where known, the place in it.

use std::fmt;

/// Bad input: which file, where in it (XML line/column, element, glyph, G-code line, JSON
/// path), and what is wrong.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct InputError {
    pub file: String,
    pub place: Option<String>,
    pub message: String,
}

impl InputError {
    pub fn new(file: impl Into<String>, message: impl Into<String>) -> InputError {
        InputError {
            file: file.into(),
            place: None,
            message: message.into(),
        }
    }

    pub fn at(
        file: impl Into<String>,
        place: impl Into<String>,
        message: impl Into<String>,
    ) -> InputError {
        InputError {
            file: file.into(),
            place: Some(place.into()),
            message: message.into(),
        }
    }
}

impl fmt::Display for InputError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.place {
            Some(p) => write!(f, "{}: {}: {}", self.file, p, self.message),
            None => write!(f, "{}: {}", self.file, self.message),
        }
    }
}

impl std::error::Error for InputError {}
