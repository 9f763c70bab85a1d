//! The verification page in a real browser: headless Chromium (Debian's package, installed by
//! run-tests.sh when missing) renders the page; the screenshot must show the outline where it
//! is, and the rendered page must contain the table. The page loads nothing from the network.

mod common;

use std::path::Path;
use std::process::Command;

fn chromium() -> &'static str {
    for c in ["/usr/bin/chromium", "/usr/bin/chromium-browser"] {
        if Path::new(c).exists() {
            return c;
        }
    }
    panic!("Chromium is not installed: run ./run-tests.sh, which installs Debian's chromium");
}

/// Flags for a headless run on a closed network (no background connections, fresh profile).
fn browser(profile: &Path) -> Command {
    let mut c = Command::new(chromium());
    c.args([
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--window-size=1200,900",
    ])
    .arg(format!("--user-data-dir={}", profile.display()));
    c
}

#[test]
fn verify_page_shows_the_outline_and_the_table() {
    let dir = tempfile::tempdir().unwrap();
    let svg = dir.path().join("ring.svg");
    common::write_mm_svg(
        &svg,
        100,
        "<circle id=\"ring\" cx=\"50\" cy=\"50\" r=\"40\"/>",
    );
    let cut = dir.path().join("ring-cut.svg");
    let html = dir.path().join("ring.html");
    let run = |args: &[&str]| {
        let o = Command::new(env!("CARGO_BIN_EXE_ratline"))
            .args(args)
            .output()
            .unwrap();
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    };
    let p = |x: &Path| x.display().to_string();
    run(&["convert", &p(&svg), "--to", "lines", "-o", &p(&cut), "-q"]);
    run(&["verify", &p(&svg), &p(&cut), "--html", &p(&html), "-q"]);

    // The rendered DOM has the table with the pair in it.
    let dom = browser(&dir.path().join("profile-a"))
        .arg("--dump-dom")
        .arg(format!("file://{}", html.display()))
        .output()
        .unwrap();
    let dom = String::from_utf8_lossy(&dom.stdout);
    assert!(dom.contains("<table"), "no table in the rendered page");
    assert!(
        dom.contains("#ring"),
        "the pair's source is not in the table"
    );

    let shot = dir.path().join("shot.png");
    let o = browser(&dir.path().join("profile-b"))
        .arg(format!("--screenshot={}", shot.display()))
        .arg(format!("file://{}", html.display()))
        .output()
        .unwrap();
    assert!(
        shot.exists(),
        "no screenshot: {}",
        String::from_utf8_lossy(&o.stderr)
    );
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(&shot).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).unwrap();
    let (w, h) = (info.width as usize, info.height as usize);
    let ch = info.color_type.samples();
    let px = |x: usize, y: usize| {
        let i = (y * w + x) * ch;
        (buf[i], buf[i + 1], buf[i + 2])
    };
    // The drawing: coloured (saturated, non-grey) pixels are the contours. Their extent must be
    // a square (a circle drawn at true aspect) with an empty middle. The page puts the title
    // above the drawing (about the top 100 px at this window size) and the legend below it
    // (from about 700 px), so only the band between is searched.
    let (mut x0, mut y0, mut x1, mut y1, mut n) = (w, h, 0, 0, 0usize);
    for y in 100..700.min(h) {
        for x in 0..w {
            let (r, g, b) = px(x, y);
            let spread = r.max(g).max(b) as i32 - r.min(g).min(b) as i32;
            if spread > 60 {
                x0 = x0.min(x);
                x1 = x1.max(x);
                y0 = y0.min(y);
                y1 = y1.max(y);
                n += 1;
            }
        }
    }
    assert!(
        n > 500,
        "only {n} coloured pixels: the outline is not drawn"
    );
    let (cw, chh) = ((x1 - x0) as f64, (y1 - y0) as f64);
    assert!(cw > 200.0, "outline too small on screen: {cw} px");
    assert!(
        (cw - chh).abs() <= 0.1 * cw,
        "outline extent {cw} × {chh} px is not a circle's"
    );
    let (cx, cy) = ((x0 + x1) / 2, (y0 + y1) / 2);
    let (r, g, b) = px(cx, cy);
    assert!(
        r.max(g).max(b) - r.min(g).min(b) < 30,
        "the middle of the ring is not background"
    );
}
