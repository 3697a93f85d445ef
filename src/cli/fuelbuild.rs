//! `dropcut fuel build`: fuels from a class x carbon-number table or a distillation curve, and single
//! estimated components from structural groups. Parses and checks the options, calls `fuel::build`, writes the
//! file atomically and prints the report.

use std::path::Path;

use super::args::{AcentricArg, BuildArgs, CriticalArg, FitArg, MethodArg};
use super::common::{notice, parse_q, stdout_write};
use super::CliError;
use crate::data::Library;
use crate::fuel::build::classes::{build_from_classes, ClassBuildOptions, ClassTable};
use crate::fuel::build::distillation::{build_from_distillation, AcentricMethod, CriticalMethod, CutFit, DistillationCurve, DistillationOptions, DEFAULT_PSEUDO_COMPONENTS};
use crate::fuel::build::estimate::{estimate_component, parse_groups, EstimateOptions, GroupMethod};
use crate::fuel::build::{kebab_id, petroleum, BuildError};
use crate::output;
use crate::units::Quantity;

impl From<BuildError> for CliError {
    fn from(e: BuildError) -> Self {
        CliError::input(e.to_string())
    }
}

fn method(m: Option<MethodArg>) -> GroupMethod {
    match m {
        Some(MethodArg::ConstantinouGani) => GroupMethod::ConstantinouGani,
        _ => GroupMethod::Joback,
    }
}

/// Refuse options that do not apply to the chosen input.
fn refuse(args: &BuildArgs, mode: &str, allowed: &[&str]) -> Result<(), CliError> {
    let given: [(&str, bool); 9] = [
        ("--density", args.density.is_some()),
        ("--specific-gravity", args.specific_gravity.is_some()),
        ("--pseudo", args.pseudo.is_some()),
        ("--critical", args.critical.is_some()),
        ("--acentric", args.acentric.is_some()),
        ("--fit", args.fit.is_some()),
        ("--method", args.method.is_some()),
        ("--boiling-point", args.boiling_point.is_some()),
        ("--class", args.class.is_some()),
    ];
    for (flag, set) in given {
        if set && !allowed.contains(&flag) {
            return Err(CliError::input(format!("{flag} does not apply to {mode}")));
        }
    }
    Ok(())
}

fn check_out(out: &Path, input: Option<&Path>) -> Result<(), CliError> {
    if out.as_os_str().is_empty() || out.is_dir() {
        return Err(CliError::input(format!("--out {}: give a file name", out.display())));
    }
    super::common::out_file(out)?;
    if let Some(inp) = input {
        let same = match (out.canonicalize(), inp.canonicalize()) {
            (Ok(a), Ok(b)) => a == b,
            _ => false,
        };
        if same {
            return Err(CliError::input(format!("--out {} is the input file; choose another name", out.display())));
        }
    }
    Ok(())
}

fn write(out: &Path, text: &str) -> Result<(), CliError> {
    output::write_atomic(out, text.as_bytes()).map_err(CliError::from)
}

/// Entry point of `fuel build`.
pub fn build(lib: &Library, args: &BuildArgs) -> Result<(), CliError> {
    if let Some(path) = &args.from_classes {
        refuse(args, "--from-classes", &["--method"])?;
        check_out(&args.out, Some(path))?;
        from_classes(lib, args, path)
    } else if let Some(path) = &args.from_distillation {
        refuse(args, "--from-distillation", &["--density", "--specific-gravity", "--pseudo", "--critical", "--acentric", "--fit"])?;
        check_out(&args.out, Some(path))?;
        from_distillation(lib, args, path)
    } else if let Some(spec) = &args.from_groups {
        refuse(args, "--from-groups", &["--method", "--boiling-point", "--class"])?;
        check_out(&args.out, None)?;
        from_groups(lib, args, spec)
    } else {
        Err(CliError::input("give one of --from-classes, --from-distillation or --from-groups"))
    }
}

fn from_classes(lib: &Library, args: &BuildArgs, path: &Path) -> Result<(), CliError> {
    let table = ClassTable::read(path)?;
    let opts = ClassBuildOptions { name: args.name.clone(), method: method(args.method) };
    let built = build_from_classes(&table, lib, &opts)?;
    write(&args.out, &built.text)?;
    let r = &built.report;
    for n in &r.notes {
        notice(n);
    }
    if args.json {
        return stdout_write(&output::to_json_string(r).map_err(CliError::runtime)?);
    }
    let mut s = format!("fuel '{}' written to {} ({} components)\n\n", built.fuel.name, args.out.display(), built.fuel.len());
    s.push_str(&format!("{:<22} {:>8}  {:<34} {}\n", "cell", "mass %", "component", "how"));
    for c in &r.cells {
        let how = match c.structure_distance {
            Some(d) if d > 0 => format!("{} (structure distance {d})", c.how),
            _ => c.how.clone(),
        };
        s.push_str(&format!("{:<22} {:>8.3}  {:<34} {}\n", format!("{} C{}", c.class.as_str(), c.carbon_number), c.mass_percent, c.component, how));
    }
    s.push_str(&format!("\nmass mapped to library components: {:.2} %; to estimated components: {:.2} %\n", r.library_mass_percent, r.estimated_mass_percent));
    s.push_str(&format!("use it like any fuel file, e.g. dropcut fuel show {}\n", args.out.display()));
    stdout_write(&s)
}

fn from_distillation(lib: &Library, args: &BuildArgs, path: &Path) -> Result<(), CliError> {
    let curve = DistillationCurve::read(path)?;
    let density = match (&args.density, &args.specific_gravity) {
        (Some(d), _) => Some(parse_q("density", d, Quantity::Density)?),
        (None, Some(sg)) => {
            let sg = parse_q("specific-gravity", sg, Quantity::Dimensionless)?;
            Some(sg * petroleum::WATER_DENSITY_60F)
        }
        (None, None) => None,
    };
    if let (Some(_), Some(_)) = (density, curve.density_15c) {
        notice(&format!("the density on the command line replaces the one in {}", path.display()));
    }
    let pseudo = match &args.pseudo {
        Some(p) => p.trim().parse::<usize>().map_err(|_| CliError::input(format!("--pseudo: '{p}' is not a whole number")))?,
        None => DEFAULT_PSEUDO_COMPONENTS,
    };
    let opts = DistillationOptions {
        name: args.name.clone(),
        density_15c: density,
        pseudo_components: pseudo,
        critical: match args.critical {
            Some(CriticalArg::RiaziDaubert1987) => CriticalMethod::RiaziDaubert1987,
            _ => CriticalMethod::RiaziDaubert1980,
        },
        acentric: match args.acentric {
            Some(AcentricArg::Edmister) => AcentricMethod::Edmister,
            _ => AcentricMethod::LeeKesler,
        },
        fit: match args.fit {
            Some(FitArg::Tbp) => CutFit::Tbp,
            _ => CutFit::SimulatedDistillation,
        },
    };
    let sim = crate::checks::fuelbuild::simulated_distillation;
    let built = build_from_distillation(&curve, lib, &opts, Some(&sim))?;
    write(&args.out, &built.text)?;
    let r = &built.report;
    for n in &r.notes {
        notice(n);
    }
    if args.json {
        return stdout_write(&output::to_json_string(r).map_err(CliError::runtime)?);
    }
    let fit = match r.fit {
        CutFit::Tbp => "tbp (no calibration)".to_string(),
        CutFit::SimulatedDistillation => format!("simulated-distillation ({} iterations)", r.calibration_iterations),
    };
    let mut s = format!(
        "fuel '{}' written to {}: {} pseudo-components from a {} curve\ndensity at 15 °C: target {:.2}, built {:.2} kg/m³; Watson K_W {:.4}; cut fit: {fit}\n\n",
        built.fuel.name,
        args.out.display(),
        r.cuts.len(),
        curve.kind.as_str().to_uppercase(),
        r.target_density_kg_m3,
        r.built_density_kg_m3,
        r.watson_k
    );
    let w = r.cuts.iter().map(|c| c.id.len()).max().unwrap_or(3).max(3);
    s.push_str(&format!(
        "{:<w$} {:>11} {:>7} {:>7} {:>7} {:>7} {:>7} {:>6} {:>6} {:<8} {:>5} {:>6} {:>5}\n",
        "cut", "vol %", "TBP K", "Tb K", "SG", "W g/mol", "Tc K", "pc bar", "omega", "formula", "H %", "LHV", "CN"
    ));
    for c in &r.cuts {
        s.push_str(&format!(
            "{:<w$} {:>5.1}-{:>5.1} {:>7.1} {:>7.1} {:>7.4} {:>7.1} {:>7.1} {:>6.2} {:>6.3} {:<8} {:>5.2} {:>6.2} {:>5.1}\n",
            c.id,
            c.from_percent,
            c.to_percent,
            c.tbp_K,
            c.boiling_point_K,
            c.specific_gravity,
            c.molar_mass_kg_mol * 1e3,
            c.critical_temperature_K,
            c.critical_pressure_Pa / 1e5,
            c.acentric_factor,
            c.formula,
            100.0 * c.hydrogen_mass_fraction,
            c.lhv_J_kg / 1e6,
            c.cetane_number
        ));
    }
    if !r.comparison.is_empty() {
        s.push_str("\nsimulated single-stage distillation of the built fuel vs the input (D86 scale; a TBP input converted by Riazi-Daubert 1986):\n");
        s.push_str(&format!("{:>7} {:>12} {:>12} {:>14} {:>9}\n", "vol %", "input °C", "input D86 °C", "simulated °C", "error K"));
        for p in &r.comparison {
            s.push_str(&format!("{:>7.1} {:>12.2} {:>12.2} {:>14.2} {:>+9.2}\n", p.percent, p.input_K - 273.15, p.input_d86_K - 273.15, p.simulated_K - 273.15, p.error_K));
        }
        s.push_str("(the ends of the curve, IBP and FBP, are the least comparable points)\n");
    }
    s.push_str(&format!("use it like any fuel file, e.g. dropcut fuel show {}\n", args.out.display()));
    stdout_write(&s)
}

fn from_groups(lib: &Library, args: &BuildArgs, spec: &str) -> Result<(), CliError> {
    let name = args.name.clone().ok_or_else(|| CliError::input("--from-groups needs --name (the component id)"))?;
    let id = kebab_id(&name);
    if id.is_empty() {
        return Err(CliError::input(format!("--name '{name}' has no letters or digits")));
    }
    let groups = parse_groups(spec, "--from-groups")?;
    let boiling_point = match &args.boiling_point {
        Some(t) => Some(parse_q("boiling-point", t, Quantity::Temperature)?),
        None => None,
    };
    let class = match &args.class {
        Some(c) => Some(crate::fuel::build::classes::parse_class(c, "--class")?),
        None => None,
    };
    let opts = EstimateOptions { method: method(args.method), boiling_point, class };
    let comp = estimate_component(lib, &id, &name, &groups, &opts, "--from-groups")?;
    let header = format!(
        "# Estimated by `dropcut fuel build --from-groups \"{spec}\"` (dropcut {}); methods: docs/fuel-from-lab-data.md.\n# Use it as a fuel (dropcut fuel show {}) or put it in a folder given to --components.\n",
        env!("CARGO_PKG_VERSION"),
        args.out.display()
    );
    let text = format!("{header}{}", comp.to_toml(None));
    // read back through the loader before writing
    let parsed = crate::data::Component::parse(&text, &args.out.display().to_string())?;
    lib.check_extra_component(&parsed)?;
    write(&args.out, &text)?;
    if args.json {
        return stdout_write(&output::to_json_string(&comp).map_err(CliError::runtime)?);
    }
    let mut s = format!("component '{id}' written to {} (class {}, C{}H{}O{})\n\n", args.out.display(), comp.class.as_str(), comp.formula.0, comp.formula.1, comp.formula.2);
    for (key, v) in &comp.constants {
        s.push_str(&format!("{:<22} {:>14.6e}  {}\n", key, v.value, v.source));
    }
    s.push_str(&format!("{:<22} {:>14}  {}\n", "ideal-gas cp", "polynomial", comp.ideal_gas_cp.source));
    s.push_str("all temperature-dependent liquid and vapour properties: corresponding states (see the file)\n");
    stdout_write(&s)
}
