//! Property tables (`dropcut table`): the written files against the library's own property functions (no
//! drift between the two paths), the fits against the tables, the surrogate against droplet runs of the full
//! mixture, the n-dodecane table against CoolProp 8.0.0, determinism, and input errors. The CLI runs in temp
//! folders through the built binary.

use std::path::{Path, PathBuf};
use std::process::Command;

use dropcut::checks::properties::is_known_failure;
use dropcut::checks::tables::{coolprop_checks, lifetime, parse_csv};
use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::props::gas::{gas_mixture_state, vapor_diffusion_coefficient, AmbientGas};
use dropcut::props::liquid;
use dropcut::table::surrogate::{ReferenceCondition, SurrogateBasis, SurrogateParameters};

fn bin() -> &'static str {
    env!("CARGO_BIN_EXE_dropcut")
}

/// A fresh temp folder for one test.
fn temp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("dropcut-tables-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn run(args: &[&str], env: &[(&str, &str)]) -> std::process::Output {
    let mut c = Command::new(bin());
    c.args(args).env_remove("SOURCE_DATE_EPOCH");
    for (k, v) in env {
        c.env(k, v);
    }
    c.output().unwrap()
}

fn run_ok(args: &[&str]) {
    let o = run(args, &[]);
    assert!(o.status.success(), "{args:?}: {}", String::from_utf8_lossy(&o.stderr));
}

fn read(p: &Path) -> String {
    std::fs::read_to_string(p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

/// Text cells of a `#`-commented CSV (for the text columns).
fn text_rows(text: &str) -> Vec<Vec<String>> {
    text.lines().filter(|l| !l.starts_with('#')).skip(1).map(|l| l.split(',').map(str::to_string).collect()).collect()
}

fn rel(a: f64, b: f64) -> f64 {
    if a == b {
        0.0
    } else {
        (a / b - 1.0).abs()
    }
}

const TIGHT: f64 = 1e-12;

/// Equal up to the one-ulp slack of serde_json's default float parser.
fn close_all(a: &[f64], b: &[f64]) {
    assert_eq!(a.len(), b.len());
    for (x, y) in a.iter().zip(b) {
        assert!(rel(*x, *y) <= 4.0 * f64::EPSILON, "{a:?} vs {b:?}");
    }
}

fn col(header: &[String], name: &str) -> usize {
    header.iter().position(|h| h == name).unwrap_or_else(|| panic!("column {name} missing"))
}

/// The mixture-table values written to mixture.csv (and a residue table) equal the library's property
/// functions at the same temperatures, recomputed here without the table code.
#[test]
fn mixture_and_residue_tables_equal_library_functions() {
    let dir = temp("library");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "test-heptane-decane", "--out", out, "--no-date", "--no-surrogate", "--residue", "0,0.5", "--pressure", "2bar"]);
    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("test-heptane-decane", &lib).unwrap();
    let gas = AmbientGas::air(&lib).unwrap();
    let residue = dropcut::post::weathering_residues(&fuel.components, &fuel.mass_fractions, 350.0, &[0.0, 0.5], Default::default()).unwrap();
    for (file, w) in [("mixture.csv", fuel.mass_fractions.clone()), ("mixture_residue_0.50.csv", residue[1].mass_fractions.clone()), ("mixture_residue_0.00.csv", residue[0].mass_fractions.clone())] {
        let (h, rows) = parse_csv(&read(&dir.join(file)));
        assert!(rows.len() > 20, "{file}: {} rows", rows.len());
        let comps = &fuel.components;
        let x = liquid::mass_to_mole(comps, &w);
        let mut worst = 0.0f64;
        for r in &rows {
            let v = |name: &str| r[col(&h, name)].unwrap();
            let t = v("temperature_K");
            let s = liquid::state(comps, &w, t);
            // equilibrium vapour, written out independently: y_i ∝ x_i p_sat,i, as mass fractions
            let mut y: Vec<f64> = comps.iter().zip(&x).map(|(c, x)| x * c.vapor_pressure(t) * c.molar_mass()).collect();
            let sum: f64 = y.iter().sum();
            y.iter_mut().for_each(|v| *v /= sum);
            let g = gas_mixture_state(comps, &y, &gas, t, 2e5);
            let d: f64 = comps.iter().zip(&y).map(|(c, y)| y * vapor_diffusion_coefficient(c, &gas, t, 2e5)).sum();
            let l_eq: f64 = comps.iter().zip(&y).map(|(c, y)| y * c.latent_heat(t)).sum();
            for (name, expected) in [
                ("density_kg_m3", s.density_kg_m3),
                ("cp_J_kgK", s.cp_J_kgK),
                ("viscosity_Pa_s", s.viscosity_Pa_s),
                ("kinematic_viscosity_m2_s", s.kinematic_viscosity_m2_s),
                ("conductivity_W_mK", s.conductivity_W_mK),
                ("surface_tension_N_m", s.surface_tension_N_m),
                ("latent_heat_J_kg", s.latent_heat_J_kg),
                ("vapor_pressure_Pa", s.vapor_pressure_Pa),
                ("latent_heat_equilibrium_vapor_J_kg", l_eq),
                ("vapor_cp_J_kgK", g.cp_J_kgK),
                ("vapor_viscosity_Pa_s", g.viscosity_Pa_s),
                ("vapor_conductivity_W_mK", g.conductivity_W_mK),
                ("vapor_molar_mass_kg_mol", g.molar_mass_kg_mol),
                ("vapor_diffusivity_m2_s", d),
            ] {
                let e = rel(v(name), expected);
                assert!(e <= TIGHT, "{file} {name} at {t} K: table {} vs library {expected} ({e:e})", v(name));
                worst = worst.max(e);
            }
        }
        println!("{file}: {} rows, worst relative difference {worst:e}", rows.len());
    }
    let _ = std::fs::remove_dir_all(&dir);
}

/// components/<id>.csv equals the component's own methods; liquid cells are empty exactly on vapor-only rows.
#[test]
fn component_tables_equal_component_methods() {
    let dir = temp("components");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "test-heptane-decane", "--out", out, "--no-date", "--no-surrogate", "--vapor-to", "1200K"]);
    let lib = Library::embedded().unwrap();
    let gas = AmbientGas::air(&lib).unwrap();
    for id in ["n-heptane", "n-decane"] {
        let c = lib.component(id).unwrap();
        let text = read(&dir.join("components").join(format!("{id}.csv")));
        assert!(text.contains("# constant critical_temperature_K:") && text.contains("# constant melting_point_K:"), "constants block");
        let (h, rows) = parse_csv(&text);
        let texts = text_rows(&text);
        let last = rows.iter().filter_map(|r| r[col(&h, "temperature_K")]).fold(0.0, f64::max);
        assert!((last - 1200.0).abs() < 1e-9);
        for (r, tr) in rows.iter().zip(&texts) {
            let t = r[0].unwrap();
            let validity = &tr[col(&h, "validity")];
            let liquid_present = r[col(&h, "density_kg_m3")].is_some();
            assert_eq!(validity == "vapor-only", !liquid_present, "{id} {t}");
            for (name, expected) in [
                ("vapor_cp_J_kgK", c.ideal_gas_heat_capacity(t)),
                ("vapor_viscosity_Pa_s", c.vapor_viscosity(t)),
                ("vapor_conductivity_W_mK", c.vapor_conductivity(t)),
                ("vapor_diffusivity_m2_s", vapor_diffusion_coefficient(c, &gas, t, 101_325.0)),
            ] {
                assert!(rel(r[col(&h, name)].unwrap(), expected) <= TIGHT, "{id} {name} {t}");
            }
            if liquid_present {
                for (name, expected) in [
                    ("vapor_pressure_Pa", c.vapor_pressure(t)),
                    ("density_kg_m3", c.liquid_density(t)),
                    ("cp_J_kgK", c.liquid_heat_capacity(t)),
                    ("viscosity_Pa_s", c.liquid_viscosity(t)),
                    ("conductivity_W_mK", c.liquid_conductivity(t)),
                    ("surface_tension_N_m", c.surface_tension(t)),
                    ("latent_heat_J_kg", c.latent_heat(t)),
                ] {
                    assert!(rel(r[col(&h, name)].unwrap(), expected) <= TIGHT, "{id} {name} {t}");
                }
            }
        }
    }
    let _ = std::fs::remove_dir_all(&dir);
}

/// Every fit in fits.csv reproduces its table within the maximum error it states, and every fittable column
/// of mixture.csv has a fit over the whole table range.
#[test]
fn fits_reproduce_tables_within_stated_error() {
    let dir = temp("fits");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "demo-narrow", "--out", out, "--no-date", "--no-surrogate", "--residue", "0.4"]);
    let fits_text = read(&dir.join("fits.csv"));
    let (fh, fits) = parse_csv(&fits_text);
    let ftext = text_rows(&fits_text);
    let mut checked = 0;
    let mut mixture_columns = std::collections::BTreeSet::new();
    for (f, ft) in fits.iter().zip(&ftext) {
        let table = &ft[col(&fh, "table")];
        let property = &ft[col(&fh, "property")];
        let form = &ft[col(&fh, "form")];
        let variable = &ft[col(&fh, "variable")];
        let get = |n: &str| f[col(&fh, n)].unwrap();
        let (center, half, stated) = (get("center"), get("half_width"), get("max_relative_error"));
        let c: Vec<f64> = (0..5).map(|k| get(&format!("c{k}"))).collect();
        assert!(get("degree") <= 4.0);
        let eval = |t: f64| {
            let x = if variable == "1/T" { 1.0 / t } else { t };
            let s = (x - center) / half;
            let p = c.iter().rev().fold(0.0, |acc, ck| acc * s + ck);
            if form == "log" {
                p.exp()
            } else {
                p
            }
        };
        let (th, trows) = parse_csv(&read(&dir.join(format!("{table}.csv"))));
        let j = col(&th, property);
        let mut worst = 0.0f64;
        let mut n = 0;
        let (t_min, t_max) = (get("t_min_K"), get("t_max_K"));
        for r in &trows {
            let (Some(t), Some(v)) = (r[0], r[j]) else { continue };
            if t < t_min || t > t_max {
                continue;
            }
            worst = worst.max(rel(eval(t), v));
            n += 1;
        }
        assert_eq!(n as f64, get("points"), "{table} {property}");
        assert!(worst <= stated * (1.0 + 1e-9) + 1e-13, "{table} {property}: {worst:e} > stated {stated:e}");
        assert_eq!(ft[col(&fh, "flag")] == "ok", stated <= 0.01, "{table} {property}: flag");
        if table == "mixture" {
            mixture_columns.insert(property.clone());
        }
        checked += 1;
    }
    for c in dropcut::table::MIXTURE_COLUMNS.iter().filter(|c| c.fit.is_some()) {
        assert!(mixture_columns.contains(c.name), "no fit for mixture column {}", c.name);
    }
    println!("{checked} fits checked");
    assert!(checked > 40);
    let _ = std::fs::remove_dir_all(&dir);
}

/// The surrogate reproduces the mixture lifetime at the reference condition within 1 %, and its reported
/// lifetimes and errors at the other conditions equal independent runs of both models (the surrogate rebuilt
/// here from the reported factors and fit ranges, the runs made with `model::simulate`).
#[test]
fn surrogate_matches_reference_and_reports_honestly() {
    let dir = temp("surrogate");
    let out = dir.to_str().unwrap();
    let t0 = std::time::Instant::now();
    run_ok(&["table", "demo-narrow", "--out", out, "--no-date", "--reference", "ambient-temperature=900K,diameter=40um"]);
    println!("table with surrogate: {:?}", t0.elapsed());
    let v: serde_json::Value = serde_json::from_str(&read(&dir.join("surrogate.json"))).unwrap();
    let r = &v["reference"];
    assert!((r["condition"]["ambient_temperature"].as_f64().unwrap() - 900.0).abs() < 1e-9);
    assert!((r["condition"]["diameter"].as_f64().unwrap() - 40e-6).abs() < 1e-15);
    let e_ref = r["lifetime_error"].as_f64().unwrap();
    assert!(e_ref.abs() < 0.01, "lifetime error at the reference {e_ref}");
    let sur_text = read(&dir.join("surrogate.csv"));
    assert!(sur_text.contains("# volatility_factor:") && sur_text.contains("# latent_heat_scaling:"));
    // the latent-heat scaling is stated as columns: L = g × unscaled, excess = L − unscaled, and h_v − h_l = L
    let (sh, srows) = parse_csv(&sur_text);
    let g = v["parameters"]["latent_heat_factor"].as_f64().unwrap();
    let mut liquid_rows = 0;
    for r in &srows {
        let Some(l) = r[col(&sh, "latent_heat_J_kg")] else { continue };
        let get = |n: &str| r[col(&sh, n)].unwrap();
        assert!(rel(get("latent_heat_factor"), g) <= TIGHT);
        assert!(rel(g * get("unscaled_latent_heat_J_kg"), l) <= 1e-12 && rel(get("unscaled_latent_heat_J_kg") + get("latent_heat_scaling_excess_J_kg"), l) <= 1e-12);
        assert!(rel(get("vapor_enthalpy_J_kg") - get("liquid_enthalpy_J_kg"), l) <= 1e-9);
        liquid_rows += 1;
    }
    assert!(liquid_rows > 20);

    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("demo-narrow", &lib).unwrap();
    let gas = AmbientGas::air(&lib).unwrap();
    let range = |k: &str| (v["fit_ranges_K"][k][0].as_f64().unwrap(), v["fit_ranges_K"][k][1].as_f64().unwrap());
    let basis = SurrogateBasis::new(&fuel, &gas, range("liquid"), range("vapor")).unwrap();
    let params = SurrogateParameters {
        volatility_factor: v["parameters"]["volatility_factor"].as_f64().unwrap(),
        latent_heat_factor: v["parameters"]["latent_heat_factor"].as_f64().unwrap(),
    };
    let sur = basis.component(params);
    // the file describes the component that is run: same vapour-pressure and latent-heat coefficients
    let corr = v["correlations"].as_array().unwrap();
    let coeffs = |key: &str| -> Vec<f64> {
        corr.iter().find(|c| c["property"] == key).unwrap()["coefficients"].as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect()
    };
    if let dropcut::data::Form::Dippr101(a) = &sur.vapor_pressure.form {
        close_all(&coeffs("vapor-pressure"), a);
    } else {
        panic!("vapour pressure form");
    }
    if let dropcut::data::Form::Dippr106 { c, .. } = &sur.latent_heat.form {
        close_all(&coeffs("latent-heat"), c);
    } else {
        panic!("latent heat form");
    }
    let sur_fuel = Fuel::pure(sur);
    let conditions: Vec<&serde_json::Value> = std::iter::once(r).chain(v["evaluations"].as_array().unwrap()).collect();
    assert_eq!(conditions.len(), 7);
    let mut worst_elsewhere = 0.0f64;
    for c in conditions {
        let k = &c["condition"];
        let cond = ReferenceCondition {
            ambient_temperature: k["ambient_temperature"].as_f64().unwrap(),
            pressure: k["pressure"].as_f64().unwrap(),
            diameter: k["diameter"].as_f64().unwrap(),
            velocity: k["velocity"].as_f64().unwrap(),
            droplet_temperature: k["droplet_temperature"].as_f64().unwrap(),
        };
        let m = lifetime(&fuel, &gas, &cond).unwrap();
        let s = lifetime(&sur_fuel, &gas, &cond).unwrap();
        assert!(rel(c["mixture"]["lifetime"].as_f64().unwrap(), m) < 1e-12, "{cond:?}");
        assert!(rel(c["surrogate"]["lifetime"].as_f64().unwrap(), s) < 1e-12, "{cond:?}");
        let reported = c["lifetime_error"].as_f64().unwrap();
        assert!((reported - (s / m - 1.0)).abs() < 1e-12, "{cond:?}: reported {reported}, rerun {}", s / m - 1.0);
        worst_elsewhere = worst_elsewhere.max(reported.abs());
    }
    println!("reference error {e_ref:e}; largest error elsewhere {worst_elsewhere}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// The n-dodecane table against CoolProp 8.0.0 with the property checks' tolerances (vapour pressure 2 %,
/// density 1.5 %, latent heat 3 %, cp 5 %, viscosity and conductivity 10 %, surface tension 5 %; vapour side
/// 3/10/15 %) at the rows where the correlations are inside their published range, and its enthalpy columns
/// against CoolProp's saturated-liquid and saturated-vapour enthalpies from the liquid at 298.15 K (5 %). The two failures traced to
/// the published correlations (properties::KNOWN_FAILURES: n-dodecane cp and viscosity) are reported, not
/// hidden.
#[test]
fn n_dodecane_table_matches_coolprop() {
    let lib = Library::embedded().unwrap();
    let results = coolprop_checks(&lib);
    dropcut::checks::print_results(&results);
    assert_eq!(results.len(), 12);
    // the enthalpy columns (liquid 0.93 %, vapour 1.6 % measured) against CoolProp's saturation enthalpies
    assert!(results.iter().filter(|r| r.check.contains("enthalpy from the liquid at 298.15 K")).all(|r| r.passed), "enthalpy checks");
    for r in results.iter().filter(|r| !is_known_failure(r)) {
        assert!(r.passed, "{} | tol {} | got {}", r.check, r.tolerance, r.achieved);
    }
    // at least vapour pressure, density, latent heat, conductivity and surface tension are judged and pass
    assert!(results.iter().filter(|r| r.passed).count() >= 8);
}

/// Byte-identical output with --no-date; SOURCE_DATE_EPOCH fixes the date; the date is there by default.
#[test]
fn deterministic_output_and_date() {
    let a = temp("det-a");
    let b = temp("det-b");
    let c = temp("det-c");
    let args = |d: &Path| -> Vec<String> { ["table", "test-heptane-decane", "--out", d.to_str().unwrap(), "--residue", "0.3"].iter().map(|s| s.to_string()).collect() };
    let mut a_args = args(&a);
    a_args.push("--no-date".into());
    let mut b_args = args(&b);
    b_args.push("--no-date".into());
    for v in [&a_args, &b_args] {
        let v: Vec<&str> = v.iter().map(|s| s.as_str()).collect();
        run_ok(&v);
    }
    let files = ["mixture.csv", "mixture_residue_0.30.csv", "components/n-heptane.csv", "components/n-decane.csv", "surrogate.csv", "surrogate.json", "fits.csv"];
    for f in files {
        let (x, y) = (std::fs::read(a.join(f)).unwrap(), std::fs::read(b.join(f)).unwrap());
        assert!(x == y, "{f} differs between runs");
        assert!(!String::from_utf8_lossy(&x).contains("date"), "{f} has a date with --no-date");
    }
    let cv: Vec<String> = args(&c);
    let cv: Vec<&str> = cv.iter().map(|s| s.as_str()).collect();
    let o = run(&cv, &[("SOURCE_DATE_EPOCH", "1700000000")]);
    assert!(o.status.success());
    assert!(read(&c.join("mixture.csv")).contains("# date: 2023-11-14T22:13:20Z"));
    let o = run(&["table", "n-decane", "--out", c.to_str().unwrap(), "--no-surrogate"], &[]);
    assert!(o.status.success());
    assert!(read(&c.join("mixture.csv")).lines().any(|l| l.starts_with("# date: ")));
    for d in [a, b, c] {
        let _ = std::fs::remove_dir_all(d);
    }
}

/// JSON holds the same rows as CSV.
#[test]
fn json_has_the_csv_content() {
    let a = temp("json-a");
    let b = temp("json-b");
    run_ok(&["table", "n-decane", "--out", a.to_str().unwrap(), "--no-date", "--no-surrogate"]);
    run_ok(&["table", "n-decane", "--out", b.to_str().unwrap(), "--no-date", "--no-surrogate", "--format", "json"]);
    for stem in ["mixture", "components/n-decane"] {
        let (h, rows) = parse_csv(&read(&a.join(format!("{stem}.csv"))));
        let v: serde_json::Value = serde_json::from_str(&read(&b.join(format!("{stem}.json")))).unwrap();
        let names: Vec<&str> = v["columns"].as_array().unwrap().iter().map(|c| c["name"].as_str().unwrap()).collect();
        assert_eq!(names, h.iter().map(|s| s.as_str()).collect::<Vec<_>>());
        let jrows = v["rows"].as_array().unwrap();
        assert_eq!(jrows.len(), rows.len());
        for (jr, r) in jrows.iter().zip(&rows) {
            for (j, cell) in r.iter().enumerate() {
                if let Some(x) = cell {
                    // serde_json's default float parser may be off by one ulp (the writer is exact)
                    assert!(rel(jr[j].as_f64().unwrap(), *x) <= 4.0 * f64::EPSILON, "{stem} column {}", h[j]);
                }
            }
        }
        assert_eq!(v["metadata"]["composition_hash"].as_str().unwrap().len(), 16);
    }
    assert!(b.join("fits.json").is_file() && !b.join("fits.csv").exists());
    for d in [a, b] {
        let _ = std::fs::remove_dir_all(d);
    }
}

/// Bad input: exit code 2 and one line naming the option and the value.
#[test]
fn bad_input_exits_2_with_one_line() {
    let d = temp("bad");
    let out = d.to_str().unwrap();
    for (args, needle) in [
        (vec!["--from", "100K"], "--from 100"),
        (vec!["--to", "900K"], "--to 900"),
        (vec!["--step", "0K"], "--step 0"),
        (vec!["--step", "five"], "--step"),
        (vec!["--pressure", "1e9"], "--pressure"),
        (vec!["--residue", "0.5,0.2"], "--residue 0.5,0.2"),
        (vec!["--residue", "1.2"], "--residue"),
        (vec!["--reference", "temperature=900K"], "--reference"),
        (vec!["--reference", "ambient-temperature=90K"], "--reference"),
        (vec!["--vapor-to", "100K"], "--vapor-to 100"),
        (vec!["--gas", "xe=1"], "--gas"),
        (vec!["--from", "400K", "--to", "300K"], "--to 300"),
        (vec!["--residue-temperature", "20K"], "--residue-temperature"),
    ] {
        let mut a = vec!["table", "n-decane", "--out", out];
        a.extend(args.iter());
        let o = run(&a, &[]);
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {err}");
        assert_eq!(err.trim_end().lines().count(), 1, "{args:?}: {err}");
        assert!(err.contains(needle), "{args:?}: {err}");
        assert!(!err.contains("panick"), "{args:?}: {err}");
    }
    let o = run(&["table", "n-decane", "--out", out], &[("SOURCE_DATE_EPOCH", "yesterday")]);
    assert_eq!(o.status.code(), Some(2));
    let o = run(&["table", "no-such-fuel", "--out", out], &[]);
    assert_eq!(o.status.code(), Some(2));
    let _ = std::fs::remove_dir_all(&d);
}

/// No bubble point in the critical region: n-dodecane at 30 bar (Raoult would give 698 K, above T_c = 658 K)
/// is reported as none with a note in the table metadata and in `fuel show`; at 1 atm the bubble point is kept.
#[test]
fn no_bubble_point_above_the_pseudo_critical_temperature() {
    let dir = temp("critical-bubble");
    let out = dir.join("t");
    run_ok(&["table", "n-dodecane", "--pressure", "30bar", "--out", out.to_str().unwrap()]);
    let text = std::fs::read_to_string(out.join("mixture.csv")).unwrap();
    let line = text.lines().find(|l| l.starts_with("# bubble_point_K:")).unwrap();
    assert!(line.contains("none") && line.contains("pseudo-critical temperature 658.0 K"), "{line}");
    let o = run(&["fuel", "show", "n-dodecane", "--pressure", "30bar", "--json"], &[]);
    assert!(o.status.success());
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v["bubble_point_K"].is_null() && v["dew_point_K"].is_null(), "{v}");
    assert!(v["notices"].as_array().unwrap().iter().any(|n| n.as_str().unwrap().contains("critical region")), "{v}");
    let o = run(&["fuel", "show", "n-dodecane", "--pressure", "1atm", "--json"], &[]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!((v["bubble_point_K"].as_f64().unwrap() - 489.4).abs() < 1.0, "{v}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// Liquid and vapour enthalpy columns share one reference state (liquid at 298.15 K) and differ by the latent-heat
/// column on every row, to 1e-9 relative, in the mixture, residue and component tables; the liquid enthalpy
/// rises by the trapezoidal integral of the cp column between rows (to 0.2 %, the trapezoid's own error at the kinks of the cp continuations).
#[test]
fn enthalpies_differ_by_the_latent_heat() {
    let dir = temp("enthalpy");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "demo-wide", "--out", out, "--no-date", "--no-surrogate", "--residue", "0.5", "--step", "2K"]);
    let mut files: Vec<PathBuf> = vec![dir.join("mixture.csv"), dir.join("mixture_residue_0.50.csv")];
    files.extend(std::fs::read_dir(dir.join("components")).unwrap().map(|e| e.unwrap().path()));
    let mut worst = 0.0f64;
    let mut rows_checked = 0;
    for f in &files {
        let text = read(f);
        assert!(text.contains("# enthalpy: reference state: the liquid at 298.15 K has zero specific enthalpy"), "{}", f.display());
        let (h, rows) = parse_csv(&text);
        let (it, il, iv, icp, ilat) = (col(&h, "temperature_K"), col(&h, "liquid_enthalpy_J_kg"), col(&h, "vapor_enthalpy_J_kg"), col(&h, "cp_J_kgK"), col(&h, "latent_heat_J_kg"));
        let liquid: Vec<(f64, f64, f64, f64, f64)> = rows.iter().filter_map(|r| Some((r[it]?, r[il]?, r[iv]?, r[icp]?, r[ilat]?))).collect();
        for (t, hl, hv, _, l) in &liquid {
            let e = rel(hv - hl, *l);
            assert!(e <= 1e-9, "{} at {t} K: h_v − h_l = {} vs L = {l}", f.display(), hv - hl);
            worst = worst.max(e);
            rows_checked += 1;
        }
        for w in liquid.windows(2) {
            let (t0, h0, _, c0, _) = w[0];
            let (t1, h1, _, c1, _) = w[1];
            let trapezoid = 0.5 * (c0 + c1) * (t1 - t0);
            assert!(rel(h1 - h0, trapezoid) <= 2e-3, "{} {t0}–{t1} K: Δh {} vs trapezoid {trapezoid}", f.display(), h1 - h0);
        }
        // zero at the reference state: the rows straddling 298.15 K bracket zero
        if let (Some(a), Some(b)) = (liquid.iter().rev().find(|r| r.0 <= 298.15), liquid.iter().find(|r| r.0 >= 298.15)) {
            assert!(a.1 <= 1e-9 && b.1 >= -1e-9, "{}: {a:?} {b:?}", f.display());
        }
    }
    println!("{rows_checked} rows: worst |(h_v − h_l)/L − 1| = {worst:e}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// demo-wide at 10 bar: the table reaches its bubble point (573.5 K; the last 5 K row is 570 K). Before, the
/// range ended at 0.95 Tc of 2-methylheptane (530 K). n-octane (Tc 568.7 K) and 2-methylheptane (Tc 559.7 K)
/// pass their critical temperatures inside the range: graded by supercritical_share (their mole fractions),
/// not table-ending. Every fit piece meets 1 % or is flagged.
#[test]
fn demo_wide_at_10_bar_reaches_its_bubble_point() {
    let dir = temp("wide10");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "demo-wide", "--pressure", "10bar", "--out", out, "--no-date", "--no-surrogate"]);
    let text = read(&dir.join("mixture.csv"));
    let meta = |k: &str| text.lines().find_map(|l| l.strip_prefix(&format!("# {k}: "))).unwrap_or_else(|| panic!("{k}")).to_string();
    let tb: f64 = meta("bubble_point_K").parse().unwrap();
    assert!(meta("range_end").starts_with("bubble point"), "{}", meta("range_end"));
    let (h, rows) = parse_csv(&text);
    let texts = text_rows(&text);
    let last = rows.last().unwrap()[0].unwrap();
    assert!(last <= tb && last > tb - 5.0, "last row {last} K, bubble point {tb} K");
    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("demo-wide", &lib).unwrap();
    let x = fuel.mole_fractions();
    let mut graded = 0;
    for (r, tr) in rows.iter().zip(&texts) {
        let t = r[0].unwrap();
        let expected: f64 = fuel.components.iter().zip(&x).filter(|(c, _)| c.critical_temperature() < t).map(|(_, x)| x).sum();
        let share = r[col(&h, "supercritical_share")].unwrap();
        assert!((share - expected).abs() <= 1e-12, "{t} K: {share} vs {expected}");
        assert_eq!(tr[col(&h, "validity")] == "partly-supercritical", expected > 0.0, "{t} K");
        assert!(r[col(&h, "extrapolated_share")].unwrap() >= share);
        if expected > 0.0 {
            graded += 1;
        }
        for name in ["density_kg_m3", "cp_J_kgK", "latent_heat_J_kg", "viscosity_Pa_s", "surface_tension_N_m"] {
            assert!(r[col(&h, name)].is_some_and(|v| v > 0.0), "{name} at {t} K");
        }
    }
    assert!(graded >= 2, "{graded} rows with a supercritical share");
    let fits_text = read(&dir.join("fits.csv"));
    let (fh, fits) = parse_csv(&fits_text);
    for (f, ft) in fits.iter().zip(text_rows(&fits_text)) {
        let e = f[col(&fh, "max_relative_error")].unwrap();
        assert!(e <= 0.01 || ft[col(&fh, "flag")] == "max-error-above-1-percent", "{ft:?}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}

/// Pure n-dodecane at 1 atm: every row below its normal boiling point (489.5 K, CRC Handbook 95th ed.) from the
/// lower end of its published surface-tension range (273.15 K, Mulero–Cachadiña 2012) up is `ok` with zero
/// shares, in the mixture table and in its component table; the two rows below 273.15 K name the surface tension.
#[test]
fn n_dodecane_below_its_boiling_point_is_ok() {
    let dir = temp("dodecane-ok");
    let out = dir.to_str().unwrap();
    run_ok(&["table", "n-dodecane", "--out", out, "--no-date", "--no-surrogate"]);
    for file in ["mixture.csv", "components/n-dodecane.csv"] {
        let text = read(&dir.join(file));
        let (h, rows) = parse_csv(&text);
        let texts = text_rows(&text);
        let mut ok = 0;
        for (r, tr) in rows.iter().zip(&texts) {
            let t = r[0].unwrap();
            if r[col(&h, "density_kg_m3")].is_none() {
                continue;
            }
            assert!(t < 489.45);
            if t >= 273.15 {
                assert_eq!(tr[col(&h, "validity")], "ok", "{file} {t}");
                assert_eq!(tr[col(&h, "extrapolated_properties")], "", "{file} {t}");
                ok += 1;
            } else {
                assert_eq!((tr[col(&h, "validity")].as_str(), tr[col(&h, "extrapolated_properties")].as_str()), ("extrapolated", "surface-tension"), "{file} {t}");
            }
        }
        assert_eq!(ok, 43, "{file}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}
