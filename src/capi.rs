//! C interface to the stepping API (feature `capi`, built as a `cdylib`): opaque handles, integer error codes
//! and a thread-local last-error message; every entry point catches panics, so none crosses the boundary.
//! build.rs writes the C header `dropcut.h` from the declarations below (each on one line) into
//! `target/<profile>/include/`. All quantities are SI (K, Pa, m, s, kg, J).

use std::cell::RefCell;
use std::ffi::{c_char, c_int, CStr, CString};
use std::panic::{catch_unwind, AssertUnwindSafe};

use crate::data::Library;
use crate::fuel::Fuel;
use crate::model::droplet::{LiquidHeat, LiquidMixing};
use crate::model::{DropletInputs, DropletState, FarField, Motion, Stepper};
use crate::props::gas::AmbientGas;

/// Success.
pub const DC_OK: c_int = 0;
/// A handle or output pointer was null.
pub const DC_ERR_NULL: c_int = 1;
/// An input value was refused (the message names it).
pub const DC_ERR_INPUT: c_int = 2;
/// The model failed (integration, properties).
pub const DC_ERR_MODEL: c_int = 3;
/// An output buffer is too short.
pub const DC_ERR_BUFFER: c_int = 4;
/// An internal error was caught (a bug: please report it with the message).
pub const DC_ERR_INTERNAL: c_int = 5;

/// Well-mixed liquid (uniform temperature and composition).
pub const DC_LIQUID_WELL_MIXED: c_int = 0;
/// Radially resolved liquid (species diffusion and heat conduction).
pub const DC_LIQUID_RESOLVED: c_int = 1;

/// The far field of one solver step.
#[repr(C)]
pub struct DcFarField {
    /// Gas temperature \[K\].
    pub temperature: f64,
    /// Pressure \[Pa\].
    pub pressure: f64,
    /// Fuel-vapour mass fractions, one per fuel component (may be null when `vapor_len` is 0).
    pub vapor_mass_fractions: *const f64,
    /// Number of values in `vapor_mass_fractions` (0 or the number of components).
    pub vapor_len: usize,
    /// Gas velocity \[m/s\].
    pub gas_velocity: [f64; 3],
}

/// Opaque stepper: one fuel and liquid model.
pub struct DcStepper {
    stepper: Stepper,
}

/// Opaque droplet state.
pub struct DcDroplet {
    state: DropletState,
}

thread_local! {
    static LAST_ERROR: RefCell<CString> = RefCell::new(CString::default());
}

/// Store the message of the last error of this thread.
fn set_error(message: &str) {
    let text = CString::new(message.replace('\0', " ")).unwrap_or_default();
    LAST_ERROR.with(|e| *e.borrow_mut() = text);
}

/// Run `f` with panics caught: its error code and message, or DC_ERR_INTERNAL for a panic.
fn guard(f: impl FnOnce() -> Result<(), (c_int, String)>) -> c_int {
    match catch_unwind(AssertUnwindSafe(f)) {
        Ok(Ok(())) => {
            set_error("");
            DC_OK
        }
        Ok(Err((code, message))) => {
            set_error(&message);
            code
        }
        Err(payload) => {
            let what = payload.downcast_ref::<&str>().map(|s| s.to_string()).or_else(|| payload.downcast_ref::<String>().cloned()).unwrap_or_else(|| "unknown panic".into());
            set_error(&format!("internal error: {what}"));
            DC_ERR_INTERNAL
        }
    }
}

/// A null-pointer error naming the argument.
fn null(name: &str) -> (c_int, String) {
    (DC_ERR_NULL, format!("{name} is null"))
}

/// A UTF-8 string from C.
///
/// # Safety
/// `p` must be null or point to a NUL-terminated string.
unsafe fn text(p: *const c_char, name: &str) -> Result<String, (c_int, String)> {
    if p.is_null() {
        return Err(null(name));
    }
    CStr::from_ptr(p).to_str().map(str::to_string).map_err(|_| (DC_ERR_INPUT, format!("{name} is not UTF-8")))
}

/// The far field of a C struct.
///
/// # Safety
/// `ff` must be null or point to a valid DcFarField whose vapour pointer holds `vapor_len` values.
unsafe fn read_far_field(ff: *const DcFarField) -> Result<FarField, (c_int, String)> {
    let ff = ff.as_ref().ok_or_else(|| null("far_field"))?;
    let vapor = if ff.vapor_len == 0 {
        vec![]
    } else if ff.vapor_mass_fractions.is_null() {
        return Err(null("far_field.vapor_mass_fractions"));
    } else {
        std::slice::from_raw_parts(ff.vapor_mass_fractions, ff.vapor_len).to_vec()
    };
    Ok(FarField { temperature: ff.temperature, pressure: ff.pressure, vapor_mass_fractions: vapor, gas_velocity: ff.gas_velocity })
}

/// Model errors: input errors keep their code.
fn model_error(e: crate::model::ModelError) -> (c_int, String) {
    match e {
        crate::model::ModelError::Input { .. } => (DC_ERR_INPUT, e.to_string()),
        _ => (DC_ERR_MODEL, e.to_string()),
    }
}

/// Message of the last error on this thread ("" after a success); valid until the next call on this thread.
#[no_mangle]
pub extern "C" fn dc_last_error() -> *const c_char {
    LAST_ERROR.with(|e| e.borrow().as_ptr())
}

/// New stepper: `fuel` (library fuel or component id, e.g. "demo-wide"), `gas` ("air", "n2" or mole fractions like "o2=0.15,n2=0.85"), initial diameter \[m\] and temperature \[K\] of new droplets, `liquid` DC_LIQUID_*, `drag` 1: velocity relaxes by drag, 0: slip held, into `*out`.
///
/// # Safety
/// `fuel` and `gas` must be NUL-terminated strings; `out` must be valid for a write.
#[no_mangle]
pub unsafe extern "C" fn dc_stepper_new(fuel: *const c_char, gas: *const c_char, diameter: f64, droplet_temperature: f64, liquid: c_int, drag: c_int, out: *mut *mut DcStepper) -> c_int {
    guard(|| {
        if out.is_null() {
            return Err(null("out"));
        }
        let fuel = text(fuel, "fuel")?;
        let gas = text(gas, "gas")?;
        let lib = Library::embedded().map_err(|e| (DC_ERR_MODEL, e.to_string()))?;
        let fuel = Fuel::resolve(&fuel, &lib).map_err(|e| (DC_ERR_INPUT, format!("fuel: {e}")))?;
        let gas = AmbientGas::parse(&lib, &gas).map_err(|e| (DC_ERR_INPUT, format!("gas: {e}")))?;
        let mut inputs = DropletInputs::new(fuel, gas, 800.0, 101_325.0, diameter, droplet_temperature);
        inputs.motion = if drag != 0 { Motion::Injected { velocity: 0.0 } } else { Motion::Fixed { velocity: 0.0 } };
        match liquid {
            DC_LIQUID_WELL_MIXED => {}
            DC_LIQUID_RESOLVED => {
                inputs.liquid.mixing = LiquidMixing::Diffusion;
                inputs.liquid.heat = LiquidHeat::Conduction;
            }
            other => return Err((DC_ERR_INPUT, format!("liquid = {other}: must be {DC_LIQUID_WELL_MIXED} (well-mixed) or {DC_LIQUID_RESOLVED} (resolved)"))),
        }
        let stepper = Stepper::new(&inputs).map_err(model_error)?;
        *out = Box::into_raw(Box::new(DcStepper { stepper }));
        Ok(())
    })
}

/// Free a stepper (null is ignored).
///
/// # Safety
/// `stepper` must be null or come from dc_stepper_new and not be used afterwards.
#[no_mangle]
pub unsafe extern "C" fn dc_stepper_free(stepper: *mut DcStepper) {
    if !stepper.is_null() {
        let _ = catch_unwind(AssertUnwindSafe(|| drop(Box::from_raw(stepper))));
    }
}

/// Number of fuel components (the length of every per-component array) into `*out`.
///
/// # Safety
/// `stepper` must be null or valid; `out` must be valid for a write.
#[no_mangle]
pub unsafe extern "C" fn dc_stepper_components(stepper: *const DcStepper, out: *mut usize) -> c_int {
    guard(|| {
        let s = stepper.as_ref().ok_or_else(|| null("stepper"))?;
        let out = out.as_mut().ok_or_else(|| null("out"))?;
        *out = s.stepper.components().len();
        Ok(())
    })
}

/// New droplet of the stepper's fuel moving at `velocity` \[m/s\] (3 values) in `far_field`, into `*out`.
///
/// # Safety
/// Pointers must be null or valid; `velocity` must hold 3 values.
#[no_mangle]
pub unsafe extern "C" fn dc_droplet_new(stepper: *mut DcStepper, far_field: *const DcFarField, velocity: *const f64, out: *mut *mut DcDroplet) -> c_int {
    guard(|| {
        let s = stepper.as_mut().ok_or_else(|| null("stepper"))?;
        if velocity.is_null() {
            return Err(null("velocity"));
        }
        if out.is_null() {
            return Err(null("out"));
        }
        let ff = read_far_field(far_field)?;
        let v = std::slice::from_raw_parts(velocity, 3);
        let state = s.stepper.initial_state(&ff, [v[0], v[1], v[2]]).map_err(model_error)?;
        *out = Box::into_raw(Box::new(DcDroplet { state }));
        Ok(())
    })
}

/// Free a droplet (null is ignored).
///
/// # Safety
/// `droplet` must be null or come from dc_droplet_new and not be used afterwards.
#[no_mangle]
pub unsafe extern "C" fn dc_droplet_free(droplet: *mut DcDroplet) {
    if !droplet.is_null() {
        let _ = catch_unwind(AssertUnwindSafe(|| drop(Box::from_raw(droplet))));
    }
}

/// Advance `droplet` by `dt` \[s\] in `far_field`; writes the vapour mass given to the gas per component \[kg\] into `mass` (`mass_len` ≥ components), the energy \[J\] (liquid at 298.15 K = 0), the momentum \[kg m/s\] (3 values), and 1 into `*finished` when its life ended. On an error the droplet is unchanged.
///
/// # Safety
/// Pointers must be null or valid for the stated lengths.
#[no_mangle]
pub unsafe extern "C" fn dc_advance(stepper: *mut DcStepper, droplet: *mut DcDroplet, dt: f64, far_field: *const DcFarField, mass: *mut f64, mass_len: usize, energy: *mut f64, momentum: *mut f64, finished: *mut c_int) -> c_int {
    guard(|| {
        let s = stepper.as_mut().ok_or_else(|| null("stepper"))?;
        let d = droplet.as_mut().ok_or_else(|| null("droplet"))?;
        if mass.is_null() {
            return Err(null("mass"));
        }
        let energy = energy.as_mut().ok_or_else(|| null("energy"))?;
        if momentum.is_null() {
            return Err(null("momentum"));
        }
        let finished = finished.as_mut().ok_or_else(|| null("finished"))?;
        let n = s.stepper.components().len();
        if mass_len < n {
            return Err((DC_ERR_BUFFER, format!("mass_len = {mass_len}: the fuel has {n} components")));
        }
        let ff = read_far_field(far_field)?;
        let ex = s.stepper.advance(&mut d.state, dt, &ff).map_err(model_error)?;
        std::slice::from_raw_parts_mut(mass, n).copy_from_slice(&ex.mass);
        *energy = ex.energy;
        std::slice::from_raw_parts_mut(momentum, 3).copy_from_slice(&ex.momentum);
        *finished = c_int::from(ex.finished);
        Ok(())
    })
}

/// The droplet's time since creation \[s\], mass \[kg\], surface temperature \[K\], diameter \[m\] and velocity (3 values) \[m/s\].
///
/// # Safety
/// Pointers must be null or valid; `velocity` must hold 3 values.
#[no_mangle]
pub unsafe extern "C" fn dc_droplet_get(stepper: *const DcStepper, droplet: *const DcDroplet, time: *mut f64, mass: *mut f64, surface_temperature: *mut f64, diameter: *mut f64, velocity: *mut f64) -> c_int {
    guard(|| {
        let s = stepper.as_ref().ok_or_else(|| null("stepper"))?;
        let d = droplet.as_ref().ok_or_else(|| null("droplet"))?;
        let outs = [(time, "time"), (mass, "mass"), (surface_temperature, "surface_temperature"), (diameter, "diameter"), (velocity, "velocity")];
        if let Some((_, name)) = outs.iter().find(|(p, _)| p.is_null()) {
            return Err(null(name));
        }
        *time = d.state.time();
        *mass = d.state.mass();
        *surface_temperature = d.state.surface_temperature();
        *diameter = s.stepper.diameter(&d.state);
        std::slice::from_raw_parts_mut(velocity, 3).copy_from_slice(&d.state.velocity());
        Ok(())
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Null handles, NaN far fields and negative steps return a code and a message; nothing panics through.
    #[test]
    fn bad_calls_return_codes_and_messages() {
        unsafe {
            let mut stepper: *mut DcStepper = std::ptr::null_mut();
            let fuel = CString::new("n-decane").unwrap();
            let gas = CString::new("air").unwrap();
            assert_eq!(dc_stepper_new(fuel.as_ptr(), gas.as_ptr(), 50e-6, 300.0, DC_LIQUID_WELL_MIXED, 1, &mut stepper), DC_OK);
            let ff = DcFarField { temperature: 800.0, pressure: 101_325.0, vapor_mass_fractions: std::ptr::null(), vapor_len: 0, gas_velocity: [0.0; 3] };
            let mut droplet: *mut DcDroplet = std::ptr::null_mut();
            let v = [1.0, 0.0, 0.0];
            assert_eq!(dc_droplet_new(stepper, &ff, v.as_ptr(), &mut droplet), DC_OK);
            let (mut mass, mut energy, mut momentum, mut finished) = ([0.0; 1], 0.0, [0.0; 3], 0);
            let message = || CStr::from_ptr(dc_last_error()).to_str().unwrap().to_string();
            assert_eq!(dc_advance(std::ptr::null_mut(), droplet, 1e-5, &ff, mass.as_mut_ptr(), 1, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_ERR_NULL);
            assert_eq!(message(), "stepper is null");
            assert_eq!(dc_advance(stepper, std::ptr::null_mut(), 1e-5, &ff, mass.as_mut_ptr(), 1, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_ERR_NULL);
            assert_eq!(message(), "droplet is null");
            assert_eq!(dc_advance(stepper, droplet, -1e-5, &ff, mass.as_mut_ptr(), 1, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_ERR_INPUT);
            assert!(message().starts_with("step = -0.00001 s"), "{}", message());
            let nan = DcFarField { temperature: f64::NAN, ..ff };
            assert_eq!(dc_advance(stepper, droplet, 1e-5, &nan, mass.as_mut_ptr(), 1, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_ERR_INPUT);
            assert!(message().starts_with("far-field temperature = NaN K"), "{}", message());
            assert_eq!(dc_advance(stepper, droplet, 1e-5, &ff, mass.as_mut_ptr(), 0, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_ERR_BUFFER);
            assert_eq!(dc_advance(stepper, droplet, 1e-5, &ff, mass.as_mut_ptr(), 1, &mut energy, momentum.as_mut_ptr(), &mut finished), DC_OK);
            assert_eq!(message(), "");
            assert!(mass[0] > 0.0 && energy.is_finite());
            let bad_fuel = CString::new("no-such-fuel").unwrap();
            let mut other: *mut DcStepper = std::ptr::null_mut();
            assert_eq!(dc_stepper_new(bad_fuel.as_ptr(), gas.as_ptr(), 50e-6, 300.0, 0, 1, &mut other), DC_ERR_INPUT);
            assert!(message().starts_with("fuel: "), "{}", message());
            assert_eq!(dc_stepper_new(fuel.as_ptr(), gas.as_ptr(), f64::NAN, 300.0, 0, 1, &mut other), DC_ERR_INPUT);
            assert!(other.is_null());
            dc_droplet_free(droplet);
            dc_stepper_free(stepper);
        }
    }
}
