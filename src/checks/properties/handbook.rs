//! Handbook constants, and liquid density and viscosity against measured data other than the coefficient source.

use super::*;

// ---------------------------------------------------------------------------------------------------------
// 2. Handbook checks
// ---------------------------------------------------------------------------------------------------------

/// Normal boiling point, critical temperature and pressure, and liquid density (at the temperature the
/// table gives) of every component in validation/handbook/constants.csv, with the file's tolerances and
/// sources. The confidence tag of each value (confirmed / physics-H / from-memory / EOS) is part of the
/// source text.
pub fn handbook_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_HANDBOOK, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(HANDBOOK_CONSTANTS);
    let col = |n: &str| table.column(n);
    let mut out = vec![];
    for row in &table.rows {
        let id = table.text(row, col("id"));
        let Some(c) = lib.component(id) else {
            out.push(failed(GROUP_HANDBOOK, format!("{id}: component present in the library"), "validation/handbook/constants.csv", "missing from the library".into()));
            continue;
        };
        // confidence "tb:physics-H/crit:physics-H/rho:from-memory" → per-property tags
        let confidence = table.text(row, col("confidence"));
        let tag = |key: &str| -> String {
            confidence.split('/').find_map(|p| p.strip_prefix(key).and_then(|r| r.strip_prefix(':'))).unwrap_or("untagged").to_string()
        };
        let src = |column: &str, key: &str| format!("{} [{}] (validation/handbook/constants.csv)", table.text(row, col(column)), tag(key));
        let density_t = table.number(row, col("density_temperature_K"));
        let density_value = density_t.map(|t| c.liquid_density(t)).unwrap_or(f64::INFINITY);
        let items = [
            HandbookItem { key: "normal-boiling-point", label: "normal boiling point", reference: table.number(row, col("normal_boiling_point_K")), tolerance: table.number(row, col("tol_tb_K")), value: c.normal_boiling_point(), unit: "K", scale: 1.0, source: src("source_tb", "tb") },
            HandbookItem { key: "critical-temperature", label: "critical temperature", reference: table.number(row, col("critical_temperature_K")), tolerance: table.number(row, col("tol_tc_K")), value: c.critical_temperature(), unit: "K", scale: 1.0, source: src("source_critical", "crit") },
            HandbookItem { key: "critical-pressure", label: "critical pressure", reference: table.number(row, col("critical_pressure_Pa")), tolerance: table.number(row, col("tol_pc_Pa")), value: c.critical_pressure(), unit: "kPa", scale: 1e-3, source: src("source_critical", "crit") },
            HandbookItem { key: "handbook-density", label: "liquid density", reference: table.number(row, col("liquid_density_kg_m3")), tolerance: table.number(row, col("tol_density_kg_m3")), value: density_value, unit: "kg/m³", scale: 1.0, source: src("source_density", "rho") },
        ];
        for HandbookItem { key, label, reference, tolerance, value, unit, scale, source } in items {
            let (Some(reference), Some(tolerance)) = (reference, tolerance) else { continue };
            let at = if key == "handbook-density" { density_t.map(|t| format!(" at {t:.2} K")).unwrap_or_default() } else { String::new() };
            let check = format!("{id} {label}{at}: library {} vs {} {unit}", fmt_sig(value * scale), fmt_sig(reference * scale));
            let err = if value.is_finite() { (value - reference).abs() * scale } else { f64::INFINITY };
            out.push(mark_known(CheckResult::absolute(GROUP_HANDBOOK, check, &source, err, tolerance * scale, unit), id, key));
        }
    }
    out
}

/// Liquid density at 15 °C, handbook/paper density at 20–25 °C and kinematic viscosity at −20 °C of every
/// component that a data-backed reference in validation/handbook/density_viscosity.csv covers (CoolProp 8.0,
/// VDI Heat Atlas PPDS, Perry Table 2-32/2-313, Viswanath & Natarajan, Dutt–Prasad, CRC Handbook, papers).
/// A reference whose source id equals the component's own coefficient source is never used; the first
/// remaining asserted reference is judged, the others are quoted in the check text. Components with no
/// independent reference produce no check (listed in validation/README.md).
pub fn density_viscosity_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_DATA, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(DENSITY_VISCOSITY);
    let col = |n: &str| table.column(n);
    let mut keys: Vec<(String, String, u64)> = vec![];
    for row in &table.rows {
        let t = table.number(row, col("temperature_K")).unwrap_or(0.0);
        let key = (table.text(row, col("id")).to_string(), table.text(row, col("property")).to_string(), (t * 100.0).round() as u64);
        if !keys.contains(&key) {
            keys.push(key);
        }
    }
    let mut out = vec![];
    for (id, property, t_centi) in keys {
        let t = t_centi as f64 / 100.0;
        let Some(c) = lib.component(&id) else {
            out.push(failed(GROUP_DATA, format!("{id}: component present in the library"), "validation/handbook/density_viscosity.csv", "missing from the library".into()));
            continue;
        };
        let rows: Vec<&Vec<String>> = table
            .rows
            .iter()
            .filter(|r| table.text(r, col("id")) == id && table.text(r, col("property")) == property && table.number(r, col("temperature_K")).is_some_and(|x| (x * 100.0).round() as u64 == t_centi))
            .collect();
        let own = if property == "density" { &c.liquid_density.source } else { &c.liquid_viscosity.source };
        if property == "viscosity" && t <= c.constants.melting_point.value {
            continue; // liquid phase only
        }
        let library_value = |rho_ref: Option<f64>| -> (f64, f64) {
            // (library, reference scale): density as is; viscosity as kinematic ν = μ/ρ
            if property == "density" {
                (c.liquid_density(t), 1.0)
            } else {
                (c.liquid_viscosity(t) / c.liquid_density(t), 1.0 / rho_ref.unwrap_or_else(|| c.liquid_density(t)))
            }
        };
        let mut judged: Option<(f64, f64, String, String)> = None;
        let mut also = vec![];
        for r in &rows {
            let src_id = table.text(r, col("source_id"));
            let Some(v) = table.number(r, col("value")) else { continue };
            let rho_ref = table.number(r, col("reference_density_kg_m3"));
            let (lib_v, scale) = library_value(rho_ref);
            let reference = v * scale;
            let e = relative_error(lib_v, reference);
            if src_id == own.as_str() {
                also.push(format!("{src_id} {:+.2} % (coefficient source, not judged)", 100.0 * (lib_v / reference - 1.0)));
            } else if judged.is_none() && table.text(r, col("asserted")) == "1" {
                judged = Some((e, reference, src_id.to_string(), table.text(r, col("source")).to_string()));
            } else {
                also.push(format!("{src_id} {:+.2} %", 100.0 * (lib_v / reference - 1.0)));
            }
        }
        let Some((error, reference, src_id, source)) = judged else { continue };
        let (lib_v, _) = library_value(None);
        let (label, key, tol, unit, shown) = match (property.as_str(), t_centi) {
            ("density", 28815) => ("liquid density at 15 °C", "density-15C", TOL_DENSITY_15C, "kg/m³", 1.0),
            ("density", _) => ("handbook liquid density", "handbook-density-20C", TOL_HANDBOOK_DENSITY, "kg/m³", 1.0),
            _ => ("kinematic viscosity", "kinematic-viscosity", TOL_KINEMATIC_VISCOSITY, "mm²/s", 1e6),
        };
        let also = if also.is_empty() { String::new() } else { format!("; other references: {}", also.join(", ")) };
        let check = format!(
            "{id} {label} at {t:.2} K: library {} vs {} {unit} (coefficients: {own}; reference: {src_id}){also}",
            fmt_sig(lib_v * shown),
            fmt_sig(reference * shown)
        );
        out.push(mark_known(CheckResult::relative(GROUP_DATA, check, &source, error, tol), &id, key));
    }
    out
}

/// One handbook value to compare: file key, label, reference and tolerance from the table (SI), library
/// value (SI), display unit and the factor from SI to it, source text.
struct HandbookItem {
    key: &'static str,
    label: &'static str,
    reference: Option<f64>,
    tolerance: Option<f64>,
    value: f64,
    unit: &'static str,
    scale: f64,
    source: String,
}
