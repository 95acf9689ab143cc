//! The `proof` subcommand: arguments, the plan (every input probed, every
//! profile resolved, every output path checked before work starts), the
//! parallel proofs, and the writes, which happen only once every image has
//! been proofed, through one output guard: every output or none.

use std::collections::HashMap;
use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};

use clap::Args;
use rayon::prelude::*;

use super::commands::{Error, Outcome};
use super::{IntentArg, ProfileArgs};
use crate::icc::transform::PressMapping;
use crate::icc::{Direction, IccProfile, Origin};
use crate::proof::heat::HeatScale;
use crate::proof::raster::{self, FileKind, Raster, RasterInfo, RgbImage};
use crate::proof::report::{self, ImageReport, ProfileSource, ProofReport};
use crate::proof::{check_embedded, Method, ProofEngine, ROUND_TRIP_THRESHOLD};
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
    /// Grey pixels without a profile of their own: shown as R = G = B in --screen.
    expand_grey: bool,
    profile: String,
    source: ProfileSource,
}

struct Finished {
    proof: Vec<u8>,
    map: Option<(Vec<u8>, String)>,
    report: ImageReport,
}

pub fn run_proof(a: ProofArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    if !(a.tolerance.is_finite() && a.tolerance >= 0.0) {
        return Err(format!("--tolerance must be a ΔE00 of 0 or more, not {}", a.tolerance).into());
    }
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
    let mut outputs = super::commands::guarded_outputs(&[], &[&screen, &press]);
    for input in &inputs {
        outputs.input(input);
    }
    let mut engines: Vec<ProofEngine> = Vec::new();
    let mut engine_of: HashMap<(Option<Vec<u8>>, usize, u8), usize> = HashMap::new();
    let mut jobs = Vec::with_capacity(inputs.len());
    for input in &inputs {
        let info = raster::probe(input)?;
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
        let embedded = match &info.icc {
            Some(bytes) => {
                let name = format!("{} (embedded profile)", input.display());
                let p = IccProfile::from_bytes(&name, Origin::File(input.clone()), bytes.clone())
                    .map_err(|e| format!("'{}': its embedded ICC profile cannot be used: {e}", input.display()))?;
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
                engines.push(ProofEngine::new(src, channels, info.bits, &screen, &press, mapping)?);
                engine_of.insert(key, engines.len() - 1);
                engines.len() - 1
            }
        };
        let (profile, source) = match &embedded {
            Some(p) => (p.name.clone(), ProfileSource::Embedded),
            None if info.channels == 4 => (press.name.clone(), ProfileSource::Assumed),
            None => (screen.name.clone(), ProfileSource::Assumed),
        };
        jobs.push(Job {
            input: input.clone(),
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

    // The work, in parallel; nothing is written yet.
    let bar = if a.quiet || a.json || !std::io::stderr().is_terminal() {
        indicatif::ProgressBar::hidden()
    } else {
        indicatif::ProgressBar::new(jobs.len() as u64)
    };
    let screen_icc = screen.bytes.clone();
    let tolerance = a.tolerance;
    let results: Vec<Result<Finished, Error>> = jobs
        .par_iter()
        .map(|job| {
            let r = proof_one(job, &engines[job.engine], heat.as_ref(), &screen_icc, tolerance);
            bar.inc(1);
            r
        })
        .collect();
    bar.finish_and_clear();
    let mut finished = Vec::with_capacity(results.len());
    for r in results {
        finished.push(r?);
    }

    // The writes: all of them, or none.
    for (job, f) in jobs.iter().zip(&finished) {
        outputs.stage_bytes(&job.out, &f.proof)?;
        if let (Some((m, l)), Some((png, svg))) = (&job.map, &f.map) {
            outputs.stage_bytes(m, png)?;
            outputs.stage_bytes(l, svg.as_bytes())?;
        }
    }
    outputs.commit()?;

    let images: Vec<ImageReport> = finished.into_iter().map(|f| f.report).collect();
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
        screen: screen.name.clone(),
        press: press.name.clone(),
        intent: mapping.intent,
        bpc: mapping.bpc,
        paper_white: mapping.paper_white,
        tolerance: a.tolerance,
        gamut_test: format!(
            "round trip CIELAB → press → CIELAB (relative colorimetric, no BPC) within ΔE00 {ROUND_TRIP_THRESHOLD:.1}"
        ),
        notes,
        images,
    };
    if a.json {
        crate::report::write_json(out, &r)?;
    } else {
        let color = std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty());
        report::render(out, &r, color)?;
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

fn proof_one(
    job: &Job,
    engine: &ProofEngine,
    heat: Option<&HeatScale>,
    screen_icc: &[u8],
    tolerance: f64,
) -> Result<Finished, Error> {
    let mut r = raster::read(&job.input)?;
    if r.info.width != job.info.width || r.info.height != job.info.height {
        return Err(format!(
            "'{}': the file changed while inkfit was reading it",
            job.input.display()
        )
        .into());
    }
    if job.expand_grey {
        expand_grey(&mut r);
    }
    let o = engine.run(&r, heat, Method::Table);
    let (w, h) = (r.info.width, r.info.height);
    let proof = raster::encode(
        &job.out,
        job.out_kind,
        &RgbImage {
            width: w,
            height: h,
            bits: r.info.bits,
            rgb: &o.proof,
            alpha: r.alpha.as_deref(),
        },
        screen_icc,
    )?;
    let map = match (&job.map, heat, &o.map) {
        (Some((m, _)), Some(heat), Some(pixels)) => {
            let png = raster::encode(
                m,
                FileKind::Png,
                &RgbImage {
                    width: w,
                    height: h,
                    bits: 8,
                    rgb: pixels,
                    alpha: None,
                },
                &heat.srgb_icc,
            )?;
            let title = format!("ΔE00 map of {}", file_name(&job.input));
            Some((png, heat.legend_svg(&title)))
        }
        _ => None,
    };
    let stats = o.tally.summary();
    Ok(Finished {
        proof,
        map,
        report: ImageReport {
            input: job.input.display().to_string(),
            output: job.out.display().to_string(),
            delta_map: job.map.as_ref().map(|(m, _)| m.display().to_string()),
            legend: job.map.as_ref().map(|(_, l)| l.display().to_string()),
            width: w,
            height: h,
            bits: job.info.bits,
            channels: match job.info.channels {
                1 => "grey",
                4 => "cmyk",
                _ => "rgb",
            },
            alpha: job.info.has_alpha,
            profile: job.profile.clone(),
            profile_source: job.source,
            within_tolerance: stats.p95 <= tolerance,
            stats,
        },
    })
}

fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}
