//! The colours of SVG artwork: every paint a map or chart export uses,
//! resolved as SVG and CSS resolve them, one palette entry per distinct
//! colour.
//!
//! - Properties read: `fill` and `stroke` of shapes and text, `stop-color`
//!   of gradient stops, `flood-color` of `feFlood` and `feDropShadow`,
//!   `lighting-color` of the lighting filters (SVG 1.1, 11.2, 13.2.3, 15.7,
//!   15.14; SVG 2, 13), with `color` for `currentColor` and the opacities
//!   (`opacity`, `fill-opacity`, `stroke-opacity`, `stop-opacity`,
//!   `flood-opacity`).
//! - The cascade (CSS 2.1, 6.4.1 and 6.4.3; SVG 2, 6.7): presentation
//!   attributes lowest, then `<style>` rules by specificity and then by
//!   order, then the `style` attribute, then `!important` rules. Selectors
//!   are matched by `simplecss` (type, class, id, attribute, descendant and
//!   child selectors, `:first-child`).
//! - Inheritance (SVG 1.1 property index): `fill`, `stroke`, `color` and
//!   the fill and stroke opacities inherit; `stop-color`, `flood-color`,
//!   `lighting-color` and `opacity` do not. `inherit` takes the parent's
//!   value. Initial values: `fill` black, `stroke` none, `color` black,
//!   `stop-color` and `flood-color` black, `lighting-color` white.
//! - Not painted, so not read: `none`, paint servers (`url(#…)`: their
//!   stops are read where they are defined), elements under `clipPath` or
//!   `mask`, anything with `display: none`, and what is only defined:
//!   `symbol` and the content of `defs` (SVG 2, 5.3 and 5.5) other than
//!   gradients, patterns, filters and markers.
//! - `use` (SVG 2, 5.6) draws what it references once more, inheriting
//!   from the `use` element: its paints count once per `use`; a reference
//!   to itself or to an element that contains it draws nothing.
//! - Each distinct colour is named by its first user: its `id`, else its
//!   first class, else the element name with the property; it carries how
//!   many paints use it and the lowest opacity it is painted with (group
//!   opacities multiplied in).

use std::collections::HashMap;

use simplecss::{AttributeOperator, PseudoClass, StyleSheet};

use super::{line_at, Entry, PaletteError, Usage};
use crate::color::css::{parse_color_with_alpha, ColorInput};

/// Most text of `<style>` elements read, together: a map export's style
/// sheet is a few to a few tens of KB. The CSS parser's time grows with the
/// square of a style sheet's size where it meets errors, so this bounds it.
pub const MAX_STYLE_BYTES: usize = 256 << 10;

/// Longest `style` attribute read (the same reason as [`MAX_STYLE_BYTES`]).
pub const MAX_STYLE_ATTRIBUTE_BYTES: usize = 16 << 10;

/// Most selector matches tried: style rules times elements. Each element is
/// matched against every rule, so a hostile file with many rules and many
/// elements would otherwise take hours; a map export with 200 rules and
/// 100,000 elements needs 20 million.
pub const MAX_SVG_MATCHES: usize = 50_000_000;

/// Most elements drawn, `use` instances included: nested `use` elements
/// multiply (ten uses of a group of ten uses of …), so a small file could
/// otherwise ask for billions.
pub const MAX_SVG_DRAWN: usize = 2_000_000;

/// What `defs` may hold that is read where it stands: paint servers and the
/// resources shapes refer to by `url(#…)` (their colours are the ones used).
/// Deepest chain of `use` elements drawing one another: real artwork nests
/// a few (a symbol of symbols); each level recurses.
pub const MAX_USE_DEPTH: usize = 32;

const DEFS_READ: [&str; 6] = [
    "linearGradient",
    "radialGradient",
    "pattern",
    "filter",
    "marker",
    "style",
];

/// The properties the cascade resolves, by index.
const PROPS: [&str; 11] = [
    "fill",
    "stroke",
    "stop-color",
    "flood-color",
    "lighting-color",
    "color",
    "opacity",
    "fill-opacity",
    "stroke-opacity",
    "stop-opacity",
    "flood-opacity",
];
const FILL: usize = 0;
const STROKE: usize = 1;
const STOP: usize = 2;
const FLOOD: usize = 3;
const LIGHTING: usize = 4;
const COLOR: usize = 5;
const OPACITY: usize = 6;
const FILL_OPACITY: usize = 7;
const STROKE_OPACITY: usize = 8;
const STOP_OPACITY: usize = 9;
const FLOOD_OPACITY: usize = 10;
const INHERITED: [bool; 11] = [true, true, false, false, false, true, false, true, true, false, false];
const INITIAL: [&str; 11] = [
    "black", "none", "black", "black", "white", "black", "1", "1", "1", "1", "1",
];

/// Shapes and text that take `fill` and `stroke` (SVG 2, 9 and 11).
const SHAPES: [&str; 8] = [
    "path", "rect", "circle", "ellipse", "polygon", "polyline", "line", "text",
];

/// A roxmltree element as simplecss matches it.
#[derive(Clone, Copy)]
struct El<'a, 'i>(roxmltree::Node<'a, 'i>);

impl simplecss::Element for El<'_, '_> {
    fn parent_element(&self) -> Option<Self> {
        self.0.parent_element().map(El)
    }
    fn prev_sibling_element(&self) -> Option<Self> {
        self.0.prev_sibling_element().map(El)
    }
    fn has_local_name(&self, name: &str) -> bool {
        self.0.tag_name().name() == name
    }
    fn attribute_matches(&self, local_name: &str, operator: AttributeOperator<'_>) -> bool {
        self.0.attribute(local_name).is_some_and(|v| operator.matches(v))
    }
    fn pseudo_class_matches(&self, class: PseudoClass<'_>) -> bool {
        matches!(class, PseudoClass::FirstChild) && self.0.prev_sibling_element().is_none()
    }
}

/// A declared value and where it ranks in the cascade.
#[derive(Clone, Copy)]
struct Declared<'s> {
    value: &'s str,
    /// (origin, specificity, order): origin 0 presentation attribute,
    /// 1 style sheet, 2 style attribute, 3 important style sheet,
    /// 4 important style attribute.
    rank: (u8, [u8; 3], usize),
    /// The style sheet rule it comes from, if any.
    rule: Option<usize>,
}

fn declare<'s>(slot: &mut [Option<Declared<'s>>; 11], name: &str, d: Declared<'s>) {
    if let Some(i) = PROPS.iter().position(|p| *p == name) {
        if slot[i].is_none_or(|old| old.rank <= d.rank) {
            slot[i] = Some(d);
        }
    }
}

/// One paint of an element: the property, the element's computed values,
/// its opacity, its line and the rule that set the value.
struct Paint<'c> {
    prop: usize,
    computed: &'c [String; 11],
    opacity: f64,
    line: usize,
    rule: Option<usize>,
}

/// One distinct colour and its users, in order of first use.
struct Found {
    text: String,
    color: ColorInput,
    name: String,
    line: usize,
    uses: usize,
    properties: Vec<&'static str>,
    opacity: f64,
}

struct Walker<'s> {
    file: &'s str,
    doc_text: &'s str,
    sheet: StyleSheet<'s>,
    found: Vec<Found>,
    index: HashMap<String, usize>,
    /// Elements by `id`, for `use`.
    ids: HashMap<&'s str, roxmltree::Node<'s, 's>>,
    /// The `use` targets being drawn, innermost last.
    using: Vec<roxmltree::NodeId>,
    /// Elements drawn so far, `use` instances included.
    drawn: usize,
    /// Most elements to draw: [`MAX_SVG_DRAWN`], and no more than the
    /// matching budget allows for the style sheet's rules.
    most_drawn: usize,
}

impl<'s> Walker<'s> {
    /// Walks `node` and what it contains. `instance`: reached through a
    /// `use`, which draws a `symbol` as a group.
    fn walk(
        &mut self,
        node: roxmltree::Node<'s, 's>,
        parent: &[String; 11],
        group_opacity: f64,
        instance: bool,
    ) -> Result<(), PaletteError> {
        let tag = node.tag_name().name();
        if matches!(
            tag,
            "clipPath" | "mask" | "style" | "script" | "title" | "desc" | "metadata"
        ) || (tag == "symbol" && !instance)
        {
            return Ok(());
        }
        self.drawn += 1;
        if self.drawn > self.most_drawn {
            return Err(PaletteError::Format {
                file: self.file.to_string(),
                message: format!(
                    "it draws more than {} elements, <use> instances included; inkfit reads up to that many",
                    self.most_drawn
                ),
            });
        }
        let mut slot: [Option<Declared<'s>>; 11] = [None; 11];
        for a in node.attributes() {
            declare(
                &mut slot,
                a.name(),
                Declared {
                    value: a.value(),
                    rank: (0, [0; 3], 0),
                    rule: None,
                },
            );
        }
        for (order, rule) in self.sheet.rules.iter().enumerate() {
            if rule.selector.matches(&El(node)) {
                for d in &rule.declarations {
                    let origin = if d.important { 3 } else { 1 };
                    declare(
                        &mut slot,
                        d.name,
                        Declared {
                            value: d.value,
                            rank: (origin, rule.selector.specificity(), order),
                            rule: Some(order),
                        },
                    );
                }
            }
        }
        let mut display_none = node.attribute("display").is_some_and(|v| v.trim() == "none");
        if let Some(style) = node.attribute("style") {
            if style.len() > MAX_STYLE_ATTRIBUTE_BYTES {
                return Err(PaletteError::Syntax {
                    file: self.file.to_string(),
                    line: line_at(self.doc_text.as_bytes(), node.range().start),
                    message: format!(
                        "a style attribute of {} bytes; inkfit reads style attributes up to {} KiB",
                        style.len(),
                        MAX_STYLE_ATTRIBUTE_BYTES >> 10
                    ),
                });
            }
            for d in simplecss::DeclarationTokenizer::from(style) {
                if d.name == "display" {
                    display_none = d.value.trim() == "none";
                }
                let origin = if d.important { 4 } else { 2 };
                declare(
                    &mut slot,
                    d.name,
                    Declared {
                        value: d.value,
                        rank: (origin, [0; 3], 0),
                        rule: None,
                    },
                );
            }
        }
        if display_none {
            return Ok(());
        }
        // The rule each of the element's own paint values comes from, for
        // naming the colour by the class that gave it.
        let sources: [Option<usize>; 11] = slot.map(|d| d.and_then(|d| d.rule));
        let mut computed: [String; 11] = Default::default();
        for i in 0..PROPS.len() {
            computed[i] = match slot[i].map(|d| d.value.trim()) {
                Some(v) if v.eq_ignore_ascii_case("inherit") => parent[i].clone(),
                Some(v) => v.to_string(),
                None if INHERITED[i] => parent[i].clone(),
                None => INITIAL[i].to_string(),
            };
        }
        let own_opacity = number(&computed[OPACITY]).unwrap_or(1.0);
        let opacity = group_opacity * own_opacity;
        let line = line_at(self.doc_text.as_bytes(), node.range().start);
        let shape = SHAPES.contains(&tag);
        let of = |prop: usize, opacity: f64| Paint {
            prop,
            computed: &computed,
            opacity,
            line,
            rule: sources[prop],
        };
        let with = |o: usize| number(&computed[o]).unwrap_or(1.0);
        if shape && tag != "line" {
            self.paint(node, of(FILL, opacity * with(FILL_OPACITY)))?;
        }
        if shape {
            self.paint(node, of(STROKE, opacity * with(STROKE_OPACITY)))?;
        }
        match tag {
            "stop" => self.paint(node, of(STOP, with(STOP_OPACITY)))?,
            "feFlood" | "feDropShadow" => self.paint(node, of(FLOOD, with(FLOOD_OPACITY)))?,
            "feDiffuseLighting" | "feSpecularLighting" => self.paint(node, of(LIGHTING, 1.0))?,
            _ => {}
        }
        if tag == "use" {
            return self.draw_use(node, &computed, opacity);
        }
        for child in node.children().filter(roxmltree::Node::is_element) {
            if tag == "defs" && !DEFS_READ.contains(&child.tag_name().name()) {
                continue;
            }
            self.walk(child, &computed, opacity, false)?;
        }
        Ok(())
    }

    /// Draws the element a `use` references, inheriting from the `use`.
    fn draw_use(
        &mut self,
        node: roxmltree::Node<'s, 's>,
        computed: &[String; 11],
        opacity: f64,
    ) -> Result<(), PaletteError> {
        const XLINK: &str = "http://www.w3.org/1999/xlink";
        let href = node.attribute("href").or_else(|| node.attribute((XLINK, "href")));
        let Some(target) = href
            .and_then(|h| h.trim().strip_prefix('#'))
            .and_then(|id| self.ids.get(id).copied())
        else {
            return Ok(());
        };
        // A reference to itself, to an element containing it, or round a
        // chain of uses draws nothing (SVG 2, 5.6: circular references are
        // an error).
        if node.ancestors().any(|a| a == target) || self.using.contains(&target.id()) {
            return Ok(());
        }
        if self.using.len() >= MAX_USE_DEPTH {
            return Err(PaletteError::Syntax {
                file: self.file.to_string(),
                line: line_at(self.doc_text.as_bytes(), node.range().start),
                message: format!("<use> elements nested more than {MAX_USE_DEPTH} deep"),
            });
        }
        self.using.push(target.id());
        let r = self.walk(target, computed, opacity, true);
        self.using.pop();
        r
    }

    /// Records the paint of property `prop` of `node`, if it paints.
    fn paint(&mut self, node: roxmltree::Node<'_, '_>, paint: Paint<'_>) -> Result<(), PaletteError> {
        let Paint {
            prop,
            computed,
            opacity,
            line,
            rule,
        } = paint;
        let mut value = computed[prop].as_str();
        if value.eq_ignore_ascii_case("currentcolor") {
            value = computed[COLOR].as_str();
        }
        if value.eq_ignore_ascii_case("none") || value.is_empty() {
            return Ok(());
        }
        if value.starts_with("url(") {
            // A paint server; a fallback colour after it is used only when
            // the server is missing, so the server's own stops count.
            return Ok(());
        }
        let (color, alpha) = parse_color_with_alpha(value).map_err(|source| PaletteError::Color {
            file: self.file.to_string(),
            line,
            source,
        })?;
        let opacity = (opacity * alpha).clamp(0.0, 1.0);
        if opacity == 0.0 {
            return Ok(());
        }
        let key = format!("{color:?}");
        let prop_name = PROPS[prop];
        match self.index.get(&key) {
            Some(&i) => {
                let f = &mut self.found[i];
                f.uses += 1;
                f.opacity = f.opacity.min(opacity);
                if !f.properties.contains(&prop_name) {
                    f.properties.push(prop_name);
                }
            }
            None => {
                let name = self.unique_name(node, prop_name, rule);
                self.index.insert(key, self.found.len());
                self.found.push(Found {
                    text: value.to_string(),
                    color,
                    name,
                    line,
                    uses: 1,
                    properties: vec![prop_name],
                    opacity,
                });
            }
        }
        Ok(())
    }
}

impl Walker<'_> {
    /// The name of a colour's first user: its own `id`; else the class of
    /// its own that the style rule giving the colour names (`parcel
    /// woodland` painted by `.woodland` is "woodland"); else its first
    /// class; else the nearest ancestor's id or first class (a gradient's
    /// stops take their gradient's); else the element name. Made unique
    /// with the property, then a count.
    fn unique_name(&self, node: roxmltree::Node<'_, '_>, prop: &str, rule: Option<usize>) -> String {
        let label = |n: roxmltree::Node<'_, '_>| {
            n.attribute("id")
                .or_else(|| n.attribute("class").and_then(|c| c.split_whitespace().next()))
                .map(str::to_string)
        };
        let by_rule = rule.and_then(|r| {
            let selector = self.sheet.rules[r].selector.to_string();
            node.attribute("class")?
                .split_whitespace()
                .find(|c| names_class(&selector, c))
                .map(str::to_string)
        });
        let base = node
            .attribute("id")
            .map(str::to_string)
            .or(by_rule)
            .or_else(|| node.ancestors().filter(roxmltree::Node::is_element).find_map(label))
            .unwrap_or_else(|| node.tag_name().name().to_string());
        let taken = |n: &str| self.found.iter().any(|f| f.name == n);
        if !taken(&base) {
            return base;
        }
        let with_prop = format!("{base} {prop}");
        if !taken(&with_prop) {
            return with_prop;
        }
        (2..)
            .map(|k| format!("{with_prop} {k}"))
            .find(|n| !taken(n))
            .unwrap_or(with_prop)
    }
}

/// Whether a selector, as simplecss writes it back (a class `.c` as
/// `[class~='c']`), names class `c`.
fn names_class(selector: &str, c: &str) -> bool {
    selector.contains(&format!("[class~='{c}']"))
}

/// A number or percentage as CSS writes opacity; `None` when it is neither.
fn number(v: &str) -> Option<f64> {
    let v = v.trim();
    let x = match v.strip_suffix('%') {
        Some(p) => p.trim().parse::<f64>().ok()? / 100.0,
        None => v.parse::<f64>().ok()?,
    };
    x.is_finite().then(|| x.clamp(0.0, 1.0))
}

/// The distinct colours of an SVG document, as palette entries in order of
/// first use.
pub fn parse_svg(file: &str, text: &str) -> Result<Vec<Entry>, PaletteError> {
    let doc = super::xml::document(file, text, "an SVG file")?;
    let root = doc.root_element();
    if root.tag_name().name() != "svg" {
        return Err(PaletteError::Format {
            file: file.to_string(),
            message: format!("the root element is <{}>, not <svg>", root.tag_name().name()),
        });
    }
    // Every <style> element's text, in document order (CDATA included).
    let styles: Vec<String> = doc
        .descendants()
        .filter(|n| n.is_element() && n.tag_name().name() == "style")
        .map(|n| n.children().filter_map(|c| c.text()).collect::<String>())
        .collect();
    let style_bytes: usize = styles.iter().map(String::len).sum();
    if style_bytes > MAX_STYLE_BYTES {
        return Err(PaletteError::Format {
            file: file.to_string(),
            message: format!(
                "{style_bytes} bytes of <style> sheets; inkfit reads up to {} KiB of them",
                MAX_STYLE_BYTES >> 10
            ),
        });
    }
    let mut sheet = StyleSheet::new();
    for s in &styles {
        sheet.parse_more(s);
    }
    let elements = doc.descendants().filter(roxmltree::Node::is_element).count();
    if sheet.rules.len().saturating_mul(elements) > MAX_SVG_MATCHES {
        return Err(PaletteError::Format {
            file: file.to_string(),
            message: format!(
                "{} style rules for {elements} elements is more matching than inkfit does (at most {MAX_SVG_MATCHES} rule-element pairs)",
                sheet.rules.len()
            ),
        });
    }
    let ids = doc
        .descendants()
        .filter_map(|n| Some((n.attribute("id")?, n)))
        .fold(HashMap::new(), |mut m, (id, n)| {
            // The first element with an id is the one a reference finds.
            m.entry(id).or_insert(n);
            m
        });
    let most_drawn = MAX_SVG_DRAWN
        .min(MAX_SVG_MATCHES / sheet.rules.len().max(1))
        .max(elements);
    let mut w = Walker {
        file,
        doc_text: text,
        sheet,
        found: Vec::new(),
        index: HashMap::new(),
        ids,
        using: Vec::new(),
        drawn: 0,
        most_drawn,
    };
    let initial: [String; 11] = INITIAL.map(str::to_string);
    w.walk(root, &initial, 1.0, false)?;
    Ok(w.found
        .into_iter()
        .map(|f| Entry {
            name: f.name,
            input: f.text,
            color: f.color,
            line: f.line,
            usage: Some(Usage {
                uses: f.uses,
                properties: f.properties.iter().map(|p| p.to_string()).collect(),
                opacity: crate::precision::round(f.opacity, 3).max(0.001),
            }),
            share: None,
        })
        .collect())
}
