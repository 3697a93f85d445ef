//! Rows of summary.csv: `#` metadata lines, the header, one row per case, and the checks resume and merge use to
//! read files back.

use crate::model::{DropletInputs, RunOutcome, Status};
use crate::output::{Cell, CsvTable, TOOL_VERSION};

use super::shard::Shard;
use super::spec::{Case, SweepSpec, VARIABLES};

/// Extra summary columns computed from a finished case (e.g. residual-liquid indicators).
///
/// The runner asks each provider for its column names once and for one value per name after each case; the
/// names go into the header (and so into resume and merge checks), after the built-in result columns.
pub trait ExtraColumns: Send + Sync {
    /// Column names, `snake_case_unit` like the built-in ones.
    fn names(&self) -> Vec<String>;
    /// One value per name for a finished case; None leaves the cell empty.
    fn values(&self, inputs: &DropletInputs, outcome: &RunOutcome) -> Vec<Option<f64>>;
}

/// Result columns written after the inputs (before extra columns and `status`).
pub const RESULT_COLUMNS: [&str; 9] = [
    "lifetime_s",
    "t10_s",
    "t50_s",
    "t90_s",
    "heatup_end_s",
    "max_surface_temperature_K",
    "boiling_onset_s",
    "end_time_s",
    "final_evaporated_fraction",
];

/// Prefix of the metadata line that marks a shard file.
pub const SHARD_LINE_PREFIX: &str = "# shard: ";
/// Prefix of the metadata line that gives the number of cases of the whole sweep.
pub const CASES_LINE_PREFIX: &str = "# cases: ";

/// Column names of summary.csv.
pub fn header(extra: &[Box<dyn ExtraColumns>]) -> Vec<String> {
    let mut h: Vec<String> = vec!["case_id".into(), "fuel".into()];
    h.extend(VARIABLES.iter().map(|v| v.column.to_string()));
    h.extend(RESULT_COLUMNS.iter().map(|s| s.to_string()));
    for e in extra {
        h.extend(e.names());
    }
    h.push("status".into());
    h
}

/// The metadata lines and the header line of a summary (each ending in a newline).
///
/// Only a shard of N > 1 carries the `# shard:` line, so shard 0/1 and a merged file equal a single-machine run.
pub fn head_text(spec: &SweepSpec, shard: Shard, header: &[String]) -> String {
    let mut s = format!("# {TOOL_VERSION} sweep summary\n");
    if let Some(name) = &spec.name {
        s.push_str(&format!("# sweep: {}\n", name.replace(['\n', '\r'], " ")));
    }
    s.push_str(&format!("# spec fingerprint: {}\n", spec.fingerprint()));
    s.push_str(&format!(
        "{CASES_LINE_PREFIX}{} (case_id counts through the fuels slowest, then the input columns left to right, the last fastest; zipped inputs move together)\n",
        spec.case_count()
    ));
    s.push_str("# units: SI (K, Pa, m, m/s, s); an empty result cell means the run did not get there; status: evaporated, time-limit or failed: <reason>\n");
    if !shard.is_whole() {
        s.push_str(&format!("{SHARD_LINE_PREFIX}{shard} (the cases with case_id % {} == {}; join the shards with dropcut merge)\n", shard.count, shard.index));
    }
    s.push_str(&header.join(","));
    s.push('\n');
    s
}

/// Shard named by a `# shard: K/N ...` line, if it is one.
pub fn parse_shard_line(line: &str) -> Option<Result<Shard, String>> {
    let rest = line.strip_prefix(SHARD_LINE_PREFIX)?;
    Some(Shard::parse(rest.split_whitespace().next().unwrap_or("")))
}

/// Number of cases named by a `# cases: T ...` line, if it is one.
pub fn parse_cases_line(line: &str) -> Option<u64> {
    line.strip_prefix(CASES_LINE_PREFIX)?.split_whitespace().next()?.parse().ok()
}

/// Number of CSV fields in a line (commas inside double quotes do not count).
pub fn field_count(line: &str) -> usize {
    let mut n = 1;
    let mut quoted = false;
    for c in line.chars() {
        match c {
            '"' => quoted = !quoted,
            ',' if !quoted => n += 1,
            _ => {}
        }
    }
    n
}

/// True when a row's last field (the status) is `failed: ...`.
pub fn is_failed_row(line: &str) -> bool {
    let line = line.trim_end_matches(['\n', '\r']);
    let mut quoted = false;
    let mut start = 0;
    for (i, c) in line.char_indices() {
        match c {
            '"' => quoted = !quoted,
            ',' if !quoted => start = i + 1,
            _ => {}
        }
    }
    line[start..].trim_start_matches('"').starts_with("failed:")
}

/// Case id at the start of a row, if it starts with one.
pub fn row_case_id(line: &str) -> Option<u64> {
    line.split(',').next()?.parse().ok()
}

/// Formats rows; one per worker thread (it reuses its buffers).
pub struct RowFormatter {
    table: CsvTable,
}

fn status_text(s: Status) -> &'static str {
    match s {
        Status::Evaporated => "evaporated",
        Status::TimeLimit => "time-limit",
        Status::Stopped => "stopped",
    }
}

impl RowFormatter {
    /// A formatter for rows under this header.
    pub fn new(header: Vec<String>) -> Self {
        RowFormatter { table: CsvTable::new(header) }
    }

    fn input_cells(spec: &SweepSpec, case: &Case) -> Vec<Cell> {
        let mut cells = vec![Cell::Text(case.id.to_string()), Cell::Text(spec.fuels()[case.fuel].entry.clone())];
        cells.extend(case.values.iter().map(|v| Cell::Text(v.csv_text())));
        cells
    }

    fn take(&mut self, cells: Vec<Cell>) -> Result<String, String> {
        self.table.rows.clear();
        self.table.push(cells, "summary.csv").map_err(|e| e.to_string())?;
        let mut line = self.table.rows.pop().unwrap_or_default().join(",");
        line.push('\n');
        Ok(line)
    }

    /// The row of a finished case (newline included); a non-finite result turns it into a failed row.
    pub fn finished(&mut self, spec: &SweepSpec, case: &Case, inputs: &DropletInputs, o: &RunOutcome, extra: &[Box<dyn ExtraColumns>]) -> String {
        let mut cells = Self::input_cells(spec, case);
        cells.extend([
            Cell::Opt(o.lifetime),
            Cell::Opt(o.t10),
            Cell::Opt(o.t50),
            Cell::Opt(o.t90),
            Cell::Opt(o.heatup_end),
            Cell::Num(o.max_surface_temperature),
            Cell::Opt(o.boiling_onset),
            Cell::Num(o.end_time),
            Cell::Num(o.final_evaporated_fraction),
        ]);
        for e in extra {
            let n = e.names().len();
            let mut v = e.values(inputs, o);
            v.resize(n, None);
            cells.extend(v.into_iter().map(Cell::Opt));
        }
        cells.push(Cell::Text(status_text(o.status).into()));
        match self.take(cells) {
            Ok(line) => line,
            Err(reason) => self.failed(spec, case, &reason),
        }
    }

    /// The row of a case that failed, with `failed: <reason>` as status (newline included).
    pub fn failed(&mut self, spec: &SweepSpec, case: &Case, reason: &str) -> String {
        let mut cells = Self::input_cells(spec, case);
        let empty = self.table.header.len() - cells.len() - 1;
        cells.extend(std::iter::repeat_n(Cell::Opt(None), empty));
        let reason = reason.replace(['\n', '\r'], " ");
        cells.push(Cell::Text(format!("failed: {}", reason.trim())));
        // Text cells never fail to format.
        self.take(cells).unwrap_or_default()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_fields_with_quotes() {
        assert_eq!(field_count("1,a,b"), 3);
        assert_eq!(field_count("1,\"a,b\",c"), 3);
        assert_eq!(field_count("1,\"say \"\"x,y\"\"\",c"), 3);
        assert_eq!(row_case_id("17,n-decane"), Some(17));
        assert_eq!(row_case_id("x,1"), None);
        assert_eq!(parse_shard_line("# shard: 2/7 (the cases ...)"), Some(Ok(Shard { index: 2, count: 7 })));
        assert_eq!(parse_cases_line("# cases: 120 (case_id ...)"), Some(120));
    }
}
