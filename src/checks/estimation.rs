//! Checks of the estimation methods used where a component has no published correlation, against the
//! published correlations of components that have one (the estimate is computed without them).

use super::CheckResult;
use crate::data::Library;
use crate::props::joback;

/// Joback liquid viscosity (recalled increments) vs the published viscosity correlations of chain alkanes and
/// alkylbenzenes at −20 °C and 27 °C. Fused rings are excluded (the method's known weakness, stated in the
/// property-methods documentation).
pub fn joback_viscosity_checks(lib: &Library) -> Vec<CheckResult> {
    let ids = [
        "n-hexane", "n-heptane", "n-octane", "n-nonane", "n-decane", "n-undecane", "n-dodecane", "n-pentadecane", "n-hexadecane",
        "methylcyclohexane", "ethylcyclohexane", "toluene", "ethylbenzene", "m-xylene", "p-xylene", "n-propylbenzene", "n-butylbenzene",
    ];
    let mut out = vec![];
    for id in ids {
        let Some(c) = lib.component(id) else { continue };
        let mut worst: f64 = 0.0;
        for t in [253.15, 300.0] {
            let published = c.liquid_viscosity.eval(t);
            match joback::liquid_viscosity(&c.joback_groups, c.molar_mass(), t) {
                Some(est) => worst = worst.max((est / published - 1.0).abs()),
                None => worst = f64::INFINITY,
            }
        }
        out.push(CheckResult::relative(
            "estimation methods vs published data",
            format!("{id}: Joback liquid viscosity at 253 and 300 K vs the published correlation"),
            &format!("published correlation of the library ({}); Joback & Reid (1987) viscosity increments recalled from memory", c.liquid_viscosity.source),
            worst,
            0.35,
        ));
    }
    out
}
