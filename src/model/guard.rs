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

    /// Accepted steps per kept row (1 until the history is first thinned).
    pub fn stride(&self) -> usize {
        self.stride
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

/// Most requested history times a run accepts (each becomes a full row held in memory).
pub const MAX_HISTORY_TIMES: usize = 100_000;

/// Check requested history times (see [`Observer::history_times`]): finite, ≥ 0, strictly ascending, at most
/// [`MAX_HISTORY_TIMES`]; the error names the option `history-times`.
pub fn check_history_times(times: &[f64]) -> Result<(), super::ModelError> {
    let bad = |value: String, reason: &str| Err(super::ModelError::Input { field: "history-times", value, reason: reason.into() });
    if times.len() > MAX_HISTORY_TIMES {
        return bad(format!("{} times", times.len()), &format!("at most {MAX_HISTORY_TIMES} times (each is a full history row)"));
    }
    for (k, t) in times.iter().enumerate() {
        if !t.is_finite() || *t < 0.0 {
            return bad(if t.is_finite() { format!("{t:.6e} s") } else { "a non-finite time".into() }, "times must be finite and not negative");
        }
        if k > 0 && *t <= times[k - 1] {
            return bad(format!("{:.6e} s after {:.6e} s", t, times[k - 1]), "times must be strictly ascending");
        }
    }
    Ok(())
}

/// Why a `history-times` text was refused; [`HistoryTimesError::detail`] is the message after the field name.
#[derive(Debug, Clone, PartialEq)]
pub enum HistoryTimesError {
    /// The text's form: (the text, the reason).
    Form(String, String),
    /// A time that does not parse (the unit parser's message names the value).
    Time(String),
    /// The times parsed but are not usable (see [`check_history_times`]): (value, reason).
    Times(String, String),
}

impl HistoryTimesError {
    /// The message after the field name: `'TEXT': reason`, the unit parser's message, or `= VALUE: reason`.
    pub fn detail(&self) -> String {
        match self {
            HistoryTimesError::Form(text, reason) => format!("'{text}': {reason}"),
            HistoryTimesError::Time(message) => message.clone(),
            HistoryTimesError::Times(value, reason) => format!("= {value}: {reason}"),
        }
    }
}

/// Requested history times from their text, as `--history-times` and a sweep spec's `[output] history-times`
/// take it: `START:STEP:END` (every STEP from START up to END inclusive) or a comma list `T1,T2,...`, each a time
/// with its unit (`ms`, `us`, `s`); checked like [`check_history_times`]. The grid is counted before it is
/// built, so a tiny step is refused instead of allocating gigabytes.
pub fn parse_history_times(text: &str) -> Result<Vec<f64>, HistoryTimesError> {
    let form = |reason: String| HistoryTimesError::Form(text.trim().to_string(), reason);
    let time = |part: &str| crate::units::parse(part, crate::units::Quantity::Time).map_err(|e| HistoryTimesError::Time(e.to_string()));
    let parts: Vec<&str> = text.split(':').collect();
    let times = if parts.len() == 3 && !text.contains(',') {
        let (start, step, end) = (time(parts[0])?, time(parts[1])?, time(parts[2])?);
        if step <= 0.0 {
            return Err(form("the step (START:STEP:END) must be positive".into()));
        }
        if start < 0.0 || end < start {
            return Err(form("START:STEP:END needs 0 ≤ START ≤ END".into()));
        }
        // the end is included within rounding
        let count = ((end - start) / step * (1.0 + 1e-12)).floor() + 1.0;
        if !(count <= MAX_HISTORY_TIMES as f64) {
            return Err(form(format!("gives {count:.3e} times; at most {MAX_HISTORY_TIMES} (a full row each)")));
        }
        // START + k·STEP rounded to 12 significant digits: 0:0.25ms:20ms gives 0.01475, not 0.014750000000000001
        (0..count as usize).map(|k| round_significant(start + k as f64 * step)).collect()
    } else if parts.len() == 1 {
        let items: Vec<&str> = text.split(',').collect();
        if items.len() > MAX_HISTORY_TIMES {
            return Err(form(format!("{} times; at most {MAX_HISTORY_TIMES} (a full row each)", items.len())));
        }
        items.iter().map(|p| time(p)).collect::<Result<Vec<f64>, _>>()?
    } else {
        return Err(form("give START:STEP:END (e.g. 0:0.1ms:20ms) or a comma list (e.g. 1ms,2ms,5ms)".into()));
    };
    check_times(&times)?;
    Ok(times)
}

/// [`check_history_times`] with its refusal as a [`HistoryTimesError`].
pub fn check_times(times: &[f64]) -> Result<(), HistoryTimesError> {
    check_history_times(times).map_err(|e| match e {
        super::ModelError::Input { value, reason, .. } => HistoryTimesError::Times(value, reason),
        other => HistoryTimesError::Times(String::new(), other.to_string()),
    })
}

/// `x` rounded to 12 significant digits (a decimal grid point computed in binary floating point).
fn round_significant(x: f64) -> f64 {
    format!("{x:.11e}").parse().unwrap_or(x)
}

/// An observer that asks for history rows at the given times only (plus the first row, regime changes and the
/// final row) and keeps none itself: the run's [`super::RunResult`] holds them.
#[derive(Debug, Default, Clone)]
pub struct RowsAt {
    /// Requested times \[s\], ascending.
    pub times: Vec<f64>,
}

impl Observer for RowsAt {
    fn history_times(&self) -> &[f64] {
        &self.times
    }
}

/// An observer with requested history times that keeps no rows: the summary of a run as it is with those times
/// (the resolved liquid lands its steps on them) without building its history, e.g. for a sweep case whose
/// history is not written.
#[derive(Debug, Default, Clone)]
pub struct TimesWithoutRows {
    /// Requested times \[s\], ascending.
    pub times: Vec<f64>,
}

impl Observer for TimesWithoutRows {
    fn wants_rows(&self) -> bool {
        false
    }
    fn history_times(&self) -> &[f64] {
        &self.times
    }
}

/// What a history row of a run driver stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum RowKind {
    /// An ordinary accepted step.
    Step,
    /// The first row, a regime change or the final row: kept in every mode.
    Event,
    /// A row at a requested time.
    Sample,
}

/// The history of a run driver: every accepted step (thinned past [`MAX_HISTORY_ROWS`]), or rows at requested
/// times (dense output or exact landing) plus the event rows, in time order.
#[derive(Debug)]
pub(crate) enum RunRows<T> {
    /// A row at every accepted step.
    Steps(ThinnedHistory<T>),
    /// Rows at requested times: `times[next..]` are still due.
    AtTimes {
        /// Requested times \[s\], ascending.
        times: Vec<f64>,
        /// First time still due.
        next: usize,
        /// Rows so far.
        rows: Vec<T>,
    },
}

impl<T> RunRows<T> {
    /// Rows at every step when `times` is empty, else at `times` (a time 0 is served by the first row).
    pub(crate) fn new(times: &[f64]) -> Self {
        if times.is_empty() {
            return RunRows::Steps(ThinnedHistory::new());
        }
        let next = times.iter().take_while(|t| **t <= 0.0).count();
        RunRows::AtTimes { times: times.to_vec(), next, rows: vec![] }
    }

    /// True when rows are taken at requested times.
    pub(crate) fn sampling(&self) -> bool {
        matches!(self, RunRows::AtTimes { .. })
    }

    /// The next requested time still due.
    pub(crate) fn peek(&self) -> Option<f64> {
        match self {
            RunRows::Steps(_) => None,
            RunRows::AtTimes { times, next, .. } => times.get(*next).copied(),
        }
    }

    /// Take the next requested time if it is before `upto` (or at it, with `inclusive`).
    pub(crate) fn take_due(&mut self, upto: f64, inclusive: bool) -> Option<f64> {
        let t = self.peek()?;
        if t < upto || (inclusive && t == upto) {
            if let RunRows::AtTimes { next, .. } = self {
                *next += 1;
            }
            return Some(t);
        }
        None
    }

    /// Offer a row of the given kind: every row goes in when stepping; at requested times the step rows are
    /// left out.
    pub(crate) fn push(&mut self, row: T, kind: RowKind) {
        match self {
            RunRows::Steps(h) => h.push(row),
            RunRows::AtTimes { rows, .. } => {
                if kind != RowKind::Step {
                    rows.push(row);
                }
            }
        }
    }

    /// How the rows were taken.
    pub(crate) fn row_times(&self) -> super::history::RowTimes {
        match self {
            RunRows::Steps(h) => super::history::RowTimes::Steps { stride: h.stride() },
            RunRows::AtTimes { times, .. } => super::history::RowTimes::Requested(times.clone()),
        }
    }

    /// The rows kept, in time order.
    pub(crate) fn into_rows(self) -> Vec<T> {
        match self {
            RunRows::Steps(h) => h.into_rows(),
            RunRows::AtTimes { rows, .. } => rows,
        }
    }
}

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
        // rows 0, 8, 16, … (the stride doubled three times) and the last one
        assert_eq!(h.stride(), 8);
        let rows = h.into_rows();
        assert!(rows.len() <= MAX_HISTORY_ROWS + 1, "{}", rows.len());
        assert!(rows.len() >= MAX_HISTORY_ROWS / 2);
        assert_eq!(rows[0], 0.0);
        assert_eq!(*rows.last().unwrap(), (n - 1) as f64);
        assert!(rows.windows(2).all(|w| w[1] > w[0]));
        // the run's rows say so
        use super::super::history::RowTimes;
        let mut r = RunRows::new(&[]);
        for k in 0..n {
            r.push(row(k as f64), RowKind::Step);
        }
        assert_eq!(r.row_times(), RowTimes::Steps { stride: 8 });
        assert_eq!(RunRows::<f64>::new(&[]).row_times(), RowTimes::Steps { stride: 1 });
        assert_eq!(RunRows::<f64>::new(&[1e-3, 2e-3]).row_times(), RowTimes::Requested(vec![1e-3, 2e-3]));
        // a short run keeps every row
        let mut h = ThinnedHistory::new();
        for k in 0..100 {
            h.push(row(k as f64));
        }
        assert_eq!(h.into_rows().len(), 100);
    }

    #[test]
    fn requested_times_are_checked_and_taken_in_order() {
        assert!(check_history_times(&[0.0, 1e-3, 2e-3]).is_ok());
        assert!(check_history_times(&[]).is_ok());
        for bad in [vec![-1e-3], vec![2e-3, 1e-3], vec![1e-3, 1e-3], vec![f64::NAN], vec![f64::INFINITY]] {
            let e = check_history_times(&bad).unwrap_err().to_string();
            assert!(e.starts_with("history-times = "), "{e}");
            assert!(!e.contains("NaN") && !e.contains("inf"), "{e}");
        }
        let many: Vec<f64> = (0..=MAX_HISTORY_TIMES).map(|k| k as f64).collect();
        assert!(check_history_times(&many).unwrap_err().to_string().contains("at most 100000"));
        // time 0 is served by the first row; due times are taken once, in order, up to a bound
        let mut r: RunRows<f64> = RunRows::new(&[0.0, 1.0, 2.0, 3.0]);
        assert!(r.sampling());
        assert_eq!(r.peek(), Some(1.0));
        assert_eq!(r.take_due(2.0, false), Some(1.0));
        assert_eq!(r.take_due(2.0, false), None);
        assert_eq!(r.take_due(2.0, true), Some(2.0));
        r.push(0.5, RowKind::Step);
        r.push(2.5, RowKind::Event);
        r.push(3.0, RowKind::Sample);
        assert_eq!(r.into_rows(), vec![2.5, 3.0]);
        // without times every row goes in
        let mut r: RunRows<f64> = RunRows::new(&[]);
        assert!(!r.sampling() && r.take_due(1.0, true).is_none());
        r.push(0.5, RowKind::Step);
        r.push(1.0, RowKind::Event);
        assert_eq!(r.into_rows(), vec![0.5, 1.0]);
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
