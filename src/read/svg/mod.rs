//! The SVG reader: SVG artwork into an exact `Outline` in millimetres, y pointing down.
//!
//! Geometry is parsed here, never through a renderer's tree, so that every arc stays exact:
//! path `A` commands, circles, ellipses and rounded-rectangle corners become conics
//! (rational quadratic Béziers), and transforms are applied to control points
//! (`Contour::transformed`), which maps conics to conics exactly.
//!
//! Rules and their sources (SVG 1.1 Second Edition unless stated):
//! - Document: the root must be `svg` (§5.1.2). Nesting: `g` (§5.2), `a` (§17.1), `svg` with
//!   its own viewport from x, y, width, height, viewBox and preserveAspectRatio (§5.1.2, §7.7,
//!   §7.8; nothing is clipped to it), `switch` (§5.8: the first child is drawn, conditional
//!   attributes are not evaluated), `use` (§5.6: `href` or `xlink:href` to `#id`, translated by
//!   x, y after its transform; a `symbol` (§5.5) or `svg` target gets the use's width and
//!   height as its viewport). `defs` (§5.3), `symbol`, `clipPath` (§14.3.5), `mask` (§14.4),
//!   `pattern` (§13.3) and `marker` (§11.6.2) draw nothing by themselves; what they hold is
//!   listed in `skipped` unless a `use` drew it.
//! - Transforms (§7.4-§7.6): composed from the root down, applied once to each contour.
//! - Units (§7.10): root width and height in mm, cm, in, pt, pc or px at `px_per_inch`
//!   (default 96, CSS; older files assumed 90, §7.10); a percentage is of the viewBox; with
//!   no width and height a user unit is one px. See `attrs` for lengths.
//! - Path data (§8.3) in `path`; basic shapes (ch. 9) in `shapes`; arcs by Appendix F.6
//!   (`svg_arc_to_center`).
//! - Styles (§6.4, §6.5): `display: none` skips an element and all inside it; `visibility`
//!   (`hidden`, `collapse`) is inherited and can be overridden below; only presentation
//!   attributes and `style` attributes are read: a `<style>` sheet is reported as a warning.
//!   Paint is ignored: every drawn shape is an outline to cut.
//! - `text` is not converted (fonts are not resolved here) and is listed in `skipped`; so are
//!   images, foreign objects and unknown SVG elements. Elements in other namespaces (editor
//!   metadata) and non-graphic SVG elements (gradients, filters, title, desc, metadata,
//!   animation) are ignored.
//! - Errors: malformed XML, a non-SVG root, a `use` cycle and the limits below are
//!   `InputError`s for the whole file. An element with malformed attributes or path data (or a
//!   number out of range) is refused whole, listed in `skipped` with the reason, and the rest of
//!   the file still converts: no subpath of a path whose data is bad is kept. A subpath with
//!   nothing to cut (a lone moveto, zero length) is listed in `skipped` too.
//!
//! Every contour carries a `Source`: the file label, the element (`#id`, else tag and
//! document order among elements of that tag, counting from 1, like `path[3]`, followed by
//! `via` and the `use` elements that drew it) and the subpath index (from 0).
//!
//! The whole walk is iterative (an explicit stack), and the raw text is scanned for nesting
//! depth before the XML parser (which recurses per level) sees it (`scan`), so deep nesting
//! cannot overflow the stack.

mod attrs;
mod path;
mod scan;
mod shapes;

use std::collections::HashMap;
use std::rc::Rc;

use kurbo::{Affine, Vec2};
use roxmltree::{Document, Node, NodeId, ParsingOptions};

use self::attrs::{aspect_attr, property, to_user, transform_attr, view_box_attr, Axis, Viewport};
use self::path::{parse_path, Subpath};
use self::shapes::Env;
use crate::geom::{Contour, Outline, Skipped, Source, MM_PER_IN};
use crate::InputError;

/// The most elements a file may hold, and the most element visits after expanding `use`.
pub const MAX_ELEMENTS: usize = 1_000_000;
/// The deepest element nesting accepted.
pub const MAX_DEPTH: usize = 256;
/// The most `use` elements nested inside one another's targets.
pub const MAX_USE_DEPTH: usize = 32;

const SVG_NS: &str = "http://www.w3.org/2000/svg";
const XLINK_NS: &str = "http://www.w3.org/1999/xlink";

/// Options for reading SVG.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SvgOptions {
    /// Pixels (user units) per inch: 96 by CSS; 90 for files made by older SVG 1.1 tools.
    pub px_per_inch: f64,
}

impl Default for SvgOptions {
    fn default() -> SvgOptions {
        SvgOptions { px_per_inch: 96.0 }
    }
}

/// Reads SVG data into an outline in millimetres, y down. `file_label` names the file in
/// every `Source` and error.
pub fn read_svg(file_label: &str, data: &[u8], opts: &SvgOptions) -> Result<Outline, InputError> {
    let ppi = opts.px_per_inch;
    if !(ppi.is_finite() && ppi > 0.0) {
        return Err(InputError::new(
            file_label,
            format!("px per inch must be a positive number, got {ppi}"),
        ));
    }
    let text = decode(file_label, data)?;
    scan::check_nesting(file_label, text)?;
    let parse_opts = ParsingOptions {
        allow_dtd: true,
        nodes_limit: (3 * MAX_ELEMENTS) as u32,
    };
    let doc =
        Document::parse_with_options(text, parse_opts).map_err(|e| xml_error(file_label, e))?;
    let root = doc.root_element();
    if root.tag_name().name() != "svg" || !is_svg(root) {
        return Err(InputError::at(
            file_label,
            place(&doc, root),
            format!(
                "not an SVG file: the root element is <{}>, not <svg> in the SVG namespace",
                root.tag_name().name()
            ),
        ));
    }
    let mut reader = Reader::new(file_label, ppi, &doc)?;
    reader.run(root)?;
    reader.report_unreached();
    Ok(reader.out)
}

/// The input as text, or an error saying what it looks like instead.
fn decode<'a>(file: &str, data: &'a [u8]) -> Result<&'a str, InputError> {
    let bad = |what: &str| InputError::new(file, format!("not an SVG file: {what}"));
    if data.iter().all(|b| b.is_ascii_whitespace()) {
        return Err(bad("the file is empty"));
    }
    if data.starts_with(b"\x89PNG") {
        return Err(bad("it is a PNG image"));
    }
    if data.starts_with(&[0x1f, 0x8b]) {
        return Err(bad(
            "it is gzip-compressed (an .svgz?): decompress it first",
        ));
    }
    let data = data.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(data);
    std::str::from_utf8(data).map_err(|e| {
        bad(&format!(
            "it is not UTF-8 text (invalid byte at offset {})",
            e.valid_up_to()
        ))
    })
}

fn xml_error(file: &str, e: roxmltree::Error) -> InputError {
    let pos = e.pos();
    let message = match e {
        roxmltree::Error::NodesLimitReached => format!(
            "more than {} XML nodes: over the limit of {MAX_ELEMENTS} elements",
            3 * MAX_ELEMENTS
        ),
        roxmltree::Error::EntityReferenceLoop(_) => {
            format!("malformed XML: {e} (entities nested too deep or expanding too much: refused)")
        }
        e => format!("malformed XML: {e}"),
    };
    InputError::at(
        file,
        format!("line {}, column {}", pos.row, pos.col),
        message,
    )
}

fn is_svg(node: Node) -> bool {
    matches!(node.tag_name().namespace(), Some(SVG_NS) | None)
}

fn place(doc: &Document, node: Node) -> String {
    let p = doc.text_pos_at(node.range().start);
    format!("line {}, column {}", p.row, p.col)
}

/// Tags whose presence is no loss: they draw nothing (§5, §13, §15, §19, and descriptive
/// elements).
const IGNORED: &[&str] = &[
    "title",
    "desc",
    "metadata",
    "style",
    "script",
    "linearGradient",
    "radialGradient",
    "stop",
    "filter",
    "font",
    "font-face",
    "glyph",
    "missing-glyph",
    "hkern",
    "vkern",
    "cursor",
    "view",
    "animate",
    "set",
    "animateMotion",
    "animateColor",
    "animateTransform",
    "mpath",
    "color-profile",
    "altGlyphDef",
    "solidcolor",
    "defs",
    "symbol",
];

/// Containers whose content is never artwork by itself.
const NON_RENDERING: &[&str] = &["clipPath", "mask", "pattern", "marker", "defs", "symbol"];

/// Elements whose loss the final pass reports when nothing drew them.
const DRAWABLE: &[&str] = &[
    "path", "rect", "circle", "ellipse", "line", "polyline", "polygon", "text", "use", "image",
];

const TEXT_REASON: &str =
    "text is not converted: convert text to outlines in the drawing program, or use --font/--text";

/// The chain of `use` elements that led to an instance.
struct Via {
    node: NodeId,
    label: String,
    depth: usize,
    parent: Option<Rc<Via>>,
}

/// One element to visit, with everything it inherits.
struct Frame<'a, 'i> {
    node: Node<'a, 'i>,
    /// Parent user space to millimetres.
    ctm: Affine,
    viewport: Viewport,
    visible: bool,
    via: Option<Rc<Via>>,
    /// Width and height from a `use` that references an `svg` or `symbol`.
    use_size: (Option<f64>, Option<f64>),
}

struct Reader<'a, 'i> {
    file: &'a str,
    ppi: f64,
    doc: &'a Document<'i>,
    /// Per node: its order among elements of the same tag, from 1.
    ords: Vec<u32>,
    ids: HashMap<&'a str, Node<'a, 'i>>,
    /// Per node: whether the walk reached it (drew it or listed it).
    reached: Vec<bool>,
    visits: usize,
    out: Outline,
}

impl<'a, 'i> Reader<'a, 'i> {
    fn new(file: &'a str, ppi: f64, doc: &'a Document<'i>) -> Result<Reader<'a, 'i>, InputError> {
        let n = doc
            .descendants()
            .map(|d| d.id().get_usize())
            .max()
            .unwrap_or(0)
            + 1;
        let mut ords = vec![0u32; n];
        let mut depth = vec![0usize; n];
        let mut per_tag: HashMap<&str, u32> = HashMap::new();
        let mut ids = HashMap::new();
        let mut elements = 0usize;
        let mut style_sheets = Vec::new();
        for node in doc.descendants().filter(|d| d.is_element()) {
            elements += 1;
            if elements > MAX_ELEMENTS {
                return Err(InputError::at(
                    file,
                    place(doc, node),
                    format!("more than {MAX_ELEMENTS} elements: over the limit"),
                ));
            }
            let i = node.id().get_usize();
            let d = node.parent().map_or(0, |p| depth[p.id().get_usize()]) + 1;
            if d > MAX_DEPTH {
                return Err(InputError::at(
                    file,
                    place(doc, node),
                    format!("elements nested more than {MAX_DEPTH} deep: over the limit"),
                ));
            }
            depth[i] = d;
            let c = per_tag.entry(node.tag_name().name()).or_insert(0);
            *c += 1;
            ords[i] = *c;
            if let Some(id) = node.attribute("id") {
                ids.entry(id).or_insert(node);
            }
            if node.tag_name().name() == "style" && is_svg(node) {
                style_sheets.push(place(doc, node));
            }
        }
        let mut out = Outline::default();
        for at in style_sheets {
            out.warnings.push(format!(
                "{file}: {at}: a <style> sheet is present; its CSS rules were not applied (only presentation attributes and style=\"...\" attributes are read), so display and visibility set by class may differ"
            ));
        }
        Ok(Reader {
            file,
            ppi,
            doc,
            ords,
            ids,
            reached: vec![false; n],
            visits: 0,
            out,
        })
    }

    fn label(&self, node: Node) -> String {
        match node.attribute("id") {
            Some(id) if !id.is_empty() => format!("#{id}"),
            _ => format!(
                "{}[{}]",
                node.tag_name().name(),
                self.ords[node.id().get_usize()]
            ),
        }
    }

    /// The element name used in a `Source`: its label and the `use` chain that drew it.
    fn element_name(&self, node: Node, via: &Option<Rc<Via>>) -> String {
        let mut s = self.label(node);
        let mut v = via.as_deref();
        while let Some(u) = v {
            s.push_str(" via ");
            s.push_str(&u.label);
            v = u.parent.as_deref();
        }
        s
    }

    fn skip(&mut self, element: String, index: usize, reason: impl Into<String>) {
        let source = Source::new(self.file, element, index);
        self.out.skipped.push(Skipped::hidden(source, reason));
    }

    fn skip_invalid(&mut self, element: String, index: usize, reason: impl Into<String>) {
        let source = Source::new(self.file, element, index);
        self.out.skipped.push(Skipped::invalid(source, reason));
    }

    fn error(&self, node: Node, message: String) -> InputError {
        InputError::at(
            self.file,
            format!("{}, {}", self.label(node), place(self.doc, node)),
            message,
        )
    }

    fn run(&mut self, root: Node<'a, 'i>) -> Result<(), InputError> {
        let (ctm, viewport) = self.root_space(root)?;
        self.reached[root.id().get_usize()] = true;
        let mut stack = Vec::new();
        let root_frame = Frame {
            node: root,
            ctm,
            viewport,
            visible: true,
            via: None,
            use_size: (None, None),
        };
        match self.visibility(&root_frame) {
            Some(visible) => {
                let child = Frame {
                    visible,
                    ..root_frame
                };
                push_children(&mut stack, &child, root.children(), child.ctm, viewport);
            }
            None => self.skip(
                self.label(root),
                0,
                "display: none on the root: nothing is drawn",
            ),
        }
        while let Some(frame) = stack.pop() {
            self.visit(frame, &mut stack)?;
        }
        Ok(())
    }

    /// The root's user space in millimetres and its viewport for percentages.
    fn root_space(&self, root: Node) -> Result<(Affine, Viewport), InputError> {
        let err = |m: String| {
            InputError::at(self.file, format!("root svg, {}", place(self.doc, root)), m)
        };
        let vb = view_box_attr(root).map_err(err)?;
        let par = aspect_attr(root).map_err(err)?;
        let px_to_mm = Affine::scale(MM_PER_IN / self.ppi);
        let vb_size = vb.map(|v| (v.w, v.h));
        let side = |name: &str, axis: Axis| -> Result<Option<f64>, InputError> {
            let Some(l) = attrs::length_attr(root, name).map_err(err)? else {
                return Ok(vb_size.map(|(w, h)| if axis == Axis::X { w } else { h }));
            };
            if l.unit == svgtypes::LengthUnit::Percent && vb.is_none() {
                return Ok(None);
            }
            let v = to_user(l, axis, vb_size, self.ppi).map_err(|m| err(format!("{name}: {m}")))?;
            if v <= 0.0 {
                return Err(err(format!("{name} is {v}: the drawing has no size")));
            }
            Ok(Some(v))
        };
        let (w, h) = (side("width", Axis::X)?, side("height", Axis::Y)?);
        let own = transform_attr(root).map_err(err)?;
        Ok(match (vb, w, h) {
            (Some(vb), Some(w), Some(h)) => (
                px_to_mm * own * attrs::view_box_transform(vb, par, w, h),
                Some((vb.w, vb.h)),
            ),
            (_, w, h) => (px_to_mm * own, w.zip(h)),
        })
    }

    /// The inherited visibility after this element, or `None` when `display: none` hides it
    /// (and everything inside).
    fn visibility(&self, f: &Frame) -> Option<bool> {
        if property(f.node, "display") == Some("none") {
            return None;
        }
        Some(match property(f.node, "visibility") {
            Some("hidden") | Some("collapse") => false,
            Some("visible") => true,
            _ => f.visible,
        })
    }

    fn visit(
        &mut self,
        f: Frame<'a, 'i>,
        stack: &mut Vec<Frame<'a, 'i>>,
    ) -> Result<(), InputError> {
        let node = f.node;
        self.visits += 1;
        if self.visits > MAX_ELEMENTS {
            return Err(self.error(
                node,
                format!("more than {MAX_ELEMENTS} elements to draw after expanding <use>: over the limit"),
            ));
        }
        let tag = node.tag_name().name();
        if !is_svg(node) || IGNORED.contains(&tag) {
            return Ok(());
        }
        if NON_RENDERING.contains(&tag) {
            // Their content is reported at the end unless a `use` draws it.
            return Ok(());
        }
        self.reached[node.id().get_usize()] = true;
        let name = self.element_name(node, &f.via);
        let Some(visible) = self.visibility(&f) else {
            self.skip(
                name,
                0,
                "display: none (the element and everything inside it are hidden)",
            );
            return Ok(());
        };
        let own = match transform_attr(node) {
            Ok(t) => t,
            Err(m) => {
                self.skip_invalid(name, 0, format!("element refused: {m}"));
                return Ok(());
            }
        };
        let ctm = f.ctm * own;
        let f = Frame { ctm, visible, ..f };
        match tag {
            "g" | "a" => push_children(stack, &f, node.children(), ctm, f.viewport),
            "switch" => self.switch(&f, stack),
            "svg" => self.nested_svg(&f, &name, stack),
            "use" => self.use_element(&f, &name, stack)?,
            "path" | "rect" | "circle" | "ellipse" | "line" | "polyline" | "polygon" => {
                self.shape(&f, tag, name)
            }
            "text" => self.skip(name, 0, TEXT_REASON),
            "image" => self.skip(name, 0, "a raster image is not an outline"),
            "foreignObject" => self.skip(name, 0, "foreign (non-SVG) content is not an outline"),
            _ => self.skip(
                name,
                0,
                format!("<{tag}> is not a drawing element this reader knows; not drawn"),
            ),
        }
        Ok(())
    }

    fn switch(&mut self, f: &Frame<'a, 'i>, stack: &mut Vec<Frame<'a, 'i>>) {
        let mut kids = f.node.children().filter(|c| c.is_element() && is_svg(*c));
        if let Some(first) = kids.next() {
            push_children(stack, f, std::iter::once(first), f.ctm, f.viewport);
        }
        for other in kids {
            self.reached[other.id().get_usize()] = true;
            let name = self.element_name(other, &f.via);
            self.skip(name, 0, "not drawn: only the first child of <switch> is drawn (conditional attributes are not evaluated)");
        }
    }

    /// A nested `svg` (or a `symbol` drawn by `use`): a new viewport (§7.9).
    fn nested_svg(&mut self, f: &Frame<'a, 'i>, name: &str, stack: &mut Vec<Frame<'a, 'i>>) {
        let node = f.node;
        let env = Env {
            viewport: f.viewport,
            ppi: self.ppi,
        };
        let is_symbol = node.tag_name().name() == "symbol";
        let geometry = || -> Result<Option<(Affine, Viewport)>, String> {
            let at = if is_symbol {
                Vec2::ZERO
            } else {
                shapes::offset(&env, node)?
            };
            let get = |n: &str, axis: Axis, over: Option<f64>| -> Result<f64, String> {
                match over {
                    Some(v) => Ok(v),
                    None => Ok(attrs::user_attr(node, n, axis, f.viewport, self.ppi)?
                        .or_else(|| f.viewport.map(|(w, h)| if axis == Axis::X { w } else { h }))
                        .unwrap_or(0.0)),
                }
            };
            let w = get("width", Axis::X, f.use_size.0)?;
            let h = get("height", Axis::Y, f.use_size.1)?;
            if w < 0.0 || h < 0.0 {
                return Err(format!(
                    "negative width or height ({w} × {h}): an error (§7.9)"
                ));
            }
            let vb = view_box_attr(node)?;
            let par = aspect_attr(node)?;
            if w == 0.0 || h == 0.0 {
                if vb.is_none() && f.viewport.is_none() && f.use_size == (None, None) {
                    // No size anywhere: user units stay as they are.
                    return Ok(Some((f.ctm * Affine::translate(at), None)));
                }
                return Ok(None);
            }
            let shift = Affine::translate(at);
            Ok(Some(match vb {
                Some(vb) => (
                    f.ctm * shift * attrs::view_box_transform(vb, par, w, h),
                    Some((vb.w, vb.h)),
                ),
                None => (f.ctm * shift, Some((w, h))),
            }))
        };
        match geometry() {
            Ok(Some((ctm, viewport))) => push_children(stack, f, node.children(), ctm, viewport),
            Ok(None) => self.skip(
                name.to_string(),
                0,
                "zero width or height, which disables rendering (SVG 1.1 §7.9)",
            ),
            Err(m) => self.skip_invalid(name.to_string(), 0, format!("element refused: {m}")),
        }
    }

    fn use_element(
        &mut self,
        f: &Frame<'a, 'i>,
        name: &str,
        stack: &mut Vec<Frame<'a, 'i>>,
    ) -> Result<(), InputError> {
        let node = f.node;
        let href = node
            .attribute((XLINK_NS, "href"))
            .or_else(|| node.attribute("href"));
        let Some(href) = href.map(str::trim) else {
            self.skip(name.to_string(), 0, "<use> without href: nothing to draw");
            return Ok(());
        };
        let Some(id) = href.strip_prefix('#') else {
            self.skip(
                name.to_string(),
                0,
                format!(
                    "<use> refers to '{href}' outside this file: external references are not read"
                ),
            );
            return Ok(());
        };
        let Some(&target) = self.ids.get(id) else {
            self.skip(
                name.to_string(),
                0,
                format!("<use> refers to #{id}, which does not exist"),
            );
            return Ok(());
        };
        let mut v = f.via.as_deref();
        while let Some(u) = v {
            if u.node == node.id() {
                return Err(self.error(
                    node,
                    format!("<use> reference cycle: {name} refers to #{id}, which leads back to this <use>"),
                ));
            }
            v = u.parent.as_deref();
        }
        if node.ancestors().any(|a| a == target) {
            return Err(self.error(
                node,
                format!("<use> reference cycle: {name} refers to #{id}, which contains it"),
            ));
        }
        let depth = f.via.as_ref().map_or(0, |v| v.depth) + 1;
        if depth > MAX_USE_DEPTH {
            return Err(self.error(
                node,
                format!("<use> nested more than {MAX_USE_DEPTH} deep: over the limit"),
            ));
        }
        let env = Env {
            viewport: f.viewport,
            ppi: self.ppi,
        };
        let sizes = (|| -> Result<_, String> {
            let w = attrs::user_attr(node, "width", Axis::X, f.viewport, self.ppi)?;
            let h = attrs::user_attr(node, "height", Axis::Y, f.viewport, self.ppi)?;
            Ok((shapes::offset(&env, node)?, w, h))
        })();
        let (at, w, h) = match sizes {
            Ok(s) => s,
            Err(m) => {
                self.skip_invalid(name.to_string(), 0, format!("element refused: {m}"));
                return Ok(());
            }
        };
        let via = Some(Rc::new(Via {
            node: node.id(),
            label: self.label(node),
            depth,
            parent: f.via.clone(),
        }));
        let inner = Frame {
            node: target,
            ctm: f.ctm * Affine::translate(at),
            viewport: f.viewport,
            visible: f.visible,
            via,
            use_size: (w, h),
        };
        if target.tag_name().name() == "symbol" && is_svg(target) {
            // A symbol is drawn only here, as a nested viewport (§5.5).
            self.visits += 1;
            self.reached[target.id().get_usize()] = true;
            let sym_name = self.element_name(target, &inner.via);
            match self.visibility(&inner) {
                Some(visible) => self.nested_svg(&Frame { visible, ..inner }, &sym_name, stack),
                None => self.skip(
                    sym_name,
                    0,
                    "display: none (the element and everything inside it are hidden)",
                ),
            }
        } else {
            stack.push(inner);
        }
        Ok(())
    }

    fn shape(&mut self, f: &Frame, tag: &str, name: String) {
        if !f.visible {
            self.skip(name, 0, "visibility: hidden");
            return;
        }
        let env = Env {
            viewport: f.viewport,
            ppi: self.ppi,
        };
        let node = f.node;
        let built = match tag {
            "path" => parse_path(node.attribute("d").unwrap_or("")).map_err(|e| e.0),
            "rect" => shapes::rect(&env, node),
            "circle" => shapes::circle(&env, node),
            "ellipse" => shapes::ellipse(&env, node),
            "line" => shapes::line(&env, node),
            "polyline" => shapes::poly(node, false),
            _ => shapes::poly(node, true),
        };
        let subpaths = match built {
            Ok(s) => s,
            Err(m) => {
                self.skip_invalid(name, 0, format!("element refused: {m}"));
                return;
            }
        };
        if subpaths.is_empty() {
            self.skip(name, 0, "no path data: nothing to draw");
            return;
        }
        let mut contours = Vec::with_capacity(subpaths.len());
        let mut empty = Vec::new();
        for (i, Subpath { segments, closed }) in subpaths.into_iter().enumerate() {
            if segments.is_empty() {
                empty.push(i);
                continue;
            }
            let c = Contour::new(segments, closed, Source::new(self.file, name.clone(), i))
                .transformed(f.ctm);
            if !c.segments.iter().all(|s| s.is_finite()) {
                self.skip(
                    name,
                    0,
                    "element refused: coordinates out of range after the transforms",
                );
                return;
            }
            contours.push(c);
        }
        for i in empty {
            self.skip(
                name.clone(),
                i,
                "subpath of zero length (a lone moveto or a point): nothing to cut",
            );
        }
        self.out.contours.extend(contours);
    }

    /// Lists what sits inside `defs`, `symbol`, `clipPath`, `mask`, `pattern` or `marker` and
    /// was never drawn.
    fn report_unreached(&mut self) {
        let doc = self.doc;
        for node in doc.descendants().filter(|n| n.is_element() && is_svg(*n)) {
            let tag = node.tag_name().name();
            if !DRAWABLE.contains(&tag) || self.reached[node.id().get_usize()] {
                continue;
            }
            let Some(holder) = node
                .ancestors()
                .find(|a| is_svg(*a) && NON_RENDERING.contains(&a.tag_name().name()))
            else {
                continue;
            };
            let htag = holder.tag_name().name();
            let reason = if matches!(htag, "defs" | "symbol") {
                format!(
                    "inside <{htag}> {} and never drawn by a <use>",
                    self.label(holder)
                )
            } else {
                format!(
                    "inside <{htag}> {}: clipping paths, masks, patterns and markers are not artwork",
                    self.label(holder)
                )
            };
            let name = self.label(node);
            self.skip(name, 0, reason);
        }
    }
}

/// Pushes the element children of `f.node` (in reverse, so they pop in document order).
fn push_children<'a, 'i>(
    stack: &mut Vec<Frame<'a, 'i>>,
    f: &Frame<'a, 'i>,
    children: impl DoubleEndedIterator<Item = Node<'a, 'i>>,
    ctm: Affine,
    viewport: Viewport,
) {
    for child in children.filter(|c| c.is_element()).rev() {
        stack.push(Frame {
            node: child,
            ctm,
            viewport,
            visible: f.visible,
            via: f.via.clone(),
            use_size: (None, None),
        });
    }
}
