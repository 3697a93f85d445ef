//! Sweep throughput: cases per second for a ten-component well-mixed fuel on every core.
//! Run with `cargo bench --bench sweep`; criterion reports the time per sweep of 64 cases and the throughput
//! (cases/s), without and with the residual-liquid indicator columns the CLI adds by default.

use std::path::Path;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use dropcut::data::Library;
use dropcut::sweep::{self, runner::NoProgress, ResidueIndicators, RunOptions, SweepSpec};

#[path = "common/sweep_spec.rs"]
mod sweep_spec;
use sweep_spec::SPEC;


fn sweep_throughput(c: &mut Criterion) {
    let lib = Library::embedded().expect("embedded library");
    let data = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data");
    let spec = SweepSpec::parse(SPEC, "bench-spec.toml", &data, &lib).expect("bench spec");
    let root = std::env::temp_dir().join(format!("dropcut-bench-sweep-{}", std::process::id()));
    let mut group = c.benchmark_group("sweep");
    group.sample_size(10);
    group.measurement_time(std::time::Duration::from_secs(10));
    group.throughput(Throughput::Elements(spec.case_count()));
    let mut n = 0u64;
    for residue in [false, true] {
        let name = if residue { "ten-component well-mixed, 64 cases, all cores, with residue indicators" } else { "ten-component well-mixed, 64 cases, all cores" };
        group.bench_function(name, |b| {
            b.iter(|| {
                n += 1;
                let dir = root.join(n.to_string());
                let extra_columns: Vec<Box<dyn sweep::ExtraColumns>> = if residue { vec![Box::new(ResidueIndicators::default())] } else { vec![] };
                let opts = RunOptions { extra_columns, ..RunOptions::default() };
                let report = sweep::run(&spec, &dir, &opts, &mut NoProgress).expect("sweep");
                assert_eq!(report.failed, 0);
                let _ = std::fs::remove_dir_all(&dir);
            })
        });
    }
    group.finish();
    let _ = std::fs::remove_dir_all(&root);
}

criterion_group!(benches, sweep_throughput);
criterion_main!(benches);
