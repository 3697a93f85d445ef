//! Supersampled drawing. plotters maps every coordinate to a whole pixel of its backend, so a curve drawn at the
//! image size moves in one-pixel stair steps. A figure is therefore laid out on a canvas [`Scale`] times larger
//! than the image: the SVG keeps the image's width and height and gets a `viewBox` of the large canvas (its
//! coordinates become 1/k of a pixel), and the PNG canvas is reduced to the image size with an area (box) filter,
//! which anti-aliases lines, edges and text. Every size in the chart code (fonts, strokes, margins, label areas,
//! markers, offsets) is written in image pixels and goes through one [`Scale`].

#[allow(unused_imports)]
use super::*;

/// Supersampling factor of a drawing; chart code writes every size in image pixels and converts it here.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) struct Scale(u32);

/// Factor of the SVG canvas: coordinates in tenths of a pixel (costs only a digit per number in the file).
pub(super) const SVG_SCALE: Scale = Scale(10);
/// Factor of the PNG canvas: 4 × 4 samples per image pixel (17 coverage levels along an edge). Redrawing the
/// demo's 48 charts (`dropcut plot`) took 1.3 s of CPU with 3 × 3, 1.7 s with 4 × 4 and 0.3 s without
/// supersampling; 4 × 4 gives visibly smoother slopes than 3 × 3, and the cost grows with k².
pub(super) const PNG_SCALE: Scale = Scale(4);

impl Scale {
    /// The factor k.
    pub(super) fn factor(self) -> u32 {
        self.0
    }
    /// A size in image pixels on the canvas (a stroke width, a margin, a font size, a label area).
    pub(super) fn px(self, image_px: u32) -> u32 {
        image_px * self.0
    }
    /// A signed position or offset in image pixels on the canvas.
    pub(super) fn at(self, image_px: i32) -> i32 {
        image_px * self.0 as i32
    }
    /// A canvas length in image pixels.
    pub(super) fn image_px(self, canvas_px: u32) -> f64 {
        f64::from(canvas_px) / f64::from(self.0)
    }
    /// The canvas size of an image size.
    pub(super) fn canvas(self, image: (u32, u32)) -> (u32, u32) {
        (self.px(image.0), self.px(image.1))
    }
    /// A text style of the chart font at `size` image pixels.
    pub(super) fn font(self, size: u32) -> TextStyle<'static> {
        TextStyle::from((FONT, self.px(size)).into_font())
    }
    /// A bold text style of the chart font at `size` image pixels.
    pub(super) fn bold(self, size: u32) -> TextStyle<'static> {
        TextStyle::from((FONT, self.px(size)).into_font().style(FontStyle::Bold))
    }
    /// A line style of `width` image pixels.
    pub(super) fn line(self, color: impl Color, width: u32) -> ShapeStyle {
        color.stroke_width(self.px(width))
    }
}

/// The SVG text plotters wrote for a canvas of `canvas` pixels, with the root element's width and height set
/// to the image size; the `viewBox` keeps the canvas, so the viewer scales every coordinate by 1/k.
pub(super) fn svg_at_image_size(svg: String, canvas: (u32, u32), scale: Scale) -> Result<String, String> {
    let written = format!("<svg width=\"{}\" height=\"{}\" viewBox=\"0 0 {} {}\"", canvas.0, canvas.1, canvas.0, canvas.1);
    let image = (canvas.0 / scale.factor(), canvas.1 / scale.factor());
    match svg.strip_prefix(&written) {
        Some(rest) => Ok(format!("<svg width=\"{}\" height=\"{}\" viewBox=\"0 0 {} {}\"{rest}", image.0, image.1, canvas.0, canvas.1)),
        None => Err("the SVG backend wrote an unexpected root element".into()),
    }
}

/// Reduce an RGB canvas of `canvas` pixels by the factor k to `canvas / k` pixels: each image pixel is the
/// mean of its k × k block of canvas pixels (area filter), rounded to nearest. Integer arithmetic, so the
/// result is the same on every machine.
pub(super) fn box_downsample(rgb: &[u8], canvas: (u32, u32), scale: Scale) -> Vec<u8> {
    let canvas = (canvas.0 as usize, canvas.1 as usize);
    // a constant factor lets the compiler unroll the inner sums (the reduction is a large share of PNG time)
    match scale.factor() {
        2 => downsample_by(rgb, canvas, 2),
        3 => downsample_by(rgb, canvas, 3),
        4 => downsample_by(rgb, canvas, 4),
        k => downsample_by(rgb, canvas, k as usize),
    }
}

/// Two passes per image row: the k canvas rows are added byte by byte into 16-bit column sums (a contiguous,
/// vectorisable loop), then each image pixel adds its k columns. The same integer sums as one pass over each
/// k × k block, so the same bytes.
#[inline(always)]
fn downsample_by(rgb: &[u8], (cw, ch): (usize, usize), k: usize) -> Vec<u8> {
    let (w, h) = (cw / k, ch / k);
    assert_eq!(rgb.len(), cw * ch * 3, "canvas buffer size");
    if k > 257 {
        // a 16-bit column sum holds 257 × 255
        return downsample_blocks(rgb, (cw, ch), k);
    }
    let area = (k * k) as u32;
    let mut out = vec![0u8; w * h * 3];
    let mut columns = vec![0u16; cw * 3];
    for y in 0..h {
        let mut rows = rgb[y * k * cw * 3..(y + 1) * k * cw * 3].chunks_exact(cw * 3);
        if let Some(first) = rows.next() {
            for (c, v) in columns.iter_mut().zip(first) {
                *c = u16::from(*v);
            }
        }
        for row in rows {
            for (c, v) in columns.iter_mut().zip(row) {
                *c += u16::from(*v);
            }
        }
        for (o, block) in out[y * w * 3..(y + 1) * w * 3].chunks_exact_mut(3).zip(columns.chunks_exact(3 * k)) {
            let (mut r, mut g, mut b) = (0u32, 0u32, 0u32);
            for px in block.chunks_exact(3) {
                r += u32::from(px[0]);
                g += u32::from(px[1]);
                b += u32::from(px[2]);
            }
            o[0] = ((r + area / 2) / area) as u8;
            o[1] = ((g + area / 2) / area) as u8;
            o[2] = ((b + area / 2) / area) as u8;
        }
    }
    out
}

/// [`downsample_by`] in one pass over each k × k block (32-bit sums: any k).
fn downsample_blocks(rgb: &[u8], (cw, ch): (usize, usize), k: usize) -> Vec<u8> {
    let (w, h) = (cw / k, ch / k);
    let area = (k * k) as u32;
    let mut out = vec![0u8; w * h * 3];
    let mut sums = vec![0u32; w * 3];
    for y in 0..h {
        sums.iter_mut().for_each(|s| *s = 0);
        for row in rgb[y * k * cw * 3..(y + 1) * k * cw * 3].chunks_exact(cw * 3) {
            for (sum, block) in sums.chunks_exact_mut(3).zip(row.chunks_exact(3 * k)) {
                let (mut r, mut g, mut b) = (0u32, 0u32, 0u32);
                for px in block.chunks_exact(3) {
                    r += u32::from(px[0]);
                    g += u32::from(px[1]);
                    b += u32::from(px[2]);
                }
                sum[0] += r;
                sum[1] += g;
                sum[2] += b;
            }
        }
        for (o, s) in out[y * w * 3..(y + 1) * w * 3].iter_mut().zip(&sums) {
            *o = ((s + area / 2) / area) as u8;
        }
    }
    out
}

/// A backend wrapper that puts axis-parallel strokes and rectangles on whole image pixels. plotters places
/// them at canvas coordinates, i.e. at fractions of an image pixel, so a one-pixel grid line or axis would
/// be spread over two half-grey pixels after supersampling (and blurred by an SVG viewer). Here a horizontal
/// or vertical segment whose stroke width is a whole number n of image pixels becomes a filled rectangle
/// n pixels wide on the pixel grid, and filled rectangles get whole-pixel corners. Curves (and strokes of
/// other widths) pass through untouched: their sub-pixel positions are the point of supersampling.
pub(super) struct PixelGrid<DB> {
    inner: DB,
    k: i32,
    /// The opaque colour the whole canvas still has, if the caller filled it before drawing (see
    /// [`PixelGrid::prefilled`]); None once anything was drawn.
    blank: Option<(u8, u8, u8)>,
}

impl<DB> PixelGrid<DB> {
    /// Wrap a backend whose canvas is `scale` times the image.
    pub(super) fn new(inner: DB, scale: Scale) -> Self {
        PixelGrid { inner, k: scale.factor() as i32, blank: None }
    }

    /// [`PixelGrid::new`] for a canvas the caller has already filled with the opaque colour `rgb`: filling the
    /// whole canvas with that colour before anything else is drawn changes nothing and is skipped (a figure's
    /// white background costs no second pass over the canvas).
    pub(super) fn prefilled(inner: DB, scale: Scale, rgb: (u8, u8, u8)) -> Self {
        PixelGrid { inner, k: scale.factor() as i32, blank: Some(rgb) }
    }

    /// Nearest whole-pixel canvas coordinate.
    fn snap(&self, c: i32) -> i32 {
        (c + self.k / 2).div_euclid(self.k) * self.k
    }

    /// The whole-pixel rectangle \[x0, x1) × \[y0, y1) of an axis-parallel segment of stroke `width`, or None
    /// when the segment is slanted or the width is not a whole number of image pixels.
    fn segment_rect(&self, a: BackendCoord, b: BackendCoord, width: u32) -> Option<(BackendCoord, BackendCoord)> {
        let k = self.k;
        let w = width as i32;
        if w < k || w % k != 0 || (a.0 != b.0 && a.1 != b.1) {
            return None;
        }
        // across the stroke: n pixels starting at the pixel edge nearest to its lower side
        let across = |c: i32| {
            let lo = self.snap(c - w / 2);
            (lo, lo + w)
        };
        // along it: every pixel the segment touches, ends included (as a one-pixel plotters line)
        let along = |p: i32, q: i32| (p.min(q).div_euclid(k) * k, (p.max(q).div_euclid(k) + 1) * k);
        if a.0 == b.0 {
            let ((x0, x1), (y0, y1)) = (across(a.0), along(a.1, b.1));
            Some(((x0, y0), (x1, y1)))
        } else {
            let ((x0, x1), (y0, y1)) = (along(a.0, b.0), across(a.1));
            Some(((x0, y0), (x1, y1)))
        }
    }
}

impl<DB: DrawingBackend> DrawingBackend for PixelGrid<DB> {
    type ErrorType = DB::ErrorType;

    fn get_size(&self) -> (u32, u32) {
        self.inner.get_size()
    }
    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.ensure_prepared()
    }
    fn present(&mut self) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.inner.present()
    }
    fn draw_pixel(&mut self, point: BackendCoord, color: BackendColor) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        self.inner.draw_pixel(point, color)
    }
    fn draw_line<S: plotters_backend::BackendStyle>(&mut self, from: BackendCoord, to: BackendCoord, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        match self.segment_rect(from, to, style.stroke_width()) {
            Some((a, b)) => self.inner.draw_rect(a, b, style, true),
            None => self.inner.draw_line(from, to, style),
        }
    }
    fn draw_rect<S: plotters_backend::BackendStyle>(&mut self, upper_left: BackendCoord, bottom_right: BackendCoord, style: &S, fill: bool) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        let (x0, y0, x1, y1) = (upper_left.0, upper_left.1, bottom_right.0, bottom_right.1);
        if fill {
            let (a, b) = ((self.snap(x0), self.snap(y0)), (self.snap(x1), self.snap(y1)));
            if let Some(rgb) = self.blank.take() {
                let (w, h) = self.inner.get_size();
                let colour = style.color();
                if colour.alpha >= 1.0 && colour.rgb == rgb && a.0 <= 0 && a.1 <= 0 && i64::from(b.0) >= i64::from(w) - 1 && i64::from(b.1) >= i64::from(h) - 1 {
                    // the whole canvas already has this colour
                    self.blank = Some(rgb);
                    return Ok(());
                }
            }
            return self.inner.draw_rect(a, b, style, true);
        }
        self.blank = None;
        // an outline: four sides that do not overlap (a translucent border gets no darker corners)
        let sides = [((x0, y0), (x1, y0)), ((x0, y1), (x1, y1)), ((x0, y0), (x0, y1)), ((x1, y0), (x1, y1))];
        let rects: Option<Vec<_>> = sides.iter().map(|&(a, b)| self.segment_rect(a, b, style.stroke_width())).collect();
        match rects {
            Some(r) if x0 != x1 && y0 != y1 => {
                let (top, bottom) = (r[0], r[1]);
                self.inner.draw_rect(top.0, top.1, style, true)?;
                self.inner.draw_rect(bottom.0, bottom.1, style, true)?;
                for &(a, b) in &r[2..] {
                    // left and right sides between the top and bottom strokes
                    if top.1 .1 < bottom.0 .1 {
                        self.inner.draw_rect((a.0, top.1 .1), (b.0, bottom.0 .1), style, true)?;
                    }
                }
                Ok(())
            }
            _ => self.inner.draw_rect(upper_left, bottom_right, style, false),
        }
    }
    fn draw_path<S: plotters_backend::BackendStyle, I: IntoIterator<Item = BackendCoord>>(&mut self, path: I, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        let points: Vec<BackendCoord> = path.into_iter().collect();
        let rects: Option<Vec<_>> = points.windows(2).map(|p| self.segment_rect(p[0], p[1], style.stroke_width())).collect();
        match rects {
            // a single axis-parallel segment (grid lines, axes, ticks, legend swatches)
            Some(r) if r.len() == 1 => self.inner.draw_rect(r[0].0, r[0].1, style, true),
            _ => self.inner.draw_path(points, style),
        }
    }
    fn draw_circle<S: plotters_backend::BackendStyle>(&mut self, center: BackendCoord, radius: u32, style: &S, fill: bool) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        self.inner.draw_circle(center, radius, style, fill)
    }
    fn fill_polygon<S: plotters_backend::BackendStyle, I: IntoIterator<Item = BackendCoord>>(&mut self, vert: I, style: &S) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        self.inner.fill_polygon(vert, style)
    }
    fn blit_bitmap(&mut self, pos: BackendCoord, size: (u32, u32), src: &[u8]) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        self.inner.blit_bitmap(pos, size, src)
    }
    fn draw_text<TStyle: BackendTextStyle>(&mut self, text: &str, style: &TStyle, pos: BackendCoord) -> Result<(), DrawingErrorKind<Self::ErrorType>> {
        self.blank = None;
        self.inner.draw_text(text, style, pos)
    }
    fn estimate_text_size<TStyle: BackendTextStyle>(&self, text: &str, style: &TStyle) -> Result<(u32, u32), DrawingErrorKind<Self::ErrorType>> {
        self.inner.estimate_text_size(text, style)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn box_filter_averages_each_block() {
        // 4 × 2 canvas, k = 2: two image pixels
        let (w, b, r) = ([255u8, 255, 255], [0u8, 0, 0], [200u8, 10, 0]);
        let rows = [[w, b, r, r], [w, w, r, b]];
        let rgb: Vec<u8> = rows.iter().flatten().flatten().copied().collect();
        let out = box_downsample(&rgb, (4, 2), Scale(2));
        // rounded to nearest: (255 × 3 + 0 + 2) / 4 = 191, (200 × 3 + 0 + 2) / 4 = 150, (10 × 3 + 0 + 2) / 4 = 8
        assert_eq!(out, vec![191, 191, 191, 150, 8, 0]);
    }

    /// The two-pass reduction gives the bytes of the one-pass block sums, for any factor and canvas sizes that
    /// are not multiples of it.
    #[test]
    fn two_pass_reduction_matches_block_sums() {
        let mut state = 0x2545_F491_4F6C_DD1Du64;
        for k in 1..=5usize {
            let (cw, ch) = (7 * k + k / 2 + 1, 5 * k + 1);
            let rgb: Vec<u8> = (0..cw * ch * 3)
                .map(|_| {
                    state ^= state << 13;
                    state ^= state >> 7;
                    state ^= state << 17;
                    (state >> 56) as u8
                })
                .collect();
            assert_eq!(downsample_by(&rgb, (cw, ch), k), downsample_blocks(&rgb, (cw, ch), k), "k = {k}");
        }
    }

    /// A canvas allocated white skips the first whole-canvas white fill and ends with the same bytes as a zeroed
    /// canvas that is filled; any other first fill (another colour, part of the canvas) is drawn.
    #[test]
    fn prefilled_canvas_gives_the_same_bytes() {
        let size = (40u32, 24u32);
        let draw = |canvas: &mut Vec<u8>, prefilled: bool, background: RGBColor, whole: bool| {
            let backend = BitMapBackend::with_buffer(canvas, size);
            let grid = if prefilled { PixelGrid::prefilled(backend, Scale(4), (255, 255, 255)) } else { PixelGrid::new(backend, Scale(4)) };
            let root = grid.into_drawing_area();
            let area = if whole { root.clone() } else { root.margin(2, 2, 2, 2) };
            area.fill(&background).unwrap();
            root.draw(&Rectangle::new([(3, 3), (20, 11)], RGBColor(200, 10, 0).filled())).unwrap();
            root.draw(&PathElement::new(vec![(0, 23), (39, 0)], BLACK.stroke_width(4))).unwrap();
            root.present().unwrap();
        };
        for (background, whole) in [(WHITE, true), (BLUE, true), (WHITE, false)] {
            let mut zeroed = vec![0u8; 40 * 24 * 3];
            let mut white = vec![255u8; 40 * 24 * 3];
            draw(&mut zeroed, false, background, whole);
            draw(&mut white, true, background, whole);
            if whole {
                assert!(zeroed == white, "background {background:?}");
            } else {
                // the margin keeps the allocation's bytes; the drawn part is the same
                assert!(zeroed.iter().zip(&white).any(|(a, b)| a != b));
                let inner = |v: &Vec<u8>| v.chunks(40 * 3).skip(5).take(14).map(|row| row[15..105].to_vec()).collect::<Vec<_>>();
                assert!(inner(&zeroed) == inner(&white));
            }
        }
    }

    #[test]
    fn axis_parallel_strokes_land_on_whole_pixels() {
        let g = PixelGrid::new((), Scale(4));
        // a one-pixel vertical line at canvas x = 42 (image 10.5) fills image column 10 exactly
        assert_eq!(g.segment_rect((42, 3), (42, 17), 4), Some(((40, 0), (44, 20))));
        // a two-pixel horizontal line centred at canvas y = 41 (image 9.25 … 11.25) covers rows 9 and 10
        assert_eq!(g.segment_rect((0, 41), (9, 41), 8), Some(((0, 36), (12, 44))));
        // slanted segments and fractional widths pass through
        assert_eq!(g.segment_rect((0, 0), (9, 1), 4), None);
        assert_eq!(g.segment_rect((0, 0), (0, 9), 6), None);
        assert_eq!((g.snap(41), g.snap(42), g.snap(-3)), (40, 44, -4));
    }

    #[test]
    fn svg_root_gets_the_image_size_and_keeps_the_canvas_view() {
        let written = "<svg width=\"9400\" height=\"6400\" viewBox=\"0 0 9400 6400\" xmlns=\"http://www.w3.org/2000/svg\">\n</svg>\n".to_string();
        let s = svg_at_image_size(written, (9400, 6400), Scale(10)).unwrap();
        assert!(s.starts_with("<svg width=\"940\" height=\"640\" viewBox=\"0 0 9400 6400\" xmlns="), "{s}");
        assert!(svg_at_image_size("<svg width=\"1\"".into(), (9400, 6400), Scale(10)).is_err());
    }

    #[test]
    fn sizes_go_through_the_factor() {
        let s = Scale(4);
        assert_eq!((s.px(18), s.at(-3), s.canvas((1000, 620)), s.image_px(10)), (72, -12, (4000, 2480), 2.5));
    }
}
