//! Lifetime maps of a sweep: for each fuel, the lifetime (or t50 when no case reached the end) over the first
//! two swept numeric inputs of `summary.csv`, other swept inputs held at their first value.

use std::path::Path;

use super::charts::{lifetime_map, ChartFiles, GridMap};
use super::read::CsvData;
use super::OutputError;

/// Numeric input columns that can span a map axis: (column, axis label, display scale).
const AXES: [(&str, &str, f64); 5] = [
    ("ambient_temperature_K", "ambient temperature [K]", 1.0),
    ("pressure_Pa", "pressure [bar]", 1e-5),
    ("diameter_m", "initial diameter [µm]", 1e6),
    ("velocity_m_s", "relative velocity [m/s]", 1.0),
    ("droplet_temperature_K", "initial droplet temperature [K]", 1.0),
];

/// A held input as "name = value unit" in the axis's display unit ("pressure = 5 bar", not "pressure_Pa = 500000").
fn held_value(column: &str, value: f64) -> String {
    match AXES.iter().find(|(c, ..)| *c == column) {
        Some((_, label, scale)) => {
            let (name, unit) = label.split_once(" [").map(|(n, u)| (n, u.trim_end_matches(']'))).unwrap_or((label, ""));
            let shown = format!("{:.6}", value * scale);
            let shown = shown.trim_end_matches('0').trim_end_matches('.');
            format!("{name} = {shown} {unit}").trim_end().to_string()
        }
        None => format!("{column} = {value}"),
    }
}

fn distinct(values: &[f64]) -> Vec<f64> {
    let mut v: Vec<f64> = values.to_vec();
    v.sort_by(|a, b| a.total_cmp(b));
    v.dedup();
    v
}

/// Draw the maps into `dir` (beside summary.csv); returns the charts drawn (none when fewer than two numeric
/// inputs vary).
pub fn sweep_maps(dir: &Path) -> Result<Vec<ChartFiles>, OutputError> {
    let data = CsvData::read(&dir.join("summary.csv"))?;
    let Some(fuel_col) = data.index("fuel") else { return Ok(vec![]) };
    let mut varying = vec![];
    for (col, label, scale) in AXES {
        if !data.has(col) {
            continue;
        }
        let v: Vec<f64> = data.numbers(col)?.into_iter().flatten().collect();
        if distinct(&v).len() > 1 {
            varying.push((col, label, scale));
        }
    }
    if varying.len() < 2 {
        return Ok(vec![]);
    }
    let (xc, yc) = (varying[0], varying[1]);
    let lifetime = data.numbers("lifetime_s")?;
    let t50 = data.numbers("t50_s")?;
    let use_lifetime = lifetime.iter().any(|v| v.is_some());
    let value = if use_lifetime { &lifetime } else { &t50 };
    let others: Vec<(&str, f64)> = varying[2..]
        .iter()
        .map(|(c, _, _)| -> Result<(&str, f64), OutputError> {
            let v: Vec<f64> = data.numbers(c)?.into_iter().flatten().collect();
            Ok((*c, distinct(&v)[0]))
        })
        .collect::<Result<_, _>>()?;
    let xs = data.numbers(xc.0)?;
    let ys = data.numbers(yc.0)?;
    let other_values: Vec<Vec<Option<f64>>> = others.iter().map(|(c, _)| data.numbers(c)).collect::<Result<_, _>>()?;
    let mut fuels: Vec<String> = vec![];
    for r in &data.rows {
        if !fuels.contains(&r[fuel_col]) {
            fuels.push(r[fuel_col].clone());
        }
    }
    let mut drawn = vec![];
    for fuel in fuels {
        let rows: Vec<usize> = (0..data.rows.len())
            .filter(|&i| data.rows[i][fuel_col] == fuel)
            .filter(|&i| others.iter().zip(&other_values).all(|((_, first), col)| col[i] == Some(*first)))
            .collect();
        let x = distinct(&rows.iter().filter_map(|&i| xs[i]).collect::<Vec<_>>());
        let y = distinct(&rows.iter().filter_map(|&i| ys[i]).collect::<Vec<_>>());
        if x.len() < 2 || y.len() < 2 {
            continue;
        }
        let mut values = vec![vec![None; x.len()]; y.len()];
        for &i in &rows {
            if let (Some(xv), Some(yv)) = (xs[i], ys[i]) {
                let (a, b) = (x.iter().position(|v| *v == xv), y.iter().position(|v| *v == yv));
                if let (Some(a), Some(b)) = (a, b) {
                    values[b][a] = value[i].map(|s| s * 1e3);
                }
            }
        }
        let held = if others.is_empty() { String::new() } else { format!("; other swept inputs at their first value ({})", others.iter().map(|(c, v)| held_value(c, *v)).collect::<Vec<_>>().join(", ")) };
        let map = GridMap {
            title: format!("{} of {fuel}", if use_lifetime { "Droplet lifetime" } else { "Time to 50 % evaporated" }),
            subtitle: format!("sweep in {}{held}", dir.file_name().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()),
            x_label: xc.1.into(),
            y_label: yc.1.into(),
            value_label: if use_lifetime { "lifetime [ms]".into() } else { "t50 [ms]".into() },
            x: x.iter().map(|v| v * xc.2).collect(),
            y: y.iter().map(|v| v * yc.2).collect(),
            values,
        };
        let stem: String = format!("chart_lifetime_map_{fuel}").chars().map(|c| if c.is_ascii_alphanumeric() || c == '-' || c == '_' { c } else { '_' }).collect();
        drawn.push(lifetime_map(dir, &stem, &map)?);
    }
    Ok(drawn)
}

#[cfg(test)]
mod tests {
    use super::held_value;

    #[test]
    fn held_inputs_are_shown_in_display_units() {
        assert_eq!(held_value("pressure_Pa", 500_000.0), "pressure = 5 bar");
        assert_eq!(held_value("diameter_m", 2.5e-5), "initial diameter = 25 µm");
        assert_eq!(held_value("ambient_temperature_K", 800.0), "ambient temperature = 800 K");
    }
}
