//! Writes a synthetic 8-bit RGB PNG for trying and timing `inkfit proof`:
//! `cargo run --release --example proof_sample -- OUT.png WIDTH HEIGHT`.
//! Left half: smooth colour ramps (a photo-like range of colours); right
//! half: flat areas of a few dozen colours (a map-like image).

use std::process::ExitCode;

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().collect();
    let (Some(out), Some(w), Some(h)) = (
        args.get(1),
        args.get(2).and_then(|s| s.parse::<u32>().ok()),
        args.get(3).and_then(|s| s.parse::<u32>().ok()),
    ) else {
        eprintln!("usage: proof_sample OUT.png WIDTH HEIGHT");
        return ExitCode::from(2);
    };
    let mut px = vec![0u8; w as usize * h as usize * 3];
    for y in 0..h {
        for x in 0..w {
            let i = (y as usize * w as usize + x as usize) * 3;
            let v = if x < w / 2 {
                let fx = x as f64 / (w / 2).max(1) as f64;
                let fy = y as f64 / h.max(1) as f64;
                [
                    (255.0 * fx) as u8,
                    (255.0 * fy) as u8,
                    (255.0 * (1.0 - fx * fy)) as u8 ^ ((x * 7 + y * 13) % 8) as u8,
                ]
            } else {
                let cell = (x / 97 + (y / 89) * 7) % 40;
                [
                    (cell * 37 % 256) as u8,
                    (cell * 91 % 256) as u8,
                    (cell * 53 % 256) as u8,
                ]
            };
            px[i..i + 3].copy_from_slice(&v);
        }
    }
    match image::save_buffer(out, &px, w, h, image::ExtendedColorType::Rgb8) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("proof_sample: error: '{out}': {e}");
            ExitCode::from(2)
        }
    }
}
