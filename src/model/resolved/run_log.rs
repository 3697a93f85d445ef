//! Bookkeeping of a resolved run between steps (crossings, regime changes, kept profiles) and the run
//! summary at its final state.

use super::*;

/// Bookkeeping of a resolved run between steps.
pub(super) struct RunLog {
    pub(super) watch: RunWatch,
    pub(super) crossing: [Option<f64>; 3],
    pub(super) status: Status,
    pub(super) lifetime: Option<f64>,
    pub(super) profiles: Vec<Profile>,
    pub(super) next_profile: usize,
    pub(super) boiling_onset: Option<f64>,
    pub(super) boiling_entries: usize,
    pub(super) boiling_exits: usize,
    pub(super) notes: Vec<String>,
}

impl RunLog {
    /// Count a regime change at `time` and note the first onset and exit.
    pub(super) fn regime_changed(&mut self, switch: RegimeSwitch, time: f64) {
        match switch {
            RegimeSwitch::Onset { hold_temperature } => {
                self.boiling_entries += 1;
                if self.boiling_onset.is_none() {
                    self.boiling_onset = Some(time);
                    self.notes.push(format!(
                        "surface reached the bubble point of the surface liquid (held at {hold_temperature:.2} K, where Σ X_s = {BOILING_THRESHOLD}) at t = {time:.4e} s: heat-limited boiling regime while the net heat holds it there"
                    ));
                }
            }
            RegimeSwitch::Exit { temperature } => {
                self.boiling_exits += 1;
                if self.boiling_exits == 1 {
                    self.notes.push(format!(
                        "at t = {time:.4e} s the net heat into the surface no longer holds it at the bubble point ({temperature:.2} K): it leaves the boiling regime and evaporates below it"
                    ));
                }
            }
        }
    }

    /// Keep the profiles of every level the evaporated fraction has passed.
    pub(super) fn keep_profiles(&mut self, model: &mut Model, state: &State, m0: f64) {
        while self.next_profile < PROFILE_LEVELS.len() && PROFILE_LEVELS[self.next_profile] <= 1.0 - state.mass / m0 {
            self.profiles.push(model.profile(state, m0));
            self.next_profile += 1;
        }
    }
}

/// The run summary at the final state: notes, mass balance, crossings, final composition.
#[allow(clippy::too_many_arguments)]
pub(super) fn resolved_outcome(inp: &DropletInputs, model: &mut Model, state: &State, m0: f64, status: Status, log: &mut RunLog, stats: Stats) -> RunOutcome {
    let n = inp.fuel.len();
    let w0 = &inp.fuel.mass_fractions;
    let mut notes = std::mem::take(&mut log.notes);
    if log.boiling_entries > 1 || log.boiling_exits > 1 {
        notes.push(format!("the droplet entered the boiling regime {} time(s) and left it {} time(s)", log.boiling_entries, log.boiling_exits));
    }
    log.watch.push_notes(&model.comps, inp.correlation, &mut notes);
    if status == Status::TimeLimit {
        notes.push(format!("time limit {:.4e} s reached with {:.2} % of the mass evaporated", inp.max_time, 100.0 * (1.0 - state.mass / m0)));
    }
    let mut mass_err: f64 = 0.0;
    model.mean_composition(state);
    for i in 0..n {
        let initial = m0 * w0[i];
        if initial > 0.0 {
            mass_err = mass_err.max((state.inventory[i] + state.evaporated[i] - initial).abs() / initial);
        }
    }
    RunOutcome {
        status,
        lifetime: log.lifetime,
        t10: log.crossing[0],
        t50: log.crossing[1],
        t90: log.crossing[2],
        heatup_end: log.watch.heatup_end,
        max_surface_temperature: log.watch.max_surface_temperature,
        boiling_onset: log.boiling_onset,
        end_time: state.time,
        final_evaporated_fraction: 1.0 - state.mass / m0,
        regime_notes: notes,
        stats,
        mass_balance_error: mass_err,
        evaporated_mass: state.evaporated.clone(),
        final_liquid_mass_fractions: model.w_mean.clone(),
    }
}
