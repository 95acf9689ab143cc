//! `inspect` (one profile), `profiles` (the built-in ones) and
//! `build-press` (a built-in press condition written as an ICC profile).

use std::io::Write;

use std::path::PathBuf;

use clap::Args;

use super::{Error, Outcome};
use crate::icc::{builtin, inspect, IccProfile};
use crate::io::Outputs;
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

pub(super) fn run_build_press(a: BuildPressArgs) -> Result<Outcome, Error> {
    let cond =
        crate::press::builtin_press(&a.name).ok_or_else(|| format!("no built-in press condition '{}'", a.name))?;
    let mut outputs = Outputs::new();
    outputs.claim(&a.out)?;
    let bytes = crate::press::build_icc(&cond)?;
    outputs.stage_bytes(&a.out, &bytes)?;
    outputs.commit()?;
    Ok(Outcome::Done)
}
