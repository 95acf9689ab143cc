//! Palette repair: the nearest palette (in CIEDE2000 to the designer's
//! colours) whose colours lie inside the press gamut and that keeps the
//! separation floor, the lightness order of ordered schemes and, when asked,
//! the separation under colour-vision deficiencies.
//!
//! Method: a quadratic penalty method solved by projected gradient descent
//! over all entries jointly, in CIELAB D50.
//! - Variables: the screen colour `x_i` (CIELAB) of every entry; its printed
//!   colour is `p_i = P(x_i)`, the press's CIELAB → CMYK (chosen intent and
//!   BPC) → CIELAB as printed, evaluated through lcms2.
//! - Objective: `Σ ΔE00(x_i, o_i)² + w · Σ max(0, c)²` over the constraint
//!   violations `c` (all in ΔE00 or L* units, each with a safety margin of
//!   [`MARGIN`] so the result survives 8-bit rounding): pair floors on `p`
//!   (and on the simulated `p` for each deficiency), "no pair loses more than
//!   half its screen difference", and for ordered schemes the minimum step
//!   and a monotonic L* (at least 1 L* per step) on `x` and on `p`.
//! - Constraint: every `x_i` stays inside the press gamut solid
//!   ([`Gamut::contains`]); after each step a colour outside is projected
//!   back along the segment to its own printed colour (printable by
//!   construction) by bisection on the inside test.
//! - Gradient by central differences (h = 0.01 CIELAB units), each entry's
//!   part from the terms that involve it; backtracking line search; the
//!   penalty weight `w` grows 1, 10, 100, 1000, 10000.
//!
//! The penalty method returns the best compromise when the constraints
//! cannot all be met; the result is then checked again with the full
//! pipeline, and every check that still fails is reported.

use lcms2::PixelFormat;
use serde::Serialize;

use super::check::{check_against, CheckOptions, CheckReport};
use super::order::{arms, direction};
use super::rewrite::Rewrite;
use super::survival::{analyse_check, Survival, SurvivalError, SurvivalOptions};
use super::{Entry, Palette};
use crate::color::css::ColorInput;
use crate::color::cvd::Simulator;
use crate::color::delta::delta_e00;
use crate::color::LabD50;
use crate::conditions::Conditions;
use crate::gamut::Gamut;
use crate::icc::transform::{self, Local, PressMapping, PressTransforms, Side};
use crate::icc::{IccError, IccProfile, RenderingIntent};
use crate::precision::round;

/// Extra room kept above each floor, in ΔE00 (or L* for the order terms).
pub const MARGIN: f64 = 0.5;

/// A colour moved by less than this ΔE00 keeps its original text.
pub const UNCHANGED_BELOW: f64 = 0.05;

const H: f64 = 0.01;

/// The repair method, in words, as the report states it.
pub const METHOD: &str =
    "quadratic penalty method, projected gradient descent over all entries jointly in CIELAB D50; \
gamut as a hard constraint (projection along the segment to the printed colour)";

/// Why a palette could not be repaired.
#[derive(Debug, thiserror::Error)]
pub enum RepairError {
    /// A profile could not be loaded or a transform built.
    #[error(transparent)]
    Icc(#[from] IccError),
    /// The palette could not be checked.
    #[error(transparent)]
    Check(#[from] super::check::CheckError),
    /// The survival options are not usable.
    #[error(transparent)]
    Options(#[from] SurvivalError),
    /// No CIELAB → screen transform could be built from the screen profile.
    #[error("screen profile '{name}': cannot build a CIELAB → screen transform")]
    ScreenTransform {
        /// The screen profile's name.
        name: String,
    },
}

/// How a palette is repaired.
#[derive(Clone, Debug, PartialEq)]
pub struct RepairOptions {
    /// The palette checks the repair must make pass.
    pub survival: SurvivalOptions,
    /// How screen colours are sent to the press, and how the print is shown.
    pub mapping: PressMapping,
    /// Gradient steps per penalty weight.
    pub iterations: usize,
}

/// One palette entry before and after the repair.
#[derive(Clone, Debug, Serialize)]
pub struct RepairedEntry {
    /// The entry's name.
    pub name: String,
    /// The colour text as given.
    pub original: String,
    /// The colour text after the repair: `#rrggbb` when moved, else the original text.
    pub repaired: String,
    /// The repaired text differs from the original.
    pub changed: bool,
    /// ΔE00 from the original to the repaired screen colour.
    pub moved: f64,
    /// CIELAB D50 of the original colour on screen.
    pub original_screen_lab: [f64; 3],
    /// CIELAB D50 of the repaired colour on screen.
    pub repaired_screen_lab: [f64; 3],
    /// Press CMYK of the repaired colour, percent.
    pub press_cmyk: [f64; 4],
    /// CIELAB D50 of the repaired colour as printed.
    pub printed_lab: [f64; 3],
    /// The repaired colour is inside the press gamut.
    pub in_gamut: bool,
}

/// The result of repairing one palette (the JSON of `repair`).
#[derive(Clone, Debug, Serialize)]
pub struct RepairReport {
    /// The palette file as named.
    pub palette: String,
    /// Profiles, mapping, tolerance, gamut test and notes of the checks run
    /// before and after the repair.
    #[serde(flatten)]
    pub conditions: Conditions,
    /// The method used: [`METHOD`].
    pub method: &'static str,
    /// True when the palette already passed and comes back as it was.
    pub unchanged: bool,
    /// Every entry, in palette order.
    pub entries: Vec<RepairedEntry>,
    /// The palette checks before the repair.
    pub before: Survival,
    /// The palette checks after the repair.
    pub after: Survival,
    /// What still fails after the repair (empty when everything holds).
    pub unmet: Vec<String>,
}

impl RepairReport {
    /// True when nothing is left unmet.
    pub fn all_met(&self) -> bool {
        self.unmet.is_empty()
    }
}

fn hinge2(c: f64) -> f64 {
    if c > 0.0 {
        c * c
    } else {
        0.0
    }
}

struct Problem<'a> {
    t: &'a PressTransforms,
    gamut: &'a Gamut,
    o: Vec<LabD50>,
    /// Arms of an ordered scheme with their L* direction (+1 lighter).
    arms: Vec<(f64, Vec<usize>)>,
    sims: Vec<Simulator>,
    floor: f64,
    min_step: f64,
    w: f64,
}

struct State {
    x: Vec<LabD50>,
    p: Vec<LabD50>,
    /// Per simulator: simulated x and p.
    sx: Vec<Vec<LabD50>>,
    sp: Vec<Vec<LabD50>>,
}

impl Problem<'_> {
    fn print(&self, x: &[LabD50]) -> Vec<LabD50> {
        self.t.printed_lab(&self.t.lab_to_press(x))
    }

    fn state(&self, x: Vec<LabD50>) -> State {
        let p = self.print(&x);
        let sx = self
            .sims
            .iter()
            .map(|s| x.iter().map(|&l| s.lab(l)).collect())
            .collect();
        let sp = self
            .sims
            .iter()
            .map(|s| p.iter().map(|&l| s.lab(l)).collect())
            .collect();
        State { x, p, sx, sp }
    }

    /// Penalty of pair (i, j) given both sides' values.
    #[allow(clippy::too_many_arguments)]
    fn pair(
        &self,
        xi: LabD50,
        pi: LabD50,
        sxi: &[LabD50],
        spi: &[LabD50],
        xj: LabD50,
        pj: LabD50,
        sxj: &[LabD50],
        spj: &[LabD50],
    ) -> f64 {
        let dp = delta_e00(pi, pj);
        let mut v = hinge2(self.floor + MARGIN - dp) + hinge2(0.5 * delta_e00(xi, xj) + MARGIN - dp);
        for k in 0..self.sims.len() {
            let d = delta_e00(spi[k], spj[k]);
            v += hinge2(self.floor + MARGIN - d) + hinge2(0.5 * delta_e00(sxi[k], sxj[k]) + MARGIN - d);
        }
        v
    }

    /// Penalty of an ordered step a → b along an arm of direction `d`.
    fn step(&self, d: f64, xa: LabD50, pa: LabD50, xb: LabD50, pb: LabD50) -> f64 {
        hinge2(self.min_step + MARGIN - delta_e00(pa, pb))
            + hinge2(self.min_step + MARGIN - delta_e00(xa, xb))
            + hinge2(1.0 - d * (pb.l - pa.l))
            + hinge2(1.0 - d * (xb.l - xa.l))
    }

    fn total(&self, s: &State) -> f64 {
        let n = s.x.len();
        let mut close = 0.0;
        let mut pen = 0.0;
        for i in 0..n {
            close += delta_e00(s.x[i], self.o[i]).powi(2);
            let (sxi, spi) = sim_at(s, i);
            for j in i + 1..n {
                let (sxj, spj) = sim_at(s, j);
                pen += self.pair(s.x[i], s.p[i], &sxi, &spi, s.x[j], s.p[j], &sxj, &spj);
            }
        }
        for (d, arm) in &self.arms {
            for w in arm.windows(2) {
                pen += self.step(*d, s.x[w[0]], s.p[w[0]], s.x[w[1]], s.p[w[1]]);
            }
        }
        close + self.w * pen
    }

    /// The terms of the objective that involve entry `i`, with `x_i` and
    /// `p_i` replaced.
    fn local(&self, s: &State, i: usize, xi: LabD50, pi: LabD50) -> f64 {
        let sxi: Vec<LabD50> = self.sims.iter().map(|m| m.lab(xi)).collect();
        let spi: Vec<LabD50> = self.sims.iter().map(|m| m.lab(pi)).collect();
        let mut pen = 0.0;
        for j in 0..s.x.len() {
            if j != i {
                let (sxj, spj) = sim_at(s, j);
                pen += self.pair(xi, pi, &sxi, &spi, s.x[j], s.p[j], &sxj, &spj);
            }
        }
        let at = |k: usize| if k == i { (xi, pi) } else { (s.x[k], s.p[k]) };
        for (d, arm) in &self.arms {
            for w in arm.windows(2) {
                if w[0] == i || w[1] == i {
                    let ((xa, pa), (xb, pb)) = (at(w[0]), at(w[1]));
                    pen += self.step(*d, xa, pa, xb, pb);
                }
            }
        }
        delta_e00(xi, self.o[i]).powi(2) + self.w * pen
    }

    fn gradient(&self, s: &State) -> Vec<[f64; 3]> {
        let n = s.x.len();
        let mut probes = Vec::with_capacity(6 * n);
        for x in &s.x {
            let v = x.to_array();
            for k in 0..3 {
                for sign in [1.0, -1.0] {
                    let mut q = v;
                    q[k] += sign * H;
                    probes.push(LabD50::from_array(q));
                }
            }
        }
        let printed = self.print(&probes);
        let mut g = vec![[0.0; 3]; n];
        for (i, gi) in g.iter_mut().enumerate() {
            for (k, gk) in gi.iter_mut().enumerate() {
                let a = 6 * i + 2 * k;
                let fp = self.local(s, i, probes[a], printed[a]);
                let fm = self.local(s, i, probes[a + 1], printed[a + 1]);
                *gk = (fp - fm) / (2.0 * H);
            }
        }
        g
    }

    /// Each colour outside the gamut pulled back along the segment to its
    /// printed colour, by bisection on the inside test.
    fn project(&self, x: Vec<LabD50>) -> Vec<LabD50> {
        let p = self.print(&x);
        x.into_iter()
            .zip(p)
            .map(|(xi, pi)| {
                if self.gamut.contains(xi) {
                    return xi;
                }
                let lerp = |t: f64| {
                    LabD50::new(
                        pi.l + t * (xi.l - pi.l),
                        pi.a + t * (xi.a - pi.a),
                        pi.b + t * (xi.b - pi.b),
                    )
                };
                let (mut lo, mut hi) = (0.0, 1.0);
                for _ in 0..24 {
                    let mid = 0.5 * (lo + hi);
                    if self.gamut.contains(lerp(mid)) {
                        lo = mid;
                    } else {
                        hi = mid;
                    }
                }
                lerp(lo)
            })
            .collect()
    }
}

fn sim_at(s: &State, i: usize) -> (Vec<LabD50>, Vec<LabD50>) {
    (s.sx.iter().map(|v| v[i]).collect(), s.sp.iter().map(|v| v[i]).collect())
}

/// Runs the optimisation from the original screen colours `o`.
fn optimise(mut pb: Problem<'_>, iterations: usize) -> Vec<LabD50> {
    let start = pb.project(pb.o.clone());
    let mut s = pb.state(start);
    for w in [1.0, 10.0, 100.0, 1000.0, 10000.0] {
        pb.w = w;
        let mut f = pb.total(&s);
        let mut step = 2.0;
        for _ in 0..iterations {
            let g = pb.gradient(&s);
            let gmax = g.iter().flat_map(|v| v.iter()).fold(0.0f64, |m, v| m.max(v.abs()));
            if gmax < 1e-9 {
                break;
            }
            let mut accepted = false;
            for _ in 0..14 {
                let alpha = step / gmax;
                let trial: Vec<LabD50> =
                    s.x.iter()
                        .zip(&g)
                        .map(|(x, g)| LabD50::new(x.l - alpha * g[0], x.a - alpha * g[1], x.b - alpha * g[2]))
                        .collect();
                let ts = pb.state(pb.project(trial));
                let ft = pb.total(&ts);
                if ft < f {
                    s = ts;
                    f = ft;
                    step = (step * 1.5).min(8.0);
                    accepted = true;
                    break;
                }
                step *= 0.5;
            }
            if !accepted {
                break;
            }
        }
    }
    s.x
}

/// 8-bit code values of encoded screen RGB (0..1, clipped, rounded);
/// `None` when a channel is not a number, so that a failed optimisation
/// never writes black (or any colour) into the palette.
fn codes(rgb: [f64; 3]) -> Option<[u8; 3]> {
    rgb.iter()
        .all(|v| v.is_finite())
        .then(|| rgb.map(|v| (v.clamp(0.0, 1.0) * 255.0).round() as u8))
}

/// Repairs `palette` for `press` as seen on `screen`; `gamut` is the press
/// profile's gamut. Returns the report and the repaired palette.
pub fn repair(
    palette: &Palette,
    screen: &IccProfile,
    press: &IccProfile,
    gamut: &Gamut,
    opts: &RepairOptions,
) -> Result<(RepairReport, Palette, CheckReport), RepairError> {
    opts.survival.validate()?;
    let copts = CheckOptions {
        mapping: opts.mapping,
        tolerance: super::check::DEFAULT_TOLERANCE,
        ink_limit: gamut.ink_limit,
    };
    let before_check = check_against(palette, screen, press, copts, Some(gamut))?;
    let before = analyse_check(&before_check, &opts.survival);
    let all_inside = before_check.entries.iter().all(|e| e.in_gamut);
    let (repaired, unchanged) = if before.passes && all_inside {
        (palette.clone(), true)
    } else {
        let o: Vec<LabD50> = before_check
            .entries
            .iter()
            .map(|e| LabD50::from_array(e.screen_lab))
            .collect();
        let x = optimise_palette(&o, screen, press, gamut, opts)?;
        (with_positions(palette, &o, &x, screen)?, false)
    };
    let after_check = check_against(&repaired, screen, press, copts, Some(gamut))?;
    let after = analyse_check(&after_check, &opts.survival);
    let unmet = unmet(&after, &after_check);
    let entries = repaired_entries(palette, &repaired, &before_check, &after_check);
    Ok((
        RepairReport {
            palette: palette.source.clone(),
            conditions: before_check.conditions.clone(),
            method: METHOD,
            unchanged,
            entries,
            before,
            after,
            unmet,
        },
        repaired,
        after_check,
    ))
}

/// The optimised CIELAB of every entry, starting from the screen colours `o`.
fn optimise_palette(
    o: &[LabD50],
    screen: &IccProfile,
    press: &IccProfile,
    gamut: &Gamut,
    opts: &RepairOptions,
) -> Result<Vec<LabD50>, RepairError> {
    let t = PressTransforms::new(screen, press, opts.mapping)?;
    let pb = Problem {
        t: &t,
        gamut,
        arms: arms(opts.survival.scheme, o.len())
            .into_iter()
            .map(|(_, idx)| (direction(&idx, o), idx))
            .collect(),
        o: o.to_vec(),
        sims: opts.survival.simulators(),
        floor: opts.survival.min_separation,
        min_step: opts.survival.min_step,
        w: 1.0,
    };
    Ok(optimise(pb, opts.iterations))
}

/// `palette` with each entry that moved (by [`UNCHANGED_BELOW`] or more from
/// `o`) replaced by the screen hex of its new position `x`.
fn with_positions(palette: &Palette, o: &[LabD50], x: &[LabD50], screen: &IccProfile) -> Result<Palette, RepairError> {
    let to_screen: Local<[f64; 3], [f64; 3]> = transform::local(
        Side::Lab,
        Side::of(screen, PixelFormat::RGB_DBL),
        RenderingIntent::Relative,
        false,
    )
    .map_err(|_| RepairError::ScreenTransform {
        name: screen.name.clone(),
    })?;
    let src: Vec<[f64; 3]> = x.iter().map(|l| l.to_array()).collect();
    let mut rgb = vec![[0.0; 3]; x.len()];
    to_screen.transform_pixels(&src, &mut rgb);
    let entries = palette
        .entries
        .iter()
        .enumerate()
        .map(|(i, e)| {
            if delta_e00(x[i], o[i]) < UNCHANGED_BELOW {
                return e.clone();
            }
            // Kept as it was when the optimiser gave no number; the
            // checks after repair then still report it.
            let Some(b) = codes(rgb[i]) else {
                return e.clone();
            };
            Entry {
                name: e.name.clone(),
                input: format!("#{:02x}{:02x}{:02x}", b[0], b[1], b[2]),
                color: ColorInput::ScreenRgb(b.map(|v| f64::from(v) / 255.0)),
                line: e.line,
                usage: e.usage.clone(),
                share: e.share,
            }
        })
        .collect();
    Ok(Palette {
        source: palette.source.clone(),
        entries,
        scheme_hint: palette.scheme_hint,
        adjacency: palette.adjacency.clone(),
        unclassified_share: palette.unclassified_share,
        notes: palette.notes.clone(),
    })
}

/// What still fails after the repair: the failing palette checks and the
/// entries outside the press gamut.
fn unmet(after: &Survival, after_check: &CheckReport) -> Vec<String> {
    let mut unmet: Vec<String> = after.problems.iter().map(|p| p.detail.clone()).collect();
    let outside: Vec<&str> = after_check
        .entries
        .iter()
        .filter(|e| !e.in_gamut)
        .map(|e| e.name.as_str())
        .collect();
    if !outside.is_empty() {
        unmet.push(format!("outside the press gamut: {}", outside.join(", ")));
    }
    unmet
}

/// Original → repaired per entry, with the checks before and after.
fn repaired_entries(
    palette: &Palette,
    repaired: &Palette,
    before_check: &CheckReport,
    after_check: &CheckReport,
) -> Vec<RepairedEntry> {
    palette
        .entries
        .iter()
        .zip(&repaired.entries)
        .zip(before_check.entries.iter().zip(&after_check.entries))
        .map(|((orig, rep), (b, a))| RepairedEntry {
            name: orig.name.clone(),
            original: orig.input.clone(),
            repaired: rep.input.clone(),
            changed: orig.input != rep.input,
            moved: round(
                delta_e00(LabD50::from_array(b.screen_lab), LabD50::from_array(a.screen_lab)),
                2,
            ),
            original_screen_lab: b.screen_lab,
            repaired_screen_lab: a.screen_lab,
            press_cmyk: a.press_cmyk,
            printed_lab: a.printed_lab,
            in_gamut: a.in_gamut,
        })
        .collect()
}

impl RepairReport {
    /// Each entry's new colour (where it changed) and press CMYK, for
    /// writing the palette back in its own shape ([`super::rewrite`]).
    pub fn rewrites(&self) -> Vec<Rewrite> {
        self.entries
            .iter()
            .map(|e| Rewrite {
                color: e.changed.then(|| e.repaired.clone()),
                press_cmyk: e.press_cmyk,
            })
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::codes;

    #[test]
    fn code_values_round_clip_and_refuse_what_is_not_a_number() {
        // 8-bit encoding as round(255·v) on 0..1 (IEC 61966-2-1, 5.2 uses
        // the same scaling of encoded values to 8 bits).
        assert_eq!(codes([1.2, -0.1, 0.5]), Some([255, 0, 128]));
        assert_eq!(codes([0.2, 0.4, 0.6]), Some([51, 102, 153]));
        assert_eq!(codes([f64::NAN, 0.0, 0.0]), None);
        assert_eq!(codes([0.0, f64::INFINITY, 0.0]), None);
    }
}
