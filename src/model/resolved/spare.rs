//! Spare buffers of the resolved liquid: the states and per-species vectors of finished steps are kept and
//! reused by the next ones, so that a step allocates nothing once a run has started.

use super::{Model, State, StepStart};

/// Largest number of spare states and vectors kept (a step attempt holds at most a few at a time).
const SPARE_LIMIT: usize = 8;

impl Model {
    /// A state of this model's dimensions with the time, mass, inventories, velocity, surface and regime of `s`;
    /// its cell profiles (`y`, `temp`) hold stale values the caller overwrites. Reuses a spare state.
    pub(super) fn state_like(&mut self, s: &State) -> State {
        let Some(mut t) = self.spare_states.pop() else { return s.clone() };
        t.time = s.time;
        t.mass = s.mass;
        t.evaporated.copy_from_slice(&s.evaporated);
        t.inventory.copy_from_slice(&s.inventory);
        t.velocity = s.velocity;
        t.surface_y.copy_from_slice(&s.surface_y);
        t.surface_t = s.surface_t;
        t.boiling = s.boiling;
        t.heat_inward = s.heat_inward;
        t
    }

    /// Keep `s` for reuse by a later step.
    pub(crate) fn recycle(&mut self, s: State) {
        if self.spare_states.len() < SPARE_LIMIT && s.y.len() == self.n * self.ny() && s.temp.len() == self.tgrid.len() {
            self.spare_states.push(s);
        }
    }

    /// A copy of `v` (one value per species) in a spare vector.
    pub(super) fn vector_copy(&mut self, v: &[f64]) -> Vec<f64> {
        spare_copy(&mut self.spare_vectors, v)
    }

    /// Keep the vectors of start data `st` for reuse.
    pub(super) fn recycle_start(&mut self, st: StepStart) {
        if self.spare_vectors.len() + 2 <= SPARE_LIMIT {
            self.spare_vectors.push(st.rates0);
            self.spare_vectors.push(st.surface_y);
        }
    }
}

/// A copy of `v` in a vector taken from `spare` (or a new one).
pub(super) fn spare_copy(spare: &mut Vec<Vec<f64>>, v: &[f64]) -> Vec<f64> {
    match spare.pop() {
        Some(mut w) => {
            w.clear();
            w.extend_from_slice(v);
            w
        }
        None => v.to_vec(),
    }
}
