//! The verification page: one self-contained HTML file (inline CSS, inline JS, inline SVG; no
//! network, no external files) showing the reference and the candidate overlaid at true scale
//! (the SVG's user unit is the millimetre), wheel zoom and drag pan, every candidate contour
//! coloured by how much of the tolerance it uses, a marker and a label at every pair's worst
//! point, and a sortable table of pairs, missing and extra contours.
//!
//! Drawing is exact where SVG allows it: lines, quadratics and cubics are path commands of
//! their own, circular arcs are `A` commands, and an elliptic conic (weight w < 1) is an `A`
//! command on its ellipse. For a conic in standard form with control points P0, P1, P2 and
//! M = (P0 + P2)/2, the centre is C = (M − w²P1)/(1 − w²), the shoulder S = (M + wP1)/(1 + w) is
//! a point of the ellipse on the diameter through P1, and u = S − C, v = (P2 − P0)/(2√(1 − λ²))
//! with M = C + λu are conjugate semi-diameters (Farin, *Curves and Surfaces for CAGD*, 5th ed.,
//! ch. 13, for the shoulder point and the centre on line MP1; the conjugate pair is derived).
//! The axes are the singular values of [u v], the rotation the direction of the larger one.
//! The arc is less than half the ellipse (its end tangents meet at P1), so large-arc is 0. A
//! parabola (w = 1) is a quadratic Bézier exactly; a hyperbolic conic (w > 1), which SVG cannot
//! draw, is shown as 64 chords (display only; every number on the page comes from `measure`).
//!
//! Colour: the share of the tolerance used runs from blue (0) to orange (100 %) through a light
//! middle, a hand-picked ramp whose ends differ along the blue–yellow axis that red–green colour
//! vision deficiencies keep. Nothing relies on colour alone: contours over the tolerance are
//! also dashed and drawn in a dark wine colour, missing reference contours are thick black
//! dashes, extra candidate contours thick dots, and the table gives every number.

use std::fmt::Write;

use kurbo::{ParamCurve, Point, Rect};

use crate::geom::{Conic, Contour, Outline, Segment};
use crate::verify::VerifyReport;

/// Colour stops of the tolerance ramp: (share of tolerance, sRGB).
const RAMP: [(f64, [u8; 3]); 4] = [
    (0.0, [0x2b, 0x5f, 0xa8]),
    (0.4, [0x6f, 0xa3, 0xd2]),
    (0.7, [0xf0, 0xa0, 0x4b]),
    (1.0, [0xd4, 0x58, 0x0c]),
];
const OVER: &str = "#7a0f3f";
const REFERENCE: &str = "#8c8c8c";
const MISSING: &str = "#111111";

/// The ramp colour for a share `used` of the tolerance (clamped to [0, 1]).
pub fn ramp_colour(used: f64) -> String {
    let u = if used.is_nan() {
        1.0
    } else {
        used.clamp(0.0, 1.0)
    };
    let k = RAMP
        .windows(2)
        .position(|w| u <= w[1].0)
        .unwrap_or(RAMP.len() - 2);
    let ((a, ca), (b, cb)) = (RAMP[k], RAMP[k + 1]);
    let f = (u - a) / (b - a);
    let mix = |i: usize| (ca[i] as f64 + f * (cb[i] as f64 - ca[i] as f64)).round() as u8;
    format!("#{:02x}{:02x}{:02x}", mix(0), mix(1), mix(2))
}

/// Escape text for HTML / XML content and attribute values.
fn esc(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            _ => out.push(c),
        }
    }
    out
}

fn num(x: f64) -> String {
    let s = format!("{x:.5}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" || s.is_empty() {
        "0".into()
    } else {
        s.into()
    }
}

fn pt(p: Point) -> String {
    format!("{} {}", num(p.x), num(p.y))
}

/// SVG path data for one conic (see the module doc for the ellipse).
fn conic_d(c: &Conic, d: &mut String) {
    let [p0, p1, p2] = c.points();
    let w = c.weight();
    if (w - 1.0).abs() < 1e-12 {
        let _ = write!(d, " Q{} {}", pt(p1), pt(p2));
        return;
    }
    if w < 1.0 {
        let m = p0.midpoint(p2).to_vec2();
        let w2 = w * w;
        let centre = (m - w2 * p1.to_vec2()) / (1.0 - w2);
        let shoulder = (m + w * p1.to_vec2()) / (1.0 + w);
        let u = shoulder - centre;
        let lambda = (m - centre).dot(u) / u.hypot2();
        let h = 0.5 * (p2 - p0);
        if u.hypot2() > 0.0 && lambda.is_finite() && lambda.abs() < 1.0 {
            let v = h / (1.0 - lambda * lambda).sqrt();
            let (e00, e11) = (u.x * u.x + v.x * v.x, u.y * u.y + v.y * v.y);
            let e01 = u.x * u.y + v.x * v.y;
            let mean = 0.5 * (e00 + e11);
            let r = (0.25 * (e00 - e11).powi(2) + e01 * e01).sqrt();
            let (rx, ry) = ((mean + r).sqrt(), (mean - r).max(0.0).sqrt());
            let phi = 0.5 * (2.0 * e01).atan2(e00 - e11);
            let sweep = u8::from((p1 - p0).cross(p2 - p1) > 0.0);
            if rx.is_finite() && ry > 0.0 {
                let _ = write!(
                    d,
                    " A{} {} {} 0 {sweep} {}",
                    num(rx),
                    num(ry),
                    num(phi.to_degrees()),
                    pt(p2)
                );
                return;
            }
        }
    }
    for i in 1..=64 {
        let _ = write!(d, " L{}", pt(c.eval(i as f64 / 64.0)));
    }
}

/// SVG path data for a contour, exact where SVG allows (module doc).
fn contour_d(c: &Contour) -> String {
    let mut d = String::new();
    let Some(start) = c.start() else {
        return d;
    };
    let _ = write!(d, "M{}", pt(start));
    for s in &c.segments {
        match s {
            Segment::Line(l) => {
                let _ = write!(d, " L{}", pt(l.p1));
            }
            Segment::Quad(q) => {
                let _ = write!(d, " Q{} {}", pt(q.p1), pt(q.p2));
            }
            Segment::Cubic(b) => {
                let _ = write!(d, " C{} {} {}", pt(b.p1), pt(b.p2), pt(b.p3));
            }
            Segment::Conic(k) => conic_d(k, &mut d),
            Segment::Arc(a) => {
                // The writers' pieces of at most 90°, so the large-arc flag is always 0 and a
                // full circle (equal end points, which SVG would omit) still draws.
                let sweep = u8::from(a.sweep > 0.0);
                for piece in super::arc_pieces(a) {
                    let _ = write!(
                        d,
                        " A{r} {r} 0 0 {sweep} {}",
                        pt(piece.eval(1.0)),
                        r = num(a.radius)
                    );
                }
            }
        }
    }
    if c.closed {
        d.push_str(" Z");
    }
    d
}

/// How strokes and markers are sized.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Strokes {
    /// For a browser: strokes in screen pixels at any zoom (`vector-effect`), markers resized
    /// by the page's script.
    Screen,
    /// For a raster image of this many pixels per mm: every width in mm.
    Raster { px_per_mm: f64 },
}

/// The area to show: both outlines (the candidate moved) with a margin.
fn view_box(reference: &Outline, candidate: &Outline, report: &VerifyReport) -> Rect {
    let moved = kurbo::Vec2::new(report.moved_mm[0], report.moved_mm[1]);
    let r = reference.bounding_box();
    let c = candidate.bounding_box().map(|b| b + moved);
    let b = match (r, c) {
        (Some(r), Some(c)) => r.union(c),
        (Some(b), None) | (None, Some(b)) => b,
        (None, None) => Rect::new(0.0, 0.0, 10.0, 10.0),
    };
    let margin = (0.05 * b.width().max(b.height())).max(1.0);
    b.inflate(margin, margin)
}

/// The overlay alone, as a standalone SVG document in mm (width and height in mm, so it
/// prints at true scale).
pub fn overlay_svg(
    reference: &Outline,
    candidate: &Outline,
    report: &VerifyReport,
    strokes: Strokes,
) -> String {
    let vb = view_box(reference, candidate, report);
    // One screen pixel in mm at the initial view (the page rescales markers on zoom).
    let px = match strokes {
        Strokes::Screen => vb.width().max(vb.height()) / 900.0,
        Strokes::Raster { px_per_mm } => 1.0 / px_per_mm,
    };
    let (unit, ve) = match strokes {
        Strokes::Screen => (1.0, " vector-effect=\"non-scaling-stroke\""),
        Strokes::Raster { .. } => (px, ""),
    };
    let tol = report.tolerance_mm;
    let mut s = String::new();
    let _ = write!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" id=\"overlay\" width=\"{w}mm\" height=\"{h}mm\" viewBox=\"{} {} {w} {h}\">",
        num(vb.x0),
        num(vb.y0),
        w = num(vb.width()),
        h = num(vb.height()),
    );
    let _ = write!(
        s,
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>",
        num(vb.x0),
        num(vb.y0),
        num(vb.width()),
        num(vb.height())
    );
    let missing: std::collections::HashSet<usize> =
        report.missing_indices.iter().copied().collect();
    let _ = write!(
        s,
        "<g id=\"reference\" fill=\"none\" stroke=\"{REFERENCE}\" stroke-width=\"{}\" stroke-linejoin=\"round\">",
        num(unit)
    );
    for (i, c) in reference.contours.iter().enumerate() {
        let extra_attrs = if missing.contains(&i) {
            format!(
                " class=\"missing\" stroke=\"{MISSING}\" stroke-width=\"{}\" stroke-dasharray=\"{} {}\"",
                num(2.5 * unit),
                num(8.0 * unit),
                num(4.0 * unit)
            )
        } else {
            String::new()
        };
        let _ = write!(
            s,
            "<path d=\"{}\"{ve}{extra_attrs}><title>reference: {}</title></path>",
            contour_d(c),
            esc(&c.source.to_string())
        );
    }
    s.push_str("</g>");
    let _ = write!(
        s,
        "<g id=\"candidate\" fill=\"none\" stroke-linejoin=\"round\" stroke-linecap=\"round\" transform=\"translate({} {})\">",
        num(report.moved_mm[0]),
        num(report.moved_mm[1])
    );
    let mut style: Vec<Option<(String, bool)>> = vec![None; candidate.contours.len()];
    for p in &report.pairs {
        if let Some(slot) = style.get_mut(p.candidate_index) {
            let used = p.used(tol);
            *slot = Some((
                if p.within_tolerance {
                    ramp_colour(used)
                } else {
                    OVER.to_string()
                },
                !p.within_tolerance,
            ));
        }
    }
    for (j, c) in candidate.contours.iter().enumerate() {
        let attrs = match &style[j] {
            Some((colour, false)) => {
                format!("stroke=\"{colour}\" stroke-width=\"{}\"", num(1.5 * unit))
            }
            Some((colour, true)) => format!(
                "class=\"over\" stroke=\"{colour}\" stroke-width=\"{}\" stroke-dasharray=\"{} {}\"",
                num(2.0 * unit),
                num(6.0 * unit),
                num(3.0 * unit)
            ),
            None => format!(
                "class=\"extra\" stroke=\"{OVER}\" stroke-width=\"{}\" stroke-dasharray=\"0 {}\"",
                num(3.0 * unit),
                num(5.0 * unit)
            ),
        };
        let _ = write!(
            s,
            "<path d=\"{}\" {attrs}{ve}><title>candidate: {}</title></path>",
            contour_d(c),
            esc(&c.source.to_string())
        );
    }
    s.push_str("</g>");
    let _ = write!(
        s,
        "<g id=\"markers\" fill=\"none\" stroke=\"#000000\" stroke-width=\"{}\" font-family=\"sans-serif\">",
        num(unit)
    );
    for (n, p) in report.pairs.iter().enumerate() {
        let (x, y) = (num(p.at[0]), num(p.at[1]));
        let _ = write!(
            s,
            "<circle class=\"mk\" cx=\"{x}\" cy=\"{y}\" r=\"{}\"{ve}/><text class=\"lb\" x=\"{x}\" y=\"{y}\" dx=\"{d}\" dy=\"-{d}\" font-size=\"{}\" fill=\"#000000\" stroke=\"#ffffff\" stroke-width=\"{}\" paint-order=\"stroke\"{ve}>{} · {} mm</text>",
            num(5.0 * px),
            num(11.0 * px),
            num(3.0 * unit),
            n + 1,
            num(p.hausdorff_mm),
            d = num(7.0 * px),
        );
    }
    s.push_str("</g></svg>");
    s
}

const CSS: &str = r#"
body{font:14px/1.4 system-ui,sans-serif;margin:0;color:#1a1a1a;background:#f4f4f2}
header{padding:12px 18px;background:#fff;border-bottom:1px solid #ccc}
h1{font-size:18px;margin:0 0 4px}
.pass{color:#1d5e20;font-weight:700}.fail{color:#9c1030;font-weight:700}
#stage{position:relative;height:68vh;background:#fff;border-bottom:1px solid #ccc;overflow:hidden;cursor:grab;touch-action:none}
#stage svg{width:100%;height:100%;display:block}
#stage.dragging{cursor:grabbing}
.tools{padding:8px 18px;display:flex;gap:14px;align-items:center;flex-wrap:wrap}
.tools button{font:inherit;padding:2px 10px}
.legend{display:flex;align-items:center;gap:8px}
.ramp{width:220px;height:12px;border:1px solid #666}
.key{display:inline-block;width:34px;height:0;vertical-align:middle;margin-right:4px}
table{border-collapse:collapse;margin:8px 18px 30px;background:#fff}
th,td{border:1px solid #ccc;padding:3px 8px;text-align:left}
th{cursor:pointer;background:#e8e8e4;user-select:none}
th.asc::after{content:" \25B2"}th.desc::after{content:" \25BC"}
td.n{text-align:right;font-variant-numeric:tabular-nums}
tr.over td,tr.missing td,tr.extra td{font-weight:600}
tbody tr{cursor:pointer}tbody tr:hover{background:#eef3fa}
.hide-labels .lb{display:none}
"#;

const JS: &str = r#"
(function(){
var stage=document.getElementById('stage'),svg=document.getElementById('overlay');
var b=svg.viewBox.baseVal,home=[b.x,b.y,b.width,b.height],v=home.slice();
var PX_PER_MM=96/25.4,zoomOut=document.getElementById('zoom');
function scale(){var r=svg.getBoundingClientRect();return Math.min(r.width/v[2],r.height/v[3]);}
function apply(){svg.setAttribute('viewBox',v.join(' '));var s=scale(),k=1/s;
 svg.querySelectorAll('.mk').forEach(function(c){c.setAttribute('r',5*k);});
 svg.querySelectorAll('.lb').forEach(function(t){t.setAttribute('font-size',11*k);t.setAttribute('dx',7*k);t.setAttribute('dy',-7*k);});
 zoomOut.textContent=(100*s/PX_PER_MM).toPrecision(3)+' % of true size';}
function toUser(cx,cy){var r=svg.getBoundingClientRect(),s=scale();
 var ox=(r.width-v[2]*s)/2,oy=(r.height-v[3]*s)/2;return [v[0]+(cx-r.left-ox)/s,v[1]+(cy-r.top-oy)/s];}
function centreOn(x,y,s){var r=svg.getBoundingClientRect();var w=r.width/s,h=r.height/s;v=[x-w/2,y-h/2,w,h];apply();}
stage.addEventListener('wheel',function(e){e.preventDefault();var f=Math.exp(e.deltaY*0.0015),u=toUser(e.clientX,e.clientY);
 v=[u[0]-(u[0]-v[0])*f,u[1]-(u[1]-v[1])*f,v[2]*f,v[3]*f];apply();},{passive:false});
var drag=null;
stage.addEventListener('pointerdown',function(e){drag=[e.clientX,e.clientY];stage.classList.add('dragging');stage.setPointerCapture(e.pointerId);});
stage.addEventListener('pointermove',function(e){if(!drag)return;var s=scale();v[0]-=(e.clientX-drag[0])/s;v[1]-=(e.clientY-drag[1])/s;drag=[e.clientX,e.clientY];apply();});
function end(){drag=null;stage.classList.remove('dragging');}
stage.addEventListener('pointerup',end);stage.addEventListener('pointercancel',end);
document.getElementById('fit').onclick=function(){v=home.slice();apply();};
document.getElementById('true').onclick=function(){centreOn(v[0]+v[2]/2,v[1]+v[3]/2,PX_PER_MM);};
document.getElementById('labels').onchange=function(e){svg.classList.toggle('hide-labels',!e.target.checked);};
var tol=parseFloat(document.body.getAttribute('data-tol'));
document.querySelectorAll('tbody tr').forEach(function(tr){tr.onclick=function(){
 centreOn(parseFloat(tr.getAttribute('data-x')),parseFloat(tr.getAttribute('data-y')),40/tol);};});
document.querySelectorAll('th').forEach(function(th,i){th.onclick=function(){
 var tb=th.closest('table').tBodies[0],rows=Array.prototype.slice.call(tb.rows),asc=!th.classList.contains('asc');
 th.parentNode.querySelectorAll('th').forEach(function(h){h.classList.remove('asc','desc');});th.classList.add(asc?'asc':'desc');
 var num=th.hasAttribute('data-num');
 rows.sort(function(a,b){var x=a.cells[i].getAttribute('data-k'),y=b.cells[i].getAttribute('data-k');
  if(num){x=x===''?Infinity:parseFloat(x);y=y===''?Infinity:parseFloat(y);if(x===y)return 0;if(!asc){if(x===Infinity)return 1;if(y===Infinity)return -1;}return asc?(x<y?-1:1):(x<y?1:-1);}
  return asc?x.localeCompare(y):y.localeCompare(x);});
 rows.forEach(function(r){tb.appendChild(r);});};});
window.addEventListener('resize',apply);apply();
})();
"#;

/// One table row. `cells` are (sort key, shown text) pairs.
fn row(out: &mut String, class: &str, at: [f64; 2], cells: &[(String, String)]) {
    let _ = write!(
        out,
        "<tr class=\"{class}\" data-x=\"{}\" data-y=\"{}\">",
        num(at[0]),
        num(at[1])
    );
    for (i, (k, text)) in cells.iter().enumerate() {
        let cls = if [0, 4, 5, 6, 7].contains(&i) {
            " class=\"n\""
        } else {
            ""
        };
        let _ = write!(out, "<td{cls} data-k=\"{}\">{}</td>", esc(k), esc(text));
    }
    out.push_str("</tr>");
}

fn centre_of(c: Option<&Contour>, moved: [f64; 2]) -> [f64; 2] {
    c.and_then(|c| c.bounding_box())
        .map(|b| [b.center().x + moved[0], b.center().y + moved[1]])
        .unwrap_or([0.0, 0.0])
}

/// The verification page (module doc).
pub fn verify_html(reference: &Outline, candidate: &Outline, report: &VerifyReport) -> String {
    let tol = report.tolerance_mm;
    let mut h = String::new();
    h.push_str("<!DOCTYPE html><html lang=\"en\"><head><meta charset=\"utf-8\">");
    h.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">");
    h.push_str("<title>ratline verify</title><style>");
    h.push_str(CSS);
    h.push_str("</style></head>");
    let _ = write!(h, "<body data-tol=\"{}\"><header>", num(tol));
    let verdict = if report.within_tolerance {
        "<span class=\"pass\">PASS</span> within tolerance".to_string()
    } else {
        "<span class=\"fail\">FAIL</span> not within tolerance".to_string()
    };
    let _ = write!(
        h,
        "<h1>ratline verify: {verdict}</h1><div>Tolerance {} mm · certified Hausdorff distance {} mm · {} pairs ({} over tolerance) · {} missing · {} extra · {} reference / {} candidate contours</div>",
        num(tol),
        num(report.hausdorff_mm),
        report.pairs.len(),
        report.pairs_over(),
        report.missing.len(),
        report.extra.len(),
        report.reference_contours,
        report.candidate_contours
    );
    let _ = write!(
        h,
        "<div>Alignment: {} · candidate moved by ({}, {}) mm</div>",
        report.align.name(),
        num(report.moved_mm[0]),
        num(report.moved_mm[1])
    );
    for (side, skipped) in [
        ("reference", &report.reference_skipped),
        ("candidate", &report.candidate_skipped),
    ] {
        if !skipped.is_empty() {
            let _ = write!(
                h,
                "<details><summary>{} not read from the {side}</summary><ul>",
                skipped.len()
            );
            for s in skipped {
                let _ = write!(
                    h,
                    "<li>{}: {}</li>",
                    esc(&s.source.to_string()),
                    esc(&s.reason)
                );
            }
            h.push_str("</ul></details>");
        }
    }
    h.push_str("</header><div id=\"stage\">");
    h.push_str(&overlay_svg(reference, candidate, report, Strokes::Screen));
    h.push_str("</div><div class=\"tools\"><button id=\"fit\">fit</button><button id=\"true\">true size</button><span id=\"zoom\"></span>");
    h.push_str("<label><input type=\"checkbox\" id=\"labels\" checked> labels</label>");
    let stops: Vec<String> = RAMP
        .iter()
        .map(|(u, _)| format!("{} {}%", ramp_colour(*u), num(100.0 * u)))
        .collect();
    let _ = write!(
        h,
        "<span class=\"legend\">share of tolerance used: 0 % <span class=\"ramp\" style=\"background:linear-gradient(to right,{})\"></span> 100 %</span>",
        stops.join(",")
    );
    let _ = write!(
        h,
        "<span><span class=\"key\" style=\"border-top:2px dashed {OVER}\"></span>over tolerance</span><span><span class=\"key\" style=\"border-top:3px dashed {MISSING}\"></span>missing</span><span><span class=\"key\" style=\"border-top:3px dotted {OVER}\"></span>extra</span><span><span class=\"key\" style=\"border-top:1px solid {REFERENCE}\"></span>reference</span>"
    );
    h.push_str("<span>Wheel: zoom · drag: pan · click a row: go to it</span></div>");
    h.push_str("<table id=\"pairs\"><thead><tr><th data-num>#</th><th>status</th><th>reference</th><th>candidate</th><th data-num>Hausdorff (mm)</th><th data-num>share of tolerance</th><th data-num>x (mm)</th><th data-num>y (mm)</th></tr></thead><tbody>");
    for (n, p) in report.pairs.iter().enumerate() {
        let status = if p.within_tolerance { "ok" } else { "over" };
        row(
            &mut h,
            status,
            p.at,
            &[
                ((n + 1).to_string(), (n + 1).to_string()),
                (status.into(), status.into()),
                (p.reference.to_string(), p.reference.to_string()),
                (p.candidate.to_string(), p.candidate.to_string()),
                (p.hausdorff_mm.to_string(), format!("{:.5}", p.hausdorff_mm)),
                (
                    p.used(tol).to_string(),
                    format!("{:.1} %", 100.0 * p.used(tol)),
                ),
                (p.at[0].to_string(), format!("{:.3}", p.at[0])),
                (p.at[1].to_string(), format!("{:.3}", p.at[1])),
            ],
        );
    }
    let mut n = report.pairs.len();
    let lists = [
        (
            "missing",
            &report.missing,
            &report.missing_indices,
            reference,
            [0.0, 0.0],
        ),
        (
            "extra",
            &report.extra,
            &report.extra_indices,
            candidate,
            report.moved_mm,
        ),
    ];
    for (status, sources, indices, outline, moved) in lists {
        for (s, &i) in sources.iter().zip(indices.iter()) {
            n += 1;
            let at = centre_of(outline.contours.get(i), moved);
            let (r, c) = if status == "missing" {
                (s.to_string(), String::new())
            } else {
                (String::new(), s.to_string())
            };
            let blank = (String::new(), String::new());
            row(
                &mut h,
                status,
                at,
                &[
                    (n.to_string(), n.to_string()),
                    (status.into(), status.into()),
                    (r.clone(), r),
                    (c.clone(), c),
                    blank.clone(),
                    blank,
                    (at[0].to_string(), format!("{:.3}", at[0])),
                    (at[1].to_string(), format!("{:.3}", at[1])),
                ],
            );
        }
    }
    h.push_str("</tbody></table><script>");
    h.push_str(JS);
    h.push_str("</script></body></html>\n");
    h
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::{svg_arc_to_center, CircularArc, SvgArcParams, SvgArcShape};
    use crate::measure;

    /// Parse the `A` command written by `conic_d` back through the SVG 1.1 implementation
    /// notes' end-point to centre conversion (Appendix F.6.5, implemented in `geom`) and
    /// compare the resulting arc with the conic: the two must be the same curve.
    fn round_trip(c: Conic) -> f64 {
        let mut d = String::new();
        conic_d(&c, &mut d);
        let v: Vec<&str> = d.trim_start_matches(" A").split(' ').collect();
        assert_eq!(v.len(), 7, "{d}");
        let f = |i: usize| v[i].parse::<f64>().unwrap();
        let params = SvgArcParams {
            from: c.points()[0],
            rx: f(0),
            ry: f(1),
            x_rotation_deg: f(2),
            large_arc: v[3] == "1",
            sweep: v[4] == "1",
            to: Point::new(f(5), f(6)),
        };
        let SvgArcShape::Arc(e) = svg_arc_to_center(&params) else {
            panic!("not an arc: {d}");
        };
        let segs: Vec<Segment> = e.to_conics().into_iter().map(Segment::Conic).collect();
        measure::hausdorff(&[Segment::Conic(c)], &segs, 1e-7).bound
    }

    #[test]
    fn elliptic_conics_draw_as_their_ellipse() {
        // Quarter of the unit circle (NURBS Book §7.3: w = cos 45°), then general ellipses.
        let q = Conic::new(
            Point::new(1.0, 0.0),
            Point::new(1.0, 1.0),
            std::f64::consts::FRAC_1_SQRT_2,
            Point::new(0.0, 1.0),
        )
        .unwrap();
        assert!(round_trip(q) < 1e-5);
        for (p1, w) in [((4.0, 7.0), 0.3), ((-2.0, 5.0), 0.8), ((6.0, -1.0), 0.55)] {
            let c = Conic::new(Point::new(0.0, 0.0), p1.into(), w, Point::new(9.0, 2.0)).unwrap();
            let d = round_trip(c);
            // 5 decimals in the path data: about 1e-5 mm of rounding.
            assert!(d < 1e-4, "{p1:?} w={w}: {d}");
        }
    }

    #[test]
    fn full_circle_arc_is_drawn() {
        // SVG 1.1 Appendix F.6.2: an arc whose end points are equal is omitted, so a full
        // circle must be written as several arcs (four of at most 90° here).
        let c = Contour::new(
            vec![Segment::Arc(CircularArc {
                center: Point::new(5.0, 5.0),
                radius: 2.0,
                start_angle: 0.0,
                sweep: std::f64::consts::TAU,
            })],
            true,
            Default::default(),
        );
        let d = contour_d(&c);
        assert_eq!(d.matches(" A").count(), 4, "{d}");
    }
}
