//! The one registry of run conditions: every condition a droplet run takes from its user (ambient temperature,
//! pressure, gas, diameter, …, radiation, fibre, activity model) is one [`Condition`] entry of [`CONDITIONS`]:
//! its key (the command-line and spec spelling), summary column, kind, SI unit, default, allowed range, one-line
//! help, an example value, and a typed setter and getter on [`DropletInputs`].
//!
//! Every front end is built from this table: the `simulate`/`compare`/`uncertainty` options (clap arguments), the
//! `[conditions]` keys and summary columns of sweep specs (in registry order, which is also the case-id order),
//! the uncertainty condition spreads (the entries of a continuous kind), the surrogate `--reference key=value`
//! pairs and `compare --vary`. Adding a condition is one entry here plus its physics in the model.
//!
//! Text is parsed with the units module at this edge (`800K`, `527degC`, `10bar`, `50um`); choice words are parsed
//! into the model's enums with an error naming the condition and the allowed words (never a silent fallback).

mod entries;
mod vapor;

use std::fmt;
use std::sync::Arc;

use crate::data::{suggest, Library};
use crate::fuel::Fuel;
use crate::model::DropletInputs;
use crate::props::gas::AmbientGas;
use crate::units::{self, Quantity};

pub use entries::{ACTIVITY_MODELS, CONDITIONS, CORRELATIONS, DRAG_LAWS, FIBRE_WORDS, LIQUID_HEAT, LIQUID_MIXING, RADIATION_WORDS, VAPOUR_DIFFUSION};
pub use vapor::{vapor_fractions, VaporPair, VaporValue};

/// Smallest liquid diffusivity or conductivity factor accepted: below it the concentration or temperature layer
/// at the surface grows thinner than the radial grid resolves, and runs stall (hours) or fail (measured: 0.01
/// runs in 0.1 s for demo-wide, 0.001 fails, 0.0001 ran for minutes).
pub const MIN_LIQUID_FACTOR: f64 = 0.01;

/// What kind of value a condition takes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// A physical quantity: a number in SI units or text with a unit (continuous).
    Quantity(Quantity),
    /// A dimensionless multiplier of a model property (continuous; limit studies).
    Factor,
    /// A whole number between the two bounds (inclusive).
    Count(u64, u64),
    /// One of a fixed set of words, each naming a model choice.
    Choice(&'static [&'static str]),
    /// On or off (a switch without a value on the command line; `true`/`false` elsewhere).
    Flag,
    /// Ambient gas: `air`, `n2` or mole fractions like `o2=0.15,n2=0.85`.
    Gas,
    /// Far-field fuel vapour as component=mass-fraction pairs (empty for none).
    AmbientVapor,
    /// A physical quantity, or one of a few keywords (e.g. `off`, `ambient`, `none`); continuous when a number.
    QuantityOr(Quantity, &'static [&'static str]),
}

impl Kind {
    /// True for kinds whose values are numbers on a continuous scale (these may be spread in uncertainty runs).
    pub fn is_continuous(self) -> bool {
        matches!(self, Kind::Quantity(_) | Kind::Factor | Kind::QuantityOr(..))
    }

    /// The quantity a number of this kind is parsed as (None for kinds without numbers).
    pub fn quantity(self) -> Option<Quantity> {
        match self {
            Kind::Quantity(q) | Kind::QuantityOr(q, _) => Some(q),
            Kind::Factor => Some(Quantity::Dimensionless),
            _ => None,
        }
    }

    /// The quantity of an absolute spread of this kind (a temperature spread is a difference).
    pub fn spread_quantity(self) -> Option<Quantity> {
        match self.quantity()? {
            Quantity::Temperature => Some(Quantity::TemperatureDifference),
            q => Some(q),
        }
    }

    /// Short name of the kind for help texts and the Python kwargs: `quantity`, `factor`, `count`, `choice`,
    /// `flag`, `gas`, `ambient-vapor`, `quantity-or-word`.
    pub fn name(self) -> &'static str {
        match self {
            Kind::Quantity(_) => "quantity",
            Kind::Factor => "factor",
            Kind::Count(..) => "count",
            Kind::Choice(_) => "choice",
            Kind::Flag => "flag",
            Kind::Gas => "gas",
            Kind::AmbientVapor => "ambient-vapor",
            Kind::QuantityOr(..) => "quantity-or-word",
        }
    }
}

/// Allowed numeric range of a continuous condition (SI): above `min` (or at it, when `min_inclusive`), at most `max`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Range {
    /// Lower bound \[SI\].
    pub min: f64,
    /// True when `min` itself is allowed.
    pub min_inclusive: bool,
    /// Upper bound (inclusive) \[SI\]; infinity for none.
    pub max: f64,
}

impl Range {
    /// Above zero, no upper bound.
    pub const POSITIVE: Range = Range { min: 0.0, min_inclusive: false, max: f64::INFINITY };
    /// Zero or above, no upper bound.
    pub const NON_NEGATIVE: Range = Range { min: 0.0, min_inclusive: true, max: f64::INFINITY };
    /// No numeric range (the kind has no numbers, or a count carries its own bounds).
    pub const NONE: Range = Range { min: f64::NEG_INFINITY, min_inclusive: true, max: f64::INFINITY };

    /// Above zero and at most `max`.
    pub const fn positive_up_to(max: f64) -> Range {
        Range { min: 0.0, min_inclusive: false, max }
    }

    /// The range as text, e.g. `(0, 1]`, `> 0`, `≥ 0` (numbers in SI).
    pub fn describe(&self) -> String {
        let lo = if self.min_inclusive { "[" } else { "(" };
        match (self.min.is_finite(), self.max.is_finite()) {
            (true, true) => format!("{lo}{}, {}]", self.min, self.max),
            (true, false) => format!("{} {}", if self.min_inclusive { "≥" } else { ">" }, self.min),
            (false, true) => format!("≤ {}", self.max),
            (false, false) => "any".into(),
        }
    }
}

/// One value of a condition, parsed and typed.
#[derive(Debug, Clone)]
pub enum Value {
    /// A quantity in SI units, a factor, or a count.
    Number(f64),
    /// A switch.
    Flag(bool),
    /// One of the condition's words (a choice, or a keyword of a quantity-or-word condition).
    Choice(&'static str),
    /// An ambient gas.
    Gas(Arc<GasValue>),
    /// Far-field fuel vapour (resolved against the fuel when set on the inputs).
    AmbientVapor(Arc<VaporValue>),
}

impl PartialEq for Value {
    fn eq(&self, other: &Self) -> bool {
        match (self, other) {
            (Value::Number(a), Value::Number(b)) => a == b,
            (Value::Flag(a), Value::Flag(b)) => a == b,
            (Value::Choice(a), Value::Choice(b)) => a == b,
            (Value::Gas(a), Value::Gas(b)) => a.gas.mole_fractions == b.gas.mole_fractions && a.gas.species.iter().map(|s| &s.id).eq(b.gas.species.iter().map(|s| &s.id)),
            (Value::AmbientVapor(a), Value::AmbientVapor(b)) => a.canonical_pairs() == b.canonical_pairs(),
            _ => false,
        }
    }
}

impl Value {
    /// The number, if this is one.
    pub fn number(&self) -> Option<f64> {
        match self {
            Value::Number(x) => Some(*x),
            _ => None,
        }
    }
}

/// An ambient gas as written and as parsed.
#[derive(Debug)]
pub struct GasValue {
    /// Text as given (trimmed).
    pub text: String,
    /// The parsed gas.
    pub gas: AmbientGas,
}

/// A refused condition value: which condition, the value (SI with unit, when a number is out of range) and why.
#[derive(Debug, Clone, PartialEq)]
pub struct ConditionError {
    /// The condition's key.
    pub key: &'static str,
    /// The refused number with its SI unit (`0 m`), for range errors; None when the reason quotes the text.
    pub value: Option<String>,
    /// Why it is refused (one line; quotes the text where it matters).
    pub reason: String,
}

impl fmt::Display for ConditionError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match &self.value {
            Some(v) => write!(f, "{} = {v}: {}", self.key, self.reason),
            None => write!(f, "{}: {}", self.key, self.reason),
        }
    }
}

impl std::error::Error for ConditionError {}

/// Setter of a condition on the droplet inputs (`Err` holds the reason).
pub type Setter = fn(&mut DropletInputs, &Value) -> Result<(), String>;
/// Getter of a condition from the droplet inputs (None where it does not apply, e.g. the absorption efficiency
/// of a run without radiation).
pub type Getter = fn(&DropletInputs) -> Option<Value>;

/// One run condition.
#[derive(Debug, Clone, Copy)]
pub struct Condition {
    /// Key: the long option name of `simulate` and the key in sweep and uncertainty files.
    pub key: &'static str,
    /// Column name in sweep summaries and uncertainty samples (SI unit as suffix).
    pub column: &'static str,
    /// Kind of value.
    pub kind: Kind,
    /// SI unit of numbers (`K`, `Pa`, `m`, `m/s`, `s`, `W/(m·K)`; empty for none).
    pub unit: &'static str,
    /// Default as text (the `simulate` default).
    pub default: &'static str,
    /// Allowed range of numbers (SI).
    pub range: Range,
    /// Reason added when a number is below `range.min` (empty: the generic one).
    pub below_min: &'static str,
    /// One-line help.
    pub help: &'static str,
    /// An accepted value other than the default (help texts, tests).
    pub example: &'static str,
    /// Only in the long help (`--help`), not the short one (`-h`).
    pub long_help_only: bool,
    /// Sets the value on the inputs.
    pub set: Setter,
    /// Reads the value from the inputs.
    pub get: Getter,
}

impl PartialEq for Condition {
    fn eq(&self, other: &Self) -> bool {
        self.key == other.key
    }
}

impl Condition {
    /// An error of this condition without a value.
    pub fn error(&self, reason: impl Into<String>) -> ConditionError {
        ConditionError { key: self.key, value: None, reason: reason.into() }
    }

    /// Check a number (SI) against the range; `Err` holds the reason (without the number).
    pub fn check_number(&self, x: f64) -> Result<(), String> {
        if !x.is_finite() {
            return Err("is not a finite number".into());
        }
        let r = &self.range;
        let allowed = if r.max.is_finite() { format!(" (allowed {})", r.describe()) } else { String::new() };
        if self.kind == Kind::Factor && !(x > 0.0 && x <= r.max) {
            return Err(format!("must be a positive factor up to {:e}", r.max));
        }
        if x < r.min || (x == r.min && !r.min_inclusive) {
            if !self.below_min.is_empty() {
                return Err(format!("is below {}: {}", r.min, self.below_min));
            }
            return Err(match (r.min == 0.0, r.min_inclusive) {
                (true, false) => format!("must be positive{allowed}"),
                (true, true) => format!("must be zero or positive{allowed}"),
                _ => format!("must not be below {}{allowed}", r.min),
            });
        }
        if x > r.max {
            return Err(format!("must not exceed {}{allowed}", r.max));
        }
        Ok(())
    }

    /// A range error for number `x` (the value shown in SI with the unit).
    pub fn range_error(&self, x: f64, reason: String) -> ConditionError {
        let value = if self.unit.is_empty() { format!("{x}") } else { format!("{x} {}", self.unit) };
        ConditionError { key: self.key, value: Some(value), reason }
    }

    /// Parse a value written as text (command line, `--reference`, `--vary`); `lib` resolves gases and vapour
    /// components.
    pub fn parse_text(&self, text: &str, lib: &Library) -> Result<Value, ConditionError> {
        let t = text.trim();
        match self.kind {
            Kind::Quantity(q) => self.number(t, q),
            Kind::Factor => self.number(t, Quantity::Dimensionless),
            Kind::QuantityOr(q, words) => match words.iter().find(|w| w.eq_ignore_ascii_case(t)) {
                Some(w) => Ok(Value::Choice(w)),
                None => self.number(t, q).map_err(|mut e| {
                    if e.value.is_none() {
                        e.reason = format!("{} (or {})", e.reason, quoted(words, " / "));
                    }
                    e
                }),
            },
            Kind::Count(lo, hi) => {
                let n: i64 = t.parse().map_err(|_| self.error(format!("'{t}' is not a whole number")))?;
                if n < lo as i64 || n > hi as i64 {
                    return Err(self.error(format!("'{t}' must be a whole number from {lo} to {hi}")));
                }
                Ok(Value::Number(n as f64))
            }
            Kind::Choice(_) => self.word(t),
            Kind::Flag => match t {
                "true" => Ok(Value::Flag(true)),
                "false" => Ok(Value::Flag(false)),
                _ => Err(self.error(format!("'{t}' must be true or false"))),
            },
            Kind::Gas => {
                let gas = AmbientGas::parse(lib, t).map_err(|e| self.error(e.to_string()))?;
                Ok(Value::Gas(Arc::new(GasValue { text: t.to_string(), gas })))
            }
            Kind::AmbientVapor => VaporValue::parse(lib, t).map(|v| Value::AmbientVapor(Arc::new(v))).map_err(|e| self.error(e)),
        }
    }

    /// A number of quantity `q` written as text, checked against the range.
    fn number(&self, text: &str, q: Quantity) -> Result<Value, ConditionError> {
        let x = units::parse(text, q).map_err(|e| self.error(e.to_string()))?;
        self.check_number(x).map_err(|r| self.range_error(x, r))?;
        Ok(Value::Number(x))
    }

    /// One of the condition's words (exact spelling), or an error naming the condition and the allowed words.
    pub fn word(&self, text: &str) -> Result<Value, ConditionError> {
        let words = self.words();
        match words.iter().find(|w| **w == text.trim()) {
            Some(w) => Ok(Value::Choice(w)),
            None => Err(self.error(format!("unknown {} '{}'{}; use {}", self.key, text.trim(), suggest(text.trim(), words.iter().copied()), words.join(" or ")))),
        }
    }

    /// The words of a choice or quantity-or-word condition (empty for other kinds).
    pub fn words(&self) -> &'static [&'static str] {
        match self.kind {
            Kind::Choice(w) | Kind::QuantityOr(_, w) => w,
            _ => &[],
        }
    }

    /// The default value, parsed.
    pub fn default_value(&self, lib: &Library) -> Result<Value, ConditionError> {
        self.parse_text(self.default, lib)
    }

    /// Set a value on the inputs, with the error naming this condition.
    pub fn apply(&self, inputs: &mut DropletInputs, value: &Value) -> Result<(), ConditionError> {
        (self.set)(inputs, value).map_err(|r| self.error(r))
    }

    /// How to write a value, for help texts: e.g. `a temperature (K; e.g. 527degC)`, `one of clift, ranz-marshall`.
    pub fn value_help(&self) -> String {
        match self.kind {
            Kind::Quantity(q) => format!("{} in {}", q.name(), self.unit_text()),
            Kind::Factor => "a factor".into(),
            Kind::Count(lo, hi) => format!("a whole number from {lo} to {hi}"),
            Kind::Choice(w) => format!("one of {}", w.join(", ")),
            Kind::Flag => "a switch".into(),
            Kind::Gas => "a gas".into(),
            Kind::AmbientVapor => "component=mass-fraction pairs".into(),
            Kind::QuantityOr(q, w) => format!("{} in {}, or {}", q.name(), self.unit_text(), w.join(" / ")),
        }
    }

    fn unit_text(&self) -> String {
        let example = match self.kind.quantity() {
            Some(Quantity::Temperature) => " or any temperature unit, e.g. 527degC",
            Some(Quantity::Pressure) => " or any pressure unit, e.g. 10bar",
            Some(Quantity::Length) => " or any length unit, e.g. 50um",
            Some(Quantity::Velocity) => " or km/h",
            Some(Quantity::Time) => " or ms",
            _ => "",
        };
        if self.unit.is_empty() {
            "no unit".into()
        } else {
            format!("{}{example}", self.unit)
        }
    }
}

fn quoted(words: &[&str], sep: &str) -> String {
    words.iter().map(|w| format!("\"{w}\"")).collect::<Vec<_>>().join(sep)
}

/// The entry of `registry` with this key.
pub fn find<'a>(registry: &'a [Condition], key: &str) -> Option<&'a Condition> {
    registry.iter().find(|c| c.key == key)
}

/// "unknown condition 'x'; did you mean …" with the known keys of `registry`.
pub fn unknown_key_message(registry: &[Condition], key: &str) -> String {
    format!("unknown condition '{key}'{}; conditions are: {}", suggest(key, registry.iter().map(|c| c.key)), registry.iter().map(|c| c.key).collect::<Vec<_>>().join(", "))
}

/// Droplet inputs of `fuel` with every condition of `registry` at its value in `values` (registry order; None =
/// the default), set in registry order.
pub fn build_inputs(registry: &[Condition], fuel: Fuel, lib: &Library, values: &[Option<Value>]) -> Result<DropletInputs, ConditionError> {
    let gas = AmbientGas::air(lib).map_err(|e| ConditionError { key: "gas", value: None, reason: e.to_string() })?;
    let mut inputs = DropletInputs::new(fuel, gas, 800.0, 101_325.0, 50e-6, 300.0);
    for (i, c) in registry.iter().enumerate() {
        let v = match values.get(i).and_then(|v| v.as_ref()) {
            Some(v) => v.clone(),
            None => c.default_value(lib)?,
        };
        c.apply(&mut inputs, &v)?;
    }
    Ok(inputs)
}

/// Droplet inputs of `fuel` from condition texts (registry order; None = the default).
pub fn inputs_from_texts(registry: &[Condition], fuel: Fuel, lib: &Library, texts: &[Option<&str>]) -> Result<DropletInputs, ConditionError> {
    let mut values = Vec::with_capacity(registry.len());
    for (i, c) in registry.iter().enumerate() {
        values.push(match texts.get(i).copied().flatten() {
            Some(t) => Some(c.parse_text(t, lib)?),
            None => None,
        });
    }
    build_inputs(registry, fuel, lib, &values)
}

#[cfg(test)]
mod tests;
