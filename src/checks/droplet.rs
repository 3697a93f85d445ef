//! The droplet model against published single-droplet experiments.
//!
//! Each case runs the well-mixed droplet model through the public API (library, fuel, ambient gas, inputs,
//! `model::simulate`) under the conditions of a published experiment and compares one quantity, computed the
//! way the experimenters define it, with the published value.
//!
//! # How far the reference numbers can be trusted
//!
//! Only abstracts of the papers could be read while this file was written; none of them prints the numbers
//! compared here. Every reference value below is therefore **from memory** and is labelled so in its
//! `source`. The tolerances are widened to reflect that, and the reference values were written down before
//! the model was first run on these conditions, so they were not adjusted to the model's output.
//! Conditions that an abstract confirms are marked "(abstract)"; the rest are from memory too.
//!
//! Abstracts that were read and what they support (paraphrased):
//! - A. Millán-Merino, E. Fernández-Tarrazo, M. Sánchez-Sanz, "Theoretical and numerical analysis of the
//!   evaporation of mono- and multicomponent single fuel droplets", J. Fluid Mech. 910 (2021) A11: the growing
//!   share of radiation explains why droplets of initial radius above about 0.25 mm depart from the d²-law in
//!   ambients near 800 K. The Nomura et al. droplets (radius ≈ 0.35 mm) are in that range; radiation is an
//!   option of the model (off by default) and is switched on for those cases with the estimate below.
//! - R.S. Miller, K. Harstad, J. Bellan, "Evaluation of equilibrium and non-equilibrium evaporation models for
//!   many-droplet gas–liquid flow simulations", Int. J. Multiphase Flow 24 (1998) 1025–1055: their model
//!   comparisons use single-component droplets (benzene, decane, heptane, hexane, water) of about 1 mm in
//!   convective air flows (abstract); the decane case is, from memory, the Wong & Lin experiment used below.
//! - V. Ebrahimian, C. Habchi, "Towards a predictive evaporation model for multi-component hydrocarbon
//!   droplets at all pressure conditions", Int. J. Heat Mass Transfer 54 (2011) 3552–3565: cites accurate
//!   data of Chauveau et al. at atmospheric pressure, 473–973 K for n-heptane and 548–623 K for n-decane,
//!   droplets of 400 µm, including microgravity (abstract). No evaporation constants are given in the abstract,
//!   so those data are not used here.
//!
//! Not included: Daïf et al. (1999), n-heptane/n-decane bicomponent droplets in a ≈ 348 K, ≈ 3 m/s air stream
//! (conditions from memory): no published number could be retrieved or recalled with any confidence.
//!
//! # Physics of the rigs beyond a free droplet (all of it speeds the experimental droplets up)
//!
//! The first two estimates below were written down before the model had these heat paths; the Nomura cases
//! now run with exactly these values (`nomura_rig`), not with values adjusted to the references. The first
//! rig run gave 0.380 mm²/s at 741 K (reference 0.60, recalled) and 0.140 mm²/s at 471 K (reference 0.20);
//! the free droplet gives 0.230 and 0.098.
//!
//! - Heat conducted along the suspending fibre or thermocouple. Rough estimate made here for a 0.15 mm quartz
//!   fibre treated as an infinite fin (h ≈ 170 W/(m²·K), k ≈ 1.4 W/(m·K)): ≈ 4.5e-5 W/K × (T∞ − T_d), i.e.
//!   about +50 % (471 K) to +65 % (741 K) of the gas-side heat flux for a 0.7 mm n-heptane droplet.
//! - Radiation from the furnace walls. Estimate made here, absorption efficiency ≈ 0.6, black walls at T∞:
//!   ≈ +16 % (471 K) and ≈ +55 % (741 K) of the gas-side heat flux for the same droplet.
//! - Temperature gradients inside large droplets (our liquid is well mixed; a thermocouple in the droplet
//!   reads a local value).
//!
//! # Independent check of the film equations for these conditions (computed here)
//!
//! The quiescent quasi-steady K from the same A&S/one-third-rule equations evaluated in a separate short
//! script with CoolProp 8.0 properties (vapour pressure, latent heat, liquid density, vapour and N2/air
//! cp, k, μ) and Fuller diffusion: 0.099 mm²/s (n-heptane, N2, 0.1 MPa, 471 K; T_s 324.6 K) and 0.231 mm²/s
//! (741 K; T_s 339.2 K); n-decane in air at 1000 K: T_s 413.2 K. The model gives 0.098 / 0.230 mm²/s and
//! 411.6 K (with Re ≈ 25), so the film model and its property data agree with that independent evaluation;
//! a gap to the experiments is a modelling (or reference-value) question, not an arithmetic one.

use super::CheckResult;
use crate::data::Library;
use crate::fuel::{Basis, Fuel};
use crate::model::droplet::{HistoryRow, Recorder};
use crate::model::{simulate, DropletInputs, Motion};
use crate::model::film::{ExtraHeat, Radiation, SupportFibre};
use crate::props::gas::AmbientGas;

/// Group name of these checks in the validation report.
pub const GROUP: &str = "droplet experiments";

/// What is compared with the experiment.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Quantity {
    /// Evaporation constant K = −d(d²)/dt from a least-squares line through d²(t) while (d/d0)² falls from
    /// `upper` to `lower` (the quasi-linear part after heat-up) [m²/s]; relative tolerance.
    EvaporationConstant {
        /// Start of the fit window in (d/d0)² [-].
        upper: f64,
        /// End of the fit window in (d/d0)² [-].
        lower: f64,
    },
    /// Droplet temperature when (d/d0)² has fallen to `at_d2_ratio` (the quasi-steady plateau) [K];
    /// absolute tolerance in K.
    PlateauTemperature {
        /// (d/d0)² at which the temperature is read [-].
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
    /// Ambient temperature [K].
    pub ambient_temperature: f64,
    /// Ambient pressure [Pa].
    pub pressure: f64,
    /// Initial diameter [m].
    pub initial_diameter: f64,
    /// Initial droplet temperature [K].
    pub initial_temperature: f64,
    /// Constant gas velocity relative to the (suspended) droplet [m/s].
    pub velocity: f64,
    /// Compared quantity.
    pub quantity: Quantity,
    /// Published value: K in m²/s, or a temperature in K.
    pub reference: f64,
    /// Tolerance: relative (fraction) for K, absolute in K for temperatures.
    pub tolerance: f64,
    /// Full citation, with "from memory" where the value was not confirmed.
    pub source: &'static str,
    /// Where the tolerance comes from.
    pub tolerance_basis: &'static str,
    /// Heat paths of the experimental rig besides the gas film (fibre, furnace radiation), as estimated in the
    /// module docs before the model had these terms; `ExtraHeat::default()` = a free droplet.
    pub rig: ExtraHeat,
    /// Short description of `rig` for the check name.
    pub rig_label: &'static str,
}

/// The Nomura et al. rig as estimated in the module docs: one 0.15 mm fused-silica fibre stem
/// (k ≈ 1.4 W/(m·K), Incropera & DeWitt Table A.3, from memory) and black furnace walls at the gas
/// temperature seen by a droplet of absorption efficiency ≈ 0.6 (estimate, see the module docs).
fn nomura_rig(t_wall: f64) -> ExtraHeat {
    ExtraHeat {
        radiation: Some(Radiation { temperature: Some(t_wall), absorption_efficiency: 0.6 }),
        fibre: Some(SupportFibre { diameter: 0.15e-3, conductivity: 1.4, stems: 1 }),
    }
}

const NOMURA: &str = "H. Nomura, Y. Ujiie, H.J. Rath, J. Sato, M. Kono, Experimental study on high-pressure droplet \
evaporation using microgravity conditions, Proc. Combust. Inst. 26 (1996) 1267–1273 (citation and value from memory, \
not confirmed; n-heptane in N2, fibre-suspended, microgravity)";

const WONG_LIN: &str = "S.-C. Wong, A.-C. Lin, Internal temperature distributions of droplets vaporizing in \
high-temperature convective flows, J. Fluid Mech. 237 (1992) 671–687 (citation, conditions and value from memory, \
not confirmed; n-decane suspended in a hot air stream, temperature measured inside the droplet)";

/// The experiment cases, with reference values fixed before the model was run on them.
pub fn cases() -> Vec<ExperimentCase> {
    vec![
        // Nomura et al. 1996: 0.1 MPa series (471, 555, 648, 741 K, from memory), d0 ≈ 0.6–0.8 mm (from memory),
        // quiescent N2 in microgravity; K from the linear part of the d² history.
        ExperimentCase {
            label: "Nomura et al. 1996, n-heptane in N2, 0.1 MPa, 741 K, d0 0.70 mm, microgravity",
            fuel: &[("n-heptane", 1.0)],
            gas: "n2",
            ambient_temperature: 741.0,
            pressure: 0.1e6,
            initial_diameter: 0.70e-3,
            initial_temperature: 300.0,
            velocity: 0.0,
            quantity: Quantity::EvaporationConstant { upper: 0.6, lower: 0.2 },
            reference: 0.60e-6,
            tolerance: 0.35,
            source: NOMURA,
            tolerance_basis: "≈25 % film model vs experiment, combined with ≈20 % for a recalled value",
            rig: nomura_rig(741.0),
            rig_label: "with fibre conduction and furnace radiation",
        },
        ExperimentCase {
            label: "Nomura et al. 1996, n-heptane in N2, 0.1 MPa, 471 K, d0 0.70 mm, microgravity",
            fuel: &[("n-heptane", 1.0)],
            gas: "n2",
            ambient_temperature: 471.0,
            pressure: 0.1e6,
            initial_diameter: 0.70e-3,
            initial_temperature: 300.0,
            velocity: 0.0,
            quantity: Quantity::EvaporationConstant { upper: 0.6, lower: 0.2 },
            reference: 0.20e-6,
            tolerance: 0.40,
            source: NOMURA,
            tolerance_basis: "≈25 % film model vs experiment, combined with ≈30 % for a recalled value",
            rig: nomura_rig(471.0),
            rig_label: "with fibre conduction and furnace radiation",
        },
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
            rig: ExtraHeat::default(),
            rig_label: "free droplet (rig heat paths not known)",
        },
    ]
}

/// Least-squares slope −d(d²)/dt over the rows with `lower` ≤ (d/d0)² ≤ `upper` [m²/s]; None with < 3 rows.
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

/// Droplet temperature at the first row where (d/d0)² ≤ `at_d2_ratio`, interpolated linearly in (d/d0)² [K].
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
        Quantity::EvaporationConstant { .. } => format!("{:.3} % relative", 100.0 * case.tolerance),
        Quantity::PlateauTemperature { .. } => format!("{} K", case.tolerance),
    };
    CheckResult { group: GROUP.into(), check: case.label.into(), source: case.source.into(), tolerance, achieved: reason, passed: false }
}

/// The model value of the compared quantity for one case (K in m²/s or T in K), with the history it came from.
pub fn model_value(case: &ExperimentCase, lib: &Library) -> Result<f64, String> {
    let mut comps = vec![];
    for (id, _) in case.fuel {
        comps.push(lib.component(id).ok_or_else(|| format!("component '{id}' is not in the library"))?.clone());
    }
    let fractions: Vec<f64> = case.fuel.iter().map(|(_, w)| *w).collect();
    let fuel = Fuel::from_fractions(case.label, comps, &fractions, Basis::Mass).map_err(|e| e.to_string())?;
    let gas = AmbientGas::parse(lib, case.gas).map_err(|e| e.to_string())?;
    let mut inp = DropletInputs::new(fuel, gas, case.ambient_temperature, case.pressure, case.initial_diameter, case.initial_temperature);
    inp.motion = Motion::Fixed { velocity: case.velocity };
    inp.extra_heat = case.rig;
    // tighter than the default so the recorded history is dense enough for the fit window
    inp.rtol = 1e-8;
    inp.max_time = 600.0;
    let mut rec = Recorder::default();
    let run = simulate(&inp, &mut rec).map_err(|e| format!("simulation failed: {e}"))?;
    match case.quantity {
        Quantity::EvaporationConstant { upper, lower } => {
            evaporation_constant(&run.history, upper, lower).ok_or_else(|| "fewer than 3 history rows in the fit window".to_string())
        }
        Quantity::PlateauTemperature { at_d2_ratio } => temperature_at(&run.history, at_d2_ratio).ok_or_else(|| format!("(d/d0)² never reached {at_d2_ratio}")),
    }
}

/// Run one case and compare with its reference value.
pub fn check_case(case: &ExperimentCase, lib: &Library) -> CheckResult {
    let value = match model_value(case, lib) {
        Ok(v) => v,
        Err(e) => return failed(case, e),
    };
    match case.quantity {
        Quantity::EvaporationConstant { upper, lower } => {
            let rel = (value - case.reference).abs() / case.reference;
            let mut r = CheckResult::relative(
                GROUP,
                format!(
                    "{}, {}: K = −d(d²)/dt for {upper} ≥ (d/d0)² ≥ {lower}: model {:.3} mm²/s vs reference {:.2} mm²/s (from memory)",
                    case.label,
                    case.rig_label,
                    value * 1e6,
                    case.reference * 1e6
                ),
                case.source,
                rel,
                case.tolerance,
            );
            r.tolerance = format!("{} ({})", r.tolerance, case.tolerance_basis);
            r.achieved = format!("{:.1} % ({})", 100.0 * rel, if value < case.reference { "model lower" } else { "model higher" });
            r
        }
        Quantity::PlateauTemperature { at_d2_ratio } => {
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
            r
        }
    }
}

/// Every experiment case, one result each (failed results carry the reason instead of panicking).
pub fn experiment_checks() -> Vec<CheckResult> {
    let lib = match Library::embedded() {
        Ok(l) => l,
        Err(e) => {
            return cases().iter().map(|c| failed(c, format!("component library failed to load: {e}"))).collect();
        }
    };
    cases().iter().map(|c| check_case(c, &lib)).collect()
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
    }
}
