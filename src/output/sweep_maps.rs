//! Lifetime maps of a sweep: for each fuel, the lifetime (or t50 when no case reached the end) over two swept
//! numeric inputs of `summary.csv`. By default the first two swept inputs span the map and every other swept
//! input is held at its first value; [`MapChoice`] names the two axes and the held values instead.

use std::path::Path;

use super::charts::{lifetime_map, ChartFiles, GridMap};
use super::read::CsvData;
use super::OutputError;
use crate::units::Quantity;

/// Numeric input that can span a map axis: spec key, summary.csv column, axis label, display scale, quantity.
struct Axis {
    key: &'static str,
    column: &'static str,
    label: &'static str,
    scale: f64,
    quantity: Quantity,
}

const AXES: [Axis; 5] = [
    Axis { key: "ambient-temperature", column: "ambient_temperature_K", label: "ambient temperature [K]", scale: 1.0, quantity: Quantity::Temperature },
    Axis { key: "pressure", column: "pressure_Pa", label: "pressure [bar]", scale: 1e-5, quantity: Quantity::Pressure },
    Axis { key: "diameter", column: "diameter_m", label: "initial diameter [µm]", scale: 1e6, quantity: Quantity::Length },
    Axis { key: "velocity", column: "velocity_m_s", label: "relative velocity [m/s]", scale: 1.0, quantity: Quantity::Velocity },
    Axis { key: "droplet-temperature", column: "droplet_temperature_K", label: "initial droplet temperature [K]", scale: 1.0, quantity: Quantity::Temperature },
];

/// Which two swept inputs span the maps and where the other swept inputs are held.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct MapChoice {
    /// Spec keys of the x and y axes (e.g. "ambient-temperature", "diameter"); `None`: the first two swept.
    pub axes: Option<(String, String)>,
    /// Held inputs: spec key and value in SI units; each must be one of the swept values of that input.
    pub hold: Vec<(String, f64)>,
}

impl MapChoice {
    /// Parse `X,Y` (spec keys) for the axes.
    pub fn parse_axes(text: &str) -> Result<(String, String), String> {
        let parts: Vec<&str> = text.split(',').map(str::trim).collect();
        match parts.as_slice() {
            [x, y] if x != y => {
                for k in [x, y] {
                    axis_by_key(k)?;
                }
                Ok((x.to_string(), y.to_string()))
            }
            _ => Err(format!("map axes {text:?}: give two different swept inputs as X,Y (e.g. ambient-temperature,diameter)")),
        }
    }

    /// Parse `KEY=VALUE` for a held input; the value takes units as on the command line (`10bar`, `30um`).
    pub fn parse_hold(text: &str) -> Result<(String, f64), String> {
        let (key, value) = text.split_once('=').ok_or_else(|| format!("map hold {text:?}: write KEY=VALUE, e.g. pressure=10bar"))?;
        let axis = axis_by_key(key.trim())?;
        let v = crate::units::parse(value.trim(), axis.quantity).map_err(|e| format!("map hold {}: {e}", axis.key))?;
        Ok((axis.key.to_string(), v))
    }
}

fn known_keys() -> String {
    AXES.iter().map(|a| a.key).collect::<Vec<_>>().join(", ")
}

fn axis_by_key(key: &str) -> Result<&'static Axis, String> {
    AXES.iter().find(|a| a.key == key).ok_or_else(|| format!("map input {key:?} is not a numeric sweep input (known: {})", known_keys()))
}

fn display_value(axis: &Axis, value: f64) -> String {
    let (_, unit) = split_label(axis.label);
    let shown = format!("{:.6}", value * axis.scale);
    let shown = shown.trim_end_matches('0').trim_end_matches('.');
    format!("{shown} {unit}").trim_end().to_string()
}

fn split_label(label: &str) -> (&str, &str) {
    label.split_once(" [").map(|(n, u)| (n, u.trim_end_matches(']'))).unwrap_or((label, ""))
}

/// A held input as "name = value unit" in the axis's display unit ("pressure = 5 bar", not "pressure_Pa = 500000").
fn held_value(column: &str, value: f64) -> String {
    match AXES.iter().find(|a| a.column == column) {
        Some(axis) => format!("{} = {}", split_label(axis.label).0, display_value(axis, value)),
        None => format!("{column} = {value}"),
    }
}

fn distinct(values: &[f64]) -> Vec<f64> {
    let mut v: Vec<f64> = values.to_vec();
    v.sort_by(|a, b| a.total_cmp(b));
    v.dedup();
    v
}

/// The swept value closest to `wanted` when it matches to 1e-9 relative (values typed with units round-trip
/// through decimal text).
fn matching(values: &[f64], wanted: f64) -> Option<f64> {
    values.iter().copied().find(|v| (v - wanted).abs() <= 1e-9 * v.abs().max(wanted.abs()).max(1e-300))
}

/// Draw the maps into `dir` (beside summary.csv) with the default choice: the first two swept inputs, others
/// at their first value. Returns the charts drawn (none when fewer than two numeric inputs vary).
pub fn sweep_maps(dir: &Path) -> Result<Vec<ChartFiles>, OutputError> {
    sweep_maps_with(dir, &MapChoice::default())
}

/// Draw the maps into `dir` with a chosen pair of axes and held values (see [`MapChoice`]).
pub fn sweep_maps_with(dir: &Path, choice: &MapChoice) -> Result<Vec<ChartFiles>, OutputError> {
    let summary = dir.join("summary.csv");
    let data = CsvData::read(&summary)?;
    let bad = |m: String| OutputError::Read { path: summary.display().to_string(), message: m };
    let Some(fuel_col) = data.index("fuel") else { return Ok(vec![]) };
    let mut varying: Vec<(&Axis, Vec<f64>)> = vec![];
    for axis in &AXES {
        if !data.has(axis.column) {
            continue;
        }
        let v = distinct(&data.numbers(axis.column)?.into_iter().flatten().collect::<Vec<_>>());
        if v.len() > 1 {
            varying.push((axis, v));
        }
    }
    let swept_keys = || varying.iter().map(|(a, _)| a.key).collect::<Vec<_>>().join(", ");
    let (xi, yi) = match &choice.axes {
        None if varying.len() < 2 => {
            if choice.hold.is_empty() {
                return Ok(vec![]);
            }
            return Err(bad(format!("fewer than two numeric inputs are swept ({}), so there is no map to hold inputs on", swept_keys())));
        }
        None => (0, 1),
        Some((x, y)) => {
            let find = |k: &str| varying.iter().position(|(a, _)| a.key == k).ok_or_else(|| bad(format!("map axis {k:?} is not swept in this summary (swept: {})", swept_keys())));
            (find(x)?, find(y)?)
        }
    };
    let mut held: Vec<(&Axis, f64)> = vec![];
    for (i, (axis, values)) in varying.iter().enumerate() {
        if i == xi || i == yi {
            if choice.hold.iter().any(|(k, _)| k == axis.key) {
                return Err(bad(format!("{} spans a map axis and cannot also be held", axis.key)));
            }
            continue;
        }
        let value = match choice.hold.iter().find(|(k, _)| k == axis.key) {
            Some((_, wanted)) => matching(values, *wanted).ok_or_else(|| {
                bad(format!(
                    "{} = {} is not a swept value (swept: {})",
                    axis.key,
                    display_value(axis, *wanted),
                    values.iter().map(|v| display_value(axis, *v)).collect::<Vec<_>>().join(", ")
                ))
            })?,
            None => values[0],
        };
        held.push((axis, value));
    }
    for (k, _) in &choice.hold {
        if !varying.iter().any(|(a, _)| a.key == k) {
            return Err(bad(format!("held input {k:?} is not swept in this summary (swept: {})", swept_keys())));
        }
    }
    let (xc, yc) = (varying[xi].0, varying[yi].0);
    let lifetime = data.numbers("lifetime_s")?;
    let t50 = data.numbers("t50_s")?;
    let use_lifetime = lifetime.iter().any(|v| v.is_some());
    let value = if use_lifetime { &lifetime } else { &t50 };
    let xs = data.numbers(xc.column)?;
    let ys = data.numbers(yc.column)?;
    let held_columns: Vec<Vec<Option<f64>>> = held.iter().map(|(a, _)| data.numbers(a.column)).collect::<Result<_, _>>()?;
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
            .filter(|&i| held.iter().zip(&held_columns).all(|((_, at), col)| col[i] == Some(*at)))
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
        let held_text = if held.is_empty() {
            String::new()
        } else {
            let how = if choice.hold.is_empty() { "other swept inputs at their first value" } else { "other swept inputs held at" };
            format!("; {how} ({})", held.iter().map(|(a, v)| held_value(a.column, *v)).collect::<Vec<_>>().join(", "))
        };
        let map = GridMap {
            title: format!("{} of {fuel}", if use_lifetime { "Droplet lifetime" } else { "Time to 50 % evaporated" }),
            subtitle: format!("sweep in {}{held_text}", dir.file_name().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()),
            x_label: xc.label.into(),
            y_label: yc.label.into(),
            value_label: if use_lifetime { "lifetime [ms]".into() } else { "t50 [ms]".into() },
            x: x.iter().map(|v| v * xc.scale).collect(),
            y: y.iter().map(|v| v * yc.scale).collect(),
            values,
        };
        let stem: String = format!("chart_lifetime_map_{fuel}").chars().map(|c| if c.is_ascii_alphanumeric() || c == '-' || c == '_' { c } else { '_' }).collect();
        drawn.push(lifetime_map(dir, &stem, &map)?);
    }
    Ok(drawn)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn held_inputs_are_shown_in_display_units() {
        assert_eq!(held_value("pressure_Pa", 500_000.0), "pressure = 5 bar");
        assert_eq!(held_value("diameter_m", 2.5e-5), "initial diameter = 25 µm");
        assert_eq!(held_value("ambient_temperature_K", 800.0), "ambient temperature = 800 K");
    }

    #[test]
    fn map_choices_parse_with_units_and_refuse_unknown_inputs() {
        assert_eq!(MapChoice::parse_axes("ambient-temperature, diameter").unwrap(), ("ambient-temperature".into(), "diameter".into()));
        assert!(MapChoice::parse_axes("diameter,diameter").is_err());
        assert!(MapChoice::parse_axes("gas,diameter").unwrap_err().contains("not a numeric sweep input"));
        let (k, v) = MapChoice::parse_hold("pressure=10bar").unwrap();
        assert_eq!(k, "pressure");
        assert!((v - 1e6).abs() < 1e-6);
        let (_, d) = MapChoice::parse_hold("diameter=30um").unwrap();
        assert!((d - 30e-6).abs() < 1e-15);
        assert!(MapChoice::parse_hold("pressure").is_err());
        assert!(MapChoice::parse_hold("pressure=ten").is_err());
    }

    #[test]
    fn held_values_match_swept_values_written_as_decimal_text() {
        let swept = [2.0e-5, 3.0e-5, 5.0e-5];
        assert_eq!(matching(&swept, 30.0 * 1e-6), Some(3.0e-5));
        assert_eq!(matching(&swept, 4.0e-5), None);
    }
}
