//! `dropcut plot` on a sweep folder draws lifetime maps over the first two swept inputs.
use std::process::Command;

#[test]
fn sweep_folder_gets_lifetime_maps() {
    let dir = std::env::temp_dir().join(format!("dropcut-sweepmap-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let spec = dir.join("spec.toml");
    std::fs::write(&spec, "fuels = [\"n-heptane\"]\n[conditions]\nambient-temperature = [\"600K\", \"900K\"]\ndiameter = [\"10um\", \"20um\", \"40um\"]\n").unwrap();
    let bin = env!("CARGO_BIN_EXE_dropcut");
    let out = dir.join("run");
    let st = Command::new(bin).args(["sweep", spec.to_str().unwrap(), "--out", out.to_str().unwrap()]).output().unwrap();
    assert!(st.status.success(), "{}", String::from_utf8_lossy(&st.stderr));
    let st = Command::new(bin).args(["plot", out.to_str().unwrap()]).output().unwrap();
    assert!(st.status.success(), "{}", String::from_utf8_lossy(&st.stderr));
    let svg = std::fs::read_to_string(out.join("chart_lifetime_map_n-heptane.svg")).unwrap();
    assert!(svg.starts_with("<svg") && svg.contains("Droplet lifetime of n-heptane") && svg.contains("initial diameter"));
    let png = std::fs::read(out.join("chart_lifetime_map_n-heptane.png")).unwrap();
    assert_eq!(&png[..8], b"\x89PNG\r\n\x1a\n");
    let _ = std::fs::remove_dir_all(&dir);
}

/// `--map-axes` and `--map-hold` choose the map and the slice of a three-input sweep; a held value that was not
/// swept, an axis that was not swept, or a choice on a folder that is not a sweep is refused with one line.
#[test]
fn map_axes_and_held_values_can_be_chosen() {
    let dir = std::env::temp_dir().join(format!("dropcut-sweepmap-choice-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let spec = dir.join("spec.toml");
    std::fs::write(&spec, "fuels = [\"n-heptane\"]\n[conditions]\nambient-temperature = [\"600K\", \"900K\"]\ndiameter = [\"10um\", \"20um\"]\npressure = [\"1bar\", \"5bar\"]\n").unwrap();
    let bin = env!("CARGO_BIN_EXE_dropcut");
    let out = dir.join("run");
    let run = |args: &[&str]| Command::new(bin).args(args).output().unwrap();
    let st = run(&["sweep", spec.to_str().unwrap(), "--out", out.to_str().unwrap()]);
    assert!(st.status.success(), "{}", String::from_utf8_lossy(&st.stderr));
    let o = out.to_str().unwrap();
    let svg = || std::fs::read_to_string(out.join("chart_lifetime_map_n-heptane.svg")).unwrap();
    // default: first two swept inputs, the third at its first value
    assert!(run(&["plot", o]).status.success());
    let default = svg();
    assert!(default.contains("at their first value") && default.contains("initial diameter = 10 µm"), "default slice not stated");
    // pressure and diameter span the map, ambient temperature held at 900 K
    let st = run(&["plot", o, "--map-axes", "pressure,diameter", "--map-hold", "ambient-temperature=900K"]);
    assert!(st.status.success(), "{}", String::from_utf8_lossy(&st.stderr));
    let chosen = svg();
    assert!(chosen.contains("ambient temperature = 900 K") && chosen.contains("pressure [bar]"), "chosen slice not drawn");
    assert_ne!(default, chosen);
    // held at a value given in other units (626.85 degC = 900 K) picks the same slice
    assert!(run(&["plot", o, "--map-axes", "pressure,diameter", "--map-hold", "ambient-temperature=626.85degC"]).status.success());
    assert_eq!(svg(), chosen);
    for (args, needle) in [
        (vec!["--map-hold", "diameter=15um"], "not a swept value"),
        (vec!["--map-axes", "velocity,diameter"], "not swept"),
        (vec!["--map-axes", "gas,diameter"], "not a numeric sweep input"),
        (vec!["--map-hold", "pressure"], "KEY=VALUE"),
        (vec!["--map-axes", "pressure,diameter", "--map-hold", "pressure=1bar"], "cannot also be held"),
    ] {
        let mut a = vec!["plot", o];
        a.extend(args.iter().copied());
        let st = run(&a);
        let err = String::from_utf8_lossy(&st.stderr);
        assert_eq!(st.status.code(), Some(2), "{a:?}: {err}");
        assert!(err.contains(needle) && err.trim().lines().count() == 1, "{a:?}: {err}");
    }
    let run_dir = dir.join("single");
    assert!(run(&["simulate", "n-heptane", "--no-plots", "--out", run_dir.to_str().unwrap()]).status.success());
    let st = run(&["plot", run_dir.to_str().unwrap(), "--map-axes", "pressure,diameter"]);
    assert_eq!(st.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&st.stderr).contains("not a sweep output folder"));
    let _ = std::fs::remove_dir_all(&dir);
}
