//! `--activity unifac` end to end through the binary: the option reaches the droplet model, the residue
//! indicators and `fuel show`, and moves results the way positive deviations from Raoult's law must
//! (more volatile ethanol and aromatics in a paraffinic liquid).

mod common;
use common::{ok, p, scratch};

fn json(text: &str) -> serde_json::Value {
    serde_json::from_str(text).expect("json")
}

/// An ethanol/n-dodecane liquid boils lower with UNIFAC (ethanol's γ ≫ 1 in the alkane) and the droplet
/// loses its ethanol sooner: t10 is shorter; the input echo records the model.
#[test]
fn ethanol_blend_is_more_volatile_with_unifac() {
    let dir = scratch("activity_cli", "ethanol");
    let fuel = dir.join("e20.toml");
    std::fs::write(&fuel, "name = \"e20\"\ndescription = \"20 % ethanol in n-dodecane\"\nbasis = \"mass\"\n[composition]\nethanol = 0.2\nn-dodecane = 0.8\n").unwrap();
    let show = |activity: &str| json(&ok(&["fuel", "show", p(&fuel), "--json", "--activity", activity]));
    let (ideal, unifac) = (show("ideal"), show("unifac"));
    let tb = |v: &serde_json::Value| v["bubble_point_K"].as_f64().unwrap();
    assert!(tb(&unifac) < tb(&ideal) - 10.0, "bubble points {} / {}", tb(&ideal), tb(&unifac));
    let run = |activity: &str| {
        let out = dir.join(activity);
        json(&ok(&["simulate", p(&fuel), "--activity", activity, "--no-plots", "--json", "--out", p(&out)]))
    };
    let (a, b) = (run("ideal"), run("unifac"));
    let t10 = |v: &serde_json::Value| v["t10_s"].as_f64().unwrap();
    assert!(t10(&b) < t10(&a), "t10 ideal {} s, unifac {} s", t10(&a), t10(&b));
    assert!(b["input"].to_string().contains("unifac"), "input echo: {}", b["input"]);
    // the ideal run says that an ethanol blend wants --activity unifac; the UNIFAC run does not
    let summary = |activity: &str| std::fs::read_to_string(dir.join(activity).join("summary.json")).unwrap();
    assert!(summary("ideal").contains("contains ethanol and is treated as ideal"), "{}", summary("ideal"));
    assert!(!summary("unifac").contains("treated as ideal"));
}

/// Weathering demo-wide in an open vessel removes its aromatics faster with UNIFAC (γ_aromatic > 1 among
/// paraffins): lower aromatic volume fraction in the residue at 50 % evaporated.
#[test]
fn aromatics_leave_faster_with_unifac() {
    let rows = |activity: &str| json(&ok(&["residue", "demo-wide", "--steps", "0,0.5", "--json", "--activity", activity]));
    let arom = |v: &serde_json::Value| v[1]["aromatics_volume_fraction"].as_f64().unwrap();
    let (a, b) = (rows("ideal"), rows("unifac"));
    assert!(arom(&b) < arom(&a) - 0.005, "aromatics at 50 %: ideal {}, unifac {}", arom(&a), arom(&b));
}
