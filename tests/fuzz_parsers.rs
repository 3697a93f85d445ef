//! Property-based fuzzing of every parser of user input: the unit parser, fuel files, component files, sweep
//! specs, limits files, uncertainty files, ambient-gas text, and the fuel-build readers (class tables, distillation curves, group
//! strings). Inputs are arbitrary strings and structured mutations of valid files (lines deleted, duplicated
//! or swapped, numbers replaced by NaN/inf/huge/negative/typed values, text truncated, random characters
//! inserted). The properties: a parser never panics, and an error is one line (no newline in its message).
//! A quantity it accepts is finite.
//!
//! `cargo test --release --test fuzz_parsers` runs a few hundred cases per target; `tests/fuzz/run.sh` runs
//! many more (PROPTEST_CASES) for a bounded time. A failing input proptest finds becomes a regression case in
//! `regressions()` below.

use std::path::Path;
use std::sync::OnceLock;

use dropcut::data::{Component, Library};
use dropcut::fuel::build::classes::ClassTable;
use dropcut::fuel::build::distillation::DistillationCurve;
use dropcut::fuel::build::estimate::parse_groups;
use dropcut::fuel::Fuel;
use dropcut::post::Limits;
use dropcut::props::gas::AmbientGas;
use dropcut::sweep::spec::SweepSpec;
use dropcut::uncertainty::UncertaintySpec;
use dropcut::units::{self, Quantity};
use proptest::prelude::*;

fn lib() -> &'static Library {
    static LIB: OnceLock<Library> = OnceLock::new();
    LIB.get_or_init(|| Library::embedded().expect("embedded library"))
}

const MANIFEST: &str = env!("CARGO_MANIFEST_DIR");

fn read(rel: &str) -> String {
    std::fs::read_to_string(Path::new(MANIFEST).join(rel)).unwrap_or_else(|e| panic!("{rel}: {e}"))
}

fn valid_fuel() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("mixtures/demo-wide.toml"))
}
fn valid_blend() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("mixtures/demo-blend.toml"))
}
fn valid_component() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("tests/bad_inputs/component-valid.toml.txt"))
}
fn valid_spec() -> &'static str {
    "name = \"fuzz\"\nfuels = [\"n-decane\", \"demo-narrow\"]\nzipped = [[\"diameter\", \"velocity\"]]\n[conditions]\nambient-temperature = { from = \"500K\", to = \"1000K\", steps = 3 }\npressure = [\"1bar\", \"10bar\"]\ndiameter = [\"20um\", \"50um\"]\nvelocity = [0, 5]\nmax-time = { from = \"1ms\", to = \"1s\", steps = 4, scale = \"log\" }\ngas = \"o2=0.15,n2=0.85\"\nambient-vapor = \"n-decane=0.01\"\nnodes = 20\n[model]\nreference-weight = 0.3333\nend-mass-fraction = 0.001\n[output]\nhistories = false\n"
}
fn valid_limits() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("limits/aviation-turbine-fuel.toml"))
}
fn valid_classes_csv() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("examples/kerosene-classes.csv"))
}
fn valid_classes_toml() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("examples/kerosene-classes.toml"))
}
fn valid_distillation_toml() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("examples/jet-a1-d86.toml"))
}
fn valid_distillation_csv() -> &'static str {
    static T: OnceLock<String> = OnceLock::new();
    T.get_or_init(|| read("examples/diesel-tbp.csv"))
}

/// Values a mutation may put where a number was.
const NASTY: [&str; 24] = [
    "nan", "-nan", "inf", "-inf", "1e308", "1e400", "-1", "0", "-0.0", "1e-320", "\"1\"", "\"\"", "true", "[]", "{}",
    "\"nan\"", "\"-300degC\"", "\"1e999 bar\"", "99999999999999999999", "0x10", "1_000", "\"5 parsec\"", "\"\\u0000\"", "1979-05-27",
];

/// One structured edit of a text file.
#[derive(Debug, Clone)]
enum Mutation {
    DeleteLine(usize),
    DuplicateLine(usize),
    SwapLines(usize, usize),
    ReplaceNumber(usize, usize),
    Truncate(usize),
    Insert(usize, String),
}

fn mutation() -> impl Strategy<Value = Mutation> {
    prop_oneof![
        any::<usize>().prop_map(Mutation::DeleteLine),
        any::<usize>().prop_map(Mutation::DuplicateLine),
        (any::<usize>(), any::<usize>()).prop_map(|(a, b)| Mutation::SwapLines(a, b)),
        (any::<usize>(), 0..NASTY.len()).prop_map(|(a, b)| Mutation::ReplaceNumber(a, b)),
        any::<usize>().prop_map(Mutation::Truncate),
        (any::<usize>(), "[\\[\\]{}=,\"#\\n. a-z0-9\\-]{1,8}").prop_map(|(a, s)| Mutation::Insert(a, s)),
    ]
}

fn apply(text: &str, mutations: &[Mutation]) -> String {
    let mut lines: Vec<String> = text.lines().map(String::from).collect();
    for m in mutations {
        let n = lines.len().max(1);
        match m {
            Mutation::DeleteLine(i) => {
                if !lines.is_empty() {
                    lines.remove(i % n);
                }
            }
            Mutation::DuplicateLine(i) => {
                if !lines.is_empty() {
                    let l = lines[i % n].clone();
                    lines.insert(i % n, l);
                }
            }
            Mutation::SwapLines(a, b) => {
                if !lines.is_empty() {
                    lines.swap(a % n, b % n);
                }
            }
            Mutation::ReplaceNumber(i, v) => {
                // the k-th number-looking token of the whole text (k = i modulo their count)
                let joined = lines.join("\n");
                let spans: Vec<(usize, usize)> = number_spans(&joined);
                if !spans.is_empty() {
                    let (a, b) = spans[i % spans.len()];
                    let replaced = format!("{}{}{}", &joined[..a], NASTY[*v], &joined[b..]);
                    lines = replaced.lines().map(String::from).collect();
                }
            }
            Mutation::Truncate(i) => {
                let joined = lines.join("\n");
                let mut cut = i % (joined.len() + 1);
                while !joined.is_char_boundary(cut) {
                    cut -= 1;
                }
                lines = joined[..cut].lines().map(String::from).collect();
            }
            Mutation::Insert(i, s) => {
                let joined = lines.join("\n");
                let mut at = i % (joined.len() + 1);
                while !joined.is_char_boundary(at) {
                    at -= 1;
                }
                let inserted = format!("{}{}{}", &joined[..at], s, &joined[at..]);
                lines = inserted.lines().map(String::from).collect();
            }
        }
    }
    let mut out = lines.join("\n");
    out.push('\n');
    out
}

/// Byte spans of number-looking tokens (digits with . e E + -).
fn number_spans(text: &str) -> Vec<(usize, usize)> {
    let b = text.as_bytes();
    let mut spans = vec![];
    let mut i = 0;
    while i < b.len() {
        if b[i].is_ascii_digit() && (i == 0 || !(b[i - 1].is_ascii_alphanumeric() || b[i - 1] == b'-' || b[i - 1] == b'_')) {
            let start = i;
            while i < b.len() && (b[i].is_ascii_digit() || matches!(b[i], b'.' | b'e' | b'E' | b'+' | b'-')) {
                i += 1;
            }
            spans.push((start, i));
        } else {
            i += 1;
        }
    }
    spans
}

/// The properties shared by every parser: an error message is one line.
fn one_line<T, E: std::fmt::Display>(r: Result<T, E>) -> Result<Option<T>, TestCaseError> {
    match r {
        Ok(v) => Ok(Some(v)),
        Err(e) => {
            let msg = e.to_string();
            prop_assert!(!msg.contains('\n'), "multi-line error: {msg:?}");
            prop_assert!(!msg.is_empty(), "empty error message");
            Ok(None)
        }
    }
}

const QUANTITIES: [Quantity; 7] = [
    Quantity::Temperature,
    Quantity::TemperatureDifference,
    Quantity::Pressure,
    Quantity::Length,
    Quantity::Velocity,
    Quantity::Time,
    Quantity::Dimensionless,
];

fn check_units(text: &str) -> Result<(), TestCaseError> {
    for q in QUANTITIES {
        if let Some(v) = one_line(units::parse(text, q))? {
            prop_assert!(v.is_finite(), "{text:?} as {q:?} gave {v}");
            if q == Quantity::Temperature {
                prop_assert!(v >= 0.0, "{text:?} gave {v} K");
            }
        }
    }
    Ok(())
}

fn check_fuel(text: &str) -> Result<(), TestCaseError> {
    if let Some(f) = one_line(Fuel::parse(text, "fuzz.toml", lib()))? {
        let s: f64 = f.mass_fractions.iter().sum();
        prop_assert!((s - 1.0).abs() < 1e-9 && f.mass_fractions.iter().all(|w| w.is_finite() && *w >= 0.0), "fractions {:?}", f.mass_fractions);
    }
    Ok(())
}

fn check_component(text: &str) -> Result<(), TestCaseError> {
    if let Some(c) = one_line(Component::parse(text, "fuzz.toml"))? {
        prop_assert!(c.molar_mass().is_finite() && c.molar_mass() > 0.0);
        let mut lib = lib().clone();
        // a parsed component either joins the library or is refused with one line (duplicate id, unknown source)
        let added = lib.add_component(c).and_then(|_| lib.check_sources());
        one_line(added)?;
    }
    Ok(())
}

fn check_spec(text: &str) -> Result<(), TestCaseError> {
    if let Some(spec) = one_line(SweepSpec::parse(text, "fuzz.toml", Path::new("."), lib()))? {
        prop_assert!(spec.case_count() >= 1);
        let last = spec.case(spec.case_count() - 1);
        prop_assert!(last.is_some());
    }
    Ok(())
}

fn check_limits(text: &str) -> Result<(), TestCaseError> {
    if let Some(l) = one_line(Limits::parse(text, "fuzz.toml"))? {
        prop_assert!(l.windows.iter().all(|w| w.min.is_none_or(f64::is_finite) && w.max.is_none_or(f64::is_finite)));
    }
    Ok(())
}

fn valid_uncertainty() -> &'static str {
    "[conditions]\nambient-temperature = { sd = \"10K\" }\npressure = \"2%\"\ndiameter = { half-width = \"3um\" }\nvelocity = { relative-half-width = 0.2 }\ndroplet-temperature = 5\n[composition]\naromatics = 0.1\nn-decane = \"5%\"\neach-component = { relative-half-width = 0.02 }\n[properties]\nscale = 1.0\ndistribution = \"normal\"\nvapor-pressure = 0.03\n"
}

fn check_uncertainty(text: &str) -> Result<(), TestCaseError> {
    one_line(UncertaintySpec::parse(text, "fuzz.toml", lib()))?;
    Ok(())
}

fn check_gas(text: &str) -> Result<(), TestCaseError> {
    one_line(AmbientGas::parse(lib(), text))?;
    Ok(())
}

fn check_build(text: &str) -> Result<(), TestCaseError> {
    one_line(ClassTable::parse_csv(text, "fuzz.csv", "fuzz"))?;
    one_line(ClassTable::parse_toml(text, "fuzz.toml", "fuzz"))?;
    one_line(DistillationCurve::parse_csv(text, "fuzz.csv", "fuzz"))?;
    one_line(DistillationCurve::parse_toml(text, "fuzz.toml", "fuzz"))?;
    one_line(parse_groups(text, "--from-groups"))?;
    Ok(())
}

/// Inputs that once broke a parser (or nearly did), kept as fixed cases.
#[test]
fn regressions() {
    type Check = fn(&str) -> Result<(), TestCaseError>;
    let cases: &[(&str, Check)] = &[
        ("n-decane = 1e308\nn-dodecane = 1e308\nname = \"x\"\nbasis = \"mass\"\n", check_fuel),
        ("name = \"x\"\nbasis = \"mass\"\n[composition]\nn-decane = 1e308\nn-dodecane = 1e308\n", check_fuel),
        ("name = \"x\"\nbasis = \"mass\"\n[composition]\n\"n-dec\\u001bane\" = 1\n", check_fuel),
        ("-300degC", check_units),
        ("1e-400", check_units),
        ("--3", check_units),
        ("e5", check_units),
        ("5e", check_units),
        ("µm", check_units),
        ("[limits]\n", check_limits),
        ("title = \"x\"\n[limits.dcn]\nmin = 1e400\n", check_limits),
        ("o2=1e400", check_gas),
        ("=", check_gas),
        ("CH3=99999999999999999999", check_build),
        // found by fuel_build_inputs_mutated: a line break in a group string was echoed into a multi-line error
        ("# comment\nname = \"x\"\nCH3=2", check_build),
        // found by tests/fuzz/run.sh (fuel_build_inputs_mutated): a quoted CSV header cell with a line break
        ("carbon_number,\"n-alkane\nname = x\"\nC10,100\n", check_build),
        // found by tests/fuzz/run.sh (uncertainty_mutated): a multi-line string value echoed into the error
        ("[properties]\nscale = \"\"\"\n\"\nscale = \"\"\"\n", check_uncertainty),
        ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = { from = 1e-300, to = 1e300, steps = 10000000, scale = \"log\" }\n", check_spec),
    ];
    for (text, check) in cases {
        check(text).unwrap_or_else(|e| panic!("{text:?}: {e}"));
    }
}

proptest! {
    #![proptest_config(ProptestConfig { failure_persistence: None, ..ProptestConfig::default() })]

    #[test]
    fn units_never_panic(text in "\\PC{0,24}") {
        check_units(&text)?;
    }

    #[test]
    fn units_number_and_unit(n in prop_oneof![any::<f64>().prop_map(|x| x.to_string()), "[-+]?[0-9]{0,6}(\\.[0-9]{0,4})?([eE][-+]?[0-9]{1,4})?"],
                             sep in "[ ]{0,2}",
                             unit in "(K|k|degC|C|°C|degF|F|Pa|kPa|MPa|bar|mbar|atm|psi|m|mm|um|µm|micron|nm|cm|m/s|km/h|s|ms|us|%|[a-zA-Z/°µ]{0,5})") {
        check_units(&format!("{n}{sep}{unit}"))?;
    }

    #[test]
    fn fuel_arbitrary(text in "\\PC{0,200}") {
        check_fuel(&text)?;
    }

    #[test]
    fn fuel_mutated(ms in prop::collection::vec(mutation(), 1..5), blend in any::<bool>()) {
        check_fuel(&apply(if blend { valid_blend() } else { valid_fuel() }, &ms))?;
    }

    #[test]
    fn component_arbitrary(text in "\\PC{0,200}") {
        check_component(&text)?;
    }

    #[test]
    fn component_mutated(ms in prop::collection::vec(mutation(), 1..5)) {
        check_component(&apply(valid_component(), &ms))?;
    }

    #[test]
    fn spec_arbitrary(text in "\\PC{0,200}") {
        check_spec(&text)?;
    }

    #[test]
    fn spec_mutated(ms in prop::collection::vec(mutation(), 1..5)) {
        check_spec(&apply(valid_spec(), &ms))?;
    }

    #[test]
    fn limits_mutated(ms in prop::collection::vec(mutation(), 1..5)) {
        check_limits(&apply(valid_limits(), &ms))?;
    }

    #[test]
    fn uncertainty_mutated(ms in prop::collection::vec(mutation(), 1..5)) {
        check_uncertainty(&apply(valid_uncertainty(), &ms))?;
    }

    #[test]
    fn uncertainty_arbitrary(text in "\\PC{0,160}") {
        check_uncertainty(&text)?;
    }

    #[test]
    fn gas_text(text in "(air|n2|[a-z0-9]{0,4}=[-+0-9.eEnaif]{0,6})(,[a-z0-9]{0,4}=[-+0-9.eEnaif]{0,6}){0,4}") {
        check_gas(&text)?;
    }

    #[test]
    fn fuel_build_inputs_mutated(ms in prop::collection::vec(mutation(), 1..4), which in 0usize..4) {
        let base = [valid_classes_csv(), valid_classes_toml(), valid_distillation_toml(), valid_distillation_csv()][which];
        check_build(&apply(base, &ms))?;
    }

    #[test]
    fn fuel_build_arbitrary(text in "\\PC{0,120}") {
        check_build(&text)?;
    }
}
