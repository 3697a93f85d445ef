//! Temperature grids of the tables: where the liquid range starts (freezing point) and ends (bubble point at the
//! table pressure), and the vapour grid of the component tables.

use std::sync::Arc;

use serde::Serialize;

use crate::data::Component;
use crate::post::indicators::freezing_point;
use crate::props::activity::{Activity, ActivityModel};
use crate::props::liquid;

use super::{input, TableError, DEFAULT_START, END_CRITICAL_FRACTION, LOWEST_DEFAULT_START, MAJOR_MOLE_FRACTION, MAX_CRITICAL_FRACTION, MAX_ROWS, MAX_VAPOR_TEMPERATURE, MIN_TEMPERATURE};


/// The temperatures of a table and how its ends were chosen.
#[derive(Debug, Clone, Serialize)]
pub struct TemperatureGrid {
    /// First temperature \[K\].
    pub from: f64,
    /// Last temperature asked for (the last row is the last grid point not above it) \[K\].
    pub to: f64,
    /// Step \[K\].
    pub step: f64,
    /// How `from` was chosen.
    pub from_rule: String,
    /// How `to` was chosen.
    pub to_rule: String,
    /// Row temperatures \[K\].
    pub temperatures: Vec<f64>,
}

/// Grid points from + k·step not above `to`, rounded to 1 µK so that decimal steps print cleanly.
pub(crate) fn grid_points(from: f64, to: f64, step: f64) -> Vec<f64> {
    let n = ((to - from) / step + 1e-9).floor().max(0.0) as usize;
    (0..=n).map(|k| ((from + k as f64 * step) * 1e6).round() / 1e6).collect()
}

pub(crate) fn check_step(step: f64) -> Result<(), TableError> {
    if !(1e-3..=500.0).contains(&step) {
        return Err(input("step", format!("{step} K"), "must lie between 0.001 K and 500 K"));
    }
    Ok(())
}

/// Where the liquid range of a composition ends: the bubble point at `pressure` (None in the critical region),
/// the liquid's pseudo-critical temperature (Kay's rule) and the lowest critical temperature of a major component.
#[derive(Debug, Clone)]
pub struct RangeLimits {
    /// Bubble point at the table pressure \[K\] (None at or above the pseudo-critical temperature).
    pub bubble_point: Option<f64>,
    /// Why there is no bubble point (empty when there is one).
    pub bubble_point_note: String,
    /// Pseudo-critical temperature of the liquid, Kay's rule Σ x_i T_c,i \[K\].
    pub pseudo_critical_temperature: f64,
    /// Lowest critical temperature of a component with mole fraction above 1 % \[K\] (the surrogate's fit range).
    pub critical_temperature: f64,
    /// Id of that component.
    pub critical_component: String,
    /// Ideal-solubility freezing point \[K\] (None when no component has an enthalpy of fusion).
    pub freezing_point: Option<f64>,
    /// Component controlling the freezing point.
    pub freezing_component: Option<String>,
    /// Components skipped by the freezing-point estimate (no enthalpy of fusion).
    pub freezing_skipped: Vec<String>,
}

/// Mole fractions of the major components: above [`MAJOR_MOLE_FRACTION`], or the largest one if none is.
fn major(x: &[f64]) -> Vec<bool> {
    let mut m: Vec<bool> = x.iter().map(|v| *v > MAJOR_MOLE_FRACTION).collect();
    if !m.iter().any(|v| *v) {
        if let Some((i, _)) = x.iter().enumerate().max_by(|a, b| a.1.total_cmp(b.1)) {
            m[i] = true;
        }
    }
    m
}

/// Bubble point (with the liquid activity model `activity`), critical limit and freezing point of a composition.
pub fn range_limits(components: &[Arc<Component>], mass_fractions: &[f64], pressure: f64, activity: ActivityModel) -> RangeLimits {
    let x = liquid::mass_to_mole(components, mass_fractions);
    let m = major(&x);
    let (mut tc, mut id) = (f64::INFINITY, String::new());
    for ((c, _), is_major) in components.iter().zip(&x).zip(&m) {
        if *is_major && c.critical_temperature() < tc {
            tc = c.critical_temperature();
            id = c.id.clone();
        }
    }
    let (tf, controlling, skipped) = freezing_point(components, &x);
    let bubble = match Activity::new(activity, components) {
        Ok(mut a) => liquid::subcritical_bubble_point_with(components, &mut a, &x, pressure),
        Err(e) => Err(e.to_string()),
    };
    RangeLimits {
        pseudo_critical_temperature: liquid::pseudo_critical_temperature(components, &x),
        bubble_point: bubble.as_ref().ok().copied(),
        bubble_point_note: bubble.err().unwrap_or_default(),
        critical_temperature: tc,
        critical_component: id,
        freezing_point: tf,
        freezing_component: controlling,
        freezing_skipped: skipped,
    }
}

/// The liquid temperature grid of a composition at `pressure`: user ends where given, else the defaults
/// (docs/tables.md): from the ideal-solubility freezing point (not below 200 K; 230 K when no component has an
/// enthalpy of fusion), rounded up to a multiple of the step, to the bubble point at `pressure` (0.95 of the
/// pseudo-critical temperature when there is none), rounded down to a multiple of the step. A minor component
/// passing its own critical temperature does not end the range: the rows grade it (`validity::grade`).
pub fn liquid_grid(limits: &RangeLimits, from: Option<f64>, to: Option<f64>, step: f64) -> Result<TemperatureGrid, TableError> {
    check_step(step)?;
    let tpc = limits.pseudo_critical_temperature;
    let cap = MAX_CRITICAL_FRACTION * tpc;
    if let Some(f) = from {
        if !(f.is_finite() && f >= MIN_TEMPERATURE) {
            return Err(input("from", format!("{f} K"), format!("must be at least {MIN_TEMPERATURE} K")));
        }
        if f >= cap {
            return Err(input("from", format!("{f} K"), format!("is at or above 0.99 of the liquid's pseudo-critical temperature ({tpc:.1} K, Kay's rule): no liquid to tabulate")));
        }
    }
    if let Some(t) = to {
        if !t.is_finite() || t > cap {
            return Err(input("to", format!("{t} K"), format!("is above 0.99 of the liquid's pseudo-critical temperature ({tpc:.1} K, Kay's rule), where liquid properties are not defined")));
        }
    }
    let (default_from, from_rule) = match limits.freezing_point {
        Some(tf) if tf >= LOWEST_DEFAULT_START => (tf, format!("ideal-solubility freezing point {tf:.2} K (controlled by {})", limits.freezing_component.as_deref().unwrap_or("?"))),
        Some(tf) => (LOWEST_DEFAULT_START, format!("{LOWEST_DEFAULT_START} K (the ideal-solubility freezing point {tf:.2} K is lower; the default does not go below {LOWEST_DEFAULT_START} K)")),
        None => (DEFAULT_START, format!("{DEFAULT_START} K (no component has an enthalpy of fusion: no freezing-point estimate)")),
    };
    let crit_end = END_CRITICAL_FRACTION * tpc;
    let (default_to, to_rule) = match limits.bubble_point {
        Some(tb) => (tb, format!("bubble point {tb:.2} K at the table pressure")),
        None => (crit_end, format!("0.95 of the liquid's pseudo-critical temperature ({crit_end:.2} K, Kay's rule); no bubble point at the table pressure")),
    };
    let (start, from_rule) = match from {
        Some(f) => (f, format!("--from {f} K")),
        None => ((default_from / step - 1e-9).ceil() * step, format!("{from_rule}, rounded up to a multiple of the step")),
    };
    let (end, to_rule) = match to {
        Some(t) => (t, format!("--to {t} K")),
        None => ((default_to / step + 1e-9).floor() * step, format!("{to_rule}, rounded down to a multiple of the step")),
    };
    // A range narrower than one step between rounded defaults: use the unrounded ends.
    let (start, end) = if start > end && from.is_none() && to.is_none() { (default_from, default_to) } else { (start, end) };
    if start >= end {
        let (option, value) = if to.is_some() { ("to", format!("{end} K")) } else { ("from", format!("{start} K")) };
        return Err(input(option, value, format!("the table would be empty: it must start below its end ({start:.2} K ≥ {end:.2} K; {to_rule})")));
    }
    let n = ((end - start) / step).floor() as usize + 1;
    if n > MAX_ROWS {
        return Err(input("step", format!("{step} K"), format!("gives {n} rows from {start:.2} K to {end:.2} K; at most {MAX_ROWS} are allowed")));
    }
    Ok(TemperatureGrid { from: start, to: end, step, from_rule, to_rule, temperatures: grid_points(start, end, step) })
}

/// The vapour grid of the component tables: from `from` to `to` in steps of `step`.
pub fn vapor_grid(from: f64, to: f64, step: f64) -> Result<TemperatureGrid, TableError> {
    check_step(step)?;
    if !(from.is_finite() && from >= MIN_TEMPERATURE) {
        return Err(input("vapor-from", format!("{from} K"), format!("must be at least {MIN_TEMPERATURE} K")));
    }
    if !(to.is_finite() && to > from && to <= MAX_VAPOR_TEMPERATURE) {
        return Err(input("vapor-to", format!("{to} K"), format!("must lie above --vapor-from ({from} K) and not above {MAX_VAPOR_TEMPERATURE} K")));
    }
    let n = ((to - from) / step).floor() as usize + 1;
    if n > MAX_ROWS {
        return Err(input("step", format!("{step} K"), format!("gives {n} vapour rows; at most {MAX_ROWS} are allowed")));
    }
    Ok(TemperatureGrid { from, to, step, from_rule: "--vapor-from".into(), to_rule: "--vapor-to".into(), temperatures: grid_points(from, to, step) })
}


#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_points_are_clean() {
        let g = grid_points(250.0, 251.0, 0.1);
        assert_eq!(g.len(), 11);
        assert_eq!(format!("{}", g[3]), "250.3");
        assert!(check_step(0.0).is_err() && check_step(f64::NAN).is_err());
    }
}
