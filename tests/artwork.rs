//! The colours of SVG artwork: paint resolution by the SVG and CSS rules
//! (each test names the rule it checks), and bad artwork refused cleanly.

mod common;
use common::*;

use inkfit::color::css::{parse_color, ColorInput};
use inkfit::swatch::{Entry, Format, Palette};

fn svg(body: &str) -> String {
    format!("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"10\" height=\"10\">{body}</svg>")
}

fn entries(body: &str) -> Vec<Entry> {
    Palette::parse("t.svg", &svg(body), Format::Svg).unwrap().entries
}

fn rgb(e: &Entry) -> [u8; 3] {
    match e.color {
        ColorInput::ScreenRgb(v) => v.map(|x| (x * 255.0).round() as u8),
        ref c => panic!("not screen RGB: {c:?}"),
    }
}

fn hex(h: &str) -> [u8; 3] {
    let Ok(ColorInput::ScreenRgb(v)) = parse_color(h) else {
        panic!("{h}")
    };
    v.map(|x| (x * 255.0).round() as u8)
}

#[test]
fn style_rules_beat_presentation_attributes() {
    // SVG 2, 6.7: presentation attributes count as author rules of
    // specificity 0 placed before all other author rules, so any matching
    // style sheet rule wins over them.
    let e = entries("<style>rect { fill: #00ff00 }</style><rect width='5' height='5' fill='#ff0000'/>");
    assert_eq!(e.len(), 1);
    assert_eq!(rgb(&e[0]), [0, 255, 0]);
}

#[test]
fn specificity_then_order_decide_between_rules() {
    // CSS 2.1, 6.4.3: an id selector (0,1,0,0) beats a class (0,0,1,0),
    // which beats a type (0,0,0,1), whatever their order; among equal
    // specificity the later rule wins (6.4.1, step 4).
    let e = entries(
        "<style>#a { fill: #0000ff } .c { fill: #00ff00 } path { fill: #ff0000 } \
         .d { fill: #111111 } .d { fill: #222222 }</style>\
         <path id='a' class='c' d='M0 0h1v1z'/><path class='c' d='M0 0h1v1z'/><path d='M0 0h1v1z'/>\
         <path class='d' d='M0 0h1v1z'/>",
    );
    let got: Vec<[u8; 3]> = e.iter().map(rgb).collect();
    assert_eq!(got, vec![[0, 0, 255], [0, 255, 0], [255, 0, 0], [0x22, 0x22, 0x22]]);
}

#[test]
fn the_style_attribute_beats_rules_and_important_beats_it() {
    // CSS 2.1, 6.4.1 and 6.4.2: declarations in the style attribute come
    // after the style sheet's; an !important author declaration beats a
    // normal one wherever it is.
    let e = entries(
        "<style>.x { fill: #ff0000 } .y { fill: #00ff00 !important }</style>\
         <rect class='x' style='fill: #0000ff' width='1' height='1'/>\
         <rect class='y' style='fill: #0000ff' width='1' height='1'/>",
    );
    assert_eq!(e.iter().map(rgb).collect::<Vec<_>>(), vec![[0, 0, 255], [0, 255, 0]]);
}

#[test]
fn descendant_and_child_selectors_match_through_groups() {
    // Selectors Level 3, 8.1 and 8.2: "g.roads path" matches a path at any
    // depth under the group; "g > circle" only a direct child.
    let e = entries(
        "<style>g.roads path { stroke: #c83c28; fill: none } g > circle { fill: #00aa00 }</style>\
         <g class='roads'><g><path d='M0 0L5 5'/></g></g>\
         <g><circle r='1'/><a><circle r='1' fill='#0000aa'/></a></g>",
    );
    assert_eq!(
        e.iter().map(rgb).collect::<Vec<_>>(),
        vec![hex("#c83c28"), [0, 0xaa, 0], [0, 0, 0xaa]]
    );
    // The road colour is named by the group that classes it.
    assert_eq!(e[0].name, "roads");
}

#[test]
fn fill_inherits_and_stop_color_does_not() {
    // SVG 1.1 property index: fill is inherited, stop-color is not (its
    // initial value, black, applies to a stop that sets none); `inherit`
    // takes the parent's value even for a property that does not inherit.
    let e = entries(
        "<g fill='#336699'><rect width='1' height='1'/></g>\
         <linearGradient id='g' stop-color='#ff0000'><stop offset='0'/><stop offset='1' stop-color='inherit'/></linearGradient>",
    );
    assert_eq!(
        e.iter().map(rgb).collect::<Vec<_>>(),
        vec![hex("#336699"), [0, 0, 0], [255, 0, 0]]
    );
}

#[test]
fn current_color_takes_the_inherited_color_property() {
    // CSS Color 4, 6.4: currentColor is the value of the color property,
    // which inherits (SVG 1.1 property index).
    let e = entries("<g color='darkgreen'><circle r='1' fill='currentColor' stroke='currentcolor'/></g>");
    assert_eq!(e.len(), 1);
    assert_eq!(rgb(&e[0]), hex("#006400"));
    let u = e[0].usage.as_ref().unwrap();
    assert_eq!(
        (u.uses, u.properties.clone()),
        (2, vec!["fill".to_string(), "stroke".to_string()])
    );
}

#[test]
fn initial_fill_is_black_and_initial_stroke_none() {
    // SVG 1.1, 11.2 and 11.4: fill's initial value is black, stroke's none;
    // a line has no interior, so only its stroke paints.
    let e = entries("<rect width='1' height='1'/><line x2='5' stroke='#0000ff'/>");
    assert_eq!(e.iter().map(rgb).collect::<Vec<_>>(), vec![[0, 0, 0], [0, 0, 255]]);
}

#[test]
fn what_does_not_paint_is_not_read() {
    // none, a paint server (its stops count where defined), clip paths and
    // masks (SVG 1.1, 14.3.5: their paint is not rendered), display: none.
    let e = entries(
        "<radialGradient id='r'><stop stop-color='#abcdef'/></radialGradient>\
         <rect width='1' height='1' fill='url(#r)' stroke='none'/>\
         <clipPath id='c'><rect width='1' height='1' fill='#ff0000'/></clipPath>\
         <mask id='m'><rect width='1' height='1' fill='#ffffff'/></mask>\
         <g style='display: none'><rect width='1' height='1' fill='#00ff00'/></g>\
         <rect width='1' height='1' display='none' fill='#0000ff'/>",
    );
    assert_eq!(e.iter().map(rgb).collect::<Vec<_>>(), vec![hex("#abcdef")]);
}

#[test]
fn filter_paints_are_read() {
    let e = entries(
        "<filter id='f'><feFlood flood-color='#102030'/><feDropShadow flood-color='gold'/>\
         <feDiffuseLighting lighting-color='#fefefe'/></filter>",
    );
    assert_eq!(
        e.iter().map(rgb).collect::<Vec<_>>(),
        vec![hex("#102030"), hex("#ffd700"), hex("#fefefe")]
    );
}

#[test]
fn opacity_is_multiplied_down_the_tree_and_noted() {
    // SVG 1.1, 14.5: a group's opacity applies to everything in it, on top
    // of fill-opacity; an alpha in the colour itself counts too. The lowest
    // opacity of a colour's uses is kept.
    let e = entries(
        "<g opacity='0.5'><rect width='1' height='1' fill='#ff0000' fill-opacity='0.5'/></g>\
         <rect width='1' height='1' fill='#ff0000'/>\
         <rect width='1' height='1' fill='rgb(0 0 255 / 40%)'/>\
         <rect width='1' height='1' fill='#00ff00' opacity='0'/>",
    );
    assert_eq!(e.len(), 2, "a fully transparent paint is not a colour of the print");
    let red = e[0].usage.as_ref().unwrap();
    assert_eq!((red.uses, red.opacity), (2, 0.25));
    assert_eq!(e[1].usage.as_ref().unwrap().opacity, 0.4);
}

#[test]
fn distinct_colours_are_one_entry_each_named_by_their_first_user() {
    let e = entries(
        "<path id='woodland' d='M0 0h1v1z' fill='#2f6b3a'/><path class='forest x' d='M0 0h1v1z' fill='#2F6B3A'/>\
         <path id='woodland-edge' d='M0 0h1v1z' fill='none' stroke='rgb(47, 107, 58)'/>\
         <path id='lake' d='M0 0h1v1z' fill='steelblue' stroke='#1a4a7a'/>",
    );
    let names: Vec<&str> = e.iter().map(|x| x.name.as_str()).collect();
    assert_eq!(names, vec!["woodland", "lake", "lake stroke"]);
    assert_eq!(e[0].usage.as_ref().unwrap().uses, 3);
    // The line is the first use's.
    assert_eq!(e[0].line, 1);
}

#[test]
fn a_colour_is_named_by_the_class_whose_rule_paints_it() {
    // "parcel woodland" painted by the .woodland rule is woodland; its
    // stroke, painted by .parcel, is parcel.
    let e = entries(
        "<style>.parcel { stroke: #ffffff } .woodland { fill: #2f6b3a } .pasture { fill: #98c46a }</style>\
         <path class='parcel woodland' d='M0 0h1v1z'/><path class='parcel pasture' d='M0 0h1v1z'/>",
    );
    let names: Vec<&str> = e.iter().map(|x| x.name.as_str()).collect();
    assert_eq!(names, vec!["woodland", "parcel", "pasture"]);
}

#[test]
fn bad_artwork_is_refused_with_the_file_and_line() {
    let dir = tempfile::tempdir().unwrap();
    let cases: [(&str, String, &[&str]); 4] = [
        (
            "broken.svg",
            "<svg xmlns='http://www.w3.org/2000/svg'>\n<rect>\n</svg>".to_string(),
            &["broken.svg", "line 3"],
        ),
        (
            "html.svg",
            "<html><body/></html>".to_string(),
            &["html.svg", "<html>", "not <svg>"],
        ),
        (
            "entities.svg",
            "<!DOCTYPE svg [<!ENTITY a \"aaaaaaaaaa\"><!ENTITY b \"&a;&a;&a;&a;&a;&a;\">]>\n<svg>&b;</svg>".to_string(),
            &["entities.svg", "line 1"],
        ),
        (
            "paint.svg",
            "<svg xmlns='http://www.w3.org/2000/svg'>\n\n<rect fill='#12345'/></svg>".to_string(),
            &["paint.svg", "line 3", "#12345"],
        ),
    ];
    for (name, text, needles) in cases {
        let path = dir.path().join(name);
        std::fs::write(&path, text).unwrap();
        assert_error(&run(&["check", path.to_str().unwrap()]), needles);
    }
    // Hostile shapes: nesting deep enough to exhaust a recursive walk, and
    // enough rules and elements to match for hours. Both are refused from
    // their size, quickly.
    let deep = format!(
        "<svg xmlns='http://www.w3.org/2000/svg'>{}<rect fill='red'/>{}</svg>",
        "<g>".repeat(100_000),
        "</g>".repeat(100_000)
    );
    let path = dir.path().join("deep.svg");
    std::fs::write(&path, deep).unwrap();
    assert_error(
        &run(&["check", path.to_str().unwrap()]),
        &["deep.svg", "nested deeper than 512"],
    );
    let rules: String = (0..5_000).map(|i| format!(".c{i}{{fill:#{:06x}}}", i * 37)).collect();
    let many = format!(
        "<svg xmlns='http://www.w3.org/2000/svg'><style>{rules}</style>{}</svg>",
        "<rect fill='red'/>".repeat(20_000)
    );
    let path = dir.path().join("many.svg");
    std::fs::write(&path, many).unwrap();
    assert_error(
        &run(&["check", path.to_str().unwrap()]),
        &["many.svg", "5000 style rules", "20002 elements"],
    );
    // A style sheet beyond 256 KiB, and a style attribute beyond 16 KiB.
    let big = format!(
        "<svg xmlns='http://www.w3.org/2000/svg'><style>{}</style></svg>",
        "x{}".repeat(100_000)
    );
    let path = dir.path().join("big-style.svg");
    std::fs::write(&path, big).unwrap();
    assert_error(&run(&["check", path.to_str().unwrap()]), &["big-style.svg", "256 KiB"]);
    let long = format!(
        "<svg xmlns='http://www.w3.org/2000/svg'>\n<rect style='{}'/></svg>",
        "fill:red;".repeat(3_000)
    );
    let path = dir.path().join("long-style.svg");
    std::fs::write(&path, long).unwrap();
    assert_error(
        &run(&["check", path.to_str().unwrap()]),
        &["long-style.svg", "line 2", "16 KiB"],
    );
    // repair does not rewrite artwork, and says so before any work.
    let ok = dir.path().join("ok.svg");
    std::fs::write(&ok, svg("<rect fill='#2f6b3a'/>")).unwrap();
    let out = dir.path().join("out.svg");
    assert_error(
        &run(&["repair", ok.to_str().unwrap(), "--out", out.to_str().unwrap()]),
        &["ok.svg", "not rewritten"],
    );
    assert!(!out.exists());
}

#[test]
fn check_reads_artwork_end_to_end() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("sheet.svg");
    std::fs::write(
        &path,
        svg(
            "<style>.woodland { fill: #2f6b3a }</style><path class='woodland' d='M0 0h1v1z'/>\
             <path class='woodland' d='M2 0h1v1z'/><g opacity='0.6'><path id='marsh' d='M0 0h1v1z' fill='#78a05a'/></g>",
        ),
    )
    .unwrap();
    let o = run(&["check", path.to_str().unwrap(), "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    assert_eq!(v["entries"][0]["name"], "woodland");
    assert_eq!(v["entries"][1]["usage"]["opacity"], 0.6);
    let text = stdout(&run(&["check", path.to_str().unwrap()]));
    assert!(text.contains("artwork  2 distinct colours from 3 paints"), "{text}");
    assert!(text.contains("marsh (opacity 0.60)"), "{text}");
}

#[test]
fn rendered_artwork_gives_touching_colours_and_shares() {
    // 200 × 100 user units rendered at 1,024 × 512 (scale 5.12): A covers
    // x 0–50 and B x 50–100, meeting along x = 50, which falls on the pixel
    // edge 256, so their border is the full 512 rows; C at x 150–200 touches
    // neither (transparent between). A hairline of D (0.1 units, half a
    // pixel) is seen only blended: no class, its neighbours unknown.
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("sheet.svg");
    std::fs::write(
        &f,
        "<svg xmlns='http://www.w3.org/2000/svg' width='200' height='100'>\
         <rect x='0' y='0' width='50' height='100' fill='#c83232'/>\
         <rect x='50' y='0' width='50' height='100' fill='#28a03c'/>\
         <rect x='150' y='0' width='50' height='100' fill='#283cc8'/>\
         <line x1='0' y1='20' x2='200' y2='20' stroke='#e6d23c' stroke-width='0.1'/></svg>",
    )
    .unwrap();
    let o = run(&["check", f.to_str().unwrap(), "--render", "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    let idx = |hex: &str| {
        1 + v["entries"]
            .as_array()
            .unwrap()
            .iter()
            .position(|e| e["input"] == hex)
            .unwrap() as u64
    };
    let (a, b, c, d) = (idx("#c83232"), idx("#28a03c"), idx("#283cc8"), idx("#e6d23c"));
    let pair = |x: u64, y: u64| {
        v["separation"]["pairs"]
            .as_array()
            .unwrap()
            .iter()
            .find(|p| (p["a"] == x.min(y)) && (p["b"] == x.max(y)))
            .unwrap()
            .clone()
    };
    assert_eq!(v["separation"]["adjacency"], "render");
    assert_eq!(pair(a, b)["touching"], true);
    assert_eq!(pair(a, b)["border_px"], 512);
    assert_eq!(pair(a, c)["touching"], false);
    assert_eq!(pair(b, c)["touching"], false);
    assert!(pair(a, d).get("touching").is_none(), "{}", pair(a, d));
    // Each rectangle paints a third of what is painted (the transparent
    // gap is no map), less a share of the hairline's half-transparent
    // pixels over the gap: at most 2 rows of 256 pixels.
    for x in [a, b, c] {
        let share = v["entries"][x as usize - 1]["share"].as_f64().unwrap();
        assert!((share - 1.0 / 3.0).abs() < 0.002, "{share}");
    }
    assert!(v["entries"][d as usize - 1].get("share").is_none());
    // --render is for SVG only.
    assert_error(
        &run(&["check", &demo("landuse.csv"), "--render"]),
        &["--render renders SVG artwork"],
    );
}

fn uses_of(es: &[Entry], h: &str) -> Option<usize> {
    es.iter()
        .find(|e| rgb(e) == hex(h))
        .map(|e| e.usage.as_ref().unwrap().uses)
}

// SVG 2, 5.6 (the use element): the referenced element is drawn once per
// use, in a tree that inherits from the use element; SVG 2, 5.5 and 5.3:
// symbol and the content of defs are not drawn where they stand.
#[test]
fn use_draws_its_target_once_per_use_and_inherits_from_the_use() {
    let es = entries(
        r##"<defs><path id="mark" d="M0 0h1" fill="#aa0000"/><circle id="dot" r="1"/>
           <rect id="unused" width="1" height="1" fill="#00aa00"/></defs>
           <symbol id="sym"><rect width="1" height="1" fill="#0000aa"/></symbol>
           <use href="#mark"/><use href="#mark"/><use href="#mark"/>
           <use href="#dot" fill="#aaaa00"/>
           <use href="#sym"/><use href="#sym"/>"##,
    );
    assert_eq!(uses_of(&es, "#aa0000"), Some(3), "three uses of one path");
    // The circle has no fill of its own: it inherits the use element's.
    assert_eq!(uses_of(&es, "#aaaa00"), Some(1));
    assert_eq!(uses_of(&es, "#0000aa"), Some(2), "a symbol drawn by two uses");
    // Never referenced: not drawn, not read.
    assert_eq!(uses_of(&es, "#00aa00"), None);
    // And no black from the unreferenced or undrawn shapes' initial fill.
    assert_eq!(uses_of(&es, "#000000"), None, "{es:?}");
}

#[test]
fn gradients_in_defs_are_still_read_and_xlink_href_is_followed() {
    let es = entries(
        r##"<defs><linearGradient id="g"><stop offset="0" stop-color="#123456"/></linearGradient>
           <g id="pair"><rect width="1" height="1" fill="#654321"/></g></defs>
           <rect width="1" height="1" fill="url(#g)"/>
           <use xmlns:xlink="http://www.w3.org/1999/xlink" xlink:href="#pair"/>"##,
    );
    assert_eq!(uses_of(&es, "#123456"), Some(1));
    assert_eq!(uses_of(&es, "#654321"), Some(1));
}

// SVG 2, 5.6: a use that references itself or an ancestor, or a cycle of
// uses, is an error in the document; inkfit draws nothing for it and ends.
#[test]
fn circular_uses_draw_nothing_and_end() {
    let es = entries(
        r##"<g id="a"><rect width="1" height="1" fill="#101010"/><use href="#a"/></g>
           <defs><g id="b"><use href="#c"/></g><g id="c"><use href="#b"/>
           <rect width="1" height="1" fill="#202020"/></g></defs>
           <use href="#b"/>"##,
    );
    assert_eq!(uses_of(&es, "#101010"), Some(1));
    assert_eq!(uses_of(&es, "#202020"), Some(1));
}

/// `levels` groups, each of ten uses of the one below, over one rect:
/// 10^levels drawings.
fn nested_uses(levels: usize) -> String {
    let mut body = String::from(r##"<defs><rect id="l0" width="1" height="1" fill="#303030"/>"##);
    for k in 1..=levels {
        body.push_str(&format!("<g id=\"l{k}\">"));
        for _ in 0..10 {
            body.push_str(&format!("<use href=\"#l{}\"/>", k - 1));
        }
        body.push_str("</g>");
    }
    body.push_str(&format!("</defs><use href=\"#l{levels}\"/>"));
    body
}

// A file made to multiply: ten uses of ten uses of … of one rect asks for
// 10⁹ drawings in a few hundred bytes; it is refused, naming the limit.
#[test]
fn nested_uses_that_multiply_are_refused() {
    let err = Palette::parse("bomb.svg", &svg(&nested_uses(9)), Format::Svg)
        .unwrap_err()
        .to_string();
    assert!(err.contains("bomb.svg") && err.contains("<use>"), "{err}");
    // Three levels (1,000 drawings) are fine and counted.
    assert_eq!(uses_of(&entries(&nested_uses(3)), "#303030"), Some(1000));
}
