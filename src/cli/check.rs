//! `check` (a palette against a press) and `delta` (two colours).

use std::io::Write;

use std::path::PathBuf;

use clap::Args;

use super::{busy, guarded_outputs, use_color, Error, GamutTestArg, Outcome, BUSY_FROM};
use super::{MappingArgs, ProfileArgs, SurvivalArgs};
use crate::icc::IccProfile;
use crate::report::{self, DeltaReport};
use crate::swatch::adjacency::read_adjacency;
use crate::swatch::check::check_with_test;
use crate::swatch::map_raster::MapOptions;
use crate::swatch::{Format, Palette};

/// The options of `check`.
#[derive(Args, Debug)]
pub struct CheckArgs {
    /// Palette file: .csv/.tsv (a colour column, or R,G,B or C,M,Y,K columns), .json (array of {"name","color"}), plain text, SVG artwork (.svg), a map style (.sld, .se), or a rendered map image (.png, .tif) whose class colours are found.
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
    /// Also write one self-contained HTML page of the check (each colour beside its print, the verdict, the figure, separation, lightness order and CVD), for looking at and sharing.
    #[arg(long, value_name = "FILE.html")]
    pub html: Option<PathBuf>,
    /// The palette checks beyond the per-colour results.
    #[command(flatten)]
    pub survival: SurvivalArgs,
    /// Which classes touch, for any palette: one pair a line, 'NAME | NAME' or 'NAME | NAME | BORDER_PX', names or entry numbers. Touching pairs are held to --min-separation, the others to --min-legend-separation. A map image brings its own.
    #[arg(long, value_name = "FILE")]
    pub touching: Option<PathBuf>,
    /// Smallest printed ΔE00 between classes that never touch, when which classes touch is known (a map image or --touching). Default: half of --min-separation (our rule: they are told apart through the legend, not across a border).
    #[arg(long, allow_negative_numbers = true, value_name = "ΔE00")]
    pub min_legend_separation: Option<f64>,
    /// For SVG artwork: render it and find which of its colours touch and the share of the drawing each paints, as for a map image (text is not drawn).
    #[arg(long)]
    pub render: bool,
    /// For a map image: name its classes from a palette file (the map's legend); a class whose colour is an entry's colour takes the entry's name.
    #[arg(long, value_name = "PALETTE")]
    pub class_names: Option<PathBuf>,
    /// For a map image: the smallest share of the map, in percent, a colour must cover to count as a class.
    #[arg(long, allow_negative_numbers = true, value_name = "PERCENT", default_value_t = 100.0 * crate::swatch::map_raster::DEFAULT_MIN_CLASS_SHARE)]
    pub min_class_share: f64,
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

pub(super) fn run_check(a: CheckArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    super::check_tolerance(a.tolerance)?;
    // The plan: everything is read and checked before any output.
    let mut survival = a.survival.options()?;
    if let Some(p) = &a.svg {
        super::plot::check_svg_path(p)?;
    }
    if let Some(p) = &a.html {
        super::check_html_path(p)?;
    }
    if !(a.min_class_share.is_finite() && a.min_class_share > 0.0 && a.min_class_share <= 100.0) {
        return Err(format!(
            "--min-class-share must be a percentage above 0 and at most 100, not {}",
            a.min_class_share
        )
        .into());
    }
    let map = MapOptions {
        min_class_share: a.min_class_share / 100.0,
        ..MapOptions::default()
    };
    let mut palette = if a.render {
        if Format::of_path(&a.palette) != Format::Svg {
            return Err(format!(
                "--render renders SVG artwork; {} is not an .svg file",
                a.palette.display()
            )
            .into());
        }
        let (mut p, text) = Palette::read_with_text(&a.palette)?;
        crate::swatch::svg_render::find_touching(&p.source.clone(), &text, &mut p, map.min_class_share)?;
        p
    } else {
        Palette::read_with(&a.palette, &map)?
    };
    if let Some(f) = &a.class_names {
        if palette.unclassified_share.is_none() {
            return Err(format!(
                "--class-names names the classes of a map image (.png, .tif); {} is a palette with names of its own",
                a.palette.display()
            )
            .into());
        }
        let legend = Palette::read(f)?;
        crate::swatch::map_raster::name_classes(&mut palette, &legend);
    }
    a.survival.scheme_for(&palette, &mut survival);
    if let Some(v) = a.min_legend_separation {
        survival.min_legend_separation = v;
        survival.validate()?;
    }
    survival.adjacency = match &a.touching {
        Some(f) => Some(read_adjacency(f, &palette.entries)?),
        None => palette.adjacency.clone(),
    };
    let screen = IccProfile::load(&a.profiles.screen)?.require_screen()?;
    let press = IccProfile::load(&a.profiles.press)?.require_press()?;
    let mut inputs = vec![a.palette.as_path()];
    inputs.extend(a.touching.as_deref());
    inputs.extend(a.class_names.as_deref());
    let mut outputs = guarded_outputs(&inputs, &[&screen, &press]);
    for p in [&a.svg, &a.html].into_iter().flatten() {
        outputs.claim(p)?;
    }
    // Work that takes seconds shows a spinner on a terminal.
    let spinner = busy(
        palette.entries.len() >= BUSY_FROM && !a.json,
        format!("checking {} colours against {}", palette.entries.len(), press.name),
    );
    let mapping = a.mapping.mapping(a.paper_white);
    let (r, press_gamut) = check_with_test(&palette, &screen, &press, mapping, a.tolerance, a.gamut_test.into())?;
    spinner.finish_and_clear();
    // Comparing every pair grows with the square of the count: a bar.
    let bar = super::progress_bar(
        palette.entries.len() >= BUSY_FROM && !a.json,
        crate::swatch::survival::pairs_compared(r.entries.len(), &survival),
        "comparing every pair".to_string(),
    );
    let s = crate::swatch::survival::analyse_check_with(&r, &survival, &|k| bar.inc(k));
    bar.finish_and_clear();
    let mut wrote = Vec::new();
    if a.svg.is_some() || a.html.is_some() {
        let collapsed: Vec<[usize; 2]> = s
            .separation
            .flagged
            .iter()
            .filter(|f| f.below_floor)
            .map(|f| [f.a - 1, f.b - 1])
            .collect();
        let fig = super::plot::check_figure(&r, &screen, &press, press_gamut.as_ref(), mapping, &collapsed)?;
        let svg = crate::plot::render(&fig);
        if let Some(p) = &a.svg {
            outputs.stage_bytes(p, svg.as_bytes())?;
            wrote.push((p, "the xy figure"));
        }
        if let Some(p) = &a.html {
            let v = crate::swatch::survival::verdict(&r, &s);
            let page = crate::report::html::check::render(&crate::report::html::check::CheckPage {
                check: &r,
                survival: &s,
                verdict: &v,
                figure: Some(&svg),
            });
            outputs.stage_bytes(p, page.as_bytes())?;
            wrote.push((p, "the check page"));
        }
    }
    outputs.commit()?;
    for (p, what) in wrote {
        super::said_wrote(p, what);
    }
    super::repair::finish_check(&r, &s, a.json, a.strict, use_color(), out)
}

pub(super) fn run_delta(a: DeltaArgs, out: &mut dyn Write) -> Result<Outcome, Error> {
    let r = DeltaReport::between(
        &a.a,
        &a.b,
        || IccProfile::load(&a.profiles.screen)?.require_screen(),
        || IccProfile::load(&a.profiles.press)?.require_press(),
    )?;
    if a.json {
        report::write_json(out, &r)?;
    } else {
        report::render_delta(out, &r)?;
    }
    Ok(Outcome::Done)
}
