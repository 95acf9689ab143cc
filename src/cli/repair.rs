//! `inkfit repair`, and the ending of `inkfit check` with its palette
//! checks, which repair shares. The palette-check options themselves
//! ([`super::SurvivalArgs`]) are shared and live in `mod.rs`.

use std::io::Write;
use std::path::PathBuf;

use clap::Args;

use super::{Error, Outcome};
use super::{MappingArgs, ProfileArgs, SurvivalArgs};
use crate::icc::IccProfile;
use crate::swatch::check::CheckReport;
use crate::swatch::repair::{repair, RepairOptions};
use crate::swatch::rewrite::{rewrite, text_heading};
use crate::swatch::survival::{verdict, CheckWithSurvival, Survival};
use crate::swatch::{Format, Palette};

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
    let format = Format::of_path(&a.palette);
    if matches!(format, Format::Svg | Format::Sld | Format::MapImage | Format::Jpeg) {
        return Err(format!(
            "{}: repair writes a palette back in its own shape, and artwork, map styles and map images are not rewritten; \
             check it, or repair a palette file of its colours",
            a.palette.display()
        )
        .into());
    }
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
