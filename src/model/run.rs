//! `simulate`: one droplet run with the liquid model its inputs choose (well-mixed or radially resolved), with
//! the notes every run gets (Langmuir–Knudsen comparison, UNIFAC range).

use crate::props::activity::ActivityModel;

use super::history::{NoHistory, Observer, RunResult};
use super::inputs::{check_inputs, DropletInputs};
use super::ModelError;

/// Run one droplet with the liquid model `inp.liquid` chooses (well-mixed or radially resolved) and return its
/// outcome, history and profiles; `observer` sees every accepted step.
pub fn simulate(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    check_inputs(inp)?;
    super::guard::check_history_times(observer.history_times())?;
    if inp.liquid.non_equilibrium {
        // Run the equilibrium case as well and say when the Langmuir–Knudsen correction matters (> 1 % lifetime).
        let mut eq = inp.clone();
        eq.liquid.non_equilibrium = false;
        let reference = simulate(&eq, &mut NoHistory)?;
        let mut res = activity_note(inp, simulate_model(inp, observer)?);
        if let (Some(a), Some(b)) = (res.outcome.lifetime, reference.outcome.lifetime) {
            let change = a / b - 1.0;
            let note = format!("non-equilibrium (Langmuir–Knudsen) surface changes the lifetime by {:+.2} % against the equilibrium surface", 100.0 * change);
            if change.abs() > 0.01 {
                res.outcome.regime_notes.push(note);
            } else {
                res.outcome.regime_notes.push(format!("{note} (below 1 %: negligible at this condition)"));
            }
        }
        return Ok(res);
    }
    simulate_model(inp, observer).map(|r| activity_note(inp, r))
}

/// With UNIFAC, say when the surface got hotter than the parameters' regression range (docs/property-methods.md).
fn activity_note(inp: &DropletInputs, mut res: RunResult) -> RunResult {
    let t_max = res.outcome.max_surface_temperature;
    if inp.liquid.activity == ActivityModel::Unifac && t_max > crate::props::activity::UNIFAC_UPPER_TEMPERATURE {
        res.outcome.regime_notes.push(format!(
            "surface temperature reached {t_max:.1} K, above the about {:.0} K up to which the original-UNIFAC parameters were fitted: activity coefficients are extrapolated there",
            crate::props::activity::UNIFAC_UPPER_TEMPERATURE
        ));
    }
    res
}

/// The run of the chosen liquid model, without the notes `simulate` adds.
fn simulate_model(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    let run_inputs = super::inputs::with_kernels(inp);
    let inp = run_inputs.as_ref().unwrap_or(inp);
    if inp.liquid.is_resolved() {
        super::resolved::simulate_resolved(inp, observer)
    } else {
        super::well_mixed::simulate_well_mixed(inp, observer)
    }
}
