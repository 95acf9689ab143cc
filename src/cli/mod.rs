//! Command-line interface: clap definitions, a plan resolved
//! from the arguments before any work starts, and one small `run` per
//! subcommand. Built only with the `cli` feature (on by default): the
//! library alone needs neither clap nor a progress bar.
//!
//! The subcommand modules use this module's [`Error`], [`Outcome`] and
//! helpers; it calls them only through [`run`].

mod check;
mod gamut;
pub mod plot;
mod profiles;
mod proof;
mod proof_budget;
pub mod repair;

use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};

use clap::{Args, Parser, Subcommand, ValueEnum};

use crate::icc::IccProfile;
use crate::io::Outputs;

/// The command line: one subcommand.
#[derive(Parser, Debug)]
#[command(
    name = "inkfit",
    version,
    about = "Will these screen colours survive the press? ICC-based checks for print.",
    after_help = "Exit codes: 0 the job ran; 1 a result beyond tolerance under --strict; 2 an error.\n\
                  A profile argument is a built-in name (see `inkfit profiles`) or a path to an ICC file."
)]
pub struct Cli {
    /// The subcommand to run.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Check each colour of a palette against the press: CMYK, ink, printed CIELAB, CIEDE2000, gamut.
    Check(CheckArgs),
    /// Colour difference of two colours: ΔE*ab, ΔE*94, CIEDE2000 and CMC(2:1).
    Delta(DeltaArgs),
    /// Describe an ICC profile: identity, white, intents with tables, primaries, maximum ink.
    Inspect(InspectArgs),
    /// List the built-in profiles.
    Profiles(ProfilesArgs),
    /// Soft-proof images: how they print on the press, a CIEDE2000 map and statistics.
    Proof(proof::ProofArgs),
    /// Gamut of each profile in CIELAB: volume, lightness range, chroma per hue, coverage of each pair, meshes.
    Gamut(GamutArgs),
    /// Draw a figure as SVG: xy or u′v′ chromaticity diagram, a*b* slices, or a hue leaf.
    Plot(plot::PlotArgs),
    /// Propose the nearest palette that prints: inside the press gamut, classes kept apart, order kept.
    Repair(repair::RepairArgs),
    /// Maintainers: rebuild a built-in press profile from its printing model.
    #[command(hide = true)]
    BuildPress(BuildPressArgs),
}

/// `--intent`: the rendering intent from screen to press.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum IntentArg {
    /// The press profile's perceptual rendering.
    Perceptual,
    /// Relative colorimetric: colours kept where the press can print them, white mapped to the paper's white.
    Relative,
    /// The press profile's saturation rendering.
    Saturation,
    /// Absolute colorimetric: colours kept as measured, the paper's white included.
    Absolute,
}

impl From<IntentArg> for crate::icc::RenderingIntent {
    fn from(i: IntentArg) -> Self {
        use crate::icc::RenderingIntent as R;
        match i {
            IntentArg::Perceptual => R::Perceptual,
            IntentArg::Relative => R::Relative,
            IntentArg::Saturation => R::Saturation,
            IntentArg::Absolute => R::Absolute,
        }
    }
}

/// `--screen` and `--press`: the two profiles of a check.
#[derive(Args, Debug)]
pub struct ProfileArgs {
    /// Screen profile: built-in name or ICC file.
    #[arg(long, value_name = "PROFILE", default_value = "srgb")]
    pub screen: String,
    /// Press profile: built-in name or ICC file (a CMYK output profile).
    #[arg(long, value_name = "PROFILE", default_value = "offset-coated")]
    pub press: String,
}

/// How screen colours are sent to the press: `--intent` and `--no-bpc`.
#[derive(Args, Debug)]
pub struct MappingArgs {
    /// Rendering intent from screen to press.
    #[arg(long, value_enum, default_value = "relative")]
    pub intent: IntentArg,
    /// Turn black point compensation off (it is on by default).
    #[arg(long)]
    pub no_bpc: bool,
}

impl MappingArgs {
    /// The mapping, shown media-relative or, with `paper_white`, on the
    /// paper's own white.
    pub fn mapping(&self, paper_white: bool) -> crate::icc::transform::PressMapping {
        crate::icc::transform::PressMapping {
            intent: self.intent.into(),
            bpc: !self.no_bpc,
            paper_white,
        }
    }
}

/// The options of `check`.
#[derive(Args, Debug)]
pub struct CheckArgs {
    /// Palette file: .csv (with a header naming a colour column), .json (array of {"name","color"}) or plain text.
    pub palette: PathBuf,
    /// The screen and press profiles.
    #[command(flatten)]
    pub profiles: ProfileArgs,
    /// How screen colours are sent to the press.
    #[command(flatten)]
    pub mapping: MappingArgs,
    /// Largest acceptable CIEDE2000 between screen and print. The default 3.0 is a rule of thumb, not a standard.
    #[arg(long, allow_negative_numbers = true, value_name = "ΔE00", default_value_t = crate::swatch::check::DEFAULT_TOLERANCE)]
    pub tolerance: f64,
    /// Show the print on the paper's own white (absolute colorimetric), so the paper's tint counts.
    #[arg(long)]
    pub paper_white: bool,
    /// Write JSON instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Exit with code 1 when the verdict fails: a colour beyond the tolerance, outside the press gamut or over its ink limit, or a failed separation, order or CVD check.
    #[arg(long)]
    pub strict: bool,
    /// How "in gamut" is decided: inside the press gamut's boundary, or by a CIELAB → press → CIELAB round trip.
    #[arg(long, value_enum, default_value = "boundary")]
    pub gamut_test: GamutTestArg,
    /// Also write the xy chromaticity diagram of the check (outlines, an arrow per colour) as SVG.
    #[arg(long, value_name = "FILE.svg")]
    pub svg: Option<PathBuf>,
    /// The palette checks beyond the per-colour results.
    #[command(flatten)]
    pub survival: repair::SurvivalArgs,
}

/// `--gamut-test`: how "in gamut" is decided.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum GamutTestArg {
    /// Inside the press gamut's boundary, or within 1 ΔE00 of it.
    Boundary,
    /// The round trip CIELAB → press → CIELAB (relative colorimetric, no BPC) returns within 1 ΔE00.
    RoundTrip,
}

/// The options of `delta`.
#[derive(Args, Debug)]
pub struct DeltaArgs {
    /// First colour (the reference for ΔE*94 and CMC), in CSS colour syntax.
    pub a: String,
    /// Second colour.
    pub b: String,
    /// The profiles that turn RGB and CMYK colours into CIELAB.
    #[command(flatten)]
    pub profiles: ProfileArgs,
    /// Write JSON instead of a table.
    #[arg(long)]
    pub json: bool,
}

/// The options of `inspect`.
#[derive(Args, Debug)]
pub struct InspectArgs {
    /// Built-in name or ICC file.
    pub profile: String,
    /// Write JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

/// The options of `profiles`.
#[derive(Args, Debug)]
pub struct ProfilesArgs {
    /// Write JSON instead of a table.
    #[arg(long)]
    pub json: bool,
}

/// The options of `gamut`.
#[derive(Args, Debug)]
pub struct GamutArgs {
    /// Profiles (built-in names or ICC files): RGB screens or CMYK presses.
    #[arg(required = true, value_name = "PROFILE")]
    pub profiles: Vec<String>,
    /// Write JSON instead of tables.
    #[arg(long)]
    pub json: bool,
    /// Write each boundary as a triangle mesh: .ply, .gltf or .glb (several profiles: FILE-1.ext, FILE-2.ext, …).
    #[arg(long, value_name = "FILE")]
    pub mesh: Option<PathBuf>,
    /// Total-ink limit for CMYK profiles in percent (default: measured from each profile's CIELAB → CMYK table).
    #[arg(long, allow_negative_numbers = true, value_name = "PERCENT")]
    pub ink_limit: Option<f64>,
    /// Also write a*b* slices of every gamut at L* 25, 50 and 75 as SVG.
    #[arg(long, value_name = "FILE.svg")]
    pub svg: Option<PathBuf>,
}

/// The options of the hidden `build-press`.
#[derive(Args, Debug)]
pub struct BuildPressArgs {
    /// Built-in press condition to rebuild.
    #[arg(default_value = "offset-coated")]
    pub name: String,
    /// Where to write the ICC file.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
}

/// How a successful run ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Outcome {
    /// The job ran; nothing was beyond tolerance, or `--strict` was not given.
    Done,
    /// `--strict` and something was beyond tolerance.
    BeyondTolerance,
}

/// Any error a subcommand returns; `main` prints it with its causes.
pub type Error = Box<dyn std::error::Error + Send + Sync>;

/// Runs the subcommand `cli` names, writing its report to `out`.
pub fn run(cli: Cli, out: &mut dyn Write) -> Result<Outcome, Error> {
    match cli.command {
        Command::Check(a) => check::run_check(a, out),
        Command::Delta(a) => check::run_delta(a, out),
        Command::Inspect(a) => profiles::run_inspect(a, out),
        Command::Profiles(a) => profiles::run_profiles(a, out),
        Command::Proof(a) => proof::run_proof(a, out),
        Command::Gamut(a) => gamut::run_gamut(a, out),
        Command::Plot(a) => plot::run_plot(a),
        Command::Repair(a) => repair::run_repair(a, out),
        Command::BuildPress(a) => profiles::run_build_press(a),
    }
}

/// `--tolerance` must be a finite ΔE00 of 0 or more.
pub(super) fn check_tolerance(tolerance: f64) -> Result<(), Error> {
    if tolerance.is_finite() && tolerance >= 0.0 {
        Ok(())
    } else {
        Err(format!("--tolerance must be a ΔE00 of 0 or more, not {tolerance}").into())
    }
}

/// Colour in tables: stdout is a terminal and NO_COLOR is unset or empty.
pub(super) fn use_color() -> bool {
    std::io::stdout().is_terminal() && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty())
}

/// The output guard of a run, knowing its input files: `files` as given and
/// the profiles read from files.
pub(super) fn guarded_outputs(files: &[&Path], profiles: &[&IccProfile]) -> Outputs {
    let mut o = Outputs::new();
    for f in files {
        o.input(f);
    }
    for p in profiles {
        if let Some(f) = p.file() {
            o.input(f);
        }
    }
    o
}

/// Palettes from this many entries up take long enough to show progress.
pub(super) const BUSY_FROM: usize = 500;

/// A spinner with `message` on stderr when `wanted` and stderr is a
/// terminal; hidden otherwise.
pub(super) fn busy(wanted: bool, message: String) -> indicatif::ProgressBar {
    if !wanted || !std::io::stderr().is_terminal() {
        return indicatif::ProgressBar::hidden();
    }
    let bar = indicatif::ProgressBar::new_spinner().with_message(message);
    bar.enable_steady_tick(std::time::Duration::from_millis(120));
    bar
}

/// The error and its causes on one line; causes whose text the message
/// already includes are not repeated.
pub fn error_chain(e: &(dyn std::error::Error + 'static)) -> String {
    let mut text = e.to_string();
    let mut cur = e.source();
    while let Some(c) = cur {
        let t = c.to_string();
        if !text.contains(&t) {
            text.push_str(": ");
            text.push_str(&t);
        }
        cur = c.source();
    }
    text.replace('\n', " ")
}
