//! `dropcut table`: validate the options, convert them to SI [`TableOptions`], build the tables and write them.

use std::io::{IsTerminal, Write};

use super::args::{TableArgs, TableFormatArg};
use super::CliError;
use crate::data::Library;
use crate::fuel::Fuel;
use crate::output;
use crate::output::tables::{TableFormat, WriteOptions};
use crate::props::gas::AmbientGas;
use crate::conditions::{self, Condition, CONDITIONS};
use crate::model::{DropletInputs, Motion};
use crate::table::surrogate::{ReferenceCondition, SurrogateOptions};
use crate::table::{self, TableError, TableOptions};
use crate::units::{self, Quantity};

fn parse_q(option: &str, text: &str, q: Quantity) -> Result<f64, CliError> {
    units::parse(text, q).map_err(|e| CliError::input(format!("--{option}: {e}")))
}

/// The droplet inputs a surrogate run uses for reference condition `r` (as `table::surrogate::run` builds them).
fn surrogate_inputs(fuel: &Fuel, gas: &AmbientGas, r: &ReferenceCondition) -> DropletInputs {
    let mut inp = DropletInputs::new(fuel.clone(), gas.clone(), r.ambient_temperature, r.pressure, r.diameter, r.droplet_temperature);
    inp.motion = Motion::Fixed { velocity: r.velocity };
    inp
}

/// The reference condition the surrogate fit reads from droplet inputs.
fn reference_of(inp: &DropletInputs) -> ReferenceCondition {
    let velocity = match inp.motion {
        Motion::Fixed { velocity } | Motion::Injected { velocity } => velocity,
    };
    ReferenceCondition { ambient_temperature: inp.ambient_temperature, pressure: inp.pressure, diameter: inp.initial_diameter, velocity, droplet_temperature: inp.initial_temperature }
}

/// True when condition `c` at `value` takes effect on the inputs and survives the trip through a reference
/// condition (the fit uses it).
fn carried(c: &Condition, base: &DropletInputs, value: &crate::conditions::Value, fuel: &Fuel, gas: &AmbientGas) -> bool {
    let mut inp = base.clone();
    c.apply(&mut inp, value).is_ok() && (c.get)(&inp).as_ref() == Some(value) && (c.get)(&inp) == (c.get)(&surrogate_inputs(fuel, gas, &reference_of(&inp)))
}

/// The condition keys `--reference` can set: those the surrogate fit carries (found by trying each entry's example).
fn reference_keys(lib: &Library, base: &DropletInputs, fuel: &Fuel, gas: &AmbientGas) -> Vec<&'static str> {
    CONDITIONS.iter().filter(|c| c.parse_text(c.example, lib).is_ok_and(|v| carried(c, base, &v, fuel, gas))).map(|c| c.key).collect()
}

/// `--reference` key=value pairs of condition options (registry spelling and units) on top of the defaults; a
/// condition the surrogate fit does not carry is refused with the keys it does carry.
fn parse_reference(lib: &Library, fuel: &Fuel, gas: &AmbientGas, text: &str) -> Result<ReferenceCondition, CliError> {
    let mut base = conditions::build_inputs(&CONDITIONS, fuel.clone(), lib, &[]).map_err(|e| CliError::input(format!("--reference: {e}")))?;
    base.gas = gas.clone();
    let mut inp = base.clone();
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let (key, value) = item
            .split_once('=')
            .ok_or_else(|| CliError::input(format!("--reference '{text}': cannot read '{item}'; use key=value pairs like ambient-temperature=800K,pressure=1atm")))?;
        let (key, value) = (key.trim(), value.trim());
        let known = || reference_keys(lib, &base, fuel, gas).join(", ");
        let c = conditions::find(&CONDITIONS, key).ok_or_else(|| CliError::input(format!("--reference '{text}': unknown key '{key}' (known: {})", known())))?;
        let v = c.parse_text(value, lib).map_err(|e| CliError::input(format!("--reference {key}={value}: {e}")))?;
        if !carried(c, &inp, &v, fuel, gas) {
            return Err(CliError::input(format!("--reference {key}={value}: the surrogate fit does not vary '{key}' (it runs a well-mixed droplet in --gas at a constant slip); reference keys: {}", known())));
        }
        c.apply(&mut inp, &v).map_err(|e| CliError::input(format!("--reference {key}={value}: {}", e.reason)))?;
    }
    Ok(reference_of(&inp))
}

fn parse_residues(text: &str) -> Result<Vec<f64>, CliError> {
    let mut v = vec![];
    for item in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let f = parse_q("residue", item, Quantity::Dimensionless)?;
        if !(0.0..1.0).contains(&f) {
            return Err(CliError::input(format!("--residue {text}: evaporated fraction {f} must lie in [0, 1)")));
        }
        v.push(f);
    }
    if v.windows(2).any(|w| w[1] <= w[0]) {
        return Err(CliError::input(format!("--residue {text}: fractions must increase")));
    }
    Ok(v)
}

/// Days since 1970-01-01 → (year, month, day) in the proleptic Gregorian calendar (H. Hinnant's algorithm).
fn civil_from_days(z: i64) -> (i64, u32, u32) {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let m = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    (if m <= 2 { y + 1 } else { y }, m, d)
}

/// ISO 8601 UTC text of a UNIX time.
fn iso_utc(seconds: i64) -> String {
    let (y, mo, d) = civil_from_days(seconds.div_euclid(86_400));
    let s = seconds.rem_euclid(86_400);
    format!("{y:04}-{mo:02}-{d:02}T{:02}:{:02}:{:02}Z", s / 3600, (s / 60) % 60, s % 60)
}

/// The date of the metadata: none with --no-date, SOURCE_DATE_EPOCH when set, else now.
fn metadata_date(no_date: bool) -> Result<Option<String>, CliError> {
    if no_date {
        return Ok(None);
    }
    if let Ok(v) = std::env::var("SOURCE_DATE_EPOCH") {
        let s: i64 = v.trim().parse().map_err(|_| CliError::input(format!("SOURCE_DATE_EPOCH '{v}': must be a whole number of seconds since 1970")))?;
        return Ok(Some(iso_utc(s)));
    }
    let now = std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_secs() as i64).unwrap_or(0);
    Ok(Some(iso_utc(now)))
}

fn table_error(e: TableError, args: &TableArgs) -> CliError {
    match e {
        TableError::Input { .. } | TableError::Property(_) | TableError::Post(_) => CliError::input(e.to_string()),
        TableError::Model(crate::model::ModelError::Input { .. }) => CliError::input(format!("--reference {}: {e}", args.reference)),
        other => CliError::runtime(other.to_string()),
    }
}

/// Run `dropcut table`.
pub fn table(lib: &Library, args: &TableArgs) -> Result<(), CliError> {
    let pressure = parse_q("pressure", &args.pressure, Quantity::Pressure)?;
    let step = parse_q("step", &args.step, Quantity::TemperatureDifference)?;
    let from = args.from.as_deref().map(|t| parse_q("from", t, Quantity::Temperature)).transpose()?;
    let to = args.to.as_deref().map(|t| parse_q("to", t, Quantity::Temperature)).transpose()?;
    let vapor_from = parse_q("vapor-from", &args.vapor_from, Quantity::Temperature)?;
    let vapor_to = parse_q("vapor-to", &args.vapor_to, Quantity::Temperature)?;
    let residue_temperature = parse_q("residue-temperature", &args.residue_temperature, Quantity::Temperature)?;
    let residue_fractions = parse_residues(&args.residue)?;
    let gas = AmbientGas::parse(lib, &args.gas).map_err(|e| CliError::input(format!("--gas {}: {e}", args.gas)))?;
    let date = metadata_date(args.no_date)?;
    let fuel = Fuel::resolve(&args.fuel, lib)?;
    for n in &fuel.notices {
        let _ = writeln!(std::io::stderr(), "note: {n}");
    }
    let reference = parse_reference(lib, &fuel, &gas, &args.reference)?;
    let mut opts = TableOptions::new(gas);
    opts.pressure = pressure;
    opts.step = step;
    opts.from = from;
    opts.to = to;
    opts.vapor_from = vapor_from;
    opts.vapor_to = vapor_to;
    opts.residue_fractions = residue_fractions;
    opts.residue_temperature = residue_temperature;
    opts.activity = args.activity.model();
    opts.surrogate = if args.no_surrogate { None } else { Some(SurrogateOptions { reference, ..SurrogateOptions::default() }) };
    if std::io::stderr().is_terminal() && opts.surrogate.is_some() {
        let _ = writeln!(std::io::stderr(), "building tables of {} (the surrogate fit runs the droplet model a few dozen times) ...", fuel.name);
    }
    let set = table::build(&fuel, &opts).map_err(|e| table_error(e, args))?;
    let format = match args.format {
        TableFormatArg::Csv => TableFormat::Csv,
        TableFormatArg::Json => TableFormat::Json,
    };
    let written = output::tables::write_tables(&args.out, &set, &lib.sources, &WriteOptions { format, date })?;
    if matches!(args.format, TableFormatArg::Csv) {
        super::plot::draw_table_charts(&args.out)?;
    }
    let m = &set.mixture;
    let mut s = format!(
        "{}: {} rows, {}–{} K every {} K at {}; {} component tables; {} residue tables\n",
        fuel.name,
        m.rows.len(),
        m.grid.from,
        m.grid.to,
        m.grid.step,
        units::format_pressure(opts.pressure),
        set.components.len(),
        set.residues.len()
    );
    if let Some((sur, _)) = &set.surrogate {
        let worst = sur.evaluations.iter().filter_map(|e| e.lifetime_error).map(f64::abs).fold(0.0, f64::max);
        s.push_str(&format!(
            "surrogate: volatility factor {:.4}, latent-heat factor {:.4}; lifetime error {:+.3} % at the reference, up to {:.2} % at the {} other conditions (surrogate.json)\n",
            sur.parameters.volatility_factor,
            sur.parameters.latent_heat_factor,
            100.0 * sur.at_reference.lifetime_error.unwrap_or(f64::NAN),
            100.0 * worst,
            sur.evaluations.len()
        ));
        for n in &sur.notes {
            let _ = writeln!(std::io::stderr(), "note: {n}");
        }
    }
    let pieces: Vec<&table::fit::PolyFit> = set.fits.iter().flat_map(|f| f.fits.iter()).collect();
    let flagged = pieces.iter().filter(|f| f.max_relative_error > table::fit::MAX_FIT_ERROR).count();
    let shares = m.rows.iter().filter(|r| r.validity != table::Validity::Ok).count();
    s.push_str(&format!("validity: {} of {} mixture rows ok; fits: {} pieces, {} above 1 % (column flag of the fits file)\n", m.rows.len() - shares, m.rows.len(), pieces.len(), flagged));
    s.push_str(&format!("wrote {} files into {}\n", written.len(), args.out.display()));
    let mut out = std::io::stdout().lock();
    match out.write_all(s.as_bytes()).and_then(|_| out.flush()) {
        Ok(()) => Ok(()),
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        Err(e) => Err(CliError::runtime(format!("stdout: {e}"))),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates() {
        assert_eq!(iso_utc(0), "1970-01-01T00:00:00Z");
        assert_eq!(iso_utc(951_782_400), "2000-02-29T00:00:00Z");
        assert_eq!(iso_utc(1_700_000_000), "2023-11-14T22:13:20Z");
    }

    #[test]
    fn reference_parsing() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("n-decane", &lib).unwrap();
        let gas = AmbientGas::air(&lib).unwrap();
        let parse = |t: &str| parse_reference(&lib, &fuel, &gas, t);
        let r = parse("ambient-temperature=1000K, diameter=30um").unwrap();
        assert!((r.ambient_temperature - 1000.0).abs() < 1e-12 && (r.diameter - 30e-6).abs() < 1e-18 && (r.pressure - 101_325.0).abs() < 1e-9);
        assert_eq!(parse("ambient-temperature=800K,pressure=1atm,diameter=50um,velocity=0,droplet-temperature=300K").unwrap(), ReferenceCondition::default());
        assert!(parse("temperature=1000K").unwrap_err().message.contains("unknown key 'temperature'"));
        assert!(parse("ambient-temperature").is_err());
        assert!(parse("pressure=3 furlongs").is_err());
        // the keys the fit carries are found from the registry, not listed by hand
        let base = conditions::build_inputs(&CONDITIONS, fuel.clone(), &lib, &[]).unwrap();
        assert_eq!(reference_keys(&lib, &base, &fuel, &gas), ["ambient-temperature", "pressure", "diameter", "droplet-temperature", "velocity"]);
        // every other registry condition is recognised and refused with a reason, never "unknown"
        for c in CONDITIONS.iter() {
            match parse(&format!("{}={}", c.key, c.example)) {
                Ok(_) => assert!(reference_keys(&lib, &base, &fuel, &gas).contains(&c.key)),
                Err(e) => assert!(e.message.contains("does not vary") && e.message.contains(c.key), "{}", e.message),
            }
        }
        assert!(parse_residues("0,0.3,0.6").unwrap().len() == 3);
        assert!(parse_residues("0.3,0.1").is_err());
        assert!(parse_residues("1.0").is_err());
    }
}
