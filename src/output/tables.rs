//! Writers of the property tables (`dropcut table`): CSV with `#` metadata lines, or JSON with the same
//! content (metadata, columns, rows). Every number is checked to be finite before it is written.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use serde_json::{json, Map, Value};

use crate::data::{Component, Correlation, Form, SourceRegistry};
use crate::fuel::Fuel;
use crate::table::fit::PolyFit;
use crate::table::surrogate::{ConditionComparison, Surrogate, SOURCE as SURROGATE_SOURCE};
use crate::table::enthalpy::REFERENCE_TEMPERATURE;
use crate::table::fit::{MAX_FIT_ERROR, MIN_PIECE_POINTS};
use crate::table::validity::VALIDITY_TEXT;
use crate::table::{describe_excursions, range_excursions, Column, ComponentTable, MixtureTable, TableFits, TableSet, COMPONENT_COLUMNS, LIQUID_KEYS, MIXTURE_COLUMNS, SHARE_COLUMNS, VAPOR_KEYS};

use super::{fmt_f64, write_atomic, Cell, CsvTable, OutputError, TOOL_VERSION};

/// File format of the tables.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TableFormat {
    /// CSV with `#` metadata lines.
    Csv,
    /// JSON objects with metadata, columns and rows.
    Json,
}

impl TableFormat {
    /// File extension.
    pub fn extension(self) -> &'static str {
        match self {
            TableFormat::Csv => "csv",
            TableFormat::Json => "json",
        }
    }
}

/// How to write the tables.
#[derive(Debug, Clone)]
pub struct WriteOptions {
    /// File format.
    pub format: TableFormat,
    /// Date line of the metadata (None = left out, for byte-identical output).
    pub date: Option<String>,
}

/// One table ready to be written in either format.
struct Doc {
    metadata: Vec<(String, String)>,
    columns: Vec<(String, String)>,
    rows: Vec<Vec<Cell>>,
    extra: Map<String, Value>,
}

fn num(path: &str, column: &str, v: f64) -> Result<Value, OutputError> {
    if !v.is_finite() {
        return Err(OutputError::NonFinite { path: path.into(), column: column.into() });
    }
    Ok(json!(v))
}

impl Doc {
    fn csv(&self, path: &str) -> Result<String, OutputError> {
        let mut t = CsvTable::new(self.columns.iter().map(|c| c.0.clone()).collect());
        t.metadata = self.metadata.iter().map(|(k, v)| format!("{k}: {v}")).collect();
        for r in &self.rows {
            t.push(r.clone(), path)?;
        }
        Ok(t.render())
    }

    fn json(&self, path: &str) -> Result<String, OutputError> {
        let mut root = Map::new();
        let meta: BTreeMap<&str, &str> = self.metadata.iter().map(|(k, v)| (k.as_str(), v.as_str())).collect();
        root.insert("metadata".into(), json!(meta));
        root.insert("columns".into(), Value::Array(self.columns.iter().map(|(n, d)| json!({"name": n, "description": d})).collect()));
        let mut rows = Vec::with_capacity(self.rows.len());
        for r in &self.rows {
            let mut out = Vec::with_capacity(r.len());
            for (i, c) in r.iter().enumerate() {
                let col = self.columns.get(i).map(|c| c.0.as_str()).unwrap_or("");
                out.push(match c {
                    Cell::Num(v) => num(path, col, *v)?,
                    Cell::Opt(None) => Value::Null,
                    Cell::Opt(Some(v)) => num(path, col, *v)?,
                    Cell::Text(t) => Value::String(t.clone()),
                });
            }
            rows.push(Value::Array(out));
        }
        root.insert("rows".into(), Value::Array(rows));
        for (k, v) in &self.extra {
            root.insert(k.clone(), v.clone());
        }
        check_finite(&Value::Object(root.clone()), path)?;
        let mut s = serde_json::to_string_pretty(&Value::Object(root)).map_err(|e| OutputError::Io { path: path.into(), message: e.to_string() })?;
        s.push('\n');
        Ok(s)
    }

    fn write(&self, dir: &Path, stem: &str, format: TableFormat, written: &mut Vec<PathBuf>) -> Result<(), OutputError> {
        let path = dir.join(format!("{stem}.{}", format.extension()));
        let shown = path.display().to_string();
        let text = match format {
            TableFormat::Csv => self.csv(&shown)?,
            TableFormat::Json => self.json(&shown)?,
        };
        write_atomic(&path, text.as_bytes())?;
        written.push(path);
        Ok(())
    }
}

/// serde_json turns NaN into null silently; refuse instead.
fn check_finite(v: &Value, path: &str) -> Result<(), OutputError> {
    match v {
        Value::Number(n) if n.as_f64().is_some_and(|f| !f.is_finite()) => Err(OutputError::NonFinite { path: path.into(), column: "(json)".into() }),
        Value::Array(a) => a.iter().try_for_each(|x| check_finite(x, path)),
        Value::Object(o) => o.values().try_for_each(|x| check_finite(x, path)),
        _ => Ok(()),
    }
}

fn g(v: f64) -> String {
    fmt_f64(v).unwrap_or_else(|| "not finite".into())
}

// ---------------------------------------------------------------------------------------------------------
// Metadata
// ---------------------------------------------------------------------------------------------------------

/// Metadata line of the enthalpy columns.
fn enthalpy_text() -> String {
    format!(
        "reference state: the liquid at {} K has zero specific enthalpy (every component; ideal solution, no heat of mixing); liquid_enthalpy_J_kg = ∫ cp_J_kgK dT from {} K (five-point Gauss–Legendre, panels of at most 5 K); vapor_enthalpy_J_kg = liquid_enthalpy_J_kg + latent_heat_J_kg, so vapor_enthalpy_J_kg − liquid_enthalpy_J_kg equals latent_heat_J_kg on every row (docs/tables.md, Enthalpies)",
        g(REFERENCE_TEMPERATURE),
        g(REFERENCE_TEMPERATURE)
    )
}

/// Metadata line on the vapour properties past their fitted ranges.
const VAPOR_EXTENSION_TEXT: &str = "vapour properties keep their temperature dependence past the published fit ranges: ideal-gas cp continues as the Wilhoit (1975) form fitted to the published polynomial (valid 50–1500 K), vapour viscosity and conductivity as the Chung et al. shape anchored at the published range end (valid from T* = 0.3 to 1500 K); rows beyond those valid ranges list the property in extrapolated_properties (docs/property-methods.md, Ranges)";

fn common(title: &str, fuel: &Fuel, set: &TableSet, date: &Option<String>) -> Vec<(String, String)> {
    let mut m = vec![
        ("tool".to_string(), TOOL_VERSION.to_string()),
        ("table".to_string(), title.to_string()),
        ("fuel".to_string(), format!("{} ({})", fuel.name, fuel.origin)),
        ("composition_hash".to_string(), fuel.composition_hash()),
        (
            "composition_mass_fractions".to_string(),
            fuel.components.iter().zip(&fuel.mass_fractions).map(|(c, w)| format!("{}={}", c.id, g(*w))).collect::<Vec<_>>().join(" "),
        ),
        ("pressure_Pa".to_string(), g(set.options.pressure)),
        (
            "ambient_gas".to_string(),
            format!(
                "{} (mole fractions {})",
                set.options.gas.label,
                set.options.gas.species.iter().zip(&set.options.gas.mole_fractions).map(|(s, x)| format!("{}={}", s.id, g(*x))).collect::<Vec<_>>().join(" ")
            ),
        ),
    ];
    if let Some(d) = date {
        m.push(("date".to_string(), d.clone()));
    }
    m
}

fn estimated_components(components: &[std::sync::Arc<Component>]) -> String {
    let v: Vec<String> = components
        .iter()
        .filter_map(|c| {
            let e = c.estimated_properties();
            (!e.is_empty()).then(|| format!("{} ({})", c.id, e.join(", ")))
        })
        .collect();
    if v.is_empty() {
        "none".into()
    } else {
        v.join("; ")
    }
}

fn sources_used(components: &[std::sync::Arc<Component>], sources: &SourceRegistry) -> (String, Value) {
    let mut ids: BTreeMap<String, String> = BTreeMap::new();
    for c in components {
        for (_, id) in c.source_ids() {
            ids.entry(id.clone()).or_insert_with(|| sources.describe(&id));
        }
    }
    let text = ids.keys().cloned().collect::<Vec<_>>().join("; ");
    (text, json!(ids))
}

/// (name, description) of the property columns followed by the two flag columns every table ends with.
fn columns_with_flags(columns: &[Column]) -> Vec<(String, String)> {
    let mut out: Vec<(String, String)> = columns.iter().map(|c| (c.name.to_string(), c.description.to_string())).collect();
    out.push(("validity".into(), "validity flag".into()));
    out.push(("extrapolated_properties".into(), "properties outside their valid range".into()));
    out.extend(SHARE_COLUMNS.iter().map(|c| (c.name.to_string(), c.description.to_string())));
    out
}

fn column_lines(columns: &[Column]) -> Vec<(String, String)> {
    columns.iter().map(|c| (format!("column {}", c.name), c.description.to_string())).collect()
}

fn composition_json(fuel: &Fuel) -> Value {
    let x = fuel.mole_fractions();
    Value::Array(
        fuel.components
            .iter()
            .zip(&fuel.mass_fractions)
            .zip(&x)
            .map(|((c, w), x)| json!({"id": c.id, "mass_fraction": w, "mole_fraction": x}))
            .collect(),
    )
}

// ---------------------------------------------------------------------------------------------------------
// Mixture tables
// ---------------------------------------------------------------------------------------------------------

fn mixture_doc(t: &MixtureTable, set: &TableSet, sources: &SourceRegistry, date: &Option<String>) -> Doc {
    let title = match t.evaporated_fraction {
        Some(f) => format!(
            "{} — mixture liquid and equilibrium vapour versus temperature, for the residue after open-vessel weathering at {} K to {} evaporated (mass)",
            t.label,
            g(set.options.residue_temperature),
            g(f)
        ),
        None => format!("{} — mixture liquid and equilibrium vapour versus temperature", t.label),
    };
    let mut m = common(&title, &t.fuel, set, date);
    let grid = &t.grid;
    m.push(("temperature_range".into(), format!("{}–{} K in steps of {} K ({} rows)", g(grid.from), g(grid.to), g(grid.step), t.rows.len())));
    m.push(("range_start".into(), grid.from_rule.clone()));
    m.push(("range_end".into(), grid.to_rule.clone()));
    m.push((
        "bubble_point_K".into(),
        t.limits.bubble_point.map(g).unwrap_or_else(|| if t.limits.bubble_point_note.is_empty() { "none at this pressure".into() } else { format!("none: {}", t.limits.bubble_point_note) }),
    ));
    m.push((
        "freezing_point_K".into(),
        match t.limits.freezing_point {
            Some(tf) => format!(
                "{} (ideal solid–liquid solubility, Schröder–van Laar; controlled by {}){}",
                g(tf),
                t.limits.freezing_component.as_deref().unwrap_or("?"),
                if t.limits.freezing_skipped.is_empty() { String::new() } else { format!("; skipped, no enthalpy of fusion: {}", t.limits.freezing_skipped.join(", ")) }
            ),
            None => "not estimated (no component has an enthalpy of fusion)".into(),
        },
    ));
    let p_pc = crate::props::liquid::pseudo_critical_pressure(&t.fuel.components, &t.fuel.mole_fractions());
    if t.pressure >= p_pc {
        m.push((
            "pressure_warning".into(),
            format!("the table pressure is at or above the liquid's pseudo-critical pressure ({} Pa, Kay's rule): there is no bubble point; saturated-liquid correlations and Raoult's law are outside their assumptions", g(p_pc)),
        ));
    }
    m.push(("pseudo_critical_temperature_K".into(), format!("{} (Kay's rule, Σ x_i T_c,i)", g(t.limits.pseudo_critical_temperature))));
    m.push(("lowest_major_critical_temperature_K".into(), format!("{} ({})", g(t.limits.critical_temperature), t.limits.critical_component)));
    let x = t.fuel.mole_fractions();
    let past: Vec<String> = t
        .fuel
        .components
        .iter()
        .zip(&x)
        .filter(|(c, x)| **x > 0.0 && c.critical_temperature() < grid.to)
        .map(|(c, x)| format!("{} (Tc {} K, mole fraction {})", c.id, g(c.critical_temperature()), g(*x)))
        .collect();
    m.push((
        "components_past_critical_in_range".into(),
        if past.is_empty() { "none".into() } else { format!("{}: graded by supercritical_share, they do not end the table", past.join("; ")) },
    ));
    m.push(("enthalpy".into(), enthalpy_text()));
    m.push((
        "enthalpy_ideal_gas_gap".into(),
        format!(
            "{}: largest |(vapor_enthalpy_J_kg − its first-row value) − ∫ cp_ig dT| over the rows, relative to latent_heat_J_kg, with cp_ig = Σ w_i cp_ig,i of the liquid's composition as a vapour: how far the published latent-heat and heat-capacity correlations are from Kirchhoff's relation",
            g(t.ideal_gas_enthalpy_gap)
        ),
    ));
    m.push(("vapor_extension".into(), VAPOR_EXTENSION_TEXT.into()));
    m.push((
        "vapor_columns".into(),
        match set.options.activity {
            crate::props::activity::ActivityModel::Ideal => "the equilibrium vapour leaving the liquid at T (Raoult: mole fractions proportional to x_i p_sat,i(T)), pure fuel vapour without ambient gas; its diffusivity is in the ambient gas at the table pressure".to_string(),
            crate::props::activity::ActivityModel::Unifac => "the equilibrium vapour leaving the liquid at T (modified Raoult's law: mole fractions proportional to x_i γ_i p_sat,i(T), γ by original UNIFAC), pure fuel vapour without ambient gas; its diffusivity is in the ambient gas at the table pressure".to_string(),
        },
    ));
    m.push(("liquid_activity".into(), set.options.activity.description()));
    m.push(("properties".into(), "saturated-liquid correlations without pressure correction; low-pressure (ideal-gas) vapour properties".into()));
    m.extend(column_lines(&MIXTURE_COLUMNS));
    m.push(("column validity".into(), VALIDITY_TEXT.into()));
    m.push(("column extrapolated_properties".into(), "property keys (component-file sections) evaluated outside their valid range for some component, separated by ';'".into()));
    m.extend(column_lines(&SHARE_COLUMNS));
    let keys: Vec<&str> = LIQUID_KEYS.iter().chain(VAPOR_KEYS.iter()).copied().collect();
    let excursions = match (t.rows.first(), t.rows.last()) {
        (Some(a), Some(b)) => range_excursions(&t.fuel.components, &t.fuel.mass_fractions, a.liquid.temperature_K, b.liquid.temperature_K, &keys),
        _ => vec![],
    };
    m.push(("properties_outside_valid_range".into(), describe_excursions(&excursions)));
    m.push(("estimated_components".into(), estimated_components(&t.fuel.components)));
    let (src_text, src_json) = sources_used(&t.fuel.components, sources);
    m.push(("sources".into(), src_text));
    let columns = columns_with_flags(&MIXTURE_COLUMNS);
    let rows = t
        .rows
        .iter()
        .map(|r| {
            let mut cells: Vec<Cell> = r.numbers().iter().map(|v| Cell::Num(*v)).collect();
            cells.push(Cell::Text(r.validity.as_str().into()));
            cells.push(Cell::Text(r.extrapolated_properties.join(";")));
            cells.extend(r.shares.iter().map(|v| Cell::Num(*v)));
            cells
        })
        .collect();
    let mut extra = Map::new();
    extra.insert("composition".into(), composition_json(&t.fuel));
    extra.insert("sources".into(), src_json);
    extra.insert("properties_outside_valid_range".into(), json!(excursions));
    Doc { metadata: m, columns, rows, extra }
}

// ---------------------------------------------------------------------------------------------------------
// Component tables
// ---------------------------------------------------------------------------------------------------------

/// Model name and coefficients of a correlation form as written in component files.
pub fn form_description(form: &Form) -> (&'static str, Vec<f64>, Option<f64>) {
    match form {
        Form::Constant(a) => ("constant", vec![*a], None),
        Form::Dippr100(c) => ("dippr100", c.to_vec(), None),
        Form::Dippr101(c) => ("dippr101", c.to_vec(), None),
        Form::Dippr102(c) => ("dippr102", c.to_vec(), None),
        Form::Dippr105(c) => ("dippr105", c.to_vec(), None),
        Form::Dippr106 { c, tc } => ("dippr106", c.to_vec(), Some(*tc)),
        Form::Dippr107(c) => ("dippr107", c.to_vec(), None),
        Form::Dippr114 { c, tc } => ("dippr114", c.to_vec(), Some(*tc)),
        Form::Antoine(c) => ("antoine", c.to_vec(), None),
        Form::Wagner { c, tc, .. } => ("wagner", c.to_vec(), Some(*tc)),
        Form::Vogel(c) => ("vogel", c.to_vec(), None),
        Form::MuleroCachadina { terms, tc } => ("mulero-cachadina", terms.iter().flat_map(|(a, b)| [*a, *b]).collect(), Some(*tc)),
        Form::Nasa7 { low, .. } => ("nasa7", low.to_vec(), None),
        Form::PpdsDensity { c, tc } => ("ppds-density", c.to_vec(), Some(*tc)),
        Form::Ppds9(c) => ("ppds-viscosity", c.to_vec(), None),
        Form::CorrespondingStates => ("corresponding-states", vec![], None),
    }
}

/// SI unit of each correlation's result.
fn si_unit(key: &str) -> &'static str {
    match key {
        "vapor-pressure" => "Pa",
        "liquid-density" => "kg/m3",
        "latent-heat" => "J/kg",
        "liquid-heat-capacity" | "ideal-gas-heat-capacity" => "J/kg/K",
        "liquid-viscosity" | "vapor-viscosity" => "Pa*s",
        "liquid-conductivity" | "vapor-conductivity" => "W/m/K",
        "surface-tension" => "N/m",
        _ => "",
    }
}

fn correlation_line(c: &Correlation, sources: &SourceRegistry) -> String {
    let (model, _, _) = form_description(&c.form);
    let range = if matches!(c.form, Form::CorrespondingStates) { "estimated from the constants (no published range)".to_string() } else { format!("published range {}–{} K", g(c.t_min), g(c.t_max)) };
    format!("{model}, {range}, source {} ({})", c.source, sources.describe(&c.source))
}

fn correlation_json(key: &str, c: &Correlation, sources: &SourceRegistry, with_coefficients: bool) -> Value {
    let (model, coefficients, tc) = form_description(&c.form);
    let mut o = json!({
        "property": key,
        "model": model,
        "t_min_K": c.t_min,
        "t_max_K": c.t_max,
        "source": c.source,
        "citation": sources.describe(&c.source),
        "estimated": c.is_estimated(),
    });
    if with_coefficients {
        o["coefficients"] = json!(coefficients);
        o["unit"] = json!(si_unit(key));
        o["form"] = json!(form_equation(model));
        if let Some(tc) = tc {
            o["tc_K"] = json!(tc);
        }
    }
    o
}

fn form_equation(model: &str) -> &'static str {
    match model {
        "dippr100" => "y = A + B T + C T^2 + D T^3 + E T^4 (T held inside [t_min, t_max])",
        "dippr101" => "y = exp(A + B/T + C ln T + D T^E)",
        "dippr106" => "y = A (1 - Tr)^(B + C Tr + D Tr^2 + E Tr^3), Tr = T/tc",
        _ => "see docs/component-format.md",
    }
}

fn constants_of(c: &Component) -> Vec<(&'static str, f64, String)> {
    let k = &c.constants;
    let mut v = vec![
        ("molar_mass_kg_mol", k.molar_mass.value, k.molar_mass.source.clone()),
        ("normal_boiling_point_K", k.normal_boiling_point.value, k.normal_boiling_point.source.clone()),
        ("critical_temperature_K", k.critical_temperature.value, k.critical_temperature.source.clone()),
        ("critical_pressure_Pa", k.critical_pressure.value, k.critical_pressure.source.clone()),
        ("acentric_factor", k.acentric_factor.value, k.acentric_factor.source.clone()),
        ("critical_volume_m3_mol", k.critical_volume.value, k.critical_volume.source.clone()),
        ("melting_point_K", k.melting_point.value, k.melting_point.source.clone()),
    ];
    if let Some(h) = &k.enthalpy_of_fusion {
        v.push(("enthalpy_of_fusion_J_mol", h.value, h.source.clone()));
    }
    v.push(("molar_volume_at_boiling_point_m3_mol", c.molar_volume_at_boiling(), "computed: molar mass / liquid density at Tb".into()));
    v.push((
        "fuller_diffusion_volume",
        c.diffusion_volume(),
        k.diffusion_volume.as_ref().map(|d| d.source.clone()).unwrap_or_else(|| "computed: Fuller et al. (1966) atomic increments".into()),
    ));
    if let Some(s) = &k.lennard_jones_sigma {
        v.push(("lennard_jones_sigma_m", s.value, s.source.clone()));
    }
    if let Some(e) = &k.lennard_jones_epsilon_over_k {
        v.push(("lennard_jones_epsilon_over_k_K", e.value, e.source.clone()));
    }
    v
}

fn component_doc(t: &ComponentTable, fuel: &Fuel, set: &TableSet, sources: &SourceRegistry, date: &Option<String>, title: &str, coefficients: bool) -> Doc {
    let c = &t.component;
    let mut m = common(title, fuel, set, date);
    m.push(("component".into(), format!("{} ({}, CAS {}, class {})", c.id, c.name, if c.cas.is_empty() { "-" } else { &c.cas }, c.class.as_str())));
    for (name, v, src) in constants_of(c) {
        m.push((format!("constant {name}"), format!("{} ({src})", g(v))));
    }
    m.push((
        "liquid_range".into(),
        match t.liquid_range {
            Some((a, b)) => format!("{}–{} K: the mixture table's temperatures, below 0.99 Tc of this component; liquid cells are empty elsewhere", g(a), g(b)),
            None => "none (the component is above 0.99 Tc over the whole mixture range)".into(),
        },
    ));
    m.push(("vapor_range".into(), format!("{}–{} K (vapour columns are filled on every row)", g(set.vapor_grid.from), g(set.vapor_grid.to))));
    m.push(("saturation_temperature_K".into(), t.saturation_temperature.map(g).unwrap_or_else(|| "none (table pressure above the critical pressure)".into())));
    for (key, corr) in c.correlations() {
        m.push((format!("correlation {key}"), correlation_line(corr, sources)));
    }
    m.extend(column_lines(&COMPONENT_COLUMNS));
    m.push(("column validity".into(), VALIDITY_TEXT.into()));
    m.push(("column extrapolated_properties".into(), "property keys evaluated outside their valid range, separated by ';'".into()));
    m.extend(column_lines(&SHARE_COLUMNS));
    m.push(("enthalpy".into(), enthalpy_text()));
    m.push(("vapor_extension".into(), VAPOR_EXTENSION_TEXT.into()));
    let one = std::slice::from_ref(c);
    let mut excursions = match t.liquid_range {
        Some((a, b)) => range_excursions(one, &[1.0], a, b, &LIQUID_KEYS),
        None => vec![],
    };
    let vapor_ts: Vec<f64> = t.rows.iter().map(|r| r.temperature).collect();
    if let (Some(a), Some(b)) = (vapor_ts.iter().copied().reduce(f64::min), vapor_ts.iter().copied().reduce(f64::max)) {
        excursions.extend(range_excursions(one, &[1.0], a, b, &VAPOR_KEYS));
    }
    m.push(("properties_outside_valid_range".into(), describe_excursions(&excursions)));
    let est = c.estimated_properties();
    m.push(("estimated_properties".into(), if est.is_empty() { "none".into() } else { est.join(", ") }));
    let columns = columns_with_flags(&COMPONENT_COLUMNS);
    let rows = t
        .rows
        .iter()
        .map(|r| {
            let mut cells: Vec<Cell> = r.cells().iter().map(|v| Cell::Opt(*v)).collect();
            cells.push(Cell::Text(r.validity.as_str().into()));
            cells.push(Cell::Text(r.extrapolated_properties.join(";")));
            cells.extend(r.shares.iter().map(|v| Cell::Num(*v)));
            cells
        })
        .collect();
    let mut extra = Map::new();
    let constants: Map<String, Value> = constants_of(c).into_iter().map(|(n, v, s)| (n.to_string(), json!({"value": v, "source": s}))).collect();
    extra.insert("constants".into(), Value::Object(constants));
    extra.insert("properties_outside_valid_range".into(), json!(excursions));
    extra.insert("correlations".into(), Value::Array(c.correlations().iter().map(|(k, corr)| correlation_json(k, corr, sources, coefficients)).collect()));
    Doc { metadata: m, columns, rows, extra }
}

// ---------------------------------------------------------------------------------------------------------
// Surrogate
// ---------------------------------------------------------------------------------------------------------

fn pct(v: Option<f64>) -> String {
    v.map(|e| format!("{:+.3} %", 100.0 * e)).unwrap_or_else(|| "n/a".into())
}

fn condition_text(c: &ConditionComparison) -> String {
    let k = &c.condition;
    format!(
        "{} K, {} Pa, {} m, {} m/s, droplet {} K: lifetime mixture {} s, surrogate {} s ({}); t10 mixture {} s, surrogate {} s ({})",
        g(k.ambient_temperature),
        g(k.pressure),
        g(k.diameter),
        g(k.velocity),
        g(k.droplet_temperature),
        c.mixture.lifetime.map(g).unwrap_or_else(|| "none".into()),
        c.surrogate.lifetime.map(g).unwrap_or_else(|| "none".into()),
        pct(c.lifetime_error),
        c.mixture.t10.map(g).unwrap_or_else(|| "none".into()),
        c.surrogate.t10.map(g).unwrap_or_else(|| "none".into()),
        pct(c.t10_error),
    )
}

/// The surrogate's latent-heat scaling columns, after the share columns (name, description).
pub const SURROGATE_SCALING_COLUMNS: [(&str, &str); 3] = [
    ("latent_heat_factor", "the fitted latent-heat factor g, constant; liquid rows only [-]"),
    ("unscaled_latent_heat_J_kg", "latent_heat_J_kg / latent_heat_factor: the DIPPR-106 fit of the mixture's mass-weighted latent heat; liquid rows only"),
    ("latent_heat_scaling_excess_J_kg", "latent_heat_J_kg − unscaled_latent_heat_J_kg: the heat per kilogram evaporated that the scaling adds to the mixture's latent heat; liquid rows only"),
];

/// The method text of the surrogate (metadata and docs).
pub const SURROGATE_METHOD: &str = "one pseudo-component: liquid density, cp, viscosity, conductivity and surface tension = the fuel's initial liquid (mixture rules, least-squares fits over the liquid range); vapour cp, viscosity, conductivity and Fuller volume = the initial composition as a vapour; molar mass = mean of the initial liquid, critical constants by Kay's rule; vapour pressure = volatility_factor × (fit of the initial liquid's bubble pressure, ln p = A + B/T + C ln T + D T^E); latent heat = latent_heat_factor × (DIPPR-106 fit of the mass-weighted latent heat); latent_heat_factor chosen so the droplet lifetime equals the mixture's at the reference condition, volatility_factor so the time to 10 % evaporated (t10) matches as well (nested bracketing root finds, well-mixed droplet model)";

fn surrogate_doc(s: &Surrogate, t: &ComponentTable, fuel: &Fuel, set: &TableSet, sources: &SourceRegistry, date: &Option<String>) -> Doc {
    let mut d = component_doc(t, fuel, set, sources, date, "surrogate — equivalent single-component surrogate, properties versus temperature", true);
    let mut m = vec![
        ("surrogate_method".to_string(), SURROGATE_METHOD.to_string()),
        ("volatility_factor".to_string(), g(s.parameters.volatility_factor)),
        ("latent_heat_factor".to_string(), g(s.parameters.latent_heat_factor)),
        ("equivalent_normal_boiling_point_K".to_string(), g(s.component.normal_boiling_point())),
        ("t10_matched".to_string(), s.t10_matched.to_string()),
        ("fit_droplet_runs".to_string(), s.fit_runs.to_string()),
        ("reference".to_string(), condition_text(&s.at_reference)),
    ];
    for (i, e) in s.evaluations.iter().enumerate() {
        m.push((format!("evaluation {}", i + 1), condition_text(e)));
    }
    let worst = s.evaluations.iter().filter_map(|e| e.lifetime_error).map(f64::abs).fold(0.0, f64::max);
    m.push(("largest_lifetime_error_elsewhere".into(), format!("{:.3} %", 100.0 * worst)));
    m.push((
        "fit_ranges".into(),
        format!("liquid curves {}–{} K, vapour curves {}–{} K", g(s.basis.liquid_range.0), g(s.basis.liquid_range.1), g(s.basis.vapor_range.0), g(s.basis.vapor_range.1)),
    ));
    m.push((
        "curve_fit_errors".into(),
        s.basis.fit_errors.iter().map(|(k, e)| format!("{k} {:.3} %", 100.0 * e)).collect::<Vec<_>>().join("; ") + " (largest deviation of each fitted curve from the mixture rule over its range, before the two factors)",
    ));
    for n in &s.notes {
        m.push(("note".into(), n.clone()));
    }
    m.push((
        "latent_heat_scaling".into(),
        format!(
            "the latent heat of this table includes the fitted latent_heat_factor {}: latent_heat_J_kg = latent_heat_factor × unscaled_latent_heat_J_kg (the DIPPR-106 fit of the mixture's mass-weighted latent heat); vapor_enthalpy_J_kg − liquid_enthalpy_J_kg equals the scaled latent_heat_J_kg, so the surrogate is energy-consistent in itself; its effect: per kilogram evaporated the surrogate takes latent_heat_scaling_excess_J_kg = (latent_heat_factor − 1) × unscaled_latent_heat_J_kg more heat than the mixture's latent heat, which stands in for the heat-up and composition effects a single component cannot carry",
            g(s.parameters.latent_heat_factor)
        ),
    ));
    // insert the surrogate lines after the common block (before "component")
    let at = d.metadata.iter().position(|(k, _)| k == "component").unwrap_or(d.metadata.len());
    for (i, line) in m.into_iter().enumerate() {
        d.metadata.insert(at + i, line);
    }
    for (name, description) in SURROGATE_SCALING_COLUMNS {
        d.columns.push((name.to_string(), description.to_string()));
        d.metadata.push((format!("column {name}"), description.to_string()));
    }
    for (row, r) in d.rows.iter_mut().zip(&t.rows) {
        row.extend(s.scaling_cells(r.liquid.map(|l| l[7])).iter().map(|v| Cell::Opt(*v)));
    }
    d.extra.insert("surrogate_method".into(), json!(SURROGATE_METHOD));
    d.extra.insert("parameters".into(), json!(s.parameters));
    d.extra.insert("t10_matched".into(), json!(s.t10_matched));
    d.extra.insert("fit_droplet_runs".into(), json!(s.fit_runs));
    d.extra.insert("reference".into(), json!(s.at_reference));
    d.extra.insert("evaluations".into(), json!(s.evaluations));
    d.extra.insert("curve_fit_errors".into(), json!(s.basis.fit_errors.iter().map(|(k, e)| (k.to_string(), *e)).collect::<BTreeMap<String, f64>>()));
    d.extra.insert("fit_ranges_K".into(), json!({"liquid": [s.basis.liquid_range.0, s.basis.liquid_range.1], "vapor": [s.basis.vapor_range.0, s.basis.vapor_range.1]}));
    d.extra.insert("notes".into(), json!(s.notes));
    d.extra.insert("source_marker".into(), json!(SURROGATE_SOURCE));
    d
}

// ---------------------------------------------------------------------------------------------------------
// Fits
// ---------------------------------------------------------------------------------------------------------

/// Columns of fits.csv.
pub const FIT_COLUMNS: [&str; 19] = [
    "table",
    "property",
    "form",
    "variable",
    "center",
    "half_width",
    "degree",
    "c0",
    "c1",
    "c2",
    "c3",
    "c4",
    "t_min_K",
    "t_max_K",
    "points",
    "max_relative_error",
    "piece",
    "pieces",
    "flag",
];

fn fit_cells(table: &str, f: &PolyFit) -> Vec<Cell> {
    let mut cells = vec![
        Cell::Text(table.into()),
        Cell::Text(f.property.clone()),
        Cell::Text(f.form.as_str().into()),
        Cell::Text(f.variable.as_str().into()),
        Cell::Num(f.center),
        Cell::Num(f.half_width),
        Cell::Num(f.degree() as f64),
    ];
    for k in 0..5 {
        cells.push(Cell::Num(f.coefficients.get(k).copied().unwrap_or(0.0)));
    }
    cells.push(Cell::Num(f.t_min));
    cells.push(Cell::Num(f.t_max));
    cells.push(Cell::Num(f.points as f64));
    cells.push(Cell::Num(f.max_relative_error));
    cells.push(Cell::Num(f.piece as f64));
    cells.push(Cell::Num(f.pieces as f64));
    cells.push(Cell::Text(f.flag().into()));
    cells
}

fn fits_doc(fits: &[TableFits], fuel: &Fuel, set: &TableSet, date: &Option<String>) -> Doc {
    let mut m = common("fits — least-squares polynomial fits of every tabulated property", fuel, set, date);
    m.push(("definition".into(), "s = (x - center)/half_width with x = T [K] (variable T) or x = 1/T [1/K] (variable 1/T); P(s) = c0 + c1 s + c2 s^2 + c3 s^3 + c4 s^4; property = P(s) (form linear) or exp(P(s)) (form log), in the unit of the column named by property".into()));
    m.push(("validity".into(), "t_min_K..t_max_K: the table rows fitted (liquid columns over the liquid rows only); do not extrapolate".into()));
    m.push(("max_relative_error".into(), "largest |fit/table - 1| over the fitted table rows".into()));
    m.push((
        "method".into(),
        format!(
            "least squares by Householder QR; linear forms weighted by 1/|y| (relative error); degree = the lowest of 0..4 that meets {} relative error on every row, else 4",
            g(crate::table::fit::TARGET_RELATIVE_ERROR)
        ),
    ));
    m.push((
        "pieces".into(),
        format!(
            "where one polynomial misses {} maximum relative error, the rows are halved at their middle row (shared by both halves) and each half fitted the same way, down to {} rows a piece; each piece is one line (piece = 1..pieces in ascending temperature, t_min_K..t_max_K its range); flag = ok, or max-error-above-1-percent for a piece that still misses it",
            g(MAX_FIT_ERROR),
            MIN_PIECE_POINTS
        ),
    ));
    let flagged: Vec<String> = fits
        .iter()
        .flat_map(|tf| tf.fits.iter().filter(|f| f.max_relative_error > MAX_FIT_ERROR).map(move |f| format!("{} {} piece {} ({:.2} %)", tf.table, f.property, f.piece, 100.0 * f.max_relative_error)))
        .collect();
    m.push(("flagged_pieces".into(), if flagged.is_empty() { "none: every piece meets 1 %".into() } else { flagged.join("; ") }));
    let columns = FIT_COLUMNS.iter().map(|c| (c.to_string(), String::new())).collect();
    let rows = fits.iter().flat_map(|tf| tf.fits.iter().map(move |f| fit_cells(&tf.table, f))).collect();
    Doc { metadata: m, columns, rows, extra: Map::new() }
}

// ---------------------------------------------------------------------------------------------------------
// Entry point
// ---------------------------------------------------------------------------------------------------------

/// Write every table of `set` into `dir`; returns the files written, in order.
pub fn write_tables(dir: &Path, set: &TableSet, sources: &SourceRegistry, opts: &WriteOptions) -> Result<Vec<PathBuf>, OutputError> {
    let f = opts.format;
    let date = &opts.date;
    let fuel = &set.mixture.fuel;
    let mut written = vec![];
    mixture_doc(&set.mixture, set, sources, date).write(dir, "mixture", f, &mut written)?;
    for r in &set.residues {
        mixture_doc(r, set, sources, date).write(dir, &r.label, f, &mut written)?;
    }
    let comp_dir = dir.join("components");
    for t in &set.components {
        let title = format!("components/{} — pure-component liquid and vapour properties versus temperature", t.component.id);
        component_doc(t, fuel, set, sources, date, &title, false).write(&comp_dir, &t.component.id, f, &mut written)?;
    }
    if let Some((s, t)) = &set.surrogate {
        let doc = surrogate_doc(s, t, fuel, set, sources, date);
        if f == TableFormat::Csv {
            doc.write(dir, "surrogate", TableFormat::Csv, &mut written)?;
        }
        doc.write(dir, "surrogate", TableFormat::Json, &mut written)?;
    }
    fits_doc(&set.fits, fuel, set, date).write(dir, "fits", f, &mut written)?;
    Ok(written)
}
