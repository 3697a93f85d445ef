//! `dropcut._native`: the Rust side of the Python package `dropcut` (pyo3). The pure-Python layer
//! (`python/dropcut/__init__.py`) turns the tables returned here into pandas DataFrames.
//!
//! Everything here calls the `dropcut` library the command line uses, so numbers, columns and messages are the
//! command line's. Input errors raise `DropcutError` (a `ValueError`), runtime failures `DropcutRunError`
//! (a `RuntimeError`); the message is the one line the command line prints after `error: `. Runs release the
//! global interpreter lock.

use std::path::{Path, PathBuf};
use std::sync::{Arc, OnceLock};
use std::time::{Duration, Instant};

use pyo3::create_exception;
use pyo3::exceptions::{PyRuntimeError, PyTypeError, PyValueError};
use pyo3::prelude::*;
use pyo3::types::{PyBool, PyDict, PyFloat, PyInt, PyString};

use dropcut::cli::CliError;
use dropcut::data::Library;
use dropcut::fuel::Fuel;
use dropcut::model::{self, DropletInputs};
use dropcut::output::{self, CsvTable};
use dropcut::props::activity::{Activity, ActivityModel};
use dropcut::props::gas::AmbientGas;
use dropcut::props::liquid;
use dropcut::conditions::{self, CONDITIONS};
use dropcut::sweep::SweepSpec;
use dropcut::units::{self, Quantity};

create_exception!(_native, DropcutError, PyValueError, "Bad input: the one-line message the command line prints (exit code 2).");
create_exception!(_native, DropcutRunError, PyRuntimeError, "A run that failed on good input (the command line's exit code 1).");

/// A command-line error as a Python exception: input errors (exit 2) → `DropcutError`, others → `DropcutRunError`.
fn py_err(e: impl Into<CliError>) -> PyErr {
    let e: CliError = e.into();
    if e.code == 2 {
        DropcutError::new_err(e.message)
    } else {
        DropcutRunError::new_err(e.message)
    }
}

fn input_err(message: impl Into<String>) -> PyErr {
    DropcutError::new_err(message.into())
}

// ---------------------------------------------------------------------------------------------------------------
// Libraries: the built-in one (parsed once), or the built-in one plus a user folder of components.

fn embedded() -> PyResult<Arc<Library>> {
    static LIB: OnceLock<Result<Arc<Library>, String>> = OnceLock::new();
    LIB.get_or_init(|| Library::embedded().map(Arc::new).map_err(|e| format!("built-in library: {e}"))).clone().map_err(DropcutRunError::new_err)
}

fn library(components: Option<PathBuf>) -> PyResult<Arc<Library>> {
    match components {
        None => embedded(),
        Some(dir) => {
            let mut lib = (*embedded()?).clone();
            lib.add_user_folder(&dir).map_err(py_err)?;
            Ok(Arc::new(lib))
        }
    }
}

// ---------------------------------------------------------------------------------------------------------------
// Values from Python: plain SI numbers, or strings with units as on the command line.

/// A quantity given as a number (SI) or a string with a unit; errors name the option as the command line does.
fn quantity(value: &Bound<'_, PyAny>, option: &str, q: Quantity) -> PyResult<f64> {
    if value.is_instance_of::<PyBool>() {
        return Err(PyTypeError::new_err(format!("{}: expected a number (SI) or a string with a unit, found a bool", option.replace('-', "_"))));
    }
    if let Ok(s) = value.extract::<String>() {
        return units::parse(&s, q).map_err(|e| input_err(format!("--{option}: {e}")));
    }
    match value.extract::<f64>() {
        Ok(x) if x.is_finite() => Ok(x),
        Ok(x) => Err(input_err(format!("--{option}: {x} is not a finite number"))),
        Err(_) => Err(PyTypeError::new_err(format!("{}: expected a number (SI) or a string with a unit, found {}", option.replace('-', "_"), value.get_type().name()?))),
    }
}

fn activity_model(name: &str) -> PyResult<ActivityModel> {
    ActivityModel::parse(name).ok_or_else(|| input_err(format!("--activity: unknown model '{name}'; use {}", ActivityModel::ALL.map(|m| m.as_str()).join(" or "))))
}

fn limits(spec: Option<&str>) -> PyResult<Option<dropcut::post::Limits>> {
    match spec {
        None => Ok(None),
        Some("aviation") => Ok(Some(dropcut::post::Limits::aviation_turbine_fuel())),
        Some(path) => dropcut::post::Limits::load(Path::new(path)).map(Some).map_err(|e| input_err(e.to_string())),
    }
}

// ---------------------------------------------------------------------------------------------------------------
// Run conditions.

/// Keyword arguments of `simulate` → droplet inputs: the ONE place where Python names meet run conditions.
///
/// Names are the `simulate` option names with `_` for `-` (`ambient_temperature`); values are plain SI numbers,
/// strings with units, bools or the option's words. Every name, default, range and message comes from the
/// condition registry (`dropcut::conditions::CONDITIONS`), exactly as for `simulate` on the command line.
fn condition_inputs(lib: &Library, fuel: &Fuel, conditions: Option<&Bound<'_, PyDict>>) -> PyResult<DropletInputs> {
    // the one condition registry: keyword names are its keys with _ for -, values become the texts the command
    // line takes (SI numbers, or strings with units), parsed and checked by the registry entry
    let mut texts: Vec<Option<String>> = vec![None; CONDITIONS.len()];
    for (name, value) in conditions.into_iter().flat_map(|d| d.iter()) {
        let name: String = name.extract()?;
        let key = name.replace('_', "-");
        let Some(index) = CONDITIONS.iter().position(|c| c.key == key) else {
            let names: Vec<String> = CONDITIONS.iter().map(|c| c.key.replace('-', "_")).collect();
            return Err(input_err(format!(
                "unknown condition '{name}'{}; conditions are the simulate options with _ for -: {}",
                dropcut::data::suggest(&name, names.iter().map(String::as_str)),
                names.join(", ")
            )));
        };
        if value.is_none() {
            continue; // None keeps the default
        }
        let text = if value.is_instance_of::<PyBool>() {
            if value.extract::<bool>()? { "true".to_string() } else { "false".to_string() }
        } else if value.is_instance_of::<PyInt>() {
            let i: i64 = value.extract().map_err(|_| input_err(format!("--{key}: {value} is out of range")))?;
            i.to_string()
        } else if value.is_instance_of::<PyFloat>() {
            float_text(value.extract()?)
        } else if value.is_instance_of::<PyString>() {
            value.extract()?
        } else if let Ok(i) = value.extract::<i64>() {
            i.to_string() // numpy integers and other objects with __index__
        } else if let Ok(x) = value.extract::<f64>() {
            float_text(x) // other numbers
        } else {
            return Err(PyTypeError::new_err(format!("{name}: expected a number (SI), a string with a unit or a bool, found {}", value.get_type().name()?)));
        };
        texts[index] = Some(text);
    }
    let mut values = Vec::with_capacity(CONDITIONS.len());
    for (c, text) in CONDITIONS.iter().zip(&texts) {
        values.push(match text {
            Some(t) => Some(c.parse_text(t, lib).map_err(|e| input_err(format!("--{e}")))?),
            None => None,
        });
    }
    conditions::build_inputs(&CONDITIONS, fuel.clone(), lib, &values).map_err(|e| {
        let given = CONDITIONS.iter().position(|c| c.key == e.key).and_then(|i| texts[i].clone()).unwrap_or_default();
        input_err(format!("--{} {given}: {}", e.key, e.reason))
    })
}

/// A Python float as the text the command line would take: the shortest decimal that reads back to the same
/// number (a NaN or infinity is passed through and refused by the registry's range check).
fn float_text(x: f64) -> String {
    if x.is_finite() { format!("{x:?}") } else { x.to_string() }
}

// ---------------------------------------------------------------------------------------------------------------
// Tables: CSV text (exactly the file the command line writes) → metadata, header and columns.

/// Split CSV text (`# ` metadata lines, header, rows) into a dict {metadata, columns, data, text}: a column whose
/// non-empty cells all read as numbers becomes a list of floats (NaN for empty cells), else a list of strings.
fn frame_dict<'py>(py: Python<'py>, text: &str, path: &str) -> PyResult<Bound<'py, PyDict>> {
    let mut metadata = vec![];
    let mut body_start = 0;
    for line in text.split_inclusive('\n') {
        match line.strip_prefix('#') {
            Some(m) => {
                metadata.push(m.trim_end_matches(['\n', '\r']).strip_prefix(' ').unwrap_or(m.trim_end_matches(['\n', '\r'])).to_string());
                body_start += line.len();
            }
            None => break,
        }
    }
    let mut reader = csv::ReaderBuilder::new().has_headers(true).flexible(false).from_reader(text[body_start..].as_bytes());
    let header: Vec<String> = reader.headers().map_err(|e| DropcutRunError::new_err(format!("{path}: {e}")))?.iter().map(str::to_string).collect();
    let mut cells: Vec<Vec<String>> = vec![vec![]; header.len()];
    for record in reader.records() {
        let record = record.map_err(|e| DropcutRunError::new_err(format!("{path}: {e}")))?;
        for (i, c) in record.iter().enumerate() {
            cells[i].push(c.to_string());
        }
    }
    let data = PyDict::new(py);
    for (name, column) in header.iter().zip(cells) {
        let numbers: Option<Vec<f64>> = column.iter().map(|c| if c.is_empty() { Some(f64::NAN) } else { c.parse::<f64>().ok() }).collect();
        match numbers {
            Some(v) if column.iter().any(|c| !c.is_empty()) => data.set_item(name, v)?,
            _ => data.set_item(name, column)?,
        }
    }
    let d = PyDict::new(py);
    d.set_item("metadata", metadata)?;
    d.set_item("columns", header)?;
    d.set_item("data", data)?;
    Ok(d)
}

fn table_dict<'py>(py: Python<'py>, table: &CsvTable, path: &str) -> PyResult<Bound<'py, PyDict>> {
    frame_dict(py, &table.render(), path)
}

/// Read a CSV file the library wrote into a table dict.
#[pyfunction]
fn read_table<'py>(py: Python<'py>, path: PathBuf) -> PyResult<Bound<'py, PyDict>> {
    let text = std::fs::read_to_string(&path).map_err(|e| input_err(format!("{}: {e}", path.display())))?;
    frame_dict(py, &text, &path.display().to_string())
}

// ---------------------------------------------------------------------------------------------------------------
// Components and fuels.

/// The components of the library as JSON text (the rows of `dropcut components --json`).
#[pyfunction]
#[pyo3(signature = (components=None))]
fn components_json(components: Option<PathBuf>) -> PyResult<String> {
    let lib = library(components)?;
    let rows: Vec<serde_json::Value> = lib
        .components()
        .iter()
        .map(|c| {
            serde_json::json!({
                "id": c.id,
                "name": c.name,
                "cas": c.cas,
                "class": c.class.as_str(),
                "molar_mass_kg_mol": c.molar_mass(),
                "normal_boiling_point_K": c.normal_boiling_point(),
                "critical_temperature_K": c.critical_temperature(),
                "critical_pressure_Pa": c.critical_pressure(),
                "density_15C_kg_m3": c.density_15c(),
                "cetane_number": c.constants.cetane_number.value,
                "cetane_kind": c.constants.cetane_number.kind.clone().unwrap_or_default(),
                "estimated_properties": c.estimated_properties().iter().map(|s| s.to_string()).collect::<Vec<_>>(),
                "sources": c.source_ids(),
            })
        })
        .collect();
    output::to_json_string(&rows).map_err(DropcutRunError::new_err)
}

/// A liquid fuel (components and mass fractions) with the component library it was read with.
#[pyclass(frozen, name = "Fuel", module = "dropcut._native")]
struct PyFuel {
    fuel: Fuel,
    lib: Arc<Library>,
}

#[pymethods]
impl PyFuel {
    /// A fuel file, a built-in fuel id (`demo-wide`) or a component id (`n-decane`), as on the command line.
    #[staticmethod]
    #[pyo3(signature = (spec, components=None))]
    fn load(spec: &str, components: Option<PathBuf>) -> PyResult<Self> {
        let lib = library(components)?;
        let fuel = Fuel::resolve(spec, &lib).map_err(py_err)?;
        Ok(PyFuel { fuel, lib })
    }

    /// A fuel from {component id: fraction} on the basis `mass`, `mole` or `volume` (liquid at 15 °C); checked
    /// as a fuel file's `[composition]`.
    #[staticmethod]
    #[pyo3(signature = (composition, basis="mass", name="composition", components=None))]
    fn from_composition(composition: &Bound<'_, PyDict>, basis: &str, name: &str, components: Option<PathBuf>) -> PyResult<Self> {
        let lib = library(components)?;
        if !["mass", "mole", "volume"].contains(&basis) {
            return Err(input_err(format!("basis: unknown basis '{basis}'; use mass, mole or volume")));
        }
        let mut comp = toml::Table::new();
        for (k, v) in composition.iter() {
            let id: String = k.extract().map_err(|_| PyTypeError::new_err("composition: keys are component ids (strings)"))?;
            let x: f64 = if v.is_instance_of::<PyBool>() { Err(PyTypeError::new_err(format!("composition['{id}']: expected a number"))) } else { v.extract().map_err(|_| PyTypeError::new_err(format!("composition['{id}']: expected a number"))) }?;
            comp.insert(id, toml::Value::Float(x));
        }
        let mut file = toml::Table::new();
        file.insert("name".into(), toml::Value::String(name.into()));
        file.insert("basis".into(), toml::Value::String(basis.into()));
        file.insert("composition".into(), toml::Value::Table(comp));
        let text = toml::to_string(&file).map_err(|e| input_err(format!("composition: {e}")))?;
        let fuel = Fuel::parse(&text, "Fuel.from_composition", &lib).map_err(py_err)?;
        Ok(PyFuel { fuel, lib })
    }

    /// Fuel name.
    #[getter]
    fn name(&self) -> String {
        self.fuel.name.clone()
    }

    /// One-line description.
    #[getter]
    fn description(&self) -> String {
        self.fuel.description.clone()
    }

    /// Where the fuel came from (file, built-in fuel, component).
    #[getter]
    fn origin(&self) -> String {
        self.fuel.origin.clone()
    }

    /// Component ids, in the fuel's order.
    #[getter]
    fn component_ids(&self) -> Vec<String> {
        self.fuel.components.iter().map(|c| c.id.clone()).collect()
    }

    /// Mass fractions [-].
    #[getter]
    fn mass_fractions(&self) -> Vec<f64> {
        self.fuel.mass_fractions.clone()
    }

    /// Mole fractions [-].
    #[getter]
    fn mole_fractions(&self) -> Vec<f64> {
        self.fuel.mole_fractions()
    }

    /// Liquid volume fractions at 15 °C [-].
    #[getter]
    fn volume_fractions(&self) -> Vec<f64> {
        self.fuel.volume_fractions()
    }

    /// Mean molar mass [kg/mol].
    #[getter]
    fn molar_mass(&self) -> f64 {
        self.fuel.molar_mass()
    }

    /// Liquid density at 15 °C [kg/m³].
    #[getter]
    fn density_15c(&self) -> f64 {
        self.fuel.density_15c()
    }

    /// Notices raised while reading (renormalisation, …).
    #[getter]
    fn notices(&self) -> Vec<String> {
        self.fuel.notices.clone()
    }

    /// 16-hex-digit hash of the composition (as in output metadata).
    #[getter]
    fn composition_hash(&self) -> String {
        self.fuel.composition_hash()
    }

    /// Mixture liquid properties at temperature and pressure (SI), as JSON text (`dropcut fuel show --json`).
    #[pyo3(signature = (temperature, pressure, activity="ideal"))]
    fn properties_json(&self, temperature: &Bound<'_, PyAny>, pressure: &Bound<'_, PyAny>, activity: &str) -> PyResult<String> {
        let t = quantity(temperature, "temperature", Quantity::Temperature)?;
        let p = quantity(pressure, "pressure", Quantity::Pressure)?;
        if !(100.0..=1500.0).contains(&t) {
            return Err(input_err(format!("--temperature {temperature}: {t} K is outside 100–1500 K")));
        }
        if !(100.0..=1e8).contains(&p) {
            return Err(input_err(format!("--pressure {pressure}: {p} Pa is outside 100 Pa – 1000 bar")));
        }
        let fuel = &self.fuel;
        let model = activity_model(activity)?;
        let x = fuel.mole_fractions();
        let mut act = Activity::new(model, &fuel.components).map_err(|e| input_err(format!("--activity {}: fuel {}: {e}", model.as_str(), fuel.origin)))?;
        liquid::bubble_point_with(&fuel.components, &mut act, &x, p).map_err(|e| input_err(format!("--pressure {pressure}: {e}")))?;
        let bubble = liquid::subcritical_bubble_point_with(&fuel.components, &mut act, &x, p).ok();
        let dew = liquid::dew_point_with(&fuel.components, &mut act, &x, p).map_err(|e| input_err(format!("--pressure {pressure}: {e}")))?;
        let dew = (dew < liquid::pseudo_critical_temperature(&fuel.components, &x)).then_some(dew);
        let mut state = liquid::state(&fuel.components, &fuel.mass_fractions, t);
        state.vapor_pressure_Pa = act.bubble_pressure(&fuel.components, &x, t);
        let mut v = serde_json::to_value(&state).map_err(|e| DropcutRunError::new_err(e.to_string()))?;
        if let serde_json::Value::Object(m) = &mut v {
            m.insert("pressure_Pa".into(), serde_json::json!(p));
            m.insert("bubble_point_K".into(), serde_json::json!(bubble));
            m.insert("dew_point_K".into(), serde_json::json!(dew));
            m.insert("activity".into(), serde_json::json!(model.as_str()));
        }
        output::to_json_string(&v).map_err(DropcutRunError::new_err)
    }

    fn __repr__(&self) -> String {
        format!("<dropcut.Fuel '{}': {} components>", self.fuel.name, self.fuel.len())
    }
}

// ---------------------------------------------------------------------------------------------------------------
// Stepping: one droplet advanced by the caller's time step in a far field that may change every step.

/// A droplet a spray code advances step by step (the library's stepping API, `dropcut::model::Stepper`).
#[pyclass(name = "Droplet", module = "dropcut._native")]
struct PyDroplet {
    stepper: model::Stepper,
    state: model::DropletState,
}

fn vector3(v: Option<Vec<f64>>, what: &str) -> PyResult<Option<[f64; 3]>> {
    match v {
        None => Ok(None),
        Some(v) if v.len() == 3 => Ok(Some([v[0], v[1], v[2]])),
        Some(v) => Err(input_err(format!("{what}: expected 3 components (x, y, z), found {}", v.len()))),
    }
}

#[pymethods]
impl PyDroplet {
    /// A droplet of `fuel` made under `conditions` (the simulate conditions: diameter, droplet temperature, liquid
    /// model, `injected`, …); its first far field is the conditions' ambient temperature and pressure at rest.
    /// `velocity_vector`: the droplet's velocity as 3 components [m/s] (default: the `velocity` condition along x).
    #[new]
    #[pyo3(signature = (fuel, conditions=None, velocity_vector=None))]
    fn new(fuel: &PyFuel, conditions: Option<&Bound<'_, PyDict>>, velocity_vector: Option<Vec<f64>>) -> PyResult<Self> {
        let inputs = condition_inputs(&fuel.lib, &fuel.fuel, conditions)?;
        let speed = match inputs.motion {
            model::Motion::Fixed { velocity } | model::Motion::Injected { velocity } => velocity,
        };
        let velocity = vector3(velocity_vector, "velocity_vector")?.unwrap_or([speed, 0.0, 0.0]);
        if velocity.iter().any(|v| !v.is_finite()) {
            return Err(input_err(format!("velocity_vector: {velocity:?} m/s must be finite")));
        }
        let mut stepper = model::Stepper::new(&inputs).map_err(py_err)?;
        let far_field = model::FarField::new(inputs.ambient_temperature, inputs.pressure);
        let state = stepper.initial_state(&far_field, velocity).map_err(py_err)?;
        Ok(PyDroplet { stepper, state })
    }

    /// Advance by `dt` [s] in the given far field; returns the exchange terms (droplet → gas) as a dict:
    /// mass (kg per component), energy (J), momentum (kg m/s, 3 components), time (s advanced), finished.
    #[pyo3(signature = (dt, temperature, pressure, vapor_mass_fractions=None, gas_velocity=None))]
    fn advance<'py>(&mut self, py: Python<'py>, dt: f64, temperature: f64, pressure: f64, vapor_mass_fractions: Option<Vec<f64>>, gas_velocity: Option<Vec<f64>>) -> PyResult<Bound<'py, PyDict>> {
        if !(dt.is_finite() && dt > 0.0) {
            return Err(input_err(format!("dt = {dt} s: the step must be a positive finite time")));
        }
        let far_field = model::FarField {
            temperature,
            pressure,
            vapor_mass_fractions: vapor_mass_fractions.unwrap_or_default(),
            gas_velocity: vector3(gas_velocity, "gas_velocity")?.unwrap_or([0.0; 3]),
        };
        let ex = self.stepper.advance(&mut self.state, dt, &far_field).map_err(py_err)?;
        let d = PyDict::new(py);
        d.set_item("mass", ex.mass)?;
        d.set_item("energy", ex.energy)?;
        d.set_item("momentum", ex.momentum.to_vec())?;
        d.set_item("time", ex.time)?;
        d.set_item("finished", ex.finished)?;
        Ok(d)
    }

    /// Component ids, in the order of every per-component list.
    #[getter]
    fn components(&self) -> Vec<String> {
        self.stepper.components().iter().map(|c| c.id.clone()).collect()
    }

    /// Time since the droplet was made [s].
    #[getter]
    fn time(&self) -> f64 {
        self.state.time()
    }

    /// Liquid mass [kg].
    #[getter]
    fn mass(&self) -> f64 {
        self.state.mass()
    }

    /// Liquid mass per component [kg].
    #[getter]
    fn masses(&self) -> Vec<f64> {
        self.state.masses().to_vec()
    }

    /// Diameter [m].
    #[getter]
    fn diameter(&self) -> f64 {
        self.stepper.diameter(&self.state)
    }

    /// Surface temperature [K].
    #[getter]
    fn surface_temperature(&self) -> f64 {
        self.state.surface_temperature()
    }

    /// Liquid temperature: one value (well-mixed) or one per radial cell, centre first (resolved) [K].
    #[getter]
    fn temperatures(&self) -> Vec<f64> {
        self.state.temperatures().to_vec()
    }

    /// Droplet velocity [m/s].
    #[getter]
    fn velocity(&self) -> Vec<f64> {
        self.state.velocity().to_vec()
    }

    /// Liquid enthalpy held by the droplet [J] (each pure liquid at 298.15 K is zero).
    #[getter]
    fn enthalpy(&self) -> f64 {
        self.state.enthalpy()
    }

    /// True once the droplet reached its end of life.
    #[getter]
    fn finished(&self) -> bool {
        self.state.is_finished()
    }
}

// ---------------------------------------------------------------------------------------------------------------
// Runs.

/// Requested history times as `--history-times` takes them: a string (`"0:0.5ms:20ms"`, `"1ms,2ms"`) or a sequence
/// of times (numbers in seconds or strings with units); errors name the option as the command line does.
fn history_times(value: &Bound<'_, PyAny>) -> PyResult<Vec<f64>> {
    if let Ok(text) = value.extract::<String>() {
        return model::guard::parse_history_times(&text).map_err(|e| match e {
            model::guard::HistoryTimesError::Time(message) => input_err(format!("--history-times: {message}")),
            other => input_err(format!("--history-times {}", other.detail())),
        });
    }
    let items: Vec<Bound<'_, PyAny>> = value.try_iter().map_err(|_| PyTypeError::new_err(format!("history_times: expected a string or a sequence of times, found {}", value.get_type().name().map(|n| n.to_string()).unwrap_or_default())))?.collect::<PyResult<_>>()?;
    if items.is_empty() {
        return Err(input_err("--history-times: the list is empty (give None for a row at every integrator step)"));
    }
    let times = items.iter().map(|t| quantity(t, "history-times", Quantity::Time)).collect::<PyResult<Vec<f64>>>()?;
    model::guard::check_times(&times).map_err(|e| input_err(format!("--history-times {}", e.detail())))?;
    Ok(times)
}

/// One droplet run: returns {history, residue, profiles (None unless resolved), summary_json, notes, inputs}.
/// `history_times`: history rows at these times (see [`history_times`]) instead of at every integrator step.
#[pyfunction]
#[pyo3(signature = (fuel, conditions=None, limits=None, history_times=None))]
fn simulate<'py>(py: Python<'py>, fuel: &PyFuel, conditions: Option<&Bound<'py, PyDict>>, limits: Option<&str>, history_times: Option<&Bound<'py, PyAny>>) -> PyResult<Bound<'py, PyDict>> {
    let inp = condition_inputs(&fuel.lib, &fuel.fuel, conditions)?;
    let limits = self::limits(limits)?;
    let times = history_times.filter(|t| !t.is_none()).map(self::history_times).transpose()?;
    let (run, residue) = py
        .detach(|| -> Result<_, CliError> {
            let run = match times {
                Some(times) => model::simulate(&inp, &mut model::guard::RowsAt { times })?,
                None => model::simulate(&inp, &mut model::guard::RowsOnly)?,
            };
            let residue = droplet_residue(&inp, &run, limits.as_ref())?;
            Ok((run, residue))
        })
        .map_err(py_err)?;
    let d = PyDict::new(py);
    d.set_item("history", table_dict(py, &output::history::history_table(&inp, &run.history, &run.row_times).map_err(py_err)?, "history.csv")?)?;
    d.set_item("residue", table_dict(py, &residue, "residue.csv")?)?;
    if run.profiles.is_empty() {
        d.set_item("profiles", py.None())?;
    } else {
        d.set_item("profiles", table_dict(py, &output::history::profiles_table(&inp, &run.profiles).map_err(py_err)?, "profiles.csv")?)?;
    }
    d.set_item("summary_json", output::to_json_string(&output::history::Summary::of(&inp, &run)).map_err(DropcutRunError::new_err)?)?;
    d.set_item("notes", run.outcome.regime_notes.clone())?;
    Ok(d)
}

/// Residual-liquid indicators along a droplet history: the table `dropcut simulate` writes as residue.csv.
fn droplet_residue(inp: &DropletInputs, run: &model::RunResult, limits: Option<&dropcut::post::Limits>) -> Result<CsvTable, CliError> {
    use dropcut::post::droplet::{residues_along_history, Layer};
    let fractions = dropcut::post::weathering::default_fractions();
    let opts = dropcut::post::IndicatorOptions { activity: inp.liquid.activity, ..Default::default() };
    let comps = &inp.fuel.components;
    let mean = residues_along_history(&run.history, &fractions, Layer::Mean);
    let mean_rows = dropcut::post::residue_table(comps, &mean, &opts).map_err(|e| CliError::runtime(e.to_string()))?;
    let mut sets = vec![output::residue::ResidueSet { label: "mean", rows: &mean_rows }];
    let surface_rows;
    if inp.liquid.mixing == model::droplet::LiquidMixing::Diffusion {
        let surface = residues_along_history(&run.history, &fractions, Layer::Surface);
        surface_rows = dropcut::post::residue_table(comps, &surface, &opts).map_err(|e| CliError::runtime(e.to_string()))?;
        sets.push(output::residue::ResidueSet { label: "surface", rows: &surface_rows });
    }
    Ok(output::residue::residue_table(&format!("residual liquid along the droplet history of {}", inp.fuel.name), &sets, limits)?)
}

/// Open-vessel weathering residues (`dropcut residue --out`): a table dict.
#[pyfunction]
#[pyo3(signature = (fuel, temperature, steps=None, activity="ideal", limits=None))]
fn residue<'py>(py: Python<'py>, fuel: &PyFuel, temperature: &Bound<'py, PyAny>, steps: Option<Vec<f64>>, activity: &str, limits: Option<&str>) -> PyResult<Bound<'py, PyDict>> {
    let t = quantity(temperature, "temperature", Quantity::Temperature)?;
    if !(150.0..=800.0).contains(&t) {
        return Err(input_err(format!("--temperature {temperature}: {t} K is outside 150–800 K")));
    }
    let fractions = match steps {
        None => dropcut::post::weathering::default_fractions(),
        Some(v) => {
            if let Some(f) = v.iter().find(|f| !(0.0..1.0).contains(*f)) {
                return Err(input_err(format!("--steps: evaporated fraction {f} must be in [0, 1)")));
            }
            if v.is_empty() || v.windows(2).any(|w| w[1] <= w[0]) {
                return Err(input_err("--steps: fractions must increase (and at least one is needed)"));
            }
            v
        }
    };
    let limits = self::limits(limits)?;
    let fuel = &fuel.fuel;
    let opts = dropcut::post::IndicatorOptions { activity: activity_model(activity)?, ..Default::default() };
    if let Err(e) = Activity::new(opts.activity, &fuel.components) {
        return Err(input_err(format!("--activity {}: fuel {}: {e}", opts.activity.as_str(), fuel.origin)));
    }
    let table = py
        .detach(|| -> Result<CsvTable, CliError> {
            let residues = dropcut::post::weathering_residues(&fuel.components, &fuel.mass_fractions, t, &fractions, opts.activity).map_err(|e| CliError::input(e.to_string()))?;
            let rows = dropcut::post::residue_table(&fuel.components, &residues, &opts).map_err(|e| CliError::runtime(e.to_string()))?;
            Ok(output::residue::residue_table(
                &format!("open-vessel weathering of {} at {t} K", fuel.name),
                &[output::residue::ResidueSet { label: "weathering", rows: &rows }],
                limits.as_ref(),
            )?)
        })
        .map_err(py_err)?;
    table_dict(py, &table, "residue.csv")
}

/// Property tables for spray CFD (`dropcut table --no-date`) written as CSV into `out`; returns the files written.
#[pyfunction]
#[pyo3(signature = (fuel, out, pressure, step, from_temperature, to_temperature, gas, vapor_from, vapor_to, residue, residue_temperature, reference, surrogate, activity))]
#[allow(clippy::too_many_arguments)]
fn table(
    py: Python<'_>,
    fuel: &PyFuel,
    out: PathBuf,
    pressure: &Bound<'_, PyAny>,
    step: &Bound<'_, PyAny>,
    from_temperature: Option<&Bound<'_, PyAny>>,
    to_temperature: Option<&Bound<'_, PyAny>>,
    gas: &str,
    vapor_from: &Bound<'_, PyAny>,
    vapor_to: &Bound<'_, PyAny>,
    residue: Vec<f64>,
    residue_temperature: &Bound<'_, PyAny>,
    reference: Option<&Bound<'_, PyDict>>,
    surrogate: bool,
    activity: &str,
) -> PyResult<Vec<PathBuf>> {
    use dropcut::table::surrogate::{ReferenceCondition, SurrogateOptions};
    use dropcut::table::{TableError, TableOptions};
    let lib = &fuel.lib;
    let mut opts = TableOptions::new(AmbientGas::parse(lib, gas).map_err(|e| input_err(format!("--gas {gas}: {e}")))?);
    opts.pressure = quantity(pressure, "pressure", Quantity::Pressure)?;
    opts.step = quantity(step, "step", Quantity::TemperatureDifference)?;
    opts.from = from_temperature.map(|t| quantity(t, "from", Quantity::Temperature)).transpose()?;
    opts.to = to_temperature.map(|t| quantity(t, "to", Quantity::Temperature)).transpose()?;
    opts.vapor_from = quantity(vapor_from, "vapor-from", Quantity::Temperature)?;
    opts.vapor_to = quantity(vapor_to, "vapor-to", Quantity::Temperature)?;
    opts.residue_temperature = quantity(residue_temperature, "residue-temperature", Quantity::Temperature)?;
    if let Some(f) = residue.iter().find(|f| !(0.0..1.0).contains(*f)) {
        return Err(input_err(format!("--residue: evaporated fraction {f} must lie in [0, 1)")));
    }
    if residue.windows(2).any(|w| w[1] <= w[0]) {
        return Err(input_err("--residue: fractions must increase"));
    }
    opts.residue_fractions = residue;
    opts.activity = activity_model(activity)?;
    let mut r = ReferenceCondition::default();
    for (k, v) in reference.into_iter().flat_map(|d| d.iter()) {
        let key: String = k.extract::<String>()?.replace('_', "-");
        let q = |qty, field: &mut f64| -> PyResult<()> {
            *field = quantity(&v, &format!("reference {key}"), qty)?;
            Ok(())
        };
        match key.as_str() {
            "ambient-temperature" => q(Quantity::Temperature, &mut r.ambient_temperature)?,
            "pressure" => q(Quantity::Pressure, &mut r.pressure)?,
            "diameter" => q(Quantity::Length, &mut r.diameter)?,
            "velocity" => q(Quantity::Velocity, &mut r.velocity)?,
            "droplet-temperature" => q(Quantity::Temperature, &mut r.droplet_temperature)?,
            other => return Err(input_err(format!("--reference: unknown key '{other}' (known: ambient_temperature, pressure, diameter, velocity, droplet_temperature)"))),
        }
    }
    opts.surrogate = surrogate.then(|| SurrogateOptions { reference: r, ..SurrogateOptions::default() });
    if let Some(m) = output::refuse_dir_target(&out) {
        return Err(input_err(format!("--out {}: {m}", out.display())));
    }
    let f = &fuel.fuel;
    py.detach(|| -> Result<Vec<PathBuf>, CliError> {
        let set = dropcut::table::build(f, &opts).map_err(|e| match e {
            TableError::Input { .. } | TableError::Property(_) | TableError::Post(_) => CliError::input(e.to_string()),
            TableError::Model(model::ModelError::Input { .. }) => CliError::input(format!("--reference: {e}")),
            other => CliError::runtime(other.to_string()),
        })?;
        let wo = output::tables::WriteOptions { format: output::tables::TableFormat::Csv, date: None };
        Ok(output::tables::write_tables(&out, &set, &lib.sources, &wo)?)
    })
    .map_err(py_err)
}

/// Progress of a sweep passed to a Python callable `callback(done, total)` (at most every quarter second).
/// A failing callback is shown and dropped (the sweep goes on); a KeyboardInterrupt (Ctrl-C, also while the
/// callback runs) is kept and raised when the sweep returns, since a started sweep runs to its end (its journal
/// lets `resume=True` continue an interrupted one).
struct CallbackProgress {
    callback: Option<Py<PyAny>>,
    total: u64,
    last: Option<Instant>,
    interrupt: Option<PyErr>,
}

impl CallbackProgress {
    fn call(&mut self, done: u64, force: bool) {
        let Some(cb) = &self.callback else { return };
        if !force && self.last.is_some_and(|t| t.elapsed() < Duration::from_millis(250)) {
            return;
        }
        self.last = Some(Instant::now());
        let total = self.total;
        let failed = Python::attach(|py| match py.check_signals().and_then(|_| cb.call1(py, (done, total)).map(|_| ())) {
            Ok(()) => None,
            Err(e) if e.is_instance_of::<pyo3::exceptions::PyKeyboardInterrupt>(py) => Some(e),
            Err(e) => {
                e.print(py); // a broken progress display never stops the sweep
                Some(e)
            }
        });
        if let Some(e) = failed {
            self.callback = None;
            if Python::attach(|py| e.is_instance_of::<pyo3::exceptions::PyKeyboardInterrupt>(py)) {
                self.interrupt = Some(e);
            }
        }
    }
}

impl dropcut::sweep::Progress for CallbackProgress {
    fn start(&mut self, total: u64, already_done: u64) {
        self.total = total;
        self.call(already_done, true);
    }
    fn update(&mut self, done: u64) {
        self.call(done, false);
    }
    fn finish(&mut self, done: u64) {
        self.call(done, true);
    }
}

/// Run a sweep spec into `out` (as `dropcut sweep SPEC --out OUT`); returns {summary (path), cases, ran,
/// resumed, failed, already_complete}.
#[pyfunction]
#[pyo3(signature = (spec, out, threads=0, histories=false, resume=false, progress=None, components=None))]
#[allow(clippy::too_many_arguments)]
fn sweep<'py>(py: Python<'py>, spec: PathBuf, out: PathBuf, threads: usize, histories: bool, resume: bool, progress: Option<Py<PyAny>>, components: Option<PathBuf>) -> PyResult<Bound<'py, PyDict>> {
    let lib = library(components)?;
    let spec = SweepSpec::load(&spec, &lib).map_err(py_err)?;
    if let Some(m) = output::refuse_dir_target(&out) {
        return Err(input_err(format!("--out {}: {m}", out.display())));
    }
    let cores = std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1);
    let opts = dropcut::sweep::RunOptions {
        threads: threads.min(cores),
        shard: dropcut::sweep::Shard::WHOLE,
        histories,
        resume,
        extra_columns: if spec.residue_indicators { vec![Box::new(dropcut::sweep::ResidueIndicators::default())] } else { vec![] },
    };
    let mut cb = CallbackProgress { callback: progress, total: 0, last: None, interrupt: None };
    let report = py.detach(|| dropcut::sweep::run(&spec, &out, &opts, &mut cb)).map_err(py_err)?;
    if let Some(e) = cb.interrupt.take() {
        return Err(e);
    }
    let d = PyDict::new(py);
    d.set_item("summary", report.summary)?;
    d.set_item("cases", report.cases)?;
    d.set_item("ran", report.ran)?;
    d.set_item("resumed", report.resumed)?;
    d.set_item("failed", report.failed)?;
    d.set_item("already_complete", report.already_complete)?;
    Ok(d)
}

/// The native module.
#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("DropcutError", m.py().get_type::<DropcutError>())?;
    m.add("DropcutRunError", m.py().get_type::<DropcutRunError>())?;
    m.add("__version__", env!("CARGO_PKG_VERSION"))?;
    m.add_class::<PyFuel>()?;
    m.add_class::<PyDroplet>()?;
    m.add_function(wrap_pyfunction!(components_json, m)?)?;
    m.add_function(wrap_pyfunction!(simulate, m)?)?;
    m.add_function(wrap_pyfunction!(residue, m)?)?;
    m.add_function(wrap_pyfunction!(table, m)?)?;
    m.add_function(wrap_pyfunction!(sweep, m)?)?;
    m.add_function(wrap_pyfunction!(read_table, m)?)?;
    Ok(())
}
