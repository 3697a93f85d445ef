//! Determinism: the same inputs give byte-identical output folders on a rerun and with one or several worker
//! threads (RAYON_NUM_THREADS=1 vs 2; `--threads 1` vs `2` for sweeps): `simulate` (with charts and page),
//! `table --no-date`, `demo`, and a sweep with per-case histories. (tests/sweep.rs checks the sweep summary
//! across thread counts and shards as well.)

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::process::Command;

mod common;
use common::BIN;

fn temp_dir(tag: &str) -> PathBuf {
    common::scratch("determinism", tag)
}

/// Every file under `dir` by relative path, with its bytes.
fn tree(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    fn walk(base: &Path, dir: &Path, out: &mut BTreeMap<String, Vec<u8>>) {
        for e in std::fs::read_dir(dir).unwrap() {
            let p = e.unwrap().path();
            if p.is_dir() {
                walk(base, &p, out);
            } else {
                out.insert(p.strip_prefix(base).unwrap().display().to_string(), std::fs::read(&p).unwrap());
            }
        }
    }
    let mut out = BTreeMap::new();
    walk(dir, dir, &mut out);
    out
}

/// Run `dropcut args... <out>` in `dir` with the given RAYON_NUM_THREADS; returns the output tree.
fn run(dir: &Path, threads: &str, args: &[&str], out: &str) -> BTreeMap<String, Vec<u8>> {
    let o = Command::new(BIN).args(args).arg(out).current_dir(dir).env("RAYON_NUM_THREADS", threads).env_remove("SOURCE_DATE_EPOCH").output().unwrap();
    assert!(o.status.success(), "dropcut {args:?}: {}", String::from_utf8_lossy(&o.stderr));
    tree(&dir.join(out))
}

fn assert_same(a: &BTreeMap<String, Vec<u8>>, b: &BTreeMap<String, Vec<u8>>, what: &str) {
    assert!(!a.is_empty(), "{what}: no files");
    assert_eq!(a.keys().collect::<Vec<_>>(), b.keys().collect::<Vec<_>>(), "{what}: different file lists");
    for (name, bytes) in a {
        assert!(bytes == &b[name], "{what}: {name} differs");
    }
}

/// Three runs of one command: twice with one thread, once with two; all byte-identical.
fn check(tag: &str, args: &[&str]) {
    let dir = temp_dir(tag);
    let first = run(&dir, "1", args, "a");
    let again = run(&dir, "1", args, "b");
    let two = run(&dir, "2", args, "c");
    assert_same(&first, &again, &format!("{tag}: rerun"));
    assert_same(&first, &two, &format!("{tag}: 1 vs 2 threads"));
    let _ = std::fs::remove_dir_all(dir);
}

#[test]
fn simulate_is_byte_identical() {
    check("simulate", &["simulate", "demo-blend", "--diameter", "30um", "--pressure", "5bar", "--out"]);
}

#[test]
fn simulate_resolved_liquid_is_byte_identical() {
    check("resolved", &["simulate", "demo-narrow", "--diameter", "30um", "--liquid-mixing", "diffusion", "--liquid-heat", "conduction", "--no-plots", "--out"]);
}

#[test]
fn table_no_date_is_byte_identical() {
    check("table", &["table", "demo-narrow", "--no-date", "--residue", "0,0.5", "--out"]);
}

#[test]
fn demo_is_byte_identical() {
    check("demo", &["demo", "--out"]);
}

#[test]
fn sweep_with_histories_is_byte_identical_across_threads() {
    let dir = temp_dir("sweep");
    std::fs::write(
        dir.join("spec.toml"),
        "fuels = [\"n-decane\", \"demo-narrow\"]\n[conditions]\ndiameter = [\"5um\", \"10um\"]\nambient-temperature = [\"600K\", \"900K\"]\nmax-time = \"50ms\"\n[output]\nhistories = true\n",
    )
    .unwrap();
    let one = run(&dir, "1", &["sweep", "spec.toml", "--threads", "1", "--out"], "a");
    let two = run(&dir, "2", &["sweep", "spec.toml", "--threads", "2", "--out"], "b");
    assert!(one.keys().any(|k| k.ends_with("history.csv")));
    assert_same(&one, &two, "sweep --threads 1 vs 2");
    let _ = std::fs::remove_dir_all(dir);
}
