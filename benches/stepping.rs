//! The stepping API against the one-shot run: a 10-component droplet life advanced in 1,000 equal steps in a
//! constant far field, and the same life in one `simulate` call (both liquid models).
use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion};
use dropcut::data::Library;
use dropcut::fuel::{Basis, Fuel};
use dropcut::model::droplet::{LiquidHeat, LiquidMixing, NoHistory};
use dropcut::model::{simulate, DropletInputs, FarField, Motion, Stepper};
use dropcut::props::gas::AmbientGas;

/// The first ten library hydrocarbons in equal mass fractions (as benches/droplet.rs).
fn inputs(lib: &Library) -> DropletInputs {
    let comps: Vec<_> = lib.components().iter().filter(|c| c.class != dropcut::data::HydrocarbonClass::Oxygenate).take(10).cloned().collect();
    let k = comps.len();
    let fuel = Fuel::from_fractions("bench", comps, &vec![1.0 / k as f64; k], Basis::Mass).unwrap();
    let mut inp = DropletInputs::new(fuel, AmbientGas::air(lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
    inp.motion = Motion::Injected { velocity: 5.0 };
    inp
}

fn benches(c: &mut Criterion) {
    let lib = Library::embedded().unwrap();
    for resolved in [false, true] {
        let mut inp = inputs(&lib);
        if resolved {
            inp.liquid.mixing = LiquidMixing::Diffusion;
            inp.liquid.heat = LiquidHeat::Conduction;
            inp.liquid.nodes = 20;
        }
        let name = if resolved { "resolved 20 cells" } else { "well-mixed" };
        let life = simulate(&inp, &mut NoHistory).unwrap().outcome.lifetime.unwrap();
        c.bench_function(&format!("one-shot life, 10 components, {name}"), |b| b.iter(|| black_box(simulate(&inp, &mut NoHistory).unwrap().outcome.lifetime)));
        let mut stepper = Stepper::new(&inp).unwrap();
        let ff = FarField::new(inp.ambient_temperature, inp.pressure);
        let dt = 1.001 * life / 1000.0;
        c.bench_function(&format!("life in 1000 steps, 10 components, {name}"), |b| {
            b.iter(|| {
                let mut state = stepper.initial_state(&ff, [5.0, 0.0, 0.0]).unwrap();
                let mut energy = 0.0;
                while !state.is_finished() {
                    energy += stepper.advance(&mut state, dt, &ff).unwrap().energy;
                }
                black_box(energy)
            })
        });
    }
}

criterion_group!(group, benches);
criterion_main!(group);
