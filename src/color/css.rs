//! The one parser of colour text in inkfit: CSS Color Module Level 4 syntax
//! (hex, `rgb()`, `hsl()`, `lab()`, `lch()`, `oklab()`, `oklch()`,
//! `color(srgb|display-p3|rec2020 …)`) and CSS Color Module Level 5
//! `device-cmyk()`.
//!
//! What each form means to inkfit is carried by [`ColorInput`]: screen RGB to
//! be interpreted through the screen ICC profile, a CIELAB D50 value already
//! resolved with the CSS Color 4 conversions, or press CMYK in percent.
//! Percent references follow CSS Color 4 (sections 5.1, 7, 9.2–9.4, 10.1):
//! lab L 100% = 100, a/b 100% = 125; lch C 100% = 150; oklab/oklch L 100% = 1,
//! a/b/C 100% = 0.4; rgb() 100% = 255; color() 100% = 1. `none` resolves to 0.
//! Palettes are opaque, so an alpha other than 1 (100%) is an error.

use super::spaces::{css_rgb_to_lab_d50, hsl_to_srgb, oklab_to_lab_d50, polar_to_rect, CssRgbSpace};
use super::LabD50;

/// A parsed colour.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ColorInput {
    /// `#rgb`, `#rrggbb`, `rgb()`, `hsl()`: encoded RGB 0..1 that means RGB in the screen ICC profile (caller decides which profile).
    ScreenRgb([f64; 3]),
    /// `lab()`, `lch()` (CSS: D50), `oklab()`, `oklch()`, `color(srgb|display-p3|rec2020 …)`: converted to CIELAB D50 with the CSS Color 4 math.
    Lab(LabD50),
    /// CSS Color 5 `device-cmyk(c m y k)`: CMYK on the press, in percent 0..100.
    DeviceCmyk([f64; 4]),
}

/// A colour text that could not be parsed; the message quotes the input and
/// says what was expected.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
#[error("bad colour \"{input}\": {expected}")]
pub struct ColorParseError {
    /// The colour text as given.
    pub input: String,
    /// What was expected instead, in words.
    pub expected: String,
}

/// Every form the parser accepts, for messages.
pub const ACCEPTED_FORMS: &str =
    "a CSS colour name, #rgb, #rrggbb, rgb(), hsl(), lab(), lch(), oklab(), oklch(), color(srgb|display-p3|rec2020 …) or device-cmyk()";

impl std::str::FromStr for ColorInput {
    type Err = ColorParseError;

    fn from_str(s: &str) -> Result<Self, Self::Err> {
        parse_color(s)
    }
}

/// Parse one colour in CSS syntax. Leading and trailing whitespace is ignored;
/// function names, units, `none` and colour-space names are ASCII
/// case-insensitive.
pub fn parse_color(text: &str) -> Result<ColorInput, ColorParseError> {
    parse_inner(text.trim())
        .and_then(|(c, alpha)| {
            if alpha < 1.0 {
                Err(transparency(&format!("{}", crate::precision::round(alpha, 4))))
            } else {
                Ok(c)
            }
        })
        .and_then(plausible)
        .map_err(|expected| ColorParseError {
            input: text.to_string(),
            expected,
        })
}

/// [`parse_color`] for artwork, where a colour may be partly transparent:
/// the colour and its alpha (0..1; 1 when none is given). `transparent` is
/// black with alpha 0, as CSS defines it.
pub fn parse_color_with_alpha(text: &str) -> Result<(ColorInput, f64), ColorParseError> {
    parse_inner(text.trim())
        .and_then(|(c, a)| plausible(c).map(|c| (c, a)))
        .map_err(|expected| ColorParseError {
            input: text.to_string(),
            expected,
        })
}

/// Largest magnitude of a CIELAB coordinate accepted from colour text. The
/// most saturated spectral colours stay within a few hundred units of a* and
/// b* (from memory), so values beyond this describe no colour and would only
/// overflow later conversions.
pub const MAX_LAB_COMPONENT: f64 = 1000.0;

/// Rejects a parsed colour whose numbers are not finite or lie far outside
/// anything a colour can be: `lab(1e308 …)` parses but converts to nothing.
fn plausible(c: ColorInput) -> Result<ColorInput, String> {
    let ok = match c {
        ColorInput::ScreenRgb(v) => v.iter().all(|x| x.is_finite()),
        ColorInput::Lab(l) => l
            .to_array()
            .iter()
            .all(|x| x.is_finite() && x.abs() <= MAX_LAB_COMPONENT),
        ColorInput::DeviceCmyk(v) => v.iter().all(|x| x.is_finite()),
    };
    if ok {
        Ok(c)
    } else {
        Err(format!(
            "its numbers describe no colour (not finite, or a CIELAB coordinate beyond ±{MAX_LAB_COMPONENT})"
        ))
    }
}

fn generic() -> String {
    format!("expected {ACCEPTED_FORMS}")
}

fn parse_inner(t: &str) -> Result<(ColorInput, f64), String> {
    if t.is_empty() {
        return Err(format!("empty text; {}", generic()));
    }
    if let Some(hex) = t.strip_prefix('#') {
        return parse_hex(hex);
    }
    let Some(open) = t.find('(') else {
        if let Some(rgb) = super::named::named_color(t) {
            return Ok((ColorInput::ScreenRgb(rgb.map(|v| f64::from(v) / 255.0)), 1.0));
        }
        if t.eq_ignore_ascii_case("transparent") {
            // CSS Color 4, 6.1.1: transparent black.
            return Ok((ColorInput::ScreenRgb([0.0; 3]), 0.0));
        }
        if t.eq_ignore_ascii_case("currentcolor") {
            return Err("currentColor names the colour of the text around it, which a palette does not have".into());
        }
        if t.chars().all(|c| c.is_ascii_alphabetic()) {
            return Err(format!("\"{t}\" is not a CSS colour name; {}", generic()));
        }
        return Err(generic());
    };
    let name = &t[..open];
    if name.is_empty() || !name.chars().all(|c| c.is_ascii_alphanumeric() || c == '-') {
        return Err(generic());
    }
    let lname = name.to_ascii_lowercase();
    let func = match lname.as_str() {
        "rgb" | "rgba" => Func::Rgb,
        "hsl" | "hsla" => Func::Hsl,
        "lab" => Func::Lab,
        "lch" => Func::Lch,
        "oklab" => Func::Oklab,
        "oklch" => Func::Oklch,
        "color" => Func::Color,
        "device-cmyk" => Func::DeviceCmyk,
        _ => return Err(format!("unknown function {name}(); {}", generic())),
    };
    let Some(inner) = t[open + 1..].strip_suffix(')') else {
        return Err(format!("{lname}() is missing its closing \")\""));
    };
    if inner.contains('(') || inner.contains(')') {
        return Err(format!(
            "{lname}(): nested functions (calc(), var(), relative colours …) are not supported"
        ));
    }
    let toks = tokenize(inner).map_err(|e| format!("{lname}(): {e}"))?;
    let args = split_args(&toks).map_err(|e| format!("{lname}(): {e}"))?;
    func.resolve(&lname, args)
}

// ---------------------------------------------------------------- hex

fn parse_hex(hex: &str) -> Result<(ColorInput, f64), String> {
    let digits: Option<Vec<u8>> = hex.chars().map(|c| c.to_digit(16).map(|d| d as u8)).collect();
    let bad = || format!("a hex colour is #rgb or #rrggbb (hex digits 0-9, a-f); found \"#{hex}\"");
    let d = digits.ok_or_else(bad)?;
    let (rgb, alpha) = match d.len() {
        3 | 4 => {
            let v: Vec<u8> = d.iter().map(|x| x * 17).collect();
            ([v[0], v[1], v[2]], v.get(3).copied())
        }
        6 | 8 => {
            let v: Vec<u8> = d.chunks(2).map(|p| p[0] * 16 + p[1]).collect();
            ([v[0], v[1], v[2]], v.get(3).copied())
        }
        _ => return Err(bad()),
    };
    let alpha = alpha.map_or(1.0, |a| f64::from(a) / 255.0);
    Ok((ColorInput::ScreenRgb(rgb.map(|v| f64::from(v) / 255.0)), alpha))
}

fn transparency(alpha: &str) -> String {
    format!(
        "transparency is not supported (alpha {alpha}); palette colours are opaque, so drop the alpha or give 1 / 100%"
    )
}

// ---------------------------------------------------------------- tokens

#[derive(Clone, Debug, PartialEq)]
enum Kind {
    Num(f64),
    Pct(f64),
    Dim(f64, String),
    Ident(String),
    Comma,
    Slash,
}

#[derive(Clone, Debug)]
struct Tok<'a> {
    kind: Kind,
    text: &'a str,
}

fn tokenize(s: &str) -> Result<Vec<Tok<'_>>, String> {
    let b = s.as_bytes();
    let mut out = Vec::new();
    let mut i = 0;
    while i < b.len() {
        let c = b[i];
        if c.is_ascii_whitespace() {
            i += 1;
            continue;
        }
        let start = i;
        let kind = if c == b',' {
            i += 1;
            Kind::Comma
        } else if c == b'/' {
            i += 1;
            Kind::Slash
        } else if starts_number(&b[i..]) {
            i += number_len(&b[i..]);
            let v: f64 = s[start..i]
                .parse()
                .map_err(|_| format!("\"{}\" is not a number", &s[start..i]))?;
            if !v.is_finite() {
                return Err(format!("\"{}\" is out of range", &s[start..i]));
            }
            if i < b.len() && b[i] == b'%' {
                i += 1;
                Kind::Pct(v)
            } else if i < b.len() && b[i].is_ascii_alphabetic() {
                let u = i;
                while i < b.len() && b[i].is_ascii_alphabetic() {
                    i += 1;
                }
                Kind::Dim(v, s[u..i].to_ascii_lowercase())
            } else {
                Kind::Num(v)
            }
        } else if c.is_ascii_alphabetic() {
            while i < b.len() && (b[i].is_ascii_alphanumeric() || b[i] == b'-') {
                i += 1;
            }
            Kind::Ident(s[start..i].to_ascii_lowercase())
        } else {
            let ch = s[i..].chars().next().unwrap_or('?');
            return Err(format!("unexpected character '{ch}'"));
        };
        // A value glued to something else ("12px3", "5%%") is one bad token.
        let glued = i < b.len() && !b[i].is_ascii_whitespace() && !matches!(b[i], b',' | b'/');
        if glued && !matches!(kind, Kind::Comma | Kind::Slash) {
            let mut j = i;
            while j < b.len() && !b[j].is_ascii_whitespace() && !matches!(b[j], b',' | b'/') {
                j += 1;
            }
            let whole = s.get(start..j).unwrap_or(&s[start..]);
            return Err(format!("\"{whole}\" is not a number, percentage, angle or keyword"));
        }
        out.push(Tok {
            kind,
            text: &s[start..i],
        });
    }
    Ok(out)
}

fn starts_number(b: &[u8]) -> bool {
    let rest = match b.first() {
        Some(b'+' | b'-') => &b[1..],
        _ => b,
    };
    match rest {
        [d, ..] if d.is_ascii_digit() => true,
        [b'.', d, ..] if d.is_ascii_digit() => true,
        _ => false,
    }
}

/// Length of a CSS <number> at the start of `b` (which [`starts_number`] accepted).
fn number_len(b: &[u8]) -> usize {
    let mut i = 0;
    if matches!(b.first(), Some(b'+' | b'-')) {
        i += 1;
    }
    while i < b.len() && b[i].is_ascii_digit() {
        i += 1;
    }
    if i + 1 < b.len() && b[i] == b'.' && b[i + 1].is_ascii_digit() {
        i += 1;
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
    }
    if i < b.len() && (b[i] == b'e' || b[i] == b'E') {
        let mut j = i + 1;
        if j < b.len() && (b[j] == b'+' || b[j] == b'-') {
            j += 1;
        }
        if j < b.len() && b[j].is_ascii_digit() {
            while j < b.len() && b[j].is_ascii_digit() {
                j += 1;
            }
            i = j;
        }
    }
    i
}

// ---------------------------------------------------------------- arguments

struct Args<'a> {
    comps: Vec<Tok<'a>>,
    alpha: Option<Tok<'a>>,
    legacy: bool,
}

/// Split into components and alpha, telling the comma (legacy) syntax from
/// the space-separated (modern) one.
fn split_args<'a>(toks: &[Tok<'a>]) -> Result<Args<'a>, String> {
    let legacy = toks.iter().any(|t| t.kind == Kind::Comma);
    if legacy {
        if toks.iter().any(|t| t.kind == Kind::Slash) {
            return Err("do not mix commas with \"/\"; use either rgb(r, g, b, a) or rgb(r g b / a) style".into());
        }
        let mut comps = Vec::new();
        for (i, t) in toks.iter().enumerate() {
            let want_comma = i % 2 == 1;
            match (&t.kind, want_comma) {
                (Kind::Comma, true) => {}
                (Kind::Comma, false) => return Err("misplaced comma".into()),
                (_, true) => {
                    return Err(format!(
                        "in the comma syntax every value is separated by a comma; found \"{}\"",
                        t.text
                    ))
                }
                (_, false) => comps.push(t.clone()),
            }
        }
        if toks.last().is_some_and(|t| t.kind == Kind::Comma) {
            return Err("trailing comma".into());
        }
        Ok(Args {
            comps,
            alpha: None,
            legacy: true,
        })
    } else {
        let mut parts = toks.split(|t| t.kind == Kind::Slash);
        let comps = parts.next().unwrap_or(&[]).to_vec();
        let alpha = match (parts.next(), parts.next()) {
            (None, _) => None,
            (Some([a]), None) => Some(a.clone()),
            (Some([]), None) => return Err("nothing after \"/\"; expected an alpha value".into()),
            (Some(_), None) => return Err("expected exactly one alpha value after \"/\"".into()),
            (Some(_), Some(_)) => return Err("more than one \"/\"".into()),
        };
        Ok(Args {
            comps,
            alpha,
            legacy: false,
        })
    }
}

#[derive(Clone, Copy)]
enum Func {
    Rgb,
    Hsl,
    Lab,
    Lch,
    Oklab,
    Oklch,
    Color,
    DeviceCmyk,
}

/// A component slot: its name, for messages, and what it may hold.
struct Slot {
    name: &'static str,
    number: bool,
    percent: bool,
    angle: bool,
}

const fn slot(name: &'static str, number: bool, percent: bool, angle: bool) -> Slot {
    Slot {
        name,
        number,
        percent,
        angle,
    }
}

/// A component value resolved to a number: percentages keep their percent
/// value, angles are in degrees, `none` is 0.
#[derive(Clone, Copy)]
enum Val {
    Num(f64),
    Pct(f64),
}

impl Val {
    /// Number, or percentage scaled so that 100% = `full`.
    fn scaled(self, full: f64) -> f64 {
        match self {
            Val::Num(v) => v,
            Val::Pct(p) => p * (full / 100.0),
        }
    }

    /// Fraction of full scale: a number divided by `num_full`, or percent / 100.
    fn fraction(self, num_full: f64) -> f64 {
        match self {
            Val::Num(v) => v / num_full,
            Val::Pct(p) => p / 100.0,
        }
    }
}

fn describe(s: &Slot, legacy: bool) -> String {
    let mut kinds = Vec::new();
    if s.number {
        kinds.push("a number");
    }
    if s.percent {
        kinds.push("a percentage");
    }
    if s.angle {
        kinds.push("an angle (deg, rad, grad, turn)");
    }
    if !legacy {
        kinds.push("none");
    }
    match kinds.len() {
        1 => kinds[0].to_string(),
        _ => {
            let last = kinds.pop().unwrap_or_default();
            format!("{} or {last}", kinds.join(", "))
        }
    }
}

fn resolve_comp(f: &str, idx: usize, s: &Slot, t: &Tok, legacy: bool) -> Result<Val, String> {
    let bad = || {
        format!(
            "{f}(): argument {} ({}) must be {}; found \"{}\"",
            idx + 1,
            s.name,
            describe(s, legacy),
            t.text
        )
    };
    match &t.kind {
        Kind::Num(v) if s.number || s.angle => Ok(Val::Num(*v)),
        Kind::Pct(p) if s.percent => Ok(Val::Pct(*p)),
        Kind::Dim(v, unit) if s.angle => {
            let deg = match unit.as_str() {
                "deg" => *v,
                "rad" => v.to_degrees(),
                "grad" => v * 0.9,
                "turn" => v * 360.0,
                _ => return Err(bad()),
            };
            if deg.is_finite() {
                Ok(Val::Num(deg))
            } else {
                Err(bad())
            }
        }
        Kind::Ident(id) if id == "none" => {
            if legacy {
                Err(format!(
                    "{f}(): \"none\" is only allowed in the space-separated syntax (argument {})",
                    idx + 1
                ))
            } else {
                Ok(Val::Num(0.0))
            }
        }
        _ => Err(bad()),
    }
}

/// The alpha of a call, clamped to 0..1 as CSS does (1 when none is given).
fn alpha_of(f: &str, args: &Args) -> Result<f64, String> {
    let Some(a) = &args.alpha else { return Ok(1.0) };
    let v = match &a.kind {
        Kind::Num(v) => *v,
        Kind::Pct(p) => p / 100.0,
        Kind::Ident(id) if id == "none" => 0.0,
        _ => {
            return Err(format!(
                "{f}(): alpha must be a number or a percentage; found \"{}\"",
                a.text
            ))
        }
    };
    // CSS clamps alpha to 0..1, so anything ≥ 1 is opaque.
    if v.is_nan() {
        return Err(format!("{f}(): alpha \"{}\" is not a number", a.text));
    }
    Ok(v.clamp(0.0, 1.0))
}

impl Func {
    /// Resolves a parsed call: the colour space of `color()`, the argument
    /// count, each argument against its slot, alpha, then the colour.
    fn resolve(self, f: &str, mut args: Args) -> Result<(ColorInput, f64), String> {
        let space = self.take_space(&mut args)?;
        let slots = self.slots(args.legacy);
        self.check_arity(f, slots, &mut args)?;
        let mut v = Vec::with_capacity(slots.len());
        for (i, (s, t)) in slots.iter().zip(&args.comps).enumerate() {
            v.push(resolve_comp(f, i, s, t, args.legacy)?);
        }
        let alpha = alpha_of(f, &args)?;
        self.color(f, &v, args.legacy, space).map(|c| (c, alpha))
    }

    /// The colour space that comes first in `color()`, taken off the
    /// arguments; `None` for every other function.
    fn take_space(self, args: &mut Args) -> Result<Option<CssRgbSpace>, String> {
        if let Func::Color = self {
            if args.legacy {
                return Err("color() takes space-separated values, no commas".into());
            }
            if args.comps.is_empty() {
                return Err("color() needs a colour space: srgb, display-p3 or rec2020".into());
            }
            let first = args.comps.remove(0);
            let Kind::Ident(name) = &first.kind else {
                return Err(format!(
                    "color(): first argument must be a colour space (srgb, display-p3 or rec2020); found \"{}\"",
                    first.text
                ));
            };
            CssRgbSpace::from_css_name(name).map(Some).ok_or_else(|| {
                format!(
                    "color(): colour space \"{}\" is not supported; expected srgb, display-p3 or rec2020",
                    first.text
                )
            })
        } else {
            Ok(None)
        }
    }

    /// What each argument may be.
    fn slots(self, legacy: bool) -> &'static [Slot] {
        const N: bool = true;
        const X: bool = false;
        match self {
            Func::Rgb => const { &[slot("red", N, N, X), slot("green", N, N, X), slot("blue", N, N, X)] },
            Func::Hsl if legacy => {
                const {
                    &[
                        slot("hue", X, X, N),
                        slot("saturation", X, N, X),
                        slot("lightness", X, N, X),
                    ]
                }
            }
            Func::Hsl => {
                const {
                    &[
                        slot("hue", X, X, N),
                        slot("saturation", N, N, X),
                        slot("lightness", N, N, X),
                    ]
                }
            }
            Func::Lab | Func::Oklab => const { &[slot("L", N, N, X), slot("a", N, N, X), slot("b", N, N, X)] },
            Func::Lch | Func::Oklch => const { &[slot("L", N, N, X), slot("C", N, N, X), slot("h", X, X, N)] },
            Func::Color => const { &[slot("r", N, N, X), slot("g", N, N, X), slot("b", N, N, X)] },
            Func::DeviceCmyk if legacy => {
                const {
                    &[
                        slot("cyan", N, X, X),
                        slot("magenta", N, X, X),
                        slot("yellow", N, X, X),
                        slot("black", N, X, X),
                    ]
                }
            }
            Func::DeviceCmyk => {
                const {
                    &[
                        slot("cyan", N, N, X),
                        slot("magenta", N, N, X),
                        slot("yellow", N, N, X),
                        slot("black", N, N, X),
                    ]
                }
            }
        }
    }

    /// The comma syntax where it is allowed, alpha split off, and the count.
    fn check_arity(self, f: &str, slots: &[Slot], args: &mut Args) -> Result<(), String> {
        let legacy_ok = matches!(self, Func::Rgb | Func::Hsl | Func::DeviceCmyk);
        if args.legacy && !legacy_ok {
            return Err(format!("{f}() takes space-separated values, no commas"));
        }
        // In the comma syntax a fourth (fifth for device-cmyk) value is alpha.
        if args.legacy && args.comps.len() == slots.len() + 1 && !matches!(self, Func::DeviceCmyk) {
            args.alpha = args.comps.pop();
        }
        if args.comps.len() != slots.len() {
            let names: Vec<&str> = slots.iter().map(|s| s.name).collect();
            return Err(format!(
                "{f}() takes {} values ({}); found {}",
                slots.len(),
                names.join(", "),
                args.comps.len()
            ));
        }
        Ok(())
    }

    /// The colour of resolved arguments `v`.
    fn color(self, f: &str, v: &[Val], legacy: bool, space: Option<CssRgbSpace>) -> Result<ColorInput, String> {
        Ok(match self {
            Func::Rgb => {
                // Legacy rgb() may not mix numbers and percentages.
                if legacy {
                    let pct = v.iter().filter(|x| matches!(x, Val::Pct(_))).count();
                    if pct != 0 && pct != 3 {
                        return Err(format!(
                            "{f}(): in the comma syntax use three numbers or three percentages, not a mix"
                        ));
                    }
                }
                // CSS Color 4, 5.1: rgb() components are clamped to 0..255.
                ColorInput::ScreenRgb([0, 1, 2].map(|i| v[i].fraction(255.0).clamp(0.0, 1.0)))
            }
            Func::Hsl => {
                let h = v[0].scaled(1.0);
                // Modern numbers for s and l mean percent (hsl(120 50 50)).
                let s = v[1].fraction(100.0).clamp(0.0, 1.0);
                let l = v[2].fraction(100.0).clamp(0.0, 1.0);
                ColorInput::ScreenRgb(hsl_to_srgb(h, s, l))
            }
            Func::Lab => ColorInput::Lab(LabD50::new(
                v[0].scaled(100.0).clamp(0.0, 100.0),
                v[1].scaled(125.0),
                v[2].scaled(125.0),
            )),
            Func::Lch => {
                let l = v[0].scaled(100.0).clamp(0.0, 100.0);
                let c = v[1].scaled(150.0).max(0.0);
                ColorInput::Lab(LabD50::from_array(polar_to_rect(l, c, v[2].scaled(1.0))))
            }
            Func::Oklab => ColorInput::Lab(oklab_to_lab_d50(
                v[0].scaled(1.0).clamp(0.0, 1.0),
                v[1].scaled(0.4),
                v[2].scaled(0.4),
            )),
            Func::Oklch => {
                let l = v[0].scaled(1.0).clamp(0.0, 1.0);
                let c = v[1].scaled(0.4).max(0.0);
                let [l, a, b] = polar_to_rect(l, c, v[2].scaled(1.0));
                ColorInput::Lab(oklab_to_lab_d50(l, a, b))
            }
            Func::Color => {
                let space = space.unwrap_or(CssRgbSpace::Srgb);
                ColorInput::Lab(css_rgb_to_lab_d50(space, [0, 1, 2].map(|i| v[i].fraction(1.0))))
            }
            // CSS Color 5: numbers 0..1 or percentages; stored as percent, clamped.
            Func::DeviceCmyk => ColorInput::DeviceCmyk([0, 1, 2, 3].map(|i| {
                let pct = match v[i] {
                    Val::Num(n) => n * 100.0,
                    Val::Pct(p) => p,
                };
                pct.clamp(0.0, 100.0)
            })),
        })
    }
}
#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn number_tokens() {
        let t = tokenize("1 -2.5 +.5 3e2 4E-1 50% 90deg none").unwrap();
        let k: Vec<Kind> = t.into_iter().map(|t| t.kind).collect();
        assert_eq!(
            k,
            vec![
                Kind::Num(1.0),
                Kind::Num(-2.5),
                Kind::Num(0.5),
                Kind::Num(300.0),
                Kind::Num(0.4),
                Kind::Pct(50.0),
                Kind::Dim(90.0, "deg".into()),
                Kind::Ident("none".into()),
            ]
        );
    }

    #[test]
    fn glued_tokens_are_rejected() {
        assert!(tokenize("12px3").is_err());
        assert!(tokenize("5%%").is_err());
        assert!(tokenize("1.2.3").is_err());
    }
}
