//! Comparison tables (runs side by side, differences to the first run) built from saved run folders, and the
//! study file (study.json) that lists the run folders of a demo or comparison so it can be redrawn.

use std::path::Path;

use serde::{Deserialize, Serialize};

use super::read::{interpolate_at, SavedRun};
use super::{Cell, CsvTable, OutputError, TOOL_VERSION};

/// Name of the study file in a demo or comparison folder.
pub const STUDY_FILE: &str = "study.json";

/// A set of runs written into one folder, in groups that are compared among themselves.
#[derive(Debug, Clone, Serialize, Deserialize, PartialEq)]
pub struct Study {
    /// Title of the study page.
    pub title: String,
    /// One-paragraph description.
    pub description: String,
    /// Groups of runs compared with each other.
    pub groups: Vec<StudyGroup>,
}

/// Runs compared with each other (same condition, different fuels; or one fuel at several conditions).
#[derive(Debug, Clone, Serialize, Deserialize, PartialEq)]
pub struct StudyGroup {
    /// Short name, used in file names (letters, digits, `-`, `_`).
    pub name: String,
    /// Heading.
    pub title: String,
    /// What is held fixed and what varies.
    pub description: String,
    /// The runs, the first being the reference for differences.
    pub runs: Vec<StudyRun>,
}

/// One run of a study.
#[derive(Debug, Clone, Serialize, Deserialize, PartialEq)]
pub struct StudyRun {
    /// Label in legends and tables.
    pub label: String,
    /// Run folder, relative to the study folder.
    pub dir: String,
}

impl Study {
    /// Read `study.json` from a folder.
    pub fn read(dir: &Path) -> Result<Self, OutputError> {
        let path = dir.join(STUDY_FILE);
        let text = std::fs::read_to_string(&path).map_err(|e| OutputError::Read { path: path.display().to_string(), message: e.to_string() })?;
        let study: Study = serde_json::from_str(&text).map_err(|e| OutputError::Read { path: path.display().to_string(), message: format!("not a study file: {e}") })?;
        for g in &study.groups {
            for r in &g.runs {
                let p = Path::new(&r.dir);
                if p.is_absolute() || p.components().any(|c| matches!(c, std::path::Component::ParentDir)) {
                    return Err(OutputError::Read { path: path.display().to_string(), message: format!("run folder '{}' must lie inside the study folder", r.dir) });
                }
            }
        }
        Ok(study)
    }

    /// Write `study.json` into a folder.
    pub fn write(&self, dir: &Path) -> Result<(), OutputError> {
        super::write_json(&dir.join(STUDY_FILE), self)
    }
}

/// Turn a label into a file-name-safe name (letters, digits, `.`, `-`, `_`).
pub fn safe_name(label: &str) -> String {
    let s: String = label.chars().map(|c| if c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.') { c } else { '_' }).collect();
    let s = s.trim_matches(|c| c == '_' || c == '.').to_string();
    if s.is_empty() {
        "run".into()
    } else {
        s
    }
}

/// How differences to the first run are shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Difference {
    /// In percent of the first run's value (times).
    Relative,
    /// In display units (temperatures, percentages).
    Absolute,
}

/// One compared quantity.
#[derive(Debug, Clone, Serialize)]
pub struct Metric {
    /// Column name in comparison.csv (`snake_case_unit`, SI).
    pub key: String,
    /// Row label.
    pub label: String,
    /// Display unit.
    pub unit: String,
    /// Display value = SI value × scale + offset.
    pub scale: f64,
    /// See `scale`.
    pub offset: f64,
    /// Decimals shown.
    pub decimals: usize,
    /// How the difference to the first run is shown.
    pub difference: Difference,
}

impl Metric {
    fn new(key: &str, label: &str, unit: &str, scale: f64, offset: f64, decimals: usize, difference: Difference) -> Self {
        Metric { key: key.into(), label: label.into(), unit: unit.into(), scale, offset, decimals, difference }
    }

    /// The display value of an SI value.
    pub fn display(&self, v: f64) -> f64 {
        v * self.scale + self.offset
    }

    /// Formatted display value, "–" when absent.
    pub fn format(&self, v: Option<f64>) -> String {
        match v {
            Some(v) => format!("{:.*}", self.decimals, self.display(v)),
            None => "–".into(),
        }
    }
}

/// One run's row of values (SI units).
#[derive(Debug, Clone, Serialize)]
pub struct ComparisonRow {
    /// Run label.
    pub label: String,
    /// Run folder relative to the study folder.
    pub dir: String,
    /// One value per metric, SI; `None` when the run has no value (e.g. it did not finish).
    pub values: Vec<Option<f64>>,
}

/// Runs side by side; the first row is the reference for differences.
#[derive(Debug, Clone, Serialize)]
pub struct ComparisonTable {
    /// Group name.
    pub group: String,
    /// Heading.
    pub title: String,
    /// What is held fixed and what varies.
    pub description: String,
    /// Quantities compared (rows of the printed table).
    pub metrics: Vec<Metric>,
    /// Runs (columns of the printed table).
    pub rows: Vec<ComparisonRow>,
}

/// Quantities read from summary.json: (summary key, csv key, label, unit, scale, decimals, difference).
const SUMMARY_METRICS: [(&str, &str, &str, f64, usize, Difference); 7] = [
    ("lifetime_s", "lifetime", "ms", 1e3, 3, Difference::Relative),
    ("t10_s", "t10 (10 % evaporated)", "ms", 1e3, 3, Difference::Relative),
    ("t50_s", "t50 (50 % evaporated)", "ms", 1e3, 3, Difference::Relative),
    ("t90_s", "t90 (90 % evaporated)", "ms", 1e3, 3, Difference::Relative),
    ("heatup_end_s", "end of heat-up", "ms", 1e3, 3, Difference::Relative),
    ("max_surface_temperature_K", "highest surface temperature", "K", 1.0, 1, Difference::Absolute),
    ("final_evaporated_fraction", "evaporated at the end", "%", 100.0, 1, Difference::Absolute),
];

/// Residue indicators read from residue.csv at fixed evaporated fractions:
/// (column, name, unit suffix, label, display unit, scale, offset, decimals, difference).
#[allow(clippy::type_complexity)]
const RESIDUE_METRICS: [(&str, &str, &str, &str, &str, f64, f64, usize, Difference); 6] = [
    ("bubble_point_K", "bubble_point", "K", "bubble point", "°C", 1.0, -273.15, 1, Difference::Absolute),
    ("t50_K", "t50_distillation", "K", "T50 (distillation)", "°C", 1.0, -273.15, 1, Difference::Absolute),
    ("flash_point_K", "flash_point", "K", "flash point", "°C", 1.0, -273.15, 1, Difference::Absolute),
    ("kinematic_viscosity_minus20C_m2_s", "kinematic_viscosity_minus20C", "m2_s", "viscosity at −20 °C", "mm²/s", 1e6, 0.0, 2, Difference::Relative),
    ("density_15C_kg_m3", "density_15C", "kg_m3", "density at 15 °C", "kg/m³", 1.0, 0.0, 1, Difference::Absolute),
    ("dcn", "dcn", "", "derived cetane number", "-", 1.0, 0.0, 1, Difference::Absolute),
];

/// Reads one compared value from a saved run.
type Extractor = Box<dyn Fn(&SavedRun) -> Result<Option<f64>, OutputError>>;

/// Evaporated fractions at which residue indicators are compared.
pub const RESIDUE_AT: [f64; 2] = [0.5, 0.9];

impl ComparisonTable {
    /// Build the table of a group from its saved runs: summary quantities for every run, and residue indicators
    /// at 50 % and 90 % evaporated for every indicator that at least one run's residue.csv carries.
    pub fn from_runs(group: &StudyGroup, runs: &[(&StudyRun, &SavedRun)]) -> Result<Self, OutputError> {
        let mut metrics: Vec<Metric> = SUMMARY_METRICS
            .iter()
            .map(|(key, label, unit, scale, dec, diff)| Metric::new(key, label, unit, *scale, 0.0, *dec, *diff))
            .collect();
        let mut extractors: Vec<Extractor> = SUMMARY_METRICS.iter().map(|(key, ..)| Box::new(move |r: &SavedRun| Ok(r.summary_number(key))) as Extractor).collect();
        for (col, name, unit_suffix, label, unit, scale, offset, dec, diff) in RESIDUE_METRICS {
            if !runs.iter().any(|(_, r)| r.residue.as_ref().is_some_and(|t| t.has(col) && t.has("evaporated_fraction"))) {
                continue;
            }
            for at in RESIDUE_AT {
                let pct = (at * 100.0).round() as u32;
                let key = if unit_suffix.is_empty() { format!("{name}_at{pct}pct") } else { format!("{name}_at{pct}pct_{unit_suffix}") };
                metrics.push(Metric::new(&key, &format!("{label}, residue at {pct} % evaporated"), unit, scale, offset, dec, diff));
                extractors.push(Box::new(move |r: &SavedRun| {
                    let Some(t) = &r.residue else { return Ok(None) };
                    if !t.has(col) || !t.has("evaporated_fraction") {
                        return Ok(None);
                    }
                    Ok(interpolate_at(&t.numbers("evaporated_fraction")?, &t.numbers(col)?, at))
                }));
            }
        }
        let mut rows = vec![];
        for (sr, run) in runs {
            let values = extractors.iter().map(|f| f(run)).collect::<Result<Vec<_>, _>>()?;
            rows.push(ComparisonRow { label: sr.label.clone(), dir: sr.dir.clone(), values });
        }
        Ok(ComparisonTable { group: group.name.clone(), title: group.title.clone(), description: group.description.clone(), metrics, rows })
    }

    /// Difference of row `row` to the first row for metric `m`: percent (relative) or display units (absolute).
    pub fn difference(&self, row: usize, m: usize) -> Option<f64> {
        if row == 0 {
            return None;
        }
        let v0 = self.rows.first()?.values[m]?;
        let v = self.rows.get(row)?.values[m]?;
        let metric = &self.metrics[m];
        match metric.difference {
            Difference::Relative => (v0.abs() > 0.0).then(|| 100.0 * (v - v0) / v0),
            Difference::Absolute => Some((v - v0) * metric.scale),
        }
    }

    /// Formatted difference, e.g. "+12.3 %" or "−4.1 K"; empty for the first run or a missing value.
    pub fn format_difference(&self, row: usize, m: usize) -> String {
        let Some(d) = self.difference(row, m) else { return String::new() };
        let metric = &self.metrics[m];
        let (dec, unit) = match metric.difference {
            Difference::Relative => (1, "%".to_string()),
            Difference::Absolute => (
                metric.decimals,
                match metric.unit.as_str() {
                    "%" => "pts".to_string(),
                    "°C" => "K".into(),
                    "-" => String::new(),
                    u => u.into(),
                },
            ),
        };
        let mut s = format!("{:+.*}", dec, d);
        if s[1..].chars().all(|c| c == '0' || c == '.') {
            s = format!("±{}", &s[1..]);
        }
        let s = s.replace('-', "−");
        if unit.is_empty() {
            s
        } else {
            format!("{s} {unit}")
        }
    }

    /// True when the table shows a flash point (which then needs the screening caution beside it).
    pub fn shows_flash_point(&self) -> bool {
        self.metrics.iter().any(|m| m.key.contains("flash_point"))
    }

    /// Plain-text table: one line per quantity, one column per run, differences to the first run in brackets.
    pub fn render_text(&self) -> String {
        let mut cols: Vec<Vec<String>> = vec![];
        let mut head = vec!["quantity".to_string()];
        head.extend(self.metrics.iter().map(|m| m.label.clone()));
        cols.push(head);
        let mut units = vec!["unit".to_string()];
        units.extend(self.metrics.iter().map(|m| m.unit.clone()));
        cols.push(units);
        for (r, row) in self.rows.iter().enumerate() {
            let mut c = vec![row.label.clone()];
            for (m, metric) in self.metrics.iter().enumerate() {
                let d = self.format_difference(r, m);
                let v = metric.format(row.values[m]);
                c.push(if d.is_empty() { v } else { format!("{v} ({d})") });
            }
            cols.push(c);
        }
        let widths: Vec<usize> = cols.iter().map(|c| c.iter().map(|s| s.chars().count()).max().unwrap_or(0)).collect();
        let mut s = format!("{}\n", self.title);
        if !self.description.is_empty() {
            s.push_str(&format!("{}\n", self.description));
        }
        for line in 0..cols[0].len() {
            let mut parts = vec![];
            for (k, c) in cols.iter().enumerate() {
                let cell = &c[line];
                let pad = widths[k] - cell.chars().count();
                parts.push(if k < 2 { format!("{cell}{}", " ".repeat(pad)) } else { format!("{}{cell}", " ".repeat(pad)) });
            }
            s.push_str(parts.join("  ").trim_end());
            s.push('\n');
        }
        if self.rows.len() > 1 {
            s.push_str(&format!("(in brackets: difference to {}; times in percent, temperatures in K)\n", self.rows[0].label));
        }
        if self.shows_flash_point() {
            s.push_str(&format!("caution: {}\n", crate::post::CAUTION));
        }
        s
    }
}

/// comparison.csv: one row per run and group, SI values, columns named by metric keys (residue columns appear
/// when residue tables exist; groups may differ in which columns they fill).
pub fn comparison_csv(tables: &[ComparisonTable]) -> Result<CsvTable, OutputError> {
    let mut keys: Vec<String> = vec![];
    for t in tables {
        for m in &t.metrics {
            if !keys.contains(&m.key) {
                keys.push(m.key.clone());
            }
        }
    }
    let mut header = vec!["group".to_string(), "run".into(), "folder".into()];
    header.extend(keys.iter().cloned());
    let mut csv = CsvTable::new(header);
    csv.metadata = vec![
        format!("{TOOL_VERSION} comparison table"),
        "values in SI units; *_at50pct_* / *_at90pct_*: residual liquid when 50 % / 90 % of the initial mass has evaporated".into(),
    ];
    if tables.iter().any(ComparisonTable::shows_flash_point) {
        csv.metadata.push(format!("caution: {}", crate::post::CAUTION));
    }
    for t in tables {
        for row in &t.rows {
            let mut cells = vec![Cell::Text(t.group.clone()), Cell::Text(row.label.clone()), Cell::Text(row.dir.clone())];
            for k in &keys {
                let v = t.metrics.iter().position(|m| &m.key == k).and_then(|i| row.values[i]);
                cells.push(Cell::Opt(v));
            }
            csv.push(cells, "comparison.csv")?;
        }
    }
    Ok(csv)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn table() -> ComparisonTable {
        ComparisonTable {
            group: "g".into(),
            title: "test".into(),
            description: String::new(),
            metrics: vec![
                Metric::new("lifetime_s", "lifetime", "ms", 1e3, 0.0, 3, Difference::Relative),
                Metric::new("max_surface_temperature_K", "highest surface temperature", "K", 1.0, 0.0, 1, Difference::Absolute),
            ],
            rows: vec![
                ComparisonRow { label: "a".into(), dir: "a".into(), values: vec![Some(0.002), Some(500.0)] },
                ComparisonRow { label: "b".into(), dir: "b".into(), values: vec![Some(0.003), Some(490.0)] },
                ComparisonRow { label: "c".into(), dir: "c".into(), values: vec![None, Some(500.0)] },
            ],
        }
    }

    #[test]
    fn differences_to_the_first_run() {
        let t = table();
        assert!((t.difference(1, 0).unwrap() - 50.0).abs() < 1e-9);
        assert!((t.difference(1, 1).unwrap() + 10.0).abs() < 1e-9);
        assert_eq!(t.difference(0, 0), None);
        assert_eq!(t.difference(2, 0), None);
        assert_eq!(t.format_difference(1, 0), "+50.0 %");
        assert_eq!(t.format_difference(1, 1), "−10.0 K");
        assert_eq!(t.format_difference(2, 1), "±0.0 K");
        let text = t.render_text();
        assert!(text.contains("3.000 (+50.0 %)"), "{text}");
        assert!(text.contains("–"));
    }

    #[test]
    fn csv_has_one_row_per_run() {
        let csv = comparison_csv(&[table()]).unwrap();
        assert_eq!(csv.rows.len(), 3);
        assert_eq!(csv.header[3], "lifetime_s");
        assert_eq!(csv.rows[2][3], "");
    }

    #[test]
    fn safe_names() {
        assert_eq!(safe_name("demo-wide"), "demo-wide");
        assert_eq!(safe_name("ambient-temperature=500K"), "ambient-temperature_500K");
        assert_eq!(safe_name("../x"), "x");
        assert_eq!(safe_name("///"), "run");
    }
}
