//! `dropcut sweep` and `dropcut merge`: options to [`crate::sweep`] calls, progress on stderr, Slurm script.

use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

use super::args::{MergeArgs, SweepArgs};
use super::common::{notice, stdout_write};
use super::CliError;
use crate::data::Library;
use crate::sweep::{self, slurm, Progress, RunOptions, Shard, SweepSpec};

/// Interval of the plain progress lines written when stderr is not a terminal.
const PLAIN_EVERY: Duration = Duration::from_secs(10);

/// Progress on stderr: a bar with rate and ETA on a terminal; otherwise nothing, or a plain line every 10 s
/// when asked for (`--progress-log`, batch logs).
struct StderrProgress {
    bar: Option<ProgressBar>,
    plain: bool,
    started: Instant,
    last_line: Instant,
    total: u64,
    already: u64,
}

impl StderrProgress {
    fn new(plain: bool) -> Self {
        StderrProgress { bar: None, plain, started: Instant::now(), last_line: Instant::now(), total: 0, already: 0 }
    }
}

fn format_duration(s: f64) -> String {
    let s = s.max(0.0).round() as u64;
    if s >= 3600 {
        format!("{}h{:02}m", s / 3600, (s % 3600) / 60)
    } else if s >= 60 {
        format!("{}m{:02}s", s / 60, s % 60)
    } else {
        format!("{s}s")
    }
}

impl Progress for StderrProgress {
    fn start(&mut self, total: u64, already_done: u64) {
        self.total = total;
        self.already = already_done;
        self.started = Instant::now();
        self.last_line = Instant::now();
        if std::io::stderr().is_terminal() {
            let bar = ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::stderr());
            let style = ProgressStyle::with_template("sweep {bar:30} {pos}/{len} cases, {rate}, ETA {eta}")
                .unwrap_or_else(|_| ProgressStyle::default_bar())
                .with_key("rate", |state: &indicatif::ProgressState, w: &mut dyn std::fmt::Write| {
                    let _ = write!(w, "{:.1} cases/s", state.per_sec());
                });
            bar.set_style(style);
            bar.set_position(already_done);
            bar.reset_eta();
            self.bar = Some(bar);
        }
    }

    fn update(&mut self, done: u64) {
        if let Some(bar) = &self.bar {
            bar.set_position(done);
            return;
        }
        if self.plain && self.last_line.elapsed() >= PLAIN_EVERY {
            self.last_line = Instant::now();
            let elapsed = self.started.elapsed().as_secs_f64();
            let ran = done.saturating_sub(self.already) as f64;
            let rate = if elapsed > 0.0 { ran / elapsed } else { 0.0 };
            let eta = if rate > 0.0 { format_duration((self.total - done.min(self.total)) as f64 / rate) } else { "?".into() };
            let _ = writeln!(std::io::stderr(), "sweep: {done}/{} cases, {rate:.1} cases/s, ETA {eta}", self.total);
        }
    }

    fn finish(&mut self, _done: u64) {
        if let Some(bar) = self.bar.take() {
            bar.finish_and_clear();
        }
    }
}

fn absolute(p: &Path) -> Result<PathBuf, CliError> {
    std::path::absolute(p).map_err(|e| CliError::input(format!("{}: {e}", p.display())))
}

/// `dropcut sweep SPEC ...`
pub fn sweep(lib: &Library, args: &SweepArgs, components: Option<&Path>) -> Result<(), CliError> {
    let spec = SweepSpec::load(&args.spec, lib)?;
    for f in spec.fuels() {
        for n in &f.fuel.notices {
            notice(n);
        }
    }
    super::common::out_dir(&args.out)?;
    if args.slurm_script {
        return slurm_script(&spec, args, components);
    }
    let shard = match &args.shard {
        Some(text) => Shard::parse(text).map_err(|e| CliError::input(format!("--shard {text}: {e}")))?,
        None => match Shard::from_slurm(|k| std::env::var(k).ok()).map_err(CliError::input)? {
            Some(s) => {
                notice(&format!("Slurm job array task: running shard {s} (the cases with case_id % {} == {})", s.count, s.index));
                s
            }
            None => Shard::WHOLE,
        },
    };
    let opts = RunOptions {
        threads: super::common::worker_threads(args.threads),
        shard,
        histories: args.histories,
        resume: args.resume,
        extra_columns: if spec.residue_indicators { vec![Box::new(sweep::ResidueIndicators::default())] } else { vec![] },
    };
    let started = Instant::now();
    let mut progress = StderrProgress::new(args.progress_log);
    let report = sweep::run(&spec, &args.out, &opts, &mut progress)?;
    if let Some((id, reason)) = &report.damaged_row {
        notice(&format!("{}: the row of case {id} {reason}; it and every later row were run again", args.out.join(sweep::JOURNAL_FILE).display()));
    }
    let what = if shard.is_whole() { String::new() } else { format!(" (shard {shard})") };
    let line = if report.already_complete {
        format!("{} already holds all {} cases{what}; nothing to run\n", report.summary.display(), report.cases)
    } else {
        format!(
            "wrote {}{what}: {} cases ({} run now, {} resumed), {} failed, {:.1} s (lifetime maps: dropcut plot <folder>)\n",
            report.summary.display(),
            report.cases,
            report.ran,
            report.resumed,
            report.failed,
            started.elapsed().as_secs_f64()
        )
    };
    stdout_write(&line)
}

fn slurm_script(spec: &SweepSpec, args: &SweepArgs, components: Option<&Path>) -> Result<(), CliError> {
    if args.shards == 0 || args.shards > sweep::shard::MAX_SHARDS {
        return Err(CliError::input(format!("--shards {}: must be between 1 and {}", args.shards, sweep::shard::MAX_SHARDS)));
    }
    if args.cpus_per_task == 0 {
        return Err(CliError::input("--cpus-per-task 0: must be at least 1"));
    }
    let spec_path = std::fs::canonicalize(&args.spec).map_err(|e| CliError::input(format!("{}: {e}", args.spec.display())))?;
    let out = absolute(&args.out)?;
    let dropcut = std::env::current_exe().map_err(|e| CliError::runtime(format!("cannot find the dropcut binary: {e}")))?;
    let mut global_args = vec![];
    if let Some(dir) = components {
        global_args.push("--components".to_string());
        let dir = absolute(dir)?;
        global_args.push(slurm::script_text("--components", dir.as_os_str()).map_err(CliError::input)?);
    }
    let mut sweep_args = vec![];
    if args.histories {
        sweep_args.push("--histories".to_string());
    }
    let batch = slurm::BatchScript {
        dropcut,
        spec: spec_path,
        out,
        shards: args.shards,
        cpus_per_task: args.cpus_per_task,
        cases: spec.case_count(),
        job_name: args.job_name.clone(),
        global_args,
        sweep_args,
        sbatch_options: args.sbatch.clone(),
    };
    let script = slurm::batch_script(&batch).map_err(CliError::input)?;
    // The log folder must exist before Slurm starts a task, also when the script is given to sbatch directly.
    let logs = batch.out.join("logs");
    crate::output::ensure_dir(&logs)?;
    stdout_write(&script)
}

/// `dropcut merge DIR... --out DIR`
pub fn merge(lib: &Library, args: &MergeArgs) -> Result<(), CliError> {
    super::common::out_dir(&args.out)?;
    let spec = match &args.spec {
        Some(path) => Some(SweepSpec::load(path, lib)?),
        None => None,
    };
    let report = sweep::merge(&args.dirs, &args.out, spec.as_ref())?;
    let mut line = format!("wrote {}: {} cases from {} shards, {} failed", report.summary.display(), report.cases, report.shards, report.failed);
    if report.histories_copied > 0 {
        line.push_str(&format!("; copied {} case histories", report.histories_copied));
    }
    line.push('\n');
    stdout_write(&line)
}

#[cfg(test)]
mod tests {
    use clap::CommandFactory;

    use super::super::args::Cli;
    use crate::conditions::{Kind, CONDITIONS};

    /// simulate, compare and uncertainty take every registry condition as an option with the registry default, and
    /// simulate has no other condition option.
    #[test]
    fn condition_options_are_the_registry() {
        let cmd = Cli::command();
        for name in ["simulate", "compare", "uncertainty"] {
            let sub = cmd.find_subcommand(name).expect("subcommand");
            for c in &CONDITIONS {
                let arg = sub.get_arguments().find(|a| a.get_long() == Some(c.key)).unwrap_or_else(|| panic!("{name} has no --{}", c.key));
                let defaults: Vec<String> = arg.get_default_values().iter().map(|d| d.to_string_lossy().into_owned()).collect();
                if c.kind == Kind::Flag {
                    assert!(defaults.is_empty() || defaults == ["false"], "--{}: {defaults:?}", c.key);
                } else {
                    assert_eq!(defaults, [c.default], "default of {name} --{}", c.key);
                }
            }
        }
        let sim = cmd.find_subcommand("simulate").expect("simulate subcommand");
        // output choices, not conditions (--history-times: the rows written, docs/model.md §5)
        let not_conditions = ["out", "json", "no-plots", "limits", "history-times", "components", "help", "version"];
        for arg in sim.get_arguments() {
            if let Some(long) = arg.get_long() {
                if !not_conditions.contains(&long) {
                    assert!(CONDITIONS.iter().any(|c| c.key == long), "simulate option --{long} is not a registry condition");
                }
            }
        }
    }
}
