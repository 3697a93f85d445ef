//! Charts, pages, `plot` and `compare`, through the built binary in temporary folders.

use std::path::{Path, PathBuf};

mod common;
use common::{ok, p, run};

fn scratch(name: &str) -> PathBuf {
    common::scratch("charts", name)
}

/// A small, fast run: two components, 10 µm.
fn small_run(dir: &Path, fuel: &str) {
    ok(&["simulate", fuel, "--diameter", "10um", "--out", p(dir)]);
}

/// Check PNG magic bytes and the IHDR size; returns (width, height).
fn check_png(path: &Path) -> (u32, u32) {
    let b = std::fs::read(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    assert_eq!(&b[..8], b"\x89PNG\r\n\x1a\n", "{} is not a PNG", path.display());
    assert_eq!(&b[12..16], b"IHDR");
    let w = u32::from_be_bytes(b[16..20].try_into().unwrap());
    let h = u32::from_be_bytes(b[20..24].try_into().unwrap());
    assert!(w >= 600 && h >= 400, "{}: {w}x{h}", path.display());
    (w, h)
}

/// Elements open and close in order (a small XML well-formedness check: tags, self-closing tags, no stray `<`).
fn assert_balanced(text: &str, void: &[&str], what: &str) {
    let mut stack: Vec<String> = vec![];
    let mut rest = text;
    while let Some(i) = rest.find('<') {
        let end = rest[i..].find('>').unwrap_or_else(|| panic!("{what}: unclosed '<'")) + i;
        let tag = &rest[i + 1..end];
        rest = &rest[end + 1..];
        if tag.starts_with('!') || tag.starts_with('?') {
            continue;
        }
        let name: String = tag.trim_start_matches('/').chars().take_while(|c| c.is_ascii_alphanumeric()).collect();
        assert!(!name.is_empty(), "{what}: bad tag <{tag}>");
        if let Some(closing) = tag.strip_prefix('/') {
            let open = stack.pop().unwrap_or_else(|| panic!("{what}: </{closing}> without opening"));
            assert_eq!(open, name, "{what}: <{open}> closed by </{name}>");
        } else if !tag.ends_with('/') && !void.contains(&name.as_str()) {
            stack.push(name);
        }
    }
    assert!(stack.is_empty(), "{what}: unclosed {stack:?}");
}

/// Check an SVG is well formed enough (root element, balanced text elements) and contains every expected text.
fn check_svg(path: &Path, expected: &[&str]) -> String {
    let s = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    assert!(s.starts_with("<svg"), "{}", path.display());
    assert!(s.trim_end().ends_with("</svg>"), "{}", path.display());
    assert_balanced(&s, &[], &path.display().to_string());
    assert!(s.matches("<text").count() > 10);
    for e in expected {
        assert!(s.contains(e), "{} lacks '{e}'", path.display());
    }
    s
}

fn check_chart(dir: &Path, stem: &str, expected: &[&str]) {
    check_png(&dir.join(format!("{stem}.png")));
    check_svg(&dir.join(format!("{stem}.svg")), expected);
}

fn check_page(path: &Path, expected: &[&str]) -> String {
    let s = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    assert!(s.starts_with("<!DOCTYPE html>"));
    assert!(!s.contains("http:") && !s.contains("https:") && !s.contains("//"), "{}: external address", path.display());
    assert!(!s.contains("<script"), "{}", path.display());
    assert_balanced(&s, &["meta", "img", "br"], &path.display().to_string());
    for e in expected {
        assert!(s.contains(e), "{} lacks '{e}'", path.display());
    }
    // every image the page shows exists beside it
    for part in s.split("<img src=\"").skip(1) {
        let src = &part[..part.find('"').unwrap()];
        assert!(path.parent().unwrap().join(src).is_file(), "{}: missing {src}", path.display());
    }
    s
}

fn json(path: &Path) -> serde_json::Value {
    serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap()
}

#[test]
fn simulate_draws_every_run_chart_and_a_page() {
    let dir = scratch("simulate");
    small_run(&dir, "test-heptane-decane");
    check_chart(&dir, "chart_d2", &["Normalised droplet size", "(d/d0)²", "t/d0²", "s/mm²", "test-heptane-decane"]);
    check_chart(&dir, "chart_surface_temperature", &["Droplet surface temperature", "surface temperature", "[K]", "[°C]", "time", "[ms]"]);
    check_chart(&dir, "chart_liquid_composition", &["Liquid composition against evaporated fraction", "n-heptane", "n-decane", "mass %"]);
    check_chart(&dir, "chart_vapor_composition", &["Composition of the released vapour", "n-heptane", "n-decane"]);
    // the run's residual liquid, with the columns the residue chart reads
    let residue = std::fs::read_to_string(dir.join("residue.csv")).unwrap();
    let header = residue.lines().find(|l| !l.starts_with('#')).unwrap();
    for col in ["evaporated_fraction", "bubble_point_K", "t50_K", "flash_point_K", "kinematic_viscosity_minus20C_m2_s", "density_15C_kg_m3", "dcn"] {
        assert!(header.split(',').any(|h| h == col), "residue.csv lacks {col}");
    }
    check_chart(&dir, "chart_residue", &["Residual liquid against evaporated fraction", "Flash point", "Derived cetane number"]);
    check_page(&dir.join("index.html"), &["chart_d2.png", "chart_d2.svg", "chart_vapor_composition.png", "chart_residue.png", "lifetime", "history.csv", "summary.json", "residue.csv"]);
    // the summary records component classes so charts can group when redrawn
    let s = json(&dir.join("summary.json"));
    assert_eq!(s["component_classes"][0][1], "n-alkane");
}

#[test]
fn many_components_are_grouped_by_class() {
    let dir = scratch("grouped");
    small_run(&dir, "demo-wide");
    for stem in ["chart_liquid_composition", "chart_vapor_composition"] {
        let svg = check_svg(&dir.join(format!("{stem}.svg")), &["hydrocarbon class", "n-alkanes", "iso-alkanes", "alkylbenzenes", "diaromatics"]);
        assert!(!svg.contains("n-dodecane"), "{stem}: components should be grouped");
    }
}

fn write_residue(dir: &Path, shift: f64) {
    let mut s = String::from("# synthetic residue table (test)\nevaporated_fraction,bubble_point_K,t50_K,flash_point_K,kinematic_viscosity_minus20C_m2_s,density_15C_kg_m3,dcn\n");
    for i in 0..=20 {
        let e = i as f64 * 0.05;
        let flash = if i > 18 { String::new() } else { format!("{}", 320.0 + 80.0 * e + shift) };
        s.push_str(&format!("{e},{},{},{flash},{},{},{}\n", 420.0 + 100.0 * e + shift, 450.0 + 90.0 * e + shift, (1.5 + 6.5 * e * e) * 1e-6, 790.0 + 40.0 * e, 45.0 + 7.0 * e));
    }
    std::fs::write(dir.join("residue.csv"), s).unwrap();
}

#[test]
fn residue_chart_appears_with_residue_csv_and_goes_without() {
    let dir = scratch("residue");
    small_run(&dir, "test-heptane-decane");
    write_residue(&dir, 0.0);
    let out = ok(&["plot", p(&dir)]);
    assert!(out.contains("drew 5 charts"), "{out}");
    check_chart(&dir, "chart_residue", &["Residual liquid against evaporated fraction", "Bubble point (solid) and T50 (dashed)", "Flash point", "Viscosity at −20 °C", "mm²/s", "Density at 15 °C", "kg/m³", "Derived cetane number", "°C"]);
    check_page(&dir.join("index.html"), &["chart_residue.png", "residue.csv"]);
    std::fs::remove_file(dir.join("residue.csv")).unwrap();
    ok(&["plot", p(&dir)]);
    assert!(!dir.join("chart_residue.png").exists() && !dir.join("chart_residue.svg").exists());
    let page = check_page(&dir.join("index.html"), &[]);
    assert!(!page.contains("chart_residue"));
}

#[test]
fn plot_redraws_byte_identical_files_without_recomputing() {
    let dir = scratch("redraw");
    small_run(&dir, "test-heptane-decane");
    let stems = ["chart_d2", "chart_surface_temperature", "chart_liquid_composition", "chart_vapor_composition"];
    let before: Vec<(Vec<u8>, Vec<u8>)> = stems.iter().map(|s| (std::fs::read(dir.join(format!("{s}.svg"))).unwrap(), std::fs::read(dir.join(format!("{s}.png"))).unwrap())).collect();
    let history = std::fs::read(dir.join("history.csv")).unwrap();
    let page = std::fs::read(dir.join("index.html")).unwrap();
    ok(&["plot", p(&dir)]);
    for (s, (svg, png)) in stems.iter().zip(&before) {
        assert_eq!(&std::fs::read(dir.join(format!("{s}.svg"))).unwrap(), svg, "{s}.svg changed");
        assert_eq!(&std::fs::read(dir.join(format!("{s}.png"))).unwrap(), png, "{s}.png changed");
    }
    assert_eq!(std::fs::read(dir.join("history.csv")).unwrap(), history);
    assert_eq!(std::fs::read(dir.join("index.html")).unwrap(), page);
}

#[test]
fn no_plots_writes_data_and_page_only() {
    let dir = scratch("noplots");
    ok(&["simulate", "test-decane", "--diameter", "10um", "--out", p(&dir), "--no-plots"]);
    assert!(dir.join("history.csv").is_file() && dir.join("index.html").is_file());
    assert!(!dir.join("chart_d2.png").exists());
    check_page(&dir.join("index.html"), &["lifetime"]);
}

const SUMMARY_KEYS: [&str; 7] = ["lifetime_s", "t10_s", "t50_s", "t90_s", "heatup_end_s", "max_surface_temperature_K", "final_evaporated_fraction"];

/// comparison.csv rows as (run label, column → cell).
fn comparison_rows(path: &Path) -> Vec<std::collections::BTreeMap<String, String>> {
    let text = std::fs::read_to_string(path).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    lines.map(|l| header.iter().map(|h| h.to_string()).zip(l.split(',').map(String::from)).collect()).collect()
}

fn assert_same_summary(a: &Path, b: &Path) {
    let (sa, sb) = (json(&a.join("summary.json")), json(&b.join("summary.json")));
    for k in SUMMARY_KEYS {
        assert_eq!(sa[k], sb[k], "{k}: {} vs {}", a.display(), b.display());
    }
    assert_eq!(std::fs::read(a.join("history.csv")).unwrap(), std::fs::read(b.join("history.csv")).unwrap());
}

#[test]
fn compare_fuels_equals_separate_simulate_runs() {
    let dir = scratch("compare");
    let cmp = dir.join("cmp");
    let out = ok(&["compare", "test-heptane-decane", "test-decane", "--diameter", "10um", "--ambient-temperature", "900K", "--out", p(&cmp)]);
    assert!(out.contains("lifetime") && out.contains("difference to test-heptane-decane"), "{out}");
    let rows = comparison_rows(&cmp.join("comparison.csv"));
    assert_eq!(rows.len(), 2);
    for (i, fuel) in ["test-heptane-decane", "test-decane"].iter().enumerate() {
        let single = dir.join(fuel);
        ok(&["simulate", fuel, "--diameter", "10um", "--ambient-temperature", "900K", "--out", p(&single)]);
        assert_same_summary(&cmp.join(fuel), &single);
        let s = json(&single.join("summary.json"));
        assert_eq!(rows[i]["run"], *fuel);
        for k in SUMMARY_KEYS {
            let cell = &rows[i][k];
            match s[k].as_f64() {
                Some(v) => assert_eq!(cell.parse::<f64>().unwrap(), v, "{fuel} {k}"),
                None => assert_eq!(cell, "", "{fuel} {k}"),
            }
        }
    }
    for stem in ["chart_all_d2", "chart_all_surface_temperature", "chart_all_evaporated"] {
        check_chart(&cmp, stem, &["test-heptane-decane", "test-decane", "run"]);
    }
    check_page(&cmp.join("index.html"), &["chart_all_d2.png", "test-decane/index.html", "lifetime", "comparison.csv"]);
    check_page(&cmp.join("test-decane").join("index.html"), &["../index.html", "chart_d2.png"]);
    let text = std::fs::read_to_string(cmp.join("comparison.txt")).unwrap();
    assert!(text.contains("t50 (50 % evaporated)") && text.contains("flash point, residue at 90 % evaporated"), "{text}");
    assert!(rows[1]["flash_point_at50pct_K"].parse::<f64>().is_ok());
    check_chart(&cmp, "chart_all_residue", &["test-heptane-decane", "test-decane"]);
}

#[test]
fn compare_vary_equals_separate_simulate_runs_and_adds_residue_rows() {
    let dir = scratch("vary");
    let cmp = dir.join("cmp");
    ok(&["compare", "test-decane", "--vary", "ambient-temperature=600K,900K", "--diameter", "10um", "--out", p(&cmp)]);
    let study = json(&cmp.join("study.json"));
    let runs = study["groups"][0]["runs"].as_array().unwrap();
    assert_eq!(runs.len(), 2);
    assert_eq!(runs[0]["label"], "ambient-temperature=600K");
    for (k, t) in ["600K", "900K"].iter().enumerate() {
        let single = dir.join(t);
        ok(&["simulate", "test-decane", "--ambient-temperature", t, "--diameter", "10um", "--out", p(&single)]);
        assert_same_summary(&cmp.join(runs[k]["dir"].as_str().unwrap()), &single);
    }
    // residue indicators slot into the table once the runs carry residue.csv
    for (k, r) in runs.iter().enumerate() {
        write_residue(&cmp.join(r["dir"].as_str().unwrap()), 10.0 * k as f64);
    }
    ok(&["plot", p(&cmp)]);
    let rows = comparison_rows(&cmp.join("comparison.csv"));
    let fp50: f64 = rows[1]["flash_point_at50pct_K"].parse().unwrap();
    assert!((fp50 - (320.0 + 40.0 + 10.0)).abs() < 1e-9, "{fp50}");
    assert!(rows[0]["flash_point_at90pct_K"].parse::<f64>().is_ok());
    assert!(rows[0].contains_key("dcn_at90pct") && rows[0].contains_key("kinematic_viscosity_minus20C_at50pct_m2_s"));
    let text = std::fs::read_to_string(cmp.join("comparison.txt")).unwrap();
    assert!(text.contains("flash point, residue at 50 % evaporated") && text.contains("+10.0 K"), "{text}");
    check_chart(&cmp, "chart_all_residue", &["Flash point", "ambient-temperature=600K", "ambient-temperature=900K"]);
}

#[test]
fn demo_writes_charts_and_pages_and_plot_redraws_them() {
    let dir = scratch("demo");
    let demo = dir.join("demo");
    ok(&["demo", "--out", p(&demo)]);
    for cond in ["combustor", "relight"] {
        for stem in ["d2", "surface_temperature", "evaporated"] {
            check_chart(&demo, &format!("chart_{cond}_{stem}"), &["demo-narrow", "demo-wide", "demo-blend", "demo-paraffinic"]);
        }
        check_chart(&demo.join(format!("demo-wide_{cond}")), "chart_liquid_composition", &["n-alkanes"]);
        check_page(&demo.join(format!("demo-narrow_{cond}")).join("index.html"), &["chart_d2.png"]);
    }
    check_page(&demo.join("index.html"), &["combustor condition", "relight condition", "chart_relight_d2.png", "demo-blend_relight/index.html"]);
    let svg = std::fs::read(demo.join("chart_combustor_d2.svg")).unwrap();
    let out = ok(&["plot", p(&demo)]);
    assert!(out.contains("drew 48 charts"), "{out}"); // 4 demo fuels × 2 conditions × 5 run charts + 8 group charts
    assert_eq!(std::fs::read(demo.join("chart_combustor_d2.svg")).unwrap(), svg);

    // a folder of run folders without study.json: compared as one group
    let loose = dir.join("loose");
    for r in ["demo-narrow_combustor", "demo-wide_combustor"] {
        std::fs::create_dir_all(loose.join(r)).unwrap();
        for f in ["history.csv", "summary.json"] {
            std::fs::copy(demo.join(r).join(f), loose.join(r).join(f)).unwrap();
        }
    }
    ok(&["plot", p(&loose)]);
    check_chart(&loose, "chart_runs_d2", &["demo-narrow_combustor", "demo-wide_combustor"]);
    check_page(&loose.join("index.html"), &["All runs"]);
}

fn fails_with_2(args: &[&str], message: &str) {
    let out = run(args);
    assert_eq!(out.status.code(), Some(2), "dropcut {args:?}: {}", String::from_utf8_lossy(&out.stderr));
    let err = String::from_utf8(out.stderr).unwrap();
    assert!(err.starts_with("error: ") && err.contains(message), "dropcut {args:?}: {err}");
    assert_eq!(err.lines().count(), 1, "{err}");
}

#[test]
fn bad_input_exits_2_with_one_line() {
    let dir = scratch("bad");
    fails_with_2(&["plot", p(&dir.join("nowhere"))], "no such folder");
    fails_with_2(&["plot", p(&dir)], "holds no history.csv");
    std::fs::create_dir_all(dir.join("broken")).unwrap();
    std::fs::write(dir.join("broken").join("history.csv"), "time_s,d2_ratio\n0,1\n").unwrap();
    fails_with_2(&["plot", p(&dir.join("broken"))], "not a dropcut history file");
    std::fs::write(dir.join("broken").join("history.csv"), "time_s,evaporated_fraction,d2_ratio,surface_temperature_K\n0,0,1,abc\n").unwrap();
    fails_with_2(&["plot", p(&dir.join("broken"))], "not a finite number");
    std::fs::write(dir.join("study.json"), "{\"title\": 3}").unwrap();
    fails_with_2(&["plot", p(&dir)], "not a study file");
    let out = p(&dir.join("cmp")).to_string();
    fails_with_2(&["compare", "test-decane", "--out", &out], "two or more fuels");
    fails_with_2(&["compare", "test-decane", "--vary", "colour=red", "--out", &out], "cannot vary 'colour'");
    fails_with_2(&["compare", "test-decane", "--vary", "ambient-temperature", "--out", &out], "use OPTION=V1,V2");
    fails_with_2(&["compare", "test-decane", "--vary", "ambient-temperature=500K,hot", "--out", &out], "--ambient-temperature");
    fails_with_2(&["compare", "test-decane", "--vary", "ambient-temperature=500K,5000K", "--out", &out], "ambient-temperature");
    fails_with_2(&["compare", "test-decane", "no-such-fuel", "--out", &out], "no-such-fuel");
    assert!(!dir.join("cmp").join("study.json").exists(), "nothing is run before the inputs are checked");
}

#[test]
fn pure_fuel_run_has_no_flat_residue_chart_but_a_note() {
    let dir = scratch("pure");
    small_run(&dir, "test-decane");
    // the residue table is still written; the chart of flat lines is not, and the page says why
    assert!(dir.join("residue.csv").is_file());
    assert!(!dir.join("chart_residue.png").exists() && !dir.join("chart_residue.svg").exists());
    let page = check_page(&dir.join("index.html"), &["No residue chart: a single-component fuel does not change as it evaporates", "chart_d2.png"]);
    assert!(!page.contains("chart_residue"));
    // a two-component fuel keeps its residue chart and gets no such note
    let mix = scratch("pure-mix");
    small_run(&mix, "test-heptane-decane");
    assert!(mix.join("chart_residue.png").is_file());
    assert!(!std::fs::read_to_string(mix.join("index.html")).unwrap().contains("No residue chart"));
}

#[test]
fn vapour_pressure_is_drawn_on_a_log_axis() {
    let dir = scratch("table-log");
    ok(&["table", "test-heptane-decane", "--no-surrogate", "--out", p(&dir)]);
    let chart = std::fs::read_dir(&dir).unwrap().filter_map(|e| e.ok()).map(|e| e.path()).find(|p| p.file_name().unwrap().to_string_lossy() == "chart_mixture.svg");
    let svg = check_svg(&chart.expect("chart_mixture.svg"), &["pressure", "[kPa], log scale"]);
    // whole-decade tick labels of a vapour pressure between a few Pa and an atmosphere
    let shown: Vec<&str> = svg.split("<text").skip(1).map(|t| t[t.find('>').unwrap() + 1..t.find("</text>").unwrap()].trim()).collect();
    let at = shown.iter().position(|t| *t == "[kPa], log scale").unwrap();
    let decades = ["0.01", "0.1", "1", "10", "100"].iter().filter(|d| shown[at..at + 12].contains(*d)).count();
    assert!(decades >= 4, "expected decade tick labels on the log axis: {:?}", &shown[at..at + 12]);
}

#[test]
fn micrometres_are_spelled_one_way_in_chart_text() {
    let dir = scratch("um");
    let cmp = dir.join("cmp");
    ok(&["compare", "test-decane", "--vary", "diameter=10um,12um", "--out", p(&cmp)]);
    let svg = check_svg(&cmp.join("chart_all_d2.svg"), &["µm"]);
    for text in svg.split("<text").skip(1) {
        let shown = &text[text.find('>').unwrap() + 1..text.find("</text>").unwrap()];
        assert!(!shown.contains("0um") && !shown.contains("2um") && !shown.contains(" m]"), "chart text '{shown}'");
    }
}

/// A resolved-liquid run gets a chart of its radial temperature and composition profiles (one panel per
/// component for a two-component fuel, one curve per saved snapshot); a well-mixed run in the same folder
/// removes the stale chart, and `plot` redraws it from profiles.csv alone.
#[test]
fn resolved_runs_get_a_radial_profile_chart() {
    let dir = scratch("radial");
    ok(&["simulate", "test-heptane-decane", "--diameter", "10um", "--liquid-mixing", "diffusion", "--liquid-heat", "conduction", "--out", p(&dir)]);
    assert!(dir.join("profiles.csv").is_file());
    let svg = check_svg(&dir.join("chart_radial_profiles.svg"), &["Inside the droplet", "n-heptane", "n-decane", "radius / surface radius", "% evaporated"]);
    check_png(&dir.join("chart_radial_profiles.png"));
    let page = std::fs::read_to_string(dir.join("index.html")).unwrap();
    assert!(page.contains("chart_radial_profiles.png"));
    // one legend line per snapshot in profiles.csv
    let profiles = std::fs::read_to_string(dir.join("profiles.csv")).unwrap();
    let mut times: Vec<&str> = profiles.lines().filter(|l| !l.starts_with('#')).skip(1).map(|l| l.split(',').next().unwrap()).collect();
    times.dedup();
    assert_eq!(svg.matches("% evaporated (").count(), times.len(), "legend entries vs snapshots");
    let before = std::fs::read(dir.join("chart_radial_profiles.svg")).unwrap();
    std::fs::remove_file(dir.join("chart_radial_profiles.svg")).unwrap();
    ok(&["plot", p(&dir)]);
    assert_eq!(std::fs::read(dir.join("chart_radial_profiles.svg")).unwrap(), before);
    ok(&["simulate", "test-heptane-decane", "--diameter", "10um", "--out", p(&dir)]);
    assert!(!dir.join("profiles.csv").exists() && !dir.join("chart_radial_profiles.svg").exists() && !dir.join("chart_radial_profiles.png").exists());
}

/// The RGB pixels of a PNG: (width, height, bytes).
fn decode_png(path: &Path) -> (usize, usize, Vec<u8>) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut buf).unwrap();
    assert_eq!(info.color_type, png::ColorType::Rgb, "{}", path.display());
    buf.truncate(info.buffer_size());
    (info.width as usize, info.height as usize, buf)
}

/// Charts are drawn on a supersampled canvas: the SVG keeps the image size with a finer viewBox (coordinates in
/// tenths of a pixel, text at the same size), the PNG is anti-aliased (pixels blended between a line's colour
/// and the white background along the sloped d² curve), and axis and grid lines stay on whole pixels.
#[test]
fn lines_are_drawn_at_sub_pixel_positions() {
    let dir = scratch("subpixel");
    small_run(&dir, "test-heptane-decane");
    let svg = std::fs::read_to_string(dir.join("chart_d2.svg")).unwrap();
    let root = &svg[..svg.find('>').unwrap()];
    let attr = |name: &str| -> Vec<f64> {
        let at = root.find(&format!(" {name}=\"")).unwrap_or_else(|| panic!("{root}")) + name.len() + 3;
        root[at..at + root[at..].find('"').unwrap()].split(' ').map(|v| v.parse().unwrap()).collect()
    };
    let (width, height, view) = (attr("width")[0], attr("height")[0], attr("viewBox"));
    assert_eq!((width, height), (1000.0, 620.0), "{root}");
    let k = view[2] / width;
    assert!(k >= 4.0 && view[3] / height == k && view[0] == 0.0 && view[1] == 0.0, "{root}");
    // the d² curve: its points in image pixels are not all whole numbers
    let curve = svg.split("<polyline").find(|p| p.contains("stroke=\"#1F5FA8\"")).expect("the run's curve");
    let points = &curve[curve.find("points=\"").unwrap() + 8..];
    let coords: Vec<f64> = points[..points.find('"').unwrap()].split([' ', ',']).filter(|v| !v.is_empty()).map(|v| v.parse::<f64>().unwrap() / k).collect();
    assert!(coords.len() > 20);
    let fractional = coords.iter().filter(|c| (*c - c.round()).abs() > 1e-9).count();
    assert!(fractional * 2 > coords.len(), "{fractional} of {} coordinates are off the pixel grid", coords.len());
    // the title keeps its visual size: 28 px (plotters writes font-size = size / 1.24)
    let title = svg.split("<text").find(|t| t.contains("Normalised droplet size")).unwrap();
    let size: f64 = title[title.find("font-size=\"").unwrap() + 11..].split('"').next().unwrap().parse().unwrap();
    assert!((size / k * 1.24 - 28.0).abs() < 1e-9, "font-size {size}");

    let (w, h, rgb) = decode_png(&dir.join("chart_d2.png"));
    assert_eq!((w, h), (1000, 620));
    // pixels that blend the curve's colour (31, 95, 168) with white, at 10–90 % of the colour
    let line = [31.0, 95.0, 168.0];
    let blends = rgb
        .chunks_exact(3)
        .filter(|p| {
            let share: Vec<f64> = (0..3).map(|c| (255.0 - f64::from(p[c])) / (255.0 - line[c])).collect();
            share.iter().all(|s| (s - share[2]).abs() < 0.08) && share[2] > 0.1 && share[2] < 0.9
        })
        .count();
    assert!(blends > 200, "only {blends} anti-aliased pixels along the curve");
    // a horizontal grid line is one pixel high: full grey in its row, white above and below, left of the legend
    let px = |x: usize, y: usize| [rgb[(y * w + x) * 3], rgb[(y * w + x) * 3 + 1], rgb[(y * w + x) * 3 + 2]];
    let grid = (60..h - 60).find(|&y| (300..320).all(|x| px(x, y) == [218, 218, 218])).expect("a whole-pixel grid line");
    assert!((300..320).all(|x| px(x, grid - 1) != [218, 218, 218] && px(x, grid + 1) != [218, 218, 218]));
}
