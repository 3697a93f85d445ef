//! Per-component vapour diffusivities (`--vapour-diffusion species`): the Stefan-flow film solution with each
//! component's own binary diffusivity. Rates stay consistent (they sum to the total), identical diffusivities
//! reproduce the mixture-averaged result, the lighter (faster-diffusing) vapour gains share, and the effect on a
//! jet-like fuel (demo-wide) is measured and printed for docs/model.md.
use dropcut::data::Library;
use dropcut::fuel::{Basis, Fuel};
use dropcut::model::droplet::{HistoryRow, Recorder, Status};
use dropcut::model::film::VapourDiffusion;
use dropcut::model::{simulate, DropletInputs, Motion};
use dropcut::props::gas::AmbientGas;

fn inputs(lib: &Library, fuel: Fuel, t_inf: f64, d0: f64, mode: VapourDiffusion) -> DropletInputs {
    let mut inp = DropletInputs::new(fuel, AmbientGas::air(lib).unwrap(), t_inf, 101_325.0, d0, 300.0);
    inp.vapour_diffusion = mode;
    inp.motion = Motion::Fixed { velocity: 5.0 };
    inp
}

fn mix(lib: &Library, fuel: &[(&str, f64)]) -> Fuel {
    let comps = fuel.iter().map(|(id, _)| lib.component(id).unwrap().clone()).collect();
    let w: Vec<f64> = fuel.iter().map(|(_, w)| *w).collect();
    Fuel::from_fractions("test", comps, &w, Basis::Mass).unwrap()
}

fn run(inp: &DropletInputs) -> (f64, Vec<HistoryRow>) {
    let mut rec = Recorder::default();
    let r = simulate(inp, &mut rec).unwrap();
    assert_eq!(r.outcome.status, Status::Evaporated, "{:?}", r.outcome.regime_notes);
    (r.outcome.lifetime.unwrap(), rec.rows)
}

/// n-octane and iso-octane (2,2,4-trimethylpentane) have the same formula, hence the same Fuller diffusion volume
/// and molar mass: the same binary diffusivity in air. The per-component formulation must then give the
/// mixture-averaged result within round-off, in lifetime and in the vapour composition along the life, for
/// the well-mixed and the resolved liquid.
#[test]
fn identical_diffusivities_reproduce_the_mixture_average() {
    let lib = Library::embedded().unwrap();
    let octane = lib.component("n-octane").unwrap();
    let iso = lib.component("2-2-4-trimethylpentane").unwrap();
    assert_eq!(octane.diffusion_volume(), iso.diffusion_volume());
    for resolved in [false, true] {
        let fuel = mix(&lib, &[("n-octane", 0.5), ("2-2-4-trimethylpentane", 0.5)]);
        let mut a = inputs(&lib, fuel.clone(), 800.0, 50e-6, VapourDiffusion::Mixture);
        if resolved {
            a.liquid.mixing = dropcut::model::inputs::LiquidMixing::Diffusion;
            a.liquid.nodes = 20;
        }
        let mut b = a.clone();
        b.vapour_diffusion = VapourDiffusion::Species;
        let ((la, ra), (lb, rb)) = (run(&a), run(&b));
        eprintln!("resolved {resolved}: lifetime {la:.12e} (mixture) vs {lb:.12e} s (species): {:.2e}", lb / la - 1.0);
        assert!((lb / la - 1.0).abs() < 1e-9, "{la} vs {lb}");
        assert_eq!(ra.len(), rb.len());
        for (x, y) in ra.iter().zip(&rb) {
            for (p, q) in x.vapor_mass_fractions.iter().zip(&y.vapor_mass_fractions) {
                assert!((p - q).abs() < 1e-9, "t = {}: {p} vs {q}", x.time);
            }
        }
    }
}

/// The two history rows around evaporated fraction `f` and the linear weight of the second: values at `f` are
/// interpolated between them (the rows sit wherever the integrator stepped, so the first row past `f` alone
/// would move with the step sequence by more than the effects measured here).
fn around(rows: &[HistoryRow], f: f64) -> (&HistoryRow, &HistoryRow, f64) {
    let k = rows.iter().position(|r| r.evaporated_fraction >= f).unwrap();
    let (a, b) = (&rows[k - 1], &rows[k]);
    (a, b, (f - a.evaporated_fraction) / (b.evaporated_fraction - a.evaporated_fraction))
}

/// The species rates sum to the total rate at every recorded state (vapour fractions sum to 1), and the
/// faster-diffusing light vapour (n-heptane, D about 1.5 times n-dodecane's in air by Fuller) takes a larger
/// share of the vapour than with one mixture-averaged diffusivity, which under-rates it.
#[test]
fn species_rates_are_consistent_and_favour_the_faster_vapour() {
    let lib = Library::embedded().unwrap();
    let fuel = mix(&lib, &[("n-heptane", 0.5), ("n-dodecane", 0.5)]);
    let (lm, rm) = run(&inputs(&lib, fuel.clone(), 800.0, 50e-6, VapourDiffusion::Mixture));
    let (ls, rs) = run(&inputs(&lib, fuel.clone(), 800.0, 50e-6, VapourDiffusion::Species));
    let fuel_index = |_: &Library, id: &str| fuel.components.iter().position(|c| c.id == id).unwrap();
    for r in &rs {
        let sum: f64 = r.vapor_mass_fractions.iter().sum();
        assert!((sum - 1.0).abs() < 1e-9, "t = {}: Σ ε = {sum}", r.time);
    }
    // vapour composition at 20 % evaporated
    let at20 = |rows: &[HistoryRow]| {
        let (a, b, s) = around(rows, 0.2);
        a.vapor_mass_fractions.iter().zip(&b.vapor_mass_fractions).map(|(x, y)| (1.0 - s) * x + s * y).collect::<Vec<f64>>()
    };
    let (vm, vs) = (at20(&rm), at20(&rs));
    eprintln!("n-heptane/n-dodecane 50/50, 800 K: lifetime {lm:.5e} (mixture) vs {ls:.5e} s (species); vapour at 20 % evaporated {vm:?} vs {vs:?}");
    let light = fuel_index(&lib, "n-heptane");
    assert!(vs[light] > vm[light], "species diffusivities raise the light vapour's share: {vs:?} vs {vm:?}");
}

/// Effect on a jet-like fuel (demo-wide, 800 K air, 50 µm, 5 m/s): lifetime and the vapour's mean molar mass at
/// 10, 50 and 90 % evaporated, mixture-averaged against per-component diffusivities (values for docs/model.md).
#[test]
fn demo_wide_vapour_composition_and_lifetime() {
    let lib = Library::embedded().unwrap();
    let fuel = Fuel::resolve("demo-wide", &lib).unwrap();
    let w: Vec<f64> = fuel.components.iter().map(|c| c.molar_mass()).collect();
    let mean_w = |y: &[f64]| 1.0 / y.iter().zip(&w).map(|(y, w)| y / w).sum::<f64>();
    let mut out = vec![];
    for mode in [VapourDiffusion::Mixture, VapourDiffusion::Species] {
        let (life, rows) = run(&inputs(&lib, fuel.clone(), 800.0, 50e-6, mode));
        let at = |f: f64| {
            let (a, b, s) = around(&rows, f);
            (1.0 - s) * mean_w(&a.vapor_mass_fractions) + s * mean_w(&b.vapor_mass_fractions)
        };
        let (w10, w50, w90) = (at(0.1), at(0.5), at(0.9));
        eprintln!("demo-wide {}: lifetime {:.4} ms, vapour mean molar mass at 10/50/90 % evaporated {:.2}/{:.2}/{:.2} g/mol", mode.as_str(), 1e3 * life, 1e3 * w10, 1e3 * w50, 1e3 * w90);
        out.push((life, w10, w50, w90));
    }
    let (m, s) = (out[0], out[1]);
    // per-component diffusivities favour the lighter vapour early, so the early vapour is lighter; the change
    // of lifetime stays small (a few per cent at most: the mixture average already weights by the vapour)
    assert!(s.1 < m.1, "early vapour lighter with per-component diffusivities: {} vs {}", s.1, m.1);
    assert!((s.0 / m.0 - 1.0).abs() < 0.05, "lifetime {} vs {}", s.0, m.0);
}
