//! Merging smooth runs for the cubic target: consecutive cubic pieces that meet with a common
//! tangent are replaced by one cubic fitted to the exact source they cover, whenever that cubic
//! is certified within the tolerance.
//!
//! The cubic keeps the run's end points and end tangents, P1 = P0 + α·T0 and P2 = P3 − β·T1, and
//! α, β solve the linear least-squares problem on sample points of the source with chord-length
//! parameters, refined by Newton reparametrisation (Schneider, "An algorithm for automatically
//! fitting digitized curves", Graphics Gems, 1990). A fit whose samples already lie farther than
//! the tolerance from it (after reparametrisation) is dropped at once; otherwise only the
//! certified measurement decides.

use kurbo::{CubicBez, ParamCurve, ParamCurveDeriv, Point, Vec2};

use super::{with_segments, Piece, CERT_SLACK};
use crate::geom::Segment;
use crate::measure;

/// Joins within this angle are tried for merging (certification decides).
const SMOOTH_COS: f64 = 0.9994; // cos 2°

/// The most pieces one merged cubic may replace.
const MAX_RUN: usize = 12;

/// A fitted piece with its output segments.
type View<'a> = (&'a Piece, &'a [Segment]);

/// The exact source a range of pieces covers.
fn source_of(segs: &[Segment], pieces: &[View]) -> Vec<Segment> {
    let (from, to) = (pieces[0].0.from, pieces[pieces.len() - 1].0.to);
    (from.segment..=to.segment)
        .filter_map(|i| {
            let t0 = if i == from.segment { from.t } else { 0.0 };
            let t1 = if i == to.segment { to.t } else { 1.0 };
            (t1 > t0).then(|| segs[i].subsegment(t0, t1))
        })
        .collect()
}

fn smooth_join(a: &View, b: &View) -> bool {
    let (Some(Segment::Cubic(x)), Some(Segment::Cubic(y))) = (a.1.last(), b.1.first()) else {
        return false;
    };
    let (u, v) = (x.p3 - x.p2, y.p1 - y.p0);
    let (lu, lv) = (u.hypot(), v.hypot());
    lu > 0.0 && lv > 0.0 && u.dot(v) >= SMOOTH_COS * lu * lv && a.0.to.segment <= b.0.from.segment
}

/// The least-squares cubic with fixed end points and end tangents through the samples, and the
/// largest distance from a sample to the cubic at its reparametrised parameter (an estimate of
/// the deviation from above at the samples: no certified value).
fn fit_cubic(samples: &[Point], t0: Vec2, t1: Vec2) -> Option<(CubicBez, f64)> {
    let (p0, p3) = (samples[0], samples[samples.len() - 1]);
    let mut u: Vec<f64> = {
        let mut acc = vec![0.0];
        for w in samples.windows(2) {
            acc.push(acc[acc.len() - 1] + (w[1] - w[0]).hypot());
        }
        let total = acc[acc.len() - 1];
        if total == 0.0 {
            return None;
        }
        acc.iter().map(|d| d / total).collect()
    };
    let mut best = None;
    for _ in 0..3 {
        let (mut c11, mut c12, mut c22, mut x1, mut x2) = (0.0, 0.0, 0.0, 0.0, 0.0);
        for (q, &t) in samples.iter().zip(&u) {
            let s = 1.0 - t;
            let (b0, b1, b2, b3) = (s * s * s, 3.0 * s * s * t, 3.0 * s * t * t, t * t * t);
            let a1 = t0 * b1;
            let a2 = -t1 * b2;
            let r = q.to_vec2() - p0.to_vec2() * (b0 + b1) - p3.to_vec2() * (b2 + b3);
            c11 += a1.dot(a1);
            c12 += a1.dot(a2);
            c22 += a2.dot(a2);
            x1 += a1.dot(r);
            x2 += a2.dot(r);
        }
        let det = c11 * c22 - c12 * c12;
        if det.abs() <= 1e-12 * (c11 * c22).max(1e-300) {
            break;
        }
        let alpha = (x1 * c22 - x2 * c12) / det;
        let beta = (c11 * x2 - c12 * x1) / det;
        if !(alpha > 0.0 && beta > 0.0 && alpha.is_finite() && beta.is_finite()) {
            break;
        }
        let c = CubicBez::new(p0, p0 + alpha * t0, p3 - beta * t1, p3);
        best = Some(c);
        // Newton reparametrisation of every sample onto the new curve.
        let (d1, d2) = (c.deriv(), c.deriv().deriv());
        for (q, t) in samples.iter().zip(u.iter_mut()) {
            let e = c.eval(*t) - *q;
            let (v, a) = (d1.eval(*t).to_vec2(), d2.eval(*t).to_vec2());
            let den = v.dot(v) + e.dot(a);
            if den > 0.0 {
                *t = (*t - e.dot(v) / den).clamp(0.0, 1.0);
            }
        }
    }
    best.map(|c| {
        let worst = samples
            .iter()
            .zip(&u)
            .map(|(q, &t)| (c.eval(t) - *q).hypot())
            .fold(0.0, f64::max);
        (c, worst)
    })
}

/// Try to replace pieces[i..=j] by one certified cubic.
fn merged(segs: &[Segment], pieces: &[View], tol: f64) -> Option<(CubicBez, Piece)> {
    let source = source_of(segs, pieces);
    let first = source.first()?;
    let last = source.last()?;
    let (t0, t1) = (first.tangent_at(0.0)?, last.tangent_at(1.0)?);
    let mut samples = vec![first.start()];
    for s in &source {
        samples.extend((1..=8).map(|k| s.eval(k as f64 / 8.0)));
    }
    let (cubic, at_samples) = fit_cubic(&samples, t0, t1)?;
    if at_samples > tol {
        return None;
    }
    let out = [Segment::Cubic(cubic)];
    if measure::estimate(&source, &out, 12) > tol {
        return None;
    }
    let deviation = measure::hausdorff_within(&source, &out, CERT_SLACK * tol, tol);
    (deviation.bound <= tol).then(|| {
        let piece = Piece {
            segments: 1,
            from: pieces[0].0.from,
            to: pieces[pieces.len() - 1].0.to,
            deviation,
        };
        (cubic, piece)
    })
}

/// Merge smooth runs of cubic pieces (see the module doc): the fit's output segments and pieces
/// in, the merged ones out.
pub fn merge_smooth(
    segs: &[Segment],
    segments: &[Segment],
    pieces: &[Piece],
    tol: f64,
) -> (Vec<Segment>, Vec<Piece>) {
    let views: Vec<View> = with_segments(pieces, segments).collect();
    let mut out = (
        Vec::with_capacity(segments.len()),
        Vec::with_capacity(pieces.len()),
    );
    let mut i = 0;
    while i < views.len() {
        let mut best = None;
        let mut j = i;
        while j + 1 < views.len() && j + 1 - i < MAX_RUN && smooth_join(&views[j], &views[j + 1]) {
            match merged(segs, &views[i..=j + 1], tol) {
                Some(m) => {
                    best = Some((j + 1, m));
                    j += 1;
                }
                None => break,
            }
        }
        match best {
            Some((end, (cubic, piece))) => {
                out.0.push(Segment::Cubic(cubic));
                out.1.push(piece);
                i = end + 1;
            }
            None => {
                out.0.extend_from_slice(views[i].1);
                out.1.push(*views[i].0);
                i += 1;
            }
        }
    }
    out
}
