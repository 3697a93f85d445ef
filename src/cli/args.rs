//! Clap definitions (first stage: text). Values with units stay strings here; commands.rs converts them.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand, ValueEnum};

use super::conditions::ConditionArgs;

/// Heating and evaporation of multicomponent fuel droplets, and how the residual liquid drifts.
#[derive(Debug, Parser)]
#[command(name = "dropcut", version, about, long_about = None)]
pub struct Cli {
    /// Extra folder of component files (TOML) added to the built-in library.
    #[arg(long, global = true, value_name = "DIR")]
    pub components: Option<PathBuf>,
    /// The command.
    #[command(subcommand)]
    pub command: Command,
}

/// Commands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// List the component library (class, boiling point, sources).
    Components {
        /// Print JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Fuel definitions: show one, or build one from lab data (show, build).
    Fuel {
        /// What to do.
        #[command(subcommand)]
        action: FuelAction,
    },
    /// Simulate one droplet and write history.csv and summary.json.
    Simulate(SimulateArgs),
    /// Run the built-in demonstration: demo fuels at a combustor-like and a relight-like condition.
    Demo {
        /// Output folder.
        #[arg(long, default_value = "dropcut-out/demo")]
        out: PathBuf,
        /// Do not draw charts.
        #[arg(long)]
        no_plots: bool,
    },
    /// Run several fuels at one condition (or one fuel at several conditions) and compare them.
    Compare(CompareArgs),
    /// Redraw the charts and index.html of a result folder from its saved data, without recomputing.
    Plot {
        /// A run folder (history.csv, summary.json), a demo/compare folder with one sub-folder per run, a sweep
        /// output folder (summary.csv), a property-table folder or an uncertainty folder.
        dir: PathBuf,
        /// Sweep maps: the two swept inputs that span each map, as X,Y (e.g. ambient-temperature,diameter).
        #[arg(long, value_name = "X,Y")]
        map_axes: Option<String>,
        /// Sweep maps: hold another swept input at one of its swept values, as KEY=VALUE with units
        /// (e.g. pressure=10bar); repeat for several. Inputs not named are held at their first value.
        #[arg(long, value_name = "KEY=VALUE")]
        map_hold: Vec<String>,
    },
    /// Run a sweep of fuels × conditions from a TOML spec on all cores, or print its Slurm batch script.
    Sweep(SweepArgs),
    /// Merge finished sweep shards into one summary.csv, identical to a single-machine run.
    Merge(MergeArgs),
    /// Residual liquid of a fuel weathered in an open vessel at a fixed temperature (Rayleigh path): indicators
    /// at each evaporated fraction.
    Residue(ResidueArgs),
    /// Property tables for spray CFD: mixture, components, weathered residues, a single-component surrogate
    /// and polynomial fits (CSV or JSON).
    Table(TableArgs),
    /// Uncertainty bands: sample the uncertain conditions, composition and property correlations, run one droplet
    /// per sample on all cores, and write percentile bands, a sensitivity ranking and charts (several fuels:
    /// bands side by side and whether they overlap).
    Uncertainty(UncertaintyArgs),
    /// Rerun every validation check and write the report (Markdown); exit 0 when only known failures fail.
    Validate {
        /// Report file (the committed report is written with --out docs/validation.md).
        #[arg(long, default_value = "dropcut-out/validation.md")]
        out: PathBuf,
    },
}

/// `residue` arguments.
#[derive(Debug, Clone, Args)]
pub struct ResidueArgs {
    /// Fuel file, library fuel id, or component id.
    pub fuel: String,
    /// Temperature of the open-vessel evaporation.
    #[arg(long, allow_hyphen_values = true, default_value = "350K")]
    pub temperature: String,
    /// Evaporated mass fractions, comma-separated (default 0, 0.05, ..., 0.95).
    #[arg(long, allow_hyphen_values = true, default_value = "")]
    pub steps: String,
    /// Limits file (TOML windows) to flag indicators in or out; `aviation` for the built-in
    /// aviation-turbine-fuel windows.
    #[arg(long)]
    pub limits: Option<String>,
    /// Print the rows as JSON (a list) instead of a table.
    #[arg(long)]
    pub json: bool,
    /// Also write the table as CSV to this file.
    #[arg(long)]
    pub out: Option<std::path::PathBuf>,
    /// Liquid activity coefficients of the weathering, bubble point, distillation, vapour pressure and flash
    /// point: ideal (Raoult's law) or unifac (original UNIFAC).
    #[arg(long, value_enum, default_value = "ideal")]
    pub activity: ActivityArg,
}

/// `fuel` subcommands.
#[derive(Debug, Subcommand)]
pub enum FuelAction {
    /// Composition, molar mass, density, bubble/dew points and liquid properties of a fuel.
    Show {
        /// Fuel file, library fuel id, or component id.
        fuel: String,
        /// Temperature for the liquid properties (e.g. 300K, 26.85degC).
        #[arg(long, default_value = "288.15K", allow_hyphen_values = true)]
        temperature: String,
        /// Pressure for bubble and dew points (e.g. 1atm, 10bar).
        #[arg(long, default_value = "1atm", allow_hyphen_values = true)]
        pressure: String,
        /// Liquid activity coefficients of the bubble and dew points and the vapour pressure: ideal or unifac.
        #[arg(long, value_enum, default_value = "ideal")]
        activity: ActivityArg,
        /// Print JSON.
        #[arg(long)]
        json: bool,
    },
    /// Build a fuel file from lab data (class x carbon-number table, or distillation curve + density), or a
    /// component file from structural groups (docs/fuel-from-lab-data.md).
    Build(Box<BuildArgs>),
}

/// `fuel build` arguments.
#[derive(Debug, Clone, Args)]
#[command(group(clap::ArgGroup::new("source").required(true).args(["from_classes", "from_distillation", "from_groups"])))]
pub struct BuildArgs {
    /// Class x carbon-number table of mass percent (CSV or TOML).
    #[arg(long, value_name = "FILE")]
    pub from_classes: Option<PathBuf>,
    /// Distillation curve, ASTM D86 or TBP (TOML or CSV); needs a density.
    #[arg(long, value_name = "FILE")]
    pub from_distillation: Option<PathBuf>,
    /// One molecule by its Joback groups, e.g. "CH3=2,CH2=10"; writes a component file.
    #[arg(long, value_name = "GROUPS")]
    pub from_groups: Option<String>,
    /// File to write (a fuel file; a component file with --from-groups).
    #[arg(long)]
    pub out: PathBuf,
    /// Fuel name (component id with --from-groups); default: from the input.
    #[arg(long)]
    pub name: Option<String>,
    /// Density of the fuel at 15 °C, with its unit (e.g. 799kg/m3).
    #[arg(long, conflicts_with = "specific_gravity")]
    pub density: Option<String>,
    /// Specific gravity 60/60 °F, instead of --density.
    #[arg(long)]
    pub specific_gravity: Option<String>,
    /// Number of pseudo-components (distillation; default 12).
    #[arg(long)]
    pub pseudo: Option<String>,
    /// Critical constants and molar mass of the cuts (distillation; default riazi-daubert-1980).
    #[arg(long, value_enum)]
    pub critical: Option<CriticalArg>,
    /// Acentric factor of the cuts (distillation; default lee-kesler).
    #[arg(long, value_enum)]
    pub acentric: Option<AcentricArg>,
    /// How the cut boiling points are fixed (distillation; default simulated-distillation).
    #[arg(long, value_enum)]
    pub fit: Option<FitArg>,
    /// Group-contribution method for estimated components (classes, groups; default joback).
    #[arg(long, value_enum)]
    pub method: Option<MethodArg>,
    /// Measured normal boiling point to use instead of the estimate (groups), e.g. 447.3K.
    #[arg(long)]
    pub boiling_point: Option<String>,
    /// Class to write (groups; inferred from the groups otherwise).
    #[arg(long)]
    pub class: Option<String>,
    /// Print the build report as JSON.
    #[arg(long)]
    pub json: bool,
}

/// Critical-constant correlation for distillation cuts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum CriticalArg {
    /// Riazi & Daubert (1980).
    #[value(name = "riazi-daubert-1980")]
    RiaziDaubert1980,
    /// Riazi & Daubert (1987).
    #[value(name = "riazi-daubert-1987")]
    RiaziDaubert1987,
}

/// Acentric-factor method for distillation cuts.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum AcentricArg {
    /// Lee–Kesler vapour pressure solved at Tb.
    LeeKesler,
    /// Edmister (1958).
    Edmister,
}

/// How cut boiling points are fixed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum FitArg {
    /// Shift the cuts until the simulated distillation reproduces the input curve.
    SimulatedDistillation,
    /// Keep the cuts on the TBP curve (D86 converted by Riazi & Daubert 1986).
    Tbp,
}

/// Group-contribution method.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum MethodArg {
    /// Joback & Reid (1987).
    Joback,
    /// Constantinou & Gani (1994) first order (acyclic alkanes; rings use Joback).
    ConstantinouGani,
}

/// Liquid activity model.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ActivityArg {
    /// Ideal solution: Raoult's law.
    Ideal,
    /// Original UNIFAC (Hansen et al. 1991 / Wittig et al. 2003 published parameters).
    Unifac,
}

impl ActivityArg {
    /// The model this option selects.
    pub fn model(self) -> crate::props::activity::ActivityModel {
        match self {
            ActivityArg::Ideal => crate::props::activity::ActivityModel::Ideal,
            ActivityArg::Unifac => crate::props::activity::ActivityModel::Unifac,
        }
    }
}

/// `simulate` arguments.
#[derive(Debug, Clone, Args)]
pub struct SimulateArgs {
    /// Fuel file, library fuel id, or component id.
    pub fuel: String,
    /// Conditions.
    #[command(flatten)]
    pub condition: ConditionArgs,
    /// Output folder.
    #[arg(long, default_value = "dropcut-out/simulate")]
    pub out: PathBuf,
    /// Also print the summary as JSON on stdout.
    #[arg(long)]
    pub json: bool,
    /// History rows at these times instead of at every integrator step, from the integrator's continuous
    /// extension (well-mixed) or steps landing on them (resolved): START:STEP:END (e.g. 0:0.1ms:20ms) or a list
    /// (1ms,2ms,5ms); the first row, regime changes and the final row stay.
    #[arg(long, value_name = "TIMES", allow_hyphen_values = true)]
    pub history_times: Option<String>,
    /// Do not draw charts.
    #[arg(long)]
    pub no_plots: bool,
    /// Limits file for the residue table (`aviation` = built-in aviation-turbine-fuel windows).
    #[arg(long)]
    pub limits: Option<String>,
}

/// `sweep` arguments.
#[derive(Debug, Clone, Args)]
pub struct SweepArgs {
    /// Sweep spec (TOML): fuels and condition values, lists or ranges (see docs/sweeps.md).
    pub spec: PathBuf,
    /// Output folder: summary.csv (one row per case, in case-id order) and, with --histories, cases/<case_id>/.
    #[arg(long, default_value = "dropcut-out/sweep")]
    pub out: PathBuf,
    /// Worker threads (0 = every core).
    #[arg(long, default_value_t = 0, value_name = "N", allow_hyphen_values = true)]
    pub threads: usize,
    /// Also write each case's history.csv and summary.json into OUT/cases/<case_id>/.
    #[arg(long)]
    pub histories: bool,
    /// Continue the sweep already in OUT, skipping the cases it holds (starts afresh when OUT holds none).
    #[arg(long)]
    pub resume: bool,
    /// When stderr is not a terminal, still print a plain progress line every 10 s (for batch-job logs).
    #[arg(long)]
    pub progress_log: bool,
    /// Run only part K of N, K from 0: the cases with case_id % N == K. Inside a Slurm job array the default
    /// comes from SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_MIN and SLURM_ARRAY_TASK_COUNT.
    #[arg(long, value_name = "K/N", conflicts_with = "slurm_script", allow_hyphen_values = true)]
    pub shard: Option<String>,
    /// Print a Slurm job-array batch script for this sweep (one task per shard, then a merge job) and exit.
    #[arg(long)]
    pub slurm_script: bool,
    /// With --slurm-script: number of shards (array tasks).
    #[arg(long, default_value_t = 4, value_name = "N", requires = "slurm_script")]
    pub shards: u64,
    /// With --slurm-script: CPUs per array task (the threads of each shard).
    #[arg(long, default_value_t = 4, value_name = "N", requires = "slurm_script")]
    pub cpus_per_task: u32,
    /// With --slurm-script: Slurm job name.
    #[arg(long, default_value = "dropcut-sweep", requires = "slurm_script")]
    pub job_name: String,
    /// With --slurm-script: an extra sbatch option for every job, e.g. --sbatch=--partition=short (repeatable).
    #[arg(long = "sbatch", value_name = "OPTION", allow_hyphen_values = true, requires = "slurm_script")]
    pub sbatch: Vec<String>,
}

/// `merge` arguments.
#[derive(Debug, Clone, Args)]
pub struct MergeArgs {
    /// Output folders of the shards (each holds a finished summary.csv), in any order.
    #[arg(required = true, value_name = "DIR")]
    pub dirs: Vec<PathBuf>,
    /// Folder for the merged summary.csv (and the shards' cases/ histories, if any).
    #[arg(long)]
    pub out: PathBuf,
    /// The sweep spec: each row's fuel and conditions are then checked against its case id.
    #[arg(long, value_name = "SPEC")]
    pub spec: Option<PathBuf>,
}

/// Table file format.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum TableFormatArg {
    /// CSV with `#` metadata lines.
    Csv,
    /// JSON.
    Json,
}

/// `table` arguments.
#[derive(Debug, Clone, Args)]
pub struct TableArgs {
    /// Fuel file, library fuel id, or component id.
    pub fuel: String,
    /// First liquid temperature (default: the ideal-solubility freezing point, else 230 K).
    #[arg(long, allow_hyphen_values = true)]
    pub from: Option<String>,
    /// Last liquid temperature (default: the bubble point at --pressure or 0.95 of the lowest major Tc).
    #[arg(long, allow_hyphen_values = true)]
    pub to: Option<String>,
    /// Temperature step.
    #[arg(long, allow_hyphen_values = true, default_value = "5K")]
    pub step: String,
    /// Table pressure (bubble point, vapour diffusivities).
    #[arg(long, allow_hyphen_values = true, default_value = "1atm")]
    pub pressure: String,
    /// Ambient gas of the vapour diffusivities and the surrogate runs: air, n2, or o2=0.21,n2=0.79 style.
    #[arg(long, default_value = "air")]
    pub gas: String,
    /// First temperature of the vapour columns of the component tables.
    #[arg(long, allow_hyphen_values = true, default_value = "250K")]
    pub vapor_from: String,
    /// Last temperature of the vapour columns of the component tables.
    #[arg(long, allow_hyphen_values = true, default_value = "1500K")]
    pub vapor_to: String,
    /// Evaporated mass fractions of weathered residues to tabulate, e.g. 0,0.3,0.6.
    #[arg(long, allow_hyphen_values = true, default_value = "")]
    pub residue: String,
    /// Temperature of the open-vessel weathering that makes the residues.
    #[arg(long, allow_hyphen_values = true, default_value = "350K")]
    pub residue_temperature: String,
    /// Surrogate fit condition as key=value pairs of the condition options the fit varies (ambient-temperature,
    /// pressure, diameter, velocity, droplet-temperature); keys not given keep their defaults.
    #[arg(long, default_value = "ambient-temperature=800K,pressure=1atm,diameter=50um,velocity=0,droplet-temperature=300K")]
    pub reference: String,
    /// Skip the single-component surrogate (no droplet runs).
    #[arg(long)]
    pub no_surrogate: bool,
    /// File format.
    #[arg(long, value_enum, default_value = "csv")]
    pub format: TableFormatArg,
    /// Output folder.
    #[arg(long, default_value = "dropcut-out/table")]
    pub out: PathBuf,
    /// Leave the date out of the metadata (byte-identical reruns); SOURCE_DATE_EPOCH, if set, fixes the date instead.
    #[arg(long)]
    pub no_date: bool,
    /// Liquid activity coefficients of the bubble point, bubble pressure, equilibrium vapour and weathered
    /// residues: ideal (Raoult's law) or unifac (original UNIFAC); the surrogate is fitted to the ideal liquid.
    #[arg(long, value_enum, default_value = "ideal")]
    pub activity: ActivityArg,
}

/// `compare` arguments.
#[derive(Debug, Clone, Args)]
pub struct CompareArgs {
    /// Fuels (fuel files, library fuel ids or component ids); one fuel is enough with --vary.
    #[arg(required = true, num_args = 1..)]
    pub fuels: Vec<String>,
    /// Conditions shared by every run.
    #[command(flatten)]
    pub condition: ConditionArgs,
    /// Run at several values of one condition option, e.g. ambient-temperature=500K,800K (any condition option
    /// above; gas=air;n2 and ambient-vapor with ';' between values).
    #[arg(long, value_name = "OPTION=V1,V2,...")]
    pub vary: Option<String>,
    /// History rows at these times instead of at every integrator step, from the integrator's continuous
    /// extension (well-mixed) or steps landing on them (resolved): START:STEP:END (e.g. 0:0.1ms:20ms) or a list
    /// (1ms,2ms,5ms); the first row, regime changes and the final row stay.
    #[arg(long, value_name = "TIMES", allow_hyphen_values = true)]
    pub history_times: Option<String>,
    /// Output folder.
    #[arg(long, default_value = "dropcut-out/compare")]
    pub out: PathBuf,
    /// Do not draw charts.
    #[arg(long)]
    pub no_plots: bool,
}

/// Sampling design of `uncertainty`.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum SamplingArg {
    /// Independent draws.
    MonteCarlo,
    /// Latin hypercube: one draw per equal-probability stratum of each input.
    LatinHypercube,
}

/// Distribution of the property factors.
#[derive(Debug, Clone, Copy, ValueEnum)]
pub enum PropertyDistributionArg {
    /// 1 + u z, z standard normal truncated at ±3.
    Normal,
    /// exp(u z), z standard normal truncated at ±3.
    LogNormal,
}

/// `uncertainty` arguments.
#[derive(Debug, Clone, Args)]
pub struct UncertaintyArgs {
    /// Fuels (fuel files, library fuel ids or component ids); with several, each gets a sub-folder and the bands
    /// are drawn together.
    #[arg(required = true, num_args = 1..)]
    pub fuels: Vec<String>,
    /// Nominal conditions (as for simulate).
    #[command(flatten)]
    pub condition: ConditionArgs,
    /// Number of samples.
    #[arg(long, default_value = "200", value_name = "N", allow_hyphen_values = true)]
    pub samples: String,
    /// Seed of the random draws (the same seed gives the same files whatever the thread count).
    #[arg(long, default_value = "1", value_name = "S", allow_hyphen_values = true)]
    pub seed: String,
    /// Uncertainty file (TOML: \[conditions\], \[composition\], \[properties\], \[indicator-inputs\]; see
    /// docs/uncertainty.md).
    #[arg(long, value_name = "FILE")]
    pub uncertainty: Option<PathBuf>,
    /// Condition spreads, e.g. ambient-temperature=10K,pressure=2% (normal standard deviations; % = relative);
    /// they replace the file's entries.
    #[arg(long, default_value = "", value_name = "KEY=SD,...")]
    pub condition_uncertainty: String,
    /// Composition spreads, relative on mass fractions, per component id, class, class group (aromatics,
    /// cycloalkanes, alkanes) or each-component, e.g. aromatics=10%,n-decane=0.05.
    #[arg(long, default_value = "", value_name = "NAME=SD,...")]
    pub composition_uncertainty: String,
    /// Multiply every stated property uncertainty (0 = properties exact); replaces the file's scale.
    #[arg(long, value_name = "X", allow_hyphen_values = true)]
    pub property_scale: Option<String>,
    /// Distribution of the property factors; replaces the file's choice.
    #[arg(long, value_enum)]
    pub property_distribution: Option<PropertyDistributionArg>,
    /// Multiply the standard uncertainties of the components' flash points and cetane numbers (published
    /// values and estimates; 0 = exact); replaces the file's scale.
    #[arg(long, value_name = "X", allow_hyphen_values = true)]
    pub indicator_input_scale: Option<String>,
    /// Sampling design.
    #[arg(long, value_enum, default_value = "monte-carlo")]
    pub method: SamplingArg,
    /// Worker threads (0 = every core).
    #[arg(long, default_value_t = 0, value_name = "N", allow_hyphen_values = true)]
    pub threads: usize,
    /// Output folder.
    #[arg(long, default_value = "dropcut-out/uncertainty")]
    pub out: PathBuf,
    /// Do not draw charts.
    #[arg(long)]
    pub no_plots: bool,
}
