//! A fresh temp folder per test and a command for the built binary.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};
use std::sync::atomic::{AtomicUsize, Ordering};

static NEXT: AtomicUsize = AtomicUsize::new(0);

/// A temporary folder removed when dropped.
pub struct Dir {
    pub path: PathBuf,
}

impl Dir {
    pub fn new(name: &str) -> Dir {
        let n = NEXT.fetch_add(1, Ordering::SeqCst);
        let path =
            std::env::temp_dir().join(format!("synodic-cli-{name}-{}-{n}", std::process::id()));
        let _ = std::fs::remove_dir_all(&path);
        std::fs::create_dir_all(&path).expect("create temp dir");
        Dir { path }
    }

    pub fn join(&self, p: &str) -> PathBuf {
        self.path.join(p)
    }

    pub fn write(&self, name: &str, text: &str) -> PathBuf {
        let p = self.join(name);
        std::fs::write(&p, text).expect("write test file");
        p
    }

    /// Run `synodic` with `args` inside this folder.
    pub fn run(&self, args: &[&str]) -> Run {
        let out = Command::new(env!("CARGO_BIN_EXE_synodic"))
            .args(args)
            .current_dir(&self.path)
            .output()
            .expect("run synodic");
        Run::from(out)
    }

    /// Names of the files in a sub-folder (or this folder), sorted.
    pub fn files(&self, sub: &str) -> Vec<String> {
        let dir = if sub.is_empty() {
            self.path.clone()
        } else {
            self.join(sub)
        };
        list(&dir)
    }
}

pub fn list(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .map(|rd| {
            rd.filter_map(|e| e.ok())
                .map(|e| e.file_name().to_string_lossy().into_owned())
                .collect()
        })
        .unwrap_or_default();
    v.sort();
    v
}

impl Drop for Dir {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.path);
    }
}

/// What a run printed and how it exited.
pub struct Run {
    pub code: i32,
    pub stdout: String,
    pub stderr: String,
}

impl From<Output> for Run {
    fn from(o: Output) -> Run {
        Run {
            // A signal (no code) is reported as -1, never mistaken for 0.
            code: o.status.code().unwrap_or(-1),
            stdout: String::from_utf8_lossy(&o.stdout).into_owned(),
            stderr: String::from_utf8_lossy(&o.stderr).into_owned(),
        }
    }
}

impl Run {
    /// Assert a zero exit, showing both streams otherwise.
    pub fn ok(self) -> Run {
        assert_eq!(
            self.code, 0,
            "expected success\n--- stdout\n{}\n--- stderr\n{}",
            self.stdout, self.stderr
        );
        self
    }

    /// Assert exit code 2 (bad input) and that stderr mentions each of
    /// `needles`. A panic (101) is always a failure.
    pub fn bad_input(self, needles: &[&str]) -> Run {
        assert_ne!(self.code, 101, "panicked:\n{}", self.stderr);
        assert_eq!(
            self.code, 2,
            "expected exit 2\n--- stdout\n{}\n--- stderr\n{}",
            self.stdout, self.stderr
        );
        for n in needles {
            assert!(
                self.stderr.contains(n),
                "stderr should mention {n:?}\n--- stderr\n{}",
                self.stderr
            );
        }
        self
    }
}
