//! The Slurm batch script for a sweep: one job-array task per shard, plus a merge job that depends on the array
//! (`sbatch --dependency=afterok:<array job>`). The script submits both when run with `bash`; see docs/sweeps.md.

use std::path::{Path, PathBuf};

use crate::output::TOOL_VERSION;

/// Everything the batch script needs (paths should be absolute: jobs may start in another folder or node).
#[derive(Debug, Clone)]
pub struct BatchScript {
    /// The dropcut binary the jobs run.
    pub dropcut: PathBuf,
    /// The sweep spec.
    pub spec: PathBuf,
    /// Output folder: shards go to `OUT/shard-K`, logs to `OUT/logs`, the merged summary to `OUT/summary.csv`.
    pub out: PathBuf,
    /// Number of shards (= array tasks).
    pub shards: u64,
    /// CPUs per array task (= worker threads of each shard).
    pub cpus_per_task: u32,
    /// Cases of the whole sweep (for the comment at the top).
    pub cases: u64,
    /// Slurm job name of the array; the merge job gets `-merge` appended.
    pub job_name: String,
    /// Options placed before the `sweep` subcommand (e.g. `--components DIR`).
    pub global_args: Vec<String>,
    /// Extra options of the shard runs (e.g. `--histories`).
    pub sweep_args: Vec<String>,
    /// Extra sbatch options (e.g. `--partition=short`), for the array and the merge job.
    pub sbatch_options: Vec<String>,
}

/// Quote a word for POSIX shells: unchanged when it holds only safe characters, else in single quotes.
pub fn shell_quote(word: &str) -> String {
    if !word.is_empty() && word.chars().all(|c| c.is_ascii_alphanumeric() || "_./:=+-@%,".contains(c)) {
        word.to_string()
    } else {
        format!("'{}'", word.replace('\'', "'\\''"))
    }
}

/// A value that goes into the generated script, checked: valid UTF-8 and no control characters (a line break
/// would start a new line of the script, that is a new command or a new `#SBATCH` directive).
pub fn script_text(what: &str, value: &std::ffi::OsStr) -> Result<String, String> {
    let Some(text) = value.to_str() else {
        return Err(format!("{what} {}: not valid UTF-8; the batch script can only hold UTF-8 text", value.to_string_lossy()));
    };
    if let Some(c) = text.chars().find(|c| c.is_control()) {
        return Err(format!("{what} {text:?}: holds the control character {:?}; values written into the batch script may not hold line breaks, tabs or other control characters", c));
    }
    Ok(text.to_string())
}

/// A literal path for a Slurm file-name pattern (`--output`): `%` doubled so Slurm does not expand it.
pub fn slurm_literal(path: &str) -> String {
    path.replace('%', "%%")
}

fn path_text(what: &str, p: &Path) -> Result<String, String> {
    script_text(what, p.as_os_str())
}

fn words(args: &[String]) -> String {
    args.iter().map(|a| format!(" {}", shell_quote(a))).collect()
}

/// The batch script text; refuses any value that is not UTF-8 or holds a control character (nothing a user
/// types may become a line of the script), naming it.
pub fn batch_script(b: &BatchScript) -> Result<String, String> {
    let dropcut_text = path_text("the dropcut binary path", &b.dropcut)?;
    let spec_text = path_text("the spec path", &b.spec)?;
    let out_text = path_text("--out", &b.out)?;
    script_text("--job-name", b.job_name.as_ref())?;
    if b.job_name.is_empty() {
        return Err("--job-name: empty name".into());
    }
    for a in b.global_args.iter().chain(&b.sweep_args) {
        script_text("option", a.as_ref())?;
    }
    for o in &b.sbatch_options {
        script_text("--sbatch", o.as_ref())?;
        if !o.starts_with('-') {
            return Err(format!("--sbatch {o:?}: an sbatch option starts with '-' (e.g. --sbatch=--partition=short)"));
        }
    }
    let (dropcut, spec, out) = (shell_quote(&dropcut_text), shell_quote(&spec_text), shell_quote(&out_text));
    let logs_pattern = slurm_literal(&path_text("--out", &b.out.join("logs"))?);
    let name = shell_quote(&b.job_name);
    let last = b.shards.saturating_sub(1);
    let mut s = String::new();
    s.push_str("#!/bin/bash\n");
    s.push_str(&format!("# Slurm job array for a dropcut sweep, written by `dropcut sweep --slurm-script` ({TOOL_VERSION}).\n"));
    s.push_str(&format!("# Spec {spec_text}: {} cases in {} shards.\n", b.cases, b.shards));
    s.push_str(&format!(
        "# Array task K runs shard K/{n} (the cases with case_id % {n} == K) into OUT/shard-K; dropcut reads K and N\n\
         # from SLURM_ARRAY_TASK_ID, _MIN and _COUNT itself, and --resume continues a task that was interrupted.\n",
        n = b.shards
    ));
    s.push_str(
        "#\n\
         #   bash THIS_FILE          submit the array, then a merge job that runs once every task has succeeded\n\
         #                           (sbatch --dependency=afterok:<array job>); result: OUT/summary.csv\n\
         #   bash THIS_FILE --wait   the same, then wait for the merge job; the exit code is the merge job's\n\
         #   sbatch THIS_FILE        submit only the array; merge later: dropcut merge OUT/shard-* --out OUT\n\
         #\n\
         # Logs: OUT/logs/shard-<task>.out and OUT/logs/merge.out. Set DROPCUT=/path/to/dropcut to use another binary.\n",
    );
    s.push_str(&format!("#SBATCH --job-name={name}\n"));
    s.push_str(&format!("#SBATCH --array=0-{last}\n"));
    s.push_str("#SBATCH --ntasks=1\n");
    s.push_str(&format!("#SBATCH --cpus-per-task={}\n", b.cpus_per_task));
    // `%` in the folder is doubled so Slurm keeps it; `%a` (the array task) is the only pattern used.
    s.push_str(&format!("#SBATCH --output={}\n", shell_quote(&format!("{logs_pattern}/shard-%a.out"))));
    for o in &b.sbatch_options {
        s.push_str(&format!("#SBATCH {o}\n"));
    }
    s.push_str("set -euo pipefail\n\n");
    s.push_str(&format!("DROPCUT=${{DROPCUT:-{dropcut}}}\nSPEC={spec}\nOUT={out}\nLOG_PATTERN={}   # OUT/logs with % doubled for Slurm\n\n", shell_quote(&logs_pattern)));
    s.push_str("if [ -n \"${SLURM_ARRAY_TASK_ID:-}\" ]; then\n");
    s.push_str("  # Inside an array task: run this task's shard on the CPUs Slurm gave it.\n");
    s.push_str(&format!(
        "  exec \"$DROPCUT\"{} sweep \"$SPEC\" --out \"$OUT/shard-$SLURM_ARRAY_TASK_ID\" --resume --progress-log --threads \"${{SLURM_CPUS_PER_TASK:-1}}\"{}\n",
        words(&b.global_args),
        words(&b.sweep_args)
    ));
    s.push_str("fi\n\n");
    s.push_str("# Submitting (run with bash outside a job): the array, then the merge job that depends on it.\n");
    s.push_str("mkdir -p \"$OUT/logs\"\n");
    s.push_str("rm -f \"$OUT/summary.csv\"   # an earlier merge result; the shards keep every row\n");
    s.push_str("array_job=$(sbatch --parsable \"$0\")\n");
    s.push_str("array_job=${array_job%%;*}\n");
    s.push_str(&format!("echo \"submitted job array $array_job: {} shards\"\n", b.shards));
    s.push_str("q() { printf \"'%s'\" \"${1//\\'/\\'\\\\\\'\\'}\"; }\n");
    s.push_str(&format!("global_args=({})\n", words(&b.global_args).trim_start()));
    s.push_str("merge_cmd=\"$(q \"$DROPCUT\")\"\n");
    s.push_str("for a in ${global_args[@]+\"${global_args[@]}\"}; do merge_cmd+=\" $(q \"$a\")\"; done\n");
    s.push_str("merge_cmd+=\" merge $(q \"$OUT\")/shard-* --out $(q \"$OUT\") --spec $(q \"$SPEC\")\"\n");
    s.push_str(&format!(
        "merge_opts=(--job-name={name}-merge --dependency=afterok:\"$array_job\" --kill-on-invalid-dep=yes --ntasks=1 --cpus-per-task=1 --output=\"$LOG_PATTERN/merge.out\"{})\n",
        words(&b.sbatch_options)
    ));
    s.push_str("if [ \"${1:-}\" = --wait ]; then\n");
    s.push_str("  echo \"waiting for the merge job (it starts when every array task has succeeded) ...\"\n");
    s.push_str("  sbatch --wait \"${merge_opts[@]}\" --wrap=\"$merge_cmd\"\n");
    s.push_str("  # a merge job cancelled because a task failed also ends sbatch --wait with 0: check its result\n");
    s.push_str("  if [ ! -s \"$OUT/summary.csv\" ]; then\n");
    s.push_str("    echo \"error: no merged summary: an array task failed and the merge job was cancelled; see $OUT/logs/\" >&2\n");
    s.push_str("    exit 1\n");
    s.push_str("  fi\n");
    s.push_str("  echo \"merged summary: $OUT/summary.csv\"\n");
    s.push_str("else\n");
    s.push_str("  merge_job=$(sbatch --parsable \"${merge_opts[@]}\" --wrap=\"$merge_cmd\")\n");
    s.push_str("  echo \"submitted merge job ${merge_job%%;*} (after job $array_job succeeds): $OUT/summary.csv\"\n");
    s.push_str("fi\n");
    Ok(s)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quoting() {
        assert_eq!(shell_quote("/a/b-c_d.toml"), "/a/b-c_d.toml");
        assert_eq!(shell_quote("a b"), "'a b'");
        assert_eq!(shell_quote("it's"), "'it'\\''s'");
        assert_eq!(shell_quote(""), "''");
    }

    #[test]
    fn script_has_array_and_dependency() {
        let s = batch_script(&BatchScript {
            dropcut: "/opt/dropcut".into(),
            spec: "/data/spec.toml".into(),
            out: "/data/out".into(),
            shards: 4,
            cpus_per_task: 8,
            cases: 100,
            job_name: "dropcut-sweep".into(),
            global_args: vec![],
            sweep_args: vec!["--histories".into()],
            sbatch_options: vec!["--partition=short".into()],
        })
        .unwrap();
        assert!(s.contains("#SBATCH --array=0-3\n"));
        assert!(s.contains("#SBATCH --cpus-per-task=8\n"));
        assert!(s.contains("#SBATCH --partition=short\n"));
        assert!(s.contains("--dependency=afterok:\"$array_job\""));
        assert!(s.contains("--resume --progress-log --threads \"${SLURM_CPUS_PER_TASK:-1}\" --histories\n"));
    }

    fn base() -> BatchScript {
        BatchScript {
            dropcut: "/opt/dropcut".into(),
            spec: "/data/spec.toml".into(),
            out: "/data/out".into(),
            shards: 2,
            cpus_per_task: 1,
            cases: 4,
            job_name: "j".into(),
            global_args: vec![],
            sweep_args: vec![],
            sbatch_options: vec![],
        }
    }

    #[test]
    fn control_characters_never_reach_the_script() {
        let mut b = base();
        b.job_name = "x\ntouch /tmp/X #".into();
        assert!(batch_script(&b).unwrap_err().contains("--job-name"));
        let mut b = base();
        b.sbatch_options = vec!["--partition=a\nrm -rf /".into()];
        assert!(batch_script(&b).unwrap_err().contains("--sbatch"));
        let mut b = base();
        b.out = "/data/o\rut".into();
        assert!(batch_script(&b).unwrap_err().contains("--out"));
        let mut b = base();
        b.spec = "/data/s\n.toml".into();
        assert!(batch_script(&b).unwrap_err().contains("spec"));
        let mut b = base();
        b.sbatch_options = vec!["partition=a".into()];
        assert!(batch_script(&b).is_err());
    }

    #[test]
    fn percent_in_the_output_folder_is_escaped_for_slurm() {
        let mut b = base();
        b.out = "/data/100%j out".into();
        let s = batch_script(&b).unwrap();
        assert!(s.contains("#SBATCH --output='/data/100%%j out/logs/shard-%a.out'\n"), "{s}");
        assert!(s.contains("LOG_PATTERN='/data/100%%j out/logs'"), "{s}");
        assert!(s.contains("OUT='/data/100%j out'\n"), "{s}");
        assert!(s.contains("--output=\"$LOG_PATTERN/merge.out\""));
    }

    #[cfg(unix)]
    #[test]
    fn a_path_that_is_not_utf8_is_refused() {
        use std::os::unix::ffi::OsStrExt;
        let mut b = base();
        b.out = std::path::PathBuf::from(std::ffi::OsStr::from_bytes(b"/data/\xff"));
        assert!(batch_script(&b).unwrap_err().contains("UTF-8"));
    }
}
