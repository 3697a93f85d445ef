//! No allocation in right-hand sides: a counting global allocator around one well-mixed right-hand-side
//! evaluation (evaporating and boiling regimes) with the ideal liquid and with UNIFAC activity coefficients, and
//! with per-component vapour diffusivities.

use std::alloc::{GlobalAlloc, Layout, System};
use std::sync::atomic::{AtomicUsize, Ordering};

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::droplet::WellMixed;
use dropcut::model::integrator::OdeSystem;
use dropcut::model::film::VapourDiffusion;
use dropcut::model::DropletInputs;
use dropcut::props::activity::ActivityModel;
use dropcut::props::gas::AmbientGas;

struct Counting;
static ALLOCATIONS: AtomicUsize = AtomicUsize::new(0);

unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        ALLOCATIONS.fetch_add(1, Ordering::SeqCst);
        System.alloc(layout)
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        System.dealloc(ptr, layout)
    }
    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        ALLOCATIONS.fetch_add(1, Ordering::SeqCst);
        System.realloc(ptr, layout, new_size)
    }
}

#[global_allocator]
static GLOBAL: Counting = Counting;

/// Allocations made by `f`.
fn allocations(f: impl FnOnce()) -> usize {
    let before = ALLOCATIONS.load(Ordering::SeqCst);
    f();
    ALLOCATIONS.load(Ordering::SeqCst) - before
}

#[test]
fn well_mixed_rhs_does_not_allocate() {
    let lib = Library::embedded().unwrap();
    let cases = [(ActivityModel::Ideal, VapourDiffusion::Mixture), (ActivityModel::Unifac, VapourDiffusion::Mixture), (ActivityModel::Ideal, VapourDiffusion::Species)];
    for (activity, vapour) in cases {
        let fuel = Fuel::resolve("demo-blend", &lib).unwrap();
        let mut inp = DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
        inp.liquid.activity = activity;
        inp.vapour_diffusion = vapour;
        let (mut sys, y0) = WellMixed::new(&inp);
        let mut dy = vec![0.0; y0.len()];
        sys.rhs(0.0, &y0, &mut dy); // warm-up (first-use initialisation of shared tables)
        // two temperatures so the UNIFAC temperature cache is refilled inside the counted call
        let mut y1 = y0.clone();
        let n = inp.fuel.len();
        y1[n] += 25.0;
        let count = allocations(|| {
            sys.rhs(0.0, &y0, &mut dy);
            sys.rhs(0.0, &y1, &mut dy);
        });
        assert_eq!(count, 0, "{} / {} right-hand side allocated {count} times", activity.as_str(), vapour.as_str());
        assert!(dy.iter().all(|v| v.is_finite()));
    }
}
