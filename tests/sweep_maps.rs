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
