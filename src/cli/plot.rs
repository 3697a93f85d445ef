//! CLI glue for charts and pages: `plot` (redraw from saved data), `compare` (several fuels or conditions,
//! overlaid), and the chart/page step that `simulate` and `demo` run after writing their data.

use std::collections::BTreeMap;
use std::path::Path;

use super::args::CompareArgs;
use super::common::{notice, progress, stdout_write, write_droplet_residue};
use super::conditions::{droplet_inputs, ConditionArgs};
use crate::conditions::{self, Condition, Kind};
use super::CliError;
use crate::data::Library;
use crate::fuel::Fuel;
use crate::model::{self, Observer};
use crate::output::charts::{self, LabelledRun};
use crate::output::compare::{comparison_csv, safe_name, ComparisonTable, Study, StudyGroup, StudyRun, STUDY_FILE};
use crate::output::read::SavedRun;
use crate::output::{self, html};

fn fill_classes(lib: &Library, run: &mut SavedRun) {
    for (id, class) in run.components.iter_mut() {
        if class.is_empty() {
            if let Some(c) = lib.component(id) {
                *class = c.class.as_str().to_string();
            }
        }
    }
}

/// Load a run folder, draw its charts (unless `plots` is false) and write its index.html.
pub(super) fn finish_run(lib: &Library, dir: &Path, plots: bool) -> Result<(SavedRun, usize), CliError> {
    finish_loaded_run(lib, SavedRun::load(dir)?, plots)
}

/// Draw the charts (unless `plots` is false) and write index.html of a run already in memory (as read back by
/// [`SavedRun::load`], or parsed from the texts just written by [`SavedRun::from_texts`]).
pub(super) fn finish_loaded_run(lib: &Library, mut run: SavedRun, plots: bool) -> Result<(SavedRun, usize), CliError> {
    fill_classes(lib, &mut run);
    let charts = if plots { charts::write_run_charts(&run)? } else { vec![] };
    html::write_run_page(&run, &charts)?;
    Ok((run, charts.len()))
}

/// Finish a study folder: run pages and charts, one comparison table and overlay charts per group,
/// comparison.csv, comparison.txt and index.html. Returns the text of the comparison tables and the chart count.
pub(super) fn finish_study(lib: &Library, dir: &Path, study: &Study, plots: bool) -> Result<(String, usize), CliError> {
    let mut loaded: BTreeMap<String, SavedRun> = BTreeMap::new();
    let mut count = 0;
    for g in &study.groups {
        for r in &g.runs {
            if !loaded.contains_key(&r.dir) {
                let run_dir = dir.join(&r.dir);
                if !SavedRun::is_run_folder(&run_dir) {
                    return Err(CliError::input(format!("{}: listed in {STUDY_FILE} but holds no history.csv", run_dir.display())));
                }
                let (run, n) = finish_run(lib, &run_dir, plots)?;
                count += n;
                loaded.insert(r.dir.clone(), run);
            }
        }
    }
    let mut text = String::new();
    let mut tables = vec![];
    let mut pages = vec![];
    for g in &study.groups {
        let pairs: Vec<(&StudyRun, &SavedRun)> = g.runs.iter().map(|r| (r, &loaded[&r.dir])).collect();
        let table = ComparisonTable::from_runs(g, &pairs)?;
        let labelled: Vec<LabelledRun> = pairs.iter().map(|(r, s)| LabelledRun { label: &r.label, run: s }).collect();
        let charts = if plots { charts::write_comparison_charts(dir, &format!("chart_{}", safe_name(&g.name)), &g.description, &labelled)? } else { vec![] };
        count += charts.len();
        if !text.is_empty() {
            text.push('\n');
        }
        text.push_str(&table.render_text());
        tables.push(table.clone());
        pages.push((table, charts));
    }
    comparison_csv(&tables)?.write(&dir.join("comparison.csv"))?;
    output::write_atomic(&dir.join("comparison.txt"), text.as_bytes())?;
    html::write_study_page(dir, study, &pages)?;
    Ok((text, count))
}

/// `dropcut plot DIR`: redraw charts and pages from saved data, without recomputing.
pub(super) fn plot(lib: &Library, dir: &Path, map_axes: Option<&str>, map_hold: &[String]) -> Result<(), CliError> {
    if !dir.is_dir() {
        return Err(CliError::input(format!("{}: no such folder", dir.display())));
    }
    let mut choice = crate::output::sweep_maps::MapChoice::default();
    if let Some(text) = map_axes {
        choice.axes = Some(crate::output::sweep_maps::MapChoice::parse_axes(text).map_err(|m| CliError::input(format!("--map-axes: {m}")))?);
    }
    for text in map_hold {
        choice.hold.push(crate::output::sweep_maps::MapChoice::parse_hold(text).map_err(|m| CliError::input(format!("--map-hold: {m}")))?);
    }
    let is_sweep = dir.join("summary.csv").is_file() && !SavedRun::is_run_folder(dir);
    if choice != Default::default() && !is_sweep {
        return Err(CliError::input(format!("--map-axes/--map-hold: {} is not a sweep output folder (no summary.csv)", dir.display())));
    }
    if dir.join("mixture.csv").is_file() {
        let n = draw_table_charts(dir)?;
        return stdout_write(&format!("drew {n} property-table chart(s) in {}\n", dir.display()));
    }
    if let Some(n) = redraw_uncertainty(dir)? {
        return stdout_write(&format!("drew {n} band chart(s) and index.html in {}\n", dir.display()));
    }
    if is_sweep {
        let maps = crate::output::sweep_maps::sweep_maps_with(dir, &choice)?;
        return stdout_write(&format!("drew {} sweep map(s) in {}\n", maps.len(), dir.display()));
    }
    if SavedRun::is_run_folder(dir) {
        let (_, n) = finish_run(lib, dir, true)?;
        return stdout_write(&format!("drew {n} charts and index.html in {}\n", dir.display()));
    }
    let study = if dir.join(STUDY_FILE).is_file() {
        Study::read(dir)?
    } else {
        let mut subdirs: Vec<_> = std::fs::read_dir(dir)
            .map_err(|e| CliError::input(format!("{}: {e}", dir.display())))?
            .filter_map(|e| e.ok())
            .map(|e| e.path())
            .filter(|p| SavedRun::is_run_folder(p))
            .collect();
        subdirs.sort();
        if subdirs.is_empty() {
            return Err(CliError::input(format!("{}: holds no history.csv, {STUDY_FILE} or run sub-folders", dir.display())));
        }
        let runs = subdirs.iter().map(|p| StudyRun { label: p.file_name().unwrap_or_default().to_string_lossy().into_owned(), dir: p.file_name().unwrap_or_default().to_string_lossy().into_owned() }).collect();
        Study {
            title: format!("dropcut runs in {}", dir.file_name().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()),
            description: "Every run folder found here, compared.".into(),
            groups: vec![StudyGroup { name: "runs".into(), title: "All runs".into(), description: String::new(), runs }],
        }
    };
    let (_, n) = finish_study(lib, dir, &study, true)?;
    stdout_write(&format!("drew {n} charts and the index.html pages in {}\n", dir.display()))
}

/// Redraw the band charts and index.html of an uncertainty folder (one fuel, or one sub-folder per fuel with
/// overlap.csv on top) from its saved files. None when `dir` is not an uncertainty folder.
fn redraw_uncertainty(dir: &Path) -> Result<Option<usize>, CliError> {
    use crate::output::uncertainty::{self as out, LabelledBands};
    let read = |d: &Path| -> Result<LabelledBands, CliError> {
        let mut b = LabelledBands::read(d, "")?;
        b.label = b.fuel.clone();
        Ok(b)
    };
    let mut sections = vec![];
    let mut count = 0;
    let mut labels = vec![];
    if out::is_band_folder(dir) {
        let bands = read(dir)?;
        let charts = out::write_band_charts(dir, std::slice::from_ref(&bands))?;
        count += charts.len();
        labels.push(bands.label.clone());
        sections.push(output::html::UncertaintySection { heading: bands.label.clone(), prefix: String::new(), charts, files: out::FILES.iter().map(|f| f.to_string()).collect() });
    } else if dir.join("overlap.csv").is_file() {
        // the fuels in their command-line order, as overlap.csv lists the pairs (first, later)
        let overlap = crate::output::read::CsvData::read(&dir.join("overlap.csv"))?;
        let (Some(a), Some(b)) = (overlap.index("fuel_a"), overlap.index("fuel_b")) else {
            return Err(CliError::input(format!("{}: no fuel_a/fuel_b columns", dir.join("overlap.csv").display())));
        };
        let mut order: Vec<String> = vec![];
        for row in &overlap.rows {
            for label in [&row[a], &row[b]] {
                if !order.contains(label) {
                    order.push(label.clone());
                }
            }
        }
        let subdirs: Vec<(String, std::path::PathBuf)> = order.iter().map(|l| (l.clone(), dir.join(safe_name(l)))).collect();
        if let Some((_, missing)) = subdirs.iter().find(|(_, d)| !out::is_band_folder(d)) {
            return Err(CliError::input(format!("{}: named in overlap.csv but does not hold the band files ({})", missing.display(), out::FILES.join(", "))));
        }
        let mut all = vec![];
        for (label, sub) in &subdirs {
            let mut bands = read(sub)?;
            let folder = sub.file_name().unwrap_or_default().to_string_lossy().into_owned();
            bands.label = label.clone();
            let charts = out::write_band_charts(sub, std::slice::from_ref(&bands))?;
            count += charts.len();
            labels.push(bands.label.clone());
            sections.push(output::html::UncertaintySection { heading: bands.label.clone(), prefix: format!("{folder}/"), charts, files: out::FILES.iter().map(|f| f.to_string()).collect() });
            all.push(bands);
        }
        let charts = out::write_band_charts(dir, &all)?;
        count += charts.len();
        sections.insert(0, output::html::UncertaintySection { heading: "all fuels".into(), prefix: String::new(), charts, files: vec!["overlap.csv".into()] });
    } else {
        return Ok(None);
    }
    let report = match std::fs::read_to_string(dir.join(out::REPORT_FILE)) {
        Ok(text) => text,
        Err(_) => format!("(no {} in this folder: written by an earlier version; the charts were redrawn from the band files)\n", out::REPORT_FILE),
    };
    output::html::write_uncertainty_page(dir, &format!("dropcut uncertainty: {}", labels.join(", ")), &report, &sections)?;
    Ok(Some(count))
}

/// Parsed `--vary OPTION=V1,V2,...`.
#[derive(Debug, Clone, PartialEq)]
struct Vary {
    option: String,
    values: Vec<String>,
}

fn parse_vary(text: &str, registry: &[Condition]) -> Result<Vary, CliError> {
    let usage = "use OPTION=V1,V2,... (e.g. ambient-temperature=500K,800K; for gas and ambient-vapor separate values with ';')";
    let (option, values) = text.split_once('=').ok_or_else(|| CliError::input(format!("--vary '{text}': {usage}")))?;
    let option = option.trim().trim_start_matches("--").to_string();
    let Some(condition) = conditions::find(registry, &option) else {
        return Err(CliError::input(format!("--vary: cannot vary '{option}'; one of {}", registry.iter().map(|c| c.key).collect::<Vec<_>>().join(", "))));
    };
    // values that hold commas themselves are separated by ';' only
    let sep: &[char] = if matches!(condition.kind, Kind::Gas | Kind::AmbientVapor) { &[';'] } else { &[',', ';'] };
    let values: Vec<String> = values.split(sep).map(|v| v.trim().to_string()).filter(|v| !v.is_empty()).collect();
    if values.is_empty() {
        return Err(CliError::input(format!("--vary '{text}': no values; {usage}")));
    }
    for (i, v) in values.iter().enumerate() {
        if values[..i].contains(v) {
            return Err(CliError::input(format!("--vary: value '{v}' is given twice")));
        }
    }
    Ok(Vary { option, values })
}

/// The conditions with `option` at `value` (read by the registry now, so a bad value stops before any run).
fn apply_vary(lib: &Library, c: &ConditionArgs, option: &str, value: &str) -> Result<ConditionArgs, CliError> {
    let condition = conditions::find(c.registry(), option).ok_or_else(|| CliError::input(format!("--vary: cannot vary '{option}'")))?;
    condition.parse_text(value, lib).map_err(|e| CliError::input(format!("--vary: --{e}")))?;
    let mut c = c.clone();
    c.set(option, value)?;
    Ok(c)
}

fn describe_condition(c: &ConditionArgs, varied: Option<&str>) -> String {
    let is = |name: &str| varied == Some(name);
    let mut parts = vec![match (is("gas"), is("ambient-temperature")) {
        (true, true) => "gas".to_string(),
        (true, false) => format!("gas at {}", c.get("ambient-temperature")),
        (false, true) => c.get("gas").to_string(),
        (false, false) => format!("{} at {}", c.get("gas"), c.get("ambient-temperature")),
    }];
    if !is("pressure") {
        parts.push(c.get("pressure").to_string());
    }
    if !is("diameter") {
        parts.push(format!("d0 = {}", c.get("diameter")));
    }
    if !is("droplet-temperature") {
        parts.push(format!("T0 = {}", c.get("droplet-temperature")));
    }
    if !is("velocity") {
        parts.push(format!("{} {} m/s", if c.get("injected") == "true" { "injected at" } else { "slip" }, c.get("velocity").trim_end_matches("m/s")));
    }
    if !is("activity") && c.get("activity") == "unifac" {
        parts.push("UNIFAC liquid".into());
    }
    let mut s = parts.join(", ");
    if let Some(v) = varied {
        s.push_str(&format!("; varied: {v}"));
    }
    s
}

/// Stops at the first step: used to check inputs before any run starts.
struct FirstStep;
impl Observer for FirstStep {
    fn on_step(&mut self, _row: &model::HistoryRow) -> bool {
        true
    }
    fn wants_rows(&self) -> bool {
        false
    }
}

fn unique(label: String, taken: &mut Vec<String>) -> String {
    let mut l = label.clone();
    let mut k = 2;
    while taken.contains(&l) {
        l = format!("{label}-{k}");
        k += 1;
    }
    taken.push(l.clone());
    l
}

/// `dropcut compare FUEL... [--vary OPTION=V1,V2,...]`.
pub(super) fn compare(lib: &Library, args: &CompareArgs) -> Result<(), CliError> {
    let vary = args.vary.as_deref().map(|v| parse_vary(v, args.condition.registry())).transpose()?;
    let history_times = args.history_times.as_deref().map(super::common::parse_history_times).transpose()?;
    let runs_per_fuel = vary.as_ref().map(|v| v.values.len()).unwrap_or(1);
    if args.fuels.len() * runs_per_fuel < 2 {
        return Err(CliError::input("compare needs two or more fuels, or one fuel with --vary OPTION=V1,V2,..."));
    }
    let mut fuels = vec![];
    for spec in &args.fuels {
        let f = Fuel::resolve(spec, lib)?;
        for n in &f.notices {
            notice(n);
        }
        fuels.push(f);
    }
    // (group index, label, dir, inputs)
    let mut groups: Vec<StudyGroup> = vec![];
    let mut plan = vec![];
    let mut dirs_taken = vec![];
    let conditions: Vec<(Option<String>, ConditionArgs)> = match &vary {
        None => vec![(None, args.condition.clone())],
        Some(v) => v.values.iter().map(|val| Ok((Some(val.clone()), apply_vary(lib, &args.condition, &v.option, val)?))).collect::<Result<_, CliError>>()?,
    };
    let one_group = vary.is_none() || fuels.len() == 1;
    if one_group {
        let (title, desc) = match &vary {
            None => (format!("{} fuels at the same condition", fuels.len()), describe_condition(&args.condition, None)),
            Some(v) => (format!("{} at {} values of {}", fuels[0].name, v.values.len(), v.option), format!("{}: {}", fuels[0].name, describe_condition(&args.condition, Some(&v.option)))),
        };
        groups.push(StudyGroup { name: "all".into(), title, description: desc, runs: vec![] });
    }
    for (ci, (value, cond)) in conditions.iter().enumerate() {
        if !one_group {
            let v = vary.as_ref().unwrap();
            let val = value.clone().unwrap_or_default();
            groups.push(StudyGroup {
                name: safe_name(&val),
                title: format!("{} = {}", v.option, val),
                description: format!("{}; {} = {}", describe_condition(cond, Some(&v.option)).split("; varied").next().unwrap_or(""), v.option, val),
                runs: vec![],
            });
        }
        let gi = if one_group { 0 } else { ci };
        let mut labels_taken: Vec<String> = groups[gi].runs.iter().map(|r| r.label.clone()).collect();
        for fuel in &fuels {
            let label = match (&vary, fuels.len()) {
                (Some(v), 1) => format!("{}={}", v.option, value.as_deref().unwrap_or("")),
                _ => fuel.name.clone(),
            };
            let label = unique(label, &mut labels_taken);
            let dir_base = match &vary {
                Some(v) => safe_name(&format!("{}_{}_{}", fuel.name, v.option, value.as_deref().unwrap_or(""))),
                None => safe_name(&fuel.name),
            };
            let dir = unique(dir_base, &mut dirs_taken);
            let inp = droplet_inputs(lib, fuel.clone(), cond)?;
            if let Err(e @ model::ModelError::Input { .. }) = model::simulate(&inp, &mut FirstStep) {
                return Err(CliError::input(format!("{label}: {e}")));
            }
            groups[gi].runs.push(StudyRun { label: label.clone(), dir: dir.clone() });
            plan.push((label, dir, inp));
        }
    }
    output::ensure_dir(&args.out)?;
    for (label, dir, inp) in &plan {
        progress(&format!("compare: {label} ..."));
        let run = match &history_times {
            Some(times) => model::simulate(inp, &mut model::guard::RowsAt { times: times.clone() }),
            None => model::simulate(inp, &mut model::guard::RowsOnly),
        }
        .map_err(|e| {
            let c: CliError = e.into();
            CliError { code: c.code, message: format!("{label}: {}", c.message) }
        })?;
        output::together(|| -> Result<(), CliError> {
            output::history::write_run(&args.out.join(dir), inp, &run, output::Durability::Atomic)?;
            write_droplet_residue(&args.out.join(dir), inp, &run, None).map(|_| ())
        })?;
    }
    let names = fuels.iter().map(|f| f.name.as_str()).collect::<Vec<_>>().join(", ");
    let title = match &vary {
        None => format!("dropcut comparison: {names}"),
        Some(v) => format!("dropcut comparison: {names} over {}", v.option),
    };
    let description = if vary.is_some() && fuels.len() > 1 {
        format!("Each fuel at {} values of {}; one comparison per value, the first fuel being the reference.", runs_per_fuel, vary.as_ref().map(|v| v.option.as_str()).unwrap_or(""))
    } else {
        "The same options for every run except what varies; the first run is the reference for differences.".into()
    };
    let study = Study { title, description, groups };
    study.write(&args.out)?;
    let (text, _) = finish_study(lib, &args.out, &study, !args.no_plots)?;
    stdout_write(&text)?;
    stdout_write(&format!("wrote {} (comparison.csv, comparison.txt, index.html and one folder per run)\n", args.out.display()))
}

/// Charts of a property-table folder: the mixture table and each residue table against temperature.
pub(super) fn draw_table_charts(dir: &Path) -> Result<usize, CliError> {
    let mut files: Vec<std::path::PathBuf> = std::fs::read_dir(dir)
        .map_err(|e| CliError::input(format!("{}: {e}", dir.display())))?
        .filter_map(|e| e.ok())
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "csv") && p.file_name().is_some_and(|n| n.to_string_lossy().starts_with("mixture")))
        .collect();
    files.sort();
    for f in &files {
        let stem = format!("chart_{}", f.file_stem().unwrap_or_default().to_string_lossy());
        let title = if stem.contains("residue") { "Residue liquid properties against temperature" } else { "Liquid and vapour properties against temperature" };
        crate::output::charts::table_vs_temperature(f, dir, &stem, title)?;
    }
    Ok(files.len())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn vary_parsing() {
        let reg = &crate::conditions::CONDITIONS;
        let v = parse_vary("ambient-temperature=500K, 800K", reg).unwrap();
        assert_eq!(v.option, "ambient-temperature");
        assert_eq!(v.values, vec!["500K", "800K"]);
        let g = parse_vary("gas=air;o2=0.15,n2=0.85", reg).unwrap();
        assert_eq!(g.values, vec!["air", "o2=0.15,n2=0.85"]);
        let a = parse_vary("ambient-vapor=n-decane=0.01;n-decane=0.02", reg).unwrap();
        assert_eq!(a.values, vec!["n-decane=0.01", "n-decane=0.02"]);
        assert!(parse_vary("colour=red", reg).is_err());
        assert!(parse_vary("pressure", reg).is_err());
        assert!(parse_vary("pressure=", reg).is_err());
        assert!(parse_vary("pressure=1bar,1bar", reg).is_err());
        // every registry entry can be varied
        for c in reg.iter() {
            assert!(parse_vary(&format!("{}={}", c.key, c.example), reg).is_ok(), "{}", c.key);
        }
    }

    #[test]
    fn vary_applies_to_the_condition() {
        let lib = Library::embedded().unwrap();
        let c = ConditionArgs::default();
        assert_eq!(apply_vary(&lib, &c, "liquid-mixing", "diffusion").unwrap().get("liquid-mixing"), "diffusion");
        assert_eq!(apply_vary(&lib, &c, "ambient-temperature", "500K").unwrap().get("ambient-temperature"), "500K");
        assert_eq!(apply_vary(&lib, &c, "gas", "n2").unwrap().get("gas"), "n2");
        assert!(apply_vary(&lib, &c, "liquid-heat", "warm").unwrap_err().message.contains("'warm'"));
        assert_eq!(apply_vary(&lib, &c, "activity", "unifac").unwrap().get("activity"), "unifac");
        assert!(apply_vary(&lib, &c, "activity", "raoult").is_err());
        assert!(apply_vary(&lib, &c, "correlation", "ranz-marshall").is_ok());
        assert!(apply_vary(&lib, &c, "pressure", "3 parsec").is_err());
    }

    #[test]
    fn unique_labels() {
        let mut taken = vec![];
        assert_eq!(unique("a".into(), &mut taken), "a");
        assert_eq!(unique("a".into(), &mut taken), "a-2");
        assert_eq!(unique("a".into(), &mut taken), "a-3");
    }
}
