//! Fuels from a class × carbon-number table (mass % by hydrocarbon class and carbon number, as GC×GC or
//! group-type analyses report them). Each non-empty cell becomes one representative component: a library
//! component when one fits, otherwise an estimated component of the class representative structure.
//!
//! Mapping rule (docs/fuel-from-lab-data.md): a cell (class, Cn) maps to the library component of the same
//! class and carbon number whose Joback groups are closest to the class representative
//! ([`super::estimate::representative_groups`]: n-alkane, 2-methyl-alkane, n-alkylcyclohexane, decalin /
//! alkyl-decalin, n-alkylbenzene, tetralin / alkyl-tetralin, naphthalene / alkyl-naphthalene), provided the
//! structural distance (Σ |Δ group count|) is at most [`MAX_STRUCTURE_DISTANCE`] (at most about one extra
//! branch); ties go to the alphabetically first id. A `map` entry in the input overrides the rule per cell.
//! Otherwise the representative is estimated from its groups.

use std::collections::BTreeMap;
use std::path::Path;
use std::sync::Arc;

use crate::data::{suggest, Component, HydrocarbonClass, Library};
use crate::fuel::Fuel;

use super::estimate::{estimate_component, group_distance, minimum_carbon_number, representative_groups, EstimateOptions, GroupMethod};
use super::{fuel_file_text, input_error, read_back, BuildError, BuiltFuel, ComponentSpec, CompositionLine};

/// Largest structural distance at which a library component still stands for a cell.
pub const MAX_STRUCTURE_DISTANCE: u32 = 4;
/// Carbon numbers accepted in a table (the design range is C6–C22).
pub const CARBON_RANGE: std::ops::RangeInclusive<u32> = 5..=30;
/// How far the table total may be from 100 % before it is refused (it is renormalised within this) \[%\].
pub const SUM_TOLERANCE_PERCENT: f64 = 10.0;

/// The classes a table may use, in display order.
pub const TABLE_CLASSES: [HydrocarbonClass; 7] = [
    HydrocarbonClass::NAlkane,
    HydrocarbonClass::IsoAlkane,
    HydrocarbonClass::Monocycloalkane,
    HydrocarbonClass::Dicycloalkane,
    HydrocarbonClass::Alkylbenzene,
    HydrocarbonClass::Cycloaromatic,
    HydrocarbonClass::Diaromatic,
];

/// Other names accepted for the classes (lower case, singular).
const CLASS_SYNONYMS: [(&str, HydrocarbonClass); 16] = [
    ("n-paraffin", HydrocarbonClass::NAlkane),
    ("normal-alkane", HydrocarbonClass::NAlkane),
    ("iso-paraffin", HydrocarbonClass::IsoAlkane),
    ("isoparaffin", HydrocarbonClass::IsoAlkane),
    ("isoalkane", HydrocarbonClass::IsoAlkane),
    ("mono-naphthene", HydrocarbonClass::Monocycloalkane),
    ("mononaphthene", HydrocarbonClass::Monocycloalkane),
    ("cycloalkane", HydrocarbonClass::Monocycloalkane),
    ("di-naphthene", HydrocarbonClass::Dicycloalkane),
    ("dinaphthene", HydrocarbonClass::Dicycloalkane),
    ("monoaromatic", HydrocarbonClass::Alkylbenzene),
    ("mono-aromatic", HydrocarbonClass::Alkylbenzene),
    ("naphthenoaromatic", HydrocarbonClass::Cycloaromatic),
    ("tetralin", HydrocarbonClass::Cycloaromatic),
    ("naphthalene", HydrocarbonClass::Diaromatic),
    ("di-aromatic", HydrocarbonClass::Diaromatic),
];

/// Read a class name (canonical kebab-case, plural, or a listed synonym); typos get a "did you mean".
pub fn parse_class(text: &str, context: &str) -> Result<HydrocarbonClass, BuildError> {
    let t = text.trim().to_ascii_lowercase().replace(['_', ' '], "-");
    let singular = t.strip_suffix("es").filter(|s| s.ends_with("naphthalen") || s.ends_with("indan")).map(|s| format!("{s}e")).unwrap_or_else(|| t.trim_end_matches('s').to_string());
    for cand in [&t, &singular] {
        if let Some(c) = TABLE_CLASSES.iter().find(|c| c.as_str() == cand.as_str()) {
            return Ok(*c);
        }
        if let Some((_, c)) = CLASS_SYNONYMS.iter().find(|(s, _)| s == cand) {
            return Ok(*c);
        }
    }
    if matches!(singular.as_str(), "oxygenate" | "petroleum-fraction") {
        return Err(input_error(context, format!("class '{text}' cannot be used in a class table (only hydrocarbon classes: {})", class_list())));
    }
    let names = TABLE_CLASSES.iter().map(|c| c.as_str()).chain(CLASS_SYNONYMS.iter().map(|(s, _)| *s));
    let hint = suggest(&singular, names);
    Err(input_error(context, format!("unknown class '{text}'{hint} (classes: {})", class_list())))
}

fn class_list() -> String {
    TABLE_CLASSES.iter().map(|c| c.as_str()).collect::<Vec<_>>().join(", ")
}

/// Read a carbon number written `C10`, `c10` or `10`.
pub fn parse_carbon(text: &str, context: &str) -> Result<u32, BuildError> {
    let t = text.trim();
    let digits = t.strip_prefix('C').or_else(|| t.strip_prefix('c')).unwrap_or(t);
    let n: u32 = digits.trim().parse().map_err(|_| input_error(context, format!("carbon number '{t}' is not of the form C10 or 10")))?;
    if !CARBON_RANGE.contains(&n) {
        return Err(input_error(context, format!("carbon number {n} is outside C{}–C{}", CARBON_RANGE.start(), CARBON_RANGE.end())));
    }
    Ok(n)
}

/// A class × carbon-number table: mass percent per (class, carbon number).
#[derive(Debug, Clone, PartialEq)]
pub struct ClassTable {
    /// Fuel name.
    pub name: String,
    /// Description.
    pub description: String,
    /// Mass percent per cell, as given (not renormalised) \[%\].
    pub cells: BTreeMap<(HydrocarbonClass, u32), f64>,
    /// Per-cell overrides of the mapping rule: library component id.
    pub map: BTreeMap<(HydrocarbonClass, u32), String>,
    /// Where the table came from.
    pub origin: String,
}

fn check_percent(v: f64, context: &str) -> Result<f64, BuildError> {
    if !v.is_finite() {
        return Err(input_error(context, format!("{v} is not a finite number")));
    }
    if v < 0.0 {
        return Err(input_error(context, format!("mass percent {v} is negative")));
    }
    if v > 100.0 {
        return Err(input_error(context, format!("mass percent {v} is above 100")));
    }
    Ok(v)
}

fn cell_key(text: &str, context: &str) -> Result<(HydrocarbonClass, u32), BuildError> {
    let (class, carbon) = text.rsplit_once('.').ok_or_else(|| input_error(context, format!("'{text}' is not of the form class.Cn (e.g. alkylbenzene.C9)")))?;
    Ok((parse_class(class, context)?, parse_carbon(carbon, context)?))
}

impl ClassTable {
    /// Read a table from a file: `.csv` as CSV, anything else as TOML (see docs/fuel-from-lab-data.md).
    pub fn read(path: &Path) -> Result<Self, BuildError> {
        super::read_csv_or_toml(path, Self::parse_csv, Self::parse_toml)
    }

    /// Parse the CSV form: `#` metadata lines (`# name: ...`, `# description: ...`, `# map: class.Cn = id`),
    /// then a header `carbon_number,<class>,<class>,...` and one row per carbon number; empty cells are zero.
    pub fn parse_csv(text: &str, file: &str, default_name: &str) -> Result<Self, BuildError> {
        let mut table = ClassTable { name: default_name.into(), description: String::new(), cells: BTreeMap::new(), map: BTreeMap::new(), origin: file.into() };
        let mut body = String::new();
        let mut first_line = None;
        for (i, line) in text.lines().enumerate() {
            let ctx = format!("{file}: line {}", i + 1);
            if let Some(meta) = line.trim_start().strip_prefix('#') {
                let Some((key, value)) = meta.split_once(':') else { continue };
                let value = value.trim();
                match key.trim().to_ascii_lowercase().as_str() {
                    "name" => table.name = value.to_string(),
                    "description" => table.description = value.to_string(),
                    "basis" if value.eq_ignore_ascii_case("mass") => {}
                    "basis" => return Err(input_error(ctx, format!("basis '{value}': class tables are mass percent only"))),
                    "map" => {
                        let (cell, id) = value.split_once('=').ok_or_else(|| input_error(&ctx, format!("map '{value}' is not of the form class.Cn = component-id")))?;
                        table.map.insert(cell_key(cell.trim(), &ctx)?, id.trim().to_string());
                    }
                    _ => {}
                }
                continue;
            }
            if line.trim().is_empty() {
                continue;
            }
            first_line.get_or_insert(i + 1);
            body.push_str(line);
            body.push('\n');
        }
        let offset = first_line.unwrap_or(1);
        let mut rdr = csv::ReaderBuilder::new().has_headers(true).trim(csv::Trim::All).from_reader(body.as_bytes());
        let headers = rdr.headers().map_err(|e| input_error(format!("{file}: line {offset}"), format!("cannot read the header: {e}")))?.clone();
        if headers.len() < 2 {
            return Err(input_error(format!("{file}: line {offset}"), "the header needs a carbon-number column and at least one class column"));
        }
        let mut classes = vec![];
        for (j, h) in headers.iter().enumerate().skip(1) {
            let c = parse_class(h, &format!("{file}: header column {}", j + 1))?;
            if classes.contains(&c) {
                return Err(input_error(format!("{file}: header column {}", j + 1), format!("class '{h}' appears twice")));
            }
            classes.push(c);
        }
        for (r, rec) in rdr.records().enumerate() {
            let line = offset + r + 1;
            let rec = rec.map_err(|e| input_error(format!("{file}: line {line}"), format!("{e}")))?;
            let ctx = format!("{file}: line {line}");
            let carbon = parse_carbon(rec.get(0).unwrap_or(""), &ctx)?;
            for (j, class) in classes.iter().enumerate() {
                let cell = rec.get(j + 1).unwrap_or("").trim();
                if cell.is_empty() {
                    continue;
                }
                let cctx = format!("{file}: line {line}, {} C{carbon}", class.as_str());
                let v: f64 = cell.trim_end_matches('%').trim().parse().map_err(|_| input_error(&cctx, format!("'{cell}' is not a number")))?;
                let v = check_percent(v, &cctx)?;
                if table.cells.insert((*class, carbon), v).is_some() {
                    return Err(input_error(cctx, "carbon number appears twice"));
                }
            }
        }
        table.validate()?;
        Ok(table)
    }

    /// Parse the TOML form: `name`, `description`, optional `basis = "mass"`, tables
    /// `[mass-percent.<class>]` with `C10 = 8.1` entries, optional `[map]` with `"class.Cn" = "component-id"`.
    pub fn parse_toml(text: &str, file: &str, default_name: &str) -> Result<Self, BuildError> {
        let root: toml::Table = toml::from_str(text).map_err(|e| input_error(file, crate::data::toml_error_at(&e, text)))?;
        let mut table = ClassTable { name: default_name.into(), description: String::new(), cells: BTreeMap::new(), map: BTreeMap::new(), origin: file.into() };
        for (key, value) in &root {
            let ctx = format!("{file}: {key}");
            match key.as_str() {
                "name" => table.name = value.as_str().ok_or_else(|| input_error(&ctx, "must be a string"))?.to_string(),
                "description" => table.description = value.as_str().ok_or_else(|| input_error(&ctx, "must be a string"))?.to_string(),
                "basis" => {
                    if value.as_str() != Some("mass") {
                        return Err(input_error(ctx, format!("{value}: class tables are mass percent only (basis = \"mass\")")));
                    }
                }
                "mass-percent" => {
                    let classes = value.as_table().ok_or_else(|| input_error(&ctx, "must be a table of [mass-percent.<class>] tables"))?;
                    for (class_name, cells) in classes {
                        let cctx = format!("{file}: [mass-percent.{class_name}]");
                        let class = parse_class(class_name, &cctx)?;
                        let cells = cells.as_table().ok_or_else(|| input_error(&cctx, "must be a table of Cn = mass percent"))?;
                        for (carbon, v) in cells {
                            let vctx = format!("{file}: mass-percent.{class_name}.{carbon}");
                            let n = parse_carbon(carbon, &vctx)?;
                            let x = v.as_float().or_else(|| v.as_integer().map(|i| i as f64)).ok_or_else(|| input_error(&vctx, format!("{v} is not a number")))?;
                            let x = check_percent(x, &vctx)?;
                            if table.cells.insert((class, n), x).is_some() {
                                return Err(input_error(vctx, "cell given twice (class synonyms?)"));
                            }
                        }
                    }
                }
                "map" => {
                    let m = value.as_table().ok_or_else(|| input_error(&ctx, "must be a table of \"class.Cn\" = \"component-id\""))?;
                    for (cell, id) in m {
                        let mctx = format!("{file}: map.{cell}");
                        let id = id.as_str().ok_or_else(|| input_error(&mctx, "must be a component id string"))?;
                        table.map.insert(cell_key(cell, &mctx)?, id.to_string());
                    }
                }
                other => {
                    let hint = suggest(other, ["name", "description", "basis", "mass-percent", "map"].into_iter());
                    return Err(input_error(ctx, format!("unknown key '{other}'{hint}")));
                }
            }
        }
        table.validate()?;
        Ok(table)
    }

    /// Checks common to both forms: not empty, total near 100 %, overrides refer to non-empty cells.
    fn validate(&self) -> Result<(), BuildError> {
        let total = self.total_percent();
        if self.cells.values().all(|v| *v <= 0.0) {
            return Err(input_error(&self.origin, "the table is empty (no cell above zero)"));
        }
        if (total - 100.0).abs() > SUM_TOLERANCE_PERCENT {
            let hint = if total <= 1.0 + 1e-9 { " (mass fractions? give mass percent)" } else { "" };
            return Err(input_error(
                &self.origin,
                format!("cells sum to {total:.3} % of the mass; the table must describe the whole fuel (100 ± {SUM_TOLERANCE_PERCENT} %){hint}"),
            ));
        }
        for (cell, id) in &self.map {
            if self.cells.get(cell).is_none_or(|v| *v <= 0.0) {
                return Err(input_error(&self.origin, format!("map entry {}.C{} = '{id}' names a cell that has no mass", cell.0.as_str(), cell.1)));
            }
        }
        Ok(())
    }

    /// Sum of the cells \[%\].
    pub fn total_percent(&self) -> f64 {
        self.cells.values().sum()
    }

    /// The class × carbon-number mass table of a fuel (library classes and formulas); components that are not
    /// hydrocarbons of a table class (oxygenates, petroleum fractions) are an error naming them.
    pub fn of_fuel(fuel: &Fuel) -> Result<Self, BuildError> {
        let mut cells = BTreeMap::new();
        for (c, w) in fuel.components.iter().zip(&fuel.mass_fractions) {
            if !TABLE_CLASSES.contains(&c.class) {
                return Err(input_error(format!("fuel '{}'", fuel.name), format!("component '{}' has class {} which a class table cannot hold", c.id, c.class.as_str())));
            }
            *cells.entry((c.class, c.formula.carbon)).or_insert(0.0) += 100.0 * w;
        }
        Ok(ClassTable { name: format!("{}-classes", fuel.name), description: format!("class x carbon-number table of {}", fuel.name), cells, map: BTreeMap::new(), origin: format!("fuel '{}'", fuel.name) })
    }

    /// The table as CSV text in the input format of [`ClassTable::parse_csv`].
    pub fn to_csv(&self) -> String {
        let classes: Vec<HydrocarbonClass> = TABLE_CLASSES.iter().copied().filter(|c| self.cells.keys().any(|k| k.0 == *c)).collect();
        let carbons: std::collections::BTreeSet<u32> = self.cells.keys().map(|k| k.1).collect();
        let mut s = format!("# name: {}\n# description: {}\n# basis: mass\ncarbon_number", self.name, self.description);
        for c in &classes {
            s.push(',');
            s.push_str(c.as_str());
        }
        s.push('\n');
        for n in carbons {
            s.push_str(&format!("C{n}"));
            for c in &classes {
                s.push(',');
                if let Some(v) = self.cells.get(&(*c, n)) {
                    s.push_str(&super::toml_f64(*v));
                }
            }
            s.push('\n');
        }
        s
    }
}

/// Options of [`build_from_classes`].
#[derive(Debug, Clone, PartialEq)]
pub struct ClassBuildOptions {
    /// Fuel name (default: the table's).
    pub name: Option<String>,
    /// Group-contribution method for estimated components (Constantinou–Gani applies to n-/iso-alkanes;
    /// ring classes always use Joback).
    pub method: GroupMethod,
}

impl Default for ClassBuildOptions {
    fn default() -> Self {
        ClassBuildOptions { name: None, method: GroupMethod::Joback }
    }
}

/// How one cell was represented.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct CellRow {
    /// Class.
    pub class: HydrocarbonClass,
    /// Carbon number.
    pub carbon_number: u32,
    /// Mass percent after renormalisation \[%\].
    pub mass_percent: f64,
    /// Component id used.
    pub component: String,
    /// `"library"`, `"library (map)"` or `"estimated (<method>)"`.
    pub how: String,
    /// Structural distance of a library component to the representative (0 = same groups).
    pub structure_distance: Option<u32>,
}

/// Report of a class-table build.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ClassReport {
    /// One row per non-empty cell.
    pub cells: Vec<CellRow>,
    /// Mass mapped to library components \[%\].
    pub library_mass_percent: f64,
    /// Mass given to estimated components \[%\].
    pub estimated_mass_percent: f64,
    /// The table total before renormalisation \[%\].
    pub table_total_percent: f64,
    /// Notices.
    pub notes: Vec<String>,
}

/// Library component standing for a cell by the mapping rule, with its structural distance.
pub fn library_match(lib: &Library, class: HydrocarbonClass, n: u32) -> Option<(Arc<Component>, u32)> {
    let (rep, _) = representative_groups(class, n)?;
    lib.components()
        .iter()
        .filter(|c| c.class == class && c.formula.carbon == n && !c.joback_groups.is_empty())
        .map(|c| (c.clone(), group_distance(&rep, &c.joback_groups)))
        .filter(|(_, d)| *d <= MAX_STRUCTURE_DISTANCE)
        .min_by(|a, b| a.1.cmp(&b.1).then_with(|| a.0.id.cmp(&b.0.id)))
}

/// Build a fuel from a class × carbon-number table.
pub fn build_from_classes(table: &ClassTable, lib: &Library, opts: &ClassBuildOptions) -> Result<BuiltFuel<ClassReport>, BuildError> {
    let name = super::kebab_id(opts.name.as_deref().unwrap_or(&table.name));
    if name.is_empty() {
        return Err(input_error(&table.origin, "the fuel needs a name (--name)"));
    }
    let total = table.total_percent();
    let mut notes = vec![];
    if (total - 100.0).abs() > 1e-6 {
        notes.push(format!("the cells summed to {total:.4} %; renormalised to 100 %"));
    }
    let mut rows = vec![];
    let mut composition: Vec<CompositionLine> = vec![];
    let mut embedded: Vec<ComponentSpec> = vec![];
    for class in TABLE_CLASSES {
        for (&(c, n), &v) in table.cells.range((class, 0)..=(class, u32::MAX)) {
            if v <= 0.0 || c != class {
                continue;
            }
            let pct = 100.0 * v / total;
            let ctx = format!("{}: {}.C{n}", table.origin, class.as_str());
            let (id, how, dist) = if let Some(id) = table.map.get(&(class, n)) {
                let comp = lib.require_component(id, &format!("{ctx} (map)"))?;
                if comp.class != class || comp.formula.carbon != n {
                    notes.push(format!("map: {}.C{n} is represented by '{}' ({} C{})", class.as_str(), comp.id, comp.class.as_str(), comp.formula.carbon));
                }
                (comp.id.clone(), "library (map)".to_string(), None)
            } else if let Some((comp, d)) = library_match(lib, class, n) {
                (comp.id.clone(), "library".to_string(), Some(d))
            } else {
                let Some((groups, rep_name)) = representative_groups(class, n) else {
                    return Err(input_error(ctx, format!("no representative structure for {} below C{}", class.as_str(), minimum_carbon_number(class).unwrap_or(0))));
                };
                let acyclic = matches!(class, HydrocarbonClass::NAlkane | HydrocarbonClass::IsoAlkane);
                let method = if acyclic { opts.method } else { GroupMethod::Joback };
                let id = match method {
                    GroupMethod::Joback => format!("est-{}-c{n}", class.as_str()),
                    GroupMethod::ConstantinouGani => format!("est-{}-c{n}-cg", class.as_str()),
                };
                if !embedded.iter().any(|e| e.id == id) {
                    let eopts = EstimateOptions { method, boiling_point: None, class: Some(class) };
                    let spec = estimate_component(lib, &id, &format!("{rep_name} (estimated, {})", method.as_str()), &groups, &eopts, &ctx)?;
                    embedded.push(spec);
                }
                (id, format!("estimated ({})", method.as_str()), None)
            };
            rows.push(CellRow { class, carbon_number: n, mass_percent: pct, component: id.clone(), how: how.clone(), structure_distance: dist });
            match composition.iter_mut().find(|l| l.id == id) {
                Some(line) => {
                    line.fraction += pct / 100.0;
                    line.comment.push_str(&format!(" + {}.C{n}", class.as_str()));
                }
                None => composition.push(CompositionLine { id, fraction: pct / 100.0, comment: format!("{}.C{n} ({how})", class.as_str()) }),
            }
        }
    }
    if opts.method == GroupMethod::ConstantinouGani && embedded.iter().any(|e| !matches!(e.class, HydrocarbonClass::NAlkane | HydrocarbonClass::IsoAlkane)) {
        notes.push("Constantinou-Gani groups for rings are not implemented here: ring classes were estimated with Joback".into());
    }
    let library_mass: f64 = rows.iter().filter(|r| r.how.starts_with("library")).map(|r| r.mass_percent).sum();
    let estimated_mass: f64 = rows.iter().filter(|r| r.how.starts_with("estimated")).map(|r| r.mass_percent).sum();
    let header = vec![
        format!("Built by `dropcut fuel build --from-classes` from {} (dropcut {}).", table.origin, env!("CARGO_PKG_VERSION")),
        format!("Mass mapped to library components: {library_mass:.2} %; to estimated components: {estimated_mass:.2} %."),
        "Mapping rule and methods: docs/fuel-from-lab-data.md. Estimated components are defined below as [[component]] tables.".into(),
    ];
    let description = if table.description.is_empty() { format!("from the class x carbon-number table {}", table.origin) } else { table.description.clone() };
    let text = fuel_file_text(&name, &description, &header, "mass", &composition, &embedded);
    let fuel = read_back(&text, &name, lib)?;
    Ok(BuiltFuel {
        text,
        fuel,
        report: ClassReport { cells: rows, library_mass_percent: library_mass, estimated_mass_percent: estimated_mass, table_total_percent: total, notes },
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lib() -> Library {
        Library::embedded().unwrap()
    }

    #[test]
    fn class_names_and_typos() {
        assert_eq!(parse_class("n-alkanes", "x").unwrap(), HydrocarbonClass::NAlkane);
        assert_eq!(parse_class("Iso-Paraffins", "x").unwrap(), HydrocarbonClass::IsoAlkane);
        assert_eq!(parse_class("naphthalenes", "x").unwrap(), HydrocarbonClass::Diaromatic);
        assert_eq!(parse_class("alkylbenzenes", "x").unwrap(), HydrocarbonClass::Alkylbenzene);
        let e = parse_class("alkylbenzen", "x").unwrap_err().to_string();
        assert!(e.contains("did you mean 'alkylbenzene'"), "{e}");
        let e = parse_class("monocycloalkanse", "x").unwrap_err().to_string();
        assert!(e.contains("did you mean 'monocycloalkane'"), "{e}");
        assert!(parse_class("oxygenates", "x").unwrap_err().to_string().contains("cannot be used"));
        assert_eq!(parse_carbon("C12", "x").unwrap(), 12);
        assert!(parse_carbon("C99", "x").is_err());
        assert!(parse_carbon("twelve", "x").is_err());
    }

    #[test]
    fn csv_and_toml_forms_agree() {
        let csv = "# name: t\n# map: alkylbenzene.C9 = 1-2-4-trimethylbenzene\ncarbon_number,n-alkanes,alkylbenzene,iso-alkane\nC9,20,10,\nC10,30,,20\nC16,10,,10\n";
        let a = ClassTable::parse_csv(csv, "t.csv", "t").unwrap();
        let toml = "name = \"t\"\n[mass-percent.n-alkane]\nC9 = 20\nC10 = 30\nC16 = 10\n[mass-percent.alkylbenzene]\nC9 = 10\n[mass-percent.iso-alkane]\nC10 = 20\nC16 = 10\n[map]\n\"alkylbenzene.C9\" = \"1-2-4-trimethylbenzene\"\n";
        let b = ClassTable::parse_toml(toml, "t.toml", "t").unwrap();
        assert_eq!(a.cells, b.cells);
        assert_eq!(a.map, b.map);
        let built = build_from_classes(&a, &lib(), &ClassBuildOptions::default()).unwrap();
        let r = &built.report;
        // C16 iso-alkane: HMN is the only C16 iso-alkane in the library and too far from 2-methylpentadecane
        let iso16 = r.cells.iter().find(|c| c.class == HydrocarbonClass::IsoAlkane && c.carbon_number == 16).unwrap();
        assert!(iso16.how.starts_with("estimated"), "{iso16:?}");
        assert!((r.library_mass_percent - 90.0).abs() < 1e-9 && (r.estimated_mass_percent - 10.0).abs() < 1e-9);
        assert_eq!(built.fuel.len(), 6);
        assert!(built.fuel.components.iter().any(|c| c.id == "1-2-4-trimethylbenzene"));
        // the C10 iso-alkane maps to 2-methylnonane (same groups as the representative)
        assert!(r.cells.iter().any(|c| c.component == "2-methylnonane" && c.structure_distance == Some(0)));
    }

    #[test]
    fn bad_tables() {
        let bad = |csv: &str| ClassTable::parse_csv(csv, "b.csv", "b").unwrap_err().to_string();
        assert!(bad("carbon_number,n-alkane\nC10,-5\nC11,105\n").contains("negative"));
        assert!(bad("carbon_number,n-alkane\nC10,150\n").contains("above 100"));
        assert!(bad("carbon_number,n-alkane\nC10,0\n").contains("empty"));
        assert!(bad("carbon_number,n-alkane\nC10,0.5\nC11,0.5\n").contains("mass fractions?"));
        assert!(bad("carbon_number,n-alkane,n-alkanes\nC10,50,50\n").contains("twice"));
        assert!(bad("carbon_number,n-alkane\nC10,abc\n").contains("not a number"));
        assert!(bad("carbon_number,n-alkane\nC10,50\nC10,50\n").contains("twice"));
        assert!(bad("carbon_number,alkilbenzene\nC10,100\n").contains("did you mean 'alkylbenzene'"));
        let e = ClassTable::parse_toml("[mass-percent.n-alkane]\nC10 = 100\n[mapp]\n", "b.toml", "b").unwrap_err().to_string();
        assert!(e.contains("did you mean 'map'"), "{e}");
        let t = ClassTable::parse_csv("carbon_number,dicycloalkane\nC6,100\n", "b.csv", "b").unwrap();
        assert!(build_from_classes(&t, &lib(), &ClassBuildOptions::default()).unwrap_err().to_string().contains("no representative"));
    }
}
