//! The layers of DEVELOPERS.md depend in one direction only: a module never imports one listed after it
//! (numerics → units → data → props → fuel → model → conditions → post → table → uncertainty → output → sweep → checks
//! → cli), and no two files of `src/cli/` import each other (shared helpers live in `cli/common.rs`).
//! Reads the whole of every source file as text; comments and the bodies of `#[cfg(test)]` modules are
//! skipped (code after a test module is still read).

use std::path::{Path, PathBuf};

const ORDER: [&str; 14] = ["numerics", "units", "data", "props", "fuel", "model", "conditions", "post", "table", "uncertainty", "output", "sweep", "checks", "cli"];

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
    assert_eq!(found, vec!["x.rs:7: props imports cli (rank 13)".to_string()], "{found:?}");
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

/// The sibling modules of `src/cli/` that `text` (a file of that folder) names through `super::NAME`.
fn cli_siblings(text: &str, siblings: &[String]) -> Vec<String> {
    let mut found = vec![];
    for (_, line) in non_test_lines(text) {
        let code = line.split("//").next().unwrap_or("");
        let mut rest = code;
        while let Some(at) = rest.find("super::") {
            rest = &rest[at + "super::".len()..];
            let names: Vec<&str> = if let Some(group) = rest.strip_prefix('{') {
                group.split('}').next().unwrap_or("").split(',').map(|n| n.trim().split("::").next().unwrap_or("").trim()).collect()
            } else {
                vec![rest.split(|c: char| !(c.is_alphanumeric() || c == '_')).next().unwrap_or("")]
            };
            for n in names {
                if siblings.iter().any(|s| s == n) && !found.iter().any(|f: &String| f == n) {
                    found.push(n.to_string());
                }
            }
        }
    }
    found
}

#[test]
fn the_cli_sibling_scan_sees_groups_and_paths() {
    let siblings: Vec<String> = ["args", "common", "plot"].iter().map(|s| s.to_string()).collect();
    let text = "use super::common::{notice};\nuse super::{args, CliError};\nfn f() { super::plot::draw(); }\n#[cfg(test)]\nmod tests {\n    use super::super::args::Cli;\n}\n";
    assert_eq!(cli_siblings(text, &siblings), ["common", "args", "plot"]);
}

#[test]
fn no_two_cli_files_import_each_other() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("src").join("cli");
    let mut files = vec![];
    rust_files(&dir, &mut files);
    let name = |p: &Path| p.file_stem().unwrap().to_string_lossy().into_owned();
    let siblings: Vec<String> = files.iter().map(|p| name(p)).filter(|n| n != "mod").collect();
    let mut edges: Vec<(String, Vec<String>)> = vec![];
    for f in &files {
        if name(f) == "mod" {
            continue;
        }
        let text = std::fs::read_to_string(f).unwrap();
        edges.push((name(f), cli_siblings(&text, &siblings).into_iter().filter(|s| *s != name(f)).collect()));
    }
    // any cycle (not only pairs): depth-first search over the import graph
    fn visit(node: &str, edges: &[(String, Vec<String>)], path: &mut Vec<String>, done: &mut Vec<String>, cycles: &mut Vec<String>) {
        if let Some(at) = path.iter().position(|p| p == node) {
            cycles.push(format!("{} -> {node}", path[at..].join(" -> ")));
            return;
        }
        if done.iter().any(|d| d == node) {
            return;
        }
        path.push(node.to_string());
        for next in edges.iter().find(|(n, _)| n == node).map(|(_, e)| e.clone()).unwrap_or_default() {
            visit(&next, edges, path, done, cycles);
        }
        path.pop();
        done.push(node.to_string());
    }
    let mut cycles = vec![];
    let mut done = vec![];
    for (n, _) in &edges {
        visit(n, &edges, &mut vec![], &mut done, &mut cycles);
    }
    assert!(cycles.is_empty(), "src/cli files import each other: {cycles:?}");
}

/// Smaller rooms: no source file over 800 lines (tests and generated data tables live outside `src/` or are
/// named here).
#[test]
fn no_source_file_is_over_800_lines() {
    let mut files = vec![];
    rust_files(Path::new(concat!(env!("CARGO_MANIFEST_DIR"), "/src")), &mut files);
    let long: Vec<String> = files
        .iter()
        .filter_map(|f| {
            let n = std::fs::read_to_string(f).unwrap().lines().count();
            (n > 800).then(|| format!("{} ({n} lines)", f.display()))
        })
        .collect();
    assert!(long.is_empty(), "split these files: {long:?}");
}
