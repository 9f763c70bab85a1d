//! A vendored font with bytes overwritten: the input is a list of 5-byte patches (a 32-bit
//! little-endian offset, taken modulo the font's length, and the new byte), so the fuzzer
//! explores broken tables inside an otherwise valid file. The last input byte picks the font.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::font::{glyph_count, glyph_outline, set_text, TextOptions, TextSize};

const DEJAVU: &[u8] = include_bytes!("../../tests/fonts/DejaVuSans.ttf");
const CANTARELL: &[u8] = include_bytes!("../../tests/fonts/Cantarell-Regular.otf");
const VARIABLE: &[u8] = include_bytes!("../../tests/fonts/RatlineTestVar.ttf");

fuzz_target!(|data: &[u8]| {
    let base = match data.last().map(|b| b % 3) {
        Some(1) => CANTARELL,
        Some(2) => VARIABLE,
        _ => DEJAVU,
    };
    let mut font = base.to_vec();
    for p in data.chunks_exact(5) {
        let off = u32::from_le_bytes([p[0], p[1], p[2], p[3]]) as usize % font.len();
        font[off] = p[4];
    }
    let _ = set_text(
        "fuzz.ttf",
        &font,
        &TextOptions {
            text: "Ag fi é".into(),
            size: TextSize::Em(12.0),
            variations: vec![("wght".into(), 700.0)],
            ..TextOptions::default()
        },
    );
    if let (Ok(n), Some(&b)) = (glyph_count("fuzz.ttf", &font, 0), data.first()) {
        if n > 0 {
            let g = u16::from(b) * 7 % n;
            let _ = glyph_outline("fuzz.ttf", &font, 0, g, 10.0);
        }
    }
});
