//! Axis ranges, ticks and their labels.

#[allow(unused_imports)]
use super::*;

/// Tick positions plotters will use for a range and label count.
pub(super) fn ticks(range: (f64, f64), n: usize) -> Vec<f64> {
    RangedCoordf64::from(range.0..range.1).key_points(n)
}

/// Smallest label count, from `n` up, that gives at least four ticks (a 1-2-5 step can leave only two).
pub(super) fn enough_ticks(range: (f64, f64), n: usize) -> usize {
    (n..=n + 8).find(|&k| ticks(range, k).len() >= 4).unwrap_or(n)
}

/// Decimals that show the tick step exactly (steps are 1, 2 or 5 × 10^k).
pub(super) fn tick_decimals(range: (f64, f64), n: usize) -> usize {
    let t = ticks(range, n);
    let step = if t.len() >= 2 { (t[1] - t[0]).abs() } else { (range.1 - range.0).abs().max(1e-12) };
    let d = (-(step.log10()) - 1e-9).ceil();
    if d.is_finite() && d > 0.0 {
        (d as usize).min(8)
    } else {
        0
    }
}

pub(super) fn format_tick(v: f64, decimals: usize) -> String {
    let s = format!("{:.*}", decimals, v);
    // "-0" and "-0.00" read badly
    if s.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
        s.trim_start_matches('-').to_string()
    } else {
        s.replace('-', "−")
    }
}

/// Range of finite values with padding; degenerate ranges are widened.
pub(super) fn padded_range(values: impl Iterator<Item = f64>, pad: f64, from_zero: bool) -> (f64, f64) {
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

/// Time axis scale for a largest time \[s\]: (factor, unit).
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
pub(super) fn thin(n: usize, max: usize) -> Vec<usize> {
    if n <= max || max < 2 {
        return (0..n).collect();
    }
    let mut idx: Vec<usize> = (0..max).map(|k| k * (n - 1) / (max - 1)).collect();
    idx.dedup();
    idx
}

/// Share of the axis span added on each side of a line chart so curves at the extremes are not cut by the frame.
pub(super) const FRAME_MARGIN: f64 = 0.015;

pub(super) fn widen(r: (f64, f64), share: f64) -> (f64, f64) {
    let span = r.1 - r.0;
    (r.0 - share * span, r.1 + share * span)
}

/// Axis ranges of a panel; line panels get a small margin inside the frame (stacked areas fill it exactly).
pub(super) fn panel_ranges(p: &Panel) -> ((f64, f64), (f64, f64)) {
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
pub(super) fn log_range(p: &Panel) -> (f64, f64) {
    let logs = p.series.iter().flat_map(|s| s.points.iter().filter_map(|q| q.1)).filter(|v| *v > 0.0 && v.is_finite()).map(f64::log10);
    let (lo, hi) = logs.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    // stop at the nearest 1-2-5 value beyond a 5 % margin, not at the next whole decade (101 kPa ends at 200)
    let margin = 1.05f64.log10();
    let (lo, hi) = (nice_log(lo - margin, false), nice_log(hi + margin, true));
    if hi - lo < 1.0 { (hi - 1.0, hi) } else { (lo, hi) }
}

/// log10 of the nearest value of the 1-2-5 series at or below (`up` false) or at or above (`up` true) 10^v.
pub(super) fn nice_log(v: f64, up: bool) -> f64 {
    let k = v.floor();
    let mantissa = 10f64.powf(v - k);
    let steps = [1.0, 2.0, 5.0, 10.0];
    let pick = if up { steps.iter().copied().find(|m| *m >= mantissa * (1.0 - 1e-12)).unwrap_or(10.0) } else { steps.iter().rev().copied().find(|m| *m <= mantissa * (1.0 + 1e-12)).unwrap_or(1.0) };
    k + pick.log10()
}

/// Tick label of a log axis at log10 value `v`: the value itself at whole decades, nothing between.
pub(super) fn decade_label(v: f64) -> String {
    let k = v.round();
    if (v - k).abs() > 1e-9 {
        return String::new();
    }
    let value = 10f64.powi(k as i32);
    if k >= 0.0 { format!("{value:.0}") } else { format!("{:.*}", (-k) as usize, value) }
}

pub(super) fn data_ranges(p: &Panel) -> ((f64, f64), (f64, f64)) {
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
