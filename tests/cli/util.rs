//! A fresh temp folder per test and a command for the built binary.

use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

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

impl Dir {
    /// Run `synodic` with `args`, stdout discarded and stderr captured
    /// through a file (so a chatty child never blocks on a full pipe), and
    /// kill it if it has not finished after `limit`. Returns the run and
    /// the time it took; a killed run has code -1.
    pub fn run_bounded(&self, args: &[&str], limit: Duration) -> (Run, Duration) {
        let err_path = self.join(".stderr-capture");
        let err_file = std::fs::File::create(&err_path).expect("stderr file");
        let start = Instant::now();
        let mut child = Command::new(env!("CARGO_BIN_EXE_synodic"))
            .args(args)
            .current_dir(&self.path)
            .stdin(Stdio::null())
            .stdout(Stdio::null())
            .stderr(err_file)
            .spawn()
            .expect("spawn synodic");
        let status = loop {
            if let Some(status) = child.try_wait().expect("wait") {
                break Some(status);
            }
            if start.elapsed() > limit {
                let _ = child.kill();
                let _ = child.wait();
                break None;
            }
            std::thread::sleep(Duration::from_millis(2));
        };
        let took = start.elapsed();
        let stderr = std::fs::read_to_string(&err_path).unwrap_or_default();
        let _ = std::fs::remove_file(&err_path);
        let run = Run {
            code: status.and_then(|s| s.code()).unwrap_or(-1),
            stdout: String::new(),
            stderr,
        };
        (run, took)
    }
}

/// `text` with the first `from` replaced by `to`; panics if `from` is not
/// there, so a test never silently checks an unmodified file.
pub fn edit(text: &str, from: &str, to: &str) -> String {
    assert!(text.contains(from), "{from:?} not in the text");
    text.replacen(from, to, 1)
}

/// The 1-based line of the first occurrence of `needle` in `text`.
pub fn line_of(text: &str, needle: &str) -> usize {
    let at = text
        .find(needle)
        .unwrap_or_else(|| panic!("{needle:?} not in text"));
    text[..at].matches('\n').count() + 1
}

/// Every file below `dir`, as paths relative to it, sorted.
pub fn tree(dir: &Path) -> Vec<String> {
    fn walk(root: &Path, dir: &Path, out: &mut Vec<String>) {
        for e in std::fs::read_dir(dir).into_iter().flatten().flatten() {
            let p = e.path();
            if p.is_dir() {
                walk(root, &p, out);
            } else {
                let rel = p.strip_prefix(root).unwrap_or(&p);
                out.push(rel.to_string_lossy().into_owned());
            }
        }
    }
    let mut out = Vec::new();
    walk(dir, dir, &mut out);
    out.sort();
    out
}

/// Assert no temporary (half-written) output file is left anywhere below
/// `dir`: atomic writes go through `.NAME.tmp-PID` files.
pub fn assert_no_temp_files(dir: &Path) {
    let left: Vec<String> = tree(dir)
        .into_iter()
        .filter(|p| p.contains(".tmp-"))
        .collect();
    assert!(left.is_empty(), "temporary files left behind: {left:?}");
}
