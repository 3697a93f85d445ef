//! Pure-component properties against the reference equations of state of CoolProp 8.0.0, and the
//! n-dodecane ideal-gas cp against a published NASA 7 polynomial above the end of its fit.

use super::*;
use crate::data::{Component, Correlation};

// ---------------------------------------------------------------------------------------------------------
// 1. CoolProp checks
// ---------------------------------------------------------------------------------------------------------

type PropertyFn = fn(&Component, f64) -> f64;

/// One property to check against a CoolProp column.
struct PropertySpec {
    key: &'static str,
    label: &'static str,
    column: &'static str,
    tolerance: f64,
    /// Header key of the reference model (`equation of state`, `viscosity model`, ...).
    model_key: &'static str,
    value: PropertyFn,
    correlation: fn(&Component) -> &Correlation,
    /// Judge the whole window, also where the library extends the published correlation (the extension
    /// methods are what is checked), and dilute-gas rows above the EOS T_max.
    whole_window: bool,
    /// Dilute-gas window \[K\] (liquid properties use Tb − 60 K … 0.85 Tc).
    gas_window: (f64, f64),
}

const LIQUID_PROPERTIES: [PropertySpec; 7] = [
    PropertySpec { key: "vapor-pressure", label: "vapour pressure", column: "vapor_pressure_Pa", tolerance: TOL_VAPOR_PRESSURE, model_key: "equation of state", value: Component::vapor_pressure, correlation: |c| &c.vapor_pressure , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-density", label: "liquid density", column: "liquid_density_kg_m3", tolerance: TOL_LIQUID_DENSITY, model_key: "equation of state", value: Component::liquid_density, correlation: |c| &c.liquid_density , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "latent-heat", label: "latent heat", column: "latent_heat_J_kg", tolerance: TOL_LATENT_HEAT, model_key: "equation of state", value: Component::latent_heat, correlation: |c| &c.latent_heat , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-heat-capacity", label: "liquid heat capacity", column: "liquid_cp_J_kgK", tolerance: TOL_LIQUID_CP, model_key: "equation of state", value: Component::liquid_heat_capacity, correlation: |c| &c.liquid_heat_capacity , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-viscosity", label: "liquid viscosity", column: "liquid_viscosity_Pa_s", tolerance: TOL_LIQUID_VISCOSITY, model_key: "viscosity model", value: Component::liquid_viscosity, correlation: |c| &c.liquid_viscosity , whole_window: true, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "liquid-conductivity", label: "liquid thermal conductivity", column: "liquid_conductivity_W_mK", tolerance: TOL_LIQUID_CONDUCTIVITY, model_key: "thermal conductivity model", value: Component::liquid_conductivity, correlation: |c| &c.liquid_conductivity , whole_window: true, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "surface-tension", label: "surface tension", column: "surface_tension_N_m", tolerance: TOL_SURFACE_TENSION, model_key: "surface tension model", value: Component::surface_tension, correlation: |c| &c.surface_tension , whole_window: false, gas_window: (300.0, 1000.0) },
];

const VAPOR_PROPERTIES: [PropertySpec; 3] = [
    PropertySpec { key: "ideal-gas-heat-capacity", label: "ideal-gas heat capacity", column: "ideal_gas_cp_J_kgK", tolerance: TOL_IDEAL_GAS_CP, model_key: "equation of state", value: Component::ideal_gas_heat_capacity, correlation: |c| &c.ideal_gas_heat_capacity , whole_window: false, gas_window: (300.0, 1500.0) },
    PropertySpec { key: "vapor-viscosity", label: "vapour viscosity", column: "vapor_viscosity_Pa_s", tolerance: TOL_VAPOR_VISCOSITY, model_key: "viscosity model", value: Component::vapor_viscosity, correlation: |c| &c.vapor_viscosity , whole_window: false, gas_window: (300.0, 1000.0) },
    PropertySpec { key: "vapor-conductivity", label: "vapour thermal conductivity", column: "vapor_conductivity_W_mK", tolerance: TOL_VAPOR_CONDUCTIVITY, model_key: "thermal conductivity model", value: Component::vapor_conductivity, correlation: |c| &c.vapor_conductivity , whole_window: true, gas_window: (300.0, 900.0) },
];

/// Source text of a CoolProp column: library, kind of model, and the paper from the table header.
fn coolprop_source(table: &Table, spec: &PropertySpec) -> String {
    let lib = table.library();
    let paper = table.comment(spec.model_key).unwrap_or("model not named in the table header");
    match spec.model_key {
        "equation of state" => format!("{lib} reference EOS ({paper})"),
        other => format!("{lib} {other} ({paper})"),
    }
}

/// Saturated-liquid and dilute-gas properties of every component CoolProp covers (validation/coolprop/).
///
/// Liquid properties use the saturated-liquid rows with T from Tb − 60 K to 0.85 Tc (the library component's
/// own Tb and Tc; not below its melting point except for the vapour pressure), the window the issue asks the
/// properties to be valid in. Inside it, each property is judged where its published correlation is valid
/// (t-min … t-max of the component file): a correlation is not held to account where the library
/// extrapolates it, but when the published range cuts the window the check text says so and gives the
/// deviation over the full window too. Ideal-gas cp, vapour viscosity and vapour conductivity use the
/// dilute-gas rows over 300–1000 K in the same way; rows above the EOS upper limit T_max (column
/// `beyond_eos_tmax` = 1) are CoolProp extrapolations (validation/README.md) and are reported, not judged.
/// Tolerances: see the `TOL_*` constants (the vapour ones are our own choice; the issue sets none).
pub fn coolprop_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_COOLPROP, "load the embedded component library".into(), "mixtures/", e)],
    };
    let mut out = vec![];
    for (id, liquid_csv, vapor_csv) in COOLPROP_FLUIDS {
        let Some(c) = lib.component(id) else {
            out.push(failed(GROUP_COOLPROP, format!("{id}: component present in the library"), "validation/coolprop/", "missing from the library".into()));
            continue;
        };
        let liquid = Table::parse(liquid_csv);
        let vapor = Table::parse(vapor_csv);
        let tb = c.normal_boiling_point();
        let tc = c.critical_temperature();
        let tm = c.constants.melting_point.value;
        for spec in &LIQUID_PROPERTIES {
            let lo = if spec.key == "vapor-pressure" { tb - 60.0 } else { (tb - 60.0).max(tm) };
            let window = (lo, 0.85 * tc);
            if let Some(r) = compare(c, &liquid, spec, window, false) {
                out.push(mark_known(r, id, spec.key));
            }
        }
        for spec in &VAPOR_PROPERTIES {
            if let Some(r) = compare(c, &vapor, spec, spec.gas_window, true) {
                out.push(mark_known(r, id, spec.key));
            }
        }
    }
    out
}

/// One component × property comparison; `None` when the reference has no values for the property.
fn compare(c: &Component, table: &Table, spec: &PropertySpec, window: (f64, f64), dilute_gas: bool) -> Option<CheckResult> {
    let t_col = table.column("temperature_K");
    let v_col = table.column(spec.column);
    let flag_col = table.column("beyond_eos_tmax");
    let corr = (spec.correlation)(c);
    let (pub_lo, pub_hi) = (corr.t_min, corr.t_max);
    let mut judged = Worst::new();
    let mut whole = Worst::new(); // the full window, extrapolated parts included
    let mut beyond_eos = Worst::new();
    let mut any_reference = false;
    for row in &table.rows {
        let (Some(t), Some(reference)) = (table.number(row, t_col), table.number(row, v_col)) else { continue };
        any_reference = true;
        if t < window.0 - 1e-9 || t > window.1 + 1e-9 {
            continue;
        }
        let e = relative_error((spec.value)(c, t), reference);
        if dilute_gas && table.number(row, flag_col).unwrap_or(0.0) > 0.5 {
            beyond_eos.add(t, e);
            if !spec.whole_window {
                continue;
            }
        }
        whole.add(t, e);
        if spec.whole_window || (t >= pub_lo && t <= pub_hi) {
            judged.add(t, e);
        }
    }
    if !any_reference {
        return None;
    }
    let source = coolprop_source(table, spec);
    let mut notes = vec![];
    if whole.points > judged.points && !spec.whole_window {
        notes.push(format!(
            "window {:.0}–{:.0} K cut to the published range {:.1}–{:.1} K of '{}'; over the whole window, extrapolated, max {} ({} points, not judged)",
            window.0, window.1, pub_lo, pub_hi, corr.source, pct(whole.error), whole.points
        ));
    }
    if spec.whole_window && (whole.points > 0) && (pub_lo > window.0 || pub_hi < window.1) {
        notes.push(format!(
            "judged over the whole window, including where the library extends '{}' (published {:.1}–{:.1} K) by its extension method",
            corr.source, pub_lo, pub_hi
        ));
    }
    if beyond_eos.points > 0 {
        let judged_text = if spec.whole_window { "judged (the reference correlation is extrapolated there too)" } else { "not judged" };
        notes.push(format!(
            "{} rows {:.0}–{:.0} K lie above the EOS T_max, where CoolProp extrapolates: max {} there, {judged_text}",
            beyond_eos.points, beyond_eos.t_lo, beyond_eos.t_hi, pct(beyond_eos.error)
        ));
    }
    if spec.key == "surface-tension" && corr.source.starts_with("mulero-cachadina") && source.contains("Mulero") {
        notes.push("the library and the reference use the same published correlation (Mulero et al. 2012): this checks the copied coefficients, not the accuracy".into());
    }
    let notes = if notes.is_empty() { String::new() } else { format!("; {}", notes.join("; ")) };
    if judged.points == 0 {
        let check = format!("{} {}: no reference point inside the published range{notes}", c.id, spec.label);
        return Some(CheckResult {
            group: GROUP_COOLPROP.into(),
            check,
            source,
            tolerance: format!("{:.3} % relative", 100.0 * spec.tolerance),
            achieved: "nothing to judge".into(),
            passed: false,
            reported: false,
        });
    }
    let check = format!(
        "{} {}, {:.0}–{:.0} K ({} points, max at {:.0} K){notes}",
        c.id, spec.label, judged.t_lo, judged.t_hi, judged.points, judged.temperature
    );
    Some(CheckResult::relative(GROUP_COOLPROP, check, &source, judged.error, spec.tolerance))
}

/// Ideal-gas cp of n-dodecane over 300–1500 K against the published NASA 7 polynomial in
/// validation/nasa7/n-dodecane_cp.csv (group-additivity thermo data of a published combustion mechanism,
/// independent of the Poling et al. Appendix A polynomial that feeds the library, which ends at 1000 K):
/// checks the Wilhoit continuation above 1000 K. Tolerance [`TOL_IDEAL_GAS_CP_HIGH`].
pub fn high_temperature_cp_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_COOLPROP, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(NASA7_DODECANE_CP);
    let source = format!("published NASA 7 polynomial ({}; validation/nasa7/n-dodecane_cp.csv)", table.comment("source").unwrap_or("source not named"));
    let Some(c) = lib.component("n-dodecane") else {
        return vec![failed(GROUP_COOLPROP, "n-dodecane: component present in the library".into(), &source, "missing".into())];
    };
    let (t_col, v_col) = (table.column("temperature_K"), table.column("ideal_gas_cp_J_kgK"));
    let mut inside = Worst::new();
    let mut beyond = Worst::new();
    for row in &table.rows {
        let (Some(t), Some(reference)) = (table.number(row, t_col), table.number(row, v_col)) else { continue };
        let e = relative_error(c.ideal_gas_heat_capacity(t), reference);
        if t > c.ideal_gas_heat_capacity.t_max {
            beyond.add(t, e);
        } else {
            inside.add(t, e);
        }
    }
    let mut all = inside;
    if beyond.points > 0 {
        for (t, e) in [(beyond.temperature, beyond.error)] {
            if e > all.error || all.points == 0 {
                all.error = e;
                all.temperature = t;
            }
        }
        all.points += beyond.points;
        all.t_hi = all.t_hi.max(beyond.t_hi);
        all.t_lo = all.t_lo.min(beyond.t_lo);
    }
    let check = format!(
        "n-dodecane ideal-gas heat capacity, {:.0}–{:.0} K ({} points, max at {:.0} K); inside the published polynomial's range (to {:.0} K) max {}, above it (Wilhoit continuation) max {}",
        all.t_lo, all.t_hi, all.points, all.temperature, c.ideal_gas_heat_capacity.t_max, pct(inside.error), pct(beyond.error)
    );
    vec![CheckResult::relative(GROUP_COOLPROP, check, &source, all.error, TOL_IDEAL_GAS_CP_HIGH)]
}
