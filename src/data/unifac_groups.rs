//! The original-UNIFAC parameter tables (data): subgroup volumes R_k and areas Q_k with their main groups, and
//! the main-group interaction parameters a_mn \[K\]. Parameter set: original UNIFAC (Fredenslund, Jones &
//! Prausnitz 1975) with the published DDBST matrix = Hansen et al. (1991), Ind. Eng. Chem. Res. 30:2352, revised
//! by Wittig, Lohmann & Gmehling (2003), Ind. Eng. Chem. Res. 42:183. The tables are the committed files
//! `mixtures/unifac/*.csv`, written by `mixtures/tools/make_unifac_tables.py` (provenance in their headers);
//! the activity-coefficient equations are in `props::activity`.

use std::collections::HashMap;
use std::sync::OnceLock;

/// One original-UNIFAC subgroup.
#[derive(Debug, Clone, PartialEq)]
pub struct Subgroup {
    /// Name used in component files (`unifac-groups`), e.g. "ACCH3".
    pub name: String,
    /// Subgroup number of the published table.
    pub number: u32,
    /// Main-group number of the published table.
    pub main_group: u32,
    /// Main-group name.
    pub main_group_name: String,
    /// Van der Waals group volume R_k \[-\].
    pub volume: f64,
    /// Van der Waals group surface area Q_k \[-\].
    pub area: f64,
}

/// The parsed parameter tables.
#[derive(Debug)]
pub struct UnifacTables {
    /// Subgroups in table order.
    pub subgroups: Vec<Subgroup>,
    /// Interaction parameters, parsed on first use (component files name subgroups; only the UNIFAC activity
    /// model needs the interactions).
    interactions: OnceLock<HashMap<(u32, u32), f64>>,
}

/// Provenance line of the parameter set, for output metadata and docs.
pub const PARAMETER_SET: &str = "original UNIFAC (Fredenslund, Jones & Prausnitz 1975), DDBST published matrix: Hansen et al. (1991) Ind. Eng. Chem. Res. 30:2352, revised by Wittig, Lohmann & Gmehling (2003) Ind. Eng. Chem. Res. 42:183";

const SUBGROUPS_CSV: &str = include_str!("../../mixtures/unifac/original-unifac-subgroups.csv");
const INTERACTIONS_CSV: &str = include_str!("../../mixtures/unifac/original-unifac-interactions.csv");

/// One row of a committed table: its fields, trimmed.
struct Row<'a> {
    fields: Vec<&'a str>,
}

impl Row<'_> {
    fn get(&self, i: usize) -> Option<&str> {
        self.fields.get(i).copied()
    }
}

/// Rows of a committed `#`-commented CSV table with a header, each with its line in the file. The two tables
/// are written by mixtures/tools/make_unifac_tables.py with plain comma-separated fields (no quoting, checked
/// by a unit test below), so a line split suffices; building a csv-crate reader costs about 0.27 M
/// instructions (its parser tables), a third of a simulate process's start-up, for a 113-row table.
fn data_rows<'a>(text: &'a str, file: &str) -> Vec<(u64, Row<'a>)> {
    let mut rows = vec![];
    let mut header_seen = false;
    for (i, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        assert!(!line.contains('"'), "{file}: line {}: quoted field in a committed table", i + 1);
        if !header_seen {
            header_seen = true;
            continue;
        }
        rows.push((i as u64 + 1, Row { fields: line.split(',').map(str::trim).collect() }));
    }
    rows
}

/// Field `i` (named `name`) of a committed table row, parsed; a malformed table is a build defect, named by
/// file, line and field.
fn field<T: std::str::FromStr>(file: &str, line: u64, row: &Row<'_>, i: usize, name: &str) -> T {
    let text = row.get(i).unwrap_or_else(|| panic!("{file}: line {line}: no field {name} (column {})", i + 1));
    text.parse().unwrap_or_else(|_| panic!("{file}: line {line}: field {name} '{text}' is not valid"))
}

fn parse() -> UnifacTables {
    // The committed tables are checked by the unit tests below; a malformed table is a build defect.
    let sub_file = "mixtures/unifac/original-unifac-subgroups.csv";
    let subgroups = data_rows(SUBGROUPS_CSV, sub_file)
        .iter()
        .map(|(line, f)| Subgroup {
            name: field(sub_file, *line, f, 0, "name"),
            number: field(sub_file, *line, f, 1, "subgroup number"),
            main_group: field(sub_file, *line, f, 2, "main-group number"),
            main_group_name: field(sub_file, *line, f, 3, "main-group name"),
            volume: field(sub_file, *line, f, 4, "R_k"),
            area: field(sub_file, *line, f, 5, "Q_k"),
        })
        .collect();
    UnifacTables { subgroups, interactions: OnceLock::new() }
}

fn parse_interactions() -> HashMap<(u32, u32), f64> {
    let int_file = "mixtures/unifac/original-unifac-interactions.csv";
    data_rows(INTERACTIONS_CSV, int_file)
        .iter()
        .map(|(line, f)| ((field(int_file, *line, f, 0, "main group m"), field(int_file, *line, f, 1, "main group n")), field(int_file, *line, f, 2, "a_mn")))
        .collect()
}

/// The tables, parsed on first use.
pub fn tables() -> &'static UnifacTables {
    static TABLES: OnceLock<UnifacTables> = OnceLock::new();
    TABLES.get_or_init(parse)
}

/// Look a subgroup up by its name (exact, case-sensitive as in the published table).
pub fn subgroup(name: &str) -> Option<&'static Subgroup> {
    tables().subgroups.iter().find(|s| s.name == name)
}

impl UnifacTables {
    /// Interaction parameter a_mn \[K\] between main groups m and n (0 for m = n); None where none is published.
    pub fn interaction(&self, m: u32, n: u32) -> Option<f64> {
        if m == n {
            return Some(0.0);
        }
        self.interactions.get_or_init(parse_interactions).get(&(m, n)).copied()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The committed tables parse, names are unique, and spot values match the published table as printed
    /// in the source named in the table header (values cross-read from Poling, Prausnitz & O'Connell 5th ed.
    /// Table 8-23/8-24 — from memory, so only the copy of the table is asserted, not the publication).
    #[test]
    fn tables_parse_and_spot_values() {
        let t = tables();
        assert_eq!(t.subgroups.len(), 113);
        let mut names: Vec<&str> = t.subgroups.iter().map(|s| s.name.as_str()).collect();
        names.sort();
        names.dedup();
        assert_eq!(names.len(), 113);
        let ach = subgroup("ACH").unwrap();
        assert_eq!((ach.number, ach.main_group, ach.volume, ach.area), (9, 3, 0.5313, 0.4));
        let ch3 = subgroup("CH3").unwrap();
        assert_eq!((ch3.main_group, ch3.volume, ch3.area), (1, 0.9011, 0.848));
        assert_eq!(t.interaction(1, 3), Some(61.13));
        assert_eq!(t.interaction(3, 1), Some(-11.12));
        assert_eq!(t.interaction(1, 5), Some(986.5));
        assert_eq!(t.interaction(5, 1), Some(156.4));
        assert_eq!(t.interaction(4, 4), Some(0.0));
        assert!(subgroup("ch3").is_none());
    }

    /// The line-split reader gives the same rows, lines and fields as the csv crate on both committed tables.
    #[test]
    fn line_split_matches_the_csv_crate() {
        for text in [SUBGROUPS_CSV, INTERACTIONS_CSV] {
            let mut reader = csv::ReaderBuilder::new().has_headers(true).comment(Some(b'#')).trim(csv::Trim::All).from_reader(text.as_bytes());
            let reference: Vec<(u64, Vec<String>)> =
                reader.records().map(|r| r.unwrap()).map(|r| (r.position().unwrap().line(), r.iter().map(String::from).collect())).collect();
            let ours: Vec<(u64, Vec<String>)> = data_rows(text, "t").into_iter().map(|(l, r)| (l, r.fields.iter().map(|f| f.to_string()).collect())).collect();
            assert!(reference.len() > 100);
            assert_eq!(ours, reference);
        }
    }
}
