//! The built-in profiles: display spaces made with lcms2 from their published
//! definitions, and the press conditions inkfit models itself (see `press`).

use lcms2::{CIExyY, CIExyYTRIPLE, Locale, Profile, TagSignature, ToneCurve, MLU};

use super::IccError;

/// What a built-in profile is for.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Role {
    /// A screen (RGB display) profile.
    Screen,
    /// A press (CMYK output) profile.
    Press,
}

/// A built-in profile as listed by `inkfit profiles`.
#[derive(Clone, Copy, Debug, serde::Serialize)]
pub struct BuiltinInfo {
    /// The name that selects it on the command line.
    pub name: &'static str,
    /// What it is for: screen or press.
    pub role: Role,
    /// One line saying what it is.
    pub summary: &'static str,
    /// What defines it: the standard and its parameters, or inkfit's own model.
    pub definition: &'static str,
}

/// Every built-in profile, screens first.
pub const BUILTINS: &[BuiltinInfo] = &[
    BuiltinInfo {
        name: "srgb",
        role: Role::Screen,
        summary: "sRGB display",
        definition: "IEC 61966-2-1:1999: BT.709 primaries, D65, sRGB tone curve",
    },
    BuiltinInfo {
        name: "display-p3",
        role: Role::Screen,
        summary: "wide-gamut display with DCI-P3 primaries",
        definition: "DCI-P3 primaries (SMPTE RP 431-2), D65 white, sRGB tone curve",
    },
    BuiltinInfo {
        name: "oprgb",
        role: Role::Screen,
        summary: "opRGB wide-gamut display",
        definition: "IEC 61966-2-5:2007: primaries 0.64/0.33, 0.21/0.71, 0.15/0.06, D65, gamma 563/256",
    },
    BuiltinInfo {
        name: "rec2020",
        role: Role::Screen,
        summary: "UHDTV display",
        definition: "ITU-R BT.2020-2: its primaries, D65, its transfer function (inverse OETF)",
    },
    BuiltinInfo {
        name: "prophoto",
        role: Role::Screen,
        summary: "ROMM RGB working space",
        definition: "ISO 22028-2:2013 (ROMM RGB): its primaries, D50, gamma 1.8 with a linear toe",
    },
    BuiltinInfo {
        name: "offset-coated",
        role: Role::Press,
        summary: "offset on coated paper, 330 % total area coverage",
        definition: "inkfit's own printing model with ISO 12647-2 style aim values (see DEVELOPERS.md)",
    },
    BuiltinInfo {
        name: "offset-uncoated",
        role: Role::Press,
        summary: "offset on wood-free uncoated paper, 300 % total area coverage",
        definition: "inkfit's own printing model with ISO 12647-2 paper type 4 style aim values, from memory (see DEVELOPERS.md)",
    },
    BuiltinInfo {
        name: "newsprint-coldset",
        role: Role::Press,
        summary: "coldset offset on newsprint, 240 % total area coverage, strong GCR",
        definition: "inkfit's own printing model with ISO 12647-3 style aim values, from memory (see DEVELOPERS.md)",
    },
];

/// The names of every built-in, in [`BUILTINS`] order.
pub fn names() -> Vec<&'static str> {
    BUILTINS.iter().map(|b| b.name).collect()
}

/// The built-in named `name`, if there is one.
pub fn info(name: &str) -> Option<&'static BuiltinInfo> {
    BUILTINS.iter().find(|b| b.name == name)
}

/// The ICC bytes of a built-in profile, or `None` for an unknown name.
pub fn bytes(name: &str) -> Option<Result<Vec<u8>, IccError>> {
    let info = info(name)?;
    Some(match info.role {
        Role::Press => press_icc(name).map(<[u8]>::to_vec).ok_or_else(|| IccError::Builtin {
            name: name.to_string(),
            detail: "no press table".to_string(),
        }),
        Role::Screen => screen(info).map_err(|detail| IccError::Builtin {
            name: name.to_string(),
            detail,
        }),
    })
}

const D65: (f64, f64) = (0.3127, 0.3290);
/// D50 as ISO 22028-2 gives it for ROMM RGB.
const D50_ROMM: (f64, f64) = (0.3457, 0.3585);

fn xyy((x, y): (f64, f64)) -> CIExyY {
    CIExyY { x, y, Y: 1.0 }
}

struct ScreenDefinition {
    white: (f64, f64),
    primaries: [(f64, f64); 3],
    /// lcms2 parametric curve: type and parameters, device value → linear.
    curve: (i16, &'static [f64]),
}

/// sRGB decoding, IEC 61966-2-1 (type 4: Y = ((X + 0.055)/1.055)^2.4 for
/// X ≥ 0.04045, else X/12.92).
const SRGB_CURVE: (i16, &[f64]) = (4, &[2.4, 1.0 / 1.055, 0.055 / 1.055, 1.0 / 12.92, 0.04045]);

/// BT.2020 inverse OETF with α = 1.09929682680944 and β = 0.018053968510807:
/// L = V/4.5 for V < 4.5β, else ((V + α − 1)/α)^(1/0.45).
const REC2020_CURVE: (i16, &[f64]) = (
    4,
    &[
        1.0 / 0.45,
        1.0 / 1.099_296_826_809_44,
        0.099_296_826_809_44 / 1.099_296_826_809_44,
        1.0 / 4.5,
        4.5 * 0.018_053_968_510_807,
    ],
);

/// ROMM RGB decoding, ISO 22028-2: X = X'/16 below X' = 16·(1/512), else X'^1.8.
const ROMM_CURVE: (i16, &[f64]) = (4, &[1.8, 1.0, 0.0, 1.0 / 16.0, 16.0 / 512.0]);

/// opRGB decoding, IEC 61966-2-5: a pure power of 563/256.
const OPRGB_CURVE: (i16, &[f64]) = (1, &[563.0 / 256.0]);

fn definition(name: &str) -> Option<ScreenDefinition> {
    Some(match name {
        "srgb" => ScreenDefinition {
            white: D65,
            primaries: [(0.64, 0.33), (0.30, 0.60), (0.15, 0.06)],
            curve: SRGB_CURVE,
        },
        "display-p3" => ScreenDefinition {
            white: D65,
            primaries: [(0.680, 0.320), (0.265, 0.690), (0.150, 0.060)],
            curve: SRGB_CURVE,
        },
        "oprgb" => ScreenDefinition {
            white: D65,
            primaries: [(0.64, 0.33), (0.21, 0.71), (0.15, 0.06)],
            curve: OPRGB_CURVE,
        },
        "rec2020" => ScreenDefinition {
            white: D65,
            primaries: [(0.708, 0.292), (0.170, 0.797), (0.131, 0.046)],
            curve: REC2020_CURVE,
        },
        "prophoto" => ScreenDefinition {
            white: D50_ROMM,
            primaries: [(0.7347, 0.2653), (0.1596, 0.8404), (0.0366, 0.0001)],
            curve: ROMM_CURVE,
        },
        _ => return None,
    })
}

fn screen(info: &BuiltinInfo) -> Result<Vec<u8>, String> {
    let def = definition(info.name).ok_or("no definition")?;
    let curve = ToneCurve::new_parametric(def.curve.0, def.curve.1).map_err(|e| e.to_string())?;
    let primaries = CIExyYTRIPLE {
        Red: xyy(def.primaries[0]),
        Green: xyy(def.primaries[1]),
        Blue: xyy(def.primaries[2]),
    };
    let mut profile =
        Profile::new_rgb(&xyy(def.white), &primaries, &[&curve, &curve, &curve]).map_err(|e| e.to_string())?;
    let description = format!("inkfit {}: {}", info.name, info.definition);
    set_text(&mut profile, TagSignature::ProfileDescriptionTag, &description)?;
    set_text(
        &mut profile,
        TagSignature::CopyrightTag,
        "Made by inkfit from the published definition; no copyright claimed",
    )?;
    let mut bytes = profile.icc().map_err(|e| e.to_string())?;
    stamp_date(&mut bytes);
    Ok(bytes)
}

/// The creation date written into every profile inkfit makes (header
/// dateTimeNumber, year month day hour minute second), so that the same
/// definition always gives the same bytes.
pub const PROFILE_DATE: [u16; 6] = [2024, 1, 1, 0, 0, 0];

/// The committed ICC output profile of `offset-coated`
/// (rebuilt by `inkfit build-press offset-coated --out profiles/offset-coated.icc`).
pub static OFFSET_COATED_ICC: &[u8] = include_bytes!("../../profiles/offset-coated.icc");

/// The committed ICC output profile of `offset-uncoated`.
pub static OFFSET_UNCOATED_ICC: &[u8] = include_bytes!("../../profiles/offset-uncoated.icc");

/// The committed ICC output profile of `newsprint-coldset`.
pub static NEWSPRINT_COLDSET_ICC: &[u8] = include_bytes!("../../profiles/newsprint-coldset.icc");

/// The committed ICC profile bytes of the built-in press of that name
/// (each rebuilt by `inkfit build-press NAME --out profiles/NAME.icc`).
pub fn press_icc(name: &str) -> Option<&'static [u8]> {
    match name {
        "offset-coated" => Some(OFFSET_COATED_ICC),
        "offset-uncoated" => Some(OFFSET_UNCOATED_ICC),
        "newsprint-coldset" => Some(NEWSPRINT_COLDSET_ICC),
        _ => None,
    }
}

/// Overwrites the header's dateTimeNumber (ICC.1:2010, 7.2.1, bytes 24..36)
/// with [`PROFILE_DATE`].
pub fn stamp_date(bytes: &mut [u8]) {
    if bytes.len() >= 36 {
        for (i, v) in PROFILE_DATE.iter().enumerate() {
            bytes[24 + 2 * i..26 + 2 * i].copy_from_slice(&v.to_be_bytes());
        }
    }
}

fn set_text(profile: &mut Profile, sig: TagSignature, text: &str) -> Result<(), String> {
    let mut mlu = MLU::new(1);
    if !mlu.set_text_ascii(text, Locale::none()) || !profile.write_tag(sig, lcms2::Tag::MLU(&mlu)) {
        return Err(format!("cannot write the {sig:?} text"));
    }
    Ok(())
}
