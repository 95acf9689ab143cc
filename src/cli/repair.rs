//! `inkfit repair` and the palette-survival options shared with
//! `inkfit check` (scheme, separation floor, minimum step, deficiencies).

use std::io::Write;
use std::path::PathBuf;

use clap::{Args, ValueEnum};

use super::{Error, Outcome};
use super::{MappingArgs, ProfileArgs};
use crate::color::cvd::Deficiency;
use crate::icc::IccProfile;
use crate::swatch::check::CheckReport;
use crate::swatch::order::Scheme;
use crate::swatch::repair::{repair, RepairOptions};
use crate::swatch::rewrite::{rewrite, text_heading};
use crate::swatch::survival::{verdict, CheckWithSurvival, Survival, SurvivalOptions};
use crate::swatch::{Format, Palette};

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
    /// Kind of palette: qualitative classes, a sequential scale (file order), or diverging (two arms from the middle entry).
    #[arg(long, value_enum, default_value = "qualitative")]
    pub scheme: SchemeArg,
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
    pub fn options(&self) -> Result<SurvivalOptions, Error> {
        let o = SurvivalOptions {
            scheme: match self.scheme {
                SchemeArg::Qualitative => Scheme::Qualitative,
                SchemeArg::Sequential => Scheme::Sequential,
                SchemeArg::Diverging => Scheme::Diverging,
            },
            min_separation: self.min_separation,
            min_step: self.min_step,
            cvd: self
                .cvd
                .iter()
                .map(|c| match c {
                    CvdArg::Protan => Deficiency::Protan,
                    CvdArg::Deutan => Deficiency::Deutan,
                    CvdArg::Tritan => Deficiency::Tritan,
                })
                .collect(),
            cvd_severity: self.cvd_severity,
        };
        o.validate()?;
        Ok(o)
    }
}

/// Renders `check` with its survival section; the outcome under `--strict`.
pub fn finish_check(
    r: &CheckReport,
    s: &Survival,
    json: bool,
    strict: bool,
    color: bool,
    out: &mut dyn Write,
) -> Result<Outcome, Error> {
    let v = verdict(r, s);
    if json {
        crate::report::write_json(
            out,
            &CheckWithSurvival {
                check: r,
                survival: s,
                verdict: &v,
            },
        )?;
    } else {
        crate::report::render_check(out, r, color)?;
        let names: Vec<String> = r.entries.iter().map(|e| e.name.clone()).collect();
        crate::report::survival::render_survival(out, s, &names, color)?;
        crate::report::survival::render_verdict(out, &v)?;
    }
    Ok(if strict && !v.passes {
        Outcome::BeyondTolerance
    } else {
        Outcome::Done
    })
}

/// The options of `repair`.
#[derive(Args, Debug)]
pub struct RepairArgs {
    /// Palette file (.csv, .json or plain text); the repaired palette is written in the same format.
    pub palette: PathBuf,
    /// Where to write the repaired palette.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// The screen and press profiles.
    #[command(flatten)]
    pub profiles: ProfileArgs,
    /// How screen colours are sent to the press.
    #[command(flatten)]
    pub mapping: MappingArgs,
    /// The palette checks the repair must make pass.
    #[command(flatten)]
    pub survival: SurvivalArgs,
    /// Write the report as JSON instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Exit with code 1 when some constraint could not be met.
    #[arg(long)]
    pub strict: bool,
}

/// Gradient steps per penalty weight.
const ITERATIONS: usize = 40;

/// Runs `repair`: checks the inputs, repairs the palette, writes it back in its own format and reports.
pub fn run_repair(a: RepairArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    // The plan: options, palette, profiles and gamut before any work.
    let sopts = a.survival.options()?;
    let (palette, text) = Palette::read_with_text(&a.palette)?;
    let screen = IccProfile::load(&a.profiles.screen)?.require_screen()?;
    let press = IccProfile::load(&a.profiles.press)?.require_press()?;
    let mut outputs = super::guarded_outputs(&[&a.palette], &[&screen, &press]);
    outputs.claim(&a.out)?;
    let gamut = crate::gamut::Gamut::of_profile(&press, Default::default())?;
    let opts = RepairOptions {
        survival: sopts,
        mapping: a.mapping.mapping(false),
        iterations: ITERATIONS,
    };
    let (r, _, _) = repair(&palette, &screen, &press, &gamut, &opts)?;
    let format = Format::of_path(&a.palette);
    let heading = text_heading(&r.conditions.press, &r.conditions.screen);
    outputs.stage(&a.out, |w| rewrite(w, format, &text, &r.rewrites(), &heading))?;
    outputs.commit()?;
    if a.json {
        crate::report::write_json(out, &r)?;
    } else {
        crate::report::repair::render(out, &r, &a.out.display().to_string())?;
    }
    Ok(if a.strict && !r.all_met() {
        Outcome::BeyondTolerance
    } else {
        Outcome::Done
    })
}
