//! Temperature correlations as data: the published form, its coefficients and the unit of its result.

use serde::Deserialize;

use super::DataError;

/// Molar gas constant \[J/(mol·K)\] (CODATA 2018, exact).
pub const GAS_CONSTANT: f64 = 8.314_462_618;

/// The equation form of a correlation (see docs/component-format.md).
#[derive(Debug, Clone, PartialEq)]
pub enum Form {
    /// y = A.
    Constant(f64),
    /// y = A + B T + C T² + D T³ + E T⁴ (held at its end values outside the range).
    Dippr100([f64; 5]),
    /// y = exp(A + B/T + C ln T + D T^E).
    Dippr101([f64; 5]),
    /// y = A T^B / (1 + C/T + D/T²).
    Dippr102([f64; 4]),
    /// y = A / B^(1 + (1 − T/C)^D).
    Dippr105([f64; 4]),
    /// y = A (1 − Tr)^(B + C Tr + D Tr² + E Tr³).
    Dippr106 {
        /// Coefficients A..E.
        c: [f64; 5],
        /// Critical temperature used in Tr \[K\].
        tc: f64,
    },
    /// Aly–Lee: y = A + B \[(C/T)/sinh(C/T)\]² + D \[(E/T)/cosh(E/T)\]².
    Dippr107([f64; 5]),
    /// y = A²/τ + B − 2AC τ − AD τ² − C² τ³/3 − CD τ⁴/2 − D² τ⁵/5, τ = 1 − T/Tc.
    Dippr114 {
        /// Coefficients A..D.
        c: [f64; 4],
        /// Critical temperature \[K\].
        tc: f64,
    },
    /// log10(y) = A − B/(T + C).
    Antoine([f64; 3]),
    /// ln(y/pc) = (A τ + B τ^1.5 + C τ^2.5 + D τ^5)/Tr.
    Wagner {
        /// Coefficients A..D.
        c: [f64; 4],
        /// Critical temperature \[K\].
        tc: f64,
        /// Critical pressure in the correlation's unit.
        pc: f64,
    },
    /// log10(y) = A + B/(T + C).
    Vogel([f64; 3]),
    /// y = Σ σ_k (1 − T/Tc)^n_k.
    MuleroCachadina {
        /// Pairs (σ_k, n_k).
        terms: Vec<(f64, f64)>,
        /// Critical temperature \[K\].
        tc: f64,
    },
    /// NASA 7-coefficient cp/R polynomials, low and high ranges.
    Nasa7 {
        /// Low-range coefficients a1..a7.
        low: [f64; 7],
        /// High-range coefficients a1..a7.
        high: [f64; 7],
        /// Switch temperature \[K\].
        t_mid: f64,
    },
    /// VDI Heat Atlas (PPDS) saturated-liquid density: y = ρc + A τ^0.35 + B τ^(2/3) + C τ + D τ^(4/3),
    /// τ = 1 − T/Tc; coefficients \[ρc, A, B, C, D\] in the correlation's unit.
    PpdsDensity {
        /// Coefficients ρc, A, B, C, D.
        c: [f64; 5],
        /// Critical temperature \[K\].
        tc: f64,
    },
    /// VDI Heat Atlas (PPDS equation 9) liquid viscosity: y = E exp\[A x^(1/3) + B x^(4/3)\], x = (C − T)/(T − D).
    Ppds9([f64; 5]),
    /// Estimated from the constants by the default corresponding-states method of the property.
    CorrespondingStates,
}

/// Raw correlation table as written in a TOML file.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct RawCorrelation {
    /// Form name.
    pub model: String,
    /// Coefficients as published.
    #[serde(default)]
    pub coefficients: Option<Vec<f64>>,
    /// NASA7 low-range coefficients.
    #[serde(default)]
    pub coefficients_low: Option<Vec<f64>>,
    /// NASA7 high-range coefficients.
    #[serde(default)]
    pub coefficients_high: Option<Vec<f64>>,
    /// NASA7 switch temperature \[K\].
    #[serde(default)]
    pub t_mid: Option<f64>,
    /// Unit of the published result.
    #[serde(default)]
    pub unit: Option<String>,
    /// Lower validity limit \[K\].
    #[serde(default)]
    pub t_min: Option<f64>,
    /// Upper validity limit \[K\].
    #[serde(default)]
    pub t_max: Option<f64>,
    /// Critical temperature parameter of the form \[K\].
    #[serde(default)]
    pub tc: Option<f64>,
    /// Critical pressure parameter of the form (correlation unit).
    #[serde(default)]
    pub pc: Option<f64>,
    /// Source id.
    pub source: String,
    /// Relative uncertainty (0.01 = 1 %).
    #[serde(default)]
    pub uncertainty: Option<f64>,
    /// Free note.
    #[serde(default)]
    pub note: Option<String>,
}

/// A correlation ready to evaluate: form, unit factor to SI mass basis and validity range.
#[derive(Debug, Clone, PartialEq)]
pub struct Correlation {
    /// Equation form.
    pub form: Form,
    /// Multiplier from the published unit to the SI mass-basis unit of the property.
    pub factor: f64,
    /// Lower validity limit \[K\].
    pub t_min: f64,
    /// Upper validity limit \[K\].
    pub t_max: f64,
    /// Source id.
    pub source: String,
    /// Relative uncertainty (1 σ-like, as stated by the source or the per-method default).
    pub uncertainty: f64,
}

/// What physical dimension a property has (selects the allowed units).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dimension {
    /// Pressure \[Pa\].
    Pressure,
    /// Mass density \[kg/m³\].
    Density,
    /// Specific energy \[J/kg\].
    SpecificEnergy,
    /// Specific heat capacity \[J/(kg·K)\].
    SpecificHeat,
    /// Dynamic viscosity \[Pa·s\].
    Viscosity,
    /// Thermal conductivity \[W/(m·K)\].
    Conductivity,
    /// Surface tension \[N/m\].
    SurfaceTension,
}

/// Factor that turns a value in `unit` into the SI mass-basis unit of `dim`.
pub fn unit_factor(unit: &str, dim: Dimension, molar_mass: f64) -> Option<f64> {
    use Dimension::*;
    let f = match (dim, unit) {
        (Pressure, "Pa") => 1.0,
        (Pressure, "kPa") => 1e3,
        (Pressure, "bar") => 1e5,
        (Pressure, "mmHg") => 133.322_387_415,
        (Density, "kg/m3") => 1.0,
        (Density, "mol/m3") => molar_mass,
        (Density, "kmol/m3") => 1e3 * molar_mass,
        (SpecificEnergy, "J/kg") => 1.0,
        (SpecificEnergy, "J/mol") => 1.0 / molar_mass,
        (SpecificEnergy, "J/kmol") => 1e-3 / molar_mass,
        (SpecificEnergy, "kJ/mol") => 1e3 / molar_mass,
        (SpecificHeat, "J/kg/K") => 1.0,
        (SpecificHeat, "J/mol/K") => 1.0 / molar_mass,
        (SpecificHeat, "J/kmol/K") => 1e-3 / molar_mass,
        (SpecificHeat, "cp/R") => GAS_CONSTANT / molar_mass,
        (Viscosity, "Pa*s") => 1.0,
        (Viscosity, "mPa*s") | (Viscosity, "cP") => 1e-3,
        (Conductivity, "W/m/K") => 1.0,
        (SurfaceTension, "N/m") => 1.0,
        (SurfaceTension, "mN/m") => 1e-3,
        _ => return None,
    };
    Some(f)
}

fn coeffs<const N: usize>(c: &[f64], min: usize, what: &str) -> Result<[f64; N], String> {
    if c.len() < min || c.len() > N {
        return Err(format!("{what} takes {min} to {N} coefficients, found {}", c.len()));
    }
    let mut out = [0.0; N];
    out[..c.len()].copy_from_slice(c);
    Ok(out)
}

impl RawCorrelation {
    /// Check and convert into an evaluable correlation; `context` names the file and section.
    pub fn build(&self, dim: Dimension, molar_mass: f64, default_uncertainty: f64, context: &str) -> Result<Correlation, DataError> {
        let bad = |msg: String| DataError::Invalid { context: context.to_string(), message: msg };
        let c = self.coefficients.clone().unwrap_or_default();
        if let Some(x) = c.iter().find(|x| !x.is_finite()) {
            return Err(bad(format!("coefficient {x} is not a finite number")));
        }
        let need_tc = |name: &str| -> Result<f64, DataError> {
            match self.tc {
                Some(t) if t.is_finite() && t > 0.0 => Ok(t),
                Some(t) => Err(bad(format!("tc = {t} must be a positive number for model '{name}'"))),
                None => Err(bad(format!("model '{name}' needs key 'tc'"))),
            }
        };
        let form = match self.model.as_str() {
            "constant" => Form::Constant(coeffs::<1>(&c, 1, "constant").map_err(bad)?[0]),
            "dippr100" => Form::Dippr100(coeffs(&c, 1, "dippr100").map_err(bad)?),
            "dippr101" => Form::Dippr101(coeffs(&c, 2, "dippr101").map_err(bad)?),
            "dippr102" => Form::Dippr102(coeffs(&c, 2, "dippr102").map_err(bad)?),
            "dippr105" => Form::Dippr105(coeffs(&c, 4, "dippr105").map_err(bad)?),
            "dippr106" => Form::Dippr106 { c: coeffs(&c, 2, "dippr106").map_err(bad)?, tc: need_tc("dippr106")? },
            "dippr107" => Form::Dippr107(coeffs(&c, 5, "dippr107").map_err(bad)?),
            "dippr114" => Form::Dippr114 { c: coeffs(&c, 4, "dippr114").map_err(bad)?, tc: need_tc("dippr114")? },
            "antoine" => Form::Antoine(coeffs(&c, 3, "antoine").map_err(bad)?),
            "ppds-density" => {
                if c.len() != 5 {
                    return Err(bad(format!("ppds-density takes 5 coefficients [rhoc, A, B, C, D], found {}", c.len())));
                }
                Form::PpdsDensity { c: coeffs(&c, 5, "ppds-density").map_err(bad)?, tc: need_tc("ppds-density")? }
            }
            "ppds-viscosity" => {
                let k: [f64; 5] = coeffs(&c, 5, "ppds-viscosity").map_err(bad)?;
                if !(k[4] > 0.0 && k[2] > k[3]) {
                    return Err(bad(format!("ppds-viscosity needs E > 0 and C > D (coefficients [A, B, C, D, E]), found E = {}, C = {}, D = {}", k[4], k[2], k[3])));
                }
                Form::Ppds9(k)
            }
            "vogel" => Form::Vogel(coeffs(&c, 3, "vogel").map_err(bad)?),
            "wagner" => {
                let pc = match self.pc {
                    Some(p) if p.is_finite() && p > 0.0 => p,
                    _ => return Err(bad("model 'wagner' needs a positive key 'pc'".into())),
                };
                Form::Wagner { c: coeffs(&c, 4, "wagner").map_err(bad)?, tc: need_tc("wagner")?, pc }
            }
            "mulero-cachadina" => {
                if c.is_empty() || !c.len().is_multiple_of(2) {
                    return Err(bad(format!("mulero-cachadina takes pairs [sigma, n, ...], found {} numbers", c.len())));
                }
                Form::MuleroCachadina { terms: c.chunks(2).map(|p| (p[0], p[1])).collect(), tc: need_tc("mulero-cachadina")? }
            }
            "nasa7" => {
                let low = self.coefficients_low.clone().unwrap_or_default();
                let high = self.coefficients_high.clone().unwrap_or_default();
                let t_mid = self.t_mid.ok_or_else(|| bad("model 'nasa7' needs key 't-mid'".into()))?;
                if !(t_mid.is_finite() && t_mid > 0.0) {
                    return Err(bad(format!("t-mid = {t_mid} must be a positive temperature [K]")));
                }
                if low.len() != 7 || high.len() != 7 || low.iter().chain(high.iter()).any(|x| !x.is_finite()) {
                    return Err(bad("model 'nasa7' needs 7 finite numbers in each of 'coefficients-low' and 'coefficients-high'".into()));
                }
                let mut l = [0.0; 7];
                let mut h = [0.0; 7];
                l.copy_from_slice(&low);
                h.copy_from_slice(&high);
                Form::Nasa7 { low: l, high: h, t_mid }
            }
            "corresponding-states" => {
                if self.source.strip_prefix("estimated:").is_none_or(|m| m.is_empty()) {
                    return Err(bad(format!("model 'corresponding-states' needs source = \"estimated:<method>\", found source = {:?}", self.source)));
                }
                Form::CorrespondingStates
            }
            other => {
                return Err(bad(format!(
                    "unknown model '{other}' (known: constant, dippr100, dippr101, dippr102, dippr105, dippr106, dippr107, dippr114, antoine, wagner, vogel, mulero-cachadina, nasa7, ppds-density, ppds-viscosity, corresponding-states)"
                )))
            }
        };
        let factor = if matches!(form, Form::CorrespondingStates) {
            1.0
        } else {
            let unit = self.unit.as_deref().ok_or_else(|| bad("missing key 'unit'".into()))?;
            unit_factor(unit, dim, molar_mass).ok_or_else(|| bad(format!("unit '{unit}' does not fit this property")))?
        };
        let t_min = self.t_min.unwrap_or(1.0);
        let t_max = self.t_max.unwrap_or(1e4);
        if !(t_min.is_finite() && t_max.is_finite() && t_min > 0.0 && t_max > t_min) {
            return Err(bad(format!("validity range t-min = {t_min}, t-max = {t_max} is not a positive increasing range")));
        }
        let uncertainty = self.uncertainty.unwrap_or(default_uncertainty);
        if !(uncertainty.is_finite() && (0.0..=1.0).contains(&uncertainty)) {
            return Err(bad(format!("uncertainty = {uncertainty} must be between 0 and 1")));
        }
        Ok(Correlation { form, factor, t_min, t_max, source: self.source.clone(), uncertainty })
    }
}

impl Form {
    /// Evaluate the form at temperature `t` \[K\] in the published unit; `t_min`/`t_max` clamp polynomials.
    pub fn eval(&self, t: f64, t_min: f64, t_max: f64) -> f64 {
        match self {
            Form::Constant(a) => *a,
            Form::Dippr100(c) => {
                let t = t.clamp(t_min, t_max);
                c[0] + t * (c[1] + t * (c[2] + t * (c[3] + t * c[4])))
            }
            Form::Dippr101(c) => {
                let t = t.max(1.0);
                let ln_t = t.ln();
                let d = if c[3] == 0.0 {
                    0.0
                } else if c[4] == c[4].trunc() && c[4].abs() <= 16.0 {
                    c[3] * t.powi(c[4] as i32) // Perry's exponents are small integers: much cheaper than powf
                } else {
                    c[3] * (c[4] * ln_t).exp() // T^E from the logarithm already taken
                };
                (c[0] + c[1] / t + c[2] * ln_t + d).exp()
            }
            Form::Dippr102(c) => {
                let t = t.max(1.0);
                c[0] * t.powf(c[1]) / (1.0 + c[2] / t + c[3] / (t * t))
            }
            Form::Dippr105(c) => {
                let tau = (1.0 - t / c[2]).max(0.0);
                c[0] / c[1].powf(1.0 + tau.powf(c[3]))
            }
            Form::Dippr106 { c, tc } => {
                let tr = t / tc;
                if tr >= 1.0 {
                    return 0.0;
                }
                let tr = tr.max(0.0);
                c[0] * (1.0 - tr).powf(c[1] + tr * (c[2] + tr * (c[3] + tr * c[4])))
            }
            Form::Dippr107(c) => {
                let t = t.max(1.0);
                let x = c[2] / t;
                let y = c[4] / t;
                let s = if x.abs() < 1e-8 { 1.0 } else { x / x.sinh() };
                let h = y / y.cosh();
                c[0] + c[1] * s * s + c[3] * h * h
            }
            Form::Dippr114 { c, tc } => {
                let tau = (1.0 - t / tc).max(1e-3);
                let (a, b, cc, d) = (c[0], c[1], c[2], c[3]);
                a * a / tau + b - 2.0 * a * cc * tau - a * d * tau.powi(2) - cc * cc * tau.powi(3) / 3.0
                    - cc * d * tau.powi(4) / 2.0
                    - d * d * tau.powi(5) / 5.0
            }
            Form::Antoine(c) => {
                let den = (t + c[2]).max(1.0);
                10f64.powf(c[0] - c[1] / den)
            }
            Form::Vogel(c) => {
                let den = t + c[2];
                let den = if den.abs() < 1.0 { 1.0 } else { den };
                10f64.powf(c[0] + c[1] / den)
            }
            Form::Wagner { c, tc, pc } => {
                let tr = (t / tc).min(1.0);
                let tau = 1.0 - tr;
                let tau15 = tau * tau.sqrt(); // τ^1.5 and τ^2.5 from one square root
                pc * ((c[0] * tau + c[1] * tau15 + c[2] * tau15 * tau + c[3] * tau.powi(5)) / tr.max(1e-3)).exp()
            }
            Form::MuleroCachadina { terms, tc } => {
                let x = (1.0 - t / tc).max(0.0);
                terms.iter().map(|(s, n)| s * x.powf(*n)).sum::<f64>().max(0.0)
            }
            Form::Nasa7 { low, high, t_mid } => {
                let t = t.clamp(t_min, t_max);
                let a = if t < *t_mid { low } else { high };
                a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4])))
            }
            Form::PpdsDensity { c, tc } => {
                let tau = (1.0 - t / tc).max(0.0);
                let cbrt = tau.cbrt();
                c[0] + c[1] * tau.powf(0.35) + c[2] * cbrt * cbrt + tau * (c[3] + c[4] * cbrt)
            }
            Form::Ppds9(c) => {
                // x = (C − T)/(T − D); held 5 K above the pole at T = D, as the VDI Heat Atlas advises
                let t = t.max(c[3] + 5.0);
                let x = (c[2] - t) / (t - c[3]);
                let x13 = x.cbrt();
                c[4] * (c[0] * x13 + c[1] * x * x13).exp()
            }
            Form::CorrespondingStates => f64::NAN,
        }
    }
}

impl Correlation {
    /// Value in the SI mass-basis unit at `t` \[K\]; not defined for corresponding-states forms.
    #[inline]
    pub fn eval(&self, t: f64) -> f64 {
        self.factor * self.form.eval(t, self.t_min, self.t_max)
    }

    /// True when the form is an estimate from constants rather than published coefficients.
    pub fn is_estimated(&self) -> bool {
        matches!(self.form, Form::CorrespondingStates) || self.source.starts_with("estimated")
    }

    /// True when `t` lies inside the published validity range.
    pub fn in_range(&self, t: f64) -> bool {
        t >= self.t_min && t <= self.t_max
    }

    /// A correlation that always returns `value` (SI), for tests and idealised components.
    pub fn constant(value: f64, source: &str) -> Self {
        Correlation { form: Form::Constant(value), factor: 1.0, t_min: 1.0, t_max: 1e4, source: source.into(), uncertainty: 0.0 }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dippr105_and_106_shapes() {
        // Perry-like n-decane density: A/B^(1+(1-T/C)^D) in kmol/m3 (shape check only)
        let f = Form::Dippr105([0.41084, 0.25175, 617.7, 0.28571]);
        let v = f.eval(300.0, 0.0, 1e4);
        assert!(v > 5.0 && v < 5.3, "{v}");
        let l = Form::Dippr106 { c: [1.0, 0.38, 0.0, 0.0, 0.0], tc: 600.0 };
        assert!((l.eval(300.0, 0.0, 1e4) - 0.5f64.powf(0.38)).abs() < 1e-12);
        assert_eq!(l.eval(700.0, 0.0, 1e4), 0.0);
    }

    #[test]
    fn aly_lee_limit_and_polynomial_clamp() {
        let f = Form::Dippr107([1.0, 2.0, 0.0, 0.0, 1.0]);
        assert!((f.eval(300.0, 0.0, 1e4) - 3.0).abs() < 1e-9);
        let p = Form::Dippr100([1.0, 1.0, 0.0, 0.0, 0.0]);
        assert!((p.eval(5000.0, 200.0, 1000.0) - 1001.0).abs() < 1e-12);
    }

    #[test]
    fn units() {
        let w = 0.1;
        assert_eq!(unit_factor("kmol/m3", Dimension::Density, w), Some(100.0));
        assert!((unit_factor("J/kmol", Dimension::SpecificEnergy, w).unwrap() - 0.01).abs() < 1e-15);
        assert!(unit_factor("kg/m3", Dimension::Pressure, w).is_none());
    }

    /// PPDS equation 9 against the worked example in the `chemicals` 1.5.2 documentation
    /// (`chemicals.viscosity.PPDS9(400.0, 1.74793, 1.33728, 482.347, 41.78, 9.963e-05)` = 3.5091137378e-4 Pa s).
    #[test]
    fn ppds9_viscosity_worked_example() {
        let f = Form::Ppds9([1.74793, 1.33728, 482.347, 41.78, 9.963e-05]);
        let v = f.eval(400.0, 0.0, 1e4);
        assert!((v / 3.5091137378230684e-4 - 1.0).abs() < 1e-12, "{v}");
        // held 5 K above the pole at T = D: finite and equal to the value at D + 5 K
        assert_eq!(f.eval(41.0, 0.0, 1e4), f.eval(46.78, 0.0, 1e4));
    }

    /// VDI PPDS saturated-liquid density of 1-methylnaphthalene (VDI Heat Atlas row as carried by `chemicals`
    /// 1.5.2: Tc 772 K, ρc 306, A..D 731.0545, −216.5763, 499.7559, −106.6647 kg/m³) against
    /// `chemicals.volume.volume_VDI_PPDS` at 293.15 K (molar volume 1.3933506e-4 m³/mol, M = 142.2 g/mol →
    /// 1020.5615 kg/m³), and ρ → ρc at Tc.
    #[test]
    fn ppds_density_against_chemicals() {
        let f = Form::PpdsDensity { c: [306.0, 731.0545, -216.5763, 499.7559, -106.6647], tc: 772.0 };
        let v = f.eval(293.15, 0.0, 1e4);
        assert!((v - 1020.5615).abs() < 2e-3, "{v}");
        assert_eq!(f.eval(772.0, 0.0, 1e4), 306.0);
        assert_eq!(f.eval(900.0, 0.0, 1e4), 306.0);
    }

    #[test]
    fn ppds_forms_refuse_bad_coefficients() {
        let raw = |model: &str, c: Vec<f64>, tc: Option<f64>| RawCorrelation {
            model: model.into(),
            coefficients: Some(c),
            coefficients_low: None,
            coefficients_high: None,
            t_mid: None,
            unit: Some("kg/m3".into()),
            t_min: None,
            t_max: None,
            tc,
            pc: None,
            source: "x".into(),
            uncertainty: None,
            note: None,
        };
        assert!(raw("ppds-density", vec![1.0, 2.0, 3.0, 4.0], Some(500.0)).build(Dimension::Density, 0.1, 0.01, "f").is_err());
        assert!(raw("ppds-density", vec![1.0, 2.0, 3.0, 4.0, 5.0], None).build(Dimension::Density, 0.1, 0.01, "f").is_err());
        let mut v = raw("ppds-viscosity", vec![1.0, 1.0, 100.0, 200.0, 1e-4], None);
        v.unit = Some("Pa*s".into());
        assert!(v.build(Dimension::Viscosity, 0.1, 0.01, "f").is_err());
    }
}
