//! Residue tables (residue.csv): fuel-quality indicators of the remaining liquid at each evaporated fraction.

use std::path::Path;

use crate::post::{LimitStatus, Limits, ResidueRow, CAUTION, INDICATOR_KEYS};

use super::{Cell, CsvTable, OutputError, TOOL_VERSION};

/// One labelled group of residue rows (e.g. layer "mean" of a droplet, or "weathering" at 350 K).
pub struct ResidueSet<'a> {
    /// Label in the `layer` column.
    pub label: &'a str,
    /// Rows.
    pub rows: &'a [ResidueRow],
}

/// Build the residue table; with `limits`, one `<key>_in_window` column per window (in / out / unknown).
pub fn residue_table(title: &str, sets: &[ResidueSet], limits: Option<&Limits>) -> Result<CsvTable, OutputError> {
    let mut header = vec!["layer".to_string()];
    header.extend(INDICATOR_KEYS.iter().map(|(k, _)| k.to_string()));
    let windows: Vec<String> = limits.map(|l| l.windows.iter().map(|w| w.key.clone()).collect()).unwrap_or_default();
    header.extend(windows.iter().map(|k| format!("{k}_in_window")));
    let mut t = CsvTable::new(header);
    t.metadata.push(format!("{TOOL_VERSION} {title}"));
    if let Some(first) = sets.iter().find_map(|s| s.rows.first()) {
        for (k, _) in INDICATOR_KEYS.iter().skip(1) {
            if let Some(m) = first.indicators.method(k) {
                t.metadata.push(format!("{k}: {m}"));
            }
        }
    }
    t.metadata.push(format!("caution: {CAUTION}"));
    for s in sets {
        for r in s.rows {
            let mut cells = vec![Cell::Text(s.label.to_string())];
            for (k, _) in INDICATOR_KEYS.iter() {
                let v = if *k == "evaporated_fraction" { Some(r.evaporated_fraction) } else { r.indicators.get(k).flatten() };
                cells.push(Cell::Opt(v));
            }
            if let Some(l) = limits {
                for f in l.check(&r.indicators) {
                    cells.push(Cell::Text(
                        match f.status {
                            LimitStatus::In => "in",
                            LimitStatus::Out => "out",
                            LimitStatus::Unknown => "unknown",
                        }
                        .into(),
                    ));
                }
            }
            t.push(cells, "residue.csv")?;
        }
    }
    Ok(t)
}

/// Write residue.csv.
pub fn write_residue(path: &Path, title: &str, sets: &[ResidueSet], limits: Option<&Limits>) -> Result<(), OutputError> {
    residue_table(title, sets, limits)?.write(path)
}
