//! Property-table charts: each column against temperature.

#[allow(unused_imports)]
use super::*;

/// Display name, unit and scale for a `name_unit` column (SI in the file, friendlier units on the axis).
pub fn column_display(column: &str) -> (String, String, f64) {
    const UNITS: [(&str, &str, f64); 17] = [
        ("_kg_m3", "kg/m³", 1.0),
        ("_J_kgK", "J/(kg·K)", 1.0),
        ("_J_molK", "J/(mol·K)", 1.0),
        ("_J_kg", "kJ/kg", 1e-3),
        ("_J_mol", "kJ/mol", 1e-3),
        ("_Pa_s", "mPa·s", 1e3),
        ("_m2_s", "mm²/s", 1e6),
        ("_W_mK", "W/(m·K)", 1.0),
        ("_N_m", "mN/m", 1e3),
        ("_kg_mol", "g/mol", 1e3),
        ("_kg_s", "kg/s", 1.0),
        ("_m_s", "m/s", 1.0),
        ("_Pa", "kPa", 1e-3),
        ("_K", "K", 1.0),
        ("_W", "W", 1.0),
        ("_m", "µm", 1e6),
        ("_s", "ms", 1e3),
    ];
    for (suffix, unit, scale) in UNITS {
        if let Some(name) = column.strip_suffix(suffix) {
            if !name.is_empty() {
                return (name.replace('_', " "), unit.into(), scale);
            }
        }
    }
    (column.replace('_', " "), "-".into(), 1.0)
}

/// Property table against temperature: one panel per numeric column of a CSV with a `temperature_K` column
/// (other columns named `name_unit`, e.g. `density_kg_m3`). Text columns are skipped.
pub fn table_vs_temperature_chart(table: &CsvData, stem: &str, title: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let t = table.numbers("temperature_K")?;
    let mut panels = vec![];
    for col in table.header.iter().filter(|h| h.as_str() != "temperature_K") {
        let Ok(y) = table.numbers(col) else { continue };
        if y.iter().all(|v| v.is_none()) {
            continue;
        }
        let (name, unit, scale) = column_display(col);
        // vapour and bubble pressures span decades over the liquid range: a log axis shows them all
        let y_log = col.ends_with("_Pa") && name.contains("pressure") && y.iter().flatten().any(|v| *v > 0.0);
        let points = t.iter().zip(&y).filter_map(|(x, y)| x.map(|x| (x, y.map(|v| v * scale)))).collect();
        panels.push(Panel {
            title: truncate_label(&name, 40),
            x_label: "temperature  [K]".into(),
            y_label: if y_log { format!("[{unit}], log scale") } else { format!("[{unit}]") },
            series: vec![Series { name: name.clone(), points, color: PALETTE[panels.len() % PALETTE.len()], stroke: Stroke::Solid }],
            y_log,
            ..Default::default()
        });
    }
    if panels.is_empty() {
        return Err(OutputError::Read { path: table.path.display().to_string(), message: "no numeric property columns besides temperature_K".into() });
    }
    let columns = if panels.len() <= 2 { panels.len() } else if panels.len() <= 6 { 3 } else { 4 };
    let rows = panels.len().div_ceil(columns) as u32;
    Ok(Chart { stem: stem.into(), title: title.into(), subtitle: subtitle.into(), panels, columns, legend_title: String::new(), legend: vec![], size: (360 * columns as u32 + 100, 80 + 330 * rows) })
}

/// Draw a property table CSV (see [`table_vs_temperature_chart`]) into `dir`.
pub fn table_vs_temperature(csv: &Path, dir: &Path, stem: &str, title: &str) -> Result<ChartFiles, OutputError> {
    let table = CsvData::read(csv)?;
    let pick = |key: &str| table.metadata.iter().find(|m| m.trim_start().starts_with(key)).map(|m| m.trim().to_string());
    let sub = [pick("fuel"), pick("pressure")].into_iter().flatten().collect::<Vec<_>>().join(" · ");
    let sub = if sub.is_empty() { table.metadata.first().cloned().unwrap_or_default() } else { sub };
    write_chart(dir, &table_vs_temperature_chart(&table, stem, title, &sub)?)
}
