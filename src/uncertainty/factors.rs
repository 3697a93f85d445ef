//! Input factors of one fuel at one condition: each uncertain condition, each composition group and each
//! (component, property) pair with a non-zero uncertainty, and how a standard draw z of each becomes a
//! perturbed [`DropletInputs`].

use std::sync::Arc;

use crate::conditions::Value;
use crate::data::Sourced;
use crate::model::DropletInputs;
use crate::post::input_spread;
use crate::post::mixture_rules::component_flash_point;

use super::random::name_key;
use super::spec::{property_keys, CompositionTarget, ConditionKey, Distribution, UncertaintySpec};
use super::UncertaintyError;

/// Smallest property factor of a normal draw (1 + u z is cut here so that a property never turns negative).
pub const MIN_PROPERTY_FACTOR: f64 = 0.05;

/// What a factor perturbs.
#[derive(Debug, Clone, PartialEq)]
pub enum FactorKind {
    /// A condition: the value is nominal + spread·z (absolute) or nominal·(1 + spread·z) (relative).
    Condition {
        /// Which condition.
        key: ConditionKey,
        /// Nominal value (SI).
        nominal: f64,
        /// Absolute standard deviation or half-width (SI).
        spread: f64,
    },
    /// A composition group: the members' mass fractions are multiplied by max(0, 1 + spread·z), then the
    /// composition is renormalised.
    Composition {
        /// Component positions in the fuel.
        members: Vec<usize>,
        /// Relative standard deviation or half-width.
        spread: f64,
    },
    /// One property of one component: the property is multiplied by 1 + u z (normal) or exp(u z) (log-normal).
    Property {
        /// Component position in the fuel.
        component: usize,
        /// Property position (`Component::correlations` order).
        property: usize,
        /// Relative uncertainty (the stated one × scale, or the override × scale).
        uncertainty: f64,
    },
    /// A pure-component input of the flash-point or cetane indicator: the value is nominal + sd·z.
    IndicatorInput {
        /// Component position in the fuel.
        component: usize,
        /// Which input.
        input: IndicatorInput,
        /// Nominal value (K or CN units).
        nominal: f64,
        /// Absolute standard uncertainty × scale (K or CN units).
        sd: f64,
    },
}

/// Which pure-component input of an indicator a [`FactorKind::IndicatorInput`] shifts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum IndicatorInput {
    /// The closed-cup flash point (published, or the boiling-point estimate) \[K\].
    FlashPoint,
    /// The cetane number \[CN units\].
    CetaneNumber,
}

impl IndicatorInput {
    /// Key used in factor names: `flash-point` or `cetane-number`.
    pub fn key(self) -> &'static str {
        match self {
            IndicatorInput::FlashPoint => "flash-point",
            IndicatorInput::CetaneNumber => "cetane-number",
        }
    }
}

/// Loader bounds of a cetane number: a shifted value is held inside them.
const CETANE_BOUNDS: (f64, f64) = (-20.0, 150.0);

/// One uncertain input.
#[derive(Debug, Clone, PartialEq)]
pub struct Factor {
    /// Name, unique within a run: `ambient-temperature`, `composition:aromatics`, `vapor-pressure:n-decane`.
    pub name: String,
    /// Distribution of the standard draw.
    pub distribution: Distribution,
    /// What it perturbs.
    pub kind: FactorKind,
    /// Key of its random stream (a hash of the name): the same factor draws the same numbers in any run
    /// with the same seed, whatever other factors exist.
    pub stream: u64,
}

impl Factor {
    /// Sampled value of the factor for a standard draw z: the condition value (SI), the composition factor or
    /// the property factor \[-\].
    pub fn value(&self, z: f64) -> f64 {
        match &self.kind {
            FactorKind::Condition { key, nominal, spread } => {
                let v = nominal + spread * z;
                // a draw beyond an inclusive bound of the condition is held at it (a speed below zero at zero);
                // conditions with an exclusive bound are refused in `resolve` when a draw could cross it
                let range = key.condition().range;
                if range.min_inclusive {
                    v.max(range.min).min(range.max)
                } else {
                    v.min(range.max)
                }
            }
            FactorKind::Composition { spread, .. } => (1.0 + spread * z).max(0.0),
            FactorKind::Property { uncertainty, .. } => match self.distribution {
                Distribution::LogNormal => (uncertainty * z).exp(),
                _ => (1.0 + uncertainty * z).max(MIN_PROPERTY_FACTOR),
            },
            FactorKind::IndicatorInput { input, nominal, sd, .. } => {
                let v = nominal + sd * z;
                match input {
                    IndicatorInput::FlashPoint => v.max(1.0),
                    IndicatorInput::CetaneNumber => v.clamp(CETANE_BOUNDS.0, CETANE_BOUNDS.1),
                }
            }
        }
    }

    /// Short kind name for tables: `condition`, `composition` or `property`.
    pub fn kind_name(&self) -> &'static str {
        match self.kind {
            FactorKind::Condition { .. } => "condition",
            FactorKind::Composition { .. } => "composition",
            FactorKind::Property { .. } => "property",
            FactorKind::IndicatorInput { .. } => "indicator-input",
        }
    }

    /// Stated spread in the factor's own terms (SI for conditions, K or CN units for indicator inputs,
    /// relative otherwise).
    pub fn spread(&self) -> f64 {
        match &self.kind {
            FactorKind::Condition { spread, .. } => *spread,
            FactorKind::Composition { spread, .. } => *spread,
            FactorKind::Property { uncertainty, .. } => *uncertainty,
            FactorKind::IndicatorInput { sd, .. } => *sd,
        }
    }
}

/// Nominal value of a condition in `inputs` (SI), or None when it holds no number (radiation off, no fibre).
pub fn condition_value(inputs: &DropletInputs, key: ConditionKey) -> Option<f64> {
    (key.condition().get)(inputs).and_then(|v| v.number())
}

fn set_condition(inputs: &mut DropletInputs, key: ConditionKey, v: f64) {
    // `resolve` tried this setter with the nominal number: a continuous condition's setter takes any number
    let _ = (key.condition().set)(inputs, &Value::Number(v));
}

/// The factors of `spec` for the fuel and condition of `nominal`, in a fixed order (conditions, composition
/// groups, then properties component by component); factors with zero spread are left out. Also returns
/// notices (entries that do nothing for this fuel).
pub fn resolve(spec: &UncertaintySpec, nominal: &DropletInputs) -> Result<(Vec<Factor>, Vec<String>), UncertaintyError> {
    let mut factors = vec![];
    let mut notices = vec![];
    for (&key, s) in &spec.conditions {
        let what = || format!("uncertainty of {}", key.as_str());
        let nominal_value = condition_value(nominal, key).ok_or_else(|| UncertaintyError::Input {
            what: what(),
            message: format!("the nominal run has no number for {} ({}): nothing to spread", key.as_str(), match (key.condition().get)(nominal) {
                Some(Value::Choice(w)) => w.to_string(),
                Some(other) => format!("{other:?}"),
                None => "not used in this run".into(),
            }),
        })?;
        (key.condition().set)(&mut nominal.clone(), &Value::Number(nominal_value)).map_err(|reason| UncertaintyError::Input { what: what(), message: reason })?;
        let spread = if s.relative { s.value * nominal_value.abs() } else { s.value };
        if spread == 0.0 {
            continue;
        }
        let reach = match s.distribution {
            Distribution::Uniform => spread,
            _ => super::random::TRUNCATION * spread,
        };
        let range = key.condition().range;
        if !range.min_inclusive && nominal_value - reach <= range.min {
            return Err(UncertaintyError::Input {
                what: what(),
                message: format!("nominal {} {} minus the largest draw {} leaves no {}: reduce the spread", nominal_value, key.condition().unit, reach, if range.min == 0.0 { "positive value".to_string() } else { format!("value above {}", range.min) }),
            });
        }
        factors.push(Factor {
            name: key.as_str().to_string(),
            distribution: s.distribution,
            kind: FactorKind::Condition { key, nominal: nominal_value, spread },
            stream: name_key(key.as_str()),
        });
    }
    let comps = &nominal.fuel.components;
    let n = comps.len();
    // composition: each component goes to the most specific entry that covers it
    let mut owner: Vec<Option<&CompositionTarget>> = vec![None; n];
    for (i, c) in comps.iter().enumerate() {
        for target in spec.composition.keys() {
            if target.covers(&c.id, c.class) && owner[i].is_none_or(|o| target.precedence() > o.precedence()) {
                owner[i] = Some(target);
            }
        }
    }
    for (target, s) in &spec.composition {
        let members: Vec<usize> = (0..n).filter(|&i| owner[i] == Some(target) && nominal.fuel.mass_fractions[i] > 0.0).collect();
        if members.is_empty() {
            notices.push(format!("composition uncertainty of '{}' covers no component of fuel '{}': ignored", target.name(), nominal.fuel.name));
            continue;
        }
        if s.value == 0.0 {
            continue;
        }
        let groups: Vec<Vec<usize>> = if *target == CompositionTarget::Each { members.iter().map(|&i| vec![i]).collect() } else { vec![members] };
        for g in groups {
            let covered_all = (0..n).filter(|&i| nominal.fuel.mass_fractions[i] > 0.0).all(|i| g.contains(&i));
            let name = if *target == CompositionTarget::Each { format!("composition:{}", comps[g[0]].id) } else { format!("composition:{}", target.name()) };
            if covered_all {
                notices.push(format!("{name} covers the whole of fuel '{}': renormalisation cancels it, so it is left out", nominal.fuel.name));
                continue;
            }
            factors.push(Factor { stream: name_key(&name), name, distribution: s.distribution, kind: FactorKind::Composition { members: g, spread: s.value } });
        }
    }
    let p = &spec.properties;
    if p.enabled && p.scale > 0.0 {
        let keys = property_keys();
        for (i, c) in comps.iter().enumerate() {
            for (k, (_, corr)) in c.correlations().iter().enumerate() {
                let u = p.overrides[k].unwrap_or(corr.uncertainty) * p.scale;
                if !(u > 0.0 && u.is_finite()) {
                    continue;
                }
                let name = format!("{}:{}", keys[k], c.id);
                factors.push(Factor { stream: name_key(&name), name, distribution: p.distribution, kind: FactorKind::Property { component: i, property: k, uncertainty: u } });
            }
        }
    }
    let q = &spec.indicator_inputs;
    if q.enabled && q.scale > 0.0 {
        for (i, c) in comps.iter().enumerate() {
            let inputs = [
                (IndicatorInput::FlashPoint, component_flash_point(c).0, input_spread::flash_point_sd(c).0),
                (IndicatorInput::CetaneNumber, c.constants.cetane_number.value, input_spread::cetane_sd(c).0),
            ];
            for (input, nominal, sd) in inputs {
                let name = format!("{}:{}", input.key(), c.id);
                factors.push(Factor { stream: name_key(&name), name, distribution: Distribution::Normal, kind: FactorKind::IndicatorInput { component: i, input, nominal, sd: sd * q.scale } });
            }
        }
    }
    Ok((factors, notices))
}

/// The droplet inputs of one sample: `nominal` with each factor set from its standard draw `z[k]`. Inputs
/// no factor touches keep their exact nominal values (so zero spreads reproduce the deterministic run).
pub fn perturbed(nominal: &DropletInputs, factors: &[Factor], z: &[f64]) -> DropletInputs {
    perturbed_reusing(nominal, factors, z, &mut Spare::default())
}

/// Component copies of finished samples kept for the next sample on the same worker: a copy differs from its
/// nominal component only in its property scales, flash point and cetane number, so overwriting those gives
/// the copy [`perturbed`] would make, without copying the rest (names, sources, correlations) again (also when
/// only the flash point or cetane number of a component is sampled).
#[derive(Default)]
pub struct Spare {
    components: Vec<Option<Arc<crate::data::Component>>>,
}

impl Spare {
    /// Keep the component copies of a finished sample's inputs (those that are not the nominal components).
    pub fn recover(&mut self, nominal: &DropletInputs, inputs: DropletInputs) {
        let n = nominal.fuel.components.len();
        if self.components.len() != n {
            self.components = vec![None; n];
        }
        for (i, c) in inputs.fuel.components.into_iter().enumerate().take(n) {
            if !Arc::ptr_eq(&c, &nominal.fuel.components[i]) {
                self.components[i] = Some(c);
            }
        }
    }

    /// A kept copy of component `i` that nothing else holds.
    fn take(&mut self, i: usize) -> Option<Arc<crate::data::Component>> {
        self.components.get_mut(i).and_then(Option::take).filter(|c| Arc::strong_count(c) == 1 && Arc::weak_count(c) == 0)
    }
}

/// [`perturbed`], overwriting kept component copies from `spare` instead of copying the nominal components
/// (the same inputs).
pub fn perturbed_reusing(nominal: &DropletInputs, factors: &[Factor], z: &[f64], spare: &mut Spare) -> DropletInputs {
    let mut inp = nominal.clone();
    let n = inp.fuel.components.len();
    let mut composition: Option<Vec<f64>> = None;
    let mut scales: Vec<Option<[f64; 10]>> = vec![None; n];
    let mut flash_points: Vec<Option<f64>> = vec![None; n];
    let mut cetane_numbers: Vec<Option<f64>> = vec![None; n];
    for (f, &zk) in factors.iter().zip(z) {
        let v = f.value(zk);
        match &f.kind {
            FactorKind::Condition { key, .. } => set_condition(&mut inp, *key, v),
            FactorKind::Composition { members, .. } => {
                let w = composition.get_or_insert_with(|| nominal.fuel.mass_fractions.clone());
                for &i in members {
                    w[i] *= v;
                }
            }
            FactorKind::Property { component, property, .. } => {
                let s = scales[*component].get_or_insert(nominal.fuel.components[*component].property_scales);
                s[*property] *= v;
            }
            FactorKind::IndicatorInput { component, input, .. } => match input {
                IndicatorInput::FlashPoint => flash_points[*component] = Some(v),
                IndicatorInput::CetaneNumber => cetane_numbers[*component] = Some(v),
            },
        }
    }
    if let Some(w) = composition {
        let total: f64 = w.iter().sum();
        if total > 0.0 && total.is_finite() {
            inp.fuel.mass_fractions = w.iter().map(|x| x / total).collect();
        }
    }
    for (i, s) in scales.into_iter().enumerate() {
        if s.is_none() && flash_points[i].is_none() && cetane_numbers[i].is_none() {
            continue;
        }
        let base = &nominal.fuel.components[i];
        // an estimated flash point becomes a sample value with the estimate's own marker
        let fp_source = base.constants.flash_point.as_ref().map_or("estimated:butler-1956", |f| f.source.as_str());
        let flash_point = |t: f64| Sourced { value: t, source: fp_source.to_string(), uncertainty: None, note: None, kind: None };
        // a copy is kept whether the sample scaled its properties or not (no property factor: the nominal scales)
        if let Some(mut kept) = spare.take(i) {
            let s = s.unwrap_or(base.property_scales);
            // a kept copy made by `with_property_scales` of this very component (the kernels it shares, none built
            // for it alone)
            let same_kernels = |c: &crate::data::Component| Arc::ptr_eq(&c.kernels.shared, &base.kernels.shared) && c.kernels.active.is_some() == base.kernels.active.is_some() && c.kernels.twin.get().is_none();
            if let Some(c) = Arc::get_mut(&mut kept).filter(|c| same_kernels(c)) {
                // the fields a sample changes, set as the copy below would have them
                c.property_scales = s;
                match (flash_points[i], &mut c.constants.flash_point) {
                    (Some(t), Some(f)) if f.source == fp_source && f.uncertainty.is_none() && f.note.is_none() && f.kind.is_none() => f.value = t,
                    (Some(t), f) => *f = Some(flash_point(t)),
                    (None, f) => {
                        if *f != base.constants.flash_point {
                            *f = base.constants.flash_point.clone();
                        }
                    }
                }
                c.constants.cetane_number.value = cetane_numbers[i].unwrap_or(base.constants.cetane_number.value);
                inp.fuel.components[i] = kept;
                continue;
            }
        }
        // a copy that changes only its flash point or cetane number keeps the properties, hence the kernels
        // (a plain clone would start without them and fit its own in every sample)
        let mut c = base.with_property_scales(s.unwrap_or(base.property_scales));
        if let Some(t) = flash_points[i] {
            c.constants.flash_point = Some(flash_point(t));
        }
        if let Some(cn) = cetane_numbers[i] {
            c.constants.cetane_number.value = cn;
        }
        inp.fuel.components[i] = Arc::new(c);
    }
    inp
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::data::Library;
    use crate::fuel::Fuel;
    use crate::props::gas::AmbientGas;
    use crate::uncertainty::spec::Spread;

    fn nominal(fuel: &str) -> DropletInputs {
        let lib = Library::embedded().unwrap();
        DropletInputs::new(Fuel::resolve(fuel, &lib).unwrap(), AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0)
    }

    #[test]
    fn composition_groups_take_the_most_specific_entry() {
        let lib = Library::embedded().unwrap();
        let inp = nominal("demo-wide");
        let mut spec = UncertaintySpec::default();
        spec.properties.enabled = false;
        spec.add_composition("aromatics=10%,each-component=1%", "--composition-uncertainty", &lib).unwrap();
        let (f, _) = resolve(&spec, &inp).unwrap();
        let arom = f.iter().find(|f| f.name == "composition:aromatics").unwrap();
        let FactorKind::Composition { members, .. } = &arom.kind else { panic!() };
        assert!(!members.is_empty());
        for &i in members {
            assert!(inp.fuel.components[i].class.aromatic_rings() > 0);
            assert!(!f.iter().any(|g| g.name == format!("composition:{}", inp.fuel.components[i].id)));
        }
        // every component is in exactly one group
        let mut count = vec![0; inp.fuel.len()];
        for g in &f {
            if let FactorKind::Composition { members, .. } = &g.kind {
                for &i in members {
                    count[i] += 1;
                }
            }
        }
        assert!(count.iter().all(|c| *c == 1), "{count:?}");
    }

    #[test]
    fn perturbation_renormalises_and_scales() {
        let lib = Library::embedded().unwrap();
        let inp = nominal("demo-wide");
        let mut spec = UncertaintySpec::default();
        spec.add_composition("aromatics=10%", "c", &lib).unwrap();
        spec.conditions.insert(ConditionKey::parse("pressure").unwrap(), Spread { value: 0.1, relative: true, distribution: Distribution::Normal });
        let (f, _) = resolve(&spec, &inp).unwrap();
        let z: Vec<f64> = (0..f.len()).map(|k| if k % 2 == 0 { 1.0 } else { -0.5 }).collect();
        let p = perturbed(&inp, &f, &z);
        assert!((p.fuel.mass_fractions.iter().sum::<f64>() - 1.0).abs() < 1e-12);
        assert!((p.pressure - 101_325.0 * 1.1).abs() < 1e-6);
        let k = f.iter().position(|f| f.name == format!("vapor-pressure:{}", inp.fuel.components[0].id)).unwrap();
        let s = f[k].value(z[k]);
        let c0 = &inp.fuel.components[0];
        assert!((p.fuel.components[0].vapor_pressure(350.0) / c0.vapor_pressure(350.0) - s).abs() < 1e-12);
        // zero draws change nothing
        let same = perturbed(&inp, &f, &vec![0.0; f.len()]);
        assert_eq!(same.pressure, inp.pressure);
        for (a, b) in same.fuel.components.iter().zip(&inp.fuel.components) {
            assert_eq!(a.vapor_pressure(350.0), b.vapor_pressure(350.0));
        }
    }

    /// Overwriting kept copies gives the inputs a fresh copy gives (every component equal, the same property
    /// bits), sample after sample, with property, flash-point and cetane factors, through the kernels; and with
    /// flash-point and cetane factors alone.
    #[test]
    fn reused_copies_equal_fresh_ones() {
        for properties in [true, false] {
            reused_copies_equal_fresh_ones_with(properties);
        }
    }

    fn reused_copies_equal_fresh_ones_with(properties: bool) {
        let lib = Library::embedded().unwrap();
        let inp = crate::model::inputs::with_kernels(&nominal("demo-wide")).unwrap_or_else(|| nominal("demo-wide"));
        let mut spec = UncertaintySpec::default();
        spec.properties.enabled = properties;
        spec.indicator_inputs.enabled = true;
        spec.indicator_inputs.scale = 1.0;
        spec.add_composition("aromatics=10%", "c", &lib).unwrap();
        let (f, _) = resolve(&spec, &inp).unwrap();
        assert_eq!(f.iter().any(|f| matches!(f.kind, FactorKind::Property { .. })), properties);
        let mut spare = Spare::default();
        let mut reused = 0;
        for sample in 0..4 {
            let z: Vec<f64> = (0..f.len()).map(|k| ((k * 7 + sample * 3) % 11) as f64 / 5.0 - 1.0).collect();
            let fresh = perturbed(&inp, &f, &z);
            let kept_before = spare.components.iter().filter(|c| c.is_some()).count();
            let again = perturbed_reusing(&inp, &f, &z, &mut spare);
            reused += kept_before - spare.components.iter().filter(|c| c.is_some()).count();
            assert_eq!(fresh.fuel.mass_fractions, again.fuel.mass_fractions);
            for (a, b) in fresh.fuel.components.iter().zip(&again.fuel.components) {
                assert_eq!(a.as_ref(), b.as_ref());
                assert_eq!(a.kernels.active.is_some(), b.kernels.active.is_some());
                for t in [300.0, 420.0] {
                    assert_eq!(a.vapor_pressure(t).to_bits(), b.vapor_pressure(t).to_bits());
                    assert_eq!(a.liquid_density(t).to_bits(), b.liquid_density(t).to_bits());
                }
            }
            spare.recover(&inp, again);
        }
        assert_eq!(reused, 3 * inp.fuel.len(), "every copy of samples 2 to 4 reused");
    }

    #[test]
    fn spreads_reaching_zero_are_refused() {
        let inp = nominal("n-decane");
        let mut spec = UncertaintySpec::default();
        spec.conditions.insert(ConditionKey::parse("diameter").unwrap(), Spread { value: 20e-6, relative: false, distribution: Distribution::Normal });
        let e = resolve(&spec, &inp).unwrap_err().to_string();
        assert!(e.contains("diameter"), "{e}");
    }
}
