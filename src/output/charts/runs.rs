//! The chart kinds drawn from saved runs: d², surface temperature, compositions, residue indicators.

#[allow(unused_imports)]
use super::*;

/// A run with the label it gets in legends.
#[derive(Debug, Clone, Copy)]
pub struct LabelledRun<'a> {
    /// Legend label.
    pub label: &'a str,
    /// The run.
    pub run: &'a SavedRun,
}

/// One-line description of a run's conditions, from summary.json.
pub fn run_subtitle(run: &SavedRun) -> String {
    let mut parts = vec![run.fuel_name()];
    if let Some(t) = run.input_number("ambient_temperature_K") {
        let mut s = format!("gas {t:.0} K");
        if let Some(p) = run.input_number("pressure_Pa") {
            s.push_str(&format!(", {} bar", significant(p / 1e5, 3)));
        }
        parts.push(s);
    }
    if let Some(d) = run.initial_diameter() {
        parts.push(format!("d0 = {} µm", significant(d * 1e6, 3)));
    }
    if let Some(t0) = run.input_number("droplet_temperature_K") {
        parts.push(format!("T0 = {t0:.0} K"));
    }
    if let Some(m) = run.summary.get("input").and_then(|i| i.get("motion")) {
        if let (Some(kind), Some(v)) = (m.get("kind").and_then(|k| k.as_str()), m.get("velocity").and_then(|v| v.as_f64())) {
            parts.push(if kind == "injected" { format!("injected at {} m/s", significant(v, 3)) } else { format!("slip {} m/s", significant(v, 3)) });
        }
    }
    parts.join(" · ")
}

pub(super) fn run_points(run: &SavedRun, x: &[Option<f64>], y: &[Option<f64>], fx: f64, fy: f64, oy: f64) -> Vec<(f64, Option<f64>)> {
    let _ = run;
    thin(x.len(), MAX_POINTS).into_iter().filter_map(|i| x[i].map(|xv| (xv * fx, y[i].map(|v| v * fy + oy)))).collect()
}

pub(super) fn max_time(runs: &[LabelledRun]) -> f64 {
    runs.iter()
        .filter_map(|r| r.run.history.numbers("time_s").ok())
        .flat_map(|v| v.into_iter().flatten())
        .fold(0.0, f64::max)
}

pub(super) fn run_legend(runs: &[LabelledRun]) -> Vec<LegendEntry> {
    runs.iter().enumerate().map(|(i, r)| {
        let (color, stroke) = palette(i);
        LegendEntry { name: r.label.to_string(), color, stroke }
    }).collect()
}

pub(super) fn overlay(runs: &[LabelledRun], mut f: impl FnMut(&SavedRun) -> Result<Vec<(f64, Option<f64>)>, OutputError>) -> Result<Vec<Series>, OutputError> {
    runs.iter()
        .enumerate()
        .map(|(i, r)| {
            let (color, stroke) = palette(i);
            Ok(Series { name: r.label.to_string(), points: f(r.run)?, color, stroke })
        })
        .collect()
}

pub(super) fn single_or_overlay(runs: &[LabelledRun], title: &str, subtitle: &str, stem: &str, panel: Panel) -> Chart {
    let legend = if runs.len() > 1 { run_legend(runs) } else { vec![] };
    Chart {
        stem: stem.into(),
        title: title.into(),
        subtitle: subtitle.into(),
        panels: vec![panel],
        columns: 1,
        legend_title: if runs.len() > 1 { "run".into() } else { String::new() },
        legend,
        size: (1000, 620),
    }
}

/// (d/d0)² against t/d0² \[s/mm²\], one curve per run.
pub fn d2_chart(runs: &[LabelledRun], stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let series = overlay(runs, |run| {
        let h = &run.history;
        let x = if h.has("time_over_d0sq_s_m2") {
            h.numbers("time_over_d0sq_s_m2")?
        } else {
            let d0 = run.initial_diameter().unwrap_or(1.0);
            h.numbers("time_s")?.into_iter().map(|t| t.map(|t| t / (d0 * d0))).collect()
        };
        Ok(run_points(run, &x, &h.numbers("d2_ratio")?, 1e-6, 1.0, 0.0))
    })?;
    let ymax = series.iter().flat_map(|s| s.points.iter().filter_map(|p| p.1)).fold(1.0, f64::max);
    let panel = Panel {
        x_label: "t/d0²  [s/mm²]".into(),
        y_label: "(d/d0)²  [-]".into(),
        series,
        y_range: Some((0.0, ymax * 1.04)),
        ..Default::default()
    };
    Ok(single_or_overlay(runs, "Normalised droplet size: (d/d0)² against t/d0²", subtitle, stem, panel))
}

/// Surface temperature against time, K on the left and °C on the right.
pub fn surface_temperature_chart(runs: &[LabelledRun], stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let (f, unit) = time_scale(max_time(runs));
    let series = overlay(runs, |run| Ok(run_points(run, &run.history.numbers("time_s")?, &run.history.numbers("surface_temperature_K")?, f, 1.0, 0.0)))?;
    let panel = Panel { x_label: format!("time  [{unit}]"), y_label: "surface temperature  [K]".into(), series, celsius_axis: true, ..Default::default() };
    Ok(single_or_overlay(runs, "Droplet surface temperature", subtitle, stem, panel))
}

/// Evaporated fraction \[%\] against time, one curve per run.
pub fn evaporated_fraction_chart(runs: &[LabelledRun], stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let (f, unit) = time_scale(max_time(runs));
    let series = overlay(runs, |run| Ok(run_points(run, &run.history.numbers("time_s")?, &run.history.numbers("evaporated_fraction")?, f, 100.0, 0.0)))?;
    let panel = Panel { x_label: format!("time  [{unit}]"), y_label: "evaporated  [% of initial mass]".into(), series, y_range: Some((0.0, 102.0)), ..Default::default() };
    Ok(single_or_overlay(runs, "Evaporated fraction against time", subtitle, stem, panel))
}

/// A stacked layer: a component or a class, its colour and its values per row.
#[derive(Debug, Clone)]
pub(super) struct Layer {
    name: String,
    color: RGBColor,
    liquid: Vec<f64>,
    vapor: Vec<f64>,
}

/// Components one by one (at most [`MAX_COMPONENTS_UNGROUPED`]) or summed by class; ordered with the most
/// persistent (heaviest) layer first, i.e. at the bottom of a stack.
pub(super) fn layers(run: &SavedRun) -> Result<(Vec<Layer>, bool), OutputError> {
    let h = &run.history;
    let n = h.rows.len();
    let cell = |col: &str| -> Result<Vec<f64>, OutputError> { Ok(h.numbers(col)?.into_iter().map(|v| v.unwrap_or(0.0)).collect()) };
    let grouped = run.components.len() > MAX_COMPONENTS_UNGROUPED;
    let mut out: Vec<Layer> = vec![];
    if grouped {
        for (class, label, color) in CLASSES {
            let members: Vec<&String> = run.components.iter().filter(|(_, c)| c == class || (class.is_empty() && !CLASSES[..8].iter().any(|k| k.0 == c))).map(|(id, _)| id).collect();
            if members.is_empty() {
                continue;
            }
            let mut liquid = vec![0.0; n];
            let mut vapor = vec![0.0; n];
            for id in members {
                for (a, b) in liquid.iter_mut().zip(cell(&format!("Yliq_{id}"))?) {
                    *a += b;
                }
                if h.has(&format!("Yvap_{id}")) {
                    for (a, b) in vapor.iter_mut().zip(cell(&format!("Yvap_{id}"))?) {
                        *a += b;
                    }
                }
            }
            out.push(Layer { name: label.to_string(), color, liquid, vapor });
        }
    } else {
        for (k, (id, _)) in run.components.iter().enumerate() {
            let vapor = if h.has(&format!("Yvap_{id}")) { cell(&format!("Yvap_{id}"))? } else { vec![0.0; n] };
            out.push(Layer { name: id.clone(), color: PALETTE[k % PALETTE.len()], liquid: cell(&format!("Yliq_{id}"))?, vapor });
        }
    }
    // persistence: area under the remaining-mass fraction of the layer against the evaporated fraction
    let evap: Vec<f64> = h.numbers("evaporated_fraction")?.into_iter().map(|v| v.unwrap_or(0.0)).collect();
    let persistence = |l: &Layer| -> f64 {
        let m0 = l.liquid.first().copied().unwrap_or(0.0) * (1.0 - evap.first().copied().unwrap_or(0.0));
        if m0 <= 0.0 {
            return 0.0;
        }
        let mut area = 0.0;
        for i in 1..n {
            let r0 = l.liquid[i - 1] * (1.0 - evap[i - 1]) / m0;
            let r1 = l.liquid[i] * (1.0 - evap[i]) / m0;
            area += 0.5 * (r0 + r1) * (evap[i] - evap[i - 1]);
        }
        area
    };
    let mut keyed: Vec<(f64, usize, Layer)> = out.into_iter().enumerate().map(|(i, l)| (persistence(&l), i, l)).collect();
    keyed.sort_by(|a, b| b.0.partial_cmp(&a.0).unwrap_or(std::cmp::Ordering::Equal).then(a.1.cmp(&b.1)));
    if !grouped {
        // colours follow the volatility order so the same fuel always looks the same
        for (k, item) in keyed.iter_mut().enumerate() {
            item.2.color = PALETTE[k % PALETTE.len()];
        }
    }
    Ok((keyed.into_iter().map(|k| k.2).collect(), grouped))
}

pub(super) fn stacked_legend(layers: &[Layer]) -> Vec<LegendEntry> {
    layers.iter().rev().map(|l| LegendEntry { name: l.name.clone(), color: l.color, stroke: Stroke::Area }).collect()
}

/// Liquid composition (mass %) against evaporated fraction, stacked; grouped by class above 8 components.
pub fn liquid_composition_chart(run: &SavedRun, stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let (layers, grouped) = layers(run)?;
    let evap = run.history.numbers("evaporated_fraction")?;
    let idx = thin(evap.len(), MAX_POINTS);
    let series = layers
        .iter()
        .map(|l| Series { name: l.name.clone(), points: idx.iter().filter_map(|&i| evap[i].map(|x| (100.0 * x, Some(100.0 * l.liquid[i])))).collect(), color: l.color, stroke: Stroke::Area })
        .collect();
    let panel = Panel {
        x_label: "evaporated  [% of initial mass]".into(),
        y_label: "liquid composition  [mass %]".into(),
        series,
        x_range: Some((0.0, 100.0)),
        y_range: Some((0.0, 100.0)),
        stacked: true,
        ..Default::default()
    };
    Ok(Chart {
        stem: stem.into(),
        title: "Liquid composition against evaporated fraction".into(),
        subtitle: subtitle.into(),
        panels: vec![panel],
        columns: 1,
        legend_title: if grouped { "hydrocarbon class".into() } else { "component".into() },
        legend: stacked_legend(&layers),
        size: (1000, 620),
    })
}

/// Composition of the vapour leaving the surface against time: stacked when the fractions are a partition of
/// one (no condensation), lines otherwise; grouped like the liquid chart.
pub fn vapor_composition_chart(run: &SavedRun, stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let (layers, grouped) = layers(run)?;
    let time = run.history.numbers("time_s")?;
    let n = time.len();
    let sums: Vec<f64> = (0..n).map(|i| layers.iter().map(|l| l.vapor[i]).sum()).collect();
    let is_partition = layers.iter().all(|l| l.vapor.iter().all(|v| *v >= -1e-9)) && sums.iter().all(|s| s.abs() < 1e-12 || (s - 1.0).abs() < 1e-3);
    let (f, unit) = time_scale(time.iter().flatten().fold(0.0, |a: f64, b| a.max(*b)));
    let idx = thin(n, MAX_POINTS);
    let series: Vec<Series> = layers
        .iter()
        .map(|l| Series {
            name: l.name.clone(),
            // rows where nothing leaves the surface carry no composition
            points: idx.iter().filter_map(|&i| time[i].map(|t| (t * f, if sums[i].abs() < 1e-12 { None } else { Some(100.0 * l.vapor[i]) }))).collect(),
            color: l.color,
            stroke: if is_partition { Stroke::Area } else { Stroke::Solid },
        })
        .collect();
    let panel = Panel {
        x_label: format!("time  [{unit}]"),
        y_label: "released vapour  [mass %]".into(),
        series,
        y_range: if is_partition { Some((0.0, 100.0)) } else { None },
        stacked: is_partition,
        ..Default::default()
    };
    let mut legend = stacked_legend(&layers);
    if !is_partition {
        for e in &mut legend {
            e.stroke = Stroke::Solid;
        }
    }
    Ok(Chart {
        stem: stem.into(),
        title: "Composition of the released vapour against time".into(),
        subtitle: subtitle.into(),
        panels: vec![panel],
        columns: 1,
        legend_title: if grouped { "hydrocarbon class".into() } else { "component".into() },
        legend,
        size: (1000, 620),
    })
}

/// Residue indicator panels: (column(s), panel title, y label, scale, offset).
pub(super) const RESIDUE_PANELS: [(&[&str], &str, &str, f64, f64); 5] = [
    (&["bubble_point_K", "t50_K"], "Bubble point (solid) and T50 (dashed)", "temperature  [°C]", 1.0, -273.15),
    (&["flash_point_K"], "Flash point", "flash point  [°C]", 1.0, -273.15),
    (&["kinematic_viscosity_minus20C_m2_s"], "Viscosity at −20 °C", "kinematic viscosity  [mm²/s]", 1e6, 0.0),
    (&["density_15C_kg_m3"], "Density at 15 °C", "density  [kg/m³]", 1.0, 0.0),
    (&["dcn"], "Derived cetane number", "DCN  [-]", 1.0, 0.0),
];

/// True when a run's fuel is one pure component: its residual liquid is the same liquid throughout, so the
/// residue indicators stay at their initial values.
pub fn is_pure_fuel(run: &SavedRun) -> bool {
    run.components.len() == 1
}

/// Note shown on a page instead of the residue chart of a pure fuel.
pub const PURE_FUEL_RESIDUE_NOTE: &str = "No residue chart: a single-component fuel does not change as it evaporates, so its residue indicators (bubble point, T50, flash point, viscosity, density, cetane number) stay at their initial values; they are listed in residue.csv and the table above.";

/// Residual-liquid indicators against evaporated fraction, one panel each, from residue.csv; `None` when no run
/// has a residue table. (A single pure-fuel run gets no residue chart: see [`write_run_charts`].)
pub fn residue_chart(runs: &[LabelledRun], stem: &str, subtitle: &str) -> Result<Option<Chart>, OutputError> {
    let with: Vec<(usize, &LabelledRun)> = runs.iter().enumerate().filter(|(_, r)| r.run.residue.is_some()).collect();
    if with.is_empty() {
        return Ok(None);
    }
    let mut panels = vec![];
    for (cols, title, ylabel, scale, offset) in RESIDUE_PANELS {
        let mut series = vec![];
        for (k, col) in cols.iter().enumerate() {
            for (i, r) in &with {
                let t = r.run.residue.as_ref().unwrap();
                if !t.has(col) || !t.has("evaporated_fraction") {
                    continue;
                }
                let x = t.numbers("evaporated_fraction")?;
                let y = t.numbers(col)?;
                let (color, stroke) = if runs.len() > 1 { palette(*i) } else { (PALETTE[k], Stroke::Solid) };
                let stroke = if k == 1 { Stroke::Dashed } else { stroke };
                series.push(Series { name: r.label.to_string(), points: run_points(r.run, &x, &y, 100.0, scale, offset), color, stroke });
            }
        }
        if series.is_empty() {
            continue;
        }
        panels.push(Panel { title: title.into(), x_label: "evaporated  [%]".into(), y_label: ylabel.into(), series, x_range: Some((0.0, 100.0)), ..Default::default() });
    }
    if panels.is_empty() {
        return Ok(None);
    }
    // one run: the first panel's title names its two curves, so no legend is needed
    let legend: Vec<LegendEntry> = if runs.len() > 1 { run_legend(runs).into_iter().enumerate().filter(|(i, _)| with.iter().any(|(j, _)| j == i)).map(|(_, e)| e).collect() } else { vec![] };
    Ok(Some(Chart {
        stem: stem.into(),
        title: "Residual liquid against evaporated fraction".into(),
        subtitle: subtitle.into(),
        panels,
        columns: 3,
        legend_title: if runs.len() > 1 { "run".into() } else { String::new() },
        legend,
        size: (1300, 820),
    }))
}
