//! Map styles in the open OGC standards as palettes: Styled Layer
//! Descriptor 1.0 (OGC 02-070, its XML schema's element names
//! StyledLayerDescriptor, NamedLayer, UserStyle, FeatureTypeStyle, Rule,
//! Name, Title, PolygonSymbolizer, LineSymbolizer, TextSymbolizer, Halo,
//! Fill, Stroke, CssParameter, RasterSymbolizer, ColorMap, ColorMapEntry) and
//! Symbology Encoding 1.1 (OGC 05-077r4: SvgParameter, Description/Title,
//! Interpolate, InterpolationPoint, Data, Value, Categorize, Threshold).

mod common;
use common::*;

use inkfit::color::css::{parse_color, ColorInput};
use inkfit::swatch::order::Scheme;
use inkfit::swatch::{Entry, Format, Palette};

fn sld(body: &str) -> String {
    format!(
        "<?xml version='1.0' encoding='UTF-8'?>\n\
         <StyledLayerDescriptor version='1.0.0' xmlns='http://www.opengis.net/sld' \
         xmlns:ogc='http://www.opengis.net/ogc'><NamedLayer><Name>landuse</Name><UserStyle>\
         <FeatureTypeStyle>{body}</FeatureTypeStyle></UserStyle></NamedLayer></StyledLayerDescriptor>"
    )
}

fn read(text: &str) -> Palette {
    Palette::parse("t.sld", text, Format::Sld).unwrap()
}

fn hex(e: &Entry) -> String {
    match e.color {
        ColorInput::ScreenRgb(v) => {
            let b = v.map(|x| (x * 255.0).round() as u8);
            format!("#{:02x}{:02x}{:02x}", b[0], b[1], b[2])
        }
        ref c => panic!("not screen RGB: {c:?}"),
    }
}

#[test]
fn sld_rules_give_their_fills_and_strokes_named_by_title() {
    let p = read(&sld(
        "<Rule><Name>wood</Name><Title>Woodland</Title><PolygonSymbolizer>\
           <Fill><CssParameter name='fill'>#2f6b3a</CssParameter></Fill>\
           <Stroke><CssParameter name='stroke'>#1d4a27</CssParameter><CssParameter name='stroke-width'>0.5</CssParameter></Stroke>\
         </PolygonSymbolizer></Rule>\
         <Rule><Name>pasture</Name><PolygonSymbolizer><Fill>\
           <CssParameter name='fill'><ogc:Literal>#98C46A</ogc:Literal></CssParameter>\
           <CssParameter name='fill-opacity'>0.7</CssParameter></Fill></PolygonSymbolizer></Rule>\
         <Rule><LineSymbolizer><Stroke><CssParameter name='stroke'>rgb(192, 57, 43)</CssParameter></Stroke></LineSymbolizer></Rule>",
    ));
    let got: Vec<(String, String)> = p.entries.iter().map(|e| (e.name.clone(), hex(e))).collect();
    assert_eq!(
        got,
        vec![
            ("Woodland".into(), "#2f6b3a".into()),
            ("Woodland stroke".into(), "#1d4a27".into()),
            ("pasture".into(), "#98c46a".into()),
            ("rule 3 stroke".into(), "#c0392b".into()),
        ]
    );
    assert_eq!(p.entries[2].usage.as_ref().unwrap().opacity, 0.7);
    assert_eq!(p.scheme_hint, None);
}

#[test]
fn se_1_1_with_prefixes_and_svg_parameters() {
    let text = "<se:FeatureTypeStyle xmlns:se='http://www.opengis.net/se' version='1.1.0'>\
        <se:Rule><se:Name>water</se:Name><se:Description><se:Title>Open water</se:Title></se:Description>\
        <se:PolygonSymbolizer><se:Fill><se:SvgParameter name='fill'>steelblue</se:SvgParameter></se:Fill></se:PolygonSymbolizer>\
        <se:TextSymbolizer><se:Halo><se:Fill><se:SvgParameter name='fill'>#ffffff</se:SvgParameter></se:Fill></se:Halo>\
        <se:Fill><se:SvgParameter name='fill'>#1a3a5a</se:SvgParameter></se:Fill></se:TextSymbolizer></se:Rule>\
        </se:FeatureTypeStyle>";
    let p = Palette::parse("t.se", text, Format::Sld).unwrap();
    let got: Vec<(&str, String)> = p.entries.iter().map(|e| (e.name.as_str(), hex(e))).collect();
    assert_eq!(
        got,
        vec![
            ("Open water", "#4682b4".into()),
            ("Open water halo", "#ffffff".into()),
            ("Open water label", "#1a3a5a".into())
        ]
    );
}

#[test]
fn two_classes_with_one_colour_stay_two_entries() {
    let p = read(&sld(
        "<Rule><Title>Fen</Title><PolygonSymbolizer><Fill><CssParameter name='fill'>#2ec4d6</CssParameter></Fill></PolygonSymbolizer></Rule>\
         <Rule><Title>Reedbed</Title><PolygonSymbolizer><Fill><CssParameter name='fill'>#2EC4D6</CssParameter></Fill></PolygonSymbolizer></Rule>",
    ));
    assert_eq!(p.entries.len(), 2);
    assert_eq!(p.entries[0].color, p.entries[1].color);
}

#[test]
fn a_raster_colour_map_is_read_in_quantity_order_as_a_sequential_scheme() {
    let p = read(&sld("<Rule><RasterSymbolizer><ColorMap>\
           <ColorMapEntry color='#08306b' quantity='2000' label='2000 mm'/>\
           <ColorMapEntry color='#f7fbff' quantity='500' label='500 mm'/>\
           <ColorMapEntry color='#6baed6' quantity='1000'/>\
           <ColorMapEntry color='#000000' quantity='-9999' label='no data' opacity='0'/>\
         </ColorMap></RasterSymbolizer></Rule>"));
    let got: Vec<(&str, String)> = p.entries.iter().map(|e| (e.name.as_str(), hex(e))).collect();
    assert_eq!(
        got,
        vec![
            ("500 mm", "#f7fbff".into()),
            ("1000", "#6baed6".into()),
            ("2000 mm", "#08306b".into())
        ]
    );
    assert_eq!(p.scheme_hint, Some(Scheme::Sequential));
}

#[test]
fn se_interpolate_and_categorize_colour_maps() {
    let interp = "<se:RasterSymbolizer xmlns:se='http://www.opengis.net/se'><se:ColorMap><se:Interpolate fallbackValue='#000000'>\
        <se:LookupValue>Rasterdata</se:LookupValue>\
        <se:InterpolationPoint><se:Data>300</se:Data><se:Value>#2171b5</se:Value></se:InterpolationPoint>\
        <se:InterpolationPoint><se:Data>0</se:Data><se:Value>#eff3ff</se:Value></se:InterpolationPoint>\
        </se:Interpolate></se:ColorMap></se:RasterSymbolizer>";
    let p = Palette::parse("i.se", interp, Format::Sld).unwrap();
    let got: Vec<(&str, String)> = p.entries.iter().map(|e| (e.name.as_str(), hex(e))).collect();
    assert_eq!(got, vec![("0", "#eff3ff".into()), ("300", "#2171b5".into())]);
    let cat = "<se:RasterSymbolizer xmlns:se='http://www.opengis.net/se'><se:ColorMap><se:Categorize fallbackValue='#000000'>\
        <se:LookupValue>Rasterdata</se:LookupValue><se:Value>#ffffcc</se:Value>\
        <se:Threshold>10</se:Threshold><se:Value>#a1dab4</se:Value>\
        <se:Threshold>50</se:Threshold><se:Value>#41b6c4</se:Value>\
        </se:Categorize></se:ColorMap></se:RasterSymbolizer>";
    let p = Palette::parse("c.se", cat, Format::Sld).unwrap();
    let names: Vec<&str> = p.entries.iter().map(|e| e.name.as_str()).collect();
    assert_eq!(names, vec!["lowest", "from 10", "from 50"]);
    assert_eq!(p.entries[1].color, parse_color("#a1dab4").unwrap());
}

#[test]
fn check_takes_a_colour_map_as_sequential_unless_told() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("rainfall.sld");
    std::fs::write(
        &path,
        sld("<Rule><RasterSymbolizer><ColorMap>\
               <ColorMapEntry color='#f7fbff' quantity='500'/><ColorMapEntry color='#6baed6' quantity='1000'/>\
               <ColorMapEntry color='#08306b' quantity='2000'/></ColorMap></RasterSymbolizer></Rule>"),
    )
    .unwrap();
    let p = path.to_str().unwrap();
    let v = json(&run(&["check", p, "--json"]));
    assert_eq!(v["scheme"], "sequential", "{v}");
    assert!(v["order"].is_object(), "the lightness order is checked: {v}");
    let v = json(&run(&["check", p, "--json", "--scheme", "qualitative"]));
    assert_eq!(v["scheme"], "qualitative");
}

#[test]
fn bad_styles_are_refused_with_the_file_and_line() {
    let dir = tempfile::tempdir().unwrap();
    let cases: [(&str, String, &[&str]); 3] = [
        (
            "computed.sld",
            sld("<Rule><PolygonSymbolizer><Fill>\n<CssParameter name='fill'><ogc:Function name='Recode'/></CssParameter></Fill></PolygonSymbolizer></Rule>"),
            &["computed.sld", "line 3", "computed (Function)"],
        ),
        (
            "badcolour.sld",
            sld("<Rule><PolygonSymbolizer><Fill>\n\n<CssParameter name='fill'>#12345</CssParameter></Fill></PolygonSymbolizer></Rule>"),
            &["badcolour.sld", "line 4", "#12345"],
        ),
        ("broken.sld", "<StyledLayerDescriptor>\n<Rule>\n".to_string(), &["broken.sld", "not a style file"]),
    ];
    for (name, text, needles) in cases {
        let path = dir.path().join(name);
        std::fs::write(&path, text).unwrap();
        assert_error(&run(&["check", path.to_str().unwrap()]), needles);
    }
    let empty = dir.path().join("empty.sld");
    std::fs::write(&empty, sld("<Rule><Name>x</Name></Rule>")).unwrap();
    assert_error(&run(&["check", empty.to_str().unwrap()]), &["empty.sld", "no colours"]);
}

// OGC Symbology Encoding 1.1 (05-077r4), 11.6: Recode (11.6.4: LookupValue,
// MapItem with Data and Value, fallbackValue), Categorize (11.6.2:
// Value, then Threshold and Value pairs) and Interpolate (11.6.3:
// InterpolationPoint with Data and Value) give a paint from the data;
// their outputs here are literal colours, one entry each.
#[test]
fn se_functions_with_literal_colours_give_one_entry_per_colour() {
    let text = "<se:FeatureTypeStyle xmlns:se='http://www.opengis.net/se' xmlns:ogc='http://www.opengis.net/ogc' version='1.1.0'>\
        <se:Rule><se:Name>Land use</se:Name><se:PolygonSymbolizer><se:Fill><se:SvgParameter name='fill'>\
          <se:Recode fallbackValue='#cccccc'><se:LookupValue><ogc:PropertyName>landuse</ogc:PropertyName></se:LookupValue>\
            <se:MapItem><se:Data>forest</se:Data><se:Value>#2f6b3a</se:Value></se:MapItem>\
            <se:MapItem><se:Data>pasture</se:Data><se:Value>#98c46a</se:Value></se:MapItem>\
          </se:Recode></se:SvgParameter></se:Fill>\
          <se:Stroke><se:SvgParameter name='stroke'>\
          <se:Categorize fallbackValue='#000000'><se:LookupValue><ogc:PropertyName>rank</ogc:PropertyName></se:LookupValue>\
            <se:Value>#dddddd</se:Value><se:Threshold>10</se:Threshold><se:Value>#555555</se:Value>\
          </se:Categorize></se:SvgParameter></se:Stroke></se:PolygonSymbolizer></se:Rule>\
        <se:Rule><se:Name>Relief</se:Name><se:PolygonSymbolizer><se:Fill><se:SvgParameter name='fill'>\
          <se:Interpolate><se:LookupValue><ogc:PropertyName>height</ogc:PropertyName></se:LookupValue>\
            <se:InterpolationPoint><se:Data>0</se:Data><se:Value>#f2e27a</se:Value></se:InterpolationPoint>\
            <se:InterpolationPoint><se:Data>500</se:Data><se:Value>#a68a78</se:Value></se:InterpolationPoint>\
          </se:Interpolate></se:SvgParameter></se:Fill></se:PolygonSymbolizer></se:Rule>\
        </se:FeatureTypeStyle>";
    let p = Palette::parse("t.se", text, Format::Sld).unwrap();
    let got: Vec<(&str, String)> = p.entries.iter().map(|e| (e.name.as_str(), hex(e))).collect();
    assert_eq!(
        got,
        vec![
            ("Land use: forest", "#2f6b3a".to_string()),
            ("Land use: pasture", "#98c46a".to_string()),
            ("Land use: other", "#cccccc".to_string()),
            ("Land use: lowest stroke", "#dddddd".to_string()),
            ("Land use: from 10 stroke", "#555555".to_string()),
            ("Land use: other stroke", "#000000".to_string()),
            ("Relief: 0", "#f2e27a".to_string()),
            ("Relief: 500", "#a68a78".to_string()),
        ]
    );
    // A map item whose colour is itself computed is still refused, with its line.
    let computed = text.replace(
        "<se:Value>#98c46a</se:Value>",
        "<se:Value><ogc:PropertyName>c</ogc:PropertyName></se:Value>",
    );
    let err = Palette::parse("t.se", &computed, Format::Sld).unwrap_err().to_string();
    assert!(err.contains("t.se") && err.contains("computed"), "{err}");
}
