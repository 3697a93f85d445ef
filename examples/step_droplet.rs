//! Step a droplet: advance one droplet of the demo-narrow fuel through a changing far field with the stepping
//! API and print its exchange terms each step — the scenario of the C example (examples/c/step_droplet.c), line
//! for line, so tests/capi/run.sh can compare the two.
//!
//! Run: `cargo run --release --example step_droplet`

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::{DropletInputs, FarField, Motion, Stepper};
use dropcut::props::gas::AmbientGas;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let lib = Library::embedded()?;
    let fuel = Fuel::resolve("demo-narrow", &lib)?;
    let n = fuel.len();
    let mut inputs = DropletInputs::new(fuel, AmbientGas::parse(&lib, "air")?, 800.0, 101_325.0, 40e-6, 300.0);
    inputs.motion = Motion::Injected { velocity: 0.0 }; // the velocity relaxes toward the gas by drag
    let mut stepper = Stepper::new(&inputs)?;
    let mut far = FarField { temperature: 600.0, pressure: 2.0e5, vapor_mass_fractions: vec![0.0; n], gas_velocity: [1.0, 0.0, 0.0] };
    let mut droplet = stepper.initial_state(&far, [11.0, 0.0, 0.0])?;
    let dt = 5e-5;
    for step in 0..2000 {
        // the gas heats up and slows down along the droplet's path; some of the lightest vapour is present
        let k = step as f64;
        far.temperature = if 600.0 + 2.0 * k < 1100.0 { 600.0 + 2.0 * k } else { 1100.0 };
        far.gas_velocity[0] = 1.0 + 0.01 * k;
        far.vapor_mass_fractions[0] = if step < 50 { 0.0 } else { 1e-4 };
        let ex = stepper.advance(&mut droplet, dt, &far)?;
        print!(
            "step {step} t {:.17e} m {:.17e} Ts {:.17e} d {:.17e} energy {:.17e} momentum {:.17e} {:.17e} {:.17e} mass",
            droplet.time(),
            droplet.mass(),
            droplet.surface_temperature(),
            stepper.diameter(&droplet),
            ex.energy,
            ex.momentum[0],
            ex.momentum[1],
            ex.momentum[2]
        );
        for m in &ex.mass {
            print!(" {m:.17e}");
        }
        println!();
        if ex.finished {
            break;
        }
    }
    Ok(())
}
