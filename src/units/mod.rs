//! Parsing and printing of quantities with units; the only place that knows "degC" or "bar".
//!
//! Plain numbers are taken as SI. Accepted suffixes per quantity:
//! temperature `K`, `degC`, `C`, `degF`, `F`; pressure `Pa`, `kPa`, `MPa`, `bar`, `mbar`, `atm`, `psi`;
//! length `m`, `mm`, `um`, `µm`, `micron`, `nm`; velocity `m/s`, `km/h`; time `s`, `ms`, `us`;
//! density `kg/m3`, `g/cm3`, `g/mL`, `kg/L` (a density needs its unit: a plain number is refused).

use thiserror::Error;

/// Error raised when a quantity string cannot be understood.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum UnitError {
    /// The text is not a number followed by a known unit.
    #[error("cannot read {what} '{text}': {reason}")]
    Invalid {
        /// Kind of quantity expected (temperature, pressure, ...).
        what: &'static str,
        /// The text given.
        text: String,
        /// Why it was refused.
        reason: String,
    },
}

/// Kind of physical quantity, used to choose the accepted units.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// Absolute temperature \[K\].
    Temperature,
    /// Temperature difference \[K\].
    TemperatureDifference,
    /// Pressure \[Pa\].
    Pressure,
    /// Length \[m\].
    Length,
    /// Velocity \[m/s\].
    Velocity,
    /// Time \[s\].
    Time,
    /// Dimensionless number.
    Dimensionless,
    /// Mass density \[kg/m³\].
    Density,
}

impl Quantity {
    /// Human name of the quantity.
    pub fn name(self) -> &'static str {
        match self {
            Quantity::Temperature => "temperature",
            Quantity::TemperatureDifference => "temperature difference",
            Quantity::Pressure => "pressure",
            Quantity::Length => "length",
            Quantity::Velocity => "velocity",
            Quantity::Time => "time",
            Quantity::Dimensionless => "number",
            Quantity::Density => "density",
        }
    }
}

fn split_number(text: &str) -> Option<(f64, &str)> {
    let t = text.trim();
    // longest prefix that parses as a float
    let bytes = t.as_bytes();
    let mut end = 0;
    for (i, c) in bytes.iter().enumerate() {
        let ok = c.is_ascii_digit() || matches!(c, b'.' | b'-' | b'+' | b'e' | b'E');
        if !ok {
            break;
        }
        // 'e' must be followed by digit or sign to be part of the number
        if (*c == b'e' || *c == b'E') && !bytes.get(i + 1).is_some_and(|n| n.is_ascii_digit() || *n == b'-' || *n == b'+') {
            break;
        }
        end = i + 1;
    }
    while end > 0 {
        if let Ok(v) = t[..end].parse::<f64>() {
            return Some((v, t[end..].trim()));
        }
        end -= 1;
    }
    None
}

/// Parse `text` as a quantity of kind `what`, returning its SI value.
pub fn parse(text: &str, what: Quantity) -> Result<f64, UnitError> {
    let err = |reason: String| UnitError::Invalid { what: what.name(), text: text.to_string(), reason };
    if text.trim().is_empty() {
        return Err(err("empty value".into()));
    }
    let lower = text.trim().to_ascii_lowercase();
    if lower.contains("nan") || lower.contains("inf") {
        return Err(err("not a finite number".into()));
    }
    let (number, unit) = split_number(text).ok_or_else(|| err("does not start with a number".into()))?;
    if !number.is_finite() {
        return Err(err("not a finite number".into()));
    }
    let unit_norm = unit.replace(' ', "");
    let value = match what {
        Quantity::Temperature => match unit_norm.as_str() {
            "" | "K" | "k" => number,
            "degC" | "°C" | "C" | "degc" | "celsius" => number + 273.15,
            "degF" | "°F" | "F" | "degf" => (number - 32.0) * 5.0 / 9.0 + 273.15,
            _ => return Err(err(format!("unknown temperature unit '{unit}' (use K, degC or degF)"))),
        },
        Quantity::TemperatureDifference => match unit_norm.as_str() {
            "" | "K" | "k" | "degC" | "C" => number,
            "degF" | "F" => number * 5.0 / 9.0,
            _ => return Err(err(format!("unknown temperature-difference unit '{unit}' (use K)"))),
        },
        Quantity::Pressure => match unit_norm.as_str() {
            "" | "Pa" | "pa" => number,
            "kPa" | "kpa" => number * 1e3,
            "MPa" | "mpa" => number * 1e6,
            "bar" => number * 1e5,
            "mbar" => number * 1e2,
            "atm" => number * 101_325.0,
            "psi" => number * 6_894.757_293_168,
            _ => return Err(err(format!("unknown pressure unit '{unit}' (use Pa, kPa, MPa, bar or atm)"))),
        },
        Quantity::Length => match unit_norm.as_str() {
            "" | "m" => number,
            "mm" => number / 1e3,
            "um" | "µm" | "μm" | "micron" | "microns" => number / 1e6,
            "nm" => number / 1e9,
            "cm" => number / 1e2,
            _ => return Err(err(format!("unknown length unit '{unit}' (use m, mm or um)"))),
        },
        Quantity::Velocity => match unit_norm.as_str() {
            "" | "m/s" => number,
            "km/h" => number / 3.6,
            "cm/s" => number / 1e2,
            _ => return Err(err(format!("unknown velocity unit '{unit}' (use m/s)"))),
        },
        Quantity::Time => match unit_norm.as_str() {
            "" | "s" => number,
            "ms" => number / 1e3,
            "us" | "µs" => number / 1e6,
            _ => return Err(err(format!("unknown time unit '{unit}' (use s, ms or us)"))),
        },
        Quantity::Density => match unit_norm.as_str() {
            "kg/m3" | "kg/m^3" | "kg/m³" | "g/L" | "g/l" => number,
            "g/cm3" | "g/cm^3" | "g/cm³" | "g/mL" | "g/ml" | "kg/L" | "kg/l" | "kg/dm3" => number * 1e3,
            "" => return Err(err("needs a unit (e.g. 799kg/m3 or 0.799g/cm3)".into())),
            _ => return Err(err(format!("unknown density unit '{unit}' (use kg/m3 or g/cm3)"))),
        },
        Quantity::Dimensionless => match unit_norm.as_str() {
            "" => number,
            "%" => number / 100.0,
            _ => return Err(err(format!("unexpected unit '{unit}' on a dimensionless number"))),
        },
    };
    if !value.is_finite() {
        return Err(err("not a finite number".into()));
    }
    if what == Quantity::Temperature && value < 0.0 {
        return Err(err(format!("{value:.2} K is below absolute zero")));
    }
    Ok(value)
}

/// Format a temperature in K with its unit, e.g. `450.00 K`.
pub fn format_temperature(kelvin: f64) -> String {
    format!("{kelvin:.2} K ({:.2} °C)", kelvin - 273.15)
}

/// Format a pressure in Pa with a readable unit.
pub fn format_pressure(pascal: f64) -> String {
    if pascal >= 1e5 {
        format!("{:.4} bar", pascal / 1e5)
    } else {
        format!("{:.3} kPa", pascal / 1e3)
    }
}

/// Format a length in m with a readable unit.
pub fn format_length(metre: f64) -> String {
    if metre < 1e-3 {
        format!("{:.2} µm", metre * 1e6)
    } else {
        format!("{:.4} mm", metre * 1e3)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn temperatures() {
        assert!((parse("450K", Quantity::Temperature).unwrap() - 450.0).abs() < 1e-12);
        assert!((parse("176.85degC", Quantity::Temperature).unwrap() - 450.0).abs() < 1e-9);
        assert!((parse("800", Quantity::Temperature).unwrap() - 800.0).abs() < 1e-12);
        assert!((parse("32degF", Quantity::Temperature).unwrap() - 273.15).abs() < 1e-9);
    }

    #[test]
    fn pressures_lengths() {
        assert!((parse("1atm", Quantity::Pressure).unwrap() - 101_325.0).abs() < 1e-9);
        assert!((parse("10bar", Quantity::Pressure).unwrap() - 1e6).abs() < 1e-6);
        assert!((parse("101325", Quantity::Pressure).unwrap() - 101_325.0).abs() < 1e-9);
        assert!((parse("50um", Quantity::Length).unwrap() - 50e-6).abs() < 1e-15);
        assert!((parse("1.5e-4", Quantity::Length).unwrap() - 1.5e-4).abs() < 1e-15);
        assert!((parse("2e1 m/s", Quantity::Velocity).unwrap() - 20.0).abs() < 1e-12);
    }

    #[test]
    fn rejects() {
        for bad in ["", "abc", "10 barr", "NaN", "inf K", "1e999", "5 kelvins", "--3"] {
            assert!(parse(bad, Quantity::Pressure).is_err(), "{bad}");
        }
        assert!(parse("300 bar", Quantity::Temperature).is_err());
        let e = parse("-300degC", Quantity::Temperature).unwrap_err().to_string();
        assert!(e.contains("below absolute zero") && e.contains("-300degC"), "{e}");
        assert!((parse("-20degC", Quantity::Temperature).unwrap() - 253.15).abs() < 1e-9);
    }

    #[test]
    fn densities_need_a_unit() {
        assert!((parse("799kg/m3", Quantity::Density).unwrap() - 799.0).abs() < 1e-12);
        assert!((parse("0.799 g/cm3", Quantity::Density).unwrap() - 799.0).abs() < 1e-9);
        assert!(parse("799", Quantity::Density).is_err());
        assert!(parse("799 kg", Quantity::Density).is_err());
    }
}
