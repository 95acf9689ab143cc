//! ICC profiles: where they come from (built-in or file), checking that a
//! profile can play the role asked of it (screen or press), which intents have
//! their own tables, and the lcms2 transforms built from them.

pub mod builtin;
pub mod header;
pub mod inspect;
pub mod tags;
pub mod transform;

use std::fmt;
use std::fs::{File, Metadata};
use std::io::Read;
use std::path::{Path, PathBuf};

use header::{Header, HeaderError, Signature, TagEntry};
use tags::TagError;

/// The largest profile inkfit reads, bytes: 64 MiB. Display and press
/// profiles are a few kB to a few MB (the built-in press is 0.9 MB); large
/// device links and six-colour press profiles reach tens of MB. The cap
/// keeps a huge or endless file (a device, a mistaken path) from filling
/// memory.
pub const MAX_PROFILE_BYTES: usize = 64 << 20;

/// Errors from loading or using a profile. Each names the profile.
#[derive(Debug, thiserror::Error)]
pub enum IccError {
    /// The header or tag table is not well formed.
    #[error("profile '{name}': {source}")]
    Malformed {
        /// The profile's name: the built-in name or the path as given.
        name: String,
        /// What is wrong with the header or tag table.
        #[source]
        source: HeaderError,
    },
    /// The file could not be read.
    #[error("profile '{name}': cannot read the file: {source}")]
    Read {
        /// The profile's name: the built-in name or the path as given.
        name: String,
        /// The read error.
        #[source]
        source: std::io::Error,
    },
    /// A tag failed its check before lcms2 opened the profile.
    #[error("profile '{name}': {source}")]
    BadTag {
        /// The profile's name: the built-in name or the path as given.
        name: String,
        /// What is wrong with the tag.
        #[source]
        source: TagError,
    },
    /// The path names something other than a regular file.
    #[error("profile '{name}': not a regular file but {what}; give the path of an ICC profile file")]
    NotAFile {
        /// The profile's name: the path as given.
        name: String,
        /// What the path names instead ("a directory", "a FIFO (named pipe)", …).
        what: &'static str,
    },
    /// The profile is larger than [`MAX_PROFILE_BYTES`].
    #[error("profile '{name}': larger than {} MiB, the most inkfit reads for a profile", MAX_PROFILE_BYTES >> 20)]
    TooLarge {
        /// The profile's name: the built-in name or the path as given.
        name: String,
    },
    /// lcms2 refused the profile after inkfit's own checks passed.
    #[error("profile '{name}': lcms2 cannot open it (a damaged or unsupported tag)")]
    Open {
        /// The profile's name: the built-in name or the path as given.
        name: String,
    },
    /// Neither a built-in name nor an existing file.
    #[error("profile '{name}': no such file and no built-in of that name (built-ins: {builtins})")]
    Unknown {
        /// The name as given.
        name: String,
        /// The built-in names, comma-separated.
        builtins: String,
    },
    /// The profile cannot play the role asked of it (screen or press).
    #[error("profile '{name}' is {found}; {role} needs {expected}")]
    WrongKind {
        /// The profile's name: the built-in name or the path as given.
        name: String,
        /// What the profile is, as [`IccProfile::kind_phrase`] words it.
        found: String,
        /// The role asked of it: the option that names it (`--screen`, `--press`).
        role: &'static str,
        /// What that role needs.
        expected: &'static str,
    },
    /// lcms2 could not build a transform from the profile.
    #[error("profile '{name}': cannot build the {what} transform for {intent}")]
    Transform {
        /// The profile's name: the built-in name or the path as given.
        name: String,
        /// Which transform: its direction or purpose, in words.
        what: &'static str,
        /// The rendering intent asked for.
        intent: RenderingIntent,
    },
    /// A built-in profile could not be made.
    #[error("built-in profile '{name}' could not be made: {detail}")]
    Builtin {
        /// The built-in name.
        name: String,
        /// Why it could not be made.
        detail: String,
    },
}

/// The four ICC rendering intents (ICC.1:2010, 7.2.15).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum RenderingIntent {
    /// Perceptual: the whole gamut compressed to fit, its appearance kept.
    Perceptual,
    /// Relative colorimetric: in-gamut colours kept, white mapped to the medium's white.
    Relative,
    /// Saturation: vivid colours kept vivid, accuracy second.
    Saturation,
    /// Absolute colorimetric: colours kept as measured, the medium's white included.
    Absolute,
}

impl RenderingIntent {
    /// The four intents in ICC order (0 perceptual … 3 absolute).
    pub const ALL: [RenderingIntent; 4] = [
        RenderingIntent::Perceptual,
        RenderingIntent::Relative,
        RenderingIntent::Saturation,
        RenderingIntent::Absolute,
    ];

    /// The matching lcms2 intent.
    pub fn to_lcms(self) -> lcms2::Intent {
        match self {
            RenderingIntent::Perceptual => lcms2::Intent::Perceptual,
            RenderingIntent::Relative => lcms2::Intent::RelativeColorimetric,
            RenderingIntent::Saturation => lcms2::Intent::Saturation,
            RenderingIntent::Absolute => lcms2::Intent::AbsoluteColorimetric,
        }
    }

    /// Short name as used on the command line and in JSON.
    pub fn key(self) -> &'static str {
        match self {
            RenderingIntent::Perceptual => "perceptual",
            RenderingIntent::Relative => "relative",
            RenderingIntent::Saturation => "saturation",
            RenderingIntent::Absolute => "absolute",
        }
    }

    /// The digit of the A2Bn/B2An tag that serves this intent (ICC.1:2010,
    /// table 25: absolute colorimetric uses the colorimetric table).
    pub fn table_index(self) -> u8 {
        match self {
            RenderingIntent::Perceptual => 0,
            RenderingIntent::Relative | RenderingIntent::Absolute => 1,
            RenderingIntent::Saturation => 2,
        }
    }
}

impl fmt::Display for RenderingIntent {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            RenderingIntent::Perceptual => "perceptual",
            RenderingIntent::Relative => "relative colorimetric",
            RenderingIntent::Saturation => "saturation",
            RenderingIntent::Absolute => "absolute colorimetric",
        })
    }
}

/// Where a profile came from.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Origin {
    /// Built into inkfit.
    Builtin,
    /// Read from this file.
    File(PathBuf),
}

/// A profile that passed the strict header check and that lcms2 opened.
pub struct IccProfile {
    /// The name a user knows it by: the built-in name or the path as given.
    pub name: String,
    /// Where it came from: built in or a file.
    pub origin: Origin,
    /// The whole profile as read.
    pub bytes: Vec<u8>,
    /// The parsed header and tag table.
    pub header: Header,
    /// The profile as lcms2 opened it.
    pub lcms: lcms2::Profile,
}

impl fmt::Debug for IccProfile {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("IccProfile")
            .field("name", &self.name)
            .field("origin", &self.origin)
            .field("class", &self.header.class)
            .field("color_space", &self.header.color_space)
            .finish()
    }
}

/// Checks that an image's own profile can describe its pixels: a connection
/// space of CIEXYZ or CIELAB (ICC.1:2010, 7.2.7), and an RGB profile with a
/// table or matrix to it for RGB pixels, a grey one for grey pixels, a CMYK
/// output profile with a table to it for CMYK pixels.
pub fn check_embedded(profile: &IccProfile, channels: usize) -> Result<(), String> {
    use header::{CLASS_OUTPUT, SPACE_CMYK, SPACE_GRAY, SPACE_LAB, SPACE_RGB, SPACE_XYZ};
    let h = &profile.header;
    if h.pcs != SPACE_XYZ && h.pcs != SPACE_LAB {
        return Err(format!(
            "the embedded profile's connection space is '{}', neither XYZ nor Lab",
            h.pcs
        ));
    }
    let has = |s: &[u8; 4]| h.tag(s).is_some();
    let tables = has(b"A2B0") || has(b"A2B1") || has(b"A2B2");
    let (ok, layout, what) = match channels {
        1 => (
            h.color_space == SPACE_GRAY && (tables || profile.is_matrix_shaper()),
            "a grey",
            "a grey profile",
        ),
        4 => (
            h.color_space == SPACE_CMYK && h.class == CLASS_OUTPUT && tables,
            "a CMYK",
            "a CMYK output profile",
        ),
        _ => (
            h.color_space == SPACE_RGB && (tables || profile.is_matrix_shaper()),
            "an RGB",
            "an RGB profile",
        ),
    };
    if ok {
        Ok(())
    } else {
        Err(format!(
            "the embedded profile is {}; {layout} image needs {what}",
            profile.kind_phrase()
        ))
    }
}

/// `text` shortened to at most `max` characters (at least 3) by an ellipsis
/// in the middle: the first half and the last half of what fits.
pub fn middle_ellipsis(text: &str, max: usize) -> String {
    let chars: Vec<char> = text.chars().collect();
    let max = max.max(3);
    if chars.len() <= max {
        return text.to_string();
    }
    let keep = max - 1;
    let head = keep.div_ceil(2);
    let tail = keep - head;
    let mut out: String = chars[..head].iter().collect::<String>().trim_end().to_string();
    out.push('…');
    out.push_str(chars[chars.len() - tail..].iter().collect::<String>().trim_start());
    out
}

/// Which way a table converts.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Direction {
    /// Device → PCS (A2Bn).
    ToPcs,
    /// PCS → device (B2An).
    FromPcs,
}

/// What serves one intent in one direction.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum TableUse {
    /// A table of the intent's own, stored once.
    Own(Signature),
    /// The intent's tag exists but holds the same data as another intent's.
    SameAs {
        /// The intent's own tag.
        tag: Signature,
        /// The tag, first in the tag table, whose data it shares.
        other: Signature,
    },
    /// No tag for this intent: lcms2 falls back to the one named.
    FallsBackTo(Signature),
    /// Matrix/TRC model: every intent computes the same colorimetric result.
    Matrix,
    /// Nothing serves this direction.
    Missing,
}

impl IccProfile {
    /// Resolves a profile argument: an exact built-in name, else a file path.
    pub fn load(spec: &str) -> Result<Self, IccError> {
        if let Some(bytes) = builtin::bytes(spec) {
            return Self::from_bytes(spec, Origin::Builtin, bytes?);
        }
        let path = Path::new(spec);
        let bytes = read_bounded(spec, path)?;
        Self::from_bytes(spec, Origin::File(path.to_path_buf()), bytes)
    }

    /// Checks and opens a profile held in memory: the header and tag table,
    /// then every tag lcms2 will decode, and only then lcms2.
    pub fn from_bytes(name: &str, origin: Origin, bytes: Vec<u8>) -> Result<Self, IccError> {
        if bytes.len() > MAX_PROFILE_BYTES {
            return Err(IccError::TooLarge { name: name.to_string() });
        }
        let header = Header::parse(&bytes).map_err(|source| IccError::Malformed {
            name: name.to_string(),
            source,
        })?;
        tags::validate(&header, &bytes).map_err(|source| IccError::BadTag {
            name: name.to_string(),
            source,
        })?;
        let lcms = lcms2::Profile::new_icc(&bytes).map_err(|_| IccError::Open { name: name.to_string() })?;
        Ok(Self {
            name: name.to_string(),
            origin,
            bytes,
            header,
            lcms,
        })
    }

    /// How this profile reads to a person: "a display RGB profile" etc.
    pub fn kind_phrase(&self) -> String {
        describe_kind(self.header.class, self.header.color_space)
    }

    /// The profile's own description text (its `desc` tag), when it has
    /// one that is not blank; control characters become spaces.
    pub fn description(&self) -> Option<String> {
        let d = self.lcms.info(lcms2::InfoType::Description, lcms2::Locale::none())?;
        let d: String = d.chars().map(|c| if c.is_control() { ' ' } else { c }).collect();
        let d = d.split_whitespace().collect::<Vec<_>>().join(" ");
        (!d.is_empty()).then_some(d)
    }

    /// What a figure's legend calls the profile, at most `max` characters:
    /// the built-in name; for a file its description, else its file name
    /// (never the whole path). Longer text keeps its start and end with an
    /// ellipsis in the middle, where names that share a maker's prefix and
    /// a version suffix differ least.
    pub fn legend_label(&self, max: usize) -> String {
        let text = match &self.origin {
            Origin::Builtin => self.name.clone(),
            Origin::File(p) => self.description().unwrap_or_else(|| {
                p.file_name()
                    .map_or_else(|| self.name.clone(), |n| n.to_string_lossy().into_owned())
            }),
        };
        middle_ellipsis(&text, max)
    }

    /// True when the profile is one of inkfit's built-ins.
    pub fn is_builtin(&self) -> bool {
        self.origin == Origin::Builtin
    }

    /// The file it was read from; `None` for a built-in.
    pub fn file(&self) -> Option<&Path> {
        match &self.origin {
            Origin::File(p) => Some(p),
            Origin::Builtin => None,
        }
    }

    /// Accepts the profile as a screen: RGB device data, and a class that
    /// converts device values to the connection space.
    pub fn require_screen(self) -> Result<Self, IccError> {
        use header::*;
        let h = &self.header;
        let class_ok = [CLASS_DISPLAY, CLASS_INPUT, CLASS_COLORSPACE, CLASS_OUTPUT].contains(&h.class);
        if h.color_space == SPACE_RGB && class_ok && self.has_to_pcs() {
            Ok(self)
        } else {
            Err(IccError::WrongKind {
                found: self.kind_phrase(),
                name: self.name,
                role: "--screen",
                expected: "an RGB display, input or colour-space profile",
            })
        }
    }

    /// Accepts the profile as a press: an output profile for CMYK with tables
    /// both ways.
    pub fn require_press(self) -> Result<Self, IccError> {
        use header::*;
        let h = &self.header;
        if h.color_space == SPACE_CMYK && h.class == CLASS_OUTPUT && self.has_to_pcs() && self.has_from_pcs() {
            Ok(self)
        } else {
            Err(IccError::WrongKind {
                found: self.kind_phrase(),
                name: self.name,
                role: "--press",
                expected: "a CMYK output profile with tables to and from the connection space",
            })
        }
    }

    fn has(&self, sig: &[u8; 4]) -> bool {
        self.header.tag(sig).is_some()
    }

    /// True for a matrix/TRC RGB or grey model (ICC.1:2010, F.3).
    pub fn is_matrix_shaper(&self) -> bool {
        (self.has(b"rXYZ")
            && self.has(b"gXYZ")
            && self.has(b"bXYZ")
            && self.has(b"rTRC")
            && self.has(b"gTRC")
            && self.has(b"bTRC"))
            || self.has(b"kTRC")
    }

    fn has_to_pcs(&self) -> bool {
        self.has(b"A2B0") || self.has(b"A2B1") || self.has(b"A2B2") || self.is_matrix_shaper()
    }

    fn has_from_pcs(&self) -> bool {
        self.has(b"B2A0") || self.has(b"B2A1") || self.has(b"B2A2") || self.is_matrix_shaper()
    }

    /// Which table serves `intent` in `dir`, following lcms2's fallback order
    /// (the intent's own tag, else the perceptual tag, else the matrix model).
    pub fn table_use(&self, intent: RenderingIntent, dir: Direction) -> TableUse {
        let prefix: &[u8; 3] = match dir {
            Direction::ToPcs => b"A2B",
            Direction::FromPcs => b"B2A",
        };
        let sig_of = |i: u8| Signature([prefix[0], prefix[1], prefix[2], b'0' + i]);
        let entry = |i: u8| self.header.tag(&sig_of(i).0);
        let own = intent.table_index();
        match entry(own) {
            Some(e) => {
                // Among tags holding the same data, the one first in the tag
                // table counts as the table; the others point to it.
                let first = self
                    .header
                    .tags
                    .iter()
                    .copied()
                    .filter(|t| t.sig.0[..3] == prefix[..] && matches!(t.sig.0[3], b'0'..=b'2'))
                    .find(|&t| same_data(&self.bytes, e, t));
                match first {
                    Some(f) if f.sig != e.sig => TableUse::SameAs {
                        tag: e.sig,
                        other: f.sig,
                    },
                    _ => TableUse::Own(e.sig),
                }
            }
            None => match entry(0) {
                Some(e) => TableUse::FallsBackTo(e.sig),
                None if self.is_matrix_shaper() => TableUse::Matrix,
                None => TableUse::Missing,
            },
        }
    }

    /// A note for output when `intent` has no table of its own in `dir`.
    pub fn intent_note(&self, intent: RenderingIntent, dir: Direction) -> Option<String> {
        let n = &self.name;
        match self.table_use(intent, dir) {
            TableUse::Own(_) => None,
            TableUse::SameAs { tag, other } => Some(format!(
                "{n}: the {intent} table ({tag}) holds the same data as {other} ({}); this intent gives the same result",
                intent_of_tag(other)
            )),
            TableUse::FallsBackTo(tag) => Some(format!(
                "{n}: no {intent} table; lcms2 uses the perceptual table ({tag}) instead"
            )),
            TableUse::Matrix => (intent != RenderingIntent::Absolute && intent != RenderingIntent::Relative).then(|| {
                format!("{n}: matrix/TRC profile: {intent} gives the same result as relative colorimetric")
            }),
            TableUse::Missing => Some(format!("{n}: no table serves {intent}")),
        }
    }
}

/// Reads the profile file at `path`: only a regular file (after following
/// links), at most [`MAX_PROFILE_BYTES`]. The file is opened without
/// blocking and checked again once open, so a FIFO or device put in its
/// place after the first check is refused too, and the read stops one byte
/// past the cap whatever size the file system reports.
fn read_bounded(name: &str, path: &Path) -> Result<Vec<u8>, IccError> {
    let read_err = |source| IccError::Read {
        name: name.to_string(),
        source,
    };
    let meta = match std::fs::metadata(path) {
        Ok(m) => m,
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
            return Err(IccError::Unknown {
                name: name.to_string(),
                builtins: builtin::names().join(", "),
            })
        }
        Err(e) => return Err(read_err(e)),
    };
    require_regular(name, &meta)?;
    let file = open_nonblocking(path).map_err(read_err)?;
    let meta = file.metadata().map_err(read_err)?;
    require_regular(name, &meta)?;
    let cap = MAX_PROFILE_BYTES as u64;
    if meta.len() > cap {
        return Err(IccError::TooLarge { name: name.to_string() });
    }
    let mut bytes = Vec::with_capacity(meta.len() as usize);
    file.take(cap + 1).read_to_end(&mut bytes).map_err(read_err)?;
    if bytes.len() > MAX_PROFILE_BYTES {
        return Err(IccError::TooLarge { name: name.to_string() });
    }
    Ok(bytes)
}

#[cfg(unix)]
fn open_nonblocking(path: &Path) -> std::io::Result<File> {
    use std::os::unix::fs::OpenOptionsExt;
    // Without O_NONBLOCK, opening a FIFO waits for a writer.
    std::fs::OpenOptions::new()
        .read(true)
        .custom_flags(libc::O_NONBLOCK)
        .open(path)
}

#[cfg(not(unix))]
fn open_nonblocking(path: &Path) -> std::io::Result<File> {
    File::open(path)
}

fn require_regular(name: &str, meta: &Metadata) -> Result<(), IccError> {
    let t = meta.file_type();
    if t.is_file() {
        return Ok(());
    }
    let what = if t.is_dir() { "a directory" } else { special_kind(&t) };
    Err(IccError::NotAFile {
        name: name.to_string(),
        what,
    })
}

#[cfg(unix)]
fn special_kind(t: &std::fs::FileType) -> &'static str {
    use std::os::unix::fs::FileTypeExt;
    if t.is_fifo() {
        "a FIFO (named pipe)"
    } else if t.is_char_device() {
        "a character device"
    } else if t.is_block_device() {
        "a block device"
    } else if t.is_socket() {
        "a socket"
    } else {
        "a special file"
    }
}

#[cfg(not(unix))]
fn special_kind(_: &std::fs::FileType) -> &'static str {
    "a special file"
}

/// Two tag entries hold the same data: one shared offset, or equal bytes.
fn same_data(bytes: &[u8], a: TagEntry, b: TagEntry) -> bool {
    a.size == b.size
        && (a.offset == b.offset || bytes[a.offset..a.offset + a.size] == bytes[b.offset..b.offset + b.size])
}

fn intent_of_tag(sig: Signature) -> &'static str {
    match sig.0[3] {
        b'0' => "perceptual",
        b'1' => "colorimetric",
        b'2' => "saturation",
        _ => "?",
    }
}

/// "a display RGB profile", "an output CMYK profile", "a Lab abstract profile"…
pub fn describe_kind(class: Signature, space: Signature) -> String {
    use header::*;
    let class_word = match class {
        c if c == CLASS_DISPLAY => "display",
        c if c == CLASS_INPUT => "input",
        c if c == CLASS_OUTPUT => "output",
        c if c == CLASS_LINK => "device link",
        c if c == CLASS_ABSTRACT => "abstract",
        c if c == CLASS_COLORSPACE => "colour space",
        c if c == CLASS_NAMED => "named colour",
        _ => "unknown-class",
    };
    let space_word = match space {
        s if s == SPACE_RGB => "RGB".to_string(),
        s if s == SPACE_CMYK => "CMYK".to_string(),
        s if s == SPACE_GRAY => "grey".to_string(),
        s if s == SPACE_LAB => "Lab".to_string(),
        s if s == SPACE_XYZ => "XYZ".to_string(),
        s => format!("'{s}'"),
    };
    let phrase = format!("{space_word} {class_word} profile");
    let article = if phrase.starts_with(['a', 'e', 'i', 'o', 'u', 'R', 'X']) {
        "an"
    } else {
        "a"
    };
    format!("{article} {phrase}")
}

#[cfg(test)]
mod tests {
    use super::middle_ellipsis;

    // Properties: short text is kept; long text fits, keeps its start and
    // its end, and shows where it was cut.
    #[test]
    fn middle_ellipsis_keeps_both_ends() {
        assert_eq!(middle_ellipsis("srgb", 28), "srgb");
        let long = "Tarrowmere Basin Press Coated 2026 v3 (measured)";
        let s = middle_ellipsis(long, 28);
        assert!(s.chars().count() <= 28, "{s}");
        let (head, tail) = s.split_once('…').expect("an ellipsis");
        assert!(long.starts_with(head) && long.ends_with(tail), "{s}");
        assert!(head.starts_with("Tarrowmere") && tail.ends_with("(measured)"), "{s}");
        assert!(head.chars().count() >= 13 && tail.chars().count() >= 13, "{s}");
        // Multi-byte characters are counted as characters, not bytes.
        let s = middle_ellipsis("ΔΔΔΔΔΔΔΔΔΔΔΔ", 5);
        assert_eq!(s, "ΔΔ…ΔΔ");
    }
}
