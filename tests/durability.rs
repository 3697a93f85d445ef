//! The durability policy of written files (docs/validity.md, "Interrupted runs and determinism"): every output is
//! written to a temporary file and renamed into place; only files that a later run trusts without recomputing
//! them (a sweep's per-case histories, its journal and summary) are also forced to disk. One test in its own
//! binary, because it reads the process-wide count of `fsync` calls (`output::sync_count`).

use std::fs;
use std::path::{Path, PathBuf};

use dropcut::data::Library;
use dropcut::output::{self, Durability, OutputError};
use dropcut::sweep::{self, spec::SweepSpec};

fn scratch(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("dropcut-test-durability-{}-{name}", std::process::id()));
    let _ = fs::remove_dir_all(&d);
    fs::create_dir_all(&d).unwrap();
    d
}

fn temporaries(dir: &Path) -> Vec<String> {
    fs::read_dir(dir).unwrap().map(|e| e.unwrap().file_name().to_string_lossy().into_owned()).filter(|n| n.contains(".tmp-")).collect()
}

#[test]
fn only_files_a_later_run_trusts_are_synced() {
    let d = scratch("policy");
    let syncs = output::sync_count;

    // a command's results: renamed into place, never synced
    let before = syncs();
    output::write_atomic(&d.join("a.csv"), b"x\n1\n").unwrap();
    output::write_file(&d.join("b.csv"), b"x\n2\n", Durability::Atomic).unwrap();
    output::together(|| -> Result<(), OutputError> {
        output::write_atomic(&d.join("a.csv"), b"x\n3\n")?;
        output::write_atomic(&d.join("b.csv"), b"x\n4\n")
    })
    .unwrap();
    assert_eq!(syncs(), before, "atomic writes must not sync");
    assert_eq!(fs::read_to_string(d.join("a.csv")).unwrap(), "x\n3\n");
    assert_eq!(fs::read_to_string(d.join("b.csv")).unwrap(), "x\n4\n");

    // a synced file: the file before its rename, the folder after it
    let before = syncs();
    output::write_synced(&d.join("c.csv"), b"x\n5\n").unwrap();
    assert_eq!(syncs() - before, 2);
    // a group with synced files syncs each file and the folder once
    let before = syncs();
    output::together(|| -> Result<(), OutputError> {
        output::write_synced(&d.join("c.csv"), b"x\n6\n")?;
        output::write_synced(&d.join("d.csv"), b"x\n7\n")?;
        output::write_atomic(&d.join("a.csv"), b"x\n8\n")
    })
    .unwrap();
    assert_eq!(syncs() - before, 3);
    assert_eq!(fs::read_to_string(d.join("d.csv")).unwrap(), "x\n7\n");
    assert!(temporaries(&d).is_empty(), "{:?}", temporaries(&d));

    // the protections hold for both kinds: no write through a symbolic link or onto a FIFO
    #[cfg(unix)]
    {
        std::os::unix::fs::symlink(d.join("a.csv"), d.join("link.csv")).unwrap();
        for durability in [Durability::Atomic, Durability::Synced] {
            let e = output::write_file(&d.join("link.csv"), b"y\n", durability).unwrap_err();
            assert!(e.to_string().contains("symbolic link"), "{e}");
        }
        assert_eq!(fs::read_to_string(d.join("a.csv")).unwrap(), "x\n8\n");
        let fifo = d.join("pipe.csv");
        assert!(std::process::Command::new("mkfifo").arg(&fifo).status().is_ok_and(|s| s.success()));
        for durability in [Durability::Atomic, Durability::Synced] {
            let e = output::write_file(&fifo, b"y\n", durability).unwrap_err();
            assert!(e.to_string().contains("not a regular file"), "{e}");
        }
    }

    // a sweep: each case history is synced (its journal row is kept by --resume), and the journal and summary
    let lib = Library::embedded().unwrap();
    let spec = SweepSpec::parse("fuels = [\"n-decane\"]\n[conditions]\ndiameter = [\"5um\", \"6um\"]\nmax-time = \"1s\"\n", "spec.toml", Path::new(""), &lib).unwrap();
    let run = |out: &Path, histories: bool| {
        let before = syncs();
        let opts = sweep::RunOptions { threads: 1, histories, ..Default::default() };
        sweep::run(&spec, out, &opts, &mut sweep::runner::NoProgress).unwrap();
        syncs() - before
    };
    let with_histories = run(&d.join("sweep-h"), true);
    // two cases × (history.csv + summary.json + their folder)
    assert!(with_histories >= 6, "{with_histories} syncs for a sweep with two case histories");
    assert!(d.join("sweep-h/cases/0/history.csv").is_file() && d.join("sweep-h/summary.csv").is_file());
    let without = run(&d.join("sweep-s"), false);
    assert_eq!(with_histories - without, 6, "case histories must be synced");
    assert_eq!(fs::read(d.join("sweep-h/summary.csv")).unwrap(), fs::read(d.join("sweep-s/summary.csv")).unwrap());

    // a single run's files: rendered, written together, not synced; what is read back equals what was written
    let before = syncs();
    let gas = dropcut::props::gas::AmbientGas::air(&lib).unwrap();
    let inputs = dropcut::model::droplet::DropletInputs::new(dropcut::fuel::Fuel::resolve("n-decane", &lib).unwrap(), gas, 800.0, 101_325.0, 20e-6, 300.0);
    let result = dropcut::model::simulate(&inputs, &mut dropcut::model::guard::RowsOnly).unwrap();
    let files = output::history::write_run(&d.join("run"), &inputs, &result, Durability::Atomic).unwrap();
    assert_eq!(syncs(), before);
    assert_eq!(fs::read_to_string(d.join("run/history.csv")).unwrap(), files.history);
    assert_eq!(fs::read_to_string(d.join("run/summary.json")).unwrap(), files.summary);
    let loaded = output::read::SavedRun::load(&d.join("run")).unwrap();
    let parsed = output::read::SavedRun::from_texts(&d.join("run"), &files.history, Some(&files.summary), None, None).unwrap();
    assert_eq!((loaded.history.header, loaded.history.rows, loaded.summary), (parsed.history.header, parsed.history.rows, parsed.summary));

    let _ = fs::remove_dir_all(&d);
}
