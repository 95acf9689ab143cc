//! The colours of a map style in the open OGC standards: Styled Layer
//! Descriptor 1.0 (`CssParameter`) and Symbology Encoding 1.1
//! (`SvgParameter`), with or without namespace prefixes.
//!
//! - Every `Rule` gives one entry per paint of its symbolizers: `fill` of a
//!   `Fill`, `stroke` of a `Stroke`, named by the rule's `Title` (else its
//!   `Name`, else its number), with "stroke", "label" (a `TextSymbolizer`'s
//!   fill), "halo" or "marker" (a `PointSymbolizer`'s mark) added. Rules are
//!   not merged by colour: two classes with the same colour are two entries,
//!   and the separation check then says they cannot be told apart.
//! - A raster `ColorMap` gives one entry per `ColorMapEntry` (SLD 1.0:
//!   `color`, `quantity`, `label`, `opacity`) or per SE 1.1 `Interpolate`
//!   point (`Data`, `Value`) or `Categorize` value, named by its label (else
//!   its quantity), in quantity order. A style that is only a colour map is
//!   a sequential scheme unless `--scheme` says otherwise. An entry of
//!   opacity 0 (the usual "no data") prints nothing and is left out.
//! - A parameter's value is its text, an `ogc:Literal` included. A `fill`
//!   or `stroke` given by an SE 1.1 function of the data whose outputs are
//!   literal colours (11.6: `Recode`, `Categorize`, `Interpolate`) gives
//!   one entry per colour it can paint, named by the rule and the data
//!   value (`Land use: forest`; `Categorize`: "lowest", "from 10"; the
//!   `fallbackValue`: "other"). Any other value computed from the data
//!   (`ogc:Function`, `ogc:PropertyName`) cannot be checked and is an error
//!   naming its line.

use roxmltree::Node;

use super::order::Scheme;
use super::{line_at, Entry, PaletteError, Usage};
use crate::color::css::parse_color_with_alpha;

fn child<'a, 'i>(n: Node<'a, 'i>, name: &str) -> Option<Node<'a, 'i>> {
    n.children().find(|c| c.is_element() && c.tag_name().name() == name)
}

/// SE 1.1 functions (11.6) whose outputs are literal values.
const SE_FUNCTIONS: [&str; 3] = ["Recode", "Categorize", "Interpolate"];

/// The SE 1.1 function that gives a parameter's value, if one does.
fn se_function<'a, 'i>(p: Node<'a, 'i>) -> Option<Node<'a, 'i>> {
    p.children()
        .find(|c| c.is_element() && SE_FUNCTIONS.contains(&c.tag_name().name()))
}

/// A Categorize value's name: "lowest" below every threshold, else
/// "from THRESHOLD".
fn category_name(below: Option<&str>) -> String {
    below.map_or("lowest".to_string(), |t| format!("from {t}"))
}

fn text_of(n: Node<'_, '_>) -> String {
    n.descendants()
        .filter(Node::is_text)
        .filter_map(|d| d.text())
        .collect::<String>()
        .trim()
        .to_string()
}

struct Reader<'t> {
    file: &'t str,
    text: &'t str,
    entries: Vec<Entry>,
}

impl Reader<'_> {
    fn err(&self, n: Node<'_, '_>, message: String) -> PaletteError {
        PaletteError::Syntax {
            file: self.file.to_string(),
            line: line_at(self.text.as_bytes(), n.range().start),
            message,
        }
    }

    /// One colour entry from colour text at node `n`; none for a colour
    /// painted fully transparent (a colour map's "no data" entry), which
    /// prints nothing.
    fn push(
        &mut self,
        n: Node<'_, '_>,
        name: String,
        value: &str,
        opacity: f64,
        property: &str,
    ) -> Result<(), PaletteError> {
        let line = line_at(self.text.as_bytes(), n.range().start);
        let (color, alpha) = parse_color_with_alpha(value).map_err(|source| PaletteError::Color {
            file: self.file.to_string(),
            line,
            source,
        })?;
        let opacity = (opacity * alpha).clamp(0.0, 1.0);
        if opacity.is_nan() || opacity == 0.0 {
            return Ok(());
        }
        self.entries.push(Entry {
            name,
            input: value.to_string(),
            color,
            line,
            usage: Some(Usage {
                uses: 1,
                properties: vec![property.to_string()],
                opacity: crate::precision::round(opacity, 3).max(0.001),
            }),
            share: None,
        });
        Ok(())
    }

    /// The literal value of a `CssParameter` / `SvgParameter`.
    fn literal(&self, p: Node<'_, '_>) -> Result<String, PaletteError> {
        if let Some(e) = p
            .descendants()
            .skip(1)
            .find(|d| d.is_element() && d.tag_name().name() != "Literal")
        {
            return Err(self.err(
                p,
                format!(
                    "the {} of this parameter is computed ({}); inkfit checks literal colours only",
                    p.attribute("name").unwrap_or("value"),
                    e.tag_name().name()
                ),
            ));
        }
        Ok(text_of(p))
    }

    /// The parameters of a `Fill` or `Stroke`, by name.
    fn params<'a, 'i>(&self, n: Node<'a, 'i>) -> Result<Vec<(String, String, Node<'a, 'i>)>, PaletteError> {
        let mut v = Vec::new();
        for p in n
            .children()
            .filter(|c| c.is_element() && matches!(c.tag_name().name(), "CssParameter" | "SvgParameter"))
        {
            if let Some(name) = p.attribute("name") {
                // A function's colours are read where the paint is.
                let value = match se_function(p) {
                    Some(_) => String::new(),
                    None => self.literal(p)?,
                };
                v.push((name.to_string(), value, p));
            }
        }
        Ok(v)
    }

    fn rule(&mut self, rule: Node<'_, '_>, index: usize) -> Result<(), PaletteError> {
        let title = child(rule, "Title")
            .or_else(|| child(rule, "Description").and_then(|d| child(d, "Title")))
            .map(text_of)
            .filter(|t| !t.is_empty());
        let base = title
            .or_else(|| child(rule, "Name").map(text_of).filter(|t| !t.is_empty()))
            .unwrap_or_else(|| format!("rule {index}"));
        for paint in rule
            .descendants()
            .filter(|d| d.is_element() && matches!(d.tag_name().name(), "Fill" | "Stroke"))
        {
            let is_fill = paint.tag_name().name() == "Fill";
            let (colour_name, opacity_name) = if is_fill {
                ("fill", "fill-opacity")
            } else {
                ("stroke", "stroke-opacity")
            };
            let params = self.params(paint)?;
            let Some((_, value, at)) = params.iter().find(|p| p.0 == colour_name) else {
                continue;
            };
            let opacity = params
                .iter()
                .find(|p| p.0 == opacity_name)
                .and_then(|p| p.1.parse::<f64>().ok())
                .filter(|v| v.is_finite())
                .unwrap_or(1.0);
            let inside = |name: &str| paint.ancestors().any(|a| a.tag_name().name() == name);
            let role = if inside("Halo") {
                " halo"
            } else if inside("TextSymbolizer") {
                " label"
            } else if inside("Mark") || inside("PointSymbolizer") {
                if is_fill {
                    " marker"
                } else {
                    " marker stroke"
                }
            } else if is_fill {
                ""
            } else {
                " stroke"
            };
            match se_function(*at) {
                Some(f) => {
                    for (data, colour, node) in self.function_values(f)? {
                        self.push(node, format!("{base}: {data}{role}"), &colour, opacity, colour_name)?;
                    }
                }
                None => self.push(*at, format!("{base}{role}"), value, opacity, colour_name)?,
            }
        }
        Ok(())
    }

    /// Every colour an SE 1.1 function can give (11.6.2 Categorize, 11.6.3
    /// Interpolate, 11.6.4 Recode), with the data value it stands for, in
    /// document order; the `fallbackValue` last as "other".
    fn function_values<'a, 'i>(&self, f: Node<'a, 'i>) -> Result<Vec<(String, String, Node<'a, 'i>)>, PaletteError> {
        let mut out = Vec::new();
        match f.tag_name().name() {
            "Recode" => {
                for item in f
                    .children()
                    .filter(|c| c.is_element() && c.tag_name().name() == "MapItem")
                {
                    let data = child(item, "Data").map(text_of).unwrap_or_default();
                    let Some(value) = child(item, "Value") else {
                        return Err(self.err(item, "a MapItem without a Value".into()));
                    };
                    out.push((data, self.literal(value)?, value));
                }
            }
            "Categorize" => {
                for (below, colour, node) in self.categorize(f)? {
                    out.push((category_name(below.as_deref()), colour, node));
                }
            }
            _ => out.extend(self.interpolation_points(f)?),
        }
        if let Some(fallback) = f.attribute("fallbackValue").filter(|v| !v.trim().is_empty()) {
            out.push(("other".to_string(), fallback.trim().to_string(), f));
        }
        if out.is_empty() {
            return Err(self.err(f, format!("a {} without any colour", f.tag_name().name())));
        }
        Ok(out)
    }

    /// SE 1.1, 11.6.2: a Categorize's values with the threshold each lies
    /// above (`None` for the first, below every threshold).
    fn categorize<'a, 'i>(&self, f: Node<'a, 'i>) -> Result<Vec<(Option<String>, String, Node<'a, 'i>)>, PaletteError> {
        let mut out = Vec::new();
        let mut below: Option<String> = None;
        for c in f.children().filter(Node::is_element) {
            match c.tag_name().name() {
                "Threshold" => below = Some(text_of(c)),
                "Value" => out.push((below.clone(), self.literal(c)?, c)),
                _ => {}
            }
        }
        Ok(out)
    }

    /// SE 1.1, 11.6.3: an Interpolate's points as (data, colour, value node).
    fn interpolation_points<'a, 'i>(
        &self,
        f: Node<'a, 'i>,
    ) -> Result<Vec<(String, String, Node<'a, 'i>)>, PaletteError> {
        let mut out = Vec::new();
        for point in f
            .children()
            .filter(|c| c.is_element() && c.tag_name().name() == "InterpolationPoint")
        {
            let data = child(point, "Data").map(text_of).unwrap_or_default();
            let Some(value) = child(point, "Value") else {
                return Err(self.err(point, "an InterpolationPoint without a Value".into()));
            };
            out.push((data, self.literal(value)?, value));
        }
        Ok(out)
    }

    /// The entries of a colour map, in quantity order.
    fn color_map(&mut self, map: Node<'_, '_>) -> Result<(), PaletteError> {
        // (quantity, name, colour, opacity, node)
        let mut points: Vec<(f64, String, String, f64, Node<'_, '_>)> = Vec::new();
        let number = |s: &str| s.trim().parse::<f64>().ok().filter(|v| v.is_finite());
        for e in map.descendants().filter(Node::is_element) {
            match e.tag_name().name() {
                "ColorMapEntry" => {
                    let Some(color) = e.attribute("color") else {
                        return Err(self.err(e, "a ColorMapEntry without a color".into()));
                    };
                    let q = e.attribute("quantity").and_then(number).unwrap_or(f64::NAN);
                    let name = e
                        .attribute("label")
                        .or_else(|| e.attribute("quantity"))
                        .unwrap_or(color)
                        .to_string();
                    let opacity = e.attribute("opacity").and_then(number).unwrap_or(1.0);
                    points.push((q, name, color.to_string(), opacity, e));
                }
                "Interpolate" => {
                    for (data, colour, value) in self.interpolation_points(e)? {
                        points.push((number(&data).unwrap_or(f64::NAN), data, colour, 1.0, value));
                    }
                }
                "Categorize" => {
                    // Each value is named by the threshold below it.
                    for (below, colour, c) in self.categorize(e)? {
                        let q = below.as_deref().and_then(number).unwrap_or(f64::NEG_INFINITY);
                        points.push((q, category_name(below.as_deref()), colour, 1.0, c));
                    }
                }
                _ => {}
            }
        }
        // Quantity order, stable; entries without a quantity keep their place at the end.
        points.sort_by(|a, b| match (a.0.is_nan(), b.0.is_nan()) {
            (false, false) => a.0.total_cmp(&b.0),
            (a_nan, b_nan) => a_nan.cmp(&b_nan),
        });
        for (_, name, colour, opacity, at) in points {
            self.push(at, name, &colour, opacity, "color-map")?;
        }
        Ok(())
    }
}

/// The colours of an SLD 1.0 or SE 1.1 document, and the scheme its shape
/// suggests (sequential for a style that is only a colour map).
pub fn parse_sld(file: &str, text: &str) -> Result<(Vec<Entry>, Option<Scheme>), PaletteError> {
    let doc = super::xml::document(file, text, "a style file")?;
    let mut r = Reader {
        file,
        text,
        entries: Vec::new(),
    };
    let rules: Vec<Node<'_, '_>> = doc
        .descendants()
        .filter(|n| n.is_element() && n.tag_name().name() == "Rule")
        .collect();
    let mut only_maps = true;
    for (i, rule) in rules.iter().enumerate() {
        let before = r.entries.len();
        r.rule(*rule, i + 1)?;
        only_maps &= r.entries.len() == before;
    }
    let maps: Vec<Node<'_, '_>> = doc
        .descendants()
        .filter(|n| n.is_element() && n.tag_name().name() == "ColorMap")
        .collect();
    for m in &maps {
        r.color_map(*m)?;
    }
    let hint = (only_maps && !maps.is_empty()).then_some(Scheme::Sequential);
    Ok((r.entries, hint))
}
