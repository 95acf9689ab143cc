//! The native part of the `inkfit` Python package: thin functions over the
//! inkfit library that take plain Python values and return the JSON text the
//! command line prints, so every number is the command line's. The Python
//! side (`inkfit/__init__.py`) parses it and wraps it in result objects.
//!
//! The heavy work runs with the GIL released.

use std::path::Path;

use pyo3::create_exception;
use pyo3::exceptions::{PyOSError, PyValueError};
use pyo3::prelude::*;

use inkfit::color::css::parse_color;
use inkfit::color::cvd::Deficiency;
use inkfit::conditions::GamutTest;
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::report::DeltaReport;
use inkfit::swatch::check::check_with_test;
use inkfit::swatch::order::Scheme;
use inkfit::swatch::survival::{analyse_check_with, verdict, CheckWithSurvival, SurvivalOptions};
use inkfit::swatch::{Entry, Palette};

create_exception!(
    _inkfit,
    InkfitError,
    PyValueError,
    "An input inkfit cannot use: the message names the file, line or value, as the command line's does."
);

type Failure = Box<dyn std::error::Error + Send + Sync>;

/// An error as a Python exception: `OSError` when a file could not be read
/// (an I/O error anywhere in its causes), else `InkfitError`; the message is
/// the command line's one line.
fn to_py(e: Failure) -> PyErr {
    let mut line = e.to_string();
    let mut cause = e.source();
    // A profile named that is neither a built-in nor a file is a missing file.
    let mut io = matches!(
        e.downcast_ref::<inkfit::icc::IccError>(),
        Some(inkfit::icc::IccError::Unknown { .. })
    );
    while let Some(c) = cause {
        io |= c.downcast_ref::<std::io::Error>().is_some();
        let text = c.to_string();
        if !line.contains(&text) {
            line = format!("{line}: {text}");
        }
        cause = c.source();
    }
    if io {
        PyOSError::new_err(line)
    } else {
        InkfitError::new_err(line)
    }
}

fn json<T: serde::Serialize>(v: &T) -> Result<String, Failure> {
    let mut out = Vec::new();
    inkfit::report::write_json(&mut out, v)?;
    Ok(String::from_utf8(out)?)
}

/// The value `name` stands for in `table`, else an error naming `what` and
/// the names it takes.
fn pick<T: Copy>(what: &str, name: &str, table: &[(&str, T)]) -> Result<T, Failure> {
    match table.iter().find(|(n, _)| *n == name) {
        Some((_, v)) => Ok(*v),
        None => {
            let names: Vec<&str> = table.iter().map(|(n, _)| *n).collect();
            Err(format!("{what} '{name}': give {}", names.join(", ")).into())
        }
    }
}

fn intent(name: &str) -> Result<RenderingIntent, Failure> {
    use RenderingIntent::*;
    pick(
        "intent",
        name,
        &[
            ("perceptual", Perceptual),
            ("relative", Relative),
            ("saturation", Saturation),
            ("absolute", Absolute),
        ],
    )
}

fn scheme(name: &str) -> Result<Scheme, Failure> {
    use Scheme::*;
    pick(
        "scheme",
        name,
        &[
            ("qualitative", Qualitative),
            ("sequential", Sequential),
            ("diverging", Diverging),
        ],
    )
}

fn deficiency(name: &str) -> Result<Deficiency, Failure> {
    use Deficiency::*;
    pick(
        "cvd",
        name,
        &[("protan", Protan), ("deutan", Deutan), ("tritan", Tritan)],
    )
}

/// A palette of (name, colour text) pairs, as a palette file of them reads.
fn palette_of_pairs(pairs: &[(String, String)]) -> Result<Palette, Failure> {
    let entries = pairs
        .iter()
        .enumerate()
        .map(|(i, (name, text))| {
            let color = parse_color(text).map_err(|e| format!("colour {}: {e}", i + 1))?;
            Ok(Entry {
                name: name.clone(),
                input: text.clone(),
                color,
                line: i + 1,
                usage: None,
                share: None,
            })
        })
        .collect::<Result<Vec<_>, Failure>>()?;
    if entries.is_empty() {
        return Err("no colours to check".into());
    }
    Ok(Palette {
        source: "<python>".to_string(),
        entries,
        scheme_hint: None,
        adjacency: None,
        unclassified_share: None,
        notes: Vec::new(),
    })
}

/// The options of a check, as the command line's flags: a dict with these
/// keys, which the Python side fills.
#[derive(FromPyObject)]
#[pyo3(from_item_all)]
struct CheckArgs {
    screen: String,
    press: String,
    intent: String,
    bpc: bool,
    paper_white: bool,
    tolerance: f64,
    gamut_test: String,
    scheme: Option<String>,
    cvd: Vec<String>,
    min_separation: Option<f64>,
}

fn run_check(palette: Palette, a: &CheckArgs) -> Result<String, Failure> {
    if !(a.tolerance.is_finite() && a.tolerance > 0.0) {
        return Err(format!("tolerance must be a ΔE00 above 0, not {}", a.tolerance).into());
    }
    let screen = IccProfile::load(&a.screen)?.require_screen()?;
    let press = IccProfile::load(&a.press)?.require_press()?;
    let mapping = PressMapping {
        intent: intent(&a.intent)?,
        bpc: a.bpc,
        paper_white: a.paper_white,
    };
    let test = pick(
        "gamut_test",
        &a.gamut_test,
        &[("boundary", GamutTest::Boundary), ("round-trip", GamutTest::RoundTrip)],
    )?;
    let mut opts = SurvivalOptions {
        cvd: a.cvd.iter().map(|c| deficiency(c)).collect::<Result<_, _>>()?,
        ..SurvivalOptions::default()
    };
    match &a.scheme {
        Some(s) => opts.scheme = scheme(s)?,
        None => opts.scheme = palette.scheme_hint.unwrap_or(Scheme::Qualitative),
    }
    if let Some(m) = a.min_separation {
        opts.min_separation = m;
        opts.min_legend_separation = m / 2.0;
    }
    opts.validate()?;
    opts.adjacency = palette.adjacency.clone();
    let (r, _) = check_with_test(&palette, &screen, &press, mapping, a.tolerance, test)?;
    let s = analyse_check_with(&r, &opts, &|_| {});
    let v = verdict(&r, &s);
    json(&CheckWithSurvival {
        check: &r,
        survival: &s,
        verdict: &v,
    })
}

/// What to check: a palette file's path, or (name, colour text) pairs.
#[derive(FromPyObject)]
enum Colours {
    Path(String),
    Pairs(Vec<(String, String)>),
}

/// Checks a palette file or (name, colour text) pairs with `options`;
/// returns the JSON of `inkfit check --json` with the same options.
#[pyfunction]
fn check(py: Python<'_>, colours: Colours, options: CheckArgs) -> PyResult<String> {
    py.allow_threads(|| {
        let palette = match &colours {
            Colours::Path(p) => Palette::read(Path::new(p))?,
            Colours::Pairs(pairs) => palette_of_pairs(pairs)?,
        };
        run_check(palette, &options)
    })
    .map_err(to_py)
}

/// The colour differences of two colours; the JSON of `inkfit delta A B --json`.
#[pyfunction]
fn delta(py: Python<'_>, a: String, b: String, screen: String, press: String) -> PyResult<String> {
    py.allow_threads(|| -> Result<String, Failure> {
        let r = DeltaReport::between(
            &a,
            &b,
            || IccProfile::load(&screen)?.require_screen(),
            || IccProfile::load(&press)?.require_press(),
        )?;
        json(&r)
    })
    .map_err(to_py)
}

/// What a profile is; the JSON of `inkfit inspect PROFILE --json`.
#[pyfunction]
fn inspect(py: Python<'_>, profile: String) -> PyResult<String> {
    py.allow_threads(|| -> Result<String, Failure> {
        let p = IccProfile::load(&profile)?;
        json(&inkfit::icc::inspect::inspect(&p))
    })
    .map_err(to_py)
}

/// The gamuts of profiles and their coverage; the JSON of `inkfit gamut … --json`.
#[pyfunction]
fn gamut(py: Python<'_>, profiles: Vec<String>) -> PyResult<String> {
    py.allow_threads(|| -> Result<String, Failure> {
        if profiles.is_empty() {
            return Err("give at least one profile".into());
        }
        let loaded = profiles
            .iter()
            .map(|p| IccProfile::load(p))
            .collect::<Result<Vec<_>, _>>()?;
        let gamuts = loaded
            .iter()
            .map(|p| inkfit::gamut::Gamut::of_profile(p, Default::default()))
            .collect::<Result<Vec<_>, _>>()?;
        let coverage = inkfit::gamut::coverage_all(&gamuts, 1.0)?;
        json(&inkfit::gamut::result::GamutReport::new(&gamuts, coverage, Vec::new()))
    })
    .map_err(to_py)
}

#[pymodule]
fn _inkfit(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("InkfitError", m.py().get_type::<InkfitError>())?;
    m.add_function(wrap_pyfunction!(check, m)?)?;
    m.add_function(wrap_pyfunction!(delta, m)?)?;
    m.add_function(wrap_pyfunction!(inspect, m)?)?;
    m.add_function(wrap_pyfunction!(gamut, m)?)?;
    Ok(())
}
