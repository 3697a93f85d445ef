//! Instruction-count driver (no timing): runs one benchmark case a given number of times so that a
//! load-independent counter (`valgrind --tool=cachegrind --cache-sim=no`) measures its work. The per-life cost
//! is the difference between two repeat counts divided by their difference (set-up and library parse cancel).
//!
//! Run: `cargo bench --bench counts --no-run`, then
//! `valgrind --tool=cachegrind --cache-sim=no target/release/deps/counts-* CASE REPEATS` with CASE one of
//! `wm1`, `wm10`, `wm50`, `res20x40`, `sweep10`, `boil2` (resolved n-heptane/n-dodecane, 20 cells, 600 K air
//! under 3000 K radiation) or `boil3` (the same with n-hexane/n-decane/n-hexadecane).
use std::hint::black_box;

use dropcut::data::Library;
use dropcut::model::droplet::{LiquidHeat, LiquidMixing, NoHistory};
use dropcut::model::{simulate, DropletInputs};

mod common;
#[path = "common/sweep_spec.rs"]
mod sweep_spec;
use common::{fifty, fuel, inputs_of};

fn main() {
    let args: Vec<String> = std::env::args().skip(1).filter(|a| a != "--bench").collect();
    let case = args.first().map(String::as_str).unwrap_or("wm10");
    let repeats: usize = args.get(1).and_then(|s| s.parse().ok()).unwrap_or(1);
    let lib = Library::embedded().unwrap();
    if case == "sweep10" {
        sweep10(&lib, repeats);
        return;
    }
    let inp = match case {
        "wm1" => inputs_of(fuel(&lib, 1), &lib),
        "wm10" => inputs_of(fuel(&lib, 10), &lib),
        "wm50" => inputs_of(fifty(&lib), &lib),
        "res20x40" => {
            let mut inp = inputs_of(fuel(&lib, 20), &lib);
            inp.liquid.mixing = LiquidMixing::Diffusion;
            inp.liquid.heat = LiquidHeat::Conduction;
            inp.liquid.nodes = 40;
            inp
        }
        "boil2" | "boil3" => {
            let fuel: &[(&str, f64)] = if case == "boil2" {
                &[("n-heptane", 0.5), ("n-dodecane", 0.5)]
            } else {
                &[("n-hexane", 1.0 / 3.0), ("n-decane", 1.0 / 3.0), ("n-hexadecane", 1.0 / 3.0)]
            };
            let comps = fuel.iter().map(|(id, _)| lib.component(id).unwrap().clone()).collect();
            let w: Vec<f64> = fuel.iter().map(|(_, w)| *w).collect();
            let fuel = dropcut::fuel::Fuel::from_fractions("boiling", comps, &w, dropcut::fuel::Basis::Mass).unwrap();
            let mut inp = DropletInputs::new(fuel, dropcut::props::gas::AmbientGas::air(&lib).unwrap(), 600.0, 101_325.0, 50e-6, 300.0);
            inp.extra_heat = dropcut::model::film::ExtraHeat { radiation: Some(dropcut::model::film::Radiation { temperature: Some(3000.0), absorption_efficiency: 1.0 }), fibre: None };
            inp.liquid.mixing = LiquidMixing::Diffusion;
            inp.liquid.heat = LiquidHeat::Conduction;
            inp.liquid.nodes = 20;
            inp
        }
        other => panic!("unknown case {other}"),
    };
    if args.get(1).map(String::as_str) == Some("trace") {
        trace(&inp);
        return;
    }
    let mut last = None;
    for _ in 0..repeats {
        last = Some(black_box(simulate(&inp, &mut NoHistory).unwrap()));
    }
    if let Some(r) = last {
        let o = &r.outcome;
        println!(
            "{case}: lifetime {:?} t10 {:?} t50 {:?} t90 {:?} Tmax {:?} stats {:?}",
            o.lifetime, o.t10, o.t50, o.t90, o.max_surface_temperature, o.stats
        );
    }
}

/// Accepted and rejected steps of a well-mixed life (the run's integrator settings, no events), one line per
/// accepted step: time, step, rejections before it, remaining mass fraction, temperature.
fn trace(inp: &DropletInputs) {
    use dropcut::model::droplet::WellMixed;
    use dropcut::model::integrator::{DormandPrince, Tolerances};
    let (mut sys, y0) = WellMixed::new(inp);
    let n = inp.fuel.len();
    let m0: f64 = y0[..n].iter().sum();
    let mut atol = vec![inp.rtol * 1e-3 * m0; 2 * n + 2];
    atol[n] = inp.rtol;
    atol[n + 1] = inp.rtol * y0[n + 1].max(1.0) * 1e-3;
    let mut dp = DormandPrince::new(&mut sys, 0.0, &y0, Tolerances { rtol: inp.rtol, atol }, 0.0, inp.max_time / 20.0);
    println!("first step proposed {:e}", dp.proposed_step());
    let mut rejected = 0;
    while dp.y[..n].iter().sum::<f64>() / m0 > inp.end_mass_fraction {
        dp.step(&mut sys).unwrap();
        let r = dp.stats.rejected - rejected;
        rejected = dp.stats.rejected;
        println!("t {:.6e} h {:.3e} rej {r} rem {:.6e} T {:.3}", dp.t, dp.h_last, dp.y[..n].iter().sum::<f64>() / m0, dp.y[n]);
    }
    println!("{:?}", dp.stats);
}

/// The sweep benchmark's 64 cases (benches/sweep.rs) on one thread, `repeats` times into fresh folders; the
/// per-case cost is the difference of two repeat counts over 64 times their difference.
fn sweep10(lib: &Library, repeats: usize) {
    use dropcut::sweep::{self, runner::NoProgress, RunOptions, SweepSpec};
    let data = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data");
    let spec = SweepSpec::parse(sweep_spec::SPEC, "bench-spec.toml", &data, lib).expect("bench spec");
    let root = std::env::temp_dir().join(format!("dropcut-counts-sweep-{}", std::process::id()));
    for k in 0..repeats {
        let dir = root.join(k.to_string());
        let opts = RunOptions { threads: 1, ..RunOptions::default() };
        let report = sweep::run(&spec, &dir, &opts, &mut NoProgress).expect("sweep");
        assert_eq!(report.failed, 0);
    }
    let _ = std::fs::remove_dir_all(&root);
    println!("sweep10: {repeats} sweeps of {} cases", spec.case_count());
}
