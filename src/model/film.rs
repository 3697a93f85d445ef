//! Quasi-steady gas film around an evaporating droplet: Abramzon & Sirignano (1989) with Raoult's law at the
//! surface (activity coefficients γ_i from `props::activity` when UNIFAC is chosen), the 1/3 reference state, lumped Wilke film mixing and Fuller diffusion. See docs/model.md.

use std::sync::Arc;

use crate::data::{Component, GAS_CONSTANT};
use crate::numerics::root::{brent_from, Tolerance};
use crate::props::activity::Activity;
use crate::props::gas::{wilke_phi_pair, AmbientGas};
use crate::props::kernels::PropertyKernels;

mod species;

pub use super::extra_heat::{churchill_bernstein, ExtraHeat, Radiation, SupportFibre, STEFAN_BOLTZMANN};
use crate::props::{liquid, PropertyError};

/// Correlation for the Nusselt and Sherwood numbers of a non-evaporating sphere.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum TransferCorrelation {
    /// Clift, Grace & Weber (1978), as recommended by Abramzon & Sirignano (1989).
    Clift,
    /// Ranz & Marshall (1952).
    RanzMarshall,
}

impl TransferCorrelation {
    /// Name as used on the command line.
    pub fn as_str(self) -> &'static str {
        match self {
            TransferCorrelation::Clift => "clift",
            TransferCorrelation::RanzMarshall => "ranz-marshall",
        }
    }

    /// Nu0 (or Sh0 with Sc in place of Pr) of a non-evaporating sphere.
    #[inline]
    pub fn nusselt0(self, re: f64, pr: f64) -> f64 {
        self.nusselt0_pair(re, pr, pr).0
    }

    /// (Nu0, Sh0) of a non-evaporating sphere at one Reynolds number, Prandtl number `pr` and Schmidt number
    /// `sc` (the Reynolds-number factor evaluated once).
    #[inline]
    pub fn nusselt0_pair(self, re: f64, pr: f64, sc: f64) -> (f64, f64) {
        use crate::numerics::cbrt;
        match self {
            TransferCorrelation::Clift => {
                let f = if re <= 1.0 { 1.0 } else { re.powf(0.077) };
                (1.0 + cbrt(1.0 + re * pr) * f, 1.0 + cbrt(1.0 + re * sc) * f)
            }
            TransferCorrelation::RanzMarshall => {
                let root_re = 0.6 * re.sqrt();
                (2.0 + root_re * cbrt(pr), 2.0 + root_re * cbrt(sc))
            }
        }
    }
}

/// Root λ of λ = A/Nu*(λ), Nu*(λ) = 2 + c/F(λ) (λ = ln(1 + B_T), F the film correction, c = Nu0 − 2 ≠ 0) by
/// Newton's method from one fixed-point step off `last_heat`, the previous call's root and its F (successive
/// calls are close in state; the new root is written back), with the fixed-point step where the Newton slope is
/// not safe. Returns (λ, Nu*(λ), e^(−λ) − 1); after the last step (|Δλ| ≤ `tolerance` (1 + |λ|); Newton's error
/// after it is of order Δλ², about 1e-14 for a tolerance of 1e-7) F and e^(−λ) are carried to the new λ by
/// their first-order terms instead of two more exponentials.
fn solve_heat_log(last_heat: &mut (f64, f64), a_heat: f64, c: f64, tolerance: f64) -> (f64, f64, f64) {
    // start: one fixed-point step from the previous root with this call's A and c, λ₀ = A/(2 + c/F(λ_prev))
    // (F of the previous root kept; no exponential), which follows a change of A or Nu0 at once
    let (last_lam, last_f) = *last_heat;
    let guess = a_heat / (2.0 + c / last_f);
    let mut lam = if last_lam.is_finite() && guess.is_finite() { guess.max(-6.9) } else { a_heat / (2.0 + c) };
    // the loop runs at least once and sets every part (no exponential spent on a value never used)
    let mut out = (lam, 2.0 + c, 0.0);
    for _ in 0..60 {
        let (f, dln_f, em1) = film_correction_of_log(lam);
        let c_over_f = c / f;
        let inv_nu = 1.0 / (2.0 + c_over_f);
        let g = a_heat * inv_nu;
        // dg/dλ = g (c/F)/Nu* d ln F/dλ
        let slope = 1.0 - g * c_over_f * inv_nu * dln_f;
        let r = lam - g;
        let mut step = if slope > 0.05 { r / slope } else { r };
        if !step.is_finite() {
            step = r;
        }
        // keep B_T > −0.999 as the fixed point does (ln 0.001)
        let next = (lam - step).max(-6.9);
        let moved = next - lam;
        let f_next = f * (1.0 + dln_f * moved);
        out = (next, 2.0 + c / f_next, em1 - (1.0 + em1) * moved);
        lam = next;
        *last_heat = (lam, f_next);
        if moved.abs() <= tolerance * (1.0 + lam.abs()) {
            break;
        }
    }
    out
}

/// ln(1+B)/B with its series near B = 0.
#[inline]
pub fn log1p_over(b: f64) -> f64 {
    if b.abs() < 1e-6 {
        1.0 - b / 2.0 + b * b / 3.0
    } else {
        b.ln_1p() / b
    }
}

/// Abramzon–Sirignano film-thickening correction F(B) = (1+B)^0.7 ln(1+B)/B.
#[inline]
pub fn film_correction(b: f64) -> f64 {
    film_correction_with(b, b.ln_1p())
}

/// [`film_correction`] F(B) with ln(1+B) already known (`ln_1p_b`).
#[inline]
fn film_correction_with(b: f64, ln_1p_b: f64) -> f64 {
    if b.abs() < 1e-6 {
        return (1.0 + b).powf(0.7) * log1p_over(b);
    }
    (0.7 * ln_1p_b).exp() * ln_1p_b / b
}

/// The film correction written in λ = ln(1+B): F = λ e^(−0.3λ)/(1 − e^(−λ)), with d ln F/dλ =
/// 1/λ − 1/(e^λ − 1) − 0.3 and e^(−λ) − 1; two exponentials, no logarithm.
#[inline]
fn film_correction_of_log(lam: f64) -> (f64, f64, f64) {
    let em1 = (-lam).exp_m1(); // e^(−λ) − 1
    let decay = (-0.3 * lam).exp();
    if lam.abs() < 1e-3 {
        // series of λ/(1 − e^(−λ)) and of 1/λ − 1/(e^λ − 1) (next terms below 1e-16 here)
        let l2 = lam * lam;
        let ratio = 1.0 + 0.5 * lam + l2 / 12.0 - l2 * l2 / 720.0;
        return (decay * ratio, 0.2 - lam / 12.0 + l2 * lam / 720.0, em1);
    }
    let inv_em1 = 1.0 / em1; // one division for both parts
    (-(decay * lam) * inv_em1, 1.0 / lam + (1.0 + em1) * inv_em1 - 0.3, em1)
}

/// Abramzon–Sirignano circulation enhancement χ(Pe_L) = 1.86 + 0.86 tanh(2.225 log10(Pe_L/30)).
#[inline]
pub fn circulation_factor(peclet: f64) -> f64 {
    if peclet <= 0.0 {
        return 1.0;
    }
    1.86 + 0.86 * (2.225 * (peclet / 30.0).log10()).tanh()
}

/// Standard sphere drag of a solid sphere, C_D = 24/Re (1 + Re^⅔/6) for Re < 1000, 0.424 above
/// (Putnam 1961 fit of the standard drag curve, as used by Yuen & Chen 1976).
#[inline]
pub fn standard_drag(re: f64) -> f64 {
    if re < 1e-12 {
        0.0
    } else if re < 1000.0 {
        let root = crate::numerics::cbrt(re);
        24.0 / re * (1.0 + root * root / 6.0)
    } else {
        0.424
    }
}

/// Drag of an evaporating droplet with the blowing factor of Eisenklam, Arunachalam & Weston (1967),
/// C_D(Re)/(1+B): meant for a Reynolds number on free-stream properties (see [`DragLaw::Blowing`]).
#[inline]
pub fn drag_coefficient(re: f64, b: f64) -> f64 {
    standard_drag(re) / (1.0 + b.max(0.0))
}

/// How the drag of an evaporating droplet is computed. Both laws count the effect of the vapour film once.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum DragLaw {
    /// Yuen & Chen (1976): the standard drag curve with the Reynolds number on the free-stream density and the
    /// film (1/3-rule reference) viscosity; no separate blowing factor (the film properties carry the effect).
    #[default]
    YuenChen,
    /// Eisenklam, Arunachalam & Weston (1967): the standard drag curve with the Reynolds number on free-stream
    /// density and viscosity, divided by (1 + B) (B_M while evaporating, B_T while boiling).
    Blowing,
}

impl DragLaw {
    /// Name as used on the command line and in sweep files.
    pub fn as_str(self) -> &'static str {
        match self {
            DragLaw::YuenChen => "yuen-chen",
            DragLaw::Blowing => "blowing",
        }
    }
}

/// How the vapour diffusivity enters the per-component evaporation rates.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum VapourDiffusion {
    /// One mixture-averaged diffusivity D_g = Σ (Y_s,i/Y_F,s) D_i for every component (Abramzon & Sirignano 1989
    /// with the single-diffusivity species fractions ε_i of Sazhin 2006).
    #[default]
    Mixture,
    /// Each component diffuses with its own binary diffusivity D_i in the ambient gas through the common Stefan
    /// flow: ṁ = 2π ρ_g D_i r_s Sh*_i ln(1 + B_M,i), B_M,i = (Y_s,i − Y_∞,i)/(ε_i − Y_s,i), Σ ε_i = 1 (docs/model.md §3).
    Species,
}

impl VapourDiffusion {
    /// Name as used on the command line and in sweep files.
    pub fn as_str(self) -> &'static str {
        match self {
            VapourDiffusion::Mixture => "mixture",
            VapourDiffusion::Species => "species",
        }
    }
}

/// Fixed inputs of the film model for one fuel in one ambient.
#[derive(Debug, Clone)]
pub struct FilmSetup {
    /// Liquid components.
    pub components: Vec<Arc<Component>>,
    /// Ambient gas.
    pub gas: AmbientGas,
    /// Ambient pressure \[Pa\].
    pub pressure: f64,
    /// Ambient temperature \[K\].
    pub ambient_temperature: f64,
    /// Far-field fuel-vapour mass fractions, per component \[-\].
    pub ambient_vapor: Vec<f64>,
    /// Reference-state weight A_r (1/3 rule).
    pub reference_weight: f64,
    /// Nu0/Sh0 correlation.
    pub correlation: TransferCorrelation,
    /// Langmuir–Knudsen non-equilibrium surface mole fractions (Miller, Harstad & Bellan 1998).
    pub non_equilibrium: bool,
    /// Heat reaching the liquid by other paths than the gas film (radiation, a supporting fibre).
    pub extra_heat: ExtraHeat,
    /// Drag law of the evaporating droplet.
    pub drag: DragLaw,
    /// Liquid activity model prepared for `components` (ideal: Raoult's law), with its work buffers.
    pub activity: Activity,
    /// Mixture-averaged or per-component vapour diffusivities in the species rates.
    pub vapour_diffusion: VapourDiffusion,
}

/// Results of one film evaluation (all SI).
#[derive(Debug, Clone, Copy, Default, serde::Serialize)]
pub struct FilmResult {
    /// Total evaporation rate \[kg/s\] (negative when condensing).
    pub evaporation_rate: f64,
    /// Heat conducted into the liquid \[W\].
    pub heat_to_liquid: f64,
    /// Heat arriving from the gas \[W\].
    pub heat_from_gas: f64,
    /// Spalding mass-transfer number.
    pub spalding_mass: f64,
    /// Spalding heat-transfer number.
    pub spalding_heat: f64,
    /// Reynolds number (free-stream density, film viscosity).
    pub reynolds: f64,
    /// Modified Sherwood number.
    pub sherwood: f64,
    /// Modified Nusselt number.
    pub nusselt: f64,
    /// Film density \[kg/m³\].
    pub film_density: f64,
    /// Film viscosity \[Pa·s\].
    pub film_viscosity: f64,
    /// Film diffusion coefficient \[m²/s\].
    pub film_diffusivity: f64,
    /// Film conductivity \[W/(m·K)\].
    pub film_conductivity: f64,
    /// Film heat capacity \[J/(kg·K)\].
    pub film_cp: f64,
    /// Sum of surface vapour mole fractions (1 at the bubble point).
    pub surface_vapor_mole_fraction: f64,
    /// Drag coefficient with blowing correction (0 when the film was told no drag is needed, see
    /// [`Film::drag_needed`]).
    pub drag_coefficient: f64,
    /// Free-stream gas density \[kg/m³\].
    pub ambient_density: f64,
    /// Heat reaching the liquid by radiation and along a supporting fibre \[W\] (0 without them).
    pub heat_extra: f64,
}

/// Film model with its scratch buffers (allocated once).
#[derive(Debug, Clone)]
pub struct Film {
    /// Fixed inputs.
    pub setup: FilmSetup,
    molar_mass: Vec<f64>,
    /// 1/W_i \[mol/kg\].
    inv_molar_mass: Vec<f64>,
    /// 1/sqrt(W_i).
    inv_sqrt_molar_mass: Vec<f64>,
    fuller: Vec<f64>,
    /// Surface vapour mole fractions (Raoult) \[-\].
    pub surface_mole: Vec<f64>,
    /// Surface vapour mass fractions \[-\].
    pub surface_mass: Vec<f64>,
    /// Per-component evaporation rates \[kg/s\].
    pub species_rate: Vec<f64>,
    /// Per-component film conductances G_i = 2π ρ_g D_i r_s Sh*_i of the last species-diffusivity evaluation \[kg/s\].
    species_conductance: Vec<f64>,
    ambient_density: f64,
    ambient_vapor_total: f64,
    surface_mole_eq: Vec<f64>,
    /// Liquid density used by the non-equilibrium correction \[kg/m³\] (set by the droplet model).
    pub liquid_density: f64,
    /// Ratio of non-equilibrium to equilibrium total surface vapour mole fraction in the last evaluation.
    pub non_equilibrium_factor: f64,
    /// ln(1 + B_T) of the last evaluation below the bubble point with Re > 0 and its film correction F (start of
    /// the next iteration; NaN before the first).
    last_heat: (f64, f64),
    /// Vapour pressures at `vapor_pressure_temperature`, kept by [`Film::liquid_state`].
    vapor_pressures: Vec<f64>,
    /// Temperature of `vapor_pressures`; taken by the next surface equilibrium.
    vapor_pressure_temperature: Option<f64>,
    /// Each component's kernels (None: direct evaluation) and the component they belong to (held, so its address
    /// stays its own): an evaluation uses them only while `setup.components[i]` is still that component.
    kernels: Vec<(Arc<Component>, Option<Arc<PropertyKernels>>)>,
    /// Last Newton step of ln(1 + B_T) accepted as converged, relative to 1 + λ (default 1e-7; the error left is of
    /// the order of its square). A droplet run sets it from its tolerance, see [`heat_iteration_tolerance`].
    pub heat_iteration_tolerance: f64,
    /// Whether evaluations compute the drag coefficient (true by default; a droplet held at constant slip sets
    /// it false and gets 0).
    pub drag_needed: bool,
}

/// Newton tolerance of the B_T iteration for a run at relative tolerance `rtol`: √(1e-4 rtol) within
/// [1e-7, 1e-5], so that the error it leaves (of the order of its square, about 1e-4 rtol; about 1e-9 relative
/// in the heat fluxes at the default rtol 1e-6, 8.3e-10 measured in a unit test) stays far below the integrator's tolerance
/// (1e-5 at the default rtol 1e-6; 1e-7, about 1e-14 left, from rtol 1e-10).
pub fn heat_iteration_tolerance(rtol: f64) -> f64 {
    (1e-4 * rtol).sqrt().clamp(1e-7, 1e-5)
}

/// The kernels kept for component `i` if `c` is still the component they were kept for, else `c`'s own
/// (a caller replaced `setup.components[i]` after the film was made).
#[inline]
fn kernels_for<'a>(kept: &'a [(Arc<Component>, Option<Arc<PropertyKernels>>)], i: usize, c: &'a Arc<Component>) -> Option<&'a PropertyKernels> {
    match kept.get(i) {
        Some((owner, k)) if Arc::ptr_eq(owner, c) => k.as_deref(),
        _ => crate::props::kernels::active(c),
    }
}

impl Film {
    /// Prepare a film model.
    pub fn new(setup: FilmSetup) -> Self {
        let n = setup.components.len();
        let molar_mass: Vec<f64> = setup.components.iter().map(|c| c.molar_mass()).collect();
        let fuller = setup.components.iter().map(|c| setup.gas.fuller_coefficient_of(c.molar_mass(), c.diffusion_volume())).collect();
        let y_inf: f64 = setup.ambient_vapor.iter().sum();
        let inv_w: f64 = setup.ambient_vapor.iter().zip(&molar_mass).map(|(y, w)| y / w).sum::<f64>() + (1.0 - y_inf) / setup.gas.molar_mass;
        let ambient_density = setup.pressure / (inv_w * GAS_CONSTANT * setup.ambient_temperature);
        Film {
            inv_molar_mass: molar_mass.iter().map(|w| 1.0 / w).collect(),
            inv_sqrt_molar_mass: molar_mass.iter().map(|w| 1.0 / w.sqrt()).collect(),
            molar_mass,
            fuller,
            surface_mole: vec![0.0; n],
            surface_mass: vec![0.0; n],
            species_rate: vec![0.0; n],
            species_conductance: vec![0.0; n],
            ambient_density,
            ambient_vapor_total: y_inf,
            surface_mole_eq: vec![0.0; n],
            liquid_density: 700.0,
            non_equilibrium_factor: 1.0,
            last_heat: (f64::NAN, 1.0),
            vapor_pressures: vec![0.0; n],
            vapor_pressure_temperature: None,
            drag_needed: true,
            heat_iteration_tolerance: 1e-7,
            kernels: setup.components.iter().map(|c| (c.clone(), crate::props::kernels::active_shared(c))).collect(),
            setup,
        }
    }

    /// Liquid properties of composition `w` (mass fractions) at `t`: writes the component latent heats
    /// \[J/kg\] to `latent`, keeps the vapour pressures for the next surface equilibrium if it is at exactly `t`
    /// (any other call forgets them) and returns the mixture density \[kg/m³\] (volume-additive) and heat capacity
    /// \[J/(kg·K)\] (mass-weighted), the values of `props::liquid::density` and `heat_capacity` bit for bit.
    pub fn liquid_state(&mut self, w: &[f64], t: f64, latent: &mut [f64]) -> (f64, f64) {
        let (mut inv_rho, mut cp) = (0.0, 0.0);
        // slices of one length: the loop needs no bounds checks
        let n = self.setup.components.len();
        let (comps, kept, w, latent, vapor_pressures) = (&self.setup.components[..n], &self.kernels[..], &w[..n], &mut latent[..n], &mut self.vapor_pressures[..n]);
        for i in 0..n {
            let c = &comps[i];
            let point = c.liquid_point_via(kernels_for(kept, i, c), t);
            latent[i] = point.latent_heat;
            vapor_pressures[i] = point.vapor_pressure;
            inv_rho += w[i] / point.density;
            cp += w[i] * point.heat_capacity;
        }
        self.vapor_pressure_temperature = Some(t);
        (1.0 / inv_rho, cp)
    }

    /// The component latent heats at `t` \[J/kg\] to `latent`, with the vapour pressures kept for the next surface
    /// equilibrium at exactly `t`: the part of [`Film::liquid_state`] a caller without the mixture density and heat
    /// capacity needs (the same bits).
    pub fn surface_liquid_state(&mut self, t: f64, latent: &mut [f64]) {
        for (i, c) in self.setup.components.iter().enumerate() {
            let (p_sat, l) = c.pressure_and_latent_via(kernels_for(&self.kernels, i, c), t);
            latent[i] = l;
            self.vapor_pressures[i] = p_sat;
        }
        self.vapor_pressure_temperature = Some(t);
    }

    /// Bubble point of liquid mole fractions `x` at the film pressure, with the film's activity model \[K\].
    pub fn bubble_point(&mut self, x: &[f64]) -> Result<f64, PropertyError> {
        liquid::bubble_point_with(&self.setup.components, &mut self.setup.activity, x, self.setup.pressure)
    }

    /// Free-stream gas density \[kg/m³\].
    pub fn ambient_density(&self) -> f64 {
        self.ambient_density
    }

    /// Surface vapour (mole and mass fractions) for liquid mole fractions `x` at `t` by the modified Raoult's law
    /// X_s,i = x_i γ_i p_sat,i(T)/p (γ = 1 for the ideal liquid). Returns Σ X_s (1 at the bubble point).
    #[inline]
    pub fn surface_equilibrium(&mut self, x: &[f64], t: f64) -> f64 {
        let p = self.setup.pressure;
        let mut sum_x = 0.0;
        let mut sum_xw = 0.0;
        let filled = self.vapor_pressure_temperature.take() == Some(t);
        let gamma = self.setup.activity.gammas(x, t);
        // slices of one length: the loops need no bounds checks
        let n = x.len();
        let (gamma, comps, vapor_pressures, molar_mass) = (&gamma[..n], &self.setup.components[..n], &self.vapor_pressures[..n], &self.molar_mass[..n]);
        let (surface_mole, surface_mass) = (&mut self.surface_mole[..n], &mut self.surface_mass[..n]);
        for i in 0..n {
            let p_sat = if filled { vapor_pressures[i] } else { comps[i].vapor_pressure(t) };
            let xs = x[i] * gamma[i] * p_sat / p;
            surface_mole[i] = xs;
            sum_x += xs;
            sum_xw += xs * molar_mass[i];
        }
        let denom = sum_xw + (1.0 - sum_x).max(0.0) * self.setup.gas.molar_mass;
        for i in 0..n {
            surface_mass[i] = surface_mole[i] * molar_mass[i] / denom;
        }
        sum_x
    }

    /// Evaluate the film for a droplet of diameter `d` at surface temperature `t_s`, relative speed `speed`,
    /// liquid mole fractions `x`. `boiling_latent` = Some(L_eff) switches to the heat-limited boiling regime,
    /// where the net heat into the liquid (gas film, radiation, fibre), less the sensible part inside L_eff,
    /// evaporates liquid of surface-vapour composition. Species rates are left in `species_rate`.
    pub fn evaluate(&mut self, x: &[f64], t_s: f64, d: f64, speed: f64, latent: &[f64], boiling_latent: Option<f64>) -> FilmResult {
        let extra = self.setup.extra_heat;
        let q_extra = if extra.is_none() {
            0.0
        } else {
            extra.radiation_heat(t_s, d, self.setup.ambient_temperature) + extra.fibre_heat(&self.setup.gas, self.setup.pressure, self.setup.ambient_temperature, t_s, speed)
        };
        let mut r = self.evaluate_gas_side(x, t_s, d, speed, latent, boiling_latent, q_extra);
        r.heat_extra = q_extra;
        if boiling_latent.is_none() {
            r.heat_to_liquid += q_extra;
        }
        r
    }

    /// Heat-limited boiling of a liquid whose surface sits at its hold temperature `t_s` while `heat_inward` \[W\] is
    /// conducted from the surface into the liquid interior (resolved liquid): the rate follows
    /// ṁ Σ ε_i L_i = Q_gas + Q_rad + Q_fib − heat_inward, the vapour leaving with the equilibrium composition ε_i of
    /// the surface liquid `x`. `heat_to_liquid` of the result is the heat entering the liquid at its surface
    /// (`heat_inward` while the balance has a root; less when even ṁ = 0 cannot supply it).
    #[allow(clippy::too_many_arguments)]
    pub fn evaluate_boiling(&mut self, x: &[f64], t_s: f64, d: f64, speed: f64, latent: &[f64], heat_inward: f64) -> FilmResult {
        let sum_x = self.surface_equilibrium(x, t_s);
        let y_fs: f64 = self.surface_mass.iter().sum();
        let l_eff = if y_fs > 0.0 && sum_x > 0.0 { self.surface_mass.iter().zip(latent).map(|(y, l)| y / y_fs * l).sum() } else { latent.iter().copied().fold(0.0, f64::max) };
        let extra = self.setup.extra_heat;
        let q_extra = if extra.is_none() {
            0.0
        } else {
            extra.radiation_heat(t_s, d, self.setup.ambient_temperature) + extra.fibre_heat(&self.setup.gas, self.setup.pressure, self.setup.ambient_temperature, t_s, speed)
        };
        self.non_equilibrium_factor = 1.0;
        let mut r = self.evaluate_surface(x, t_s, d, speed, latent, Some(l_eff), sum_x, q_extra - heat_inward);
        r.heat_extra = q_extra;
        r.heat_to_liquid += heat_inward;
        r
    }

    /// Gas-film part of [`Film::evaluate`]; `q_extra` (radiation and fibre heat \[W\]) enters only the boiling
    /// balance, where it sets the rate.
    #[allow(clippy::too_many_arguments)]
    fn evaluate_gas_side(&mut self, x: &[f64], t_s: f64, d: f64, speed: f64, latent: &[f64], boiling_latent: Option<f64>, q_extra: f64) -> FilmResult {
        let sum_x = self.surface_equilibrium(x, t_s);
        self.non_equilibrium_factor = 1.0;
        if !self.setup.non_equilibrium || boiling_latent.is_some() || sum_x <= 0.0 {
            return self.evaluate_surface(x, t_s, d, speed, latent, boiling_latent, sum_x, q_extra);
        }
        // Langmuir–Knudsen law (Miller, Harstad & Bellan 1998, their eqs. for X_s,neq): X_s,neq = X_s,eq − (2 L_K/d) β,
        // Knudsen length L_K = μ_g sqrt(2π T_s R/W_F)/(α_e Sc_g p), α_e = 1, blowing number
        // β = (3 Pr_g τ_d / 2)(ṁ/m_d), τ_d = ρ_L d²/(18 μ_g). Applied to the total fuel mole fraction, each
        // component scaled alike. ṁ depends on X_s,neq, so the relation is solved implicitly for X_s,neq:
        // h(X) = X − X_eq + (2 L_K/d) β(ṁ(X)) rises monotonically from h(0) ≤ 0 to h(X_eq) ≥ 0 (ṁ rises with X;
        // β uses max(ṁ, 0)), a bracketed root found by Brent's method (crate::numerics::root).
        self.surface_mole_eq.copy_from_slice(&self.surface_mole);
        let mut lo = (0.0, 0.0);
        let mut hi = (sum_x, 0.0);
        let mut r = self.non_equilibrium_at(x, t_s, d, speed, latent, sum_x, sum_x, &mut hi.1);
        if hi.1 <= 0.0 {
            return r;
        }
        let _ = self.non_equilibrium_at(x, t_s, d, speed, latent, sum_x, 0.0, &mut lo.1);
        if lo.1 >= 0.0 {
            return self.non_equilibrium_at(x, t_s, d, speed, latent, sum_x, 0.0, &mut lo.1);
        }
        let mut last = hi.0;
        let root = brent_from(
            |xm| {
                let mut hm = 0.0;
                r = self.non_equilibrium_at(x, t_s, d, speed, latent, sum_x, xm, &mut hm);
                last = xm;
                hm
            },
            lo,
            hi,
            Tolerance::absolute(1e-13 * sum_x).with_f_abs(1e-12 * sum_x).with_max_iterations(100),
        );
        let x_neq = root.map(|root| root.x).unwrap_or_else(|e| e.best().unwrap_or(hi.0));
        if x_neq != last {
            // Brent's estimate is not always its last trial: evaluate the film there
            let mut hm = 0.0;
            r = self.non_equilibrium_at(x, t_s, d, speed, latent, sum_x, x_neq, &mut hm);
        }
        r
    }

    /// One Langmuir–Knudsen trial: the surface at total fuel mole fraction `x_neq` (the equilibrium composition
    /// scaled), the film evaluated there, and the residual h = X − X_eq + (2 L_K/d) β written to `residual`.
    #[allow(clippy::too_many_arguments)]
    fn non_equilibrium_at(&mut self, x: &[f64], t_s: f64, d: f64, speed: f64, latent: &[f64], sum_eq: f64, x_neq: f64, residual: &mut f64) -> FilmResult {
        let n = x.len();
        let factor = x_neq / sum_eq;
        self.non_equilibrium_factor = factor;
        let mut sum_xw = 0.0;
        let (mut num, mut den) = (0.0, 0.0);
        for i in 0..n {
            self.surface_mole[i] = self.surface_mole_eq[i] * factor;
            sum_xw += self.surface_mole[i] * self.molar_mass[i];
            num += self.surface_mole_eq[i] * self.molar_mass[i];
            den += self.surface_mole_eq[i];
        }
        let denom = sum_xw + (1.0 - x_neq).max(0.0) * self.setup.gas.molar_mass;
        for i in 0..n {
            self.surface_mass[i] = self.surface_mole[i] * self.molar_mass[i] / denom;
        }
        let r = self.evaluate_surface(x, t_s, d, speed, latent, None, x_neq, 0.0);
        let w_f = num / den;
        let sc = r.film_viscosity / (r.film_density * r.film_diffusivity);
        let pr = r.film_cp * r.film_viscosity / r.film_conductivity;
        let l_k = r.film_viscosity * (2.0 * std::f64::consts::PI * t_s * GAS_CONSTANT / w_f).sqrt() / (sc * self.setup.pressure);
        let tau_d = self.liquid_density * d * d / (18.0 * r.film_viscosity);
        let m_d = std::f64::consts::PI / 6.0 * self.liquid_density * d * d * d;
        let beta = 1.5 * pr * tau_d * r.evaporation_rate.max(0.0) / m_d;
        *residual = x_neq - sum_eq + 2.0 * l_k / d * beta;
        r
    }

    /// Film evaluation with the surface vapour already in `surface_mole` / `surface_mass`.
    #[allow(clippy::too_many_arguments)]
    fn evaluate_surface(&mut self, x: &[f64], t_s: f64, d: f64, speed: f64, latent: &[f64], boiling_latent: Option<f64>, sum_x: f64, q_extra: f64) -> FilmResult {
        let n = x.len();
        let s = &self.setup;
        let t_inf = s.ambient_temperature;
        let p = s.pressure;
        let boiling = boiling_latent.is_some();
        let y_fs: f64 = self.surface_mass.iter().sum();
        let y_finf = self.ambient_vapor_total;
        let a_r = s.reference_weight;
        let t_ref = t_s + a_r * (t_inf - t_s);
        // Fuel lump in the film (reference composition), Herning–Zipperer weights inside the lump.
        let mut y_fref = 0.0;
        let mut cp_fuel_ref = 0.0;
        let mut lump_moles = 0.0;
        let mut lump_w = 0.0;
        let mut mu_num = 0.0;
        let mut k_num = 0.0;
        let mut hz_den = 0.0;
        let mut cp_surface = 0.0;
        let weight_total = if y_fs > 1e-300 { y_fs } else { 0.0 };
        let sqrt_t = t_ref.sqrt();
        let t175 = t_ref * sqrt_t * sqrt_t.sqrt(); // T^1.75 from two square roots
        // slices of length n: the indexing below needs no bounds checks
        let (comps, surface_mass, ambient_vapor, x_n) = (&s.components[..n], &self.surface_mass[..n], &s.ambient_vapor[..n], &x[..n]);
        let (molar_mass, inv_molar_mass, inv_sqrt_molar_mass, fuller) = (&self.molar_mass[..n], &self.inv_molar_mass[..n], &self.inv_sqrt_molar_mass[..n], &self.fuller[..n]);
        let inv_y_fs = if weight_total > 0.0 { 1.0 / y_fs } else { 0.0 };
        let mut fuller_sum = 0.0;
        for i in 0..n {
            let y_ref = surface_mass[i] + a_r * (ambient_vapor[i] - surface_mass[i]);
            // weights: reference composition, or liquid mole fractions when no vapour at all
            let wgt = if weight_total > 0.0 { y_ref.max(0.0) } else { x_n[i] * molar_mass[i] };
            let (cp_i, mu_i, k_i) = comps[i].vapor_properties_via(kernels_for(&self.kernels, i, &comps[i]), t_ref);
            // Herning–Zipperer weights x_i sqrt(W_i) = (w_i/W_i) sqrt(W_i) = w_i/sqrt(W_i)
            let hz = wgt * inv_sqrt_molar_mass[i];
            y_fref += y_ref.max(0.0);
            cp_fuel_ref += wgt * cp_i;
            lump_moles += wgt * inv_molar_mass[i];
            lump_w += wgt;
            mu_num += hz * mu_i;
            k_num += hz * k_i;
            hz_den += hz;
            let dw = if weight_total > 0.0 { surface_mass[i] * inv_y_fs } else { x_n[i] };
            fuller_sum += dw * fuller[i];
            cp_surface += dw * cp_i;
        }
        let d_eff = fuller_sum * (t175 / p);
        let lump_total = lump_w.max(1e-300);
        let cp_lump = cp_fuel_ref / lump_total;
        let w_fuel = lump_w / lump_moles.max(1e-300);
        let mu_fuel = mu_num / hz_den.max(1e-300);
        let k_fuel = k_num / hz_den.max(1e-300);
        let y_fref = y_fref.min(1.0);
        let (cp_amb, mu_amb, k_amb) = s.gas.film_transport(t_ref);
        let w_amb = s.gas.molar_mass;
        let inv_w = y_fref / w_fuel + (1.0 - y_fref) / w_amb;
        let x_f = (y_fref / w_fuel) / inv_w;
        let x_a = 1.0 - x_f;
        let (phi_fa, phi_af) = wilke_phi_pair(mu_fuel, mu_amb, w_fuel, w_amb);
        let den_f = x_f + x_a * phi_fa;
        let den_a = x_a + x_f * phi_af;
        let mu_g = if x_f > 0.0 { x_f * mu_fuel / den_f } else { 0.0 } + if x_a > 0.0 { x_a * mu_amb / den_a } else { 0.0 };
        let k_g = if x_f > 0.0 { x_f * k_fuel / den_f } else { 0.0 } + if x_a > 0.0 { x_a * k_amb / den_a } else { 0.0 };
        let cp_g = y_fref * cp_lump + (1.0 - y_fref) * cp_amb;
        let rho_g = p / (inv_w * GAS_CONSTANT * t_ref);
        let re = self.ambient_density * speed.abs() * d / mu_g;
        // drag: Yuen & Chen on this film-viscosity Reynolds number, or the blowing factor on free-stream properties
        let drag_needed = self.drag_needed;
        let drag = |b: f64| -> f64 {
            if !drag_needed {
                return 0.0;
            }
            match s.drag {
                DragLaw::YuenChen => standard_drag(re),
                DragLaw::Blowing => drag_coefficient(self.ambient_density * speed.abs() * d / s.gas.transport(t_inf).1, b),
            }
        };
        let pr = cp_g * mu_g / k_g;
        let sc = mu_g / (rho_g * d_eff);
        let (nu0, sh0) = s.correlation.nusselt0_pair(re, pr, sc);
        let r = 0.5 * d;
        let cp_f = cp_surface;
        let dt = t_inf - t_s;

        if let Some(l_eff) = boiling_latent {
            // Heat-limited boiling: the net heat into the liquid evaporates it. With the Spalding heat-transfer
            // number B_T, ṁ = G(B_T) ln(1+B_T) and the conducted gas heat Q_gas = G(B_T) c_pF ΔT ln(1+B_T)/B_T,
            // G(B) = 2π (k/c_pF) r Nu*(B). The balance ṁ L_eff = Q_gas + Q_extra is solved for B_T ≥ 0; without
            // extra heat its root is B_T = c_pF ΔT/L_eff. No root (Q_gas(0) + Q_extra ≤ 0): ṁ = 0, and the droplet
            // model leaves the regime.
            // Solved for λ = ln(1+B_T) (radiation or a fibre can push B_T past any float range in cold gas):
            // F(B) = λ e^(−0.3λ)/(1 − e^(−λ)), ln(1+B)/B = λ e^(−λ)/(1 − e^(−λ)).
            let over = |lam: f64| -> f64 { if lam < 1e-8 { 1.0 - 0.5 * lam } else { lam * (-lam).exp() / -(-lam).exp_m1() } };
            let g_of = |lam: f64| -> f64 {
                let f = if lam < 1e-8 { 1.0 } else { lam * (-0.3 * lam).exp() / -(-lam).exp_m1() };
                2.0 * std::f64::consts::PI * (k_g / cp_f) * r * (2.0 + (nu0 - 2.0) / f)
            };
            let resid = |lam: f64| -> f64 { g_of(lam) * (lam * l_eff - cp_f * dt * over(lam)) - q_extra };
            let r0 = resid(0.0);
            let lam = if r0 >= 0.0 {
                0.0
            } else {
                let mut lo = (0.0, r0);
                let mut hi_l = (cp_f * dt.abs() / l_eff).ln_1p().max(1e-3);
                let mut hi = (hi_l, resid(hi_l));
                while hi.1 < 0.0 && hi_l < 1e6 {
                    lo = hi;
                    hi_l *= 2.0;
                    hi = (hi_l, resid(hi_l));
                }
                brent_from(resid, lo, hi, Tolerance::relative(1e-14)).map(|root| root.x).unwrap_or_else(|e| e.best().unwrap_or(hi.0))
            };
            let b_t = lam.exp_m1().min(1e300);
            let g_t = g_of(lam);
            let nu_star = g_t / (2.0 * std::f64::consts::PI * (k_g / cp_f) * r);
            let mdot = g_t * lam;
            let q_gas = g_t * cp_f * dt * over(lam);
            let mut q_latent = 0.0;
            for i in 0..n {
                let eps = self.surface_mass[i] / y_fs;
                self.species_rate[i] = eps * mdot;
                q_latent += self.species_rate[i] * latent[i];
            }
            return FilmResult {
                evaporation_rate: mdot,
                heat_to_liquid: q_gas + q_extra - q_latent,
                heat_from_gas: q_gas,
                spalding_mass: 0.0, // unbounded at the bubble point; writers leave it empty in the boiling regime
                spalding_heat: b_t,
                reynolds: re,
                sherwood: 2.0,
                nusselt: nu_star,
                film_density: rho_g,
                film_viscosity: mu_g,
                film_diffusivity: d_eff,
                film_conductivity: k_g,
                film_cp: cp_g,
                surface_vapor_mole_fraction: sum_x,
                drag_coefficient: drag(b_t),
                ambient_density: self.ambient_density,
                heat_extra: 0.0,
            };
        }
        let _ = boiling;
        // Mass transfer: B_M and species rates mdot_i = G ln(1+B)/B [(1+B) Y_s,i − Y_∞,i].
        let y_fs_c = y_fs.min(1.0 - 1e-12);
        let b_m = (y_fs_c - y_finf) / (1.0 - y_fs_c);
        let ln_1p_bm = b_m.ln_1p();
        let sh_star = 2.0 + (sh0 - 2.0) / film_correction_with(b_m, ln_1p_bm);
        let species = s.vapour_diffusion == VapourDiffusion::Species && {
            let film = species::SpeciesFilm { fuller: &self.fuller, surface: &self.surface_mass, ambient: &s.ambient_vapor, correlation: s.correlation };
            species::species_rates(&film, &mut self.species_conductance, &mut self.species_rate, re, mu_g, rho_g, r, t175 / p, b_m, 1.0 - y_fs_c)
        };
        let mut mdot = 0.0;
        let mut q_latent = 0.0;
        if species {
            for i in 0..n {
                mdot += self.species_rate[i];
                q_latent += self.species_rate[i] * latent[i];
            }
        } else {
            let g = 2.0 * std::f64::consts::PI * rho_g * d_eff * r * sh_star;
            let ratio = if b_m.abs() < 1e-6 { log1p_over(b_m) } else { ln_1p_bm / b_m };
            for i in 0..n {
                let rate = g * ratio * ((1.0 + b_m) * self.surface_mass[i] - s.ambient_vapor[i]);
                self.species_rate[i] = rate;
                mdot += rate;
                q_latent += rate * latent[i];
            }
        }
        // Heat transfer: B_T = (1+B_M)^φ − 1, φ = (cp_F/cp_g)(Sh*/Nu*)/Le, Nu* = 2 + (Nu0 − 2)/F(B_T). Written for
        // λ = ln(1 + B_T): λ = A/Nu*(λ) with A = φ_base ln(1 + B_M), φ_base = (cp_F/cp_g) Sh*/Le; with
        // per-component diffusivities the same relation is written with the rate itself, A = ṁ c_pF/(2π k_g r_s)
        // (with one diffusivity this is φ_base ln(1 + B_M)).
        let lewis = k_g / (rho_g * cp_g * d_eff);
        let a_heat = if species { mdot * cp_f / (2.0 * std::f64::consts::PI * k_g * r) } else { (cp_f / cp_g) * sh_star / lewis * ln_1p_bm };
        let (lam, nu_star, em1) = if nu0 == 2.0 {
            // Re = 0: Nu* = 2 whatever F, one evaluation is exact
            let lam = 0.5 * a_heat;
            (lam, 2.0, (-lam).exp_m1())
        } else {
            solve_heat_log(&mut self.last_heat, a_heat, nu0 - 2.0, self.heat_iteration_tolerance)
        };
        // B_T = e^λ − 1 = −(e^(−λ) − 1)/e^(−λ)
        let b_t = (-em1 / (1.0 + em1)).min(1e300);
        let q_gas = 2.0 * std::f64::consts::PI * k_g * r * nu_star * dt * if b_t.abs() < 1e-6 { log1p_over(b_t) } else { lam / b_t };
        FilmResult {
            evaporation_rate: mdot,
            heat_to_liquid: q_gas - q_latent,
            heat_from_gas: q_gas,
            spalding_mass: b_m,
            spalding_heat: b_t,
            reynolds: re,
            sherwood: sh_star,
            nusselt: nu_star,
            film_density: rho_g,
            film_viscosity: mu_g,
            film_diffusivity: d_eff,
            film_conductivity: k_g,
            film_cp: cp_g,
            surface_vapor_mole_fraction: sum_x,
            drag_coefficient: drag(b_m),
            ambient_density: self.ambient_density,
            heat_extra: 0.0,
        }
    }
}

#[cfg(test)]
mod tests;
