//! Every lcms2 transform inkfit runs is built here: [`local`] for one thread
//! (with lcms2's one-pixel cache), [`shared`] and [`shared_soft_proof`] for
//! rayon workers (no cache, so the transform is `Sync`). One side may be
//! [`Side::Lab`], CIELAB D50 in double precision. [`PressMapping::shown`] is
//! the one place that decides how a print is shown (media-relative, or
//! absolute on the paper's own white). On top of them, [`PressTransforms`]
//! holds what a palette check needs: screen RGB and CIELAB to and from a
//! press's CMYK, all in double precision (lcms2's float path: RGB 0..1, CMYK
//! 0..100 %, CIELAB D50).

use lcms2::{AllowCache, CIExyY, DisallowCache, Flags, GlobalContext, PixelFormat, Profile, Transform};

use super::{IccError, IccProfile, RenderingIntent};
use crate::color::{LabD50, Xy, D50};

/// A CIELAB v4 profile relative to D50: the PCS as a colour space.
pub fn lab_d50_profile() -> Profile {
    let xy = D50.chromaticity().unwrap_or(Xy { x: 0.3457, y: 0.3585 });
    let white = CIExyY {
        x: xy.x,
        y: xy.y,
        Y: 1.0,
    };
    // Creating an identity Lab profile cannot fail for a valid white.
    Profile::new_lab4_context(GlobalContext::new(), &white).expect("lcms2 creates a Lab v4 profile")
}

/// One side of an lcms2 transform.
#[derive(Clone, Copy)]
pub enum Side<'a> {
    /// Values of a profile's colour space in `PixelFormat`.
    Profile(&'a Profile, PixelFormat),
    /// CIELAB D50 in double precision (`Lab_DBL`, [`lab_d50_profile`]).
    Lab,
}

impl<'a> Side<'a> {
    /// The device side of a loaded profile, in `format`.
    pub fn of(profile: &'a IccProfile, format: PixelFormat) -> Self {
        Side::Profile(&profile.lcms, format)
    }
}

/// A transform that rayon workers can share: built without lcms2's one-pixel
/// cache through a context constructor, which makes it `Sync`.
pub type Shared<I, O> = Transform<I, O, GlobalContext, DisallowCache>;

/// A transform for one thread (lcms2 keeps a one-pixel cache in it).
pub type Local<I, O> = Transform<I, O, GlobalContext, AllowCache>;

/// Black point compensation, or no flag.
fn bpc_flag(bpc: bool) -> Flags {
    if bpc {
        Flags::BLACKPOINT_COMPENSATION
    } else {
        Flags::default()
    }
}

/// The lcms2 profile and pixel format of a side; `lab` is the CIELAB D50
/// profile that [`Side::Lab`] stands for.
fn resolve<'b>(side: Side<'b>, lab: &'b Profile) -> End<'b> {
    match side {
        Side::Profile(p, f) => (p, f),
        Side::Lab => (lab, PixelFormat::Lab_DBL),
    }
}

/// Runs `make` with both sides resolved to lcms2 profiles and formats.
fn with_sides<T>(from: Side, to: Side, make: impl FnOnce(End, End) -> T) -> T {
    let lab = lab_d50_profile();
    make(resolve(from, &lab), resolve(to, &lab))
}

/// A one-thread transform from `from` to `to` with `intent`, and black point
/// compensation when `bpc`.
pub fn local<I: Copy + lcms2::Pod, O: Copy + lcms2::Pod>(
    from: Side,
    to: Side,
    intent: RenderingIntent,
    bpc: bool,
) -> Result<Local<I, O>, lcms2::Error> {
    with_sides(from, to, |f, t| {
        Transform::new_flags(f.0, f.1, t.0, t.1, intent.to_lcms(), bpc_flag(bpc))
    })
}

/// A transform rayon workers share (see [`Shared`]).
pub fn shared<I: Copy + lcms2::Pod, O: Copy + lcms2::Pod>(
    from: Side,
    to: Side,
    intent: RenderingIntent,
    bpc: bool,
) -> Result<Shared<I, O>, lcms2::Error> {
    with_sides(from, to, |f, t| {
        Transform::new_flags_context(
            GlobalContext::new(),
            f.0,
            f.1,
            t.0,
            t.1,
            intent.to_lcms(),
            Flags::NO_CACHE | bpc_flag(bpc),
        )
    })
}

/// A shared soft-proofing transform: `from` → `press` with `intent` (and BPC
/// when `bpc`), then `press` → `to` with `shown`, as one lcms2 proofing
/// transform (`cmsFLAGS_SOFTPROOFING`).
pub fn shared_soft_proof<I: Copy + lcms2::Pod, O: Copy + lcms2::Pod>(
    from: Side,
    to: Side,
    press: &Profile,
    intent: RenderingIntent,
    shown: RenderingIntent,
    bpc: bool,
) -> Result<Shared<I, O>, lcms2::Error> {
    with_sides(from, to, |f, t| {
        Transform::new_proofing_context(
            GlobalContext::new(),
            f.0,
            f.1,
            t.0,
            t.1,
            press,
            intent.to_lcms(),
            shown.to_lcms(),
            Flags::NO_CACHE | bpc_flag(bpc) | Flags::SOFT_PROOFING,
        )
    })
}

/// How a screen colour is sent to the press.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct PressMapping {
    /// The rendering intent from screen to press.
    pub intent: RenderingIntent,
    /// Black point compensation from screen to press.
    pub bpc: bool,
    /// Show the print relative to the paper as measured (absolute
    /// colorimetric) instead of media-relative.
    pub paper_white: bool,
}

impl PressMapping {
    /// The intent of press → CIELAB or screen, the print as shown: absolute
    /// colorimetric on the paper's own white with `paper_white`, else
    /// relative colorimetric. Never BPC.
    pub fn shown(&self) -> RenderingIntent {
        if self.paper_white {
            RenderingIntent::Absolute
        } else {
            RenderingIntent::Relative
        }
    }
}

type Rgb = [f64; 3];
type Lab = [f64; 3];
type Cmyk = [f64; 4];

/// Every transform a palette check needs, built once.
pub struct PressTransforms {
    screen_to_lab: Transform<Rgb, Lab>,
    screen_to_press: Transform<Rgb, Cmyk>,
    lab_to_press: Transform<Lab, Cmyk>,
    press_to_lab: Transform<Cmyk, Lab>,
    /// Relative colorimetric without BPC both ways, for the round-trip gamut test.
    lab_to_press_colorimetric: Transform<Lab, Cmyk>,
    press_to_lab_colorimetric: Transform<Cmyk, Lab>,
}

/// One end of a transform: a profile and the pixel format of its side.
type End<'a> = (&'a Profile, PixelFormat);

/// [`local`], with a failure reported against `blamed`.
fn build<I: Copy + lcms2::Pod, O: Copy + lcms2::Pod>(
    from: Side,
    to: Side,
    intent: RenderingIntent,
    bpc: bool,
    blamed: &IccProfile,
    what: &'static str,
) -> Result<Local<I, O>, IccError> {
    local(from, to, intent, bpc).map_err(|_| IccError::Transform {
        name: blamed.name.clone(),
        what,
        intent,
    })
}

impl PressTransforms {
    /// Builds every transform from `screen` to `press` under `mapping`; a failure names the profile blamed.
    pub fn new(screen: &IccProfile, press: &IccProfile, mapping: PressMapping) -> Result<Self, IccError> {
        let rel = RenderingIntent::Relative;
        let shown = mapping.shown();
        let (i, bpc) = (mapping.intent, mapping.bpc);
        let s = Side::of(screen, PixelFormat::RGB_DBL);
        let p = Side::of(press, PixelFormat::CMYK_DBL);
        let l = Side::Lab;
        Ok(Self {
            screen_to_lab: build(s, l, rel, false, screen, "screen → CIELAB")?,
            screen_to_press: build(s, p, i, bpc, press, "screen → press")?,
            lab_to_press: build(l, p, i, bpc, press, "CIELAB → press")?,
            press_to_lab: build(p, l, shown, false, press, "press → CIELAB")?,
            lab_to_press_colorimetric: build(l, p, rel, false, press, "CIELAB → press")?,
            press_to_lab_colorimetric: build(p, l, rel, false, press, "press → CIELAB")?,
        })
    }

    /// Screen RGB (encoded, 0..1) → CIELAB D50, relative colorimetric.
    pub fn screen_lab(&self, rgb: &[Rgb]) -> Vec<LabD50> {
        run(&self.screen_to_lab, rgb)
            .into_iter()
            .map(LabD50::from_array)
            .collect()
    }

    /// Screen RGB → press CMYK (percent) with the chosen intent and BPC.
    pub fn screen_to_press(&self, rgb: &[Rgb]) -> Vec<Cmyk> {
        run(&self.screen_to_press, rgb)
    }

    /// CIELAB D50 → press CMYK (percent) with the chosen intent and BPC.
    pub fn lab_to_press(&self, lab: &[LabD50]) -> Vec<Cmyk> {
        let v: Vec<Lab> = lab.iter().map(|l| l.to_array()).collect();
        run(&self.lab_to_press, &v)
    }

    /// Press CMYK (percent) → CIELAB D50 as printed: media-relative, or
    /// absolute when the mapping asks for paper white.
    pub fn printed_lab(&self, cmyk: &[Cmyk]) -> Vec<LabD50> {
        run(&self.press_to_lab, cmyk)
            .into_iter()
            .map(LabD50::from_array)
            .collect()
    }

    /// The colorimetric round trip CIELAB → press → CIELAB (relative, no BPC).
    pub fn round_trip(&self, lab: &[LabD50]) -> Vec<LabD50> {
        let v: Vec<Lab> = lab.iter().map(|l| l.to_array()).collect();
        let cmyk = run(&self.lab_to_press_colorimetric, &v);
        run(&self.press_to_lab_colorimetric, &cmyk)
            .into_iter()
            .map(LabD50::from_array)
            .collect()
    }

    /// Press CMYK → CIELAB D50, relative colorimetric.
    pub fn press_lab_colorimetric(&self, cmyk: &[Cmyk]) -> Vec<LabD50> {
        run(&self.press_to_lab_colorimetric, cmyk)
            .into_iter()
            .map(LabD50::from_array)
            .collect()
    }
}

fn run<I: Copy + lcms2::Pod, O: Copy + lcms2::Pod + Default>(t: &Transform<I, O>, input: &[I]) -> Vec<O> {
    let mut out = vec![O::default(); input.len()];
    t.transform_pixels(input, &mut out);
    out
}

/// Resolves colour inputs to CIELAB D50: screen RGB through `screen`
/// (relative colorimetric), press CMYK through `press` (relative
/// colorimetric), CIELAB as given.
pub fn resolve_lab(
    inputs: &[crate::color::css::ColorInput],
    screen: &IccProfile,
    press: Option<&IccProfile>,
) -> Result<Vec<LabD50>, IccError> {
    use crate::color::css::ColorInput;
    let rel = RenderingIntent::Relative;
    // Each transform is built once, and only when an input needs it.
    let mut from_screen: Option<Local<Rgb, Lab>> = None;
    let mut from_press: Option<Local<Cmyk, Lab>> = None;
    let mut out = Vec::with_capacity(inputs.len());
    for input in inputs {
        out.push(match *input {
            ColorInput::Lab(l) => l,
            ColorInput::ScreenRgb(rgb) => {
                let t = match &from_screen {
                    Some(t) => t,
                    None => from_screen.insert(build(
                        Side::of(screen, PixelFormat::RGB_DBL),
                        Side::Lab,
                        rel,
                        false,
                        screen,
                        "screen → CIELAB",
                    )?),
                };
                LabD50::from_array(run(t, &[rgb])[0])
            }
            ColorInput::DeviceCmyk(cmyk) => {
                let t = match &from_press {
                    Some(t) => t,
                    None => {
                        let press = press.ok_or_else(|| IccError::Transform {
                            name: "(no press profile)".to_string(),
                            what: "press → CIELAB",
                            intent: rel,
                        })?;
                        from_press.insert(build(
                            Side::of(press, PixelFormat::CMYK_DBL),
                            Side::Lab,
                            rel,
                            false,
                            press,
                            "press → CIELAB",
                        )?)
                    }
                };
                LabD50::from_array(run(t, &[cmyk])[0])
            }
        });
    }
    Ok(out)
}
