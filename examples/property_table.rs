//! Build a property table: the mixture table of the demo-narrow fuel at 1 atm (liquid density, vapour
//! pressure, heat capacity over its liquid range, with the validity flag of each row).
//!
//! Run: `cargo run --release --example property_table`

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::props::gas::AmbientGas;
use dropcut::table::{mixture_table, TableOptions};

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let lib = Library::embedded()?;
    let fuel = Fuel::resolve("demo-narrow", &lib)?;
    let mut options = TableOptions::new(AmbientGas::air(&lib)?);
    options.step = 20.0;
    let table = mixture_table("mixture", &fuel, &options)?;
    println!("{} at {} Pa: {} rows", table.fuel.name, table.pressure, table.rows.len());
    println!("{:>8} {:>10} {:>12} {:>10}  validity", "T_K", "rho_kg_m3", "p_vap_Pa", "cp_J_kgK");
    for row in &table.rows {
        let l = &row.liquid;
        println!("{:>8.2} {:>10.2} {:>12.4e} {:>10.1}  {}", l.temperature_K, l.density_kg_m3, l.vapor_pressure_Pa, l.cp_J_kgK, row.validity.as_str());
    }
    Ok(())
}
