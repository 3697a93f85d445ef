//! Latent heat and liquid heat capacity of the branched, cyclic and aromatic components whose values rest on
//! one compilation (VDI Heat Atlas PPDS, CRC Handbook, Zabransky et al. 1996), judged against a different
//! compilation (validation/handbook/thermal.csv), and a hold-out of the anchoring methods the generator uses
//! for them, run on the components that have full published correlations.

use super::*;
use crate::data::Component;
use crate::props::pure::{rowlinson_bondi_cp, watson_latent_heat};

const GROUP_THERMAL: &str = "pure-component latent heat and liquid cp vs measured data";

/// Every (component, property, temperature) of validation/handbook/thermal.csv: the first asserted row whose
/// source differs from the component's coefficient source is judged with its own tolerance; the other rows
/// (the coefficient source, reported-only compilations) are quoted in the check text. Keys with no
/// independent asserted row are gathered into one final line marked "reported, not asserted".
pub fn thermal_anchor_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_THERMAL, "load the embedded component library".into(), "mixtures/", e)],
    };
    let table = Table::parse(THERMAL);
    let col = |n: &str| table.column(n);
    let mut keys: Vec<(String, String, u64)> = vec![];
    for row in &table.rows {
        let Some(t) = table.number(row, col("temperature_K")) else {
            keys.push((table.text(row, col("id")).to_string(), "temperature".into(), 0));
            continue;
        };
        let key = (table.text(row, col("id")).to_string(), table.text(row, col("property")).to_string(), (t * 100.0).round() as u64);
        if !keys.contains(&key) {
            keys.push(key);
        }
    }
    let mut out = vec![];
    let mut reported: Vec<String> = vec![];
    for (id, property, t_centi) in keys {
        if t_centi == 0 {
            out.push(failed(GROUP_THERMAL, format!("{id}: temperature cell of validation/handbook/thermal.csv"), "validation/handbook/thermal.csv", "not a number".into()));
            continue;
        }
        let t = t_centi as f64 / 100.0;
        let Some(c) = lib.component(&id) else {
            out.push(failed(GROUP_THERMAL, format!("{id}: component present in the library"), "validation/handbook/thermal.csv", "missing from the library".into()));
            continue;
        };
        let (own, value, label, unit) = match property.as_str() {
            "latent-heat" => (&c.latent_heat.source, c.latent_heat(t) * c.molar_mass(), "latent heat", "kJ/mol"),
            "liquid-heat-capacity" => (&c.liquid_heat_capacity.source, c.liquid_heat_capacity(t) * c.molar_mass(), "liquid heat capacity", "J/(mol·K)"),
            other => {
                out.push(failed(GROUP_THERMAL, format!("{id}: property '{other}' of validation/handbook/thermal.csv"), "validation/handbook/thermal.csv", "unknown property".into()));
                continue;
            }
        };
        let shown = if property == "latent-heat" { 1e-3 } else { 1.0 };
        let mut judged: Option<(f64, f64, f64, String, String)> = None;
        let mut also = vec![];
        for r in table.rows.iter().filter(|r| {
            table.text(r, col("id")) == id && table.text(r, col("property")) == property && table.number(r, col("temperature_K")).is_some_and(|x| (x * 100.0).round() as u64 == t_centi)
        }) {
            let src_id = table.text(r, col("source_id"));
            let Some(reference) = table.number(r, col("value")) else {
                out.push(failed(GROUP_THERMAL, format!("{id} {label} at {t:.2} K: value cell ({src_id})"), "validation/handbook/thermal.csv", "not a number".into()));
                continue;
            };
            let signed = 100.0 * (value / reference - 1.0);
            if src_id == own.as_str() {
                also.push(format!("{src_id} {signed:+.2} % (coefficient source, not judged)"));
            } else if judged.is_none() && table.text(r, col("asserted")) == "1" {
                let tol = table.number(r, col("tolerance_rel")).unwrap_or(0.0);
                judged = Some((relative_error(value, reference), reference, tol, src_id.to_string(), table.text(r, col("source")).to_string()));
            } else {
                also.push(format!("{src_id} {signed:+.2} % (reported)"));
            }
        }
        let also_text = if also.is_empty() { String::new() } else { format!("; other references: {}", also.join(", ")) };
        match judged {
            Some((error, reference, tol, src_id, source)) => {
                let check = format!(
                    "{id} {label} at {t:.2} K: library {} vs {} {unit} (coefficients: {own}; reference: {src_id}){also_text}",
                    fmt_sig(value * shown),
                    fmt_sig(reference * shown)
                );
                out.push(CheckResult::relative(GROUP_THERMAL, check, &source, error, tol));
            }
            None => {
                let informative: Vec<&String> = also.iter().filter(|a| a.ends_with("(reported)")).collect();
                if !informative.is_empty() {
                    let list: Vec<&str> = informative.iter().map(|a| a.trim_end_matches(" (reported)")).collect();
                    reported.push(format!("{id} {label} at {t:.2} K {} {unit} ({own}): {}", fmt_sig(value * shown), list.join(", ")));
                }
            }
        }
    }
    if !reported.is_empty() {
        // one line for every comparison that is not asserted, so that they do not count as passed checks
        out.push(CheckResult {
            group: GROUP_THERMAL.into(),
            check: format!("reported, not asserted ({} comparisons with a compilation of unclear or overlapping provenance, or with the estimate still in use): {}", reported.len(), reported.join("; ")),
            source: "validation/handbook/thermal.csv (Alibakhshi 2017 at Tb; Gharagheizi et al. 2011 at 298.15 K)".into(),
            tolerance: "reported".into(),
            achieved: "–".into(),
            passed: true,
            reported: false,
        });
    }
    out
}

/// Hold-out of the generator's anchoring methods for latent heat and liquid cp: each component with a full
/// Perry correlation (Tables 2-150 / 2-153; hydrocarbons only) is treated as if only the points the
/// generator would use were known, and the loader's continuation is compared with the full correlation.
/// Latent heat: (a) one value at 298.15 K, Watson exponent 0.38 (what a single CRC value gives); (b) two
/// values, 298.15 K and Tb, through A(1 − Tr)^B, Watson 0.38 above Tb. Liquid cp: one value at 298.15 K,
/// Rowlinson–Bondi shape. Each method gives one check: the largest error over all components, with the mean.
pub fn thermal_holdout_checks() -> Vec<CheckResult> {
    let lib = match library() {
        Ok(l) => l,
        Err(e) => return vec![failed(GROUP_THERMAL, "load the embedded component library".into(), "mixtures/", e)],
    };
    let hydrocarbon = |c: &Component| c.formula.oxygen == 0;
    let mut one = Spread::default();
    let mut two = Spread::default();
    let mut cp = Spread::default();
    let (mut one_hot, mut two_hot) = (Spread::default(), Spread::default());
    for c in lib.components() {
        let c = c.as_ref();
        if !hydrocarbon(c) {
            continue;
        }
        let (tb, tc) = (c.normal_boiling_point(), c.critical_temperature());
        if c.latent_heat.source == "perry8-table-2-150" && c.latent_heat.t_min <= 298.15 && tb > 320.0 {
            let l298 = c.latent_heat(298.15);
            let ltb = c.latent_heat(tb);
            let lx = |t: f64| (1.0 - t / tc).ln();
            let b = (l298 / ltb).ln() / (lx(298.15) - lx(tb));
            let a = l298 / (b * lx(298.15)).exp();
            let mut t = 300.0;
            while t <= 0.85 * tc && t <= c.latent_heat.t_max {
                let truth = c.latent_heat(t);
                let two_point = if t <= tb { a * (b * lx(t)).exp() } else { watson_latent_heat(t, tb, ltb, tc) };
                let (e1, e2) = (relative_error(watson_latent_heat(t, 298.15, l298, tc), truth), relative_error(two_point, truth));
                two.add(&c.id, t, e2);
                if t <= tb {
                    one.add(&c.id, t, e1);
                } else {
                    one_hot.add(&c.id, t, e1);
                    two_hot.add(&c.id, t, e2);
                }
                t += 10.0;
            }
        }
        if c.liquid_heat_capacity.source == "perry8-table-2-153" && c.liquid_heat_capacity.t_min <= 298.15 {
            let w = c.molar_mass();
            let rb = |t: f64| rowlinson_bondi_cp(c.ideal_gas_heat_capacity(t) * w, t, tc, c.acentric_factor());
            let anchor = c.liquid_heat_capacity(298.15) / rb(298.15);
            let lo = c.constants.melting_point.value.max(250.0).max(c.liquid_heat_capacity.t_min);
            let hi = tb.min(0.7 * tc).min(c.liquid_heat_capacity.t_max);
            let mut t = lo;
            while t <= hi {
                cp.add(&c.id, t, relative_error(anchor * rb(t), c.liquid_heat_capacity(t)));
                t += 10.0;
            }
        }
    }
    let source = "hold-out on the library's Perry 8th ed. Table 2-150 / 2-153 correlations (measured-data fits)";
    let above = |s: &Spread| format!("; above Tb to 0.85 Tc (reported): mean {}, max {} ({} {:.0} K)", pct(s.mean()), pct(s.worst), s.worst_at.0, s.worst_at.1);
    let mut one_check = one.check("latent heat, one value at 298.15 K + Watson 0.38 (CRC single-value anchor), 298 K … Tb", source, TOL_LATENT_HEAT_ONE_POINT);
    one_check.check.push_str(&above(&one_hot));
    let mut two_check = two.check("latent heat, values at 298.15 K and Tb through A(1 − Tr)^B, Watson 0.38 above Tb (CRC two-value anchor), 298 K … 0.85 Tc", source, TOL_LATENT_HEAT_TWO_POINT);
    two_check.check.push_str(&format!("; above Tb alone: mean {}, max {}", pct(two_hot.mean()), pct(two_hot.worst)));
    vec![
        one_check,
        two_check,
        cp.check("liquid heat capacity, one value at 298.15 K + Rowlinson–Bondi shape (CRC / Zabransky single-value anchor), 250 K … min(Tb, 0.7 Tc)", source, TOL_LIQUID_CP_HOLDOUT),
    ]
}

/// Largest and mean error of a hold-out over components and temperatures.
#[derive(Default)]
struct Spread {
    worst: f64,
    worst_at: (String, f64),
    sum: f64,
    points: usize,
    components: Vec<String>,
}

impl Spread {
    fn add(&mut self, id: &str, t: f64, e: f64) {
        if !e.is_finite() || e > self.worst {
            self.worst = if e.is_finite() { e } else { f64::INFINITY };
            self.worst_at = (id.to_string(), t);
        }
        self.sum += if e.is_finite() { e } else { 0.0 };
        self.points += 1;
        if !self.components.iter().any(|c| c == id) {
            self.components.push(id.to_string());
        }
    }

    fn mean(&self) -> f64 {
        if self.points == 0 {
            0.0
        } else {
            self.sum / self.points as f64
        }
    }

    fn check(&self, what: &str, source: &str, tol: f64) -> CheckResult {
        if self.points == 0 {
            return failed(GROUP_THERMAL, format!("hold-out of the {what}"), source, "no component with a full correlation".into());
        }
        let mean = self.mean();
        let check = format!(
            "hold-out of the {what}: {} components, {} points, mean {}, max at {} {:.0} K",
            self.components.len(),
            self.points,
            pct(mean),
            self.worst_at.0,
            self.worst_at.1
        );
        CheckResult::relative(GROUP_THERMAL, check, source, self.worst, tol)
    }
}
