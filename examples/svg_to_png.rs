//! Renders an SVG file to PNG with resvg, for looking at figures and demo
//! artwork: `cargo run --example svg_to_png -- IN.svg OUT.png [SCALE]`.
//! Text is not drawn (resvg is built without its text feature here).

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if args.len() < 3 {
        eprintln!("usage: svg_to_png IN.svg OUT.png [SCALE]");
        std::process::exit(2);
    }
    let scale: f32 = args.get(3).and_then(|s| s.parse().ok()).unwrap_or(2.0);
    let text = std::fs::read_to_string(&args[1]).expect("readable SVG");
    let opts = resvg::usvg::Options::default();
    let tree = resvg::usvg::Tree::from_str(&text, &opts).expect("valid SVG");
    let size = tree.size().to_int_size().scale_by(scale).expect("non-empty size");
    let mut pix = resvg::tiny_skia::Pixmap::new(size.width(), size.height()).expect("pixmap");
    resvg::render(
        &tree,
        resvg::tiny_skia::Transform::from_scale(scale, scale),
        &mut pix.as_mut(),
    );
    pix.save_png(&args[2]).expect("PNG written");
}
