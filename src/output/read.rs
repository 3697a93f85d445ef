//! Readers for the files we write: CSV tables with `#` metadata lines, and saved run folders
//! (history.csv, summary.json, residue.csv), so charts and pages can be redrawn without recomputing.

use std::path::{Path, PathBuf};

use crate::numerics::interp;
use super::OutputError;

fn read_err(path: &Path, message: impl Into<String>) -> OutputError {
    OutputError::Read { path: path.display().to_string(), message: message.into() }
}

/// A CSV table as written by [`super::CsvTable`]: metadata lines, a header, and rows of text cells.
#[derive(Debug, Clone, Default)]
pub struct CsvData {
    /// File the table came from (for messages).
    pub path: PathBuf,
    /// Metadata lines above the header, without the leading `#`.
    pub metadata: Vec<String>,
    /// Column names.
    pub header: Vec<String>,
    /// Rows of cells, as text (an empty cell is an empty string).
    pub rows: Vec<Vec<String>>,
}

impl CsvData {
    /// Read and parse a CSV file.
    pub fn read(path: &Path) -> Result<Self, OutputError> {
        let text = std::fs::read_to_string(path).map_err(|e| read_err(path, e.to_string()))?;
        Self::parse(&text, path)
    }

    /// Parse CSV text: leading lines starting with `#` are metadata, then one header line, then rows.
    /// Quoted cells may contain commas; every row must have as many cells as the header.
    pub fn parse(text: &str, path: &Path) -> Result<Self, OutputError> {
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut metadata = vec![];
        let mut offset = 0;
        for line in text.split_inclusive('\n') {
            let trimmed = line.trim_start();
            if let Some(rest) = trimmed.strip_prefix('#') {
                metadata.push(rest.trim().to_string());
                offset += line.len();
            } else if trimmed.trim().is_empty() {
                offset += line.len();
            } else {
                break;
            }
        }
        let body = &text[offset..];
        if let Some((header, rows)) = parse_plain(body) {
            if header.is_empty() || header.iter().all(|h| h.is_empty()) {
                return Err(read_err(path, "no header line"));
            }
            return Ok(CsvData { path: path.to_path_buf(), metadata, header, rows });
        }
        let (header, rows) = parse_with_reader(body, path)?;
        Ok(CsvData { path: path.to_path_buf(), metadata, header, rows })
    }

    /// The table that [`CsvData::parse`] reads from `table.render()`, built from the table's own cells (no
    /// formatting and parsing back) where that is certain to be the same: no name or cell holds a quote, comma,
    /// line break, CR or byte-order mark, every row is as long as the header and none renders as an empty line,
    /// and the header line can be taken neither for metadata nor for an empty header. Cells and metadata are trimmed
    /// as the parser trims them. Otherwise the table comes back unchanged, for the caller to parse its text
    /// (`table_and_parse_agree` compares both).
    pub fn from_table(table: super::CsvTable, path: &Path) -> Result<Self, super::CsvTable> {
        let plain = |c: &String| !c.contains(['"', ',', '\n', '\r', '\u{feff}']);
        let n = table.header.len();
        let header_line = table.header.join(",");
        let ok = n > 0
            && table.header.iter().any(|h| !h.trim().is_empty())
            && !header_line.trim_start().starts_with('#')
            && table.header.iter().all(plain)
            && table.rows.iter().all(|r| r.len() == n && !(n == 1 && r[0].is_empty()) && r.iter().all(plain));
        if !ok {
            return Err(table);
        }
        let trimmed = |c: String| if c.trim().len() == c.len() { c } else { c.trim().to_string() };
        let metadata = table.metadata.iter().map(|m| super::metadata_text(m).trim().to_string()).collect();
        let header = table.header.into_iter().map(trimmed).collect();
        let rows = table.rows.into_iter().map(|r| r.into_iter().map(trimmed).collect()).collect();
        Ok(CsvData { path: path.to_path_buf(), metadata, header, rows })
    }

    /// Index of a column, if present.
    pub fn index(&self, column: &str) -> Option<usize> {
        self.header.iter().position(|h| h == column)
    }

    /// True when the column is present.
    pub fn has(&self, column: &str) -> bool {
        self.index(column).is_some()
    }

    /// Numbers of a column: `None` for an empty cell; a missing column, text or a non-finite value is an error.
    pub fn numbers(&self, column: &str) -> Result<Vec<Option<f64>>, OutputError> {
        let j = self.index(column).ok_or_else(|| read_err(&self.path, format!("no column '{column}'")))?;
        self.rows
            .iter()
            .enumerate()
            .map(|(i, r)| {
                let cell = r[j].as_str();
                if cell.is_empty() {
                    return Ok(None);
                }
                match cell.parse::<f64>() {
                    Ok(v) if v.is_finite() => Ok(Some(v)),
                    _ => Err(read_err(&self.path, format!("data row {}, column '{column}': '{cell}' is not a finite number", i + 1))),
                }
            })
            .collect()
    }

    /// Numbers of a column where every cell must be filled.
    pub fn required_numbers(&self, column: &str) -> Result<Vec<f64>, OutputError> {
        self.numbers(column)?
            .into_iter()
            .enumerate()
            .map(|(i, v)| v.ok_or_else(|| read_err(&self.path, format!("data row {}, column '{column}': empty cell", i + 1))))
            .collect()
    }

    /// Only the rows of one layer when the table has a `layer` column (e.g. "mean" and "surface" rows of
    /// residue.csv); the rows of the first layer when `name` is absent; the table unchanged without the column.
    pub fn layer(mut self, name: &str) -> Self {
        if let Some(j) = self.index("layer") {
            let keep = if self.rows.iter().any(|r| r[j] == name) { name.to_string() } else { self.rows.first().map(|r| r[j].clone()).unwrap_or_default() };
            self.rows.retain(|r| r[j] == keep);
        }
        self
    }

    /// Columns whose names start with `prefix`, as (name without the prefix, full name), in file order.
    pub fn columns_with_prefix(&self, prefix: &str) -> Vec<(String, String)> {
        self.header.iter().filter_map(|h| h.strip_prefix(prefix).map(|rest| (rest.to_string(), h.clone()))).collect()
    }
}

/// The header and rows of CSV text by the `csv` reader (quoted cells, any line ends).
fn parse_with_reader(body: &str, path: &Path) -> Result<(Vec<String>, Vec<Vec<String>>), OutputError> {
    let mut reader = csv::ReaderBuilder::new().has_headers(true).flexible(false).trim(csv::Trim::All).from_reader(body.as_bytes());
    let header: Vec<String> = reader.headers().map_err(|e| read_err(path, format!("header: {e}")))?.iter().map(|s| s.to_string()).collect();
    if header.is_empty() || header.iter().all(|h| h.is_empty()) {
        return Err(read_err(path, "no header line"));
    }
    let mut rows = vec![];
    for (i, rec) in reader.records().enumerate() {
        let rec = rec.map_err(|e| read_err(path, format!("data row {}: {e}", i + 1)))?;
        rows.push(rec.iter().map(|s| s.to_string()).collect());
    }
    Ok((header, rows))
}

/// The header and rows of CSV text that holds no quote, carriage return or byte-order mark, with every line the
/// same number of cells: the lines split at `\n` (empty lines skipped) and the cells at `,`, each trimmed of
/// Unicode white space — what the `csv` reader (`Trim::All`, not flexible) returns for such text, without building
/// one (about 0.27 M instructions each). None for anything else, which the `csv` reader then parses (and
/// reports on).
fn parse_plain(body: &str) -> Option<(Vec<String>, Vec<Vec<String>>)> {
    if body.bytes().any(|b| b == b'"' || b == b'\r') || body.contains('\u{feff}') {
        return None;
    }
    let mut lines = body.split('\n').filter(|l| !l.is_empty());
    let Some(first) = lines.next() else { return Some((vec![], vec![])) };
    let header: Vec<String> = first.split(',').map(|c| c.trim().to_string()).collect();
    let mut rows = vec![];
    for line in lines {
        let mut row = Vec::with_capacity(header.len());
        row.extend(line.split(',').map(|c| c.trim().to_string()));
        if row.len() != header.len() {
            return None;
        }
        rows.push(row);
    }
    Some((header, rows))
}

/// A run folder read back from disk: the history, the summary and, when present, the residue table.
#[derive(Debug, Clone)]
pub struct SavedRun {
    /// The folder.
    pub dir: PathBuf,
    /// history.csv.
    pub history: CsvData,
    /// summary.json, as a JSON value (fields are read leniently so older folders still plot).
    pub summary: serde_json::Value,
    /// residue.csv, when the run wrote one.
    pub residue: Option<CsvData>,
    /// Component ids in history order, with their hydrocarbon class ("" when unknown).
    pub components: Vec<(String, String)>,
    /// profiles.csv (radial profiles of a resolved-liquid run), when the run wrote one.
    pub profiles: Option<CsvData>,
}

impl SavedRun {
    /// True when `dir` holds a run (a history.csv).
    pub fn is_run_folder(dir: &Path) -> bool {
        dir.join("history.csv").is_file()
    }

    /// Read a run folder. summary.json is optional (an empty object when absent); residue.csv is optional.
    pub fn load(dir: &Path) -> Result<Self, OutputError> {
        let read = |name: &str| -> Result<Option<String>, OutputError> {
            let path = dir.join(name);
            if !path.is_file() {
                return Ok(None);
            }
            std::fs::read_to_string(&path).map(Some).map_err(|e| read_err(&path, e.to_string()))
        };
        let history_path = dir.join("history.csv");
        let history = std::fs::read_to_string(&history_path).map_err(|e| read_err(&history_path, e.to_string()))?;
        let parsed = |name: &str| -> Result<Option<CsvData>, OutputError> { read(name)?.map(|t| CsvData::parse(&t, &dir.join(name))).transpose() };
        Self::assemble(dir, || CsvData::parse(&history, &history_path), || read("summary.json"), || parsed("residue.csv"), || parsed("profiles.csv"))
    }

    /// A run folder from the texts of its files (history.csv; summary.json, residue.csv and profiles.csv when
    /// present), parsed exactly as [`SavedRun::load`] parses the files: a command that has just written them
    /// draws its page without reading them back.
    pub fn from_texts(dir: &Path, history: &str, summary: Option<&str>, residue: Option<&str>, profiles: Option<&str>) -> Result<Self, OutputError> {
        let parsed = |t: Option<&str>, name: &str| -> Result<Option<CsvData>, OutputError> { t.map(|t| CsvData::parse(t, &dir.join(name))).transpose() };
        Self::assemble(dir, || CsvData::parse(history, &dir.join("history.csv")), || Ok(summary.map(str::to_string)), || parsed(residue, "residue.csv"), || parsed(profiles, "profiles.csv"))
    }

    /// A run folder from the tables and texts just written (history.csv, summary.json, residue.csv and
    /// profiles.csv when present): each table taken as [`CsvData::from_table`] where that equals parsing its
    /// text, else its text parsed as [`SavedRun::load`] parses the file.
    pub fn from_tables(dir: &Path, history: (super::CsvTable, &str), summary: Option<&str>, residue: Option<(super::CsvTable, &str)>, profiles: Option<(super::CsvTable, &str)>) -> Result<Self, OutputError> {
        let take = |(table, text): (super::CsvTable, &str), name: &str| -> Result<CsvData, OutputError> {
            let path = dir.join(name);
            match CsvData::from_table(table, &path) {
                Ok(data) => Ok(data),
                Err(_) => CsvData::parse(text, &path),
            }
        };
        Self::assemble(
            dir,
            || take(history, "history.csv"),
            || Ok(summary.map(str::to_string)),
            || residue.map(|r| take(r, "residue.csv")).transpose(),
            || profiles.map(|p| take(p, "profiles.csv")).transpose(),
        )
    }

    /// Parse the files in the order [`SavedRun::load`] has always read them (so the first error is the same).
    fn assemble(
        dir: &Path,
        history: impl FnOnce() -> Result<CsvData, OutputError>,
        summary: impl FnOnce() -> Result<Option<String>, OutputError>,
        residue: impl FnOnce() -> Result<Option<CsvData>, OutputError>,
        profiles: impl FnOnce() -> Result<Option<CsvData>, OutputError>,
    ) -> Result<Self, OutputError> {
        let history = history()?;
        for col in ["time_s", "evaporated_fraction", "d2_ratio", "surface_temperature_K"] {
            if !history.has(col) {
                return Err(read_err(&history.path, format!("no column '{col}': not a dropcut history file")));
            }
        }
        let summary_path = dir.join("summary.json");
        let summary = match summary()? {
            Some(text) => serde_json::from_str(&text).map_err(|e| read_err(&summary_path, format!("not valid JSON: {e}")))?,
            None => serde_json::Value::Object(Default::default()),
        };
        let residue = residue()?.map(|r| r.layer("mean"));
        let classes: Vec<(String, String)> = summary
            .get("component_classes")
            .and_then(|v| v.as_array())
            .map(|a| {
                a.iter()
                    .filter_map(|p| {
                        let p = p.as_array()?;
                        Some((p.first()?.as_str()?.to_string(), p.get(1)?.as_str()?.to_string()))
                    })
                    .collect()
            })
            .unwrap_or_default();
        let components = history
            .columns_with_prefix("Yliq_")
            .into_iter()
            .map(|(id, _)| {
                let class = classes.iter().find(|(c, _)| *c == id).map(|(_, k)| k.clone()).unwrap_or_default();
                (id, class)
            })
            .collect();
        let profiles = profiles()?;
        Ok(SavedRun { dir: dir.to_path_buf(), history, summary, residue, components, profiles })
    }

    /// A number from summary.json (top level), if present and finite.
    pub fn summary_number(&self, key: &str) -> Option<f64> {
        self.summary.get(key).and_then(|v| v.as_f64()).filter(|v| v.is_finite())
    }

    /// A number from the input echo in summary.json.
    pub fn input_number(&self, key: &str) -> Option<f64> {
        self.summary.get("input").and_then(|i| i.get(key)).and_then(|v| v.as_f64()).filter(|v| v.is_finite())
    }

    /// A text field from summary.json (top level or input echo).
    pub fn summary_text(&self, key: &str) -> Option<String> {
        let v = self.summary.get(key).or_else(|| self.summary.get("input").and_then(|i| i.get(key)))?;
        v.as_str().map(|s| s.to_string())
    }

    /// Fuel name: from summary.json, else from the history metadata, else the folder name.
    pub fn fuel_name(&self) -> String {
        if let Some(f) = self.summary_text("fuel") {
            return f;
        }
        for m in &self.history.metadata {
            if let Some(rest) = m.strip_prefix("fuel: ") {
                return rest.split(" (").next().unwrap_or(rest).to_string();
            }
        }
        self.dir.file_name().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "run".into())
    }

    /// Initial diameter \[m\]: from summary.json, else from the first history row.
    pub fn initial_diameter(&self) -> Option<f64> {
        self.input_number("initial_diameter_m").or_else(|| self.history.numbers("diameter_m").ok().and_then(|d| d.first().copied().flatten()))
    }
}

/// Linear interpolation of `y` at `x = at` over rows sorted by x; empty cells are skipped. `None` outside the data.
pub fn interpolate_at(x: &[Option<f64>], y: &[Option<f64>], at: f64) -> Option<f64> {
    let pts: Vec<(f64, f64)> = x.iter().zip(y).filter_map(|(a, b)| Some(((*a)?, (*b)?))).collect();
    for w in pts.windows(2) {
        let ((x0, y0), (x1, y1)) = (w[0], w[1]);
        let (lo, hi) = if x0 <= x1 { (x0, x1) } else { (x1, x0) };
        if at >= lo && at <= hi {
            if (x1 - x0).abs() < f64::MIN_POSITIVE {
                return Some(y0);
            }
            return Some(interp::lerp(x0, y0, x1, y1, at));
        }
    }
    if pts.len() == 1 && (pts[0].0 - at).abs() < 1e-12 {
        return Some(pts[0].1);
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_metadata_header_numbers_and_empty_cells() {
        let text = "# dropcut test\n# second line\ntime_s,value_K,regime,note\n0,300,heating,\"a, b\"\n1e-3,,boiling,x\n";
        let t = CsvData::parse(text, Path::new("t.csv")).unwrap();
        assert_eq!(t.metadata, vec!["dropcut test", "second line"]);
        assert_eq!(t.header, vec!["time_s", "value_K", "regime", "note"]);
        assert_eq!(t.rows.len(), 2);
        assert_eq!(t.rows[0][3], "a, b");
        let v = t.numbers("value_K").unwrap();
        assert_eq!(v, vec![Some(300.0), None]);
        assert!(t.required_numbers("value_K").is_err());
        assert!(t.numbers("regime").unwrap_err().to_string().contains("not a finite number"));
        assert!(t.numbers("missing").unwrap_err().to_string().contains("no column 'missing'"));
    }

    #[test]
    fn keeps_one_layer() {
        let t = CsvData::parse("layer,x\nmean,1\nsurface,2\nmean,3\n", Path::new("r.csv")).unwrap();
        assert_eq!(t.clone().layer("mean").numbers("x").unwrap(), vec![Some(1.0), Some(3.0)]);
        assert_eq!(t.clone().layer("other").numbers("x").unwrap(), vec![Some(1.0), Some(3.0)]);
        let u = CsvData::parse("x\n1\n", Path::new("r.csv")).unwrap();
        assert_eq!(u.layer("mean").rows.len(), 1);
    }

    #[test]
    fn plain_text_is_split_as_the_csv_reader_splits_it() {
        // random texts over an alphabet of cell text, separators, Unicode and ASCII white space and the characters
        // that send a text to the csv reader (quote, CR, byte-order mark): wherever the plain split answers, it
        // answers what the reader returns, and it answers for the tables dropcut writes
        let alphabet = ["a", "1", "e-3", ",", ",", "\n", "\n", " ", "\t", "\u{a0}", "\u{2003}", "\u{feff}", "\"", "\r", "#", "é", "\u{b}"];
        let mut state: u64 = 0x9e37_79b9_7f4a_7c15;
        let mut next = |n: usize| {
            state = state.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
            ((state >> 33) % n as u64) as usize
        };
        let (mut plain, mut compared) = (0, 0);
        for _ in 0..60_000 {
            let len = 1 + next(40);
            let body: String = (0..len).map(|_| alphabet[next(alphabet.len())]).collect();
            let Some((header, rows)) = parse_plain(&body) else { continue };
            plain += 1;
            match parse_with_reader(&body, Path::new("x.csv")) {
                Ok((h, r)) => {
                    compared += 1;
                    assert_eq!((&header, &rows), (&h, &r), "{body:?}");
                }
                // the reader refuses only a text without a header; parse() refuses that one too
                Err(e) => assert!(header.is_empty() || header.iter().all(|h| h.is_empty()), "{body:?}: {e}"),
            }
        }
        assert!(plain > 4_000 && compared > 3_000, "{plain} plain, {compared} compared");
        // dropcut's own tables take the plain path
        let table = "time_s,evaporated_fraction,regime\n0,0,heating\n1e-5,0.25,evaporating\n";
        assert!(parse_plain(table).is_some());
        assert!(parse_plain("a,b\n\"x,y\",1\n").is_none());
        assert!(parse_plain("a,b\r\n1,2\r\n").is_none());
        assert!(parse_plain("a,b\n1\n").is_none());
    }

    /// A table taken directly equals the parse of its rendered text; tables where that could differ are refused.
    #[test]
    fn table_and_parse_agree() {
        use crate::output::{Cell, CsvTable};
        let path = Path::new("t.csv");
        let same = |t: CsvTable| -> bool {
            let parsed = CsvData::parse(&t.render(), path).ok();
            match CsvData::from_table(t, path) {
                Ok(direct) => {
                    let parsed = parsed.unwrap_or_else(|| panic!("a table taken directly parses: {:?}", direct.header));
                    assert_eq!((&direct.metadata, &direct.header, &direct.rows), (&parsed.metadata, &parsed.header, &parsed.rows));
                    true
                }
                Err(_) => false,
            }
        };
        let table = |meta: &[&str], header: &[&str], rows: &[&[&str]]| {
            let mut t = CsvTable::new(header.iter().map(|h| h.to_string()).collect());
            t.metadata = meta.iter().map(|m| m.to_string()).collect();
            for r in rows {
                t.push(r.iter().map(|c| Cell::Text(c.to_string())).collect(), "t.csv").unwrap();
            }
            t
        };
        // taken directly (and equal to the parse)
        assert!(same(table(&["dropcut 0.1", "  fuel: a\tb\nc ", "", "esc \u{1b} x"], &["time_s", "x"], &[&["0", "1e-5"], &[" 2 ", ""], &["\u{a0}3", "é"]])));
        let mut numbers = CsvTable::new(vec!["a".into(), "b".into()]);
        numbers.push(vec![Cell::Num(1.5e-7), Cell::Opt(None)], "t.csv").unwrap();
        assert!(same(numbers));
        assert!(same(table(&[], &["only"], &[&["1"], &["2"]])));
        // refused: quoting, an empty line, a header read as metadata or blank, ragged rows, CR, BOM
        assert!(!same(table(&[], &["a", "b"], &[&["x, y", "1"]])));
        assert!(!same(table(&[], &["a", "b"], &[&["say \"hi\"", "1"]])));
        assert!(!same(table(&[], &["a"], &[&["1"], &[""], &["2"]])));
        assert!(!same(table(&[], &["#a", "b"], &[&["1", "2"]])));
        assert!(!same(table(&[], &[" ", ""], &[&["1", "2"]])));
        assert!(!same(table(&[], &["a", "b"], &[&["1"]])));
        assert!(!same(table(&[], &["a", "b"], &[&["1\r", "2"]])));
        assert!(!same(table(&[], &["\u{feff}a", "b"], &[&["1", "2"]])));
    }

    #[test]
    fn rejects_ragged_rows_and_nan() {
        assert!(CsvData::parse("a,b\n1\n", Path::new("x.csv")).is_err());
        let t = CsvData::parse("a\nNaN\n", Path::new("x.csv")).unwrap();
        assert!(t.numbers("a").is_err());
    }

    #[test]
    fn interpolates_and_skips_gaps() {
        let x = [Some(0.0), Some(0.4), Some(0.6), Some(1.0)];
        let y = [Some(10.0), None, Some(16.0), Some(20.0)];
        assert!((interpolate_at(&x, &y, 0.3).unwrap() - 13.0).abs() < 1e-12);
        assert!((interpolate_at(&x, &y, 0.8).unwrap() - 18.0).abs() < 1e-12);
        assert_eq!(interpolate_at(&x, &y, 1.5), None);
    }
}
