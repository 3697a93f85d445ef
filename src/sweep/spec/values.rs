//! Values of one `[conditions]` key: a TOML value (number in SI, text with a unit or word, list, or range) read
//! through the condition registry, and checked against every fuel of the sweep.

use crate::conditions::{Condition, Kind, Value};
use crate::model::DropletInputs;

use super::{show, type_name, unknown_key, Ctx, SweepFuel, ValueText, Values, MAX_STEPS, RANGE_KEYS};
use crate::sweep::SweepError;

/// A number given as a TOML number (SI), checked against the condition's range.
fn number(ctx: &Ctx, c: &Condition, x: f64, v: &toml::Value, field: &str) -> Result<Value, SweepError> {
    if !x.is_finite() {
        return Err(ctx.err(field, format!("{} is not a finite number", show(v))));
    }
    c.check_number(x).map_err(|reason| ctx.err(field, format!("{} {reason}", show(v))))?;
    Ok(Value::Number(x))
}

/// One value of condition `c`.
pub(super) fn scalar(ctx: &Ctx, c: &Condition, v: &toml::Value, field: &str) -> Result<Value, SweepError> {
    let found = || format!("found {} {}", type_name(v), show(v));
    match (c.kind, v) {
        // text: the registry reads it (units, words, gases, vapour pairs)
        (_, toml::Value::String(text)) => c.parse_text(text, ctx.lib).map_err(|e| match &e.value {
            Some(_) => ctx.err(field, format!("{} {}", show(v), e.reason)),
            None if c.kind == Kind::Gas => ctx.err(field, format!("'{text}': {}", e.reason)),
            None => ctx.err(field, e.reason),
        }),
        (Kind::Quantity(_) | Kind::Factor | Kind::QuantityOr(..), toml::Value::Integer(i)) => number(ctx, c, *i as f64, v, field),
        (Kind::Quantity(_) | Kind::Factor | Kind::QuantityOr(..), toml::Value::Float(f)) => number(ctx, c, *f, v, field),
        (Kind::Quantity(q) | Kind::QuantityOr(q, _), _) => Err(ctx.err(field, format!("expected a {} (a number in SI units or a string with a unit), {}", q.name(), found()))),
        (Kind::Factor, _) => Err(ctx.err(field, format!("expected a factor (a number), {}", found()))),
        (Kind::Flag, toml::Value::Boolean(b)) => Ok(Value::Flag(*b)),
        (Kind::Flag, _) => Err(ctx.err(field, format!("expected true or false, {}", found()))),
        (Kind::Count(lo, hi), toml::Value::Integer(n)) if *n >= lo as i64 && *n <= hi as i64 => Ok(Value::Number(*n as f64)),
        (Kind::Count(lo, hi), _) => Err(ctx.err(field, format!("expected a whole number from {lo} to {hi}, {}", found()))),
        (Kind::Choice(names), _) => Err(ctx.err(field, format!("expected {}, {}", names.iter().map(|n| format!("\"{n}\"")).collect::<Vec<_>>().join(" or "), found()))),
        (Kind::Gas, _) => Err(ctx.err(field, format!("expected a gas such as \"air\", \"n2\" or \"o2=0.15,n2=0.85\", {}", found()))),
        (Kind::AmbientVapor, _) => Err(ctx.err(field, format!("expected component=mass-fraction pairs like \"n-decane=0.01\", {}", found()))),
    }
}

/// The values of condition `c`: a value, a list, or a range `{ from, to, steps, scale }` of a continuous kind.
pub(super) fn parse_values(ctx: &Ctx, c: &Condition, v: &toml::Value, field: &str) -> Result<Values, SweepError> {
    match v {
        toml::Value::Array(items) => {
            if items.is_empty() {
                return Err(ctx.err(field, "the list is empty"));
            }
            let mut out = Vec::with_capacity(items.len());
            for (i, item) in items.iter().enumerate() {
                out.push(scalar(ctx, c, item, &format!("{field}[{i}]"))?);
            }
            Ok(Values::List(out))
        }
        toml::Value::Table(t) => {
            let Some(q) = c.kind.quantity().filter(|_| c.kind.is_continuous()) else {
                return Err(ctx.err(field, format!("a range {{ from, to, steps }} needs a numeric variable; give '{}' a value or a list", c.key)));
            };
            for key in t.keys() {
                if !RANGE_KEYS.contains(&key.as_str()) {
                    return Err(unknown_key(ctx, &format!("{field}.{key}"), key, &RANGE_KEYS));
                }
            }
            let end = |key: &str| -> Result<f64, SweepError> {
                let f = format!("{field}.{key}");
                let v = t.get(key).ok_or_else(|| ctx.err(&f, "missing: a range needs from, to and steps"))?;
                match scalar(ctx, c, v, &f)? {
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
        scalar_value => Ok(Values::List(vec![scalar(ctx, c, scalar_value, field)?])),
    }
}

/// Set every listed value of condition `c` on the inputs of every fuel (`templates`, one per fuel): values that
/// depend on the fuel (far-field vapour components, the activity model's groups) are refused here, before any
/// case runs. Range values are numbers and depend on no fuel.
pub(super) fn check_against_fuels(ctx: &Ctx, c: &Condition, values: &Values, field: &str, fuels: &[SweepFuel], templates: &[DropletInputs]) -> Result<(), SweepError> {
    let Values::List(list) = values else { return Ok(()) };
    for value in list {
        for (fuel, template) in fuels.iter().zip(templates) {
            let mut inputs = template.clone();
            (c.set)(&mut inputs, value).map_err(|reason| ctx.err(field, format!("'{}' with fuel '{}': {reason}", value.csv_text(), fuel.entry)))?;
        }
    }
    Ok(())
}
