//! Helpers shared by the integration tests that run the built binary (`mod common;` in each test file).
#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// The dropcut binary built for these tests.
pub const BIN: &str = env!("CARGO_BIN_EXE_dropcut");

/// A fresh, empty folder `<group>/<name>` under the tests' scratch area of the target directory.
pub fn scratch(group: &str, name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_TARGET_TMPDIR")).join(group).join(name);
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Run the binary with `args`.
pub fn run(args: &[&str]) -> Output {
    Command::new(BIN).args(args).output().expect("run dropcut")
}

/// Run the binary, require success, return stdout.
pub fn ok(args: &[&str]) -> String {
    let out = run(args);
    assert!(out.status.success(), "dropcut {args:?} failed: {}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8(out.stdout).unwrap()
}

/// A path as a command-line argument.
pub fn p(path: &Path) -> &str {
    path.to_str().unwrap()
}

/// Run the binary in folder `dir` with `args`, outside any Slurm job (the array variables removed).
pub fn run_in(dir: &Path, args: &[&str]) -> Output {
    Command::new(BIN)
        .args(args)
        .current_dir(dir)
        .env_remove("SLURM_ARRAY_TASK_ID")
        .env_remove("SLURM_ARRAY_TASK_COUNT")
        .env_remove("SLURM_ARRAY_TASK_MIN")
        .output()
        .unwrap()
}

/// [`run_in`], requiring success.
pub fn ok_in(dir: &Path, args: &[&str]) -> Output {
    let out = run_in(dir, args);
    assert!(out.status.success(), "dropcut {args:?} failed: {}", String::from_utf8_lossy(&out.stderr));
    out
}
