//! Writes the generated seeds of the fuzz corpora: small ICC profiles of
//! every kind inkfit meets (matrix/TRC RGB v2 and v4, grey, Lab, XYZ, a tiny
//! CMYK output profile as v4 lutAToB/lutBToA and as v2 lut16) and tiny PNG,
//! JPEG and TIFF images in every layout `raster` reads (grey, grey +
//! alpha, RGB, RGBA, 8 and 16 bits, indexed and 1-bit PNG, CMYK TIFF, with
//! and without an embedded profile, compressed and not).
//!
//! Usage: `seedgen <fuzz/corpus dir>`; it overwrites the files it names and
//! leaves the others alone. The output is deterministic.

use std::error::Error;
use std::ffi::{c_void, CString};
use std::io::Cursor;
use std::path::{Path, PathBuf};
use std::ptr;

use image::codecs::jpeg::JpegEncoder;
use image::codecs::png::PngEncoder;
use image::codecs::tiff::TiffEncoder;
use image::{ExtendedColorType, ImageEncoder};
use inkfit::press::invert::invert;
use inkfit::press::model::{offset_coated, PrintCondition};
use lcms2::{CIExyY, GlobalContext, Profile, ToneCurve};
use lcms2_sys as ffi;

type Res<T> = Result<T, Box<dyn Error>>;

fn main() -> Res<()> {
    let dir = PathBuf::from(std::env::args().nth(1).ok_or("usage: seedgen <fuzz/corpus dir>")?);
    let profiles = icc_seeds()?;
    for (name, bytes) in &profiles {
        write(&dir.join("icc_profile"), name, bytes)?;
        write(&dir.join("icc_header"), name, bytes)?;
    }
    let srgb = &profiles
        .iter()
        .find(|(n, _)| *n == "srgb-v4.icc")
        .ok_or("no sRGB seed")?
        .1;
    let cmyk = &profiles
        .iter()
        .find(|(n, _)| *n == "cmyk-v4.icc")
        .ok_or("no CMYK seed")?
        .1;
    for (name, bytes) in image_seeds(srgb, cmyk)? {
        write(&dir.join("image"), name, &bytes)?;
    }
    Ok(())
}

fn write(dir: &Path, name: &str, bytes: &[u8]) -> Res<()> {
    std::fs::create_dir_all(dir)?;
    std::fs::write(dir.join(name), bytes)?;
    println!("{:>6} bytes  {}", bytes.len(), dir.join(name).display());
    Ok(())
}

// ------------------------------------------------------------------ profiles

fn d50() -> CIExyY {
    CIExyY {
        x: 0.3457,
        y: 0.3585,
        Y: 1.0,
    }
}

fn icc_seeds() -> Res<Vec<(&'static str, Vec<u8>)>> {
    let mut out = Vec::new();
    for (name, builtin) in [
        ("srgb-v4.icc", "srgb"),
        ("display-p3-v4.icc", "display-p3"),
        ("prophoto-v4.icc", "prophoto"),
    ] {
        let bytes = inkfit::icc::builtin::bytes(builtin).ok_or("no such built-in")??;
        out.push((name, bytes));
    }
    let mut v2 = Profile::new_srgb();
    v2.set_version(2.1);
    out.push(("srgb-v2.icc", stamped(v2.icc()?)));

    let gamma = ToneCurve::new(2.2);
    let grey = Profile::new_gray(&d50(), &gamma)?;
    out.push(("grey-v4.icc", stamped(grey.icc()?)));
    out.push((
        "lab-v4.icc",
        stamped(Profile::new_lab4_context(GlobalContext::new(), &d50())?.icc()?),
    ));
    out.push((
        "lab-v2.icc",
        stamped(Profile::new_lab2_context(GlobalContext::new(), &d50())?.icc()?),
    ));
    out.push(("xyz-v4.icc", stamped(Profile::new_xyz().icc()?)));

    let cond = offset_coated();
    out.push(("cmyk-v4.icc", stamped(cmyk_profile(&cond, 4.3, 3, 5)?)));
    out.push(("cmyk-v2.icc", stamped(cmyk_profile(&cond, 2.1, 3, 5)?)));
    Ok(out)
}

fn stamped(mut bytes: Vec<u8>) -> Vec<u8> {
    inkfit::icc::builtin::stamp_date(&mut bytes);
    bytes
}

struct Tables<'a> {
    cond: &'a PrintCondition,
    v2: bool,
}

/// A2B sampler: CMYK codes → Lab codes of the model's media-relative colour.
unsafe extern "C" fn sample_a2b(input: *const u16, output: *mut u16, cargo: *mut c_void) -> i32 {
    // SAFETY: the stage is 4 → 3 and cargo is the Tables passed below.
    let (inp, out, t) = unsafe {
        (
            std::slice::from_raw_parts(input, 4),
            std::slice::from_raw_parts_mut(output, 3),
            &*(cargo as *const Tables),
        )
    };
    let lab = t.cond.lab_relative([0, 1, 2, 3].map(|i| f64::from(inp[i]) / 65535.0));
    let lab = ffi::CIELab {
        L: lab.l,
        a: lab.a,
        b: lab.b,
    };
    // SAFETY: `out` has the three slots the encoders write.
    unsafe {
        if t.v2 {
            ffi::cmsFloat2LabEncodedV2(out.as_mut_ptr(), &lab);
        } else {
            ffi::cmsFloat2LabEncoded(out.as_mut_ptr(), &lab);
        }
    }
    1
}

/// B2A sampler: Lab codes → CMYK codes of the model's inversion.
unsafe extern "C" fn sample_b2a(input: *const u16, output: *mut u16, cargo: *mut c_void) -> i32 {
    // SAFETY: the stage is 3 → 4 and cargo is the Tables passed below.
    let (inp, out, t) = unsafe {
        (
            std::slice::from_raw_parts(input, 3),
            std::slice::from_raw_parts_mut(output, 4),
            &*(cargo as *const Tables),
        )
    };
    let mut lab = ffi::CIELab { L: 0.0, a: 0.0, b: 0.0 };
    // SAFETY: `inp` holds the three codes the decoders read.
    unsafe {
        if t.v2 {
            ffi::cmsLabEncoded2FloatV2(&mut lab, inp.as_ptr());
        } else {
            ffi::cmsLabEncoded2Float(&mut lab, inp.as_ptr());
        }
    }
    let ink = invert(t.cond, inkfit::color::LabD50::new(lab.L, lab.a, lab.b)).cmyk;
    for (o, v) in out.iter_mut().zip(ink) {
        *o = (v.clamp(0.0, 1.0) * 65535.0).round() as u16;
    }
    1
}

/// A CMYK output profile with the model sampled on tiny grids: v4 as
/// curves–CLUT–curves (lutAToBType / lutBToAType), v2 as a bare CLUT
/// (lut16Type); the colorimetric and saturation tags link to the perceptual
/// ones.
fn cmyk_profile(cond: &PrintCondition, version: f64, a2b_grid: u32, b2a_grid: u32) -> Res<Vec<u8>> {
    let v2 = version < 4.0;
    let tables = Tables { cond, v2 };
    let cargo = &tables as *const Tables as *mut c_void;
    // SAFETY: every handle from Little CMS is checked before use and freed
    // once; the samplers only read `tables`, which outlives the calls.
    unsafe {
        let h = ffi::cmsCreateProfilePlaceholder(ptr::null_mut());
        if h.is_null() {
            return Err("cmsCreateProfilePlaceholder".into());
        }
        ffi::cmsSetProfileVersion(h, version);
        ffi::cmsSetDeviceClass(h, ffi::ProfileClassSignature::OutputClass);
        ffi::cmsSetColorSpace(h, ffi::ColorSpaceSignature::CmykData);
        ffi::cmsSetPCS(h, ffi::ColorSpaceSignature::LabData);
        let result = (|| -> Res<Vec<u8>> {
            let a2b = pipeline(4, 3, a2b_grid, sample_a2b, cargo, !v2)?;
            let ok = ffi::cmsWriteTag(h, ffi::TagSignature::AToB0Tag, a2b as *const c_void);
            ffi::cmsPipelineFree(a2b);
            let b2a = pipeline(3, 4, b2a_grid, sample_b2a, cargo, !v2)?;
            let ok = ok != 0 && ffi::cmsWriteTag(h, ffi::TagSignature::BToA0Tag, b2a as *const c_void) != 0;
            ffi::cmsPipelineFree(b2a);
            if !ok {
                return Err("cmsWriteTag A2B0/B2A0".into());
            }
            for (tag, to) in [
                (ffi::TagSignature::AToB1Tag, ffi::TagSignature::AToB0Tag),
                (ffi::TagSignature::AToB2Tag, ffi::TagSignature::AToB0Tag),
                (ffi::TagSignature::BToA1Tag, ffi::TagSignature::BToA0Tag),
                (ffi::TagSignature::BToA2Tag, ffi::TagSignature::BToA0Tag),
            ] {
                if ffi::cmsLinkTag(h, tag, to) == 0 {
                    return Err("cmsLinkTag".into());
                }
            }
            let paper = cond.paper_xyz();
            let wtpt = ffi::CIEXYZ {
                X: paper.x,
                Y: paper.y,
                Z: paper.z,
            };
            if ffi::cmsWriteTag(
                h,
                ffi::TagSignature::MediaWhitePointTag,
                &wtpt as *const _ as *const c_void,
            ) == 0
            {
                return Err("cmsWriteTag wtpt".into());
            }
            write_text(
                h,
                ffi::TagSignature::ProfileDescriptionTag,
                "inkfit fuzz seed: tiny CMYK press",
            )?;
            write_text(h, ffi::TagSignature::CopyrightTag, "No copyright, use freely")?;
            let mut len = 0u32;
            if ffi::cmsSaveProfileToMem(h, ptr::null_mut(), &mut len) == 0 {
                return Err("cmsSaveProfileToMem (size)".into());
            }
            let mut bytes = vec![0u8; len as usize];
            if ffi::cmsSaveProfileToMem(h, bytes.as_mut_ptr() as *mut c_void, &mut len) == 0 {
                return Err("cmsSaveProfileToMem".into());
            }
            Ok(bytes)
        })();
        ffi::cmsCloseProfile(h);
        result
    }
}

/// curves–CLUT–curves (v4) or a bare CLUT (v2), filled by `sampler`.
unsafe fn pipeline(
    inputs: u32,
    outputs: u32,
    grid: u32,
    sampler: ffi::SAMPLER16,
    cargo: *mut c_void,
    curves: bool,
) -> Res<*mut ffi::Pipeline> {
    // SAFETY: as in `cmyk_profile`; the pipeline owns the stages inserted.
    unsafe {
        let lut = ffi::cmsPipelineAlloc(ptr::null_mut(), inputs, outputs);
        if lut.is_null() {
            return Err("cmsPipelineAlloc".into());
        }
        let identity = |n: u32| {
            let g = ffi::cmsBuildGamma(ptr::null_mut(), 1.0);
            let list = vec![g as *const ffi::ToneCurve; n as usize];
            let stage = ffi::cmsStageAllocToneCurves(ptr::null_mut(), n, list.as_ptr());
            ffi::cmsFreeToneCurve(g);
            stage
        };
        let clut = ffi::cmsStageAllocCLut16bit(ptr::null_mut(), grid, inputs, outputs, ptr::null());
        let mut ok = !clut.is_null() && ffi::cmsStageSampleCLut16bit(clut, sampler, cargo, 0) != 0;
        if curves {
            ok = ok && ffi::cmsPipelineInsertStage(lut, ffi::StageLoc::AT_END, identity(inputs)) != 0;
        }
        ok = ok && ffi::cmsPipelineInsertStage(lut, ffi::StageLoc::AT_END, clut) != 0;
        if curves {
            ok = ok && ffi::cmsPipelineInsertStage(lut, ffi::StageLoc::AT_END, identity(outputs)) != 0;
        }
        if !ok {
            ffi::cmsPipelineFree(lut);
            return Err("building a CLUT pipeline".into());
        }
        Ok(lut)
    }
}

unsafe fn write_text(h: ffi::HPROFILE, sig: ffi::TagSignature, text: &str) -> Res<()> {
    let text = CString::new(text)?;
    // SAFETY: h is a live profile; the MLU is freed after cmsWriteTag copied it.
    unsafe {
        let mlu = ffi::cmsMLUalloc(ptr::null_mut(), 1);
        if mlu.is_null() {
            return Err("cmsMLUalloc".into());
        }
        let ok = ffi::cmsMLUsetASCII(mlu, c"en".as_ptr(), c"US".as_ptr(), text.as_ptr()) != 0
            && ffi::cmsWriteTag(h, sig, mlu as *const c_void) != 0;
        ffi::cmsMLUfree(mlu);
        if ok {
            Ok(())
        } else {
            Err("writing a text tag".into())
        }
    }
}

// ------------------------------------------------------------------ images

/// A `w`×`h` gradient with `n` samples per pixel, 8 bits.
fn ramp8(w: u32, h: u32, n: u32) -> Vec<u8> {
    (0..w * h * n).map(|i| (i * 37 % 251) as u8).collect()
}

/// The same as 16-bit samples, native order (what the image crate takes).
fn ramp16(w: u32, h: u32, n: u32) -> Vec<u8> {
    (0..w * h * n)
        .flat_map(|i| ((i * 4099 % 65521) as u16).to_ne_bytes())
        .collect()
}

fn png(data: &[u8], w: u32, h: u32, t: ExtendedColorType, icc: Option<&[u8]>) -> Res<Vec<u8>> {
    let mut out = Vec::new();
    let mut enc = PngEncoder::new(&mut out);
    if let Some(p) = icc {
        enc.set_icc_profile(p.to_vec())?;
    }
    enc.write_image(data, w, h, t)?;
    Ok(out)
}

/// PNG layouts the image crate's encoder does not write: indexed colour and
/// 1-bit grey.
fn png_raw(w: u32, h: u32, color: png::ColorType, depth: png::BitDepth, data: &[u8]) -> Res<Vec<u8>> {
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, w, h);
        enc.set_color(color);
        enc.set_depth(depth);
        if color == png::ColorType::Indexed {
            enc.set_palette(vec![0, 0, 0, 255, 0, 0, 0, 255, 0, 0, 0, 255]);
            enc.set_trns(vec![255, 128, 255, 0]);
        }
        let mut wr = enc.write_header()?;
        wr.write_image_data(data)?;
    }
    Ok(out)
}

fn jpeg(data: &[u8], w: u32, h: u32, t: ExtendedColorType, icc: Option<&[u8]>) -> Res<Vec<u8>> {
    let mut out = Vec::new();
    let mut enc = JpegEncoder::new_with_quality(&mut out, 90);
    if let Some(p) = icc {
        enc.set_icc_profile(p.to_vec())?;
    }
    enc.write_image(data, w, h, t)?;
    Ok(out)
}

fn tiff(data: &[u8], w: u32, h: u32, t: ExtendedColorType, icc: Option<&[u8]>) -> Res<Vec<u8>> {
    let mut out = Vec::new();
    let mut enc = TiffEncoder::new(Cursor::new(&mut out));
    if let Some(p) = icc {
        enc.set_icc_profile(p.to_vec())?;
    }
    enc.write_image(data, w, h, t)?;
    Ok(out)
}

/// CMYK TIFF through the tiff crate (the image crate does not write CMYK).
fn tiff_cmyk(w: u32, h: u32, sixteen: bool, lzw: bool, icc: Option<&[u8]>) -> Res<Vec<u8>> {
    use tiff::encoder::{colortype, Compression, TiffEncoder};
    use tiff::tags::Tag;
    let mut out = Cursor::new(Vec::new());
    let compression = if lzw {
        Compression::Lzw
    } else {
        Compression::Uncompressed
    };
    let mut enc = TiffEncoder::new(&mut out)?.with_compression(compression);
    if sixteen {
        let data: Vec<u16> = (0..w * h * 4).map(|i| (i * 4099 % 65521) as u16).collect();
        let mut img = enc.new_image::<colortype::CMYK16>(w, h)?;
        if let Some(p) = icc {
            img.encoder().write_tag(Tag::IccProfile, p)?;
        }
        img.write_data(&data)?;
    } else {
        let data = ramp8(w, h, 4);
        let mut img = enc.new_image::<colortype::CMYK8>(w, h)?;
        if let Some(p) = icc {
            img.encoder().write_tag(Tag::IccProfile, p)?;
        }
        img.write_data(&data)?;
    }
    Ok(out.into_inner())
}

fn image_seeds(srgb: &[u8], cmyk: &[u8]) -> Res<Vec<(&'static str, Vec<u8>)>> {
    use ExtendedColorType as T;
    let (w, h) = (4, 3);
    Ok(vec![
        ("rgb8-icc.png", png(&ramp8(w, h, 3), w, h, T::Rgb8, Some(srgb))?),
        ("rgba16.png", png(&ramp16(w, h, 4), w, h, T::Rgba16, None)?),
        ("grey8.png", png(&ramp8(w, h, 1), w, h, T::L8, None)?),
        ("grey-alpha8.png", png(&ramp8(w, h, 2), w, h, T::La8, None)?),
        ("grey16.png", png(&ramp16(w, h, 1), w, h, T::L16, None)?),
        (
            "indexed.png",
            png_raw(w, h, png::ColorType::Indexed, png::BitDepth::Two, &[0x1b, 0xe4, 0x6c])?,
        ),
        (
            "grey1.png",
            png_raw(8, 2, png::ColorType::Grayscale, png::BitDepth::One, &[0xa5, 0x5a])?,
        ),
        ("rgb-icc.jpg", jpeg(&ramp8(8, 8, 3), 8, 8, T::Rgb8, Some(srgb))?),
        ("grey.jpg", jpeg(&ramp8(8, 8, 1), 8, 8, T::L8, None)?),
        ("rgb8-icc.tif", tiff(&ramp8(w, h, 3), w, h, T::Rgb8, Some(srgb))?),
        ("rgba16.tif", tiff(&ramp16(w, h, 4), w, h, T::Rgba16, None)?),
        ("grey8.tif", tiff(&ramp8(w, h, 1), w, h, T::L8, None)?),
        ("cmyk8-icc.tif", tiff_cmyk(w, h, false, false, Some(cmyk))?),
        ("cmyk16-lzw.tif", tiff_cmyk(w, h, true, true, None)?),
    ])
}
