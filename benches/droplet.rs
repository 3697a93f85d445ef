//! Hot paths: mixture properties, one right-hand-side evaluation, droplet lifetimes (well-mixed 1/10/50
//! components, diffusion 20 components × 40 cells), table generation, residue indicators; the right-hand side
//! with the ideal liquid and with UNIFAC activity coefficients.
use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion};
use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::droplet::{LiquidHeat, LiquidMixing, NoHistory, WellMixed};
use dropcut::model::integrator::OdeSystem;
use dropcut::model::{simulate, DropletInputs};
use dropcut::props::activity::ActivityModel;
use dropcut::props::gas::AmbientGas;
use dropcut::props::liquid;

mod common;
use common::{fifty, fuel, inputs_of};

fn inputs(lib: &Library, n: usize) -> DropletInputs {
    inputs_of(fuel(lib, n), lib)
}

fn benches(c: &mut Criterion) {
    let lib = Library::embedded().unwrap();
    let all = fifty(&lib);
    let x = all.mole_fractions();
    c.bench_function(&format!("mixture liquid properties, {} components", all.len()), |b| {
        b.iter(|| black_box(liquid::state(&all.components, &all.mass_fractions, black_box(350.0))))
    });
    c.bench_function(&format!("bubble point, {} components", all.len()), |b| b.iter(|| black_box(liquid::bubble_point(&all.components, &x, 101_325.0))));
    let inp10 = inputs(&lib, 10);
    let (mut sys, y0) = WellMixed::new(&inp10);
    let mut dy = vec![0.0; y0.len()];
    c.bench_function("right-hand side, 10 components (well-mixed)", |b| b.iter(|| sys.rhs(0.0, black_box(&y0), &mut dy)));
    // Cost of the liquid activity model per right-hand side: the same state with Raoult's law and with UNIFAC
    // (demo-wide, 25 library components, 10 UNIFAC subgroups).
    for activity in [ActivityModel::Ideal, ActivityModel::Unifac] {
        let mut inp = inputs_of(Fuel::resolve("demo-wide", &lib).unwrap(), &lib);
        inp.liquid.activity = activity;
        let (mut sys, y0) = WellMixed::new(&inp);
        let mut dy = vec![0.0; y0.len()];
        // alternate between two droplet temperatures, as successive integrator stages do (a new T each call:
        // no reuse of the temperature-only UNIFAC terms)
        let n = inp.fuel.len();
        let mut y1 = y0.clone();
        y1[n] += 0.01;
        let states = [y0, y1];
        let mut k = 0usize;
        c.bench_function(&format!("right-hand side, demo-wide 25 components, {}", activity.as_str()), |b| {
            b.iter(|| {
                k ^= 1;
                sys.rhs(0.0, black_box(&states[k]), &mut dy)
            })
        });
    }
    for n in [1, 10, 50] {
        let inp = if n == 50 { inputs_of(all.clone(), &lib) } else { inputs(&lib, n) };
        c.bench_function(&format!("lifetime, {n} components, well-mixed"), |b| b.iter(|| black_box(simulate(&inp, &mut NoHistory).unwrap())));
    }
    let mut inp = inputs(&lib, 20);
    inp.liquid.mixing = LiquidMixing::Diffusion;
    inp.liquid.heat = LiquidHeat::Conduction;
    inp.liquid.nodes = 40;
    let mut group = c.benchmark_group("resolved");
    group.sample_size(20);
    group.bench_function("lifetime, 20 components x 40 cells, diffusion + conduction", |b| b.iter(|| black_box(simulate(&inp, &mut NoHistory).unwrap())));
    group.finish();
    let wide = Fuel::resolve("demo-wide", &lib).unwrap();
    let mut topts = dropcut::table::TableOptions::new(AmbientGas::air(&lib).unwrap());
    topts.surrogate = None;
    let mut tg = c.benchmark_group("tables");
    tg.sample_size(10);
    tg.bench_function("property tables of demo-wide (mixture + 25 components, 5 K steps, no surrogate)", |b| {
        b.iter(|| black_box(dropcut::table::build(&wide, &topts).unwrap()))
    });
    tg.finish();
    let opts = dropcut::post::IndicatorOptions::default();
    c.bench_function("residue indicators, demo-wide (25 components)", |b| {
        b.iter(|| black_box(dropcut::post::indicators(&wide.components, &wide.mass_fractions, &opts).unwrap()))
    });
}

criterion_group!(droplet, benches);
criterion_main!(droplet);
