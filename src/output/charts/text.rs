//! Chart text: the built-in fonts, crisp glyph placement on PNG, titles and label spelling.

#[allow(unused_imports)]
use super::*;

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

/// A bitmap backend wrapper that draws text itself: plotters' ab_glyph path drops each glyph's side bearing
/// and rounds every glyph to whole pixels on its own, which spaces letters unevenly ("tim e"). This places
/// glyphs at sub-pixel positions along the advance widths plotters measures, and puts the anchor at the cap
/// height (centre), cap top (top) or descender (bottom), like the SVG backend's `dy` offsets.
pub(super) struct CrispText<DB>(pub(super) DB);

pub(super) fn glyph_fonts() -> &'static (ab_glyph::FontRef<'static>, ab_glyph::FontRef<'static>) {
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

pub(super) fn truncate_label(s: &str, max_chars: usize) -> String {
    if s.chars().count() <= max_chars {
        s.to_string()
    } else {
        let mut t: String = s.chars().take(max_chars - 1).collect();
        t.push('…');
        t
    }
}

/// Width of `text` at `size` image pixels, in canvas pixels.
pub(super) fn text_width<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, text: &str, size: u32, s: Scale) -> u32 {
    root.estimate_text_size(text, &s.font(size)).map(|(w, _)| w).unwrap_or(s.px(8 * text.len() as u32))
}

/// Title and subtitle centred at the top; returns the height they take, in canvas pixels.
pub(super) fn draw_title<DB: DrawingBackend>(root: &DrawingArea<DB, Shift>, title: &str, subtitle: &str, s: Scale) -> Result<u32, String> {
    let (w, _) = root.dim_in_pixel();
    let title_style = s.bold(28).color(&TEXT).pos(Pos::new(HPos::Center, VPos::Top));
    root.draw_text(title, &title_style, (w as i32 / 2, s.at(10))).map_err(de)?;
    if subtitle.is_empty() {
        return Ok(s.px(50));
    }
    let mut sub = subtitle.to_string();
    let mut size = 19;
    while text_width(root, &sub, size, s) + s.px(40) > w && size > 14 {
        size -= 1;
    }
    while text_width(root, &sub, size, s) + s.px(40) > w && sub.chars().count() > 10 {
        sub = truncate_label(&sub, sub.chars().count() - 4);
    }
    root.draw_text(&sub, &s.font(size).color(&MUTED).pos(Pos::new(HPos::Center, VPos::Top)), (w as i32 / 2, s.at(48))).map_err(de)?;
    Ok(s.px(80))
}
