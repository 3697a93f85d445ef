//! The Joback & Reid (1987) group-increment table (data); the estimation formulas are in props::joback.
//! Tc, Pc, Vc, Tb and cp increments as reprinted in Poling, Prausnitz & O'Connell, 5th ed. (2001), Table C-1;
//! liquid-viscosity increments as in the Joback table carried by thermo 0.6.1 (mua/mub), checked against published correlations in src/checks.

/// One Joback group's increments.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Group {
    /// Key used in component files.
    pub key: &'static str,
    /// ΔTc.
    pub tc: f64,
    /// ΔPc.
    pub pc: f64,
    /// ΔVc \[cm³/mol\].
    pub vc: f64,
    /// ΔTb \[K\].
    pub tb: f64,
    /// Ideal-gas cp increments a, b, c, d (J/(mol·K), T in K).
    pub cp: [f64; 4],
    /// Liquid-viscosity increments (η_a, η_b), where published.
    pub eta: Option<(f64, f64)>,
    /// Atoms in the group (heavy atoms + H) for the Pc term.
    pub atoms: u32,
}

/// The group table.
pub const GROUPS: [Group; 9] = [
    Group { key: "CH3", tc: 0.0141, pc: -0.0012, vc: 65.0, tb: 23.58, cp: [19.5, -8.08e-3, 1.53e-4, -9.67e-8], eta: Some((548.29, -1.719)), atoms: 4 },
    Group { key: "CH2", tc: 0.0189, pc: 0.0, vc: 56.0, tb: 22.88, cp: [-0.909, 9.50e-2, -5.44e-5, 1.19e-8], eta: Some((94.16, -0.199)), atoms: 3 },
    Group { key: "CH", tc: 0.0164, pc: 0.0020, vc: 41.0, tb: 21.74, cp: [-23.0, 2.04e-1, -2.65e-4, 1.20e-7], eta: Some((-322.15, 1.187)), atoms: 2 },
    Group { key: "C", tc: 0.0067, pc: 0.0043, vc: 27.0, tb: 18.25, cp: [-66.2, 4.27e-1, -6.41e-4, 3.01e-7], eta: Some((-573.56, 2.307)), atoms: 1 },
    Group { key: "rCH2", tc: 0.0100, pc: 0.0025, vc: 48.0, tb: 27.15, cp: [-6.03, 8.54e-2, -8.00e-6, -1.80e-8], eta: Some((307.53, -0.798)), atoms: 3 },
    Group { key: "rCH", tc: 0.0122, pc: 0.0004, vc: 38.0, tb: 21.78, cp: [-20.5, 1.62e-1, -1.60e-4, 6.24e-8], eta: Some((-394.29, 1.251)), atoms: 2 },
    Group { key: "rCHa", tc: 0.0082, pc: 0.0011, vc: 41.0, tb: 26.73, cp: [-2.14, 5.74e-2, -1.64e-6, -1.59e-8], eta: Some((259.65, -0.702)), atoms: 2 },
    Group { key: "rCa", tc: 0.0143, pc: 0.0008, vc: 32.0, tb: 31.01, cp: [-8.25, 1.01e-1, -1.42e-4, 6.78e-8], eta: Some((-245.74, 0.912)), atoms: 1 },
    Group { key: "OH", tc: 0.0741, pc: 0.0112, vc: 28.0, tb: 92.88, cp: [25.7, -6.91e-2, 1.77e-4, -9.88e-8], eta: None, atoms: 2 },
];

/// Look a group up by key.
pub fn group(key: &str) -> Option<&'static Group> {
    GROUPS.iter().find(|g| g.key == key)
}


/// Joback & Reid (1987) increments for the melting point ΔTm \[K\] and the ideal-gas enthalpy of formation at
/// 298.15 K ΔHf \[kJ/mol\], by group key, as reprinted in Poling, Prausnitz & O'Connell, 5th ed. (2001),
/// Table C-1 (the same values the component generator mixtures/tools/make_components.py uses).
/// Tm = 122.5 + ΣΔTm; Hf(g) = 68.29 + ΣΔHf.
pub const MELTING_AND_FORMATION: [(&str, f64, f64); 9] = [
    ("CH3", -5.10, -76.45),
    ("CH2", 11.27, -20.64),
    ("CH", 12.64, 29.89),
    ("C", 46.43, 82.23),
    ("rCH2", 7.75, -26.80),
    ("rCH", 19.88, 8.67),
    ("rCHa", 8.13, 2.09),
    ("rCa", 37.02, 46.43),
    ("OH", 44.45, -208.04),
];

/// Atoms of one group: (carbon, hydrogen, oxygen).
pub fn group_atoms(key: &str) -> Option<(u32, u32, u32)> {
    Some(match key {
        "CH3" => (1, 3, 0),
        "CH2" | "rCH2" => (1, 2, 0),
        "CH" | "rCH" | "rCHa" => (1, 1, 0),
        "C" | "rCa" => (1, 0, 0),
        "OH" => (0, 1, 1),
        _ => return None,
    })
}
