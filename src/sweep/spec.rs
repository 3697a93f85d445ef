//! The sweep spec (TOML): fuels × condition variables, each a fixed value, a list or a linear/log range, with
//! optional zipped (paired) variables. Parsed and validated once; cases are then generated on demand from their id,
//! so a sweep of any size needs no memory per case.
//!
//! Case ids count through the fuels (slowest), then through the condition variables in the fixed order of
//! [`VARIABLES`], the last varying fastest; a zipped group takes the place of its first member in that order.
//! The order of keys in the file does not matter, so the same spec always yields the same cases in the same order.

use std::collections::BTreeMap;
use std::path::Path;
use std::sync::Arc;

use crate::data::{suggest, toml_error_at, Library};
use crate::fuel::Fuel;
use crate::model::droplet::{LiquidHeat, LiquidMixing, LiquidOptions};
use crate::model::film::{DragLaw, Radiation, SupportFibre};
use crate::model::{DropletInputs, Motion, TransferCorrelation};
use crate::props::gas::AmbientGas;
use crate::units::{self, Quantity};

use super::SweepError;

/// What kind of value a condition variable takes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// A physical quantity: a plain number (SI) or a string with a unit.
    Quantity(Quantity),
    /// true or false.
    Flag,
    /// Ambient gas text: `air`, `n2` or mole fractions like `o2=0.15,n2=0.85`.
    Gas,
    /// One of a fixed set of names (e.g. `clift` / `ranz-marshall`).
    Choice(&'static [&'static str]),
    /// A whole number between the two bounds (inclusive).
    Count(u64, u64),
    /// Far-field fuel vapour as component=mass-fraction pairs (empty for none).
    AmbientVapor,
    /// A physical quantity, or one of a few keywords (e.g. `off`, `ambient`, `none`).
    QuantityOr(Quantity, &'static [&'static str]),
}

/// One condition variable: its key (the long option name of `simulate`), CSV column, kind and default.
#[derive(Debug, Clone, Copy)]
pub struct Variable {
    /// Key in `[conditions]`, the same as the `simulate` option.
    pub key: &'static str,
    /// Column name in summary.csv (SI unit as suffix).
    pub column: &'static str,
    /// Kind of value.
    pub kind: Kind,
    /// Value used when the spec does not set the variable (the `simulate` default).
    pub default: &'static str,
    /// Largest accepted value of a quantity (SI); larger values are spec errors.
    pub max: f64,
}

const fn var(key: &'static str, column: &'static str, kind: Kind, default: &'static str) -> Variable {
    Variable { key, column, kind, default, max: f64::INFINITY }
}

const fn factor(key: &'static str, column: &'static str) -> Variable {
    Variable { key, column, kind: Kind::Quantity(Quantity::Dimensionless), default: "1", max: 1e8 }
}

/// Names of the Nusselt/Sherwood correlations.
pub const CORRELATIONS: [&str; 2] = ["clift", "ranz-marshall"];
/// Names of the drag laws (`simulate --drag`).
pub const DRAG_LAWS: [&str; 2] = ["yuen-chen", "blowing"];
/// Names of the liquid species-mixing models.
pub const LIQUID_MIXING: [&str; 2] = ["well-mixed", "diffusion"];
/// Names of the liquid heat-transport models.
pub const LIQUID_HEAT: [&str; 2] = ["uniform", "conduction"];

/// Names of the liquid activity models.
pub const ACTIVITY_MODELS: [&str; 2] = ["ideal", "unifac"];

/// Keywords of the `radiation` variable.
pub const RADIATION_WORDS: [&str; 2] = ["off", "ambient"];
/// Keyword of the `fibre-diameter` variable (no fibre).
pub const FIBRE_WORDS: [&str; 1] = ["none"];

/// The condition variables in case-id order (the last varies fastest); defaults equal those of `simulate`.
pub const VARIABLES: [Variable; 24] = [
    var("ambient-temperature", "ambient_temperature_K", Kind::Quantity(Quantity::Temperature), "800K"),
    var("pressure", "pressure_Pa", Kind::Quantity(Quantity::Pressure), "1atm"),
    var("gas", "gas", Kind::Gas, "air"),
    var("diameter", "diameter_m", Kind::Quantity(Quantity::Length), "50um"),
    var("droplet-temperature", "droplet_temperature_K", Kind::Quantity(Quantity::Temperature), "300K"),
    var("velocity", "velocity_m_s", Kind::Quantity(Quantity::Velocity), "0"),
    var("injected", "injected", Kind::Flag, "false"),
    var("correlation", "correlation", Kind::Choice(&CORRELATIONS), "clift"),
    var("rtol", "rtol", Kind::Quantity(Quantity::Dimensionless), "1e-6"),
    var("max-time", "max_time_s", Kind::Quantity(Quantity::Time), "30s"),
    var("ambient-vapor", "ambient_vapor", Kind::AmbientVapor, ""),
    var("liquid-mixing", "liquid_mixing", Kind::Choice(&LIQUID_MIXING), "well-mixed"),
    var("liquid-heat", "liquid_heat", Kind::Choice(&LIQUID_HEAT), "uniform"),
    var("nodes", "nodes", Kind::Count(4, 400), "40"),
    var("non-equilibrium", "non_equilibrium", Kind::Flag, "false"),
    factor("liquid-diffusivity-factor", "liquid_diffusivity_factor"),
    factor("liquid-conductivity-factor", "liquid_conductivity_factor"),
    var("radiation", "radiation_temperature_K", Kind::QuantityOr(Quantity::Temperature, &RADIATION_WORDS), "off"),
    Variable { key: "absorption-efficiency", column: "absorption_efficiency", kind: Kind::Quantity(Quantity::Dimensionless), default: "1", max: 1.0 },
    var("fibre-diameter", "fibre_diameter_m", Kind::QuantityOr(Quantity::Length, &FIBRE_WORDS), "none"),
    Variable { key: "fibre-conductivity", column: "fibre_conductivity_W_mK", kind: Kind::Quantity(Quantity::Dimensionless), default: "1.4", max: 500.0 },
    var("fibre-stems", "fibre_stems", Kind::Count(1, 4), "1"),
    var("drag", "drag", Kind::Choice(&DRAG_LAWS), "yuen-chen"),
    var("activity", "activity", Kind::Choice(&ACTIVITY_MODELS), "ideal"),
];

// Positions in VARIABLES (checked by a unit test).
const AMBIENT_TEMPERATURE: usize = 0;
const PRESSURE: usize = 1;
const GAS: usize = 2;
const DIAMETER: usize = 3;
const DROPLET_TEMPERATURE: usize = 4;
const VELOCITY: usize = 5;
const INJECTED: usize = 6;
const CORRELATION: usize = 7;
const RTOL: usize = 8;
const MAX_TIME: usize = 9;
const AMBIENT_VAPOR: usize = 10;
const MIXING: usize = 11;
const HEAT: usize = 12;
const NODES: usize = 13;
const NON_EQUILIBRIUM: usize = 14;
const DIFFUSIVITY_FACTOR: usize = 15;
const CONDUCTIVITY_FACTOR: usize = 16;
const RADIATION: usize = 17;
const ABSORPTION: usize = 18;
const FIBRE_DIAMETER: usize = 19;
const FIBRE_CONDUCTIVITY: usize = 20;
const FIBRE_STEMS: usize = 21;
const DRAG: usize = 22;
const ACTIVITY: usize = 23;

const TOP_KEYS: [&str; 7] = ["name", "description", "fuels", "zipped", "conditions", "model", "output"];
const RANGE_KEYS: [&str; 4] = ["from", "to", "steps", "scale"];
const MODEL_KEYS: [&str; 2] = ["reference-weight", "end-mass-fraction"];
/// Smallest liquid diffusivity or conductivity factor accepted: below it the concentration or temperature layer
/// at the surface grows thinner than the radial grid resolves, and runs stall (hours) or fail (measured: 0.01
/// runs in 0.1 s for demo-wide, 0.001 fails, 0.0001 ran for minutes).
pub const MIN_LIQUID_FACTOR: f64 = 0.01;
/// Smallest `model.end-mass-fraction` accepted (a remaining diameter of 1 % of the initial one).
pub const MIN_END_MASS_FRACTION: f64 = 1e-6;
const OUTPUT_KEYS: [&str; 2] = ["histories", "residue-indicators"];
/// Largest number of cases a spec may describe.
pub const MAX_CASES: u64 = 1_000_000_000_000;
/// Largest `steps` of one range.
pub const MAX_STEPS: u64 = 10_000_000;

/// An ambient gas as written in the spec and as parsed.
#[derive(Debug)]
pub struct GasValue {
    /// Text as given (trimmed).
    pub text: String,
    /// The parsed gas.
    pub gas: AmbientGas,
}

/// Far-field vapour as written in the spec, with the mass fractions it means for each fuel of the sweep.
#[derive(Debug)]
pub struct VaporValue {
    /// Text as given (trimmed).
    pub text: String,
    /// Per fuel (same order as the spec's fuels): mass fraction per fuel component [-], empty for none.
    pub per_fuel: Vec<Vec<f64>>,
}

/// One value of a condition variable.
#[derive(Debug, Clone)]
pub enum Value {
    /// A quantity in SI units.
    Number(f64),
    /// A flag.
    Flag(bool),
    /// An ambient gas.
    Gas(Arc<GasValue>),
    /// One of a fixed set of names.
    Choice(&'static str),
    /// Far-field fuel vapour.
    AmbientVapor(Arc<VaporValue>),
}

impl Value {
    /// The value as it appears in summary.csv (numbers in SI, shortest round-trip form).
    pub fn csv_text(&self) -> String {
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
    /// Reference-state weight of the film (1/3 rule) [-].
    pub reference_weight: f64,
    /// Remaining mass fraction that counts as evaporated [-].
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
    fuels: Vec<SweepFuel>,
    values: Vec<Values>,
    groups: Vec<Vec<usize>>,
    model: ModelOptions,
    count: u64,
    fingerprint: String,
    fallback_gas: AmbientGas,
}

/// One case of a sweep: its id, fuel index and the value of every condition variable.
#[derive(Debug, Clone)]
pub struct Case {
    /// Case id (position in the sweep, from 0).
    pub id: u64,
    /// Index into the spec's fuels.
    pub fuel: usize,
    /// Values indexed like [`VARIABLES`].
    pub values: Vec<Value>,
}

struct Ctx<'a> {
    file: &'a str,
    lib: &'a Library,
}

impl Ctx<'_> {
    fn err(&self, field: impl Into<String>, message: impl Into<String>) -> SweepError {
        SweepError::Spec { file: self.file.to_string(), field: field.into(), message: message.into() }
    }
}

fn type_name(v: &toml::Value) -> &'static str {
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

fn show(v: &toml::Value) -> String {
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

fn unknown_key(ctx: &Ctx, field: &str, key: &str, known: &[&str]) -> SweepError {
    ctx.err(field, format!("unknown key '{key}'{}; known keys: {}", suggest(key, known.iter().copied()), known.join(", ")))
}

/// Far-field vapour text → mass fraction per component of `fuel` (empty text → empty vector).
pub fn vapor_fractions(lib: &Library, fuel: &Fuel, text: &str) -> Result<Vec<f64>, String> {
    if text.trim().is_empty() {
        return Ok(vec![]);
    }
    let mut y_all = vec![0.0; fuel.len()];
    let mut seen = vec![false; fuel.len()];
    for item in text.split(',') {
        let (id, y) = item.split_once('=').ok_or_else(|| format!("cannot read '{}': use component=mass-fraction pairs", item.trim()))?;
        // the fuel's own components first: a built fuel may hold components the library does not know
        let comp = match fuel.components.iter().find(|c| c.answers_to(id.trim())) {
            Some(c) => c.clone(),
            None => lib
                .require_component(id.trim(), "ambient-vapor")
                .map_err(|e| match e {
                    crate::data::DataError::Unknown { kind, id, hint, .. } => format!("unknown {kind} '{id}'{hint}"),
                    other => other.to_string(),
                })?
                .clone(),
        };
        let i = fuel
            .components
            .iter()
            .position(|c| c.id == comp.id)
            .ok_or_else(|| format!("'{}' is not a component of fuel '{}'", id.trim(), fuel.name))?;
        if std::mem::replace(&mut seen[i], true) {
            return Err(format!("component '{}' is given twice (under its id or an alias)", comp.id));
        }
        let y: f64 = y.trim().parse().map_err(|_| format!("mass fraction '{}' of '{}' is not a number", y.trim(), id.trim()))?;
        if !(y.is_finite() && (0.0..0.5).contains(&y)) {
            return Err(format!("mass fraction {y} of '{}' must be in [0, 0.5)", id.trim()));
        }
        y_all[i] = y;
    }
    Ok(y_all)
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
        Self::parse_with(text, file, base_dir, lib, None)
    }

    /// A spec of exactly one case for library front ends (the Python module): the already resolved `fuel` under
    /// `conditions` (keys as in `[conditions]`, one value each; the others at their defaults), with the same
    /// checks and messages as a spec file's conditions (field `conditions.<key>`).
    pub fn one_case(fuel: SweepFuel, conditions: toml::Table, lib: &Library) -> Result<SweepSpec, SweepError> {
        let file = "(conditions)";
        if let Some((key, _)) = conditions.iter().find(|(_, v)| matches!(v, toml::Value::Array(_) | toml::Value::Table(_))) {
            return Err(SweepError::Spec { file: file.into(), field: format!("conditions.{key}"), message: "expected one value, not a list or a range".into() });
        }
        let mut table = toml::Table::new();
        table.insert("conditions".into(), toml::Value::Table(conditions));
        let text = toml::to_string(&table).map_err(|e| SweepError::Spec { file: file.into(), field: "conditions".into(), message: e.to_string() })?;
        Self::parse_with(&text, file, Path::new(""), lib, Some(vec![fuel]))
    }

    fn parse_with(text: &str, file: &str, base_dir: &Path, lib: &Library, preset_fuels: Option<Vec<SweepFuel>>) -> Result<SweepSpec, SweepError> {
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
        let fuels = match preset_fuels {
            Some(fuels) => fuels,
            None => parse_fuels(&ctx, table.get("fuels"), base_dir)?,
        };

        // conditions
        let mut given: BTreeMap<usize, toml::Value> = BTreeMap::new();
        match table.get("conditions") {
            None => {}
            Some(toml::Value::Table(t)) => {
                for (key, v) in t {
                    let i = VARIABLES.iter().position(|var| var.key == key).ok_or_else(|| {
                        ctx.err(
                            format!("conditions.{key}"),
                            format!("unknown condition '{key}'{}; conditions are the simulate options: {}", suggest(key, VARIABLES.iter().map(|v| v.key)), VARIABLES.map(|v| v.key).join(", ")),
                        )
                    })?;
                    given.insert(i, v.clone());
                }
            }
            Some(v) => return Err(ctx.err("conditions", format!("expected a table [conditions], found {}", type_name(v)))),
        }
        let mut values = Vec::with_capacity(VARIABLES.len());
        for (i, var) in VARIABLES.iter().enumerate() {
            let field = format!("conditions.{}", var.key);
            let v = match given.get(&i) {
                Some(v) => parse_values(&ctx, var, v, &field, &fuels)?,
                None => Values::List(vec![scalar(&ctx, var, &toml::Value::String(var.default.into()), &field, &fuels)?]),
            };
            values.push(v);
        }

        if let Values::List(models) = &values[ACTIVITY] {
            for m in models {
                if let Value::Choice(name) = m {
                    let model = crate::props::activity::ActivityModel::parse(name).unwrap_or_default();
                    for f in &fuels {
                        if let Err(e) = crate::props::activity::Activity::new(model, &f.fuel.components) {
                            return Err(ctx.err("conditions.activity", format!("{name} for fuel '{}': {e}", f.entry)));
                        }
                    }
                }
            }
        }
        let groups = parse_zipped(&ctx, table.get("zipped"), &given, &values)?;
        let model = parse_model(&ctx, table.get("model"))?;
        let (histories, residue_indicators) = parse_output(&ctx, table.get("output"))?;

        let mut count: u64 = fuels.len() as u64;
        for g in &groups {
            count = count.checked_mul(values[g[0]].len()).filter(|c| *c <= MAX_CASES).ok_or_else(|| ctx.err("conditions", format!("the spec describes more than {MAX_CASES} cases")))?;
        }
        let fallback_gas = AmbientGas::air(lib).map_err(|e| ctx.err("conditions.gas", e.to_string()))?;
        let mut spec = SweepSpec { file: file.to_string(), name, description, fuels, values, groups, model, histories, residue_indicators, count, fingerprint: String::new(), fallback_gas };
        spec.fingerprint = spec.compute_fingerprint();
        Ok(spec)
    }

    /// Fuels, in spec order.
    pub fn fuels(&self) -> &[SweepFuel] {
        &self.fuels
    }

    /// Values of each condition variable, indexed like [`VARIABLES`].
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

    /// A 16-hex-digit hash of everything that defines the cases (fuels and compositions, values, model options).
    pub fn fingerprint(&self) -> &str {
        &self.fingerprint
    }

    fn compute_fingerprint(&self) -> String {
        let mut s = String::from("dropcut-sweep-1\n");
        for f in &self.fuels {
            s.push_str(&format!("fuel {}={}\n", f.entry, f.fuel.composition_hash()));
        }
        for (var, v) in VARIABLES.iter().zip(&self.values) {
            s.push_str(&format!("{}={}\n", var.key, v.canonical()));
        }
        for g in &self.groups {
            s.push_str(&format!("group {:?}\n", g));
        }
        s.push_str(&format!("model {:?} {:?}\n", self.model.reference_weight, self.model.end_mass_fraction));
        let mut h: u64 = 0xcbf29ce484222325;
        for b in s.bytes() {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x100000001b3);
        }
        format!("{h:016x}")
    }

    /// Keys of the condition variables that take more than one value.
    pub fn varied(&self) -> Vec<&'static str> {
        VARIABLES.iter().zip(&self.values).filter(|(_, v)| v.len() > 1).map(|(var, _)| var.key).collect()
    }

    /// The case with this id, or None when id ≥ [`case_count`](Self::case_count).
    pub fn case(&self, id: u64) -> Option<Case> {
        if id >= self.count {
            return None;
        }
        let mut rem = id;
        let mut idx = vec![0u64; VARIABLES.len()];
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

    /// The SI droplet inputs of a case.
    pub fn inputs(&self, case: &Case) -> DropletInputs {
        let num = |v: usize| match &case.values[v] {
            Value::Number(x) => *x,
            _ => f64::NAN, // cannot happen: kinds are checked at parse time; NaN is refused by the model
        };
        let flag = |v: usize| matches!(case.values[v], Value::Flag(true));
        let choice = |v: usize| match &case.values[v] {
            Value::Choice(c) => *c,
            _ => "",
        };
        let fuel = &self.fuels[case.fuel].fuel;
        let gas = match &case.values[GAS] {
            Value::Gas(g) => g.gas.clone(),
            _ => self.fallback_gas.clone(), // cannot happen: the gas variable holds gases
        };
        let mut inp = DropletInputs::new(fuel.clone(), gas, num(AMBIENT_TEMPERATURE), num(PRESSURE), num(DIAMETER), num(DROPLET_TEMPERATURE));
        let velocity = num(VELOCITY);
        inp.motion = if flag(INJECTED) { Motion::Injected { velocity } } else { Motion::Fixed { velocity } };
        inp.correlation = if choice(CORRELATION) == "ranz-marshall" { TransferCorrelation::RanzMarshall } else { TransferCorrelation::Clift };
        inp.drag = if choice(DRAG) == "blowing" { DragLaw::Blowing } else { DragLaw::YuenChen };
        inp.rtol = num(RTOL);
        inp.max_time = num(MAX_TIME);
        if let Value::AmbientVapor(v) = &case.values[AMBIENT_VAPOR] {
            inp.ambient_vapor = v.per_fuel[case.fuel].clone();
        }
        inp.liquid = LiquidOptions {
            mixing: if choice(MIXING) == "diffusion" { LiquidMixing::Diffusion } else { LiquidMixing::WellMixed },
            heat: if choice(HEAT) == "conduction" { LiquidHeat::Conduction } else { LiquidHeat::Uniform },
            nodes: num(NODES) as usize,
            non_equilibrium: flag(NON_EQUILIBRIUM),
            diffusivity_factor: num(DIFFUSIVITY_FACTOR),
            conductivity_factor: num(CONDUCTIVITY_FACTOR),
            activity: crate::props::activity::ActivityModel::parse(choice(ACTIVITY)).unwrap_or_default(),
        };
        inp.extra_heat.radiation = match &case.values[RADIATION] {
            Value::Number(t) => Some(Radiation { temperature: Some(*t), absorption_efficiency: num(ABSORPTION) }),
            Value::Choice("ambient") => Some(Radiation { temperature: None, absorption_efficiency: num(ABSORPTION) }),
            _ => None,
        };
        inp.extra_heat.fibre = match &case.values[FIBRE_DIAMETER] {
            Value::Number(d) => Some(SupportFibre { diameter: *d, conductivity: num(FIBRE_CONDUCTIVITY), stems: num(FIBRE_STEMS) as u32 }),
            _ => None,
        };
        inp.reference_weight = self.model.reference_weight;
        inp.end_mass_fraction = self.model.end_mass_fraction;
        inp
    }

}

fn parse_fuels(ctx: &Ctx, v: Option<&toml::Value>, base_dir: &Path) -> Result<Vec<SweepFuel>, SweepError> {
    let entries: Vec<(String, String)> = match v {
        None => return Err(ctx.err("fuels", "missing: list the fuels, e.g. fuels = [\"n-decane\", \"my-fuel.toml\"]")),
        Some(toml::Value::String(s)) => vec![("fuels".into(), s.clone())],
        Some(toml::Value::Array(items)) => {
            if items.is_empty() {
                return Err(ctx.err("fuels", "the list is empty"));
            }
            let mut out = vec![];
            for (i, item) in items.iter().enumerate() {
                match item {
                    toml::Value::String(s) => out.push((format!("fuels[{i}]"), s.clone())),
                    other => return Err(ctx.err(format!("fuels[{i}]"), format!("expected a fuel id or file name, found {} {}", type_name(other), show(other)))),
                }
            }
            out
        }
        Some(other) => return Err(ctx.err("fuels", format!("expected a list of fuel ids or files, found {} {}", type_name(other), show(other)))),
    };
    let mut fuels = vec![];
    for (field, entry) in entries {
        let trimmed = entry.trim();
        if trimmed.is_empty() {
            return Err(ctx.err(field, "empty fuel name"));
        }
        if trimmed.chars().any(char::is_control) {
            return Err(ctx.err(field, format!("{trimmed:?}: a fuel name or path may not hold control characters (line breaks, tabs)")));
        }
        let rel = Path::new(trimmed);
        let beside_spec = base_dir.join(rel);
        let target = if rel.is_relative() && !base_dir.as_os_str().is_empty() && beside_spec.is_file() { beside_spec.display().to_string() } else { trimmed.to_string() };
        let fuel = Fuel::resolve(&target, ctx.lib).map_err(|e| ctx.err(field.clone(), format!("'{trimmed}': {e}")))?;
        fuels.push(SweepFuel { entry: trimmed.to_string(), fuel });
    }
    Ok(fuels)
}

/// A quantity value: a number in SI units or a string with a unit, finite, positive (velocity: ≥ 0), ≤ max.
fn quantity(ctx: &Ctx, var: &Variable, q: Quantity, v: &toml::Value, field: &str) -> Result<Value, SweepError> {
    let found = || format!("found {} {}", type_name(v), show(v));
    let x = match v {
        toml::Value::String(s) => units::parse(s, q).map_err(|e| ctx.err(field, e.to_string()))?,
        toml::Value::Integer(i) => *i as f64,
        toml::Value::Float(f) => *f,
        _ => return Err(ctx.err(field, format!("expected a {} (a number in SI units or a string with a unit), {}", q.name(), found()))),
    };
    if !x.is_finite() {
        return Err(ctx.err(field, format!("{} is not a finite number", show(v))));
    }
    let positive = !matches!(q, Quantity::Velocity);
    if (positive && x <= 0.0) || x < 0.0 {
        return Err(ctx.err(field, format!("{} must be {}", show(v), if positive { "positive" } else { "zero or positive" })));
    }
    if x > var.max {
        return Err(ctx.err(field, format!("{} must not exceed {}", show(v), var.max)));
    }
    if var.key.starts_with("liquid-") && var.key.ends_with("-factor") && x < MIN_LIQUID_FACTOR {
        return Err(ctx.err(field, format!("{} is below {MIN_LIQUID_FACTOR}: the liquid layers would grow thinner than the radial grid can follow and the run stalls or fails", show(v))));
    }
    Ok(Value::Number(x))
}

fn scalar(ctx: &Ctx, var: &Variable, v: &toml::Value, field: &str, fuels: &[SweepFuel]) -> Result<Value, SweepError> {
    let found = || format!("found {} {}", type_name(v), show(v));
    match var.kind {
        Kind::Quantity(q) => quantity(ctx, var, q, v, field),
        Kind::QuantityOr(q, words) => match v {
            toml::Value::String(text) => match words.iter().find(|w| w.eq_ignore_ascii_case(text.trim())) {
                Some(w) => Ok(Value::Choice(w)),
                None => quantity(ctx, var, q, v, field).map_err(|e| match e {
                    SweepError::Spec { file, field, message } => SweepError::Spec { file, field, message: format!("{message} (or {})", words.iter().map(|w| format!("\"{w}\"")).collect::<Vec<_>>().join(" / ")) },
                    other => other,
                }),
            },
            _ => quantity(ctx, var, q, v, field),
        },
        Kind::Flag => match v {
            toml::Value::Boolean(b) => Ok(Value::Flag(*b)),
            toml::Value::String(s) if s == "true" || s == "false" => Ok(Value::Flag(s == "true")),
            _ => Err(ctx.err(field, format!("expected true or false, {}", found()))),
        },
        Kind::Gas => match v {
            toml::Value::String(s) => {
                let gas = AmbientGas::parse(ctx.lib, s).map_err(|e| ctx.err(field, format!("'{s}': {e}")))?;
                Ok(Value::Gas(Arc::new(GasValue { text: s.trim().to_string(), gas })))
            }
            _ => Err(ctx.err(field, format!("expected a gas such as \"air\", \"n2\" or \"o2=0.15,n2=0.85\", {}", found()))),
        },
        Kind::Choice(names) => match v {
            toml::Value::String(text) => match names.iter().find(|n| **n == text.trim()) {
                Some(n) => Ok(Value::Choice(n)),
                None => Err(ctx.err(field, format!("unknown {} '{}'{}; use {}", var.key, text.trim(), suggest(text.trim(), names.iter().copied()), names.join(" or ")))),
            },
            _ => Err(ctx.err(field, format!("expected {}, {}", names.iter().map(|n| format!("\"{n}\"")).collect::<Vec<_>>().join(" or "), found()))),
        },
        Kind::Count(lo, hi) => {
            let n = match v {
                toml::Value::Integer(i) => Some(*i),
                toml::Value::String(t) => t.trim().parse::<i64>().ok(),
                _ => None,
            };
            match n {
                Some(n) if n >= lo as i64 && n <= hi as i64 => Ok(Value::Number(n as f64)),
                _ => Err(ctx.err(field, format!("expected a whole number from {lo} to {hi}, {}", found()))),
            }
        }
        Kind::AmbientVapor => match v {
            toml::Value::String(s) => {
                let mut per_fuel = vec![];
                for f in fuels {
                    per_fuel.push(vapor_fractions(ctx.lib, &f.fuel, s).map_err(|e| ctx.err(field, format!("'{s}' with fuel '{}': {e}", f.entry)))?);
                }
                Ok(Value::AmbientVapor(Arc::new(VaporValue { text: s.trim().to_string(), per_fuel })))
            }
            _ => Err(ctx.err(field, format!("expected component=mass-fraction pairs like \"n-decane=0.01\", {}", found()))),
        },
    }
}

fn parse_values(ctx: &Ctx, var: &Variable, v: &toml::Value, field: &str, fuels: &[SweepFuel]) -> Result<Values, SweepError> {
    match v {
        toml::Value::Array(items) => {
            if items.is_empty() {
                return Err(ctx.err(field, "the list is empty"));
            }
            let mut out = Vec::with_capacity(items.len());
            for (i, item) in items.iter().enumerate() {
                out.push(scalar(ctx, var, item, &format!("{field}[{i}]"), fuels)?);
            }
            Ok(Values::List(out))
        }
        toml::Value::Table(t) => {
            let (Kind::Quantity(q) | Kind::QuantityOr(q, _)) = var.kind else {
                return Err(ctx.err(field, format!("a range {{ from, to, steps }} needs a numeric variable; give '{}' a value or a list", var.key)));
            };
            for key in t.keys() {
                if !RANGE_KEYS.contains(&key.as_str()) {
                    return Err(unknown_key(ctx, &format!("{field}.{key}"), key, &RANGE_KEYS));
                }
            }
            let end = |key: &str| -> Result<f64, SweepError> {
                let f = format!("{field}.{key}");
                let v = t.get(key).ok_or_else(|| ctx.err(&f, "missing: a range needs from, to and steps"))?;
                match scalar(ctx, var, v, &f, fuels)? {
                    Value::Number(x) => Ok(x),
                    _ => Err(ctx.err(&f, format!("expected a {}", q.name()))),
                }
            };
            let from = end("from")?;
            let to = end("to")?;
            let steps_field = format!("{field}.steps");
            let steps = match t.get("steps") {
                Some(toml::Value::Integer(n)) if *n >= 1 && (*n as u64) <= MAX_STEPS => *n as u64,
                Some(other) => return Err(ctx.err(steps_field, format!("expected a whole number from 1 to {MAX_STEPS}, found {}", show(other)))),
                None => return Err(ctx.err(steps_field, "missing: a range needs from, to and steps")),
            };
            let log = match t.get("scale") {
                None => false,
                Some(toml::Value::String(s)) if s == "linear" => false,
                Some(toml::Value::String(s)) if s == "log" => true,
                Some(other) => return Err(ctx.err(format!("{field}.scale"), format!("expected \"linear\" or \"log\", found {}", show(other)))),
            };
            if steps == 1 && from != to {
                return Err(ctx.err(steps_field, "steps = 1 with from ≠ to: give a fixed value instead, or 2 steps or more"));
            }
            if log && !(from > 0.0 && to > 0.0) {
                return Err(ctx.err(format!("{field}.scale"), "a log range needs from and to above zero"));
            }
            Ok(Values::Range { from, to, steps, log })
        }
        scalar_value => Ok(Values::List(vec![scalar(ctx, var, scalar_value, field, fuels)?])),
    }
}

fn parse_zipped(ctx: &Ctx, v: Option<&toml::Value>, given: &BTreeMap<usize, toml::Value>, values: &[Values]) -> Result<Vec<Vec<usize>>, SweepError> {
    let mut zipped: Vec<Vec<usize>> = vec![];
    if let Some(v) = v {
        let toml::Value::Array(groups) = v else {
            return Err(ctx.err("zipped", format!("expected a list of lists of condition names, e.g. zipped = [[\"diameter\", \"velocity\"]], found {}", type_name(v))));
        };
        let mut seen: Vec<usize> = vec![];
        for (gi, g) in groups.iter().enumerate() {
            let gf = format!("zipped[{gi}]");
            let toml::Value::Array(members) = g else {
                return Err(ctx.err(gf, format!("expected a list of condition names, found {} {}", type_name(g), show(g))));
            };
            if members.len() < 2 {
                return Err(ctx.err(gf, "a zipped group needs two names or more"));
            }
            let mut group = vec![];
            for (mi, m) in members.iter().enumerate() {
                let mf = format!("{gf}[{mi}]");
                let toml::Value::String(key) = m else {
                    return Err(ctx.err(mf, format!("expected a condition name, found {} {}", type_name(m), show(m))));
                };
                let i = VARIABLES
                    .iter()
                    .position(|var| var.key == key)
                    .ok_or_else(|| ctx.err(&mf, format!("unknown condition '{key}'{}", suggest(key, VARIABLES.iter().map(|v| v.key)))))?;
                if !given.contains_key(&i) {
                    return Err(ctx.err(&mf, format!("'{key}' is zipped but has no values in [conditions]")));
                }
                if seen.contains(&i) {
                    return Err(ctx.err(&mf, format!("'{key}' appears in more than one place in zipped")));
                }
                seen.push(i);
                group.push(i);
            }
            let n0 = values[group[0]].len();
            for &i in &group[1..] {
                if values[i].len() != n0 {
                    return Err(ctx.err(
                        gf,
                        format!("zipped variables need the same number of values: '{}' has {n0}, '{}' has {}", VARIABLES[group[0]].key, VARIABLES[i].key, values[i].len()),
                    ));
                }
            }
            group.sort_unstable();
            zipped.push(group);
        }
    }
    let mut groups = vec![];
    for i in 0..VARIABLES.len() {
        match zipped.iter().find(|g| g.contains(&i)) {
            Some(g) if g[0] == i => groups.push(g.clone()),
            Some(_) => {}
            None => groups.push(vec![i]),
        }
    }
    Ok(groups)
}

fn parse_model(ctx: &Ctx, v: Option<&toml::Value>) -> Result<ModelOptions, SweepError> {
    let mut m = ModelOptions { reference_weight: 1.0 / 3.0, end_mass_fraction: 1e-3 };
    let Some(v) = v else { return Ok(m) };
    let toml::Value::Table(t) = v else {
        return Err(ctx.err("model", format!("expected a table [model], found {}", type_name(v))));
    };
    for (key, v) in t {
        let field = format!("model.{key}");
        let number = || match v {
            toml::Value::Float(f) if f.is_finite() => Ok(*f),
            toml::Value::Integer(i) => Ok(*i as f64),
            other => Err(ctx.err(&field, format!("expected a number, found {}", show(other)))),
        };
        match key.as_str() {
            "reference-weight" => {
                let x = number()?;
                if !(0.0..=1.0).contains(&x) {
                    return Err(ctx.err(&field, format!("{x} must lie between 0 and 1 (1 excluded)")));
                }
                if x == 1.0 {
                    // The reference state would be the far-field gas alone, with no fuel vapour in the film
                    // mixture: the vapour-weighted film properties are undefined there and every case fails.
                    return Err(ctx.err(&field, "1 puts the film reference state at the far-field gas, which holds no fuel vapour, so the film properties are undefined; use a value below 1 (e.g. 0.99)"));
                }
                m.reference_weight = x;
            }
            "end-mass-fraction" => {
                let x = number()?;
                if !(x > 0.0 && x < 0.5) {
                    return Err(ctx.err(&field, format!("{x} must lie between 0 and 0.5 (exclusive)")));
                }
                if x < MIN_END_MASS_FRACTION {
                    // Below this the diameter is under 1 % of the initial one and the step size of the integrator
                    // reaches the round-off limit before the end is reached: every case would fail.
                    return Err(ctx.err(&field, format!("{} is below {MIN_END_MASS_FRACTION:e}: the integration cannot follow the droplet that far (the diameter would be under 1 % of the initial one)", crate::output::fmt_f64(x).unwrap_or_default())));
                }
                m.end_mass_fraction = x;
            }
            _ => return Err(unknown_key(ctx, &field, key, &MODEL_KEYS)),
        }
    }
    Ok(m)
}

fn parse_output(ctx: &Ctx, v: Option<&toml::Value>) -> Result<(bool, bool), SweepError> {
    let (mut histories, mut residue) = (false, true);
    let Some(v) = v else { return Ok((histories, residue)) };
    let toml::Value::Table(t) = v else {
        return Err(ctx.err("output", format!("expected a table [output], found {}", type_name(v))));
    };
    for (key, v) in t {
        let field = format!("output.{key}");
        let slot = match key.as_str() {
            "histories" => &mut histories,
            "residue-indicators" => &mut residue,
            _ => return Err(unknown_key(ctx, &field, key, &OUTPUT_KEYS)),
        };
        match v {
            toml::Value::Boolean(b) => *slot = *b,
            other => return Err(ctx.err(field, format!("expected true or false, found {}", show(other)))),
        }
    }
    Ok((histories, residue))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lib() -> Library {
        Library::embedded().unwrap()
    }

    fn parse(text: &str) -> Result<SweepSpec, SweepError> {
        SweepSpec::parse(text, "spec.toml", Path::new(""), &lib())
    }

    #[test]
    fn product_order_and_count() {
        let s = parse(
            r#"
fuels = ["n-decane", "n-heptane"]
[conditions]
pressure = ["1bar", "10bar"]
ambient-temperature = { from = "500K", to = "1000K", steps = 6 }
diameter = "50um"
"#,
        )
        .unwrap();
        assert_eq!(s.case_count(), 24);
        assert_eq!(s.varied(), vec!["ambient-temperature", "pressure"]);
        let c = s.case(0).unwrap();
        assert_eq!(c.fuel, 0);
        assert_eq!(c.values[0].csv_text(), "500");
        assert_eq!(c.values[1].csv_text(), "100000");
        // pressure varies fastest (it comes after ambient-temperature in the fixed order)
        let c1 = s.case(1).unwrap();
        assert_eq!(c1.values[1].csv_text(), "1000000");
        assert_eq!(c1.values[0].csv_text(), "500");
        let c2 = s.case(2).unwrap();
        assert_eq!(c2.values[0].csv_text(), "600");
        let last = s.case(23).unwrap();
        assert_eq!(last.fuel, 1);
        assert_eq!(last.values[0].csv_text(), "1000");
        assert!(s.case(24).is_none());
        let inp = s.inputs(&last);
        approx::assert_relative_eq!(inp.initial_diameter, 50e-6, max_relative = 1e-15);
        approx::assert_relative_eq!(inp.pressure, 1e6, max_relative = 1e-15);
    }

    #[test]
    fn key_order_does_not_matter() {
        let a = parse("fuels = [\"n-decane\"]\n[conditions]\npressure = [1e5, 2e5]\ndiameter = [\"10um\", \"20um\"]\n").unwrap();
        let b = parse("fuels = [\"n-decane\"]\n[conditions]\ndiameter = [\"10um\", \"20um\"]\npressure = [\"1bar\", \"2bar\"]\n").unwrap();
        assert_eq!(a.fingerprint(), b.fingerprint());
        for id in 0..4 {
            let (ca, cb) = (a.case(id).unwrap(), b.case(id).unwrap());
            let ta: Vec<String> = ca.values.iter().map(|v| v.csv_text()).collect();
            let tb: Vec<String> = cb.values.iter().map(|v| v.csv_text()).collect();
            assert_eq!(ta, tb);
        }
    }

    #[test]
    fn log_range_and_zip() {
        let s = parse(
            r#"
fuels = "n-decane"
zipped = [["velocity", "diameter"]]
[conditions]
diameter = { from = "10um", to = "1000um", steps = 3, scale = "log" }
velocity = [0, 5, 10]
"#,
        )
        .unwrap();
        assert_eq!(s.case_count(), 3);
        let d: Vec<f64> = (0..3).map(|i| s.inputs(&s.case(i).unwrap()).initial_diameter).collect();
        approx::assert_relative_eq!(d[0], 1e-5, max_relative = 1e-15);
        approx::assert_relative_eq!(d[1], 1e-4, max_relative = 1e-12);
        approx::assert_relative_eq!(d[2], 1e-3, max_relative = 1e-15);
        assert_eq!(s.case(2).unwrap().values[5].csv_text(), "10");
    }

    #[test]
    fn position_constants_match_the_table() {
        let keys = [
            (AMBIENT_TEMPERATURE, "ambient-temperature"),
            (PRESSURE, "pressure"),
            (GAS, "gas"),
            (DIAMETER, "diameter"),
            (DROPLET_TEMPERATURE, "droplet-temperature"),
            (VELOCITY, "velocity"),
            (INJECTED, "injected"),
            (CORRELATION, "correlation"),
            (RTOL, "rtol"),
            (MAX_TIME, "max-time"),
            (AMBIENT_VAPOR, "ambient-vapor"),
            (MIXING, "liquid-mixing"),
            (HEAT, "liquid-heat"),
            (NODES, "nodes"),
            (NON_EQUILIBRIUM, "non-equilibrium"),
            (DIFFUSIVITY_FACTOR, "liquid-diffusivity-factor"),
            (CONDUCTIVITY_FACTOR, "liquid-conductivity-factor"),
            (RADIATION, "radiation"),
            (ABSORPTION, "absorption-efficiency"),
            (FIBRE_DIAMETER, "fibre-diameter"),
            (FIBRE_CONDUCTIVITY, "fibre-conductivity"),
            (FIBRE_STEMS, "fibre-stems"),
            (DRAG, "drag"),
            (ACTIVITY, "activity"),
        ];
        assert_eq!(keys.len(), VARIABLES.len());
        for (i, k) in keys {
            assert_eq!(VARIABLES[i].key, k);
        }
    }

    #[test]
    fn radiation_and_fibre_conditions() {
        let s = parse("fuels = \"n-decane\"\n[conditions]\nradiation = [\"off\", \"ambient\", \"1200K\"]\nabsorption-efficiency = 0.5\nfibre-diameter = [\"none\", \"20um\"]\nfibre-stems = 2\n").unwrap();
        assert_eq!(s.case_count(), 6);
        let inp = |id: u64| s.inputs(&s.case(id).unwrap());
        assert_eq!(inp(0).extra_heat, crate::model::film::ExtraHeat::default());
        let r = inp(2).extra_heat.radiation.unwrap();
        assert_eq!((r.temperature, r.absorption_efficiency), (None, 0.5));
        assert!(inp(2).extra_heat.fibre.is_none());
        let f = inp(5).extra_heat.fibre.unwrap();
        assert_eq!((f.diameter, f.conductivity, f.stems), (20e-6, 1.4, 2));
        assert_eq!(inp(5).extra_heat.radiation.unwrap().temperature, Some(1200.0));
        assert_eq!(s.case(4).unwrap().values[RADIATION].csv_text(), "1200");
        assert_eq!(s.case(2).unwrap().values[RADIATION].csv_text(), "ambient");
        let range = parse("fuels = \"n-decane\"\n[conditions]\nradiation = { from = \"900K\", to = \"1500K\", steps = 3 }\n").unwrap();
        assert_eq!(range.inputs(&range.case(2).unwrap()).extra_heat.radiation.unwrap().temperature, Some(1500.0));
        let err = parse("fuels = \"n-decane\"\n[conditions]\nradiation = \"hot\"\n").unwrap_err().to_string();
        assert!(err.contains("conditions.radiation") && err.contains("hot") && err.contains("\"ambient\""), "{err}");
        assert!(parse("fuels = \"n-decane\"\n[conditions]\nabsorption-efficiency = 1.5\n").is_err());
        assert!(parse("fuels = \"n-decane\"\n[conditions]\nfibre-stems = 5\n").is_err());
    }

    #[test]
    fn liquid_model_options() {
        let s = parse("fuels = \"n-decane\"\n[conditions]\nliquid-mixing = [\"well-mixed\", \"diffusion\"]\nliquid-heat = \"conduction\"\nnodes = 20\nnon-equilibrium = true\nliquid-diffusivity-factor = 2\n").unwrap();
        assert_eq!(s.case_count(), 2);
        let inp = s.inputs(&s.case(1).unwrap());
        assert_eq!(inp.liquid.mixing, LiquidMixing::Diffusion);
        assert_eq!(inp.liquid.heat, LiquidHeat::Conduction);
        assert_eq!(inp.liquid.nodes, 20);
        assert!(inp.liquid.non_equilibrium);
        assert_eq!(inp.liquid.diffusivity_factor, 2.0);
        assert_eq!(inp.liquid.conductivity_factor, 1.0);
        assert_eq!(s.inputs(&s.case(0).unwrap()).liquid.mixing, LiquidMixing::WellMixed);
        assert!(parse("fuels = \"n-decane\"\n[conditions]\nnodes = 2\n").is_err());
        assert!(parse("fuels = \"n-decane\"\n[conditions]\nliquid-mixing = \"difusion\"\n").is_err());
        assert!(parse("fuels = \"n-decane\"\n[conditions]\nliquid-conductivity-factor = 1e9\n").is_err());
    }

    #[test]
    fn defaults_are_simulate_defaults() {
        let s = parse("fuels = [\"n-decane\"]").unwrap();
        assert_eq!(s.case_count(), 1);
        let inp = s.inputs(&s.case(0).unwrap());
        assert_eq!(inp.ambient_temperature, 800.0);
        assert_eq!(inp.pressure, 101_325.0);
        assert_eq!(inp.max_time, 30.0);
        assert_eq!(inp.rtol, 1e-6);
        assert!(inp.ambient_vapor.is_empty());
    }

    #[test]
    fn errors_name_the_field() {
        let cases = [
            ("fuels = [\"n-decane\"]\n[conditions]\nambient-temprature = \"800K\"\n", "conditions.ambient-temprature", "did you mean 'ambient-temperature'"),
            ("fuels = [\"n-decane\"]\n[conditions]\npressure = [\"1bar\", \"3 parsec\"]\n", "conditions.pressure[1]", "parsec"),
            ("fuels = [\"n-decanne\"]\n", "fuels[0]", "n-decanne"),
            ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = { from = \"1um\", to = \"2um\" }\n", "conditions.diameter.steps", "missing"),
            ("fuels = [\"n-decane\"]\nzipped = [[\"diameter\", \"velocity\"]]\n[conditions]\ndiameter = [1e-5, 2e-5]\nvelocity = [1]\n", "zipped[0]", "same number"),
            ("fuel = [\"n-decane\"]\n", "fuel", "did you mean 'fuels'"),
            ("fuels = [\"n-decane\"]\n[conditions]\ninjected = 3\n", "conditions.injected", "true or false"),
            ("fuels = [\"n-decane\"\n", "(syntax)", ""),
            ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = \"-5um\"\n", "conditions.diameter", "positive"),
        ];
        for (text, field, needle) in cases {
            match parse(text) {
                Err(SweepError::Spec { field: f, message, .. }) => {
                    assert_eq!(f, field, "{text}: {message}");
                    assert!(message.contains(needle), "{text}: {message}");
                }
                other => panic!("{text}: expected a spec error, got {other:?}"),
            }
        }
    }

    #[test]
    fn one_case_equals_the_spec_file_case() {
        let lib = lib();
        let text = "fuels = [\"demo-wide\"]\n[conditions]\ndiameter = \"30um\"\npressure = 1e6\ninjected = true\nvelocity = 20\nambient-vapor = \"n-decane=0.01\"\n";
        let spec = parse(text).unwrap();
        let from_file = spec.inputs(&spec.case(0).unwrap());
        let fuel = SweepFuel { entry: "demo-wide".into(), fuel: Fuel::resolve("demo-wide", &lib).unwrap() };
        let mut c = toml::Table::new();
        c.insert("diameter".into(), toml::Value::String("30um".into()));
        c.insert("pressure".into(), toml::Value::Float(1e6));
        c.insert("injected".into(), toml::Value::Boolean(true));
        c.insert("velocity".into(), toml::Value::Integer(20));
        c.insert("ambient-vapor".into(), toml::Value::String("n-decane=0.01".into()));
        let one = SweepSpec::one_case(fuel.clone(), c, &lib).unwrap();
        assert_eq!(one.case_count(), 1);
        assert_eq!(one.fingerprint(), spec.fingerprint());
        let inp = one.inputs(&one.case(0).unwrap());
        assert_eq!(format!("{inp:?}"), format!("{from_file:?}"));
        let mut bad = toml::Table::new();
        bad.insert("diameter".into(), toml::Value::Array(vec![toml::Value::Float(1e-5), toml::Value::Float(2e-5)]));
        match SweepSpec::one_case(fuel, bad, &lib) {
            Err(SweepError::Spec { field, message, .. }) => assert!(field == "conditions.diameter" && message.contains("one value"), "{field}: {message}"),
            other => panic!("expected a spec error, got {other:?}"),
        }
    }
}
