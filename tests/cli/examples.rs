//! The committed example studies reproduce their committed outputs byte
//! for byte.

use std::path::Path;

use crate::util::{list, Dir};

fn copy_dir(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).expect("mkdir");
    for name in list(from) {
        let src = from.join(&name);
        if src.is_dir() {
            continue;
        }
        std::fs::copy(&src, to.join(&name)).expect("copy");
    }
}

fn reproduces(example: &str) {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples")
        .join(example);
    let d = Dir::new(example);
    copy_dir(&root, &d.path);
    d.run(&["run", "study.toml", "--quiet"]).ok();
    let committed = root.join("out");
    let fresh = d.join("out");
    let names: Vec<String> = list(&committed)
        .into_iter()
        .filter(|n| n != "run-info.json")
        .collect();
    assert!(names.len() >= 6, "{names:?}");
    for name in &names {
        let a = std::fs::read(committed.join(name)).expect("committed file");
        let b = std::fs::read(fresh.join(name)).unwrap_or_default();
        assert!(a == b, "{example}/out/{name} differs from a fresh run");
    }
    // And the resolved copy repeats in place.
    d.run(&["run", "out/study.toml", "--quiet"]).ok();
    for name in &names {
        let a = std::fs::read(committed.join(name)).expect("committed file");
        let b = std::fs::read(fresh.join(name)).unwrap_or_default();
        assert!(
            a == b,
            "{example}/out/{name} differs after repeating out/study.toml"
        );
    }
}

#[test]
fn cargo_runs_reproduces() {
    reproduces("cargo-runs");
}

#[test]
fn iskra_rendezvous_reproduces() {
    reproduces("iskra-rendezvous");
}

#[test]
fn moon_tour_reproduces() {
    reproduces("moon-tour");
}
