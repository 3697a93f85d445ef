use super::*;
use crate::model::droplet::{LiquidHeat, LiquidMixing};

fn lib() -> Library {
    Library::embedded().unwrap()
}

fn parse(text: &str) -> Result<SweepSpec, SweepError> {
    SweepSpec::parse(text, "spec.toml", Path::new(""), &lib())
}

#[test]
fn product_order_and_count() {
    let s = parse(
        r#"
fuels = ["n-decane", "n-heptane"]
[conditions]
pressure = ["1bar", "10bar"]
ambient-temperature = { from = "500K", to = "1000K", steps = 6 }
diameter = "50um"
"#,
    )
    .unwrap();
    assert_eq!(s.case_count(), 24);
    assert_eq!(s.varied(), vec!["ambient-temperature", "pressure"]);
    let c = s.case(0).unwrap();
    assert_eq!(c.fuel, 0);
    assert_eq!(c.values[0].csv_text(), "500");
    assert_eq!(c.values[1].csv_text(), "100000");
    // pressure varies fastest (it comes after ambient-temperature in the fixed order)
    let c1 = s.case(1).unwrap();
    assert_eq!(c1.values[1].csv_text(), "1000000");
    assert_eq!(c1.values[0].csv_text(), "500");
    let c2 = s.case(2).unwrap();
    assert_eq!(c2.values[0].csv_text(), "600");
    let last = s.case(23).unwrap();
    assert_eq!(last.fuel, 1);
    assert_eq!(last.values[0].csv_text(), "1000");
    assert!(s.case(24).is_none());
    let inp = s.inputs(&last).unwrap();
    approx::assert_relative_eq!(inp.initial_diameter, 50e-6, max_relative = 1e-15);
    approx::assert_relative_eq!(inp.pressure, 1e6, max_relative = 1e-15);
}

#[test]
fn key_order_does_not_matter() {
    let a = parse("fuels = [\"n-decane\"]\n[conditions]\npressure = [1e5, 2e5]\ndiameter = [\"10um\", \"20um\"]\n").unwrap();
    let b = parse("fuels = [\"n-decane\"]\n[conditions]\ndiameter = [\"10um\", \"20um\"]\npressure = [\"1bar\", \"2bar\"]\n").unwrap();
    assert_eq!(a.fingerprint(), b.fingerprint());
    for id in 0..4 {
        let (ca, cb) = (a.case(id).unwrap(), b.case(id).unwrap());
        let ta: Vec<String> = ca.values.iter().map(|v| v.csv_text()).collect();
        let tb: Vec<String> = cb.values.iter().map(|v| v.csv_text()).collect();
        assert_eq!(ta, tb);
    }
}

#[test]
fn log_range_and_zip() {
    let s = parse(
        r#"
fuels = "n-decane"
zipped = [["velocity", "diameter"]]
[conditions]
diameter = { from = "10um", to = "1000um", steps = 3, scale = "log" }
velocity = [0, 5, 10]
"#,
    )
    .unwrap();
    assert_eq!(s.case_count(), 3);
    let d: Vec<f64> = (0..3).map(|i| s.inputs(&s.case(i).unwrap()).unwrap().initial_diameter).collect();
    approx::assert_relative_eq!(d[0], 1e-5, max_relative = 1e-15);
    approx::assert_relative_eq!(d[1], 1e-4, max_relative = 1e-12);
    approx::assert_relative_eq!(d[2], 1e-3, max_relative = 1e-15);
    assert_eq!(s.case(2).unwrap().values[5].csv_text(), "10");
}

/// Case ids, summary columns and spec fingerprints follow the registry order: it may only grow at the end.
#[test]
fn case_order_is_the_registry_order() {
    let keys = [
        "ambient-temperature",
        "pressure",
        "gas",
        "diameter",
        "droplet-temperature",
        "velocity",
        "injected",
        "correlation",
        "rtol",
        "max-time",
        "ambient-vapor",
        "liquid-mixing",
        "liquid-heat",
        "nodes",
        "non-equilibrium",
        "liquid-diffusivity-factor",
        "liquid-conductivity-factor",
        "radiation",
        "absorption-efficiency",
        "fibre-diameter",
        "fibre-conductivity",
        "fibre-stems",
        "drag",
        "activity",
        "vapour-diffusion",
    ];
    let registry: Vec<&str> = CONDITIONS.iter().map(|c| c.key).collect();
    assert_eq!(registry[..keys.len()], keys);
}

#[test]
fn every_condition_is_a_spec_key() {
    for c in CONDITIONS.iter() {
        let s = parse(&format!("fuels = \"n-decane\"\n[conditions]\n{} = \"{}\"\n", c.key, c.example)).unwrap_or_else(|e| panic!("{}: {e}", c.key));
        let case = s.case(0).unwrap();
        let i = CONDITIONS.iter().position(|o| o.key == c.key).unwrap();
        assert_eq!(Some(case.values[i].clone()), c.parse_text(c.example, &lib()).ok(), "{}", c.key);
        s.inputs(&case).unwrap();
    }
}

#[test]
fn a_wrong_choice_word_names_the_field_and_the_words() {
    let e = parse("fuels = \"n-decane\"\n[conditions]\ncorrelation = [\"clift\", \"ranz_marshall\"]\n").unwrap_err().to_string();
    assert!(e.contains("conditions.correlation[1]") && e.contains("'ranz_marshall'") && e.contains("clift or ranz-marshall"), "{e}");
}

#[test]
fn radiation_and_fibre_conditions() {
    let s = parse("fuels = \"n-decane\"\n[conditions]\nradiation = [\"off\", \"ambient\", \"1200K\"]\nabsorption-efficiency = 0.5\nfibre-diameter = [\"none\", \"20um\"]\nfibre-stems = 2\n").unwrap();
    assert_eq!(s.case_count(), 6);
    let inp = |id: u64| s.inputs(&s.case(id).unwrap()).unwrap();
    assert_eq!(inp(0).extra_heat, crate::model::film::ExtraHeat::default());
    let r = inp(2).extra_heat.radiation.unwrap();
    assert_eq!((r.temperature, r.absorption_efficiency), (None, 0.5));
    assert!(inp(2).extra_heat.fibre.is_none());
    let f = inp(5).extra_heat.fibre.unwrap();
    assert_eq!((f.diameter, f.conductivity, f.stems), (20e-6, 1.4, 2));
    assert_eq!(inp(5).extra_heat.radiation.unwrap().temperature, Some(1200.0));
    assert_eq!(s.case(4).unwrap().values[17].csv_text(), "1200");
    assert_eq!(s.case(2).unwrap().values[17].csv_text(), "ambient");
    let range = parse("fuels = \"n-decane\"\n[conditions]\nradiation = { from = \"900K\", to = \"1500K\", steps = 3 }\n").unwrap();
    assert_eq!(range.inputs(&range.case(2).unwrap()).unwrap().extra_heat.radiation.unwrap().temperature, Some(1500.0));
    let err = parse("fuels = \"n-decane\"\n[conditions]\nradiation = \"hot\"\n").unwrap_err().to_string();
    assert!(err.contains("conditions.radiation") && err.contains("hot") && err.contains("\"ambient\""), "{err}");
    assert!(parse("fuels = \"n-decane\"\n[conditions]\nabsorption-efficiency = 1.5\n").is_err());
    assert!(parse("fuels = \"n-decane\"\n[conditions]\nfibre-stems = 5\n").is_err());
}

#[test]
fn liquid_model_options() {
    let s = parse("fuels = \"n-decane\"\n[conditions]\nliquid-mixing = [\"well-mixed\", \"diffusion\"]\nliquid-heat = \"conduction\"\nnodes = 20\nnon-equilibrium = true\nliquid-diffusivity-factor = 2\n").unwrap();
    assert_eq!(s.case_count(), 2);
    let inp = s.inputs(&s.case(1).unwrap()).unwrap();
    assert_eq!(inp.liquid.mixing, LiquidMixing::Diffusion);
    assert_eq!(inp.liquid.heat, LiquidHeat::Conduction);
    assert_eq!(inp.liquid.nodes, 20);
    assert!(inp.liquid.non_equilibrium);
    assert_eq!(inp.liquid.diffusivity_factor, 2.0);
    assert_eq!(inp.liquid.conductivity_factor, 1.0);
    assert_eq!(s.inputs(&s.case(0).unwrap()).unwrap().liquid.mixing, LiquidMixing::WellMixed);
    assert!(parse("fuels = \"n-decane\"\n[conditions]\nnodes = 2\n").is_err());
    assert!(parse("fuels = \"n-decane\"\n[conditions]\nliquid-mixing = \"difusion\"\n").is_err());
    assert!(parse("fuels = \"n-decane\"\n[conditions]\nliquid-conductivity-factor = 1e9\n").is_err());
}

#[test]
fn defaults_are_simulate_defaults() {
    let s = parse("fuels = [\"n-decane\"]").unwrap();
    assert_eq!(s.case_count(), 1);
    let inp = s.inputs(&s.case(0).unwrap()).unwrap();
    assert_eq!(inp.ambient_temperature, 800.0);
    assert_eq!(inp.pressure, 101_325.0);
    assert_eq!(inp.max_time, 30.0);
    assert_eq!(inp.rtol, 1e-6);
    assert!(inp.ambient_vapor.is_empty());
}

#[test]
fn errors_name_the_field() {
    let cases = [
        ("fuels = [\"n-decane\"]\n[conditions]\nambient-temprature = \"800K\"\n", "conditions.ambient-temprature", "did you mean 'ambient-temperature'"),
        ("fuels = [\"n-decane\"]\n[conditions]\npressure = [\"1bar\", \"3 parsec\"]\n", "conditions.pressure[1]", "parsec"),
        ("fuels = [\"n-decanne\"]\n", "fuels[0]", "n-decanne"),
        ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = { from = \"1um\", to = \"2um\" }\n", "conditions.diameter.steps", "missing"),
        ("fuels = [\"n-decane\"]\nzipped = [[\"diameter\", \"velocity\"]]\n[conditions]\ndiameter = [1e-5, 2e-5]\nvelocity = [1]\n", "zipped[0]", "same number"),
        ("fuel = [\"n-decane\"]\n", "fuel", "did you mean 'fuels'"),
        ("fuels = [\"n-decane\"]\n[conditions]\ninjected = 3\n", "conditions.injected", "true or false"),
        ("fuels = [\"n-decane\"\n", "(syntax)", ""),
        ("fuels = [\"n-decane\"]\n[conditions]\ndiameter = \"-5um\"\n", "conditions.diameter", "positive"),
    ];
    for (text, field, needle) in cases {
        match parse(text) {
            Err(SweepError::Spec { field: f, message, .. }) => {
                assert_eq!(f, field, "{text}: {message}");
                assert!(message.contains(needle), "{text}: {message}");
            }
            other => panic!("{text}: expected a spec error, got {other:?}"),
        }
    }
}

#[test]
fn history_times_are_an_output_setting_in_the_fingerprint() {
    let base = "fuels = [\"n-decane\"]\n[conditions]\ndiameter = [\"20um\", \"30um\"]\n";
    let with = |times: &str| parse(&format!("{base}[output]\nhistory-times = {times}\n")).unwrap();
    let plain = parse(base).unwrap();
    assert!(plain.history_times.is_empty());
    let grid = with("\"0:0.5ms:2ms\"");
    assert_eq!(grid.history_times, vec![0.0, 0.5e-3, 1e-3, 1.5e-3, 2e-3]);
    assert_eq!(with("[\"0.5ms\", 0.001, \"1500us\"]").history_times, vec![0.5e-3, 1e-3, 1.5e-3]);
    assert_eq!(with("[1, 2]").history_times, vec![1.0, 2.0]);
    // the times enter the fingerprint; a spec without them keeps the fingerprint it always had
    assert_ne!(grid.fingerprint(), plain.fingerprint());
    assert_ne!(grid.fingerprint(), with("\"0:0.5ms:2.5ms\"").fingerprint());
    assert_eq!(grid.fingerprint(), with("\"0:0.5ms:2ms\"").fingerprint());
    assert_eq!(plain.fingerprint(), parse(&format!("{base}[output]\nhistories = true\n")).unwrap().fingerprint());
    for (times, expect) in [
        ("\"0:0ms:2ms\"", "output.history-times: '0:0ms:2ms': the step (START:STEP:END) must be positive"),
        ("\"2ms,1ms\"", "output.history-times: 1.000000e-3 s after 2.000000e-3 s: times must be strictly ascending"),
        ("[\"1ms\", \"2mm\"]", "output.history-times[1]"),
        ("[\"1ms\", true]", "output.history-times[1]: expected a time"),
        ("[]", "output.history-times: the list is empty"),
        ("true", "output.history-times: expected \"START:STEP:END\""),
        ("[-1.0]", "output.history-times: -1.000000e0 s: times must be finite and not negative"),
    ] {
        let e = parse(&format!("{base}[output]\nhistory-times = {times}\n")).unwrap_err().to_string();
        assert!(e.contains(expect), "{times}: {e}");
        assert!(!e.contains('\n'), "{e}");
    }
}
