//! Writing result files: atomically, so a reader never sees half a file.
//!
//! Every output synodic writes goes through [`write_atomic`]: the bytes go
//! to a temporary file in the destination's folder, are flushed to disk,
//! and the temporary file is renamed over the destination. A failure at
//! any step leaves the destination as it was (absent or the old complete
//! file) and removes the temporary file.

mod dates;
mod grid_csv;
mod windows_csv;

pub use dates::{file_date, stamp, Stamp, JD_DECIMALS};
pub use grid_csv::{grid_csv, read_grid_csv, GRID_COLUMNS};
pub use windows_csv::{launch_period_csv, windows_csv, WindowRecord, WINDOW_COLUMNS};

use std::io::Write;
use std::path::{Path, PathBuf};

/// Why an output file could not be written.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum ExportError {
    /// An I/O failure, with the file it concerned.
    #[error("cannot write {}: {source}", path.display())]
    Io {
        /// The destination (or its folder) that failed.
        path: PathBuf,
        /// The underlying error.
        #[source]
        source: std::io::Error,
    },
    /// A file read back (e.g. `grid.csv`) is malformed.
    #[error("{}:{line}: {message}", path.display())]
    Parse {
        /// The file.
        path: PathBuf,
        /// 1-based line.
        line: usize,
        /// What is wrong.
        message: String,
    },
    /// Formatting the content failed (CSV or JSON encoder).
    #[error("cannot encode {}: {message}", path.display())]
    Encode {
        /// The destination.
        path: PathBuf,
        /// What the encoder said.
        message: String,
    },
}

/// Write `bytes` to `path` atomically (temporary file, then rename).
///
/// # Errors
/// [`ExportError::Io`] naming `path` when the folder is missing or
/// read-only, the disk is full, or the rename fails.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), ExportError> {
    let io_err = |source| ExportError::Io {
        path: path.to_path_buf(),
        source,
    };
    let dir = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "output".to_string());
    let tmp = dir.join(format!(".{name}.tmp-{}", std::process::id()));
    let result = (|| {
        let mut file = std::fs::File::create(&tmp)?;
        file.write_all(bytes)?;
        file.sync_all()?;
        drop(file);
        std::fs::rename(&tmp, path)
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(io_err(e));
    }
    Ok(())
}

/// Create `dir` and its parents if needed.
///
/// # Errors
/// [`ExportError::Io`] naming the folder.
pub fn ensure_dir(dir: &Path) -> Result<(), ExportError> {
    std::fs::create_dir_all(dir).map_err(|source| ExportError::Io {
        path: dir.to_path_buf(),
        source,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch(name: &str) -> PathBuf {
        let dir =
            std::env::temp_dir().join(format!("synodic-export-{name}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).expect("temp dir");
        dir
    }

    #[test]
    fn writes_and_replaces_whole_files() {
        let dir = scratch("replace");
        let path = dir.join("a.csv");
        write_atomic(&path, b"one\n").expect("first write");
        write_atomic(&path, b"two\n").expect("second write");
        assert_eq!(std::fs::read(&path).expect("read"), b"two\n");
        let leftovers: Vec<_> = std::fs::read_dir(&dir)
            .expect("list")
            .filter_map(|e| e.ok())
            .filter(|e| e.file_name().to_string_lossy().contains(".tmp-"))
            .collect();
        assert!(leftovers.is_empty());
        let _ = std::fs::remove_dir_all(&dir);
    }

    #[test]
    fn missing_folder_is_an_error_naming_the_path() {
        let dir = scratch("missing");
        let path = dir.join("no-such-folder").join("a.csv");
        let err = write_atomic(&path, b"x").expect_err("must fail");
        assert!(err.to_string().contains("no-such-folder"), "{err}");
        let _ = std::fs::remove_dir_all(&dir);
    }
}
