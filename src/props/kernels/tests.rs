//! Unit tests of the property kernels (src/props/kernels.rs).
use super::*;
use crate::data::Library;

/// Every property of every library component: where the kernel serves it between 250 K and the critical
/// temperature (liquid properties) or 250–2500 K (vapour properties), it stays within 1e-7 of the direct
/// evaluation on a 0.37 K grid, and it serves most of that range.
#[test]
fn kernels_match_direct_evaluation() {
    let lib = Library::embedded().unwrap();
    let mut worst_all = 0.0f64;
    for c in lib.components() {
        let k = PropertyKernels::new(c);
        for p in 0..PROPERTIES {
            let to = if p >= 7 { 2500.0 } else { 0.999 * c.critical_temperature() };
            let (worst, served) = k.measured_deviation(c, p, 250.0, to, 0.37);
            assert!(worst < 1e-7, "{} property {p}: {worst:e}", c.id);
            assert!(served > 0.8, "{} property {p}: kernel serves only {:.0} %", c.id, 100.0 * served);
            worst_all = worst_all.max(worst);
        }
    }
    eprintln!("largest kernel deviation over the library: {worst_all:e}");
}

/// Truncated interpolants: for every property of every library component on every segment from 250 K to
/// 0.95 T_c (liquid properties) or 2500 K (vapour properties), the truncated interpolant differs from the
/// full-degree one by less than 3 × TRUNCATION relative (absolute in ln p) on a 0.53 K grid, and the
/// library's interpolants need on average well below the full degree.
#[test]
fn truncation_drops_only_negligible_terms() {
    let lib = Library::embedded().unwrap();
    let (mut kept, mut fits) = (0usize, 0usize);
    for c in lib.components() {
        let k = PropertyKernels::new(c);
        for p in 0..PROPERTIES {
            let to = if p >= 7 { 2500.0 } else { 0.95 * c.critical_temperature() };
            for seg in k.segments.iter().filter(|s| s.hi > 250.0 && s.lo < to) {
                let log = p == VAPOR_PRESSURE;
                let direct = |t: f64| c.unscaled_direct(p, t);
                let full = fit_function_truncated(&direct, log, seg, 0.0);
                let short = fit_function_truncated(&direct, log, seg, TRUNCATION);
                if !full.ok {
                    continue;
                }
                assert!(short.ok, "{} property {p} on [{}, {}]: the truncated fit fails its check", c.id, seg.lo, seg.hi);
                assert!(short.degree <= full.degree);
                fits += 1;
                kept += short.degree + 1;
                let mut t = seg.lo;
                while t < seg.hi {
                    let u = (t - seg.mid) * seg.inv_half;
                    let (a, b) = (horner(&full, u), horner(&short, u));
                    let dev = if log { (a - b).abs() } else { (b / a - 1.0).abs() };
                    assert!(dev < 3.0 * TRUNCATION, "{} property {p} at {t} K: {dev:e}", c.id);
                    t += 0.53;
                }
            }
        }
    }
    let mean = kept as f64 / fits as f64;
    eprintln!("{fits} interpolants keep {mean:.2} of {COEFFICIENTS} coefficients on average");
    assert!(mean < COEFFICIENTS as f64 - 2.0, "mean kept coefficients {mean}");
}

/// The cell table finds the segment a plain search finds: for every library component, at temperatures on
/// a fine grid, at every segment and cell end and one ulp either side of them.
#[test]
fn segment_lookup_matches_a_plain_search() {
    let lib = Library::embedded().unwrap();
    let plain = |segs: &[Segment], t: f64| -> Option<usize> {
        if !(t >= KERNEL_RANGE.0 && t < KERNEL_RANGE.1) {
            return None;
        }
        segs.iter().rposition(|s| s.lo <= t)
    };
    for c in lib.components() {
        let k = PropertyKernels::new(c);
        let mut probes: Vec<f64> = (0..=13_500).map(|i| KERNEL_RANGE.0 + 0.25 * i as f64 - 1.0).collect();
        for s in k.segments.iter() {
            probes.push(s.lo);
            probes.push(s.hi);
        }
        for cell in 0..=k.cell_first.len() {
            probes.push(KERNEL_RANGE.0 + CELL_WIDTH * cell as f64);
        }
        for t in probes.clone() {
            probes.push(f64::from_bits(t.to_bits() + 1));
            probes.push(f64::from_bits(t.to_bits() - 1));
        }
        for t in probes {
            assert_eq!(find_segment(&k.segments, &k.cell_first, t), plain(&k.segments, t), "{} at {t:e} K", c.id);
        }
    }
}

/// The air kernel stays within 1e-7 of the direct mixture transport properties over 250–2500 K.
#[test]
fn gas_kernel_matches_direct_evaluation() {
    let lib = Library::embedded().unwrap();
    let air = AmbientGas::air(&lib).unwrap();
    let fast = run_gas(&air, PropertyEvaluation::Kernels);
    let k = fast.kernel.as_ref().unwrap();
    let (mut worst, mut served, mut total) = (0.0f64, 0, 0);
    let mut t = 250.0;
    while t < 2500.0 {
        let d = air.transport(t);
        total += 1;
        if let Some(v) = k.transport(&air, t) {
            served += 1;
            for (a, b) in [(v.0, d.0), (v.1, d.1), (v.2, d.2)] {
                worst = worst.max((a / b - 1.0).abs());
            }
        }
        t += 0.37;
    }
    assert!(worst < 1e-7, "{worst:e}");
    assert!(served as f64 > 0.9 * total as f64, "{served}/{total}");
    assert!(run_gas(&air, PropertyEvaluation::Direct).kernel.is_none());
}

/// The sweep evaluator gives the bits of `Component::vapor_pressure` for kernel, rescaled and direct
/// components, at temperatures that stay in a segment, jump between segments and leave the kernel range.
#[test]
fn vapor_pressure_sweeps_have_the_bits_of_the_component() {
    let lib = Library::embedded().unwrap();
    let mut components: Vec<Arc<Component>> = vec![];
    for id in ["n-decane", "n-hexadecane", "toluene", "1-methylnaphthalene"] {
        let c = lib.component(id).unwrap().clone();
        let mut scales = [1.0; 10];
        scales[VAPOR_PRESSURE] = 1.07;
        components.push(Arc::new(with_kernels(&c).with_property_scales(scales)));
        components.push(with_kernels(&c));
        components.push(c);
    }
    let mut sweeps = VaporPressures::new(&components);
    // a fine walk up through the range, then jumps back and forth
    let walk = (0..9600).map(|k| 120.0 + 0.37 * k as f64);
    let jumps = (0..2000).map(|k| 250.0 + (k as f64 * 7.31) % 600.0 - if k % 3 == 0 { 90.0 } else { 0.0 });
    for t in walk.chain(jumps) {
        for (i, c) in components.iter().enumerate() {
            assert_eq!(sweeps.at(i, t).to_bits(), c.vapor_pressure(t).to_bits(), "{} at {t} K", c.id);
        }
    }
    assert_eq!(sweeps.len(), components.len());
}

#[test]
fn scales_apply_on_top_and_direct_copy_is_direct() {
    let lib = Library::embedded().unwrap();
    let c = lib.component("n-decane").unwrap().clone();
    let fast = with_kernels(&c);
    assert!(active(&fast).is_some() && active(&c).is_none());
    assert!(Arc::ptr_eq(&fast, &with_kernels(&c)), "twin is cached");
    let p = fast.vapor_pressure(400.0);
    assert!((p / c.vapor_pressure(400.0) - 1.0).abs() < 1e-7);
    let mut scales = [1.0; 10];
    scales[0] = 1.5;
    let scaled = Arc::new(fast.with_property_scales(scales));
    assert!(active(&scaled).is_some());
    assert_eq!(scaled.vapor_pressure(400.0), 1.5 * p);
    assert!(active(&without_kernels(&fast)).is_none());
    // a plain copy may be changed after copying: it builds its own kernels
    let mut changed = (*c).clone();
    if let crate::data::Form::Dippr101(ref mut a) = changed.vapor_pressure.form {
        a[0] += 0.5f64.ln();
    }
    let changed = with_kernels(&Arc::new(changed));
    assert!((changed.vapor_pressure(400.0) / (0.5 * p) - 1.0).abs() < 1e-7);
}

/// The values of `at_with_slopes` have the bits of `at`; its derivatives of ln p match central differences
/// of the same kernel (and of the direct evaluation where no kernel serves).
#[test]
fn vapour_pressure_slopes_match_differences() {
    let lib = Library::embedded().unwrap();
    // every library component (the props layer does not read fuels)
    let all: Vec<Arc<Component>> = lib.components().to_vec();
    for comps in [run_components(&all, PropertyEvaluation::Kernels), run_components(&all, PropertyEvaluation::Direct)] {
        let (mut plain, mut sloped) = (VaporPressures::new(&comps), VaporPressures::new(&comps));
        for i in 0..comps.len() {
            for t in [300.0, 351.7, 423.4, 480.1, 140.0] {
                let (p, d1, d2) = sloped.at_with_slopes(i, t);
                assert_eq!(p.to_bits(), plain.at(i, t).to_bits(), "{} at {t}", comps[i].id);
                let (h, ln) = (0.05, |t: f64| comps[i].vapor_pressure(t).ln());
                let (fd1, fd2) = ((ln(t + h) - ln(t - h)) / (2.0 * h), (ln(t + h) - 2.0 * ln(t) + ln(t - h)) / (h * h));
                assert!((d1 / fd1 - 1.0).abs() < 1e-5, "{} at {t}: {d1} vs {fd1}", comps[i].id);
                assert!((d2 - fd2).abs() < 1e-3 * fd2.abs() + 1e-7, "{} at {t}: {d2} vs {fd2}", comps[i].id);
            }
        }
    }
}
