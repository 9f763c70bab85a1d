//! ratline: outlines from SVG artwork and fonts, kept exact (every arc a conic), fitted to the
//! primitives a cutter or engraver accepts within a tolerance in millimetres, with the true
//! deviation measured and certified.

pub mod cli;
pub mod convert;
pub mod error;
pub mod fit;
pub mod geom;
pub mod inspect;
pub mod measure;
pub mod prep;
pub mod read;
#[cfg(test)]
mod testing;
pub mod verify;
pub mod write;

pub use error::InputError;
