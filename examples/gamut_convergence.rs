//! Convergence of the gamut volume with sampling density: RGB by face-grid
//! steps (divergence theorem), CMYK by 3-face steps and voxel size.
//! Run: `cargo run --release --example gamut_convergence`.

use inkfit::gamut::{Gamut, GamutOptions};
use inkfit::icc::IccProfile;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    for name in ["srgb", "display-p3"] {
        let p = IccProfile::load(name)?;
        let fine = Gamut::of_profile(
            &p,
            GamutOptions {
                rgb_steps: 512,
                ..GamutOptions::default()
            },
        )?
        .volume;
        println!("{name}: RGB face steps → volume (relative to 512 steps: {fine:.0})");
        for n in [8, 16, 32, 64, 128, 256] {
            let v = Gamut::of_profile(
                &p,
                GamutOptions {
                    rgb_steps: n,
                    ..GamutOptions::default()
                },
            )?
            .volume;
            println!("  {n:>4}  {v:>10.0}  {:+.4} %", 100.0 * (v / fine - 1.0));
        }
    }
    let p = IccProfile::load("offset-coated")?;
    println!("offset-coated: 3-face steps × voxel → volume");
    for voxel in [2.0, 1.0, 0.5] {
        for steps in [12, 24, 36] {
            let g = Gamut::of_profile(
                &p,
                GamutOptions {
                    cmyk_steps: steps,
                    voxel,
                    ..GamutOptions::default()
                },
            )?;
            println!("  voxel {voxel:.1}  steps {steps:>3}  {:>10.0}", g.volume);
        }
    }
    Ok(())
}
