//! The layers of DEVELOPERS.md depend in one direction only: a module never imports one listed after it
//! (numerics → units → data → props → fuel → model → post → table → uncertainty → output → sweep → checks → cli).
//! Reads the whole of every source file as text; comments and the bodies of `#[cfg(test)]` modules are
//! skipped (code after a test module is still read).

use std::path::{Path, PathBuf};

const ORDER: [&str; 13] = ["numerics", "units", "data", "props", "fuel", "model", "post", "table", "uncertainty", "output", "sweep", "checks", "cli"];

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

/// The lines of `text` that are not inside a `#[cfg(test)] mod … { … }` block, with their 1-based numbers.
fn non_test_lines(text: &str) -> Vec<(usize, &str)> {
    let mut out = vec![];
    let mut lines = text.lines().enumerate().peekable();
    while let Some((no, line)) = lines.next() {
        if line.trim() == "#[cfg(test)]" {
            // skip attributes and blank lines up to the item; a test module's body is skipped by brace counting
            while let Some((_, next)) = lines.peek() {
                if next.trim().is_empty() || next.trim_start().starts_with("#[") {
                    lines.next();
                } else {
                    break;
                }
            }
            let is_module = lines.peek().is_some_and(|(_, l)| {
                let t = l.trim_start();
                (t.starts_with("mod ") || t.starts_with("pub mod ") || t.starts_with("pub(crate) mod ")) && t.trim_end().ends_with('{')
            });
            if is_module {
                let mut depth = 0i64;
                for (_, body) in lines.by_ref() {
                    let code = body.split("//").next().unwrap_or("");
                    depth += code.matches('{').count() as i64 - code.matches('}').count() as i64;
                    if depth <= 0 {
                        break;
                    }
                }
            }
            continue;
        }
        out.push((no + 1, line));
    }
    out
}

/// Upward imports of layer `rank` in `text` (one message per offending line).
fn upward_imports(text: &str, rank: usize, name: &str) -> Vec<String> {
    let layer = ORDER[rank];
    let mut offences = vec![];
    for (no, line) in non_test_lines(text) {
        let code = line.split("//").next().unwrap_or("");
        for (higher_rank, higher) in ORDER.iter().enumerate().skip(rank + 1) {
            if code.contains(&format!("crate::{higher}::")) || code.contains(&format!("crate::{higher};")) {
                offences.push(format!("{name}:{no}: {layer} imports {higher} (rank {higher_rank})"));
            }
        }
    }
    offences
}

#[test]
fn the_scan_reads_past_test_modules() {
    let text = "use crate::units::Quantity;\n#[cfg(test)]\nmod tests {\n    use crate::cli::run;\n    fn f() { if true { } }\n}\nuse crate::cli::run;\n";
    let found = upward_imports(text, 3, "x.rs");
    assert_eq!(found, vec!["x.rs:7: props imports cli (rank 12)".to_string()], "{found:?}");
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
            offences.extend(upward_imports(&text, rank, &file.display().to_string()));
        }
    }
    assert!(offences.is_empty(), "upward imports:\n{}", offences.join("\n"));
}
