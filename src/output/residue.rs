//! residue.csv: residual-liquid indicators (from the post layer) at a series of evaporated fractions.

use std::path::Path;

use crate::post::{ResidueRow, INDICATOR_KEYS};

use super::{Cell, CsvTable, OutputError, TOOL_VERSION};

/// Build the residue table: one row per residue, one column per indicator key (`snake_case_unit`, SI),
/// empty cells where an indicator could not be estimated.
pub fn residue_table(rows: &[ResidueRow], description: &str) -> Result<CsvTable, OutputError> {
    let mut t = CsvTable::new(INDICATOR_KEYS.iter().map(|(k, _)| k.to_string()).collect());
    t.metadata = vec![format!("{TOOL_VERSION} residual-liquid indicators"), description.to_string(), crate::post::CAUTION.to_string()];
    if let Some(first) = rows.first() {
        let i = &first.indicators;
        t.metadata.push(format!(
            "distillation at {} Pa, {:?} basis; viscosity rule {:?}; cetane rule {:?}",
            i.distillation_pressure_Pa, i.distillation_basis, i.viscosity_rule, i.cetane_rule
        ));
    }
    for r in rows {
        let cells = INDICATOR_KEYS
            .iter()
            .map(|(k, _)| if *k == "evaporated_fraction" { Cell::Num(r.evaporated_fraction) } else { Cell::Opt(r.indicators.get(k).flatten()) })
            .collect();
        t.push(cells, "residue.csv")?;
    }
    Ok(t)
}

/// Write residue.csv into `dir`.
pub fn write_residue(dir: &Path, rows: &[ResidueRow], description: &str) -> Result<(), OutputError> {
    residue_table(rows, description)?.write(&dir.join("residue.csv"))
}
