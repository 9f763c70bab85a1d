//! Atomic file replacement: the target is either its old self or the whole new content.
//!
//! The bytes go to a new temporary file in the target's folder (same file system, so the final
//! `rename` is atomic on POSIX, rename(2); on Windows `std::fs::rename` replaces the target in
//! one step as well), the file is flushed to disk (`fsync`), renamed over the target, and on
//! Unix the folder is flushed too so the rename itself survives a power cut. On any error the
//! temporary file is removed and the target is untouched. The new file gets default permissions.

use std::fs::{self, File, OpenOptions};
use std::io::{self, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// How many temporary names to try before giving up (each is unique to this process and call,
/// so a clash means a stale file from an earlier crashed run with the same process id).
const NAME_ATTEMPTS: u32 = 16;

static COUNTER: AtomicU64 = AtomicU64::new(0);

/// Write `bytes` to `path` atomically (see the module docs).
pub fn write_atomic(path: &Path, bytes: &[u8]) -> io::Result<()> {
    let name = path.file_name().ok_or_else(|| {
        io::Error::new(
            io::ErrorKind::InvalidInput,
            format!("{} does not name a file", path.display()),
        )
    })?;
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    };
    let (tmp, file) = create_temp(dir, &name.to_string_lossy())?;
    let result = fill_and_rename(file, bytes, &tmp, path, dir);
    if result.is_err() {
        // The temporary file may already be gone (renamed); either way nothing is left behind.
        let _ = fs::remove_file(&tmp);
    }
    result
}

/// A new, empty temporary file next to the target: `.<name>.<pid>.<n>.tmp`.
fn create_temp(dir: &Path, name: &str) -> io::Result<(PathBuf, File)> {
    let mut last = None;
    for _ in 0..NAME_ATTEMPTS {
        let n = COUNTER.fetch_add(1, Ordering::Relaxed);
        let tmp = dir.join(format!(".{name}.{}.{n}.tmp", std::process::id()));
        match OpenOptions::new().write(true).create_new(true).open(&tmp) {
            Ok(f) => return Ok((tmp, f)),
            Err(e) if e.kind() == io::ErrorKind::AlreadyExists => last = Some(e),
            Err(e) => return Err(e),
        }
    }
    Err(last.unwrap_or_else(|| io::Error::other("no temporary file name available")))
}

fn fill_and_rename(
    mut file: File,
    bytes: &[u8],
    tmp: &Path,
    path: &Path,
    dir: &Path,
) -> io::Result<()> {
    file.write_all(bytes)?;
    file.sync_all()?;
    drop(file);
    fs::rename(tmp, path)?;
    sync_dir(dir)
}

#[cfg(unix)]
fn sync_dir(dir: &Path) -> io::Result<()> {
    File::open(dir)?.sync_all()
}

#[cfg(not(unix))]
fn sync_dir(_dir: &Path) -> io::Result<()> {
    Ok(())
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
    fn target_is_replaced_whole_and_no_temp_file_is_left() {
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("out.svg");
        let long = vec![b'x'; 100_000];
        write_atomic(&target, &long).unwrap();
        assert_eq!(fs::read(&target).unwrap(), long);
        // A shorter file replaces the longer one entirely: no tail of the old content survives.
        write_atomic(&target, b"short").unwrap();
        assert_eq!(fs::read(&target).unwrap(), b"short");
        assert_eq!(names(dir.path()), vec!["out.svg".to_string()]);
    }

    #[test]
    fn missing_folder_is_an_error_and_creates_nothing() {
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("no-such-folder").join("out.nc");
        let e = write_atomic(&target, b"G0 X0").unwrap_err();
        assert_eq!(e.kind(), io::ErrorKind::NotFound);
        assert!(names(dir.path()).is_empty());
    }

    #[test]
    fn failed_rename_removes_the_temp_file_and_keeps_the_target() {
        // Renaming a file over a non-empty folder fails (rename(2): EISDIR / ENOTEMPTY).
        let dir = tempfile::tempdir().unwrap();
        let target = dir.path().join("busy");
        fs::create_dir(&target).unwrap();
        fs::write(target.join("keep"), b"old").unwrap();
        assert!(write_atomic(&target, b"new").is_err());
        assert_eq!(names(dir.path()), vec!["busy".to_string()]);
        assert_eq!(fs::read(target.join("keep")).unwrap(), b"old");
    }

    #[test]
    fn a_path_without_a_file_name_is_refused() {
        let e = write_atomic(Path::new("/"), b"x").unwrap_err();
        assert_eq!(e.kind(), io::ErrorKind::InvalidInput);
    }
}
