//! Attribute values: lengths in user units, style properties, transforms and the viewBox map.
//!
//! - Lengths (SVG 1.1 Second Edition §7.10 "Units"): a user unit is one px; 1 in = `px_per_inch`
//!   px (CSS says 96, SVG 1.1 §7.10 assumed 90), 1 cm = 1/2.54 in, 1 mm = 1/25.4 in,
//!   1 pt = 1/72 in, 1 pc = 1/6 in; `em` is taken as 16 px (the CSS initial font size, `medium`)
//!   and `ex` as half of that, since this reader does not resolve fonts; a percentage is of the
//!   viewport width (x), height (y) or √((w² + h²)/2) (other lengths).
//! - Properties (§6.4 presentation attributes, §6.5 the `style` attribute): a declaration in
//!   `style` wins over the attribute of the same name; style sheets are not applied.
//! - viewBox and preserveAspectRatio (§7.7, §7.8): scale the viewBox to the viewport, uniformly
//!   (`meet` takes the smaller factor, `slice` the larger) unless `none`, then align.

use kurbo::{Affine, Vec2};
use roxmltree::Node;
use svgtypes::{Align, AspectRatio, Length, LengthUnit, ViewBox};

/// What a percentage is measured against.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(super) enum Axis {
    X,
    Y,
    Other,
}

/// The size of the nearest viewport in user units, for percentages; `None` when the document
/// gives no size at all.
pub(super) type Viewport = Option<(f64, f64)>;

/// A length in user units (px).
pub(super) fn to_user(l: Length, axis: Axis, vp: Viewport, ppi: f64) -> Result<f64, String> {
    let n = l.number;
    let v = match l.unit {
        LengthUnit::None | LengthUnit::Px => n,
        LengthUnit::In => n * ppi,
        LengthUnit::Cm => n * ppi / 2.54,
        LengthUnit::Mm => n * ppi / 25.4,
        LengthUnit::Pt => n * ppi / 72.0,
        LengthUnit::Pc => n * ppi / 6.0,
        LengthUnit::Em => n * 16.0,
        LengthUnit::Ex => n * 8.0,
        LengthUnit::Percent => {
            let (w, h) = vp.ok_or_else(|| {
                "a percentage length, but the document gives no viewport size (no width, height or viewBox on the root svg)".to_string()
            })?;
            let base = match axis {
                Axis::X => w,
                Axis::Y => h,
                Axis::Other => ((w * w + h * h) / 2.0).sqrt(),
            };
            n / 100.0 * base
        }
    };
    if v.is_finite() {
        Ok(v)
    } else {
        Err("a length is out of range (infinite or too large)".to_string())
    }
}

/// An attribute parsed as a length, `Ok(None)` when absent.
pub(super) fn length_attr(node: Node, name: &str) -> Result<Option<Length>, String> {
    match node.attribute(name) {
        None => Ok(None),
        Some(s) => s
            .parse::<Length>()
            .map(Some)
            .map_err(|e| format!("attribute {name}=\"{s}\" is not a length ({e})")),
    }
}

/// An attribute as a length in user units, `Ok(None)` when absent.
pub(super) fn user_attr(
    node: Node,
    name: &str,
    axis: Axis,
    vp: Viewport,
    ppi: f64,
) -> Result<Option<f64>, String> {
    length_attr(node, name)?
        .map(|l| to_user(l, axis, vp, ppi).map_err(|e| format!("attribute {name}: {e}")))
        .transpose()
}

/// The value of a property: the last declaration in `style`, else the presentation attribute.
pub(super) fn property<'a>(node: Node<'a, '_>, name: &str) -> Option<&'a str> {
    let from_style = node.attribute("style").and_then(|style| {
        style
            .rsplit(';')
            .filter_map(|decl| decl.split_once(':'))
            .find(|(k, _)| k.trim() == name)
            .map(|(_, v)| v.trim().trim_end_matches("!important").trim())
    });
    from_style.or_else(|| node.attribute(name).map(str::trim))
}

/// The `transform` attribute as an affine map (identity when absent).
pub(super) fn transform_attr(node: Node) -> Result<Affine, String> {
    let Some(s) = node.attribute("transform") else {
        return Ok(Affine::IDENTITY);
    };
    let t: svgtypes::Transform = s
        .parse()
        .map_err(|e| format!("attribute transform=\"{s}\" is malformed ({e})"))?;
    let a = Affine::new([t.a, t.b, t.c, t.d, t.e, t.f]);
    if !a.as_coeffs().iter().all(|c| c.is_finite()) {
        return Err(format!("attribute transform=\"{s}\" is out of range"));
    }
    if a.determinant() == 0.0 {
        return Err(format!(
            "attribute transform=\"{s}\" is singular (it flattens everything to a line or a point)"
        ));
    }
    Ok(a)
}

/// The `viewBox` attribute, `Ok(None)` when absent.
pub(super) fn view_box_attr(node: Node) -> Result<Option<ViewBox>, String> {
    match node.attribute("viewBox") {
        None => Ok(None),
        Some(s) => {
            let vb: ViewBox = s
                .parse()
                .map_err(|e| format!("attribute viewBox=\"{s}\" is invalid: {e}"))?;
            if [vb.x, vb.y, vb.w, vb.h].iter().all(|v| v.is_finite()) {
                Ok(Some(vb))
            } else {
                Err(format!("attribute viewBox=\"{s}\" is out of range"))
            }
        }
    }
}

/// The `preserveAspectRatio` attribute (default `xMidYMid meet`).
pub(super) fn aspect_attr(node: Node) -> Result<AspectRatio, String> {
    match node.attribute("preserveAspectRatio") {
        None => Ok(AspectRatio::default()),
        Some(s) => s
            .parse()
            .map_err(|e| format!("attribute preserveAspectRatio=\"{s}\" is invalid ({e})")),
    }
}

/// The map from viewBox coordinates into a viewport of size w × h at the origin (§7.8).
pub(super) fn view_box_transform(vb: ViewBox, par: AspectRatio, w: f64, h: f64) -> Affine {
    let (sx, sy) = (w / vb.w, h / vb.h);
    if par.align == Align::None {
        return Affine::scale_non_uniform(sx, sy) * Affine::translate(Vec2::new(-vb.x, -vb.y));
    }
    let s = if par.slice { sx.max(sy) } else { sx.min(sy) };
    let (fx, fy) = match par.align {
        Align::None | Align::XMinYMin => (0.0, 0.0),
        Align::XMidYMin => (0.5, 0.0),
        Align::XMaxYMin => (1.0, 0.0),
        Align::XMinYMid => (0.0, 0.5),
        Align::XMidYMid => (0.5, 0.5),
        Align::XMaxYMid => (1.0, 0.5),
        Align::XMinYMax => (0.0, 1.0),
        Align::XMidYMax => (0.5, 1.0),
        Align::XMaxYMax => (1.0, 1.0),
    };
    let tx = fx * (w - vb.w * s);
    let ty = fy * (h - vb.h * s);
    Affine::translate(Vec2::new(tx, ty))
        * Affine::scale(s)
        * Affine::translate(Vec2::new(-vb.x, -vb.y))
}

#[cfg(test)]
mod tests {
    use super::*;
    use kurbo::Point;

    // SVG 1.1 §7.8: viewBox 0 0 100 50 into 200 × 200, xMidYMid meet: scale 2, centred
    // vertically, so (0,0) → (0,50) and (100,50) → (200,150). Worked by hand.
    #[test]
    fn meet_centres() {
        let vb = ViewBox::new(0.0, 0.0, 100.0, 50.0);
        let t = view_box_transform(vb, AspectRatio::default(), 200.0, 200.0);
        assert_eq!(t * Point::new(0.0, 0.0), Point::new(0.0, 50.0));
        assert_eq!(t * Point::new(100.0, 50.0), Point::new(200.0, 150.0));
    }

    #[test]
    fn style_wins_over_attribute() {
        let doc = roxmltree::Document::parse(
            r#"<g display="inline" style="fill:red; display : none !important"/>"#,
        )
        .unwrap();
        assert_eq!(property(doc.root_element(), "display"), Some("none"));
        assert_eq!(property(doc.root_element(), "visibility"), None);
    }
}
