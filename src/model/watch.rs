//! Watches along a run that end in regime notes: the surface against critical temperatures and the freezing
//! point of the surface liquid, and the Reynolds number against the correlations' fitted range.

use super::film::TransferCorrelation;

/// End-of-run note when the largest Reynolds number left the range the Nu0/Sh0 correlation was fitted to
/// (Clift et al. 1978: Re ≤ 400; Ranz & Marshall 1952: Re ≤ 200, from memory) or the drag law's (Re ≤ 1000).
pub(crate) fn reynolds_note(correlation: TransferCorrelation, max_re: f64) -> Option<String> {
    let (name, limit) = match correlation {
        TransferCorrelation::Clift => ("Clift", 400.0),
        TransferCorrelation::RanzMarshall => ("Ranz–Marshall", 200.0),
    };
    if max_re > 1000.0 {
        Some(format!("Reynolds number reached {max_re:.0}, above the {limit:.0} to which the {name} correlation was fitted and above 1000, where the standard drag law is held at C_D = 0.424: transfer rates and drag are extrapolated"))
    } else if max_re > limit {
        Some(format!("Reynolds number reached {max_re:.0}, above the {limit:.0} to which the {name} correlation was fitted: transfer rates are extrapolated"))
    } else {
        None
    }
}

/// Watches the surface temperature against the critical temperatures of the components present at the
/// surface (liquid mole fraction above 1 %), so a light component that has already evaporated raises no alarm.
#[derive(Debug, Default)]
pub(crate) struct CriticalWatch {
    /// Worst case so far: (T_s / T_c, T_s \[K\], T_c \[K\], component index, mole fraction, time \[s\]).
    worst: Option<(f64, f64, f64, usize, f64, f64)>,
    /// First state with the surface below the ideal-solubility freezing point of the surface liquid:
    /// (T_s \[K\], freezing point \[K\], component index of the first crystals, time \[s\]).
    frozen: Option<(f64, f64, usize, f64)>,
}

impl CriticalWatch {
    /// Look at one state: surface liquid mass fractions `w`, surface temperature and time.
    #[inline]
    pub(crate) fn observe(&mut self, comps: &[std::sync::Arc<crate::data::Component>], w: &[f64], surface_temperature: f64, time: f64) {
        let moles: f64 = comps.iter().zip(w).map(|(c, w)| w.max(0.0) / c.molar_mass()).sum();
        if moles.is_nan() || moles <= 0.0 {
            return;
        }
        for (i, (c, w)) in comps.iter().zip(w).enumerate() {
            let x = w.max(0.0) / c.molar_mass() / moles;
            let ratio = surface_temperature / c.critical_temperature();
            if x > 0.01 && ratio > 0.95 && self.worst.is_none_or(|b| ratio > b.0) {
                self.worst = Some((ratio, surface_temperature, c.critical_temperature(), i, x, time));
            }
            // the ideal-solubility freezing point lies at or below the melting point (x ≤ 1): a surface at or
            // above it cannot freeze, and the logarithm is not needed
            if self.frozen.is_none() && x > 0.0 && surface_temperature < c.constants.melting_point.value {
                if let Some(h) = c.constants.enthalpy_of_fusion.as_ref() {
                    let t_f = 1.0 / (1.0 / c.constants.melting_point.value - crate::data::GAS_CONSTANT * x.ln() / h.value);
                    if surface_temperature < t_f {
                        self.frozen = Some((surface_temperature, t_f, i, time));
                    }
                }
            }
        }
    }

    /// The note, if the surface was ever below the freezing point of the surface liquid.
    pub(crate) fn freezing_note(&self, comps: &[std::sync::Arc<crate::data::Component>]) -> Option<String> {
        let (t_s, t_f, i, time) = self.frozen?;
        Some(format!(
            "surface temperature {t_s:.1} K was below the ideal-solubility freezing point of the surface liquid ({t_f:.1} K, first crystals: {}) at t = {time:.4e} s: the droplet may start to freeze; solidification is not modelled, liquid properties are extrapolated",
            comps[i].id
        ))
    }

    /// The note, if the surface came within 5 % of (or rose above) a present component's critical temperature.
    pub(crate) fn note(&self, comps: &[std::sync::Arc<crate::data::Component>]) -> Option<String> {
        let (ratio, t_s, t_c, i, x, time) = self.worst?;
        let id = &comps[i].id;
        Some(if ratio >= 1.0 {
            format!(
                "surface temperature {t_s:.1} K rose above the critical temperature of {id} ({t_c:.1} K, {:.1} mol% of the surface liquid) at t = {time:.4e} s: there is no sharp liquid-vapour interface in reality (supercritical mixing); the subcritical model runs on with its correlations clamped at or extrapolated past the critical point, so results are indicative only",
                100.0 * x
            )
        } else {
            format!(
                "surface temperature {t_s:.1} K came within 5 % of the critical temperature of {id} ({t_c:.1} K, {:.1} mol% of the surface liquid) at t = {time:.4e} s: subcritical correlations are near their limit",
                100.0 * x
            )
        })
    }
}

/// The watches of one run: critical and freezing temperatures, the highest surface temperature and Reynolds
/// number, and the end of the heat-up period (shared by the well-mixed and the resolved run drivers).
#[derive(Debug)]
pub(crate) struct RunWatch {
    critical: CriticalWatch,
    /// Highest surface temperature so far \[K\].
    pub(crate) max_surface_temperature: f64,
    max_reynolds: f64,
    /// First time the heat into the liquid fell below 10 % of the gas heat flux \[s\].
    pub(crate) heatup_end: Option<f64>,
    /// Time and value of |Q_L| − 0.1 |Q_gas| at the last observed row, while the heat-up lasts.
    heatup_last: (f64, f64),
}

/// |Q_L| − 0.1 |Q_gas| of a row: the heat-up has ended where it first reaches zero \[W\].
fn heatup_margin(row: &super::history::HistoryRow) -> f64 {
    row.film.heat_to_liquid.abs() - 0.1 * row.film.heat_from_gas.abs()
}

impl RunWatch {
    /// Watches started at the first row (time 0); `surface_w`: the surface liquid mass fractions of that row.
    pub(crate) fn start(comps: &[std::sync::Arc<crate::data::Component>], surface_w: &[f64], first: &super::history::HistoryRow) -> Self {
        let mut critical = CriticalWatch::default();
        critical.observe(comps, surface_w, first.surface_temperature, 0.0);
        RunWatch {
            critical,
            max_surface_temperature: first.surface_temperature,
            max_reynolds: first.film.reynolds,
            heatup_end: if heatup_margin(first) <= 0.0 { Some(0.0) } else { None },
            heatup_last: (0.0, heatup_margin(first)),
        }
    }

    /// Look at the row of one accepted step at `time`.
    pub(crate) fn observe(&mut self, comps: &[std::sync::Arc<crate::data::Component>], surface_w: &[f64], row: &super::history::HistoryRow, time: f64) {
        self.max_surface_temperature = self.max_surface_temperature.max(row.surface_temperature);
        self.critical.observe(comps, surface_w, row.surface_temperature, time);
        self.max_reynolds = self.max_reynolds.max(row.film.reynolds);
        if self.heatup_end.is_none() {
            // the crossing between the last row and this one, by linear interpolation of the margin (the rows
            // sit wherever the integrator stepped; the step end alone moved the time by a few per cent)
            let margin = heatup_margin(row);
            let (t0, m0) = self.heatup_last;
            if margin <= 0.0 {
                let share = if m0 > 0.0 && m0 - margin > 0.0 { m0 / (m0 - margin) } else { 1.0 };
                self.heatup_end = Some(t0 + share * (time - t0));
            }
            self.heatup_last = (time, margin);
        }
    }

    /// The end-of-run notes: critical temperature, freezing, Reynolds range.
    pub(crate) fn push_notes(&self, comps: &[std::sync::Arc<crate::data::Component>], correlation: TransferCorrelation, notes: &mut Vec<String>) {
        if let Some(note) = self.critical.note(comps) {
            notes.push(note);
        }
        if let Some(note) = self.critical.freezing_note(comps) {
            notes.push(note);
        }
        if let Some(note) = reynolds_note(correlation, self.max_reynolds) {
            notes.push(note);
        }
    }
}
