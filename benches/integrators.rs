//! The integrator decision on record: the own Dormand–Prince 5(4) stepper against `ode_solvers::Dopri5`
//! (DVector state, scaled to equal error weights) on the same well-mixed 10-component droplet, to half its
//! lifetime, at rtol 1e-6 and 1e-9; and the own 5(4) against the own 8(5,3) pair on whole lives at rtol 1e-10
//! (where `Method::Auto` takes the 8(5,3) pair). Results in docs/model.md ("Integrator").
use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion};
use dropcut::model::droplet::NoHistory;
use dropcut::model::integrator::Method;
use dropcut::model::simulate;

#[path = "../tests/support/integrator_problem.rs"]
mod problem;

fn benches(c: &mut Criterion) {
    for rtol in [1e-6, 1e-9] {
        let p = problem::problem(rtol);
        let mut group = c.benchmark_group(format!("integrator, 10 components, rtol {rtol:e}"));
        group.bench_function("own Dormand-Prince", |b| b.iter(|| black_box(problem::own(&p))));
        group.bench_function("ode_solvers Dopri5 (DVector)", |b| b.iter(|| black_box(problem::crate_dopri5(&p))));
        group.finish();
    }
    let mut p = problem::problem(1e-10);
    p.inputs.rtol = 1e-10;
    let mut group = c.benchmark_group("whole life, 10 components, rtol 1e-10");
    for method in [Method::Order5, Method::Order8] {
        let mut inputs = p.inputs.clone();
        inputs.integrator = method;
        group.bench_function(format!("own {method:?}"), |b| b.iter(|| black_box(simulate(&inputs, &mut NoHistory).unwrap())));
    }
    group.finish();
}

criterion_group!(integrators, benches);
criterion_main!(integrators);
