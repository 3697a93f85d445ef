//! The layers of DEVELOPERS.md depend in one direction only: a module never imports one listed after it
//! (units → data → props → fuel → model → post → table → uncertainty → output → sweep → checks → cli).
//! Reads the sources as text; comments and `#[cfg(test)]` modules are skipped.

use std::path::{Path, PathBuf};

const ORDER: [&str; 12] = ["units", "data", "props", "fuel", "model", "post", "table", "uncertainty", "output", "sweep", "checks", "cli"];

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.push(path);
        }
    }
}

#[test]
fn no_layer_imports_a_higher_one() {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut offences = vec![];
    for (rank, layer) in ORDER.iter().enumerate() {
        let mut files = vec![];
        let dir = src.join(layer);
        if dir.is_dir() {
            rust_files(&dir, &mut files);
        }
        let single = src.join(format!("{layer}.rs"));
        if single.is_file() {
            files.push(single);
        }
        assert!(!files.is_empty(), "layer {layer} has no sources");
        for file in files {
            let text = std::fs::read_to_string(&file).unwrap();
            let body = text.split("#[cfg(test)]").next().unwrap_or("");
            for (no, line) in body.lines().enumerate() {
                let code = line.split("//").next().unwrap_or("");
                for (higher_rank, higher) in ORDER.iter().enumerate().skip(rank + 1) {
                    if code.contains(&format!("crate::{higher}::")) || code.contains(&format!("crate::{higher}::{{")) || code.contains(&format!("crate::{higher};")) {
                        offences.push(format!("{}:{}: {layer} imports {higher} (rank {higher_rank})", file.display(), no + 1));
                    }
                }
            }
        }
    }
    assert!(offences.is_empty(), "upward imports:\n{}", offences.join("\n"));
}
