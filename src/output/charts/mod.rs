//! Charts drawn from saved results (history.csv, summary.json, residue.csv, property tables), each written as
//! PNG and SVG. Fonts are compiled into the binary (Noto Sans via the `notosans` crate), so drawing needs no
//! system font packages. Charts only read results; they never compute physics.

use std::path::{Path, PathBuf};
use std::sync::OnceLock;

use plotters::coord::ranged1d::{Ranged, SegmentValue};
use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use plotters::style::{register_font, FontStyle};
use plotters_backend::{BackendColor, BackendCoord, BackendTextStyle, DrawingErrorKind};

use super::read::{CsvData, SavedRun};

mod axes;
mod figure;
mod heatmap;
mod profiles;
mod raster;
mod runs;
mod table_charts;
mod text;

pub use axes::*;
pub use figure::*;
pub use heatmap::*;
pub use text::*;
pub use profiles::*;
pub use runs::*;
pub use table_charts::*;
use raster::*;

use super::{write_atomic, OutputError};

/// Font family name every text element uses (registered with the built-in Noto Sans).
const FONT: &str = "sans-serif";
/// At most this many components are drawn one by one; more are grouped by hydrocarbon class.
pub const MAX_COMPONENTS_UNGROUPED: usize = 8;
/// Curves are thinned to at most this many points (evenly spaced rows, first and last kept).
const MAX_POINTS: usize = 800;
/// Length of the axis tick marks \[image px\] (plotters' default, set explicitly so it scales with the canvas).
const TICK_MARK: u32 = 5;

const TEXT: RGBColor = RGBColor(34, 34, 34);
const MUTED: RGBColor = RGBColor(96, 96, 96);
const GRID_BOLD: RGBColor = RGBColor(218, 218, 218);
const GRID_LIGHT: RGBColor = RGBColor(240, 240, 240);

/// Qualitative palette for runs and components (our own picks, distinguishable on white).
const PALETTE: [RGBColor; 10] = [
    RGBColor(31, 95, 168),
    RGBColor(217, 84, 30),
    RGBColor(46, 158, 72),
    RGBColor(142, 68, 173),
    RGBColor(201, 161, 0),
    RGBColor(23, 162, 184),
    RGBColor(214, 96, 170),
    RGBColor(110, 110, 110),
    RGBColor(140, 86, 75),
    RGBColor(11, 46, 89),
];

/// Hydrocarbon classes in display order, with plural labels and fixed colours (so fuels compare at a glance).
const CLASSES: [(&str, &str, RGBColor); 9] = [
    ("n-alkane", "n-alkanes", RGBColor(31, 95, 168)),
    ("iso-alkane", "iso-alkanes", RGBColor(120, 172, 222)),
    ("monocycloalkane", "monocycloalkanes", RGBColor(46, 158, 72)),
    ("dicycloalkane", "dicycloalkanes", RGBColor(150, 205, 120)),
    ("alkylbenzene", "alkylbenzenes", RGBColor(230, 130, 40)),
    ("cycloaromatic", "cycloaromatics", RGBColor(200, 60, 50)),
    ("diaromatic", "diaromatics", RGBColor(120, 40, 40)),
    ("oxygenate", "oxygenates", RGBColor(142, 68, 173)),
    ("", "unclassified", RGBColor(150, 150, 150)),
];

fn chart_err(path: &Path, message: impl Into<String>) -> OutputError {
    OutputError::Chart { path: path.display().to_string(), message: message.into() }
}

fn de<E: std::fmt::Debug>(e: E) -> String {
    format!("{e:?}")
}

/// One chart written in both formats.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartFiles {
    /// File stem (without extension).
    pub stem: String,
    /// Chart title.
    pub title: String,
    /// The PNG file.
    pub png: PathBuf,
    /// The SVG file.
    pub svg: PathBuf,
}

/// How a curve is stroked.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Stroke {
    /// Solid line.
    Solid,
    /// Dashed line.
    Dashed,
    /// Filled area (stacked charts).
    Area,
}

/// One curve: points with gaps (`None`), a colour and a stroke.
#[derive(Debug, Clone)]
pub struct Series {
    /// Name shown in the legend.
    pub name: String,
    /// (x, y) points in display units; `None` breaks the line.
    pub points: Vec<(f64, Option<f64>)>,
    /// Colour.
    pub color: RGBColor,
    /// Stroke.
    pub stroke: Stroke,
}

/// A shaded band between a lower and an upper curve (e.g. the 5–95 % band of sampled runs).
#[derive(Debug, Clone)]
pub struct Band {
    /// Name (for the reader of the code; legends are built separately).
    pub name: String,
    /// (x, (lower, upper)) points in display units; `None` breaks the band.
    pub points: Vec<(f64, Option<(f64, f64)>)>,
    /// Colour (drawn translucent).
    pub color: RGBColor,
}

/// One set of axes.
#[derive(Debug, Clone, Default)]
pub struct Panel {
    /// Panel title (empty for single-panel charts).
    pub title: String,
    /// x-axis label with unit.
    pub x_label: String,
    /// y-axis label with unit.
    pub y_label: String,
    /// Curves (for a stacked panel: layer thicknesses, bottom first).
    pub series: Vec<Series>,
    /// Fixed x range, else from the data.
    pub x_range: Option<(f64, f64)>,
    /// Fixed y range, else from the data.
    pub y_range: Option<(f64, f64)>,
    /// Start the y axis at zero.
    pub y_from_zero: bool,
    /// Draw the series as stacked areas.
    pub stacked: bool,
    /// Add a right-hand axis in °C (the y data are in K).
    pub celsius_axis: bool,
    /// Shaded bands, drawn under the curves.
    pub bands: Vec<Band>,
    /// Logarithmic y axis (decades); values that are not positive are left out.
    pub y_log: bool,
}

/// One legend line.
#[derive(Debug, Clone)]
pub struct LegendEntry {
    /// Text.
    pub name: String,
    /// Colour.
    pub color: RGBColor,
    /// Swatch kind.
    pub stroke: Stroke,
}

/// A chart: title, optional subtitle, one or more panels on a grid, and a legend to the right.
#[derive(Debug, Clone)]
pub struct Chart {
    /// File stem.
    pub stem: String,
    /// Title.
    pub title: String,
    /// Subtitle (conditions), may be empty.
    pub subtitle: String,
    /// Panels, drawn row by row.
    pub panels: Vec<Panel>,
    /// Panels per row.
    pub columns: usize,
    /// Legend heading, may be empty.
    pub legend_title: String,
    /// Legend entries, top to bottom.
    pub legend: Vec<LegendEntry>,
    /// Image size \[px\].
    pub size: (u32, u32),
}

/// A value over a grid of two swept variables, for [`lifetime_map`].
#[derive(Debug, Clone)]
pub struct GridMap {
    /// Chart title.
    pub title: String,
    /// Subtitle, may be empty.
    pub subtitle: String,
    /// x-axis label with unit, e.g. "ambient temperature \[K\]".
    pub x_label: String,
    /// y-axis label with unit, e.g. "initial diameter \[µm\]".
    pub y_label: String,
    /// Label of the mapped value with unit, e.g. "lifetime \[ms\]".
    pub value_label: String,
    /// The swept x values, increasing, in display units.
    pub x: Vec<f64>,
    /// The swept y values, increasing, in display units.
    pub y: Vec<f64>,
    /// `values[j][i]` belongs to `(x[i], y[j])`, in display units; `None` when the case has no value.
    pub values: Vec<Vec<Option<f64>>>,
}

/// File stems of the per-run charts, in page order.
pub const RUN_CHARTS: [&str; 5] = ["chart_d2", "chart_surface_temperature", "chart_liquid_composition", "chart_vapor_composition", "chart_residue"];

/// Draw every chart of one run folder beside its data; the residue chart only when residue.csv exists and the
/// fuel has more than one component (a pure fuel's residue indicators are flat lines; the run page says so
/// with [`PURE_FUEL_RESIDUE_NOTE`]). Comparison charts keep pure fuels: there their level is the information.
pub fn write_run_charts(run: &SavedRun) -> Result<Vec<ChartFiles>, OutputError> {
    let sub = run_subtitle(run);
    let label = run.fuel_name();
    let one = [LabelledRun { label: &label, run }];
    let mut charts = vec![
        d2_chart(&one, RUN_CHARTS[0], &sub)?,
        surface_temperature_chart(&one, RUN_CHARTS[1], &sub)?,
        liquid_composition_chart(run, RUN_CHARTS[2], &sub)?,
        vapor_composition_chart(run, RUN_CHARTS[3], &sub)?,
    ];
    if !is_pure_fuel(run) {
        if let Some(c) = residue_chart(&one, RUN_CHARTS[4], &sub)? {
            charts.push(c);
        }
    }
    let has_residue = charts.len() == 5;
    remove_stale(&run.dir, RUN_CHARTS[4], !has_residue);
    let profiles = radial_profile_chart(run, PROFILE_CHART, &sub)?;
    remove_stale(&run.dir, PROFILE_CHART, profiles.is_none());
    charts.extend(profiles);
    charts.iter().map(|c| write_chart(&run.dir, c)).collect()
}

/// Draw the overlay charts of a group of runs into `dir`, with file stems starting with `prefix`.
pub fn write_comparison_charts(dir: &Path, prefix: &str, subtitle: &str, runs: &[LabelledRun]) -> Result<Vec<ChartFiles>, OutputError> {
    let mut charts = vec![
        d2_chart(runs, &format!("{prefix}_d2"), subtitle)?,
        surface_temperature_chart(runs, &format!("{prefix}_surface_temperature"), subtitle)?,
        evaporated_fraction_chart(runs, &format!("{prefix}_evaporated"), subtitle)?,
    ];
    let residue_stem = format!("{prefix}_residue");
    match residue_chart(runs, &residue_stem, subtitle)? {
        Some(c) => charts.push(c),
        None => remove_stale(dir, &residue_stem, true),
    }
    charts.iter().map(|c| write_chart(dir, c)).collect()
}

/// Remove a chart left over from an earlier drawing whose data are now gone.
fn remove_stale(dir: &Path, stem: &str, stale: bool) {
    if stale {
        for ext in ["png", "svg"] {
            let _ = std::fs::remove_file(dir.join(format!("{stem}.{ext}")));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn log_axes_end_at_the_next_one_two_five_value() {
        let panel = |values: &[f64]| Panel { y_log: true, series: vec![Series { name: "p".into(), points: values.iter().enumerate().map(|(i, v)| (i as f64, Some(*v))).collect(), color: TEXT, stroke: Stroke::Solid }], ..Default::default() };
        let range = |values: &[f64]| {
            let (lo, hi) = log_range(&panel(values));
            (10f64.powf(lo), 10f64.powf(hi))
        };
        // vapour pressure 0.03 to 101 kPa: the axis ends at 200 kPa, not 1000
        let (lo, hi) = range(&[0.03, 1.0, 101.0]);
        assert!((hi - 200.0).abs() < 1e-9 && (lo - 0.02).abs() < 1e-12, "{lo} {hi}");
        // a value just above a decade keeps a margin; exact 1-2-5 values get their 5 % margin too
        let (_, hi) = range(&[1.0, 95.0]);
        assert!((hi - 100.0).abs() < 1e-9);
        let (_, hi) = range(&[1.0, 100.0]);
        assert!((hi - 200.0).abs() < 1e-9);
        // a narrow span still shows a whole decade, so at least one labelled tick
        let (lo, hi) = range(&[60.0, 90.0]);
        assert!((hi / lo - 10.0).abs() < 1e-9 && lo < 100.0 && hi >= 100.0);
    }

    #[test]
    fn one_outlier_does_not_swamp_the_colour_scale() {
        // 24 lifetimes between 10 and 33 ms and one droplet that took 5 s
        let mut values: Vec<f64> = (0..24).map(|i| 10.0 + i as f64).collect();
        values.push(5000.0);
        let s = colour_scale(&values);
        assert_eq!((s.low, s.high, s.above, s.below), (10.0, 33.0, 1, 0));
        // an even spread keeps its full range
        let even: Vec<f64> = (0..25).map(|i| 10.0 + 40.0 * i as f64).collect();
        let s = colour_scale(&even);
        assert_eq!((s.low, s.high, s.above, s.below), (10.0, 970.0, 0, 0));
        // a small map keeps its full range; a flat map gets a visible span
        assert_eq!(colour_scale(&[1.0, 2.0, 100.0]).high, 100.0);
        let flat = colour_scale(&[5.0; 10]);
        assert!(flat.low < 5.0 && flat.high > 5.0);
    }

    #[test]
    fn tick_decimals_follow_the_step() {
        assert_eq!(tick_decimals((0.0, 2.4), 10), 1);
        assert_eq!(tick_decimals((0.0, 100.0), 10), 0);
        assert_eq!(tick_decimals((300.0, 520.0), 8), 0);
        assert_eq!(tick_decimals((0.0, 0.012), 6), 3);
        assert_eq!(tick_decimals((300.0, 300.06), 8), 2);
        assert_eq!(tick_decimals((0.0, 10.0), 10), 0);
        assert_eq!(format_tick(-0.0001, 2), "0.00");
        assert_eq!(format_tick(-1.5, 1), "−1.5");
    }

    #[test]
    fn micrometres_have_one_spelling() {
        assert_eq!(micrometre_text("initial-diameter=30um"), "initial-diameter=30µm");
        assert_eq!(micrometre_text("d0 = 30 um, 45um"), "d0 = 30 µm, 45µm");
        assert_eq!(micrometre_text("umbrella 3umx drum"), "umbrella 3umx drum");
        assert_eq!(micrometre_text("sum 10 µm"), "sum 10 µm");
    }

    #[test]
    fn log_axis_labels_whole_decades() {
        assert_eq!(decade_label(2.0), "100");
        assert_eq!(decade_label(0.0), "1");
        assert_eq!(decade_label(-2.0), "0.01");
        assert_eq!(decade_label(0.5), "");
        let p = Panel { y_log: true, series: vec![Series { name: "p".into(), points: vec![(300.0, Some(0.2)), (400.0, Some(-1.0)), (500.0, Some(350.0))], color: PALETTE[0], stroke: Stroke::Solid }], ..Default::default() };
        let (lo, hi) = log_range(&p);
        assert_eq!(lo, -1.0);
        assert!((hi - 500f64.log10()).abs() < 1e-12, "{hi}");
    }

    #[test]
    fn line_panels_keep_a_margin_inside_the_frame() {
        let p = Panel { x_range: Some((0.0, 100.0)), y_range: Some((0.0, 1.0)), series: vec![Series { name: "a".into(), points: vec![(0.0, Some(0.0)), (100.0, Some(1.0))], color: PALETTE[0], stroke: Stroke::Solid }], ..Default::default() };
        let (xr, yr) = panel_ranges(&p);
        assert!(xr.0 < 0.0 && xr.1 > 100.0 && yr.0 < 0.0 && yr.1 > 1.0, "{xr:?} {yr:?}");
        assert!(xr.1 - xr.0 < 105.0);
        let stacked = Panel { stacked: true, ..p };
        assert_eq!(panel_ranges(&stacked), ((0.0, 100.0), (0.0, 1.0)));
    }

    #[test]
    fn exact_decimals_show_sweep_values() {
        assert_eq!(exact_decimals(&[500.0, 800.0, 1100.0]), 0);
        assert_eq!(exact_decimals(&[0.5, 1.25, 2.0]), 2);
        assert_eq!(exact_decimals(&[0.0, 0.1]), 1);
    }

    #[test]
    fn at_least_four_ticks() {
        let n = enough_ticks((786.0, 798.5), 6);
        assert!(ticks((786.0, 798.5), n).len() >= 4);
        assert_eq!(enough_ticks((0.0, 100.0), 6), 6);
    }

    #[test]
    fn thinning_keeps_ends() {
        let idx = thin(10_000, 800);
        assert_eq!(idx.first(), Some(&0));
        assert_eq!(idx.last(), Some(&9_999));
        assert!(idx.len() <= 800);
        assert_eq!(thin(5, 800), vec![0, 1, 2, 3, 4]);
    }

    #[test]
    fn column_units_are_recognised() {
        assert_eq!(column_display("density_kg_m3"), ("density".into(), "kg/m³".into(), 1.0));
        assert_eq!(column_display("kinematic_viscosity_m2_s").1, "mm²/s");
        assert_eq!(column_display("latent_heat_J_kg"), ("latent heat".into(), "kJ/kg".into(), 1e-3));
        assert_eq!(column_display("dcn").1, "-");
    }

    #[test]
    fn time_scale_picks_readable_units() {
        assert_eq!(time_scale(0.0001).1, "µs");
        assert_eq!(time_scale(0.0005).1, "ms");
        assert_eq!(time_scale(0.003).1, "ms");
        assert_eq!(time_scale(2.0).1, "ms");
        assert_eq!(time_scale(40.0).1, "s");
    }

    #[test]
    fn heat_colors_span_the_scale() {
        assert_eq!(heat_color(0.0), RGBColor(38, 24, 96));
        assert_eq!(heat_color(1.0), RGBColor(246, 222, 62));
        assert_eq!(heat_color(f64::NAN), RGBColor(38, 24, 96));
    }

    fn scratch(name: &str) -> PathBuf {
        match std::env::var_os("DROPCUT_CHART_DIR") {
            Some(d) => PathBuf::from(d).join(name),
            None => std::env::temp_dir().join(format!("dropcut-{name}-{}", std::process::id())),
        }
    }

    #[test]
    fn property_table_draws_one_panel_per_column() {
        let dir = scratch("table");
        std::fs::create_dir_all(&dir).unwrap();
        let mut text = String::from("# property table of a test liquid\ntemperature_K,density_kg_m3,viscosity_Pa_s,surface_tension_N_m,latent_heat_J_kg,vapor_pressure_Pa,note\n");
        for k in 0..15 {
            let t = 280.0 + 20.0 * k as f64;
            text.push_str(&format!("{t},{},{},{},{},{},x\n", 1000.0 - 0.8 * t, 1e-3 * (1500.0 / t - 5.0).exp(), 0.03 - 4e-5 * (t - 280.0), 4e5 - 300.0 * (t - 280.0), 1e5 * (12.0 - 4500.0 / t).exp()));
        }
        std::fs::write(dir.join("props.csv"), text).unwrap();
        let files = table_vs_temperature(&dir.join("props.csv"), &dir, "chart_props", "Test liquid properties").unwrap();
        let svg = std::fs::read_to_string(&files.svg).unwrap();
        assert!(svg.starts_with("<svg") && svg.contains("Test liquid properties"));
        for name in ["density", "viscosity", "surface tension", "latent heat", "vapor pressure", "mPa·s", "mN/m", "kJ/kg"] {
            assert!(svg.contains(name), "{name}");
        }
        assert!(!svg.contains(">note<"));
        assert!(svg.contains("[kPa], log scale"), "vapour pressure on a log axis");
        let png = std::fs::read(&files.png).unwrap();
        assert_eq!(&png[1..4], b"PNG");
        if std::env::var_os("DROPCUT_CHART_DIR").is_none() {
            let _ = std::fs::remove_dir_all(&dir);
        }
    }

    #[test]
    fn lifetime_map_draws_png_and_svg_and_rejects_bad_grids() {
        let dir = scratch("map");
        let map = GridMap {
            title: "Lifetime over ambient temperature and diameter".into(),
            subtitle: "test grid".into(),
            x_label: "ambient temperature  [K]".into(),
            y_label: "initial diameter  [µm]".into(),
            value_label: "lifetime  [ms]".into(),
            x: vec![500.0, 800.0, 1100.0],
            y: vec![20.0, 50.0],
            values: vec![vec![Some(9.1), Some(3.2), Some(2.0)], vec![Some(55.0), None, Some(12.5)]],
        };
        let files = lifetime_map(&dir, "map", &map).unwrap();
        let png = std::fs::read(&files.png).unwrap();
        assert_eq!(&png[..8], b"\x89PNG\r\n\x1a\n");
        assert_eq!(u32::from_be_bytes(png[16..20].try_into().unwrap()), 940);
        let svg = std::fs::read_to_string(&files.svg).unwrap();
        assert!(svg.starts_with("<svg"));
        assert!(svg.contains("Lifetime over ambient temperature and diameter"));
        assert!(svg.contains("n/a"));
        let mut bad = map.clone();
        bad.values.pop();
        assert!(lifetime_map(&dir, "bad", &bad).is_err());
        let mut bad = map.clone();
        bad.x = vec![800.0, 500.0, 1100.0];
        assert!(lifetime_map(&dir, "bad", &bad).is_err());
        if std::env::var_os("DROPCUT_CHART_DIR").is_none() {
            let _ = std::fs::remove_dir_all(&dir);
        }
    }
}
