//! Path data: arbitrary text as the `d` of one path (XML-escaped, so the path parser sees it
//! as it is), inside a small SVG document with a physical size and a viewBox.
#![no_main]

use libfuzzer_sys::fuzz_target;
use ratline::read::svg::{read_svg, SvgOptions};

fuzz_target!(|data: &[u8]| {
    let d = String::from_utf8_lossy(data);
    let mut esc = String::with_capacity(d.len());
    for c in d.chars() {
        match c {
            '&' => esc.push_str("&amp;"),
            '<' => esc.push_str("&lt;"),
            '"' => esc.push_str("&quot;"),
            // Characters XML 1.0 does not allow at all (§2.2) would only test the XML parser.
            c if (c as u32) < 0x20 && !matches!(c, '\t' | '\n' | '\r') => esc.push(' '),
            c => esc.push(c),
        }
    }
    let doc = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"100mm\" height=\"100mm\" \
         viewBox=\"0 0 100 100\"><path id=\"p\" d=\"{esc}\"/></svg>"
    );
    if let Ok(outline) = read_svg("fuzz.svg", doc.as_bytes(), &SvgOptions::default()) {
        for c in &outline.contours {
            let _ = c.bounding_box();
            let _ = c.length();
        }
    }
});
