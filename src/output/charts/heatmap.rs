//! Heat maps of a value over two swept variables.

#[allow(unused_imports)]
use super::*;

/// Sequential colour scale (dark blue → teal → green → yellow) at t in \[0, 1\].
pub(super) fn heat_color(t: f64) -> RGBColor {
    const ANCHORS: [(u8, u8, u8); 5] = [(38, 24, 96), (36, 94, 150), (30, 150, 138), (118, 192, 84), (246, 222, 62)];
    let t = if t.is_finite() { t.clamp(0.0, 1.0) } else { 0.0 };
    let x = t * (ANCHORS.len() - 1) as f64;
    let i = (x.floor() as usize).min(ANCHORS.len() - 2);
    let f = x - i as f64;
    let mix = |a: u8, b: u8| (a as f64 + (b as f64 - a as f64) * f).round() as u8;
    let (a, b) = (ANCHORS[i], ANCHORS[i + 1]);
    RGBColor(mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
}

pub(super) fn significant(v: f64, digits: usize) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let mag = v.abs().log10().floor() as i32;
    let decimals = (digits as i32 - 1 - mag).max(0) as usize;
    format_tick(v, decimals)
}

/// Fewest decimals (up to 6) that show every value exactly (to 1e-9 relative).
pub(super) fn exact_decimals(values: &[f64]) -> usize {
    (0..=6)
        .find(|&d| {
            values.iter().all(|v| {
                let shown: f64 = format!("{:.*}", d, v).parse().unwrap_or(f64::NAN);
                (shown - v).abs() <= 1e-9 * v.abs().max(1e-300)
            })
        })
        .unwrap_or(6)
}

/// Colour range of a heat map: the data's full range, unless a few outliers lie beyond Tukey's far fences
/// (quartiles ∓ 3 interquartile ranges); then the range stops at the fences, cells beyond take the end colours
/// (their printed values stay exact) and the counts above and below are reported on the colour bar.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) struct ColourScale {
    /// Value at the low end of the colour bar.
    pub(super) low: f64,
    /// Value at the high end of the colour bar.
    pub(super) high: f64,
    /// Cells above `high`.
    pub(super) above: usize,
    /// Cells below `low`.
    pub(super) below: usize,
}

pub(super) fn colour_scale(values: &[f64]) -> ColourScale {
    if values.is_empty() {
        return ColourScale { low: 0.0, high: 1.0, above: 0, below: 0 };
    }
    let mut v: Vec<f64> = values.to_vec();
    v.sort_by(|a, b| a.total_cmp(b));
    let (lo, hi) = (v[0], v[v.len() - 1]);
    if hi - lo <= 1e-12 * hi.abs().max(1.0) {
        return ColourScale { low: lo - 0.05 * lo.abs().max(1.0), high: hi + 0.05 * hi.abs().max(1.0), above: 0, below: 0 };
    }
    let full = ColourScale { low: lo, high: hi, above: 0, below: 0 };
    if v.len() < 8 {
        return full;
    }
    let quantile = |q: f64| {
        let x = q * (v.len() - 1) as f64;
        let i = x.floor() as usize;
        let f = x - i as f64;
        if i + 1 < v.len() { v[i] + f * (v[i + 1] - v[i]) } else { v[i] }
    };
    let (q1, q3) = (quantile(0.25), quantile(0.75));
    let iqr = q3 - q1;
    let (fence_low, fence_high) = (q1 - 3.0 * iqr, q3 + 3.0 * iqr);
    let low = v.iter().copied().find(|x| *x >= fence_low).unwrap_or(lo);
    let high = v.iter().rev().copied().find(|x| *x <= fence_high).unwrap_or(hi);
    if high - low <= 1e-12 * high.abs().max(1.0) {
        return full;
    }
    ColourScale { low, high, above: v.iter().filter(|x| **x > high).count(), below: v.iter().filter(|x| **x < low).count() }
}

pub(super) fn check_map(m: &GridMap) -> Result<(), String> {
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

pub(super) fn draw_map<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, m: &GridMap, s: Scale) -> Result<(), String> {
    check_map(m)?;
    root.fill(&WHITE).map_err(de)?;
    let top = draw_title(root, &micrometre_text(&m.title), &micrometre_text(&m.subtitle), s)?;
    let (_, body) = root.split_vertically(top);
    let (w, _) = body.dim_in_pixel();
    let (plot, bar) = body.split_horizontally(w - s.px(130));
    let vals: Vec<f64> = m.values.iter().flatten().flatten().copied().collect();
    let scale = colour_scale(&vals);
    let (vmin, vmax) = (scale.low, scale.high);
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
    let widest = m.y.iter().map(|v| text_width(root, &format_tick(*v, yd), 18, s)).max().unwrap_or(s.px(20));
    let mut cc = ChartBuilder::on(&plot)
        .margin(s.px(10))
        .margin_right(s.px(16))
        .x_label_area_size(s.px(66))
        .y_label_area_size(widest + s.px(50))
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
        .label_style(s.font(18).color(&TEXT))
        .axis_desc_style(s.font(20).color(&TEXT))
        .axis_style(s.line(BLACK, 1))
        .set_all_tick_mark_size(s.px(TICK_MARK))
        .draw()
        .map_err(de)?;
    let (pw, ph) = cc.plotting_area().dim_in_pixel();
    // cell size in image pixels
    let cell_w = s.image_px(pw) / nx as f64;
    let cell_h = s.image_px(ph) / ny as f64;
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
            cc.draw_series(std::iter::once(Rectangle::new(corners, s.line(WHITE, 1)))).map_err(de)?;
            if annotate {
                let text = v.map(|v| format_tick(v, cell_decimals)).unwrap_or_else(|| "n/a".into());
                let light = v.map(|v| ((v - vmin) / (vmax - vmin)).clamp(0.0, 1.0) < 0.55).unwrap_or(false);
                let size = if cell_w >= 70.0 && cell_h >= 30.0 { 18 } else { 14 };
                let st = s.font(size).color(if light { &WHITE } else { &TEXT }).pos(Pos::new(HPos::Center, VPos::Center));
                cc.draw_series(std::iter::once(Text::new(text, (SegmentValue::CenterOf(i), SegmentValue::CenterOf(j)), st))).map_err(de)?;
            }
        }
    }
    // colour bar
    let vd = tick_decimals((vmin, vmax), 6);
    let fv = move |v: &f64| format_tick(*v, vd);
    let mut cb = ChartBuilder::on(&bar)
        .margin_top(s.px(10))
        .margin_bottom(s.px(76))
        .margin_left(s.px(4))
        .margin_right(s.px(4))
        .y_label_area_size(0)
        .right_y_label_area_size(s.px(92))
        .build_cartesian_2d(0f64..1.0, vmin..vmax)
        .map_err(de)?;
    cb.configure_mesh()
        .disable_mesh()
        .disable_x_axis()
        .y_labels(6)
        .y_label_formatter(&fv)
        .y_desc(&m.value_label)
        .label_style(s.font(17).color(&TEXT))
        .axis_desc_style(s.font(18).color(&TEXT))
        .axis_style(s.line(BLACK, 1))
        .set_all_tick_mark_size(s.px(TICK_MARK))
        .draw()
        .map_err(de)?;
    let steps = 100;
    cb.draw_series((0..steps).map(|k| {
        let a = vmin + (vmax - vmin) * k as f64 / steps as f64;
        let b = vmin + (vmax - vmin) * (k + 1) as f64 / steps as f64;
        Rectangle::new([(0.0, a), (1.0, b)], heat_color((k as f64 + 0.5) / steps as f64).filled())
    }))
    .map_err(de)?;
    let bh = s.image_px(bar.dim_in_pixel().1) as i32;
    let at = |x: i32, y: i32| (s.at(x), s.at(y));
    let note = s.font(14).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Center));
    for (k, (count, word)) in [(scale.above, "above"), (scale.below, "below")].into_iter().filter(|(c, _)| *c > 0).enumerate() {
        let text = format!("{count} cell{} {word} scale", if count == 1 { "" } else { "s" });
        bar.draw_text(&text, &note, at(6, bh - 66 + 16 * k as i32)).map_err(de)?;
    }
    if m.values.iter().flatten().any(|v| v.is_none()) {
        let st = s.font(16).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Center));
        bar.draw(&Rectangle::new([at(6, bh - 44), at(24, bh - 26)], RGBColor(225, 225, 225).filled())).map_err(de)?;
        bar.draw_text("n/a: no value", &st, at(30, bh - 35)).map_err(de)?;
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
