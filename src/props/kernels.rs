//! Per-component property kernels: fast piecewise-polynomial evaluators of the ten temperature-dependent
//! properties of a component, used by droplet runs instead of the published correlations.
//!
//! Each kernel covers [`KERNEL_RANGE`] with segments at most [`SEGMENT_WIDTH`] wide whose ends include every
//! temperature where a property's definition changes (validity limits of the correlations, extension take-over
//! points, reduced-temperature caps). On first use of a segment by a group of properties evaluated together (the
//! four liquid properties a droplet needs at its surface temperature, the three vapour properties of its gas
//! film, each other property alone) the direct evaluation of each is
//! interpolated at [`COEFFICIENTS`] Chebyshev nodes (the vapour pressure as ln p) and the interpolant is checked
//! against the direct evaluation at the [`COEFFICIENTS`] + 1 Chebyshev extrema of the segment; a segment whose
//! worst relative deviation there exceeds [`ACCEPTED_DEVIATION`] (a kink not on a segment end, a value that
//! reaches zero) falls back to the direct evaluation, as does every temperature outside the range. The
//! interpolants are pure functions of the component data and the segment, so lazy building on any thread gives
//! the same bits. The kernels are shared by every copy of the component (runs, sweep cases, uncertainty
//! samples, whose property scales apply on top of the unscaled kernel values); tables and checks keep using
//! the published correlations directly (docs/property-methods.md, "Property kernels").

use std::sync::{Arc, OnceLock};

use crate::data::component::KernelSlot;
use crate::data::Component;
use crate::numerics::exp;
use crate::props::gas::AmbientGas;

mod fit;
use fit::{fit_function, fit_group};
#[cfg(test)]
use fit::fit_function_truncated;

/// Degree + 1 of the interpolating polynomial of a segment.
pub const COEFFICIENTS: usize = 12;
/// Widest segment \[K\].
pub const SEGMENT_WIDTH: f64 = 40.0;
/// Width of the cells of the segment look-up table \[K\].
const CELL_WIDTH: f64 = 2.5;
/// Flag of a look-up cell that lies inside one segment (no search needed).
const WHOLE_CELL: u32 = 1 << 31;
/// Temperatures \[K\] covered by kernels; outside, the direct evaluation is used.
pub const KERNEL_RANGE: (f64, f64) = (150.0, 3500.0);
/// Largest relative deviation from the direct evaluation accepted at the check points of a segment \[-\].
pub const ACCEPTED_DEVIATION: f64 = 2e-8;
/// Bound on the sum of the Chebyshev coefficients an interpolant drops, relative to the smallest magnitude of
/// the property on its segment (absolute for ln p): the interpolant keeps the lowest degree whose dropped tail
/// is below it, so a smooth property evaluates in fewer Horner steps \[-\].
pub const TRUNCATION: f64 = 1e-11;
/// Number of properties of a component (in [`Component::correlations`] order).
pub const PROPERTIES: usize = 10;
/// Index of the vapour pressure, interpolated as its logarithm.
const VAPOR_PRESSURE: usize = 0;

/// How a droplet run evaluates pure-component properties.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum PropertyEvaluation {
    /// Per-component property kernels (default; within 1e-7 relative of the direct evaluation).
    #[default]
    Kernels,
    /// The published correlations and their extensions, evaluated directly at every call.
    Direct,
}

/// One segment [lo, hi) of a kernel: its centre and the inverse half-width that map it onto \[−1, 1\].
#[derive(Debug, Clone, Copy)]
struct Segment {
    lo: f64,
    hi: f64,
    mid: f64,
    inv_half: f64,
}

/// Monomial coefficients in u = (t − mid)/half of a segment's interpolant; `ok` false: use the direct path.
#[derive(Debug, Clone, Copy)]
struct Poly {
    c: [f64; COEFFICIENTS],
    /// Highest power with a coefficient (those above are zero).
    degree: usize,
    ok: bool,
}

/// Interpolants of properties that are evaluated together, built together on first use in a segment;
/// coefficients stored power-major (`c[k][j]`: power k of property j), so that the Horner loops of the group
/// run side by side.
#[derive(Debug, Clone, Copy)]
struct PolyGroup<const N: usize> {
    c: [[f64; N]; COEFFICIENTS],
    /// Highest degree of the group's interpolants (the coefficients above are zero).
    degree: usize,
    /// Whether each interpolant passed its check (else the direct evaluation applies to it).
    ok: [bool; N],
    /// Whether every interpolant passed its check.
    all_ok: bool,
}

/// Properties (in [`Component::correlations`] order) a droplet evaluates at the surface temperature: vapour
/// pressure, liquid density, latent heat, liquid heat capacity.
const LIQUID_GROUP: [usize; 4] = [0, 1, 2, 3];
/// Properties a droplet's gas film evaluates at its reference temperature: ideal-gas heat capacity, vapour
/// viscosity, vapour conductivity.
const VAPOUR_GROUP: [usize; 3] = [7, 8, 9];
/// The other properties, each on its own: liquid viscosity, liquid conductivity, surface tension.
const SINGLES: [usize; 3] = [4, 5, 6];

/// The kernels of one component: segments and their lazily built interpolants (unscaled properties).
#[derive(Debug)]
pub struct PropertyKernels {
    segments: Box<[Segment]>,
    /// For each CELL_WIDTH cell of KERNEL_RANGE, the segment containing the cell's lower end, flagged
    /// [`WHOLE_CELL`] if the cell lies inside it.
    cell_first: Box<[u32]>,
    /// Interpolants of [`LIQUID_GROUP`], one group per segment.
    liquid: Box<[OnceLock<PolyGroup<4>>]>,
    /// Interpolants of [`VAPOUR_GROUP`], one group per segment.
    vapour: Box<[OnceLock<PolyGroup<3>>]>,
    /// Interpolants of [`SINGLES`]: `single[segment * 3 + slot]`.
    single: Box<[OnceLock<PolyGroup<1>>]>,
}

/// Temperatures \[K\] where some property of `c` changes its definition (see [`crate::props::pure`]).
fn kinks(c: &Component) -> Vec<f64> {
    use crate::data::Form;
    let tc = c.critical_temperature();
    let mut k = vec![];
    for (_, corr) in c.correlations() {
        k.push(corr.t_min);
        k.push(corr.t_max);
        match &corr.form {
            Form::Dippr105(a) => k.push(a[2]),
            Form::Dippr106 { tc, .. } | Form::Dippr114 { tc, .. } | Form::Wagner { tc, .. } | Form::MuleroCachadina { tc, .. } | Form::PpdsDensity { tc, .. } => {
                k.push(*tc);
                k.push(0.999 * tc); // Dippr114 holds τ ≥ 1e-3
            }
            Form::Nasa7 { t_mid, .. } => k.push(*t_mid),
            Form::Ppds9(a) => k.push(a[3] + 5.0),
            Form::Antoine(a) => k.push(1.0 - a[2]),
            _ => {}
        }
    }
    for f in [0.70, 0.76, 0.80, 0.98, 0.99, 1.0, 1.1] {
        k.push(f * tc);
    }
    k.push(crate::props::pure::vapor_conductivity_fit_limit(c));
    if let Some((takeover, ..)) = c.extensions().fluidity {
        k.push(takeover);
        k.push(takeover - crate::props::pure::FLUIDITY_SPAN);
    }
    k.retain(|t| t.is_finite() && *t > KERNEL_RANGE.0 && *t < KERNEL_RANGE.1);
    k.sort_by(f64::total_cmp);
    k.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
    k
}

impl PropertyKernels {
    /// Segments for component `c` (no property is evaluated until first use).
    pub fn new(c: &Component) -> Self {
        let (segments, cell_first) = segments_between(kinks(c));
        let n = segments.len();
        PropertyKernels {
            liquid: (0..n).map(|_| OnceLock::new()).collect(),
            vapour: (0..n).map(|_| OnceLock::new()).collect(),
            single: (0..n * SINGLES.len()).map(|_| OnceLock::new()).collect(),
            segments,
            cell_first,
        }
    }
}

/// Segments of [`KERNEL_RANGE`] at most [`SEGMENT_WIDTH`] wide with ends at `kinks` (sorted, inside the range),
/// and the first segment of each look-up cell ([`CELL_WIDTH`], flagged [`WHOLE_CELL`] when the cell lies inside
/// it with a margin far above the rounding of the cell index).
fn segments_between(kinks: Vec<f64>) -> (Box<[Segment]>, Box<[u32]>) {
    {
        let (lo, hi) = KERNEL_RANGE;
        let mut ends = vec![lo];
        ends.extend(kinks);
        ends.push(hi);
        let mut segments = vec![];
        for w in ends.windows(2) {
            let (a, b) = (w[0], w[1]);
            let pieces = ((b - a) / SEGMENT_WIDTH).ceil().max(1.0) as usize;
            for p in 0..pieces {
                let s_lo = a + (b - a) * p as f64 / pieces as f64;
                let s_hi = if p + 1 == pieces { b } else { a + (b - a) * (p + 1) as f64 / pieces as f64 };
                segments.push(Segment { lo: s_lo, hi: s_hi, mid: 0.5 * (s_lo + s_hi), inv_half: 2.0 / (s_hi - s_lo) });
            }
        }
        // one cell more: a temperature a rounding below the range's end can take the index of the cell after it
        let cells = ((hi - lo) / CELL_WIDTH).ceil() as usize + 1;
        let mut cell_first = Vec::with_capacity(cells);
        let mut i = 0usize;
        const MARGIN: f64 = 1e-6;
        for k in 0..cells {
            // the cell index of a temperature is rounded: the first segment is taken a margin below the cell
            let t = lo + CELL_WIDTH * k as f64 - MARGIN;
            while i + 1 < segments.len() && segments[i + 1].lo <= t {
                i += 1;
            }
            let whole = segments[i].lo <= t && (i + 1 == segments.len() || segments[i + 1].lo > lo + CELL_WIDTH * (k + 1) as f64 + MARGIN);
            cell_first.push(i as u32 | if whole { WHOLE_CELL } else { 0 });
        }
        (segments.into_boxed_slice(), cell_first.into_boxed_slice())
    }
}

/// The segment of `segments` containing `t`, if `t` lies in [`KERNEL_RANGE`].
#[inline]
fn find_segment(segments: &[Segment], cell_first: &[u32], t: f64) -> Option<usize> {
    let (lo, hi) = KERNEL_RANGE;
    if !(t >= lo && t < hi) {
        return None;
    }
    // inside the range the quotient lies in [0, 1340): the i32 conversion is exact and cheaper than to usize
    let cell = ((t - lo) * (1.0 / CELL_WIDTH)) as i32 as usize;
    let first = *cell_first.get(cell)?;
    if first & WHOLE_CELL != 0 {
        return Some((first & !WHOLE_CELL) as usize);
    }
    let mut i = first as usize;
    while let Some(next) = segments.get(i + 1) {
        if next.lo > t {
            break;
        }
        i += 1;
    }
    Some(i)
}

/// Horner evaluation of a segment interpolant at u.
#[inline(always)]
fn horner(poly: &Poly, u: f64) -> f64 {
    /// Horner steps from power TOP down (a constant, so the loop unrolls).
    #[inline(always)]
    fn from<const TOP: usize>(c: &[f64; COEFFICIENTS], u: f64) -> f64 {
        let mut v = c[TOP];
        for k in (0..TOP).rev() {
            v = v * u + c[k];
        }
        v
    }
    let c = &poly.c;
    match poly.degree {
        0..=3 => from::<3>(c, u),
        4 => from::<4>(c, u),
        5 => from::<5>(c, u),
        6 => from::<6>(c, u),
        7 => from::<7>(c, u),
        8 => from::<8>(c, u),
        _ => from::<{ COEFFICIENTS - 1 }>(c, u),
    }
}

/// Horner evaluation of interpolant `j` of a group at u (the bits of [`horner_group`]'s value j, and of
/// [`horner`] on the interpolant alone: starting higher, at zero coefficients, changes no bit).
#[inline(always)]
fn horner_column<const N: usize>(group: &PolyGroup<N>, j: usize, u: f64) -> f64 {
    /// Horner steps from power TOP down (a constant, so the loop unrolls).
    #[inline(always)]
    fn from<const N: usize, const TOP: usize>(c: &[[f64; N]; COEFFICIENTS], j: usize, u: f64) -> f64 {
        let mut v = c[TOP][j];
        for k in (0..TOP).rev() {
            v = v * u + c[k][j]; // not mul_add: without the fma target feature that is a library call
        }
        v
    }
    let c = &group.c;
    match group.degree {
        0..=3 => from::<N, 3>(c, j, u),
        4 => from::<N, 4>(c, j, u),
        5 => from::<N, 5>(c, j, u),
        6 => from::<N, 6>(c, j, u),
        7 => from::<N, 7>(c, j, u),
        8 => from::<N, 8>(c, j, u),
        _ => from::<N, { COEFFICIENTS - 1 }>(c, j, u),
    }
}

/// Horner evaluation of interpolant `j` of a group's coefficients at u with its first and second derivatives in
/// u (the value has the bits of [`horner_column`]: the derivative sums do not touch it).
#[inline(always)]
fn horner_column_derivatives<const N: usize>(group: &PolyGroup<N>, j: usize, u: f64) -> (f64, f64, f64) {
    /// Horner steps from power TOP down (a constant, so the loop unrolls).
    #[inline(always)]
    fn from<const N: usize, const TOP: usize>(c: &[[f64; N]; COEFFICIENTS], j: usize, u: f64) -> (f64, f64, f64) {
        let mut v = c[TOP][j];
        let mut d1 = 0.0;
        let mut d2 = 0.0;
        for k in (0..TOP).rev() {
            d2 = d2 * u + d1;
            d1 = d1 * u + v;
            v = v * u + c[k][j];
        }
        (v, d1, 2.0 * d2)
    }
    // each degree its own unrolled loop (the operations of a loop from the degree down: the same bits)
    let c = &group.c;
    match group.degree {
        0 => from::<N, 0>(c, j, u),
        1 => from::<N, 1>(c, j, u),
        2 => from::<N, 2>(c, j, u),
        3 => from::<N, 3>(c, j, u),
        4 => from::<N, 4>(c, j, u),
        5 => from::<N, 5>(c, j, u),
        6 => from::<N, 6>(c, j, u),
        7 => from::<N, 7>(c, j, u),
        8 => from::<N, 8>(c, j, u),
        9 => from::<N, 9>(c, j, u),
        10 => from::<N, 10>(c, j, u),
        _ => from::<N, { COEFFICIENTS - 1 }>(c, j, u),
    }
}

/// Horner evaluation of the interpolants of a group at u, side by side (each value has the bits of
/// [`horner`] on its own coefficients: the same operations in the same order).
#[inline(always)]
fn horner_group<const N: usize>(group: &PolyGroup<N>, u: f64) -> [f64; N] {
    /// Horner steps from power TOP down (a constant, so the loops unroll).
    #[inline(always)]
    fn from<const N: usize, const TOP: usize>(c: &[[f64; N]; COEFFICIENTS], u: f64) -> [f64; N] {
        let mut v = c[TOP];
        for k in (0..TOP).rev() {
            for (vj, cj) in v.iter_mut().zip(&c[k]) {
                *vj = *vj * u + cj;
            }
        }
        v
    }
    let c = &group.c;
    match group.degree {
        0..=3 => from::<N, 3>(c, u),
        4 => from::<N, 4>(c, u),
        5 => from::<N, 5>(c, u),
        6 => from::<N, 6>(c, u),
        7 => from::<N, 7>(c, u),
        8 => from::<N, 8>(c, u),
        _ => from::<N, { COEFFICIENTS - 1 }>(c, u),
    }
}

impl PropertyKernels {

    /// Number of segments.
    pub fn segment_count(&self) -> usize {
        self.segments.len()
    }

    /// The segment containing `t`, if `t` lies in [`KERNEL_RANGE`].
    #[inline]
    fn segment_of(&self, t: f64) -> Option<usize> {
        find_segment(&self.segments, &self.cell_first, t)
    }

    /// Unscaled value of property `property` of `c` at `t` from its kernel; None where the direct evaluation
    /// applies (outside the range, or a segment that did not pass its check).
    #[inline]
    pub fn eval(&self, c: &Component, property: usize, t: f64) -> Option<f64> {
        let s = self.segment_of(t)?;
        let seg = &self.segments[s];
        let u = (t - seg.mid) * seg.inv_half;
        let (value, ok) = match property {
            0..=3 => {
                let g = self.liquid[s].get_or_init(|| fit_group(c, LIQUID_GROUP, seg));
                (horner_column(g, property, u), g.ok[property])
            }
            7..=9 => {
                let g = self.vapour[s].get_or_init(|| fit_group(c, VAPOUR_GROUP, seg));
                (horner_column(g, property - 7, u), g.ok[property - 7])
            }
            4..=6 => {
                let g = self.single.get(s * SINGLES.len() + property - 4)?.get_or_init(|| fit_group(c, [property], seg));
                (horner_column(g, 0, u), g.ok[0])
            }
            _ => return None,
        };
        if !ok {
            return None;
        }
        Some(if property == VAPOR_PRESSURE { exp(value) } else { value })
    }

    /// Unscaled vapour pressure, liquid density, latent heat and liquid heat capacity of `c` at `t` from one
    /// segment look-up; None unless all four are served (each value has the bits [`PropertyKernels::eval`]
    /// gives it).
    #[inline(always)]
    pub fn liquid_group(&self, c: &Component, t: f64) -> Option<[f64; 4]> {
        let s = self.segment_of(t)?;
        let seg = &self.segments[s];
        let g = self.liquid[s].get_or_init(|| fit_group(c, LIQUID_GROUP, seg));
        if !g.all_ok {
            return None;
        }
        let mut v = horner_group(g, (t - seg.mid) * seg.inv_half);
        v[0] = exp(v[0]);
        Some(v)
    }

    /// Unscaled vapour pressure and latent heat of `c` at `t` from its liquid group, the bits of values 0 and 2 of
    /// [`PropertyKernels::liquid_group`] (None where it gives None): the two columns alone, for a caller that needs
    /// no density or heat capacity.
    #[inline]
    pub fn pressure_and_latent(&self, c: &Component, t: f64) -> Option<[f64; 2]> {
        self.liquid_columns(c, t, 0, 2).map(|[ln_p, latent]| [ln_p.exp(), latent])
    }

    /// Unscaled liquid density and liquid heat capacity of `c` at `t` from its liquid group, the bits of values 1
    /// and 3 of [`PropertyKernels::liquid_group`] (None where it gives None).
    #[inline]
    pub fn density_and_heat_capacity(&self, c: &Component, t: f64) -> Option<[f64; 2]> {
        self.liquid_columns(c, t, 1, 3)
    }

    /// Columns `first` and `second` of the liquid group of `c` at `t` (None unless the whole group is served).
    #[inline(always)]
    fn liquid_columns(&self, c: &Component, t: f64, first: usize, second: usize) -> Option<[f64; 2]> {
        let s = self.segment_of(t)?;
        let seg = &self.segments[s];
        let g = self.liquid[s].get_or_init(|| fit_group(c, LIQUID_GROUP, seg));
        if !(g.ok[0] && g.ok[1] && g.ok[2] && g.ok[3]) {
            return None;
        }
        let u = (t - seg.mid) * seg.inv_half;
        Some([horner_column(g, first, u), horner_column(g, second, u)])
    }

    /// Unscaled ideal-gas heat capacity, vapour viscosity and vapour conductivity of `c` at `t` from one
    /// segment look-up; None unless all three are served (bits as [`PropertyKernels::eval`]).
    #[inline(always)]
    pub fn vapour_group(&self, c: &Component, t: f64) -> Option<[f64; 3]> {
        let s = self.segment_of(t)?;
        let seg = &self.segments[s];
        let g = self.vapour[s].get_or_init(|| fit_group(c, VAPOUR_GROUP, seg));
        if !g.all_ok {
            return None;
        }
        Some(horner_group(g, (t - seg.mid) * seg.inv_half))
    }

    /// Largest relative deviation from the direct evaluation of property `property` over the kernel segments
    /// overlapping \[from, to\], probed every `step` K, and the share of that range served by the kernel; builds
    /// the interpolants it touches.
    pub fn measured_deviation(&self, c: &Component, property: usize, from: f64, to: f64, step: f64) -> (f64, f64) {
        let mut worst = 0.0f64;
        let (mut served, mut total) = (0usize, 0usize);
        let mut t = from;
        while t <= to {
            let direct = c.unscaled_direct(property, t);
            total += 1;
            if let Some(v) = self.eval(c, property, t) {
                served += 1;
                let dev = if direct == 0.0 { v.abs() } else { (v / direct - 1.0).abs() };
                worst = worst.max(dev);
            }
            t += step;
        }
        (worst, served as f64 / total.max(1) as f64)
    }
}

/// Step \[K\] of the central differences of [`VaporPressures::at_with_slopes`] where no kernel serves.
pub const SLOPE_STEP: f64 = 0.01;

/// Vapour pressures of a fixed list of components at one temperature after another (the sweeps of bubble-point,
/// distillation and flash-point iterations), each with the bits of [`Component::vapor_pressure`]: a component
/// evaluating through its kernels remembers the segment of its last temperature, so a sweep at a temperature in
/// the same segment skips the search and the dispatch (components without kernels, and temperatures a kernel
/// does not serve, take [`Component::vapor_pressure`] itself).
pub struct VaporPressures<'a> {
    components: &'a [Arc<Component>],
    last: Vec<LastSegment<'a>>,
}

/// The kernel segment a component's last vapour pressure came from.
#[derive(Clone, Copy)]
struct LastSegment<'a> {
    lo: f64,
    hi: f64,
    mid: f64,
    inv_half: f64,
    /// Vapour-pressure scale of the component \[-\].
    scale: f64,
    /// The segment's liquid-group interpolants (None: nothing remembered).
    group: Option<&'a PolyGroup<4>>,
}

impl<'a> VaporPressures<'a> {
    /// An evaluator for `components` (nothing is evaluated yet).
    pub fn new(components: &'a [Arc<Component>]) -> Self {
        let none = LastSegment { lo: 0.0, hi: 0.0, mid: 0.0, inv_half: 0.0, scale: 1.0, group: None };
        VaporPressures { components, last: vec![none; components.len()] }
    }

    /// Number of components.
    pub fn len(&self) -> usize {
        self.components.len()
    }

    /// Whether there are no components.
    pub fn is_empty(&self) -> bool {
        self.components.is_empty()
    }

    /// Vapour pressure of component `i` at `t` \[Pa\] (the bits of `components[i].vapor_pressure(t)`).
    #[inline(always)]
    pub fn at(&mut self, i: usize, t: f64) -> f64 {
        let last = &self.last[i];
        if let Some(g) = last.group {
            if t >= last.lo && t < last.hi {
                // as PropertyKernels::eval: the interpolant of ln p, then exp, then the scale
                return exp(horner_column(g, VAPOR_PRESSURE, (t - last.mid) * last.inv_half)) * last.scale;
            }
        }
        self.search(i, t)
    }

    /// [`Self::at`] (the same bits) with the first and second derivatives of ln p_sat in t \[1/K, 1/K²\]: analytic
    /// from the kernel's interpolant of ln p, else central differences of the direct evaluation ([`SLOPE_STEP`]).
    #[inline(always)]
    pub fn at_with_slopes(&mut self, i: usize, t: f64) -> (f64, f64, f64) {
        let last = &self.last[i];
        if !(last.group.is_some() && t >= last.lo && t < last.hi) {
            self.search(i, t);
        }
        match self.last[i] {
            LastSegment { group: Some(g), lo, hi, mid, inv_half, scale } if t >= lo && t < hi => {
                let (v, d1, d2) = horner_column_derivatives(g, VAPOR_PRESSURE, (t - mid) * inv_half);
                (exp(v) * scale, d1 * inv_half, d2 * inv_half * inv_half)
            }
            _ => {
                let c = &self.components[i];
                let (lo, mid, hi) = (c.vapor_pressure(t - SLOPE_STEP).ln(), c.vapor_pressure(t), c.vapor_pressure(t + SLOPE_STEP).ln());
                (mid, (hi - lo) / (2.0 * SLOPE_STEP), (hi - 2.0 * mid.ln() + lo) / (SLOPE_STEP * SLOPE_STEP))
            }
        }
    }

    /// [`Self::at`] when `t` lies outside the remembered segment: find its segment and remember it.
    #[cold]
    fn search(&mut self, i: usize, t: f64) -> f64 {
        let c: &'a Component = &self.components[i];
        if let Some(k) = active(c) {
            if let Some(s) = k.segment_of(t) {
                let seg = &k.segments[s];
                let g = k.liquid[s].get_or_init(|| fit_group(c, LIQUID_GROUP, seg));
                if g.ok[VAPOR_PRESSURE] {
                    let scale = c.property_scales[VAPOR_PRESSURE];
                    self.last[i] = LastSegment { lo: seg.lo, hi: seg.hi, mid: seg.mid, inv_half: seg.inv_half, scale, group: Some(g) };
                    return exp(horner_column(g, VAPOR_PRESSURE, (t - seg.mid) * seg.inv_half)) * scale;
                }
            }
        }
        c.vapor_pressure(t)
    }
}

/// Kernel of an ambient gas's heat capacity, Wilke viscosity and Wassiljewa–Mason–Saxena conductivity
/// ([`AmbientGas::transport`]), built like the component kernels.
#[derive(Debug)]
pub struct GasKernel {
    /// The species (with their correlations) and mole fractions (bits) the kernel was built for: a changed
    /// gas builds its own.
    built_for: (Vec<crate::data::GasSpecies>, Vec<u64>),
    segments: Box<[Segment]>,
    cell_first: Box<[u32]>,
    /// `polys[segment * 3 + output]`.
    polys: Box<[OnceLock<Poly>]>,
}

/// Whether the transport properties of `gas` are those `kernel` was built for: same species with the same
/// correlations, same mole fractions (compared field by field; no formatting, no allocation).
fn built_for(kernel: &GasKernel, gas: &AmbientGas) -> bool {
    kernel.built_for.0[..] == gas.species[..] && kernel.built_for.1.len() == gas.mole_fractions.len() && kernel.built_for.1.iter().zip(&gas.mole_fractions).all(|(a, b)| *a == b.to_bits())
}

impl GasKernel {
    /// Segments for `gas` (ends at every validity limit of its species' correlations).
    pub fn new(gas: &AmbientGas) -> Self {
        let mut k = vec![];
        for g in gas.species.iter() {
            for corr in [&g.ideal_gas_heat_capacity, &g.viscosity, &g.conductivity] {
                k.push(corr.t_min);
                k.push(corr.t_max);
                if let crate::data::Form::Nasa7 { t_mid, .. } = corr.form {
                    k.push(t_mid);
                }
            }
        }
        k.retain(|t| t.is_finite() && *t > KERNEL_RANGE.0 && *t < KERNEL_RANGE.1);
        k.sort_by(f64::total_cmp);
        k.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
        let (segments, cell_first) = segments_between(k);
        let polys = (0..segments.len() * 3).map(|_| OnceLock::new()).collect();
        GasKernel { built_for: (gas.species.to_vec(), gas.mole_fractions.iter().map(|v| v.to_bits()).collect()), segments, cell_first, polys }
    }

    /// (cp, μ, k) of `gas` at `t` from the kernel; None where the direct evaluation applies.
    #[inline]
    pub fn transport(&self, gas: &AmbientGas, t: f64) -> Option<(f64, f64, f64)> {
        let s = find_segment(&self.segments, &self.cell_first, t)?;
        let seg = &self.segments[s];
        let u = (t - seg.mid) * seg.inv_half;
        let mut out = [0.0; 3];
        for (j, o) in out.iter_mut().enumerate() {
            let poly = self.polys.get(s * 3 + j)?.get_or_init(|| {
                fit_function(
                    &|t| {
                        let (cp, mu, k) = gas.transport(t);
                        [cp, mu, k][j]
                    },
                    false,
                    seg,
                )
            });
            if !poly.ok {
                return None;
            }
            *o = horner(poly, u);
        }
        Some((out[0], out[1], out[2]))
    }
}

/// The gas of a run under `mode`: with its kernel (built once per gas and shared by its copies) or without.
pub fn run_gas(gas: &AmbientGas, mode: PropertyEvaluation) -> AmbientGas {
    let mut g = gas.clone();
    g.kernel = match mode {
        PropertyEvaluation::Direct => None,
        PropertyEvaluation::Kernels => {
            let shared = gas.kernel_slot.get_or_init(|| Arc::new(GasKernel::new(gas))).clone();
            Some(if built_for(&shared, gas) { shared } else { Arc::new(GasKernel::new(gas)) })
        }
    };
    g
}

/// The kernels `c` evaluates through, if any.
#[inline]
pub fn active(c: &Component) -> Option<&PropertyKernels> {
    c.kernels.active.as_deref().and_then(|k| k.downcast_ref::<PropertyKernels>())
}

/// The kernels `c` evaluates through, if any, as a shared handle (for callers that keep them).
pub fn active_shared(c: &Component) -> Option<Arc<PropertyKernels>> {
    c.kernels.active.clone().and_then(|k| k.downcast::<PropertyKernels>().ok())
}

/// The kernels of `c` (built once, shared by every copy of `c`).
pub fn kernels_of(c: &Component) -> Arc<dyn std::any::Any + Send + Sync> {
    c.kernels.shared.get_or_init(|| Arc::new(PropertyKernels::new(c))).clone()
}

/// The copy of `c` that evaluates its properties through its kernels (cached in `c`; `c` itself if it already
/// does).
pub fn with_kernels(c: &Arc<Component>) -> Arc<Component> {
    if c.kernels.active.is_some() {
        return c.clone();
    }
    c.kernels
        .twin
        .get_or_init(|| {
            let k = kernels_of(c);
            let slot = KernelSlot { shared: c.kernels.shared.clone(), active: Some(k), twin: OnceLock::new() };
            Arc::new(Component { kernels: slot, ..(**c).clone() })
        })
        .clone()
}

/// The copy of `c` that evaluates its properties directly.
pub fn without_kernels(c: &Arc<Component>) -> Arc<Component> {
    if c.kernels.active.is_none() {
        return c.clone();
    }
    let slot = KernelSlot { shared: c.kernels.shared.clone(), active: None, twin: OnceLock::new() };
    Arc::new(Component { kernels: slot, ..(**c).clone() })
}

/// The components of a run under `mode`.
pub fn run_components(components: &[Arc<Component>], mode: PropertyEvaluation) -> Vec<Arc<Component>> {
    match mode {
        PropertyEvaluation::Kernels => components.iter().map(with_kernels).collect(),
        PropertyEvaluation::Direct => components.iter().map(without_kernels).collect(),
    }
}

/// The components of a run under `mode` when some of `components` are not yet set to it (None: all are).
pub fn swap_components(components: &[Arc<Component>], mode: PropertyEvaluation) -> Option<Vec<Arc<Component>>> {
    let want_kernels = mode == PropertyEvaluation::Kernels;
    if components.iter().all(|c| c.kernels.active.is_some() == want_kernels) {
        return None;
    }
    Some(run_components(components, mode))
}

#[cfg(test)]
mod tests;
