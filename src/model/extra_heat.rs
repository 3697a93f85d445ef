//! Heat reaching a droplet by other paths than its gas film: thermal radiation from an enclosure (grey body,
//! transparent gas) and conduction along a suspending fibre (infinite fin). See docs/model.md §4.

use crate::data::GAS_CONSTANT;

/// Thermal radiation exchanged between the droplet and an enclosure (the gas itself is transparent).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Radiation {
    /// Black-body temperature of the surroundings \[K\]; None: at the ambient gas temperature (furnace walls at
    /// the gas temperature), so it follows the gas temperature in sweeps and uncertainty samples.
    pub temperature: Option<f64>,
    /// Absorption efficiency of the droplet, also its emissivity (Kirchhoff, grey body) \[-\], 0–1.
    pub absorption_efficiency: f64,
}

/// A fibre that suspends the droplet, conducting heat in from the hot gas like an infinite fin.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct SupportFibre {
    /// Fibre diameter \[m\].
    pub diameter: f64,
    /// Thermal conductivity of the fibre material \[W/(m·K)\].
    pub conductivity: f64,
    /// Number of fibre stems leaving the droplet (1 for a fibre ending in the droplet, 2 for one through it).
    pub stems: u32,
}

/// Optional heat paths into the liquid besides the gas film.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct ExtraHeat {
    /// Radiation from the surroundings, if any.
    pub radiation: Option<Radiation>,
    /// Supporting fibre, if any.
    pub fibre: Option<SupportFibre>,
}

/// Nusselt number of a circular cylinder in cross-flow, Churchill & Bernstein (1977, J. Heat Transfer 99:300):
/// Nu = 0.3 + 0.62 Re^½ Pr^⅓ / \[1 + (0.4/Pr)^⅔\]^¼ · \[1 + (Re/282 000)^⅝\]^⅘ (a lower bound for Re·Pr < 0.2).
pub fn churchill_bernstein(re: f64, pr: f64) -> f64 {
    0.3 + 0.62 * re.sqrt() * pr.cbrt() / (1.0 + (0.4 / pr).powf(2.0 / 3.0)).powf(0.25) * (1.0 + (re / 282_000.0).powf(5.0 / 8.0)).powf(0.8)
}

/// Stefan–Boltzmann constant \[W/(m²·K⁴)\] (CODATA 2018, exact in the 2019 SI).
pub const STEFAN_BOLTZMANN: f64 = 5.670_374_419e-8;

impl ExtraHeat {
    /// True when no extra heat path is set.
    pub fn is_none(&self) -> bool {
        self.radiation.is_none() && self.fibre.is_none()
    }

    /// Net radiative heat absorbed by a grey sphere of diameter `d` at `t_s` in a black enclosure \[W\]:
    /// Q = Q_abs π d² σ (T_rad⁴ − T_s⁴) (incident power on a sphere in an isotropic field is π d² σ T⁴).
    pub fn radiation_heat(&self, t_s: f64, d: f64, t_inf: f64) -> f64 {
        match self.radiation {
            Some(r) => {
                let t_rad = r.temperature.unwrap_or(t_inf);
                r.absorption_efficiency * std::f64::consts::PI * d * d * STEFAN_BOLTZMANN * (t_rad.powi(4) - t_s.powi(4))
            }
            None => 0.0,
        }
    }

    /// Heat conducted in along the fibre stems \[W\]: infinite fin, Q = n sqrt(h P k A_c) (T∞ − T_s)
    /// (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eq. 3.80 — number from memory), h from the
    /// Churchill–Bernstein cylinder correlation (ibid. eq. 7.54, from memory) with gas properties at the mean of T∞ and T_s.
    pub fn fibre_heat(&self, gas: &crate::props::gas::AmbientGas, pressure: f64, t_inf: f64, t_s: f64, speed: f64) -> f64 {
        let Some(f) = self.fibre else { return 0.0 };
        let t_film = 0.5 * (t_inf + t_s);
        let (cp, mu, k) = gas.transport(t_film);
        let rho = pressure * gas.molar_mass / (GAS_CONSTANT * t_film);
        let re = rho * speed.abs() * f.diameter / mu;
        let pr = cp * mu / k;
        let h = churchill_bernstein(re, pr) * k / f.diameter;
        let perimeter = std::f64::consts::PI * f.diameter;
        let area = 0.25 * std::f64::consts::PI * f.diameter * f.diameter;
        f64::from(f.stems) * (h * perimeter * f.conductivity * area).sqrt() * (t_inf - t_s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Grey-body radiation: 0.5 π (1 mm)² σ (1000⁴ − 300⁴) = 0.0883486 W (hand value); none without the option.
    #[test]
    fn radiation_heat_hand_value() {
        let mut extra = ExtraHeat::default();
        assert_eq!(extra.radiation_heat(300.0, 1e-3, 800.0), 0.0);
        extra.radiation = Some(Radiation { temperature: Some(1000.0), absorption_efficiency: 0.5 });
        assert!((extra.radiation_heat(300.0, 1e-3, 800.0) / 0.088_348_566 - 1.0).abs() < 1e-7);
        assert!(extra.radiation_heat(1000.0, 1e-3, 800.0).abs() < 1e-15, "no net exchange at equal temperatures");
        assert!(extra.radiation_heat(1200.0, 1e-3, 800.0) < 0.0, "a hotter droplet loses heat");
        extra.radiation = Some(Radiation { temperature: None, absorption_efficiency: 0.5 });
        assert!((extra.radiation_heat(300.0, 1e-3, 1000.0) / 0.088_348_566 - 1.0).abs() < 1e-7, "None = the gas temperature");
    }

    /// Churchill–Bernstein check values from the worked examples of the `ht` package documentation
    /// (Nu_cylinder_Churchill_Bernstein): Re 120, Pr 0.71 → 5.65356; Re 6071, Pr 0.7 → 40.6371.
    #[test]
    fn churchill_bernstein_published_examples() {
        assert!((churchill_bernstein(120.0, 0.71) / 5.65356 - 1.0).abs() < 1e-5);
        assert!((churchill_bernstein(6071.0, 0.7) / 40.6371 - 1.0).abs() < 1e-5);
        assert_eq!(churchill_bernstein(0.0, 0.7), 0.3);
    }

    /// Fibre fin: still gas gives the Churchill–Bernstein floor Nu = 0.3, so h ∝ 1/d_f and Q ∝ d_f; Q ∝ stems.
    #[test]
    fn fibre_heat_scaling() {
        let lib = crate::data::Library::embedded().unwrap();
        let gas = crate::props::gas::AmbientGas::air(&lib).unwrap();
        let fibre = |d: f64, stems: u32| ExtraHeat { radiation: None, fibre: Some(SupportFibre { diameter: d, conductivity: 1.4, stems }) };
        let q = fibre(100e-6, 1).fibre_heat(&gas, 101_325.0, 800.0, 350.0, 0.0);
        let (_, _, k) = gas.transport(575.0);
        let h = 0.3 * k / 100e-6;
        let expected = (h * std::f64::consts::PI * 100e-6 * 1.4 * 0.25 * std::f64::consts::PI * 1e-8).sqrt() * 450.0;
        assert!((q / expected - 1.0).abs() < 1e-12, "{q} vs {expected}");
        assert!((fibre(100e-6, 2).fibre_heat(&gas, 101_325.0, 800.0, 350.0, 0.0) / q - 2.0).abs() < 1e-12);
        assert!((fibre(400e-6, 1).fibre_heat(&gas, 101_325.0, 800.0, 350.0, 0.0) / q - 4.0).abs() < 1e-12);
        assert!(fibre(100e-6, 1).fibre_heat(&gas, 101_325.0, 800.0, 350.0, 5.0) > q, "gas flow raises h");
    }
}
