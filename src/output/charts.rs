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
use super::{write_replace, OutputError};

/// Font family name every text element uses (registered with the built-in Noto Sans).
const FONT: &str = "sans-serif";
/// At most this many components are drawn one by one; more are grouped by hydrocarbon class.
pub const MAX_COMPONENTS_UNGROUPED: usize = 8;
/// Curves are thinned to at most this many points (evenly spaced rows, first and last kept).
const MAX_POINTS: usize = 800;

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

/// Register the built-in fonts under the family name the charts use; safe to call many times.
pub fn register_fonts() -> Result<(), OutputError> {
    static DONE: OnceLock<bool> = OnceLock::new();
    let ok = *DONE.get_or_init(|| {
        register_font(FONT, FontStyle::Normal, notosans::REGULAR_TTF).is_ok() && register_font(FONT, FontStyle::Bold, notosans::BOLD_TTF).is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(chart_err(Path::new("(built-in font)"), "the built-in font could not be loaded"))
    }
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
    /// Image size [px].
    pub size: (u32, u32),
}

/// A value over a grid of two swept variables, for [`lifetime_map`].
#[derive(Debug, Clone)]
pub struct GridMap {
    /// Chart title.
    pub title: String,
    /// Subtitle, may be empty.
    pub subtitle: String,
    /// x-axis label with unit, e.g. "ambient temperature [K]".
    pub x_label: String,
    /// y-axis label with unit, e.g. "initial diameter [µm]".
    pub y_label: String,
    /// Label of the mapped value with unit, e.g. "lifetime [ms]".
    pub value_label: String,
    /// The swept x values, increasing, in display units.
    pub x: Vec<f64>,
    /// The swept y values, increasing, in display units.
    pub y: Vec<f64>,
    /// `values[j][i]` belongs to `(x[i], y[j])`, in display units; `None` when the case has no value.
    pub values: Vec<Vec<Option<f64>>>,
}

enum Figure<'a> {
    Chart(&'a Chart),
    Map(&'a GridMap),
}

// ---------------------------------------------------------------------------------------------
// Writing

fn save(dir: &Path, stem: &str, title: &str, size: (u32, u32), fig: Figure) -> Result<ChartFiles, OutputError> {
    register_fonts()?;
    super::ensure_dir(dir)?;
    let svg_path = dir.join(format!("{stem}.svg"));
    let png_path = dir.join(format!("{stem}.png"));
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, size).into_drawing_area();
        draw_figure(&root, &fig).map_err(|m| chart_err(&svg_path, m))?;
        root.present().map_err(|e| chart_err(&svg_path, de(e)))?;
    }
    write_replace(&svg_path, svg.as_bytes())?;
    // The bitmap encoder picks the format from the extension: the temporary name must end in .png.
    let tmp = super::temp_path(&png_path, ".", ".png");
    {
        let root = CrispText(BitMapBackend::new(&tmp, size)).into_drawing_area();
        draw_figure(&root, &fig).map_err(|m| chart_err(&png_path, m))?;
        root.present().map_err(|e| chart_err(&png_path, de(e)))?;
    }
    super::check_file_target(&png_path)?;
    if let Err(e) = std::fs::rename(&tmp, &png_path) {
        let _ = std::fs::remove_file(&tmp);
        return Err(chart_err(&png_path, e.to_string()));
    }
    super::remove_stale_temps_of(&png_path, ".", ".png");
    Ok(ChartFiles { stem: stem.into(), title: title.into(), png: png_path, svg: svg_path })
}

/// Draw a chart into `dir` as `<stem>.png` and `<stem>.svg`.
pub fn write_chart(dir: &Path, chart: &Chart) -> Result<ChartFiles, OutputError> {
    save(dir, &chart.stem, &chart.title, chart.size, Figure::Chart(chart))
}

fn draw_figure<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, fig: &Figure) -> Result<(), String> {
    match fig {
        Figure::Chart(c) => draw_chart(root, c),
        Figure::Map(m) => draw_map(root, m),
    }
}

// ---------------------------------------------------------------------------------------------
// PNG text

/// A bitmap backend wrapper that draws text itself: plotters' ab_glyph path drops each glyph's side bearing
/// and rounds every glyph to whole pixels on its own, which spaces letters unevenly ("tim e"). This places
/// glyphs at sub-pixel positions along the advance widths plotters measures, and puts the anchor at the cap
/// height (centre), cap top (top) or descender (bottom), like the SVG backend's `dy` offsets.
struct CrispText<DB>(DB);

fn glyph_fonts() -> &'static (ab_glyph::FontRef<'static>, ab_glyph::FontRef<'static>) {
    static FONTS: OnceLock<(ab_glyph::FontRef<'static>, ab_glyph::FontRef<'static>)> = OnceLock::new();
    // register_fonts() has already parsed the same bytes successfully before any drawing starts
    FONTS.get_or_init(|| {
        (
            ab_glyph::FontRef::try_from_slice(notosans::REGULAR_TTF).expect("built-in font parses"),
            ab_glyph::FontRef::try_from_slice(notosans::BOLD_TTF).expect("built-in font parses"),
        )
    })
}

impl<DB: DrawingBackend> DrawingBackend for CrispText<DB> {
    type ErrorType = DB::ErrorType;

    fn get_size(&self) -> (u32, u32) {
        self.0.get_size()
    }
    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.ensure_prepared()
    }
    fn present(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.present()
    }
    fn draw_pixel(&mut self, point: BackendCoord, color: BackendColor) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_pixel(point, color)
    }
    fn draw_line<S: plotters_backend::BackendStyle>(&mut self, from: BackendCoord, to: BackendCoord, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_line(from, to, style)
    }
    fn draw_rect<S: plotters_backend::BackendStyle>(&mut self, upper_left: BackendCoord, bottom_right: BackendCoord, style: &S, fill: bool) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_rect(upper_left, bottom_right, style, fill)
    }
    fn draw_path<S: plotters_backend::BackendStyle, I: IntoIterator<Item = BackendCoord>>(&mut self, path: I, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_path(path, style)
    }
    fn draw_circle<S: plotters_backend::BackendStyle>(&mut self, center: BackendCoord, radius: u32, style: &S, fill: bool) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.draw_circle(center, radius, style, fill)
    }
    fn fill_polygon<S: plotters_backend::BackendStyle, I: IntoIterator<Item = BackendCoord>>(&mut self, vert: I, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.fill_polygon(vert, style)
    }
    fn blit_bitmap(&mut self, pos: BackendCoord, size: (u32, u32), src: &[u8]) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.0.blit_bitmap(pos, size, src)
    }

    fn draw_text<TStyle: BackendTextStyle>(&mut self, text: &str, style: &TStyle, pos: BackendCoord) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        use ab_glyph::{Font, ScaleFont};
        let color = style.color();
        if color.alpha == 0.0 || text.is_empty() {
            return Ok(());
        }
        let (regular, bold) = glyph_fonts();
        let font = if matches!(style.style(), FontStyle::Bold) { bold } else { regular };
        let scaled = font.as_scaled(style.size() as f32);
        // advance widths with kerning, as plotters measures them
        let mut xs = Vec::with_capacity(text.len());
        let mut x = 0f32;
        let mut prev = None;
        for c in text.chars() {
            let id = scaled.glyph_id(c);
            if let Some(p) = prev {
                x += scaled.kern(p, id);
            }
            xs.push((id, x));
            x += scaled.h_advance(id);
            prev = Some(id);
        }
        let width = x;
        let cap = {
            let h = scaled.glyph_id('H');
            font.outline_glyph(h.with_scale_and_position(scaled.scale(), ab_glyph::point(0.0, 0.0))).map(|g| -g.px_bounds().min.y).unwrap_or(0.7 * scaled.ascent())
        };
        let x0 = match style.anchor().h_pos {
            HPos::Left => 0.0,
            HPos::Center => -width / 2.0,
            HPos::Right => -width,
        };
        let baseline = match style.anchor().v_pos {
            VPos::Top => cap,
            VPos::Center => cap / 2.0,
            VPos::Bottom => scaled.descent(),
        };
        let trans = style.transform();
        let (w, h) = self.0.get_size();
        let mut result = Ok(());
        for (id, gx) in xs {
            let glyph = id.with_scale_and_position(scaled.scale(), ab_glyph::point(x0 + gx, baseline));
            let Some(outline) = font.outline_glyph(glyph) else { continue };
            let b = outline.px_bounds();
            let inner = &mut self.0;
            outline.draw(|px, py, coverage| {
                if result.is_err() || coverage < 1.0 / 255.0 {
                    return;
                }
                let (dx, dy) = trans.transform(b.min.x as i32 + px as i32, b.min.y as i32 + py as i32);
                let (X, Y) = (pos.0 + dx, pos.1 + dy);
                if X >= 0 && Y >= 0 && (X as u32) < w && (Y as u32) < h {
                    let c = BackendColor { alpha: color.alpha * coverage.min(1.0) as f64, rgb: color.rgb };
                    result = inner.draw_pixel((X, Y), c);
                }
            });
            if result.is_err() {
                break;
            }
        }
        result
    }
}

// ---------------------------------------------------------------------------------------------
// Axis helpers

/// Tick positions plotters will use for a range and label count.
fn ticks(range: (f64, f64), n: usize) -> Vec<f64> {
    RangedCoordf64::from(range.0..range.1).key_points(n)
}

/// Smallest label count, from `n` up, that gives at least four ticks (a 1-2-5 step can leave only two).
fn enough_ticks(range: (f64, f64), n: usize) -> usize {
    (n..=n + 8).find(|&k| ticks(range, k).len() >= 4).unwrap_or(n)
}

/// Decimals that show the tick step exactly (steps are 1, 2 or 5 × 10^k).
fn tick_decimals(range: (f64, f64), n: usize) -> usize {
    let t = ticks(range, n);
    let step = if t.len() >= 2 { (t[1] - t[0]).abs() } else { (range.1 - range.0).abs().max(1e-12) };
    let d = (-(step.log10()) - 1e-9).ceil();
    if d.is_finite() && d > 0.0 {
        (d as usize).min(8)
    } else {
        0
    }
}

fn format_tick(v: f64, decimals: usize) -> String {
    let s = format!("{:.*}", decimals, v);
    // "-0" and "-0.00" read badly
    if s.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
        s.trim_start_matches('-').to_string()
    } else {
        s.replace('-', "−")
    }
}

/// Range of finite values with padding; degenerate ranges are widened.
fn padded_range(values: impl Iterator<Item = f64>, pad: f64, from_zero: bool) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in values.filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    if from_zero {
        lo = lo.min(0.0);
    }
    let span = hi - lo;
    if span <= 1e-12 * hi.abs().max(1.0) {
        let w = if hi.abs() > 0.0 { 0.05 * hi.abs() } else { 1.0 };
        return (lo - w, hi + w);
    }
    let lo2 = if from_zero && lo >= 0.0 { lo } else { lo - pad * span };
    (lo2, hi + pad * span)
}

/// Time axis scale for a largest time [s]: (factor, unit).
pub fn time_scale(max_time: f64) -> (f64, &'static str) {
    if max_time < 2e-4 {
        (1e6, "µs")
    } else if max_time < 20.0 {
        (1e3, "ms")
    } else {
        (1.0, "s")
    }
}

/// Indices of at most `max` evenly spaced rows, always keeping the first and the last.
fn thin(n: usize, max: usize) -> Vec<usize> {
    if n <= max || max < 2 {
        return (0..n).collect();
    }
    let mut idx: Vec<usize> = (0..max).map(|k| k * (n - 1) / (max - 1)).collect();
    idx.dedup();
    idx
}

/// One spelling for micrometres in chart text: a number followed by "um" (e.g. a run label "d0=30um" typed
/// on the command line) is shown with "µm"; other words are left alone.
pub fn micrometre_text(s: &str) -> String {
    let c: Vec<char> = s.chars().collect();
    let mut out = String::with_capacity(s.len() + 2);
    let mut i = 0;
    while i < c.len() {
        let after_number = {
            let mut j = i;
            while j > 0 && c[j - 1] == ' ' {
                j -= 1;
            }
            j > 0 && c[j - 1].is_ascii_digit()
        };
        let ends = c.get(i + 2).is_none_or(|n| !n.is_alphanumeric());
        if c[i] == 'u' && c.get(i + 1) == Some(&'m') && after_number && ends {
            out.push('µ');
            out.push('m');
            i += 2;
        } else {
            out.push(c[i]);
            i += 1;
        }
    }
    out
}

fn truncate_label(s: &str, max_chars: usize) -> String {
    if s.chars().count() <= max_chars {
        s.to_string()
    } else {
        let mut t: String = s.chars().take(max_chars - 1).collect();
        t.push('…');
        t
    }
}

/// Colour of the i-th run in overlays (the palette the run charts use).
pub fn run_color(i: usize) -> RGBColor {
    PALETTE[i % PALETTE.len()]
}

/// `color` blended with white (share of the colour in [0, 1]): a legend swatch for a translucent band.
pub fn lighter(color: RGBColor, share: f64) -> RGBColor {
    let m = |c: u8| (f64::from(c) * share + 255.0 * (1.0 - share)).round().clamp(0.0, 255.0) as u8;
    RGBColor(m(color.0), m(color.1), m(color.2))
}

fn palette(i: usize) -> (RGBColor, Stroke) {
    (PALETTE[i % PALETTE.len()], if (i / PALETTE.len()) % 2 == 1 { Stroke::Dashed } else { Stroke::Solid })
}

// ---------------------------------------------------------------------------------------------
// Drawing

fn text_width<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, text: &str, size: u32) -> u32 {
    root.estimate_text_size(text, &TextStyle::from((FONT, size).into_font())).map(|(w, _)| w).unwrap_or(8 * text.len() as u32)
}

fn draw_title<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, title: &str, subtitle: &str) -> Result<u32, String> {
    let (w, _) = root.dim_in_pixel();
    let title_style = TextStyle::from((FONT, 28).into_font().style(FontStyle::Bold)).color(&TEXT).pos(Pos::new(HPos::Center, VPos::Top));
    root.draw_text(title, &title_style, (w as i32 / 2, 10)).map_err(de)?;
    if subtitle.is_empty() {
        return Ok(50);
    }
    let mut sub = subtitle.to_string();
    let mut size = 19;
    while text_width(root, &sub, size) + 40 > w && size > 14 {
        size -= 1;
    }
    while text_width(root, &sub, size) + 40 > w && sub.chars().count() > 10 {
        sub = truncate_label(&sub, sub.chars().count() - 4);
    }
    root.draw_text(&sub, &TextStyle::from((FONT, size).into_font()).color(&MUTED).pos(Pos::new(HPos::Center, VPos::Top)), (w as i32 / 2, 48)).map_err(de)?;
    Ok(80)
}

fn legend_width<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &Chart) -> u32 {
    if c.legend.is_empty() {
        return 0;
    }
    let mut w = text_width(root, &c.legend_title, 18);
    for e in &c.legend {
        w = w.max(text_width(root, &truncate_label(&micrometre_text(&e.name), 34), 17) + 44);
    }
    (w + 24).clamp(120, 380)
}

fn draw_legend<DB: DrawingBackend>(area: &DrawingArea<DB, Shift>, c: &Chart) -> Result<(), String> {
    let (_, h) = area.dim_in_pixel();
    let mut y = 12i32;
    if !c.legend_title.is_empty() {
        let st = TextStyle::from((FONT, 18).into_font().style(FontStyle::Bold)).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Top));
        area.draw_text(&c.legend_title, &st, (8, y)).map_err(de)?;
        y += 30;
    }
    let avail = h as i32 - y - 10;
    let n = c.legend.len() as i32;
    let mut row = 27;
    let mut size = 17;
    if n * row > avail {
        row = (avail / n.max(1)).max(14);
        size = (row - 5).clamp(11, 17);
    }
    let fits = ((avail / row).max(1)) as usize;
    let shown = if c.legend.len() > fits { fits.saturating_sub(1) } else { c.legend.len() };
    let st = TextStyle::from((FONT, size as u32).into_font()).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Center));
    for e in c.legend.iter().take(shown) {
        let cy = y + row / 2;
        match e.stroke {
            Stroke::Area => {
                area.draw(&Rectangle::new([(8, cy - 7), (30, cy + 7)], e.color.filled())).map_err(de)?;
                area.draw(&Rectangle::new([(8, cy - 7), (30, cy + 7)], BLACK.mix(0.25).stroke_width(1))).map_err(de)?;
            }
            Stroke::Solid => {
                area.draw(&PathElement::new(vec![(6, cy), (32, cy)], e.color.stroke_width(3))).map_err(de)?;
            }
            Stroke::Dashed => {
                for k in 0..3 {
                    let x0 = 6 + k * 10;
                    area.draw(&PathElement::new(vec![(x0, cy), (x0 + 6, cy)], e.color.stroke_width(3))).map_err(de)?;
                }
            }
        }
        area.draw_text(&truncate_label(&micrometre_text(&e.name), 34), &st, (42, cy)).map_err(de)?;
        y += row;
    }
    if shown < c.legend.len() {
        let st2 = st.clone().color(&MUTED);
        area.draw_text(&format!("… and {} more", c.legend.len() - shown), &st2, (40, y + row / 2)).map_err(de)?;
    }
    Ok(())
}

fn draw_chart<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &Chart) -> Result<(), String> {
    root.fill(&WHITE).map_err(de)?;
    let top = draw_title(root, &micrometre_text(&c.title), &micrometre_text(&c.subtitle))?;
    let (_, body) = root.split_vertically(top);
    let cols = c.columns.max(1);
    let rows = c.panels.len().div_ceil(cols).max(1);
    // a grid with a free cell holds the legend there; otherwise the legend gets a column on the right
    let free_cell = c.panels.len() > 1 && c.panels.len() < rows * cols && !c.legend.is_empty();
    let lw = if free_cell { 0 } else { legend_width(root, c) };
    let (w, _) = body.dim_in_pixel();
    let (plots, legend) = body.split_horizontally(w - lw);
    if lw > 0 {
        draw_legend(&legend, c)?;
    }
    let cells = plots.split_evenly((rows, cols));
    for (p, cell) in c.panels.iter().zip(cells.iter()) {
        draw_panel(root, cell, p, c.panels.len() > 1)?;
    }
    if free_cell {
        let cell = &cells[c.panels.len()];
        draw_legend(&cell.margin(30, 0, 40, 0), c)?;
    }
    Ok(())
}

/// Share of the axis span added on each side of a line chart so curves at the extremes are not cut by the frame.
const FRAME_MARGIN: f64 = 0.015;

fn widen(r: (f64, f64), share: f64) -> (f64, f64) {
    let span = r.1 - r.0;
    (r.0 - share * span, r.1 + share * span)
}

/// Axis ranges of a panel; line panels get a small margin inside the frame (stacked areas fill it exactly).
fn panel_ranges(p: &Panel) -> ((f64, f64), (f64, f64)) {
    let (xr, yr) = data_ranges(p);
    if p.stacked {
        (xr, yr)
    } else if p.y_log {
        (widen(xr, FRAME_MARGIN), yr)
    } else {
        (widen(xr, FRAME_MARGIN), widen(yr, FRAME_MARGIN))
    }
}

/// Whole decades (log10 of the values) enclosing the positive values of a log panel, with a small margin.
fn log_range(p: &Panel) -> (f64, f64) {
    let logs = p.series.iter().flat_map(|s| s.points.iter().filter_map(|q| q.1)).filter(|v| *v > 0.0 && v.is_finite()).map(f64::log10);
    let (lo, hi) = logs.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    let (lo, hi) = ((lo - 0.05).floor(), (hi + 0.05).ceil());
    if hi - lo < 1.0 { (lo, lo + 1.0) } else { (lo, hi) }
}

/// Tick label of a log axis at log10 value `v`: the value itself at whole decades, nothing between.
fn decade_label(v: f64) -> String {
    let k = v.round();
    if (v - k).abs() > 1e-9 {
        return String::new();
    }
    let value = 10f64.powi(k as i32);
    if k >= 0.0 { format!("{value:.0}") } else { format!("{:.*}", (-k) as usize, value) }
}

fn data_ranges(p: &Panel) -> ((f64, f64), (f64, f64)) {
    let band_x = p.bands.iter().flat_map(|b| b.points.iter().filter(|q| q.1.is_some()).map(|q| q.0));
    let band_y = p.bands.iter().flat_map(|b| b.points.iter().filter_map(|q| q.1).flat_map(|(lo, hi)| [lo, hi]));
    let xr = p.x_range.unwrap_or_else(|| padded_range(p.series.iter().flat_map(|s| s.points.iter().filter(|q| q.1.is_some()).map(|q| q.0)).chain(band_x), 0.0, false));
    let yr = p.y_range.unwrap_or_else(|| {
        if p.y_log {
            log_range(p)
        } else if p.stacked {
            let n = p.series.first().map(|s| s.points.len()).unwrap_or(0);
            let tops = (0..n).map(|i| p.series.iter().map(|s| s.points.get(i).and_then(|q| q.1).unwrap_or(0.0)).sum::<f64>());
            padded_range(tops.chain(std::iter::once(0.0)), 0.02, true)
        } else {
            padded_range(p.series.iter().flat_map(|s| s.points.iter().filter_map(|q| q.1)).chain(band_y), 0.05, p.y_from_zero)
        }
    });
    (xr, yr)
}

fn draw_panel<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, area: &DrawingArea<DB, Shift>, p: &Panel, multi: bool) -> Result<(), String> {
    let (xr, yr) = panel_ranges(p);
    let (xn, yn) = if multi { (6, 6) } else { (10, 8) };
    let log = p.y_log;
    // a log axis is drawn on log10 of the values: one tick per whole decade
    let (xn, yn) = (enough_ticks(xr, xn), if log { (yr.1 - yr.0).round().max(1.0) as usize + 1 } else { enough_ticks(yr, yn) });
    let label_size: u32 = if multi { 16 } else { 18 };
    let desc_size: u32 = if multi { 17 } else { 20 };
    let xd = tick_decimals(xr, xn);
    let yd = tick_decimals(yr, yn);
    let fx = move |v: &f64| format_tick(*v, xd);
    let fy = move |v: &f64| if log { decade_label(*v) } else { format_tick(*v, yd) };
    let widest = ticks(yr, yn).iter().map(|v| text_width(root, &fy(v), label_size)).max().unwrap_or(20);
    let y_area = widest + desc_size + 22;
    let mut builder = ChartBuilder::on(area);
    builder.margin(10).margin_right(if p.celsius_axis { 10 } else { 22 }).x_label_area_size(label_size + desc_size + 26).y_label_area_size(y_area);
    if !p.title.is_empty() {
        builder.caption(micrometre_text(&p.title), TextStyle::from((FONT, 19).into_font().style(FontStyle::Bold)).color(&TEXT));
    }
    let label_style = TextStyle::from((FONT, label_size).into_font()).color(&TEXT);
    let desc_style = TextStyle::from((FONT, desc_size).into_font()).color(&TEXT);
    if p.celsius_axis {
        let cr = (yr.0 - 273.15, yr.1 - 273.15);
        let cd = tick_decimals(cr, yn);
        let fc = move |v: &f64| format_tick(*v, cd);
        let widest_c = ticks(cr, yn).iter().map(|v| text_width(root, &fc(v), label_size)).max().unwrap_or(20);
        builder.right_y_label_area_size(widest_c + desc_size + 22);
        let mut cc = builder.build_cartesian_2d(xr.0..xr.1, yr.0..yr.1).map_err(de)?.set_secondary_coord(xr.0..xr.1, cr.0..cr.1);
        cc.configure_mesh()
            .x_desc(micrometre_text(&p.x_label))
            .y_desc(micrometre_text(&p.y_label))
            .x_labels(xn)
            .y_labels(yn)
            .x_label_formatter(&fx)
            .y_label_formatter(&fy)
            .label_style(label_style.clone())
            .axis_desc_style(desc_style.clone())
            .bold_line_style(GRID_BOLD)
            .light_line_style(GRID_LIGHT)
            .max_light_lines(1)
            .draw()
            .map_err(de)?;
        cc.configure_secondary_axes().y_desc(p.y_label.replace("[K]", "[°C]")).y_labels(yn).y_label_formatter(&fc).label_style(label_style).axis_desc_style(desc_style).draw().map_err(de)?;
        draw_series(&mut cc, p, yr)?;
    } else {
        let mut cc = builder.build_cartesian_2d(xr.0..xr.1, yr.0..yr.1).map_err(de)?;
        cc.configure_mesh()
            .x_desc(micrometre_text(&p.x_label))
            .y_desc(micrometre_text(&p.y_label))
            .x_labels(xn)
            .y_labels(yn)
            .x_label_formatter(&fx)
            .y_label_formatter(&fy)
            .label_style(label_style)
            .axis_desc_style(desc_style)
            .bold_line_style(GRID_BOLD)
            .light_line_style(GRID_LIGHT)
            .max_light_lines(1)
            .draw()
            .map_err(de)?;
        draw_series(&mut cc, p, yr)?;
    }
    Ok(())
}

type Cc<'a, DB> = ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

fn draw_series<DB: DrawingBackend>(cc: &mut Cc<'_, DB>, p: &Panel, yr: (f64, f64)) -> Result<(), String> {
    let clamp = |v: f64| v.clamp(yr.0 - 10.0 * (yr.1 - yr.0), yr.1 + 10.0 * (yr.1 - yr.0));
    if p.stacked {
        let n = p.series.first().map(|s| s.points.len()).unwrap_or(0);
        let mut lower = vec![0.0f64; n];
        for s in &p.series {
            let upper: Vec<f64> = (0..n).map(|i| lower[i] + s.points.get(i).and_then(|q| q.1).unwrap_or(0.0).max(0.0)).collect();
            let xs: Vec<f64> = (0..n).map(|i| s.points.get(i).map(|q| q.0).unwrap_or(0.0)).collect();
            let mut poly: Vec<(f64, f64)> = (0..n).map(|i| (xs[i], clamp(upper[i]))).collect();
            poly.extend((0..n).rev().map(|i| (xs[i], clamp(lower[i]))));
            cc.draw_series(std::iter::once(Polygon::new(poly, s.color.filled()))).map_err(de)?;
            cc.draw_series(std::iter::once(PathElement::new((0..n).map(|i| (xs[i], clamp(upper[i]))).collect::<Vec<_>>(), WHITE.mix(0.7).stroke_width(1)))).map_err(de)?;
            lower = upper;
        }
        return Ok(());
    }
    for b in &p.bands {
        let mut segments: Vec<Vec<(f64, f64, f64)>> = vec![vec![]];
        for &(x, v) in &b.points {
            match v {
                Some((lo, hi)) if x.is_finite() && lo.is_finite() && hi.is_finite() => segments.last_mut().unwrap().push((x, clamp(lo), clamp(hi))),
                _ => {
                    if !segments.last().unwrap().is_empty() {
                        segments.push(vec![]);
                    }
                }
            }
        }
        for seg in segments.into_iter().filter(|s| s.len() > 1) {
            let mut poly: Vec<(f64, f64)> = seg.iter().map(|q| (q.0, q.2)).collect();
            poly.extend(seg.iter().rev().map(|q| (q.0, q.1)));
            cc.draw_series(std::iter::once(Polygon::new(poly, b.color.mix(0.22).filled()))).map_err(de)?;
        }
    }
    for s in &p.series {
        let mut segments: Vec<Vec<(f64, f64)>> = vec![vec![]];
        for &(x, y) in &s.points {
            match y {
                Some(y) if x.is_finite() && y.is_finite() && (!p.y_log || y > 0.0) => segments.last_mut().unwrap().push((x, clamp(if p.y_log { y.log10() } else { y }))),
                _ => {
                    if !segments.last().unwrap().is_empty() {
                        segments.push(vec![]);
                    }
                }
            }
        }
        for seg in segments.into_iter().filter(|s| !s.is_empty()) {
            let style = s.color.stroke_width(2);
            if seg.len() == 1 {
                cc.draw_series(std::iter::once(Circle::new(seg[0], 3, s.color.filled()))).map_err(de)?;
            } else if s.stroke == Stroke::Dashed {
                cc.draw_series(DashedLineSeries::new(seg, 8, 5, style)).map_err(de)?;
            } else {
                cc.draw_series(LineSeries::new(seg, style)).map_err(de)?;
            }
        }
    }
    Ok(())
}

// ---------------------------------------------------------------------------------------------
// Heat map

/// Sequential colour scale (dark blue → teal → green → yellow) at t in [0, 1].
fn heat_color(t: f64) -> RGBColor {
    const ANCHORS: [(u8, u8, u8); 5] = [(38, 24, 96), (36, 94, 150), (30, 150, 138), (118, 192, 84), (246, 222, 62)];
    let t = if t.is_finite() { t.clamp(0.0, 1.0) } else { 0.0 };
    let x = t * (ANCHORS.len() - 1) as f64;
    let i = (x.floor() as usize).min(ANCHORS.len() - 2);
    let f = x - i as f64;
    let mix = |a: u8, b: u8| (a as f64 + (b as f64 - a as f64) * f).round() as u8;
    let (a, b) = (ANCHORS[i], ANCHORS[i + 1]);
    RGBColor(mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
}

fn significant(v: f64, digits: usize) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let mag = v.abs().log10().floor() as i32;
    let decimals = (digits as i32 - 1 - mag).max(0) as usize;
    format_tick(v, decimals)
}

/// Fewest decimals (up to 6) that show every value exactly (to 1e-9 relative).
fn exact_decimals(values: &[f64]) -> usize {
    (0..=6)
        .find(|&d| {
            values.iter().all(|v| {
                let shown: f64 = format!("{:.*}", d, v).parse().unwrap_or(f64::NAN);
                (shown - v).abs() <= 1e-9 * v.abs().max(1e-300)
            })
        })
        .unwrap_or(6)
}

fn check_map(m: &GridMap) -> Result<(), String> {
    if m.x.is_empty() || m.y.is_empty() {
        return Err("the map needs at least one x and one y value".into());
    }
    if m.values.len() != m.y.len() || m.values.iter().any(|r| r.len() != m.x.len()) {
        return Err(format!("values must be {} rows (y) of {} values (x)", m.y.len(), m.x.len()));
    }
    for (name, v) in [("x", &m.x), ("y", &m.y)] {
        if v.iter().any(|a| !a.is_finite()) || v.windows(2).any(|w| w[1] <= w[0]) {
            return Err(format!("the {name} values must be finite and increasing"));
        }
    }
    if m.values.iter().flatten().flatten().any(|v| !v.is_finite()) {
        return Err("a map value is not finite".into());
    }
    Ok(())
}

fn draw_map<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, m: &GridMap) -> Result<(), String> {
    check_map(m)?;
    root.fill(&WHITE).map_err(de)?;
    let top = draw_title(root, &micrometre_text(&m.title), &micrometre_text(&m.subtitle))?;
    let (_, body) = root.split_vertically(top);
    let (w, _) = body.dim_in_pixel();
    let (plot, bar) = body.split_horizontally(w - 130);
    let vals: Vec<f64> = m.values.iter().flatten().flatten().copied().collect();
    let (vmin, vmax) = if vals.is_empty() {
        (0.0, 1.0)
    } else {
        let lo = vals.iter().cloned().fold(f64::INFINITY, f64::min);
        let hi = vals.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
        if hi - lo <= 1e-12 * hi.abs().max(1.0) {
            (lo - 0.5 * lo.abs().max(1.0) * 0.1, hi + 0.5 * hi.abs().max(1.0) * 0.1)
        } else {
            (lo, hi)
        }
    };
    let (nx, ny) = (m.x.len() as i32, m.y.len() as i32);
    let (xd, yd) = (exact_decimals(&m.x), exact_decimals(&m.y));
    let cell_decimals = tick_decimals((vmin, vmax), 6) + 1;
    // label at most about 12 of the cell centres along an axis
    let centre_label = |v: &SegmentValue<i32>, values: &[f64], decimals: usize| match v {
        SegmentValue::CenterOf(i) if *i >= 0 && (*i as usize) < values.len() => {
            let step = values.len().div_ceil(12).max(1);
            if (*i as usize).is_multiple_of(step) {
                format_tick(values[*i as usize], decimals)
            } else {
                String::new()
            }
        }
        _ => String::new(),
    };
    let xlabels = |v: &SegmentValue<i32>| centre_label(v, &m.x, xd);
    let ylabels = |v: &SegmentValue<i32>| centre_label(v, &m.y, yd);
    let widest = m.y.iter().map(|v| text_width(root, &format_tick(*v, yd), 18)).max().unwrap_or(20);
    let mut cc = ChartBuilder::on(&plot)
        .margin(10)
        .margin_right(16)
        .x_label_area_size(66)
        .y_label_area_size(widest + 50)
        .build_cartesian_2d((0..nx - 1).into_segmented(), (0..ny - 1).into_segmented())
        .map_err(de)?;
    cc.configure_mesh()
        .disable_mesh()
        .x_desc(micrometre_text(&m.x_label))
        .y_desc(micrometre_text(&m.y_label))
        .x_labels(nx as usize + 1)
        .y_labels(ny as usize + 1)
        .x_label_formatter(&xlabels)
        .y_label_formatter(&ylabels)
        .label_style(TextStyle::from((FONT, 18).into_font()).color(&TEXT))
        .axis_desc_style(TextStyle::from((FONT, 20).into_font()).color(&TEXT))
        .draw()
        .map_err(de)?;
    let (pw, ph) = cc.plotting_area().dim_in_pixel();
    let cell_w = pw as f64 / nx as f64;
    let cell_h = ph as f64 / ny as f64;
    let annotate = cell_w >= 46.0 && cell_h >= 22.0;
    for j in 0..ny {
        for i in 0..nx {
            let v = m.values[j as usize][i as usize];
            let corners = [(SegmentValue::Exact(i), SegmentValue::Exact(j)), (SegmentValue::Exact(i + 1), SegmentValue::Exact(j + 1))];
            let color = match v {
                Some(v) => heat_color((v - vmin) / (vmax - vmin)),
                None => RGBColor(225, 225, 225),
            };
            cc.draw_series(std::iter::once(Rectangle::new(corners.clone(), color.filled()))).map_err(de)?;
            cc.draw_series(std::iter::once(Rectangle::new(corners, WHITE.stroke_width(1)))).map_err(de)?;
            if annotate {
                let text = v.map(|v| format_tick(v, cell_decimals)).unwrap_or_else(|| "n/a".into());
                let light = v.map(|v| (v - vmin) / (vmax - vmin) < 0.55).unwrap_or(false);
                let size = if cell_w >= 70.0 && cell_h >= 30.0 { 18 } else { 14 };
                let st = TextStyle::from((FONT, size).into_font()).color(if light { &WHITE } else { &TEXT }).pos(Pos::new(HPos::Center, VPos::Center));
                cc.draw_series(std::iter::once(Text::new(text, (SegmentValue::CenterOf(i), SegmentValue::CenterOf(j)), st))).map_err(de)?;
            }
        }
    }
    // colour bar
    let vd = tick_decimals((vmin, vmax), 6);
    let fv = move |v: &f64| format_tick(*v, vd);
    let mut cb = ChartBuilder::on(&bar).margin_top(10).margin_bottom(76).margin_left(4).margin_right(4).y_label_area_size(0).right_y_label_area_size(92).build_cartesian_2d(0f64..1.0, vmin..vmax).map_err(de)?;
    cb.configure_mesh()
        .disable_mesh()
        .disable_x_axis()
        .y_labels(6)
        .y_label_formatter(&fv)
        .y_desc(&m.value_label)
        .label_style(TextStyle::from((FONT, 17).into_font()).color(&TEXT))
        .axis_desc_style(TextStyle::from((FONT, 18).into_font()).color(&TEXT))
        .draw()
        .map_err(de)?;
    let steps = 100;
    cb.draw_series((0..steps).map(|k| {
        let a = vmin + (vmax - vmin) * k as f64 / steps as f64;
        let b = vmin + (vmax - vmin) * (k + 1) as f64 / steps as f64;
        Rectangle::new([(0.0, a), (1.0, b)], heat_color((k as f64 + 0.5) / steps as f64).filled())
    }))
    .map_err(de)?;
    if m.values.iter().flatten().any(|v| v.is_none()) {
        let st = TextStyle::from((FONT, 16).into_font()).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Center));
        let (_, bh) = bar.dim_in_pixel();
        bar.draw(&Rectangle::new([(6, bh as i32 - 44), (24, bh as i32 - 26)], RGBColor(225, 225, 225).filled())).map_err(de)?;
        bar.draw_text("n/a: no value", &st, (30, bh as i32 - 35)).map_err(de)?;
    }
    Ok(())
}

/// Heat map of a lifetime (or t50, or any value) over two swept variables, written as `<stem>.png/.svg` in `dir`.
/// Cells are drawn on an index grid with the swept values as tick labels, so uneven or logarithmic sweeps
/// keep equal cell sizes; cells without a value (`None`, e.g. a droplet that did not finish) are grey.
pub fn lifetime_map(dir: &Path, stem: &str, map: &GridMap) -> Result<ChartFiles, OutputError> {
    check_map(map).map_err(|m| chart_err(&dir.join(format!("{stem}.svg")), m))?;
    let size = (940, 640);
    save(dir, stem, &map.title, size, Figure::Map(map))
}

// ---------------------------------------------------------------------------------------------
// Chart builders from saved results

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

fn run_points(run: &SavedRun, x: &[Option<f64>], y: &[Option<f64>], fx: f64, fy: f64, oy: f64) -> Vec<(f64, Option<f64>)> {
    let _ = run;
    thin(x.len(), MAX_POINTS).into_iter().filter_map(|i| x[i].map(|xv| (xv * fx, y[i].map(|v| v * fy + oy)))).collect()
}

fn max_time(runs: &[LabelledRun]) -> f64 {
    runs.iter()
        .filter_map(|r| r.run.history.numbers("time_s").ok())
        .flat_map(|v| v.into_iter().flatten())
        .fold(0.0, f64::max)
}

fn run_legend(runs: &[LabelledRun]) -> Vec<LegendEntry> {
    runs.iter().enumerate().map(|(i, r)| {
        let (color, stroke) = palette(i);
        LegendEntry { name: r.label.to_string(), color, stroke }
    }).collect()
}

fn overlay(runs: &[LabelledRun], mut f: impl FnMut(&SavedRun) -> Result<Vec<(f64, Option<f64>)>, OutputError>) -> Result<Vec<Series>, OutputError> {
    runs.iter()
        .enumerate()
        .map(|(i, r)| {
            let (color, stroke) = palette(i);
            Ok(Series { name: r.label.to_string(), points: f(r.run)?, color, stroke })
        })
        .collect()
}

fn single_or_overlay(runs: &[LabelledRun], title: &str, subtitle: &str, stem: &str, panel: Panel) -> Chart {
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

/// (d/d0)² against t/d0² [s/mm²], one curve per run.
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

/// Evaporated fraction [%] against time, one curve per run.
pub fn evaporated_fraction_chart(runs: &[LabelledRun], stem: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let (f, unit) = time_scale(max_time(runs));
    let series = overlay(runs, |run| Ok(run_points(run, &run.history.numbers("time_s")?, &run.history.numbers("evaporated_fraction")?, f, 100.0, 0.0)))?;
    let panel = Panel { x_label: format!("time  [{unit}]"), y_label: "evaporated  [% of initial mass]".into(), series, y_range: Some((0.0, 102.0)), ..Default::default() };
    Ok(single_or_overlay(runs, "Evaporated fraction against time", subtitle, stem, panel))
}

/// A stacked layer: a component or a class, its colour and its values per row.
#[derive(Debug, Clone)]
struct Layer {
    name: String,
    color: RGBColor,
    liquid: Vec<f64>,
    vapor: Vec<f64>,
}

/// Components one by one (at most [`MAX_COMPONENTS_UNGROUPED`]) or summed by class; ordered with the most
/// persistent (heaviest) layer first, i.e. at the bottom of a stack.
fn layers(run: &SavedRun) -> Result<(Vec<Layer>, bool), OutputError> {
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

fn stacked_legend(layers: &[Layer]) -> Vec<LegendEntry> {
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
const RESIDUE_PANELS: [(&[&str], &str, &str, f64, f64); 5] = [
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

/// Display name, unit and scale for a `name_unit` column (SI in the file, friendlier units on the axis).
pub fn column_display(column: &str) -> (String, String, f64) {
    const UNITS: [(&str, &str, f64); 17] = [
        ("_kg_m3", "kg/m³", 1.0),
        ("_J_kgK", "J/(kg·K)", 1.0),
        ("_J_molK", "J/(mol·K)", 1.0),
        ("_J_kg", "kJ/kg", 1e-3),
        ("_J_mol", "kJ/mol", 1e-3),
        ("_Pa_s", "mPa·s", 1e3),
        ("_m2_s", "mm²/s", 1e6),
        ("_W_mK", "W/(m·K)", 1.0),
        ("_N_m", "mN/m", 1e3),
        ("_kg_mol", "g/mol", 1e3),
        ("_kg_s", "kg/s", 1.0),
        ("_m_s", "m/s", 1.0),
        ("_Pa", "kPa", 1e-3),
        ("_K", "K", 1.0),
        ("_W", "W", 1.0),
        ("_m", "µm", 1e6),
        ("_s", "ms", 1e3),
    ];
    for (suffix, unit, scale) in UNITS {
        if let Some(name) = column.strip_suffix(suffix) {
            if !name.is_empty() {
                return (name.replace('_', " "), unit.into(), scale);
            }
        }
    }
    (column.replace('_', " "), "-".into(), 1.0)
}

/// Property table against temperature: one panel per numeric column of a CSV with a `temperature_K` column
/// (other columns named `name_unit`, e.g. `density_kg_m3`). Text columns are skipped.
pub fn table_vs_temperature_chart(table: &CsvData, stem: &str, title: &str, subtitle: &str) -> Result<Chart, OutputError> {
    let t = table.numbers("temperature_K")?;
    let mut panels = vec![];
    for col in table.header.iter().filter(|h| h.as_str() != "temperature_K") {
        let Ok(y) = table.numbers(col) else { continue };
        if y.iter().all(|v| v.is_none()) {
            continue;
        }
        let (name, unit, scale) = column_display(col);
        // vapour and bubble pressures span decades over the liquid range: a log axis shows them all
        let y_log = col.ends_with("_Pa") && name.contains("pressure") && y.iter().flatten().any(|v| *v > 0.0);
        let points = t.iter().zip(&y).filter_map(|(x, y)| x.map(|x| (x, y.map(|v| v * scale)))).collect();
        panels.push(Panel {
            title: truncate_label(&name, 40),
            x_label: "temperature  [K]".into(),
            y_label: if y_log { format!("[{unit}], log scale") } else { format!("[{unit}]") },
            series: vec![Series { name: name.clone(), points, color: PALETTE[panels.len() % PALETTE.len()], stroke: Stroke::Solid }],
            y_log,
            ..Default::default()
        });
    }
    if panels.is_empty() {
        return Err(OutputError::Read { path: table.path.display().to_string(), message: "no numeric property columns besides temperature_K".into() });
    }
    let columns = if panels.len() <= 2 { panels.len() } else if panels.len() <= 6 { 3 } else { 4 };
    let rows = panels.len().div_ceil(columns) as u32;
    Ok(Chart { stem: stem.into(), title: title.into(), subtitle: subtitle.into(), panels, columns, legend_title: String::new(), legend: vec![], size: (360 * columns as u32 + 100, 80 + 330 * rows) })
}

/// Draw a property table CSV (see [`table_vs_temperature_chart`]) into `dir`.
pub fn table_vs_temperature(csv: &Path, dir: &Path, stem: &str, title: &str) -> Result<ChartFiles, OutputError> {
    let table = CsvData::read(csv)?;
    let pick = |key: &str| table.metadata.iter().find(|m| m.trim_start().starts_with(key)).map(|m| m.trim().to_string());
    let sub = [pick("fuel"), pick("pressure")].into_iter().flatten().collect::<Vec<_>>().join(" · ");
    let sub = if sub.is_empty() { table.metadata.first().cloned().unwrap_or_default() } else { sub };
    write_chart(dir, &table_vs_temperature_chart(&table, stem, title, &sub)?)
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
    remove_stale(&run.dir, RUN_CHARTS[4], charts.len() < 5);
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
        assert_eq!(log_range(&p), (-1.0, 3.0));
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
