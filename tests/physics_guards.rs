//! Physics guards: conditions at or past the edge of the droplet model run with a documented behaviour and a
//! note in `summary.json` (`regime_notes`, also printed as `note:` lines), as listed in docs/validity.md.
//! Each case runs the built binary on a small, short droplet (cases in parallel threads).

use std::path::PathBuf;
use std::process::Command;

mod common;
use common::BIN;

/// One guarded condition: the simulate options, notes that must appear and notes that must not.
struct Guard {
    name: &'static str,
    args: &'static [&'static str],
    notes: &'static [&'static str],
    absent: &'static [&'static str],
}

const GUARDS: &[Guard] = &[
    Guard {
        name: "UNIFAC activity coefficients above their fitted temperature range",
        args: &["demo-narrow", "--activity", "unifac", "--diameter", "20um"],
        notes: &["above the about 425 K up to which the original-UNIFAC parameters were fitted"],
        absent: &[],
    },
    Guard {
        name: "UNIFAC in a cool gas stays inside its range",
        args: &["demo-narrow", "--activity", "unifac", "--ambient-temperature", "350K", "--diameter", "20um", "--max-time", "50ms"],
        notes: &[],
        absent: &["original-UNIFAC parameters were fitted"],
    },
    Guard {
        name: "radiation and a suspending fibre are reported",
        args: &["n-heptane", "--diameter", "500um", "--radiation", "ambient", "--absorption-efficiency", "0.5", "--fibre-diameter", "100um", "--max-time", "20ms"],
        notes: &["radiation from black surroundings at 800.0 K is absorbed with efficiency 0.5", "suspended droplet: 1 fibre stem(s) of 100 µm"],
        absent: &["pseudo-critical"],
    },
    Guard {
        name: "ambient below the freezing point",
        args: &["n-hexadecane", "--ambient-temperature", "200K", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["below the fuel's ideal-solubility freezing point", "solidification is not modelled"],
        absent: &[],
    },
    Guard {
        name: "cold droplet below its freezing point in hot gas",
        args: &["n-hexadecane", "--droplet-temperature", "280K", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["was below the ideal-solubility freezing point of the surface liquid", "first crystals: n-hexadecane"],
        absent: &["ambient temperature"],
    },
    Guard {
        name: "droplet hotter than the gas",
        args: &["n-decane", "--ambient-temperature", "300K", "--droplet-temperature", "400K", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["droplet starts hotter than the gas"],
        absent: &["freezing point"],
    },
    Guard {
        name: "pressure above half the lowest critical pressure",
        args: &["n-decane", "--pressure", "12bar", "--diameter", "20um", "--max-time", "2ms"],
        notes: &["exceeds half the lowest component critical pressure"],
        absent: &["pseudo-critical"],
    },
    Guard {
        name: "pressure at or above the pseudo-critical pressure",
        args: &["n-decane", "--pressure", "30bar", "--diameter", "20um", "--max-time", "2ms"],
        notes: &["at or above the liquid's pseudo-critical pressure", "indicative only"],
        absent: &[],
    },
    Guard {
        name: "surface above the critical temperature (well-mixed)",
        args: &["n-decane", "--pressure", "300bar", "--ambient-temperature", "1500K", "--diameter", "20um", "--max-time", "50ms"],
        notes: &["rose above the critical temperature of n-decane", "supercritical"],
        absent: &[],
    },
    Guard {
        name: "surface above the critical temperature (resolved liquid)",
        args: &["n-decane", "--pressure", "300bar", "--ambient-temperature", "1500K", "--diameter", "20um", "--max-time", "50ms", "--liquid-mixing", "diffusion", "--liquid-heat", "conduction", "--nodes", "10"],
        notes: &["rose above the critical temperature of n-decane"],
        absent: &[],
    },
    Guard {
        name: "no critical note once the light components have gone",
        args: &["demo-wide", "--pressure", "10bar", "--diameter", "30um", "--velocity", "20", "--injected", "--max-time", "1s"],
        notes: &[],
        absent: &["critical temperature of"],
    },
    Guard {
        name: "supersaturated ambient vapour",
        args: &["n-decane", "--ambient-temperature", "300K", "--ambient-vapor", "n-decane=0.1", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["supersaturated", "condenses onto the droplet", "fog formation in the gas is not modelled"],
        absent: &[],
    },
    Guard {
        name: "unsaturated ambient vapour",
        args: &["n-decane", "--ambient-temperature", "800K", "--ambient-vapor", "n-decane=0.01", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["ambient contains fuel vapour"],
        absent: &["supersaturated"],
    },
    Guard {
        name: "Reynolds number beyond the correlations",
        args: &["n-decane", "--velocity", "300", "--diameter", "200um", "--max-time", "1ms"],
        notes: &["Reynolds number reached", "extrapolated"],
        absent: &[],
    },
    Guard {
        name: "Reynolds number beyond Ranz–Marshall's range names that correlation",
        args: &["n-decane", "--velocity", "150", "--diameter", "150um", "--correlation", "ranz-marshall", "--max-time", "1ms"],
        notes: &["to which the Ranz–Marshall correlation was fitted"],
        absent: &["Clift"],
    },
    Guard {
        name: "droplet injected above its bubble point",
        args: &["n-decane", "--droplet-temperature", "480K", "--diameter", "20um", "--max-time", "5ms"],
        notes: &["adiabatic flash", "evaporates below it"],
        absent: &[],
    },
    Guard {
        name: "plain condition raises no guard",
        args: &["n-decane", "--diameter", "20um"],
        notes: &[],
        absent: &["freezing", "critical", "hotter", "supersaturated", "Reynolds", "flash", "time limit"],
    },
];

fn temp_dir(tag: &str) -> PathBuf {
    common::scratch("physics-guards", tag)
}

/// Run one guard; returns the parsed summary.json.
fn run(g: &Guard, i: usize) -> Result<serde_json::Value, String> {
    let dir = temp_dir(&format!("{i}"));
    let out = dir.join("run");
    let o = Command::new(BIN).arg("simulate").args(g.args).args(["--no-plots", "--out"]).arg(&out).output().map_err(|e| e.to_string())?;
    let stderr = String::from_utf8_lossy(&o.stderr).into_owned();
    if !o.status.success() {
        return Err(format!("{}: exit {:?}: {stderr}", g.name, o.status.code()));
    }
    let text = std::fs::read_to_string(out.join("summary.json")).map_err(|e| format!("{}: summary.json: {e}", g.name))?;
    let summary: serde_json::Value = serde_json::from_str(&text).map_err(|e| format!("{}: summary.json: {e}", g.name))?;
    let notes: Vec<String> = summary["regime_notes"].as_array().ok_or(format!("{}: no regime_notes", g.name))?.iter().map(|n| n.as_str().unwrap_or("").to_string()).collect();
    let all = notes.join("\n");
    for want in g.notes {
        if !all.contains(want) {
            return Err(format!("{}: no note with {want:?} in {notes:?}", g.name));
        }
        if !stderr.contains(want) {
            return Err(format!("{}: the note {want:?} is not printed on stderr", g.name));
        }
    }
    for not in g.absent {
        if all.contains(not) {
            return Err(format!("{}: unexpected note with {not:?} in {notes:?}", g.name));
        }
    }
    let _ = std::fs::remove_dir_all(&dir);
    Ok(summary)
}

#[test]
fn each_guard_gives_its_note_and_behaviour() {
    let results: Vec<Result<serde_json::Value, String>> = std::thread::scope(|s| {
        let handles: Vec<_> = GUARDS.iter().enumerate().map(|(i, g)| s.spawn(move || run(g, i))).collect();
        handles.into_iter().map(|h| h.join().unwrap()).collect()
    });
    let errors: Vec<&String> = results.iter().filter_map(|r| r.as_ref().err()).collect();
    assert!(errors.is_empty(), "{}", errors.iter().map(|e| e.as_str()).collect::<Vec<_>>().join("\n"));
    let by_name = |name: &str| -> &serde_json::Value {
        let i = GUARDS.iter().position(|g| g.name == name).unwrap();
        results[i].as_ref().unwrap()
    };
    let num = |v: &serde_json::Value, key: &str| v[key].as_f64().unwrap_or_else(|| panic!("{key} missing in {v}"));
    // Behaviours that go with the notes.
    let hot = by_name("droplet hotter than the gas");
    assert!((num(hot, "max_surface_temperature_K") - 400.0).abs() < 1e-6, "the hot droplet only cools");
    let cold = by_name("ambient below the freezing point");
    assert!(num(cold, "max_surface_temperature_K") <= 300.0 + 1e-9);
    for name in ["surface above the critical temperature (well-mixed)", "surface above the critical temperature (resolved liquid)"] {
        let s = by_name(name);
        assert!(num(s, "max_surface_temperature_K") > 617.7, "{name}: the surface passes n-decane's Tc");
        assert_eq!(s["status"], "evaporated", "{name}: the run goes on to the end");
    }
    let fog = by_name("supersaturated ambient vapour");
    assert!(num(fog, "final_evaporated_fraction") < 0.0, "vapour condenses: the droplet grows");
    // 480 K n-decane in 800 K air: the flash brings it to the bubble point, but the diffusion-limited evaporation
    // there takes more heat than the gas supplies, so it does not boil: it evaporates below the bubble point
    let flash = by_name("droplet injected above its bubble point");
    assert!(flash["boiling_onset_s"].is_null(), "no boiling regime: {flash}");
    assert!(num(flash, "max_surface_temperature_K") < 447.5, "held no higher than the bubble point (447.46 K): {flash}");
    assert_eq!(flash["status"], "evaporated");
}
