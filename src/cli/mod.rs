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
use std::path::Path;

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
    Check(check::CheckArgs),
    /// Colour difference of two colours: ΔE*ab, ΔE*94, CIEDE2000 and CMC(2:1).
    Delta(check::DeltaArgs),
    /// Describe an ICC profile: identity, white, intents with tables, primaries, maximum ink.
    Inspect(profiles::InspectArgs),
    /// List the built-in profiles.
    Profiles(profiles::ProfilesArgs),
    /// Soft-proof images: how they print on the press, a CIEDE2000 map and statistics.
    Proof(proof::ProofArgs),
    /// Gamut of each profile in CIELAB: volume, lightness range, chroma per hue, coverage of each pair, meshes.
    Gamut(gamut::GamutArgs),
    /// Draw a figure as SVG: xy or u′v′ chromaticity diagram, a*b* slices, or a hue leaf.
    Plot(plot::PlotArgs),
    /// Propose the nearest palette that prints: inside the press gamut, classes kept apart, order kept.
    Repair(repair::RepairArgs),
    /// Build a press profile from a printer's measurement data (CGATS.17), with a report of its accuracy.
    BuildPress(profiles::BuildPressArgs),
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

/// `--gamut-test`: how "in gamut" is decided.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum GamutTestArg {
    /// Inside the press gamut's boundary, or within 1 ΔE00 of it.
    Boundary,
    /// The round trip CIELAB → press → CIELAB (relative colorimetric, no BPC) returns within 1 ΔE00.
    RoundTrip,
}

impl From<GamutTestArg> for crate::conditions::GamutTest {
    fn from(t: GamutTestArg) -> Self {
        match t {
            GamutTestArg::Boundary => Self::Boundary,
            GamutTestArg::RoundTrip => Self::RoundTrip,
        }
    }
}

/// `--scheme`: the kind of palette.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum SchemeArg {
    /// Unordered classes: no lightness order is checked.
    Qualitative,
    /// A sequential scale in file order: lightness order and steps are checked too.
    Sequential,
    /// Two arms from the middle entry: order and steps on each arm, and their symmetry.
    Diverging,
}

/// `--cvd`: a colour-vision deficiency to simulate.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum CvdArg {
    /// Missing or anomalous L cones.
    Protan,
    /// Missing or anomalous M cones.
    Deutan,
    /// Missing or anomalous S cones.
    Tritan,
}

/// The palette checks shared by `check` and `repair`.
#[derive(Args, Debug, Clone)]
pub struct SurvivalArgs {
    /// Kind of palette: qualitative classes, a sequential scale (file order), or diverging (two arms from the middle entry). Default: qualitative, or sequential for a map style that is only a raster colour map.
    #[arg(long, value_enum)]
    pub scheme: Option<SchemeArg>,
    /// Smallest printed ΔE00 between any two entries. The default 10 is a rule of thumb for map classes told apart at a glance, not a standard.
    #[arg(long, allow_negative_numbers = true, value_name = "ΔE00", default_value_t = crate::swatch::separation::DEFAULT_MIN_SEPARATION)]
    pub min_separation: f64,
    /// Smallest ΔE00 between neighbouring steps of a sequential or diverging scheme (a rule of thumb).
    #[arg(long, allow_negative_numbers = true, value_name = "ΔE00", default_value_t = crate::swatch::order::DEFAULT_MIN_STEP)]
    pub min_step: f64,
    /// Colour-vision deficiencies to simulate on the printed colours, comma-separated.
    #[arg(long, value_enum, value_delimiter = ',', value_name = "LIST")]
    pub cvd: Vec<CvdArg>,
    /// Severity of the simulated deficiencies, 0 (normal vision) to 1 (dichromacy).
    #[arg(long, allow_negative_numbers = true, value_name = "0..1", default_value_t = 1.0)]
    pub cvd_severity: f64,
}

impl SurvivalArgs {
    /// The survival options these arguments ask for; an error when a value is out of range.
    /// Without `--scheme`, the scheme is qualitative until [`SurvivalArgs::scheme_for`] says otherwise.
    pub fn options(&self) -> Result<crate::swatch::survival::SurvivalOptions, Error> {
        let o = crate::swatch::survival::SurvivalOptions {
            scheme: match self.scheme {
                None | Some(SchemeArg::Qualitative) => crate::swatch::order::Scheme::Qualitative,
                Some(SchemeArg::Sequential) => crate::swatch::order::Scheme::Sequential,
                Some(SchemeArg::Diverging) => crate::swatch::order::Scheme::Diverging,
            },
            min_separation: self.min_separation,
            min_step: self.min_step,
            cvd: self
                .cvd
                .iter()
                .map(|c| match c {
                    CvdArg::Protan => crate::color::cvd::Deficiency::Protan,
                    CvdArg::Deutan => crate::color::cvd::Deficiency::Deutan,
                    CvdArg::Tritan => crate::color::cvd::Deficiency::Tritan,
                })
                .collect(),
            cvd_severity: self.cvd_severity,
            min_legend_separation: self.min_separation / 2.0,
            adjacency: None,
        };
        o.validate()?;
        Ok(o)
    }

    /// The scheme for `palette`: `--scheme` when given, else what the file's
    /// shape says (a raster colour map is sequential), else qualitative.
    pub fn scheme_for(&self, palette: &crate::swatch::Palette, options: &mut crate::swatch::survival::SurvivalOptions) {
        if self.scheme.is_none() {
            if let Some(s) = palette.scheme_hint {
                options.scheme = s;
            }
        }
    }
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
        Command::BuildPress(a) => profiles::run_build_press(a, out),
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
    // Cleared also when an error drops it, so the error stays one line.
    let bar = indicatif::ProgressBar::new_spinner()
        .with_message(message)
        .with_finish(indicatif::ProgressFinish::AndClear);
    bar.enable_steady_tick(std::time::Duration::from_millis(120));
    bar
}

/// A progress bar of `len` steps with `message` on stderr when `wanted` and
/// stderr is a terminal; hidden otherwise.
pub(super) fn progress_bar(wanted: bool, len: u64, message: String) -> indicatif::ProgressBar {
    if !wanted || !std::io::stderr().is_terminal() {
        return indicatif::ProgressBar::hidden();
    }
    let style = indicatif::ProgressStyle::with_template("{msg} [{bar:30}] {percent:>3} % (about {eta} left)")
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar())
        .progress_chars("=> ");
    indicatif::ProgressBar::new(len)
        .with_style(style)
        .with_message(message)
        .with_finish(indicatif::ProgressFinish::AndClear)
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

/// Tells stderr what a command wrote besides its report, once every output
/// is in place: `inkfit: wrote PATH (WHAT)`.
pub(super) fn said_wrote(path: &std::path::Path, what: &str) {
    eprintln!("inkfit: wrote {} ({what})", path.display());
}

/// An HTML page's path must end in .html or .htm: a slip of the option
/// order must not turn a palette or figure name into a page.
pub(super) fn check_html_path(p: &std::path::Path) -> Result<(), Error> {
    let ok = p.extension().is_some_and(|e| {
        ["html", "htm"]
            .iter()
            .any(|x| e.to_string_lossy().eq_ignore_ascii_case(x))
    });
    if ok {
        Ok(())
    } else {
        Err(format!("--html '{}': give a file ending in .html", p.display()).into())
    }
}
