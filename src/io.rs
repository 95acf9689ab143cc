//! Output files written atomically: into a temporary file in the same folder,
//! then renamed over the target, so a reader never sees half a file.

use std::fs::File;
use std::io::{self, BufWriter, Write};
use std::path::Path;

/// Writes `path` by calling `fill` on a buffered temporary file beside it and
/// renaming it into place once everything is written and flushed. On any
/// error the temporary file is removed and `path` is left as it was.
pub fn write_atomic<F>(path: &Path, fill: F) -> io::Result<()>
where
    F: FnOnce(&mut dyn Write) -> io::Result<()>,
{
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    };
    let file_name = path
        .file_name()
        .ok_or_else(|| io::Error::new(io::ErrorKind::InvalidInput, "the output path names no file"))?;
    let tmp = dir.join(format!(".{}.{}.tmp", file_name.to_string_lossy(), std::process::id()));
    let result = (|| {
        let mut w = BufWriter::new(File::create(&tmp)?);
        fill(&mut w)?;
        let file = w.into_inner().map_err(|e| e.into_error())?;
        file.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn failed_write_leaves_target_untouched() {
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("out.txt");
        std::fs::write(&target, "old").unwrap();
        let r = write_atomic(&target, |w| {
            w.write_all(b"partial")?;
            Err(io::Error::other("stopped half-way"))
        });
        assert!(r.is_err());
        assert_eq!(std::fs::read_to_string(&target).unwrap(), "old");
        assert_eq!(
            std::fs::read_dir(dir.path()).unwrap().count(),
            1,
            "temporary file left behind"
        );
    }

    #[test]
    fn successful_write_replaces_target() {
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("out.txt");
        write_atomic(&target, |w| w.write_all(b"new")).unwrap();
        assert_eq!(std::fs::read_to_string(&target).unwrap(), "new");
    }
}
