//! The `proof` subcommand: arguments, the plan (every input probed, every
//! profile resolved, every output path checked before work starts), the
//! parallel proofs, and the writes through one output guard: each image's
//! outputs are staged as soon as it is done, and put in place only once
//! every image has been proofed: every output or none.
//!
//! # Memory
//!
//! Each image is refused from its header above `--max-pixels` (see
//! [`crate::raster`]). Images are proofed by one worker per thread of
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
use std::sync::Mutex;

use clap::Args;

use super::proof_budget::{working_bytes, Budget, WORKING_BUDGET};

use super::{Error, Outcome};
use super::{IntentArg, ProfileArgs};
use crate::conditions::{Conditions, GamutTest};
use crate::icc::transform::PressMapping;
use crate::icc::{Direction, IccError, IccProfile, Origin};
use crate::io::Outputs;
use crate::proof::heat::HeatScale;
use crate::proof::result::{Channels, ImageReport, ProfileSource, ProofReport};
use crate::proof::{check_embedded, Method, ProofEngine};
use crate::raster::{self, DecodeLimits, FileKind, Raster, RasterError, RasterInfo, RgbImage};
use crate::report::html::proof::{picture_side, ImagePictures, ProofPage, MAX_PAGE_PICTURES};
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
    /// Also write one self-contained HTML page: each image as on screen, its soft proof and its
    /// ΔE00 map with the scale (small copies), and the statistics.
    #[arg(long, value_name = "FILE.html")]
    pub html: Option<PathBuf>,
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

/// A raster error, with the way out when the image is over the pixel limit.
fn with_limit_hint(e: RasterError) -> Error {
    match e {
        RasterError::TooManyPixels { .. } => format!("{e}; raise it with --max-pixels MEGAPIXELS").into(),
        e => e.into(),
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

/// Where proofs and maps go.
struct Targets {
    out: Target,
    map: Option<Target>,
}

/// Everything checked and built before any pixel is proofed.
struct Plan {
    screen: IccProfile,
    press: IccProfile,
    mapping: PressMapping,
    limits: DecodeLimits,
    /// One engine per distinct (embedded profile, channels, bits).
    engines: Vec<ProofEngine>,
    jobs: Vec<Job>,
    heat: Option<HeatScale>,
    outputs: Outputs,
}

/// `inkfit proof`: the plan (every input, output and engine checked and
/// built), the work (every image proofed, outputs staged, then committed all
/// together) and the report.
pub fn run_proof(a: ProofArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    let plan = plan(&a)?;
    let done = work(&a, plan)?;
    write_report(&a, done, out)
}

fn plan(a: &ProofArgs) -> Result<Plan, Error> {
    super::check_tolerance(a.tolerance)?;
    let limits = DecodeLimits::from_megapixels(a.max_pixels).ok_or_else(|| {
        format!(
            "--max-pixels must be a number of megapixels above 0, not {}",
            a.max_pixels
        )
    })?;
    let screen = IccProfile::load(&a.profiles.screen)?.require_screen()?;
    let press = IccProfile::load(&a.profiles.press)?.require_press()?;
    let mapping = PressMapping {
        intent: a.intent.into(),
        bpc: !a.no_bpc,
        paper_white: a.paper_white,
    };
    if let Some(p) = &a.html {
        super::check_html_path(p)?;
    }
    let inputs = expand_inputs(&a.images)?;
    let targets = targets(a, inputs.len())?;
    let mut outputs = super::guarded_outputs(&[], &[&screen, &press]);
    for input in &inputs {
        outputs.input(input);
    }
    if let Some(p) = &a.html {
        outputs.claim(p)?;
    }
    let mut plan = Plan {
        screen,
        press,
        mapping,
        limits,
        engines: Vec::new(),
        jobs: Vec::with_capacity(inputs.len()),
        heat: None,
        outputs,
    };
    let mut engine_of: HashMap<(Option<Vec<u8>>, usize, u8), usize> = HashMap::new();
    for input in &inputs {
        let job = plan_job(input, &targets, &mut plan, &mut engine_of)?;
        plan.jobs.push(job);
    }
    if targets.map.is_some() || a.html.is_some() {
        plan.heat = Some(HeatScale::new()?);
    }
    Ok(plan)
}

/// `--out` and `--delta-map` for `count` inputs; a single map file must be PNG.
fn targets(a: &ProofArgs, count: usize) -> Result<Targets, Error> {
    let out = target(&a.out, count, "--out")?;
    let map = match &a.delta_map {
        Some(p) => {
            let t = target(p, count, "--delta-map")?;
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
    Ok(Targets { out, map })
}

/// One input's job: its header read within the limits, its outputs claimed,
/// its profile checked and its engine found or built.
fn plan_job(
    input: &Path,
    targets: &Targets,
    plan: &mut Plan,
    engine_of: &mut HashMap<(Option<Vec<u8>>, usize, u8), usize>,
) -> Result<Job, Error> {
    let info = raster::probe_within(input, &plan.limits).map_err(with_limit_hint)?;
    let (out_path, out_kind) = match &targets.out {
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
    plan.outputs.claim(&out_path)?;
    let map = match &targets.map {
        Some(Target::Dir(d)) => Some((
            d.join(format!("{}.delta.png", stem(input))),
            d.join(format!("{}.delta-legend.svg", stem(input))),
        )),
        Some(Target::File(f)) => Some((f.clone(), f.with_extension("legend.svg"))),
        None => None,
    };
    if let Some((m, l)) = &map {
        plan.outputs.claim(m)?;
        plan.outputs.claim(l)?;
    }
    let unusable = |e: &IccError| -> Error {
        format!("'{}': its embedded ICC profile cannot be used: {e}", input.display()).into()
    };
    let embedded = match &info.icc {
        Some(bytes) => {
            let name = format!("{} (embedded profile)", input.display());
            let p = IccProfile::from_bytes(&name, Origin::File(input.to_path_buf()), bytes.clone())
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
            let fallback = if info.channels == 4 { &plan.press } else { &plan.screen };
            let src = embedded.as_ref().unwrap_or(fallback);
            let built = ProofEngine::new(src, channels, info.bits, &plan.screen, &plan.press, plan.mapping).map_err(
                |e| match (&embedded, &e) {
                    (Some(p), IccError::Transform { name, .. }) if *name == p.name => unusable(&e),
                    _ => Error::from(e),
                },
            )?;
            plan.engines.push(built);
            engine_of.insert(key, plan.engines.len() - 1);
            plan.engines.len() - 1
        }
    };
    let (profile, source) = match &embedded {
        Some(p) => (p.name.clone(), ProfileSource::Embedded),
        None if info.channels == 4 => (plan.press.name.clone(), ProfileSource::Assumed),
        None => (plan.screen.name.clone(), ProfileSource::Assumed),
    };
    let file_len = std::fs::metadata(input).map(|m| m.len()).unwrap_or(0);
    let cost = working_bytes(&info, file_len, map.is_some());
    Ok(Job {
        input: input.to_path_buf(),
        cost,
        info,
        out: out_path,
        out_kind,
        map,
        engine,
        expand_grey,
        profile,
        source,
    })
}

/// What the work leaves: the plan, every image's report and pictures (for
/// the page), and the outputs staged so far, not yet in place.
struct Done {
    plan: Plan,
    images: Vec<ImageReport>,
    pictures: Vec<Option<ImagePictures>>,
    outputs: Outputs,
}

/// The work, in parallel: outputs are staged while images are proofed; they
/// are put in place together, with the page, only when every image succeeded.
fn work(a: &ProofArgs, mut plan: Plan) -> Result<Done, Error> {
    let bar = if a.quiet || a.json || !std::io::stderr().is_terminal() {
        indicatif::ProgressBar::hidden()
    } else {
        indicatif::ProgressBar::new(plan.jobs.len() as u64)
    };
    let outputs = std::mem::replace(&mut plan.outputs, Outputs::new());
    let ctx = Work {
        engines: &plan.engines,
        heat: plan.heat.as_ref(),
        screen_icc: &plan.screen.bytes,
        tolerance: a.tolerance,
        limits: plan.limits,
        picture_side: a.html.as_ref().map(|_| picture_side(plan.jobs.len())),
        outputs: Mutex::new(outputs),
    };
    let done = proof_all(&plan.jobs, &ctx, &bar);
    bar.finish_and_clear();
    let (images, pictures) = done?.into_iter().unzip();
    let outputs = ctx.outputs.into_inner().unwrap_or_else(|e| e.into_inner());
    Ok(Done {
        plan,
        images,
        pictures,
        outputs,
    })
}

/// Notes on what the proofs can and cannot say about these inputs.
fn notes(plan: &Plan) -> Vec<String> {
    let jobs = &plan.jobs;
    let mut notes = Vec::new();
    notes.extend(plan.press.intent_note(plan.mapping.intent, Direction::FromPcs));
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
    notes
}

/// The report: the page staged and every output put in place, then the
/// table or JSON, and the outcome for `--strict`.
fn write_report(a: &ProofArgs, done: Done, out: &mut dyn Write) -> Result<Outcome, Error> {
    let Done {
        plan,
        images,
        pictures,
        mut outputs,
    } = done;
    let plan = &plan;
    let beyond = images.iter().any(|i| !i.within_tolerance);
    let conditions = Conditions::new(
        &plan.screen,
        &plan.press,
        plan.mapping,
        a.tolerance,
        GamutTest::RoundTrip,
        None,
        notes(plan),
    );
    let r = ProofReport { conditions, images };
    if let Some(p) = &a.html {
        let page = crate::report::html::proof::render(&ProofPage {
            report: &r,
            pictures: &pictures,
        });
        outputs.stage_bytes(p, page.as_bytes())?;
    }
    outputs.commit()?;
    if let Some(p) = &a.html {
        super::said_wrote(p, "the proof page");
    }
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
    /// The pictures' longest side when there is a page.
    picture_side: Option<u32>,
    outputs: Mutex<Outputs>,
}

impl Work<'_> {
    fn stage(&self, path: &Path, bytes: &[u8]) -> Result<(), Error> {
        let mut o = self.outputs.lock().unwrap_or_else(|e| e.into_inner());
        o.stage_bytes(path, bytes)?;
        Ok(())
    }
}

/// One image's report and its pictures for the page.
type Proofed = (ImageReport, Option<ImagePictures>);

/// What became of a job: `None` when it was not started because another had
/// failed.
type JobResult = Option<Result<Proofed, Error>>;

/// Proofs every job, in parallel within [`WORKING_BUDGET`]; the reports in
/// job order, or the error of the first job that failed (no new image starts
/// after a failure).
fn proof_all(jobs: &[Job], ctx: &Work<'_>, bar: &indicatif::ProgressBar) -> Result<Vec<Proofed>, Error> {
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
                    let side = ctx.picture_side.filter(|_| i < MAX_PAGE_PICTURES);
                    Some(proof_one(job, ctx, side))
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
/// soon as their part is done. With `side`, small copies for the page too.
fn proof_one(job: &Job, ctx: &Work<'_>, side: Option<u32>) -> Result<Proofed, Error> {
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
    // The picture as designed: RGB in its own profile (or the screen's).
    let screen_picture = match side {
        Some(side) if r.info.channels == 3 => {
            let (px, pw, ph) = raster::preview_mean(&r.color, w, h, bits, side);
            let icc = job.info.icc.as_deref().unwrap_or(ctx.screen_icc);
            Some(picture_png(&job.input, pw, ph, &px, icc)?)
        }
        _ => None,
    };
    let alpha = r.alpha.take();
    let o = engine.run_owned(std::mem::take(&mut r.color), ctx.heat, Method::Table);
    let stats = o.tally.summary();
    // The map's scale, for the page and for the legend file beside the map.
    let legend = ctx
        .heat
        .filter(|_| side.is_some() || job.map.is_some())
        .map(|heat| heat.legend_svg(&format!("ΔE00 map of {}", file_name(&job.input))));
    let mut pictures = None;
    if let (Some(side), Some(heat), Some(pixels), Some(legend)) = (side, ctx.heat, &o.map, &legend) {
        let (px, pw, ph) = raster::preview_mean(&o.proof, w, h, bits, side);
        let proof = picture_png(&job.out, pw, ph, &px, ctx.screen_icc)?;
        let (px, _, _) = raster::preview_brightest(pixels, w, h, side);
        pictures = Some(ImagePictures {
            size: (pw, ph),
            screen: screen_picture,
            proof,
            delta: picture_png(&job.out, pw, ph, &px, &heat.srgb_icc)?,
            legend: legend.clone(),
        });
    }
    if let (Some((m, l)), Some(heat), Some(pixels), Some(legend)) = (&job.map, ctx.heat, o.map, &legend) {
        let png = picture_png(m, w, h, &pixels, &heat.srgb_icc)?;
        drop(pixels);
        ctx.stage(m, &png)?;
        drop(png);
        ctx.stage(l, legend.as_bytes())?;
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
    let report = ImageReport {
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
    };
    Ok((report, pictures))
}

/// 8-bit RGB as PNG with its profile: the ΔE00 map and the page's small copies.
fn picture_png(name: &Path, width: u32, height: u32, rgb: &[u8], icc: &[u8]) -> Result<Vec<u8>, Error> {
    let img = RgbImage {
        width,
        height,
        bits: 8,
        rgb,
        alpha: None,
    };
    Ok(raster::encode(name, FileKind::Png, &img, icc)?)
}

fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}
