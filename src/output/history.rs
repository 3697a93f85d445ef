//! Droplet history (history.csv) and run summary (summary.json).

use std::path::Path;

use serde::Serialize;

use crate::model::{DropletInputs, HistoryRow, Motion, RowTimes};


use super::{Cell, CsvTable, OutputError, TOOL_VERSION};

/// Build the history table of a run; `row_times` (the run's [`crate::model::RunResult::row_times`]) goes into the
/// metadata.
pub fn history_table(inputs: &DropletInputs, rows: &[HistoryRow], row_times: &RowTimes) -> Result<CsvTable, OutputError> {
    let ids: Vec<&str> = inputs.fuel.components.iter().map(|c| c.id.as_str()).collect();
    let mut header: Vec<String> = [
        "time_s",
        "time_over_d0sq_s_m2",
        "diameter_m",
        "d2_ratio",
        "surface_temperature_K",
        "mass_kg",
        "evaporated_fraction",
        "velocity_m_s",
        "reynolds",
        "evaporation_rate_kg_s",
        "spalding_BM",
        "spalding_BT",
        "sherwood",
        "nusselt",
        "heat_to_liquid_W",
        "regime",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    let resolved = inputs.liquid.is_resolved();
    let extra = !inputs.extra_heat.is_none();
    if extra {
        // radiation and fibre heat (included in heat_to_liquid_W) and the gas-film heat, for their shares
        header.push("heat_from_gas_W".into());
        header.push("heat_radiation_fibre_W".into());
    }
    if resolved {
        header.push("mean_temperature_K".into());
        header.push("center_temperature_K".into());
    }
    header.extend(ids.iter().map(|id| format!("Yliq_{id}")));
    header.extend(ids.iter().map(|id| format!("Yvap_{id}")));
    if resolved {
        header.extend(ids.iter().map(|id| format!("Ysurf_{id}")));
    }
    let mut t = CsvTable::new(header);
    t.metadata = vec![
        format!("{TOOL_VERSION} droplet history (well-mixed liquid, Abramzon-Sirignano film)"),
        format!("fuel: {} ({} components)", inputs.fuel.name, inputs.fuel.len()),
        format!(
            "ambient: {} K, {} Pa, gas {}; initial diameter {} m, droplet {} K",
            inputs.ambient_temperature, inputs.pressure, inputs.gas.label, inputs.initial_diameter, inputs.initial_temperature
        ),
        format!("liquid model: species {:?}, heat {:?}, {} radial cells", inputs.liquid.mixing, inputs.liquid.heat, inputs.liquid.nodes).to_lowercase(),
        row_times_note(inputs, row_times),
        "Yliq_*: (mean) liquid mass fractions; Yvap_*: mass fractions of the vapour leaving the surface at that instant; Ysurf_*: liquid mass fractions at the surface (resolved models)".into(),
    ];
    let d0sq = inputs.initial_diameter * inputs.initial_diameter;
    for r in rows {
        let mut cells = vec![
            Cell::Num(r.time),
            Cell::Num(r.time / d0sq),
            Cell::Num(r.diameter),
            Cell::Num(r.d2_ratio),
            Cell::Num(r.surface_temperature),
            Cell::Num(r.mass),
            Cell::Num(r.evaporated_fraction),
            Cell::Num(r.velocity),
            Cell::Num(r.film.reynolds),
            Cell::Num(r.film.evaporation_rate),
            // B_M is unbounded at the bubble point: left empty in the boiling regime (see the regime column)
            if r.regime == crate::model::droplet::Regime::Boiling { Cell::Opt(None) } else { Cell::Num(r.film.spalding_mass) },
            Cell::Num(r.film.spalding_heat),
            Cell::Num(r.film.sherwood),
            Cell::Num(r.film.nusselt),
            Cell::Num(r.film.heat_to_liquid),
            Cell::Text(format!("{:?}", r.regime).to_lowercase()),
        ];
        if extra {
            cells.push(Cell::Num(r.film.heat_from_gas));
            cells.push(Cell::Num(r.film.heat_extra));
        }
        if resolved {
            cells.push(Cell::Num(r.mean_temperature));
            cells.push(Cell::Num(r.center_temperature));
        }
        cells.extend(r.liquid_mass_fractions.iter().map(|v| Cell::Num(*v)));
        cells.extend(r.vapor_mass_fractions.iter().map(|v| Cell::Num(*v)));
        if resolved {
            cells.extend(r.surface_liquid_mass_fractions.iter().map(|v| Cell::Num(*v)));
        }
        t.push(cells, "history.csv")?;
    }
    Ok(t)
}

/// Echo of the inputs, SI units.
#[derive(Debug, Clone, Serialize)]
pub struct InputEcho {
    /// Fuel name.
    pub fuel: String,
    /// Fuel origin (file or library).
    pub fuel_origin: String,
    /// Components and mass fractions.
    pub composition_mass_fractions: Vec<(String, f64)>,
    /// Ambient temperature \[K\].
    pub ambient_temperature_K: f64,
    /// Pressure \[Pa\].
    pub pressure_Pa: f64,
    /// Ambient gas mole fractions.
    pub ambient_gas: Vec<(String, f64)>,
    /// Initial diameter \[m\].
    pub initial_diameter_m: f64,
    /// Initial droplet temperature \[K\].
    pub droplet_temperature_K: f64,
    /// Motion.
    pub motion: Motion,
    /// Nu0/Sh0 correlation.
    pub correlation: String,
    /// Reference-state weight.
    pub reference_weight: f64,
    /// Relative tolerance.
    pub rtol: f64,
    /// Runge–Kutta pair of the run: `dp54` or `dp853`, `auto: dp54` (`auto: dp853`) for the one `auto` took at
    /// this tolerance, `<choice>: resolved liquid, own implicit steps` for the resolved liquid.
    pub integrator: String,
    /// Time limit \[s\].
    pub max_time_s: f64,
    /// Liquid model.
    pub liquid_model: String,
    /// Far-field fuel-vapour mass fractions.
    pub ambient_vapor_mass_fractions: Vec<(String, f64)>,
    /// Vapour diffusivity in the species rates: "mixture" (one averaged value) or "species" (per component).
    pub vapour_diffusion: String,
    /// Radiation and supporting-fibre heat (absent for a free droplet in a transparent gas).
    #[serde(skip_serializing_if = "crate::model::film::ExtraHeat::is_none")]
    pub extra_heat: crate::model::film::ExtraHeat,
}

/// The `integrator` echo of a run: the choice and the pair it takes at the run's tolerance.
fn integrator_echo(inp: &DropletInputs) -> String {
    use crate::model::integrator::Method;
    if inp.liquid.is_resolved() {
        format!("{}: resolved liquid, own implicit steps", inp.integrator.as_str())
    } else {
        match inp.integrator {
            Method::Auto => format!("auto: {}", Method::Auto.resolve(inp.rtol).as_str()),
            chosen => chosen.as_str().to_string(),
        }
    }
}

impl InputEcho {
    /// Echo of a run's inputs.
    pub fn of(inp: &DropletInputs) -> Self {
        let ids = || inp.fuel.components.iter().map(|c| c.id.clone());
        InputEcho {
            fuel: inp.fuel.name.clone(),
            fuel_origin: inp.fuel.origin.clone(),
            composition_mass_fractions: ids().zip(inp.fuel.mass_fractions.iter().copied()).collect(),
            ambient_temperature_K: inp.ambient_temperature,
            pressure_Pa: inp.pressure,
            ambient_gas: inp.gas.species.iter().map(|s| s.id.clone()).zip(inp.gas.mole_fractions.iter().copied()).collect(),
            initial_diameter_m: inp.initial_diameter,
            droplet_temperature_K: inp.initial_temperature,
            motion: inp.motion,
            correlation: inp.correlation.as_str().into(),
            reference_weight: inp.reference_weight,
            rtol: inp.rtol,
            integrator: integrator_echo(inp),
            max_time_s: inp.max_time,
            liquid_model: format!(
                "species {:?}, heat {:?}, {} radial cells, non-equilibrium surface {}, activity {}",
                inp.liquid.mixing,
                inp.liquid.heat,
                inp.liquid.nodes,
                inp.liquid.non_equilibrium,
                inp.liquid.activity.as_str()
            )
            .to_lowercase(),
            ambient_vapor_mass_fractions: if inp.ambient_vapor.is_empty() { vec![] } else { ids().zip(inp.ambient_vapor.iter().copied()).collect() },
            vapour_diffusion: inp.vapour_diffusion.as_str().into(),
            extra_heat: inp.extra_heat,
        }
    }
}

/// The summary.json document.
#[derive(Debug, Clone, Serialize)]
#[allow(non_snake_case)]
pub struct Summary {
    /// Tool and version.
    pub tool: String,
    /// How the run ended.
    pub status: String,
    /// Time when 0.1 % of the initial mass remains \[s\].
    pub lifetime_s: Option<f64>,
    /// 10 % evaporated \[s\].
    pub t10_s: Option<f64>,
    /// 50 % evaporated \[s\].
    pub t50_s: Option<f64>,
    /// 90 % evaporated \[s\].
    pub t90_s: Option<f64>,
    /// End of heat-up \[s\].
    pub heatup_end_s: Option<f64>,
    /// Highest surface temperature \[K\].
    pub max_surface_temperature_K: f64,
    /// Boiling onset \[s\].
    pub boiling_onset_s: Option<f64>,
    /// Final time \[s\].
    pub end_time_s: f64,
    /// Evaporated fraction at the end.
    pub final_evaporated_fraction: f64,
    /// Regime and validity notes.
    pub regime_notes: Vec<String>,
    /// Integrator statistics.
    pub integrator: crate::model::integrator::Stats,
    /// Mass-balance error (liquid + evaporated vs initial, max over components).
    pub mass_balance_error: f64,
    /// Estimated (not published) properties used, per component.
    pub estimated_properties: Vec<(String, Vec<String>)>,
    /// Liquid temperatures the run reached (lowest and highest of surface, mean and centre) \[K\]; the liquid
    /// properties were evaluated in this span.
    pub liquid_temperature_span_K: (f64, f64),
    /// Properties used outside their valid range (component, property, method, valid range, how far below
    /// and above): liquid properties over `liquid_temperature_span_K`, vapour properties from its lower end to
    /// the ambient temperature. Empty when every property rests on its published range or a published
    /// extension inside its stated or checked range (docs/property-methods.md, Ranges).
    pub properties_outside_valid_range: Vec<crate::props::pure::RangeExcursion>,
    /// Hydrocarbon class of each component (id, class), so charts can group components when redrawn.
    pub component_classes: Vec<(String, String)>,
    /// Inputs echoed back.
    pub input: InputEcho,
}

impl Summary {
    /// Summary of a run.
    pub fn of(inp: &DropletInputs, result: &crate::model::RunResult) -> Self {
        let o = &result.outcome;
        let (mut lo, mut hi) = (inp.initial_temperature, inp.initial_temperature.max(o.max_surface_temperature));
        for r in &result.history {
            for t in [r.surface_temperature, r.mean_temperature, r.center_temperature] {
                if t.is_finite() {
                    lo = lo.min(t);
                    hi = hi.max(t);
                }
            }
        }
        let fractions = vec![1.0; inp.fuel.components.len()];
        let mut outside = crate::table::range_excursions(&inp.fuel.components, &fractions, lo, hi, &crate::table::LIQUID_KEYS);
        outside.extend(crate::table::range_excursions(&inp.fuel.components, &fractions, lo, hi.max(inp.ambient_temperature), &crate::table::VAPOR_KEYS));
        Summary {
            tool: TOOL_VERSION.into(),
            status: format!("{:?}", o.status).to_lowercase(),
            lifetime_s: o.lifetime,
            t10_s: o.t10,
            t50_s: o.t50,
            t90_s: o.t90,
            heatup_end_s: o.heatup_end,
            max_surface_temperature_K: o.max_surface_temperature,
            boiling_onset_s: o.boiling_onset,
            end_time_s: o.end_time,
            final_evaporated_fraction: o.final_evaporated_fraction,
            regime_notes: o.regime_notes.clone(),
            integrator: o.stats,
            mass_balance_error: o.mass_balance_error,
            estimated_properties: inp
                .fuel
                .components
                .iter()
                .filter(|c| !c.estimated_properties().is_empty())
                .map(|c| (c.id.clone(), c.estimated_properties().iter().map(|s| s.to_string()).collect()))
                .collect(),
            component_classes: inp.fuel.components.iter().map(|c| (c.id.clone(), c.class.as_str().to_string())).collect(),
            liquid_temperature_span_K: (lo, hi),
            properties_outside_valid_range: outside,
            input: InputEcho::of(inp),
        }
    }
}

/// Radial profiles table (profiles.csv) of a resolved run.
pub fn profiles_table(inputs: &DropletInputs, profiles: &[crate::model::droplet::Profile]) -> Result<CsvTable, OutputError> {
    let ids: Vec<&str> = inputs.fuel.components.iter().map(|c| c.id.as_str()).collect();
    let mut header: Vec<String> = ["time_s", "evaporated_fraction", "radius_m", "radius_fraction", "temperature_K"].iter().map(|s| s.to_string()).collect();
    header.extend(ids.iter().map(|id| format!("Y_{id}")));
    let mut t = CsvTable::new(header);
    t.metadata = vec![
        format!("{TOOL_VERSION} radial profiles inside the droplet (cell centres, r/r_s)"),
        format!("fuel: {}; profiles at the first step past each evaporated fraction of {:?}", inputs.fuel.name, crate::model::resolved::PROFILE_LEVELS),
    ];
    for p in profiles {
        for k in 0..p.radius_fraction.len() {
            let mut cells = vec![Cell::Num(p.time), Cell::Num(p.evaporated_fraction), Cell::Num(p.radius), Cell::Num(p.radius_fraction[k]), Cell::Num(p.temperature[k])];
            cells.extend(p.mass_fractions.iter().map(|y| Cell::Num(y[k])));
            t.push(cells, "profiles.csv")?;
        }
    }
    Ok(t)
}

/// The metadata line that says how the history rows were taken: at requested times (which, and how they were
/// reached), or at integrator steps (thinned, if thinned).
pub fn row_times_note(inputs: &DropletInputs, row_times: &RowTimes) -> String {
    match row_times {
        RowTimes::Steps { stride: 1 } => "rows: one per accepted integrator step (adaptive; not evenly spaced in time)".into(),
        RowTimes::Steps { stride } => format!(
            "rows: one per {stride} accepted integrator steps (a long run's history is thinned to stay under {} rows; the final row is kept)",
            crate::model::guard::MAX_HISTORY_ROWS
        ),
        RowTimes::Requested(times) => {
            let how = if inputs.liquid.is_resolved() { "steps landed exactly on each time" } else { "dense output of the integrator" };
            format!("rows: at requested times ({how}) plus the first row, regime changes and the final row; requested {}; times after the end of the run have no row", describe_times(times))
        }
    }
}

/// A short description of requested times \[s\]: all of them when few, else the grid or the ends.
fn describe_times(times: &[f64]) -> String {
    let n = times.len();
    // times are checked finite (check_history_times)
    let num = |t: f64| super::fmt_f64(t).unwrap_or_default();
    let list = |ts: &[f64]| ts.iter().map(|t| num(*t)).collect::<Vec<_>>().join(", ");
    if n <= 12 {
        return format!("t = {} s", list(times));
    }
    let step = times[1] - times[0];
    let even = times.windows(2).all(|w| ((w[1] - w[0]) - step).abs() <= 1e-9 * step.abs().max(times[n - 1].abs()));
    if even {
        format!("{n} times from t = {} s to {} s every {} s", num(times[0]), num(times[n - 1]), num(round12(step)))
    } else {
        format!("{n} times: t = {}, …, {} s", list(&times[..5]), list(&times[n - 2..]))
    }
}

/// `x` to 12 significant digits (a grid step computed as a difference of decimals).
fn round12(x: f64) -> f64 {
    format!("{x:.11e}").parse().unwrap_or(x)
}

/// The files of one run, rendered: history.csv, summary.json and (resolved models) profiles.csv.
#[derive(Debug, Clone)]
pub struct RunFiles {
    /// history.csv.
    pub history: String,
    /// summary.json.
    pub summary: String,
    /// profiles.csv, when the model wrote radial profiles.
    pub profiles: Option<String>,
    /// The table rendered as history.csv.
    pub history_table: super::CsvTable,
    /// The table rendered as profiles.csv.
    pub profiles_table: Option<super::CsvTable>,
}

impl RunFiles {
    /// Render the files of a run.
    pub fn of(inputs: &DropletInputs, result: &crate::model::RunResult) -> Result<Self, OutputError> {
        let history_table = history_table(inputs, &result.history, &result.row_times)?;
        let history = history_table.render();
        let profiles_table = if result.profiles.is_empty() { None } else { Some(profiles_table(inputs, &result.profiles)?) };
        let profiles = profiles_table.as_ref().map(|t| t.render());
        let summary = super::to_json_string(&Summary::of(inputs, result)).map_err(|m| OutputError::Io { path: "summary.json".into(), message: m })?;
        Ok(RunFiles { history, summary, profiles, history_table, profiles_table })
    }

    /// Write the files into `dir`, together or not at all (inside a caller's [`super::together`] group, with
    /// the caller's other files); a profiles.csv of an earlier run that this run does not produce is removed.
    pub fn write(&self, dir: &Path, durability: super::Durability) -> Result<(), OutputError> {
        super::together(|| {
            super::ensure_dir(dir)?;
            super::write_file(&dir.join("history.csv"), self.history.as_bytes(), durability)?;
            match &self.profiles {
                Some(text) => super::write_file(&dir.join("profiles.csv"), text.as_bytes(), durability)?,
                // an earlier resolved run's profiles would not belong to this history
                None => super::remove_output(&dir.join("profiles.csv"))?,
            }
            super::write_file(&dir.join("summary.json"), self.summary.as_bytes(), durability)
        })
    }
}

/// Write history.csv, summary.json and (resolved models) profiles.csv into `dir`, together or not at all
/// (inside a caller's [`super::together`] group, with the caller's other files); returns the texts written.
pub fn write_run(dir: &Path, inputs: &DropletInputs, result: &crate::model::RunResult, durability: super::Durability) -> Result<RunFiles, OutputError> {
    let files = RunFiles::of(inputs, result)?;
    files.write(dir, durability)?;
    Ok(files)
}

#[cfg(test)]
mod tests {
    use super::describe_times;

    #[test]
    fn requested_times_are_described_briefly() {
        assert_eq!(describe_times(&[1e-3, 2.5e-3]), "t = 0.001, 0.0025 s");
        let grid: Vec<f64> = (0..=400).map(|k| format!("{:.11e}", k as f64 * 0.25e-3).parse().unwrap()).collect();
        assert_eq!(describe_times(&grid), "401 times from t = 0 s to 0.1 s every 0.00025 s");
        let uneven: Vec<f64> = (1..=20).map(|k| (k * k) as f64 / 1e6).collect();
        assert_eq!(describe_times(&uneven), "20 times: t = 1e-6, 4e-6, 9e-6, 1.6e-5, 2.5e-5, …, 0.000361, 0.0004 s");
    }
}
