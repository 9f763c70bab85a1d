//! Writers: cutter SVG, G-code, the JSON outline format, all written atomically.

pub mod atomic;
pub mod gcode;
pub mod json;
pub mod summary;
pub mod svg;
