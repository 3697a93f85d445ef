//! `dropcut uncertainty FUEL... \[condition options\] --samples N --seed S \[--uncertainty FILE\] ...`: CLI glue
//! around `crate::uncertainty` (sampling, statistics) and `crate::output::uncertainty` (files, charts).

use std::io::IsTerminal;

use super::args::{PropertyDistributionArg, SamplingArg, UncertaintyArgs};
use super::common::{notice, parse_q, progress, stdout_write};
use super::conditions::droplet_inputs;
use super::CliError;
use crate::data::Library;
use crate::fuel::Fuel;
use crate::model::{self, DropletInputs, Observer};
use crate::output::compare::safe_name;
use crate::output::uncertainty::{self as out, LabelledBands};
use crate::output::{self};
use crate::uncertainty::{self, Distribution, Method, Settings, UncertaintyRun, UncertaintySpec, RANKED_OUTPUTS};
use crate::units::Quantity;

/// Stops at the first step: checks a run's inputs before any sampling starts.
struct FirstStep;
impl Observer for FirstStep {
    fn on_step(&mut self, _row: &model::HistoryRow) -> bool {
        true
    }
    fn wants_rows(&self) -> bool {
        false
    }
}

fn read_spec(lib: &Library, args: &UncertaintyArgs) -> Result<UncertaintySpec, CliError> {
    let mut spec = match &args.uncertainty {
        None => UncertaintySpec::default(),
        Some(path) => {
            let shown = path.display().to_string();
            let bytes = crate::data::read_input_file(path).map_err(|e| CliError::input(format!("--uncertainty {shown}: {e}")))?;
            let text = String::from_utf8(bytes).map_err(|_| CliError::input(format!("--uncertainty {shown}: the file is not UTF-8 text")))?;
            UncertaintySpec::parse(&text, &shown, lib)?
        }
    };
    spec.add_conditions(&args.condition_uncertainty, "--condition-uncertainty")?;
    spec.add_composition(&args.composition_uncertainty, "--composition-uncertainty", lib)?;
    if let Some(text) = &args.property_scale {
        let x = parse_q("property-scale", text, Quantity::Dimensionless)?;
        spec.set_property_scale(x, "--property-scale")?;
    }
    if let Some(text) = &args.indicator_input_scale {
        let x = parse_q("indicator-input-scale", text, Quantity::Dimensionless)?;
        spec.set_indicator_input_scale(x, "--indicator-input-scale")?;
    }
    if let Some(d) = args.property_distribution {
        spec.properties.distribution = match d {
            PropertyDistributionArg::Normal => Distribution::Normal,
            PropertyDistributionArg::LogNormal => Distribution::LogNormal,
        };
    }
    Ok(spec)
}

fn settings(args: &UncertaintyArgs) -> Result<Settings, CliError> {
    let samples: usize = args.samples.trim().parse().map_err(|_| CliError::input(format!("--samples: '{}' is not a whole number", args.samples)))?;
    if samples == 0 || samples > uncertainty::run::MAX_SAMPLES {
        return Err(CliError::input(format!("--samples: {samples} must be between 1 and {}", uncertainty::run::MAX_SAMPLES)));
    }
    let seed: u64 = args.seed.trim().parse().map_err(|_| CliError::input(format!("--seed: '{}' is not a whole number from 0 to {}", args.seed, u64::MAX)))?;
    let method = match args.method {
        SamplingArg::MonteCarlo => Method::MonteCarlo,
        SamplingArg::LatinHypercube => Method::LatinHypercube,
    };
    Ok(Settings { samples, seed, method, threads: super::common::worker_threads(args.threads), ..Settings::default() })
}

fn ms(v: Option<f64>) -> String {
    v.map(|t| format!("{:.3}", t * 1e3)).unwrap_or_else(|| "-".into())
}

fn num(v: Option<f64>, decimals: usize) -> String {
    v.map(|x| format!("{x:.decimals$}")).unwrap_or_else(|| "-".into())
}

/// The text report of one fuel: statistics and the top inputs of each ranked output.
fn report(label: &str, run: &UncertaintyRun) -> String {
    let mut s = format!("{label}: {} samples ({}, seed {}), {} uncertain inputs\n", run.settings.samples, run.settings.method.as_str(), run.settings.seed, run.factors.len());
    s.push_str(&format!("  {:<32} {:>13} {:>11} {:>11} {:>11}\n", "output", "deterministic", "5 %", "50 %", "95 %"));
    let l = &run.lifetime;
    s.push_str(&format!("  {:<32} {:>13} {:>11} {:>11} {:>11}\n", "lifetime [ms]", ms(run.deterministic.lifetime), ms(l.p05), ms(l.p50), ms(l.p95)));
    let t = &run.t50;
    s.push_str(&format!("  {:<32} {:>13} {:>11} {:>11} {:>11}\n", "t50 [ms]", ms(run.deterministic.t50), ms(t.p05), ms(t.p50), ms(t.p95)));
    if let (Some(r), Some(j)) = (&run.residue50, run.settings.residue_fractions.iter().position(|f| (f - 0.5).abs() < 1e-12)) {
        let det = &run.deterministic.residue[j];
        s.push_str(&format!("  {:<32} {:>13} {:>11} {:>11} {:>11}\n", "residue at 50 %: DCN", num(det[5], 2), num(r[5].p05, 2), num(r[5].p50, 2), num(r[5].p95, 2)));
        let c = |v: Option<f64>| num(v.map(|k| k - 273.15), 1);
        s.push_str(&format!("  {:<32} {:>13} {:>11} {:>11} {:>11}\n", "residue at 50 %: flash point [°C]", c(det[2]), c(r[2].p05), c(r[2].p50), c(r[2].p95)));
        s.push_str(&format!("  caution: {}\n", crate::post::CAUTION));
    }
    for (o, desc) in RANKED_OUTPUTS {
        let top: Vec<String> = run
            .sensitivity
            .iter()
            .filter(|r| r.output == o && r.above_noise == Some(true))
            .take(3)
            .filter_map(|r| r.r2.map(|v| format!("{} ({:.0} %{})", out::readable_input(&r.input), 100.0 * v, r.spearman.map(|s| format!(", ρ {s:+.2}")).unwrap_or_default())))
            .collect();
        if top.is_empty() {
            s.push_str(&format!("  drives the spread of the {desc}: no input stands out from the sampling noise\n"));
        } else {
            s.push_str(&format!("  drives the spread of the {desc} (share of rank variance): {}\n", top.join(", ")));
        }
    }
    s
}

fn describe_overlap(a: &str, b: &str, o: &uncertainty::Overlap) -> String {
    let (name, scale, offset, unit) = match o.output.as_str() {
        "lifetime_s" => ("lifetime", 1e3, 0.0, " ms"),
        "residue50_dcn" => ("residue DCN at 50 %", 1.0, 0.0, ""),
        _ => ("residue flash point at 50 %", 1.0, -273.15, " °C"),
    };
    let band = |x: Option<(f64, f64)>| x.map(|(lo, hi)| format!("{:.3}–{:.3}{unit}", lo * scale + offset, hi * scale + offset)).unwrap_or_else(|| "no band".into());
    let verdict = match o.overlap {
        Some(true) => "the 5–95 % bands overlap",
        Some(false) => "the 5–95 % bands do not overlap",
        None => "cannot tell (a band is missing)",
    };
    format!("  {name}: {a} {} vs {b} {}: {verdict}\n", band(o.first), band(o.second))
}

/// `dropcut uncertainty`.
pub(super) fn uncertainty(lib: &Library, args: &UncertaintyArgs) -> Result<(), CliError> {
    let settings = settings(args)?;
    let spec = read_spec(lib, args)?;
    // resolve and check every fuel before any sampling starts
    let mut plan: Vec<(String, DropletInputs)> = vec![];
    let mut taken: Vec<String> = vec![];
    for f in &args.fuels {
        let fuel = Fuel::resolve(f, lib)?;
        for n in &fuel.notices {
            notice(n);
        }
        let mut label = fuel.name.clone();
        let mut k = 2;
        while taken.contains(&label) {
            label = format!("{}-{k}", fuel.name);
            k += 1;
        }
        taken.push(label.clone());
        let inp = droplet_inputs(lib, fuel, &args.condition)?;
        if let Err(e @ model::ModelError::Input { .. }) = model::simulate(&inp, &mut FirstStep) {
            return Err(CliError::input(format!("{label}: {e}")));
        }
        let (_, notices) = uncertainty::resolve(&spec, &inp).map_err(|e| CliError { message: format!("{label}: {e}"), ..CliError::from(e) })?;
        for n in notices {
            notice(&format!("{label}: {n}"));
        }
        plan.push((label, inp));
    }
    output::ensure_dir(&args.out)?;
    let tty = std::io::stderr().is_terminal();
    let mut runs: Vec<(String, UncertaintyRun)> = vec![];
    for (label, inp) in &plan {
        progress(&format!("uncertainty: {label}: {} samples ...", settings.samples));
        let step = (settings.samples / 20).max(1);
        let show = |k: usize| {
            if tty && (k.is_multiple_of(step) || k == settings.samples) {
                eprint!("\r  {k}/{} samples", settings.samples);
                if k == settings.samples {
                    eprintln!();
                }
            }
        };
        let run = uncertainty::run(inp, &spec, &settings, Some(&show)).map_err(|e| CliError { message: format!("{label}: {e}"), ..CliError::from(e) })?;
        for n in &run.notices {
            if !n.contains("covers") {
                notice(&format!("{label}: {n}"));
            }
        }
        runs.push((label.clone(), run));
    }
    let single = runs.len() == 1;
    let mut text = String::new();
    let mut sections = vec![];
    // the files of each run are formatted on as many threads as it ran on (one pool for all runs)
    let pool = rayon::ThreadPoolBuilder::new().num_threads(settings.threads).build().map_err(|e| CliError::runtime(format!("thread pool: {e}")))?;
    for (label, run) in &runs {
        let dir = if single { args.out.clone() } else { args.out.join(safe_name(label)) };
        pool.install(|| out::write_run(&dir, run))?;
        let charts = if args.no_plots {
            vec![]
        } else {
            super::common::release_freed_memory();
            out::write_band_charts(&dir, &[LabelledBands::of(label, run)])?
        };
        text.push_str(&report(label, run));
        let prefix = if single { String::new() } else { format!("{}/", safe_name(label)) };
        sections.push(output::html::UncertaintySection { heading: label.clone(), prefix, charts, files: out::FILES.iter().map(|f| f.to_string()).collect() });
    }
    if !single {
        let labelled: Vec<LabelledBands> = runs.iter().map(|(l, r)| LabelledBands::of(l, r)).collect();
        if !args.no_plots {
            let charts = out::write_band_charts(&args.out, &labelled)?;
            sections.insert(0, output::html::UncertaintySection { heading: "all fuels".into(), prefix: String::new(), charts, files: vec!["overlap.csv".into()] });
        }
        let mut pairs = vec![];
        text.push_str("do the 5–95 % bands overlap?\n");
        for i in 0..runs.len() {
            for j in i + 1..runs.len() {
                let list = uncertainty::overlaps(&runs[i].1, &runs[j].1);
                for o in &list {
                    text.push_str(&describe_overlap(&runs[i].0, &runs[j].0, o));
                }
                pairs.push((runs[i].0.clone(), runs[j].0.clone(), list));
            }
        }
        out::overlap_table(&pairs)?.write(&args.out.join("overlap.csv"))?;
    }
    let labels: Vec<&str> = runs.iter().map(|(l, _)| l.as_str()).collect();
    output::write_atomic(&args.out.join(out::REPORT_FILE), text.as_bytes())?;
    output::html::write_uncertainty_page(&args.out, &format!("dropcut uncertainty: {}", labels.join(", ")), &text, &sections)?;
    stdout_write(&text)?;
    let what = if args.no_plots { ", index.html" } else { ", index.html and band charts" };
    let where_ = if single { format!("{}", args.out.display()) } else { format!("{} (one folder per fuel; overlap.csv and overlaid charts on top)", args.out.display()) };
    stdout_write(&format!("wrote {}, {}{what} in {where_}\n", out::FILES.join(", "), out::REPORT_FILE))?;
    Ok(())
}
