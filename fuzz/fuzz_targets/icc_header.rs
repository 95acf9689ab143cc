//! The strict ICC header and tag-table reader, `inkfit::icc::header`, and the
//! tag decoders that use its entries.
#![no_main]

use inkfit::icc::header::{read_matrix3, read_xyz, tag_type, Header};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let h = match Header::parse(data) {
        Ok(h) => h,
        Err(e) => {
            let _ = e.to_string();
            return;
        }
    };
    assert!(h.size <= data.len(), "property: declared size within the data");
    let _ = h.version_string();
    let _ = format!("{} {} {} {}", h.class, h.color_space, h.pcs, h.creator);
    for t in &h.tags {
        assert!(
            t.offset.checked_add(t.size).is_some_and(|end| end <= h.size),
            "property: tag {t:?} lies inside the profile"
        );
        let _ = tag_type(data, *t);
        let _ = read_xyz(data, *t);
        let _ = read_matrix3(data, *t);
        assert_eq!(h.tag(&t.sig.0).map(|e| e.sig), Some(t.sig));
    }
});
