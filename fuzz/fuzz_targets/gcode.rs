//! The G-code reader on arbitrary text.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::gcode::read_gcode;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    let _ = read_gcode("fuzz.nc", &text);
});
