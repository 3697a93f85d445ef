//! The same well-mixed droplet integrated by the project's own Dormand–Prince 5(4) stepper and by the
//! `ode_solvers` crate's Dopri5 (a dev-dependency kept only for this comparison), at equal tolerances.
//! Shared by `tests/integrator_choice.rs` and `benches/integrators.rs`.
#![allow(dead_code)]

use std::cell::RefCell;

use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::droplet::{NoHistory, WellMixed};
use dropcut::model::integrator::{DormandPrince, Method, OdeSystem, Tolerances};
use dropcut::model::{simulate, DropletInputs, Motion};
use dropcut::props::gas::AmbientGas;
use ode_solvers::{DVector, Dopri5, OutputType, System};

/// A droplet problem: inputs, the end time of the comparison and the per-unknown tolerances.
pub struct Problem {
    /// Droplet inputs (10-component test fuel, 800 K air, 1 atm, 50 µm, 5 m/s).
    pub inputs: DropletInputs,
    /// Integration end time [s]: half the one-shot lifetime, before any event.
    pub end_time: f64,
    /// Tolerances as the run driver sets them.
    pub tolerances: Tolerances,
}

/// Final state and work of one integration.
#[derive(Debug, Clone)]
pub struct Outcome {
    /// State at the end time.
    pub state: Vec<f64>,
    /// Right-hand-side evaluations.
    pub rhs_calls: u64,
    /// Accepted steps.
    pub steps: u64,
    /// Rejected steps.
    pub rejected: u64,
}

/// The comparison problem at relative tolerance `rtol`.
pub fn problem(rtol: f64) -> Problem {
    let lib = Library::embedded().unwrap();
    let text = include_str!("../data/ten-component.toml");
    let fuel = Fuel::parse(text, "tests/data/ten-component.toml", &lib).unwrap();
    let mut inputs = DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
    inputs.motion = Motion::Fixed { velocity: 5.0 };
    inputs.rtol = rtol;
    let lifetime = simulate(&inputs, &mut NoHistory).unwrap().outcome.lifetime.unwrap();
    let (_, y0) = WellMixed::new(&inputs);
    let n = inputs.fuel.len();
    let m0: f64 = y0[..n].iter().sum();
    // the run driver's error weights (src/model/droplet.rs)
    let mut atol = vec![rtol * 1e-3 * m0; 2 * n + 2];
    atol[n] = rtol;
    atol[n + 1] = rtol * y0[n + 1].max(1.0) * 1e-3;
    Problem { inputs, end_time: 0.5 * lifetime, tolerances: Tolerances { rtol, atol } }
}

/// Integrate with the project's own Dormand–Prince 5(4) stepper to the end time (dense output at the end).
pub fn own(p: &Problem) -> Outcome {
    own_with(p, Method::Order5)
}

/// Integrate with the project's own stepper and pair `method` to the end time (dense output at the end).
pub fn own_with(p: &Problem, method: Method) -> Outcome {
    let (mut sys, y0) = WellMixed::new(&p.inputs);
    let mut stepper = DormandPrince::with_method(&mut sys, 0.0, &y0, p.tolerances.clone(), 0.0, p.inputs.max_time / 20.0, method);
    while stepper.t < p.end_time {
        stepper.step(&mut sys).unwrap();
    }
    let mut state = vec![0.0; y0.len()];
    stepper.prepare_dense(&mut sys);
    stepper.dense(p.end_time, &mut state);
    Outcome { state, rhs_calls: stepper.stats.rhs_calls, steps: stepper.stats.steps, rejected: stepper.stats.rejected }
}

/// `ode_solvers` needs `&self` and one scalar absolute tolerance: the state is scaled by the per-unknown
/// absolute tolerances (z_i = y_i / atol_i, scalar atol 1), which gives the same error weights
/// atol_i + rtol·|y_i| as the own stepper.
struct Scaled<'a> {
    system: RefCell<WellMixed>,
    scale: &'a [f64],
    y: RefCell<Vec<f64>>,
    dydt: RefCell<Vec<f64>>,
}

impl System<f64, DVector<f64>> for Scaled<'_> {
    fn system(&self, t: f64, z: &DVector<f64>, dz: &mut DVector<f64>) {
        let mut y = self.y.borrow_mut();
        let mut dydt = self.dydt.borrow_mut();
        for i in 0..y.len() {
            y[i] = z[i] * self.scale[i];
        }
        self.system.borrow_mut().rhs(t, &y, &mut dydt);
        for i in 0..y.len() {
            dz[i] = dydt[i] / self.scale[i];
        }
    }
}

/// Integrate with `ode_solvers::Dopri5` (sparse output: one row per accepted step, the last at the end time).
pub fn crate_dopri5(p: &Problem) -> Outcome {
    let (sys, y0) = WellMixed::new(&p.inputs);
    let scale = &p.tolerances.atol;
    let z0 = DVector::from_iterator(y0.len(), y0.iter().zip(scale).map(|(y, s)| y / s));
    let system = Scaled { system: RefCell::new(sys), scale, y: RefCell::new(vec![0.0; y0.len()]), dydt: RefCell::new(vec![0.0; y0.len()]) };
    let mut stepper = Dopri5::new(system, 0.0, p.end_time, p.end_time, z0, p.tolerances.rtol, 1.0);
    stepper.set_output(OutputType::Sparse);
    let stats = stepper.integrate().unwrap();
    let z = stepper.y_out().last().unwrap();
    let state = z.iter().zip(scale).map(|(z, s)| z * s).collect();
    Outcome { state, rhs_calls: stats.num_eval as u64, steps: stats.accepted_steps as u64, rejected: stats.rejected_steps as u64 }
}

/// Integrate with `ode_solvers::Dop853` (8th-order Dormand–Prince pair, Hairer's DOP853), same scaling and
/// sparse output as [`crate_dopri5`].
pub fn crate_dop853(p: &Problem) -> Outcome {
    let (sys, y0) = WellMixed::new(&p.inputs);
    let scale = &p.tolerances.atol;
    let z0 = DVector::from_iterator(y0.len(), y0.iter().zip(scale).map(|(y, s)| y / s));
    let system = Scaled { system: RefCell::new(sys), scale, y: RefCell::new(vec![0.0; y0.len()]), dydt: RefCell::new(vec![0.0; y0.len()]) };
    let mut stepper = ode_solvers::Dop853::new(system, 0.0, p.end_time, p.end_time, z0, p.tolerances.rtol, 1.0);
    stepper.set_output(OutputType::Sparse);
    let stats = stepper.integrate().unwrap();
    let z = stepper.y_out().last().unwrap();
    let state = z.iter().zip(scale).map(|(z, s)| z * s).collect();
    Outcome { state, rhs_calls: stats.num_eval as u64, steps: stats.accepted_steps as u64, rejected: stats.rejected_steps as u64 }
}
