//! Simulate one droplet: a 50 µm droplet of the demo-wide fuel in air at 800 K and 10 bar, its lifetime, the
//! times at which 10/50/90 % of its mass evaporated, and every 10th history row.
//!
//! Run: `cargo run --release --example simulate_droplet`

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::droplet::Recorder;
use dropcut::model::{simulate, DropletInputs};
use dropcut::props::gas::AmbientGas;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let lib = Library::embedded()?;
    let fuel = Fuel::resolve("demo-wide", &lib)?;
    let inputs = DropletInputs::new(fuel, AmbientGas::air(&lib)?, 800.0, 10e5, 50e-6, 300.0);
    let mut recorder = Recorder::default();
    let run = simulate(&inputs, &mut recorder)?;
    let o = &run.outcome;
    println!("status {:?}, lifetime {:?} s, t10 {:?} s, t50 {:?} s, t90 {:?} s", o.status, o.lifetime, o.t10, o.t50, o.t90);
    println!("{:>12} {:>12} {:>10} {:>10}", "time_s", "diameter_m", "T_s_K", "evap_frac");
    for row in recorder.rows.iter().step_by(10) {
        println!("{:>12.4e} {:>12.4e} {:>10.2} {:>10.4}", row.time, row.diameter, row.surface_temperature, row.evaporated_fraction);
    }
    for note in &o.regime_notes {
        println!("note: {note}");
    }
    Ok(())
}
