//! `inspect` (one profile), `profiles` (the built-in ones) and
//! `build-press` (a press profile from a printer's measurement data, or a
//! built-in press condition rebuilt).

use std::io::Write;

use std::path::PathBuf;

use clap::Args;

use super::{Error, Outcome};
use crate::icc::{builtin, inspect, IccProfile};
use crate::io::Outputs;
use crate::press::cgats::Measurements;
use crate::press::fit::{fit, BlackStrength, FitOptions};
use crate::report;

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

/// The options of `build-press`.
#[derive(Args, Debug)]
pub struct BuildPressArgs {
    /// Measurement data of the print condition: a CGATS.17 file with CMYK_C,
    /// CMYK_M, CMYK_Y, CMYK_K and LAB_L/A/B or XYZ_X/Y/Z.
    #[arg(long, value_name = "DATA", required_unless_present = "builtin")]
    pub from: Option<PathBuf>,
    /// Maintainers: rebuild this built-in press condition instead (its
    /// committed profile in profiles/).
    #[arg(value_name = "BUILTIN", conflicts_with = "from", hide = true)]
    pub builtin: Option<String>,
    /// Where to write the ICC profile.
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    /// Total area coverage limit, percent (100–400); 300 unless given.
    #[arg(long, value_name = "PERCENT", default_value_t = 300.0)]
    pub ink_limit: f64,
    /// Black generation: light, medium or strong (how early and how much
    /// black replaces C+M+Y).
    #[arg(long, value_name = "STRENGTH", default_value = "medium", value_parser = BlackStrength::NAMES)]
    pub black: String,
    /// The profile description; by default it names the data file.
    #[arg(long, value_name = "TEXT")]
    pub name: Option<String>,
    /// Folds of the cross-validation (2–20).
    #[arg(long, value_name = "K", default_value_t = 5, value_parser = clap::value_parser!(u8).range(2..=20))]
    pub folds: u8,
    /// Write the fit report as JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

pub(super) fn run_inspect(a: InspectArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    let p = IccProfile::load(&a.profile)?;
    let r = inspect::inspect(&p);
    if a.json {
        report::write_json(out, &r)?;
    } else {
        report::render_inspect(out, &r)?;
    }
    Ok(Outcome::Done)
}

pub(super) fn run_profiles(a: ProfilesArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    if a.json {
        report::write_json(out, &builtin::BUILTINS)?;
    } else {
        report::render_profiles(out, builtin::BUILTINS)?;
    }
    Ok(Outcome::Done)
}

pub(super) fn run_build_press(a: BuildPressArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    let mut outputs = Outputs::new();
    if let Some(data) = &a.from {
        outputs.input(data);
    }
    outputs.claim(&a.out)?;
    let Some(data) = &a.from else {
        let name = a.builtin.as_deref().unwrap_or_default();
        let cond = crate::press::builtin_press(name).ok_or_else(|| format!("no built-in press condition '{name}'"))?;
        let bytes = crate::press::build_icc(&cond)?;
        outputs.stage_bytes(&a.out, &bytes)?;
        outputs.commit()?;
        return Ok(Outcome::Done);
    };
    if !(100.0..=400.0).contains(&a.ink_limit) {
        return Err(format!("--ink-limit {} is outside 100–400 %", a.ink_limit).into());
    }
    let black = BlackStrength::from_name(&a.black).ok_or_else(|| format!("unknown --black '{}'", a.black))?;
    let measurements = Measurements::read(data)?;
    let stem = a
        .out
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "measured".to_string());
    let description = match &a.name {
        Some(n) if n.trim().is_empty() => return Err("--name is empty".into()),
        Some(n) => n.clone(),
        None => format!(
            "inkfit: press condition fitted to {} ({} patches)",
            data.file_name().map(|f| f.to_string_lossy()).unwrap_or_default(),
            measurements.patches.len()
        ),
    };
    let opts = FitOptions {
        name: stem,
        description,
        ink_limit_percent: a.ink_limit,
        black,
        folds: usize::from(a.folds),
    };
    // Fitting takes seconds and the tables tens of seconds: a spinner on a terminal.
    let spinner = super::busy(
        true,
        format!(
            "fitting {} patches with {}-fold cross-validation",
            measurements.patches.len(),
            opts.folds
        ),
    );
    let (cond, fit_report) = fit(&measurements, &opts)?;
    spinner.set_message("building the profile's tables for three intents");
    let now = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs())
        .unwrap_or(0);
    let bytes = crate::press::icc_writer::build_icc_dated(&cond, crate::press::icc_writer::utc_date(now))?;
    spinner.finish_and_clear();
    outputs.stage_bytes(&a.out, &bytes)?;
    outputs.commit()?;
    if a.json {
        report::write_json(out, &fit_report)?;
    } else {
        report::fit::render_fit(out, &fit_report)?;
    }
    Ok(Outcome::Done)
}
