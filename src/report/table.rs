//! Plain aligned text tables: columns sized to their widest cell, numbers
//! right-aligned, optional ANSI colour applied after alignment.

use std::io::{self, Write};

/// How a column's cells are aligned.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Align {
    /// Padded on the right (the last column is not padded).
    Left,
    /// Padded on the left.
    Right,
}

/// A cell's optional emphasis; only drawn when colour is on.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Tone {
    /// No emphasis.
    Plain,
    /// Drawn green.
    Good,
    /// Drawn bold red.
    Bad,
}

/// A text table: a header row and rows of cells.
pub struct Table {
    headers: Vec<(String, Align)>,
    rows: Vec<Vec<(String, Tone)>>,
}

impl Table {
    /// A table with these column headers and alignments, and no rows.
    pub fn new(headers: &[(&str, Align)]) -> Self {
        Self {
            headers: headers.iter().map(|(h, a)| (h.to_string(), *a)).collect(),
            rows: Vec::new(),
        }
    }

    /// Adds a row of cells; cells beyond the headers are not drawn.
    pub fn row(&mut self, cells: Vec<(String, Tone)>) {
        self.rows.push(cells);
    }

    /// Writes the table, with the tones painted when `color` is on.
    pub fn write(&self, w: &mut dyn Write, color: bool) -> io::Result<()> {
        let n = self.headers.len();
        let mut width: Vec<usize> = self.headers.iter().map(|(h, _)| h.chars().count()).collect();
        for r in &self.rows {
            for (i, (c, _)) in r.iter().enumerate().take(n) {
                width[i] = width[i].max(c.chars().count());
            }
        }
        let line = |w: &mut dyn Write, cells: &[(String, Tone)]| -> io::Result<()> {
            let mut out = String::new();
            for (i, (text, tone)) in cells.iter().enumerate().take(n) {
                let pad = width[i] - text.chars().count();
                let padded = match self.headers[i].1 {
                    Align::Left if i + 1 == n => text.clone(),
                    Align::Left => format!("{text}{}", " ".repeat(pad)),
                    Align::Right => format!("{}{text}", " ".repeat(pad)),
                };
                let painted = match (color, tone) {
                    (true, Tone::Good) => format!("\x1b[32m{padded}\x1b[0m"),
                    (true, Tone::Bad) => format!("\x1b[1;31m{padded}\x1b[0m"),
                    _ => padded,
                };
                if i > 0 {
                    out.push_str("  ");
                }
                out.push_str(&painted);
            }
            writeln!(w, "{}", out.trim_end())
        };
        let head: Vec<(String, Tone)> = self.headers.iter().map(|(h, _)| (h.clone(), Tone::Plain)).collect();
        line(w, &head)?;
        for r in &self.rows {
            line(w, r)?;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn aligns_columns() {
        let mut t = Table::new(&[("name", Align::Left), ("ΔE", Align::Right)]);
        t.row(vec![("a".into(), Tone::Plain), ("10.00".into(), Tone::Bad)]);
        t.row(vec![("longer".into(), Tone::Plain), ("1.00".into(), Tone::Good)]);
        let mut out = Vec::new();
        t.write(&mut out, false).unwrap();
        assert_eq!(
            String::from_utf8(out).unwrap(),
            "name       ΔE\na       10.00\nlonger   1.00\n"
        );
    }
}
