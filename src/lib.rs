//! dropcut: heating and evaporation of multicomponent liquid-fuel droplets, and how the residual liquid drifts.
//!
//! Layers, each depending only on those above it in this list:
//! [`numerics`] → [`units`] → [`data`] → [`props`] → [`fuel`] → [`model`] → [`conditions`] → [`post`] → [`table`] → [`uncertainty`] → [`output`] →
//! [`sweep`] → [`cli`].
#![warn(missing_docs)]
#![allow(non_snake_case)] // SI-unit suffixes in names: temperature_K, pressure_Pa

pub mod checks;
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
