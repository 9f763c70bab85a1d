//! Cut preparation: what turns a drawing into cuts, on the exact outline, before fitting. Every
//! step is optional (a zero length, `KerfSide::None`, `Direction::Keep` or `Order::AsDrawn`
//! turns it off), measured, and reported in [`PrepReport`].
//!
//! Steps, in this order:
//! 1. nesting (`nesting`): even-odd depth of every contour, so outer contours and holes are
//!    told apart;
//! 2. warnings (`warn`), on the drawing as given: strokes or gaps narrower than twice the blade
//!    offset or the kerf, open contours that cannot be weeded;
//! 3. kerf offset (`kerf`): outer contours and holes move by half the kerf; collapsed features
//!    are removed and listed in `Outline::skipped`; nesting is computed again afterwards;
//! 4. direction (`direction`): outer contours as requested, holes the other way;
//! 5. order (`order`): inside first or short travel, closed contours restarted near the
//!    previous end;
//! 6. weeding (`weed`): weed lines, then the border, appended so they are cut last;
//! 7. overcut (`overcut`): closed contours continue past their start (the border too);
//! 8. blade offset (`blade`), last because it turns the final tip path (start points,
//!    overcut and all) into the knife-axis path.
//!
//! Overcut and blade offset leave paths that no longer end where they start, so those contours
//! come out with `closed == false`.

mod blade;
mod direction;
mod displace;
mod intersect;
mod kerf;
mod nesting;
mod order;
mod overcut;
mod warn;
mod weed;

pub use blade::{axis_path, simulate_tip, tip_deviation, AxisPath, LEAD_IN};
pub use direction::{is_clockwise, Direction};
pub use displace::{displace, Displaced, Displacement};
pub use intersect::{intersections, Hit};
pub use kerf::{offset, ContourOffset};
pub use nesting::{nesting, Nesting, Polygon};
pub use order::{inside_first, travel, Order};
pub use overcut::{head, param_at_length};
pub use warn::Warning;

use serde::Serialize;

use crate::geom::{Contour, Outline, Segment, Skipped, Tolerance};
use crate::InputError;

/// Which way the kerf moves the cut line.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum KerfSide {
    /// Outer contours outward, holes inward: the part keeps its drawn size.
    Outside,
    /// Outer contours inward, holes outward: the opening (the waste side) keeps its size.
    Inside,
    /// No kerf offset.
    #[default]
    None,
}

/// What to prepare. Lengths in mm; zero turns a step off.
#[derive(Clone, Debug, PartialEq)]
pub struct PrepOptions {
    pub kerf_mm: f64,
    pub kerf_side: KerfSide,
    pub blade_offset_mm: f64,
    /// Corners turning by more than this get a swivel arc (degrees).
    pub corner_threshold_deg: f64,
    pub overcut_mm: f64,
    pub weed_border_mm: f64,
    /// Number of vertical weed lines (needs a weed border).
    pub weed_lines: usize,
    pub direction: Direction,
    pub order: Order,
    /// Whether to look for narrow features and open contours.
    pub warnings: bool,
}

impl Default for PrepOptions {
    fn default() -> PrepOptions {
        PrepOptions {
            kerf_mm: 0.0,
            kerf_side: KerfSide::None,
            blade_offset_mm: 0.0,
            // Common practice, no source: small turns need no swivel.
            corner_threshold_deg: 30.0,
            overcut_mm: 0.0,
            weed_border_mm: 0.0,
            weed_lines: 0,
            direction: Direction::Keep,
            order: Order::AsDrawn,
            warnings: true,
        }
    }
}

impl PrepOptions {
    /// Every length finite and ≥ 0, the threshold in [0°, 180°].
    pub fn check(&self) -> Result<(), InputError> {
        let lengths = [
            ("kerf", self.kerf_mm),
            ("blade offset", self.blade_offset_mm),
            ("overcut", self.overcut_mm),
            ("weed border", self.weed_border_mm),
        ];
        for (name, v) in lengths {
            if !v.is_finite() || v < 0.0 {
                return Err(InputError::at(
                    "options",
                    name,
                    format!("must be a finite length of 0 mm or more, got {v} mm"),
                ));
            }
        }
        let t = self.corner_threshold_deg;
        if !(0.0..=180.0).contains(&t) {
            return Err(InputError::at(
                "options",
                "corner threshold",
                format!("must be between 0° and 180°, got {t}°"),
            ));
        }
        if self.weed_lines > 0 && self.weed_border_mm == 0.0 {
            return Err(InputError::at(
                "options",
                "weed lines",
                "weed lines need a weed border (give a border margin above 0 mm)",
            ));
        }
        Ok(())
    }
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct KerfReport {
    pub kerf_mm: f64,
    pub side: KerfSide,
    pub half_kerf_mm: f64,
    pub contours_offset: usize,
    pub open_not_offset: usize,
    pub exact_segments: usize,
    pub fitted_segments: usize,
    pub round_joins: usize,
    pub trimmed_pieces: usize,
    /// Contours whose offset fell apart into more than one loop.
    pub split_contours: usize,
    /// Worst deviation of a fitted piece from the true offset curve (mm; 0 when all exact).
    pub max_deviation_mm: f64,
    pub deviation_note: &'static str,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DirectionReport {
    pub direction: Direction,
    pub outer: usize,
    pub holes: usize,
    pub reversed: usize,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OrderReport {
    pub order: Order,
    pub travel_before_mm: f64,
    pub travel_after_mm: f64,
    pub restarted: usize,
    pub reversed_open: usize,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OvercutReport {
    pub requested_mm: f64,
    pub contours: usize,
    /// Measured arc length added, smallest and largest over the contours.
    pub min_added_mm: f64,
    pub max_added_mm: f64,
    /// Contours shorter than the overcut (extended by one full turn only).
    pub capped: usize,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct WeedReport {
    pub margin_mm: f64,
    /// The border rectangle [x0, y0, x1, y1] in mm.
    pub border: [f64; 4],
    pub lines_requested: usize,
    pub line_pieces: usize,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct BladeReport {
    pub offset_mm: f64,
    pub corner_threshold_deg: f64,
    pub lead_in_mm: f64,
    pub swivels: usize,
    /// Worst deviation of fitted axis pieces from p + d·T (mm).
    pub max_fit_deviation_mm: f64,
    /// Worst distance of the simulated trailing tip from the drawn path (mm).
    pub max_tip_deviation_mm: f64,
    pub tip_note: &'static str,
}

/// What preparation did, with measured numbers.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PrepReport {
    /// The steps applied, in order.
    pub steps: Vec<&'static str>,
    pub contours_in: usize,
    pub contours_out: usize,
    /// Pen-up travel of the input as drawn, and of the result (mm).
    pub travel_before_mm: f64,
    pub travel_after_mm: f64,
    pub kerf: Option<KerfReport>,
    pub direction: Option<DirectionReport>,
    pub order: Option<OrderReport>,
    pub weed: Option<WeedReport>,
    pub overcut: Option<OvercutReport>,
    pub blade: Option<BladeReport>,
    pub warnings: Vec<Warning>,
    /// Contours removed (also in the outline's `skipped`).
    pub removed: Vec<Skipped>,
}

/// The prepared outline and its report.
#[derive(Clone, Debug, PartialEq)]
pub struct Prepared {
    pub outline: Outline,
    pub report: PrepReport,
}

/// Run the preparation steps on an exact outline.
pub fn prepare(
    outline: Outline,
    opts: &PrepOptions,
    tol: Tolerance,
) -> Result<Prepared, InputError> {
    opts.check()?;
    let tol = tol.mm();
    let Outline {
        contours,
        mut skipped,
        mut warnings,
    } = outline;
    let mut report = PrepReport {
        steps: Vec::new(),
        contours_in: contours.len(),
        contours_out: 0,
        travel_before_mm: travel(&contours),
        travel_after_mm: 0.0,
        kerf: None,
        direction: None,
        order: None,
        weed: None,
        overcut: None,
        blade: None,
        warnings: Vec::new(),
        removed: Vec::new(),
    };
    let mut nest = nesting(&contours);
    if opts.warnings {
        report.steps.push("warnings");
        let limit = (2.0 * opts.blade_offset_mm).max(match opts.kerf_side {
            KerfSide::None => 0.0,
            _ => opts.kerf_mm,
        });
        if limit > 0.0 {
            let polys = nesting::polygons(&contours);
            report
                .warnings
                .extend(warn::narrow(&contours, &nest, &polys, limit));
        }
        report.warnings.extend(warn::open_contours(&contours));
    }
    let mut contours = contours;
    if opts.kerf_mm > 0.0 && opts.kerf_side != KerfSide::None {
        report.steps.push("kerf");
        let (next, kr) = kerf_step(contours, &nest, opts, tol, &mut report);
        contours = next;
        report.kerf = Some(kr);
        nest = nesting(&contours);
    }
    if opts.direction != Direction::Keep {
        report.steps.push("direction");
        let mut r = DirectionReport {
            direction: opts.direction,
            outer: 0,
            holes: 0,
            reversed: 0,
        };
        contours = contours
            .into_iter()
            .enumerate()
            .map(|(i, c)| {
                let hole = nest.is_hole(i);
                if c.closed {
                    if hole {
                        r.holes += 1;
                    } else {
                        r.outer += 1;
                    }
                }
                let (c, flipped) = direction::orient(c, hole, opts.direction);
                r.reversed += usize::from(flipped);
                c
            })
            .collect();
        report.direction = Some(r);
    }
    if opts.order != Order::AsDrawn {
        report.steps.push("order");
        let before = travel(&contours);
        let o = order::order(contours, &nest.parent, opts.order);
        contours = o.contours;
        report.order = Some(OrderReport {
            order: opts.order,
            travel_before_mm: before,
            travel_after_mm: travel(&contours),
            restarted: o.restarted,
            reversed_open: o.reversed_open,
        });
    }
    if opts.weed_border_mm > 0.0 {
        let bbox = contours
            .iter()
            .filter_map(|c| c.bounding_box())
            .reduce(|a, b| a.union(b));
        if let Some(bbox) = bbox {
            report.steps.push("weed");
            let (frame, _) = direction::orient(
                weed::border(bbox, opts.weed_border_mm),
                false,
                opts.direction,
            );
            let nest = nesting(&contours);
            let polys = nesting::polygons(&contours);
            let outers: Vec<&Polygon> = polys
                .iter()
                .enumerate()
                .filter(|(i, _)| nest.depth[*i] == 0)
                .filter_map(|(_, p)| p.as_ref())
                .collect();
            let rect = bbox.inflate(opts.weed_border_mm, opts.weed_border_mm);
            let lines = weed::weed_lines(rect, &outers, opts.weed_lines);
            report.weed = Some(WeedReport {
                margin_mm: opts.weed_border_mm,
                border: [rect.x0, rect.y0, rect.x1, rect.y1],
                lines_requested: opts.weed_lines,
                line_pieces: lines.len(),
            });
            contours.extend(lines);
            contours.push(frame);
        }
    }
    // The closed loops as they stand before overcut, for the blade's lead-in.
    let loops: Vec<Option<Vec<Segment>>> = contours
        .iter()
        .map(|c| c.closed.then(|| c.segments.clone()))
        .collect();
    if opts.overcut_mm > 0.0 {
        report.steps.push("overcut");
        let mut r = OvercutReport {
            requested_mm: opts.overcut_mm,
            contours: 0,
            min_added_mm: f64::INFINITY,
            max_added_mm: 0.0,
            capped: 0,
        };
        for c in contours
            .iter_mut()
            .filter(|c| c.closed && !c.segments.is_empty())
        {
            let (segs, added) = overcut::overcut(&c.segments, opts.overcut_mm);
            r.contours += 1;
            r.min_added_mm = r.min_added_mm.min(added);
            r.max_added_mm = r.max_added_mm.max(added);
            if added < opts.overcut_mm - 1e-6 {
                r.capped += 1;
            }
            c.segments = segs;
            c.closed = false;
        }
        if r.contours == 0 {
            r.min_added_mm = 0.0;
        }
        report.overcut = Some(r);
    }
    if opts.blade_offset_mm > 0.0 {
        report.steps.push("blade");
        report.blade = Some(blade_step(&mut contours, &loops, opts, tol));
    }
    report.travel_after_mm = travel(&contours);
    report.contours_out = contours.len();
    skipped.extend(report.removed.iter().cloned());
    warnings.extend(report.warnings.iter().map(|w| w.to_string()));
    Ok(Prepared {
        outline: Outline {
            contours,
            skipped,
            warnings,
        },
        report,
    })
}

fn kerf_step(
    contours: Vec<Contour>,
    nest: &Nesting,
    opts: &PrepOptions,
    tol: f64,
    report: &mut PrepReport,
) -> (Vec<Contour>, KerfReport) {
    let half = 0.5 * opts.kerf_mm;
    let mut kr = KerfReport {
        kerf_mm: opts.kerf_mm,
        side: opts.kerf_side,
        half_kerf_mm: half,
        contours_offset: 0,
        open_not_offset: 0,
        exact_segments: 0,
        fitted_segments: 0,
        round_joins: 0,
        trimmed_pieces: 0,
        split_contours: 0,
        max_deviation_mm: 0.0,
        deviation_note: "fitted pieces: certified Hausdorff bound against a dense polyline of the true offset curve, plus that polyline's sampled chord error",
    };
    let mut out = Vec::with_capacity(contours.len());
    for (i, c) in contours.into_iter().enumerate() {
        if c.segments.is_empty() {
            out.push(c);
            continue;
        }
        if !c.closed {
            kr.open_not_offset += 1;
            report.warnings.push(Warning {
                source: c.source.clone(),
                message: "open contour: kerf offset not applied (an open cut has no inside)".into(),
            });
            out.push(c);
            continue;
        }
        // Outside: the material grows (outer contours out, holes in); Inside: it shrinks.
        let material_grows = opts.kerf_side == KerfSide::Outside;
        let grow = if material_grows != nest.is_hole(i) {
            half
        } else {
            -half
        };
        let off = kerf::offset(&c, kerf::left_distance(c.signed_area(), grow), tol);
        kr.contours_offset += 1;
        kr.exact_segments += off.exact_segments;
        kr.fitted_segments += off.fitted_segments;
        kr.round_joins += off.round_joins;
        kr.trimmed_pieces += off.trimmed;
        kr.max_deviation_mm = kr.max_deviation_mm.max(off.deviation);
        if off.unclosed > 0 {
            report.warnings.push(Warning {
                source: c.source.clone(),
                message: format!(
                    "kerf offset: {} piece chain(s) could not be closed and were dropped",
                    off.unclosed
                ),
            });
        }
        match off.loops.len() {
            0 => report.removed.push(Skipped::hidden(
                c.source.clone(),
                format!(
                    "removed by the kerf offset: moving it {half} mm inward leaves nothing (the feature is smaller than the kerf)"
                ),
            )),
            1 => {}
            n => {
                kr.split_contours += 1;
                report.warnings.push(Warning {
                    source: c.source.clone(),
                    message: format!("the kerf offset splits this contour into {n} loops"),
                });
            }
        }
        out.extend(off.loops);
    }
    (out, kr)
}

fn blade_step(
    contours: &mut [Contour],
    loops: &[Option<Vec<Segment>>],
    opts: &PrepOptions,
    tol: f64,
) -> BladeReport {
    let d = opts.blade_offset_mm;
    let mut r = BladeReport {
        offset_mm: d,
        corner_threshold_deg: opts.corner_threshold_deg,
        lead_in_mm: LEAD_IN * d,
        swivels: 0,
        max_fit_deviation_mm: 0.0,
        max_tip_deviation_mm: 0.0,
        tip_note: "simulated trailing tip (tractrix steps of d/200), sampled, not certified",
    };
    for (c, lp) in contours.iter_mut().zip(loops) {
        if c.segments.is_empty() {
            continue;
        }
        let mut tip = match lp {
            Some(l) => overcut::tail(l, LEAD_IN * d),
            None => Vec::new(),
        };
        tip.extend(c.segments.iter().copied());
        let axis = axis_path(&tip, d, opts.corner_threshold_deg.to_radians(), tol);
        r.swivels += axis.swivels;
        r.max_fit_deviation_mm = r.max_fit_deviation_mm.max(axis.deviation);
        r.max_tip_deviation_mm = r
            .max_tip_deviation_mm
            .max(tip_deviation(&tip, &axis.segments, d));
        c.segments = axis.segments;
        c.closed = false;
    }
    r
}
