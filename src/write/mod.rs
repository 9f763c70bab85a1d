//! Writers: cutter SVG, G-code, the JSON outline format, all written atomically, and the
//! verification page (HTML).

pub mod atomic;
pub mod gcode;
pub mod html;
pub mod json;
pub mod svg;
