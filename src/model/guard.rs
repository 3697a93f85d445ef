//! Run-driver guards that keep a run's cost bounded whatever the inputs: a history that thins itself past a
//! fixed number of rows (memory), and a stagnation check that stops a run whose step size is held so small
//! that it could not reach its end within the step limit (time). Both are deterministic (they depend on step
//! counts and simulated time only, never on the clock), so results stay byte-identical across machines.

use super::history::Observer;

/// Most history rows a run keeps; past this every other row is dropped and only every 2nd, 4th, … step is kept.
pub const MAX_HISTORY_ROWS: usize = 20_000;

/// A run history of at most [`MAX_HISTORY_ROWS`] rows (plus the last row): the first row, rows at a regular
/// step stride that doubles each time the limit is reached, and always the final row.
#[derive(Debug)]
pub struct ThinnedHistory<T> {
    rows: Vec<T>,
    stride: usize,
    count: usize,
    last: Option<T>,
}

impl<T> Default for ThinnedHistory<T> {
    fn default() -> Self {
        Self::new()
    }
}

impl<T> ThinnedHistory<T> {
    /// An empty history.
    pub fn new() -> Self {
        ThinnedHistory { rows: vec![], stride: 1, count: 0, last: None }
    }

    /// Offer the row of one accepted step.
    pub fn push(&mut self, row: T) {
        let k = self.count;
        self.count += 1;
        if !k.is_multiple_of(self.stride) {
            self.last = Some(row);
            return;
        }
        self.last = None;
        self.rows.push(row);
        if self.rows.len() >= MAX_HISTORY_ROWS {
            // keep the rows at even positions: the steps at multiples of twice the stride
            let mut i = 0;
            self.rows.retain(|_| {
                let keep = i % 2 == 0;
                i += 1;
                keep
            });
            self.stride *= 2;
        }
    }

    /// The rows kept, the final one included.
    pub fn into_rows(mut self) -> Vec<T> {
        if let Some(last) = self.last.take() {
            self.rows.push(last);
        }
        self.rows
    }
}

/// An observer that asks the model for full history rows and keeps none itself (the run's [`super::RunResult`]
/// holds the bounded history): for callers that write history.csv from the result.
#[derive(Debug, Default)]
pub struct RowsOnly;

impl Observer for RowsOnly {}

/// Steps after which a run is checked for stagnation (a healthy run takes a few thousand at most).
pub const STAGNATION_CHECK_STEPS: u64 = 100_000;

/// Watches a run for stagnation: checked every 10 000 steps past [`STAGNATION_CHECK_STEPS`], it projects the
/// steps still needed from the last 10 000 steps (their mean step size, and their evaporation rate, or the
/// mean rate since the start if that is faster) and stops a run that would need more than its step limit.
#[derive(Debug, Default, Clone, Copy)]
pub struct StagnationGuard {
    last: Option<(u64, f64, f64)>,
}

impl StagnationGuard {
    /// Why a run that has taken `steps` steps to reach `time` \[s\] (with `evaporated` of its mass gone) should
    /// stop: it could not reach `max_time` or the end of evaporation, whichever comes first, within
    /// `step_limit` steps at its present pace. None: go on.
    pub fn check(&mut self, steps: u64, time: f64, max_time: f64, evaporated: f64, step_limit: u64) -> Option<String> {
        if steps < STAGNATION_CHECK_STEPS.saturating_sub(10_000) || !steps.is_multiple_of(10_000) || time.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
            return None;
        }
        let evaporated = evaporated.clamp(0.0, 1.0);
        let (s0, t0, e0) = self.last.replace((steps, time, evaporated))?;
        if steps < STAGNATION_CHECK_STEPS || steps <= s0 || time <= t0 {
            return None;
        }
        let step_size = (time - t0) / (steps - s0) as f64;
        let rate = ((evaporated - e0) / (time - t0)).max(evaporated / time);
        let end_of_evaporation = if rate > 0.0 { time + (1.0 - evaporated) / rate } else { f64::INFINITY };
        let target = max_time.min(end_of_evaporation);
        let projected = steps as f64 + (target - time).max(0.0) / step_size;
        if projected <= step_limit as f64 {
            return None;
        }
        Some(format!(
            "the run stagnates: {steps} steps of about {step_size:.1e} s reached only {:.3} % of the mass evaporated; at this pace it would need some {:.0e} steps (limit {step_limit}) to reach {} (the step size is held down by the very fast temperature response of a very small or very cold droplet); give a shorter --max-time, a larger droplet or a warmer gas",
            100.0 * evaporated,
            projected,
            if target < max_time { format!("the end of evaporation (about {target:.3e} s)") } else { format!("max-time {max_time:.3e} s") }
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row(t: f64) -> f64 {
        t
    }

    #[test]
    fn history_stays_bounded_and_keeps_the_ends() {
        let mut h = ThinnedHistory::new();
        let n = 5 * MAX_HISTORY_ROWS + 3;
        for k in 0..n {
            h.push(row(k as f64));
        }
        let rows = h.into_rows();
        assert!(rows.len() <= MAX_HISTORY_ROWS + 1, "{}", rows.len());
        assert!(rows.len() >= MAX_HISTORY_ROWS / 2);
        assert_eq!(rows[0], 0.0);
        assert_eq!(*rows.last().unwrap(), (n - 1) as f64);
        assert!(rows.windows(2).all(|w| w[1] > w[0]));
        // a short run keeps every row
        let mut h = ThinnedHistory::new();
        for k in 0..100 {
            h.push(row(k as f64));
        }
        assert_eq!(h.into_rows().len(), 100);
    }

    #[test]
    fn stagnation_stops_only_hopeless_runs() {
        // steps of 1e-7 s with 0.6 % evaporated per 10 ms: millions of steps to go
        let mut g = StagnationGuard::default();
        assert_eq!(g.check(90_000, 0.009, 30.0, 0.0054, 2_000_000), None);
        assert!(g.check(100_000, 0.010, 30.0, 0.006, 2_000_000).unwrap().contains("stagnates"));
        // a slow but healthy run: 60 % evaporated, steps growing
        let mut g = StagnationGuard::default();
        assert_eq!(g.check(90_000, 0.009, 30.0, 0.5, 2_000_000), None);
        assert_eq!(g.check(100_000, 0.010, 30.0, 0.6, 2_000_000), None);
        // short runs are never checked
        let mut g = StagnationGuard::default();
        assert_eq!(g.check(5_000, 1e-9, 30.0, 0.0, 2_000_000), None);
        assert_eq!(g.check(10_000, 2e-9, 30.0, 0.0, 2_000_000), None);
    }
}
