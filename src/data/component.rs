//! A pure component as read from `mixtures/components/<id>.toml`: constants and correlations with sources.

use serde::Deserialize;

use super::correlation::{Correlation, Dimension, RawCorrelation};
use super::{toml_error_at, DataError};

/// Hydrocarbon (or oxygenate) class of a component.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum HydrocarbonClass {
    /// Straight-chain alkanes.
    NAlkane,
    /// Branched alkanes.
    IsoAlkane,
    /// Alkylcyclohexanes and other one-ring naphthenes.
    Monocycloalkane,
    /// Decalins and other two-ring naphthenes.
    Dicycloalkane,
    /// Alkylbenzenes.
    Alkylbenzene,
    /// Tetralins, indanes.
    Cycloaromatic,
    /// Naphthalenes.
    Diaromatic,
    /// Alcohols and other oxygenates.
    Oxygenate,
    /// A petroleum pseudo-component (a distillation cut) with no single molecular class.
    PetroleumFraction,
}

impl HydrocarbonClass {
    /// Kebab-case name as written in files.
    pub fn as_str(self) -> &'static str {
        match self {
            HydrocarbonClass::NAlkane => "n-alkane",
            HydrocarbonClass::IsoAlkane => "iso-alkane",
            HydrocarbonClass::Monocycloalkane => "monocycloalkane",
            HydrocarbonClass::Dicycloalkane => "dicycloalkane",
            HydrocarbonClass::Alkylbenzene => "alkylbenzene",
            HydrocarbonClass::Cycloaromatic => "cycloaromatic",
            HydrocarbonClass::Diaromatic => "diaromatic",
            HydrocarbonClass::Oxygenate => "oxygenate",
            HydrocarbonClass::PetroleumFraction => "petroleum-fraction",
        }
    }

    /// Number of aromatic rings (for Fuller volumes and the aromatics indicator).
    pub fn aromatic_rings(self) -> u32 {
        match self {
            HydrocarbonClass::Alkylbenzene | HydrocarbonClass::Cycloaromatic => 1,
            HydrocarbonClass::Diaromatic => 2,
            _ => 0,
        }
    }

    /// True for classes counted as aromatics.
    pub fn is_aromatic(self) -> bool {
        self.aromatic_rings() > 0
    }

    /// Every class, in display order.
    pub const ALL: [HydrocarbonClass; 9] = [
        HydrocarbonClass::NAlkane,
        HydrocarbonClass::IsoAlkane,
        HydrocarbonClass::Monocycloalkane,
        HydrocarbonClass::Dicycloalkane,
        HydrocarbonClass::Alkylbenzene,
        HydrocarbonClass::Cycloaromatic,
        HydrocarbonClass::Diaromatic,
        HydrocarbonClass::Oxygenate,
        HydrocarbonClass::PetroleumFraction,
    ];
}

/// A number with its source and optional relative uncertainty.
#[derive(Debug, Clone, PartialEq, Deserialize, serde::Serialize)]
#[serde(deny_unknown_fields)]
pub struct Sourced {
    /// Value in SI units.
    pub value: f64,
    /// Source id or marker.
    pub source: String,
    /// Relative uncertainty.
    #[serde(default)]
    pub uncertainty: Option<f64>,
    /// Free note.
    #[serde(default)]
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
    /// For cetane numbers: "CN", "DCN" or "estimate" (see [`CETANE_KINDS`]).
    #[serde(default)]
    #[serde(skip_serializing_if = "Option::is_none")]
    pub kind: Option<String>,
}

/// Atom counts.
#[derive(Debug, Clone, Copy, PartialEq, Deserialize, serde::Serialize)]
#[serde(deny_unknown_fields)]
pub struct Formula {
    /// Carbon atoms.
    #[serde(rename = "C")]
    pub carbon: u32,
    /// Hydrogen atoms.
    #[serde(rename = "H")]
    pub hydrogen: u32,
    /// Oxygen atoms.
    #[serde(rename = "O", default)]
    pub oxygen: u32,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
struct RawConstants {
    molar_mass: Sourced,
    normal_boiling_point: Sourced,
    critical_temperature: Sourced,
    critical_pressure: Sourced,
    critical_volume: Sourced,
    acentric_factor: Sourced,
    melting_point: Sourced,
    #[serde(default)]
    enthalpy_of_fusion: Option<Sourced>,
    #[serde(default, rename = "density-15C")]
    density_15c: Option<Sourced>,
    lower_heating_value: Sourced,
    cetane_number: Sourced,
    #[serde(default)]
    flash_point: Option<Sourced>,
    #[serde(default)]
    rackett_z: Option<Sourced>,
    #[serde(default)]
    diffusion_volume: Option<Sourced>,
    #[serde(default)]
    lennard_jones_sigma: Option<Sourced>,
    #[serde(default)]
    lennard_jones_epsilon_over_k: Option<Sourced>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
struct RawComponent {
    id: String,
    name: String,
    #[serde(default)]
    aliases: Vec<String>,
    cas: String,
    class: HydrocarbonClass,
    formula: Formula,
    #[serde(default)]
    joback_groups: Option<std::collections::BTreeMap<String, u32>>,
    #[serde(default)]
    unifac_groups: Option<std::collections::BTreeMap<String, u32>>,
    constants: RawConstants,
    vapor_pressure: RawCorrelation,
    liquid_density: RawCorrelation,
    latent_heat: RawCorrelation,
    liquid_heat_capacity: RawCorrelation,
    liquid_viscosity: RawCorrelation,
    liquid_conductivity: RawCorrelation,
    surface_tension: RawCorrelation,
    ideal_gas_heat_capacity: RawCorrelation,
    vapor_viscosity: RawCorrelation,
    vapor_conductivity: RawCorrelation,
}

/// Scalar constants of a component, SI units.
#[derive(Debug, Clone, PartialEq)]
pub struct Constants {
    /// Molar mass \[kg/mol\].
    pub molar_mass: Sourced,
    /// Normal boiling point \[K\].
    pub normal_boiling_point: Sourced,
    /// Critical temperature \[K\].
    pub critical_temperature: Sourced,
    /// Critical pressure \[Pa\].
    pub critical_pressure: Sourced,
    /// Critical molar volume \[m³/mol\].
    pub critical_volume: Sourced,
    /// Acentric factor \[-\].
    pub acentric_factor: Sourced,
    /// Melting point \[K\].
    pub melting_point: Sourced,
    /// Enthalpy of fusion \[J/mol\].
    pub enthalpy_of_fusion: Option<Sourced>,
    /// Published liquid density at 15 °C \[kg/m³\].
    pub density_15c: Option<Sourced>,
    /// Lower heating value of the liquid \[J/kg\].
    pub lower_heating_value: Sourced,
    /// Cetane number or derived cetane number \[-\] (`kind` says which).
    pub cetane_number: Sourced,
    /// Closed-cup flash point \[K\].
    pub flash_point: Option<Sourced>,
    /// Spencer–Danner Rackett parameter \[-\].
    pub rackett_z: Option<Sourced>,
    /// Fuller diffusion-volume sum \[-\].
    pub diffusion_volume: Option<Sourced>,
    /// Lennard-Jones collision diameter \[m\].
    pub lennard_jones_sigma: Option<Sourced>,
    /// Lennard-Jones well depth over Boltzmann constant \[K\].
    pub lennard_jones_epsilon_over_k: Option<Sourced>,
}

/// A pure liquid component with its constants and property correlations.
#[derive(Debug, Clone, PartialEq)]
pub struct Component {
    /// Unique id (kebab-case).
    pub id: String,
    /// Display name.
    pub name: String,
    /// Other accepted names.
    pub aliases: Vec<String>,
    /// CAS registry number.
    pub cas: String,
    /// Hydrocarbon class.
    pub class: HydrocarbonClass,
    /// Atom counts.
    pub formula: Formula,
    /// Joback groups (for group-contribution estimates), in file order.
    pub joback_groups: Vec<(&'static super::joback_groups::Group, u32)>,
    /// Original-UNIFAC subgroups and their counts (empty: none given; `--activity unifac` then refuses it).
    pub unifac_groups: Vec<(&'static super::unifac_groups::Subgroup, u32)>,
    /// Scalar constants.
    pub constants: Constants,
    /// Vapour pressure \[Pa\].
    pub vapor_pressure: Correlation,
    /// Saturated liquid density \[kg/m³\].
    pub liquid_density: Correlation,
    /// Latent heat \[J/kg\].
    pub latent_heat: Correlation,
    /// Liquid heat capacity \[J/(kg·K)\].
    pub liquid_heat_capacity: Correlation,
    /// Liquid viscosity \[Pa·s\].
    pub liquid_viscosity: Correlation,
    /// Liquid thermal conductivity \[W/(m·K)\].
    pub liquid_conductivity: Correlation,
    /// Surface tension \[N/m\].
    pub surface_tension: Correlation,
    /// Ideal-gas heat capacity \[J/(kg·K)\].
    pub ideal_gas_heat_capacity: Correlation,
    /// Vapour viscosity \[Pa·s\].
    pub vapor_viscosity: Correlation,
    /// Vapour thermal conductivity \[W/(m·K)\].
    pub vapor_conductivity: Correlation,
    /// File the component came from.
    pub origin: String,
    /// Multipliers on the ten properties, in [`Component::correlations`] order \[-\]: 1 everywhere except in
    /// uncertainty samples (`crate::uncertainty`), which set them with [`Component::with_property_scales`].
    pub property_scales: [f64; 10],
    /// Coefficients of the extensions of the published correlations beyond their ranges, fitted to them on
    /// first use (`crate::props::pure`); empty until then.
    pub extensions: std::sync::OnceLock<Extensions>,
    /// Property kernels of this component (shared by its copies) and whether this copy evaluates through them
    /// (`crate::props::kernels`; only droplet runs do).
    pub kernels: KernelSlot,
}

/// Opaque property-kernel state of a component, managed by the properties layer (`props::kernels`): the
/// kernels (built on first use), whether this copy evaluates through them, and the cached copy that does.
#[derive(Default)]
pub struct KernelSlot {
    /// The kernels once built, shared by this component and its rescaled copies.
    pub shared: std::sync::Arc<std::sync::OnceLock<std::sync::Arc<dyn std::any::Any + Send + Sync>>>,
    /// The kernels this copy evaluates through (None: direct evaluation).
    pub active: Option<std::sync::Arc<dyn std::any::Any + Send + Sync>>,
    /// The copy of this component that evaluates through the kernels.
    pub twin: std::sync::OnceLock<std::sync::Arc<Component>>,
}

impl KernelSlot {
    /// The slot of a copy that differs from its original only in its property scales: it shares the kernels
    /// (the scales apply on top of them) and evaluates through them if the original does.
    pub fn for_rescaled_copy(&self) -> Self {
        KernelSlot { shared: self.shared.clone(), active: self.active.clone(), twin: std::sync::OnceLock::new() }
    }
}

impl Clone for KernelSlot {
    /// A plain copy starts without kernels: its correlations or constants may be changed after copying.
    fn clone(&self) -> Self {
        KernelSlot::default()
    }
}

impl PartialEq for KernelSlot {
    /// Kernels do not change what a component is.
    fn eq(&self, _: &Self) -> bool {
        true
    }
}

impl std::fmt::Debug for KernelSlot {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "KernelSlot {{ active: {} }}", self.active.is_some())
    }
}

/// Coefficients that continue published correlations past their ranges (docs/property-methods.md), fitted
/// to the published correlations themselves by `crate::props::pure::fit_extensions` (the Wilhoit fit on first
/// use: most runs never leave the published ideal-gas cp range).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Extensions {
    /// Hildebrand fluidity law 1/μ = a·V + b above the takeover temperature: (takeover \[K\], a \[1/(Pa·s)/(m³/mol)\],
    /// b \[1/(Pa·s)\]); None when the liquid viscosity has no published coefficients or the fit failed.
    pub fluidity: Option<(f64, f64, f64)>,
    /// Wilhoit ideal-gas cp above the published range: (B \[K\], a0, a1, a2, cp at 0 K \[J/(mol·K)\], classical
    /// limit \[J/(mol·K)\]); None when the ideal-gas cp is not a polynomial with a finite range. Fitted on first
    /// use (`crate::props::pure`, `Component::wilhoit`).
    pub wilhoit: std::sync::OnceLock<Option<WilhoitCoefficients>>,
    /// Temperature-independent factor of the Chung et al. vapour viscosity of this component \[Pa·s/K^½\].
    pub chung_viscosity_factor: f64,
}

/// Wilhoit ideal-gas cp coefficients: (B \[K\], \[a0, a1, a2\], cp at 0 K \[J/(mol·K)\], classical limit \[J/(mol·K)\]).
pub type WilhoitCoefficients = (f64, [f64; 3], f64, f64);

/// Default relative uncertainties (published coefficients, estimated) per property; docs/property-methods.md.
pub const DEFAULT_UNCERTAINTY: [(&str, f64, f64); 10] = [
    ("vapor-pressure", 0.02, 0.10),
    ("liquid-density", 0.01, 0.03),
    ("latent-heat", 0.03, 0.08),
    ("liquid-heat-capacity", 0.03, 0.08),
    ("liquid-viscosity", 0.05, 0.25),
    ("liquid-conductivity", 0.05, 0.15),
    ("surface-tension", 0.03, 0.10),
    ("ideal-gas-heat-capacity", 0.02, 0.05),
    ("vapor-viscosity", 0.05, 0.10),
    ("vapor-conductivity", 0.05, 0.15),
];

/// Physical bounds of a liquid fuel component's density near 15 °C \[kg/m³\] (n-pentane about 630, polycyclic
/// aromatics about 1100; common practice, with margin).
pub const ANCHOR_DENSITY: (f64, f64) = (500.0, 1300.0);
/// Physical bounds of a liquid fuel component's dynamic viscosity near 15 °C \[Pa s\] (light alkanes about
/// 2e-4, heavy multi-ring liquids about 1e-1; common practice, with margin).
pub const ANCHOR_VISCOSITY: (f64, f64) = (1e-4, 1.0);

/// Broad plausible ranges of each property at the normal boiling point (SI), for load-time checks of
/// user files: (section, low, high, unit). The vapour pressure there is 1 atm within a factor of two.
pub const PLAUSIBLE_AT_BOILING: [(&str, f64, f64, &str); 10] = [
    ("vapor-pressure", 101_325.0 / 2.0, 101_325.0 * 2.0, "Pa"),
    ("liquid-density", 200.0, 3000.0, "kg/m3"),
    ("latent-heat", 1e4, 1e7, "J/kg"),
    ("liquid-heat-capacity", 300.0, 1e4, "J/(kg K)"),
    ("liquid-viscosity", 1e-6, 10.0, "Pa s"),
    ("liquid-conductivity", 0.01, 2.0, "W/(m K)"),
    ("surface-tension", 1e-4, 0.2, "N/m"),
    ("ideal-gas-heat-capacity", 300.0, 1e4, "J/(kg K)"),
    ("vapor-viscosity", 1e-7, 1e-3, "Pa s"),
    ("vapor-conductivity", 1e-4, 1.0, "W/(m K)"),
];

/// Kinds of cetane value a component file may give (`kind` of `cetane-number`), with what they mean.
pub const CETANE_KINDS: [(&str, &str); 3] = [
    ("CN", "engine cetane number (ASTM D613 cooperative fuel research engine)"),
    ("DCN", "derived cetane number from ignition delay in a constant-volume combustion chamber (ASTM D6890, D7170, D7668)"),
    ("estimate", "estimated (correlation, class trend or index), not measured"),
];

/// Physical bounds of a liquid density of a fuel molecule at any temperature of its liquid range \[kg/m³\]:
/// below the lightest liquid hydrocarbons near their critical point, above dense polyaromatics (common practice).
pub const DENSITY_BOUNDS: (f64, f64) = (100.0, 2000.0);
/// Physical bounds of a liquid dynamic viscosity between the melting and boiling points \[Pa·s\]: a liquid is
/// not less viscous than about 1e-5 Pa·s (near-critical light hydrocarbons) and a fuel molecule well above its
/// melting point not more than 1e3 Pa·s (common practice).
pub const VISCOSITY_BOUNDS: (f64, f64) = (1e-5, 1e3);

/// A number in four significant digits, in exponent form outside 0.001–100000.
fn short(v: f64) -> String {
    if v == 0.0 || !v.is_finite() || (1e-3..1e5).contains(&v.abs()) {
        format!("{}", (v * 1e4).round() / 1e4).replace("NaN", "not-a-number").replace("inf", "infinite")
    } else {
        format!("{v:.3e}")
    }
}

fn check_positive(s: &Sourced, context: &str, field: &str) -> Result<(), DataError> {
    if !(s.value.is_finite() && s.value > 0.0) {
        return Err(DataError::Invalid { context: format!("{context}: constants.{field}"), message: format!("value {} must be a positive finite number", s.value) });
    }
    if let Some(u) = s.uncertainty {
        if !(u.is_finite() && (0.0..=1.0).contains(&u)) {
            return Err(DataError::Invalid { context: format!("{context}: constants.{field}"), message: format!("uncertainty {u} must be between 0 and 1") });
        }
    }
    Ok(())
}

impl Component {
    /// Parse and check a component file; `file` names it in messages.
    pub fn parse(text: &str, file: &str) -> Result<Self, DataError> {
        let raw: RawComponent = toml::from_str(text).map_err(|e| DataError::Parse { file: file.into(), message: toml_error_at(&e, text) })?;
        Self::from_raw(raw, file)
    }

    /// Parse a generated component file (the embedded library): the plain-TOML subset reader when the whole file
    /// is in its subset (the same table as the full parser: `data::toml_subset`), else [`Component::parse`].
    /// Both give the same component for every embedded file (`embedded_components_parse_alike`).
    pub fn parse_generated(text: &str, file: &str) -> Result<Self, DataError> {
        match super::toml_subset::parse_table(text).and_then(|t| toml::Value::Table(t).try_into::<RawComponent>().ok()) {
            Some(raw) => Self::from_raw(raw, file),
            None => Self::parse(text, file),
        }
    }

    fn from_raw(raw: RawComponent, file: &str) -> Result<Self, DataError> {
        let ctx = format!("{file} (component '{}')", raw.id);
        if raw.id.is_empty() || !raw.id.chars().all(|c| c.is_ascii_lowercase() || c.is_ascii_digit() || c == '-') {
            return Err(DataError::Invalid { context: format!("{file}: id"), message: format!("'{}' must be kebab-case (a-z, 0-9, -)", raw.id) });
        }
        let c = &raw.constants;
        let positives = [
            (&c.molar_mass, "molar-mass"),
            (&c.normal_boiling_point, "normal-boiling-point"),
            (&c.critical_temperature, "critical-temperature"),
            (&c.critical_pressure, "critical-pressure"),
            (&c.critical_volume, "critical-volume"),
            (&c.melting_point, "melting-point"),
            (&c.lower_heating_value, "lower-heating-value"),
        ];
        for (s, f) in positives {
            check_positive(s, &ctx, f)?;
        }
        for (s, f) in [
            (&c.enthalpy_of_fusion, "enthalpy-of-fusion"),
            (&c.density_15c, "density-15C"),
            (&c.flash_point, "flash-point"),
            (&c.rackett_z, "rackett-z"),
            (&c.diffusion_volume, "diffusion-volume"),
            (&c.lennard_jones_sigma, "lennard-jones-sigma"),
            (&c.lennard_jones_epsilon_over_k, "lennard-jones-epsilon-over-k"),
        ] {
            if let Some(s) = s {
                check_positive(s, &ctx, f)?;
            }
        }
        let w = c.molar_mass.value;
        if !(0.01..=2.0).contains(&w) {
            return Err(DataError::Invalid { context: format!("{ctx}: constants.molar-mass"), message: format!("{w} kg/mol is outside 0.01–2 kg/mol (the unit is kg/mol, not g/mol)") });
        }
        let (tb, tc, tm) = (c.normal_boiling_point.value, c.critical_temperature.value, c.melting_point.value);
        if !(tm < tb && tb < tc) {
            return Err(DataError::Invalid { context: format!("{ctx}: constants"), message: format!("needs melting point {tm} K < normal boiling point {tb} K < critical temperature {tc} K") });
        }
        if c.critical_pressure.value < 1e5 || c.critical_pressure.value > 1e8 {
            return Err(DataError::Invalid { context: format!("{ctx}: constants.critical-pressure"), message: format!("{} Pa is outside 1e5–1e8 Pa (the unit is Pa)", c.critical_pressure.value) });
        }
        let omega = c.acentric_factor.value;
        if !(omega.is_finite() && (-0.5..=2.0).contains(&omega)) {
            return Err(DataError::Invalid { context: format!("{ctx}: constants.acentric-factor"), message: format!("{omega} is outside -0.5–2") });
        }
        if !c.cetane_number.value.is_finite() || c.cetane_number.value < -20.0 || c.cetane_number.value > 150.0 {
            return Err(DataError::Invalid { context: format!("{ctx}: constants.cetane-number"), message: format!("{} is outside -20–150", c.cetane_number.value) });
        }
        match c.cetane_number.kind.as_deref() {
            Some(k) if CETANE_KINDS.iter().any(|(name, _)| *name == k) => {}
            Some(other) => {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: constants.cetane-number.kind"),
                    message: format!("\"{other}\" must be \"CN\" (engine, ASTM D613), \"DCN\" (derived, constant-volume combustion chamber, e.g. ASTM D6890/D7668) or \"estimate\""),
                })
            }
            None => {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: constants.cetane-number"),
                    message: format!(
                        "value {} has no kind: add kind = \"DCN\" (derived, ASTM D6890/D7668), kind = \"CN\" (engine, ASTM D613) or kind = \"estimate\"",
                        short(c.cetane_number.value)
                    ),
                })
            }
        }
        if let Some(d) = &c.density_15c {
            if !(DENSITY_BOUNDS.0..=DENSITY_BOUNDS.1).contains(&d.value) {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: constants.density-15C"),
                    message: format!("value {} kg/m3 is outside the physical bounds {}–{} kg/m3 of a liquid fuel molecule (the unit is kg/m3)", short(d.value), DENSITY_BOUNDS.0, DENSITY_BOUNDS.1),
                });
            }
        }
        let wf = raw.formula;
        let formula_mass = 12.011e-3 * f64::from(wf.carbon) + 1.008e-3 * f64::from(wf.hydrogen) + 15.999e-3 * f64::from(wf.oxygen);
        // A petroleum fraction's formula is a whole-atom representative of an average molecule: it may differ from
        // the fraction's molar mass by about one carbon atom.
        let formula_tolerance = if raw.class == HydrocarbonClass::PetroleumFraction { 0.10 } else { 0.01 };
        if (formula_mass - w).abs() > formula_tolerance * w {
            return Err(DataError::Invalid { context: format!("{ctx}: constants.molar-mass"), message: format!("{w} kg/mol disagrees with the formula ({formula_mass:.5} kg/mol)") });
        }
        let build = |r: &RawCorrelation, key: &str, dim: Dimension| -> Result<Correlation, DataError> {
            let (published, estimated) = DEFAULT_UNCERTAINTY.iter().find(|(k, _, _)| *k == key).map(|(_, a, b)| (*a, *b)).unwrap_or((0.05, 0.2));
            let default = if r.model == "corresponding-states" || r.source.starts_with("estimated") { estimated } else { published };
            r.build(dim, w, default, &format!("{ctx}: [{key}]"))
        };
        let mut joback_groups = vec![];
        if let Some(map) = &raw.joback_groups {
            for (key, count) in map {
                let g = super::joback_groups::group(key).ok_or_else(|| DataError::Invalid {
                    context: format!("{ctx}: joback-groups.{key}"),
                    message: format!(
                        "unknown Joback group '{key}' (known: {})",
                        super::joback_groups::GROUPS.iter().map(|g| g.key).collect::<Vec<_>>().join(", ")
                    ),
                })?;
                if *count > 0 {
                    joback_groups.push((g, *count));
                }
            }
        }
        let mut unifac_groups = vec![];
        if let Some(map) = &raw.unifac_groups {
            for (key, count) in map {
                let g = super::unifac_groups::subgroup(key).ok_or_else(|| DataError::Invalid {
                    context: format!("{ctx}: unifac-groups.{key}"),
                    message: format!("unknown original-UNIFAC subgroup '{key}' (names as in mixtures/unifac/original-unifac-subgroups.csv, e.g. CH3, CH2, CH, C, ACH, AC, ACCH3, ACCH2, ACCH, OH)"),
                })?;
                if *count == 0 {
                    return Err(DataError::Invalid { context: format!("{ctx}: unifac-groups.{key}"), message: "count 0: leave the group out or give a positive count".into() });
                }
                unifac_groups.push((g, *count));
            }
            if unifac_groups.is_empty() {
                return Err(DataError::Invalid { context: format!("{ctx}: unifac-groups"), message: "empty table: give at least one subgroup or leave the table out".into() });
            }
        }
        let component = Component {
            joback_groups,
            unifac_groups,
            vapor_pressure: build(&raw.vapor_pressure, "vapor-pressure", Dimension::Pressure)?,
            liquid_density: build(&raw.liquid_density, "liquid-density", Dimension::Density)?,
            latent_heat: build(&raw.latent_heat, "latent-heat", Dimension::SpecificEnergy)?,
            liquid_heat_capacity: build(&raw.liquid_heat_capacity, "liquid-heat-capacity", Dimension::SpecificHeat)?,
            liquid_viscosity: build(&raw.liquid_viscosity, "liquid-viscosity", Dimension::Viscosity)?,
            liquid_conductivity: build(&raw.liquid_conductivity, "liquid-conductivity", Dimension::Conductivity)?,
            surface_tension: build(&raw.surface_tension, "surface-tension", Dimension::SurfaceTension)?,
            ideal_gas_heat_capacity: build(&raw.ideal_gas_heat_capacity, "ideal-gas-heat-capacity", Dimension::SpecificHeat)?,
            vapor_viscosity: build(&raw.vapor_viscosity, "vapor-viscosity", Dimension::Viscosity)?,
            vapor_conductivity: build(&raw.vapor_conductivity, "vapor-conductivity", Dimension::Conductivity)?,
            id: raw.id,
            name: raw.name,
            aliases: raw.aliases,
            cas: raw.cas,
            class: raw.class,
            formula: raw.formula,
            constants: Constants {
                molar_mass: raw.constants.molar_mass,
                normal_boiling_point: raw.constants.normal_boiling_point,
                critical_temperature: raw.constants.critical_temperature,
                critical_pressure: raw.constants.critical_pressure,
                critical_volume: raw.constants.critical_volume,
                acentric_factor: raw.constants.acentric_factor,
                melting_point: raw.constants.melting_point,
                enthalpy_of_fusion: raw.constants.enthalpy_of_fusion,
                density_15c: raw.constants.density_15c,
                lower_heating_value: raw.constants.lower_heating_value,
                cetane_number: raw.constants.cetane_number,
                flash_point: raw.constants.flash_point,
                rackett_z: raw.constants.rackett_z,
                diffusion_volume: raw.constants.diffusion_volume,
                lennard_jones_sigma: raw.constants.lennard_jones_sigma,
                lennard_jones_epsilon_over_k: raw.constants.lennard_jones_epsilon_over_k,
            },
            origin: file.to_string(),
            property_scales: [1.0; 10],
            extensions: std::sync::OnceLock::new(),
            kernels: Default::default(),
        };
        component.check_plausible(&ctx)?;
        component.check_anchors(&ctx)?;
        Ok(component)
    }

    /// Evaluate every published correlation at the normal boiling point (and the liquid ones also halfway
    /// between the melting and boiling points): the values must be finite, positive and inside broad
    /// plausible ranges, so a wrong `unit`, a sign slip or a misplaced coefficient fails at load time
    /// naming the section, instead of surfacing as a failed integration mid-run. Corresponding-states
    /// estimates are computed from the checked constants and are not evaluated here.
    fn check_plausible(&self, ctx: &str) -> Result<(), DataError> {
        let tb = self.normal_boiling_point();
        let t_mid = 0.5 * (self.constants.melting_point.value + tb);
        for (key, corr) in self.correlations() {
            if matches!(corr.form, super::correlation::Form::CorrespondingStates) {
                continue;
            }
            let (lo, hi, unit) = PLAUSIBLE_AT_BOILING.iter().find(|(k, ..)| *k == key).map(|(_, lo, hi, u)| (*lo, *hi, *u)).unwrap_or((0.0, f64::INFINITY, ""));
            let liquid_side = !key.starts_with("vapor-") && key != "ideal-gas-heat-capacity";
            let temps: &[f64] = if liquid_side { &[tb, t_mid] } else { &[tb] };
            for &t in temps {
                let v = corr.eval(t);
                if !(v.is_finite() && v > 0.0) {
                    return Err(DataError::Invalid {
                        context: format!("{ctx}: [{key}]"),
                        message: format!("gives {} {unit} at {t:.2} K; it must be a positive finite number there (check the coefficients, their signs and 'unit')", short(v)),
                    });
                }
            }
            if key == "liquid-density" || key == "liquid-viscosity" {
                let ((lo_b, hi_b), u) = if key == "liquid-density" { (DENSITY_BOUNDS, "kg/m3") } else { (VISCOSITY_BOUNDS, "Pa s") };
                for &t in temps {
                    let v = corr.eval(t);
                    if !matches!(corr.form, super::correlation::Form::Constant(_)) && !(lo_b..=hi_b).contains(&v) {
                        return Err(DataError::Invalid {
                            context: format!("{ctx}: [{key}]"),
                            message: format!("gives {} {u} at {t:.2} K, outside the plausible physical bounds {}–{} {u} of a liquid (check 'unit' and the coefficients)", short(v), short(lo_b), short(hi_b)),
                        });
                    }
                }
            }
            // a `constant` form is an idealised property (analytic test liquids): positive is all it must be
            let v = corr.eval(tb);
            if !matches!(corr.form, super::correlation::Form::Constant(_)) && !(lo..=hi).contains(&v) {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: [{key}]"),
                    message: format!(
                        "gives {} {unit} at the normal boiling point {tb:.2} K, outside the plausible {}–{} {unit} (check 'unit' and the coefficients)",
                        short(v),
                        short(lo),
                        short(hi)
                    ),
                });
            }
        }
        self.check_vapor_pressure_rises(ctx)
    }

    /// The vapour pressure must rise with temperature across its range (Clausius–Clapeyron: the latent heat
    /// is positive), checked at 33 points; a curve that falls would make the droplet condense as it heats.
    fn check_vapor_pressure_rises(&self, ctx: &str) -> Result<(), DataError> {
        let Some((_, corr)) = self.correlations().into_iter().find(|(k, _)| *k == "vapor-pressure") else { return Ok(()) };
        if matches!(corr.form, super::correlation::Form::CorrespondingStates | super::correlation::Form::Constant(_)) {
            return Ok(());
        }
        let lo = corr.t_min.max(self.constants.melting_point.value);
        let hi = corr.t_max.min(self.constants.critical_temperature.value);
        if hi <= lo || hi.is_nan() || lo.is_nan() {
            return Ok(());
        }
        let n = 32;
        let mut previous = corr.eval(lo);
        for k in 1..=n {
            let t = lo + (hi - lo) * k as f64 / n as f64;
            let v = corr.eval(t);
            if v <= previous || v.is_nan() {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: [vapor-pressure]"),
                    message: format!(
                        "falls from {} Pa to {} Pa between {:.2} K and {t:.2} K; a vapour pressure must rise with temperature (check the coefficients and their signs)",
                        short(previous),
                        short(v),
                        lo + (hi - lo) * (k - 1) as f64 / n as f64
                    ),
                });
            }
            previous = v;
        }
        Ok(())
    }

    /// The near-ambient anchors of a fuel component: liquid density and viscosity at 15 °C (held inside the
    /// liquid range, melting to boiling point) and a stated `density-15C` must lie inside physical bounds for
    /// liquid fuel molecules (density 500–1300 kg/m³, viscosity 1e-4–1 Pa s), so a wrong anchor is refused
    /// at load naming the file, the field and the value. Constant and estimated forms are not judged here.
    fn check_anchors(&self, ctx: &str) -> Result<(), DataError> {
        let (tm, tb) = (self.constants.melting_point.value, self.normal_boiling_point());
        let t = 288.15_f64.clamp(tm, tb);
        let out_of = |field: &str, v: f64, unit: &str, lo: f64, hi: f64| DataError::Invalid {
            context: format!("{ctx}: {field}"),
            message: format!("gives {} {unit} at {t:.2} K, outside the physical {}–{} {unit} of a liquid fuel component (check the anchor value and its unit)", short(v), short(lo), short(hi)),
        };
        for (key, corr, lo, hi, unit) in [
            ("[liquid-density]", &self.liquid_density, ANCHOR_DENSITY.0, ANCHOR_DENSITY.1, "kg/m3"),
            ("[liquid-viscosity]", &self.liquid_viscosity, ANCHOR_VISCOSITY.0, ANCHOR_VISCOSITY.1, "Pa s"),
        ] {
            if matches!(corr.form, super::correlation::Form::CorrespondingStates | super::correlation::Form::Constant(_)) {
                continue;
            }
            let v = corr.eval(t);
            if !(v.is_finite() && (lo..=hi).contains(&v)) {
                return Err(out_of(key, v, unit, lo, hi));
            }
        }
        if let Some(d) = &self.constants.density_15c {
            if !(ANCHOR_DENSITY.0..=ANCHOR_DENSITY.1).contains(&d.value) {
                return Err(DataError::Invalid {
                    context: format!("{ctx}: constants.density-15C"),
                    message: format!("{} kg/m3 is outside the physical {}–{} kg/m3 of a liquid fuel component (the unit is kg/m3)", short(d.value), ANCHOR_DENSITY.0, ANCHOR_DENSITY.1),
                });
            }
        }
        Ok(())
    }

    /// A copy whose ten properties are multiplied by `scales` (in [`Component::correlations`] order).
    pub fn with_property_scales(&self, scales: [f64; 10]) -> Self {
        Component { property_scales: scales, kernels: self.kernels.for_rescaled_copy(), ..self.clone() }
    }

    /// Every (field, source id) pair used by this component, for registry checks and reports.
    pub fn source_ids(&self) -> Vec<(String, String)> {
        let c = &self.constants;
        let mut out = vec![];
        let mut push = |f: &str, s: &Sourced| out.push((f.to_string(), s.source.clone()));
        push("molar-mass", &c.molar_mass);
        push("normal-boiling-point", &c.normal_boiling_point);
        push("critical-temperature", &c.critical_temperature);
        push("critical-pressure", &c.critical_pressure);
        push("critical-volume", &c.critical_volume);
        push("acentric-factor", &c.acentric_factor);
        push("melting-point", &c.melting_point);
        push("lower-heating-value", &c.lower_heating_value);
        push("cetane-number", &c.cetane_number);
        for (f, s) in [
            ("enthalpy-of-fusion", &c.enthalpy_of_fusion),
            ("density-15C", &c.density_15c),
            ("flash-point", &c.flash_point),
            ("rackett-z", &c.rackett_z),
            ("diffusion-volume", &c.diffusion_volume),
            ("lennard-jones-sigma", &c.lennard_jones_sigma),
            ("lennard-jones-epsilon-over-k", &c.lennard_jones_epsilon_over_k),
        ] {
            if let Some(s) = s {
                push(f, s);
            }
        }
        for (f, corr) in self.correlations() {
            out.push((f.to_string(), corr.source.clone()));
        }
        out
    }

    /// The ten correlations with their section names.
    pub fn correlations(&self) -> [(&'static str, &Correlation); 10] {
        [
            ("vapor-pressure", &self.vapor_pressure),
            ("liquid-density", &self.liquid_density),
            ("latent-heat", &self.latent_heat),
            ("liquid-heat-capacity", &self.liquid_heat_capacity),
            ("liquid-viscosity", &self.liquid_viscosity),
            ("liquid-conductivity", &self.liquid_conductivity),
            ("surface-tension", &self.surface_tension),
            ("ideal-gas-heat-capacity", &self.ideal_gas_heat_capacity),
            ("vapor-viscosity", &self.vapor_viscosity),
            ("vapor-conductivity", &self.vapor_conductivity),
        ]
    }

    /// Molar mass \[kg/mol\].
    #[inline]
    pub fn molar_mass(&self) -> f64 {
        self.constants.molar_mass.value
    }

    /// Critical temperature \[K\].
    #[inline]
    pub fn critical_temperature(&self) -> f64 {
        self.constants.critical_temperature.value
    }

    /// Critical pressure \[Pa\].
    #[inline]
    pub fn critical_pressure(&self) -> f64 {
        self.constants.critical_pressure.value
    }

    /// Critical molar volume \[m³/mol\].
    #[inline]
    pub fn critical_volume(&self) -> f64 {
        self.constants.critical_volume.value
    }

    /// Normal boiling point \[K\].
    #[inline]
    pub fn normal_boiling_point(&self) -> f64 {
        self.constants.normal_boiling_point.value
    }

    /// Acentric factor \[-\].
    #[inline]
    pub fn acentric_factor(&self) -> f64 {
        self.constants.acentric_factor.value
    }

    /// True when this name is the id or one of the aliases.
    pub fn answers_to(&self, name: &str) -> bool {
        self.id == name || self.aliases.iter().any(|a| a == name)
    }
}
