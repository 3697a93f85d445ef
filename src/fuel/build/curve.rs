//! Distillation-curve input for building a fuel from lab data (the first step of [`super::distillation`]):
//! the curve kind (ASTM D86 or true boiling point), the TOML and CSV forms with their checks, and the 15 °C
//! density. Every message names the file, line and field.

use std::path::Path;

use crate::data::suggest;
use crate::units::{self, Quantity};

use super::petroleum as pet;
use super::{input_error, BuildError};

/// Kind of distillation curve.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum CurveKind {
    /// ASTM D86 (single-stage batch distillation, thermometer in the vapour).
    D86,
    /// True boiling point (ASTM D2892 or simulated distillation by GC, ASTM D2887).
    Tbp,
}

impl CurveKind {
    /// Name as written in files.
    pub fn as_str(self) -> &'static str {
        match self {
            CurveKind::D86 => "d86",
            CurveKind::Tbp => "tbp",
        }
    }
}

/// A measured distillation curve.
#[derive(Debug, Clone, PartialEq)]
pub struct DistillationCurve {
    /// Fuel name.
    pub name: String,
    /// Description.
    pub description: String,
    /// Curve kind.
    pub kind: CurveKind,
    /// (volume % recovered, temperature \[K\]), increasing.
    pub points: Vec<(f64, f64)>,
    /// 15 °C density given in the file \[kg/m³\].
    pub density_15c: Option<f64>,
    /// Where the curve came from.
    pub origin: String,
}

fn parse_kind(text: &str, context: &str) -> Result<CurveKind, BuildError> {
    match text.trim().to_ascii_lowercase().as_str() {
        "d86" | "astm-d86" => Ok(CurveKind::D86),
        "tbp" | "true-boiling-point" | "d2887" | "d2892" => Ok(CurveKind::Tbp),
        other => Err(input_error(context, format!("curve '{other}' is not d86 or tbp{}", suggest(other, ["d86", "tbp"].into_iter())))),
    }
}

fn parse_percent(key: &str, context: &str) -> Result<f64, BuildError> {
    let k = key.trim();
    let p = match k.to_ascii_uppercase().as_str() {
        "IBP" => 0.0,
        "FBP" | "EP" => 100.0,
        _ => k.trim_end_matches('%').trim().parse::<f64>().map_err(|_| input_error(context, format!("'{k}' is not a percentage recovered (a number 0–100, IBP or FBP)")))?,
    };
    if !(p.is_finite() && (0.0..=100.0).contains(&p)) {
        return Err(input_error(context, format!("percentage recovered {p} is outside 0–100")));
    }
    Ok(p)
}

fn temperature_unit(text: &str, context: &str) -> Result<String, BuildError> {
    match text.trim() {
        "K" => Ok("K".into()),
        "degC" | "C" | "°C" => Ok("degC".into()),
        "degF" | "F" | "°F" => Ok("degF".into()),
        other => Err(input_error(context, format!("temperature unit '{other}' is not K, degC or degF"))),
    }
}

fn parse_density(text: &str, context: &str) -> Result<f64, BuildError> {
    let rho = units::parse(text, Quantity::Density).map_err(|e| input_error(context, e.to_string()))?;
    check_density(rho, context)
}

/// Check a 15 °C density is a plausible liquid-fuel density \[kg/m³\].
pub fn check_density(rho: f64, context: &str) -> Result<f64, BuildError> {
    if !(rho.is_finite() && (550.0..=1100.0).contains(&rho)) {
        return Err(input_error(context, format!("density {rho} kg/m³ is outside 550–1100 kg/m³")));
    }
    Ok(rho)
}

impl DistillationCurve {
    /// Read a curve: `.csv` as CSV, anything else as TOML (docs/fuel-from-lab-data.md).
    pub fn read(path: &Path) -> Result<Self, BuildError> {
        super::read_csv_or_toml(path, Self::parse_csv, Self::parse_toml)
    }

    /// Parse the TOML form: `curve = "d86" | "tbp"`, `temperature-unit`, optional `name`, `description`,
    /// `density-15C = "799 kg/m3"` or `specific-gravity = 0.8`, and `[points]` with `IBP = 155`, `10 = 171`, ...
    /// (values are numbers in `temperature-unit` or strings with a unit such as "171 degC").
    pub fn parse_toml(text: &str, file: &str, default_name: &str) -> Result<Self, BuildError> {
        let root: toml::Table = toml::from_str(text).map_err(|e| input_error(file, crate::data::toml_error_at(&e, text)))?;
        let mut curve = DistillationCurve { name: default_name.into(), description: String::new(), kind: CurveKind::D86, points: vec![], density_15c: None, origin: file.into() };
        let mut kind = None;
        let mut unit = None;
        let mut raw_points = None;
        for (key, value) in &root {
            let ctx = format!("{file}: {key}");
            let text_of = |v: &toml::Value| v.as_str().map(str::to_string).ok_or_else(|| input_error(&ctx, "must be a string"));
            match key.as_str() {
                "name" => curve.name = text_of(value)?,
                "description" => curve.description = text_of(value)?,
                "curve" => kind = Some(parse_kind(&text_of(value)?, &ctx)?),
                "temperature-unit" => unit = Some(temperature_unit(&text_of(value)?, &ctx)?),
                "density-15C" => curve.density_15c = Some(parse_density(&text_of(value)?, &ctx)?),
                "specific-gravity" => {
                    let sg = value.as_float().ok_or_else(|| input_error(&ctx, "must be a number"))?;
                    curve.density_15c = Some(check_density(sg * pet::WATER_DENSITY_60F, &ctx)?);
                }
                "points" => raw_points = Some(value.as_table().ok_or_else(|| input_error(&ctx, "must be a table of percent = temperature"))?.clone()),
                other => {
                    let known = ["name", "description", "curve", "temperature-unit", "density-15C", "specific-gravity", "points"];
                    return Err(input_error(ctx, format!("unknown key '{other}'{}", suggest(other, known.into_iter()))));
                }
            }
        }
        curve.kind = kind.ok_or_else(|| input_error(file, "missing key 'curve' (\"d86\" or \"tbp\")"))?;
        let raw_points = raw_points.ok_or_else(|| input_error(file, "missing [points] (percent recovered = temperature)"))?;
        for (key, value) in &raw_points {
            let ctx = format!("{file}: points.{key}");
            let p = parse_percent(key, &ctx)?;
            let t = match value {
                toml::Value::String(s) => units::parse(s, Quantity::Temperature).map_err(|e| input_error(&ctx, e.to_string()))?,
                v => {
                    let x = v.as_float().or_else(|| v.as_integer().map(|i| i as f64)).ok_or_else(|| input_error(&ctx, format!("{v} is not a temperature")))?;
                    let u = unit.as_deref().ok_or_else(|| input_error(&ctx, "plain numbers need temperature-unit = \"K\", \"degC\" or \"degF\""))?;
                    units::parse(&format!("{x}{u}"), Quantity::Temperature).map_err(|e| input_error(&ctx, e.to_string()))?
                }
            };
            curve.points.push((p, t));
        }
        curve.finish()?;
        Ok(curve)
    }

    /// Parse the CSV form: `#` metadata lines (`# curve: d86`, `# name:`, `# description:`,
    /// `# density-15C: 799 kg/m3`), a header `percent_recovered,temperature_<K|degC|degF>` and one row per point
    /// (percent may be IBP or FBP).
    pub fn parse_csv(text: &str, file: &str, default_name: &str) -> Result<Self, BuildError> {
        let mut curve = DistillationCurve { name: default_name.into(), description: String::new(), kind: CurveKind::D86, points: vec![], density_15c: None, origin: file.into() };
        let mut kind = None;
        // `#` metadata lines are read here; the table (header and rows) goes to the csv reader, with each of its
        // lines' numbers in the file kept for messages
        let mut body = String::new();
        let mut body_lines: Vec<usize> = vec![];
        for (i, line) in text.lines().enumerate() {
            let ctx = format!("{file}: line {}", i + 1);
            let trimmed = line.trim();
            if trimmed.is_empty() {
                continue;
            }
            if let Some(meta) = trimmed.strip_prefix('#') {
                if let Some((key, value)) = meta.split_once(':') {
                    match key.trim().to_ascii_lowercase().as_str() {
                        "name" => curve.name = value.trim().into(),
                        "description" => curve.description = value.trim().into(),
                        "curve" => kind = Some(parse_kind(value, &ctx)?),
                        "density-15c" => curve.density_15c = Some(parse_density(value.trim(), &ctx)?),
                        _ => {}
                    }
                }
                continue;
            }
            body.push_str(trimmed);
            body.push('\n');
            body_lines.push(i + 1);
        }
        let line_of = |body_line: u64| body_lines.get((body_line as usize).saturating_sub(1)).copied().unwrap_or(0);
        let mut reader = csv::ReaderBuilder::new().has_headers(false).flexible(true).trim(csv::Trim::All).from_reader(body.as_bytes());
        let mut unit: Option<String> = None;
        for record in reader.records() {
            let record = record.map_err(|e| {
                let line = e.position().map_or(0, |p| line_of(p.line()));
                input_error(format!("{file}: line {line}"), format!("cannot read the row: {e}"))
            })?;
            let line = record.position().map_or(0, |p| line_of(p.line()));
            let ctx = format!("{file}: line {line}");
            if record.len() != 2 {
                return Err(input_error(ctx, format!("expected 2 columns (percent, temperature), found {}", record.len())));
            }
            let (percent, temperature) = (&record[0], &record[1]);
            if unit.is_none() {
                let u = temperature.strip_prefix("temperature_").ok_or_else(|| input_error(&ctx, format!("header '{temperature}' must be temperature_K, temperature_degC or temperature_degF")))?;
                unit = Some(temperature_unit(u, &ctx)?);
                continue;
            }
            let p = parse_percent(percent, &format!("{ctx}, percent"))?;
            let u = unit.as_deref().unwrap_or("K");
            let x: f64 = temperature.parse().map_err(|_| input_error(&ctx, format!("temperature '{temperature}' is not a number")))?;
            let t = units::parse(&format!("{x}{u}"), Quantity::Temperature).map_err(|e| input_error(&ctx, format!("temperature: {e}")))?;
            curve.points.push((p, t));
        }
        curve.kind = kind.ok_or_else(|| input_error(file, "missing metadata line '# curve: d86' (or tbp)"))?;
        curve.finish()?;
        Ok(curve)
    }

    /// Sort and check: at least three points, distinct percentages, temperatures 150–1000 K and strictly
    /// increasing with the percentage recovered.
    fn finish(&mut self) -> Result<(), BuildError> {
        let f = self.origin.clone();
        self.points.sort_by(|a, b| a.0.total_cmp(&b.0));
        if self.points.len() < 3 {
            return Err(input_error(f, format!("{} points: a distillation curve needs at least 3", self.points.len())));
        }
        for (p, t) in &self.points {
            if !(t.is_finite() && (150.0..=1000.0).contains(t)) {
                return Err(input_error(&f, format!("temperature at {p} % is {t:.2} K, outside 150–1000 K")));
            }
        }
        for w in self.points.windows(2) {
            let ((p0, t0), (p1, t1)) = (w[0], w[1]);
            if (p1 - p0).abs() < 1e-9 {
                return Err(input_error(&f, format!("percentage {p0} is given twice")));
            }
            if t1 <= t0 {
                return Err(input_error(
                    &f,
                    format!("temperatures must increase with % recovered: {:.2} °C at {p1} % is not above {:.2} °C at {p0} %", t1 - 273.15, t0 - 273.15),
                ));
            }
        }
        Ok(())
    }
}
