//! CLI tests of `dropcut sweep` and `dropcut merge`, running the built binary in temporary folders: shards merged
//! equal the unsharded run, kill-and-resume, determinism across thread counts, bad specs, failed cases, Slurm
//! environment, histories. Sweeps are small (tiny droplets, a few dozen cases) to keep the suite fast.

use std::fs;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::time::Duration;

mod common;
use common::BIN;

/// A fresh temporary folder, removed when the test passes.
struct TempDir(PathBuf);

impl TempDir {
    fn new(name: &str) -> Self {
        let p = std::env::temp_dir().join(format!("dropcut-test-sweep-{}-{name}", std::process::id()));
        let _ = fs::remove_dir_all(&p);
        fs::create_dir_all(&p).unwrap();
        let fuel = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/ten-component.toml");
        fs::copy(fuel, p.join("ten-component.toml")).unwrap();
        TempDir(p)
    }
    fn path(&self) -> &Path {
        &self.0
    }
    fn write(&self, name: &str, text: &str) -> PathBuf {
        let p = self.0.join(name);
        fs::write(&p, text).unwrap();
        p
    }
}

impl Drop for TempDir {
    fn drop(&mut self) {
        if !std::thread::panicking() {
            let _ = fs::remove_dir_all(&self.0);
        }
    }
}

fn dropcut(dir: &Path, args: &[&str]) -> Output {
    common::run_in(dir, args)
}

fn ok(dir: &Path, args: &[&str]) -> Output {
    common::ok_in(dir, args)
}

fn read(p: impl AsRef<Path>) -> Vec<u8> {
    fs::read(p.as_ref()).unwrap_or_else(|e| panic!("{}: {e}", p.as_ref().display()))
}

/// 2 fuels × 3 temperatures × 2 pressures × 2 zipped (diameter, velocity) = 24 small cases.
const SMALL: &str = r#"
name = "test sweep"
fuels = ["n-decane", "ten-component.toml"]
zipped = [["diameter", "velocity"]]
[conditions]
ambient-temperature = { from = "600K", to = "1000K", steps = 3 }
pressure = ["1bar", "5bar"]
diameter = ["10um", "20um"]
velocity = [0, 5]
max-time = "1s"
"#;

fn data_rows(summary: &[u8]) -> Vec<String> {
    String::from_utf8(summary.to_vec()).unwrap().lines().filter(|l| !l.starts_with('#')).skip(1).map(String::from).collect()
}

#[test]
fn shards_merged_equal_the_unsharded_run() {
    let t = TempDir::new("shards");
    t.write("spec.toml", SMALL);
    ok(t.path(), &["sweep", "spec.toml", "--out", "whole"]);
    let whole = read(t.path().join("whole/summary.csv"));
    let rows = data_rows(&whole);
    assert_eq!(rows.len(), 24);
    for (i, r) in rows.iter().enumerate() {
        assert!(r.starts_with(&format!("{i},")), "row {i}: {r}");
        assert!(r.ends_with(",evaporated"), "row {i}: {r}");
    }
    for n in [1u32, 2, 3, 7] {
        let mut dirs = vec![];
        for k in 0..n {
            let dir = format!("n{n}/shard-{k}");
            ok(t.path(), &["sweep", "spec.toml", "--out", &dir, "--shard", &format!("{k}/{n}"), "--threads", "1"]);
            let text = String::from_utf8(read(t.path().join(&dir).join("summary.csv"))).unwrap();
            if n > 1 {
                assert!(text.contains(&format!("\n# shard: {k}/{n} ")), "{dir}");
            }
            for r in data_rows(text.as_bytes()) {
                let id: u32 = r.split(',').next().unwrap().parse().unwrap();
                assert_eq!(id % n, k, "{dir}: {r}");
            }
            dirs.push(dir);
        }
        dirs.reverse(); // merge must not depend on the order of its arguments
        let mut args = vec!["merge"];
        args.extend(dirs.iter().map(|s| s.as_str()));
        let out = format!("n{n}/merged");
        args.extend(["--out", &out]);
        ok(t.path(), &args);
        assert!(read(t.path().join(&out).join("summary.csv")) == whole, "{n} shards merged differ from the single run");
    }
    // a missing shard is refused, naming it
    let out = dropcut(t.path(), &["merge", "n3/shard-0", "n3/shard-2", "--out", "bad"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("1/3"), "{}", String::from_utf8_lossy(&out.stderr));
}

#[test]
fn same_summary_whatever_the_thread_count() {
    let t = TempDir::new("threads");
    t.write("spec.toml", SMALL);
    ok(t.path(), &["sweep", "spec.toml", "--out", "t1", "--threads", "1"]);
    ok(t.path(), &["sweep", "spec.toml", "--out", "t2", "--threads", "2"]);
    ok(t.path(), &["sweep", "spec.toml", "--out", "t0"]);
    let a = read(t.path().join("t1/summary.csv"));
    assert!(a == read(t.path().join("t2/summary.csv")), "--threads 1 and 2 differ");
    assert!(a == read(t.path().join("t0/summary.csv")), "--threads 1 and all cores differ");
}

fn field_count(line: &str) -> usize {
    let mut quoted = false;
    1 + line.chars().filter(|c| {
        if *c == '"' {
            quoted = !quoted;
        }
        *c == ',' && !quoted
    }).count()
}

/// Complete rows of a journal or summary must be the cases 0, 1, 2, ... in order, each once, each whole.
fn check_rows(text: &[u8], n_fields: usize) -> usize {
    let text = String::from_utf8_lossy(text);
    let body: Vec<&str> = text.split_inclusive('\n').filter(|l| !l.starts_with('#')).skip(1).collect();
    let mut n = 0;
    for (i, line) in body.iter().enumerate() {
        if !line.ends_with('\n') {
            assert_eq!(i, body.len() - 1, "an unfinished line that is not the last one");
            break;
        }
        assert!(line.starts_with(&format!("{i},")), "row {i} is out of order or duplicated: {line}");
        assert_eq!(field_count(line), n_fields, "row {i} is not whole: {line}");
        n += 1;
    }
    n
}

#[test]
fn killed_runs_resume_to_the_same_summary() {
    let t = TempDir::new("kill");
    // 800 ten-component cases: long enough (a second or more) to be killed mid-way several times; the quoted
    // gas text (it holds a comma) goes through the resume checks
    t.write(
        "spec.toml",
        r#"
fuels = ["ten-component.toml"]
[conditions]
ambient-temperature = { from = "600K", to = "1000K", steps = 50 }
pressure = ["1bar", "5bar"]
gas = ["air", "o2=0.15,n2=0.85"]
diameter = ["10um", "20um"]
velocity = [0, 5]
max-time = "1s"
"#,
    );
    ok(t.path(), &["sweep", "spec.toml", "--out", "reference", "--threads", "2"]);
    let reference = read(t.path().join("reference/summary.csv"));
    let header = String::from_utf8_lossy(&reference).lines().find(|l| !l.starts_with('#')).unwrap().to_string();
    let n_fields = field_count(&header);
    assert!(String::from_utf8_lossy(&reference).contains(",\"o2=0.15,n2=0.85\","));
    assert_eq!(check_rows(&reference, n_fields), 800);

    let journal = t.path().join("run/summary.csv.partial");
    let summary = t.path().join("run/summary.csv");
    let mut seen_partial = false;
    let mut torn = false;
    for (round, delay_ms) in [5u64, 40, 150, 350, 350, 350, 350, 350].into_iter().enumerate() {
        let mut child = Command::new(BIN)
            .args(["sweep", "spec.toml", "--out", "run", "--resume", "--threads", "2"])
            .current_dir(t.path())
            .env_remove("SLURM_ARRAY_TASK_ID")
            .stdout(Stdio::null())
            .stderr(Stdio::null())
            .spawn()
            .unwrap();
        std::thread::sleep(Duration::from_millis(delay_ms));
        let _ = child.kill(); // SIGKILL
        let _ = child.wait();
        if summary.exists() {
            assert!(read(&summary) == reference, "round {round}: a finished summary differs from the reference");
            assert!(!journal.exists());
            break;
        }
        if journal.exists() {
            let j = read(&journal);
            let rows = check_rows(&j, n_fields);
            let whole_lines = &j[..j.iter().rposition(|b| *b == b'\n').map_or(0, |p| p + 1)];
            assert!(reference.starts_with(whole_lines), "round {round}: the journal's whole rows differ from the reference");
            if rows > 0 && rows < 800 {
                if !torn {
                    torn = true;
                    // a torn last line, as a kill in the middle of a write would leave it: resume must cut it
                    let mut j = j;
                    j.extend_from_slice(format!("{rows},ten-component.toml,7").as_bytes());
                    fs::write(&journal, j).unwrap();
                }
                seen_partial = true;
            }
        }
    }
    ok(t.path(), &["sweep", "spec.toml", "--out", "run", "--resume", "--threads", "2"]);
    assert!(read(&summary) == reference, "resumed summary differs from an uninterrupted run");
    assert!(!journal.exists());
    // resuming a finished sweep runs nothing and changes nothing
    let out = ok(t.path(), &["sweep", "spec.toml", "--out", "run", "--resume"]);
    assert!(String::from_utf8_lossy(&out.stdout).contains("nothing to run"));
    assert!(read(&summary) == reference);
    // On a loaded machine every kill may land before the first row or after the last; then only the
    // final comparison above was exercised. Say so instead of failing.
    if !seen_partial {
        eprintln!("note: no kill landed mid-sweep on this machine; the resume-from-partial path was not exercised");
    }
    assert_eq!(seen_partial, torn);
}

#[test]
fn resume_refuses_another_spec_and_run_refuses_a_used_folder() {
    let t = TempDir::new("refuse");
    t.write("spec.toml", SMALL);
    t.write("other.toml", &SMALL.replace("steps = 3", "steps = 4"));
    ok(t.path(), &["sweep", "spec.toml", "--out", "out"]);
    let again = dropcut(t.path(), &["sweep", "spec.toml", "--out", "out"]);
    assert_eq!(again.status.code(), Some(2));
    let other = dropcut(t.path(), &["sweep", "other.toml", "--out", "out", "--resume"]);
    assert_eq!(other.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&other.stderr).contains("another spec"), "{}", String::from_utf8_lossy(&other.stderr));
    // an unfinished journal from another spec is refused too
    fs::create_dir_all(t.path().join("half")).unwrap();
    let s = fs::read_to_string(t.path().join("out/summary.csv")).unwrap();
    fs::write(t.path().join("half/summary.csv.partial"), &s[..s.len() / 2]).unwrap();
    let other = dropcut(t.path(), &["sweep", "other.toml", "--out", "half", "--resume"]);
    assert_eq!(other.status.code(), Some(2));
    let fresh = dropcut(t.path(), &["sweep", "spec.toml", "--out", "half"]);
    assert_eq!(fresh.status.code(), Some(2), "an unfinished sweep must need --resume");
    // while another process holds the journal, a second run stops without touching it
    let journal = t.path().join("half/summary.csv.partial");
    let before = read(&journal);
    {
        let held = fs::OpenOptions::new().read(true).write(true).open(&journal).unwrap();
        held.try_lock().unwrap();
        let second = dropcut(t.path(), &["sweep", "spec.toml", "--out", "half", "--resume"]);
        assert_eq!(second.status.code(), Some(2));
        assert!(String::from_utf8_lossy(&second.stderr).contains("another dropcut sweep is writing"), "{}", String::from_utf8_lossy(&second.stderr));
        assert!(read(&journal) == before, "the journal was changed while locked");
    }
    ok(t.path(), &["sweep", "spec.toml", "--out", "half", "--resume"]);
    assert!(read(t.path().join("half/summary.csv")) == read(t.path().join("out/summary.csv")));
}

#[test]
fn bad_specs_exit_2_with_one_line_naming_the_field() {
    let t = TempDir::new("bad");
    let cases: [(&str, &str); 10] = [
        ("fuels = [\"n-decane\"]\n[conditions]\nambient-temprature = \"800K\"\n", "conditions.ambient-temprature"),
        ("fuels = [\"n-decane\"]\n[conditions]\npressure = [\"1bar\", \"3 parsec\"]\n", "conditions.pressure[1]"),
        ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = \"50 furlongs\"\n", "conditions.diameter"),
        ("fuels = [\"no-such-fuel\"]\n", "fuels[0]"),
        ("fuels = [\"missing-file.toml\"]\n", "fuels[0]"),
        ("fuels = [\"n-decane\"]\n[conditions]\nambient-temperature = { from = \"500K\", to = \"900K\", stepz = 3 }\n", "conditions.ambient-temperature.stepz"),
        ("fuels = [\"n-decane\"]\n[conditions\n", "(syntax)"),
        ("fuels = [\"n-decane\"]\nzipped = [[\"diameter\", \"velocity\"]]\n[conditions]\ndiameter = [\"10um\", \"20um\"]\nvelocity = [1, 2, 3]\n", "zipped[0]"),
        ("fuels = [\"n-decane\"]\n[conditions]\ncorrelation = \"ranz\"\n", "conditions.correlation"),
        ("fuels = [\"n-decane\"]\noutput = { histories = \"yes\" }\n", "output.histories"),
    ];
    for (i, (text, field)) in cases.iter().enumerate() {
        let name = format!("bad{i}.toml");
        t.write(&name, text);
        let out = dropcut(t.path(), &["sweep", &name, "--out", "o"]);
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{name}: {err}");
        assert_eq!(err.trim_end().lines().count(), 1, "{name}: not one line: {err}");
        assert!(err.starts_with(&format!("error: {name}: {field}")), "{name}: {err}");
        assert!(out.stdout.is_empty());
    }
    let out = dropcut(t.path(), &["sweep", "nope.toml"]);
    assert_eq!(out.status.code(), Some(2));
    let out = dropcut(t.path(), &["sweep", "bad0.toml", "--shard", "3/3"]);
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn a_failing_case_is_recorded_and_the_sweep_goes_on() {
    let t = TempDir::new("failing");
    t.write(
        "spec.toml",
        "fuels = [\"n-decane\"]\n[conditions]\nambient-temperature = [\"800K\", \"5000K\", \"900K\"]\ndiameter = \"10um\"\nmax-time = \"1s\"\n",
    );
    let out = ok(t.path(), &["sweep", "spec.toml", "--out", "o"]);
    assert!(String::from_utf8_lossy(&out.stdout).contains("1 failed"));
    let rows = data_rows(&read(t.path().join("o/summary.csv")));
    assert_eq!(rows.len(), 3);
    assert!(rows[0].ends_with(",evaporated"));
    assert!(rows[1].contains(",failed: ambient-temperature"), "{}", rows[1]);
    assert!(rows[2].ends_with(",evaporated"));
    // the failed row has empty result and residue cells
    assert!(rows[1].contains(",,,,,,,,,,,,,,,,failed: "), "{}", rows[1]);
}

#[test]
fn residue_indicator_columns_and_switching_them_off() {
    let t = TempDir::new("residue");
    let spec = "fuels = [\"ten-component.toml\"]\n[conditions]\ndiameter = [\"10um\", \"20um\"]\nmax-time = \"1s\"\n";
    t.write("on.toml", spec);
    t.write("off.toml", &format!("{spec}[output]\nresidue-indicators = false\n"));
    ok(t.path(), &["sweep", "on.toml", "--out", "on"]);
    ok(t.path(), &["sweep", "off.toml", "--out", "off"]);
    let on = String::from_utf8(read(t.path().join("on/summary.csv"))).unwrap();
    let off = String::from_utf8(read(t.path().join("off/summary.csv"))).unwrap();
    let header_on = on.lines().find(|l| !l.starts_with('#')).unwrap();
    let header_off = off.lines().find(|l| !l.starts_with('#')).unwrap();
    for col in ["residue_t50_K", "residue_flash_point_K", "residue_density_15C_kg_m3", "residue_dcn", "residue_dcn_not_measured_share"] {
        assert!(header_on.contains(col), "{header_on}");
    }
    assert!(!header_off.contains("residue_"));
    assert!(header_on.ends_with(",status") && header_off.ends_with(",status"));
    // the residue of an evaporated ten-component droplet is heavier than the fuel: its flash point is above
    // the fresh fuel's lightest components' and it has a value
    let cols: Vec<&str> = header_on.split(',').collect();
    let fp = cols.iter().position(|c| *c == "residue_flash_point_K").unwrap();
    for row in data_rows(on.as_bytes()) {
        let v: f64 = row.split(',').nth(fp).unwrap().parse().unwrap();
        assert!(v > 300.0 && v < 500.0, "{row}");
    }
}

#[test]
fn slurm_environment_and_batch_script() {
    let t = TempDir::new("slurm");
    t.write("spec.toml", SMALL);
    ok(t.path(), &["sweep", "spec.toml", "--out", "explicit", "--shard", "1/3"]);
    // array 4-6: task 5 is shard 1 of 3
    let out = Command::new(BIN)
        .args(["sweep", "spec.toml", "--out", "from-env"])
        .current_dir(t.path())
        .env("SLURM_ARRAY_TASK_ID", "5")
        .env("SLURM_ARRAY_TASK_MIN", "4")
        .env("SLURM_ARRAY_TASK_COUNT", "3")
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(read(t.path().join("from-env/summary.csv")) == read(t.path().join("explicit/summary.csv")));

    let out = ok(t.path(), &["sweep", "spec.toml", "--slurm-script", "--shards", "3", "--cpus-per-task", "2", "--out", "cluster", "--sbatch=--time=00:10:00"]);
    let script = String::from_utf8(out.stdout).unwrap();
    assert!(script.starts_with("#!/bin/bash\n"));
    for needle in ["#SBATCH --array=0-2\n", "#SBATCH --cpus-per-task=2\n", "#SBATCH --time=00:10:00\n", "--dependency=afterok:", "/shard-$SLURM_ARRAY_TASK_ID", " merge "] {
        assert!(script.contains(needle), "script lacks {needle:?}:\n{script}");
    }
    assert!(t.path().join("cluster/logs").is_dir());
    let syntax = Command::new("bash").arg("-n").stdin(Stdio::piped()).spawn().and_then(|mut c| {
        use std::io::Write;
        c.stdin.take().unwrap().write_all(script.as_bytes())?;
        c.wait()
    });
    if let Ok(status) = syntax {
        assert!(status.success(), "the batch script is not valid bash");
    }
}

#[test]
fn histories_relative_fuel_paths_and_merge_copies_them() {
    let t = TempDir::new("histories");
    fs::create_dir_all(t.path().join("specs/fuels")).unwrap();
    fs::copy(t.path().join("ten-component.toml"), t.path().join("specs/fuels/ten.toml")).unwrap();
    // the fuel path is relative to the spec's folder, not to the current one
    t.write("specs/spec.toml", "fuels = [\"fuels/ten.toml\"]\n[conditions]\ndiameter = [\"10um\", \"12um\", \"14um\"]\nmax-time = \"1s\"\n");
    ok(t.path(), &["sweep", "specs/spec.toml", "--out", "h", "--histories"]);
    for id in 0..3 {
        assert!(t.path().join(format!("h/cases/{id}/history.csv")).is_file());
        assert!(t.path().join(format!("h/cases/{id}/summary.json")).is_file());
    }
    for k in 0..2 {
        ok(t.path(), &["sweep", "specs/spec.toml", "--out", &format!("s{k}"), "--shard", &format!("{k}/2"), "--histories"]);
    }
    ok(t.path(), &["merge", "s0", "s1", "--out", "m"]);
    assert!(read(t.path().join("m/summary.csv")) == read(t.path().join("h/summary.csv")));
    for id in 0..3 {
        assert!(read(t.path().join(format!("m/cases/{id}/history.csv"))) == read(t.path().join(format!("h/cases/{id}/history.csv"))));
    }
    let rows = data_rows(&read(t.path().join("h/summary.csv")));
    assert!(rows[0].starts_with("0,fuels/ten.toml,"), "{}", rows[0]);
}
