//! The font reader on arbitrary bytes: text setting and single glyphs.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::font::{glyph_count, glyph_outline, set_text, TextOptions, TextSize};

fuzz_target!(|data: &[u8]| {
    let _ = set_text(
        "fuzz.ttf",
        data,
        &TextOptions {
            text: "Hag é\nfi?".into(),
            size: TextSize::CapHeight(10.0),
            ..TextOptions::default()
        },
    );
    if let Ok(n) = glyph_count("fuzz.ttf", data, 0) {
        for g in 0..n.min(8) {
            let _ = glyph_outline("fuzz.ttf", data, 0, g, 10.0);
        }
        let _ = glyph_outline("fuzz.ttf", data, 0, n, 10.0);
    }
});
