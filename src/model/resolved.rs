//! Radially resolved liquid: transient species diffusion and/or heat conduction inside the droplet, with the
//! effective diffusivity and conductivity of Abramzon & Sirignano (1989) for internal circulation, coupled at
//! the surface to the same gas film. Time stepping: linearly implicit (backward) Euler on the radial
//! finite-volume grid (radial.rs), surface fluxes iterated twice per step, and Richardson extrapolation of a
//! step against two half steps, which gives second-order accuracy and the error estimate for step control.

use std::sync::Arc;

use crate::data::Component;
use crate::props::liquid;

pub use crate::props::diffusion::wilke_chang;

use super::film::{circulation_factor, Film, FilmResult};
use super::guard::{RowKind, RunRows};
use super::history::{HistoryRow, Observer, Profile, Regime, RunOutcome, RunResult, Status};
use super::inputs::{integration_failure, validity_notes, DropletInputs, LiquidHeat, LiquidMixing, Motion};
use super::integrator::Stats;
use super::radial::{RadialGrid, SurfaceInput};
use super::watch::RunWatch;
use super::well_mixed::{adiabatic_flash, boiling_hold_temperature, BOILING_THRESHOLD};
use super::ModelError;

mod boiling;
mod control;
mod run_log;
mod spare;
mod surface;
use spare::spare_copy;
pub(crate) use control::{attempt_step, crossing_time, first_step, grown_step, step_tolerance, Attempt};
use run_log::{resolved_outcome, RunLog};
pub(crate) use boiling::RegimeSwitch;

/// Evaluated-evaporated-fraction levels at which radial profiles are kept.
pub const PROFILE_LEVELS: [f64; 7] = [0.0, 0.1, 0.25, 0.5, 0.75, 0.9, 0.95];

/// State of a resolved droplet: radial profiles, inventories, relative speed.
#[derive(Debug, Clone)]
pub(crate) struct State {
    /// Time \[s\].
    pub(crate) time: f64,
    /// Droplet mass \[kg\].
    pub(crate) mass: f64,
    /// Mass fractions, component-major: y\[i * ny + j\].
    pub(crate) y: Vec<f64>,
    /// Temperature per cell \[K\].
    pub(crate) temp: Vec<f64>,
    /// Evaporated mass per component \[kg\].
    pub(crate) evaporated: Vec<f64>,
    /// Liquid mass of each component \[kg\]; with `evaporated` it sums to the initial mass exactly.
    pub(crate) inventory: Vec<f64>,
    /// Relative speed \[m/s\].
    pub(crate) velocity: f64,
    /// Surface liquid mass fractions \[-\].
    pub(crate) surface_y: Vec<f64>,
    /// Surface temperature \[K\].
    pub(crate) surface_t: f64,
    /// In the heat-limited boiling regime (surface held at the hold temperature of its composition).
    pub(crate) boiling: bool,
    /// Heat entering the liquid at its surface over the last step \[W\] (conducted inward, or stored by a
    /// uniform-temperature liquid); the boiling balance of a uniform-temperature liquid starts from it.
    pub(crate) heat_inward: f64,
}

/// The resolved-liquid model of one fuel in one far field, with its grids and scratch buffers.
pub(crate) struct Model {
    conductivity_factor: f64,
    diffusivity_factor: f64,
    fixed_temperature: bool,
    drag: bool,
    comps: Vec<Arc<Component>>,
    film: Film,
    /// Composition grid.
    pub(crate) ygrid: RadialGrid,
    /// Temperature grid.
    pub(crate) tgrid: RadialGrid,
    n: usize,
    // scratch
    w_mean: Vec<f64>,
    x_mean: Vec<f64>,
    x_surf: Vec<f64>,
    latent: Vec<f64>,
    rates: Vec<f64>,
    kappa: Vec<f64>,
    inputs: Vec<SurfaceInput>,
    molar_volume_b: Vec<f64>,
    /// Σ over species of the cell mass fractions, per cell (scratch of a step).
    cell_sums: Vec<f64>,
    /// Σ_j Δη_j Y_ij per species after and before a step (scratch of a step, 2n).
    column_sums: Vec<f64>,
    /// Scratch of the surface-state Newton iteration (surface.rs): structured Jacobian, right-hand side n+1, per
    /// component ∂ΣX/∂Y_j and vapour-share factors, rates and their temperature derivatives.
    surface_jacobian: surface::SurfaceJacobian,
    jac_rhs: Vec<f64>,
    jac_a: Vec<f64>,
    jac_b: Vec<f64>,
    jac_rates0: Vec<f64>,
    jac_drate_dt: Vec<f64>,
    /// Surface solution of the last settled state (surface.rs), reused by the start of the step from it.
    settled: surface::Settled,
    film_calls: u64,
    /// Liquid properties of the last liquid evaluated.
    liquid_cache: LiquidCache,
    /// Scratch of a step: the species rates and the surface mass fractions its fluxes come from.
    step_rates: Vec<f64>,
    step_surface: Vec<f64>,
    /// States and per-species vectors of finished steps, reused by the next ones (no allocation per step).
    spare_states: Vec<State>,
    spare_vectors: Vec<Vec<f64>>,
}

/// The liquid properties of one liquid state (its inventories and cell temperatures).
struct LiquidCache {
    valid: bool,
    inventory: Vec<f64>,
    temp: Vec<f64>,
    liquid: Liquid,
}

/// Liquid properties of the mean liquid for one step.
#[derive(Clone, Copy, Default)]
struct Liquid {
    density: f64,
    cp: f64,
    conductivity: f64,
    viscosity: f64,
    diffusivity: f64,
}

impl Model {
    fn ny(&self) -> usize {
        self.ygrid.len()
    }

    fn mean_composition(&mut self, s: &State) {
        for i in 0..self.n {
            self.w_mean[i] = s.inventory[i].max(0.0);
        }
        let sum: f64 = self.w_mean.iter().sum();
        self.w_mean.iter_mut().for_each(|v| *v /= sum);
        liquid::mass_to_mole_into(&self.comps, &self.w_mean, &mut self.x_mean);
    }

    fn liquid(&mut self, s: &State) -> Liquid {
        self.mean_composition(s);
        // the same liquid (inventories and temperatures) as the last evaluation: its properties again (a state is
        // settled, then starts the next step, and gives its row)
        let cache = &self.liquid_cache;
        if cache.valid && cache.inventory == s.inventory && cache.temp == s.temp {
            return cache.liquid;
        }
        let liquid = self.liquid_properties(s);
        let cache = &mut self.liquid_cache;
        cache.valid = true;
        cache.inventory.copy_from_slice(&s.inventory);
        cache.temp.copy_from_slice(&s.temp);
        cache.liquid = liquid;
        liquid
    }

    /// Liquid properties of the mean liquid of `s` (mean composition already in `w_mean`, `x_mean`).
    fn liquid_properties(&mut self, s: &State) -> Liquid {
        let t_mean = self.tgrid.mean(&s.temp);
        let comps = &self.comps;
        // density, heat capacity, viscosity and conductivity in one pass over the components, through the film's
        // components (their property kernels when the run evaluates through kernels, else the direct correlations)
        let mix = liquid::transport_mix(&self.film.setup.components, &self.w_mean, &self.x_mean, t_mean);
        let w_b = liquid::molar_mass(comps, &self.x_mean);
        let v_a: f64 = self.x_mean.iter().zip(&self.molar_volume_b).map(|(x, v)| x * v).sum();
        Liquid {
            density: mix.density,
            cp: mix.heat_capacity,
            conductivity: mix.conductivity * self.conductivity_factor,
            viscosity: mix.viscosity,
            diffusivity: wilke_chang(t_mean, w_b, mix.viscosity, v_a) * self.diffusivity_factor,
        }
    }

    /// Film at the state's surface values; species rates left in `self.rates`.
    fn film_at(&mut self, surface_y: &[f64], t_s: f64, mass: f64, rho: f64, speed: f64) -> FilmResult {
        self.film_with(surface_y, t_s, mass, rho, speed, None)
    }

    /// Film at the surface `surface_y` and temperature `t_s`: evaporating (`heat_inward` None) or boiling at
    /// the hold temperature `t_s` with `heat_inward` \[W\] conducted into the liquid; species rates left in
    /// `self.rates`.
    fn film_with(&mut self, surface_y: &[f64], t_s: f64, mass: f64, rho: f64, speed: f64, heat_inward: Option<f64>) -> FilmResult {
        liquid::mass_to_mole_into(&self.comps, surface_y, &mut self.x_surf);
        // latent heats and vapour pressures from one kernel look-up per component (the film keeps the latter)
        self.film.surface_liquid_state(t_s, &mut self.latent);
        let d = (6.0 * mass.max(1e-300) / (std::f64::consts::PI * rho)).cbrt();
        self.film.liquid_density = rho;
        let x = std::mem::take(&mut self.x_surf);
        let latent = std::mem::take(&mut self.latent);
        let f = match heat_inward {
            None => self.film.evaluate(&x, t_s, d, speed, &latent, None),
            Some(q) => self.film.evaluate_boiling(&x, t_s, d, speed, &latent, q),
        };
        self.x_surf = x;
        self.latent = latent;
        self.rates.copy_from_slice(&self.film.species_rate);
        self.film_calls += 1;
        f
    }

    /// Circulation factors (χ_heat, χ_species) of Abramzon & Sirignano (1989) from the gas-side shear.
    /// `blowing`: the Spalding number of the film's blowing (B_M while evaporating, B_T while boiling).
    fn circulation(&self, f: &FilmResult, liq: &Liquid, speed: f64, radius: f64, blowing: f64) -> (f64, f64) {
        let re = f.reynolds;
        if re <= 0.0 || speed == 0.0 {
            return (1.0, 1.0);
        }
        let c_f = 12.69 * re.powf(-2.0 / 3.0) / (1.0 + blowing.max(0.0));
        let u_s = speed.abs() / 32.0 * (f.film_viscosity / liq.viscosity) * re * c_f;
        let re_l = 2.0 * liq.density * u_s * radius / liq.viscosity;
        let pr_l = liq.cp * liq.viscosity / liq.conductivity;
        let sc_l = liq.viscosity / (liq.density * liq.diffusivity);
        (circulation_factor(re_l * pr_l), circulation_factor(re_l * sc_l))
    }

    /// One linearly implicit Euler step of length dt.
    /// Everything a step needs from its start state (shared by the full step and the first half step).
    fn start(&mut self, s: &State) -> Result<StepStart, String> {
        let liq = self.liquid(s);
        let radius = 0.5 * (6.0 * s.mass / (std::f64::consts::PI * liq.density)).cbrt();
        let area = 4.0 * std::f64::consts::PI * radius * radius;
        let mut surface = self.vector_copy(&s.surface_y);
        if s.boiling {
            if self.n > 1 && self.ny() > 1 {
                self.solve_boiling_surface(s, &liq, radius, &mut surface);
                let sum: f64 = surface.iter().sum();
                surface.iter_mut().for_each(|v| *v /= sum);
            }
            let (f0, hold, g_t, g_y) = self.boiling_film_of(s, &surface, &liq, radius);
            let rates0 = spare_copy(&mut self.spare_vectors, &self.rates);
            return Ok(StepStart { liq, radius, f0, rates0, dq: 0.0, g_t, g_y, t_lin: hold, surface_y: surface });
        }
        if self.n > 1 && self.ny() > 1 {
            // species diffusion in a mixture: surface composition and temperature solved together (surface.rs),
            // or the solution found when this state was accepted
            if let Some((sol, rates0)) = self.settled_solution(s) {
                return Ok(StepStart { liq, radius, f0: sol.film, rates0, dq: sol.dq, g_t: sol.g_t, g_y: sol.g_y, t_lin: sol.temperature, surface_y: surface });
            }
            let sol = self.solve_surface(s, &liq, radius, &mut surface);
            let sum: f64 = surface.iter().sum();
            surface.iter_mut().for_each(|v| *v /= sum);
            let rates0 = spare_copy(&mut self.spare_vectors, &self.rates);
            return Ok(StepStart { liq, radius, f0: sol.film, rates0, dq: sol.dq, g_t: sol.g_t, g_y: sol.g_y, t_lin: sol.temperature, surface_y: surface });
        }
        // Q_L(T_s) is linearised about the surface temperature that balances conduction from the outer cell,
        // cp G_s (T_s − T_N) = Q_L(T_s), found by Newton iterations (the surface half cell holds no heat, so a
        // step of any length starts from it; linearising about a stale value would leave the step-doubling
        // error estimate with a part that does not shrink with the step).
        let nt = self.tgrid.len();
        let mut t_lin = s.surface_t;
        let rho2a2_over_m = liq.density * liq.density * area * area / s.mass;
        let mut newton = 0;
        loop {
            let f0 = self.film_at(&surface, t_lin, s.mass, liq.density, s.velocity);
            let rates0 = spare_copy(&mut self.spare_vectors, &self.rates);
            // dQ_L/dT_s by a one-sided difference
            let dt_s = 0.01;
            let f1 = self.film_at(&surface, t_lin + dt_s, s.mass, liq.density, s.velocity);
            let dq = (f1.heat_to_liquid - f0.heat_to_liquid) / dt_s;
            self.rates.copy_from_slice(&rates0);
            let (chi_t, chi_y) = self.circulation(&f0, &liq, s.velocity, radius, f0.spalding_mass);
            let g_t = rho2a2_over_m * chi_t * liq.conductivity / (liq.density * liq.cp);
            let g_y = rho2a2_over_m * chi_y * liq.diffusivity;
            newton += 1;
            if nt > 1 && !self.fixed_temperature && newton < 6 {
                let g_s = liq.cp * g_t * self.tgrid.face_factor(nt);
                let t_n = s.temp[nt - 1];
                let balanced = (g_s * t_n + f0.heat_to_liquid - dq * t_lin) / (g_s - dq);
                if balanced.is_finite() && (balanced - t_lin).abs() > 1e-3 {
                    t_lin = balanced.clamp(t_lin - 20.0, t_lin + 20.0);
                    continue;
                }
            }
            return Ok(StepStart { liq, radius, f0, rates0, dq, g_t, g_y, t_lin, surface_y: surface });
        }
    }

    /// One linearly implicit Euler step of length dt from `s`, whose start data are `st`.
    fn step(&mut self, s: &State, st: &StepStart, dt: f64) -> Result<State, String> {
        let n = self.n;
        let ny = self.ny();
        let StepStart { liq, radius, f0, rates0, dq, g_t, g_y, t_lin, surface_y: start_surface } = st;
        let (liq, radius, f0, dq, g_t, g_y) = (liq, *radius, *f0, *dq, *g_t, *g_y);
        let mut hold = *t_lin;
        // heat input to the liquid linearised as Q_L(T_s) ≈ q0 + q1 (T_s − t_ref) [W, W/K, K]
        let mut heat_lin = (f0.heat_to_liquid, dq, *t_lin);
        let near_bubble = !s.boiling && n > 1 && ny > 1 && f0.surface_vapor_mole_fraction >= NEAR_BUBBLE;
        // (the cell profiles of `next` are written by each pass below before anything reads them)
        let mut next = self.state_like(s);
        // Surface coupling, iterated: each species leaves at κ_i u_s,i with κ_i = ṁ_i/Y_s,i from the film at the
        // latest surface state (implicit in the surface value; prescribed rate when condensing), the advective
        // terms use the total rate of the previous iterate; converged when the two totals agree.
        // (scratch vectors of the model, taken for the step and given back at its end)
        let mut film_rates = std::mem::take(&mut self.step_rates);
        film_rates.clear();
        film_rates.extend_from_slice(rates0);
        let mut film_surface = std::mem::take(&mut self.step_surface);
        film_surface.clear();
        film_surface.extend_from_slice(start_surface);
        let mut mdot_a: f64 = rates0.iter().sum();
        let mut m_used = s.mass;
        for iteration in 0..2 {
            let m_new = s.mass - dt * mdot_a;
            m_used = m_new;
            if !(m_new > 0.0) {
                return Err("mass would become negative".into());
            }
            next.temp.copy_from_slice(&s.temp);
            let input_t = if s.boiling {
                // surface held at the hold temperature: a transfer coefficient far above every conductance
                let stiff = 1e9 * (s.mass / dt + g_t * self.tgrid.face_factor(self.tgrid.len()) + mdot_a.abs());
                SurfaceInput { q0: 0.0, q1: -stiff, u_ref: hold }
            } else {
                SurfaceInput { q0: heat_lin.0 / liq.cp, q1: heat_lin.1 / liq.cp, u_ref: heat_lin.2 }
            };
            next.surface_t = if self.fixed_temperature {
                s.surface_t
            } else {
                self.tgrid.implicit_step(&mut next.temp, s.mass, m_new, dt, g_t, mdot_a, input_t)
            };
            next.heat_inward = if self.fixed_temperature { f0.heat_to_liquid } else { liq.cp * self.inward_per_cp(s, &next, m_new, dt, g_t, mdot_a) };
            if s.boiling {
                next.surface_t = hold;
                // the boiling rate with the heat this temperature solution conducts inward (consistent energy)
                self.boiling_film_at(&film_surface, hold, m_new, liq.density, s.velocity, next.heat_inward);
                film_rates.copy_from_slice(&self.rates);
            }
            for i in 0..n {
                let implicit = film_rates[i] > 0.0 && film_surface[i] > 1e-300;
                self.kappa[i] = if implicit { film_rates[i] / film_surface[i] } else { 0.0 };
                self.inputs[i] = if implicit { SurfaceInput { q0: 0.0, q1: mdot_a - self.kappa[i], u_ref: 0.0 } } else { SurfaceInput { q0: -film_rates[i], q1: mdot_a, u_ref: 0.0 } };
            }
            if iteration == 0 {
                // the first pass feeds the second only through its surface values and outer cells (the film
                // refresh or the surface solve at its surface): the forward elimination gives them
                self.ygrid.implicit_surface_many_from(&s.y, &mut next.y, s.mass, m_new, dt, g_y, mdot_a, &self.inputs, &mut next.surface_y);
            } else {
                self.ygrid.implicit_step_many_from(&s.y, &mut next.y, s.mass, m_new, dt, g_y, mdot_a, &self.inputs, &mut next.surface_y);
            }
            let mut total = 0.0;
            for i in 0..n {
                let ys = next.surface_y[i].max(0.0);
                next.surface_y[i] = ys;
                self.rates[i] = if film_rates[i] > 0.0 && film_surface[i] > 1e-300 { self.kappa[i] * ys } else { film_rates[i] };
                total += self.rates[i];
            }
            let sum_s: f64 = next.surface_y.iter().sum();
            if !(sum_s > 0.0) {
                return Err("surface composition vanished".into());
            }
            next.surface_y.iter_mut().for_each(|v| *v /= sum_s);
            mdot_a = total;
            if iteration == 0 && s.boiling && n > 1 && ny > 1 {
                // boiling with species diffusion in a mixture: the second pass takes its surface fluxes from the
                // surface state solved for the cells of the first (surface.rs), not from a film refresh at the
                // first pass's reconstruction (the boiling rate moves steeply with the hold temperature of the
                // surface liquid through the heat conducted inward; the refresh overshoots unless the step is tiny:
                // 18 942 steps instead of 1 841 for the 3000 K n-heptane/n-dodecane droplet of docs/model.md §5)
                next.mass = m_new;
                let radius_new = 0.5 * (6.0 * m_new / (std::f64::consts::PI * liq.density)).cbrt();
                film_surface.copy_from_slice(&next.surface_y);
                self.solve_boiling_surface(&next, liq, radius_new, &mut film_surface);
                let sum: f64 = film_surface.iter().sum();
                film_surface.iter_mut().for_each(|v| *v /= sum);
                hold = self.hold_temperature(&film_surface);
                self.boiling_film_at(&film_surface, hold, m_new, liq.density, s.velocity, next.heat_inward);
                film_rates.copy_from_slice(&self.rates);
                mdot_a = film_rates.iter().sum();
            } else if iteration == 0 && near_bubble {
                // evaporating near the bubble point with species diffusion in a mixture: as in boiling, the second
                // pass takes its fluxes from the surface state solved for the first pass's cells (surface.rs), and
                // the heat input is linearised about that surface state (the total rate grows like 1/(1 − Y_F,s)
                // there; a film refresh at the first pass's reconstruction overshoots unless the step is tiny)
                next.mass = m_new;
                let radius_new = 0.5 * (6.0 * m_new / (std::f64::consts::PI * liq.density)).cbrt();
                film_surface.copy_from_slice(&next.surface_y);
                let sol = self.solve_surface(&next, liq, radius_new, &mut film_surface);
                let sum: f64 = film_surface.iter().sum();
                film_surface.iter_mut().for_each(|v| *v /= sum);
                if self.tgrid.len() > 1 && !self.fixed_temperature {
                    heat_lin = (sol.film.heat_to_liquid, sol.dq, sol.temperature);
                }
                film_rates.copy_from_slice(&self.rates);
                mdot_a = film_rates.iter().sum();
            } else if iteration == 0 {
                // refresh the film at the new surface state (one Picard pass)
                if s.boiling {
                    hold = self.hold_temperature(&next.surface_y);
                    self.boiling_film_at(&next.surface_y, hold, m_new, liq.density, s.velocity, next.heat_inward);
                } else {
                    self.film_at(&next.surface_y, next.surface_t, m_new, liq.density, s.velocity);
                }
                film_rates.copy_from_slice(&self.rates);
                film_surface.copy_from_slice(&next.surface_y);
                mdot_a = film_rates.iter().sum();
            }
        }
        // Liquid inventory per component straight from the conservative solve; the evaporated masses are what
        // left it (so liquid + evaporated = initial holds exactly), and cell sums are renormalised to 1.
        let widths = &self.ygrid.widths[..ny];
        let cell_sums = &mut self.cell_sums[..ny];
        cell_sums.fill(0.0);
        // Σ_j Δη_j Y_ij of each column after and before the step (four partial sums over the cells, independent
        // chains), and each cell's sum over the columns (in column order, contiguous over the cells)
        let sums = &mut self.column_sums[..2 * n];
        let (new_sums, old_sums) = sums.split_at_mut(n);
        let y_len = n * ny;
        for ((column, old), (sum_new, sum_old)) in next.y[..y_len].chunks_exact(ny).zip(s.y[..y_len].chunks_exact(ny)).zip(new_sums.iter_mut().zip(old_sums.iter_mut())) {
            *sum_new = crate::numerics::linalg::dot(widths, column);
            *sum_old = crate::numerics::linalg::dot(widths, old);
            for (sum, &v) in cell_sums.iter_mut().zip(column) {
                *sum += v;
            }
        }
        let mut total_mass = 0.0;
        let (new_sums, old_sums) = sums.split_at(n);
        for i in 0..n {
            let inventory: f64 = m_used * new_sums[i];
            let before: f64 = s.mass * old_sums[i];
            next.evaporated[i] = s.evaporated[i] + (before - inventory);
            next.inventory[i] = s.inventory[i] - (before - inventory);
            total_mass += next.inventory[i];
        }
        let _ = mdot_a;
        next.mass = total_mass;
        // divisors of the cells: their sums, or 1 where a sum is not positive (the value kept: v/1 = v exactly)
        for sum in cell_sums.iter_mut() {
            if !(*sum > 0.0) {
                *sum = 1.0;
            }
        }
        // (the test written without branches, so that the loop runs two cells at a time: !(u ≥ −1e-6) holds for
        // NaN, −∞ and u < −1e-6, the second term for +∞, as !u.is_finite() | (u < −1e-6))
        let mut bad = false;
        for column in next.y.chunks_exact_mut(ny).take(n) {
            let mut column_bad = false;
            for (v, &sum) in column.iter_mut().zip(&*cell_sums) {
                let u = *v / sum;
                *v = u;
                column_bad |= !(u >= -1e-6) | (u == f64::INFINITY);
            }
            bad |= column_bad;
        }
        if bad || next.temp.iter().any(|v| !v.is_finite()) || !next.surface_t.is_finite() {
            return Err("non-physical values".into());
        }
        // drag (semi-implicit), gas at rest
        if self.drag {
            let c = 0.375 * f0.drag_coefficient * f0.ambient_density / (liq.density * radius);
            next.velocity = s.velocity / (1.0 + dt * c * s.velocity.abs());
        }
        next.time = s.time + dt;
        self.step_rates = film_rates;
        self.step_surface = film_surface;
        Ok(next)
    }

    fn row(&mut self, s: &State, m0: f64, d0: f64) -> HistoryRow {
        let liq = self.liquid(s);
        let sy = s.surface_y.clone();
        // a settled state (surface.rs) has its film from the surface solve: the row takes it and its species rates
        // (the solve's surface before the normalisation that differs from 1 by the solve's tolerance, about 1e-9)
        let settled = if s.boiling { None } else { self.settled_film(s) };
        let f = if s.boiling {
            let radius = 0.5 * (6.0 * s.mass / (std::f64::consts::PI * liq.density)).cbrt();
            self.boiling_film(s, &liq, radius).0
        } else if let Some(f) = settled {
            f
        } else {
            self.film_at(&sy, s.surface_t, s.mass, liq.density, s.velocity)
        };
        let mdot = f.evaporation_rate;
        let vapor: Vec<f64> = if mdot.abs() > 1e-300 {
            self.rates.iter().map(|r| r / mdot).collect()
        } else {
            let t: f64 = self.film.surface_mass.iter().sum();
            self.film.surface_mass.iter().map(|v| if t > 0.0 { v / t } else { 0.0 }).collect()
        };
        let d = (6.0 * s.mass / (std::f64::consts::PI * liq.density)).cbrt();
        HistoryRow {
            time: s.time,
            diameter: d,
            d2_ratio: (d / d0).powi(2),
            surface_temperature: s.surface_t,
            mass: s.mass,
            evaporated_fraction: 1.0 - s.mass / m0,
            velocity: s.velocity,
            film: f,
            liquid_mass_fractions: self.w_mean.clone(),
            vapor_mass_fractions: vapor,
            regime: if s.boiling { Regime::Boiling } else { Regime::Evaporating },
            mean_temperature: self.tgrid.mean(&s.temp),
            center_temperature: s.temp[0],
            surface_liquid_mass_fractions: s.surface_y.clone(),
        }
    }

    fn profile(&mut self, s: &State, m0: f64) -> Profile {
        let liq = self.liquid(s);
        let radius = 0.5 * (6.0 * s.mass / (std::f64::consts::PI * liq.density)).cbrt();
        let ny = self.ny();
        // report on the finer of the two grids
        let grid = if self.tgrid.len() >= ny { &self.tgrid } else { &self.ygrid };
        let cells = grid.len();
        let value_at = |g: &RadialGrid, u: &[f64], eta: f64| -> f64 {
            let k = g.centres.iter().position(|c| *c >= eta).unwrap_or(g.len() - 1);
            u[k.min(u.len() - 1)]
        };
        let centres = grid.centres.clone();
        Profile {
            time: s.time,
            evaporated_fraction: 1.0 - s.mass / m0,
            radius,
            radius_fraction: centres.iter().map(|e| e.cbrt()).collect(),
            temperature: centres.iter().map(|e| value_at(&self.tgrid, &s.temp, *e)).collect(),
            mass_fractions: (0..self.n).map(|i| (0..cells).map(|k| value_at(&self.ygrid, &s.y[i * ny..(i + 1) * ny], centres[k])).collect()).collect(),
        }
    }
}

/// Start-of-step data: liquid properties, film evaluation and its temperature derivative, conductances.
struct StepStart {
    liq: Liquid,
    radius: f64,
    f0: FilmResult,
    rates0: Vec<f64>,
    dq: f64,
    g_t: f64,
    g_y: f64,
    /// Surface temperature the heat input is linearised about (the hold temperature in the boiling regime) \[K\].
    t_lin: f64,
    /// Surface mass fractions the film was evaluated at \[-\].
    surface_y: Vec<f64>,
}


/// Σ X_s of the start film from which an evaporating step with species diffusion in a mixture takes its second
/// pass's fluxes from the surface state solved for the first pass's cells (the total rate grows like
/// 1/(1 − Y_F,s) towards the bubble point; below this the film refresh at the first pass's surface is enough).
const NEAR_BUBBLE: f64 = 0.9;

// ---- Integration core: shared by the run driver below and by the stepping API ----

impl Model {
    /// The model of `inp` and its initial state at time 0 (after an adiabatic flash when the droplet starts at or
    /// above its bubble point), the initial mass \[kg\] and the note of the flash.
    pub(crate) fn prepare(inp: &DropletInputs) -> Result<(Model, State, f64, Option<String>), ModelError> {
        let n = inp.fuel.len();
        let comps = inp.fuel.components.clone();
        let mut film = Film::new(inp.film_setup());
        film.heat_iteration_tolerance = crate::model::film::heat_iteration_tolerance(inp.rtol);
        let nodes = inp.liquid.nodes;
        if !(4..=400).contains(&nodes) {
            return Err(ModelError::Input { field: "nodes", value: nodes.to_string(), reason: "must lie between 4 and 400".into() });
        }
        let ny = if inp.liquid.mixing == LiquidMixing::Diffusion { nodes } else { 1 };
        let nt = if inp.liquid.heat == LiquidHeat::Conduction { nodes } else { 1 };
        let w0 = &inp.fuel.mass_fractions;
        let t0 = inp.initial_temperature;
        let rho0 = liquid::density(&comps, w0, t0);
        let m0 = std::f64::consts::PI / 6.0 * rho0 * inp.initial_diameter.powi(3);
        let x0 = inp.fuel.mole_fractions();
        // the hold temperature decides only whether the droplet flashes at injection: a start well below it (bubble
        // pressure at t0 under 90 % of the hold pressure; it rises with temperature) is told by one bubble-pressure
        // evaluation instead of the root search, as in the well-mixed model
        let below_hold = film.setup.activity.bubble_pressure(&comps, &x0, t0) < 0.9 * BOILING_THRESHOLD * inp.pressure;
        let t_hold0 = if below_hold { f64::INFINITY } else { boiling_hold_temperature(&comps, &mut film.setup.activity, &x0, inp.pressure).unwrap_or(f64::INFINITY) };
        let mut masses: Vec<f64> = w0.iter().map(|w| w * m0).collect();
        let mut t_start = t0;
        let mut flash = None;
        if !inp.fixed_temperature && t0 >= t_hold0 - 1e-9 {
            // as the well-mixed liquid: flash down to the hold temperature, then boil if the heat holds it there
            let (m_left, tb) = adiabatic_flash(&comps, &mut film.setup.activity, w0, t0, m0, BOILING_THRESHOLD * inp.pressure, inp.end_mass_fraction);
            let total: f64 = m_left.iter().sum();
            // the bubble point only for the note (a search of its own)
            let t_bubble0 = film.bubble_point(&x0).unwrap_or(f64::INFINITY);
            flash = Some((100.0 * (1.0 - total / m0), tb, t_bubble0));
            masses = m_left;
            t_start = tb;
        }
        let mass: f64 = masses.iter().sum();
        let velocity0 = match inp.motion {
            Motion::Fixed { velocity } | Motion::Injected { velocity } => velocity,
        };
        let w_start: Vec<f64> = masses.iter().map(|m| m / mass).collect();
        let mut y = vec![0.0; n * ny];
        for i in 0..n {
            for j in 0..ny {
                y[i * ny + j] = w_start[i];
            }
        }
        let model = Model {
            conductivity_factor: inp.liquid.conductivity_factor,
            diffusivity_factor: inp.liquid.diffusivity_factor,
            fixed_temperature: inp.fixed_temperature,
            drag: matches!(inp.motion, Motion::Injected { .. }),
            molar_volume_b: comps.iter().map(|c| c.molar_volume_at_boiling()).collect(),
            comps,
            film,
            ygrid: RadialGrid::new(ny),
            tgrid: RadialGrid::new(nt),
            n,
            w_mean: vec![0.0; n],
            x_mean: vec![0.0; n],
            x_surf: vec![0.0; n],
            latent: vec![0.0; n],
            rates: vec![0.0; n],
            kappa: vec![0.0; n],
            inputs: vec![SurfaceInput { q0: 0.0, q1: 0.0, u_ref: 0.0 }; n],
            cell_sums: vec![0.0; ny],
            column_sums: vec![0.0; 2 * n],
            surface_jacobian: surface::SurfaceJacobian::new(n),
            jac_rhs: vec![0.0; n + 1],
            jac_a: vec![0.0; n],
            jac_b: vec![0.0; n],
            jac_rates0: vec![0.0; n],
            jac_drate_dt: vec![0.0; n],
            settled: surface::Settled::new(n),
            film_calls: 0,
            step_rates: vec![0.0; n],
            step_surface: vec![0.0; n],
            spare_states: Vec::new(),
            spare_vectors: Vec::new(),
            liquid_cache: LiquidCache { valid: false, inventory: vec![0.0; n], temp: vec![0.0; nt], liquid: Liquid::default() },
        };
        let mut state = State {
            time: 0.0,
            mass,
            y,
            temp: vec![t_start; nt],
            evaporated: (0..n).map(|i| m0 * w0[i] - masses[i]).collect(),
            inventory: masses.clone(),
            velocity: velocity0,
            surface_y: w_start,
            surface_t: t_start,
            boiling: false,
            heat_inward: 0.0,
        };
        let mut model = model;
        let note = flash.map(|(percent, tb, t_bubble0)| {
            state.boiling = model.hold_margin(&state) > 0.0;
            format!(
                "initial temperature {t0:.2} K is at or above the bubble point ({t_bubble0:.2} K at the ambient pressure; the boiling regime holds Σ X_s = {BOILING_THRESHOLD}, {t_hold0:.2} K): {percent:.3} % of the mass flashed at injection (adiabatic flash) down to {tb:.2} K, {}",
                if state.boiling { "then heat-limited boiling" } else { "where the net heat cannot hold it at the bubble point: it evaporates below it (no boiling)" }
            )
        });
        Ok((model, state, m0, note))
    }

    /// The gas film (its setup holds the far field).
    pub(crate) fn film_mut(&mut self) -> &mut Film {
        self.settled.valid = false;
        &mut self.film
    }

    /// Set the relative motion: with drag (`true`) or at constant slip.
    pub(crate) fn set_drag(&mut self, drag: bool) {
        self.drag = drag;
    }
}

// ---- Run driver: a whole droplet life over the integration core ----

/// Remaining-fraction levels whose times the outcome reports (t10, t50, t90).
const LEVELS: [f64; 3] = [0.9, 0.5, 0.1];

/// Run one droplet with a radially resolved liquid (diffusion and/or conduction).
pub fn simulate_resolved(inp: &DropletInputs, observer: &mut dyn Observer) -> Result<RunResult, ModelError> {
    let (mut model, mut state, m0, flash_note) = Model::prepare(inp)?;
    let mut notes = validity_notes(inp);
    notes.extend(flash_note);
    let boiling_onset = state.boiling.then_some(0.0);
    let tol = step_tolerance(inp.rtol);
    let mut dt = first_step(inp.initial_diameter);
    let mut stats = Stats::default();
    let mut history = RunRows::new(observer.history_times());
    let mut stagnation = super::guard::StagnationGuard::default();
    let wants_rows = observer.wants_rows();
    let first = model.row(&state, m0, inp.initial_diameter);
    let mut log = RunLog {
        watch: RunWatch::start(&model.comps, &first.surface_liquid_mass_fractions, &first),
        // a flash at injection may already have evaporated 10 % or more: those times are 0, not missing
        crossing: LEVELS.map(|lvl| (state.mass / m0 <= lvl).then_some(0.0)),
        status: Status::TimeLimit,
        lifetime: None,
        profiles: vec![],
        next_profile: 0,
        boiling_onset,
        boiling_entries: usize::from(boiling_onset.is_some()),
        boiling_exits: 0,
        notes,
    };
    observer.on_step(&first);
    if wants_rows {
        history.push(first, RowKind::Event);
    }
    log.keep_profiles(&mut model, &state, m0);
    loop {
        if stats.steps > 1_000_000 {
            return Err(ModelError::Integration { time: state.time, reason: "more than 1 000 000 steps".into() });
        }
        if let Some(reason) = stagnation.check(stats.steps, state.time, inp.max_time, 1.0 - state.mass / m0, 1_000_000) {
            return Err(ModelError::Integration { time: state.time, reason });
        }
        dt = dt.min(inp.max_time - state.time).max(1e-15);
        // Rows at requested times come from steps that land on them exactly (this scheme has no continuous
        // extension): a step that would pass the next requested time, or end within 1 % of a step short of
        // it, is cut or stretched to end there; the step after it starts again from the controller's proposal.
        let proposal = dt;
        let landing = history.peek().filter(|tk| *tk > state.time && state.time + 1.01 * dt >= *tk);
        if let Some(tk) = landing {
            dt = tk - state.time;
        }
        let (mut new, err) = match attempt_step(&mut model, &state, &mut dt, tol, m0, &mut stats) {
            Attempt::Accepted(new, err, switch) => {
                if let Some(switch) = switch {
                    log.regime_changed(switch, new.time);
                }
                (new, err)
            }
            Attempt::Retry => continue,
            Attempt::Failed(e) => return Err(integration_failure(inp, state.time, state.surface_t, &format!("the step size fell to the round-off limit ({e})"))),
        };
        let rem_prev = state.mass / m0;
        let rem_now = new.mass / m0;
        for (k, lvl) in LEVELS.iter().enumerate() {
            if log.crossing[k].is_none() && rem_prev > *lvl && rem_now <= *lvl {
                log.crossing[k] = Some(crossing_time(state.time, dt, rem_prev, rem_now, *lvl));
            }
        }
        let finished = rem_now <= inp.end_mass_fraction;
        if finished {
            log.lifetime = Some(crossing_time(state.time, dt, rem_prev, rem_now, inp.end_mass_fraction));
            log.status = Status::Evaporated;
        }
        let landed = landing.filter(|tk| dt == *tk - state.time);
        if let Some(tk) = landed {
            new.time = tk;
        }
        let old = std::mem::replace(&mut state, new);
        model.recycle(old);
        let row = model.row(&state, m0, inp.initial_diameter);
        log.watch.observe(&model.comps, &row.surface_liquid_mass_fractions, &row, state.time);
        log.keep_profiles(&mut model, &state, m0);
        let stop = observer.on_step(&row);
        let event = finished || stop || state.time >= inp.max_time * (1.0 - 1e-12);
        // requested times this step passed without landing (only in a step that ended the run) get no row
        while history.take_due(state.time, true).is_some() {}
        if wants_rows {
            history.push(row, if event { RowKind::Event } else if landed.is_some() { RowKind::Sample } else { RowKind::Step });
        }
        if finished {
            break;
        }
        if stop {
            log.status = Status::Stopped;
            break;
        }
        if state.time >= inp.max_time * (1.0 - 1e-12) {
            break;
        }
        dt = if landed.is_some() { grown_step(dt, tol, err).max(proposal) } else { grown_step(dt, tol, err) };
    }
    stats.rhs_calls = model.film_calls;
    let outcome = resolved_outcome(inp, &mut model, &state, m0, log.status, &mut log, stats);
    Ok(RunResult { outcome, row_times: history.row_times(), history: history.into_rows(), profiles: log.profiles })
}

