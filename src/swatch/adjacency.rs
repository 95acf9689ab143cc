//! Which classes of a map touch: found in a map image
//! ([`super::map_raster`]) or given for any palette in a small text file of
//! our own.
//!
//! On a map, two classes must be told apart side by side only where they
//! share a border; classes that never meet are told apart through the
//! legend. With an adjacency known, separation holds touching pairs to the
//! full floor and the others to the lower legend floor.
//!
//! # The adjacency file
//!
//! UTF-8 text, one pair of touching classes a line, the two separated by
//! `|`, optionally a third field with the border length in pixels:
//!
//! ```text
//! # classes that share a border
//! Woodland | Pasture
//! Woodland | Open water | 340
//! 3 | 5
//! ```
//!
//! Each side is an entry's name as the palette gives it (surrounding spaces
//! ignored) or its number in the palette (1-based). Blank lines and lines
//! starting with `#` are skipped. Pairs not listed do not touch.

use std::collections::HashMap;
use std::path::Path;

use serde::Serialize;

use super::{Entry, PaletteError};

/// Where an adjacency comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum AdjacencySource {
    /// Found in a map image.
    Map,
    /// Given in an adjacency file.
    File,
    /// Found by rendering SVG artwork.
    Render,
}

/// The touching pairs of a palette's entries.
#[derive(Clone, Debug, PartialEq)]
pub struct Adjacency {
    /// Where it comes from.
    pub source: AdjacencySource,
    /// Touching pairs (0-based entry indices, lower first) with the border
    /// length in pixels where known.
    touching: HashMap<(usize, usize), Option<u64>>,
    /// Per entry, whether its neighbours are known; `None`: every entry's.
    known: Option<Vec<bool>>,
}

impl Adjacency {
    /// An adjacency over touching pairs keyed (lower, higher), 0-based.
    pub fn new(source: AdjacencySource, touching: HashMap<(usize, usize), Option<u64>>) -> Self {
        Adjacency {
            source,
            touching,
            known: None,
        }
    }

    /// The same, knowing the neighbours only of the entries marked true
    /// (artwork whose rendering shows some colours only blended or in lines
    /// too thin to be classes).
    pub fn with_known(mut self, known: Vec<bool>) -> Self {
        self.known = Some(known);
        self
    }

    /// Whether entry `i`'s neighbours are known.
    pub fn knows(&self, i: usize) -> bool {
        self.known.as_ref().is_none_or(|k| k.get(i).copied().unwrap_or(false))
    }

    fn key(a: usize, b: usize) -> (usize, usize) {
        (a.min(b), a.max(b))
    }

    /// Entries `a` and `b` (0-based) touch.
    pub fn touches(&self, a: usize, b: usize) -> bool {
        self.touching.contains_key(&Self::key(a, b))
    }

    /// Their shared border in pixels, where known.
    pub fn border_px(&self, a: usize, b: usize) -> Option<u64> {
        self.touching.get(&Self::key(a, b)).copied().flatten()
    }

    /// How many pairs touch.
    pub fn len(&self) -> usize {
        self.touching.len()
    }

    /// No pair touches.
    pub fn is_empty(&self) -> bool {
        self.touching.is_empty()
    }

    /// The touching pairs, 0-based, lower first, in order.
    pub fn pairs(&self) -> Vec<(usize, usize)> {
        let mut v: Vec<_> = self.touching.keys().copied().collect();
        v.sort_unstable();
        v
    }
}

/// Largest adjacency file read: 4 MiB (a full 4,096-entry palette's pairs
/// would not fit, but no map has every class touch every other).
pub const MAX_ADJACENCY_BYTES: u64 = 4 << 20;

/// Reads an adjacency file naming `entries`.
pub fn read_adjacency(path: &Path, entries: &[Entry]) -> Result<Adjacency, PaletteError> {
    let file = path.display().to_string();
    let text = super::read_bounded_max(path, &file, MAX_ADJACENCY_BYTES)?;
    parse_adjacency(&file, &text, entries)
}

/// Parses adjacency text; `file` names it in errors.
pub fn parse_adjacency(file: &str, text: &str, entries: &[Entry]) -> Result<Adjacency, PaletteError> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut by_name: HashMap<&str, Option<usize>> = HashMap::new();
    for (i, e) in entries.iter().enumerate() {
        by_name
            .entry(e.name.as_str())
            .and_modify(|v| *v = None)
            .or_insert(Some(i));
    }
    let err = |line: usize, message: String| PaletteError::Syntax {
        file: file.to_string(),
        line,
        message,
    };
    let resolve = |line: usize, side: &str| -> Result<usize, PaletteError> {
        match by_name.get(side) {
            Some(Some(i)) => Ok(*i),
            Some(None) => Err(err(
                line,
                format!("\"{side}\" names more than one entry of the palette; use its number"),
            )),
            None => match side.parse::<usize>() {
                Ok(n) if (1..=entries.len()).contains(&n) => Ok(n - 1),
                Ok(n) => Err(err(
                    line,
                    format!("entry {n} is not in the palette, which has {}", entries.len()),
                )),
                Err(_) => Err(err(line, format!("\"{side}\" is no entry of the palette"))),
            },
        }
    };
    let mut touching = HashMap::new();
    for (n, raw) in text.lines().enumerate() {
        let line = n + 1;
        let t = raw.trim();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let fields: Vec<&str> = t.split('|').map(str::trim).collect();
        if !(2..=3).contains(&fields.len()) {
            return Err(err(
                line,
                "expected two classes separated by '|' and optionally a border length, as in 'Woodland | Pasture | 120'"
                    .to_string(),
            ));
        }
        let (a, b) = (resolve(line, fields[0])?, resolve(line, fields[1])?);
        if a == b {
            return Err(err(line, format!("\"{}\" is paired with itself", fields[0])));
        }
        let border = match fields.get(2) {
            None => None,
            Some(f) => Some(
                f.parse::<u64>()
                    .map_err(|_| err(line, format!("border length \"{f}\" is not a whole number of pixels")))?,
            ),
        };
        touching.insert((a.min(b), a.max(b)), border);
    }
    Ok(Adjacency::new(AdjacencySource::File, touching))
}
