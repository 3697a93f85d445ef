//! Gas-side properties: the ambient gas (air, N2 or a user mixture of O2, N2, CO2, H2O, Ar), fuel-vapour
//! mixtures in it, Wilke viscosity, Wassiljewa–Mason–Saxena conductivity and Fuller diffusion coefficients.

use std::sync::Arc;

use crate::data::{Component, GasSpecies, Library, GAS_CONSTANT};

use super::PropertyError;

/// Dry-air composition used for `air` (mole fractions N2 0.7812, O2 0.2096, Ar 0.0092; CO2 folded into N2).
pub const AIR: [(&str, f64); 3] = [("n2", 0.7812), ("o2", 0.2096), ("ar", 0.0092)];

/// An ambient gas: species and their mole fractions.
#[derive(Debug, Clone)]
pub struct AmbientGas {
    /// Species (shared by copies of this gas: a droplet run copies its gas without copying the correlations).
    pub species: Arc<[GasSpecies]>,
    /// Mole fractions \[-\], sum 1.
    pub mole_fractions: Vec<f64>,
    /// Mass fractions \[-\], sum 1.
    pub mass_fractions: Vec<f64>,
    /// Mean molar mass \[kg/mol\].
    pub molar_mass: f64,
    /// Short description, e.g. "air".
    pub label: String,
    /// Per species pair (i, j): ((W_j/W_i)^¼, 1/sqrt(8(1 + W_i/W_j))) of Wilke's φ_ij.
    pub wilke_factors: Vec<(f64, f64)>,
    /// Kernel of [`AmbientGas::transport`] used by [`AmbientGas::film_transport`] in droplet runs (None: direct).
    pub kernel: Option<Arc<super::kernels::GasKernel>>,
    /// The kernel once built, shared by copies of this gas (`crate::props::kernels::run_gas`).
    pub kernel_slot: Arc<std::sync::OnceLock<Arc<super::kernels::GasKernel>>>,
}

/// Wilke's interaction factor φ_ij (Wilke 1950).
#[inline]
pub fn wilke_phi(mu_i: f64, mu_j: f64, w_i: f64, w_j: f64) -> f64 {
    let a = 1.0 + (mu_i / mu_j).sqrt() * (w_j / w_i).sqrt().sqrt();
    a * a / (8.0 * (1.0 + w_i / w_j)).sqrt()
}

/// Wilke's φ_ij and φ_ji of one pair (Wilke 1950), sharing the square roots.
#[inline]
pub fn wilke_phi_pair(mu_i: f64, mu_j: f64, w_i: f64, w_j: f64) -> (f64, f64) {
    let viscosity_root = (mu_i / mu_j).sqrt();
    let weight_root = (w_j / w_i).sqrt().sqrt();
    let a = 1.0 + viscosity_root * weight_root;
    let b = 1.0 + 1.0 / (viscosity_root * weight_root);
    (a * a / (8.0 * (1.0 + w_i / w_j)).sqrt(), b * b / (8.0 * (1.0 + w_j / w_i)).sqrt())
}

/// Wilke mixture viscosity (or Wassiljewa–Mason–Saxena conductivity, with `values` = conductivities and
/// `viscosities` used in the weights) for mole fractions `y` [same unit as `values`].
pub fn wilke_mix(values: &[f64], viscosities: &[f64], molar_masses: &[f64], y: &[f64]) -> f64 {
    let n = values.len();
    let mut total = 0.0;
    for i in 0..n {
        if y[i] <= 0.0 {
            continue;
        }
        let mut den = 0.0;
        for j in 0..n {
            if y[j] > 0.0 {
                den += y[j] * wilke_phi(viscosities[i], viscosities[j], molar_masses[i], molar_masses[j]);
            }
        }
        total += y[i] * values[i] / den;
    }
    total
}

/// Fuller–Schettler–Giddings binary diffusion coefficient \[m²/s\] (Fuller et al. 1966; Poling et al. 2001 eq. 11-4.4).
#[inline]
pub fn fuller_diffusion(t: f64, p: f64, w_a: f64, w_b: f64, v_a: f64, v_b: f64) -> f64 {
    fuller_coefficient(w_a, w_b, v_a, v_b) * t.powf(1.75) / p
}

/// The factor c in D = c T^1.75 / p of the Fuller equation \[m²·Pa/(s·K^1.75)\].
#[inline]
pub fn fuller_coefficient(w_a: f64, w_b: f64, v_a: f64, v_b: f64) -> f64 {
    let w_ab = 2.0 / (1.0 / (w_a * 1e3) + 1.0 / (w_b * 1e3));
    let s = v_a.cbrt() + v_b.cbrt();
    // 0.00143 T^1.75 / (p[bar] sqrt(W_AB) s²) in cm²/s → m²/s with p in Pa
    0.00143e-4 * 1e5 / (w_ab.sqrt() * s * s)
}

impl AmbientGas {
    /// Build from (species id, mole fraction) pairs; fractions are renormalised if within 1 % of 1.
    pub fn new(lib: &Library, parts: &[(String, f64)], label: &str) -> Result<Self, PropertyError> {
        if parts.is_empty() {
            return Err(PropertyError::Gas(format!("ambient gas '{label}' has no species")));
        }
        let mut species = vec![];
        let mut x = vec![];
        for (id, f) in parts {
            let g = lib.gas(id).ok_or_else(|| {
                PropertyError::Gas(format!("unknown ambient-gas species '{id}' (known: {})", lib.gases.keys().cloned().collect::<Vec<_>>().join(", ")))
            })?;
            if !(f.is_finite() && *f >= 0.0) {
                return Err(PropertyError::Gas(format!("mole fraction of '{id}' is {f}; it must be a number ≥ 0")));
            }
            if species.iter().any(|s: &GasSpecies| s.id == g.id) {
                return Err(PropertyError::Gas(format!("species '{id}' is listed twice")));
            }
            species.push(g.clone());
            x.push(*f);
            if species.len() > 8 {
                return Err(PropertyError::Gas("an ambient gas may have at most 8 species".into()));
            }
        }
        let s: f64 = x.iter().sum();
        if (s - 1.0).abs() > 0.01 {
            return Err(PropertyError::Gas(format!("ambient-gas mole fractions sum to {s:.6}, not 1 (within 0.01)")));
        }
        x.iter_mut().for_each(|v| *v /= s);
        let w_mean: f64 = species.iter().zip(&x).map(|(g, x)| x * g.molar_mass()).sum();
        let y = species.iter().zip(&x).map(|(g, x)| x * g.molar_mass() / w_mean).collect();
        Ok(Self::assemble(species, x, y, w_mean, label))
    }

    /// Assemble a gas from its parts (fractions already normalised), precomputing Wilke's molar-mass factors.
    pub fn assemble(species: Vec<GasSpecies>, mole_fractions: Vec<f64>, mass_fractions: Vec<f64>, molar_mass: f64, label: &str) -> Self {
        let n = species.len();
        let mut wilke_factors = Vec::with_capacity(n * n);
        for i in 0..n {
            for j in 0..n {
                let (wi, wj) = (species[i].molar_mass(), species[j].molar_mass());
                wilke_factors.push(((wj / wi).powf(0.25), 1.0 / (8.0 * (1.0 + wi / wj)).sqrt()));
            }
        }
        AmbientGas { species: species.into(), mole_fractions, mass_fractions, molar_mass, label: label.to_string(), wilke_factors, kernel: None, kernel_slot: Default::default() }
    }

    /// Dry air.
    pub fn air(lib: &Library) -> Result<Self, PropertyError> {
        Self::new(lib, &AIR.iter().map(|(s, x)| (s.to_string(), *x)).collect::<Vec<_>>(), "air")
    }

    /// Parse `air`, `n2`/`nitrogen`, or `o2=0.21,n2=0.79` style mole-fraction lists.
    pub fn parse(lib: &Library, text: &str) -> Result<Self, PropertyError> {
        let t = text.trim().to_ascii_lowercase();
        match t.as_str() {
            "air" => return Self::air(lib),
            "n2" | "nitrogen" => return Self::new(lib, &[("n2".into(), 1.0)], "n2"),
            _ => {}
        }
        let mut parts = vec![];
        for item in t.split(',') {
            let (id, f) = item.split_once('=').ok_or_else(|| {
                PropertyError::Gas(format!("cannot read ambient gas '{text}': use air, n2, or a list like o2=0.21,n2=0.79"))
            })?;
            let f: f64 = f.trim().parse().map_err(|_| PropertyError::Gas(format!("cannot read mole fraction '{}' of '{}' in ambient gas '{text}'", f.trim(), id.trim())))?;
            parts.push((id.trim().to_string(), f));
        }
        Self::new(lib, &parts, text)
    }

    /// Ambient-gas heat capacity \[J/(kg·K)\].
    pub fn heat_capacity(&self, t: f64) -> f64 {
        self.species.iter().zip(&self.mass_fractions).map(|(g, y)| y * g.ideal_gas_heat_capacity.eval(t)).sum()
    }

    /// Ambient-gas viscosity by Wilke \[Pa·s\].
    pub fn viscosity(&self, t: f64) -> f64 {
        let mu: Vec<f64> = self.species.iter().map(|g| g.viscosity.eval(t)).collect();
        let w: Vec<f64> = self.species.iter().map(|g| g.molar_mass()).collect();
        wilke_mix(&mu, &mu, &w, &self.mole_fractions)
    }

    /// Ambient-gas conductivity by Wassiljewa–Mason–Saxena \[W/(m·K)\].
    pub fn conductivity(&self, t: f64) -> f64 {
        let mu: Vec<f64> = self.species.iter().map(|g| g.viscosity.eval(t)).collect();
        let k: Vec<f64> = self.species.iter().map(|g| g.conductivity.eval(t)).collect();
        let w: Vec<f64> = self.species.iter().map(|g| g.molar_mass()).collect();
        wilke_mix(&k, &mu, &w, &self.mole_fractions)
    }

    /// Heat capacity \[J/(kg·K)\], Wilke viscosity \[Pa·s\] and Wassiljewa–Mason–Saxena conductivity \[W/(m·K)\]
    /// at `t`, without allocating (at most 8 species).
    pub fn transport(&self, t: f64) -> (f64, f64, f64) {
        let n = self.species.len().min(8);
        let mut mu = [0.0; 8];
        let mut k = [0.0; 8];
        let mut sqrt_mu = [0.0; 8];
        let mut cp = 0.0;
        for i in 0..n {
            let g = &self.species[i];
            mu[i] = g.viscosity.eval(t);
            k[i] = g.conductivity.eval(t);
            sqrt_mu[i] = mu[i].sqrt();
            cp += self.mass_fractions[i] * g.ideal_gas_heat_capacity.eval(t);
        }
        // Wilke / Wassiljewa–Mason–Saxena with the molar-mass factors of φ_ij taken out of the loop
        let x = &self.mole_fractions;
        let (mut mu_mix, mut k_mix) = (0.0, 0.0);
        for i in 0..n {
            if x[i] <= 0.0 {
                continue;
            }
            let mut den = 0.0;
            for j in 0..n {
                if x[j] > 0.0 {
                    let (w4, inv) = self.wilke_factors[i * n + j];
                    let a = 1.0 + sqrt_mu[i] / sqrt_mu[j] * w4;
                    den += x[j] * a * a * inv;
                }
            }
            mu_mix += x[i] * mu[i] / den;
            k_mix += x[i] * k[i] / den;
        }
        (cp, mu_mix, k_mix)
    }

    /// [`AmbientGas::transport`] from the run's kernel where it serves `t` (droplet runs), else directly.
    #[inline]
    pub fn film_transport(&self, t: f64) -> (f64, f64, f64) {
        if let Some(k) = &self.kernel {
            if let Some(v) = k.transport(self, t) {
                return v;
            }
        }
        self.transport(t)
    }

    /// Fuller coefficient c (D = c T^1.75 / p) of a vapour in this gas, combined over species by Blanc's law.
    pub fn fuller_coefficient_of(&self, molar_mass: f64, diffusion_volume: f64) -> f64 {
        let inv: f64 = self
            .species
            .iter()
            .zip(&self.mole_fractions)
            .map(|(g, x)| x / fuller_coefficient(molar_mass, g.molar_mass(), diffusion_volume, g.diffusion_volume.value))
            .sum();
        1.0 / inv
    }

    /// Ideal-gas density \[kg/m³\].
    pub fn density(&self, t: f64, p: f64) -> f64 {
        p * self.molar_mass / (GAS_CONSTANT * t)
    }
}

/// Binary diffusion coefficient of a fuel component's vapour in the ambient gas \[m²/s\] (Fuller + Blanc).
pub fn vapor_diffusion_coefficient(c: &Component, gas: &AmbientGas, t: f64, p: f64) -> f64 {
    gas.fuller_coefficient_of(c.molar_mass(), c.diffusion_volume()) * t.powf(1.75) / p
}

/// Properties of a gas mixture of fuel vapours (mass fractions `y_fuel`) in the ambient gas.
#[derive(Debug, Clone, Copy, serde::Serialize)]
#[allow(non_snake_case)]
pub struct GasMixtureState {
    /// Heat capacity \[J/(kg·K)\].
    pub cp_J_kgK: f64,
    /// Viscosity \[Pa·s\].
    pub viscosity_Pa_s: f64,
    /// Thermal conductivity \[W/(m·K)\].
    pub conductivity_W_mK: f64,
    /// Density \[kg/m³\].
    pub density_kg_m3: f64,
    /// Mean molar mass \[kg/mol\].
    pub molar_mass_kg_mol: f64,
}

/// Full Wilke / Wassiljewa–Mason–Saxena mixture of fuel vapours (mass fractions `y_fuel`, rest ambient gas).
pub fn gas_mixture_state(components: &[Arc<Component>], y_fuel: &[f64], gas: &AmbientGas, t: f64, p: f64) -> GasMixtureState {
    let y_f: f64 = y_fuel.iter().sum();
    let n = components.len() + gas.species.len();
    let mut mass = Vec::with_capacity(n);
    let mut w = Vec::with_capacity(n);
    let mut mu = Vec::with_capacity(n);
    let mut k = Vec::with_capacity(n);
    let mut cp = 0.0;
    for (c, y) in components.iter().zip(y_fuel) {
        mass.push(*y);
        w.push(c.molar_mass());
        mu.push(c.vapor_viscosity(t));
        k.push(c.vapor_conductivity(t));
        cp += y * c.ideal_gas_heat_capacity(t);
    }
    for (g, y) in gas.species.iter().zip(&gas.mass_fractions) {
        mass.push(y * (1.0 - y_f));
        w.push(g.molar_mass());
        mu.push(g.viscosity.eval(t));
        k.push(g.conductivity.eval(t));
        cp += y * (1.0 - y_f) * g.ideal_gas_heat_capacity.eval(t);
    }
    let moles: Vec<f64> = mass.iter().zip(&w).map(|(m, w)| m / w).collect();
    let total: f64 = moles.iter().sum();
    let x: Vec<f64> = moles.iter().map(|m| m / total).collect();
    let w_mix = 1.0 / total;
    GasMixtureState {
        cp_J_kgK: cp,
        viscosity_Pa_s: wilke_mix(&mu, &mu, &w, &x),
        conductivity_W_mK: wilke_mix(&k, &mu, &w, &x),
        density_kg_m3: p * w_mix / (GAS_CONSTANT * t),
        molar_mass_kg_mol: w_mix,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Fuller check values computed in the physics notes (B.10): water–air 0.250 cm²/s, n-heptane–air
    /// 0.0705 cm²/s, n-decane–air 0.0583 cm²/s at 298.15 K and 101.325 kPa (air volume 19.7, W 28.97).
    #[test]
    fn fuller_check_values() {
        let d = |w: f64, v: f64| fuller_diffusion(298.15, 101_325.0, w, 0.02897, v, 19.7) * 1e4;
        let water = d(0.018015, 13.1); // tabulated H2O volume (Fuller et al. 1966)
        assert!((water - 0.250).abs() < 0.003, "{water}");
        let heptane = d(0.10020, 7.0 * 15.9 + 16.0 * 2.31);
        assert!((heptane - 0.0705).abs() < 0.001, "{heptane}");
        let decane = d(0.14228, 10.0 * 15.9 + 22.0 * 2.31);
        assert!((decane - 0.0583).abs() < 0.001, "{decane}");
    }

    #[test]
    fn wilke_single_species_is_identity() {
        let v = wilke_mix(&[1.8e-5], &[1.8e-5], &[0.028], &[1.0]);
        assert!((v - 1.8e-5).abs() < 1e-15);
    }
}
