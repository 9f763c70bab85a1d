//! The SVG reader on arbitrary bytes: an outline or an `InputError`, never a panic or a hang.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::svg::{read_svg, SvgOptions};

fuzz_target!(|data: &[u8]| {
    let _ = read_svg("fuzz.svg", data, &SvgOptions::default());
});
