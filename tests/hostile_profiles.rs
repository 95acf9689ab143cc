//! Profiles made hostile by one or a few changed bytes, and paths that are
//! not profile files: each must end in exit 2 with one line naming the file,
//! in bounded time and memory (a hang shows as a test that never ends).
//! Every mutant starts from a real profile: the built-in press
//! (`profiles/offset-coated.icc`, ICC v4 lutAToB/lutBToA tables), the same
//! kind of tables on uniform grids re-saved by lcms2 as ICC v2 (lut16), and
//! the built-in sRGB screen (matrix/TRC).

mod common;
use common::*;

use std::path::{Path, PathBuf};

use inkfit::icc::header::{Header, MAX_TAG_BYTES};
use inkfit::icc::{builtin, tags, IccProfile, Origin, MAX_PROFILE_BYTES};
use lcms2::{Profile, TagSignature};

fn offset_coated() -> Vec<u8> {
    std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles/offset-coated.icc")).unwrap()
}

fn srgb() -> Vec<u8> {
    builtin::bytes("srgb").unwrap().unwrap()
}

/// A press profile of uniform grids (33³ B2A, an earlier build of the
/// built-in press, kept in `tests/data/`) re-saved as an ICC v2 profile:
/// lcms2 writes its tables as lut16Type ('mft2'), one copy for the
/// perceptual intent that the other intents link to (same offset), as many
/// v2 press profiles do. The current built-in cannot be: its B2A grids differ
/// per input (33 × 52 × 52), which lut16Type cannot hold.
fn offset_coated_v2() -> Vec<u8> {
    let bytes = std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/press-uniform-grid.icc")).unwrap();
    let src = Profile::new_icc(&bytes).unwrap();
    let mut p = Profile::new_icc(&bytes).unwrap();
    use TagSignature::*;
    assert!(p.write_tag(AToB0Tag, src.read_tag(AToB1Tag)));
    assert!(p.write_tag(BToA0Tag, src.read_tag(BToA1Tag)));
    assert!(p.write_tag(GamutTag, src.read_tag(GamutTag)));
    for (tag, to) in [
        (AToB1Tag, AToB0Tag),
        (AToB2Tag, AToB0Tag),
        (BToA1Tag, BToA0Tag),
        (BToA2Tag, BToA0Tag),
    ] {
        assert!(p.link_tag(tag, to));
    }
    p.set_version(2.1);
    p.icc().unwrap()
}

/// Offset and size of `sig` in the tag table (ICC.1:2010, 7.3), read here
/// independently of the library.
fn tag(bytes: &[u8], sig: &[u8; 4]) -> (usize, usize) {
    let be = |at: usize| u32::from_be_bytes(bytes[at..at + 4].try_into().unwrap()) as usize;
    (0..be(128))
        .map(|i| 132 + 12 * i)
        .find(|&at| &bytes[at..at + 4] == sig)
        .map(|at| (be(at + 4), be(at + 8)))
        .unwrap_or_else(|| panic!("no tag {sig:?}"))
}

/// Index of the tag-table entry of `sig`.
fn entry_at(bytes: &[u8], sig: &[u8; 4]) -> usize {
    let n = u32::from_be_bytes(bytes[128..132].try_into().unwrap()) as usize;
    (0..n)
        .map(|i| 132 + 12 * i)
        .find(|&at| &bytes[at..at + 4] == sig)
        .unwrap_or_else(|| panic!("no tag {sig:?}"))
}

fn write(dir: &Path, name: &str, bytes: &[u8]) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, bytes).unwrap();
    p
}

/// `check` (with the profile as press, or as screen when it is RGB) and
/// `gamut` both fail cleanly, naming the file and each of `needles`.
fn assert_refused(path: &Path, needles: &[&str]) {
    let p = path.to_str().unwrap();
    // Sniff the colour space of regular files only: reading /dev/zero or a
    // FIFO here would hang the test itself.
    let rgb = std::fs::metadata(path).is_ok_and(|m| m.is_file() && m.len() < 1 << 24)
        && std::fs::read(path).is_ok_and(|b| b.get(16..20) == Some(b"RGB "));
    let role = if rgb { "--screen" } else { "--press" };
    let mut all = vec![p];
    all.extend_from_slice(needles);
    assert_error(&run(&["check", &demo("landuse.csv"), role, p]), &all);
    assert_error(&run(&["gamut", p]), &all);
}

#[test]
fn real_profiles_pass_validation() {
    let mut profiles: Vec<(String, Vec<u8>)> = builtin::names()
        .into_iter()
        .map(|n| (n.to_string(), builtin::bytes(n).unwrap().unwrap()))
        .collect();
    profiles.push(("profiles/offset-coated.icc".into(), offset_coated()));
    profiles.push(("offset-coated as v2".into(), offset_coated_v2()));
    profiles.push(("lcms2 sRGB".into(), Profile::new_srgb().icc().unwrap()));
    profiles.push((
        "lcms2 CIELAB".into(),
        inkfit::icc::transform::lab_d50_profile().icc().unwrap(),
    ));
    for (name, bytes) in profiles {
        let header = Header::parse(&bytes).unwrap_or_else(|e| panic!("{name}: {e}"));
        tags::validate(&header, &bytes).unwrap_or_else(|e| panic!("{name}: {e}"));
        IccProfile::from_bytes(&name, Origin::Builtin, bytes).unwrap_or_else(|e| panic!("{name}: {e}"));
    }
    // The v2 re-save still has a gamut and gives the same one, near enough
    // (its CIELAB is the v2 encoding, which differs by under 0.4 %).
    let dir = tempfile::tempdir().unwrap();
    let v2 = write(dir.path(), "v2.icc", &offset_coated_v2());
    let o = run(&["gamut", v2.to_str().unwrap(), "offset-coated", "--json"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
}

#[test]
fn lut_ab_table_retyped_as_lut8_is_refused() {
    // 'mAB ' → 'mft1': byte 10 (grid points of a lut8) is a reserved 0.
    let dir = tempfile::tempdir().unwrap();
    let mut b = offset_coated();
    let (at, _) = tag(&b, b"A2B0");
    assert_eq!(&b[at..at + 4], b"mAB ");
    b[at..at + 4].copy_from_slice(b"mft1");
    let p = write(dir.path(), "mab-as-mft1.icc", &b);
    assert_refused(&p, &["A2B", "grid points"]);
}

#[test]
fn lut16_table_retyped_as_lut8_is_refused() {
    // 'mft2' → 'mft1' (one byte): the 16-bit data read as a lut8 fits in the
    // tag, but gives a table whose neighbouring nodes jump across CIELAB;
    // filling its gamut used to run for minutes.
    let dir = tempfile::tempdir().unwrap();
    let mut b = offset_coated_v2();
    let (at, _) = tag(&b, b"A2B0");
    assert_eq!(tag(&b, b"A2B1").0, at, "A2B1 links to A2B0");
    assert_eq!(&b[at..at + 4], b"mft2");
    b[at + 3] = b'1';
    let p = write(dir.path(), "mft2-as-mft1.icc", &b);
    assert_refused(&p, &["not plausible"]);
}

#[test]
fn rgb_colorant_with_a_changed_byte_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let base = srgb();
    let (at, _) = tag(&base, b"rXYZ");
    // The high byte of X: X becomes about 32,000, which used to ask for a
    // 23 GB voxel grid.
    let mut b = base.clone();
    b[at + 8] = 0x7f;
    let huge = write(dir.path(), "rxyz-huge.icc", &b);
    assert_refused(&huge, &["rXYZ", "plausible range"]);
    // The high byte of Z to 0x80: a negative colorant far below −5.
    let mut b = base.clone();
    b[at + 16] = 0x80;
    let negative = write(dir.path(), "rxyz-negative.icc", &b);
    assert_refused(&negative, &["rXYZ", "plausible range"]);
    // X = 4.4: inside the per-tag range, but the red primary then lies far
    // outside anything a display shows. Converting single colours through it
    // (`check --screen`) is bounded work and may go ahead; its gamut is
    // refused.
    let mut b = base.clone();
    b[at + 9] = 0x04;
    let wide = write(dir.path(), "rxyz-wide.icc", &b);
    let w = wide.to_str().unwrap();
    assert_error(&run(&["gamut", w]), &[w, "not plausible", "a*"]);
}

#[test]
fn tag_beyond_the_size_cap_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let mut b = offset_coated();
    let e = entry_at(&b, b"B2A1");
    b[e + 8..e + 12].copy_from_slice(&(MAX_TAG_BYTES as u32 + 1).to_be_bytes());
    let p = write(dir.path(), "tag-too-large.icc", &b);
    assert_refused(&p, &["B2A1", "more than"]);
    // A size inside the cap but past the end of the file.
    let mut b = offset_coated();
    let offset = u32::from_be_bytes(b[e + 4..e + 8].try_into().unwrap()) as usize;
    let past = (b.len() - offset + 1) as u32;
    b[e + 8..e + 12].copy_from_slice(&past.to_be_bytes());
    let p = write(dir.path(), "tag-past-end.icc", &b);
    assert_refused(&p, &["B2A1", "outside"]);
}

/// The profile made a 15-colour one (data colour space 'FCLR', ICC.1:2010
/// table 19) so that a 15-input table has the right channels, with the
/// B2A and gamut tags renamed out of the way.
fn fifteen_colours(mut b: Vec<u8>) -> Vec<u8> {
    b[16..20].copy_from_slice(b"FCLR");
    for sig in [b"B2A0", b"B2A1", b"B2A2", b"gamt"] {
        if let Some(e) = (0..u32::from_be_bytes(b[128..132].try_into().unwrap()) as usize)
            .map(|i| 132 + 12 * i)
            .find(|&at| &b[at..at + 4] == sig)
        {
            b[e..e + 4].copy_from_slice(b"priv");
        }
    }
    b
}

#[test]
fn clut_of_255_points_on_15_channels_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    // lutAToB: 15 inputs with 255 grid points each.
    let mut b = fifteen_colours(offset_coated());
    let (at, _) = tag(&b, b"A2B0");
    b[at + 8] = 15;
    let clut = u32::from_be_bytes(b[at + 24..at + 28].try_into().unwrap()) as usize;
    for g in &mut b[at + clut..at + clut + 15] {
        *g = 255;
    }
    let p = write(dir.path(), "mab-255x15.icc", &b);
    assert_refused(&p, &["A2B", "255^15", "exceeds the limit"]);
    // lut16: the same with its single grid-point count.
    let mut b = fifteen_colours(offset_coated_v2());
    let (at, _) = tag(&b, b"A2B0");
    b[at + 8] = 15;
    b[at + 10] = 255;
    let p = write(dir.path(), "mft2-255x15.icc", &b);
    assert_refused(&p, &["A2B", "255^15", "exceeds the limit"]);
}

#[test]
fn table_channels_must_match_the_profile() {
    // The press's A2B table claims 3 inputs: a CMYK profile has 4.
    let dir = tempfile::tempdir().unwrap();
    let mut b = offset_coated();
    let (at, _) = tag(&b, b"A2B0");
    b[at + 8] = 3;
    let p = write(dir.path(), "a2b-3-inputs.icc", &b);
    assert_refused(&p, &["A2B", "3 input channels", "'CMYK' has 4"]);
    // A lutBToA whose CLUT offset points past the tag.
    let mut b = offset_coated();
    let (at, size) = tag(&b, b"B2A1");
    b[at + 24..at + 28].copy_from_slice(&(size as u32 + 64).to_be_bytes());
    let p = write(dir.path(), "b2a-clut-outside.icc", &b);
    assert_refused(&p, &["B2A", "CLUT"]);
}

#[test]
fn tone_curve_longer_than_its_tag_is_refused() {
    // Turn the parametric sRGB curve into a 'curv' whose count runs past the tag.
    let dir = tempfile::tempdir().unwrap();
    let mut b = srgb();
    let (at, _) = tag(&b, b"rTRC");
    b[at..at + 4].copy_from_slice(b"curv");
    b[at + 8..at + 12].copy_from_slice(&1_000_000u32.to_be_bytes());
    let p = write(dir.path(), "trc-long.icc", &b);
    assert_refused(&p, &["TRC", "entries", "but the tag has 32"]);
}

#[test]
fn dev_zero_is_not_read() {
    if Path::new("/dev/zero").exists() {
        assert_refused(Path::new("/dev/zero"), &["not a regular file", "character device"]);
    }
}

#[test]
fn a_directory_is_not_a_profile() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path().join("folder.icc");
    std::fs::create_dir(&d).unwrap();
    assert_refused(&d, &["not a regular file", "directory"]);
}

#[cfg(unix)]
#[test]
fn a_fifo_is_not_opened_for_reading() {
    // Opening a FIFO without a writer would block: the test would hang.
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("pipe.icc");
    let c = std::ffi::CString::new(f.to_str().unwrap()).unwrap();
    // SAFETY: `c` is a valid NUL-terminated path for the call's duration.
    assert_eq!(unsafe { libc::mkfifo(c.as_ptr(), 0o600) }, 0, "mkfifo");
    assert_refused(&f, &["not a regular file", "FIFO"]);
    // Through a symbolic link, too.
    let link = dir.path().join("link.icc");
    std::os::unix::fs::symlink(&f, &link).unwrap();
    assert_refused(&link, &["not a regular file", "FIFO"]);
}

#[test]
fn a_file_beyond_the_size_cap_is_not_read() {
    // A sparse file: no disk space, but its size is past the cap.
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("huge.icc");
    let f = std::fs::File::create(&p).unwrap();
    f.set_len(MAX_PROFILE_BYTES as u64 + 1).unwrap();
    drop(f);
    assert_refused(&p, &["larger than 64 MiB"]);
}

#[test]
fn a_table_giving_no_finite_ink_measures_within_four_hundred_percent() {
    // The fuzzer's find (fuzz/regressions/icc_profile/): a CMYK press whose
    // Lab → CMYK table gives non-finite and far-above-100 % CMYK for some
    // CIELAB. Property: a channel holds at most 100 % ink, so any measured
    // total lies in 0–400 %.
    let o = run(&[
        "inspect",
        "fuzz/regressions/icc_profile/nonfinite-ink-table.icc",
        "--json",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let ink = json(&o)["max_ink"].as_f64().expect("a finite measurement");
    assert!((0.0..=400.0).contains(&ink), "{ink}");
}
