//! Rows of summary.csv: `#` metadata lines, the header, one row per case, and the checks resume and merge use to
//! read files back.

use crate::model::{DropletInputs, RunOutcome, Status};
use crate::output::{Cell, CsvTable, TOOL_VERSION};

use super::shard::Shard;
use super::spec::{Case, SweepSpec, ValueText};
use crate::conditions::CONDITIONS;

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
    h.extend(CONDITIONS.iter().map(|v| v.column.to_string()));
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
    if header.iter().any(|h| h.contains("flash_point")) {
        s.push_str(&format!("# caution: residue_* columns (flash point among them): {}\n", crate::post::CAUTION));
    }
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

/// Split a row into its CSV fields (double quotes removed, `""` inside quotes read as `"`).
pub fn split_fields(line: &str) -> Vec<String> {
    let mut fields = vec![String::new()];
    let mut quoted = false;
    let mut chars = line.chars().peekable();
    while let Some(c) = chars.next() {
        match c {
            '"' if quoted && chars.peek() == Some(&'"') => {
                chars.next();
                fields.last_mut().unwrap_or(&mut String::new()).push('"');
            }
            '"' => quoted = !quoted,
            ',' if !quoted => fields.push(String::new()),
            c => {
                if let Some(f) = fields.last_mut() {
                    f.push(c);
                }
            }
        }
    }
    fields
}

/// Check one row read back from a journal, shard or summary (without its newline) against the header: case
/// id `id`, `n_fields` fields, no control characters, every result cell empty or a finite number, a known
/// status, and results that fit the status (a failed row has none; a finished one has its end time). With
/// `expected_inputs` (the row's first cells as this spec writes them for case `id`, comma included) the
/// inputs must be exactly those. Err says what is wrong.
pub fn check_row(text: &str, id: u64, n_fields: usize, expected_inputs: Option<&str>) -> Result<(), String> {
    if let Some(c) = text.chars().find(|c| c.is_control()) {
        return Err(format!("holds the control character {c:?}"));
    }
    if row_case_id(text) != Some(id) {
        return Err(format!("does not start with case id {id}"));
    }
    if field_count(text) != n_fields {
        return Err(format!("has {} fields, not {n_fields}", field_count(text)));
    }
    if let Some(prefix) = expected_inputs {
        if !text.starts_with(prefix) {
            return Err("its fuel or conditions are not those of this case id in the spec".into());
        }
    }
    let fields = split_fields(text);
    let inputs = 2 + CONDITIONS.len();
    if fields.len() != n_fields || n_fields < inputs + RESULT_COLUMNS.len() + 1 {
        return Err("cannot be split into its columns".into());
    }
    if fields[1].trim().is_empty() {
        return Err("has no fuel name".into());
    }
    for (v, cell) in CONDITIONS.iter().zip(&fields[2..inputs]) {
        if cell.starts_with(|c: char| c.is_ascii_digit() || c == '-') && cell.parse::<f64>().is_ok_and(|x| !x.is_finite()) {
            return Err(format!("{} = {cell} is not a finite number", v.column));
        }
        if matches!(cell.to_ascii_lowercase().as_str(), "nan" | "inf" | "-inf" | "infinity" | "+inf") {
            return Err(format!("{} = {cell} is not a finite number", v.column));
        }
    }
    let results = &fields[inputs..n_fields - 1];
    for (k, cell) in results.iter().enumerate() {
        if !cell.is_empty() && !cell.parse::<f64>().is_ok_and(f64::is_finite) {
            let column = RESULT_COLUMNS.get(k).copied().unwrap_or("extra column");
            return Err(format!("{column} = '{cell}' is not a finite number"));
        }
    }
    let status = fields[n_fields - 1].as_str();
    let present = |name: &str| RESULT_COLUMNS.iter().position(|c| *c == name).is_some_and(|k| !results[k].is_empty());
    if let Some(reason) = status.strip_prefix("failed: ") {
        if reason.trim().is_empty() {
            return Err("is failed without a reason".into());
        }
        if results.iter().any(|c| !c.is_empty()) {
            return Err("is marked failed but holds results".into());
        }
        return Ok(());
    }
    match status {
        "evaporated" | "time-limit" | "stopped" => {}
        other => return Err(format!("has an unknown status '{other}'")),
    }
    for need in ["max_surface_temperature_K", "end_time_s", "final_evaporated_fraction"] {
        if !present(need) {
            return Err(format!("status {status} but no {need}"));
        }
    }
    if status == "evaporated" && !present("lifetime_s") {
        return Err("status evaporated but no lifetime_s".into());
    }
    Ok(())
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

    /// The input cells of a case's row as written (case id, fuel, conditions), each followed by a comma.
    pub fn input_prefix(&mut self, spec: &SweepSpec, case: &Case) -> String {
        let cells = Self::input_cells(spec, case);
        let n = cells.len();
        let mut t = CsvTable::new(self.table.header[..n].to_vec());
        // text cells never fail to format
        let _ = t.push(cells, "summary.csv");
        let mut s = t.rows.pop().unwrap_or_default().join(",");
        s.push(',');
        s
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

    #[test]
    fn damaged_rows_are_named() {
        let n = 2 + CONDITIONS.len() + RESULT_COLUMNS.len() + 1;
        let inputs: Vec<String> = (0..CONDITIONS.len()).map(|_| "1".to_string()).collect();
        let row = |fuel: &str, results: &[&str], status: &str| {
            let mut f = vec!["3".to_string(), fuel.to_string()];
            f.extend(inputs.iter().cloned());
            f.extend(results.iter().map(|s| s.to_string()));
            f.push(status.to_string());
            f.join(",")
        };
        let good = ["0.1", "0.01", "0.05", "0.09", "0.02", "350", "", "0.1", "1"];
        assert_eq!(check_row(&row("n-decane", &good, "evaporated"), 3, n, None), Ok(()));
        let empty = ["", "", "", "", "", "", "", "", ""];
        assert_eq!(check_row(&row("n-decane", &empty, "failed: no convergence"), 3, n, None), Ok(()));
        let mut nan = good;
        nan[0] = "NaN";
        assert!(check_row(&row("n-decane", &nan, "evaporated"), 3, n, None).unwrap_err().contains("lifetime_s"));
        assert!(check_row(&row("n-de\0cane", &good, "evaporated"), 3, n, None).unwrap_err().contains("control"));
        assert!(check_row(&row("n-decane", &good, "evaporated\r"), 3, n, None).unwrap_err().contains("control"));
        assert!(check_row(&row("n-decane", &good, "failed: fake"), 3, n, None).unwrap_err().contains("holds results"));
        assert!(check_row(&row("n-decane", &good, "done"), 3, n, None).unwrap_err().contains("status"));
        assert!(check_row(&row("n-decane", &good, "evaporated"), 4, n, None).is_err());
        assert!(check_row(&row("x-fuel", &good, "evaporated"), 3, n, Some("3,n-decane,")).unwrap_err().contains("spec"));
    }
}
