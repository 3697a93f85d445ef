//! What is uncertain and by how much: conditions (absolute or relative, normal or uniform), composition
//! (relative on mass fractions, per component, per class or per group of classes) and the property
//! correlations (their stated uncertainties, scaled, normal or log-normal). Read from a TOML file
//! (docs/uncertainty.md) and/or from command-line text; command-line entries replace file entries.

use std::collections::BTreeMap;

use crate::conditions::{Condition, CONDITIONS};
use crate::data::component::DEFAULT_UNCERTAINTY;
use crate::data::{suggest, HydrocarbonClass, Library};
use crate::units::{self, Quantity};

use super::UncertaintyError;

/// A condition that can be uncertain: a thin view of a registry entry of a continuous kind
/// ([`crate::conditions::Kind::is_continuous`]), ordered by its position in the registry.
#[derive(Clone, Copy)]
pub struct ConditionKey {
    position: usize,
    condition: &'static Condition,
}

impl PartialEq for ConditionKey {
    fn eq(&self, other: &Self) -> bool {
        self.position == other.position && self.condition.key == other.condition.key
    }
}
impl Eq for ConditionKey {}
impl PartialOrd for ConditionKey {
    fn partial_cmp(&self, other: &Self) -> Option<std::cmp::Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for ConditionKey {
    fn cmp(&self, other: &Self) -> std::cmp::Ordering {
        (self.position, self.condition.key).cmp(&(other.position, other.condition.key))
    }
}
impl std::fmt::Debug for ConditionKey {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "ConditionKey({})", self.condition.key)
    }
}

impl ConditionKey {
    /// The spreadable condition of the built-in registry with this key, if it is one.
    pub fn parse(name: &str) -> Option<Self> {
        Self::parse_in(&CONDITIONS, name)
    }

    /// The spreadable condition of `registry` with this key, if it is one.
    pub fn parse_in(registry: &'static [Condition], name: &str) -> Option<Self> {
        registry.iter().enumerate().find(|(_, c)| c.key == name && c.kind.is_continuous()).map(|(position, condition)| ConditionKey { position, condition })
    }

    /// Keys of the spreadable conditions of `registry`, in registry order.
    pub fn spreadable(registry: &[Condition]) -> Vec<&'static str> {
        registry.iter().filter(|c| c.kind.is_continuous()).map(|c| c.key).collect()
    }

    /// The registry entry.
    pub fn condition(self) -> &'static Condition {
        self.condition
    }

    /// Key as in files and on the command line (the `simulate` option name).
    pub fn as_str(self) -> &'static str {
        self.condition.key
    }

    /// CSV column of the sampled value (SI unit suffix).
    pub fn column(self) -> &'static str {
        self.condition.column
    }

    /// Quantity of an absolute spread (a temperature spread is a difference).
    pub fn spread_quantity(self) -> Quantity {
        self.condition.kind.spread_quantity().unwrap_or(Quantity::Dimensionless)
    }
}

/// The refusal of a key that is not a spreadable condition of `registry`.
fn not_spreadable(registry: &[Condition], name: &str) -> String {
    let known = ConditionKey::spreadable(registry).join(", ");
    match crate::conditions::find(registry, name) {
        Some(c) => format!("'{name}' cannot be spread: it takes {}, not a number on a continuous scale (spreadable: {known})", c.value_help()),
        None => format!("unknown condition '{name}'{} (known: {known})", suggest(name, ConditionKey::spreadable(registry).into_iter())),
    }
}

/// Shape of a sampled spread.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Distribution {
    /// Normal, truncated at ±3 standard deviations; the spread is the standard deviation.
    Normal,
    /// Uniform; the spread is the half-width.
    Uniform,
    /// Log-normal factor exp(u z), z normal truncated at ±3 (property factors only).
    LogNormal,
}

impl Distribution {
    /// Name as written in files.
    pub fn as_str(self) -> &'static str {
        match self {
            Distribution::Normal => "normal",
            Distribution::Uniform => "uniform",
            Distribution::LogNormal => "log-normal",
        }
    }
}

/// A spread: absolute (SI) or relative to the nominal value, with its distribution.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Spread {
    /// Standard deviation (normal) or half-width (uniform), SI or relative.
    pub value: f64,
    /// True when `value` is relative to the nominal value.
    pub relative: bool,
    /// Distribution.
    pub distribution: Distribution,
}

/// Which components a composition entry covers.
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord)]
pub enum CompositionTarget {
    /// One component, by library id.
    Component(String),
    /// Every component of a hydrocarbon class.
    Class(HydrocarbonClass),
    /// Every component of several classes (`aromatics`, `cycloalkanes`, `alkanes`).
    Group(&'static str),
    /// Every component not covered by another entry, each with its own factor (`each-component`).
    Each,
}

/// Groups of classes accepted as composition keys.
pub const CLASS_GROUPS: [(&str, &[HydrocarbonClass]); 3] = [
    ("aromatics", &[HydrocarbonClass::Alkylbenzene, HydrocarbonClass::Cycloaromatic, HydrocarbonClass::Diaromatic]),
    ("cycloalkanes", &[HydrocarbonClass::Monocycloalkane, HydrocarbonClass::Dicycloalkane]),
    ("alkanes", &[HydrocarbonClass::NAlkane, HydrocarbonClass::IsoAlkane]),
];

impl CompositionTarget {
    /// Name as written in files.
    pub fn name(&self) -> String {
        match self {
            CompositionTarget::Component(id) => id.clone(),
            CompositionTarget::Class(c) => c.as_str().to_string(),
            CompositionTarget::Group(g) => g.to_string(),
            CompositionTarget::Each => "each-component".into(),
        }
    }

    /// Precedence when several entries cover a component: higher wins.
    pub fn precedence(&self) -> u8 {
        match self {
            CompositionTarget::Component(_) => 3,
            CompositionTarget::Class(_) => 2,
            CompositionTarget::Group(_) => 1,
            CompositionTarget::Each => 0,
        }
    }

    /// True when a component of this class with this id is covered.
    pub fn covers(&self, id: &str, class: HydrocarbonClass) -> bool {
        match self {
            CompositionTarget::Component(c) => c == id,
            CompositionTarget::Class(k) => *k == class,
            CompositionTarget::Group(g) => CLASS_GROUPS.iter().any(|(name, classes)| name == g && classes.contains(&class)),
            CompositionTarget::Each => true,
        }
    }
}

/// How the property correlations are perturbed.
#[derive(Debug, Clone, PartialEq)]
pub struct PropertySettings {
    /// Perturb the properties at all.
    pub enabled: bool,
    /// Multiplier on every stated uncertainty (1 = as stated; 0 = off).
    pub scale: f64,
    /// Normal (factor 1 + u z) or log-normal (factor exp(u z)).
    pub distribution: Distribution,
    /// Relative uncertainty replacing the stated one, per property (in `Component::correlations` order).
    pub overrides: [Option<f64>; 10],
}

impl Default for PropertySettings {
    fn default() -> Self {
        PropertySettings { enabled: true, scale: 1.0, distribution: Distribution::Normal, overrides: [None; 10] }
    }
}

/// How the pure-component inputs of the flash-point and cetane indicators (published values and estimates)
/// are perturbed; their standard uncertainties come from [`crate::post::input_spread`].
#[derive(Debug, Clone, PartialEq)]
pub struct IndicatorInputSettings {
    /// Perturb them at all.
    pub enabled: bool,
    /// Multiplier on every standard uncertainty (1 = as measured; 0 = exact).
    pub scale: f64,
}

impl Default for IndicatorInputSettings {
    fn default() -> Self {
        IndicatorInputSettings { enabled: true, scale: 1.0 }
    }
}

/// Everything that is uncertain.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct UncertaintySpec {
    /// Condition spreads.
    pub conditions: BTreeMap<ConditionKey, Spread>,
    /// Composition spreads (relative on mass fractions).
    pub composition: BTreeMap<CompositionTarget, Spread>,
    /// Property settings.
    pub properties: PropertySettings,
    /// Flash-point and cetane inputs.
    pub indicator_inputs: IndicatorInputSettings,
}

/// Property keys in `Component::correlations` order.
pub fn property_keys() -> [&'static str; 10] {
    DEFAULT_UNCERTAINTY.map(|(k, _, _)| k)
}

const TOP_KEYS: [&str; 4] = ["conditions", "composition", "properties", "indicator-inputs"];
const SPREAD_KEYS: [&str; 4] = ["sd", "relative-sd", "half-width", "relative-half-width"];
/// Largest relative spread of a condition or composition entry.
pub const MAX_RELATIVE: f64 = 1.0;
/// Largest property-uncertainty scale.
pub const MAX_SCALE: f64 = 10.0;

fn spec_err(file: &str, field: impl Into<String>, message: impl Into<String>) -> UncertaintyError {
    // values echoed from the file may be multi-line strings: keep the message one line
    let one_line = |s: String| if s.contains(char::is_control) { s.chars().map(|c| if c.is_control() { ' ' } else { c }).collect() } else { s };
    UncertaintyError::Spec { file: file.to_string(), field: one_line(field.into()), message: one_line(message.into()) }
}

/// Parse a shorthand spread: `"10K"` / `3.0` = absolute standard deviation, `"2%"` = relative standard deviation.
fn shorthand(text: &str, quantity: Option<Quantity>) -> Result<Spread, String> {
    let t = text.trim();
    if let Some(p) = t.strip_suffix('%') {
        let v: f64 = p.trim().parse().map_err(|_| format!("'{text}' is not a percentage"))?;
        return Ok(Spread { value: v / 100.0, relative: true, distribution: Distribution::Normal });
    }
    match quantity {
        Some(q) => units::parse(t, q).map(|v| Spread { value: v, relative: false, distribution: Distribution::Normal }).map_err(|e| e.to_string()),
        // composition and property entries are relative: a bare number is a fraction (0.1 = 10 %)
        None => t.parse::<f64>().map(|v| Spread { value: v, relative: true, distribution: Distribution::Normal }).map_err(|_| format!("'{text}' is not a number or a percentage")),
    }
}

fn check_spread(s: &Spread) -> Result<(), String> {
    if !s.value.is_finite() || s.value < 0.0 {
        return Err(format!("spread {} must be a finite non-negative number", s.value));
    }
    if s.relative && s.value > MAX_RELATIVE {
        return Err(format!("relative spread {} is above {MAX_RELATIVE} (100 %)", s.value));
    }
    Ok(())
}

/// Read one spread entry: a shorthand string/number, or a table with one of `sd`, `relative-sd`,
/// `half-width`, `relative-half-width`. `quantity` is the unit kind of absolute spreads (None: relative only).
fn spread_value(v: &toml::Value, quantity: Option<Quantity>) -> Result<Spread, String> {
    let s = match v {
        toml::Value::String(t) => shorthand(t, quantity)?,
        toml::Value::Float(_) | toml::Value::Integer(_) => {
            let x = v.as_float().or_else(|| v.as_integer().map(|i| i as f64)).unwrap_or(f64::NAN);
            Spread { value: x, relative: quantity.is_none(), distribution: Distribution::Normal }
        }
        toml::Value::Table(t) => {
            if let Some(k) = t.keys().find(|k| !SPREAD_KEYS.contains(&k.as_str())) {
                return Err(format!("unknown key '{k}' (known: {})", SPREAD_KEYS.join(", ")));
            }
            if t.len() != 1 {
                return Err(format!("give exactly one of {}", SPREAD_KEYS.join(", ")));
            }
            let (k, val) = t.iter().next().ok_or_else(|| "empty table".to_string())?;
            let relative = k.starts_with("relative");
            let distribution = if k.ends_with("half-width") { Distribution::Uniform } else { Distribution::Normal };
            if !relative && quantity.is_none() {
                return Err(format!("'{k}': only relative spreads apply here (relative-sd or relative-half-width)"));
            }
            let value = match val {
                toml::Value::Float(x) => *x,
                toml::Value::Integer(i) => *i as f64,
                toml::Value::String(text) if relative => units::parse(text, Quantity::Dimensionless).map_err(|e| format!("{k}: {e}"))?,
                toml::Value::String(text) => units::parse(text, quantity.unwrap_or(Quantity::Dimensionless)).map_err(|e| format!("{k}: {e}"))?,
                other => return Err(format!("{k}: expected a number or a string with a unit, found {other}")),
            };
            Spread { value, relative, distribution }
        }
        other => return Err(format!("expected a spread (\"10K\", \"2%\", a number or a table), found {other}")),
    };
    check_spread(&s)?;
    Ok(s)
}

/// Resolve a composition key: a library component id, a class name (singular or plural) or a class group.
fn composition_target(name: &str, lib: &Library) -> Result<CompositionTarget, String> {
    if name == "each-component" {
        return Ok(CompositionTarget::Each);
    }
    for class in HydrocarbonClass::ALL {
        let s = class.as_str();
        if name == s || name.strip_suffix('s') == Some(s) {
            return Ok(CompositionTarget::Class(class));
        }
    }
    if let Some((g, _)) = CLASS_GROUPS.iter().find(|(g, _)| *g == name) {
        return Ok(CompositionTarget::Group(g));
    }
    if let Some(c) = lib.component(name) {
        return Ok(CompositionTarget::Component(c.id.clone()));
    }
    let names = lib
        .components()
        .iter()
        .map(|c| c.id.as_str())
        .chain(HydrocarbonClass::ALL.iter().map(|c| c.as_str()))
        .chain(CLASS_GROUPS.iter().map(|(g, _)| *g))
        .chain(std::iter::once("each-component"));
    Err(format!("'{name}' is not a component id, a hydrocarbon class, a class group (aromatics, cycloalkanes, alkanes) or each-component{}", suggest(name, names)))
}

impl UncertaintySpec {
    /// Read a TOML uncertainty file; `file` names it in messages.
    pub fn parse(text: &str, file: &str, lib: &Library) -> Result<Self, UncertaintyError> {
        Self::parse_with(text, file, lib, &CONDITIONS)
    }

    /// Read a TOML uncertainty file whose `[conditions]` are those of `registry` (the built-in one or an extension).
    pub fn parse_with(text: &str, file: &str, lib: &Library, registry: &'static [Condition]) -> Result<Self, UncertaintyError> {
        let value: toml::Table = toml::from_str(text).map_err(|e| spec_err(file, "(file)", crate::data::toml_error_at(&e, text)))?;
        let mut spec = UncertaintySpec::default();
        for (key, v) in &value {
            match key.as_str() {
                "conditions" => {
                    let t = v.as_table().ok_or_else(|| spec_err(file, "conditions", "must be a table ([conditions])"))?;
                    for (name, entry) in t {
                        let field = format!("conditions.{name}");
                        let k = ConditionKey::parse_in(registry, name).ok_or_else(|| spec_err(file, &field, not_spreadable(registry, name)))?;
                        let s = spread_value(entry, Some(k.spread_quantity())).map_err(|m| spec_err(file, &field, m))?;
                        spec.conditions.insert(k, s);
                    }
                }
                "composition" => {
                    let t = v.as_table().ok_or_else(|| spec_err(file, "composition", "must be a table ([composition])"))?;
                    for (name, entry) in t {
                        let field = format!("composition.{name}");
                        let target = composition_target(name, lib).map_err(|m| spec_err(file, &field, m))?;
                        let s = spread_value(entry, None).map_err(|m| spec_err(file, &field, m))?;
                        if spec.composition.insert(target.clone(), s).is_some() {
                            return Err(spec_err(file, &field, format!("'{}' is given twice (a class under two names?)", target.name())));
                        }
                    }
                }
                "properties" => match v {
                    toml::Value::Boolean(b) => spec.properties.enabled = *b,
                    toml::Value::Table(t) => spec.properties = parse_properties(t, file)?,
                    other => return Err(spec_err(file, "properties", format!("must be true, false or a table, found {other}"))),
                },
                "indicator-inputs" => match v {
                    toml::Value::Boolean(b) => spec.indicator_inputs.enabled = *b,
                    toml::Value::Table(t) => spec.indicator_inputs = parse_indicator_inputs(t, file)?,
                    other => return Err(spec_err(file, "indicator-inputs", format!("must be true, false or a table, found {other}"))),
                },
                other => return Err(spec_err(file, other, format!("unknown key (known: {})", TOP_KEYS.join(", ")))),
            }
        }
        Ok(spec)
    }

    /// Add command-line condition entries `key=spread,...` (spread as in files: `10K`, `2%`); they replace file entries.
    pub fn add_conditions(&mut self, text: &str, option: &str) -> Result<(), UncertaintyError> {
        self.add_conditions_with(text, option, &CONDITIONS)
    }

    /// [`add_conditions`](Self::add_conditions) with the conditions of `registry`.
    pub fn add_conditions_with(&mut self, text: &str, option: &str, registry: &'static [Condition]) -> Result<(), UncertaintyError> {
        for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
            let (name, spread) = item.split_once('=').ok_or_else(|| UncertaintyError::Input { what: option.to_string(), message: format!("cannot read '{item}': use key=spread pairs like ambient-temperature=10K,pressure=2%") })?;
            let k = ConditionKey::parse_in(registry, name.trim()).ok_or_else(|| UncertaintyError::Input { what: option.to_string(), message: not_spreadable(registry, name.trim()) })?;
            let s = shorthand(spread, Some(k.spread_quantity())).and_then(|s| check_spread(&s).map(|_| s)).map_err(|m| UncertaintyError::Input { what: option.to_string(), message: format!("{}: {m}", name.trim()) })?;
            self.conditions.insert(k, s);
        }
        Ok(())
    }

    /// Add command-line composition entries `name=spread,...` (relative: `0.1` or `10%`); they replace file entries.
    pub fn add_composition(&mut self, text: &str, option: &str, lib: &Library) -> Result<(), UncertaintyError> {
        for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
            let (name, spread) = item.split_once('=').ok_or_else(|| UncertaintyError::Input { what: option.to_string(), message: format!("cannot read '{item}': use name=relative-spread pairs like aromatics=10%") })?;
            let target = composition_target(name.trim(), lib).map_err(|m| UncertaintyError::Input { what: option.to_string(), message: m })?;
            let s = shorthand(spread, None).and_then(|s| check_spread(&s).map(|_| s)).map_err(|m| UncertaintyError::Input { what: option.to_string(), message: format!("{}: {m}", name.trim()) })?;
            self.composition.insert(target, s);
        }
        Ok(())
    }

    /// Set the scale of the flash-point and cetane input uncertainties (0 makes them exact).
    pub fn set_indicator_input_scale(&mut self, scale: f64, option: &str) -> Result<(), UncertaintyError> {
        if !(scale.is_finite() && (0.0..=MAX_SCALE).contains(&scale)) {
            return Err(UncertaintyError::Input { what: option.to_string(), message: format!("{scale} must be between 0 and {MAX_SCALE}") });
        }
        self.indicator_inputs.scale = scale;
        Ok(())
    }

    /// Set the property-uncertainty scale (0 turns property perturbation off).
    pub fn set_property_scale(&mut self, scale: f64, option: &str) -> Result<(), UncertaintyError> {
        if !(scale.is_finite() && (0.0..=MAX_SCALE).contains(&scale)) {
            return Err(UncertaintyError::Input { what: option.to_string(), message: format!("{scale} must be between 0 and {MAX_SCALE}") });
        }
        self.properties.scale = scale;
        Ok(())
    }
}

fn scale_value(v: &toml::Value, file: &str, field: &str) -> Result<f64, UncertaintyError> {
    let s = v.as_float().or_else(|| v.as_integer().map(|i| i as f64)).ok_or_else(|| spec_err(file, field, format!("must be a number, found {v}")))?;
    if !(s.is_finite() && (0.0..=MAX_SCALE).contains(&s)) {
        return Err(spec_err(file, field, format!("{s} must be between 0 and {MAX_SCALE}")));
    }
    Ok(s)
}

fn parse_indicator_inputs(t: &toml::Table, file: &str) -> Result<IndicatorInputSettings, UncertaintyError> {
    let mut p = IndicatorInputSettings::default();
    for (k, v) in t {
        let field = format!("indicator-inputs.{k}");
        match k.as_str() {
            "enabled" => p.enabled = v.as_bool().ok_or_else(|| spec_err(file, &field, format!("must be true or false, found {v}")))?,
            "scale" => p.scale = scale_value(v, file, &field)?,
            _ => return Err(spec_err(file, &field, "unknown key (known: enabled, scale)")),
        }
    }
    Ok(p)
}

fn parse_properties(t: &toml::Table, file: &str) -> Result<PropertySettings, UncertaintyError> {
    let keys = property_keys();
    let mut p = PropertySettings::default();
    for (k, v) in t {
        let field = format!("properties.{k}");
        match k.as_str() {
            "enabled" => p.enabled = v.as_bool().ok_or_else(|| spec_err(file, &field, format!("must be true or false, found {v}")))?,
            "scale" => p.scale = scale_value(v, file, &field)?,
            "distribution" => {
                p.distribution = match v.as_str() {
                    Some("normal") => Distribution::Normal,
                    Some("log-normal") => Distribution::LogNormal,
                    _ => return Err(spec_err(file, &field, format!("{v} must be \"normal\" or \"log-normal\""))),
                }
            }
            other => {
                let i = keys.iter().position(|x| *x == other).ok_or_else(|| {
                    spec_err(file, &field, format!("unknown key (known: enabled, scale, distribution, {})", keys.join(", ")))
                })?;
                let s = spread_value(v, None).map_err(|m| spec_err(file, &field, m))?;
                if s.distribution != Distribution::Normal {
                    return Err(spec_err(file, &field, "a property uncertainty is a relative standard deviation (a number, \"5%\" or { relative-sd = ... })"));
                }
                p.overrides[i] = Some(s.value);
            }
        }
    }
    Ok(p)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_every_kind_of_entry() {
        let lib = Library::embedded().unwrap();
        let text = r#"
[conditions]
ambient-temperature = { sd = "10K" }
pressure = "2%"
diameter = { half-width = "5um" }
velocity = { relative-half-width = 0.1 }

[composition]
aromatics = 0.1
n-decane = "5%"
each-component = { relative-half-width = 0.02 }

[properties]
scale = 0.5
distribution = "log-normal"
vapor-pressure = 0.05
"#;
        let s = UncertaintySpec::parse(text, "u.toml", &lib).unwrap();
        assert_eq!(s.conditions[&ConditionKey::parse("ambient-temperature").unwrap()], Spread { value: 10.0, relative: false, distribution: Distribution::Normal });
        assert_eq!(s.conditions[&ConditionKey::parse("pressure").unwrap()], Spread { value: 0.02, relative: true, distribution: Distribution::Normal });
        assert!((s.conditions[&ConditionKey::parse("diameter").unwrap()].value - 5e-6).abs() < 1e-15);
        assert_eq!(s.conditions[&ConditionKey::parse("diameter").unwrap()].distribution, Distribution::Uniform);
        assert!(s.conditions[&ConditionKey::parse("velocity").unwrap()].relative);
        assert_eq!(s.composition[&CompositionTarget::Group("aromatics")].value, 0.1);
        assert_eq!(s.composition[&CompositionTarget::Component("n-decane".into())].value, 0.05);
        assert_eq!(s.composition[&CompositionTarget::Each].distribution, Distribution::Uniform);
        assert_eq!(s.properties.scale, 0.5);
        assert_eq!(s.properties.distribution, Distribution::LogNormal);
        assert_eq!(s.properties.overrides[0], Some(0.05));
    }

    #[test]
    fn errors_name_the_field_and_value() {
        let lib = Library::embedded().unwrap();
        let cases = [
            ("[conditions]\nambient-temp = \"1K\"\n", "conditions.ambient-temp"),
            ("[conditions]\npressure = { sd = \"1 furlong\" }\n", "conditions.pressure"),
            ("[conditions]\ndiameter = { sd = 1, half-width = 2 }\n", "conditions.diameter"),
            ("[composition]\nunobtainium = 0.1\n", "composition.unobtainium"),
            ("[composition]\naromatics = { sd = 0.1 }\n", "composition.aromatics"),
            ("[composition]\naromatics = -0.1\n", "composition.aromatics"),
            ("[properties]\nscale = -1\n", "properties.scale"),
            ("[properties]\nvapour-pressure = 0.1\n", "properties.vapour-pressure"),
            ("properties = 3\n", "properties"),
            ("colour = 1\n", "colour"),
        ];
        for (text, field) in cases {
            let e = UncertaintySpec::parse(text, "u.toml", &lib).unwrap_err().to_string();
            assert!(e.starts_with(&format!("u.toml: {field}:")), "{e}");
        }
        let mut s = UncertaintySpec::default();
        assert!(s.add_conditions("ambient-temperature=10K,pressure=2%", "--condition-uncertainty").is_ok());
        assert!(s.add_conditions("pressure", "--condition-uncertainty").unwrap_err().to_string().contains("--condition-uncertainty"));
        assert!(s.add_composition("aromatics=10%,alkylbenzenes=5%", "--composition-uncertainty", &lib).is_ok());
        assert!(s.composition.contains_key(&CompositionTarget::Class(HydrocarbonClass::Alkylbenzene)));
        let e = s.add_composition("aromatic=10%", "--composition-uncertainty", &lib).unwrap_err().to_string();
        assert!(e.starts_with("--composition-uncertainty: 'aromatic'"), "{e}");
    }

    #[test]
    fn properties_false_turns_them_off() {
        let lib = Library::embedded().unwrap();
        let s = UncertaintySpec::parse("properties = false\n", "u.toml", &lib).unwrap();
        assert!(!s.properties.enabled);
    }
}
