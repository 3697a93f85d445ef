//! Evaluate residue indicators: the fuel-quality indicators (distillation points, flash point, density,
//! viscosity, derived cetane number) of the demo-wide fuel and of the liquid left after a droplet in 800 K air
//! has lost half its mass.
//!
//! Run: `cargo run --release --example residue_indicators`

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::droplet::Recorder;
use dropcut::model::{simulate, DropletInputs};
use dropcut::post::{indicators, IndicatorOptions};
use dropcut::props::gas::AmbientGas;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let lib = Library::embedded()?;
    let fuel = Fuel::resolve("demo-wide", &lib)?;
    let options = IndicatorOptions::default();
    let fresh = indicators(&fuel.components, &fuel.mass_fractions, &options)?;
    let inputs = DropletInputs::new(fuel.clone(), AmbientGas::air(&lib)?, 800.0, 101_325.0, 50e-6, 300.0);
    let mut recorder = Recorder::default();
    simulate(&inputs, &mut recorder)?;
    let half = recorder.rows.iter().find(|r| r.evaporated_fraction >= 0.5).ok_or("the droplet never lost half its mass")?;
    let residue = indicators(&fuel.components, &half.liquid_mass_fractions, &options)?;
    let show = |v: Option<f64>| v.map_or("—".to_string(), |x| format!("{x:.2}"));
    println!("{:<28} {:>10} {:>10}", "indicator", "fuel", "residue");
    println!("{:<28} {:>10} {:>10}", "T10 [K]", show(fresh.t10_K), show(residue.t10_K));
    println!("{:<28} {:>10} {:>10}", "T50 [K]", show(fresh.t50_K), show(residue.t50_K));
    println!("{:<28} {:>10} {:>10}", "flash point [K]", show(fresh.flash_point_K), show(residue.flash_point_K));
    println!("{:<28} {:>10} {:>10}", "density at 15 °C [kg/m³]", show(fresh.density_15C_kg_m3), show(residue.density_15C_kg_m3));
    println!("Flash points are estimates for comparison only, not certification: handling follows the governing standards and local codes.");
    Ok(())
}
