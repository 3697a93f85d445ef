use super::*;

fn lib() -> Library {
    Library::embedded().unwrap()
}

fn decane(lib: &Library) -> Fuel {
    Fuel::resolve("n-decane", lib).unwrap()
}

#[test]
fn keys_and_columns_are_unique_and_defaults_parse() {
    let lib = lib();
    for (i, c) in CONDITIONS.iter().enumerate() {
        assert!(CONDITIONS[..i].iter().all(|o| o.key != c.key && o.column != c.column), "{} repeated", c.key);
        c.default_value(&lib).unwrap_or_else(|e| panic!("default of {}: {e}", c.key));
        assert!(c.help.ends_with('.') || c.help.ends_with(')'), "help of {}", c.key);
        assert_ne!(c.example, c.default, "example of {} must differ from its default", c.key);
    }
}

#[test]
fn every_setter_and_getter_round_trips_the_example() {
    let lib = lib();
    let defaults = build_inputs(&CONDITIONS, decane(&lib), &lib, &[]).unwrap();
    for c in &CONDITIONS {
        let mut inp = defaults.clone();
        // radiation and fibre settings apply only with radiation or a fibre
        if c.key == "absorption-efficiency" {
            find(&CONDITIONS, "radiation").unwrap().apply(&mut inp, &Value::Choice("ambient")).unwrap();
        }
        if c.key.starts_with("fibre-") && c.key != "fibre-diameter" {
            find(&CONDITIONS, "fibre-diameter").unwrap().apply(&mut inp, &Value::Number(14e-6)).unwrap();
        }
        let v = c.parse_text(c.example, &lib).unwrap_or_else(|e| panic!("example of {}: {e}", c.key));
        let before = (c.get)(&inp);
        c.apply(&mut inp, &v).unwrap();
        assert_eq!((c.get)(&inp), Some(v.clone()), "{}", c.key);
        assert_ne!(before, Some(v), "{}: the example leaves the inputs unchanged", c.key);
        // every word of a choice reaches the inputs and reads back as itself
        if let Kind::Choice(words) = c.kind {
            for word in words.iter() {
                let mut inp = defaults.clone();
                c.apply(&mut inp, &Value::Choice(word)).unwrap_or_else(|e| panic!("{} = {word}: {e}", c.key));
                assert_eq!((c.get)(&inp), Some(Value::Choice(word)), "{} = {word}", c.key);
            }
        }
    }
}

#[test]
fn defaults_equal_the_model_defaults() {
    let lib = lib();
    let inp = build_inputs(&CONDITIONS, decane(&lib), &lib, &[]).unwrap();
    let plain = DropletInputs::new(decane(&lib), AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
    assert_eq!(format!("{inp:?}"), format!("{plain:?}"));
}

#[test]
fn choice_words_are_never_guessed() {
    let lib = lib();
    let c = find(&CONDITIONS, "correlation").unwrap();
    let e = c.parse_text("whitaker", &lib).unwrap_err().to_string();
    assert_eq!(e, "correlation: unknown correlation 'whitaker'; use clift or ranz-marshall");
    let mut inp = build_inputs(&CONDITIONS, decane(&lib), &lib, &[]).unwrap();
    // a word of another condition handed to a setter is refused, not mapped to a default
    assert!(c.apply(&mut inp, &Value::Choice("ranz_marshall")).is_err());
    assert!(find(&CONDITIONS, "liquid-mixing").unwrap().apply(&mut inp, &Value::Choice("stirred")).is_err());
    assert!(find(&CONDITIONS, "drag").unwrap().apply(&mut inp, &Value::Number(1.0)).is_err());
}

#[test]
fn units_and_ranges() {
    let lib = lib();
    let t = find(&CONDITIONS, "ambient-temperature").unwrap();
    assert_eq!(t.parse_text("527degC", &lib).unwrap(), Value::Number(800.15));
    assert_eq!(find(&CONDITIONS, "pressure").unwrap().parse_text("10bar", &lib).unwrap(), Value::Number(1e6));
    assert_eq!(find(&CONDITIONS, "diameter").unwrap().parse_text("50um", &lib).unwrap().number().map(|d| (d * 1e6).round()), Some(50.0));
    assert_eq!(find(&CONDITIONS, "diameter").unwrap().parse_text("0", &lib).unwrap_err().to_string(), "diameter = 0 m: must be positive");
    let e = find(&CONDITIONS, "pressure").unwrap().parse_text("800K", &lib).unwrap_err().to_string();
    assert!(e.starts_with("pressure: ") && e.contains("'K'"), "{e}");
    let a = find(&CONDITIONS, "absorption-efficiency").unwrap();
    assert!(a.parse_text("1.5", &lib).unwrap_err().to_string().contains("must not exceed 1 (allowed (0, 1])"));
    let f = find(&CONDITIONS, "liquid-diffusivity-factor").unwrap();
    assert!(f.parse_text("0.001", &lib).unwrap_err().to_string().contains("is below 0.01"));
    assert!(f.parse_text("0", &lib).unwrap_err().to_string().contains("positive factor"));
    let n = find(&CONDITIONS, "nodes").unwrap();
    assert!(n.parse_text("4.5", &lib).unwrap_err().to_string().contains("'4.5' is not a whole number"));
    assert!(n.parse_text("3", &lib).unwrap_err().to_string().contains("'3' must be a whole number from 4 to 400"));
    assert_eq!(find(&CONDITIONS, "radiation").unwrap().parse_text("Ambient", &lib).unwrap(), Value::Choice("ambient"));
    let e = find(&CONDITIONS, "radiation").unwrap().parse_text("hot", &lib).unwrap_err().to_string();
    assert!(e.contains("'hot'") && e.contains("\"off\" / \"ambient\""), "{e}");
}

#[test]
fn continuous_kinds_are_the_spreadable_ones() {
    let spreadable: Vec<&str> = CONDITIONS.iter().filter(|c| c.kind.is_continuous()).map(|c| c.key).collect();
    for k in ["ambient-temperature", "pressure", "diameter", "droplet-temperature", "velocity"] {
        assert!(spreadable.contains(&k), "{k}");
    }
    for k in ["gas", "correlation", "nodes", "injected", "ambient-vapor", "activity"] {
        assert!(!spreadable.contains(&k), "{k}");
    }
    assert_eq!(find(&CONDITIONS, "ambient-temperature").unwrap().kind.spread_quantity(), Some(Quantity::TemperatureDifference));
}

#[test]
fn ambient_vapor_resolves_against_the_fuel() {
    let lib = lib();
    let fuel = decane(&lib);
    assert_eq!(vapor_fractions(&lib, &fuel, "n-decane=0.01").unwrap(), vec![0.01]);
    assert!(vapor_fractions(&lib, &fuel, "toluene=0.1").unwrap_err().contains("'toluene' is not a component of fuel"));
    assert!(vapor_fractions(&lib, &fuel, "foo=0.1").unwrap_err().contains("unknown component 'foo'"));
    assert!(vapor_fractions(&lib, &fuel, "n-decane=0.6").unwrap_err().contains("[0, 0.5)"));
    assert!(vapor_fractions(&lib, &fuel, "").unwrap().is_empty());
}

#[test]
fn inputs_from_texts_reads_units_and_words() {
    let lib = lib();
    let mut texts: Vec<Option<&str>> = vec![None; CONDITIONS.len()];
    texts[1] = Some("10bar");
    texts[7] = Some("ranz-marshall");
    let inp = inputs_from_texts(&CONDITIONS, decane(&lib), &lib, &texts).unwrap();
    assert_eq!((inp.pressure, inp.correlation), (1e6, crate::model::TransferCorrelation::RanzMarshall));
    texts[7] = Some("ranz");
    assert_eq!(inputs_from_texts(&CONDITIONS, decane(&lib), &lib, &texts).unwrap_err().key, "correlation");
}
