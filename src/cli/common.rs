//! Helpers shared by the command files: output to stdout and stderr, quantity options, output targets, thread
//! counts and the residue table of a droplet run. No command file imports another; they all import this one.

use std::io::{IsTerminal, Write};
use std::path::Path;

use super::CliError;
use crate::model::{self, DropletInputs};
use crate::output;
use crate::units::{self, Quantity};

/// Write to stdout; a closed pipe (`| head`) is not an error.
pub(super) fn stdout_write(text: &str) -> Result<(), CliError> {
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|_| out.flush()) {
        Ok(()) => Ok(()),
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        Err(e) => Err(CliError::runtime(format!("stdout: {e}"))),
    }
}

/// A progress line on stderr, only when stderr is a terminal.
pub(super) fn progress(msg: &str) {
    if std::io::stderr().is_terminal() {
        let _ = writeln!(std::io::stderr(), "{msg}");
    }
}

/// A `note:` line on stderr.
pub(super) fn notice(msg: &str) {
    let _ = writeln!(std::io::stderr(), "note: {msg}");
}

/// A quantity option with its unit, in SI; the error names the option.
pub(super) fn parse_q(option: &str, text: &str, q: Quantity) -> Result<f64, CliError> {
    units::parse(text, q).map_err(|e| CliError::input(format!("--{option}: {e}")))
}

/// Worker threads for `--threads N`: 0 = every core; more than the cores this process may use is capped to
/// them with a note (the results do not depend on the thread count; thousands of threads only cost time and
/// memory).
pub(super) fn worker_threads(requested: usize) -> usize {
    let cores = std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1);
    if requested > cores {
        notice(&format!("--threads {requested}: this machine lets dropcut use {cores} cores; running {cores} threads"));
        return cores;
    }
    requested
}

/// Refuse an existing `--out` that is not a folder (a file, device, FIFO) before any work is done.
pub(super) fn out_dir(out: &Path) -> Result<(), CliError> {
    match output::refuse_dir_target(out) {
        Some(m) => Err(CliError::input(format!("--out {}: {m}", out.display()))),
        None => Ok(()),
    }
}

/// Refuse an existing `--out` file that is not a regular file (device, FIFO, symbolic link, folder).
pub(super) fn out_file(out: &Path) -> Result<(), CliError> {
    match output::refuse_file_target(out) {
        Some(m) => Err(CliError::input(format!("--out {}: {m}", out.display()))),
        None => Ok(()),
    }
}

/// Residual-liquid indicators along a droplet history (mean liquid, and the surface layer of a resolved
/// droplet) written to residue.csv.
pub(super) fn write_droplet_residue(dir: &Path, inp: &DropletInputs, run: &model::RunResult, limits: Option<&crate::post::Limits>) -> Result<(output::CsvTable, String), CliError> {
    use crate::post::droplet::{residues_along_history, Layer};
    let fractions = crate::post::weathering::default_fractions();
    let opts = crate::post::IndicatorOptions { activity: inp.liquid.activity, ..Default::default() };
    let comps = &inp.fuel.components;
    let mean = residues_along_history(&run.history, &fractions, Layer::Mean);
    let mean_rows = crate::post::residue_table(comps, &mean, &opts).map_err(|e| CliError::runtime(e.to_string()))?;
    let mut sets = vec![output::residue::ResidueSet { label: "mean", rows: &mean_rows }];
    let surface_rows;
    if inp.liquid.mixing == model::droplet::LiquidMixing::Diffusion {
        let surface = residues_along_history(&run.history, &fractions, Layer::Surface);
        surface_rows = crate::post::residue_table(comps, &surface, &opts).map_err(|e| CliError::runtime(e.to_string()))?;
        sets.push(output::residue::ResidueSet { label: "surface", rows: &surface_rows });
    }
    let table = output::residue::residue_table(&format!("residual liquid along the droplet history of {}", inp.fuel.name), &sets, limits)?;
    let text = table.render();
    output::write_atomic(&dir.join("residue.csv"), text.as_bytes())?;
    Ok((table, text))
}

/// `--history-times`: `START:STEP:END` (every STEP from START up to END inclusive) or a comma list `T1,T2,...`,
/// each a time with its unit (`ms`, `us`, `s`); checked (finite, ≥ 0, strictly ascending, a positive step, at
/// most [`model::guard::MAX_HISTORY_TIMES`] times) before any run, the error naming the option and the value
/// (the parser is [`model::guard::parse_history_times`], shared with sweep specs).
pub(super) fn parse_history_times(text: &str) -> Result<Vec<f64>, CliError> {
    model::guard::parse_history_times(text).map_err(|e| match e {
        model::guard::HistoryTimesError::Time(message) => CliError::input(format!("--history-times: {message}")),
        other => CliError::input(format!("--history-times {}", other.detail())),
    })
}

/// Hands the heap's freed pages back to the system before a phase that allocates a lot anew (the charts after
/// an `uncertainty` run): glibc keeps them in its per-thread arenas otherwise, so the two phases' peaks would
/// add up in the resident size. A no-op off glibc.
pub(crate) fn release_freed_memory() {
    #[cfg(all(target_os = "linux", target_env = "gnu"))]
    // SAFETY: malloc_trim only returns free memory of the allocator's arenas to the system; it takes no pointer.
    unsafe {
        libc::malloc_trim(0);
    }
}

#[cfg(test)]
mod history_times_tests {
    use super::parse_history_times;

    #[test]
    fn ranges_and_lists() {
        let t = parse_history_times("0:0.5ms:2ms").unwrap();
        assert_eq!(t.len(), 5);
        assert_eq!(t, vec![0.0, 0.5e-3, 1e-3, 1.5e-3, 2e-3]);
        assert_eq!(parse_history_times("0:0.25ms:20ms").unwrap()[59], 0.01475);
        assert_eq!(parse_history_times("1ms, 2ms,5ms").unwrap(), vec![1e-3, 2e-3, 5e-3]);
        for bad in ["0:0ms:1ms", "0:-1ms:1ms", "5ms:1ms:1ms", "-1ms:1ms:2ms", "2ms,1ms", "1ms,1ms", "-1ms", "nan", "0:1ns:1s", "1:2", "0:1ms:2ms:3ms", "1ms,,2ms", "0:1e-300:1"] {
            let e = parse_history_times(bad).unwrap_err();
            assert_eq!(e.code, 2, "{bad}");
            assert!(e.message.contains("history-times"), "{bad}: {}", e.message);
            assert!(!e.message.contains('\n') && !e.message.contains("NaN"), "{}", e.message);
        }
    }
}
