//! The sampling run: a design (Monte Carlo or Latin hypercube) of standard draws per factor, one droplet run
//! per sample on a rayon pool, and the reduction to percentile bands and rank sensitivities.
//!
//! Determinism: the draws of sample i depend only on (seed, factor name, i) — and for a Latin hypercube on a
//! permutation per factor generated from (seed, factor name) before the runs start — so each sample's inputs
//! and results are the same whichever thread runs it; results are collected in sample order and every
//! statistic is computed afterwards on one thread.

use rayon::prelude::*;
use serde::Serialize;

use crate::model::droplet::Status;
use crate::model::{simulate, DropletInputs, HistoryRow, RunResult};
use crate::post::droplet::{residues_along_history, Layer};
use crate::post::residue_series::ResidueSeries;
use crate::post::{IndicatorOptions, PostError};

use super::factors::{perturbed_reusing, resolve, Factor, FactorKind, IndicatorInput, Spare};
use super::random::{counter_uniform, mix64, truncated_normal, Xoshiro256};
use super::spec::{property_keys, Distribution, UncertaintySpec};
use super::stats::{above_noise, percentile_sorted, rank_design, rank_r2_with, regression_samples, sorted_finite, spearman, RankDesign, Statistics, PERCENTILES};
use super::UncertaintyError;

/// How the standard draws are spread over the samples.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Method {
    /// Independent draws.
    MonteCarlo,
    /// One draw per equal-probability stratum of each factor, strata paired at random (McKay et al. 1979).
    LatinHypercube,
}

impl Method {
    /// Name as on the command line.
    pub fn as_str(self) -> &'static str {
        match self {
            Method::MonteCarlo => "monte-carlo",
            Method::LatinHypercube => "latin-hypercube",
        }
    }
}

/// Residue indicators that get bands: (indicator key, short label).
pub const RESIDUE_KEYS: [(&str, &str); 6] = [
    ("bubble_point_K", "bubble point"),
    ("t50_K", "T50"),
    ("flash_point_K", "flash point"),
    ("kinematic_viscosity_minus20C_m2_s", "viscosity at -20 °C"),
    ("density_15C_kg_m3", "density at 15 °C"),
    ("dcn", "DCN"),
];

/// Evaporated fraction at which the residue outputs of the sensitivity ranking are taken \[-\].
pub const RANKED_RESIDUE_FRACTION: f64 = 0.5;

/// Outputs ranked by sensitivity: (column name, description).
pub const RANKED_OUTPUTS: [(&str, &str); 3] = [
    ("lifetime_s", "droplet lifetime"),
    ("residue50_dcn", "DCN of the liquid left at 50 % evaporated"),
    ("residue50_flash_point_K", "flash point of the liquid left at 50 % evaporated"),
];

/// Largest number of samples of one run.
pub const MAX_SAMPLES: usize = 100_000;

/// Settings of a sampling run.
#[derive(Debug, Clone)]
pub struct Settings {
    /// Number of samples.
    pub samples: usize,
    /// Seed of every random stream.
    pub seed: u64,
    /// Sampling design.
    pub method: Method,
    /// Worker threads (0 = every core).
    pub threads: usize,
    /// Points of the common time grid.
    pub grid_points: usize,
    /// End of the time grid as a multiple of the deterministic lifetime \[-\].
    pub grid_extent: f64,
    /// Evaporated fractions of the residue bands \[-\].
    pub residue_fractions: Vec<f64>,
    /// Options of the residue indicators.
    pub indicator_options: IndicatorOptions,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            samples: 200,
            seed: 1,
            method: Method::MonteCarlo,
            threads: 0,
            grid_points: 401,
            grid_extent: 2.0,
            residue_fractions: crate::post::weathering::default_fractions(),
            indicator_options: IndicatorOptions::default(),
        }
    }
}

/// How one sample's droplet run ended.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum SampleStatus {
    /// Evaporated.
    Evaporated,
    /// Reached the time limit first.
    TimeLimit,
    /// The model refused the inputs or the integration failed (message).
    Failed(String),
}

impl SampleStatus {
    /// Text for tables.
    pub fn text(&self) -> String {
        match self {
            SampleStatus::Evaporated => "evaporated".into(),
            SampleStatus::TimeLimit => "time-limit".into(),
            SampleStatus::Failed(m) => format!("failed: {m}"),
        }
    }
}

/// Results of one droplet run (a sample or the deterministic run), reduced to what the bands need.
#[derive(Debug, Clone)]
pub struct SampleRecord {
    /// Standard draw of each factor.
    pub z: Vec<f64>,
    /// How the run ended.
    pub status: SampleStatus,
    /// Lifetime \[s\].
    pub lifetime: Option<f64>,
    /// Time at 50 % evaporated \[s\].
    pub t50: Option<f64>,
    /// Highest surface temperature \[K\].
    pub max_surface_temperature: Option<f64>,
    /// (d/d0)² on the time grid (0 after the droplet is gone) \[-\].
    pub d2: Vec<Option<f64>>,
    /// Surface temperature on the time grid (none after the droplet is gone) \[K\].
    pub surface_temperature: Vec<Option<f64>>,
    /// Residue indicators ([`RESIDUE_KEYS`]) at each residue fraction (SI).
    pub residue: Vec<[Option<f64>; 6]>,
}

impl SampleRecord {
    /// Value of a ranked output ([`RANKED_OUTPUTS`]) given the position of 50 % among the residue fractions.
    pub fn ranked_output(&self, k: usize, at50: Option<usize>) -> Option<f64> {
        match k {
            0 => self.lifetime,
            1 => at50.and_then(|j| self.residue.get(j)).and_then(|r| r[5]),
            _ => at50.and_then(|j| self.residue.get(j)).and_then(|r| r[2]),
        }
    }
}

/// Percentile bands of the droplet history on the common time grid.
#[derive(Debug, Clone, Serialize)]
pub struct HistoryBands {
    /// Grid times \[s\].
    pub time: Vec<f64>,
    /// Grid times over the deterministic lifetime \[-\].
    pub normalised_time: Vec<f64>,
    /// (d/d0)² percentiles 5/50/95 \[-\].
    pub d2: Vec<[Option<f64>; 3]>,
    /// Deterministic (d/d0)² \[-\].
    pub d2_deterministic: Vec<Option<f64>>,
    /// Surface-temperature percentiles 5/50/95 over the droplets still present, where at least half are \[K\].
    pub surface_temperature: Vec<[Option<f64>; 3]>,
    /// Deterministic surface temperature \[K\].
    pub surface_temperature_deterministic: Vec<Option<f64>>,
    /// Fraction of the successful samples whose droplet is still present \[-\].
    pub present_fraction: Vec<f64>,
}

/// Percentile bands of the residue indicators against evaporated fraction.
#[derive(Debug, Clone, Serialize)]
pub struct ResidueBands {
    /// Evaporated fractions \[-\].
    pub fractions: Vec<f64>,
    /// Per fraction, per indicator of [`RESIDUE_KEYS`]: percentiles 5/50/95 (SI).
    pub bands: Vec<[[Option<f64>; 3]; 6]>,
    /// Per fraction, per indicator: the deterministic value (SI).
    pub deterministic: Vec<[Option<f64>; 6]>,
    /// Per fraction, per indicator: samples with a value.
    pub counts: Vec<[usize; 6]>,
}

/// One input of the sensitivity ranking and its value in each sample.
#[derive(Debug, Clone)]
pub struct SensitivityInput {
    /// Name: a condition key, `composition:<group>` or `property:<property>`.
    pub name: String,
    /// `condition`, `composition` or `property-type`.
    pub kind: &'static str,
    /// Value per sample: the condition value (SI), the composition factor, or the mass-weighted mean z of the
    /// property over the components.
    pub values: Vec<f64>,
    /// The factors behind it (positions in the factor list): one, or every component's factor of a property type.
    pub members: Vec<usize>,
}

/// One line of the sensitivity ranking.
#[derive(Debug, Clone, Serialize)]
pub struct SensitivityRow {
    /// Ranked output (column name of [`RANKED_OUTPUTS`]).
    pub output: &'static str,
    /// 1 = strongest.
    pub rank: usize,
    /// Input name.
    pub input: String,
    /// Input kind.
    pub kind: &'static str,
    /// Spearman rank correlation of the input's value with the output (none when undefined).
    pub spearman: Option<f64>,
    /// Adjusted R² of the rank regression of the output on the input's member factors: the share of the
    /// output's rank variance they explain (the ranking key; none when undefined).
    pub r2: Option<f64>,
    /// Samples used.
    pub samples: usize,
    /// Factors behind the input (1, or the components of a property type).
    pub factors: usize,
    /// Whether the input stands out from sampling noise ([`super::stats::above_noise`]).
    pub above_noise: Option<bool>,
}

/// Everything a sampling run of one fuel produced.
#[derive(Debug, Clone)]
pub struct UncertaintyRun {
    /// Nominal inputs.
    pub nominal: DropletInputs,
    /// Settings used.
    pub settings: Settings,
    /// The uncertain inputs.
    pub factors: Vec<Factor>,
    /// Notices (spec entries that do nothing for this fuel, failures).
    pub notices: Vec<String>,
    /// The deterministic run.
    pub deterministic: SampleRecord,
    /// Time that normalises the grid: the deterministic lifetime, else its end time \[s\].
    pub reference_time: f64,
    /// Every sample, in sample order.
    pub samples: Vec<SampleRecord>,
    /// History bands.
    pub history: HistoryBands,
    /// Residue bands.
    pub residue: ResidueBands,
    /// Inputs of the ranking with their sampled values.
    pub sensitivity_inputs: Vec<SensitivityInput>,
    /// Rankings of every output in [`RANKED_OUTPUTS`], strongest first.
    pub sensitivity: Vec<SensitivityRow>,
    /// Statistics of the lifetime \[s\].
    pub lifetime: Statistics,
    /// Statistics of t50 \[s\].
    pub t50: Statistics,
    /// Statistics of the highest surface temperature \[K\].
    pub max_surface_temperature: Statistics,
    /// Statistics of each residue indicator at 50 % evaporated (when 50 % is one of the fractions).
    pub residue50: Option<[Statistics; 6]>,
}

/// Standard draws of every factor for every sample.
#[derive(Debug, Clone)]
pub struct Design {
    method: Method,
    seed: u64,
    samples: usize,
    permutations: Vec<Vec<u32>>,
}

const LHS_SALT: u64 = 0x4C48_5350_4552_4D55;

impl Design {
    /// Prepare the design (for a Latin hypercube: one permutation of the strata per factor).
    pub fn new(factors: &[Factor], settings: &Settings) -> Self {
        let permutations = match settings.method {
            Method::MonteCarlo => vec![],
            Method::LatinHypercube => factors.iter().map(|f| Xoshiro256::new(mix64(settings.seed ^ LHS_SALT) ^ f.stream).permutation(settings.samples)).collect(),
        };
        Design { method: settings.method, seed: settings.seed, samples: settings.samples, permutations }
    }

    /// Uniform draw in (0, 1) of factor `k` in sample `i`.
    pub fn uniform(&self, factors: &[Factor], k: usize, i: usize) -> f64 {
        let stream = factors[k].stream;
        match self.method {
            Method::MonteCarlo => counter_uniform(self.seed, stream, i as u64, 0),
            Method::LatinHypercube => {
                let stratum = f64::from(self.permutations[k][i]);
                let u = (stratum + counter_uniform(self.seed, stream, i as u64, 1)) / self.samples as f64;
                u.clamp(f64::MIN_POSITIVE, 1.0 - f64::EPSILON)
            }
        }
    }

    /// Standard draws z of every factor in sample `i` (normal and log-normal: truncated normal; uniform: −1..1).
    pub fn draws(&self, factors: &[Factor], i: usize) -> Vec<f64> {
        (0..factors.len())
            .map(|k| {
                let u = self.uniform(factors, k, i);
                match factors[k].distribution {
                    Distribution::Uniform => 2.0 * u - 1.0,
                    Distribution::Normal | Distribution::LogNormal => truncated_normal(u),
                }
            })
            .collect()
    }
}

/// Linear interpolation of history rows at the grid times: ((d/d0)², surface temperature) per grid time.
fn on_grid(rows: &[HistoryRow], grid: &[f64], evaporated: bool) -> (Vec<Option<f64>>, Vec<Option<f64>>) {
    let mut d2 = Vec::with_capacity(grid.len());
    let mut ts = Vec::with_capacity(grid.len());
    let mut k = 0;
    let last = rows.last().map(|r| r.time).unwrap_or(0.0);
    for &t in grid {
        if rows.is_empty() || t > last {
            d2.push(if evaporated { Some(0.0) } else { None });
            ts.push(None);
            continue;
        }
        while k + 1 < rows.len() && rows[k + 1].time < t {
            k += 1;
        }
        let (a, b) = if k + 1 < rows.len() { (&rows[k], &rows[k + 1]) } else { (&rows[k], &rows[k]) };
        let s = if b.time > a.time { ((t - a.time) / (b.time - a.time)).clamp(0.0, 1.0) } else { 0.0 };
        let lerp = |x: f64, y: f64| x + s * (y - x);
        d2.push(Some(lerp(a.d2_ratio, b.d2_ratio)));
        ts.push(Some(lerp(a.surface_temperature, b.surface_temperature)));
    }
    (d2, ts)
}

fn empty_record(status: SampleStatus, z: Vec<f64>, grid: &[f64], settings: &Settings) -> SampleRecord {
    SampleRecord {
        z,
        status,
        lifetime: None,
        t50: None,
        max_surface_temperature: None,
        d2: vec![None; grid.len()],
        surface_temperature: vec![None; grid.len()],
        residue: vec![[None; 6]; settings.residue_fractions.len()],
    }
}

/// A finished droplet run reduced to a record.
fn reduce(inputs: &DropletInputs, run: &RunResult, z: Vec<f64>, grid: &[f64], settings: &Settings) -> SampleRecord {
    let o = &run.outcome;
    let status = match o.status {
        Status::Evaporated => SampleStatus::Evaporated,
        _ => SampleStatus::TimeLimit,
    };
    let (d2, surface_temperature) = on_grid(&run.history, grid, status == SampleStatus::Evaporated);
    let mut residue = vec![[None; 6]; settings.residue_fractions.len()];
    let residues = residues_along_history(&run.history, &settings.residue_fractions, Layer::Mean);
    // only the indicators of RESIDUE_KEYS are computed, one residue after another sharing the per-component work
    // and starting each solve from the previous residue's (post::residue_series); an error on any residue
    // leaves every residue value out, as a residue table would
    let indicator_options = IndicatorOptions { activity: inputs.liquid.activity, ..settings.indicator_options.clone() };
    let keys = RESIDUE_KEYS.map(|(key, _)| key);
    let values: Result<Vec<Vec<Option<f64>>>, PostError> =
        ResidueSeries::new(&inputs.fuel.components, &indicator_options, &keys).and_then(|mut series| residues.iter().map(|r| series.values(&r.mass_fractions)).collect());
    if let Ok(rows) = values {
        for (r, row) in residues.iter().zip(rows) {
            if let Some(j) = settings.residue_fractions.iter().position(|f| *f == r.evaporated_fraction) {
                for (m, v) in row.into_iter().enumerate().take(RESIDUE_KEYS.len()) {
                    residue[j][m] = v.filter(|v| v.is_finite());
                }
            }
        }
    }
    SampleRecord {
        z,
        status,
        lifetime: o.lifetime,
        t50: o.t50,
        max_surface_temperature: Some(o.max_surface_temperature).filter(|v| v.is_finite()),
        d2,
        surface_temperature,
        residue,
    }
}

/// One droplet run reduced to a record.
fn evaluate(inputs: &DropletInputs, z: Vec<f64>, grid: &[f64], settings: &Settings) -> SampleRecord {
    match simulate(inputs, &mut crate::model::guard::RowsOnly) {
        Ok(run) => reduce(inputs, &run, z, grid, settings),
        Err(e) => empty_record(SampleStatus::Failed(e.to_string()), z, grid, settings),
    }
}

fn check_settings(s: &Settings) -> Result<(), UncertaintyError> {
    let bad = |what: &str, message: String| Err(UncertaintyError::Input { what: what.to_string(), message });
    if s.samples == 0 || s.samples > MAX_SAMPLES {
        return bad("samples", format!("{} must be between 1 and {MAX_SAMPLES}", s.samples));
    }
    if s.grid_points < 2 || s.grid_points > 100_000 {
        return bad("grid points", format!("{} must be between 2 and 100000", s.grid_points));
    }
    if !(s.grid_extent.is_finite() && s.grid_extent > 0.0 && s.grid_extent <= 100.0) {
        return bad("grid extent", format!("{} must be in (0, 100]", s.grid_extent));
    }
    if s.residue_fractions.iter().any(|f| !(0.0..1.0).contains(f)) || s.residue_fractions.windows(2).any(|w| w[1] <= w[0]) {
        return bad("residue fractions", "must increase and lie in [0, 1)".into());
    }
    Ok(())
}

/// Run the deterministic case and `settings.samples` perturbed cases of `nominal` under `spec`;
/// `progress` (if any) is called with the number of finished samples (from worker threads).
pub fn run(nominal: &DropletInputs, spec: &UncertaintySpec, settings: &Settings, progress: Option<&(dyn Fn(usize) + Sync)>) -> Result<UncertaintyRun, UncertaintyError> {
    check_settings(settings)?;
    let (factors, mut notices) = resolve(spec, nominal)?;
    // The deterministic run and every sample evaluate their pure-component properties (droplet run and residue
    // indicators alike) through the per-component kernels of the nominal components when the inputs ask for
    // kernels: the copies each sample rescales share them, so no sample copies or builds kernels.
    let kernel_nominal = crate::model::inputs::with_kernels(nominal);
    let run_nominal = kernel_nominal.as_ref().unwrap_or(nominal);
    // the deterministic run sets the time scale of the grid
    let det_run = simulate(run_nominal, &mut crate::model::guard::RowsOnly)?;
    let reference_time = match det_run.outcome.lifetime {
        Some(t) if t > 0.0 => t,
        _ => {
            notices.push("the deterministic droplet did not evaporate before the time limit: the time grid is normalised by the time limit".into());
            nominal.max_time
        }
    };
    let step = settings.grid_extent / (settings.grid_points - 1) as f64;
    let normalised: Vec<f64> = (0..settings.grid_points).map(|j| j as f64 * step).collect();
    let grid: Vec<f64> = normalised.iter().map(|x| x * reference_time).collect();
    let deterministic = reduce(run_nominal, &det_run, vec![], &grid, settings);
    drop(det_run);
    let design = Design::new(&factors, settings);
    let pool = rayon::ThreadPoolBuilder::new().num_threads(settings.threads).build().map_err(|e| UncertaintyError::Internal(format!("thread pool: {e}")))?;
    let done = std::sync::atomic::AtomicUsize::new(0);
    let samples: Vec<SampleRecord> = pool.install(|| {
        (0..settings.samples)
            .into_par_iter()
            // each worker keeps the component copies of its last sample and overwrites them for the next
            .map_init(Spare::default, |spare, i| {
                let z = design.draws(&factors, i);
                let inputs = perturbed_reusing(run_nominal, &factors, &z, spare);
                let r = evaluate(&inputs, z, &grid, settings);
                spare.recover(run_nominal, inputs);
                if let Some(p) = progress {
                    p(done.fetch_add(1, std::sync::atomic::Ordering::Relaxed) + 1);
                }
                r
            })
            .collect()
    });
    let failed = samples.iter().filter(|s| matches!(s.status, SampleStatus::Failed(_))).count();
    let limited = samples.iter().filter(|s| s.status == SampleStatus::TimeLimit).count();
    if failed > 0 {
        let first = samples.iter().find_map(|s| if let SampleStatus::Failed(m) = &s.status { Some(m.clone()) } else { None }).unwrap_or_default();
        notices.push(format!("{failed} of {} samples failed and are left out of every statistic (first: {first})", samples.len()));
    }
    if limited > 0 {
        notices.push(format!("{limited} of {} samples reached the time limit before evaporating: they have no lifetime, so the lifetime percentiles leave them out (raise --max-time)", samples.len()));
    }
    let beyond = samples.iter().filter(|s| s.lifetime.is_some_and(|t| t > grid[grid.len() - 1])).count();
    if beyond > 0 {
        notices.push(format!("{beyond} samples outlive the time grid ({} × the deterministic lifetime): their history bands end there", settings.grid_extent));
    }
    let at50 = settings.residue_fractions.iter().position(|f| (f - RANKED_RESIDUE_FRACTION).abs() < 1e-12);
    // the statistics on the same pool (each grid point and each ranked input on its own: the same values
    // whatever thread computes them)
    let (history, residue, sensitivity_inputs, sensitivity) = pool.install(|| {
        let history = history_bands(&samples, &deterministic, &grid, &normalised);
        let residue = residue_bands(&samples, &deterministic, settings);
        let sensitivity_inputs = sensitivity_inputs(&factors, &samples, nominal);
        let sensitivity = rank(&sensitivity_inputs, &samples, at50);
        (history, residue, sensitivity_inputs, sensitivity)
    });
    let ok = |s: &&SampleRecord| !matches!(s.status, SampleStatus::Failed(_));
    let lifetime = Statistics::of(samples.iter().filter(ok).map(|s| s.lifetime));
    let t50 = Statistics::of(samples.iter().filter(ok).map(|s| s.t50));
    let max_surface_temperature = Statistics::of(samples.iter().filter(ok).map(|s| s.max_surface_temperature));
    let residue50 = at50.map(|j| std::array::from_fn(|m| Statistics::of(samples.iter().filter(ok).map(|s| s.residue[j][m]))));
    Ok(UncertaintyRun {
        nominal: nominal.clone(),
        settings: settings.clone(),
        factors,
        notices,
        deterministic,
        reference_time,
        samples,
        history,
        residue,
        sensitivity_inputs,
        sensitivity,
        lifetime,
        t50,
        max_surface_temperature,
        residue50,
    })
}

fn bands(values: Vec<f64>) -> [Option<f64>; 3] {
    let mut v = values;
    v.retain(|x| x.is_finite());
    // values equal under total_cmp have the same bits: the unstable sort gives the stable sort's result
    v.sort_unstable_by(f64::total_cmp);
    PERCENTILES.map(|q| percentile_sorted(&v, q))
}

fn history_bands(samples: &[SampleRecord], det: &SampleRecord, grid: &[f64], normalised: &[f64]) -> HistoryBands {
    let ok: Vec<&SampleRecord> = samples.iter().filter(|s| !matches!(s.status, SampleStatus::Failed(_))).collect();
    let n = ok.len().max(1) as f64;
    let mut h = HistoryBands {
        time: vec![],
        normalised_time: vec![],
        d2: vec![],
        d2_deterministic: vec![],
        surface_temperature: vec![],
        surface_temperature_deterministic: vec![],
        present_fraction: vec![],
    };
    // rows after every droplet (and the deterministic one) is gone carry no information: keep one of them
    let mut last = grid.len() - 1;
    while last > 0 && det.d2[last - 1].is_some_and(|v| v == 0.0) && ok.iter().all(|s| s.d2[last - 1].is_none_or(|v| v == 0.0)) {
        last -= 1;
    }
    // the bands of each grid point (side by side on the pool)
    let per_point: Vec<_> = (0..=last)
        .into_par_iter()
        .map(|j| {
            let present: Vec<f64> = ok.iter().filter_map(|s| s.surface_temperature[j]).collect();
            let present_fraction = present.len() as f64 / n;
            let d2 = bands(ok.iter().filter_map(|s| s.d2[j]).collect());
            let surface_temperature = if !ok.is_empty() && present_fraction >= 0.5 { bands(present) } else { [None; 3] };
            (d2, surface_temperature, present_fraction)
        })
        .collect();
    for (j, (d2, surface_temperature, present_fraction)) in per_point.into_iter().enumerate() {
        h.time.push(grid[j]);
        h.normalised_time.push(normalised[j]);
        h.d2.push(d2);
        h.d2_deterministic.push(det.d2[j]);
        h.surface_temperature.push(surface_temperature);
        h.surface_temperature_deterministic.push(det.surface_temperature[j]);
        h.present_fraction.push(present_fraction);
    }
    h
}

fn residue_bands(samples: &[SampleRecord], det: &SampleRecord, settings: &Settings) -> ResidueBands {
    let ok: Vec<&SampleRecord> = samples.iter().filter(|s| !matches!(s.status, SampleStatus::Failed(_))).collect();
    let nf = settings.residue_fractions.len();
    let mut r = ResidueBands { fractions: settings.residue_fractions.clone(), bands: vec![], deterministic: vec![], counts: vec![] };
    for j in 0..nf {
        let mut b = [[None; 3]; 6];
        let mut c = [0usize; 6];
        for m in 0..6 {
            let v: Vec<f64> = ok.iter().filter_map(|s| s.residue[j][m]).collect();
            c[m] = v.len();
            b[m] = bands(v);
        }
        r.bands.push(b);
        r.counts.push(c);
        r.deterministic.push(det.residue[j]);
    }
    r
}

/// Inputs of the ranking: each condition (its value), each composition group (its factor), and per property
/// type the mean of the standard draws z over the components weighted by their initial mass fractions.
fn sensitivity_inputs(factors: &[Factor], samples: &[SampleRecord], nominal: &DropletInputs) -> Vec<SensitivityInput> {
    let mut out = vec![];
    for (k, f) in factors.iter().enumerate() {
        match f.kind {
            FactorKind::Condition { .. } => out.push(SensitivityInput { name: f.name.clone(), kind: "condition", values: samples.iter().map(|s| f.value(s.z[k])).collect(), members: vec![k] }),
            FactorKind::Composition { .. } => out.push(SensitivityInput { name: f.name.clone(), kind: "composition", values: samples.iter().map(|s| f.value(s.z[k])).collect(), members: vec![k] }),
            FactorKind::Property { .. } | FactorKind::IndicatorInput { .. } => {}
        }
    }
    let w = &nominal.fuel.mass_fractions;
    // a group of per-component factors as one input: their standard draws averaged with the mass fractions
    let mut group = |name: String, member_of: &dyn Fn(&FactorKind) -> Option<usize>| {
        let members: Vec<(usize, f64)> = factors.iter().enumerate().filter_map(|(k, f)| member_of(&f.kind).map(|c| (k, w[c]))).collect();
        let total: f64 = members.iter().map(|(_, w)| w).sum();
        if members.is_empty() || total <= 0.0 {
            return;
        }
        let values = samples.iter().map(|s| members.iter().map(|(k, wk)| wk * s.z[*k]).sum::<f64>() / total).collect();
        out.push(SensitivityInput { name, kind: "property-type", values, members: members.iter().map(|(k, _)| *k).collect() });
    };
    for (p, key) in property_keys().iter().enumerate() {
        group(format!("property:{key}"), &|kind| match *kind {
            FactorKind::Property { component, property, .. } if property == p => Some(component),
            _ => None,
        });
    }
    // the flash-point and cetane inputs, each like a property type
    for input in [IndicatorInput::FlashPoint, IndicatorInput::CetaneNumber] {
        group(format!("input:{}", input.key()), &|kind| match *kind {
            FactorKind::IndicatorInput { component, input: which, .. } if which == input => Some(component),
            _ => None,
        });
    }
    out
}

fn rank(inputs: &[SensitivityInput], samples: &[SampleRecord], at50: Option<usize>) -> Vec<SensitivityRow> {
    let outputs: Vec<Vec<Option<f64>>> = (0..RANKED_OUTPUTS.len()).map(|k| samples.iter().map(|s| s.ranked_output(k, at50)).collect()).collect();
    // each input's row for every output, inputs side by side on the pool; outputs that use the same samples
    // share the regression design (the ranks of the input's factors and their Cholesky factor)
    let per_input: Vec<Vec<SensitivityRow>> = inputs
        .par_iter()
        .map(|inp| {
            let x: Vec<Option<f64>> = inp.values.iter().map(|v| Some(*v)).collect();
            let columns: Vec<Vec<f64>> = inp.members.iter().map(|&m| samples.iter().map(|s| s.z[m]).collect()).collect();
            let mut designs: Vec<(Vec<usize>, Option<RankDesign>)> = vec![];
            let factors = inp.members.len();
            RANKED_OUTPUTS
                .iter()
                .zip(&outputs)
                .map(|((output, _), y)| {
                    let used = y.iter().filter(|v| v.is_some()).count();
                    let keep = regression_samples(&columns, y);
                    let d = match designs.iter().position(|(k, _)| *k == keep) {
                        Some(d) => d,
                        None => {
                            designs.push((keep.clone(), rank_design(&columns, keep)));
                            designs.len() - 1
                        }
                    };
                    let r2 = designs[d].1.as_ref().and_then(|design| rank_r2_with(design, y));
                    let rho = spearman(&x, y);
                    SensitivityRow { output, rank: 0, input: inp.name.clone(), kind: inp.kind, spearman: rho, r2, samples: used, factors, above_noise: above_noise(factors, used, rho, r2) }
                })
                .collect()
        })
        .collect();
    let mut out = vec![];
    for k in 0..RANKED_OUTPUTS.len() {
        let mut rows: Vec<SensitivityRow> = per_input.iter().map(|r| r[k].clone()).collect();
        // strongest first (by explained rank variance, then |Spearman|); undefined last; ties by name
        rows.sort_by(|a, b| {
            let key = |r: &SensitivityRow| (r.r2.unwrap_or(-1.0), r.spearman.map(f64::abs).unwrap_or(-1.0));
            let (ka, kb) = (key(a), key(b));
            kb.0.total_cmp(&ka.0).then(kb.1.total_cmp(&ka.1)).then_with(|| a.input.cmp(&b.input))
        });
        for (i, r) in rows.iter_mut().enumerate() {
            r.rank = i + 1;
        }
        out.extend(rows);
    }
    out
}

/// Whether two fuels' 5–95 % bands of one output overlap.
#[derive(Debug, Clone, Serialize)]
pub struct Overlap {
    /// Output name.
    pub output: String,
    /// First fuel's 5–95 % band.
    pub first: Option<(f64, f64)>,
    /// Second fuel's 5–95 % band.
    pub second: Option<(f64, f64)>,
    /// True when the bands share at least one value; none when a band is missing.
    pub overlap: Option<bool>,
}

/// 5–95 % band overlap of the lifetime and the residue DCN and flash point at 50 % evaporated.
pub fn overlaps(a: &UncertaintyRun, b: &UncertaintyRun) -> Vec<Overlap> {
    let pick = |r: &UncertaintyRun, k: usize| -> Option<(f64, f64)> {
        match k {
            0 => r.lifetime.band(),
            1 => r.residue50.as_ref().and_then(|s| s[5].band()),
            _ => r.residue50.as_ref().and_then(|s| s[2].band()),
        }
    };
    RANKED_OUTPUTS
        .iter()
        .enumerate()
        .map(|(k, (name, _))| {
            let (first, second) = (pick(a, k), pick(b, k));
            let overlap = match (first, second) {
                (Some(x), Some(y)) => Some(x.0.max(y.0) <= x.1.min(y.1)),
                _ => None,
            };
            Overlap { output: name.to_string(), first, second, overlap }
        })
        .collect()
}

/// Sorted finite values of the lifetimes of the successful samples \[s\] (for convergence checks).
pub fn lifetimes(run: &UncertaintyRun) -> Vec<f64> {
    sorted_finite(run.samples.iter().map(|s| s.lifetime))
}
