//! Uncertainty bands: zero spreads reproduce the deterministic run bit for bit, a single perturbed input ranks
//! first, percentiles converge, the run is fast enough, files are byte-identical across thread counts, and bad
//! input exits 2 with one line naming the option, file or field.

use std::path::{Path, PathBuf};
use std::time::Instant;

use dropcut::data::Library;
use dropcut::fuel::{Basis, Fuel};
use dropcut::model::droplet::{NoHistory, Recorder};
use dropcut::model::{simulate, DropletInputs, Motion};
use dropcut::props::gas::AmbientGas;
use dropcut::uncertainty::{self, Method, Settings, UncertaintySpec};

mod common;
use common::{ok, p, run};

fn scratch(name: &str) -> PathBuf {
    common::scratch("uncertainty", name)
}

fn inputs(fuel: &str, diameter: f64) -> DropletInputs {
    let lib = Library::embedded().unwrap();
    DropletInputs::new(Fuel::resolve(fuel, &lib).unwrap(), AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, diameter, 300.0)
}

fn spec(text: &str) -> UncertaintySpec {
    UncertaintySpec::parse(text, "test.toml", &Library::embedded().unwrap()).unwrap()
}

fn settings(samples: usize, method: Method) -> Settings {
    Settings { samples, seed: 7, method, threads: 2, ..Settings::default() }
}

/// Every spread set to zero: no factor is left, and each sample is the deterministic run, bit for bit.
#[test]
fn zero_uncertainty_reproduces_the_deterministic_run() {
    let zero = spec(
        r#"
[conditions]
ambient-temperature = { sd = "0K" }
pressure = "0%"
diameter = { half-width = 0 }
velocity = { relative-sd = 0 }
droplet-temperature = { sd = 0 }
[composition]
n-heptane = 0
each-component = "0%"
[properties]
scale = 0
[indicator-inputs]
scale = 0
"#,
    );
    let mut inp = inputs("test-heptane-decane", 20e-6);
    inp.motion = Motion::Fixed { velocity: 2.0 };
    let reference = simulate(&inp, &mut NoHistory).unwrap().outcome;
    let recorded = simulate(&inp, &mut Recorder::default()).unwrap().outcome;
    assert_eq!(reference.lifetime.unwrap().to_bits(), recorded.lifetime.unwrap().to_bits());
    for method in [Method::MonteCarlo, Method::LatinHypercube] {
        let r = uncertainty::run(&inp, &zero, &settings(6, method), None).unwrap();
        assert!(r.factors.is_empty(), "{:?}", r.factors);
        for s in &r.samples {
            assert_eq!(s.lifetime.unwrap().to_bits(), reference.lifetime.unwrap().to_bits());
            assert_eq!(s.t50.unwrap().to_bits(), reference.t50.unwrap().to_bits());
            assert_eq!(s.max_surface_temperature.unwrap().to_bits(), reference.max_surface_temperature.to_bits());
            assert_eq!(s.d2, r.deterministic.d2);
            assert_eq!(s.residue, r.deterministic.residue);
        }
        assert_eq!(r.lifetime.p05, reference.lifetime);
        assert_eq!(r.lifetime.p95, reference.lifetime);
    }
}

/// Through the binary: with --property-scale 0 and no other spread, samples.csv holds the lifetime that
/// `simulate` writes, digit for digit (shortest round-trip formatting: equal text = equal bits).
#[test]
fn zero_uncertainty_through_the_binary() {
    let dir = scratch("zero");
    let sim = dir.join("sim");
    let unc = dir.join("unc");
    ok(&["simulate", "test-heptane-decane", "--diameter", "15um", "--no-plots", "--out", p(&sim)]);
    ok(&["uncertainty", "test-heptane-decane", "--diameter", "15um", "--samples", "4", "--property-scale", "0", "--no-plots", "--out", p(&unc)]);
    let summary: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(sim.join("summary.json")).unwrap()).unwrap();
    let life = summary["lifetime_s"].as_f64().unwrap();
    let text = std::fs::read_to_string(unc.join("samples.csv")).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<&str> = lines.next().unwrap().split(',').collect();
    let col = header.iter().position(|h| *h == "lifetime_s").unwrap();
    let mut n = 0;
    for l in lines {
        let v: f64 = l.split(',').nth(col).unwrap().parse().unwrap();
        assert_eq!(v.to_bits(), life.to_bits(), "{l}");
        n += 1;
    }
    assert_eq!(n, 4);
}

fn first(r: &uncertainty::UncertaintyRun, output: &str) -> String {
    r.sensitivity.iter().find(|s| s.output == output && s.rank == 1).map(|s| s.input.clone()).unwrap()
}

/// With only one input perturbed, the sensitivity ranking puts it first.
#[test]
fn a_single_perturbed_input_ranks_first() {
    let inp = inputs("test-heptane-decane", 20e-6);
    let st = settings(60, Method::MonteCarlo);
    let off = "[properties]\nenabled = false\n[indicator-inputs]\nenabled = false\n";
    for (cond, name) in [("ambient-temperature = \"20K\"", "ambient-temperature"), ("diameter = \"5%\"", "diameter"), ("pressure = \"5%\"", "pressure")] {
        let r = uncertainty::run(&inp, &spec(&format!("{off}[conditions]\n{cond}\n")), &st, None).unwrap();
        assert_eq!(first(&r, "lifetime_s"), name);
        let top = r.sensitivity.iter().find(|s| s.output == "lifetime_s" && s.rank == 1).unwrap();
        assert!(top.r2.unwrap() > 0.5 && top.spearman.unwrap().abs() > 0.7, "{top:?}");
    }
    // only vapour pressures: the other nine properties set to zero uncertainty
    let only_vp = "[properties]\nliquid-density = 0\nlatent-heat = 0\nliquid-heat-capacity = 0\nliquid-viscosity = 0\nliquid-conductivity = 0\nsurface-tension = 0\nideal-gas-heat-capacity = 0\nvapor-viscosity = 0\nvapor-conductivity = 0\n[indicator-inputs]\nenabled = false\n";
    let r = uncertainty::run(&inp, &spec(only_vp), &st, None).unwrap();
    assert!(r.factors.iter().all(|f| f.name.starts_with("vapor-pressure:")), "{:?}", r.factors.iter().map(|f| &f.name).collect::<Vec<_>>());
    for o in ["lifetime_s", "residue50_dcn", "residue50_flash_point_K"] {
        assert_eq!(first(&r, o), "property:vapor-pressure", "{o}");
    }
    // only one composition group of a wide-cut fuel
    let wide = inputs("demo-wide", 20e-6);
    let r = uncertainty::run(&wide, &spec(&format!("{off}[composition]\naromatics = 0.2\n")), &settings(40, Method::LatinHypercube), None).unwrap();
    assert_eq!(r.factors.len(), 1);
    assert_eq!(first(&r, "residue50_dcn"), "composition:aromatics");
}

/// Only the flash-point and cetane inputs perturbed (their standard uncertainties from
/// validation/estimator_spread.csv): the lifetime is untouched, the residue's flash-point band is about as wide
/// as a published flash point is known to (±1.645 × 2.33 K for two published values), and each input type ranks
/// first for its own indicator.
#[test]
fn indicator_inputs_widen_only_their_indicators() {
    let inp = inputs("test-heptane-decane", 20e-6);
    let r = uncertainty::run(&inp, &spec("[properties]\nenabled = false\n"), &settings(200, Method::LatinHypercube), None).unwrap();
    assert_eq!(r.factors.len(), 4, "{:?}", r.factors.iter().map(|f| &f.name).collect::<Vec<_>>());
    let det = r.deterministic.lifetime.unwrap();
    assert!(r.samples.iter().all(|s| s.lifetime.unwrap().to_bits() == det.to_bits()));
    let at50 = Settings::default().residue_fractions.iter().position(|f| (f - 0.5).abs() < 1e-12);
    let mut fp: Vec<f64> = r.samples.iter().filter_map(|s| s.ranked_output(2, at50)).collect();
    fp.sort_by(f64::total_cmp);
    let width = fp[fp.len() * 95 / 100] - fp[fp.len() * 5 / 100];
    // the residue is mostly n-decane, whose published flash point has sd 2.33 K: 5–95 % width about 7.7 K
    assert!(width > 4.0 && width < 12.0, "flash-point band {width} K");
    assert_eq!(first(&r, "residue50_flash_point_K"), "input:flash-point");
    assert_eq!(first(&r, "residue50_dcn"), "input:cetane-number");
}

/// Percentile estimates converge: doubling N from 400 to 800 moves the 5 % and 95 % lifetime percentiles by
/// less than 2 % (the stated bound of docs/uncertainty.md), for both designs.
#[test]
fn lifetime_percentiles_converge() {
    let inp = inputs("n-heptane", 10e-6);
    let s = spec("[conditions]\nambient-temperature = \"25K\"\ndiameter = \"4%\"\n");
    for method in [Method::MonteCarlo, Method::LatinHypercube] {
        let a = uncertainty::run(&inp, &s, &settings(400, method), None).unwrap();
        let b = uncertainty::run(&inp, &s, &settings(800, method), None).unwrap();
        let det = a.deterministic.lifetime.unwrap();
        let width = b.lifetime.p95.unwrap() - b.lifetime.p05.unwrap();
        assert!(width > 0.1 * det, "spread too small to test: {width} of {det}");
        for (x, y) in [(a.lifetime.p05, b.lifetime.p05), (a.lifetime.p95, b.lifetime.p95)] {
            let change = (x.unwrap() / y.unwrap() - 1.0).abs();
            eprintln!("{method:?}: change {:.3} % (band width {:.1} % of the lifetime)", 100.0 * change, 100.0 * width / det);
            assert!(change < 0.02, "{method:?}: {x:?} vs {y:?}");
        }
    }
}

/// A small timing guard for the 10-component well-mixed case (the 1,000-sample figure in docs/uncertainty.md
/// was measured with the release binary): 100 samples on two threads, far inside a tenth of 30 s.
#[test]
fn ten_components_are_fast_enough() {
    let lib = Library::embedded().unwrap();
    let comps: Vec<_> = lib.components().iter().filter(|c| c.class != dropcut::data::HydrocarbonClass::Oxygenate).take(10).cloned().collect();
    let fuel = Fuel::from_fractions("ten", comps, &[0.1; 10], Basis::Mass).unwrap();
    let mut inp = DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
    inp.motion = Motion::Fixed { velocity: 5.0 };
    let t = Instant::now();
    let r = uncertainty::run(&inp, &spec("[conditions]\nambient-temperature = \"10K\"\n"), &settings(100, Method::MonteCarlo), None).unwrap();
    let secs = t.elapsed().as_secs_f64();
    eprintln!("100 samples of 10 components: {secs:.2} s");
    assert_eq!(r.samples.len(), 100);
    assert!(r.factors.len() > 90);
    assert!(secs < 3.0, "{secs} s");
}

fn files(dir: &Path) -> Vec<(String, Vec<u8>)> {
    let mut v: Vec<(String, Vec<u8>)> = std::fs::read_dir(dir)
        .unwrap()
        .filter_map(|e| e.ok())
        .filter(|e| e.path().is_file())
        .map(|e| (e.file_name().to_string_lossy().into_owned(), std::fs::read(e.path()).unwrap()))
        .collect();
    v.sort();
    v
}

/// Same seed, one thread or two: every file (data and charts) byte for byte the same; another seed differs.
#[test]
fn files_are_identical_across_thread_counts() {
    let dir = scratch("threads");
    let args = |out: &Path, threads: &str, seed: &str| -> Vec<String> {
        [
            "uncertainty", "test-heptane-decane", "--diameter", "10um", "--samples", "30", "--seed", seed, "--threads", threads,
            "--condition-uncertainty", "ambient-temperature=15K,diameter=3%", "--composition-uncertainty", "n-heptane=10%",
            "--method", "latin-hypercube", "--out", p(out),
        ]
        .iter()
        .map(|s| s.to_string())
        .collect()
    };
    let run_with = |out: &Path, threads: &str, seed: &str| {
        let a = args(out, threads, seed);
        ok(&a.iter().map(|s| s.as_str()).collect::<Vec<_>>());
    };
    let (one, two, other) = (dir.join("one"), dir.join("two"), dir.join("other"));
    run_with(&one, "1", "11");
    run_with(&two, "2", "11");
    run_with(&other, "2", "12");
    let (a, b) = (files(&one), files(&two));
    let names: Vec<&str> = a.iter().map(|(n, _)| n.as_str()).collect();
    for f in ["bands_history.csv", "bands_residue.csv", "sensitivity.csv", "samples.csv", "summary.json", "chart_band_d2.png", "chart_band_d2.svg", "chart_band_residue.svg"] {
        assert!(names.contains(&f), "{f} missing: {names:?}");
    }
    assert_eq!(a.len(), b.len());
    for ((na, ba), (nb, bb)) in a.iter().zip(&b) {
        assert_eq!(na, nb);
        assert!(ba == bb, "{na} differs between --threads 1 and 2");
    }
    assert_ne!(std::fs::read(one.join("samples.csv")).unwrap(), std::fs::read(other.join("samples.csv")).unwrap());
    // nothing non-finite is ever written
    for (name, bytes) in a.iter().filter(|(n, _)| n.ends_with(".csv") || n.ends_with(".json")) {
        let text = String::from_utf8_lossy(bytes).to_ascii_lowercase();
        let bad = text.split([',', '\n', ':', ' ', '[', ']']).any(|t| matches!(t.trim(), "nan" | "-nan" | "inf" | "-inf" | "infinity" | "-infinity"));
        assert!(!bad, "{name}");
    }
}

/// Several fuels: one folder each, overlaid charts and overlap.csv on top, and a verdict per output.
#[test]
fn two_fuels_say_whether_their_bands_overlap() {
    let dir = scratch("two");
    let out = ok(&["uncertainty", "n-heptane", "n-decane", "--diameter", "10um", "--samples", "20", "--condition-uncertainty", "ambient-temperature=10K", "--out", p(&dir)]);
    for o in ["lifetime", "residue DCN at 50 %", "residue flash point at 50 %"] {
        assert!(out.lines().any(|l| l.contains(o) && l.contains("overlap")), "{o}: {out}");
    }
    // heptane and decane droplets differ far more than a 10 K spread can hide
    assert!(out.lines().any(|l| l.contains("lifetime:") && l.contains("do not overlap")), "{out}");
    for sub in ["n-heptane", "n-decane"] {
        assert!(dir.join(sub).join("samples.csv").is_file());
        assert!(dir.join(sub).join("chart_band_d2.png").is_file());
    }
    assert!(dir.join("overlap.csv").is_file());
    assert!(dir.join("chart_band_d2.svg").is_file());
    let overlap = std::fs::read_to_string(dir.join("overlap.csv")).unwrap();
    assert!(overlap.contains("n-heptane,n-decane,lifetime_s,"));
    // `plot` redraws every band chart and index.html from the saved files alone, byte for byte
    let drawn: Vec<PathBuf> = ["", "n-heptane", "n-decane"]
        .iter()
        .flat_map(|sub| ["chart_band_d2.png", "chart_band_d2.svg", "chart_band_surface_temperature.svg", "chart_band_residue.svg"].map(|f| dir.join(sub).join(f)))
        .chain([dir.join("index.html")])
        .collect();
    let before: Vec<Vec<u8>> = drawn.iter().map(|f| std::fs::read(f).unwrap()).collect();
    for f in &drawn {
        std::fs::remove_file(f).unwrap();
    }
    let said = ok(&["plot", p(&dir)]);
    assert!(said.contains("band chart"), "{said}");
    for (f, b) in drawn.iter().zip(&before) {
        assert!(std::fs::read(f).unwrap() == *b, "{} differs after redrawing", f.display());
    }
    // the report names inputs as a reader says them, and residue temperatures are drawn in °C
    let page = std::fs::read_to_string(dir.join("index.html")).unwrap();
    assert!(page.contains("ambient temperature (") && !page.contains("ambient-temperature ("), "ranking labels");
    let residue = std::fs::read_to_string(dir.join("chart_band_residue.svg")).unwrap();
    assert!(residue.contains("flash point  [°C]") || residue.contains("flash point [°C]"));
}

/// Bad input: exit 2 and one line naming the option, file or field and the value.
#[test]
fn bad_input_exits_2_with_one_line() {
    let dir = scratch("bad");
    let file = |name: &str, text: &str| -> String {
        let f = dir.join(name);
        std::fs::write(&f, text).unwrap();
        f.to_str().unwrap().to_string()
    };
    let bad_field = file("bad_field.toml", "[conditions]\nambient-temprature = \"10K\"\n");
    let bad_unit = file("bad_unit.toml", "[conditions]\npressure = { sd = \"3 furlongs\" }\n");
    let too_wide = file("too_wide.toml", "[conditions]\ndiameter = { sd = \"20um\" }\n");
    let bad_class = file("bad_class.toml", "[composition]\narromatics = 0.1\n");
    let not_toml = file("not_toml.toml", "[conditions\n");
    let missing = dir.join("missing.toml");
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (vec!["--uncertainty", &bad_field], "conditions.ambient-temprature"),
        (vec!["--uncertainty", &bad_unit], "conditions.pressure"),
        (vec!["--uncertainty", &too_wide], "diameter"),
        (vec!["--uncertainty", &bad_class], "composition.arromatics"),
        (vec!["--uncertainty", &not_toml], "not_toml.toml"),
        (vec!["--uncertainty", p(&missing)], "missing.toml"),
        (vec!["--samples", "0"], "--samples"),
        (vec!["--samples", "many"], "--samples"),
        (vec!["--seed=-3"], "--seed"),
        (vec!["--property-scale=-1"], "--property-scale"),
        (vec!["--condition-uncertainty", "altitude=3m"], "--condition-uncertainty"),
        (vec!["--condition-uncertainty", "ambient-temperature=hot"], "--condition-uncertainty"),
        (vec!["--composition-uncertainty", "aromatics=150%"], "--composition-uncertainty"),
        (vec!["--ambient-temperature=-5K"], "ambient"),
    ];
    for (extra, needle) in cases {
        let out_dir = dir.join("out");
        let mut args = vec!["uncertainty", "test-decane", "--samples", "3", "--out", p(&out_dir)];
        args.extend(extra.iter().copied());
        let o = run(&args);
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{extra:?}: {err}");
        let lines: Vec<&str> = err.lines().filter(|l| l.starts_with("error")).collect();
        assert_eq!(lines.len(), 1, "{extra:?}: {err}");
        assert!(lines[0].contains(needle), "{extra:?}: {err}");
    }
}
