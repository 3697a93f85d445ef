//! Heat-limited boiling regime of the resolved liquid: the surface sits at the hold temperature of the surface
//! liquid (Σ X_s = BOILING_THRESHOLD), the evaporation rate follows the heat balance at the surface
//! ṁ Σ ε_i L_i = Q_gas + Q_rad + Q_fib − Q_in (Q_in conducted into the liquid interior), the vapour leaves with
//! the equilibrium composition of the surface liquid, and the droplet leaves the regime when that heat no longer
//! holds the surface at the bubble point (docs/model.md §5).

use super::{boiling_hold_temperature, FilmResult, Liquid, Model, State, BOILING_THRESHOLD};
use crate::props::liquid;

/// A change of heat regime of the resolved liquid at the end of an accepted step.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) enum RegimeSwitch {
    /// The surface reached the hold temperature and the heat holds it there: boiling from here.
    Onset {
        /// Hold temperature \[K\].
        hold_temperature: f64,
    },
    /// The heat no longer holds the surface at the bubble point: evaporating below it from here.
    Exit {
        /// Surface temperature at the exit \[K\].
        temperature: f64,
    },
}

impl Model {
    /// Hold temperature of the surface liquid of mass fractions `surface_y` \[K\]: Σ x_i γ_i p_sat,i = 0.995 p.
    pub(super) fn hold_temperature(&mut self, surface_y: &[f64]) -> f64 {
        liquid::mass_to_mole_into(&self.comps, surface_y, &mut self.x_surf);
        let fallback = self.film.setup.ambient_temperature;
        let pressure = self.film.setup.pressure;
        boiling_hold_temperature(&self.comps, &mut self.film.setup.activity, &self.x_surf, pressure).unwrap_or(fallback)
    }

    /// Boiling film at the surface `surface_y` held at `hold` with `heat_inward` \[W\] conducted into the liquid;
    /// species rates left in `self.rates`.
    pub(super) fn boiling_film_at(&mut self, surface_y: &[f64], hold: f64, mass: f64, rho: f64, speed: f64, heat_inward: f64) -> FilmResult {
        self.film_with(surface_y, hold, mass, rho, speed, Some(heat_inward))
    }

    /// Heat \[W\] conducted from a surface at `t_s` into the liquid of state `s`: through the surface half cell of
    /// the temperature grid, or (uniform liquid temperature) the heat the liquid stored over the last step.
    pub(super) fn conducted_inward(&self, s: &State, t_s: f64, g_t: f64, cp: f64) -> f64 {
        let nt = self.tgrid.len();
        if nt > 1 {
            cp * g_t * self.tgrid.face_factor(nt) * (t_s - s.temp[nt - 1])
        } else {
            s.heat_inward
        }
    }

    /// Heat conductances of temperature and species (ρ² κ A²/m) for the circulation of film `f`.
    pub(super) fn conductances(&self, f: &FilmResult, liq: &Liquid, s: &State, radius: f64, blowing: f64) -> (f64, f64) {
        let (chi_t, chi_y) = self.circulation(f, liq, s.velocity, radius, blowing);
        let area = 4.0 * std::f64::consts::PI * radius * radius;
        let rho2a2_over_m = liq.density * liq.density * area * area / s.mass;
        (rho2a2_over_m * chi_t * liq.conductivity / (liq.density * liq.cp), rho2a2_over_m * chi_y * liq.diffusivity)
    }

    /// The boiling film of state `s` (surface at the hold temperature of its composition, conduction into the
    /// interior from the profile): the film, the hold temperature and the conductances (g_T, g_Y).
    pub(super) fn boiling_film(&mut self, s: &State, liq: &Liquid, radius: f64) -> (FilmResult, f64, f64, f64) {
        self.boiling_film_of(s, &s.surface_y, liq, radius)
    }

    /// [`Model::boiling_film`] with the surface mass fractions `sy`.
    pub(super) fn boiling_film_of(&mut self, s: &State, sy: &[f64], liq: &Liquid, radius: f64) -> (FilmResult, f64, f64, f64) {
        let hold = self.hold_temperature(sy);
        // circulation from the film without the sink (the gas side does not depend on it but for B_T)
        let probe = self.boiling_film_at(sy, hold, s.mass, liq.density, s.velocity, 0.0);
        let (g_t, g_y) = self.conductances(&probe, liq, s, radius, probe.spalding_heat);
        let inward = self.conducted_inward(s, hold, g_t, liq.cp);
        let f = self.boiling_film_at(sy, hold, s.mass, liq.density, s.velocity, inward);
        (f, hold, g_t, g_y)
    }

    /// Heat into the liquid interior implied by the temperature step from `s` to `next` (per unit c_p, kg·K/s):
    /// through the surface half cell, or the change of stored heat of a uniform-temperature liquid plus what the
    /// vapour carried (the same q_in the step's surface condition used).
    pub(super) fn inward_per_cp(&self, s: &State, next: &State, m_new: f64, dt: f64, g_t: f64, mdot: f64) -> f64 {
        let nt = self.tgrid.len();
        if nt > 1 {
            g_t * self.tgrid.face_factor(nt) * (next.surface_t - next.temp[nt - 1])
        } else {
            (m_new * next.temp[0] - s.mass * s.temp[0]) / dt + mdot * next.temp[0]
        }
    }

    /// Heat margin of the boiling regime at state `s` \[W\]: the heat into the liquid of the evaporating film at the
    /// hold temperature (diffusion-limited rate, Σ X_s = 0.995) less the heat conducted into the interior there.
    /// Positive: the evaporating regime would carry the surface past the hold temperature (boiling holds it);
    /// zero or negative: the heat no longer holds it at the bubble point.
    pub(super) fn hold_margin(&mut self, s: &State) -> f64 {
        let liq = self.liquid(s);
        let radius = 0.5 * (6.0 * s.mass / (std::f64::consts::PI * liq.density)).cbrt();
        let hold = self.hold_temperature(&s.surface_y);
        let f = self.film_at(&s.surface_y, hold, s.mass, liq.density, s.velocity);
        let (g_t, _) = self.conductances(&f, &liq, s, radius, f.spalding_mass);
        f.heat_to_liquid - self.conducted_inward(s, hold, g_t, liq.cp)
    }

    /// Event function of the regime change out of the current regime (`boiling`) at state `s`: positive while the
    /// regime holds, zero or negative past the change. Boiling: the heat margin ([`Model::hold_margin`], the quantity
    /// that decides the exit); evaporating: T_h − T_s of the surface liquid (Σ X_s reaches BOILING_THRESHOLD, the
    /// quantity that decides the onset), None when the surface is below it (no onset to locate) or the surface
    /// temperature is fixed.
    pub(super) fn regime_event(&mut self, boiling: bool, s: &State) -> Option<f64> {
        if self.fixed_temperature {
            return None;
        }
        if boiling {
            return Some(self.hold_margin(s));
        }
        Some(self.hold_temperature(&s.surface_y) - s.surface_t)
    }

    /// True when the evaporating state `s` has reached the hold temperature of its surface liquid (Σ X_s ≥
    /// BOILING_THRESHOLD) with a positive heat margin: the onset condition.
    pub(super) fn onset_due(&mut self, s: &State) -> bool {
        self.surface_sum(s) >= BOILING_THRESHOLD && self.hold_margin(s) > 0.0
    }

    /// Σ X_s = Σ x_i γ_i p_sat,i(T_s)/p of the surface liquid of state `s`.
    pub(super) fn surface_sum(&mut self, s: &State) -> f64 {
        liquid::mass_to_mole_into(&self.comps, &s.surface_y, &mut self.x_surf);
        let x = std::mem::take(&mut self.x_surf);
        let sum = self.film.surface_equilibrium(&x, s.surface_t);
        self.x_surf = x;
        sum
    }

    /// True when the boiling regime, entered at the evaporating state `s` (at its onset), still holds after a
    /// probe step of length `h` \[s\] (heat margin positive at its end). False when the surface only grazes the
    /// bubble point: the boiling regime's own margin falls at once while the evaporating regime returns to the
    /// hold temperature (both push towards the boundary, where they agree), and the droplet evaporates on at
    /// the bubble point instead of entering and leaving the regime at every step.
    pub(super) fn boiling_holds(&mut self, s: &State, h: f64) -> bool {
        let mut b = s.clone();
        b.boiling = true;
        b.surface_t = self.hold_temperature(&s.surface_y);
        if self.tgrid.len() == 1 {
            b.temp[0] = b.surface_t;
        }
        self.settle_surface(&mut b);
        let Ok(st) = self.start(&b) else { return true };
        match self.step(&b, &st, h) {
            Ok(mut e) => {
                self.settle_surface(&mut e);
                self.hold_margin(&e) > 0.0
            }
            Err(_) => true,
        }
    }

    /// Regime change at the accepted state `s` (updated in place): onset when the surface has reached the hold
    /// temperature and the margin is positive (the surface is set to the hold temperature), exit when the
    /// margin is no longer positive.
    pub(super) fn update_regime(&mut self, s: &mut State) -> Option<RegimeSwitch> {
        if self.fixed_temperature {
            return None;
        }
        if s.boiling {
            if self.hold_margin(s) > 0.0 {
                return None;
            }
            s.boiling = false;
            return Some(RegimeSwitch::Exit { temperature: s.surface_t });
        }
        if !self.onset_due(s) {
            return None;
        }
        let hold = self.hold_temperature(&s.surface_y);
        s.boiling = true;
        s.surface_t = hold;
        if self.tgrid.len() == 1 {
            // a uniform-temperature liquid is its surface (the onset is located to within a small part of a step)
            s.temp[0] = hold;
        }
        Some(RegimeSwitch::Onset { hold_temperature: hold })
    }
}
