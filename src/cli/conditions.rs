//! The condition options of `simulate`, `compare` and `uncertainty`, built from the condition registry
//! ([`crate::conditions::CONDITIONS`]) with clap's builder API: one `--key` option per entry, with its help, unit
//! and default. [`ConditionArgs`] holds the texts as given; [`droplet_inputs`] turns them into SI inputs.

use clap::{Arg, ArgAction, ArgMatches};

use super::CliError;
use crate::conditions::{self, Condition, Kind, CONDITIONS};
use crate::data::Library;
use crate::fuel::Fuel;
use crate::model::DropletInputs;

/// The condition options as given on the command line (defaults filled in), one text per registry entry.
#[derive(Debug, Clone)]
pub struct ConditionArgs {
    registry: &'static [Condition],
    texts: Vec<String>,
}

impl Default for ConditionArgs {
    fn default() -> Self {
        Self::with_registry(&CONDITIONS)
    }
}

impl ConditionArgs {
    /// Every condition of `registry` at its default.
    pub fn with_registry(registry: &'static [Condition]) -> Self {
        ConditionArgs { registry, texts: registry.iter().map(|c| c.default.to_string()).collect() }
    }

    /// The registry these options come from.
    pub fn registry(&self) -> &'static [Condition] {
        self.registry
    }

    /// The text of condition `key` (empty for an unknown key).
    pub fn get(&self, key: &str) -> &str {
        self.registry.iter().position(|c| c.key == key).map(|i| self.texts[i].as_str()).unwrap_or("")
    }

    /// Replace the text of condition `key` (checked when the inputs are built).
    pub fn set(&mut self, key: &str, text: &str) -> Result<(), CliError> {
        let i = self.registry.iter().position(|c| c.key == key).ok_or_else(|| CliError::input(format!("--{key}: {}", conditions::unknown_key_message(self.registry, key))))?;
        self.texts[i] = text.to_string();
        Ok(())
    }

    /// (condition, text) pairs in registry order.
    pub fn iter(&self) -> impl Iterator<Item = (&'static Condition, &str)> {
        self.registry.iter().zip(self.texts.iter().map(String::as_str))
    }

    /// Read the options of `registry` from parsed arguments.
    pub fn from_matches(matches: &ArgMatches, registry: &'static [Condition]) -> Result<Self, clap::Error> {
        let mut args = Self::with_registry(registry);
        args.update(matches)?;
        Ok(args)
    }

    fn update(&mut self, matches: &ArgMatches) -> Result<(), clap::Error> {
        for (c, text) in self.registry.iter().zip(self.texts.iter_mut()) {
            let missing = |e| clap::Error::raw(clap::error::ErrorKind::ArgumentConflict, format!("condition option --{}: {e}", c.key));
            match c.kind {
                Kind::Flag => {
                    if let Some(b) = matches.try_get_one::<bool>(c.key).map_err(missing)? {
                        *text = b.to_string();
                    }
                }
                _ => {
                    if let Some(v) = matches.try_get_one::<String>(c.key).map_err(missing)? {
                        *text = v.clone();
                    }
                }
            }
        }
        Ok(())
    }
}

/// Add one option per condition of `registry` to `cmd` (help: the entry's help, how to write a value with its
/// unit, and the default).
pub fn condition_args(mut cmd: clap::Command, registry: &[Condition]) -> clap::Command {
    for c in registry {
        let mut arg = Arg::new(c.key).long(c.key);
        arg = match c.kind {
            Kind::Flag => arg.action(ArgAction::SetTrue).help(format!("{} [a switch; default: off]", c.help)),
            kind => {
                let numeric = matches!(kind, Kind::Quantity(_) | Kind::Factor | Kind::Count(..) | Kind::QuantityOr(..));
                arg.action(ArgAction::Set)
                    .value_name(c.key.to_ascii_uppercase().replace('-', "_"))
                    .allow_hyphen_values(numeric)
                    .default_value(c.default)
                    .help(format!("{} [{}{}]", c.help, c.value_help(), if c.default.is_empty() { "; default: none" } else { "" }))
            }
        };
        if c.long_help_only {
            arg = arg.hide_short_help(true);
        }
        cmd = cmd.arg(arg);
    }
    cmd
}

impl clap::FromArgMatches for ConditionArgs {
    fn from_arg_matches(matches: &ArgMatches) -> Result<Self, clap::Error> {
        Self::from_matches(matches, &CONDITIONS)
    }

    fn update_from_arg_matches(&mut self, matches: &ArgMatches) -> Result<(), clap::Error> {
        self.update(matches)
    }
}

impl clap::Args for ConditionArgs {
    fn augment_args(cmd: clap::Command) -> clap::Command {
        condition_args(cmd, &CONDITIONS)
    }

    fn augment_args_for_update(cmd: clap::Command) -> clap::Command {
        condition_args(cmd, &CONDITIONS)
    }
}

/// Second stage: the condition texts → SI droplet inputs of `fuel`. Errors name the option and the value.
pub fn droplet_inputs(lib: &Library, fuel: Fuel, c: &ConditionArgs) -> Result<DropletInputs, CliError> {
    let mut values = Vec::with_capacity(c.registry.len());
    for (cond, text) in c.iter() {
        values.push(Some(cond.parse_text(text, lib).map_err(|e| CliError::input(format!("--{e}")))?));
    }
    conditions::build_inputs(c.registry, fuel, lib, &values).map_err(|e| CliError::input(format!("--{} {}: {}", e.key, c.get(e.key), e.reason)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_condition_is_an_option_with_its_default() {
        let cmd = condition_args(clap::Command::new("simulate"), &CONDITIONS);
        for c in &CONDITIONS {
            let arg = cmd.get_arguments().find(|a| a.get_long() == Some(c.key)).unwrap_or_else(|| panic!("no --{}", c.key));
            let help = arg.get_help().map(|h| h.to_string()).unwrap_or_default();
            assert!(help.starts_with(c.help), "--{}: {help}", c.key);
            if c.kind != Kind::Flag {
                let defaults: Vec<String> = arg.get_default_values().iter().map(|d| d.to_string_lossy().into_owned()).collect();
                assert_eq!(defaults, [c.default], "--{}", c.key);
                if !c.unit.is_empty() {
                    assert!(help.contains(c.unit), "--{}: unit missing from {help}", c.key);
                }
            }
        }
        let m = cmd.clone().try_get_matches_from(["simulate", "--pressure", "10bar", "--injected"]).unwrap();
        let args = ConditionArgs::from_matches(&m, &CONDITIONS).unwrap();
        assert_eq!(args.get("pressure"), "10bar");
        assert_eq!(args.get("injected"), "true");
        assert_eq!(args.get("diameter"), "50um");
    }

    #[test]
    fn errors_name_the_option_and_value() {
        let lib = Library::embedded().unwrap();
        let fuel = Fuel::resolve("n-decane", &lib).unwrap();
        let mut c = ConditionArgs::default();
        c.set("correlation", "whitaker").unwrap();
        let e = droplet_inputs(&lib, fuel.clone(), &c).unwrap_err();
        assert_eq!((e.code, e.message.as_str()), (2, "--correlation: unknown correlation 'whitaker'; use clift or ranz-marshall"));
        let mut c = ConditionArgs::default();
        c.set("ambient-vapor", "toluene=0.1").unwrap();
        let e = droplet_inputs(&lib, fuel, &c).unwrap_err();
        assert!(e.message.starts_with("--ambient-vapor toluene=0.1: 'toluene' is not a component"), "{}", e.message);
        assert!(ConditionArgs::default().set("colour", "red").is_err());
    }
}
