//! Radial profiles inside a droplet of the resolved liquid model: temperature and composition against r/r_s,
//! one curve per saved snapshot (profiles.csv).

#[allow(unused_imports)]
use super::*;

/// File stem of the radial-profile chart.
pub const PROFILE_CHART: &str = "chart_radial_profiles";

/// Most components drawn one panel each; more are summed by hydrocarbon class.
const MAX_COMPONENT_PANELS: usize = 4;

/// One saved profile: evaporated fraction, time and the cell values.
struct Snapshot {
    evaporated: f64,
    time: f64,
    radius_fraction: Vec<f64>,
    temperature: Vec<f64>,
    /// Per composition panel, the mass fraction in each cell.
    shares: Vec<Vec<f64>>,
}

/// Chart of the radial temperature and composition profiles of a resolved run (None when the run saved no
/// profiles.csv).
pub fn radial_profile_chart(run: &SavedRun, stem: &str, subtitle: &str) -> Result<Option<Chart>, OutputError> {
    let Some(p) = &run.profiles else { return Ok(None) };
    let time = p.required_numbers("time_s")?;
    let evaporated = p.required_numbers("evaporated_fraction")?;
    let radius = p.required_numbers("radius_fraction")?;
    let temperature = p.required_numbers("temperature_K")?;
    let ids: Vec<String> = p.columns_with_prefix("Y_").into_iter().map(|(id, _)| id).collect();
    if ids.is_empty() || time.is_empty() {
        return Ok(None);
    }
    let class_of = |id: &str| run.components.iter().find(|(c, _)| c == id).map(|(_, k)| k.clone()).unwrap_or_default();
    // composition panels: each component, or each class present
    let groups: Vec<(String, Vec<usize>)> = if ids.len() <= MAX_COMPONENT_PANELS {
        ids.iter().enumerate().map(|(k, id)| (id.clone(), vec![k])).collect()
    } else {
        CLASSES
            .iter()
            .enumerate()
            .filter_map(|(ci, (class, label, _))| {
                let members: Vec<usize> = (0..ids.len())
                    .filter(|&k| {
                        let c = class_of(&ids[k]);
                        c == *class || (ci == CLASSES.len() - 1 && !CLASSES[..CLASSES.len() - 1].iter().any(|k| k.0 == c))
                    })
                    .collect();
                (!members.is_empty()).then(|| (label.to_string(), members))
            })
            .collect()
    };
    let columns: Vec<Vec<f64>> = ids.iter().map(|id| p.required_numbers(&format!("Y_{id}"))).collect::<Result<_, _>>()?;
    let mut snapshots: Vec<Snapshot> = vec![];
    for row in 0..time.len() {
        if snapshots.last().is_none_or(|s| s.time != time[row]) {
            snapshots.push(Snapshot { evaporated: evaporated[row], time: time[row], radius_fraction: vec![], temperature: vec![], shares: vec![vec![]; groups.len()] });
        }
        let s = snapshots.last_mut().expect("pushed above");
        s.radius_fraction.push(radius[row]);
        s.temperature.push(temperature[row]);
        for (g, (_, members)) in groups.iter().enumerate() {
            s.shares[g].push(members.iter().map(|&k| columns[k][row]).sum());
        }
    }
    let (scale, unit) = time_scale(snapshots.iter().map(|s| s.time).fold(0.0, f64::max));
    let names: Vec<String> = snapshots.iter().map(|s| format!("{:.0} % evaporated ({} {unit})", 100.0 * s.evaporated, significant(s.time * scale, 3))).collect();
    let color = |k: usize| PALETTE[k % PALETTE.len()];
    let series_of = |values: &dyn Fn(&Snapshot) -> &Vec<f64>| -> Vec<Series> {
        snapshots
            .iter()
            .enumerate()
            .map(|(k, s)| Series { name: names[k].clone(), points: s.radius_fraction.iter().zip(values(s)).map(|(r, v)| (*r, Some(*v))).collect(), color: color(k), stroke: Stroke::Solid })
            .collect()
    };
    let x_label = "radius / surface radius  [-]".to_string();
    let mut panels = vec![Panel { title: "temperature".into(), x_label: x_label.clone(), y_label: "temperature  [K]".into(), series: series_of(&|s| &s.temperature), x_range: Some((0.0, 1.0)), ..Default::default() }];
    for (g, (name, _)) in groups.iter().enumerate() {
        panels.push(Panel { title: name.clone(), x_label: x_label.clone(), y_label: "mass fraction  [-]".into(), series: series_of(&|s| &s.shares[g]), x_range: Some((0.0, 1.0)), ..Default::default() });
    }
    panels.truncate(6);
    let columns = if panels.len() <= 2 { panels.len() } else { 3 };
    let rows = panels.len().div_ceil(columns);
    let legend = snapshots.iter().enumerate().map(|(k, _)| LegendEntry { name: names[k].clone(), color: color(k), stroke: Stroke::Solid }).collect();
    let what = if ids.len() <= MAX_COMPONENT_PANELS { "components" } else { "hydrocarbon classes (summed)" };
    Ok(Some(Chart {
        stem: stem.into(),
        title: format!("Inside the droplet: temperature and {what} against radius"),
        subtitle: subtitle.into(),
        panels,
        columns,
        legend_title: "profile at".into(),
        legend,
        size: (1400, 140 + 380 * rows as u32),
    }))
}
