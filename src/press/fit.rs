//! A press condition fitted to a printer's measurement data, and how well
//! the fit predicts patches it did not see.
//!
//! The fit, in order:
//! 1. **Primaries**: the 16 Neugebauer primaries (paper, solids and their
//!    overprints) are the measured patches at those corners, averaged. Paper
//!    and the four solids must be measured; a missing overprint is estimated
//!    from the ones it is made of by the black-overprint (density
//!    additivity) rule of the model. The paper patch is the media white.
//! 2. **Tone curves and n**: for a Yule–Nielsen n, each single-ink tint
//!    gives its effective coverage in closed form (least squares over X, Y,
//!    Z of X^(1/n) = (1 − e)·P^(1/n) + e·S^(1/n)); the means per nominal
//!    value are made monotone by isotonic regression and joined by a
//!    monotone cubic ([`super::tone`]). n itself is chosen by golden-section
//!    search (Kiefer 1953) over 1..4 for the smallest mean CIEDE2000 on all
//!    patches.
//! 3. **Correction**: what the model still misses (trapping, a channel the
//!    n does not suit, paper-dependent effects) is fitted as a smooth
//!    media-relative CIELAB lattice ([`super::correction`]), its smoothing
//!    chosen by k-fold cross-validation.
//!
//! The report gives the error on the data and on held-out patches (k-fold
//! cross-validation: each fold refits steps 2 and 3 without its patches;
//! paper and the corner patches always stay in, since the fit cannot do
//! without them), the worst held-out patches, patches that disagree with
//! their neighbours, and repeats that disagree with each other.

use serde::Serialize;

use super::cgats::Measurements;
use super::correction::Correction;
use super::model::{black_overprint, PrintCondition, MEASURING_CHANNEL};
use super::spec::{Aims, GcrCurve, PressSpec};
use super::tone::{isotonic, MonotoneCurve};
use crate::color::delta::delta_e00;
use crate::color::{LabD50, Xyz, D50};
use crate::precision::{round, round_all};

/// The most patches a condition is fitted to (a characterisation chart has
/// a few thousand; common practice). Larger files are refused, so that the
/// fit stays within seconds.
pub const MAX_FIT_PATCHES: usize = 10_000;

/// The fewest patches a condition is fitted to: the paper, four solids,
/// three tints of each ink and enough combinations to say something about
/// the rest.
pub const MIN_FIT_PATCHES: usize = 50;

/// Lattice nodes per ink of the correction: every 20 % of coverage.
pub const CORRECTION_NODES: usize = 6;

/// The smoothing weights the cross-validation chooses among.
const SMOOTHING_CHOICES: [f64; 6] = [1e-4, 1e-3, 1e-2, 1e-1, 1.0, 10.0];

/// A patch whose held-out error is above this and above
/// [`SUSPECT_FACTOR`] times the mean held-out error is listed as suspect
/// (a design choice: about three times what a good fit to real data
/// misses by).
pub const SUSPECT_FLOOR_DE00: f64 = 1.5;
/// See [`SUSPECT_FLOOR_DE00`].
pub const SUSPECT_FACTOR: f64 = 4.0;

/// Repeats of a patch further than this from their mean are listed as
/// inconsistent (common practice: repeat measurements of one patch agree
/// within about 1 ΔE00).
pub const REPEAT_LIMIT_DE00: f64 = 1.0;

/// How much black the inversion aims at (the GCR strength).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum BlackStrength {
    /// Black only in the shadows: from L* 60 down, rising steeply.
    Light,
    /// Black from L* 80 down (the built-in coated condition's curve).
    Medium,
    /// Black from L* 85 down, rising gently and kept in chromatic colours
    /// longer (the built-in newsprint condition's curve).
    Strong,
}

impl BlackStrength {
    /// The value names, as the command line takes them.
    pub const NAMES: [&'static str; 3] = ["light", "medium", "strong"];

    const ALL: [BlackStrength; 3] = [BlackStrength::Light, BlackStrength::Medium, BlackStrength::Strong];

    /// The strength of that name.
    pub fn from_name(name: &str) -> Option<BlackStrength> {
        Self::ALL.into_iter().find(|b| b.name() == name)
    }

    /// Its value name, as the command line takes it (one of [`Self::NAMES`]).
    pub fn name(self) -> &'static str {
        Self::NAMES[self as usize]
    }

    /// The black generation curve, full black at `black_l` (the
    /// media-relative L* of the measured black solid). Shapes are design
    /// choices in the range of light, medium and heavy GCR settings of
    /// common practice.
    pub fn curve(self, black_l: f64) -> GcrCurve {
        let (l_start, exponent, chroma_half) = match self {
            BlackStrength::Light => (60.0, 1.8, 20.0),
            BlackStrength::Medium => (80.0, 1.4, 30.0),
            BlackStrength::Strong => (85.0, 1.2, 40.0),
        };
        GcrCurve {
            l_start,
            l_full: black_l.clamp(0.0, l_start - 10.0),
            exponent,
            chroma_half,
            weight: 1.0,
        }
    }
}

/// What to build.
#[derive(Clone, Debug)]
pub struct FitOptions {
    /// Short name of the condition (for example the output file's stem).
    pub name: String,
    /// The profile description.
    pub description: String,
    /// Total area coverage limit, percent.
    pub ink_limit_percent: f64,
    /// GCR strength.
    pub black: BlackStrength,
    /// Folds of the cross-validation (at least 2).
    pub folds: usize,
}

/// Why measurements cannot be fitted. Each names the file.
#[derive(Debug, thiserror::Error)]
#[error("{file}: {detail}")]
pub struct FitError {
    /// The measurement file as named.
    pub file: String,
    /// What is wrong, in words.
    pub detail: String,
}

/// Mean, 95th percentile and largest CIEDE2000.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct ErrorStats {
    /// Mean ΔE00.
    pub mean: f64,
    /// 95th percentile (nearest rank).
    pub p95: f64,
    /// Largest ΔE00.
    pub max: f64,
}

impl ErrorStats {
    /// The statistics of `errors` (all zero when empty).
    pub fn of(errors: &[f64]) -> ErrorStats {
        if errors.is_empty() {
            return ErrorStats {
                mean: 0.0,
                p95: 0.0,
                max: 0.0,
            };
        }
        let mut v = errors.to_vec();
        v.sort_by(f64::total_cmp);
        let rank = ((0.95 * v.len() as f64).ceil() as usize).clamp(1, v.len());
        ErrorStats {
            mean: round(v.iter().sum::<f64>() / v.len() as f64, 3),
            p95: round(v[rank - 1], 3),
            max: round(v[v.len() - 1], 3),
        }
    }
}

/// One patch and how far the fit is from it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PatchError {
    /// Its `SAMPLE_ID` (or row number).
    pub id: String,
    /// Its line in the file.
    pub line: usize,
    /// C, M, Y, K in percent.
    pub cmyk: [f64; 4],
    /// Measured media-relative CIELAB.
    pub measured: [f64; 3],
    /// Predicted media-relative CIELAB.
    pub predicted: [f64; 3],
    /// ΔE00 between them.
    pub delta_e00: f64,
}

/// Repeats of one patch that disagree.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RepeatSpread {
    /// Its `SAMPLE_ID`.
    pub id: String,
    /// The line of its first row.
    pub line: usize,
    /// How many rows were averaged.
    pub repeats: usize,
    /// The largest ΔE00 of a repeat from the mean.
    pub spread_de00: f64,
}

/// How the fit went and how well it predicts.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FitReport {
    /// The measurement file.
    pub source: String,
    /// Data rows read.
    pub rows: usize,
    /// Distinct patches (repeats averaged).
    pub patches: usize,
    /// Corner patches (of 16: paper, solids, overprints) that were measured;
    /// the rest were estimated.
    pub corners_measured: usize,
    /// Absolute CIELAB of the paper: the media white.
    pub paper_lab: [f64; 3],
    /// The fitted Yule–Nielsen n.
    pub yule_nielsen_n: f64,
    /// Tone value increase at 50 % per ink (C, M, Y, K), percent, as the
    /// fitted model prints it (Murray–Davies in the ink's channel).
    pub tvi50_percent: [f64; 4],
    /// Correction lattice nodes per ink.
    pub correction_nodes: usize,
    /// The smoothing weight chosen by cross-validation.
    pub smoothing: f64,
    /// Largest correction at any lattice node, ΔE*ab.
    pub largest_correction: f64,
    /// Total area coverage limit, percent.
    pub ink_limit_percent: f64,
    /// GCR strength.
    pub black: BlackStrength,
    /// Error of the model alone (before the correction) on the data.
    pub model_only: ErrorStats,
    /// Error of the final fit on the patches it was fitted to.
    pub on_data: ErrorStats,
    /// Folds of the cross-validation.
    pub folds: usize,
    /// Patches held out across the folds.
    pub held_out: usize,
    /// Error on held-out patches.
    pub cross_validated: ErrorStats,
    /// The held-out patches the fit predicts worst, worst first (at most 10).
    pub worst: Vec<PatchError>,
    /// Patches far from what their neighbours predict (see
    /// [`SUSPECT_FLOOR_DE00`]): possible measurement errors.
    pub suspect: Vec<PatchError>,
    /// Repeats that disagree by more than [`REPEAT_LIMIT_DE00`].
    pub inconsistent_repeats: Vec<RepeatSpread>,
}

/// One measured patch, ready for fitting.
#[derive(Clone, Debug)]
struct Sample {
    index: usize,
    cmyk: [f64; 4],
    xyz: [f64; 3],
    lab_rel: LabD50,
}

/// Inks within this of 0 or 100 % count as unprinted or solid (percent).
const CORNER_TOLERANCE: f64 = 0.5;

fn corner_of(cmyk: [f64; 4]) -> Option<usize> {
    let mut j = 0;
    for (i, v) in cmyk.iter().enumerate() {
        if *v >= 100.0 - CORNER_TOLERANCE {
            j |= 1 << i;
        } else if *v > CORNER_TOLERANCE {
            return None;
        }
    }
    Some(j)
}

const INK_NAMES: [&str; 4] = ["cyan", "magenta", "yellow", "black"];

fn corner_name(j: usize) -> String {
    if j == 0 {
        return "paper".to_string();
    }
    let inks: Vec<&str> = (0..4).filter(|i| j & (1 << i) != 0).map(|i| INK_NAMES[i]).collect();
    format!("solid {}", inks.join(" + "))
}

fn media_relative(xyz: [f64; 3], paper: [f64; 3]) -> LabD50 {
    LabD50::from_xyz(Xyz::new(
        xyz[0] * D50.x / paper[0],
        xyz[1] * D50.y / paper[1],
        xyz[2] * D50.z / paper[2],
    ))
}

/// Everything that does not depend on the fold.
struct Prepared {
    samples: Vec<Sample>,
    primaries: [[f64; 3]; 16],
    corners_measured: usize,
    /// Whether each sample is a corner (always in training).
    is_corner: Vec<bool>,
}

fn prepare(m: &Measurements) -> Result<Prepared, FitError> {
    let err = |detail: String| FitError {
        file: m.source.clone(),
        detail,
    };
    if m.patches.len() > MAX_FIT_PATCHES {
        return Err(err(format!(
            "{} distinct patches; a press condition is fitted to at most {MAX_FIT_PATCHES}",
            m.patches.len()
        )));
    }
    if m.patches.len() < MIN_FIT_PATCHES {
        return Err(err(format!(
            "only {} distinct patches; a press condition needs at least {MIN_FIT_PATCHES} \
             (paper, solids, tints of each ink and their combinations)",
            m.patches.len()
        )));
    }
    let mut sums = [[0.0f64; 3]; 16];
    let mut counts = [0usize; 16];
    let mut samples = Vec::with_capacity(m.patches.len());
    let mut corner_of_sample = Vec::with_capacity(m.patches.len());
    for (index, p) in m.patches.iter().enumerate() {
        if p.cmyk.iter().any(|v| !(0.0..=100.0).contains(v)) {
            return Err(err(format!(
                "line {}: patch {} has an ink outside 0..100 %",
                p.line, p.id
            )));
        }
        let xyz = p.lab.to_xyz().to_array();
        if xyz.iter().any(|v| !(v.is_finite() && *v > 0.0)) {
            return Err(err(format!(
                "line {}: patch {} has a colour no print has (L* {:.1}, a* {:.1}, b* {:.1})",
                p.line, p.id, p.lab.l, p.lab.a, p.lab.b
            )));
        }
        let corner = corner_of(p.cmyk);
        if let Some(j) = corner {
            for ch in 0..3 {
                sums[j][ch] += xyz[ch];
            }
            counts[j] += 1;
        }
        corner_of_sample.push(corner);
        samples.push(Sample {
            index,
            cmyk: p.cmyk.map(|v| v / 100.0),
            xyz,
            lab_rel: LabD50::new(0.0, 0.0, 0.0),
        });
    }
    for j in [0usize, 1, 2, 4, 8] {
        if counts[j] == 0 {
            let mut cmyk = [0; 4];
            (0..4).filter(|i| j & (1 << i) != 0).for_each(|i| cmyk[i] = 100);
            return Err(err(format!(
                "no patch of {} (C {} M {} Y {} K {}); paper and the four solids must be measured",
                corner_name(j),
                cmyk[0],
                cmyk[1],
                cmyk[2],
                cmyk[3]
            )));
        }
    }
    let mut p = [[0.0f64; 3]; 16];
    for j in 0..16 {
        if counts[j] > 0 {
            p[j] = sums[j].map(|s| s / counts[j] as f64);
        }
    }
    let paper = p[0];
    // Missing overprints in order: each is made of one already known
    // (without its highest ink) printed under that ink's solid.
    for j in 1..16 {
        if counts[j] == 0 {
            let top = 1 << (usize::BITS - 1 - (j as u32).leading_zeros());
            let floor = if top == 8 { 0.01 } else { 0.0 };
            for ch in 0..3 {
                p[j][ch] = black_overprint(p[j ^ top][ch], p[top][ch], paper[ch], floor);
            }
        }
    }
    for (i, &ch) in MEASURING_CHANNEL.iter().enumerate() {
        if p[1 << i][ch] >= paper[ch] {
            return Err(err(format!(
                "the {} solid is not darker than paper in {}; check the CMYK columns",
                corner_name(1 << i),
                ["X", "Y", "Z"][ch]
            )));
        }
    }
    for s in &mut samples {
        s.lab_rel = media_relative(s.xyz, paper);
    }
    let is_corner = corner_of_sample.iter().map(Option::is_some).collect();
    Ok(Prepared {
        samples,
        primaries: p,
        corners_measured: counts.iter().filter(|c| **c > 0).count(),
        is_corner,
    })
}

/// The effective-coverage curves for Yule–Nielsen `n` from the single-ink
/// tints among `train`; `min_levels` distinct tint values per ink needed.
fn tone_curves(
    prep: &Prepared,
    train: &[usize],
    n: f64,
    min_levels: usize,
) -> Result<[MonotoneCurve; 4], (usize, usize)> {
    let p = &prep.primaries;
    let root = |v: f64| v.max(1e-12).powf(1.0 / n);
    let mut curves = Vec::with_capacity(4);
    for ink in 0..4 {
        let paper = p[0].map(root);
        let solid = p[1 << ink].map(root);
        let mut tints: Vec<(f64, f64)> = Vec::new();
        for &i in train {
            let s = &prep.samples[i];
            let a = s.cmyk[ink];
            let alone = (0..4).all(|o| o == ink || s.cmyk[o] * 100.0 <= CORNER_TOLERANCE);
            if !alone || a * 100.0 <= CORNER_TOLERANCE || a * 100.0 >= 100.0 - CORNER_TOLERANCE {
                continue;
            }
            let t = s.xyz.map(root);
            let (mut num, mut den) = (0.0, 0.0);
            for ch in 0..3 {
                num += (paper[ch] - solid[ch]) * (paper[ch] - t[ch]);
                den += (paper[ch] - solid[ch]) * (paper[ch] - solid[ch]);
            }
            tints.push((a, (num / den).clamp(0.0, 1.0)));
        }
        tints.sort_by(|x, y| x.0.total_cmp(&y.0));
        // Mean effective coverage per nominal value (to 0.01 %).
        let mut levels: Vec<(f64, f64, f64)> = Vec::new();
        for (a, e) in tints {
            match levels.last_mut() {
                Some(l) if (l.0 - a).abs() < 1e-4 => {
                    l.1 += e;
                    l.2 += 1.0;
                }
                _ => levels.push((a, e, 1.0)),
            }
        }
        if levels.len() < min_levels {
            return Err((ink, levels.len()));
        }
        let means: Vec<f64> = levels.iter().map(|l| l.1 / l.2).collect();
        let weights: Vec<f64> = levels.iter().map(|l| l.2).collect();
        let mono = isotonic(&means, &weights);
        let mut pts = vec![(0.0, 0.0)];
        let mut last: f64 = 0.0;
        for (l, e) in levels.iter().zip(mono) {
            last = e.clamp(last, 1.0);
            pts.push((l.0, last));
        }
        pts.push((1.0, 1.0));
        curves.push(MonotoneCurve::new(&pts).expect("ordered knots"));
    }
    Ok(curves.try_into().expect("four curves"))
}

fn spec_for(prep: &Prepared, opts: &FitOptions, n: f64) -> PressSpec {
    let p = &prep.primaries;
    let lab = |j: usize| LabD50::from_xyz(Xyz::new(p[j][0], p[j][1], p[j][2]));
    let black_l = media_relative(p[8], p[0]).l;
    PressSpec {
        name: opts.name.clone(),
        description: opts.description.clone(),
        aims: Aims {
            paper: lab(0),
            cyan: lab(1),
            magenta: lab(2),
            yellow: lab(4),
            black: lab(8),
            cyan_magenta: lab(3),
            cyan_yellow: lab(5),
            magenta_yellow: lab(6),
            cyan_magenta_yellow: lab(7),
        },
        tvi50: [0.0; 4],
        yule_nielsen_n: n,
        tac_percent: opts.ink_limit_percent,
        gcr: opts.black.curve(black_l),
        black_overprint_floor: 0.01,
    }
}

/// The model without correction for `train`, n by golden-section search.
fn fit_model(
    prep: &Prepared,
    opts: &FitOptions,
    train: &[usize],
    min_levels: usize,
) -> Result<PrintCondition, (usize, usize)> {
    let build = |n: f64| -> Result<PrintCondition, (usize, usize)> {
        let tone = tone_curves(prep, train, n, min_levels)?;
        Ok(PrintCondition::measured(spec_for(prep, opts, n), prep.primaries, tone))
    };
    let score = |c: &PrintCondition| -> f64 {
        train
            .iter()
            .map(|&i| {
                let s = &prep.samples[i];
                delta_e00(c.lab_relative(s.cmyk), s.lab_rel)
            })
            .sum::<f64>()
    };
    // Golden-section search on 1..4 (the mean error is unimodal in n in
    // practice; a bracket of width 0.001 is far finer than it matters).
    let phi = (5f64.sqrt() - 1.0) / 2.0;
    let (mut lo, mut hi) = (1.0f64, 4.0f64);
    let mut x1 = hi - phi * (hi - lo);
    let mut x2 = lo + phi * (hi - lo);
    let mut f1 = score(&build(x1)?);
    let mut f2 = score(&build(x2)?);
    while hi - lo > 1e-3 {
        if f1 <= f2 {
            hi = x2;
            x2 = x1;
            f2 = f1;
            x1 = hi - phi * (hi - lo);
            f1 = score(&build(x1)?);
        } else {
            lo = x1;
            x1 = x2;
            f1 = f2;
            x2 = lo + phi * (hi - lo);
            f2 = score(&build(x2)?);
        }
    }
    let n = 0.5 * (lo + hi);
    let tone = tone_curves(prep, train, n, min_levels)?;
    let c = PrintCondition::measured(spec_for(prep, opts, n), prep.primaries, tone.clone());
    // The spec records the tone value increase the fitted model prints.
    let mut spec = c.spec().clone();
    for ink in 0..4 {
        spec.tvi50[ink] = c.tone_value(ink, 0.5).unwrap_or(0.5) - 0.5;
    }
    Ok(PrintCondition::measured(spec, prep.primaries, tone))
}

fn residuals(prep: &Prepared, model: &PrintCondition, train: &[usize]) -> Vec<([f64; 4], [f64; 3])> {
    train
        .iter()
        .map(|&i| {
            let s = &prep.samples[i];
            let m = model.lab_relative(s.cmyk);
            (s.cmyk, [s.lab_rel.l - m.l, s.lab_rel.a - m.a, s.lab_rel.b - m.b])
        })
        .collect()
}

/// The fold of each non-corner patch: a fixed pseudo-random permutation
/// (a multiplicative hash of the index), so that folds do not follow the
/// chart's order and the report is the same on every run.
fn fold_of(index: usize, folds: usize) -> usize {
    let h = (index as u64 ^ 0x9e37_79b9_7f4a_7c15).wrapping_mul(0xbf58_476d_1ce4_e5b9);
    ((h ^ (h >> 31)) % folds as u64) as usize
}

/// Fits a press condition to `m`: the condition, with its correction, and
/// the report.
pub fn fit(m: &Measurements, opts: &FitOptions) -> Result<(PrintCondition, FitReport), FitError> {
    let prep = prepare(m)?;
    let err = |detail: String| FitError {
        file: m.source.clone(),
        detail,
    };
    let too_few = |(ink, found): (usize, usize)| {
        err(format!(
            "{found} tint value(s) of {} alone; at least 3 between 0 and 100 % are needed to measure its tone curve",
            INK_NAMES[ink]
        ))
    };
    let all: Vec<usize> = (0..prep.samples.len()).collect();
    let model = fit_model(&prep, opts, &all, 3).map_err(too_few)?;
    let folds = opts.folds.max(2);

    // Cross-validation: per fold, refit the model and the correction for
    // every smoothing choice; keep each held-out patch's prediction.
    let mut held: Vec<Vec<(usize, LabD50)>> = vec![Vec::new(); SMOOTHING_CHOICES.len()];
    for f in 0..folds {
        let (train, test): (Vec<usize>, Vec<usize>) =
            all.iter().partition(|&&i| prep.is_corner[i] || fold_of(i, folds) != f);
        if test.is_empty() {
            continue;
        }
        let fold_model = fit_model(&prep, opts, &train, 1).map_err(too_few)?;
        let r = residuals(&prep, &fold_model, &train);
        for (k, &lambda) in SMOOTHING_CHOICES.iter().enumerate() {
            let corr = Correction::fit(&r, CORRECTION_NODES, lambda);
            let c = fold_model.clone().with_correction(corr);
            held[k].extend(test.iter().map(|&i| (i, c.lab_relative(prep.samples[i].cmyk))));
        }
    }
    // Held-out ΔE00 per smoothing choice, computed once; the choice with
    // the smallest mean wins (the first on a tie).
    let cv_errors: Vec<Vec<f64>> = held
        .iter()
        .map(|h| {
            h.iter()
                .map(|(i, lab)| delta_e00(*lab, prep.samples[*i].lab_rel))
                .collect()
        })
        .collect();
    let mean = |e: &[f64]| e.iter().sum::<f64>() / e.len().max(1) as f64;
    let mut best = 0;
    for k in 1..cv_errors.len() {
        if mean(&cv_errors[k]) < mean(&cv_errors[best]) {
            best = k;
        }
    }
    let smoothing = SMOOTHING_CHOICES[best];
    let corr = Correction::fit(&residuals(&prep, &model, &all), CORRECTION_NODES, smoothing);
    let largest_correction = corr.largest_offset();
    let model_only: Vec<f64> = all
        .iter()
        .map(|&i| delta_e00(model.lab_relative(prep.samples[i].cmyk), prep.samples[i].lab_rel))
        .collect();
    let tvi50_percent = model.spec().tvi50.map(|t| t * 100.0);
    let n = model.spec().yule_nielsen_n;
    let cond = model.with_correction(corr);
    let on_data: Vec<f64> = all
        .iter()
        .map(|&i| delta_e00(cond.lab_relative(prep.samples[i].cmyk), prep.samples[i].lab_rel))
        .collect();

    let patch_error = |i: usize, predicted: LabD50| {
        let p = &m.patches[prep.samples[i].index];
        let measured = prep.samples[i].lab_rel;
        PatchError {
            id: p.id.clone(),
            line: p.line,
            cmyk: p.cmyk,
            measured: round_all(measured.to_array(), 2),
            predicted: round_all(predicted.to_array(), 2),
            delta_e00: round(delta_e00(predicted, measured), 3),
        }
    };
    let mut held_errors: Vec<PatchError> = held[best].iter().map(|(i, lab)| patch_error(*i, *lab)).collect();
    held_errors.sort_by(|a, b| b.delta_e00.total_cmp(&a.delta_e00).then(a.line.cmp(&b.line)));
    let cv = ErrorStats::of(&cv_errors[best]);
    let suspect_limit = SUSPECT_FLOOR_DE00.max(SUSPECT_FACTOR * cv.mean);
    let suspect = held_errors
        .iter()
        .filter(|e| e.delta_e00 > suspect_limit)
        .cloned()
        .collect();
    let worst = held_errors.iter().take(10).cloned().collect();
    let inconsistent_repeats = m
        .inconsistent_repeats(REPEAT_LIMIT_DE00)
        .into_iter()
        .map(|p| RepeatSpread {
            id: p.id.clone(),
            line: p.line,
            repeats: p.repeats,
            spread_de00: round(p.spread_de00, 3),
        })
        .collect();
    let paper = prep.primaries[0];
    let report = FitReport {
        source: m.source.clone(),
        rows: m.rows,
        patches: m.patches.len(),
        corners_measured: prep.corners_measured,
        paper_lab: round_all(LabD50::from_xyz(Xyz::new(paper[0], paper[1], paper[2])).to_array(), 2),
        yule_nielsen_n: round(n, 3),
        tvi50_percent: round_all(tvi50_percent, 1),
        correction_nodes: CORRECTION_NODES,
        smoothing,
        largest_correction: round(largest_correction, 2),
        ink_limit_percent: opts.ink_limit_percent,
        black: opts.black,
        model_only: ErrorStats::of(&model_only),
        on_data: ErrorStats::of(&on_data),
        folds,
        held_out: held[best].len(),
        cross_validated: cv,
        worst,
        suspect,
        inconsistent_repeats,
    };
    Ok((cond, report))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nearest_rank_percentile() {
        // Nearest-rank definition: the 95th percentile of 1..=20 is the
        // 19th value (⌈0.95 · 20⌉ = 19).
        let v: Vec<f64> = (1..=20).map(f64::from).collect();
        let s = ErrorStats::of(&v);
        assert_eq!((s.mean, s.p95, s.max), (10.5, 19.0, 20.0));
    }

    #[test]
    fn corners_are_recognised_within_tolerance() {
        assert_eq!(corner_of([0.0, 0.0, 0.0, 0.0]), Some(0));
        assert_eq!(corner_of([100.0, 0.2, 99.6, 0.0]), Some(5));
        assert_eq!(corner_of([50.0, 0.0, 0.0, 0.0]), None);
        assert_eq!(corner_name(11), "solid cyan + magenta + black");
    }

    #[test]
    fn black_strength_names_round_trip() {
        for name in BlackStrength::NAMES {
            assert_eq!(BlackStrength::from_name(name).map(BlackStrength::name), Some(name));
        }
        assert_eq!(BlackStrength::from_name("heavy"), None);
    }

    #[test]
    fn folds_are_balanced() {
        let mut counts = [0usize; 5];
        for i in 0..2000 {
            counts[fold_of(i, 5)] += 1;
        }
        assert!(counts.iter().all(|c| (350..=450).contains(c)), "{counts:?}");
    }
}
