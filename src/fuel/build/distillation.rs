//! Fuels from a distillation curve and a density: N pseudo-components (distillation cuts) with the full
//! property set.
//!
//! 1. The curve (ASTM D86 or true boiling point, TBP; volume % recovered) is turned into a TBP curve: D86
//!    points by the Riazi–Daubert (1986) power law at each percentage ([`super::petroleum::d86_to_tbp`]),
//!    TBP points as given. Between points the TBP curve is linear in percent; a missing 0 % or 100 % point is
//!    extrapolated from the nearest segment.
//! 2. The 0–100 % range is split into N cuts of equal volume; a cut's boiling point is the volume average of
//!    the TBP curve over the cut.
//! 3. Every cut gets a specific gravity from one Watson factor K_W shared by all cuts, solved so that the
//!    volume-additive density of the cuts equals the given 15 °C density (closed form:
//!    K_W = Σ v_i (1.8 Tb_i)^(1/3) · 999 / ρ15).
//! 4. Per cut: molar mass and critical constants by Riazi–Daubert (1980, or 1987), acentric factor by
//!    Lee–Kesler (Tb, Tc, pc; or Edmister), critical volume from the Lee–Kesler Zc, a formula from the
//!    Riazi (1986) C/H ratio, ideal-gas cp by Kesler–Lee (1976), LHV by Channiwala–Parikh (2002) from C and H,
//!    cetane number by the ASTM D976 index of the cut, melting point by Won (1986), and a Rackett Z fitted so
//!    that the liquid density at 15 °C is the cut's SG × 999 kg/m³.
//! 5. Optional calibration (`fit = simulated-distillation`, the default of the CLI): the simulated
//!    single-stage distillation of the built fuel (the curve every other command reports) is compared with the
//!    input curve on the D86 scale (a TBP input is converted back with the inverse of step 1) at the input
//!    points between 5 and 95 %; the cut boiling points are shifted by the interpolated residual and steps
//!    3–4 repeated until the residual is below 0.05 K. The shift is reported per cut.

use crate::numerics::interp::{self, Extrapolation};
use crate::data::{HydrocarbonClass, Library, GAS_CONSTANT};

pub use super::curve::{check_density, CurveKind, DistillationCurve};
use super::petroleum::{self as pet, CutConstants};
/// Largest relative difference between a pseudo-component's molar mass and its formula's mass: below the 10 %
/// the component loader accepts for petroleum fractions, so every built fuel loads.
const FORMULA_MASS_TOLERANCE: f64 = 0.08;

use super::{formula_molar_mass, fuel_file_text, input_error, read_back, BuildError, BuiltFuel, ComponentSpec, CompositionLine, CpPolynomial, CurveSimulator, Value};

/// Critical-constant correlation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum CriticalMethod {
    /// Riazi & Daubert (1980).
    RiaziDaubert1980,
    /// Riazi & Daubert (1987).
    RiaziDaubert1987,
}

impl CriticalMethod {
    /// Source marker.
    pub fn marker(self) -> &'static str {
        match self {
            CriticalMethod::RiaziDaubert1980 => "estimated:riazi-daubert-1980",
            CriticalMethod::RiaziDaubert1987 => "estimated:riazi-daubert-1987",
        }
    }
    fn eval(self, tb: f64, sg: f64) -> CutConstants {
        match self {
            CriticalMethod::RiaziDaubert1980 => pet::riazi_daubert_1980(tb, sg),
            CriticalMethod::RiaziDaubert1987 => pet::riazi_daubert_1987(tb, sg),
        }
    }
}

/// Acentric-factor method.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum AcentricMethod {
    /// Lee–Kesler vapour-pressure equation solved at Tb (consistent with the vapour-pressure curve).
    LeeKesler,
    /// Edmister (1958).
    Edmister,
}

/// How the cut boiling points are fixed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum CutFit {
    /// Cuts from the TBP curve (D86 converted by Riazi–Daubert 1986), no further adjustment.
    Tbp,
    /// Cuts shifted until the simulated single-stage distillation reproduces the input curve (D86 scale).
    SimulatedDistillation,
}

/// Options of [`build_from_distillation`].
#[derive(Debug, Clone, PartialEq)]
pub struct DistillationOptions {
    /// Fuel name (default: the curve's).
    pub name: Option<String>,
    /// 15 °C density \[kg/m³\] (overrides the file's).
    pub density_15c: Option<f64>,
    /// Number of pseudo-components.
    pub pseudo_components: usize,
    /// Critical constants and molar mass.
    pub critical: CriticalMethod,
    /// Acentric factor.
    pub acentric: AcentricMethod,
    /// Cut boiling points.
    pub fit: CutFit,
}

impl Default for DistillationOptions {
    fn default() -> Self {
        DistillationOptions { name: None, density_15c: None, pseudo_components: DEFAULT_PSEUDO_COMPONENTS, critical: CriticalMethod::RiaziDaubert1980, acentric: AcentricMethod::LeeKesler, fit: CutFit::SimulatedDistillation }
    }
}

/// Default number of pseudo-components.
pub const DEFAULT_PSEUDO_COMPONENTS: usize = 12;
/// Allowed numbers of pseudo-components.
pub const PSEUDO_RANGE: std::ops::RangeInclusive<usize> = 3..=60;
/// Calibration points lie between these percentages recovered \[%\].
pub const CALIBRATION_RANGE: (f64, f64) = (5.0, 95.0);
/// Calibration stops when every residual is below this \[K\].
pub const CALIBRATION_TOLERANCE: f64 = 0.05;
/// Most calibration iterations.
pub const CALIBRATION_ITERATIONS: usize = 30;

/// One pseudo-component as reported.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[allow(non_snake_case)]
pub struct CutRow {
    /// Component id.
    pub id: String,
    /// Cut start \[% recovered\].
    pub from_percent: f64,
    /// Cut end \[% recovered\].
    pub to_percent: f64,
    /// Volume-average TBP of the cut before calibration \[K\].
    pub tbp_K: f64,
    /// Boiling point used \[K\].
    pub boiling_point_K: f64,
    /// Specific gravity 60/60 °F \[-\].
    pub specific_gravity: f64,
    /// Molar mass \[kg/mol\].
    pub molar_mass_kg_mol: f64,
    /// Critical temperature \[K\].
    pub critical_temperature_K: f64,
    /// Critical pressure \[Pa\].
    pub critical_pressure_Pa: f64,
    /// Acentric factor \[-\].
    pub acentric_factor: f64,
    /// Formula as text.
    pub formula: String,
    /// Hydrogen mass fraction \[-\].
    pub hydrogen_mass_fraction: f64,
    /// Lower heating value \[J/kg\].
    pub lhv_J_kg: f64,
    /// Cetane number estimate \[-\].
    pub cetane_number: f64,
}

/// One compared point of the curve.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[allow(non_snake_case)]
pub struct CurvePoint {
    /// Volume % recovered.
    pub percent: f64,
    /// Input temperature \[K\] (as given: D86 or TBP).
    pub input_K: f64,
    /// Input on the D86 scale \[K\] (a TBP input converted by the inverse Riazi–Daubert 1986 law).
    pub input_d86_K: f64,
    /// Simulated single-stage distillation of the built fuel \[K\].
    pub simulated_K: f64,
    /// simulated − input on the D86 scale \[K\].
    pub error_K: f64,
}

/// Report of a distillation build.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[allow(non_snake_case)]
pub struct DistillationReport {
    /// Curve kind of the input.
    pub curve: CurveKind,
    /// Target 15 °C density \[kg/m³\].
    pub target_density_kg_m3: f64,
    /// Density of the built fuel at 15 °C (volume additivity) \[kg/m³\].
    pub built_density_kg_m3: f64,
    /// Watson factor shared by the cuts \[-\].
    pub watson_k: f64,
    /// Cut fit mode.
    pub fit: CutFit,
    /// Calibration iterations done (0 without calibration).
    pub calibration_iterations: usize,
    /// Pseudo-components.
    pub cuts: Vec<CutRow>,
    /// Simulated distillation vs input at the input points (empty without a simulator).
    pub comparison: Vec<CurvePoint>,
    /// Notices.
    pub notes: Vec<String>,
}

/// Linear interpolation in a sorted (x, y) table with linear extrapolation from the end segments.
fn interp_extrap(points: &[(f64, f64)], x: f64) -> f64 {
    interp::linear(points, x, Extrapolation::Linear).unwrap_or(0.0)
}

/// Linear interpolation held flat beyond the ends.
fn interp_flat(points: &[(f64, f64)], x: f64) -> f64 {
    interp::linear(points, x, Extrapolation::Hold).unwrap_or(0.0)
}

/// Volume-average of a piecewise-linear curve over \[a, b\] (exact for the linear pieces: the breakpoints are
/// included as nodes).
fn average(points: &[(f64, f64)], a: f64, b: f64) -> f64 {
    let mut xs = vec![a, b];
    xs.extend(points.iter().map(|p| p.0).filter(|x| *x > a && *x < b));
    xs.sort_by(f64::total_cmp);
    let mut s = 0.0;
    for w in xs.windows(2) {
        s += 0.5 * (interp_extrap(points, w[0]) + interp_extrap(points, w[1])) * (w[1] - w[0]);
    }
    s / (b - a)
}

/// Rackett Z_RA that makes the Spencer–Danner density equal `rho` at `t` \[-\].
fn rackett_z_for(rho: f64, t: f64, tc: f64, pc: f64, molar_mass: f64) -> f64 {
    let tr = (t / tc).min(crate::props::pure::MAX_REDUCED_TEMPERATURE);
    (molar_mass * pc / (rho * GAS_CONSTANT * tc)).powf(1.0 / (1.0 + (1.0 - tr).powf(2.0 / 7.0)))
}

struct CutInput<'a> {
    id: String,
    index: usize,
    range: (f64, f64),
    tb: f64,
    tbp: f64,
    sg: f64,
    k_w: f64,
    tb_note: &'a str,
    /// Added to the cut's D976 index so that the volume-linear blend equals the fuel's D976 index.
    cn_offset: f64,
    /// D976 index of the whole fuel (for the note).
    fuel_cci: f64,
}

fn cut_component(c: &CutInput, opts: &DistillationOptions, notes: &mut Vec<String>) -> Result<ComponentSpec, BuildError> {
    let ctx = format!("cut {} ({:.1}–{:.1} %)", c.index + 1, c.range.0, c.range.1);
    let (tb, sg) = (c.tb, c.sg);
    let cc = opts.critical.eval(tb, sg);
    let (tc, pc) = (cc.critical_temperature, cc.critical_pressure);
    if !(tc > tb * 1.05 && pc > 2e5 && pc < 1e8) {
        return Err(input_error(ctx, format!("{} gives Tc {tc:.1} K, pc {:.2} bar for Tb {tb:.1} K, SG {sg:.4}: outside the correlation's range", opts.critical.marker(), pc / 1e5)));
    }
    let (omega, omega_src, omega_note) = match opts.acentric {
        AcentricMethod::LeeKesler => (crate::props::pure::lee_kesler_acentric_factor(tb, tc, pc), "estimated:lee-kesler-omega", "Lee-Kesler vapour-pressure equation solved at Tb with the Tc, pc above"),
        AcentricMethod::Edmister => (pet::edmister_acentric_factor(tb, tc, pc), "estimated:edmister", "Edmister (1958): (3/7) log10(pc/1 atm)/(Tc/Tb - 1) - 1"),
    };
    // formula from the Riazi (1986) C/H weight ratio: the whole-atom formula of nearest mass with that H/C
    let w_rd = cc.molar_mass;
    let ch = pet::riazi_carbon_hydrogen_ratio(tb, sg);
    let hc_atomic = 11.9147 / ch;
    let x_c = w_rd / (12.011e-3 + 1.008e-3 * hc_atomic);
    let mut best: Option<(u32, u32, f64)> = None;
    for n_c in [x_c.floor().max(2.0) as u32, x_c.ceil().max(2.0) as u32] {
        let n_h = ((f64::from(n_c) * hc_atomic).round() as u32).clamp(2, 2 * n_c + 2);
        let err = (formula_molar_mass(n_c, n_h, 0) / w_rd - 1.0).abs();
        if best.is_none_or(|b| err < b.2) {
            best = Some((n_c, n_h, err));
        }
    }
    let (mut n_c, mut n_h, err) = best.unwrap_or((2, 6, 0.0));
    let mut adjusted = false;
    if err > FORMULA_MASS_TOLERANCE {
        // The ratio's formula misses the molar mass (light cuts, where the paraffin limit caps H/C): take the
        // whole-atom hydrocarbon (H/C between 1 and the paraffin limit) of nearest mass, then nearest H/C.
        let mut wide: Option<(u32, u32, f64, f64)> = None;
        for c in (x_c.floor() as u32).saturating_sub(3).max(1)..=(x_c.ceil() as u32 + 3) {
            for h in c.max(2)..=(2 * c + 2) {
                let e = (formula_molar_mass(c, h, 0) / w_rd - 1.0).abs();
                let d = (f64::from(h) / f64::from(c) - hc_atomic).abs();
                if e <= FORMULA_MASS_TOLERANCE && wide.is_none_or(|b| d < b.3) {
                    wide = Some((c, h, e, d));
                }
            }
        }
        match wide {
            Some((c, h, ..)) => {
                (n_c, n_h, adjusted) = (c, h, true);
            }
            None => {
                return Err(input_error(
                    ctx,
                    format!(
                        "{}: Tb {:.1} K and SG {sg:.4} give a molar mass of {:.1} g/mol that no hydrocarbon formula matches within {:.0} % (the lightest, CH4, is 16 g/mol; the Riazi–Daubert correlation covers fractions of about 70–300 g/mol, boiling from about 35 °C): start the curve at a higher temperature or use fewer pseudo-components (--pseudo)",
                        c.id,
                        tb,
                        w_rd * 1e3,
                        100.0 * FORMULA_MASS_TOLERANCE
                    ),
                ));
            }
        }
    }
    let w_formula = formula_molar_mass(n_c, n_h, 0);
    let mut formula_note = format!("formula C{n_c}H{n_h}: whole atoms nearest the molar mass with the Riazi (1986) C/H weight ratio {ch:.3} (H/C {hc_atomic:.3})");
    if adjusted {
        formula_note = format!("formula C{n_c}H{n_h}: the whole-atom hydrocarbon nearest the molar mass (within {:.0} %), H/C nearest the Riazi (1986) ratio {hc_atomic:.3}, which alone gives no formula of that mass", 100.0 * FORMULA_MASS_TOLERANCE);
        notes.push(format!("{}: the Riazi C/H ratio gives no formula near the molar mass {:.1} g/mol; C{n_c}H{n_h} used", c.id, w_rd * 1e3));
    }
    if hc_atomic > 2.0 + 2.0 / f64::from(n_c) + 1e-9 {
        formula_note.push_str("; the ratio was above the paraffin limit and is capped there");
        notes.push(format!("{}: the Riazi C/H ratio is above the paraffin limit; capped at CnH2n+2", c.id));
    }
    let w = w_rd;
    let h_frac = 1.008e-3 * f64::from(n_h) / w_formula;
    let vc = pet::lee_kesler_critical_volume(tc, pc, omega);
    let tm_won = pet::won_n_paraffin_melting_point(w);
    let tm = tm_won.min(0.8 * tb);
    let rho15 = sg * pet::WATER_DENSITY_60F;
    let z_ra = rackett_z_for(rho15, 288.15, tc, pc, w);
    if !(0.15..=0.40).contains(&z_ra) {
        notes.push(format!("{}: the Rackett Z fitted to SG {sg:.4} is {z_ra:.4}, outside the usual 0.20–0.30", c.id));
    }
    let (cp, vertex) = pet::kesler_lee_cp_coefficients(c.k_w, omega, w);
    let cp_t_max = vertex.min(1000.0);
    let hhv = pet::channiwala_parikh_hhv(100.0 * (1.0 - h_frac), 100.0 * h_frac, 0.0);
    let lhv = pet::lhv_from_hhv(hhv, h_frac);
    let cci = pet::astm_d976_cetane_index(rho15, tb);
    let cn = (cci + c.cn_offset).clamp(0.0, 100.0);
    let mut cn_note = format!(
        "ASTM D976 two-variable cetane index of the cut (density {rho15:.1} kg/m3, boiling point {:.1} degC) = {cci:.1}, shifted by {:+.1} so that the volume-linear blend of the cuts equals the D976 index of the whole fuel ({:.1}, from its density and D86 T50)",
        tb - 273.15,
        c.cn_offset,
        c.fuel_cci
    );
    if (cn - (cci + c.cn_offset)).abs() > 1e-9 {
        cn_note.push_str(&format!("; clamped to {cn:.0}"));
    }
    let mut cn_value = Value::new(cn, "estimated:astm-d976", cn_note);
    cn_value.kind = Some("estimate".into());
    cn_value.uncertainty = Some(0.3);
    let mut density_value = Value::new(rho15, "estimated:watson-k", format!("SG {sg:.5} x 999.0 kg/m3 from the Watson factor K_W = {:.4} shared by all cuts", c.k_w));
    density_value.uncertainty = Some(0.02);
    let constants = vec![
        ("molar-mass", Value::new(w, opts.critical.marker(), format!("from Tb {tb:.2} K and SG {sg:.5}; the representative formula C{n_c}H{n_h} has {:.3} g/mol", w_formula * 1e3))),
        ("normal-boiling-point", Value::new(tb, "estimated:distillation-cut", c.tb_note.to_string())),
        ("critical-temperature", Value::new(tc, opts.critical.marker(), format!("from Tb {tb:.2} K and SG {sg:.5}"))),
        ("critical-pressure", Value::new(pc, opts.critical.marker(), format!("from Tb {tb:.2} K and SG {sg:.5}"))),
        ("critical-volume", Value::new(vc, "estimated:lee-kesler-zc", format!("Vc = Zc R Tc/pc with Zc = 0.2905 - 0.085 omega = {:.4}", 0.2905 - 0.085 * omega))),
        ("acentric-factor", Value::new(omega, omega_src, omega_note)),
        ("melting-point", Value::new(tm, "estimated:won-n-paraffin", format!("Won (1986) melting point of the n-paraffin of the same molar mass, {tm_won:.1} K (an upper bound for a cut; capped at 0.8 Tb); no enthalpy of fusion, so freezing-point estimates skip this cut"))),
        ("density-15C", density_value),
        ("lower-heating-value", Value::new(lhv, "estimated:channiwala-parikh", format!("HHV from C {:.2} %, H {:.2} % by mass (Channiwala-Parikh 2002), LHV = HHV - 2.442 MJ/kg x 8.937 w_H", 100.0 * (1.0 - h_frac), 100.0 * h_frac))),
        ("cetane-number", cn_value),
        ("diffusion-volume", Value::new((15.9 * f64::from(n_c) + 2.31 * f64::from(n_h)) * w / w_formula, "estimated:fuller-scaled", "Fuller atomic diffusion volumes of the formula (C 15.9, H 2.31), scaled by the ratio of the molar mass to the formula mass")),
        ("rackett-z", Value::new(z_ra, "estimated:rackett-z-fit", format!("Z_RA that makes the Spencer-Danner Rackett density {rho15:.2} kg/m3 at 15 degC"))),
    ];
    Ok(ComponentSpec {
        id: c.id.clone(),
        name: format!("distillation cut {} ({:.1}-{:.1} vol%, Tb {:.1} K)", c.index + 1, c.range.0, c.range.1, tb),
        class: HydrocarbonClass::PetroleumFraction,
        formula: (n_c, n_h, 0),
        joback_groups: vec![],
        constants,
        ideal_gas_cp: CpPolynomial {
            coefficients: vec![cp[0], cp[1], cp[2]],
            t_min: 200.0,
            t_max: cp_t_max,
            source: "estimated:kesler-lee-1976".into(),
            note: format!("Kesler-Lee (1976) petroleum-fraction ideal-gas cp, SI form (Riazi 2005), K_W {:.4}, omega {omega:.4}; held constant above t-max. {formula_note}", c.k_w),
        },
        viscosity_source: "estimated:letsou-stiel-lewis-squires".into(),
    })
}

/// Build a fuel of pseudo-components from a distillation curve; `simulate` is needed for
/// `fit = simulated-distillation` and, when given, fills the report's comparison in any mode.
pub fn build_from_distillation(curve: &DistillationCurve, lib: &Library, opts: &DistillationOptions, simulate: Option<&CurveSimulator>) -> Result<BuiltFuel<DistillationReport>, BuildError> {
    let name = super::kebab_id(opts.name.as_deref().unwrap_or(&curve.name));
    if name.is_empty() {
        return Err(input_error(&curve.origin, "the fuel needs a name (--name)"));
    }
    let n = opts.pseudo_components;
    if !PSEUDO_RANGE.contains(&n) {
        return Err(input_error("--pseudo", format!("{n} pseudo-components: use {}–{}", PSEUDO_RANGE.start(), PSEUDO_RANGE.end())));
    }
    let rho = match (opts.density_15c, curve.density_15c) {
        (Some(r), _) => check_density(r, "--density")?,
        (None, Some(r)) => r,
        (None, None) => return Err(input_error(&curve.origin, "no density: give --density (or --specific-gravity), or density-15C in the file")),
    };
    if opts.fit == CutFit::SimulatedDistillation && simulate.is_none() {
        return Err(input_error("fit", "calibration to the simulated distillation needs a distillation simulator"));
    }
    let mut notes = vec![];
    // TBP curve
    let tbp: Vec<(f64, f64)> = match curve.kind {
        CurveKind::Tbp => curve.points.clone(),
        CurveKind::D86 => {
            let between: Vec<String> = curve.points.iter().filter(|(p, _)| !pet::d86_tbp_coefficients(*p).2 && *p < 95.0).map(|(p, _)| format!("{p}")).collect();
            let above: Vec<String> = curve.points.iter().filter(|(p, _)| *p > 95.0).map(|(p, _)| format!("{p}")).collect();
            if !between.is_empty() {
                notes.push(format!(
                    "D86 -> TBP: the Riazi-Daubert (1986) law is tabulated at 0, 10, 30, 50, 70, 90, 95 %; at {} % the difference TBP - D86 was interpolated linearly between tabulated percentages",
                    between.join(", ")
                ));
            }
            if !above.is_empty() {
                notes.push(format!("D86 -> TBP: the table ends at 95 %; at {} % the 95 % difference TBP - D86 was kept", above.join(", ")));
            }
            pet::d86_curve_to_tbp(&curve.points)
        }
    };
    if let Some(w) = tbp.windows(2).find(|w| w[1].1 <= w[0].1) {
        return Err(input_error(&curve.origin, format!("the TBP curve converted from D86 does not increase between {} % and {} %; check the input", w[0].0, w[1].0)));
    }
    if tbp[0].0 > 0.0 {
        notes.push(format!("no 0 % (IBP) point: the TBP curve was extrapolated linearly from {} % to 0 %", tbp[0].0));
    }
    if tbp[tbp.len() - 1].0 < 100.0 {
        notes.push(format!("no 100 % (FBP) point: the TBP curve was extrapolated linearly from {} % to 100 %", tbp[tbp.len() - 1].0));
    }
    let edges: Vec<f64> = (0..=n).map(|i| 100.0 * i as f64 / n as f64).collect();
    let mids: Vec<f64> = edges.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
    let tbs0: Vec<f64> = edges.windows(2).map(|w| average(&tbp, w[0], w[1])).collect();
    if tbs0[0] < 250.0 {
        return Err(input_error(&curve.origin, format!("the lightest cut boils at {:.1} K: below 250 K the correlations do not apply (check the units of the curve)", tbs0[0])));
    }
    // the input on the D86 scale: calibration targets and comparison
    let d86: Vec<(f64, f64)> = match curve.kind {
        CurveKind::D86 => curve.points.clone(),
        CurveKind::Tbp => pet::tbp_curve_to_d86(&curve.points),
    };
    let targets: Vec<(f64, f64)> = d86.iter().copied().filter(|(p, _)| *p >= CALIBRATION_RANGE.0 && *p <= CALIBRATION_RANGE.1).collect();
    if opts.fit == CutFit::SimulatedDistillation && targets.is_empty() {
        notes.push(format!("no input point between {} and {} %: nothing to calibrate against, cuts kept on the TBP curve", CALIBRATION_RANGE.0, CALIBRATION_RANGE.1));
    }
    let fractions: Vec<f64> = targets.iter().map(|(p, _)| p / 100.0).collect();
    // D976 index of the whole fuel from its density and D86 T50 (a TBP input converted back)
    let d86_t50 = interp_extrap(&d86, 50.0);
    let fuel_cci = pet::astm_d976_cetane_index(rho, d86_t50);
    let ids: Vec<String> = (1..=n).map(|i| format!("{name}-pc{i:02}")).collect();
    let mut tbs = tbs0.clone();
    let mut iterations = 0;
    type Candidate = (f64, String, crate::fuel::Fuel, Vec<CutRow>, f64, Vec<String>);
    let mut best: Option<Candidate> = None;
    fn finish(best: Option<Candidate>, notes: &mut Vec<String>) -> (String, crate::fuel::Fuel, Vec<CutRow>, f64) {
        let (_, text, fuel, rows, k_w, cut_notes) = best.expect("at least one candidate");
        notes.extend(cut_notes);
        (text, fuel, rows, k_w)
    }
    let (text, fuel, cuts, k_w) = loop {
        // Watson factor so that Σ v_i SG_i × 999 = ρ15 (equal volumes)
        let k_w = tbs.iter().map(|tb| (1.8 * tb).cbrt()).sum::<f64>() / n as f64 * pet::WATER_DENSITY_60F / rho;
        let mut specs = vec![];
        let mut rows = vec![];
        let mut cut_notes = vec![];
        let sgs: Vec<f64> = tbs.iter().map(|tb| pet::sg_from_watson(*tb, k_w)).collect();
        let mean_cci = tbs.iter().zip(&sgs).map(|(tb, sg)| pet::astm_d976_cetane_index(sg * pet::WATER_DENSITY_60F, *tb)).sum::<f64>() / n as f64;
        let cn_offset = fuel_cci - mean_cci;
        for i in 0..n {
            let shift = tbs[i] - tbs0[i];
            let src = match curve.kind {
                CurveKind::D86 => "TBP from the D86 curve by Riazi-Daubert (1986)",
                CurveKind::Tbp => "TBP curve as given",
            };
            let mut tb_note = format!("volume-average TBP over {:.2}-{:.2} % recovered ({src}): {:.2} K", edges[i], edges[i + 1], tbs0[i]);
            if shift.abs() > 1e-9 {
                tb_note.push_str(&format!("; shifted by {shift:+.2} K so that the simulated distillation reproduces the input curve (fit = simulated-distillation)"));
            }
            let sg = sgs[i];
            let input = CutInput { id: ids[i].clone(), index: i, range: (edges[i], edges[i + 1]), tb: tbs[i], tbp: tbs0[i], sg, k_w, tb_note: &tb_note, cn_offset, fuel_cci };
            let spec = cut_component(&input, opts, &mut cut_notes)?;
            rows.push(CutRow {
                id: spec.id.clone(),
                from_percent: edges[i],
                to_percent: edges[i + 1],
                tbp_K: input.tbp,
                boiling_point_K: input.tb,
                specific_gravity: sg,
                molar_mass_kg_mol: spec.constant("molar-mass").unwrap_or(f64::NAN),
                critical_temperature_K: spec.constant("critical-temperature").unwrap_or(f64::NAN),
                critical_pressure_Pa: spec.constant("critical-pressure").unwrap_or(f64::NAN),
                acentric_factor: spec.constant("acentric-factor").unwrap_or(f64::NAN),
                formula: format!("C{}H{}", spec.formula.0, spec.formula.1),
                hydrogen_mass_fraction: 1.008e-3 * f64::from(spec.formula.1) / formula_molar_mass(spec.formula.0, spec.formula.1, 0),
                lhv_J_kg: spec.constant("lower-heating-value").unwrap_or(f64::NAN),
                cetane_number: spec.constant("cetane-number").unwrap_or(f64::NAN),
            });
            specs.push(spec);
        }
        let composition: Vec<CompositionLine> = ids.iter().enumerate().map(|(i, id)| CompositionLine { id: id.clone(), fraction: 1.0 / n as f64, comment: format!("{:.2}-{:.2} vol%", edges[i], edges[i + 1]) }).collect();
        let header = vec![
            format!("Built by `dropcut fuel build --from-distillation` from {} (dropcut {}).", curve.origin, env!("CARGO_PKG_VERSION")),
            format!(
                "{} curve, 15 degC density {rho:.2} kg/m3, {n} equal-volume cuts, Watson K_W {k_w:.4}, {}, cut fit: {}.",
                curve.kind.as_str().to_uppercase(),
                opts.critical.marker().trim_start_matches("estimated:"),
                match opts.fit {
                    CutFit::Tbp => "tbp",
                    CutFit::SimulatedDistillation => "simulated-distillation",
                }
            ),
            "Methods and their sources: docs/fuel-from-lab-data.md. The pseudo-components are defined below as [[component]] tables.".into(),
        ];
        let description = if curve.description.is_empty() { format!("pseudo-components from the {} curve {}", curve.kind.as_str().to_uppercase(), curve.origin) } else { curve.description.clone() };
        let text = fuel_file_text(&name, &description, &header, "volume", &composition, &specs);
        let fuel = read_back(&text, &name, lib)?;
        if opts.fit == CutFit::Tbp || targets.is_empty() {
            notes.extend(cut_notes);
            break (text, fuel, rows, k_w);
        }
        let sim = simulate.expect("checked above")(&fuel, &fractions).map_err(|e| input_error("simulated distillation", e))?;
        let residual: Vec<(f64, f64)> = targets.iter().zip(&sim).map(|((p, t), s)| (*p, s - t)).collect();
        let worst = residual.iter().map(|(_, r)| r.abs()).fold(0.0, f64::max);
        if best.as_ref().is_none_or(|b| worst < b.0) {
            best = Some((worst, text, fuel, rows, k_w, cut_notes));
        }
        if worst < CALIBRATION_TOLERANCE {
            break finish(best.take(), &mut notes);
        }
        if iterations >= CALIBRATION_ITERATIONS {
            notes.push(format!("calibration stopped after {CALIBRATION_ITERATIONS} iterations; the best residual was {:.2} K", best.as_ref().map_or(f64::NAN, |b| b.0)));
            break finish(best.take(), &mut notes);
        }
        iterations += 1;
        let mut next = tbs.clone();
        for (tb, m) in next.iter_mut().zip(&mids) {
            *tb -= interp_flat(&residual, *m);
        }
        if next.windows(2).any(|w| w[1] <= w[0]) || next[0] < 250.0 {
            notes.push(format!(
                "calibration stopped after {iterations} iterations: a further shift would make the cut boiling points decrease; the best residual was {:.2} K (a steep or uneven curve, or too few cuts: try more --pseudo)",
                best.as_ref().map_or(f64::NAN, |b| b.0)
            ));
            break finish(best.take(), &mut notes);
        }
        tbs = next;
    };
    if !(10.0..=13.5).contains(&k_w) {
        notes.push(format!("Watson factor K_W = {k_w:.3} is unusual for a liquid fuel (paraffinic about 12.5-13, aromatic about 10): check the density against the boiling range"));
    }
    let comparison = match simulate {
        Some(sim_fn) => {
            let fr: Vec<f64> = curve.points.iter().map(|(p, _)| (p / 100.0).clamp(0.0, 0.995)).collect();
            let sim = sim_fn(&fuel, &fr).map_err(|e| input_error("simulated distillation", e))?;
            curve
                .points
                .iter()
                .zip(&d86)
                .zip(sim)
                .map(|(((p, t), (_, d)), s)| CurvePoint { percent: *p, input_K: *t, input_d86_K: *d, simulated_K: s, error_K: s - d })
                .collect()
        }
        None => vec![],
    };
    let report = DistillationReport {
        curve: curve.kind,
        target_density_kg_m3: rho,
        built_density_kg_m3: fuel.density_15c(),
        watson_k: k_w,
        fit: opts.fit,
        calibration_iterations: iterations,
        cuts,
        comparison,
        notes,
    };
    Ok(BuiltFuel { text, fuel, report })
}

#[cfg(test)]
mod tests {
    use super::*;

    const JET: &str = "name = \"jet\"\ncurve = \"d86\"\ntemperature-unit = \"degC\"\ndensity-15C = \"799 kg/m3\"\n[points]\nIBP = 155\n10 = 171\n50 = 195\n90 = 233\nFBP = 254\n";

    #[test]
    fn toml_and_csv_forms_agree() {
        let a = DistillationCurve::parse_toml(JET, "jet.toml", "jet").unwrap();
        let csv = "# curve: d86\n# density-15C: 0.799 g/cm3\npercent_recovered,temperature_degC\nIBP,155\n10,171\n50,195\n90,233\nFBP,254\n";
        let b = DistillationCurve::parse_csv(csv, "jet.csv", "jet").unwrap();
        assert_eq!(a.points.len(), 5);
        for (x, y) in a.points.iter().zip(&b.points) {
            assert!((x.0 - y.0).abs() < 1e-12 && (x.1 - y.1).abs() < 1e-9);
        }
        assert!((a.density_15c.unwrap() - b.density_15c.unwrap()).abs() < 1e-9);
    }

    #[test]
    fn bad_curves() {
        let bad = |t: &str| DistillationCurve::parse_toml(t, "b.toml", "b").unwrap_err().to_string();
        assert!(bad("curve = \"d86\"\ntemperature-unit = \"degC\"\n[points]\n10 = 171\n50 = 165\n90 = 233\n").contains("must increase"));
        assert!(bad("curve = \"d86\"\ntemperature-unit = \"degC\"\n[points]\n10 = 171\n150 = 195\n90 = 233\n").contains("outside 0–100"));
        assert!(bad("curve = \"d68\"\ntemperature-unit = \"degC\"\n[points]\n10 = 171\n50 = 195\n90 = 233\n").contains("did you mean 'd86'"));
        assert!(bad("curve = \"d86\"\n[points]\n10 = 171\n50 = 195\n90 = 233\n").contains("temperature-unit"));
        assert!(bad("curve = \"d86\"\ntemperature-unit = \"degC\"\n[points]\n10 = 171\n90 = 233\n").contains("at least 3"));
        assert!(bad("curve = \"d86\"\ntemperature-unit = \"degC\"\n[pionts]\n10 = 171\n").contains("did you mean 'points'"));
        assert!(bad("curve = \"d86\"\ntemperature-unit = \"degC\"\ndensity-15C = \"799\"\n[points]\n10 = 171\n50 = 195\n90 = 233\n").contains("needs a unit"));
    }

    /// Without calibration: the density is reproduced by construction, the cuts are ordered, and the Watson
    /// factor is that of a kerosene.
    #[test]
    fn tbp_fit_density_and_properties() {
        let lib = Library::embedded().unwrap();
        let c = DistillationCurve::parse_toml(JET, "jet.toml", "jet").unwrap();
        let opts = DistillationOptions { fit: CutFit::Tbp, ..Default::default() };
        let b = build_from_distillation(&c, &lib, &opts, None).unwrap();
        let r = &b.report;
        assert_eq!(b.fuel.len(), 12);
        assert!((r.built_density_kg_m3 / 799.0 - 1.0).abs() < 1e-6, "{}", r.built_density_kg_m3);
        assert!(r.watson_k > 11.0 && r.watson_k < 12.5, "{}", r.watson_k);
        assert!(r.cuts.windows(2).all(|w| w[1].boiling_point_K > w[0].boiling_point_K && w[1].molar_mass_kg_mol > w[0].molar_mass_kg_mol));
        for (comp, row) in b.fuel.components.iter().zip(&r.cuts) {
            assert!((comp.vapor_pressure(row.boiling_point_K) / 101_325.0 - 1.0).abs() < 0.02, "{}", comp.id);
            assert!((comp.density_15c() / (row.specific_gravity * 999.0) - 1.0).abs() < 1e-9);
            assert!((comp.liquid_density(288.15) / comp.density_15c() - 1.0).abs() < 1e-9);
            let h = comp.hydrogen_mass_fraction();
            assert!(h > 0.12 && h < 0.16, "{h}");
            let lhv = comp.constants.lower_heating_value.value;
            assert!(lhv > 42.5e6 && lhv < 44.5e6, "{lhv} {row:?}");
            assert!(comp.ideal_gas_heat_capacity(300.0) > 1300.0 && comp.ideal_gas_heat_capacity(800.0) > 2500.0);
        }
        assert!(b.text.contains("[[component]]") && b.text.contains("estimated:riazi-daubert-1980"));
    }
}
