//! How each rendering intent of a press profile prints saturated screen
//! colours: 36 hues of sRGB at full and at reduced saturation
//! (hsl(h 100% 50%) and hsl(h 60% 50%)), and for the colours outside the
//! press gamut the hue shift (OKLab and CIELAB), the share of CIELAB chroma
//! kept and the CIEDE2000 shift. The figures in the README and the notes on
//! the built-in press come from here.
//!
//! `cargo run --release --example intent_survey [PRESS]` (default: the
//! built-in `offset-coated`).

use inkfit::color::spaces::lab_d50_to_oklab;
use inkfit::color::LabD50;
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, RenderingIntent};
use inkfit::swatch::check::{check_against, CheckOptions};
use inkfit::swatch::{Format, Palette};

fn hue(a: f64, b: f64) -> f64 {
    b.atan2(a).to_degrees().rem_euclid(360.0)
}

fn hue_diff(x: f64, y: f64) -> f64 {
    let d = (x - y).rem_euclid(360.0);
    d.min(360.0 - d)
}

fn percentile(v: &mut [f64], p: f64) -> f64 {
    v.sort_by(f64::total_cmp);
    if v.is_empty() {
        return f64::NAN;
    }
    v[((p * (v.len() - 1) as f64).round() as usize).min(v.len() - 1)]
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let press_name = std::env::args().nth(1).unwrap_or_else(|| "offset-coated".to_string());
    let screen = IccProfile::load("srgb")?.require_screen()?;
    let press = IccProfile::load(&press_name)?.require_press()?;
    let gamut = inkfit::gamut::Gamut::of_profile(&press, Default::default())?;
    let mut text = String::new();
    for sat in [100, 60] {
        for h in (0..360).step_by(10) {
            text.push_str(&format!("hsl({h} {sat}% 50%) h{h}s{sat}\n"));
        }
    }
    let palette = Palette::parse("hue circle", &text, Format::Text)?;
    println!("press {press_name}; sRGB hsl(h 100% 50%) and hsl(h 60% 50%), 36 hues each; out-of-gamut colours only");
    println!(
        "{:<22} {:>5} {:>13} {:>13} {:>17} {:>17}",
        "intent", "n", "OKLab dh p90/max", "CIELAB dh p90/max", "chroma kept min/med", "ΔE00 mean/p95/max"
    );
    for intent in [
        RenderingIntent::Relative,
        RenderingIntent::Perceptual,
        RenderingIntent::Saturation,
    ] {
        let opts = CheckOptions {
            mapping: PressMapping {
                intent,
                bpc: false,
                paper_white: false,
            },
            tolerance: 3.0,
            ink_limit: gamut.ink_limit,
        };
        let r = check_against(&palette, &screen, &press, opts, Some(&gamut))?;
        let (mut dh_ok, mut dh_ab, mut kept, mut de) = (Vec::new(), Vec::new(), Vec::new(), Vec::new());
        for e in r.entries.iter().filter(|e| !e.in_gamut) {
            let s = LabD50::from_array(e.screen_lab);
            let p = LabD50::from_array(e.printed_lab);
            let (so, po) = (lab_d50_to_oklab(s), lab_d50_to_oklab(p));
            dh_ok.push(hue_diff(hue(so[1], so[2]), hue(po[1], po[2])));
            dh_ab.push(hue_diff(hue(s.a, s.b), hue(p.a, p.b)));
            kept.push(p.a.hypot(p.b) / s.a.hypot(s.b));
            de.push(e.delta_e00);
        }
        let n = de.len();
        let mean = de.iter().sum::<f64>() / n.max(1) as f64;
        println!(
            "{:<22} {:>5} {:>6.1}/{:>5.1} {:>6.1}/{:>5.1} {:>9.2}/{:>5.2} {:>6.2}/{:>5.2}/{:>5.2}",
            intent.to_string(),
            n,
            percentile(&mut dh_ok, 0.9),
            percentile(&mut dh_ok, 1.0),
            percentile(&mut dh_ab, 0.9),
            percentile(&mut dh_ab, 1.0),
            percentile(&mut kept, 0.0),
            percentile(&mut kept, 0.5),
            mean,
            percentile(&mut de, 0.95),
            percentile(&mut de, 1.0)
        );
    }
    Ok(())
}
