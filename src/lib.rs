//! dropcut: heating and evaporation of multicomponent liquid-fuel droplets, and how the residual liquid drifts.
//!
//! Layers, each depending only on those above it in this list:
//! [`numerics`] → [`units`] → [`data`] → [`props`] → [`fuel`] → [`model`] → [`conditions`] → [`post`] → [`table`] → [`uncertainty`] → [`output`] →
//! [`sweep`] → [`cli`].
//!
//! As a library: [`model::simulate`] runs one droplet life; [`model::Stepper`] advances droplets step by step in
//! a far field a spray solver gives and returns the exchange terms; [`table`] builds property tables;
//! [`post::indicators()`] evaluates residue indicators. Cargo features: `cli` (the command line: clap, progress
//! bars) and `charts` (plotters, fonts) are on by default; `default-features = false` builds the library alone;
//! `capi` adds the C interface (`capi` module, header `dropcut.h`).
//!
//! ```
//! use dropcut::data::Library;
//! use dropcut::fuel::Fuel;
//! use dropcut::model::{simulate, DropletInputs};
//! use dropcut::model::droplet::NoHistory;
//! use dropcut::props::gas::AmbientGas;
//!
//! let lib = Library::embedded().unwrap();
//! let fuel = Fuel::resolve("n-decane", &lib).unwrap();
//! let inputs = DropletInputs::new(fuel, AmbientGas::air(&lib).unwrap(), 800.0, 101_325.0, 50e-6, 300.0);
//! let run = simulate(&inputs, &mut NoHistory).unwrap();
//! let lifetime = run.outcome.lifetime.unwrap();
//! assert!(lifetime > 1e-3 && lifetime < 2e-2, "{lifetime} s");
//! ```
//!
//! A property table and the residue indicators of a liquid:
//!
//! ```
//! use dropcut::data::Library;
//! use dropcut::fuel::Fuel;
//! use dropcut::post::{indicators, IndicatorOptions};
//! use dropcut::props::gas::AmbientGas;
//! use dropcut::table::{mixture_table, TableOptions};
//!
//! let lib = Library::embedded().unwrap();
//! let fuel = Fuel::resolve("demo-narrow", &lib).unwrap();
//! let table = mixture_table("mixture", &fuel, &TableOptions::new(AmbientGas::air(&lib).unwrap())).unwrap();
//! assert!(table.rows.len() > 5);
//! let found = indicators(&fuel.components, &fuel.mass_fractions, &IndicatorOptions::default()).unwrap();
//! assert!(found.t10_K.unwrap() < found.t50_K.unwrap());
//! ```
#![warn(missing_docs)]
#![allow(non_snake_case)] // SI-unit suffixes in names: temperature_K, pressure_Pa
// Numeric kernels index several parallel per-component arrays (masses, fractions, γ, p_sat) by one index.
#![allow(clippy::needless_range_loop)]
// `!(x > 0.0)` is deliberate throughout: unlike `x <= 0.0` it also rejects NaN.
#![allow(clippy::neg_cmp_op_on_partial_ord)]

#[cfg(feature = "capi")]
pub mod capi;
pub mod checks;
#[cfg(feature = "cli")]
pub mod cli;
pub mod conditions;
pub mod data;
pub mod fuel;
pub mod model;
pub mod numerics;
pub mod output;
pub mod post;
pub mod props;
pub mod sweep;
pub mod table;
pub mod uncertainty;
pub mod units;
