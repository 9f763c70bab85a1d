//! Readers: SVG artwork, font text jobs, ratline's JSON outline format and G-code, each into an
//! `Outline` in millimetres with y pointing down.

pub mod font;
pub mod gcode;
pub mod json;
pub mod svg;
