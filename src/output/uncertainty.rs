//! Files and charts of an uncertainty run (docs/uncertainty.md): bands_history.csv, bands_residue.csv,
//! sensitivity.csv, samples.csv, summary.json, and band charts (one fuel, or several fuels overlaid).

use std::path::Path;

use rayon::prelude::*;
use serde::Serialize;

use crate::uncertainty::run::{HistoryBands, ResidueBands, RANKED_RESIDUE_FRACTION};
use crate::uncertainty::{FactorKind, Overlap, SampleStatus, Statistics, UncertaintyRun, PERCENTILES, RANKED_OUTPUTS, RESIDUE_KEYS};

use super::charts::{lighter, run_color, time_scale, write_chart, Band, Chart, ChartFiles, LegendEntry, Panel, Series, Stroke};
use super::history::InputEcho;
use super::read::CsvData;
use super::{Cell, CsvTable, OutputError, TOOL_VERSION};

/// File names written into the output folder of one fuel.
pub const FILES: [&str; 5] = ["bands_history.csv", "bands_residue.csv", "sensitivity.csv", "samples.csv", "summary.json"];

/// The text report (as printed on stdout), written at the top of the output folder so `plot` can redraw the
/// page.
pub const REPORT_FILE: &str = "report.txt";

/// Chart stems of one fuel (the residue chart only when a residue band exists).
pub const CHARTS: [&str; 3] = ["chart_band_d2", "chart_band_surface_temperature", "chart_band_residue"];

/// Split an indicator key into its name and SI unit suffix: `flash_point_K` → (`flash_point`, `_K`).
fn split_unit(key: &str) -> (&str, &str) {
    for suffix in ["_m2_s", "_kg_m3", "_K"] {
        if let Some(base) = key.strip_suffix(suffix) {
            return (base, suffix);
        }
    }
    (key, "")
}

fn pct(q: f64) -> String {
    format!("p{:02}", q.round() as u32)
}

fn head(run: &UncertaintyRun, what: &str) -> Vec<String> {
    let inp = &run.nominal;
    let s = &run.settings;
    vec![
        format!("{TOOL_VERSION} {what}"),
        format!(
            "fuel: {}; {} samples, {} design, seed {}; percentiles {}",
            inp.fuel.name,
            s.samples,
            s.method.as_str(),
            s.seed,
            PERCENTILES.map(|q| format!("{q}")).join("/")
        ),
        format!(
            "nominal: ambient {} K, {} Pa, gas {}; initial diameter {} m, droplet {} K",
            inp.ambient_temperature, inp.pressure, inp.gas.label, inp.initial_diameter, inp.initial_temperature
        ),
        format!("uncertain inputs: {}", factor_summary(run)),
    ]
}

fn factor_summary(run: &UncertaintyRun) -> String {
    let conditions: Vec<String> = run.factors.iter().filter(|f| f.kind_name() == "condition").map(|f| format!("{} ({} {})", f.name, f.distribution.as_str(), f.spread())).collect();
    let composition = run.factors.iter().filter(|f| f.kind_name() == "composition").count();
    let properties = run.factors.iter().filter(|f| f.kind_name() == "property").count();
    format!(
        "conditions [{}], {composition} composition factors, {properties} property factors",
        if conditions.is_empty() { "none".into() } else { conditions.join(", ") }
    )
}

/// bands_history.csv: percentiles of (d/d0)² and surface temperature on the common time grid.
pub fn history_table(run: &UncertaintyRun) -> Result<CsvTable, OutputError> {
    let h = &run.history;
    let mut header = vec!["time_s".to_string(), "time_over_lifetime".to_string()];
    header.extend(PERCENTILES.map(|q| format!("d2_ratio_{}", pct(q))));
    header.push("d2_ratio_deterministic".into());
    header.extend(PERCENTILES.map(|q| format!("surface_temperature_{}_K", pct(q))));
    header.push("surface_temperature_deterministic_K".into());
    header.push("present_fraction".into());
    let mut t = CsvTable::new(header);
    t.metadata = head(run, "uncertainty bands of the droplet history");
    t.metadata.push(format!(
        "time grid: time_over_lifetime x the deterministic lifetime ({} s); a droplet counts as d2 = 0 once gone; surface-temperature percentiles are over the droplets still present, written where present_fraction >= 0.5",
        run.reference_time
    ));
    for j in 0..h.time.len() {
        let mut cells = vec![Cell::Num(h.time[j]), Cell::Num(h.normalised_time[j])];
        cells.extend(h.d2[j].iter().map(|v| Cell::Opt(*v)));
        cells.push(Cell::Opt(h.d2_deterministic[j]));
        cells.extend(h.surface_temperature[j].iter().map(|v| Cell::Opt(*v)));
        cells.push(Cell::Opt(h.surface_temperature_deterministic[j]));
        cells.push(Cell::Num(h.present_fraction[j]));
        t.push(cells, "bands_history.csv")?;
    }
    Ok(t)
}

/// bands_residue.csv: percentiles of each residue indicator against evaporated fraction.
pub fn residue_table(run: &UncertaintyRun) -> Result<CsvTable, OutputError> {
    let r = &run.residue;
    let mut header = vec!["evaporated_fraction".to_string()];
    for (key, _) in RESIDUE_KEYS {
        let (base, unit) = split_unit(key);
        header.extend(PERCENTILES.map(|q| format!("{base}_{}{unit}", pct(q))));
        header.push(format!("{base}_deterministic{unit}"));
        header.push(format!("{base}_samples"));
    }
    let mut t = CsvTable::new(header);
    t.metadata = head(run, "uncertainty bands of the residual liquid along the droplet history");
    t.metadata.push("indicators as in residue.csv of `dropcut simulate` (docs/property-methods.md), evaluated with each sample's perturbed properties; <name>_samples = samples with a value".into());
    t.metadata.push(format!("caution: {}", crate::post::CAUTION));
    for j in 0..r.fractions.len() {
        let mut cells = vec![Cell::Num(r.fractions[j])];
        for m in 0..RESIDUE_KEYS.len() {
            cells.extend(r.bands[j][m].iter().map(|v| Cell::Opt(*v)));
            cells.push(Cell::Opt(r.deterministic[j][m]));
            cells.push(Cell::Num(r.counts[j][m] as f64));
        }
        t.push(cells, "bands_residue.csv")?;
    }
    Ok(t)
}

/// sensitivity.csv: per ranked output, every input by decreasing |Spearman| coefficient.
pub fn sensitivity_table(run: &UncertaintyRun) -> Result<CsvTable, OutputError> {
    let mut t = CsvTable::new(["output", "rank", "input", "input_kind", "factors", "r2_rank", "spearman", "samples", "above_noise"].iter().map(|s| s.to_string()).collect());
    t.metadata = head(run, "sensitivity ranking: which inputs drive the spread of each output");
    t.metadata.push("inputs: each uncertain condition (its sampled value), each composition group (its factor), and per property type the mean of the standard draws z over the components weighted by their initial mass fractions (spearman column)".into());
    t.metadata.push("r2_rank (the ranking key): adjusted R2 of a least-squares fit of the output's ranks on the ranks of the input's factors (for a property type: every component's factor of that property), i.e. the share of the output's rank variance they explain; spearman: rank correlation of the input's value (mean z for a property type) with the output, for the sign".into());
    t.metadata.push(format!(
        "outputs: {}; residue outputs at {} % evaporated; above_noise: one factor |spearman| > 1.96/sqrt(samples - 1); m factors r2_rank > 2 sqrt(2 m)/(samples - m - 1) (rough 5 % tests for independent samples)",
        RANKED_OUTPUTS.map(|(k, d)| format!("{k} ({d})")).join(", "),
        100.0 * RANKED_RESIDUE_FRACTION
    ));
    for r in &run.sensitivity {
        let above = match r.above_noise {
            Some(true) => "yes",
            Some(false) => "no",
            None => "",
        };
        t.push(
            vec![
                Cell::Text(r.output.into()),
                Cell::Num(r.rank as f64),
                Cell::Text(r.input.clone()),
                Cell::Text(r.kind.into()),
                Cell::Num(r.factors as f64),
                Cell::Opt(r.r2),
                Cell::Opt(r.spearman),
                Cell::Num(r.samples as f64),
                Cell::Text(above.into()),
            ],
            "sensitivity.csv",
        )?;
    }
    Ok(t)
}

fn factor_column(f: &crate::uncertainty::Factor) -> String {
    match &f.kind {
        FactorKind::Condition { key, .. } => key.column().to_string(),
        FactorKind::Composition { .. } => format!("{}_factor", f.name.replace(':', "_")),
        FactorKind::Property { .. } => {
            let (prop, comp) = f.name.split_once(':').unwrap_or((&f.name, ""));
            format!("{}_factor_{comp}", prop.replace('-', "_"))
        }
        FactorKind::IndicatorInput { input, .. } => {
            let comp = f.name.split_once(':').map_or("", |(_, c)| c);
            let unit = match input {
                crate::uncertainty::IndicatorInput::FlashPoint => "K",
                crate::uncertainty::IndicatorInput::CetaneNumber => "CN",
            };
            format!("{}_{comp}_{unit}", input.key().replace('-', "_"))
        }
    }
}

/// samples.csv: one row per sample with every sampled input and the outputs.
pub fn samples_table(run: &UncertaintyRun) -> Result<CsvTable, OutputError> {
    let mut header = vec!["sample".to_string(), "status".to_string()];
    header.extend(run.factors.iter().map(factor_column));
    let aggregated: Vec<usize> = (0..run.sensitivity_inputs.len()).filter(|&k| run.sensitivity_inputs[k].kind == "property-type").collect();
    header.extend(aggregated.iter().map(|&k| format!("{}_mean_z", run.sensitivity_inputs[k].name.replace([':', '-'], "_"))));
    header.extend(["lifetime_s", "t50_s", "max_surface_temperature_K"].map(String::from));
    let at50 = run.settings.residue_fractions.iter().position(|f| (f - RANKED_RESIDUE_FRACTION).abs() < 1e-12);
    if at50.is_some() {
        header.extend(RESIDUE_KEYS.map(|(k, _)| format!("residue50_{k}")));
    }
    let mut t = CsvTable::new(header);
    t.metadata = head(run, "one row per sample: sampled inputs and outputs");
    t.metadata.push("conditions in SI units; composition factors multiply the group's mass fractions before renormalisation; property factors multiply the property; *_mean_z: mass-weighted mean standard draw of that property over the components".into());
    // rows formatted side by side (on the caller's rayon pool), appended in sample order
    // (the first failing row in sample order, if any, names the error)
    let rows: Vec<Vec<String>> = run
        .samples
        .par_iter()
        .enumerate()
        .map(|(i, s)| {
            let mut cells = vec![Cell::Num(i as f64), Cell::Text(s.status.text())];
            cells.extend(run.factors.iter().zip(&s.z).map(|(f, z)| Cell::Num(f.value(*z))));
            cells.extend(aggregated.iter().map(|&k| Cell::Num(run.sensitivity_inputs[k].values[i])));
            cells.extend([Cell::Opt(s.lifetime), Cell::Opt(s.t50), Cell::Opt(s.max_surface_temperature)]);
            if let Some(j) = at50 {
                cells.extend(s.residue[j].iter().map(|v| Cell::Opt(*v)));
            }
            // one string per row (the joined text as its only cell: the same file, no string per cell)
            t.format_row_text(cells, "samples.csv").map(|text| vec![text])
        })
        .collect::<Vec<_>>()
        .into_iter()
        .collect::<Result<_, _>>()?;
    t.rows = rows;
    Ok(t)
}

/// One uncertain input in summary.json.
#[derive(Debug, Clone, Serialize)]
pub struct FactorEcho {
    /// Name.
    pub name: String,
    /// condition, composition or property.
    pub kind: &'static str,
    /// normal, uniform or log-normal.
    pub distribution: &'static str,
    /// Standard deviation or half-width: SI for conditions, relative otherwise.
    pub spread: f64,
}

/// Statistics of one output with its deterministic value.
#[derive(Debug, Clone, Serialize)]
pub struct OutputStatistics {
    /// Output name (SI unit suffix).
    pub output: String,
    /// Value of the deterministic run.
    pub deterministic: Option<f64>,
    /// Sample statistics.
    #[serde(flatten)]
    pub statistics: Statistics,
}

/// The top inputs of one ranked output.
#[derive(Debug, Clone, Serialize)]
pub struct Ranking {
    /// Output name.
    pub output: String,
    /// (input, adjusted rank R², Spearman coefficient), strongest first (at most five).
    pub top: Vec<(String, Option<f64>, Option<f64>)>,
}

/// summary.json of an uncertainty run.
#[derive(Debug, Clone, Serialize)]
pub struct UncertaintySummary {
    /// Tool and version.
    pub tool: String,
    /// Nominal inputs.
    pub input: InputEcho,
    /// Samples requested.
    pub samples: usize,
    /// Seed.
    pub seed: u64,
    /// Sampling design.
    pub method: &'static str,
    /// Percentiles of every band \[%\].
    pub percentiles: [f64; 3],
    /// Samples that evaporated, reached the time limit, failed.
    pub sample_status: SampleCounts,
    /// The uncertain inputs.
    pub factors: Vec<FactorEcho>,
    /// Statistics of the scalar outputs.
    pub outputs: Vec<OutputStatistics>,
    /// Top inputs of each ranked output.
    pub sensitivity: Vec<Ranking>,
    /// Deterministic lifetime that normalises the time grid \[s\].
    pub reference_time_s: f64,
    /// Notices.
    pub notes: Vec<String>,
}

/// Sample counts by status.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct SampleCounts {
    /// Evaporated.
    pub evaporated: usize,
    /// Reached the time limit.
    pub time_limit: usize,
    /// Failed.
    pub failed: usize,
}

impl UncertaintySummary {
    /// Summary of a run.
    pub fn of(run: &UncertaintyRun) -> Self {
        let count = |f: &dyn Fn(&SampleStatus) -> bool| run.samples.iter().filter(|s| f(&s.status)).count();
        let det = &run.deterministic;
        let mut outputs = vec![
            OutputStatistics { output: "lifetime_s".into(), deterministic: det.lifetime, statistics: run.lifetime },
            OutputStatistics { output: "t50_s".into(), deterministic: det.t50, statistics: run.t50 },
            OutputStatistics { output: "max_surface_temperature_K".into(), deterministic: det.max_surface_temperature, statistics: run.max_surface_temperature },
        ];
        let at50 = run.settings.residue_fractions.iter().position(|f| (f - RANKED_RESIDUE_FRACTION).abs() < 1e-12);
        if let (Some(stats), Some(j)) = (&run.residue50, at50) {
            for (m, (key, _)) in RESIDUE_KEYS.iter().enumerate() {
                outputs.push(OutputStatistics { output: format!("residue50_{key}"), deterministic: det.residue[j][m], statistics: stats[m] });
            }
        }
        let sensitivity = RANKED_OUTPUTS
            .iter()
            .map(|(o, _)| Ranking { output: o.to_string(), top: run.sensitivity.iter().filter(|r| r.output == *o).take(5).map(|r| (r.input.clone(), r.r2, r.spearman)).collect() })
            .collect();
        UncertaintySummary {
            tool: TOOL_VERSION.into(),
            input: InputEcho::of(&run.nominal),
            samples: run.settings.samples,
            seed: run.settings.seed,
            method: run.settings.method.as_str(),
            percentiles: PERCENTILES,
            sample_status: SampleCounts {
                evaporated: count(&|s| *s == SampleStatus::Evaporated),
                time_limit: count(&|s| *s == SampleStatus::TimeLimit),
                failed: count(&|s| matches!(s, SampleStatus::Failed(_))),
            },
            factors: run.factors.iter().map(|f| FactorEcho { name: f.name.clone(), kind: f.kind_name(), distribution: f.distribution.as_str(), spread: f.spread() }).collect(),
            outputs,
            sensitivity,
            reference_time_s: run.reference_time,
            notes: run.notices.clone(),
        }
    }
}

/// Write the five files of one run into `dir`.
pub fn write_run(dir: &Path, run: &UncertaintyRun) -> Result<(), OutputError> {
    super::ensure_dir(dir)?;
    history_table(run)?.write(&dir.join(FILES[0]))?;
    residue_table(run)?.write(&dir.join(FILES[1]))?;
    sensitivity_table(run)?.write(&dir.join(FILES[2]))?;
    samples_table(run)?.write(&dir.join(FILES[3]))?;
    super::write_json(&dir.join(FILES[4]), &UncertaintySummary::of(run))
}

/// One fuel's bands as the charts need them, with its legend label: taken from a finished run
/// ([`LabelledBands::of`]) or read back from the files of an uncertainty folder ([`LabelledBands::read`]).
#[derive(Debug, Clone)]
pub struct LabelledBands {
    /// Legend label (fuel name, or the label given on the command line).
    pub label: String,
    /// Fuel name.
    pub fuel: String,
    /// Nominal condition and design in one line (without the fuel).
    pub setting: String,
    /// Bands of the droplet history.
    pub history: HistoryBands,
    /// Bands of the residue indicators.
    pub residue: ResidueBands,
}

impl LabelledBands {
    /// The bands of a finished run.
    pub fn of(label: &str, run: &UncertaintyRun) -> Self {
        LabelledBands { label: label.into(), fuel: run.nominal.fuel.name.clone(), setting: subtitle(run, false), history: run.history.clone(), residue: run.residue.clone() }
    }

    /// Read the bands back from bands_history.csv, bands_residue.csv and summary.json of a folder written by
    /// [`write_run`], so the charts can be redrawn without sampling again.
    pub fn read(dir: &Path, label: &str) -> Result<Self, OutputError> {
        let summary_path = dir.join(FILES[4]);
        let text = std::fs::read_to_string(&summary_path).map_err(|e| read_err(&summary_path, e.to_string()))?;
        let json: serde_json::Value = serde_json::from_str(&text).map_err(|e| read_err(&summary_path, e.to_string()))?;
        let number = |path: &[&str]| -> Result<f64, OutputError> {
            let mut v = &json;
            for k in path {
                v = &v[*k];
            }
            v.as_f64().ok_or_else(|| read_err(&summary_path, format!("missing number {}", path.join("."))))
        };
        let word = |key: &str| json[key].as_str().map(str::to_string).ok_or_else(|| read_err(&summary_path, format!("missing text {key}")));
        let fuel = json["input"]["fuel"].as_str().unwrap_or(label).to_string();
        let setting = setting_line(
            number(&["input", "ambient_temperature_K"])?,
            number(&["input", "pressure_Pa"])?,
            number(&["input", "initial_diameter_m"])?,
            number(&["input", "droplet_temperature_K"])?,
            number(&["samples"])? as usize,
            &word("method")?,
            number(&["seed"])? as u64,
        );
        let h = CsvData::read(&dir.join(FILES[0]))?;
        let triple = |data: &CsvData, base: &str, unit: &str| -> Result<Vec<[Option<f64>; 3]>, OutputError> {
            let cols: Vec<Vec<Option<f64>>> = PERCENTILES.iter().map(|q| data.numbers(&format!("{base}_{}{unit}", pct(*q)))).collect::<Result<_, _>>()?;
            Ok((0..data.rows.len()).map(|j| [cols[0][j], cols[1][j], cols[2][j]]).collect())
        };
        let history = HistoryBands {
            time: h.required_numbers("time_s")?,
            normalised_time: h.required_numbers("time_over_lifetime")?,
            d2: triple(&h, "d2_ratio", "")?,
            d2_deterministic: h.numbers("d2_ratio_deterministic")?,
            surface_temperature: triple(&h, "surface_temperature", "_K")?,
            surface_temperature_deterministic: h.numbers("surface_temperature_deterministic_K")?,
            present_fraction: h.required_numbers("present_fraction")?,
        };
        let r = CsvData::read(&dir.join(FILES[1]))?;
        let fractions = r.required_numbers("evaporated_fraction")?;
        let n = fractions.len();
        let mut residue = ResidueBands { fractions, bands: vec![[[None; 3]; 6]; n], deterministic: vec![[None; 6]; n], counts: vec![[0; 6]; n] };
        for (m, (key, _)) in RESIDUE_KEYS.iter().enumerate() {
            let (base, unit) = split_unit(key);
            let bands = triple(&r, base, unit)?;
            let det = r.numbers(&format!("{base}_deterministic{unit}"))?;
            let counts = r.required_numbers(&format!("{base}_samples"))?;
            for j in 0..n {
                residue.bands[j][m] = bands[j];
                residue.deterministic[j][m] = det[j];
                if !(counts[j] >= 0.0 && counts[j].fract() == 0.0) {
                    return Err(read_err(&r.path, format!("{base}_samples: {} is not a sample count (data row {})", counts[j], j + 1)));
                }
                residue.counts[j][m] = counts[j] as usize;
            }
        }
        Ok(LabelledBands { label: label.into(), fuel, setting, history, residue })
    }
}

/// A sensitivity input as a reader says it: `property:vapor-pressure` → "vapour pressure (all components)",
/// `input:flash-point` → "flash points (all components)", `composition:aromatics` → "aromatics share",
/// `ambient-temperature` → "ambient temperature".
pub fn readable_input(name: &str) -> String {
    let words = |s: &str| s.replace(['-', '_'], " ").replace("vapor", "vapour");
    if let Some(p) = name.strip_prefix("property:") {
        format!("{} (all components)", words(p))
    } else if let Some(p) = name.strip_prefix("input:") {
        format!("{}s (all components)", words(p))
    } else if let Some(c) = name.strip_prefix("composition:") {
        format!("{c} share")
    } else if let Some((p, c)) = name.split_once(':') {
        format!("{} of {c}", words(p))
    } else {
        words(name)
    }
}

fn read_err(path: &Path, message: impl Into<String>) -> OutputError {
    OutputError::Read { path: path.display().to_string(), message: message.into() }
}

/// True when `dir` holds the files of one fuel's uncertainty run.
pub fn is_band_folder(dir: &Path) -> bool {
    FILES.iter().all(|f| dir.join(f).is_file())
}

fn legend(runs: &[LabelledBands]) -> Vec<LegendEntry> {
    let lo = PERCENTILES[0];
    let hi = PERCENTILES[2];
    let mut out = vec![];
    for (i, r) in runs.iter().enumerate() {
        let c = run_color(i);
        let prefix = if runs.len() > 1 { format!("{}: ", r.label) } else { String::new() };
        out.push(LegendEntry { name: format!("{prefix}{lo}–{hi} % band"), color: lighter(c, 0.22), stroke: Stroke::Area });
        out.push(LegendEntry { name: format!("{prefix}median"), color: c, stroke: Stroke::Solid });
        out.push(LegendEntry { name: format!("{prefix}deterministic"), color: c, stroke: Stroke::Dashed });
    }
    out
}

fn band_chart(stem: &str, title: &str, subtitle: &str, runs: &[LabelledBands], panels: Vec<Panel>, columns: usize, size: (u32, u32)) -> Chart {
    Chart { stem: stem.into(), title: title.into(), subtitle: subtitle.into(), panels, columns, legend_title: String::new(), legend: legend(runs), size }
}

fn history_panel(runs: &[LabelledBands], f: f64, pick: impl Fn(&HistoryBands, usize) -> ([Option<f64>; 3], Option<f64>)) -> (Vec<Band>, Vec<Series>) {
    let mut bands = vec![];
    let mut series = vec![];
    for (i, r) in runs.iter().enumerate() {
        let h = &r.history;
        let c = run_color(i);
        let rows: Vec<(f64, [Option<f64>; 3], Option<f64>)> = (0..h.time.len()).map(|j| {
            let (b, d) = pick(h, j);
            (h.time[j] * f, b, d)
        }).collect();
        bands.push(Band { name: r.label.clone(), points: rows.iter().map(|(x, b, _)| (*x, b[0].zip(b[2]))).collect(), color: c });
        series.push(Series { name: format!("{} median", r.label), points: rows.iter().map(|(x, b, _)| (*x, b[1])).collect(), color: c, stroke: Stroke::Solid });
        series.push(Series { name: format!("{} deterministic", r.label), points: rows.iter().map(|(x, _, d)| (*x, *d)).collect(), color: c, stroke: Stroke::Dashed });
    }
    (bands, series)
}

/// Band chart of (d/d0)² against time.
pub fn d2_band_chart(runs: &[LabelledBands], subtitle: &str) -> Chart {
    let t_max = runs.iter().filter_map(|r| r.history.time.last().copied()).fold(0.0, f64::max);
    let (f, unit) = time_scale(t_max);
    let (bands, series) = history_panel(runs, f, |h, j| (h.d2[j], h.d2_deterministic[j]));
    let panel = Panel { x_label: format!("time  [{unit}]"), y_label: "(d/d0)²  [-]".into(), series, bands, y_range: Some((0.0, 1.08)), ..Default::default() };
    band_chart(CHARTS[0], "Droplet size: (d/d0)² with its uncertainty band", subtitle, runs, vec![panel], 1, (1000, 620))
}

/// Band chart of the surface temperature against time.
pub fn surface_temperature_band_chart(runs: &[LabelledBands], subtitle: &str) -> Chart {
    let t_max = runs.iter().filter_map(|r| r.history.time.last().copied()).fold(0.0, f64::max);
    let (f, unit) = time_scale(t_max);
    let (bands, series) = history_panel(runs, f, |h, j| (h.surface_temperature[j], h.surface_temperature_deterministic[j]));
    let panel = Panel { x_label: format!("time  [{unit}]"), y_label: "surface temperature  [K]".into(), series, bands, celsius_axis: true, ..Default::default() };
    band_chart(CHARTS[1], "Surface temperature with its uncertainty band", subtitle, runs, vec![panel], 1, (1000, 620))
}

/// Residue indicator panels: (indicator position in RESIDUE_KEYS, title, y label, scale, offset); temperatures
/// in °C as in the residue charts of a single run.
const RESIDUE_PANELS: [(usize, &str, &str, f64, f64); 6] = [
    (0, "Bubble point (1 atm)", "bubble point  [°C]", 1.0, -273.15),
    (1, "T50 of the simulated distillation", "T50  [°C]", 1.0, -273.15),
    (2, "Flash point (estimate)", "flash point  [°C]", 1.0, -273.15),
    (3, "Viscosity at −20 °C", "kinematic viscosity  [mm²/s]", 1e6, 0.0),
    (4, "Density at 15 °C", "density  [kg/m³]", 1.0, 0.0),
    (5, "Derived cetane number", "DCN  [-]", 1.0, 0.0),
];

/// Band chart of the residue indicators against evaporated fraction (None when no indicator has a band).
pub fn residue_band_chart(runs: &[LabelledBands], subtitle: &str) -> Option<Chart> {
    let mut panels = vec![];
    for (m, title, ylabel, scale, offset) in RESIDUE_PANELS {
        let mut bands = vec![];
        let mut series = vec![];
        for (i, r) in runs.iter().enumerate() {
            let rb = &r.residue;
            let c = run_color(i);
            let x: Vec<f64> = rb.fractions.iter().map(|f| 100.0 * f).collect();
            bands.push(Band { name: r.label.clone(), points: x.iter().zip(&rb.bands).map(|(x, b)| (*x, b[m][0].zip(b[m][2]).map(|(lo, hi)| (lo * scale + offset, hi * scale + offset)))).collect(), color: c });
            series.push(Series { name: format!("{} median", r.label), points: x.iter().zip(&rb.bands).map(|(x, b)| (*x, b[m][1].map(|v| v * scale + offset))).collect(), color: c, stroke: Stroke::Solid });
            series.push(Series { name: format!("{} deterministic", r.label), points: x.iter().zip(&rb.deterministic).map(|(x, d)| (*x, d[m].map(|v| v * scale + offset))).collect(), color: c, stroke: Stroke::Dashed });
        }
        if series.iter().all(|s| s.points.iter().all(|p| p.1.is_none())) {
            continue;
        }
        panels.push(Panel { title: title.into(), x_label: "evaporated  [%]".into(), y_label: ylabel.into(), series, bands, x_range: Some((0.0, 100.0)), ..Default::default() });
    }
    if panels.is_empty() {
        return None;
    }
    Some(band_chart(CHARTS[2], "Residual liquid against evaporated fraction, with uncertainty bands", subtitle, runs, panels, 3, (1300, 820)))
}

/// One-line description of the nominal condition and the design.
pub fn subtitle(run: &UncertaintyRun, with_fuel: bool) -> String {
    let inp = &run.nominal;
    let s = &run.settings;
    let setting = setting_line(inp.ambient_temperature, inp.pressure, inp.initial_diameter, inp.initial_temperature, s.samples, s.method.as_str(), s.seed);
    if with_fuel { format!("{} · {setting}", inp.fuel.name) } else { setting }
}

fn setting_line(ambient_temperature: f64, pressure: f64, diameter: f64, droplet_temperature: f64, samples: usize, method: &str, seed: u64) -> String {
    [
        format!("gas {:.0} K, {} bar", ambient_temperature, format_sig(pressure / 1e5)),
        format!("d0 = {} µm", format_sig(diameter * 1e6)),
        format!("T0 = {:.0} K", droplet_temperature),
        format!("{samples} samples ({method}, seed {seed})"),
    ]
    .join(" · ")
}

fn format_sig(v: f64) -> String {
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    s.to_string()
}

/// Draw the band charts of one or several fuels into `dir`.
pub fn write_band_charts(dir: &Path, runs: &[LabelledBands]) -> Result<Vec<ChartFiles>, OutputError> {
    let Some(first) = runs.first() else { return Ok(vec![]) };
    let sub = if runs.len() == 1 { format!("{} · {}", first.fuel, first.setting) } else { first.setting.clone() };
    let mut charts = vec![d2_band_chart(runs, &sub), surface_temperature_band_chart(runs, &sub)];
    if let Some(c) = residue_band_chart(runs, &sub) {
        charts.push(c);
    }
    charts.iter().map(|c| write_chart(dir, c)).collect()
}

/// overlap.csv of a multi-fuel run: for each pair (first fuel, other fuel) and each ranked output, the two
/// 5–95 % bands and whether they overlap.
pub fn overlap_table(pairs: &[(String, String, Vec<Overlap>)]) -> Result<CsvTable, OutputError> {
    let mut t = CsvTable::new(["fuel_a", "fuel_b", "output", "a_p05", "a_p95", "b_p05", "b_p95", "overlap"].iter().map(|s| s.to_string()).collect());
    t.metadata = vec![
        format!("{TOOL_VERSION} do the 5-95 % bands of two fuels overlap?"),
        format!("outputs: {}; residue outputs at {} % evaporated; SI units", RANKED_OUTPUTS.map(|(k, _)| k).join(", "), 100.0 * RANKED_RESIDUE_FRACTION),
    ];
    for (a, b, list) in pairs {
        for o in list {
            t.push(
                vec![
                    Cell::Text(a.clone()),
                    Cell::Text(b.clone()),
                    Cell::Text(o.output.clone()),
                    Cell::Opt(o.first.map(|x| x.0)),
                    Cell::Opt(o.first.map(|x| x.1)),
                    Cell::Opt(o.second.map(|x| x.0)),
                    Cell::Opt(o.second.map(|x| x.1)),
                    Cell::Text(match o.overlap {
                        Some(true) => "yes".into(),
                        Some(false) => "no".into(),
                        None => String::new(),
                    }),
                ],
                "overlap.csv",
            )?;
        }
    }
    Ok(t)
}
