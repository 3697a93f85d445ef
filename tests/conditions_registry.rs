//! The condition registry is the one definition of run conditions: every entry reaches each front end, and a new
//! condition added to the registry alone appears in the `simulate` options (with help, unit and default), sweep
//! specs and uncertainty spreads. (The `compare --vary` and surrogate `--reference` parsers are private to the
//! command line; their unit tests, `cli::plot::tests::vary_parsing` and `cli::table::tests::reference_parsing`,
//! walk every entry the same way.)

use std::path::Path;

use clap::CommandFactory;
use dropcut::cli::{condition_args, droplet_inputs, Cli, ConditionArgs};
use dropcut::conditions::{Condition, Kind, Range, Value, CONDITIONS};
use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::sweep::SweepSpec;
use dropcut::uncertainty::{self, ConditionKey, UncertaintySpec};
use dropcut::units::Quantity;

fn lib() -> Library {
    Library::embedded().unwrap()
}

fn long_help(cmd: &mut clap::Command) -> String {
    cmd.render_long_help().to_string()
}

/// Each entry is an option of simulate, compare and uncertainty (help lists its unit and default), a sweep key, and
/// — when its kind is continuous — an uncertainty spread; a non-continuous entry is refused as a spread by name.
#[test]
fn every_entry_reaches_every_front_end() {
    let lib = lib();
    let mut cli = Cli::command();
    for sub in ["simulate", "compare", "uncertainty"] {
        let help = long_help(cli.find_subcommand_mut(sub).unwrap());
        for c in CONDITIONS.iter() {
            assert!(help.contains(&format!("--{}", c.key)), "{sub} --help lacks --{}", c.key);
            let default = match (c.kind, c.default) {
                (Kind::Flag, _) => "default: off".to_string(),
                (_, "") => "default: none".to_string(),
                (_, d) => format!("[default: {d}]"),
            };
            assert!(help.contains(&default), "{sub} --help lacks the default of --{}", c.key);
            if !c.unit.is_empty() {
                assert!(help.contains(c.unit), "{sub} --help lacks the unit {} of --{}", c.unit, c.key);
            }
        }
    }
    for c in CONDITIONS.iter() {
        let spec = format!("fuels = \"n-decane\"\n[conditions]\n{} = \"{}\"\n", c.key, c.example);
        let s = SweepSpec::parse(&spec, "spec.toml", Path::new(""), &lib).unwrap_or_else(|e| panic!("{}: {e}", c.key));
        let inputs = s.inputs(&s.case(0).unwrap()).unwrap();
        if c.key != "absorption-efficiency" && !c.key.starts_with("fibre-c") && c.key != "fibre-stems" {
            // (radiation and fibre settings are read only with radiation or a fibre)
            assert_eq!((c.get)(&inputs), c.parse_text(c.example, &lib).ok(), "sweep {}", c.key);
        }
        let mut u = UncertaintySpec::default();
        let r = u.add_conditions(&format!("{}=1%", c.key), "--condition-uncertainty");
        if c.kind.is_continuous() {
            r.unwrap_or_else(|e| panic!("{}: {e}", c.key));
            assert_eq!(u.conditions.keys().next().map(|k| k.as_str()), Some(c.key));
        } else {
            let e = r.unwrap_err().to_string();
            assert!(e.contains(&format!("'{}' cannot be spread", c.key)), "{e}");
        }
    }
}

fn set_reference_weight(i: &mut dropcut::model::DropletInputs, v: &Value) -> Result<(), String> {
    i.reference_weight = v.number().ok_or("expected a number")?;
    Ok(())
}

fn get_reference_weight(i: &dropcut::model::DropletInputs) -> Option<Value> {
    Some(Value::Number(i.reference_weight))
}

/// The registry with one more condition: the film reference-state weight (a field of the inputs no front end
/// knows today), added here and nowhere else.
fn extended() -> &'static [Condition] {
    let mut v: Vec<Condition> = CONDITIONS.to_vec();
    v.push(Condition {
        key: "film-reference-weight",
        column: "film_reference_weight",
        kind: Kind::Quantity(Quantity::Dimensionless),
        unit: "",
        default: "0.3333333333333333",
        range: Range::positive_up_to(0.99),
        below_min: "",
        help: "Weight of the far-field state in the film reference state (1/3 rule).",
        example: "0.5",
        long_help_only: false,
        set: set_reference_weight,
        get: get_reference_weight,
    });
    Box::leak(v.into_boxed_slice())
}

#[test]
fn a_new_condition_needs_only_a_registry_entry() {
    let lib = lib();
    let registry = extended();
    let fuel = Fuel::resolve("n-decane", &lib).unwrap();

    // simulate options: listed in --help with its default, parsed, set on the inputs
    let mut cmd = condition_args(clap::Command::new("simulate").no_binary_name(true), registry);
    let help = long_help(&mut cmd);
    assert!(help.contains("--film-reference-weight") && help.contains("[default: 0.3333333333333333]") && help.contains("1/3 rule"), "{help}");
    let m = cmd.try_get_matches_from(["--film-reference-weight", "0.5", "--diameter", "30um"]).unwrap();
    let args = ConditionArgs::from_matches(&m, registry).unwrap();
    let inputs = droplet_inputs(&lib, fuel.clone(), &args).unwrap();
    assert_eq!((inputs.reference_weight, inputs.initial_diameter), (0.5, 30e-6));
    let mut bad = args.clone();
    bad.set("film-reference-weight", "2").unwrap();
    let e = droplet_inputs(&lib, fuel.clone(), &bad).unwrap_err();
    assert_eq!((e.code, e.message.as_str()), (2, "--film-reference-weight = 2: must not exceed 0.99 (allowed (0, 0.99])"));

    // sweep spec: a key with a list, a range, in the fingerprint; an unknown spelling is still refused
    let spec = "fuels = \"n-decane\"\n[conditions]\nfilm-reference-weight = [0.2, 0.4]\ndiameter = { from = \"20um\", to = \"40um\", steps = 3 }\n";
    let s = SweepSpec::parse_with(spec, "spec.toml", Path::new(""), &lib, registry).unwrap();
    assert_eq!(s.case_count(), 6);
    assert_eq!(s.varied(), ["diameter", "film-reference-weight"]);
    // the new entry is last in the registry, so it varies fastest
    let weights: Vec<f64> = (0..2).map(|id| s.inputs(&s.case(id).unwrap()).unwrap().reference_weight).collect();
    assert_eq!(weights, [0.2, 0.4]);
    let plain = SweepSpec::parse_with("fuels = \"n-decane\"\n", "spec.toml", Path::new(""), &lib, registry).unwrap();
    assert_eq!(plain.inputs(&plain.case(0).unwrap()).unwrap().reference_weight, 1.0 / 3.0);
    let e = SweepSpec::parse_with("fuels = \"n-decane\"\n[conditions]\nfilm-reference-weight = 1.5\n", "spec.toml", Path::new(""), &lib, registry).unwrap_err().to_string();
    assert!(e.contains("conditions.film-reference-weight") && e.contains("1.5 must not exceed 0.99"), "{e}");
    assert!(SweepSpec::parse(spec, "spec.toml", Path::new(""), &lib).unwrap_err().to_string().contains("unknown condition 'film-reference-weight'"));

    // uncertainty spreads: from a file and from the command line; the factor perturbs the new field
    let u = UncertaintySpec::parse_with("properties = false\nindicator-inputs = false\n[conditions]\nfilm-reference-weight = \"10%\"\n", "u.toml", &lib, registry).unwrap();
    let key = ConditionKey::parse_in(registry, "film-reference-weight").unwrap();
    assert!(u.conditions.contains_key(&key));
    let nominal = dropcut::conditions::build_inputs(registry, fuel, &lib, &[]).unwrap();
    let (factors, _) = uncertainty::resolve(&u, &nominal).unwrap();
    assert_eq!(factors.len(), 1);
    assert_eq!(factors[0].name, "film-reference-weight");
    let perturbed = uncertainty::perturbed(&nominal, &factors, &[1.0]);
    assert!((perturbed.reference_weight - 1.1 / 3.0).abs() < 1e-15, "{}", perturbed.reference_weight);
    let mut cmd_line = UncertaintySpec::default();
    cmd_line.add_conditions_with("film-reference-weight=0.01", "--condition-uncertainty", registry).unwrap();
    assert_eq!(cmd_line.conditions.values().next().map(|s| s.value), Some(0.01));
}

/// docs/sweeps.md lists every registry entry with its summary column and default, in registry order.
#[test]
fn the_sweep_docs_list_the_registry() {
    let doc = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/sweeps.md")).unwrap();
    let mut last = 0;
    for c in CONDITIONS.iter() {
        let row_start = format!("| `{}` | `{}` |", c.key, c.column);
        let at = doc.find(&row_start).unwrap_or_else(|| panic!("docs/sweeps.md has no row {row_start}"));
        assert!(at > last, "docs/sweeps.md: {} is out of registry order", c.key);
        last = at;
        let row = doc[at..].lines().next().unwrap();
        let default = if c.default.is_empty() { "none" } else { c.default };
        assert!(row.trim_end().ends_with(&format!("| {default} |")), "docs/sweeps.md row of {}: default {default}: {row}", c.key);
    }
}
