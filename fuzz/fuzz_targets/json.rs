//! The JSON outline reader on arbitrary bytes; what it accepts must write back and read again.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::json::read_outline_json;
use ratline::write::json::outline_to_json;

fuzz_target!(|data: &[u8]| {
    if let Ok(outline) = read_outline_json("fuzz.json", data) {
        let text = outline_to_json(&outline);
        if let Err(e) = read_outline_json("again.json", text.as_bytes()) {
            panic!("written outline does not read back: {e}");
        }
    }
});
