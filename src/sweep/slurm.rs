//! The Slurm batch script for a sweep: one job-array task per shard, plus a merge job that depends on the array
//! (`sbatch --dependency=afterok:<array job>`). The script submits both when run with `bash`; see docs/sweeps.md.

use std::path::PathBuf;

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

fn words(args: &[String]) -> String {
    args.iter().map(|a| format!(" {}", shell_quote(a))).collect()
}

/// The batch script text.
pub fn batch_script(b: &BatchScript) -> String {
    let q = |p: &PathBuf| shell_quote(&p.display().to_string());
    let (dropcut, spec, out) = (q(&b.dropcut), q(&b.spec), q(&b.out));
    let name = shell_quote(&b.job_name);
    let last = b.shards.saturating_sub(1);
    let mut s = String::new();
    s.push_str("#!/bin/bash\n");
    s.push_str(&format!("# Slurm job array for a dropcut sweep, written by `dropcut sweep --slurm-script` ({TOOL_VERSION}).\n"));
    s.push_str(&format!("# Spec {}: {} cases in {} shards.\n", b.spec.display(), b.cases, b.shards));
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
    s.push_str(&format!("#SBATCH --output={}\n", shell_quote(&b.out.join("logs").join("shard-%a.out").display().to_string())));
    for o in &b.sbatch_options {
        s.push_str(&format!("#SBATCH {o}\n"));
    }
    s.push_str("set -euo pipefail\n\n");
    s.push_str(&format!("DROPCUT=${{DROPCUT:-{dropcut}}}\nSPEC={spec}\nOUT={out}\n\n"));
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
    s.push_str("merge_cmd=\"$(q \"$DROPCUT\") merge $(q \"$OUT\")/shard-* --out $(q \"$OUT\")\"\n");
    s.push_str(&format!(
        "merge_opts=(--job-name={name}-merge --dependency=afterok:\"$array_job\" --kill-on-invalid-dep=yes --ntasks=1 --cpus-per-task=1 --output=\"$OUT/logs/merge.out\"{})\n",
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
    s
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
        });
        assert!(s.contains("#SBATCH --array=0-3\n"));
        assert!(s.contains("#SBATCH --cpus-per-task=8\n"));
        assert!(s.contains("#SBATCH --partition=short\n"));
        assert!(s.contains("--dependency=afterok:\"$array_job\""));
        assert!(s.contains("--resume --progress-log --threads \"${SLURM_CPUS_PER_TASK:-1}\" --histories\n"));
    }
}
