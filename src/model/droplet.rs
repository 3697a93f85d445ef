//! The droplet-model paths of earlier versions, kept working: inputs (inputs.rs), history rows, observers and
//! outcomes (history.rs), the well-mixed liquid (well_mixed.rs) and `simulate` (run.rs) are re-exported here.

pub use super::history::{energy_balance_residual, HistoryRow, NoHistory, Observer, Profile, Recorder, Regime, RunOutcome, RunResult, Status};
pub use super::inputs::{DropletInputs, LiquidHeat, LiquidMixing, LiquidOptions, Motion};
pub use super::run::simulate;
pub use super::well_mixed::{adiabatic_flash, boiling_hold_temperature, WellMixed, BOILING_THRESHOLD};
