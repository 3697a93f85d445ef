//! The fuels and droplet inputs shared by the benchmarks (`droplet`, `counts`).

use dropcut::data::Library;
use dropcut::fuel::{Basis, Fuel};
use dropcut::model::{DropletInputs, Motion};
use dropcut::props::gas::AmbientGas;

/// A fuel of the first `n` library components in equal mass fractions (n = all gives every component).
pub fn fuel(lib: &Library, n: usize) -> Fuel {
    let comps: Vec<_> = lib.components().iter().filter(|c| c.class != dropcut::data::HydrocarbonClass::Oxygenate).take(n).cloned().collect();
    let k = comps.len();
    Fuel::from_fractions("bench", comps, &vec![1.0 / k as f64; k], Basis::Mass).unwrap()
}

/// An invented 50-cell class × carbon-number table (mass %) of a wide-cut kerosene: the 50-component fuel of
/// the benchmarks (library components where a cell has one, group-contribution estimates elsewhere).
pub const FIFTY_CELLS: &str = "\
carbon_number,n-alkane,iso-alkane,monocycloalkane,dicycloalkane,alkylbenzene,cycloaromatic,diaromatic
C7,0.5,,0.4,,0.6,,
C8,1.0,0.5,0.8,,1.2,,
C9,3.0,2.0,3.0,0.5,3.5,,
C10,6.5,5.5,4.0,2.5,3.0,1.0,0.5
C11,6.0,5.5,3.5,2.0,2.0,1.2,1.0
C12,5.5,5.5,2.5,1.5,1.2,0.8,0.5
C13,4.0,4.5,1.5,1.0,0.6,0.4,0.2
C14,2.5,3.0,0.8,0.5,,,
C15,1.2,1.5,,,,,
C16,0.5,0.8,,,,,
C17,0.3,0.4,,,,,
";

/// The 50-component fuel built from [`FIFTY_CELLS`].
pub fn fifty(lib: &Library) -> Fuel {
    let table = dropcut::fuel::build::classes::ClassTable::parse_csv(FIFTY_CELLS, "bench", "bench-fifty").unwrap();
    let built = dropcut::fuel::build::classes::build_from_classes(&table, lib, &Default::default()).unwrap();
    assert_eq!(built.fuel.len(), 50, "{:?}", built.fuel.components.iter().map(|c| c.id.clone()).collect::<Vec<_>>());
    built.fuel
}

pub fn inputs_of(fuel: Fuel, lib: &Library) -> DropletInputs {
    let mut inp = DropletInputs::new(fuel, AmbientGas::air(lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
    inp.motion = Motion::Fixed { velocity: 5.0 };
    inp
}

