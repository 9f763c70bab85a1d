//! ratline against kurbo, on the same inputs in the same run: segment counts, certified and
//! dense-checked deviations, contours over tolerance, and time (median of repetitions).
//!
//! ```sh
//! cargo bench --bench compare                              # everything (whole fonts)
//! cargo bench --bench compare -- --glyphs 300 --reps 5     # a quick subset
//! cargo bench --bench compare -- --only circles,arcs --arcs 10000
//! cargo bench --bench compare -- --ratline-only            # whole-font ratline jobs only (memory)
//! ```
//!
//! Without `--bench` (as `cargo test --all-targets` runs it) it does a small smoke run.
//!
//! Every timed job consumes every output coordinate (summed into `black_box`), so nothing is
//! optimised away; reading the input is not timed. ratline and kurbo run in turn, run by run,
//! so a shared machine's drifts in speed reach both medians alike. ratline's time includes its
//! certification;
//! kurbo's methods estimate their error and are measured afterwards, untimed, with
//! `ratline::measure::hausdorff` against the exact source (a certified value for kurbo too),
//! and both sides are checked by the independent dense sampling of `dense.rs`.

#[path = "../../tests/common/mod.rs"]
mod common;
mod dense;
mod jobs;

use std::hint::black_box;
use std::time::{Duration, Instant};

use clap::{Parser, ValueEnum};
use kurbo::BezPath;
use rayon::prelude::*;

use ratline::convert::fit_outline;
use ratline::fit::{fit, Fitted, Target};
use ratline::geom::{CircularArc, Contour, Outline, Segment, Tolerance};
use ratline::measure;

use dense::{Piece, Set};
use jobs::{CircleTarget, QuadMethod};

#[derive(Parser, Debug)]
#[command(about = "ratline against kurbo on the same inputs, in one run")]
struct Args {
    /// Only the first N glyphs of each font (default: all).
    #[arg(long)]
    glyphs: Option<usize>,
    /// Timed repetitions per job (the median is reported).
    #[arg(long, default_value_t = 5)]
    reps: usize,
    /// Random SVG arcs in the arcs job.
    #[arg(long, default_value_t = 100_000)]
    arcs: usize,
    /// How many of the random arcs (evenly spread) get the dense check.
    #[arg(long, default_value_t = 5_000)]
    dense_arcs: usize,
    /// Which jobs to run.
    #[arg(
        long,
        value_enum,
        value_delimiter = ',',
        default_value = "fonts,circles,arcs,parallel"
    )]
    only: Vec<Part>,
    /// Run only ratline's whole-font jobs through `convert::fit_outline`, untimed and without
    /// kurbo (to measure memory, e.g. under `/usr/bin/time -v`).
    #[arg(long)]
    ratline_only: bool,
    /// Also run kurbo's `fit_to_bezpath_opt` (slow: about 8 s per 300 glyphs; kurbo 0.13.1
    /// panics inside it on some glyph of the whole DejaVu Sans, an `unwrap` at fit.rs:646).
    #[arg(long)]
    kurbo_opt: bool,
    /// Passed by `cargo bench`.
    #[arg(long, hide = true)]
    bench: bool,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum Part {
    Fonts,
    Circles,
    Arcs,
    Parallel,
}

/// One tool's result on one job.
#[derive(Clone, Copy)]
struct Side {
    segments: usize,
    certified: f64,
    over_certified: usize,
    dense: f64,
    over_dense: usize,
    time: Duration,
}

/// One row: one input, one target, ratline and (where kurbo has the method) kurbo.
struct Row {
    input: String,
    target: String,
    tol: f64,
    segments_in: usize,
    /// Contours, for the per-contour cost of whole-font rows (`None` for other rows).
    font_contours: Option<usize>,
    minimum: Option<usize>,
    ratline: Side,
    kurbo: Option<Side>,
}

/// A timed job: the median time of one run and the result of one run.
struct Timed<T> {
    median: Duration,
    result: T,
}

/// Run `job` `reps` times (at least once) and take the median. Short jobs run in batches of at
/// least 2 ms and report the time per run; a job of 0.5 s or more counts its first run as a
/// repetition. `sum` consumes every output coordinate.
fn timed<T>(reps: usize, mut job: impl FnMut() -> T, sum: impl Fn(&T) -> f64) -> Timed<T> {
    let (result, mut times, batch) = first_run(&mut job, &sum);
    while times.len() < reps.max(1) {
        times.push(batch_run(&mut job, &sum, batch));
    }
    Timed {
        median: median(times),
        result,
    }
}

/// Two jobs timed as [`timed`], in turn run by run, so both see the same stretches of a shared
/// machine and their ratio holds even when its speed drifts.
fn timed_pair<A, B>(
    reps: usize,
    mut a: impl FnMut() -> A,
    sum_a: impl Fn(&A) -> f64,
    mut b: impl FnMut() -> B,
    sum_b: impl Fn(&B) -> f64,
) -> (Timed<A>, Timed<B>) {
    let (result_a, mut times_a, batch_a) = first_run(&mut a, &sum_a);
    let (result_b, mut times_b, batch_b) = first_run(&mut b, &sum_b);
    while times_a.len() < reps.max(1) || times_b.len() < reps.max(1) {
        if times_a.len() < reps.max(1) {
            times_a.push(batch_run(&mut a, &sum_a, batch_a));
        }
        if times_b.len() < reps.max(1) {
            times_b.push(batch_run(&mut b, &sum_b, batch_b));
        }
    }
    (
        Timed {
            median: median(times_a),
            result: result_a,
        },
        Timed {
            median: median(times_b),
            result: result_b,
        },
    )
}

/// A job's first run: its result, the run as a repetition if it took 0.5 s or more, and the
/// batch size for the next runs (at least 2 ms a batch).
fn first_run<T>(job: &mut impl FnMut() -> T, sum: &impl Fn(&T) -> f64) -> (T, Vec<Duration>, u32) {
    let start = Instant::now();
    let result = job();
    black_box(sum(&result));
    let once = start.elapsed();
    let batch = (2e-3 / once.as_secs_f64().max(1e-9)).ceil().max(1.0) as u32;
    let times = if once >= Duration::from_millis(500) {
        vec![once]
    } else {
        Vec::new()
    };
    (result, times, batch)
}

/// The time per run of one batch of `batch` runs.
fn batch_run<T>(job: &mut impl FnMut() -> T, sum: &impl Fn(&T) -> f64, batch: u32) -> Duration {
    let t = Instant::now();
    for _ in 0..batch {
        let r = job();
        black_box(sum(&r));
    }
    t.elapsed() / batch
}

/// The median of at least one time.
fn median(mut times: Vec<Duration>) -> Duration {
    times.sort();
    times[times.len() / 2]
}

fn tolerance(mm: f64) -> Tolerance {
    Tolerance::new(mm).expect("the comparison's tolerances are valid")
}

fn fitted_checksum(v: &[Fitted]) -> f64 {
    v.iter().map(|f| jobs::checksum(&f.contour.segments)).sum()
}

fn paths_checksum(v: &[BezPath]) -> f64 {
    v.iter().map(jobs::path_checksum).sum()
}

/// ratline's certified side of a set of fitted contours, with the dense check against their
/// sources.
fn ratline_side(sources: &[Contour], fitted: &[Fitted], tol: f64, time: Duration) -> Side {
    let dense: Vec<f64> = sources
        .par_iter()
        .zip(fitted)
        .map(|(c, f)| {
            let src = Set::new(c.segments.iter().map(source_piece).collect());
            dense::dense(
                &src.samples(),
                &src,
                &Set::from_segments(&f.contour.segments),
            )
        })
        .collect();
    Side {
        segments: fitted.iter().map(|f| f.contour.segments.len()).sum(),
        certified: fitted.iter().map(|f| f.deviation.bound).fold(0.0, f64::max),
        over_certified: fitted.iter().filter(|f| f.deviation.bound > tol).count(),
        dense: dense.iter().copied().fold(0.0, f64::max),
        over_dense: dense.iter().filter(|&&d| d > tol).count(),
        time,
    }
}

/// A source segment for the dense check: fonts hold lines and Béziers; circles are measured
/// as circular arcs.
fn source_piece(s: &Segment) -> Piece {
    match s {
        Segment::Conic(c) => {
            let f = c
                .as_circle(1e-9)
                .expect("the dense check takes circular conics only");
            Piece::Arc(CircularArc {
                center: f.center,
                radius: f.radius,
                start_angle: (c.points()[0] - f.center).atan2(),
                sweep: f.sweep,
            })
        }
        other => Piece::of(other),
    }
}

/// kurbo's side: certified by `measure` against the exact sources, and dense-checked.
fn kurbo_side(sources: &[Contour], out: &[BezPath], tol: f64, time: Duration) -> Side {
    let per: Vec<(usize, f64, f64)> = sources
        .par_iter()
        .zip(out)
        .map(|(c, p)| {
            let segs = jobs::segments_of(p);
            let cert = measure::hausdorff_within(&c.segments, &segs, 1e-3 * tol, tol).bound;
            let src = Set::new(c.segments.iter().map(source_piece).collect());
            let d = dense::dense(&src.samples(), &src, &Set::from_segments(&segs));
            (segs.len(), cert, d)
        })
        .collect();
    Side {
        segments: per.iter().map(|p| p.0).sum(),
        certified: per.iter().map(|p| p.1).fold(0.0, f64::max),
        over_certified: per.iter().filter(|p| p.1 > tol).count(),
        dense: per.iter().map(|p| p.2).fold(0.0, f64::max),
        over_dense: per.iter().filter(|p| p.2 > tol).count(),
        time,
    }
}

/// A loaded font: its contours and their kurbo paths.
struct Font {
    name: &'static str,
    glyphs: usize,
    contours: Vec<Contour>,
    paths: Vec<BezPath>,
}

fn load_font(name: &'static str, path: &str, limit: Option<usize>) -> Result<Font, String> {
    let (contours, glyphs, errors) = jobs::font_contours(path, limit).map_err(|e| e.to_string())?;
    for e in &errors {
        eprintln!("note: {e}");
    }
    let paths = contours
        .iter()
        .map(|c| jobs::bezpath(c).ok_or_else(|| format!("{}: not lines and Béziers", c.source)))
        .collect::<Result<_, _>>()?;
    Ok(Font {
        name,
        glyphs,
        contours,
        paths,
    })
}

fn segments_in(f: &Font) -> usize {
    f.contours.iter().map(|c| c.segments.len()).sum()
}

/// One whole-font row: ratline's `target` against a kurbo method.
fn font_row(
    f: &Font,
    target: Target,
    kurbo_name: &str,
    kurbo: impl Fn(&BezPath) -> BezPath + Sync,
    tol: f64,
    reps: usize,
    ratline: Option<&Side>,
) -> Row {
    let t = tolerance(tol);
    let input = format!(
        "{}, {} glyphs ({} contours)",
        f.name,
        f.glyphs,
        f.contours.len()
    );
    eprintln!(
        "{input}: {} and kurbo {kurbo_name}, in turn ...",
        target.name()
    );
    let (run, k) = timed_pair(
        reps,
        || {
            f.contours
                .iter()
                .map(|c| fit(c, target, t))
                .collect::<Vec<_>>()
        },
        |v| fitted_checksum(v),
        || f.paths.iter().map(&kurbo).collect::<Vec<_>>(),
        |v| paths_checksum(v),
    );
    // (A side measured in an earlier row keeps its checks and takes this run's time.)
    let r = match ratline {
        Some(s) => Side {
            time: run.median,
            ..*s
        },
        None => ratline_side(&f.contours, &run.result, tol, run.median),
    };
    Row {
        input,
        target: format!("{} (kurbo: {kurbo_name})", target.name()),
        tol,
        segments_in: segments_in(f),
        font_contours: Some(f.contours.len()),
        minimum: None,
        ratline: r,
        kurbo: Some(kurbo_side(&f.contours, &k.result, tol, k.median)),
    }
}

fn font_rows(dejavu: &Font, cantarell: &Font, reps: usize, kurbo_opt: bool, rows: &mut Vec<Row>) {
    let tol = 0.01;
    rows.push(font_row(
        dejavu,
        Target::Lines,
        "flatten",
        |p| jobs::kurbo_lines(p, tol),
        tol,
        reps,
        None,
    ));
    let fast = font_row(
        dejavu,
        Target::Cubic,
        "fit_to_bezpath",
        |p| jobs::kurbo_cubics(p, tol, false),
        tol,
        reps,
        None,
    );
    if kurbo_opt {
        let opt = font_row(
            dejavu,
            Target::Cubic,
            "fit_to_bezpath_opt",
            |p| jobs::kurbo_cubics(p, tol, true),
            tol,
            reps,
            Some(&fast.ratline),
        );
        rows.push(fast);
        rows.push(opt);
    } else {
        rows.push(fast);
    }
    let quad = font_row(
        cantarell,
        Target::Quadratic,
        "approx_spline",
        |p| jobs::kurbo_quads(p, tol, QuadMethod::Spline),
        tol,
        reps,
        None,
    );
    let to_quads = font_row(
        cantarell,
        Target::Quadratic,
        "to_quads",
        |p| jobs::kurbo_quads(p, tol, QuadMethod::ToQuads),
        tol,
        reps,
        Some(&quad.ratline),
    );
    rows.push(quad);
    rows.push(to_quads);
}

fn circle_rows(reps: usize, rows: &mut Vec<Row>) {
    let targets = [
        (Target::Lines, Some(CircleTarget::Lines), "flatten"),
        (
            Target::Quadratic,
            Some(CircleTarget::Quadratic),
            "approx_spline",
        ),
        (
            Target::Cubic,
            Some(CircleTarget::Cubic),
            "Circle::path_elements",
        ),
        (Target::Arcs, None, "none"),
    ];
    for r in [0.5, 1.0, 10.0, 100.0, 400.0] {
        for tol in [0.01, 0.001] {
            let source = [jobs::circle_contour(r)];
            for (target, kt, kname) in targets {
                let ratline_job = || vec![fit(&source[0], target, tolerance(tol))];
                let (ratline, kurbo) = match kt {
                    Some(kt) => {
                        let (run, k) = timed_pair(
                            reps,
                            ratline_job,
                            |v| fitted_checksum(v),
                            || vec![jobs::kurbo_circle(r, kt, tol)],
                            |v| paths_checksum(v),
                        );
                        (
                            ratline_side(&source, &run.result, tol, run.median),
                            Some(kurbo_side(&source, &k.result, tol, k.median)),
                        )
                    }
                    None => {
                        let run = timed(reps, ratline_job, |v| fitted_checksum(v));
                        (ratline_side(&source, &run.result, tol, run.median), None)
                    }
                };
                rows.push(Row {
                    input: format!("circle r = {r} mm"),
                    target: format!("{} (kurbo: {kname})", target.name()),
                    tol,
                    segments_in: source[0].segments.len(),
                    font_contours: None,
                    minimum: Some(kt.map_or(1, |kt| jobs::circle_minimum(kt, r, tol))),
                    ratline,
                    kurbo,
                });
            }
        }
    }
}

fn arc_row(n: usize, dense_n: usize, reps: usize) -> Row {
    let tol = 0.01;
    let t = tolerance(tol);
    let params = jobs::random_svg_arcs(n, jobs::ARC_SEED);
    eprintln!("{n} random arcs ...");
    let (r, k) = timed_pair(
        reps,
        || {
            params
                .iter()
                .enumerate()
                .map(|(i, a)| jobs::ratline_arc(a, i).map(|c| fit(&c, Target::Lines, t)))
                .collect::<Vec<_>>()
        },
        |v| {
            v.iter()
                .flatten()
                .map(|f| jobs::checksum(&f.contour.segments))
                .sum()
        },
        || {
            params
                .iter()
                .map(|a| jobs::kurbo_arc(a).map(|a| jobs::kurbo_arc_lines(&a, tol)))
                .collect::<Vec<_>>()
        },
        |v| v.iter().flatten().map(jobs::path_checksum).sum(),
    );
    let step = n.div_ceil(dense_n.max(1)).max(1);
    eprintln!("{n} random arcs: measuring ...");
    // (segments, certified, dense or NaN when not checked) per arc, for each tool.
    let per: Vec<[(usize, f64, f64); 2]> = params
        .par_iter()
        .enumerate()
        .filter_map(|(i, a)| {
            let source = jobs::ratline_arc(a, i)?;
            let fr = r.result[i].as_ref()?;
            let kp = k.result[i].as_ref()?;
            let ks = jobs::segments_of(kp);
            let kc = measure::hausdorff_within(&source.segments, &ks, 1e-3 * tol, tol).bound;
            let (dr, dk) = if i % step == 0 {
                let (samples, set) = dense::arc_reference(&jobs::kurbo_arc(a)?);
                (
                    dense::dense(&samples, &set, &Set::from_segments(&fr.contour.segments)),
                    dense::dense(&samples, &set, &Set::from_segments(&ks)),
                )
            } else {
                (f64::NAN, f64::NAN)
            };
            Some([
                (fr.contour.segments.len(), fr.deviation.bound, dr),
                (ks.len(), kc, dk),
            ])
        })
        .collect();
    let side = |j: usize, time: Duration| Side {
        segments: per.iter().map(|p| p[j].0).sum(),
        certified: per.iter().map(|p| p[j].1).fold(0.0, f64::max),
        over_certified: per.iter().filter(|p| p[j].1 > tol).count(),
        dense: per
            .iter()
            .map(|p| p[j].2)
            .filter(|d| !d.is_nan())
            .fold(0.0, f64::max),
        over_dense: per.iter().filter(|p| p[j].2 > tol).count(),
        time,
    };
    let checked = per.iter().filter(|p| !p[0].2.is_nan()).count();
    Row {
        input: format!(
            "{} random SVG arcs, radii 1–200 mm (both read {}; dense check on {checked})",
            n,
            per.len()
        ),
        target: "lines (kurbo: from_svg_arc + flatten)".into(),
        tol,
        segments_in: params
            .iter()
            .enumerate()
            .filter_map(|(i, a)| jobs::ratline_arc(a, i))
            .map(|c| c.segments.len())
            .sum(),
        font_contours: None,
        minimum: None,
        ratline: side(0, r.median),
        kurbo: Some(side(1, k.median)),
    }
}

/// One parallel job: `fit_outline` on 1 and 2 threads.
struct Parallel {
    job: String,
    one: Duration,
    two: Duration,
    identical: bool,
}

fn parallel_rows(dejavu: &Font, cantarell: &Font, reps: usize) -> Result<Vec<Parallel>, String> {
    let tol = tolerance(0.01);
    let mut out = Vec::new();
    for (f, target) in [
        (dejavu, Target::Lines),
        (dejavu, Target::Cubic),
        (cantarell, Target::Quadratic),
    ] {
        let outline = Outline {
            contours: f.contours.clone(),
            ..Outline::default()
        };
        let job = format!(
            "{} ({} contours), {}",
            f.name,
            f.contours.len(),
            target.name()
        );
        // The two pools take turns, run by run, so that a busy spell of the shared machine
        // slows both alike rather than one of them.
        let pools = [1, 2].map(|threads| {
            rayon::ThreadPoolBuilder::new()
                .num_threads(threads)
                .build()
                .map_err(|e| e.to_string())
        });
        let [one, two] = match pools {
            [Ok(a), Ok(b)] => [a, b],
            [Err(e), _] | [_, Err(e)] => return Err(e),
        };
        eprintln!("{job}: fit_outline on 1 and 2 threads, in turn ...");
        let run = |pool: &rayon::ThreadPool| {
            let start = Instant::now();
            let r = pool.install(|| {
                fit_outline(&outline, target, tol, &[], usize::MAX, &|| {})
                    .expect("no segment limit")
            });
            black_box(
                r.contours
                    .iter()
                    .map(|c| jobs::checksum(&c.segments))
                    .sum::<f64>(),
            );
            (start.elapsed(), r)
        };
        // One untimed run on each pool first, so both are timed warm whatever earlier jobs left
        // in the heap: a worker thread may get an allocator arena of its own (glibc malloc),
        // which its first run grows. (Without it, the cubic job measured 1.59 after the other
        // jobs and 1.92 alone.)
        black_box(run(&one));
        black_box(run(&two));
        let (mut times_one, mut times_two) = (Vec::new(), Vec::new());
        let (mut result_one, mut result_two) = (None, None);
        for _ in 0..reps.max(1) {
            let (t, r) = run(&one);
            times_one.push(t);
            result_one = Some(r);
            let (t, r) = run(&two);
            times_two.push(t);
            result_two = Some(r);
        }
        let (Some(r1), Some(r2)) = (result_one, result_two) else {
            return Err("no parallel run".to_string());
        };
        out.push(Parallel {
            job,
            one: median(times_one),
            two: median(times_two),
            identical: r1.contours == r2.contours && r1.reports == r2.reports,
        });
    }
    Ok(out)
}

fn duration(d: Duration) -> String {
    let s = d.as_secs_f64();
    if s >= 1.0 {
        format!("{s:.2} s")
    } else if s >= 1e-3 {
        format!("{:.1} ms", s * 1e3)
    } else {
        format!("{:.1} µs", s * 1e6)
    }
}

fn ratio(a: f64, b: f64) -> String {
    if b > 0.0 {
        format!("{:.2}", a / b)
    } else {
        "–".into()
    }
}

fn print_rows(rows: &[Row]) {
    println!(
        "| input | target | tol mm | segs in | min | segs out ratline / kurbo | certified max mm ratline / kurbo \
         | over tol (certified) r / k | dense max mm r / k | over tol (dense) r / k | time r / k \
         | segs r/k | time r/k |"
    );
    println!("|---|---|---|---|---|---|---|---|---|---|---|---|---|");
    for row in rows {
        let r = &row.ratline;
        let pair = |a: String, b: Option<String>| match b {
            Some(b) => format!("{a} / {b}"),
            None => format!("{a} / –"),
        };
        let k = row.kurbo.as_ref();
        println!(
            "| {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} |",
            row.input,
            row.target,
            row.tol,
            row.segments_in,
            row.minimum.map_or("–".into(), |m| m.to_string()),
            pair(r.segments.to_string(), k.map(|k| k.segments.to_string())),
            pair(
                format!("{:.6}", r.certified),
                k.map(|k| format!("{:.6}", k.certified))
            ),
            pair(
                r.over_certified.to_string(),
                k.map(|k| k.over_certified.to_string())
            ),
            pair(
                format!("{:.6}", r.dense),
                k.map(|k| format!("{:.6}", k.dense))
            ),
            pair(
                r.over_dense.to_string(),
                k.map(|k| k.over_dense.to_string())
            ),
            pair(duration(r.time), k.map(|k| duration(k.time))),
            k.map_or("–".into(), |k| ratio(
                r.segments as f64,
                k.segments as f64
            )),
            k.map_or("–".into(), |k| ratio(
                r.time.as_secs_f64(),
                k.time.as_secs_f64()
            )),
        );
    }
}

fn header(args: &Args) {
    let date = std::process::Command::new("date")
        .arg("-u")
        .arg("+%Y-%m-%d %H:%M UTC")
        .output()
        .ok()
        .and_then(|o| String::from_utf8(o.stdout).ok())
        .map_or("unknown date".into(), |s| s.trim().to_string());
    let cores = std::thread::available_parallelism().map_or(0, |n| n.get());
    let meminfo = std::fs::read_to_string("/proc/meminfo").unwrap_or_default();
    let mem_gib = meminfo
        .lines()
        .find(|l| l.starts_with("MemTotal:"))
        .and_then(|l| l.split_whitespace().nth(1)?.parse::<f64>().ok())
        .map_or("?".into(), |kib| format!("{:.1}", kib / 1024.0 / 1024.0));
    let cpu = std::fs::read_to_string("/proc/cpuinfo")
        .unwrap_or_default()
        .lines()
        .find(|l| l.starts_with("model name"))
        .and_then(|l| l.split(':').nth(1))
        .map_or("unknown CPU".into(), |s| s.trim().to_string());
    println!(
        "ratline vs kurbo 0.13, {date}; {cores} cores (nproc), {mem_gib} GiB memory, {cpu}; \
         reps {}, glyphs {}, 1 em = {} mm; times are medians, one thread unless stated",
        args.reps,
        args.glyphs.map_or("all".into(), |g| g.to_string()),
        jobs::EM_MM
    );
    println!();
}

fn ratline_only(limit: Option<usize>) -> Result<(), String> {
    let tol = tolerance(0.01);
    for (name, path, target) in [
        ("DejaVu Sans", jobs::DEJAVU, Target::Lines),
        ("DejaVu Sans", jobs::DEJAVU, Target::Cubic),
        ("Cantarell", jobs::CANTARELL, Target::Quadratic),
    ] {
        let (contours, glyphs, _) = jobs::font_contours(path, limit).map_err(|e| e.to_string())?;
        let outline = Outline {
            contours,
            ..Outline::default()
        };
        let start = Instant::now();
        let f =
            fit_outline(&outline, target, tol, &[], usize::MAX, &|| {}).expect("no segment limit");
        let segs: usize = f.contours.iter().map(|c| c.segments.len()).sum();
        println!(
            "{name}, {glyphs} glyphs, {} contours, {}: {segs} segments, max {:.6} mm, {} over, {}",
            outline.contours.len(),
            target.name(),
            f.max_deviation_mm(),
            f.reports.iter().filter(|r| !r.within_tolerance).count(),
            duration(start.elapsed())
        );
    }
    Ok(())
}

fn main() -> Result<(), String> {
    let raw: Vec<String> = std::env::args().collect();
    let args = if raw.iter().any(|a| a == "--bench") {
        Args::parse()
    } else {
        // `cargo test --all-targets` runs bench targets without `--bench`: a smoke run.
        eprintln!("compare: no --bench flag, so a smoke run (use `cargo bench --bench compare`)");
        Args::parse_from(["compare", "--glyphs", "12", "--reps", "1", "--arcs", "50"])
    };
    if args.ratline_only {
        return ratline_only(args.glyphs);
    }
    header(&args);
    let mut rows = Vec::new();
    let fonts = if args.only.contains(&Part::Fonts) || args.only.contains(&Part::Parallel) {
        Some((
            load_font("DejaVu Sans", jobs::DEJAVU, args.glyphs)?,
            load_font("Cantarell", jobs::CANTARELL, args.glyphs)?,
        ))
    } else {
        None
    };
    if let (true, Some((d, c))) = (args.only.contains(&Part::Fonts), &fonts) {
        font_rows(d, c, args.reps, args.kurbo_opt, &mut rows);
    }
    if args.only.contains(&Part::Circles) {
        circle_rows(args.reps, &mut rows);
    }
    if args.only.contains(&Part::Arcs) {
        rows.push(arc_row(args.arcs, args.dense_arcs, args.reps));
    }
    print_rows(&rows);
    for row in &rows {
        if let (Some(n), Some(k)) = (row.font_contours, &row.kurbo) {
            println!(
                "\n{} {}: per contour ratline {:.1} µs, kurbo {:.1} µs",
                row.input,
                row.target,
                row.ratline.time.as_secs_f64() * 1e6 / n as f64,
                k.time.as_secs_f64() * 1e6 / n as f64
            );
        }
    }
    if let (true, Some((d, c))) = (args.only.contains(&Part::Parallel), &fonts) {
        let par = parallel_rows(d, c, args.reps)?;
        println!();
        println!("| parallel job (convert::fit_outline, rayon) | 1 thread | 2 threads | speed-up | identical results |");
        println!("|---|---|---|---|---|");
        for p in par {
            println!(
                "| {} | {} | {} | {} | {} |",
                p.job,
                duration(p.one),
                duration(p.two),
                ratio(p.one.as_secs_f64(), p.two.as_secs_f64()),
                if p.identical { "yes" } else { "NO" }
            );
        }
    }
    Ok(())
}
