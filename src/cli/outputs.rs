//! Output files: refuse to overwrite an input or to write two outputs to one path, then write
//! each atomically (`write::atomic`) only after all of them are ready, so an error never leaves
//! a partial set.

use std::path::{Path, PathBuf};

use super::CliError;
use crate::write::atomic::write_atomic;

/// A path made absolute and resolved as far as it exists (the file itself may not yet).
fn resolved(p: &Path) -> PathBuf {
    if let Ok(c) = p.canonicalize() {
        return c;
    }
    let parent = p
        .parent()
        .filter(|q| !q.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    match (parent.canonicalize(), p.file_name()) {
        (Ok(dir), Some(name)) => dir.join(name),
        _ => p.to_path_buf(),
    }
}

/// Files to write, checked against the inputs and each other.
#[derive(Default)]
pub struct Outputs {
    files: Vec<(PathBuf, Vec<u8>)>,
}

impl Outputs {
    pub fn check(inputs: &[PathBuf], outputs: &[&Path]) -> Result<(), CliError> {
        let ins: Vec<PathBuf> = inputs.iter().map(|p| resolved(p)).collect();
        let mut seen: Vec<PathBuf> = Vec::new();
        for o in outputs {
            let r = resolved(o);
            if ins.contains(&r) {
                return Err(CliError::usage(format!(
                    "{}: refusing to write an output over an input file",
                    o.display()
                )));
            }
            if seen.contains(&r) {
                return Err(CliError::usage(format!(
                    "{}: named for two outputs",
                    o.display()
                )));
            }
            seen.push(r);
        }
        Ok(())
    }

    pub fn add(&mut self, path: &Path, bytes: Vec<u8>) {
        self.files.push((path.to_path_buf(), bytes));
    }

    /// Write every file atomically, after checking that every folder to write into exists, so
    /// that a missing folder fails the job before any output is replaced.
    pub fn write(self) -> Result<(), CliError> {
        for (p, _) in &self.files {
            let dir = p
                .parent()
                .filter(|d| !d.as_os_str().is_empty())
                .unwrap_or(Path::new("."));
            if !dir.is_dir() {
                return Err(CliError::input(format!(
                    "{}: cannot write: the folder {} does not exist; nothing was written",
                    p.display(),
                    dir.display()
                )));
            }
        }
        for (p, bytes) in &self.files {
            write_atomic(p, bytes)
                .map_err(|e| CliError::input(format!("{}: cannot write: {e}", p.display())))?;
        }
        Ok(())
    }
}
