//! The `proof` subcommand: arguments, the plan (every input probed, every
//! profile resolved, every output path checked before work starts), the
//! parallel proofs, and the writes through one output guard: each image's
//! outputs are staged as soon as it is done, and put in place only once
//! every image has been proofed: every output or none.
//!
//! # Memory
//!
//! Each image is refused from its header above `--max-pixels` (see
//! [`crate::proof::raster`]). Images are proofed by one worker per thread of
//! the pool, each image's pixels in parallel over the pool; a worker starts
//! an image only while the estimated working memory of the images in
//! progress, this one included, stays within [`WORKING_BUDGET`] (an image
//! larger than that runs alone). Proofs and maps are staged to their
//! temporary files as soon as they are encoded, so nothing of a finished
//! image stays in memory.

use std::collections::HashMap;
use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::{Condvar, Mutex};

use clap::Args;

use super::{Error, Outcome};
use super::{IntentArg, ProfileArgs};
use crate::conditions::{Conditions, GamutTest};
use crate::icc::transform::PressMapping;
use crate::icc::{Direction, IccError, IccProfile, Origin};
use crate::io::Outputs;
use crate::proof::heat::HeatScale;
use crate::proof::raster::{self, DecodeLimits, FileKind, Raster, RasterError, RasterInfo, RgbImage};
use crate::proof::result::{Channels, ImageReport, ProfileSource, ProofReport};
use crate::proof::{check_embedded, Method, ProofEngine};
use crate::swatch::check::DEFAULT_TOLERANCE;

#[derive(Args, Debug)]
pub struct ProofArgs {
    /// Images (PNG, JPEG or TIFF; grey or RGB, 8 or 16 bits per channel; CMYK TIFF) or folders of them.
    /// An image without an embedded ICC profile is taken to be in the --screen profile, a CMYK one
    /// in --press; a CMYK image is press data, proofed press → screen only.
    #[arg(required = true, value_name = "IMAGE")]
    pub images: Vec<PathBuf>,
    /// Where proofs go: a folder (made if missing; NAME.proof.EXT, same format as the input)
    /// or, for one image, a file whose extension (.png, .jpg, .tif) picks the format.
    #[arg(long, value_name = "DIR|FILE")]
    pub out: PathBuf,
    #[command(flatten)]
    pub profiles: ProfileArgs,
    /// Rendering intent from the image to the press.
    #[arg(long, value_enum, default_value = "relative")]
    pub intent: IntentArg,
    /// Turn black point compensation off (it is on by default; it applies to image → press only).
    #[arg(long)]
    pub no_bpc: bool,
    /// Show the print on the paper's own white (press → screen absolute colorimetric).
    #[arg(long)]
    pub paper_white: bool,
    /// Also write a ΔE00 map (PNG, with an SVG legend beside it): a folder (NAME.delta.png)
    /// or, for one image, a .png file.
    #[arg(long, value_name = "FILE|DIR")]
    pub delta_map: Option<PathBuf>,
    /// Write JSON instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Exit with code 1 when an image's 95th-percentile ΔE00 is above --tolerance.
    #[arg(long)]
    pub strict: bool,
    /// Largest acceptable 95th-percentile CIEDE2000. The default 3.0 is a rule of thumb, not a standard.
    #[arg(long, allow_negative_numbers = true, value_name = "ΔE00", default_value_t = DEFAULT_TOLERANCE)]
    pub tolerance: f64,
    /// No progress bar.
    #[arg(long)]
    pub quiet: bool,
    /// Largest image to read, in megapixels (width × height / 10⁶), checked from the file's header
    /// before any pixel is decoded. A 100-MP 8-bit RGB image takes about 0.4 GB to proof, 0.7 GB with
    /// --delta-map (16-bit and alpha take more); raise it for larger images on a machine with the memory.
    #[arg(long, value_name = "MEGAPIXELS", default_value_t = DecodeLimits::DEFAULT_MEGAPIXELS)]
    pub max_pixels: f64,
}

/// Estimated working memory of the images proofed at once: 1 GiB. An image
/// whose estimate alone is larger runs by itself.
pub const WORKING_BUDGET: u64 = 1 << 30;

/// A raster error, with the way out when the image is over the pixel limit.
fn with_limit_hint(e: RasterError) -> Error {
    match e {
        RasterError::TooManyPixels { .. } => format!("{e}; raise it with --max-pixels MEGAPIXELS").into(),
        e => e.into(),
    }
}

/// Estimated peak bytes of proofing one image, stage by stage: decoding
/// (with what the decoder holds besides: the image crate's TIFF buffer, the
/// JPEG file and, for progressive JPEG, 2 bytes per sample of DCT
/// coefficients), splitting alpha off, grey → RGB, the proof (written over
/// the samples unless proof pixels are larger) and the map, encoding the map
/// and then the proof (alpha joined back), each encoded file counted at its
/// raw size. [`proof_one`] drops each buffer once its part is done.
pub fn working_bytes(info: &RasterInfo, file_len: u64, map: bool) -> u64 {
    let px = info.pixels() as u64;
    let bps = info.bytes_per_sample() as u64;
    let ch = info.channels as u64;
    let a = u64::from(info.has_alpha);
    let decoded = (ch + a) * bps;
    let (extra, file) = match info.kind {
        FileKind::Tiff if info.channels != 4 => (decoded, 0),
        FileKind::Jpeg => (2 * ch, file_len),
        _ => (0, 0),
    };
    let m = if map { 3 } else { 0 };
    let decode = decoded + extra + a * bps;
    let grey = info.channels == 1 && info.icc.is_none();
    let expand = if grey { ch * bps + 3 * bps + a * bps } else { 0 };
    let samples = if grey { 3 * bps } else { ch * bps };
    let apart = if 3 * bps > samples { 3 * bps } else { 0 };
    let run = samples + apart + a * bps + m;
    let proof = 3 * bps;
    let map_encode = proof + a * bps + 2 * m;
    let proof_encode = proof + a * bps + a * 4 * bps + (3 + a) * bps;
    let per_px = decode.max(expand).max(run).max(map_encode).max(proof_encode);
    px.saturating_mul(per_px).saturating_add(file)
}

/// Working memory handed out to the images in progress.
struct Budget {
    limit: u64,
    /// Bytes and images in progress.
    used: Mutex<(u64, usize)>,
    freed: Condvar,
}

struct Held<'a> {
    budget: &'a Budget,
    bytes: u64,
}

impl Budget {
    fn new(limit: u64) -> Self {
        Self {
            limit,
            used: Mutex::new((0, 0)),
            freed: Condvar::new(),
        }
    }

    /// Waits until `bytes` fit beside the images in progress, or none is.
    fn take(&self, bytes: u64) -> Held<'_> {
        let mut g = self.used.lock().unwrap_or_else(|e| e.into_inner());
        while g.1 > 0 && g.0.saturating_add(bytes) > self.limit {
            g = self.freed.wait(g).unwrap_or_else(|e| e.into_inner());
        }
        g.0 += bytes;
        g.1 += 1;
        Held { budget: self, bytes }
    }
}

impl Drop for Held<'_> {
    fn drop(&mut self) {
        let mut g = self.budget.used.lock().unwrap_or_else(|e| e.into_inner());
        g.0 -= self.bytes;
        g.1 -= 1;
        self.budget.freed.notify_all();
    }
}

const IMAGE_EXTENSIONS: [&str; 5] = ["png", "jpg", "jpeg", "tif", "tiff"];

fn is_image_name(p: &Path) -> bool {
    p.extension()
        .and_then(|e| e.to_str())
        .is_some_and(|e| IMAGE_EXTENSIONS.contains(&e.to_ascii_lowercase().as_str()))
}

/// Files named on the command line, with folders replaced by the images in
/// them (not recursive, sorted by name).
fn expand_inputs(args: &[PathBuf]) -> Result<Vec<PathBuf>, Error> {
    let mut out = Vec::new();
    for a in args {
        if a.is_dir() {
            let rd = std::fs::read_dir(a).map_err(|e| format!("'{}': cannot read the folder: {e}", a.display()))?;
            let mut found: Vec<PathBuf> = rd
                .filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|p| p.is_file() && is_image_name(p))
                .collect();
            if found.is_empty() {
                return Err(format!("'{}': no PNG, JPEG or TIFF images in this folder", a.display()).into());
            }
            found.sort();
            out.extend(found);
        } else if a.exists() {
            out.push(a.clone());
        } else {
            return Err(format!("'{}': no such file or folder", a.display()).into());
        }
    }
    Ok(out)
}

/// An output argument: a folder, or a single file.
enum Target {
    Dir(PathBuf),
    File(PathBuf),
}

fn target(p: &Path, count: usize, flag: &str) -> Result<Target, Error> {
    if p.is_dir() || !is_image_name(p) {
        if p.exists() && !p.is_dir() {
            return Err(format!("'{}': {flag} names a file that is not a PNG, JPEG or TIFF", p.display()).into());
        }
        Ok(Target::Dir(p.to_path_buf()))
    } else if count > 1 {
        Err(format!(
            "'{}': {flag} must be a folder when proofing {count} images",
            p.display()
        )
        .into())
    } else {
        Ok(Target::File(p.to_path_buf()))
    }
}

fn stem(p: &Path) -> String {
    p.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default()
}

struct Job {
    input: PathBuf,
    info: RasterInfo,
    out: PathBuf,
    out_kind: FileKind,
    map: Option<(PathBuf, PathBuf)>,
    engine: usize,
    /// Estimated working memory ([`working_bytes`]).
    cost: u64,
    /// Grey pixels without a profile of their own: shown as R = G = B in --screen.
    expand_grey: bool,
    profile: String,
    source: ProfileSource,
}

pub fn run_proof(a: ProofArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    super::check_tolerance(a.tolerance)?;
    let limits = DecodeLimits::from_megapixels(a.max_pixels).ok_or_else(|| {
        format!(
            "--max-pixels must be a number of megapixels above 0, not {}",
            a.max_pixels
        )
    })?;
    // The plan.
    let screen = IccProfile::load(&a.profiles.screen)?.require_screen()?;
    let press = IccProfile::load(&a.profiles.press)?.require_press()?;
    let mapping = PressMapping {
        intent: a.intent.into(),
        bpc: !a.no_bpc,
        paper_white: a.paper_white,
    };
    let inputs = expand_inputs(&a.images)?;
    let out_target = target(&a.out, inputs.len(), "--out")?;
    let map_target = match &a.delta_map {
        Some(p) => {
            let t = target(p, inputs.len(), "--delta-map")?;
            if let Target::File(f) = &t {
                if FileKind::from_extension(f) != Some(FileKind::Png) {
                    return Err(format!(
                        "'{}': --delta-map writes PNG; name a .png file or a folder",
                        f.display()
                    )
                    .into());
                }
            }
            Some(t)
        }
        None => None,
    };
    let mut outputs = super::guarded_outputs(&[], &[&screen, &press]);
    for input in &inputs {
        outputs.input(input);
    }
    let mut engines: Vec<ProofEngine> = Vec::new();
    let mut engine_of: HashMap<(Option<Vec<u8>>, usize, u8), usize> = HashMap::new();
    let mut jobs = Vec::with_capacity(inputs.len());
    for input in &inputs {
        let info = raster::probe_within(input, &limits).map_err(with_limit_hint)?;
        let (out_path, out_kind) = match &out_target {
            Target::Dir(d) => {
                let ext = input.extension().and_then(|e| e.to_str()).unwrap_or("png").to_string();
                (
                    d.join(format!("{}.proof.{ext}", stem(input))),
                    FileKind::from_extension(Path::new(&format!("x.{ext}"))).unwrap_or(info.kind),
                )
            }
            Target::File(f) => (f.clone(), FileKind::from_extension(f).unwrap_or(info.kind)),
        };
        if out_kind == FileKind::Jpeg && (info.bits != 8 || info.has_alpha) {
            return Err(format!(
                "'{}': JPEG holds 8-bit RGB without alpha; this image is {}-bit{}: write PNG or TIFF",
                out_path.display(),
                info.bits,
                if info.has_alpha { " with alpha" } else { "" }
            )
            .into());
        }
        outputs.claim(&out_path)?;
        let map = match &map_target {
            Some(Target::Dir(d)) => Some((
                d.join(format!("{}.delta.png", stem(input))),
                d.join(format!("{}.delta-legend.svg", stem(input))),
            )),
            Some(Target::File(f)) => Some((f.clone(), f.with_extension("legend.svg"))),
            None => None,
        };
        if let Some((m, l)) = &map {
            outputs.claim(m)?;
            outputs.claim(l)?;
        }
        let unusable = |e: &IccError| -> Error {
            format!("'{}': its embedded ICC profile cannot be used: {e}", input.display()).into()
        };
        let embedded = match &info.icc {
            Some(bytes) => {
                let name = format!("{} (embedded profile)", input.display());
                let p = IccProfile::from_bytes(&name, Origin::File(input.clone()), bytes.clone())
                    .map_err(|e| unusable(&e))?;
                check_embedded(&p, info.channels).map_err(|e| format!("'{}': {e}", input.display()))?;
                Some(p)
            }
            None => None,
        };
        let expand_grey = embedded.is_none() && info.channels == 1;
        let channels = if expand_grey { 3 } else { info.channels };
        let key = (info.icc.clone(), channels, info.bits);
        let engine = match engine_of.get(&key) {
            Some(&i) => i,
            None => {
                let fallback = if info.channels == 4 { &press } else { &screen };
                let src = embedded.as_ref().unwrap_or(fallback);
                let built =
                    ProofEngine::new(src, channels, info.bits, &screen, &press, mapping).map_err(|e| {
                        match (&embedded, &e) {
                            (Some(p), IccError::Transform { name, .. }) if *name == p.name => unusable(&e),
                            _ => Error::from(e),
                        }
                    })?;
                engines.push(built);
                engine_of.insert(key, engines.len() - 1);
                engines.len() - 1
            }
        };
        let (profile, source) = match &embedded {
            Some(p) => (p.name.clone(), ProfileSource::Embedded),
            None if info.channels == 4 => (press.name.clone(), ProfileSource::Assumed),
            None => (screen.name.clone(), ProfileSource::Assumed),
        };
        let file_len = std::fs::metadata(input).map(|m| m.len()).unwrap_or(0);
        let cost = working_bytes(&info, file_len, map.is_some());
        jobs.push(Job {
            input: input.clone(),
            cost,
            info,
            out: out_path,
            out_kind,
            map,
            engine,
            expand_grey,
            profile,
            source,
        });
    }
    let heat = if map_target.is_some() {
        Some(HeatScale::new()?)
    } else {
        None
    };

    // The work, in parallel; outputs are staged, none is put in place yet.
    let bar = if a.quiet || a.json || !std::io::stderr().is_terminal() {
        indicatif::ProgressBar::hidden()
    } else {
        indicatif::ProgressBar::new(jobs.len() as u64)
    };
    let screen_icc = screen.bytes.clone();
    let ctx = Work {
        engines: &engines,
        heat: heat.as_ref(),
        screen_icc: &screen_icc,
        tolerance: a.tolerance,
        limits,
        outputs: Mutex::new(outputs),
    };
    let images = proof_all(&jobs, &ctx, &bar);
    bar.finish_and_clear();
    let images = images?;
    ctx.outputs.into_inner().unwrap_or_else(|e| e.into_inner()).commit()?;

    let beyond = images.iter().any(|i| !i.within_tolerance);
    let mut notes = Vec::new();
    notes.extend(press.intent_note(mapping.intent, Direction::FromPcs));
    if jobs.iter().any(|j| j.info.channels == 1) {
        notes.push("grey images are proofed to RGB: the press may not print grey neutral".to_string());
    }
    if jobs.iter().any(|j| j.info.channels == 4) {
        notes.push(
            "CMYK images are press data: proofed press → screen only (intent and BPC do not apply); \
             their ΔE00 is between the press colour and what the screen shows of it, and none is outside the press gamut"
                .to_string(),
        );
    }
    if jobs.iter().any(|j| j.info.has_alpha) {
        notes.push("alpha is carried over unchanged; statistics count every pixel whatever its alpha".to_string());
    }
    let r = ProofReport {
        conditions: Conditions::new(&screen, &press, mapping, a.tolerance, GamutTest::RoundTrip, None, notes),
        images,
    };
    if a.json {
        crate::report::write_json(out, &r)?;
    } else {
        crate::report::proof::render(out, &r, super::use_color())?;
    }
    Ok(if a.strict && beyond {
        Outcome::BeyondTolerance
    } else {
        Outcome::Done
    })
}

/// R = G = B from grey samples.
fn expand_grey(r: &mut Raster) {
    let bps = r.info.bytes_per_sample();
    let mut rgb = Vec::with_capacity(r.color.len() * 3);
    for s in r.color.chunks_exact(bps) {
        for _ in 0..3 {
            rgb.extend_from_slice(s);
        }
    }
    r.color = rgb;
    r.info.channels = 3;
}

/// What every image's proof shares.
struct Work<'a> {
    engines: &'a [ProofEngine],
    heat: Option<&'a HeatScale>,
    screen_icc: &'a [u8],
    tolerance: f64,
    limits: DecodeLimits,
    outputs: Mutex<Outputs>,
}

impl Work<'_> {
    fn stage(&self, path: &Path, bytes: &[u8]) -> Result<(), Error> {
        let mut o = self.outputs.lock().unwrap_or_else(|e| e.into_inner());
        o.stage_bytes(path, bytes)?;
        Ok(())
    }
}

/// What became of a job: `None` when it was not started because another had
/// failed.
type JobResult = Option<Result<ImageReport, Error>>;

/// Proofs every job, in parallel within [`WORKING_BUDGET`]; the reports in
/// job order, or the error of the first job that failed (no new image starts
/// after a failure).
fn proof_all(jobs: &[Job], ctx: &Work<'_>, bar: &indicatif::ProgressBar) -> Result<Vec<ImageReport>, Error> {
    let budget = Budget::new(WORKING_BUDGET);
    let next = AtomicUsize::new(0);
    let failed = AtomicBool::new(false);
    let done: Mutex<Vec<(usize, JobResult)>> = Mutex::new(Vec::with_capacity(jobs.len()));
    let workers = rayon::current_num_threads().clamp(1, jobs.len().max(1));
    std::thread::scope(|scope| {
        for _ in 0..workers {
            scope.spawn(|| loop {
                if failed.load(Ordering::Relaxed) {
                    break;
                }
                let i = next.fetch_add(1, Ordering::Relaxed);
                let Some(job) = jobs.get(i) else { break };
                let held = budget.take(job.cost);
                let r = if failed.load(Ordering::Relaxed) {
                    None
                } else {
                    Some(proof_one(job, ctx))
                };
                drop(held);
                if matches!(r, Some(Err(_))) {
                    failed.store(true, Ordering::Relaxed);
                }
                bar.inc(1);
                done.lock().unwrap_or_else(|e| e.into_inner()).push((i, r));
            });
        }
    });
    let mut done = done.into_inner().unwrap_or_else(|e| e.into_inner());
    done.sort_by_key(|(i, _)| *i);
    let mut reports = Vec::with_capacity(done.len());
    for (_, r) in done {
        match r {
            Some(Ok(rep)) => reports.push(rep),
            Some(Err(e)) => return Err(e),
            None => {}
        }
    }
    Ok(reports)
}

/// Reads, proofs, encodes and stages one image; its buffers are dropped as
/// soon as their part is done.
fn proof_one(job: &Job, ctx: &Work<'_>) -> Result<ImageReport, Error> {
    let engine = &ctx.engines[job.engine];
    let mut r = raster::read_within(&job.input, &ctx.limits).map_err(with_limit_hint)?;
    if r.info != job.info {
        return Err(format!(
            "'{}': the file changed while inkfit was reading it",
            job.input.display()
        )
        .into());
    }
    if job.expand_grey {
        expand_grey(&mut r);
    }
    let (w, h, bits) = (r.info.width, r.info.height, r.info.bits);
    let alpha = r.alpha.take();
    let o = engine.run_owned(std::mem::take(&mut r.color), ctx.heat, Method::Table);
    let stats = o.tally.summary();
    if let (Some((m, l)), Some(heat), Some(pixels)) = (&job.map, ctx.heat, o.map) {
        let png = raster::encode(
            m,
            FileKind::Png,
            &RgbImage {
                width: w,
                height: h,
                bits: 8,
                rgb: &pixels,
                alpha: None,
            },
            &heat.srgb_icc,
        )?;
        drop(pixels);
        ctx.stage(m, &png)?;
        drop(png);
        let title = format!("ΔE00 map of {}", file_name(&job.input));
        ctx.stage(l, heat.legend_svg(&title).as_bytes())?;
    }
    let proof = raster::encode(
        &job.out,
        job.out_kind,
        &RgbImage {
            width: w,
            height: h,
            bits,
            rgb: &o.proof,
            alpha: alpha.as_deref(),
        },
        ctx.screen_icc,
    )?;
    drop(o.proof);
    drop(alpha);
    ctx.stage(&job.out, &proof)?;
    Ok(ImageReport {
        input: job.input.display().to_string(),
        output: job.out.display().to_string(),
        delta_map: job.map.as_ref().map(|(m, _)| m.display().to_string()),
        legend: job.map.as_ref().map(|(_, l)| l.display().to_string()),
        width: w,
        height: h,
        bits: job.info.bits,
        channels: Channels::of_count(job.info.channels),
        alpha: job.info.has_alpha,
        profile: job.profile.clone(),
        profile_source: job.source,
        within_tolerance: stats.p95 <= ctx.tolerance,
        stats,
    })
}

fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::sync::mpsc;
    use std::time::Duration;

    #[test]
    fn budget_holds_back_what_does_not_fit_and_lets_a_large_image_run_alone() {
        let b = Budget::new(10);
        let first = b.take(6);
        let (tx, rx) = mpsc::channel();
        std::thread::scope(|s| {
            s.spawn(|| {
                let _second = b.take(6);
                tx.send(()).unwrap();
            });
            // 6 + 6 > 10: the second waits while the first is held.
            assert!(rx.recv_timeout(Duration::from_millis(200)).is_err());
            drop(first);
            rx.recv_timeout(Duration::from_secs(10))
                .expect("starts once the first is done");
        });
        // Larger than the whole budget, with nothing else in progress: runs.
        let big = b.take(25);
        assert_eq!(*b.used.lock().unwrap(), (25, 1));
        drop(big);
        assert_eq!(*b.used.lock().unwrap(), (0, 0));
        // Small ones share it.
        let (x, y) = (b.take(4), b.take(5));
        assert_eq!(*b.used.lock().unwrap(), (9, 2));
        drop((x, y));
    }

    #[test]
    fn working_estimate_counts_the_layouts_that_cost_more() {
        let info = |channels, bits, has_alpha, kind| RasterInfo {
            kind,
            width: 1000,
            height: 1000,
            channels,
            bits,
            has_alpha,
            icc: None,
        };
        let rgb8 = working_bytes(&info(3, 8, false, FileKind::Png), 0, false);
        // 8-bit RGB: the proof over the samples (3) plus its encoded file (3).
        assert_eq!(rgb8, 6_000_000);
        // A map adds its pixels, and its file while the proof is still held.
        assert_eq!(working_bytes(&info(3, 8, false, FileKind::Png), 0, true), 9_000_000);
        // 16 bits double it; alpha and the image crate's TIFF buffer add more.
        assert_eq!(working_bytes(&info(3, 16, false, FileKind::Png), 0, false), 12_000_000);
        assert!(working_bytes(&info(3, 8, true, FileKind::Png), 0, false) > rgb8);
        // A JPEG's file is held whole while it decodes.
        assert!(working_bytes(&info(3, 8, false, FileKind::Jpeg), 50_000_000, false) > 50_000_000);
    }
}
