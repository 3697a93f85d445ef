//! The sections of a sweep spec besides `[conditions]`: fuels, zipped groups, `[model]` and `[output]`.

use std::collections::BTreeMap;
use std::path::Path;

use crate::conditions::Condition;
use crate::data::suggest;
use crate::fuel::Fuel;

use super::{show, type_name, unknown_key, Ctx, ModelOptions, SweepFuel, Values, MIN_END_MASS_FRACTION, MODEL_KEYS, OUTPUT_KEYS};
use crate::sweep::SweepError;

pub(super) fn parse_fuels(ctx: &Ctx, v: Option<&toml::Value>, base_dir: &Path) -> Result<Vec<SweepFuel>, SweepError> {
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

pub(super) fn parse_zipped(ctx: &Ctx, registry: &[Condition], v: Option<&toml::Value>, given: &BTreeMap<usize, toml::Value>, values: &[Values]) -> Result<Vec<Vec<usize>>, SweepError> {
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
                let i = registry
                    .iter()
                    .position(|c| c.key == key)
                    .ok_or_else(|| ctx.err(&mf, format!("unknown condition '{key}'{}", suggest(key, registry.iter().map(|c| c.key)))))?;
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
                        format!("zipped variables need the same number of values: '{}' has {n0}, '{}' has {}", registry[group[0]].key, registry[i].key, values[i].len()),
                    ));
                }
            }
            group.sort_unstable();
            zipped.push(group);
        }
    }
    let mut groups = vec![];
    for i in 0..registry.len() {
        match zipped.iter().find(|g| g.contains(&i)) {
            Some(g) if g[0] == i => groups.push(g.clone()),
            Some(_) => {}
            None => groups.push(vec![i]),
        }
    }
    Ok(groups)
}

pub(super) fn parse_model(ctx: &Ctx, v: Option<&toml::Value>) -> Result<ModelOptions, SweepError> {
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

/// The `[output]` section: (histories, residue indicators, requested history times \[s\], empty for rows at
/// integrator steps).
pub(super) fn parse_output(ctx: &Ctx, v: Option<&toml::Value>) -> Result<(bool, bool, Vec<f64>), SweepError> {
    let (mut histories, mut residue, mut times) = (false, true, vec![]);
    let Some(v) = v else { return Ok((histories, residue, times)) };
    let toml::Value::Table(t) = v else {
        return Err(ctx.err("output", format!("expected a table [output], found {}", type_name(v))));
    };
    for (key, v) in t {
        let field = format!("output.{key}");
        let slot = match key.as_str() {
            "histories" => &mut histories,
            "residue-indicators" => &mut residue,
            "history-times" => {
                times = parse_history_times(ctx, &field, v)?;
                continue;
            }
            _ => return Err(unknown_key(ctx, &field, key, &OUTPUT_KEYS)),
        };
        match v {
            toml::Value::Boolean(b) => *slot = *b,
            other => return Err(ctx.err(field, format!("expected true or false, found {}", show(other)))),
        }
    }
    Ok((histories, residue, times))
}

/// `[output] history-times`: a string as `--history-times` takes it (`"0:0.5ms:20ms"`, `"1ms,2ms,5ms"`) or a list
/// of times (strings with units, plain numbers in seconds); checked like the option.
fn parse_history_times(ctx: &Ctx, field: &str, v: &toml::Value) -> Result<Vec<f64>, SweepError> {
    use crate::model::guard::{self, HistoryTimesError};
    let refuse = |e: HistoryTimesError| match e {
        HistoryTimesError::Times(value, reason) => ctx.err(field, format!("{value}: {reason}")),
        other => ctx.err(field, other.detail()),
    };
    match v {
        toml::Value::String(text) => guard::parse_history_times(text).map_err(refuse),
        toml::Value::Array(items) => {
            if items.is_empty() {
                return Err(ctx.err(field, "the list is empty (leave the key out for a row at every integrator step)"));
            }
            let mut times = Vec::with_capacity(items.len().min(guard::MAX_HISTORY_TIMES + 1));
            for (i, item) in items.iter().enumerate() {
                let at = format!("{field}[{i}]");
                times.push(match item {
                    toml::Value::String(text) => crate::units::parse(text, crate::units::Quantity::Time).map_err(|e| ctx.err(&at, e.to_string()))?,
                    toml::Value::Integer(n) => *n as f64,
                    toml::Value::Float(x) => *x,
                    other => return Err(ctx.err(at, format!("expected a time (\"5ms\", or a number in seconds), found {}", show(other)))),
                });
            }
            guard::check_times(&times).map_err(refuse)?;
            Ok(times)
        }
        other => Err(ctx.err(field, format!("expected \"START:STEP:END\", \"T1,T2,...\" or a list of times, found {}", show(other)))),
    }
}
