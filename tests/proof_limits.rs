//! Hostile image input: files whose headers declare far more pixels than
//! they hold, decompression bombs and broken embedded profiles. Each must
//! fail from its header with exit 2, one line naming the file, and no output
//! left behind; each input is made here.

mod common;
use common::*;

use std::path::Path;

use image::codecs::jpeg::JpegEncoder;
use image::codecs::png::{CompressionType, FilterType, PngEncoder};
use image::{ExtendedColorType, ImageEncoder};
use inkfit::icc::transform::PressMapping;
use inkfit::icc::{IccProfile, Origin, RenderingIntent};
use inkfit::proof::heat::HeatScale;
use inkfit::proof::{Method, ProofEngine};
use inkfit::raster::{self, DecodeLimits, FileKind, RasterError};

fn s(p: &Path) -> String {
    p.display().to_string()
}

/// Everything in `dir`, hidden temporary files included.
/// Runs `proof IMAGE --out DIR` (plus `extra`) and checks a clean refusal
/// naming `img` and each of `needles`, with nothing written.
fn assert_refused(img: &Path, extra: &[&str], needles: &[&str]) {
    let dir = img.parent().unwrap();
    let out = dir.join("out");
    let mut args = vec!["proof".to_string(), s(img), "--out".to_string(), s(&out)];
    args.extend(extra.iter().map(|a| a.to_string()));
    let args: Vec<&str> = args.iter().map(String::as_str).collect();
    let o = run(&args);
    let name = img.file_name().unwrap().to_str().unwrap();
    let mut all = vec![name];
    all.extend_from_slice(needles);
    assert_error(&o, &all);
    assert!(listing(&out).is_empty(), "left behind: {:?}", listing(&out));
    let stray: Vec<String> = listing(dir).into_iter().filter(|p| p.contains("inkfit-tmp")).collect();
    assert!(stray.is_empty(), "temporary files left: {stray:?}");
}

#[test]
fn crc32_matches_its_check_value() {
    // The standard check value of CRC-32 over the ASCII digits "123456789".
    assert_eq!(crc32(b"123456789"), 0xcbf4_3926);
}

fn png_bytes(w: u32, h: u32, color: ExtendedColorType, px: &[u8], icc: Option<Vec<u8>>) -> Vec<u8> {
    let mut bytes = Vec::new();
    let mut enc = PngEncoder::new(&mut bytes);
    if let Some(p) = icc {
        enc.set_icc_profile(p).unwrap();
    }
    enc.write_image(px, w, h, color).unwrap();
    bytes
}

/// A real 1×1 PNG whose IHDR is patched to `w` × `h`, its CRC recomputed.
fn png_declaring(w: u32, h: u32) -> Vec<u8> {
    let mut b = png_bytes(1, 1, ExtendedColorType::Rgb8, &[10, 20, 30], None);
    // PNG spec 5.3, 11.2.2: signature (8), length (4), "IHDR", 13 data bytes, CRC.
    assert_eq!(&b[12..16], b"IHDR");
    b[16..20].copy_from_slice(&w.to_be_bytes());
    b[20..24].copy_from_slice(&h.to_be_bytes());
    let crc = crc32(&b[12..29]);
    b[29..33].copy_from_slice(&crc.to_be_bytes());
    b
}

#[test]
fn png_header_declaring_100000_squared_is_refused_from_its_header() {
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("huge.png");
    let bytes = png_declaring(100_000, 100_000);
    assert!(bytes.len() < 100, "{} bytes", bytes.len());
    std::fs::write(&img, &bytes).unwrap();
    // The patched header is valid: a decoder without limits reads it.
    let d = image::codecs::png::PngDecoder::new(std::io::Cursor::new(&bytes)).unwrap();
    assert_eq!(image::ImageDecoder::dimensions(&d), (100_000, 100_000));
    assert_refused(
        &img,
        &[],
        &[
            "100000 × 100000",
            "10000 megapixels",
            "limit of 100 megapixels",
            "--max-pixels",
        ],
    );
    // The library refuses it the same way, from probe and read.
    assert!(matches!(raster::probe(&img), Err(RasterError::TooManyPixels { .. })));
    assert!(matches!(raster::read(&img), Err(RasterError::TooManyPixels { .. })));
}

/// A little-endian baseline TIFF (TIFF 6.0, sections 2 and 8): one strip of
/// `data`, uncompressed unless `compression` says otherwise.
fn tiff_bytes(w: u32, h: u32, samples: u16, photometric: u16, compression: u16, data: &[u8]) -> Vec<u8> {
    // Entries: tag, type (3 SHORT, 4 LONG), count, value or offset.
    let n = 9u16;
    let ifd = 8u32;
    let bps_at = ifd + 2 + u32::from(n) * 12 + 4;
    let data_at = bps_at + 2 * u32::from(samples);
    let mut e: Vec<(u16, u16, u32, u32)> = vec![
        (256, 4, 1, w),
        (257, 4, 1, h),
        (258, 3, u32::from(samples), bps_at),
        (259, 3, 1, u32::from(compression)),
        (262, 3, 1, u32::from(photometric)),
        (273, 4, 1, data_at),
        (277, 3, 1, u32::from(samples)),
        (278, 4, 1, h),
        (279, 4, 1, data.len() as u32),
    ];
    e.sort_by_key(|x| x.0);
    let mut b = Vec::new();
    b.extend_from_slice(b"II*\0");
    b.extend_from_slice(&ifd.to_le_bytes());
    b.extend_from_slice(&n.to_le_bytes());
    for (tag, ty, count, value) in e {
        b.extend_from_slice(&tag.to_le_bytes());
        b.extend_from_slice(&ty.to_le_bytes());
        b.extend_from_slice(&count.to_le_bytes());
        if ty == 3 && count == 1 {
            b.extend_from_slice(&(value as u16).to_le_bytes());
            b.extend_from_slice(&[0, 0]);
        } else {
            b.extend_from_slice(&value.to_le_bytes());
        }
    }
    b.extend_from_slice(&0u32.to_le_bytes());
    for _ in 0..samples {
        b.extend_from_slice(&8u16.to_le_bytes());
    }
    b.extend_from_slice(data);
    b
}

#[test]
fn tiff_declaring_huge_dimensions_is_refused_rgb_and_cmyk() {
    let dir = tempfile::tempdir().unwrap();
    // The hand-made layout is a real TIFF: at 2 × 1 it proofs.
    let ok = dir.path().join("ok.tif");
    std::fs::write(&ok, tiff_bytes(2, 1, 3, 2, 1, &[10, 20, 30, 40, 50, 60])).unwrap();
    let o = run(&["proof", &s(&ok), "--out", &s(&dir.path().join("ok.proof.tif"))]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));

    let rgb = dir.path().join("huge.tif");
    std::fs::write(&rgb, tiff_bytes(100_000, 100_000, 3, 2, 1, &[0])).unwrap();
    assert_refused(&rgb, &[], &["100000 × 100000", "--max-pixels"]);
    // CMYK (photometric 5) goes through the tiff crate's own decoder.
    let cmyk = dir.path().join("huge-cmyk.tif");
    std::fs::write(&cmyk, tiff_bytes(70_000, 50_000, 4, 5, 1, &[0])).unwrap();
    assert_refused(&cmyk, &[], &["70000 × 50000", "3500 megapixels", "--max-pixels"]);
}

#[test]
fn tiff_field_declaring_more_values_than_the_file_holds_is_refused() {
    // TIFF 6.0 section 2: an entry's values lie at its offset, `count`
    // values of its type's size, inside the file. The tiff decoder reserves
    // room for the declared count (up to 256 MiB) as it opens the file,
    // before it finds the file too short (a find of the image fuzz target:
    // 1,485 bytes asking for 256 MiB). Here BitsPerSample (258, SHORT, the
    // third entry) declares 8,000,000 values in a file of under 200 bytes.
    let dir = tempfile::tempdir().unwrap();
    let mut b = tiff_bytes(2, 1, 3, 2, 1, &[10, 20, 30, 40, 50, 60]);
    let count_at = 8 + 2 + 2 * 12 + 4;
    assert_eq!(&b[count_at - 4..count_at - 2], &258u16.to_le_bytes());
    b[count_at..count_at + 4].copy_from_slice(&8_000_000u32.to_le_bytes());
    for (name, photometric) in [("long-field.tif", 2u8), ("long-field-cmyk.tif", 5)] {
        let mut b = b.clone();
        // PhotometricInterpretation (262) is the fifth entry; CMYK takes the
        // tiff crate's own path.
        b[8 + 2 + 4 * 12 + 8] = photometric;
        let img = dir.path().join(name);
        std::fs::write(&img, &b).unwrap();
        assert_refused(&img, &[], &["field 258", "8000000 values"]);
        assert!(matches!(raster::probe(&img), Err(RasterError::Bounds { .. })));
    }
    // An image directory with more entries than the file holds.
    let mut b = tiff_bytes(2, 1, 3, 2, 1, &[10, 20, 30, 40, 50, 60]);
    b[8..10].copy_from_slice(&5000u16.to_le_bytes());
    let img = dir.path().join("long-directory.tif");
    std::fs::write(&img, &b).unwrap();
    assert_refused(&img, &[], &["5000 entries"]);
}

/// A real JPEG of `w` × `h` with its frame header (SOF0, ITU T.81 B.2.2)
/// patched to declare `dw` × `dh`.
fn jpeg_declaring(w: u32, h: u32, dw: u16, dh: u16) -> Vec<u8> {
    let px: Vec<u8> = (0..w * h * 3).map(|i| (i * 37 % 251) as u8).collect();
    let mut b = Vec::new();
    JpegEncoder::new_with_quality(&mut b, 90)
        .write_image(&px, w, h, ExtendedColorType::Rgb8)
        .unwrap();
    let mut i = 2;
    loop {
        assert_eq!(b[i], 0xff, "marker expected at {i}");
        let code = b[i + 1];
        let len = usize::from(u16::from_be_bytes([b[i + 2], b[i + 3]]));
        if code == 0xc0 {
            b[i + 5..i + 7].copy_from_slice(&dh.to_be_bytes());
            b[i + 7..i + 9].copy_from_slice(&dw.to_be_bytes());
            return b;
        }
        i += 2 + len;
    }
}

#[test]
fn jpeg_frame_header_declaring_30000_squared_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("huge.jpg");
    let bytes = jpeg_declaring(8, 8, 30_000, 30_000);
    assert!(bytes.len() < 10_000, "{} bytes", bytes.len());
    std::fs::write(&img, bytes).unwrap();
    assert_refused(&img, &[], &["30000 × 30000", "900 megapixels", "--max-pixels"]);
}

#[test]
fn jpeg_with_far_more_bytes_than_its_pixels_need_is_refused() {
    // A 1 × 1 frame followed by 70 MB of padding: the decoder would read
    // all of it into memory.
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("padded.jpg");
    let mut bytes = jpeg_declaring(8, 8, 1, 1);
    bytes.resize(bytes.len() + (70 << 20), 0);
    std::fs::write(&img, bytes).unwrap();
    assert_refused(&img, &[], &["refused", "the whole file"]);
}

#[test]
fn grey_png_bomb_is_refused_under_the_default_limit() {
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("bomb.png");
    // 20000 × 20000 zeros: 400 MB of pixels in a few hundred KB.
    let zeros = vec![0u8; 20_000 * 20_000];
    let mut bytes = Vec::new();
    PngEncoder::new_with_quality(&mut bytes, CompressionType::Best, FilterType::NoFilter)
        .write_image(&zeros, 20_000, 20_000, ExtendedColorType::L8)
        .unwrap();
    drop(zeros);
    assert!(bytes.len() < 1_000_000, "bomb is {} bytes", bytes.len());
    std::fs::write(&img, bytes).unwrap();
    assert_refused(&img, &[], &["20000 × 20000", "400 megapixels", "--max-pixels"]);
}

#[test]
fn png_whose_profile_chunk_inflates_past_the_metadata_allowance_is_refused() {
    // An iCCP chunk of 80 MiB of zeros compresses to a few dozen KB; the
    // decoder may keep at most 64 MiB besides the pixels, and an embedded
    // profile it could not read is an error, not an image without one.
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("iccp-bomb.png");
    let bytes = png_bytes(1, 1, ExtendedColorType::Rgb8, &[1, 2, 3], Some(vec![0u8; 80 << 20]));
    assert!(bytes.len() < 1_000_000, "{} bytes", bytes.len());
    std::fs::write(&img, bytes).unwrap();
    assert_refused(&img, &[], &["refused", "iCCP", "64 MiB"]);
}

#[test]
fn jpeg_compressed_tiff_whose_strip_declares_more_than_it_holds_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    // TIFF Technical Note 2: compression 7, one JPEG stream per strip. The
    // image is 16 × 16; its one strip's JPEG says 8000 × 8000.
    let img = dir.path().join("jpeg-strip.tif");
    let jpeg = jpeg_declaring(16, 16, 8000, 8000);
    std::fs::write(&img, tiff_bytes(16, 16, 3, 6, 7, &jpeg)).unwrap();
    assert_refused(&img, &[], &["refused", "8000 × 8000", "16 × 16"]);
}

/// The built-in sRGB profile with its connection-space field (header bytes
/// 20..24, ICC.1:2010 7.2.7) zeroed.
fn srgb_with_zeroed_pcs() -> Vec<u8> {
    let mut p = IccProfile::load("srgb").unwrap().bytes;
    p[20..24].copy_from_slice(&[0; 4]);
    p
}

#[test]
fn embedded_profile_with_zeroed_connection_space_names_the_image() {
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("zero-pcs.png");
    std::fs::write(
        &img,
        png_bytes(
            2,
            1,
            ExtendedColorType::Rgb8,
            &[200, 10, 10, 10, 200, 10],
            Some(srgb_with_zeroed_pcs()),
        ),
    )
    .unwrap();
    let o = run(&["proof", &s(&img), "--out", &s(&dir.path().join("out"))]);
    assert_error(&o, &["zero-pcs.png", "embedded", "connection space"]);
    assert!(
        !stderr(&o).contains("offset-coated"),
        "blames the press: {}",
        stderr(&o)
    );
    assert!(listing(&dir.path().join("out")).is_empty());
}

#[test]
fn engine_built_from_a_broken_image_profile_blames_that_profile() {
    // Past the CLI's header check, the transform that fails must still be
    // blamed on the image's profile, not on the press it is joined to.
    let name = "zero-pcs.png (embedded profile)";
    let broken = IccProfile::from_bytes(name, Origin::Builtin, srgb_with_zeroed_pcs()).unwrap();
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    let mapping = PressMapping {
        intent: RenderingIntent::Relative,
        bpc: true,
        paper_white: false,
    };
    let e = ProofEngine::new(&broken, 3, 8, &screen, &press, mapping)
        .err()
        .expect("a profile without a connection space cannot be proofed");
    let text = e.to_string();
    assert!(text.contains(name), "{text}");
    assert!(!text.contains("offset-coated"), "{text}");
}

#[test]
fn max_pixels_moves_the_limit_both_ways() {
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("small.png");
    let px: Vec<u8> = (0..64 * 64 * 3).map(|i| (i % 256) as u8).collect();
    std::fs::write(&img, png_bytes(64, 64, ExtendedColorType::Rgb8, &px, None)).unwrap();
    // 4096 pixels: over 0.001 MP, under the default and under 0.005 MP.
    assert_refused(
        &img,
        &["--max-pixels", "0.001"],
        &[
            "64 × 64",
            "0.004096 megapixels",
            "limit of 0.001 megapixels",
            "--max-pixels",
        ],
    );
    for extra in [&[][..], &["--max-pixels", "0.005"][..]] {
        let out = dir.path().join("o.png");
        let mut args = vec!["proof", img.to_str().unwrap(), "--out", out.to_str().unwrap()];
        args.extend_from_slice(extra);
        let o = run(&args);
        assert_eq!(o.status.code(), Some(0), "{extra:?}: {}", stderr(&o));
        assert!(out.is_file());
        std::fs::remove_file(&out).unwrap();
    }
    // And the huge header passes the header check once the limit allows it
    // (it then fails on its missing pixel data, not on the limit).
    let huge = dir.path().join("wide.png");
    std::fs::write(&huge, png_declaring(20_000, 10)).unwrap();
    let limits = DecodeLimits::from_megapixels(0.1).unwrap();
    assert!(matches!(
        raster::read_within(&huge, &limits),
        Err(RasterError::TooManyPixels { .. })
    ));
    let limits = DecodeLimits::from_megapixels(1.0).unwrap();
    assert!(matches!(
        raster::read_within(&huge, &limits),
        Err(RasterError::Decode { .. })
    ));
    // A limit must be a number of megapixels above 0.
    for bad in ["0", "-5", "NaN"] {
        let o = run(&[
            "proof",
            &s(&img),
            "--out",
            &s(&dir.path().join("x")),
            &format!("--max-pixels={bad}"),
        ]);
        assert_error(&o, &["--max-pixels"]);
    }
}

#[test]
fn small_tiffs_keep_their_embedded_profiles_under_the_limits() {
    // The limits apply to tag values too; the profile is read before them.
    let dir = tempfile::tempdir().unwrap();
    let p3 = IccProfile::load("display-p3").unwrap().bytes;
    let rgb = dir.path().join("rgb.tif");
    let mut b = Vec::new();
    let mut enc = image::codecs::tiff::TiffEncoder::new(std::io::Cursor::new(&mut b));
    enc.set_icc_profile(p3.clone()).unwrap();
    enc.write_image(&[9, 8, 7], 1, 1, ExtendedColorType::Rgb8).unwrap();
    std::fs::write(&rgb, b).unwrap();
    let r = raster::read_within(&rgb, &DecodeLimits::from_megapixels(0.000001).unwrap()).unwrap();
    assert_eq!(r.info.icc.as_deref(), Some(&p3[..]));
    assert_eq!(r.color, vec![9, 8, 7]);

    let press = inkfit::icc::builtin::OFFSET_COATED_ICC;
    let cmyk = dir.path().join("cmyk.tif");
    let mut b = Vec::new();
    {
        let mut enc = tiff::encoder::TiffEncoder::new(std::io::Cursor::new(&mut b)).unwrap();
        let mut im = enc.new_image::<tiff::encoder::colortype::CMYK8>(1, 1).unwrap();
        im.encoder().write_tag(tiff::tags::Tag::IccProfile, press).unwrap();
        im.write_data(&[1, 2, 3, 4]).unwrap();
    }
    std::fs::write(&cmyk, b).unwrap();
    let r = raster::read_within(&cmyk, &DecodeLimits::from_megapixels(0.000001).unwrap()).unwrap();
    assert_eq!(r.info.icc.as_deref(), Some(press));
    assert_eq!((r.info.channels, r.color.clone()), (4, vec![1, 2, 3, 4]));
}

#[test]
fn proof_over_its_own_samples_matches_the_separate_proof() {
    // `run_owned` writes the proof over the samples (RGB), compacts it down
    // (CMYK, several waves of chunks), or allocates (grey with its own
    // profile); each must give exactly what `run` gives.
    let screen = IccProfile::load("srgb").unwrap();
    let press = IccProfile::load("offset-coated").unwrap();
    // A grey profile made by lcms2 (D65 white, gamma 2.2).
    let d65 = lcms2::CIExyY {
        x: 0.3127,
        y: 0.3290,
        Y: 1.0,
    };
    let grey_bytes = lcms2::Profile::new_gray(&d65, &lcms2::ToneCurve::new(2.2))
        .unwrap()
        .icc()
        .unwrap();
    let grey = IccProfile::from_bytes("grey", Origin::Builtin, grey_bytes).unwrap();
    let mapping = PressMapping {
        intent: RenderingIntent::Relative,
        bpc: true,
        paper_white: false,
    };
    let heat = HeatScale::new().unwrap();
    let mut x: u32 = 7;
    let mut noise = |n: usize| -> Vec<u8> {
        (0..n)
            .map(|_| {
                x = x.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
                (x >> 24) as u8
            })
            .collect()
    };
    let cases: Vec<(ProofEngine, usize, Vec<u8>)> = vec![
        (
            ProofEngine::new(&screen, 3, 8, &screen, &press, mapping).unwrap(),
            3,
            noise(100_003 * 3),
        ),
        (
            ProofEngine::new(&screen, 3, 16, &screen, &press, mapping).unwrap(),
            6,
            noise(50_001 * 6),
        ),
        (
            ProofEngine::new(&press, 4, 8, &screen, &press, mapping).unwrap(),
            4,
            noise(300_007 * 4),
        ),
        (
            ProofEngine::new(&grey, 1, 8, &screen, &press, mapping).unwrap(),
            1,
            noise(70_001),
        ),
    ];
    for (engine, px, samples) in cases {
        let r = raster::Raster {
            info: raster::RasterInfo {
                kind: FileKind::Png,
                width: (samples.len() / px) as u32,
                height: 1,
                channels: engine.channels(),
                bits: if px == 6 { 16 } else { 8 },
                has_alpha: false,
                icc: None,
            },
            color: samples.clone(),
            alpha: None,
        };
        let a = engine.run(&r, Some(&heat), Method::Table);
        let b = engine.run_owned(samples, Some(&heat), Method::Table);
        assert_eq!(a.proof, b.proof, "{px}-byte pixels: proof");
        assert_eq!(a.map, b.map, "{px}-byte pixels: map");
        assert_eq!(a.tally.summary(), b.tally.summary(), "{px}-byte pixels: statistics");
    }
}

#[test]
fn many_images_are_all_written_or_none_is() {
    let dir = tempfile::tempdir().unwrap();
    let imgs = dir.path().join("imgs");
    std::fs::create_dir(&imgs).unwrap();
    for k in 0..6u8 {
        let px: Vec<u8> = (0..32 * 24 * 3).map(|i| (i as u8).wrapping_mul(k + 1)).collect();
        std::fs::write(
            imgs.join(format!("p{k}.png")),
            png_bytes(32, 24, ExtendedColorType::Rgb8, &px, None),
        )
        .unwrap();
    }
    let out = dir.path().join("out");
    let maps = dir.path().join("maps");
    let o = run(&[
        "proof",
        &s(&imgs),
        "--out",
        &s(&out),
        "--delta-map",
        &s(&maps),
        "--json",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let v = json(&o);
    let inputs: Vec<String> = v["images"]
        .as_array()
        .unwrap()
        .iter()
        .map(|i| i["input"].as_str().unwrap().to_string())
        .collect();
    let want: Vec<String> = (0..6).map(|k| s(&imgs.join(format!("p{k}.png")))).collect();
    assert_eq!(inputs, want, "reports in input order");
    assert_eq!(listing(&out).len(), 6);
    assert_eq!(listing(&maps).len(), 12);
    for k in 0..6 {
        let r = raster::read(&out.join(format!("p{k}.proof.png"))).unwrap();
        assert_eq!((r.info.width, r.info.height), (32, 24));
    }

    // One image over the limit among them: nothing at all is written.
    std::fs::write(imgs.join("p9.png"), png_declaring(30_000, 30_000)).unwrap();
    let out2 = dir.path().join("out2");
    let maps2 = dir.path().join("maps2");
    let o = run(&["proof", &s(&imgs), "--out", &s(&out2), "--delta-map", &s(&maps2)]);
    assert_error(&o, &["p9.png", "--max-pixels"]);
    assert!(listing(&out2).is_empty() && listing(&maps2).is_empty());
    // An image that fails only while decoding, after others were staged.
    std::fs::remove_file(imgs.join("p9.png")).unwrap();
    let good = std::fs::read(imgs.join("p5.png")).unwrap();
    std::fs::write(imgs.join("p5.png"), &good[..good.len() - 30]).unwrap();
    let o = run(&["proof", &s(&imgs), "--out", &s(&out2), "--delta-map", &s(&maps2)]);
    assert_error(&o, &["p5.png"]);
    assert!(
        listing(&out2).is_empty() && listing(&maps2).is_empty(),
        "{:?} {:?}",
        listing(&out2),
        listing(&maps2)
    );
}

/// A PNG chunk (PNG spec 5.3): length, type, data, CRC over type and data.
fn png_chunk(out: &mut Vec<u8>, kind: &[u8; 4], data: &[u8]) {
    out.extend_from_slice(&(data.len() as u32).to_be_bytes());
    let mut typed = kind.to_vec();
    typed.extend_from_slice(data);
    out.extend_from_slice(&typed);
    out.extend_from_slice(&crc32(&typed).to_be_bytes());
}

/// A 1 × 1 indexed-colour PNG (colour type 3, 8 bits) whose PLTE chunk has
/// `plte` as its data, and one pixel of index 0. The image data is a zlib
/// stream (RFC 1950) of one stored deflate block (RFC 1951 3.2.4) holding
/// the filter byte and the index, so that nothing but the palette is odd.
fn indexed_png(plte: &[u8]) -> Vec<u8> {
    let mut b = b"\x89PNG\r\n\x1a\n".to_vec();
    // IHDR: width, height, bit depth 8, colour type 3, compression, filter, interlace.
    let mut ihdr = Vec::new();
    ihdr.extend_from_slice(&1u32.to_be_bytes());
    ihdr.extend_from_slice(&1u32.to_be_bytes());
    ihdr.extend_from_slice(&[8, 3, 0, 0, 0]);
    png_chunk(&mut b, b"IHDR", &ihdr);
    png_chunk(&mut b, b"PLTE", plte);
    let raw = [0u8, 0u8];
    // Adler-32 (RFC 1950 8.2) of the raw bytes.
    let (mut a, mut s2) = (1u32, 0u32);
    for &x in &raw {
        a = (a + u32::from(x)) % 65521;
        s2 = (s2 + a) % 65521;
    }
    let mut z = vec![0x78, 0x01, 0x01, 0x02, 0x00, 0xfd, 0xff];
    z.extend_from_slice(&raw);
    z.extend_from_slice(&((s2 << 16) | a).to_be_bytes());
    png_chunk(&mut b, b"IDAT", &z);
    png_chunk(&mut b, b"IEND", &[]);
    b
}

#[test]
fn indexed_png_reads_when_its_palette_is_whole_entries() {
    // The hand-built file is sound: one palette entry of (10, 20, 30).
    let dir = tempfile::tempdir().unwrap();
    let img = dir.path().join("indexed.png");
    std::fs::write(&img, indexed_png(&[10, 20, 30])).unwrap();
    let r = raster::read(&img).unwrap();
    assert_eq!((r.info.width, r.info.height, r.info.channels), (1, 1, 3));
    assert_eq!(r.color, vec![10, 20, 30]);
}

#[test]
fn png_palette_that_is_not_whole_rgb_entries_is_refused() {
    // PNG spec 11.2.3: a PLTE chunk length not divisible by 3 is an error.
    // The PNG decoder takes such a palette as it is and then indexes past
    // its end while expanding the pixels (a panic, found by the image fuzz
    // target); it must be a one-line refusal instead.
    for len in [4usize, 5, 767] {
        let dir = tempfile::tempdir().unwrap();
        let img = dir.path().join("odd-palette.png");
        std::fs::write(&img, indexed_png(&vec![7u8; len])).unwrap();
        assert_refused(&img, &[], &["PLTE", &format!("{len} bytes")]);
        assert!(matches!(raster::read(&img), Err(RasterError::Decode { .. })));
        assert!(matches!(raster::probe(&img), Err(RasterError::Decode { .. })));
    }
}
