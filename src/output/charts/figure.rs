//! Figures: saving in both formats, line-chart panels, legends and colours.

#[allow(unused_imports)]
use super::*;

pub(super) enum Figure<'a> {
    Chart(&'a Chart),
    Map(&'a GridMap),
}

// ---------------------------------------------------------------------------------------------
// Writing

pub(super) fn save(dir: &Path, stem: &str, title: &str, size: (u32, u32), fig: Figure) -> Result<ChartFiles, OutputError> {
    register_fonts()?;
    super::super::ensure_dir(dir)?;
    let svg_path = dir.join(format!("{stem}.svg"));
    let png_path = dir.join(format!("{stem}.png"));
    // SVG: laid out on a canvas SVG_SCALE times larger, shown at the image size through the viewBox
    let svg_canvas = SVG_SCALE.canvas(size);
    let mut svg = String::new();
    {
        let root = PixelGrid::new(SVGBackend::with_string(&mut svg, svg_canvas), SVG_SCALE).into_drawing_area();
        draw_figure(&root, &fig, SVG_SCALE).map_err(|m| chart_err(&svg_path, m))?;
        root.present().map_err(|e| chart_err(&svg_path, de(e)))?;
    }
    let svg = svg_at_image_size(svg, svg_canvas, SVG_SCALE).map_err(|m| chart_err(&svg_path, m))?;
    write_atomic(&svg_path, svg.as_bytes())?;
    // PNG: drawn on a canvas PNG_SCALE times larger, then reduced with an area filter (anti-aliasing)
    let png_canvas = PNG_SCALE.canvas(size);
    // allocated white (one pass of memset): the figure's white background fill is then skipped
    let mut canvas = vec![255u8; png_canvas.0 as usize * png_canvas.1 as usize * 3];
    {
        let root = CrispText(PixelGrid::prefilled(BitMapBackend::with_buffer(&mut canvas, png_canvas), PNG_SCALE, (255, 255, 255))).into_drawing_area();
        draw_figure(&root, &fig, PNG_SCALE).map_err(|m| chart_err(&png_path, m))?;
        root.present().map_err(|e| chart_err(&png_path, de(e)))?;
    }
    let image = box_downsample(&canvas, png_canvas, PNG_SCALE);
    drop(canvas);
    // The bitmap encoder picks the format from the extension: the temporary name must end in .png.
    let tmp = super::super::temp_path(&png_path, ".", ".png");
    let encoded = {
        let mut png = BitMapBackend::new(&tmp, size);
        png.blit_bitmap((0, 0), size, &image).and_then(|_| png.present())
    };
    if let Err(e) = encoded {
        let _ = std::fs::remove_file(&tmp);
        return Err(chart_err(&png_path, de(e)));
    }
    super::super::check_file_target(&png_path)?;
    if let Err(e) = super::super::replace_file(&tmp, &png_path, false) {
        let _ = std::fs::remove_file(&tmp);
        return Err(chart_err(&png_path, e.to_string()));
    }
    super::super::remove_stale_temps_of(&png_path, ".", ".png");
    Ok(ChartFiles { stem: stem.into(), title: title.into(), png: png_path, svg: svg_path })
}

/// Draw a chart into `dir` as `<stem>.png` and `<stem>.svg`.
pub fn write_chart(dir: &Path, chart: &Chart) -> Result<ChartFiles, OutputError> {
    save(dir, &chart.stem, &chart.title, chart.size, Figure::Chart(chart))
}

pub(super) fn draw_figure<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, fig: &Figure, s: Scale) -> Result<(), String> {
    match fig {
        Figure::Chart(c) => draw_chart(root, c, s),
        Figure::Map(m) => draw_map(root, m, s),
    }
}

// ---------------------------------------------------------------------------------------------
// Colours

/// Colour of the i-th run in overlays (the palette the run charts use).
pub fn run_color(i: usize) -> RGBColor {
    PALETTE[i % PALETTE.len()]
}

/// `color` blended with white (share of the colour in \[0, 1\]): a legend swatch for a translucent band.
pub fn lighter(color: RGBColor, share: f64) -> RGBColor {
    let m = |c: u8| (f64::from(c) * share + 255.0 * (1.0 - share)).round().clamp(0.0, 255.0) as u8;
    RGBColor(m(color.0), m(color.1), m(color.2))
}

pub(super) fn palette(i: usize) -> (RGBColor, Stroke) {
    (PALETTE[i % PALETTE.len()], if (i / PALETTE.len()) % 2 == 1 { Stroke::Dashed } else { Stroke::Solid })
}

// ---------------------------------------------------------------------------------------------
// Drawing

/// Width of the legend column, in canvas pixels.
pub(super) fn legend_width<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &Chart, s: Scale) -> u32 {
    if c.legend.is_empty() {
        return 0;
    }
    let mut w = text_width(root, &c.legend_title, 18, s);
    for e in &c.legend {
        w = w.max(text_width(root, &truncate_label(&micrometre_text(&e.name), 34), 17, s) + s.px(44));
    }
    (w + s.px(24)).clamp(s.px(120), s.px(380))
}

/// The legend: the layout is worked out in image pixels (so it is the same at every scale), then drawn scaled.
pub(super) fn draw_legend<DB: DrawingBackend>(area: &DrawingArea<DB, Shift>, c: &Chart, s: Scale) -> Result<(), String> {
    let h = s.image_px(area.dim_in_pixel().1) as i32;
    let mut y = 12i32;
    if !c.legend_title.is_empty() {
        let st = s.bold(18).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Top));
        area.draw_text(&c.legend_title, &st, (s.at(8), s.at(y))).map_err(de)?;
        y += 30;
    }
    let avail = h - y - 10;
    let n = c.legend.len() as i32;
    let mut row = 27;
    let mut size = 17;
    if n * row > avail {
        row = (avail / n.max(1)).max(14);
        size = (row - 5).clamp(11, 17);
    }
    let fits = ((avail / row).max(1)) as usize;
    let shown = if c.legend.len() > fits { fits.saturating_sub(1) } else { c.legend.len() };
    let st = s.font(size as u32).color(&TEXT).pos(Pos::new(HPos::Left, VPos::Center));
    let at = |x: i32, y: i32| (s.at(x), s.at(y));
    for e in c.legend.iter().take(shown) {
        let cy = y + row / 2;
        match e.stroke {
            Stroke::Area => {
                area.draw(&Rectangle::new([at(8, cy - 7), at(30, cy + 7)], e.color.filled())).map_err(de)?;
                area.draw(&Rectangle::new([at(8, cy - 7), at(30, cy + 7)], s.line(BLACK.mix(0.25), 1))).map_err(de)?;
            }
            Stroke::Solid => {
                area.draw(&PathElement::new(vec![at(6, cy), at(32, cy)], s.line(e.color, 3))).map_err(de)?;
            }
            Stroke::Dashed => {
                for k in 0..3 {
                    let x0 = 6 + k * 10;
                    area.draw(&PathElement::new(vec![at(x0, cy), at(x0 + 6, cy)], s.line(e.color, 3))).map_err(de)?;
                }
            }
        }
        area.draw_text(&truncate_label(&micrometre_text(&e.name), 34), &st, at(42, cy)).map_err(de)?;
        y += row;
    }
    if shown < c.legend.len() {
        let st2 = st.clone().color(&MUTED);
        area.draw_text(&format!("… and {} more", c.legend.len() - shown), &st2, at(40, y + row / 2)).map_err(de)?;
    }
    Ok(())
}

pub(super) fn draw_chart<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, c: &Chart, s: Scale) -> Result<(), String> {
    root.fill(&WHITE).map_err(de)?;
    let top = draw_title(root, &micrometre_text(&c.title), &micrometre_text(&c.subtitle), s)?;
    let (_, body) = root.split_vertically(top);
    let cols = c.columns.max(1);
    let rows = c.panels.len().div_ceil(cols).max(1);
    // a grid with a free cell holds the legend there; otherwise the legend gets a column on the right
    let free_cell = c.panels.len() > 1 && c.panels.len() < rows * cols && !c.legend.is_empty();
    let lw = if free_cell { 0 } else { legend_width(root, c, s) };
    let (w, _) = body.dim_in_pixel();
    let (plots, legend) = body.split_horizontally(w - lw);
    if lw > 0 {
        draw_legend(&legend, c, s)?;
    }
    let cells = plots.split_evenly((rows, cols));
    for (p, cell) in c.panels.iter().zip(cells.iter()) {
        draw_panel(root, cell, p, c.panels.len() > 1, s)?;
    }
    if free_cell {
        let cell = &cells[c.panels.len()];
        draw_legend(&cell.margin(s.at(30), 0, s.at(40), 0), c, s)?;
    }
    Ok(())
}

/// A panel title above the panel's axes (as plotters' caption: centred, 5 px above and below).
fn panel_title<DB: DrawingBackend>(area: &DrawingArea<DB, Shift>, title: &str, s: Scale) -> Result<DrawingArea<DB, Shift>, String> {
    let style = s.bold(19).color(&TEXT).pos(Pos::new(HPos::Center, VPos::Top));
    let (w, _) = area.dim_in_pixel();
    let (_, text_h) = area.estimate_text_size(title, &style).map_err(de)?;
    area.draw_text(title, &style, (w as i32 / 2, s.at(5))).map_err(de)?;
    Ok(area.split_vertically(s.px(10) + text_h).1)
}

pub(super) fn draw_panel<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, area: &DrawingArea<DB, Shift>, p: &Panel, multi: bool, s: Scale) -> Result<(), String> {
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
    let widest = ticks(yr, yn).iter().map(|v| text_width(root, &fy(v), label_size, s)).max().unwrap_or(s.px(20));
    let y_area = widest + s.px(desc_size + 22);
    let area = area.margin(s.at(10), s.at(10), s.at(10), s.at(if p.celsius_axis { 10 } else { 22 }));
    let area = if p.title.is_empty() { area } else { panel_title(&area, &micrometre_text(&p.title), s)? };
    let mut builder = ChartBuilder::on(&area);
    builder.x_label_area_size(s.px(label_size + desc_size + 26)).y_label_area_size(y_area);
    let label_style = s.font(label_size).color(&TEXT);
    let desc_style = s.font(desc_size).color(&TEXT);
    let (axis, tick) = (s.line(BLACK, 1), s.px(TICK_MARK));
    let (grid_bold, grid_light) = (s.line(GRID_BOLD, 1), s.line(GRID_LIGHT, 1));
    // the primary axes and grid, the same with or without a secondary °C axis (whose chart type differs)
    macro_rules! mesh {
        ($cc:expr, $labels:expr, $descs:expr) => {
            $cc.configure_mesh()
                .x_desc(micrometre_text(&p.x_label))
                .y_desc(micrometre_text(&p.y_label))
                .x_labels(xn)
                .y_labels(yn)
                .x_label_formatter(&fx)
                .y_label_formatter(&fy)
                .label_style($labels)
                .axis_desc_style($descs)
                .axis_style(axis)
                .set_all_tick_mark_size(tick)
                .bold_line_style(grid_bold)
                .light_line_style(grid_light)
                .max_light_lines(1)
                .draw()
                .map_err(de)?
        };
    }
    if p.celsius_axis {
        let cr = (yr.0 - 273.15, yr.1 - 273.15);
        let cd = tick_decimals(cr, yn);
        let fc = move |v: &f64| format_tick(*v, cd);
        let widest_c = ticks(cr, yn).iter().map(|v| text_width(root, &fc(v), label_size, s)).max().unwrap_or(s.px(20));
        builder.right_y_label_area_size(widest_c + s.px(desc_size + 22));
        let mut cc = builder.build_cartesian_2d(xr.0..xr.1, yr.0..yr.1).map_err(de)?.set_secondary_coord(xr.0..xr.1, cr.0..cr.1);
        mesh!(cc, label_style.clone(), desc_style.clone());
        cc.configure_secondary_axes()
            .y_desc(p.y_label.replace("[K]", "[°C]"))
            .y_labels(yn)
            .y_label_formatter(&fc)
            .label_style(label_style)
            .axis_desc_style(desc_style)
            .axis_style(axis)
            .set_all_tick_mark_size(tick)
            .draw()
            .map_err(de)?;
        draw_series(&mut cc, p, yr, s)?;
    } else {
        let mut cc = builder.build_cartesian_2d(xr.0..xr.1, yr.0..yr.1).map_err(de)?;
        mesh!(cc, label_style, desc_style);
        draw_series(&mut cc, p, yr, s)?;
    }
    Ok(())
}

pub(super) type Cc<'a, DB> = ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

pub(super) fn draw_series<DB: DrawingBackend>(cc: &mut Cc<'_, DB>, p: &Panel, yr: (f64, f64), s: Scale) -> Result<(), String> {
    let clamp = |v: f64| v.clamp(yr.0 - 10.0 * (yr.1 - yr.0), yr.1 + 10.0 * (yr.1 - yr.0));
    if p.stacked {
        let n = p.series.first().map(|layer| layer.points.len()).unwrap_or(0);
        let mut lower = vec![0.0f64; n];
        for layer in &p.series {
            let upper: Vec<f64> = (0..n).map(|i| lower[i] + layer.points.get(i).and_then(|q| q.1).unwrap_or(0.0).max(0.0)).collect();
            let xs: Vec<f64> = (0..n).map(|i| layer.points.get(i).map(|q| q.0).unwrap_or(0.0)).collect();
            let mut poly: Vec<(f64, f64)> = (0..n).map(|i| (xs[i], clamp(upper[i]))).collect();
            poly.extend((0..n).rev().map(|i| (xs[i], clamp(lower[i]))));
            cc.draw_series(std::iter::once(Polygon::new(poly, layer.color.filled()))).map_err(de)?;
            cc.draw_series(std::iter::once(PathElement::new((0..n).map(|i| (xs[i], clamp(upper[i]))).collect::<Vec<_>>(), s.line(WHITE.mix(0.7), 1)))).map_err(de)?;
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
        for seg in segments.into_iter().filter(|seg| seg.len() > 1) {
            let mut poly: Vec<(f64, f64)> = seg.iter().map(|q| (q.0, q.2)).collect();
            poly.extend(seg.iter().rev().map(|q| (q.0, q.1)));
            cc.draw_series(std::iter::once(Polygon::new(poly, b.color.mix(0.22).filled()))).map_err(de)?;
        }
    }
    for series in &p.series {
        let mut segments: Vec<Vec<(f64, f64)>> = vec![vec![]];
        for &(x, y) in &series.points {
            match y {
                Some(y) if x.is_finite() && y.is_finite() && (!p.y_log || y > 0.0) => segments.last_mut().unwrap().push((x, clamp(if p.y_log { y.log10() } else { y }))),
                _ => {
                    if !segments.last().unwrap().is_empty() {
                        segments.push(vec![]);
                    }
                }
            }
        }
        for seg in segments.into_iter().filter(|seg| !seg.is_empty()) {
            let style = s.line(series.color, 2);
            if seg.len() == 1 {
                cc.draw_series(std::iter::once(Circle::new(seg[0], s.px(3), series.color.filled()))).map_err(de)?;
            } else if series.stroke == Stroke::Dashed {
                cc.draw_series(DashedLineSeries::new(seg, s.px(8), s.px(5), style)).map_err(de)?;
            } else {
                cc.draw_series(LineSeries::new(seg, style)).map_err(de)?;
            }
        }
    }
    Ok(())
}

// ---------------------------------------------------------------------------------------------
// Heat map
