//! Residual liquid along a droplet history: the liquid composition (mean, or the surface layer of a
//! resolved droplet) at chosen evaporated fractions, interpolated linearly between history rows.

use crate::model::HistoryRow;

use super::weathering::Residue;

/// Which liquid of a resolved droplet to sample.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Layer {
    /// The whole droplet (mass-mean composition).
    Mean,
    /// The liquid at the surface (resolved species model only).
    Surface,
}

impl Layer {
    /// Name used in tables.
    pub fn as_str(self) -> &'static str {
        match self {
            Layer::Mean => "mean",
            Layer::Surface => "surface",
        }
    }
}

/// Residues at each requested evaporated fraction that the history reaches (fractions beyond the last row
/// are skipped).
pub fn residues_along_history(rows: &[HistoryRow], fractions: &[f64], layer: Layer) -> Vec<Residue> {
    let pick = |r: &HistoryRow| -> Vec<f64> {
        match layer {
            Layer::Surface if !r.surface_liquid_mass_fractions.is_empty() => r.surface_liquid_mass_fractions.clone(),
            _ => r.liquid_mass_fractions.clone(),
        }
    };
    let mut out = vec![];
    for &f in fractions {
        let Some(k) = rows.iter().position(|r| r.evaporated_fraction >= f) else { continue };
        let w = if k == 0 || rows[k].evaporated_fraction <= f {
            pick(&rows[k])
        } else {
            let (a, b) = (&rows[k - 1], &rows[k]);
            let s = (f - a.evaporated_fraction) / (b.evaporated_fraction - a.evaporated_fraction);
            pick(a).iter().zip(pick(b)).map(|(x, y)| (x + s * (y - x)).max(0.0)).collect()
        };
        let sum: f64 = w.iter().sum();
        if sum > 0.0 {
            out.push(Residue { evaporated_fraction: f, mass_fractions: w.iter().map(|v| v / sum).collect() });
        }
    }
    out
}
