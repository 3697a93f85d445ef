//! Step control of the resolved liquid: one step attempt (a full step against two half steps, Richardson
//! combination, error norm), regime changes located inside the step, and the step-size rules; shared by the run
//! driver (resolved.rs) and the stepping API.

use super::*;

/// Richardson combination 2·(two half steps `a`) − (one full step `b`) into `out` (every field written).
fn combine_into(a: &State, b: &State, out: &mut State) {
    let mix = |x: &[f64], y: &[f64], out: &mut [f64]| {
        for (o, (h, f)) in out.iter_mut().zip(x.iter().zip(y)) {
            *o = 2.0 * h - f;
        }
    };
    mix(&a.surface_y, &b.surface_y, &mut out.surface_y);
    out.surface_y.iter_mut().for_each(|v| *v = v.max(0.0));
    let s: f64 = out.surface_y.iter().sum();
    out.surface_y.iter_mut().for_each(|v| *v /= s);
    out.time = a.time;
    mix(&a.inventory, &b.inventory, &mut out.inventory);
    out.mass = out.inventory.iter().sum();
    mix(&a.y, &b.y, &mut out.y);
    mix(&a.temp, &b.temp, &mut out.temp);
    mix(&a.evaporated, &b.evaporated, &mut out.evaporated);
    out.velocity = 2.0 * a.velocity - b.velocity;
    out.surface_t = 2.0 * a.surface_t - b.surface_t;
    out.boiling = a.boiling;
    out.heat_inward = 2.0 * a.heat_inward - b.heat_inward;
}

/// Scaled RMS difference between two solutions: mass relative to m0, temperatures over 1 K, mass fractions
/// over 0.01 (absolute scales times the step tolerance give the accepted local error).
fn error_norm(a: &State, b: &State, m0: f64) -> f64 {
    let mut acc = ((a.mass - b.mass) / (1e-2 * m0)).powi(2);
    let mut count = 1.0;
    acc += (a.surface_t - b.surface_t).powi(2);
    count += 1.0;
    for (x, y) in a.temp.iter().zip(&b.temp) {
        acc += (x - y).powi(2) / a.temp.len() as f64;
    }
    count += 1.0;
    let mut ys = 0.0;
    for (x, y) in a.y.iter().zip(&b.y) {
        ys += ((x - y) / 1e-2).powi(2);
    }
    acc += ys / a.y.len() as f64;
    count += 1.0;
    let mut ss = 0.0;
    for (x, y) in a.surface_y.iter().zip(&b.surface_y) {
        ss += ((x - y) / 1e-2).powi(2);
    }
    acc += ss / a.surface_y.len() as f64;
    count += 1.0;
    (acc / count).sqrt()
}

/// Local-error tolerance of the step-doubling estimate for the user's relative tolerance `rtol`, scaled with its
/// square root.
pub(crate) fn step_tolerance(rtol: f64) -> f64 {
    3e-2 * (rtol / 1e-6).sqrt()
}

/// First step of a droplet of diameter `d0` \[m\] \[s\].
pub(crate) fn first_step(d0: f64) -> f64 {
    1e-3 * d0 * d0 / 1e-7
}

/// Next step size after an accepted step of size `dt` with error norm `err` \[s\].
pub(crate) fn grown_step(dt: f64, tol: f64, err: f64) -> f64 {
    dt * (0.9 * (tol / err.max(1e-300)).sqrt()).clamp(0.2, 4.0)
}

/// The outcome of one step attempt.
pub(crate) enum Attempt {
    /// Accepted: the new state (at `time + dt`), its error norm and the regime change at its end, if any.
    Accepted(State, f64, Option<RegimeSwitch>),
    /// Rejected: try again with the reduced `dt`.
    Retry,
    /// The step size fell to the round-off limit (reason).
    Failed(String),
}

/// The outcome of one candidate step of length `h` from `state` (start data `st`): the Richardson combination
/// of a full step and two half steps, and the step-doubling error norm; Err(reason, retry factor) when a step
/// failed or the combination is not physical. The surface of the combination is settled (`settle_surface`) when
/// `settle` is true or the error norm is within `tol`: a rejected candidate is not settled, so that the kept
/// surface solution stays the one of `state`, from which the retry starts.
fn candidate(model: &mut Model, state: &State, st: &StepStart, h: f64, m0: f64, tol: f64, settle: bool) -> Result<(State, f64), String> {
    let full = model.step(state, st, h)?;
    let mid = model.step(state, st, 0.5 * h)?;
    let mid_start = model.start(&mid)?;
    let half = model.step(&mid, &mid_start, 0.5 * h)?;
    model.recycle_start(mid_start);
    let err = error_norm(&half, &full, m0);
    let mut new = model.state_like(&half);
    combine_into(&half, &full, &mut new);
    model.recycle(full);
    model.recycle(mid);
    model.recycle(half);
    new.time = state.time + h;
    if !(new.mass > 0.0) || new.temp.iter().any(|v| !v.is_finite()) {
        return Err("non-physical Richardson combination".into());
    }
    if settle || err <= tol {
        model.settle_surface(&mut new);
    }
    Ok((new, err))
}

/// Length of the probe step that tells a boiling onset from a grazing contact, as a fraction of the step that
/// reached the bubble point.
const GRAZING_PROBE: f64 = 0.1;

/// Relative tolerance on the step length at which a regime change is located (event location).
const EVENT_TOLERANCE: f64 = 1e-4;

/// One attempt of a step `dt` from `state`: a full step and two half steps, Richardson-combined when their
/// difference is within `tol`; on rejection `dt` is reduced in place. A step across a regime change (the event
/// function of boiling.rs changing sign) is shortened to end just past the change, found by Brent's method on the
/// step length (numerics::root, as the well-mixed model locates its regime changes on its dense output); `dt` then
/// holds the shortened length. Counts into `stats`.
pub(crate) fn attempt_step(model: &mut Model, state: &State, dt: &mut f64, tol: f64, m0: f64, stats: &mut Stats) -> Attempt {
    let start = model.start(state);
    let outcome = match &start {
        Ok(st) => candidate(model, state, st, *dt, m0, tol, false),
        Err(e) => Err(e.clone()),
    };
    stats.rhs_calls = model.film_calls;
    let (mut new, mut err) = match outcome {
        Ok(x) => x,
        Err(e) => {
            stats.rejected += 1;
            *dt *= 0.25;
            if *dt < 1e-14 {
                return Attempt::Failed(e);
            }
            return Attempt::Retry;
        }
    };
    if err > tol {
        model.recycle(new);
        if let Ok(st) = start {
            model.recycle_start(st);
        }
        stats.rejected += 1;
        if *dt < 1e-14 {
            // the one-step and two-half-step surface states still differ as the step vanishes
            return Attempt::Failed(format!("the step-doubling error {err:.3e} does not shrink with the step"));
        }
        *dt *= (0.9 * (tol / err).sqrt()).clamp(0.1, 0.9);
        return Attempt::Retry;
    }
    // a regime change at the step's end (heat margin gone while boiling, Σ X_s at the threshold while evaporating;
    // the evaporating event function needs a bubble-point search, so the cheap test comes first)
    let crossed = !model.fixed_temperature && if state.boiling { model.hold_margin(&new) <= 0.0 } else { model.surface_sum(&new) >= BOILING_THRESHOLD };
    let event_end = if crossed { model.regime_event(state.boiling, &new) } else { None };
    if let (Some(g_b), Ok(st)) = (event_end, &start) {
        let g_a = model.regime_event(state.boiling, state).unwrap_or(0.0);
        if g_a > 0.0 && g_b <= 0.0 {
            // the step crossed a regime change: shorten it to end just past the change
            let mut past = (*dt, None);
            let tolerance = crate::numerics::root::Tolerance::relative(EVENT_TOLERANCE).with_max_iterations(40);
            let _ = crate::numerics::root::brent_from(
                |h| match candidate(model, state, st, h, m0, tol, true) {
                    Ok((c, e)) => {
                        let g = model.regime_event(state.boiling, &c).unwrap_or(f64::NAN);
                        if g <= 0.0 && h < past.0 {
                            past = (h, Some((c, e)));
                        }
                        g
                    }
                    Err(_) => f64::NAN,
                },
                (0.0, g_a),
                (*dt, g_b),
                tolerance,
            );
            if let (h, Some((c, e))) = past {
                *dt = h;
                new = c;
                err = e;
            }
        }
    }
    // (no change possible unless the step crossed: the end state keeps its regime)
    let grazing = crossed && !state.boiling && model.onset_due(&new) && !model.boiling_holds(&new, GRAZING_PROBE * *dt);
    let switch = if grazing || !crossed { None } else { model.update_regime(&mut new) };
    if switch.is_some() {
        // the surface of the state at the change solved for the new regime
        model.settle_surface(&mut new);
    }
    if let Ok(st) = start {
        model.recycle_start(st);
    }
    stats.steps += 1;
    stats.rhs_calls = model.film_calls;
    Attempt::Accepted(new, err, switch)
}

/// Time inside the step from `a` to `b` (remaining fractions `rem_a` > `level` ≥ `rem_b`) where the remaining
/// fraction crosses `level`, by linear interpolation \[s\].
pub(crate) fn crossing_time(a_time: f64, dt: f64, rem_a: f64, rem_b: f64, level: f64) -> f64 {
    a_time + dt * (rem_a - level) / (rem_a - rem_b)
}
