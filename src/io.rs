//! Every file inkfit writes goes through [`Outputs`]: the one guard that keeps
//! a user's files safe, and the atomic, all-or-none way they are written.
//!
//! - An output that is the same file as an input (same device and inode,
//!   after following links; a hard link counts) is refused.
//! - Only regular files are replaced: a folder, a device, a FIFO, a socket or
//!   a link to nothing is refused. A link to a regular file is followed, so
//!   the link stays and its target gets the new content.
//! - The same output named twice in one run is refused.
//! - Each output is first written to a temporary file in its own folder and
//!   synced; only when every output of the run is staged are they renamed
//!   into place. A failure before that leaves every target as it was; a
//!   failed rename puts back what the earlier renames replaced. Temporary
//!   files, and folders made for the outputs, are removed on failure.

use std::fs::{self, File};
use std::io::{self, BufWriter, Write};
use std::path::{Path, PathBuf};

/// Why an output cannot be written. Each names the path.
#[derive(Debug, thiserror::Error)]
pub enum OutputError {
    /// The output is one of the inputs.
    #[error("'{output}' would overwrite the input '{input}': inkfit never writes over an input; name another output")]
    SameAsInput {
        /// The output path as given.
        output: String,
        /// The input path it would replace.
        input: String,
    },
    /// The output exists and is not a regular file.
    #[error("'{output}' is {kind}, not a regular file: inkfit only replaces regular files")]
    NotRegular {
        /// The output path as given.
        output: String,
        /// What it is instead ("a folder", "a character device", …).
        kind: &'static str,
    },
    /// The output is a symbolic link whose target does not exist.
    #[error("'{output}' is a link to nothing: name the file itself")]
    DanglingLink {
        /// The output path as given.
        output: String,
    },
    /// A part of the output's folder path exists and is not a folder.
    #[error("'{output}': '{folder}' is not a folder, so nothing can be written inside it")]
    NotAFolder {
        /// The output path as given.
        output: String,
        /// The part that is not a folder.
        folder: String,
    },
    /// The same output is named twice in one run.
    #[error("'{output}' is named twice as an output of this run")]
    Twice {
        /// The output path as given.
        output: String,
    },
    /// The output could not be examined, written or put in place.
    #[error("'{path}': cannot write: {source}")]
    Write {
        /// The path being written.
        path: String,
        /// The I/O error.
        #[source]
        source: io::Error,
    },
    /// A folder for the output could not be made.
    #[error("'{path}': cannot make the folder: {source}")]
    Folder {
        /// The folder's path.
        path: String,
        /// The I/O error.
        #[source]
        source: io::Error,
    },
}

/// What identifies a file whatever path reaches it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct FileId {
    dev: u64,
    ino: u64,
}

#[cfg(unix)]
fn file_id(m: &fs::Metadata) -> Option<FileId> {
    use std::os::unix::fs::MetadataExt;
    Some(FileId {
        dev: m.dev(),
        ino: m.ino(),
    })
}

#[cfg(not(unix))]
fn file_id(_m: &fs::Metadata) -> Option<FileId> {
    None
}

/// A word for a file system entry that is not a regular file.
fn kind_of(t: fs::FileType) -> &'static str {
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        if t.is_char_device() {
            return "a character device";
        }
        if t.is_block_device() {
            return "a block device";
        }
        if t.is_fifo() {
            return "a FIFO";
        }
        if t.is_socket() {
            return "a socket";
        }
    }
    if t.is_dir() {
        "a folder"
    } else {
        "not a regular file"
    }
}

/// The path as a canonical identity for "named twice": the canonical path
/// when it exists, else its folder's canonical path and its name.
fn identity(p: &Path) -> PathBuf {
    if let Ok(c) = p.canonicalize() {
        return c;
    }
    match (folder_of(p).canonicalize(), p.file_name()) {
        (Ok(d), Some(n)) => d.join(n),
        _ => p.to_path_buf(),
    }
}

fn folder_of(p: &Path) -> &Path {
    match p.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    }
}

struct Input {
    path: PathBuf,
    id: Option<FileId>,
    canonical: Option<PathBuf>,
}

struct Staged {
    tmp: PathBuf,
    target: PathBuf,
}

/// The outputs of one run: checked against its inputs when claimed, staged
/// as temporary files, and put in place together by [`Outputs::commit`].
/// Dropped without a commit, it removes what it staged.
#[derive(Default)]
pub struct Outputs {
    inputs: Vec<Input>,
    claimed: Vec<(PathBuf, PathBuf)>,
    staged: Vec<Staged>,
    made_dirs: Vec<PathBuf>,
}

impl Outputs {
    /// An empty guard: no inputs recorded, nothing staged.
    pub fn new() -> Self {
        Self::default()
    }

    /// Records an input file that no output may replace. Paths that do not
    /// exist are ignored (there is nothing to protect).
    pub fn input(&mut self, path: &Path) {
        if let Ok(m) = fs::metadata(path) {
            self.inputs.push(Input {
                path: path.to_path_buf(),
                id: file_id(&m),
                canonical: path.canonicalize().ok(),
            });
        }
    }

    /// Checks that `path` may be written in this run and returns the path
    /// that will be written (a link's target, else `path` itself).
    pub fn claim(&mut self, path: &Path) -> Result<PathBuf, OutputError> {
        let shown = path.display().to_string();
        let target = match fs::symlink_metadata(path) {
            Err(_) => {
                // Not there yet: the nearest existing ancestor must be a folder.
                let mut up = path.parent();
                while let Some(d) = up.filter(|d| !d.as_os_str().is_empty()) {
                    if let Ok(m) = fs::metadata(d) {
                        if !m.is_dir() {
                            return Err(OutputError::NotAFolder {
                                output: shown,
                                folder: d.display().to_string(),
                            });
                        }
                        break;
                    }
                    up = d.parent();
                }
                path.to_path_buf()
            }
            Ok(lm) => {
                let target = if lm.file_type().is_symlink() {
                    path.canonicalize()
                        .map_err(|_| OutputError::DanglingLink { output: shown.clone() })?
                } else {
                    path.to_path_buf()
                };
                let m = fs::metadata(&target).map_err(|source| OutputError::Write {
                    path: shown.clone(),
                    source,
                })?;
                if !m.file_type().is_file() {
                    return Err(OutputError::NotRegular {
                        output: shown,
                        kind: kind_of(m.file_type()),
                    });
                }
                let id = file_id(&m);
                let canonical = target.canonicalize().ok();
                if let Some(input) = self
                    .inputs
                    .iter()
                    .find(|i| (id.is_some() && i.id == id) || (canonical.is_some() && i.canonical == canonical))
                {
                    return Err(OutputError::SameAsInput {
                        output: shown,
                        input: input.path.display().to_string(),
                    });
                }
                target
            }
        };
        let id = identity(&target);
        if self.claimed.iter().any(|(c, _)| *c == id) {
            return Err(OutputError::Twice { output: shown });
        }
        self.claimed.push((id, target.clone()));
        Ok(target)
    }

    /// Writes `path` into a temporary file beside it by calling `fill`;
    /// claims it first if that was not done. Nothing replaces `path` before
    /// [`Outputs::commit`].
    pub fn stage<F>(&mut self, path: &Path, fill: F) -> Result<(), OutputError>
    where
        F: FnOnce(&mut dyn Write) -> io::Result<()>,
    {
        let id = identity(path);
        let target = match self.claimed.iter().find(|(c, _)| *c == id) {
            Some((_, t)) => t.clone(),
            None => self.claim(path)?,
        };
        let write_err = |source| OutputError::Write {
            path: path.display().to_string(),
            source,
        };
        let dir = folder_of(&target).to_path_buf();
        self.make_dir(&dir)?;
        let name = target
            .file_name()
            .ok_or_else(|| write_err(io::Error::new(io::ErrorKind::InvalidInput, "the path names no file")))?;
        let tmp = dir.join(format!(
            ".{}.{}-{}.inkfit-tmp",
            name.to_string_lossy(),
            std::process::id(),
            self.staged.len()
        ));
        // Registered before it exists, so a failure below still removes it.
        self.staged.push(Staged {
            tmp: tmp.clone(),
            target: target.clone(),
        });
        let file = fs::OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&tmp)
            .map_err(write_err)?;
        if let Ok(m) = fs::metadata(&target) {
            // A replaced file keeps its permissions.
            let _ = file.set_permissions(m.permissions());
        }
        let mut w = BufWriter::new(file);
        fill(&mut w).map_err(write_err)?;
        let file: File = w.into_inner().map_err(|e| write_err(e.into_error()))?;
        file.sync_all().map_err(write_err)?;
        Ok(())
    }

    /// [`Outputs::stage`] for bytes already in memory.
    pub fn stage_bytes(&mut self, path: &Path, bytes: &[u8]) -> Result<(), OutputError> {
        self.stage(path, |w| w.write_all(bytes))
    }

    /// Makes `dir` and any missing parents, remembering which it made.
    fn make_dir(&mut self, dir: &Path) -> Result<(), OutputError> {
        let mut missing = Vec::new();
        let mut cur = Some(dir);
        while let Some(d) = cur.filter(|d| !d.as_os_str().is_empty() && !d.exists()) {
            missing.push(d.to_path_buf());
            cur = d.parent();
        }
        for d in missing.into_iter().rev() {
            fs::create_dir(&d).map_err(|source| OutputError::Folder {
                path: d.display().to_string(),
                source,
            })?;
            self.made_dirs.push(d);
        }
        Ok(())
    }

    /// Puts every staged output in place. On failure the targets replaced
    /// so far get their old content back and new ones are removed.
    pub fn commit(mut self) -> Result<(), OutputError> {
        let staged = std::mem::take(&mut self.staged);
        // Old content of each replaced target, kept as a hard link until the
        // last rename has succeeded.
        let mut done: Vec<(PathBuf, Option<PathBuf>)> = Vec::with_capacity(staged.len());
        let mut failure = None;
        for (k, s) in staged.iter().enumerate() {
            let backup = if s.target.exists() {
                let b = s.tmp.with_extension("inkfit-old");
                fs::hard_link(&s.target, &b).ok().map(|_| b)
            } else {
                None
            };
            match fs::rename(&s.tmp, &s.target) {
                Ok(()) => done.push((s.target.clone(), backup)),
                Err(source) => {
                    if let Some(b) = backup {
                        let _ = fs::remove_file(b);
                    }
                    failure = Some((k, source));
                    break;
                }
            }
        }
        match failure {
            None => {
                for (_, b) in done {
                    if let Some(b) = b {
                        let _ = fs::remove_file(b);
                    }
                }
                self.made_dirs.clear();
                Ok(())
            }
            Some((k, source)) => {
                for (target, backup) in done.into_iter().rev() {
                    match backup {
                        Some(b) => {
                            let _ = fs::rename(b, &target);
                        }
                        None => {
                            let _ = fs::remove_file(&target);
                        }
                    }
                }
                for s in &staged[k..] {
                    let _ = fs::remove_file(&s.tmp);
                }
                Err(OutputError::Write {
                    path: staged[k].target.display().to_string(),
                    source,
                })
            }
        }
    }
}

impl Drop for Outputs {
    fn drop(&mut self) {
        for s in &self.staged {
            let _ = fs::remove_file(&s.tmp);
        }
        for d in self.made_dirs.iter().rev() {
            // Only empty folders go: remove_dir refuses anything else.
            let _ = fs::remove_dir(d);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn names(dir: &Path) -> Vec<String> {
        let mut v: Vec<String> = fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        v.sort();
        v
    }

    #[test]
    fn a_failed_fill_leaves_every_target_untouched() {
        let dir = tempfile::tempdir().unwrap();
        let a = dir.path().join("a.txt");
        let b = dir.path().join("b.txt");
        fs::write(&a, "old a").unwrap();
        let mut o = Outputs::new();
        o.stage_bytes(&a, b"new a").unwrap();
        let r = o.stage(&b, |w| {
            w.write_all(b"partial")?;
            Err(io::Error::other("stopped half-way"))
        });
        assert!(r.is_err());
        drop(o);
        assert_eq!(fs::read_to_string(&a).unwrap(), "old a");
        assert_eq!(names(dir.path()), ["a.txt"], "temporary files left behind");
    }

    #[test]
    fn commit_replaces_all_and_keeps_permissions() {
        let dir = tempfile::tempdir().unwrap();
        let a = dir.path().join("a.txt");
        let b = dir.path().join("sub/b.txt");
        fs::write(&a, "old").unwrap();
        #[cfg(unix)]
        {
            use std::os::unix::fs::PermissionsExt;
            fs::set_permissions(&a, fs::Permissions::from_mode(0o600)).unwrap();
        }
        let mut o = Outputs::new();
        o.stage_bytes(&a, b"new a").unwrap();
        o.stage_bytes(&b, b"new b").unwrap();
        o.commit().unwrap();
        assert_eq!(fs::read_to_string(&a).unwrap(), "new a");
        assert_eq!(fs::read_to_string(&b).unwrap(), "new b");
        assert_eq!(names(dir.path()), ["a.txt", "sub"]);
        #[cfg(unix)]
        {
            use std::os::unix::fs::PermissionsExt;
            assert_eq!(fs::metadata(&a).unwrap().permissions().mode() & 0o777, 0o600);
        }
    }

    #[test]
    fn folders_made_for_a_failed_run_are_removed() {
        let dir = tempfile::tempdir().unwrap();
        let b = dir.path().join("x/y/b.txt");
        let mut o = Outputs::new();
        let r = o.stage(&b, |_| Err(io::Error::other("no")));
        assert!(r.is_err());
        drop(o);
        assert!(names(dir.path()).is_empty());
    }

    #[test]
    fn an_input_is_never_an_output_by_any_path() {
        let dir = tempfile::tempdir().unwrap();
        let input = dir.path().join("in.csv");
        fs::write(&input, "data").unwrap();
        let hard = dir.path().join("hard.csv");
        fs::hard_link(&input, &hard).unwrap();
        let mut o = Outputs::new();
        o.input(&input);
        let dotted = dir.path().join(".").join("in.csv");
        for p in [&input, &hard, &dotted] {
            assert!(
                matches!(o.claim(p), Err(OutputError::SameAsInput { .. })),
                "{}",
                p.display()
            );
        }
        #[cfg(unix)]
        {
            let link = dir.path().join("link.csv");
            std::os::unix::fs::symlink(&input, &link).unwrap();
            assert!(matches!(o.claim(&link), Err(OutputError::SameAsInput { .. })));
        }
        assert_eq!(fs::read_to_string(&input).unwrap(), "data");
    }

    #[test]
    fn only_regular_files_are_replaced() {
        let dir = tempfile::tempdir().unwrap();
        let mut o = Outputs::new();
        assert!(matches!(
            o.claim(dir.path()),
            Err(OutputError::NotRegular { kind: "a folder", .. })
        ));
        #[cfg(unix)]
        {
            assert!(matches!(
                o.claim(Path::new("/dev/null")),
                Err(OutputError::NotRegular {
                    kind: "a character device",
                    ..
                })
            ));
            let dangling = dir.path().join("dangling");
            std::os::unix::fs::symlink(dir.path().join("nothing"), &dangling).unwrap();
            assert!(matches!(o.claim(&dangling), Err(OutputError::DanglingLink { .. })));
        }
    }

    #[test]
    #[cfg(unix)]
    fn a_link_to_a_file_is_followed_and_kept() {
        let dir = tempfile::tempdir().unwrap();
        let real = dir.path().join("real.txt");
        let link = dir.path().join("link.txt");
        fs::write(&real, "old").unwrap();
        std::os::unix::fs::symlink(&real, &link).unwrap();
        let mut o = Outputs::new();
        o.stage_bytes(&link, b"new").unwrap();
        o.commit().unwrap();
        assert!(fs::symlink_metadata(&link).unwrap().file_type().is_symlink());
        assert_eq!(fs::read_to_string(&real).unwrap(), "new");
    }

    #[test]
    fn the_same_output_twice_is_refused() {
        let dir = tempfile::tempdir().unwrap();
        let a = dir.path().join("a.svg");
        let mut o = Outputs::new();
        o.claim(&a).unwrap();
        let again = dir.path().join(".").join("a.svg");
        assert!(matches!(o.claim(&again), Err(OutputError::Twice { .. })));
    }
}
