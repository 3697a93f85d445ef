//! The droplet model against published single-droplet experiments.
//!
//! Each case runs the well-mixed droplet model through the public API (library, fuel, ambient gas, inputs,
//! `model::simulate`) under the conditions of a published experiment and compares one quantity, computed the
//! way the experimenters define it, with the published value.
//!
//! # The n-heptane microgravity pair (0.1 MPa, 748 K, d0 ≈ 0.7 mm, N2)
//!
//! Two published experiments at nearly the same condition disagree by a factor of 1.5 in t/d0² at
//! (d/d0)² = 0.5: Nomura et al. (1996) about 1.7 s/mm², Chauveau et al. about 2.55 s/mm² (4.9 s/mm² to the
//! end). The values were read from a plotted comparison of the two data sets quoted in issue 17 (plot reading,
//! about ±0.1 s/mm²); they were not checked against the original figures here. The spread is the rig: Nomura
//! et al. suspended the droplet on the tip of a quartz fibre of about 0.15 mm in an electric furnace;
//! Chauveau et al. held it at the crossing of two quartz fibres of about 14 µm (four stems). Those fibre
//! dimensions are from memory (the papers could not be read while this file was written); the furnace walls
//! are taken at the gas temperature.
//!
//! The check is therefore a band, not a point: for each experiment the model runs with the rig's fibre and
//! (i) no radiation and (ii) black furnace walls absorbed with efficiency 1 (the largest radiative heat a grey
//! droplet can take; n-heptane is semi-transparent, so the true share lies between). The experiment passes when
//! its value lies inside \[model (ii), model (i)\] widened by the tolerance (plot reading ≈ ±5 % combined with
//! ≈ 5 % film-model and property uncertainty, common practice). A free droplet (no fibre, no radiation) must
//! not evaporate faster than either experiment beyond the same tolerance: both rigs only add heat.
//!
//! Cases marked "reported, not asserted" are printed in the validation report with the reason and are not part
//! of the asserted test (reference values from memory, or a known disagreement explained in the text). Today every
//! case is reported only: the microgravity pair rests on second-hand plot readings and fibre dimensions from
//! memory, and a passing check may not rest on values from memory.
//!
//! # Independent check of the film equations for these conditions (computed here, earlier)
//!
//! The quiescent quasi-steady K from the same A&S/one-third-rule equations evaluated in a separate short
//! script with CoolProp 8.0 properties and Fuller diffusion: 0.099 mm²/s (n-heptane, N2, 0.1 MPa, 471 K) and
//! 0.231 mm²/s (741 K); the model gives 0.098 / 0.230 mm²/s, so a gap to the experiments is a modelling (or
//! reference-value) question, not an arithmetic one.

use super::CheckResult;
use crate::data::Library;
use crate::fuel::{Basis, Fuel};
use crate::model::droplet::{HistoryRow, Recorder};
use crate::model::film::{ExtraHeat, Radiation, SupportFibre};
use crate::model::{simulate, DropletInputs, Motion};
use crate::props::gas::AmbientGas;

/// Group name of these checks in the validation report.
pub const GROUP: &str = "droplet experiments";

/// What is compared with the experiment.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Quantity {
    /// t/d0² when (d/d0)² first falls to `at_d2_ratio` \[s/m²\]; 0 means the end of the droplet's life.
    TimeOverD0Squared {
        /// (d/d0)² at which the time is read \[-\] (0 = end of life).
        at_d2_ratio: f64,
    },
    /// Droplet temperature when (d/d0)² has fallen to `at_d2_ratio` (the quasi-steady plateau) \[K\];
    /// absolute tolerance in K.
    PlateauTemperature {
        /// (d/d0)² at which the temperature is read \[-\].
        at_d2_ratio: f64,
    },
}

/// One published experiment and the quantity compared.
#[derive(Debug, Clone)]
pub struct ExperimentCase {
    /// Short label used in the check name.
    pub label: &'static str,
    /// Fuel: (library component id, mass fraction) pairs.
    pub fuel: &'static [(&'static str, f64)],
    /// Ambient gas as accepted by `AmbientGas::parse` ("air", "n2", ...).
    pub gas: &'static str,
    /// Ambient temperature \[K\].
    pub ambient_temperature: f64,
    /// Ambient pressure \[Pa\].
    pub pressure: f64,
    /// Initial diameter \[m\].
    pub initial_diameter: f64,
    /// Initial droplet temperature \[K\].
    pub initial_temperature: f64,
    /// Constant gas velocity relative to the (suspended) droplet \[m/s\].
    pub velocity: f64,
    /// Compared quantity.
    pub quantity: Quantity,
    /// Published value: t/d0² in s/m², or a temperature in K.
    pub reference: f64,
    /// Tolerance: relative (fraction) for t/d0², absolute in K for temperatures.
    pub tolerance: f64,
    /// Full citation and how the value was read (table, plot), with "from memory" where not confirmed.
    pub source: &'static str,
    /// Where the tolerance comes from.
    pub tolerance_basis: &'static str,
    /// The rig's supporting fibre (None: a free droplet or rig unknown).
    pub fibre: Option<SupportFibre>,
    /// Short description of the rig for the check name.
    pub rig_label: &'static str,
    /// Part of the asserted validation test; false: reported only, with the reason in `note`.
    pub asserted: bool,
    /// Why a case is reported only (empty when asserted).
    pub note: &'static str,
}

const NOMURA: &str = "H. Nomura, Y. Ujiie, H.J. Rath, J. Sato, M. Kono, Experimental study on high-pressure droplet \
evaporation using microgravity conditions, Proc. Combust. Inst. 26 (1996) 1267–1273; value read from a plotted \
comparison of published n-heptane data quoted in issue 17 (plot reading, not checked against the original figure)";

const CHAUVEAU: &str = "C. Chauveau, M. Birouk, I. Gökalp and co-workers, n-heptane droplet vaporization in \
microgravity on crossed 14 µm quartz fibres (citation details and fibre size from memory); value read from a plotted \
comparison of published n-heptane data quoted in issue 17 (plot reading, not checked against the original figure)";

const WONG_LIN: &str = "S.-C. Wong, A.-C. Lin, Internal temperature distributions of droplets vaporizing in \
high-temperature convective flows, J. Fluid Mech. 237 (1992) 671–687 (citation, conditions and value from memory, \
not confirmed; n-decane suspended in a hot air stream, temperature measured inside the droplet)";

/// Quartz fibre: k ≈ 1.4 W/(m·K) (fused silica near room temperature, Incropera & DeWitt Table A.3, from memory).
const QUARTZ: f64 = 1.4;

const BAND_BASIS: &str = "plot reading ≈ ±5 % combined with ≈ 5 % film-model and property uncertainty (common practice); band between the rig without radiation and with black furnace walls";

/// The experiment cases.
pub fn cases() -> Vec<ExperimentCase> {
    let heptane = |label, quantity, reference, source, fibre, rig_label, asserted, note| ExperimentCase {
        label,
        fuel: &[("n-heptane", 1.0)],
        gas: "n2",
        ambient_temperature: 748.0,
        pressure: 0.1e6,
        initial_diameter: 0.70e-3,
        initial_temperature: 300.0,
        velocity: 0.0,
        quantity,
        reference,
        tolerance: 0.10,
        source,
        tolerance_basis: BAND_BASIS,
        fibre,
        rig_label,
        asserted,
        note,
    };
    vec![
        heptane(
            "Nomura et al. 1996, n-heptane in N2, 0.1 MPa, 748 K, d0 0.70 mm, microgravity",
            Quantity::TimeOverD0Squared { at_d2_ratio: 0.5 },
            1.7e6,
            NOMURA,
            Some(SupportFibre { diameter: 0.15e-3, conductivity: QUARTZ, stems: 1 }),
            "0.15 mm quartz fibre, one stem (from memory)",
            false,
            "reported, not asserted: the reference is a second-hand plot reading (quoted in issue 17) and the fibre dimensions are from memory; to be asserted once the original papers are read",
        ),
        heptane(
            "Chauveau et al., n-heptane in N2, 0.1 MPa, 748 K, d0 0.70 mm, microgravity",
            Quantity::TimeOverD0Squared { at_d2_ratio: 0.5 },
            2.55e6,
            CHAUVEAU,
            Some(SupportFibre { diameter: 14e-6, conductivity: QUARTZ, stems: 4 }),
            "two crossed 14 µm quartz fibres, four stems (from memory)",
            false,
            "reported, not asserted: the reference is a second-hand plot reading (quoted in issue 17) and the fibre dimensions are from memory; to be asserted once the original papers are read",
        ),
        heptane(
            "Chauveau et al., n-heptane in N2, 0.1 MPa, 748 K, d0 0.70 mm, microgravity",
            Quantity::TimeOverD0Squared { at_d2_ratio: 0.0 },
            4.9e6,
            CHAUVEAU,
            Some(SupportFibre { diameter: 14e-6, conductivity: QUARTZ, stems: 4 }),
            "two crossed 14 µm quartz fibres, four stems (from memory)",
            false,
            "reported, not asserted: the infinite-fin fibre heat grows against the shrinking droplet and makes the end of life too fast (a droplet on crossed fibres is not a sphere at the end); the free droplet is within 3 %",
        ),
        // Wong & Lin 1992: d0 ≈ 2 mm, air ≈ 1000 K, Re ≈ 17 on free-stream properties (→ U ≈ 1 m/s), T_d0 ≈ 315 K.
        ExperimentCase {
            label: "Wong & Lin 1992, n-decane in air, 0.1013 MPa, 1000 K, d0 2.0 mm, U 1.0 m/s (Re ≈ 17)",
            fuel: &[("n-decane", 1.0)],
            gas: "air",
            ambient_temperature: 1000.0,
            pressure: 101_325.0,
            initial_diameter: 2.0e-3,
            initial_temperature: 315.0,
            velocity: 1.0,
            quantity: Quantity::PlateauTemperature { at_d2_ratio: 0.5 },
            reference: 440.0,
            tolerance: 15.0,
            source: WONG_LIN,
            tolerance_basis: "≈5–10 K film model vs measured plateau, combined with ≈10 K for a recalled value",
            fibre: None,
            rig_label: "free droplet (rig heat paths not known)",
            asserted: false,
            note: "reported, not asserted: reference value from memory",
        },
    ]
}

/// Least-squares slope −d(d²)/dt over the rows with `lower` ≤ (d/d0)² ≤ `upper` \[m²/s\]; None with < 3 rows.
pub fn evaporation_constant(rows: &[HistoryRow], upper: f64, lower: f64) -> Option<f64> {
    let pts: Vec<(f64, f64)> = rows.iter().filter(|r| r.d2_ratio <= upper && r.d2_ratio >= lower).map(|r| (r.time, r.diameter * r.diameter)).collect();
    if pts.len() < 3 {
        return None;
    }
    let n = pts.len() as f64;
    let mt = pts.iter().map(|p| p.0).sum::<f64>() / n;
    let md = pts.iter().map(|p| p.1).sum::<f64>() / n;
    let stt: f64 = pts.iter().map(|p| (p.0 - mt) * (p.0 - mt)).sum();
    let std: f64 = pts.iter().map(|p| (p.0 - mt) * (p.1 - md)).sum();
    if stt <= 0.0 {
        return None;
    }
    let k = -std / stt;
    k.is_finite().then_some(k)
}

/// Droplet temperature at the first row where (d/d0)² ≤ `at_d2_ratio`, interpolated linearly in (d/d0)² \[K\].
pub fn temperature_at(rows: &[HistoryRow], at_d2_ratio: f64) -> Option<f64> {
    let i = rows.iter().position(|r| r.d2_ratio <= at_d2_ratio)?;
    if i == 0 {
        return Some(rows[0].surface_temperature);
    }
    let (a, b) = (&rows[i - 1], &rows[i]);
    let span = a.d2_ratio - b.d2_ratio;
    let w = if span > 0.0 { (a.d2_ratio - at_d2_ratio) / span } else { 1.0 };
    Some(a.surface_temperature + w * (b.surface_temperature - a.surface_temperature))
}

fn failed(case: &ExperimentCase, reason: String) -> CheckResult {
    let tolerance = match case.quantity {
        Quantity::TimeOverD0Squared { .. } => format!("{:.3} % relative", 100.0 * case.tolerance),
        Quantity::PlateauTemperature { .. } => format!("{} K", case.tolerance),
    };
    CheckResult { group: GROUP.into(), check: case.label.into(), source: case.source.into(), tolerance, achieved: reason, passed: false, reported: !case.asserted }
}

/// t/d0² when (d/d0)² first falls to `at` (interpolated linearly in (d/d0)²), or at the last row for `at` = 0 \[s/m²\].
pub fn time_over_d0_squared(rows: &[HistoryRow], d0: f64, at: f64) -> Option<f64> {
    if at <= 0.0 {
        return rows.last().map(|r| r.time / (d0 * d0));
    }
    let i = rows.iter().position(|r| r.d2_ratio <= at)?;
    if i == 0 {
        return Some(0.0);
    }
    let (a, b) = (&rows[i - 1], &rows[i]);
    let span = a.d2_ratio - b.d2_ratio;
    let w = if span > 0.0 { (a.d2_ratio - at) / span } else { 1.0 };
    Some((a.time + w * (b.time - a.time)) / (d0 * d0))
}

/// The model value of the compared quantity for one case with the heat paths `rig` (t/d0² in s/m² or T in K).
pub fn model_value_with(case: &ExperimentCase, lib: &Library, rig: ExtraHeat) -> Result<f64, String> {
    let mut comps = vec![];
    for (id, _) in case.fuel {
        comps.push(lib.component(id).ok_or_else(|| format!("component '{id}' is not in the library"))?.clone());
    }
    let fractions: Vec<f64> = case.fuel.iter().map(|(_, w)| *w).collect();
    let fuel = Fuel::from_fractions(case.label, comps, &fractions, Basis::Mass).map_err(|e| e.to_string())?;
    let gas = AmbientGas::parse(lib, case.gas).map_err(|e| e.to_string())?;
    let mut inp = DropletInputs::new(fuel, gas, case.ambient_temperature, case.pressure, case.initial_diameter, case.initial_temperature);
    inp.motion = Motion::Fixed { velocity: case.velocity };
    inp.extra_heat = rig;
    // tighter than the default so the recorded history is dense enough to interpolate
    inp.rtol = 1e-8;
    inp.max_time = 600.0;
    let mut rec = Recorder::default();
    let run = simulate(&inp, &mut rec).map_err(|e| format!("simulation failed: {e}"))?;
    match case.quantity {
        Quantity::TimeOverD0Squared { at_d2_ratio } => {
            time_over_d0_squared(&run.history, case.initial_diameter, at_d2_ratio).ok_or_else(|| format!("(d/d0)² never reached {at_d2_ratio}"))
        }
        Quantity::PlateauTemperature { at_d2_ratio } => temperature_at(&run.history, at_d2_ratio).ok_or_else(|| format!("(d/d0)² never reached {at_d2_ratio}")),
    }
}

/// The model value of a case as a free droplet (no fibre, no radiation).
pub fn model_value(case: &ExperimentCase, lib: &Library) -> Result<f64, String> {
    model_value_with(case, lib, ExtraHeat::default())
}

/// The rig without radiation and with black furnace walls at the gas temperature (absorption efficiency 1).
pub fn rig_bounds(case: &ExperimentCase) -> (ExtraHeat, ExtraHeat) {
    let slow = ExtraHeat { radiation: None, fibre: case.fibre };
    let fast = ExtraHeat { radiation: Some(Radiation { temperature: None, absorption_efficiency: 1.0 }), fibre: case.fibre };
    (slow, fast)
}

fn known(case: &ExperimentCase, mut r: CheckResult) -> CheckResult {
    if !case.asserted {
        r.check = format!("{} — {}", r.check, case.note);
        r.reported = true;
    }
    r
}

/// Run one case and compare with its reference value: the band check and the free-droplet check for t/d0²
/// cases, one comparison for temperature cases.
pub fn check_case(case: &ExperimentCase, lib: &Library) -> Vec<CheckResult> {
    match case.quantity {
        Quantity::TimeOverD0Squared { at_d2_ratio } => {
            let (slow_rig, fast_rig) = rig_bounds(case);
            let values = (model_value(case, lib), model_value_with(case, lib, slow_rig), model_value_with(case, lib, fast_rig));
            let (free, slow, fast) = match values {
                (Ok(a), Ok(b), Ok(c)) => (a, b, c),
                (Err(e), _, _) | (_, Err(e), _) | (_, _, Err(e)) => return vec![known(case, failed(case, e))],
            };
            let at = if at_d2_ratio > 0.0 { format!("(d/d0)² = {at_d2_ratio}") } else { "the end of life".to_string() };
            let reference = case.reference;
            let (lo, hi) = (fast.min(slow), fast.max(slow));
            // distance of the reference outside [lo, hi], relative to the nearer edge
            let outside = if reference < lo { (lo - reference) / lo } else if reference > hi { (reference - hi) / hi } else { 0.0 };
            let mut band = CheckResult::relative(
                GROUP,
                format!(
                    "{}, {}: t/d0² at {at}: reference {:.2} s/mm² inside the model band [{:.3} (black furnace walls), {:.3} (no radiation)] s/mm²",
                    case.label,
                    case.rig_label,
                    reference * 1e-6,
                    lo * 1e-6,
                    hi * 1e-6
                ),
                case.source,
                outside,
                case.tolerance,
            );
            band.tolerance = format!("{} outside the band ({})", band.tolerance, case.tolerance_basis);
            band.achieved = if outside == 0.0 { "inside".into() } else { format!("{:.1} % {}", 100.0 * outside, if reference > hi { "above" } else { "below" }) };
            // free droplet: no rig heat, so never faster than the experiment beyond the tolerance
            let short = (reference - free) / reference;
            let mut free_check = CheckResult::relative(
                GROUP,
                format!("{}, free droplet (no fibre, no radiation): t/d0² at {at}: model {:.3} s/mm² not below the experiment {:.2} s/mm² (the rig only adds heat)", case.label, free * 1e-6, reference * 1e-6),
                case.source,
                short.max(0.0),
                case.tolerance,
            );
            free_check.tolerance = format!("{} below the experiment", free_check.tolerance);
            free_check.achieved = format!("model {:+.1} % against the experiment", 100.0 * (free / reference - 1.0));
            vec![known(case, band), known(case, free_check)]
        }
        Quantity::PlateauTemperature { at_d2_ratio } => {
            let value = match model_value_with(case, lib, ExtraHeat { radiation: None, fibre: case.fibre }) {
                Ok(v) => v,
                Err(e) => return vec![known(case, failed(case, e))],
            };
            let err = (value - case.reference).abs();
            let mut r = CheckResult::absolute(
                GROUP,
                format!("{}, {}: droplet temperature at (d/d0)² = {at_d2_ratio}: model {:.1} K vs reference {:.0} K (from memory)", case.label, case.rig_label, value, case.reference),
                case.source,
                err,
                case.tolerance,
                "K",
            );
            r.tolerance = format!("{} ({})", r.tolerance, case.tolerance_basis);
            r.achieved = format!("{:.1} K ({})", err, if value < case.reference { "model lower" } else { "model higher" });
            vec![known(case, r)]
        }
    }
}

/// Every experiment case: (asserted, result) pairs (failed results carry the reason instead of panicking).
pub fn experiment_results() -> Vec<(bool, CheckResult)> {
    let lib = match Library::embedded() {
        Ok(l) => l,
        Err(e) => {
            return cases().iter().map(|c| (c.asserted, failed(c, format!("component library failed to load: {e}")))).collect();
        }
    };
    cases().iter().flat_map(|c| check_case(c, &lib).into_iter().map(move |r| (c.asserted, r))).collect()
}

/// Every experiment check, asserted or reported (for the validation report).
pub fn experiment_checks() -> Vec<CheckResult> {
    experiment_results().into_iter().map(|(_, r)| r).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::droplet::Regime;
    use crate::model::film::FilmResult;

    fn row(t: f64, d2: f64, temp: f64) -> HistoryRow {
        HistoryRow {
            time: t,
            diameter: d2.sqrt() * 1e-3,
            d2_ratio: d2,
            surface_temperature: temp,
            mass: 0.0,
            evaporated_fraction: 0.0,
            velocity: 0.0,
            film: FilmResult::default(),
            liquid_mass_fractions: vec![],
            vapor_mass_fractions: vec![],
            regime: Regime::Evaporating,
            mean_temperature: temp,
            center_temperature: temp,
            surface_liquid_mass_fractions: vec![],
        }
    }

    #[test]
    fn slope_of_a_straight_d2_line_and_interpolated_temperature() {
        // d0 = 1 mm, d² = 1 − 0.5 t [mm²]: K = 0.5 mm²/s; a curved heat-up part above the window is ignored
        let mut rows = vec![row(0.0, 1.0, 300.0), row(0.1, 1.02, 310.0)];
        for i in 1..40 {
            let t = 0.05 * i as f64;
            rows.push(row(t + 0.2, 1.0 - 0.5 * t, 320.0 + t));
        }
        let k = evaporation_constant(&rows, 0.6, 0.2).unwrap();
        assert!((k - 0.5e-6).abs() < 1e-12, "{k}");
        assert!(evaporation_constant(&rows, 0.6, 0.59).is_none());
        let t = temperature_at(&rows, 0.5).unwrap();
        assert!((t - 321.0).abs() < 1e-9, "{t}");
        // d0 = 1 mm: (d/d0)² = 0.5 at t = 0.2 + 1.0 s → 1.2 s/mm²; the last row at 0.2 + 0.05 · 39 s = 2.15 s
        let t05 = time_over_d0_squared(&rows, 1e-3, 0.5).unwrap();
        assert!((t05 - 1.2e6).abs() < 1e-3, "{t05}");
        assert!((time_over_d0_squared(&rows, 1e-3, 0.0).unwrap() - 2.15e6).abs() < 1e-3);
    }
}
