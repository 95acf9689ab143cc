//! `inkfit plot KIND`: check every option and load every input first, then
//! compute the gamuts and contours, then write the SVG atomically. Also the
//! figures behind `check --svg` and `gamut --svg`.

use std::path::{Path, PathBuf};

use clap::Args;

use super::MappingArgs;
use super::{Error, Outcome};
use crate::conditions::GamutTest;
use crate::gamut::Gamut;
use crate::icc::transform::{resolve_lab, PressMapping};
use crate::icc::IccProfile;
use crate::io::Outputs;
use crate::plot::{self, Figure, PlotError, PlotKind, Swatch};
use crate::swatch::check::{check_with_test, CheckReport, DEFAULT_TOLERANCE};
use crate::swatch::Palette;

/// The options of `plot`.
#[derive(Args, Debug)]
pub struct PlotArgs {
    /// Figure: xy (CIE 1931 chromaticity), uv (CIE 1976 u′v′), ab (slices at L*) or leaf (L* against C* at one hue).
    pub kind: String,
    /// Where to write the SVG file.
    #[arg(long, value_name = "FILE.svg")]
    pub out: PathBuf,
    /// A profile to draw (built-in name or ICC file); repeat for several.
    #[arg(long = "profile", value_name = "PROFILE")]
    pub profiles: Vec<String>,
    /// Palette whose colours are marked.
    #[arg(long, value_name = "FILE")]
    pub palette: Option<PathBuf>,
    /// Screen profile the palette's RGB colours are in.
    #[arg(long, value_name = "PROFILE", default_value = "srgb")]
    pub screen: String,
    /// Press profile: with it, arrows show where the press puts each colour and out-of-gamut colours are marked.
    #[arg(long, value_name = "PROFILE")]
    pub press: Option<String>,
    /// How palette colours are sent to the press.
    #[command(flatten)]
    pub mapping: MappingArgs,
    /// L* of the a*b* slices (ab), comma-separated, each 0–100.
    #[arg(long, value_name = "L,L,…", default_value = "30,50,70")]
    pub lightness: String,
    /// Hue angle of the leaf (leaf), degrees 0–360.
    #[arg(long, allow_negative_numbers = true, value_name = "DEGREES", default_value_t = plot::DEFAULT_HUE)]
    pub hue: f64,
}

/// Rejects an output path that does not end in .svg.
pub fn check_svg_path(p: &Path) -> Result<(), PlotError> {
    let ok = p
        .extension()
        .is_some_and(|e| e.to_string_lossy().eq_ignore_ascii_case("svg"));
    if ok {
        Ok(())
    } else {
        Err(PlotError::OutExtension {
            path: p.display().to_string(),
        })
    }
}

/// Longest press label in a figure's caption, characters.
const CAPTION_LABEL_CHARS: usize = 48;

/// The mapping in words, for the caption.
pub fn mapping_words(mapping: PressMapping, press: &str) -> String {
    format!(
        "{} {} black point compensation onto {press}",
        mapping.intent,
        if mapping.bpc { "with" } else { "without" }
    )
}

/// Layers for `profiles` (gamuts computed only where the figure needs them),
/// reusing `known` gamuts by profile name.
pub fn layers(
    kind: PlotKind,
    profiles: &[IccProfile],
    known: &[&Gamut],
    lightness: &[f64],
    hue: f64,
) -> Result<Vec<plot::ProfileLayer>, Error> {
    let mut out = Vec::with_capacity(profiles.len());
    for p in profiles {
        let own;
        let gamut = if plot::needs_gamut(kind, p) {
            match known.iter().find(|g| g.name == p.name) {
                Some(g) => Some(*g),
                None => {
                    own = Gamut::of_profile(p, Default::default())?;
                    Some(&own)
                }
            }
        } else {
            None
        };
        out.push(plot::layer_for(kind, p, gamut, lightness, hue)?);
    }
    Ok(out)
}

/// Runs `plot`: checks every option and input, then draws and writes the figure.
pub fn run_plot(a: PlotArgs) -> Result<Outcome, Error> {
    // The plan: every option and input checked before any work.
    let kind = PlotKind::parse(&a.kind)?;
    check_svg_path(&a.out)?;
    if a.profiles.is_empty() {
        return Err(PlotError::NoProfiles.into());
    }
    let lightness = plot::parse_lightness(&a.lightness)?;
    let hue = plot::check_hue(a.hue)?;
    let profiles = a
        .profiles
        .iter()
        .map(|s| IccProfile::load(s))
        .collect::<Result<Vec<_>, _>>()?;
    let palette = a.palette.as_deref().map(Palette::read).transpose()?;
    let screen = IccProfile::load(&a.screen)?.require_screen()?;
    let press = match &a.press {
        Some(s) => Some(IccProfile::load(s)?.require_press()?),
        None => None,
    };
    let mapping = a.mapping.mapping(false);
    let mut outputs = Outputs::new();
    for p in profiles.iter().chain([&screen]).chain(press.as_ref()) {
        if let Some(f) = p.file() {
            outputs.input(f);
        }
    }
    if let Some(p) = &a.palette {
        outputs.input(p);
    }
    outputs.claim(&a.out)?;
    // Compute.
    let mut press_gamut = None;
    let swatches = match (&palette, &press) {
        (Some(pal), Some(pr)) => {
            let (r, g) = check_with_test(pal, &screen, pr, mapping, DEFAULT_TOLERANCE, GamutTest::Boundary)?;
            press_gamut = g;
            Swatch::from_check(&r)
        }
        (Some(pal), None) => {
            let colors: Vec<_> = pal.entries.iter().map(|e| e.color).collect();
            let lab = resolve_lab(&colors, &screen, None)
                .map_err(|e| format!("palette '{}': {e}; give --press for device-cmyk() colours", pal.source))?;
            pal.entries
                .iter()
                .zip(lab)
                .map(|(e, l)| Swatch {
                    name: e.name.clone(),
                    screen_lab: l.to_array(),
                    printed_lab: None,
                    in_gamut: None,
                })
                .collect()
        }
        (None, _) => Vec::new(),
    };
    let known: Vec<&Gamut> = press_gamut.iter().collect();
    let fig = Figure {
        kind,
        layers: layers(kind, &profiles, &known, &lightness, hue)?,
        swatches,
        lightness,
        hue,
        mapping: press
            .as_ref()
            .filter(|_| palette.is_some())
            .map(|p| mapping_words(mapping, &p.legend_label(CAPTION_LABEL_CHARS))),
        collapsed: Vec::new(),
    };
    outputs.stage_bytes(&a.out, plot::render(&fig).as_bytes())?;
    outputs.commit()?;
    super::said_wrote(&a.out, &format!("the {} figure", a.kind));
    Ok(Outcome::Done)
}

/// The figure of `inkfit check --svg`: the xy diagram with the screen and
/// press outlines and an arrow per palette colour.
pub fn check_figure(
    r: &CheckReport,
    screen: &IccProfile,
    press: &IccProfile,
    press_gamut: Option<&Gamut>,
    mapping: PressMapping,
    collapsed: &[[usize; 2]],
) -> Result<Figure, Error> {
    let known: Vec<&Gamut> = press_gamut.into_iter().collect();
    let profiles = [screen, press];
    let mut layers_out = Vec::new();
    for p in profiles {
        layers_out.extend(layers(
            PlotKind::Xy,
            std::slice::from_ref(p),
            &known,
            &[],
            plot::DEFAULT_HUE,
        )?);
    }
    Ok(Figure {
        kind: PlotKind::Xy,
        layers: layers_out,
        swatches: Swatch::from_check(r),
        lightness: Vec::new(),
        hue: plot::DEFAULT_HUE,
        mapping: Some(mapping_words(mapping, &press.legend_label(CAPTION_LABEL_CHARS))),
        collapsed: collapsed.to_vec(),
    })
}

/// The figure of `inkfit gamut --svg`: a*b* slices at L* 25, 50 and 75.
pub fn gamut_figure(profiles: &[IccProfile], gamuts: &[Gamut]) -> Result<Figure, Error> {
    let known: Vec<&Gamut> = gamuts.iter().collect();
    Ok(Figure {
        kind: PlotKind::Ab,
        layers: layers(
            PlotKind::Ab,
            profiles,
            &known,
            &plot::GAMUT_LIGHTNESS,
            plot::DEFAULT_HUE,
        )?,
        swatches: Vec::new(),
        lightness: plot::GAMUT_LIGHTNESS.to_vec(),
        hue: plot::DEFAULT_HUE,
        mapping: None,
        collapsed: Vec::new(),
    })
}
