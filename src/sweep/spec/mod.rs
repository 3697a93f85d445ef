//! The sweep spec (TOML): fuels × condition variables, each a fixed value, a list or a linear/log range, with
//! optional zipped (paired) variables. Parsed and validated once; cases are then generated on demand from their id,
//! so a sweep of any size needs no memory per case.
//!
//! The condition keys, their columns and their order come from the condition registry
//! ([`crate::conditions::CONDITIONS`]). Case ids count through the fuels (slowest), then through the conditions in
//! registry order, the last varying fastest; a zipped group takes the place of its first member in that order.
//! The order of keys in the file does not matter, so the same spec always yields the same cases in the same order.

mod sections;
mod values;

use std::collections::BTreeMap;
use std::path::Path;

use crate::conditions::{self, Condition, CONDITIONS};
use crate::data::{suggest, toml_error_at, Library};
use crate::fuel::Fuel;
use crate::model::DropletInputs;

use super::SweepError;

pub use crate::conditions::{Value, MIN_LIQUID_FACTOR};

const TOP_KEYS: [&str; 7] = ["name", "description", "fuels", "zipped", "conditions", "model", "output"];
pub(super) const RANGE_KEYS: [&str; 4] = ["from", "to", "steps", "scale"];
pub(super) const MODEL_KEYS: [&str; 2] = ["reference-weight", "end-mass-fraction"];
/// Smallest `model.end-mass-fraction` accepted (a remaining diameter of 1 % of the initial one).
pub const MIN_END_MASS_FRACTION: f64 = 1e-6;
pub(super) const OUTPUT_KEYS: [&str; 3] = ["histories", "residue-indicators", "history-times"];
/// Largest number of cases a spec may describe.
pub const MAX_CASES: u64 = 1_000_000_000_000;
/// Largest `steps` of one range.
pub const MAX_STEPS: u64 = 10_000_000;

/// How a condition value appears in summary.csv and in the spec fingerprint.
pub trait ValueText {
    /// The value as it appears in summary.csv (numbers in SI, shortest round-trip form).
    fn csv_text(&self) -> String;
    /// The value in the spec fingerprint (numbers in full precision).
    fn canonical(&self) -> String;
}

impl ValueText for Value {
    fn csv_text(&self) -> String {
        match self {
            Value::Number(x) => crate::output::fmt_f64(*x).unwrap_or_default(),
            Value::Flag(b) => b.to_string(),
            Value::Gas(g) => g.text.clone(),
            Value::Choice(c) => c.to_string(),
            Value::AmbientVapor(v) => v.text.clone(),
        }
    }

    fn canonical(&self) -> String {
        match self {
            Value::Number(x) => format!("{x:?}"),
            other => other.csv_text(),
        }
    }
}

/// The values one variable takes in a sweep.
#[derive(Debug, Clone)]
pub enum Values {
    /// Listed values (a fixed value is a list of one).
    List(Vec<Value>),
    /// `steps` values from `from` to `to` (both included), evenly spaced, or evenly spaced in the logarithm.
    Range {
        /// First value (SI).
        from: f64,
        /// Last value (SI).
        to: f64,
        /// Number of values (≥ 1).
        steps: u64,
        /// Spaced evenly in ln(value) instead of value.
        log: bool,
    },
}

impl Values {
    /// Number of values.
    pub fn len(&self) -> u64 {
        match self {
            Values::List(v) => v.len() as u64,
            Values::Range { steps, .. } => *steps,
        }
    }

    /// True when there is no value (never, for a parsed spec).
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The i-th value (i < len); range end points are exact.
    pub fn get(&self, i: u64) -> Value {
        match self {
            Values::List(v) => v[i as usize].clone(),
            Values::Range { from, to, steps, log } => {
                if i == 0 || *steps <= 1 {
                    return Value::Number(*from);
                }
                if i + 1 >= *steps {
                    return Value::Number(*to);
                }
                let (i, n) = (i as f64, (*steps - 1) as f64);
                Value::Number(if *log {
                    let (a, b) = (from.ln(), to.ln());
                    (a + (b - a) * i / n).exp()
                } else {
                    from + (to - from) * i / n
                })
            }
        }
    }

    fn canonical(&self) -> String {
        match self {
            Values::List(v) => format!("[{}]", v.iter().map(|x| x.canonical()).collect::<Vec<_>>().join("|")),
            Values::Range { from, to, steps, log } => format!("{}({from:?},{to:?},{steps})", if *log { "log" } else { "linear" }),
        }
    }
}

/// A fuel of the sweep: the entry as written in the spec and the fuel it resolved to.
#[derive(Debug, Clone)]
pub struct SweepFuel {
    /// The entry as written (shown in the `fuel` column).
    pub entry: String,
    /// The resolved fuel.
    pub fuel: Fuel,
}

/// Model options of a sweep (the same for every case).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ModelOptions {
    /// Reference-state weight of the film (1/3 rule) \[-\].
    pub reference_weight: f64,
    /// Remaining mass fraction that counts as evaporated \[-\].
    pub end_mass_fraction: f64,
}

/// A parsed, validated sweep spec.
#[derive(Debug, Clone)]
pub struct SweepSpec {
    /// The spec file as given (used in messages).
    pub file: String,
    /// Optional name of the sweep.
    pub name: Option<String>,
    /// Optional description.
    pub description: Option<String>,
    /// Write per-case histories (the `[output] histories` option).
    pub histories: bool,
    /// Add the residual-liquid indicator columns (the `[output] residue-indicators` option, default true).
    pub residue_indicators: bool,
    /// Times \[s\] of the case history rows (the `[output] history-times` option); empty: a row at every
    /// integrator step. Part of the spec's fingerprint, since with the resolved liquid it also moves the steps.
    pub history_times: Vec<f64>,
    fuels: Vec<SweepFuel>,
    values: Vec<Values>,
    groups: Vec<Vec<usize>>,
    model: ModelOptions,
    count: u64,
    fingerprint: String,
    registry: &'static [Condition],
    templates: Vec<DropletInputs>,
}

/// One case of a sweep: its id, fuel index and the value of every condition variable.
#[derive(Debug, Clone)]
pub struct Case {
    /// Case id (position in the sweep, from 0).
    pub id: u64,
    /// Index into the spec's fuels.
    pub fuel: usize,
    /// Values indexed like the registry.
    pub values: Vec<Value>,
}

pub(super) struct Ctx<'a> {
    pub(super) file: &'a str,
    pub(super) lib: &'a Library,
}

impl Ctx<'_> {
    pub(super) fn err(&self, field: impl Into<String>, message: impl Into<String>) -> SweepError {
        SweepError::Spec { file: self.file.to_string(), field: field.into(), message: message.into() }
    }
}

pub(super) fn type_name(v: &toml::Value) -> &'static str {
    match v {
        toml::Value::String(_) => "a string",
        toml::Value::Integer(_) => "an integer",
        toml::Value::Float(_) => "a number",
        toml::Value::Boolean(_) => "a boolean",
        toml::Value::Datetime(_) => "a date",
        toml::Value::Array(_) => "a list",
        toml::Value::Table(_) => "a table",
    }
}

pub(super) fn show(v: &toml::Value) -> String {
    // a float in shortest form, in exponent notation when tiny or huge (never hundreds of digits)
    let s = match v {
        toml::Value::Float(f) if f.is_finite() && *f != 0.0 && !(1e-4..1e15).contains(&f.abs()) => format!("{f:e}"),
        other => other.to_string(),
    };
    if s.len() > 60 {
        format!("{}…", &s[..s.char_indices().nth(57).map(|(i, _)| i).unwrap_or(s.len())])
    } else {
        s
    }
}

pub(super) fn unknown_key(ctx: &Ctx, field: &str, key: &str, known: &[&str]) -> SweepError {
    ctx.err(field, format!("unknown key '{key}'{}; known keys: {}", suggest(key, known.iter().copied()), known.join(", ")))
}

impl SweepSpec {
    /// Read and validate a spec file; relative fuel paths resolve against the spec's folder, then the current one.
    pub fn load(path: &Path, lib: &Library) -> Result<SweepSpec, SweepError> {
        let file = path.display().to_string();
        let bytes = crate::data::read_input_file(path).map_err(|e| SweepError::Spec { file: file.clone(), field: "(file)".into(), message: format!("cannot read the spec: {e}") })?;
        let text = String::from_utf8(bytes).map_err(|_| SweepError::Spec { file: file.clone(), field: "(file)".into(), message: "the spec is not UTF-8 text".into() })?;
        let base = path.parent().unwrap_or(Path::new(""));
        Self::parse(&text, &file, base, lib)
    }

    /// Parse spec text; `file` names it in messages and `base_dir` is where relative fuel paths are tried first.
    pub fn parse(text: &str, file: &str, base_dir: &Path, lib: &Library) -> Result<SweepSpec, SweepError> {
        Self::parse_with(text, file, base_dir, lib, &CONDITIONS)
    }

    /// Parse spec text with the conditions of `registry` (the built-in [`CONDITIONS`], or an extension of it).
    pub fn parse_with(text: &str, file: &str, base_dir: &Path, lib: &Library, registry: &'static [Condition]) -> Result<SweepSpec, SweepError> {
        let ctx = Ctx { file, lib };
        let table: toml::Table = toml::from_str(text).map_err(|e| ctx.err("(syntax)", toml_error_at(&e, text)))?;
        for key in table.keys() {
            if !TOP_KEYS.contains(&key.as_str()) {
                return Err(unknown_key(&ctx, key, key, &TOP_KEYS));
            }
        }
        let text_field = |key: &str| -> Result<Option<String>, SweepError> {
            match table.get(key) {
                None => Ok(None),
                Some(toml::Value::String(s)) => Ok(Some(s.clone())),
                Some(v) => Err(ctx.err(key, format!("expected a string, found {} {}", type_name(v), show(v)))),
            }
        };
        let name = text_field("name")?;
        let description = text_field("description")?;
        let fuels = sections::parse_fuels(&ctx, table.get("fuels"), base_dir)?;

        // conditions
        let mut given: BTreeMap<usize, toml::Value> = BTreeMap::new();
        match table.get("conditions") {
            None => {}
            Some(toml::Value::Table(t)) => {
                for (key, v) in t {
                    let i = registry.iter().position(|c| c.key == key).ok_or_else(|| {
                        ctx.err(
                            format!("conditions.{key}"),
                            format!("unknown condition '{key}'{}; conditions are the simulate options: {}", suggest(key, registry.iter().map(|c| c.key)), registry.iter().map(|c| c.key).collect::<Vec<_>>().join(", ")),
                        )
                    })?;
                    given.insert(i, v.clone());
                }
            }
            Some(v) => return Err(ctx.err("conditions", format!("expected a table [conditions], found {}", type_name(v)))),
        }
        // every fuel with every condition at its default: the template each case starts from
        let mut templates = Vec::with_capacity(fuels.len());
        for f in &fuels {
            templates.push(conditions::build_inputs(registry, f.fuel.clone(), lib, &[]).map_err(|e| ctx.err(format!("conditions.{}", e.key), format!("default with fuel '{}': {}", f.entry, e.reason)))?);
        }
        let mut values = Vec::with_capacity(registry.len());
        for (i, c) in registry.iter().enumerate() {
            let field = format!("conditions.{}", c.key);
            let v = match given.get(&i) {
                Some(v) => values::parse_values(&ctx, c, v, &field)?,
                None => Values::List(vec![values::scalar(&ctx, c, &toml::Value::String(c.default.into()), &field)?]),
            };
            values::check_against_fuels(&ctx, c, &v, &field, &fuels, &templates)?;
            values.push(v);
        }
        let groups = sections::parse_zipped(&ctx, registry, table.get("zipped"), &given, &values)?;
        let model = sections::parse_model(&ctx, table.get("model"))?;
        // model options hold for every case; a condition of the registry that sets the same field wins
        for t in &mut templates {
            t.reference_weight = model.reference_weight;
            t.end_mass_fraction = model.end_mass_fraction;
        }
        let (histories, residue_indicators, history_times) = sections::parse_output(&ctx, table.get("output"))?;

        let mut count: u64 = fuels.len() as u64;
        for g in &groups {
            count = count.checked_mul(values[g[0]].len()).filter(|c| *c <= MAX_CASES).ok_or_else(|| ctx.err("conditions", format!("the spec describes more than {MAX_CASES} cases")))?;
        }
        let mut spec = SweepSpec { file: file.to_string(), name, description, fuels, values, groups, model, histories, residue_indicators, history_times, count, fingerprint: String::new(), registry, templates };
        spec.fingerprint = spec.compute_fingerprint();
        Ok(spec)
    }

    /// The conditions of this spec, in case-id order.
    pub fn registry(&self) -> &'static [Condition] {
        self.registry
    }

    /// Fuels, in spec order.
    pub fn fuels(&self) -> &[SweepFuel] {
        &self.fuels
    }

    /// Values of each condition, indexed like the registry.
    pub fn values(&self) -> &[Values] {
        &self.values
    }

    /// Groups of variable indices in case-id order (slowest first); a zipped group has several members.
    pub fn groups(&self) -> &[Vec<usize>] {
        &self.groups
    }

    /// Model options.
    pub fn model(&self) -> ModelOptions {
        self.model
    }

    /// Number of cases.
    pub fn case_count(&self) -> u64 {
        self.count
    }

    /// A 16-hex-digit hash of everything that defines the cases (fuels and compositions, values, model options,
    /// requested history times).
    pub fn fingerprint(&self) -> &str {
        &self.fingerprint
    }

    fn compute_fingerprint(&self) -> String {
        let mut s = String::from("dropcut-sweep-1\n");
        for f in &self.fuels {
            s.push_str(&format!("fuel {}={}\n", f.entry, f.fuel.composition_hash()));
        }
        for (c, v) in self.registry.iter().zip(&self.values) {
            s.push_str(&format!("{}={}\n", c.key, v.canonical()));
        }
        for g in &self.groups {
            s.push_str(&format!("group {:?}\n", g));
        }
        s.push_str(&format!("model {:?} {:?}\n", self.model.reference_weight, self.model.end_mass_fraction));
        // only when given, so the fingerprints of specs without it stay as they were
        if !self.history_times.is_empty() {
            s.push_str(&format!("history-times {:?}\n", self.history_times));
        }
        let mut h: u64 = 0xcbf29ce484222325;
        for b in s.bytes() {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x100000001b3);
        }
        format!("{h:016x}")
    }

    /// Keys of the condition variables that take more than one value.
    pub fn varied(&self) -> Vec<&'static str> {
        self.registry.iter().zip(&self.values).filter(|(_, v)| v.len() > 1).map(|(c, _)| c.key).collect()
    }

    /// The case with this id, or None when id ≥ [`case_count`](Self::case_count).
    pub fn case(&self, id: u64) -> Option<Case> {
        if id >= self.count {
            return None;
        }
        let mut rem = id;
        let mut idx = vec![0u64; self.registry.len()];
        for g in self.groups.iter().rev() {
            let n = self.values[g[0]].len();
            for &v in g {
                idx[v] = rem % n;
            }
            rem /= n;
        }
        let values = idx.iter().enumerate().map(|(v, &i)| self.values[v].get(i)).collect();
        Some(Case { id, fuel: rem as usize, values })
    }

    /// The SI droplet inputs of a case: the fuel's template (defaults and model options) with every condition set
    /// in registry order.
    pub fn inputs(&self, case: &Case) -> Result<DropletInputs, SweepError> {
        let mut inp = self.templates.get(case.fuel).cloned().ok_or_else(|| SweepError::Internal(format!("case {} has no fuel {}", case.id, case.fuel)))?;
        for (c, v) in self.registry.iter().zip(&case.values) {
            // every listed value was set on every fuel's inputs at parse time; range values are checked numbers
            c.apply(&mut inp, v).map_err(|e| SweepError::Internal(format!("case {}: {e}", case.id)))?;
        }
        Ok(inp)
    }
}

#[cfg(test)]
mod tests;
