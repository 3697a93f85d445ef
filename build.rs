//! Embeds every TOML file of `mixtures/` (components, gases, sources, fuels) into the binary.
use std::fs;
use std::io::Write;
use std::path::Path;

fn collect(dir: &Path, out: &mut Vec<String>) {
    let Ok(entries) = fs::read_dir(dir) else { return };
    let mut paths: Vec<_> = entries.filter_map(|e| e.ok()).map(|e| e.path()).collect();
    paths.sort();
    for p in paths {
        if p.is_dir() {
            collect(&p, out);
        } else if p.extension().and_then(|e| e.to_str()) == Some("toml") {
            out.push(p.to_string_lossy().into_owned());
        }
    }
}

fn main() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("mixtures");
    println!("cargo:rerun-if-changed=mixtures");
    let mut files = Vec::new();
    collect(&root, &mut files);
    let out_dir = std::env::var("OUT_DIR").unwrap();
    let mut f = fs::File::create(Path::new(&out_dir).join("embedded.rs")).unwrap();
    writeln!(f, "/// Every embedded data file: (path relative to mixtures/, contents).").unwrap();
    writeln!(f, "pub static EMBEDDED_FILES: &[(&str, &str)] = &[").unwrap();
    for p in &files {
        let rel = Path::new(p).strip_prefix(&root).unwrap().to_string_lossy().replace('\\', "/");
        writeln!(f, "    ({:?}, include_str!({:?})),", rel, p).unwrap();
    }
    writeln!(f, "];").unwrap();
}
