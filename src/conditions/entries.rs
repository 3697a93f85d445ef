//! The entries of the condition registry, in case-id order of sweeps (the last varies fastest). Each entry's
//! setter and getter work on the public fields of [`DropletInputs`]; choice words become the model's enums here.

use std::sync::Arc;

use crate::model::droplet::{LiquidHeat, LiquidMixing};
use crate::model::film::{DragLaw, Radiation, SupportFibre, VapourDiffusion};
use crate::model::integrator::Method;
use crate::model::{Motion, TransferCorrelation};
use crate::props::activity::{Activity, ActivityModel};
use crate::units::Quantity;

use super::{Condition, GasValue, Kind, Range, Value, VaporValue, MIN_LIQUID_FACTOR};

/// Words of `correlation`.
pub const CORRELATIONS: [&str; 2] = ["clift", "ranz-marshall"];
/// Words of `drag`.
pub const DRAG_LAWS: [&str; 2] = ["yuen-chen", "blowing"];
/// Words of `vapour-diffusion`.
pub const VAPOUR_DIFFUSION: [&str; 2] = ["mixture", "species"];
/// Words of `liquid-mixing`.
pub const LIQUID_MIXING: [&str; 2] = ["well-mixed", "diffusion"];
/// Words of `liquid-heat`.
pub const LIQUID_HEAT: [&str; 2] = ["uniform", "conduction"];
/// Words of `activity`.
pub const ACTIVITY_MODELS: [&str; 2] = ["ideal", "unifac"];
/// Words of `integrator` (the model's own words, [`Method::as_str`]).
pub const INTEGRATORS: [&str; 3] = [Method::Auto.as_str(), Method::Order5.as_str(), Method::Order8.as_str()];
/// Keywords of `radiation`.
pub const RADIATION_WORDS: [&str; 2] = ["off", "ambient"];
/// Keyword of `fibre-diameter` (no fibre).
pub const FIBRE_WORDS: [&str; 1] = ["none"];

const LIQUID_FACTOR_NOTE: &str = "the liquid layers would grow thinner than the radial grid can follow and the run stalls or fails";

/// Every run condition, in the order of sweep case ids and summary columns.
pub static CONDITIONS: [Condition; 26] = [
    Condition {
        key: "ambient-temperature",
        column: "ambient_temperature_K",
        kind: Kind::Quantity(Quantity::Temperature),
        unit: "K",
        default: "800K",
        range: Range::POSITIVE,
        below_min: "",
        help: "Ambient gas temperature.",
        example: "527degC",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.ambient_temperature = x),
        get: |i| Some(Value::Number(i.ambient_temperature)),
    },
    Condition {
        key: "pressure",
        column: "pressure_Pa",
        kind: Kind::Quantity(Quantity::Pressure),
        unit: "Pa",
        default: "1atm",
        range: Range::POSITIVE,
        below_min: "",
        help: "Ambient pressure.",
        example: "10bar",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.pressure = x),
        get: |i| Some(Value::Number(i.pressure)),
    },
    Condition {
        key: "gas",
        column: "gas",
        kind: Kind::Gas,
        unit: "",
        default: "air",
        range: Range::NONE,
        below_min: "",
        help: "Ambient gas: air, n2, or mole fractions like o2=0.15,n2=0.75,co2=0.05,h2o=0.05.",
        example: "n2",
        long_help_only: false,
        set: |i, v| match v {
            Value::Gas(g) => {
                i.gas = g.gas.clone();
                Ok(())
            }
            other => Err(wrong(other, "a gas")),
        },
        get: |i| Some(Value::Gas(Arc::new(GasValue { text: i.gas.label.clone(), gas: i.gas.clone() }))),
    },
    Condition {
        key: "diameter",
        column: "diameter_m",
        kind: Kind::Quantity(Quantity::Length),
        unit: "m",
        default: "50um",
        range: Range::POSITIVE,
        below_min: "",
        help: "Initial droplet diameter.",
        example: "30um",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.initial_diameter = x),
        get: |i| Some(Value::Number(i.initial_diameter)),
    },
    Condition {
        key: "droplet-temperature",
        column: "droplet_temperature_K",
        kind: Kind::Quantity(Quantity::Temperature),
        unit: "K",
        default: "300K",
        range: Range::POSITIVE,
        below_min: "",
        help: "Initial droplet temperature.",
        example: "250K",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.initial_temperature = x),
        get: |i| Some(Value::Number(i.initial_temperature)),
    },
    Condition {
        key: "velocity",
        column: "velocity_m_s",
        kind: Kind::Quantity(Quantity::Velocity),
        unit: "m/s",
        default: "0",
        range: Range::NON_NEGATIVE,
        below_min: "",
        help: "Relative velocity between droplet and gas (kept constant unless --injected).",
        example: "20",
        long_help_only: false,
        set: |i, v| {
            let velocity = number(v)?;
            i.motion = match i.motion {
                Motion::Fixed { .. } => Motion::Fixed { velocity },
                Motion::Injected { .. } => Motion::Injected { velocity },
            };
            Ok(())
        },
        get: |i| match i.motion {
            Motion::Fixed { velocity } | Motion::Injected { velocity } => Some(Value::Number(velocity)),
        },
    },
    Condition {
        key: "injected",
        column: "injected",
        kind: Kind::Flag,
        unit: "",
        default: "false",
        range: Range::NONE,
        below_min: "",
        help: "The droplet is injected at --velocity into gas at rest and slows down by drag.",
        example: "true",
        long_help_only: false,
        set: |i, v| {
            let injected = flag(v)?;
            let velocity = match i.motion {
                Motion::Fixed { velocity } | Motion::Injected { velocity } => velocity,
            };
            i.motion = if injected { Motion::Injected { velocity } } else { Motion::Fixed { velocity } };
            Ok(())
        },
        get: |i| Some(Value::Flag(matches!(i.motion, Motion::Injected { .. }))),
    },
    Condition {
        key: "correlation",
        column: "correlation",
        kind: Kind::Choice(&CORRELATIONS),
        unit: "",
        default: "clift",
        range: Range::NONE,
        below_min: "",
        help: "Nusselt/Sherwood correlation of the non-evaporating sphere: Clift, Grace & Weber (1978) or Ranz & Marshall (1952).",
        example: "ranz-marshall",
        long_help_only: false,
        set: |i, v| {
            i.correlation = match word(v)? {
                "clift" => TransferCorrelation::Clift,
                "ranz-marshall" => TransferCorrelation::RanzMarshall,
                other => return Err(unknown_word(other, &CORRELATIONS)),
            };
            Ok(())
        },
        get: |i| Some(Value::Choice(i.correlation.as_str())),
    },
    Condition {
        key: "rtol",
        column: "rtol",
        kind: Kind::Quantity(Quantity::Dimensionless),
        unit: "",
        default: "1e-6",
        range: Range::POSITIVE,
        below_min: "",
        help: "Relative tolerance of the time integration.",
        example: "1e-7",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.rtol = x),
        get: |i| Some(Value::Number(i.rtol)),
    },
    Condition {
        key: "max-time",
        column: "max_time_s",
        kind: Kind::Quantity(Quantity::Time),
        unit: "s",
        default: "30s",
        range: Range::POSITIVE,
        below_min: "",
        help: "Give up after this simulated time.",
        example: "2s",
        long_help_only: false,
        set: |i, v| number(v).map(|x| i.max_time = x),
        get: |i| Some(Value::Number(i.max_time)),
    },
    Condition {
        key: "ambient-vapor",
        column: "ambient_vapor",
        kind: Kind::AmbientVapor,
        unit: "",
        default: "",
        range: Range::NONE,
        below_min: "",
        help: "Far-field fuel vapour, as component=mass-fraction pairs (e.g. n-decane=0.01).",
        example: "n-decane=0.01",
        long_help_only: false,
        set: |i, v| match v {
            Value::AmbientVapor(vapor) => {
                i.ambient_vapor = vapor.resolve(&i.fuel)?;
                Ok(())
            }
            other => Err(wrong(other, "component=mass-fraction pairs")),
        },
        get: |i| Some(Value::AmbientVapor(Arc::new(VaporValue::of(&i.fuel, &i.ambient_vapor)))),
    },
    Condition {
        key: "liquid-mixing",
        column: "liquid_mixing",
        kind: Kind::Choice(&LIQUID_MIXING),
        unit: "",
        default: "well-mixed",
        range: Range::NONE,
        below_min: "",
        help: "Species inside the droplet: well-mixed (rapid mixing) or diffusion (effective diffusivity).",
        example: "diffusion",
        long_help_only: false,
        set: |i, v| {
            i.liquid.mixing = match word(v)? {
                "well-mixed" => LiquidMixing::WellMixed,
                "diffusion" => LiquidMixing::Diffusion,
                other => return Err(unknown_word(other, &LIQUID_MIXING)),
            };
            Ok(())
        },
        get: |i| {
            Some(Value::Choice(match i.liquid.mixing {
                LiquidMixing::WellMixed => "well-mixed",
                LiquidMixing::Diffusion => "diffusion",
            }))
        },
    },
    Condition {
        key: "liquid-heat",
        column: "liquid_heat",
        kind: Kind::Choice(&LIQUID_HEAT),
        unit: "",
        default: "uniform",
        range: Range::NONE,
        below_min: "",
        help: "Heat inside the droplet: uniform (infinite conductivity) or conduction (effective conductivity).",
        example: "conduction",
        long_help_only: false,
        set: |i, v| {
            i.liquid.heat = match word(v)? {
                "uniform" => LiquidHeat::Uniform,
                "conduction" => LiquidHeat::Conduction,
                other => return Err(unknown_word(other, &LIQUID_HEAT)),
            };
            Ok(())
        },
        get: |i| {
            Some(Value::Choice(match i.liquid.heat {
                LiquidHeat::Uniform => "uniform",
                LiquidHeat::Conduction => "conduction",
            }))
        },
    },
    Condition {
        key: "nodes",
        column: "nodes",
        kind: Kind::Count(4, 400),
        unit: "",
        default: "40",
        range: Range::NONE,
        below_min: "",
        help: "Radial cells of the resolved liquid models.",
        example: "20",
        long_help_only: false,
        set: |i, v| count(v, 4, 400).map(|n| i.liquid.nodes = n as usize),
        get: |i| Some(Value::Number(i.liquid.nodes as f64)),
    },
    Condition {
        key: "non-equilibrium",
        column: "non_equilibrium",
        kind: Kind::Flag,
        unit: "",
        default: "false",
        range: Range::NONE,
        below_min: "",
        help: "Langmuir–Knudsen non-equilibrium surface vapour (Miller, Harstad & Bellan 1998).",
        example: "true",
        long_help_only: false,
        set: |i, v| flag(v).map(|b| i.liquid.non_equilibrium = b),
        get: |i| Some(Value::Flag(i.liquid.non_equilibrium)),
    },
    Condition {
        key: "liquid-diffusivity-factor",
        column: "liquid_diffusivity_factor",
        kind: Kind::Factor,
        unit: "",
        default: "1",
        range: Range { min: MIN_LIQUID_FACTOR, min_inclusive: true, max: 1e8 },
        below_min: LIQUID_FACTOR_NOTE,
        help: "Multiply the liquid diffusivity (limit studies).",
        example: "2",
        long_help_only: true,
        set: |i, v| number(v).map(|x| i.liquid.diffusivity_factor = x),
        get: |i| Some(Value::Number(i.liquid.diffusivity_factor)),
    },
    Condition {
        key: "liquid-conductivity-factor",
        column: "liquid_conductivity_factor",
        kind: Kind::Factor,
        unit: "",
        default: "1",
        range: Range { min: MIN_LIQUID_FACTOR, min_inclusive: true, max: 1e8 },
        below_min: LIQUID_FACTOR_NOTE,
        help: "Multiply the liquid conductivity (limit studies).",
        example: "0.5",
        long_help_only: true,
        set: |i, v| number(v).map(|x| i.liquid.conductivity_factor = x),
        get: |i| Some(Value::Number(i.liquid.conductivity_factor)),
    },
    Condition {
        key: "radiation",
        column: "radiation_temperature_K",
        kind: Kind::QuantityOr(Quantity::Temperature, &RADIATION_WORDS),
        unit: "K",
        default: "off",
        range: Range::POSITIVE,
        below_min: "",
        help: "Radiation from black surroundings: off, ambient (at the gas temperature) or a temperature (e.g. 900K).",
        example: "1200K",
        long_help_only: false,
        set: |i, v| {
            let absorption_efficiency = i.extra_heat.radiation.map(|r| r.absorption_efficiency).unwrap_or(1.0);
            i.extra_heat.radiation = match v {
                Value::Number(t) => Some(Radiation { temperature: Some(*t), absorption_efficiency }),
                Value::Choice("ambient") => Some(Radiation { temperature: None, absorption_efficiency }),
                Value::Choice("off") => None,
                Value::Choice(other) => return Err(unknown_word(other, &RADIATION_WORDS)),
                other => return Err(wrong(other, "a temperature, off or ambient")),
            };
            Ok(())
        },
        get: |i| {
            Some(match i.extra_heat.radiation {
                None => Value::Choice("off"),
                Some(Radiation { temperature: None, .. }) => Value::Choice("ambient"),
                Some(Radiation { temperature: Some(t), .. }) => Value::Number(t),
            })
        },
    },
    Condition {
        key: "absorption-efficiency",
        column: "absorption_efficiency",
        kind: Kind::Quantity(Quantity::Dimensionless),
        unit: "",
        default: "1",
        range: Range::positive_up_to(1.0),
        below_min: "",
        help: "Absorption efficiency (= emissivity) of the droplet for --radiation, 0–1 (used only with radiation).",
        example: "0.5",
        long_help_only: false,
        set: |i, v| {
            let x = number(v)?;
            if let Some(r) = &mut i.extra_heat.radiation {
                r.absorption_efficiency = x;
            }
            Ok(())
        },
        get: |i| i.extra_heat.radiation.map(|r| Value::Number(r.absorption_efficiency)),
    },
    Condition {
        key: "fibre-diameter",
        column: "fibre_diameter_m",
        kind: Kind::QuantityOr(Quantity::Length, &FIBRE_WORDS),
        unit: "m",
        default: "none",
        range: Range::POSITIVE,
        below_min: "",
        help: "Diameter of a fibre suspending the droplet (heat conducted in along it); none by default.",
        example: "14um",
        long_help_only: false,
        set: |i, v| {
            i.extra_heat.fibre = match v {
                Value::Number(d) => {
                    let (conductivity, stems) = i.extra_heat.fibre.map(|f| (f.conductivity, f.stems)).unwrap_or((1.4, 1));
                    Some(SupportFibre { diameter: *d, conductivity, stems })
                }
                Value::Choice("none") => None,
                Value::Choice(other) => return Err(unknown_word(other, &FIBRE_WORDS)),
                other => return Err(wrong(other, "a length or none")),
            };
            Ok(())
        },
        get: |i| Some(i.extra_heat.fibre.map(|f| Value::Number(f.diameter)).unwrap_or(Value::Choice("none"))),
    },
    Condition {
        key: "fibre-conductivity",
        column: "fibre_conductivity_W_mK",
        kind: Kind::Quantity(Quantity::Dimensionless),
        unit: "W/(m·K)",
        default: "1.4",
        range: Range::positive_up_to(500.0),
        below_min: "",
        help: "Thermal conductivity of the fibre in W/(m·K) (default 1.4: fused silica near room temperature; used only with a fibre).",
        example: "20",
        long_help_only: false,
        set: |i, v| {
            let x = number(v)?;
            if let Some(f) = &mut i.extra_heat.fibre {
                f.conductivity = x;
            }
            Ok(())
        },
        get: |i| i.extra_heat.fibre.map(|f| Value::Number(f.conductivity)),
    },
    Condition {
        key: "fibre-stems",
        column: "fibre_stems",
        kind: Kind::Count(1, 4),
        unit: "",
        default: "1",
        range: Range::NONE,
        below_min: "",
        help: "Fibre stems leaving the droplet: 1 (fibre ends inside) or 2 (fibre passes through); used only with a fibre.",
        example: "2",
        long_help_only: false,
        set: |i, v| {
            let n = count(v, 1, 4)?;
            if let Some(f) = &mut i.extra_heat.fibre {
                f.stems = n as u32;
            }
            Ok(())
        },
        get: |i| i.extra_heat.fibre.map(|f| Value::Number(f64::from(f.stems))),
    },
    Condition {
        key: "drag",
        column: "drag",
        kind: Kind::Choice(&DRAG_LAWS),
        unit: "",
        default: "yuen-chen",
        range: Range::NONE,
        below_min: "",
        help: "Drag law of an --injected droplet: yuen-chen (Yuen & Chen 1976) or blowing (Eisenklam, Arunachalam & Weston 1967).",
        example: "blowing",
        long_help_only: false,
        set: |i, v| {
            i.drag = match word(v)? {
                "yuen-chen" => DragLaw::YuenChen,
                "blowing" => DragLaw::Blowing,
                other => return Err(unknown_word(other, &DRAG_LAWS)),
            };
            Ok(())
        },
        get: |i| Some(Value::Choice(i.drag.as_str())),
    },
    Condition {
        key: "activity",
        column: "activity",
        kind: Kind::Choice(&ACTIVITY_MODELS),
        unit: "",
        default: "ideal",
        range: Range::NONE,
        below_min: "",
        help: "Liquid activity coefficients at the surface: ideal (Raoult's law) or unifac (original UNIFAC).",
        example: "unifac",
        long_help_only: false,
        set: |i, v| {
            let name = word(v)?;
            let model = ActivityModel::parse(name).ok_or_else(|| unknown_word(name, &ACTIVITY_MODELS))?;
            Activity::new(model, &i.fuel.components).map_err(|e| format!("fuel {}: {e}", i.fuel.origin))?;
            i.liquid.activity = model;
            Ok(())
        },
        get: |i| Some(Value::Choice(i.liquid.activity.as_str())),
    },
    Condition {
        key: "vapour-diffusion",
        column: "vapour_diffusion",
        kind: Kind::Choice(&VAPOUR_DIFFUSION),
        unit: "",
        default: "mixture",
        range: Range::NONE,
        below_min: "",
        help: "Vapour diffusivity in the per-component evaporation rates: mixture (one mixture-averaged value) or species (each component's own binary diffusivity in the ambient gas, common Stefan flow).",
        example: "species",
        long_help_only: false,
        set: |i, v| {
            i.vapour_diffusion = match word(v)? {
                "mixture" => VapourDiffusion::Mixture,
                "species" => VapourDiffusion::Species,
                other => return Err(unknown_word(other, &VAPOUR_DIFFUSION)),
            };
            Ok(())
        },
        get: |i| Some(Value::Choice(i.vapour_diffusion.as_str())),
    },
    Condition {
        key: "integrator",
        column: "integrator",
        kind: Kind::Choice(&INTEGRATORS),
        unit: "",
        default: "auto",
        range: Range::NONE,
        below_min: "",
        help: "Runge–Kutta pair of the well-mixed liquid's time integration: auto (Dormand–Prince 5(4) above rtol 1e-10, 8(5,3) at or below), dp54 or dp853 (the resolved liquid takes its own implicit steps and ignores it).",
        example: "dp853",
        long_help_only: false,
        set: |i, v| {
            let name = word(v)?;
            i.integrator = Method::parse(name).ok_or_else(|| unknown_word(name, &INTEGRATORS))?;
            Ok(())
        },
        get: |i| Some(Value::Choice(i.integrator.as_str())),
    },
];

fn describe(v: &Value) -> String {
    match v {
        Value::Number(x) => format!("the number {x}"),
        Value::Flag(b) => format!("the switch {b}"),
        Value::Choice(w) => format!("the word '{w}'"),
        Value::Gas(g) => format!("the gas '{}'", g.text),
        Value::AmbientVapor(a) => format!("the vapour '{}'", a.text),
    }
}

fn wrong(v: &Value, expected: &str) -> String {
    format!("expected {expected}, got {}", describe(v))
}

fn number(v: &Value) -> Result<f64, String> {
    match v {
        Value::Number(x) => Ok(*x),
        other => Err(wrong(other, "a number")),
    }
}

fn flag(v: &Value) -> Result<bool, String> {
    match v {
        Value::Flag(b) => Ok(*b),
        other => Err(wrong(other, "true or false")),
    }
}

fn word(v: &Value) -> Result<&'static str, String> {
    match v {
        Value::Choice(w) => Ok(w),
        other => Err(wrong(other, "a word")),
    }
}

fn count(v: &Value, lo: u64, hi: u64) -> Result<u64, String> {
    let x = number(v)?;
    if x.fract() != 0.0 || x < lo as f64 || x > hi as f64 {
        return Err(format!("{x} must be a whole number from {lo} to {hi}"));
    }
    Ok(x as u64)
}

fn unknown_word(w: &str, words: &[&str]) -> String {
    format!("unknown word '{w}'; use {}", words.join(" or "))
}
