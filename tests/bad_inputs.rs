//! The bad-input corpus: every input dropcut reads (fuel files, component files loaded with `--components DIR`,
//! sweep specs, limits files, command-line values with and without units) fed in broken forms to the built
//! binary. The files live in `tests/bad_inputs/`; the table below says which command line reads which file
//! and what the message must say.
//!
//! The contract each case checks (docs/validity.md, "Bad input"):
//! - exit code 2 (bad input or usage), never 101 (a panic) and never 0;
//! - stderr holds no "panicked" and no "internal failure" (the binary maps a caught panic to exit 1 with an
//!   "internal failure" line);
//! - the **last** stderr line is the error: one line starting with `error: `, at most ~1100 characters; any
//!   earlier lines are `note: ` lines (for example a fuel's renormalisation notice);
//! - the error names the file (its name as given) when the input is a file, and contains the expected
//!   substrings, which name the field and/or the value.
//!
//! Placeholders in the command lines: `@name` is a file of `tests/bad_inputs/` (the folder is the working
//! directory, so the name is passed as it is and must appear in the message); `%name` is a fresh temporary
//! folder holding a copy of that component file (or of the files of that folder), passed to `--components`;
//! `{out}` is a fresh temporary output folder. Cases run in parallel threads.

use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::Mutex;

mod common;
use common::BIN;

/// One bad input: the command line and the substrings the error line must contain.
struct Case {
    args: &'static [&'static str],
    expect: &'static [&'static str],
}

macro_rules! case {
    ([$($a:expr),* $(,)?], [$($e:expr),* $(,)?]) => {
        Case { args: &[$($a),*], expect: &[$($e),*] }
    };
}

const CASES: &[Case] = &[
    // ------------------------------------------------------------------ fuel files
    case!(["fuel", "show", "@fuel-empty.toml"], ["missing field `basis`"]),
    case!(["fuel", "show", "@fuel-garbage.toml"], ["not UTF-8"]),
    case!(["fuel", "show", "@fuel-nul-bytes.toml"], ["line 1"]),
    case!(["fuel", "show", "@fuel-syntax.toml"], ["line 1", "name = \"unterminated"]),
    case!(["fuel", "show", "@fuel-missing-basis.toml"], ["missing field `basis`"]),
    case!(["fuel", "show", "@fuel-bad-basis.toml"], ["line 2", "weight", "mass"]),
    case!(["fuel", "show", "@fuel-basis-number.toml"], ["line 2", "basis = 1"]),
    case!(["fuel", "show", "@fuel-extra-field.toml"], ["unknown field `colour`"]),
    case!(["fuel", "show", "@fuel-no-composition.toml"], ["missing [composition]"]),
    case!(["fuel", "show", "@fuel-both-sections.toml"], ["both [composition] and [blend]"]),
    case!(["fuel", "show", "@fuel-empty-composition.toml"], ["[composition]", "is empty"]),
    case!(["fuel", "show", "@fuel-unknown-component.toml"], ["unknown component 'n-decan'", "did you mean 'n-decane'"]),
    case!(["fuel", "show", "@fuel-duplicate-key.toml"], ["duplicate key", "line 5"]),
    case!(["fuel", "show", "@fuel-alias-twice.toml"], ["n-decane", "listed twice"]),
    case!(["fuel", "show", "@fuel-sum-low.toml"], ["[composition]", "sum to 0.8"]),
    case!(["fuel", "show", "@fuel-sum-high.toml"], ["[composition]", "sum to 1.5"]),
    case!(["fuel", "show", "@fuel-volume-sum.toml"], ["[composition]", "sum to 0.4"]),
    case!(["fuel", "show", "@fuel-negative.toml"], ["composition.n-dodecane", "-0.1", "negative"]),
    case!(["fuel", "show", "@fuel-nan.toml"], ["composition.n-decane", "not a finite number"]),
    case!(["fuel", "show", "@fuel-inf.toml"], ["composition.n-decane", "not a finite number"]),
    case!(["fuel", "show", "@fuel-neg-inf.toml"], ["composition.n-decane", "not a finite number"]),
    case!(["fuel", "show", "@fuel-string-fraction.toml"], ["composition.n-decane", "must be a number", "\"0.5\""]),
    case!(["fuel", "show", "@fuel-bool-fraction.toml"], ["composition.n-decane", "must be a number", "true"]),
    case!(["fuel", "show", "@fuel-all-zero.toml"], ["[composition]", "sum to 0"]),
    case!(["fuel", "show", "@fuel-huge-fractions.toml"], ["composition.n-decane", "1e308", "above 1"]),
    case!(["fuel", "show", "@fuel-percent.toml"], ["composition.n-decane", "60", "above 1"]),
    case!(["fuel", "show", "@fuel-composition-not-table.toml"], ["composition = 5", "expected a map"]),
    case!(["fuel", "show", "@fuel-array-root.toml"], ["[[composition]]"]),
    case!(["fuel", "show", "@fuel-blend-unknown.toml"], ["blend.no-such-fuel", "unknown fuel, component or file"]),
    case!(["fuel", "show", "@fuel-blend-self.toml"], ["nest more than 8 levels"]),
    case!(["fuel", "show", "@fuel-blend-bad-sub.toml"], ["blend.fuel-sum-low.toml", "sum to 0.8"]),
    case!(["fuel", "show", "@fuel-blend-negative.toml"], ["blend.demo-narrow", "negative"]),
    case!(["fuel", "show", "@fuel-blend-sum.toml"], ["[blend]", "sum to 0.4"]),
    case!(["fuel", "show", "@fuel-name-number.toml"], ["name = 5", "expected a string"]),
    case!(["fuel", "show", "@fuel-description-table.toml"], ["[description]", "expected a string"]),
    case!(["fuel", "show", "@fuel-fuel-id-as-component.toml"], ["unknown component 'demo-wide'"]),
    case!(["fuel", "show", "@fuel-key-with-space.toml"], ["unknown component 'n decane'"]),
    case!(["fuel", "show", "@fuel-control-char-key.toml"], ["unknown component", "\\u{1b}"]),
    case!(["fuel", "show", "@fuel-long-line.toml"], ["unknown component", "characters left out"]),
    case!(["fuel", "show", "@fuel-long-value.toml"], ["line 4", "overflow"]),
    case!(["fuel", "show", "@fuel-mole-unknown.toml"], ["unknown component 'toluol'", "did you mean 'toluene'"]),
    case!(["fuel", "show", "@no-such-file.toml"], ["No such file"]),
    case!(["fuel", "show", "@fuel-name-escape.toml"], ["name", "control character"]),
    case!(["fuel", "show", "@fuel-not-a-fuel.env"], ["not a fuel file"]),
    case!(["fuel", "show", "no-such-fuel"], ["unknown fuel, component or file 'no-such-fuel'"]),
    case!(["fuel", "show", "n-decan"], ["'n-decan'", "did you mean 'n-decane'"]),
    case!(["fuel", "show", ""], ["unknown fuel, component or file ''"]),
    case!(["simulate", "@fuel-sum-low.toml", "--no-plots", "--out", "{out}"], ["sum to 0.8"]),
    case!(["table", "@fuel-unknown-component.toml", "--no-surrogate", "--out", "{out}"], ["unknown component 'n-decan'"]),
    case!(["residue", "@fuel-nan.toml"], ["composition.n-decane", "not a finite number"]),
    case!(["compare", "@fuel-empty.toml", "n-decane", "--no-plots", "--out", "{out}"], ["missing field `basis`"]),
    // ------------------------------------------------------------------ component files (--components DIR)
    case!(["--components", "%comp-empty.toml", "components"], ["missing field `id`"]),
    case!(["--components", "%comp-garbage.toml", "components"], ["not UTF-8"]),
    case!(["--components", "%comp-syntax.toml", "components"], ["line 12", "name = \"unterminated"]),
    case!(["--components", "%comp-nan-coef.toml", "components"], ["[vapor-pressure]", "coefficient NaN", "not a finite number"]),
    case!(["--components", "%comp-inf-coef.toml", "components"], ["[liquid-viscosity]", "coefficient -inf"]),
    case!(["--components", "%comp-unknown-model.toml", "components"], ["[vapor-pressure]", "unknown model 'dippr999'", "dippr101"]),
    case!(["--components", "%comp-wrong-unit.toml", "components"], ["[liquid-density]", "unit 'Pa' does not fit"]),
    case!(["--components", "%comp-unit-typo.toml", "components"], ["[surface-tension]", "unit 'N/mm'"]),
    case!(["--components", "%comp-unit-missing.toml", "components"], ["[latent-heat]", "missing key 'unit'"]),
    case!(["--components", "%comp-unit-kg-for-kmol.toml", "components"], ["[liquid-density]", "4.2399 kg/m3", "plausible"]),
    case!(["--components", "%comp-unit-kpa-for-pa.toml", "components"], ["[vapor-pressure]", "normal boiling point", "plausible"]),
    case!(["--components", "%comp-negative-tmin.toml", "components"], ["[vapor-pressure]", "t-min = -243.51"]),
    case!(["--components", "%comp-tmin-above-tmax.toml", "components"], ["[liquid-density]", "t-min = 700", "t-max = 617.7"]),
    case!(["--components", "%comp-tmax-nan.toml", "components"], ["[latent-heat]", "t-max = NaN"]),
    case!(["--components", "%comp-missing-source.toml", "components"], ["[vapor-pressure]", "missing field `source`"]),
    case!(["--components", "%comp-unknown-source.toml", "components"], ["vapor-pressure.source", "unknown source 'nowhere-2020'"]),
    case!(["--components", "%comp-empty-source.toml", "components"], ["liquid-conductivity.source", "unknown source ''"]),
    case!(["--components", "%comp-constant-missing-source.toml", "components"], ["normal-boiling-point", "missing field `source`"]),
    case!(["--components", "%comp-constant-unknown-source.toml", "components"], ["normal-boiling-point.source", "crc96-made-up"]),
    case!(["--components", "%comp-cs-not-estimated.toml", "components"], ["[liquid-density]", "corresponding-states", "estimated:<method>"]),
    case!(["--components", "%comp-negative-density.toml", "components"], ["[liquid-density]", "-603.28", "positive finite"]),
    case!(["--components", "%comp-negative-viscosity.toml", "components"], ["[liquid-viscosity]", "positive finite"]),
    case!(["--components", "%comp-density-anchor-high.toml", "components"], ["[liquid-density]", "288.15 K", "physical 500–1300 kg/m3"]),
    case!(["--components", "%comp-viscosity-anchor-high.toml", "components"], ["[liquid-viscosity]", "288.15 K", "physical"]),
    case!(["--components", "%comp-density-15c-gcm3.toml", "components"], ["constants.density-15C", "0.735", "kg/m3"]),
    case!(["--components", "%comp-too-few-coefs.toml", "components"], ["[liquid-density]", "found 3"]),
    case!(["--components", "%comp-too-many-coefs.toml", "components"], ["[vapor-pressure]", "found 6"]),
    case!(["--components", "%comp-coefficients-string.toml", "components"], ["coefficients = [\"112.73\"", "expected f64"]),
    case!(["--components", "%comp-missing-tc.toml", "components"], ["[latent-heat]", "needs key 'tc'"]),
    case!(["--components", "%comp-negative-tc.toml", "components"], ["[surface-tension]", "tc = -617.7"]),
    case!(["--components", "%comp-mulero-odd.toml", "components"], ["[surface-tension]", "pairs", "found 3"]),
    case!(["--components", "%comp-molar-mass-gmol.toml", "components"], ["constants.molar-mass", "142.286", "not g/mol"]),
    case!(["--components", "%comp-molar-mass-negative.toml", "components"], ["constants.molar-mass", "-0.142286"]),
    case!(["--components", "%comp-molar-mass-formula.toml", "components"], ["constants.molar-mass", "0.17", "formula"]),
    case!(["--components", "%comp-tb-above-tc.toml", "components"], ["constants", "critical temperature 400 K"]),
    case!(["--components", "%comp-pc-in-bar.toml", "components"], ["constants.critical-pressure", "21.1 Pa"]),
    case!(["--components", "%comp-acentric-absurd.toml", "components"], ["constants.acentric-factor", "5"]),
    case!(["--components", "%comp-cetane-kind-missing.toml", "components"], ["constants.cetane-number", "value 77", "kind = \"DCN\""]),
    case!(["--components", "%comp-cetane-absurd.toml", "components"], ["constants.cetane-number", "500"]),
    case!(["--components", "%comp-cetane-kind-unknown.toml", "components"], ["constants.cetane-number.kind", "\"IQT\"", "\"DCN\""]),
    case!(["--components", "%comp-density-15c-absurd.toml", "components"], ["constants.density-15C", "7.300e5", "physical bounds"]),
    case!(["--components", "%comp-viscosity-out-of-bounds.toml", "components"], ["[liquid-viscosity]", "physical bounds"]),
    case!(["--components", "%comp-constant-nan.toml", "components"], ["constants.melting-point", "NaN"]),
    case!(["--components", "%comp-constant-zero.toml", "components"], ["constants.critical-volume", "value 0"]),
    case!(["--components", "%comp-constant-uncertainty-negative.toml", "components"], ["constants.normal-boiling-point", "uncertainty -0.1"]),
    case!(["--components", "%comp-uncertainty-2.toml", "components"], ["[vapor-pressure]", "uncertainty = 2"]),
    case!(["--components", "%comp-bad-class.toml", "components"], ["class = \"alkane\"", "n-alkane"]),
    case!(["--components", "%comp-bad-id.toml", "components"], ["id", "'Test Comp'", "kebab-case"]),
    case!(["--components", "%comp-duplicate-id.toml", "components"], ["'n-decane' is already defined", "n-decane.toml"]),
    case!(["--components", "%comp-duplicate-alias.toml", "components"], ["'decane' is already defined"]),
    case!(["--components", "%comp-extra-field.toml", "components"], ["unknown field `colour`", "line 6"]),
    case!(["--components", "%comp-extra-field-in-section.toml", "components"], ["unknown field `bogus`", "bogus = 1"]),
    case!(["--components", "%comp-missing-section.toml", "components"], ["missing field `latent-heat`"]),
    case!(["--components", "%comp-unknown-joback-group.toml", "components"], ["joback-groups.CH9", "unknown Joback group"]),
    case!(["--components", "%comp-negative-formula.toml", "components"], ["C = -10", "u32"]),
    case!(["--components", "%comp-vapor-pressure-falls.toml", "components"], ["[vapor-pressure]", "falls", "must rise"]),
    case!(["--components", "%comp-bad-sources", "components"], ["sources.toml", "unknown field `year`"]),
    case!(["--components", "%comp-sources-syntax", "components"], ["sources.toml", "line 1", "[my-source"]),
    case!(["--components", "%comp-nan-coef.toml", "simulate", "test-comp", "--no-plots", "--out", "{out}"], ["[vapor-pressure]", "not a finite number"]),
    case!(["--components", "%comp-unit-kg-for-kmol.toml", "fuel", "show", "test-comp"], ["[liquid-density]", "plausible"]),
    case!(["--components", "no-such-folder", "components"], ["no-such-folder", "No such file"]),
    case!(["--components", "@comp-empty.toml", "components"], ["Not a directory"]),
    // ------------------------------------------------------------------ sweep specs
    case!(["sweep", "@spec-empty.toml", "--out", "{out}"], ["fuels: missing"]),
    case!(["sweep", "@spec-garbage.toml", "--out", "{out}"], ["not UTF-8"]),
    case!(["sweep", "@spec-syntax.toml", "--out", "{out}"], ["(syntax)", "line 2"]),
    case!(["sweep", "@spec-fuels-empty.toml", "--out", "{out}"], ["fuels", "the list is empty"]),
    case!(["sweep", "@spec-fuels-number.toml", "--out", "{out}"], ["fuels", "an integer 5"]),
    case!(["sweep", "@spec-unknown-fuel.toml", "--out", "{out}"], ["fuels[0]", "'n-decan'", "did you mean 'n-decane'"]),
    case!(["sweep", "@spec-bad-fuel-file.toml", "--out", "{out}"], ["fuels[0]", "fuel-sum-low.toml", "sum to 0.8"]),
    case!(["sweep", "@spec-unknown-top-key.toml", "--out", "{out}"], ["condtions", "did you mean 'conditions'"]),
    case!(["sweep", "@spec-unknown-condition.toml", "--out", "{out}"], ["conditions.ambient-temprature", "did you mean 'ambient-temperature'"]),
    case!(["sweep", "@spec-unit-typo.toml", "--out", "{out}"], ["conditions.pressure[1]", "10 parsec", "parsec"]),
    case!(["sweep", "@spec-wrong-quantity.toml", "--out", "{out}"], ["conditions.ambient-temperature", "800bar"]),
    case!(["sweep", "@spec-negative-diameter.toml", "--out", "{out}"], ["conditions.diameter", "-5um", "positive"]),
    case!(["sweep", "@spec-zero-pressure.toml", "--out", "{out}"], ["conditions.pressure", "0 must be positive"]),
    case!(["sweep", "@spec-nan-diameter.toml", "--out", "{out}"], ["conditions.diameter", "not a finite number"]),
    case!(["sweep", "@spec-inf-temperature.toml", "--out", "{out}"], ["conditions.ambient-temperature", "not a finite number"]),
    case!(["sweep", "@spec-overflow.toml", "--out", "{out}"], ["line 3", "1e400"]),
    case!(["sweep", "@spec-steps-zero.toml", "--out", "{out}"], ["conditions.diameter.steps", "found 0"]),
    case!(["sweep", "@spec-steps-huge.toml", "--out", "{out}"], ["conditions.diameter.steps", "99999999999"]),
    case!(["sweep", "@spec-steps-float.toml", "--out", "{out}"], ["conditions.diameter.steps", "2.5"]),
    case!(["sweep", "@spec-log-from-zero.toml", "--out", "{out}"], ["conditions.velocity", "log range"]),
    case!(["sweep", "@spec-unknown-scale.toml", "--out", "{out}"], ["conditions.diameter.scale", "cubic"]),
    case!(["sweep", "@spec-range-extra-key.toml", "--out", "{out}"], ["conditions.diameter.step", "did you mean 'steps'"]),
    case!(["sweep", "@spec-range-missing-to.toml", "--out", "{out}"], ["conditions.diameter.to", "missing"]),
    case!(["sweep", "@spec-empty-list.toml", "--out", "{out}"], ["conditions.diameter", "the list is empty"]),
    case!(["sweep", "@spec-nodes-fraction.toml", "--out", "{out}"], ["conditions.nodes", "3.5"]),
    case!(["sweep", "@spec-radiation-word.toml", "--out", "{out}"], ["conditions.radiation[1]", "glowing", "\"off\" / \"ambient\""]),
    case!(["sweep", "@spec-absorption-too-big.toml", "--out", "{out}"], ["conditions.absorption-efficiency", "must not exceed 1"]),
    case!(["sweep", "@spec-nodes-out-of-range.toml", "--out", "{out}"], ["conditions.nodes", "1000"]),
    case!(["sweep", "@spec-injected-string.toml", "--out", "{out}"], ["conditions.injected", "maybe"]),
    case!(["sweep", "@spec-zipped-unequal.toml", "--out", "{out}"], ["zipped[0]", "'diameter' has 2", "'velocity' has 3"]),
    case!(["sweep", "@spec-zipped-single.toml", "--out", "{out}"], ["zipped[0]", "two names or more"]),
    case!(["sweep", "@spec-zipped-unknown.toml", "--out", "{out}"], ["zipped[0][1]", "unknown condition 'speed'"]),
    case!(["sweep", "@spec-zipped-twice.toml", "--out", "{out}"], ["zipped[1][0]", "'velocity'"]),
    case!(["sweep", "@spec-zipped-not-set.toml", "--out", "{out}"], ["zipped[0][1]", "'velocity'", "no values"]),
    case!(["sweep", "@spec-model-unknown-key.toml", "--out", "{out}"], ["model.reference_weight", "did you mean 'reference-weight'"]),
    case!(["sweep", "@spec-model-reference-weight.toml", "--out", "{out}"], ["model.reference-weight", "2 must lie between 0 and 1"]),
    case!(["sweep", "@spec-model-nan.toml", "--out", "{out}"], ["model.reference-weight", "nan"]),
    case!(["sweep", "@spec-end-mass-fraction.toml", "--out", "{out}"], ["model.end-mass-fraction", "1.5"]),
    case!(["sweep", "@spec-end-mass-tiny.toml", "--out", "{out}"], ["model.end-mass-fraction", "1e-300", "1e-6"]),
    case!(["sweep", "@spec-reference-weight-one.toml", "--out", "{out}"], ["model.reference-weight", "below 1"]),
    case!(["sweep", "@spec-factor-too-small.toml", "--out", "{out}"], ["conditions.liquid-diffusivity-factor", "1e-300", "0.01"]),
    case!(["sweep", "@spec-output-histories.toml", "--out", "{out}"], ["output.histories", "true or false"]),
    case!(["sweep", "@spec-output-unknown.toml", "--out", "{out}"], ["output.charts", "unknown key 'charts'"]),
    // [output] history-times: "START:STEP:END", "T1,T2,..." or a list of times
    case!(["sweep", "@spec-history-times-step-zero.toml", "--out", "{out}"], ["output.history-times", "'0:0ms:5ms'", "must be positive"]),
    case!(["sweep", "@spec-history-times-descending.toml", "--out", "{out}"], ["output.history-times", "1.000000e-3 s after 2.000000e-3 s", "strictly ascending"]),
    case!(["sweep", "@spec-history-times-unit.toml", "--out", "{out}"], ["output.history-times[1]", "'2mm'", "unknown time unit"]),
    case!(["sweep", "@spec-history-times-not-a-time.toml", "--out", "{out}"], ["output.history-times[1]", "expected a time", "true"]),
    case!(["sweep", "@spec-history-times-empty.toml", "--out", "{out}"], ["output.history-times", "the list is empty"]),
    case!(["sweep", "@spec-history-times-number.toml", "--out", "{out}"], ["output.history-times", "START:STEP:END", "found 5"]),
    case!(["sweep", "@spec-history-times-negative.toml", "--out", "{out}"], ["output.history-times", "-1.000000e-3 s", "not negative"]),
    case!(["sweep", "@spec-history-times-too-many.toml", "--out", "{out}"], ["output.history-times", "'0:1e-12:1s'", "at most 100000"]),
    case!(["sweep", "@spec-history-times-nan.toml", "--out", "{out}"], ["output.history-times", "'nan'", "not a finite number"]),
    case!(["sweep", "@spec-history-times-form.toml", "--out", "{out}"], ["output.history-times", "'1:2'", "START:STEP:END"]),
    case!(["sweep", "@spec-gas-unknown.toml", "--out", "{out}"], ["conditions.gas", "'xe'"]),
    case!(["sweep", "@spec-gas-sum.toml", "--out", "{out}"], ["conditions.gas", "sum to 0.7"]),
    case!(["sweep", "@spec-ambient-vapor-dup.toml", "--out", "{out}"], ["conditions.ambient-vapor", "given twice"]),
    case!(["sweep", "@spec-ambient-vapor-other.toml", "--out", "{out}"], ["conditions.ambient-vapor", "'toluene' is not a component"]),
    case!(["sweep", "@spec-ambient-vapor-high.toml", "--out", "{out}"], ["conditions.ambient-vapor", "0.7"]),
    case!(["sweep", "@spec-correlation-unknown.toml", "--out", "{out}"], ["conditions.correlation", "whitaker"]),
    case!(["sweep", "@spec-drag-unknown.toml", "--out", "{out}"], ["conditions.drag", "stokes", "yuen-chen"]),
    case!(["sweep", "@spec-choice-word-in-list.toml", "--out", "{out}"], ["conditions.liquid-heat[1]", "unknown liquid-heat 'convective'", "uniform or conduction"]),
    case!(["sweep", "@spec-liquid-mixing-unknown.toml", "--out", "{out}"], ["conditions.liquid-mixing", "stirred"]),
    case!(["sweep", "@spec-factor-too-big.toml", "--out", "{out}"], ["conditions.liquid-diffusivity-factor", "100000000"]),
    case!(["sweep", "@spec-too-many-cases.toml", "--out", "{out}"], ["conditions", "more than 1000000000000 cases"]),
    case!(["sweep", "@spec-conditions-not-table.toml", "--out", "{out}"], ["conditions", "expected a table"]),
    case!(["sweep", "@spec-max-time-zero.toml", "--out", "{out}"], ["conditions.max-time", "positive"]),
    case!(["sweep", "@spec-name-number.toml", "--out", "{out}"], ["name", "expected a string"]),
    case!(["sweep", "@spec-date-value.toml", "--out", "{out}"], ["conditions.diameter", "a date"]),
    case!(["sweep", "@spec-long-line.toml", "--out", "{out}"], ["conditions.diameter", "characters left out"]),
    case!(["sweep", "@no-such-spec.toml", "--out", "{out}"], ["cannot read the spec"]),
    case!(["sweep", "@spec-empty.toml", "--out", "{out}", "--shard", "5/4"], ["fuels: missing"]),
    // ------------------------------------------------------------------ limits files
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-empty.toml"], ["title", "needs a title"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-garbage.toml"], ["not UTF-8"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-syntax.toml"], ["line 1", "title = \"x"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-no-limits.toml"], ["limits", "no [limits.<indicator key>]"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-empty-limits.toml"], ["limits", "is empty"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-unknown-key.toml"], ["limits.flash_pont_K", "did you mean 'flash_point_K'"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-unknown-field.toml"], ["limits.dcn.minn", "did you mean 'min'"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-unknown-top.toml"], ["version", "unknown field"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-nan-min.toml"], ["limits.dcn.min", "finite"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-inf-max.toml"], ["limits.t10_K.max", "finite"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-min-above-max.toml"], ["limits.dcn.min = 50", "max = 40"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-unit-mismatch.toml"], ["limits.kinematic_viscosity_minus20C_m2_s.unit", "mm2/s"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-unit-typo.toml"], ["limits.flash_point_K.min", "38 degrees"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-below-absolute-zero.toml"], ["limits.flash_point_K.min", "-500degC", "absolute zero"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-negative-kelvin.toml"], ["limits.freezing_point_K.max", "-47"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-percent-fraction.toml"], ["limits.aromatics_volume_fraction.max", "25", "0.25"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-density-gcm3.toml"], ["limits.density_15C_kg_m3.min", "0.775", "g/cm3"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-viscosity-mm2s.toml"], ["limits.kinematic_viscosity_minus20C_m2_s.max", "8"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-lhv-mj.toml"], ["limits.lhv_J_kg.min", "42.8"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-missing-source.toml"], ["limits.dcn.source", "needs a source"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-empty-source.toml"], ["limits.dcn.source", "standard and clause"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-title-number.toml"], ["title = 5", "must be a string"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-title-empty.toml"], ["title", "must not be empty"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-window-not-table.toml"], ["limits.dcn = 40", "must be a table"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-string-non-temperature.toml"], ["limits.dcn.min = \"40\"", "plain number"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-no-bounds.toml"], ["limits.dcn", "'min', 'max' or both"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-limits-not-table.toml"], ["limits = 5"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@lim-bool-bound.toml"], ["limits.dcn.min = true"]),
    case!(["residue", "n-decane", "--steps", "0", "--limits", "@no-such-limits.toml"], ["No such file"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--limits", "@lim-unknown-key.toml"], ["limits.flash_pont_K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--limits", "@lim-percent-fraction.toml"], ["limits.aromatics_volume_fraction.max"]),
    // ------------------------------------------------------------------ fuel build inputs (class tables, distillation curves, groups)
    case!(["fuel", "build", "--from-classes", "@classes-empty.csv", "--out", "{out}"], ["line 1", "header"]),
    case!(["fuel", "build", "--from-classes", "@classes-garbage.csv", "--out", "{out}"], ["UTF-8"]),
    case!(["fuel", "build", "--from-classes", "@classes-not-number.csv", "--out", "{out}"], ["line 2", "n-alkane C10", "'abc'"]),
    case!(["fuel", "build", "--from-classes", "@classes-negative.csv", "--out", "{out}"], ["n-alkane C10", "-5", "negative"]),
    case!(["fuel", "build", "--from-classes", "@classes-nan.csv", "--out", "{out}"], ["n-alkane C10", "not a finite number"]),
    case!(["fuel", "build", "--from-classes", "@classes-unknown-class.csv", "--out", "{out}"], ["unknown class 'alkanes'"]),
    case!(["fuel", "build", "--from-classes", "@classes-carbon-range.csv", "--out", "{out}"], ["carbon number 99"]),
    case!(["fuel", "build", "--from-classes", "@classes-carbon-text.csv", "--out", "{out}"], ["carbon number 'ten'"]),
    case!(["fuel", "build", "--from-classes", "@classes-duplicate-row.csv", "--out", "{out}"], ["line 3", "appears twice"]),
    case!(["fuel", "build", "--from-classes", "@classes-ragged.csv", "--out", "{out}"], ["line 2", "2 fields"]),
    case!(["fuel", "build", "--from-classes", "@classes-sum.csv", "--out", "{out}"], ["sum to 30.000 %"]),
    case!(["fuel", "build", "--from-classes", "@classes-toml-inf.toml", "--out", "{out}"], ["mass-percent.n-alkane.C10", "not a finite number"]),
    case!(["fuel", "build", "--from-classes", "@classes-toml-volume.toml", "--out", "{out}"], ["basis", "volume"]),
    case!(["fuel", "build", "--from-classes", "@classes-toml-unknown-class.toml", "--out", "{out}"], ["n-alkane2"]),
    case!(["fuel", "build", "--from-classes", "@classes-toml-syntax.toml", "--out", "{out}"], ["line 1"]),
    case!(["fuel", "build", "--from-distillation", "@dist-not-increasing.toml", "--out", "{out}"], ["must increase", "50 %"]),
    case!(["fuel", "build", "--from-distillation", "@dist-too-few.toml", "--out", "{out}"], ["at least 3"]),
    case!(["fuel", "build", "--from-distillation", "@dist-csv-ragged.csv", "--out", "{out}"], ["dist-csv-ragged.csv", "line 6", "expected 2 columns", "found 3"]),
    case!(["fuel", "build", "--from-distillation", "@dist-csv-not-number.csv", "--out", "{out}"], ["dist-csv-not-number.csv", "line 7", "temperature 'warm' is not a number"]),
    case!(["fuel", "build", "--from-distillation", "@dist-csv-bad-percent.csv", "--out", "{out}"], ["line 5", "percent", "'ten' is not a percentage"]),
    case!(["fuel", "build", "--from-distillation", "@dist-csv-quote.csv", "--out", "{out}"], ["dist-csv-quote.csv", "line"]),
    case!(["fuel", "build", "--from-distillation", "@dist-nan.toml", "--out", "{out}"], ["points.IBP", "not a finite number"]),
    case!(["fuel", "build", "--from-distillation", "@dist-percent-range.toml", "--out", "{out}"], ["points.150", "0–100"]),
    case!(["fuel", "build", "--from-distillation", "@dist-below-absolute-zero.toml", "--out", "{out}"], ["points.10", "absolute zero"]),
    case!(["fuel", "build", "--from-distillation", "@dist-absurd-temperature.toml", "--out", "{out}"], ["10 %", "150–1000 K"]),
    case!(["fuel", "build", "--from-distillation", "@dist-no-density.toml", "--out", "{out}"], ["no density"]),
    case!(["fuel", "build", "--from-distillation", "@dist-density-gcm3.toml", "--out", "{out}"], ["density-15C", "'0.799'"]),
    case!(["fuel", "build", "--from-distillation", "@dist-unknown-curve.toml", "--out", "{out}"], ["curve", "d2887x"]),
    case!(["fuel", "build", "--from-distillation", "@fuel-garbage.toml", "--out", "{out}"], ["UTF-8"]),
    case!(["fuel", "build", "--from-distillation", "dist-ok.toml", "--out", "{out}", "--density", "5kg/m3"], ["--density", "5 kg/m³"]),
    case!(["fuel", "build", "--from-distillation", "dist-ok.toml", "--out", "{out}", "--specific-gravity", "80"], ["--density", "outside"]),
    case!(["fuel", "build", "--from-distillation", "dist-ok.toml", "--out", "{out}", "--pseudo", "0"], ["--pseudo", "0 pseudo-components"]),
    case!(["fuel", "build", "--from-distillation", "dist-ok.toml", "--out", "{out}", "--pseudo", "100000"], ["--pseudo", "100000"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH2=nan", "--name", "my-x", "--out", "{out}"], ["--from-groups", "'nan'"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH9=8", "--name", "my-x", "--out", "{out}"], ["--from-groups", "unknown group 'CH9'"]),
    case!(["fuel", "build", "--from-groups", "", "--name", "my-x", "--out", "{out}"], ["--from-groups", "no groups"]),
    case!(["fuel", "build", "--from-groups", "CH3=-2", "--name", "my-x", "--out", "{out}"], ["--from-groups", "'-2'"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH2=100000", "--name", "my-x", "--out", "{out}"], ["--from-groups", "outside the method's range"]),
    case!(["fuel", "build", "--from-groups", "OH=1", "--name", "my-x", "--out", "{out}"], ["--from-groups", "two carbon atoms"]),
    case!(["fuel", "build", "--from-groups", "CH3", "--name", "my-x", "--out", "{out}"], ["--from-groups", "cannot read 'CH3'"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH2=8", "--out", "{out}"], ["--from-groups needs --name"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH2=8", "--name", "my-x", "--boiling-point", "5K", "--out", "{out}"], ["boiling point 5 K"]),
    case!(["fuel", "build", "--from-groups", "CH3=2,CH2=8", "--name", "my-x", "--class", "alkane", "--out", "{out}"], ["--class", "'alkane'"]),
    case!(["fuel", "build", "--from-classes", "@no-such-table.csv", "--out", "{out}"], ["no-such-table.csv"]),
    // ------------------------------------------------------------------ uncertainty files and options
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-nan-sd.toml"], ["conditions.ambient-temperature", "not a finite number"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-negative-sd.toml"], ["conditions.ambient-temperature", "-10"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-unit-typo.toml"], ["conditions.ambient-temperature", "parsec"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-unknown-condition.toml"], ["conditions.ambient-temprature", "unknown condition"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-spread-wrong-unit.toml"], ["conditions.diameter", "5K", "unknown length unit 'K'"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-spread-not-continuous.toml"], ["conditions.gas", "'gas' cannot be spread"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--no-plots", "--out", "{out}", "--condition-uncertainty", "pressure=3K"], ["--condition-uncertainty", "pressure", "unknown pressure unit 'K'"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--no-plots", "--out", "{out}", "--condition-uncertainty", "radiation=10K"], ["uncertainty of radiation", "no number"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-relative-too-big.toml"], ["conditions.pressure", "above 1"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-unknown-composition.toml"], ["composition.foo", "'foo'"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-negative-composition.toml"], ["composition.n-decane", "-0.1"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-scale-nan.toml"], ["properties.scale"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-scale-negative.toml"], ["properties.scale", "-1"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-distribution.toml"], ["properties.distribution", "cauchy"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-property-too-big.toml"], ["properties.liquid-viscosity", "5"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-unknown-section.toml"], ["bogus", "unknown key"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-syntax.toml"], ["line 1"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-garbage.toml"], ["UTF-8"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@no-such-spreads.toml"], ["No such file"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--samples", "0"], ["--samples", "0"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--samples", "-5"], ["--samples", "'-5'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--samples", "1e99"], ["--samples", "'1e99'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--seed", "-1"], ["--seed", "'-1'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--property-scale", "-1"], ["--property-scale", "-1"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--property-scale", "nan"], ["--property-scale", "not a finite number"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--indicator-input-scale", "-0.5"], ["--indicator-input-scale", "-0.5"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--indicator-input-scale", "2K"], ["indicator-input-scale", "2K"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-indicator-scale-big.toml"], ["indicator-inputs.scale", "20"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-indicator-unknown-key.toml"], ["indicator-inputs.spread", "unknown key"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--diameter", "10um", "--no-plots", "--out", "{out}", "--uncertainty", "@unc-indicator-not-bool.toml"], ["indicator-inputs", "\"yes\""]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--condition-uncertainty", "ambient-temperature=nan"], ["--condition-uncertainty", "'nan'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--condition-uncertainty", "foo=1"], ["--condition-uncertainty", "unknown condition 'foo'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--condition-uncertainty", "pressure"], ["--condition-uncertainty", "cannot read 'pressure'"]),
    case!(["uncertainty", "n-decane", "--no-plots", "--out", "{out}", "--composition-uncertainty", "aromatics=abc"], ["--composition-uncertainty", "aromatics"]),
    case!(["uncertainty", "n-decane", "--samples", "4", "--no-plots", "--out", "{out}", "--diameter", "1e9"], ["diameter"]),
    // ------------------------------------------------------------------ command-line values: simulate
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "10m"], ["diameter = 10 m", "0.1 µm and 10 mm"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "0"], ["diameter = 0 m"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "-5um"], ["diameter = -0.000005 m"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "50uM"], ["--diameter", "'50uM'", "unknown length unit 'uM'"]),
    // --history-times: START:STEP:END or a comma list of times
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "0:0ms:5ms"], ["--history-times '0:0ms:5ms'", "step", "positive"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "0:-1ms:5ms"], ["--history-times '0:-1ms:5ms'", "positive"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "5ms:1ms:1ms"], ["--history-times '5ms:1ms:1ms'", "START ≤ END"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "0:1e-12:1s"], ["--history-times '0:1e-12:1s'", "at most 100000"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "-1ms,2ms"], ["--history-times = -1.000000e-3 s", "not negative"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "2ms,1ms"], ["--history-times = 1.000000e-3 s after 2.000000e-3 s", "strictly ascending"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "1ms,nan"], ["--history-times", "'nan'", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "1ms,inf"], ["--history-times", "'inf'", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "1ms,2mm"], ["--history-times", "'2mm'", "unknown time unit"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--history-times", "1:2"], ["--history-times '1:2'", "START:STEP:END"]),
    case!(["compare", "n-decane", "n-dodecane", "--no-plots", "--out", "{out}", "--history-times", "0:0:1ms"], ["--history-times '0:0:1ms'", "positive"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "50", "um"], ["unexpected argument 'um'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", ""], ["--diameter", "empty value"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "um"], ["--diameter", "does not start with a number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "1e-400"], ["diameter = 0 m"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "1e999"], ["--diameter", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "NaN"], ["--diameter", "'NaN'", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "inf um"], ["--diameter", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "1e9Pa"], ["pressure = 1000000000 Pa", "1 kPa and 300 bar"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "0"], ["pressure = 0 Pa"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "-1bar"], ["pressure = -100000 Pa"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "10barr"], ["--pressure", "unknown pressure unit 'barr'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "10 bars"], ["--pressure", "'bars'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "800K"], ["--pressure", "unknown pressure unit 'K'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "5K"], ["ambient-temperature = 5 K", "150 K and 4000 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "1e5K"], ["ambient-temperature = 100000 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "-300degC"], ["--ambient-temperature", "below absolute zero"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "-150degC"], ["ambient-temperature = 123.1", "150 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "nan"], ["--ambient-temperature", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "infinity"], ["--ambient-temperature", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "800kelvin"], ["--ambient-temperature", "unknown temperature unit 'kelvin'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-temperature", "300bar"], ["--ambient-temperature", "'bar'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--droplet-temperature", "2000K"], ["droplet-temperature = 2000 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--droplet-temperature", "100K"], ["droplet-temperature = 100 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--velocity", "-1"], ["velocity = -1 m/s"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--velocity", "1e4"], ["velocity = 10000 m/s", "0 and 1000 m/s"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--velocity", "10mph"], ["--velocity", "unknown velocity unit 'mph'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--rtol", "0"], ["rtol = 0"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--rtol", "1"], ["rtol = 1", "1e-12 and 1e-2"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--rtol", "abc"], ["--rtol", "does not start with a number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--rtol", "1e-6s"], ["--rtol", "unexpected unit 's'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--max-time", "0"], ["max-time = 0 s", "positive"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--max-time", "-1s"], ["max-time = -1 s"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--max-time", "1h"], ["--max-time", "unknown time unit 'h'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--max-time", "nan"], ["--max-time", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--nodes", "3"], ["--nodes", "'3' must be a whole number from 4 to 400"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--nodes", "4.5"], ["--nodes", "'4.5' is not a whole number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--nodes", "401"], ["--nodes", "401"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--nodes", "99999999999999999999999"], ["--nodes", "not a whole number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--nodes", "-1"], ["--nodes", "'-1'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", "xe=1"], ["--gas", "unknown ambient-gas species 'xe'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", "o2=0.5"], ["--gas", "sum to 0.5"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", ""], ["--gas", "cannot read ambient gas ''"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", "o2=nan,n2=1"], ["--gas", "'o2'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", "o2=-0.1,n2=1.1"], ["--gas", "'o2' is -0.1"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--gas", "o2"], ["--gas", "'o2'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane=0.6"], ["--ambient-vapor", "0.6", "[0, 0.5)"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane=nan"], ["--ambient-vapor", "'n-decane'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane"], ["--ambient-vapor", "cannot read 'n-decane'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "toluene=0.1"], ["--ambient-vapor", "'toluene' is not a component of fuel 'n-decane'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "foo=0.1"], ["--ambient-vapor", "unknown component 'foo'"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane=0.1,decane=0.2"], ["--ambient-vapor", "given twice"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane=-0.1"], ["--ambient-vapor", "-0.1"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--ambient-vapor", "n-decane=0.3x"], ["--ambient-vapor", "'0.3x' of 'n-decane' is not a number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diameter", "50", "um"], ["--diameter", "50um"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--pressure", "10", "bar"], ["--pressure", "10bar"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--radiation", "hot"], ["radiation", "hot"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--radiation", "0K"], ["--radiation = 0 K", "must be positive"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--radiation", "9000K"], ["--radiation", "5000 K"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--radiation", "ambient", "--absorption-efficiency", "1.5"], ["--absorption-efficiency", "1.5"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--radiation", "ambient", "--absorption-efficiency", "0"], ["--absorption-efficiency", "(0, 1]"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--fibre-diameter", "80um"], ["--fibre-diameter", "smaller than the droplet"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--fibre-diameter", "thin"], ["fibre-diameter", "thin"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--fibre-diameter", "10um", "--fibre-conductivity", "-3"], ["--fibre-conductivity", "-3"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--fibre-diameter", "10um", "--fibre-stems", "0"], ["--fibre-stems", "'0'", "1 to 4"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-diffusivity-factor", "0"], ["--liquid-diffusivity-factor", "positive factor"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-diffusivity-factor", "1e9"], ["--liquid-diffusivity-factor", "1000000000"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-conductivity-factor", "-2"], ["--liquid-conductivity-factor", "-2"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-conductivity-factor", "nan"], ["--liquid-conductivity-factor", "not a finite number"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--correlation", "whitaker"], ["--correlation", "whitaker", "clift"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--injected", "--velocity", "20", "--drag", "stokes"], ["--drag", "stokes", "yuen-chen"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--vapour-diffusion", "binary"], ["--vapour-diffusion", "binary", "mixture", "species"]),
    case!(["sweep", "@spec-vapour-diffusion-unknown.toml", "--out", "{out}"], ["conditions.vapour-diffusion", "stefan-maxwell", "mixture"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--integrator", "rk4"], ["--integrator", "rk4", "dp54", "dp853"]),
    case!(["sweep", "@spec-integrator-unknown.toml", "--out", "{out}"], ["conditions.integrator", "rk45", "auto"]),
    // ------------------------------------------------------------------ liquid activity model (UNIFAC)
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--activity", "raoult"], ["--activity", "raoult", "unifac"]),
    case!(["--components", "%comp-unifac-unknown-group.toml", "components"], ["unifac-groups.CH9", "unknown original-UNIFAC subgroup 'CH9'"]),
    case!(["--components", "%comp-unifac-zero-count.toml", "components"], ["unifac-groups.CH2", "count 0"]),
    case!(["--components", "%comp-no-unifac-groups.toml", "simulate", "@fuel-test-comp-heptane.toml", "--activity", "unifac", "--no-plots", "--out", "{out}"], ["activity", "'test-comp'", "unifac-groups"]),
    case!(["--components", "%comp-no-unifac-groups.toml", "fuel", "show", "@fuel-test-comp-heptane.toml", "--activity", "unifac"], ["--activity unifac", "'test-comp'", "unifac-groups"]),
    case!(["--components", "%comp-no-unifac-groups.toml", "residue", "@fuel-test-comp-heptane.toml", "--activity", "unifac"], ["--activity unifac", "'test-comp'", "unifac-groups"]),
    case!(["--components", "%comp-no-unifac-groups.toml", "table", "@fuel-test-comp-heptane.toml", "--activity", "unifac", "--no-surrogate", "--out", "{out}"], ["activity", "'test-comp'", "unifac-groups"]),
    case!(["--components", "%comp-no-unifac-groups.toml", "sweep", "@spec-activity-no-groups.toml", "--out", "{out}"], ["conditions.activity", "'test-comp'", "unifac-groups"]),
    case!(["sweep", "@spec-activity-unknown.toml", "--out", "{out}"], ["conditions.activity", "nonideal"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-mixing", "stirred"], ["--liquid-mixing", "stirred"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--diamter", "5um"], ["--diamter", "--diameter"]),
    case!(["simulate", "--no-plots", "--out", "{out}"], ["<FUEL>"]),
    // ------------------------------------------------------------------ command-line values: other commands
    case!(["fuel", "show", "n-decane", "--temperature", "5K"], ["--temperature 5K", "100–1500 K"]),
    case!(["fuel", "show", "n-decane", "--temperature", "-300degC"], ["--temperature", "below absolute zero"]),
    case!(["fuel", "show", "n-decane", "--temperature", "300 bar"], ["--temperature", "'bar'"]),
    case!(["fuel", "show", "n-decane", "--pressure", "1e20"], ["--pressure 1e20"]),
    case!(["fuel", "show", "n-decane", "--pressure", "10 parsec"], ["--pressure", "parsec"]),
    case!(["fuel", "show", "n-decane", "--temperature", "1400K", "--pressure", "1e8"], ["--pressure 1e8", "bubble point"]),
    case!(["residue", "n-decane", "--temperature", "5K"], ["--temperature 5K", "150–800 K"]),
    case!(["residue", "n-decane", "--temperature", "hot"], ["--temperature", "'hot'"]),
    case!(["residue", "n-decane", "--steps", "0,1"], ["--steps", "evaporated fraction 1"]),
    case!(["residue", "n-decane", "--steps", "0.5,0.2"], ["--steps '0.5,0.2'", "must increase"]),
    case!(["residue", "n-decane", "--steps", "nan"], ["--steps", "not a finite number"]),
    case!(["residue", "n-decane", "--steps", "0,,0.5"], ["--steps", "empty value"]),
    case!(["residue", "n-decane", "--steps", "-0.1"], ["--steps", "-0.1"]),
    case!(["residue", "n-decane", "--steps", "50%x"], ["--steps", "50%x"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--from", "500K", "--to", "300K"], ["--to 300 K", "empty"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--step", "0"], ["--step 0 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--step", "-5K"], ["--step -5 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--step", "5bar"], ["--step", "'5bar'"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--from", "10K"], ["--from 10 K", "150 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--to", "1e5K"], ["--to 100000 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--pressure", "0"], ["--pressure 0 Pa"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--pressure", "1e12"], ["--pressure 1000000000000 Pa"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--vapor-from", "2000K"], ["--vapor-from (2000 K)"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--vapor-to", "1e6"], ["--vapor-to 1000000 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--residue", "0,0.5,1.5"], ["--residue 0,0.5,1.5", "1.5"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--residue", "0.5,0.3"], ["--residue 0.5,0.3", "must increase"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--residue", "abc"], ["--residue", "'abc'"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--residue-temperature", "5K"], ["--residue-temperature 5 K"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--gas", "air2"], ["--gas air2"]),
    case!(["table", "n-decane", "--out", "{out}", "--reference", "foo=1"], ["--reference", "unknown key 'foo'"]),
    case!(["table", "n-decane", "--out", "{out}", "--reference", "diameter=10m"], ["--reference", "diameter = 10 m"]),
    case!(["table", "n-decane", "--out", "{out}", "--reference", "diameter"], ["--reference", "cannot read 'diameter'"]),
    case!(["table", "n-decane", "--out", "{out}", "--reference", "ambient-temperature=nan"], ["--reference", "not a finite number"]),
    case!(["table", "n-decane", "--no-surrogate", "--out", "{out}", "--format", "xlsx"], ["--format", "xlsx"]),
    case!(["compare", "n-decane", "--no-plots", "--out", "{out}", "--vary", "foo=1"], ["--vary", "cannot vary 'foo'"]),
    case!(["compare", "n-decane", "--no-plots", "--out", "{out}", "--vary", "diameter="], ["--vary 'diameter='", "no values"]),
    case!(["compare", "n-decane", "--no-plots", "--out", "{out}", "--vary", "drag=yuen-chen,stokes"], ["--vary", "--drag", "'stokes'", "yuen-chen or blowing"]),
    case!(["table", "n-decane", "--out", "{out}", "--reference", "gas=n2"], ["--reference gas=n2", "does not vary 'gas'", "ambient-temperature"]),
    case!(["compare", "n-decane", "--no-plots", "--out", "{out}"], ["two or more fuels"]),
    case!(["compare", "n-decane", "n-dodecane", "--no-plots", "--out", "{out}", "--pressure", "1e9"], ["pressure = 1000000000 Pa"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--shard", "5/4"], ["--shard 5/4", "not below the number of shards"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--shard", "abc"], ["--shard abc"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--shard", "1/0"], ["--shard 1/0"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--shard", "-1/4"], ["--shard -1/4", "not a whole number"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--threads", "-1"], ["--threads", "'-1'"]),
    case!(["sweep", "spec-ok.toml", "--out", "{out}", "--threads", "many"], ["--threads", "many"]),
    case!(["sweep", "spec-ok.toml", "--slurm-script", "--out", "{out}", "--job-name", "a\ntouch injected-file #"], ["--job-name", "control character"]),
    case!(["sweep", "spec-ok.toml", "--slurm-script", "--out", "{out}", "--sbatch", "--partition=a\nb"], ["--sbatch", "control character"]),
    case!(["sweep", "spec-ok.toml", "--slurm-script", "--out", "{out}", "--sbatch", "partition=a"], ["--sbatch", "starts with '-'"]),
    case!(["merge", "no-such-shard", "--out", "{out}", "--spec", "@no-such-spec.toml"], ["cannot read the spec"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-diffusivity-factor", "1e-300"], ["--liquid-diffusivity-factor", "1e-300", "0.01"]),
    case!(["simulate", "n-decane", "--no-plots", "--out", "{out}", "--liquid-conductivity-factor", "0.001"], ["--liquid-conductivity-factor", "0.001"]),
    case!(["merge", "no-such-shard", "--out", "{out}"], ["no-such-shard", "no summary.csv"]),
    case!(["plot", "no-such-folder"], ["no-such-folder", "no such folder"]),
];

/// A fresh temporary folder for one case, removed afterwards.
fn temp_dir(tag: &str) -> PathBuf {
    static NEXT: AtomicUsize = AtomicUsize::new(0);
    common::scratch("bad-inputs", &format!("{tag}-{}", NEXT.fetch_add(1, Ordering::Relaxed)))
}

fn corpus_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad_inputs")
}

/// Run one case; Err describes every broken promise.
fn run_case(case: &Case) -> Result<(), String> {
    let corpus = corpus_dir();
    let mut args: Vec<String> = vec![];
    let mut named_files: Vec<String> = vec![];
    let mut cleanup: Vec<PathBuf> = vec![];
    for a in case.args {
        if let Some(name) = a.strip_prefix('@') {
            named_files.push(name.to_string());
            args.push(name.to_string());
        } else if let Some(name) = a.strip_prefix('%') {
            let dir = temp_dir("components");
            let src = corpus.join(name);
            if src.is_dir() {
                for e in std::fs::read_dir(&src).unwrap() {
                    let e = e.unwrap();
                    std::fs::copy(e.path(), dir.join(e.file_name())).unwrap();
                }
                named_files.push("sources.toml".into());
            } else {
                std::fs::copy(&src, dir.join(name)).unwrap();
                named_files.push(name.to_string());
            }
            args.push(dir.display().to_string());
            cleanup.push(dir);
        } else if *a == "{out}" {
            let dir = temp_dir("out");
            args.push(dir.join("out").display().to_string());
            cleanup.push(dir);
        } else {
            args.push(a.to_string());
        }
    }
    let out = Command::new(BIN).args(&args).current_dir(&corpus).env_remove("SLURM_ARRAY_TASK_ID").output().map_err(|e| format!("cannot start dropcut: {e}"))?;
    for d in cleanup {
        let _ = std::fs::remove_dir_all(d);
    }
    let stderr = String::from_utf8_lossy(&out.stderr);
    let mut problems = vec![];
    match out.status.code() {
        Some(2) => {}
        Some(101) => problems.push("exit code 101 (panic)".to_string()),
        other => problems.push(format!("exit code {other:?}, expected 2")),
    }
    if stderr.contains("panicked") || stderr.contains("internal failure") {
        problems.push("stderr reports a panic / internal failure".into());
    }
    let lines: Vec<&str> = stderr.lines().collect();
    let last = lines.last().copied().unwrap_or("");
    if !last.starts_with("error: ") {
        problems.push("the last stderr line does not start with 'error: '".into());
    }
    if let Some(bad) = lines[..lines.len().saturating_sub(1)].iter().find(|l| !l.starts_with("note: ")) {
        problems.push(format!("a line before the error is not a note: {bad:?}"));
    }
    if last.chars().count() > 1100 {
        problems.push(format!("the error line has {} characters", last.chars().count()));
    }
    for want in case.expect.iter().map(|s| s.to_string()).chain(named_files) {
        if !last.contains(&want) {
            problems.push(format!("the error does not contain {want:?}"));
        }
    }
    if problems.is_empty() {
        Ok(())
    } else {
        let shown: String = stderr.chars().take(600).collect();
        Err(format!("dropcut {}:\n    {}\n    stderr: {shown}", case.args.join(" "), problems.join("\n    ")))
    }
}

#[test]
fn corpus_is_large_and_every_file_is_used() {
    assert!(CASES.len() >= 150, "{} cases", CASES.len());
    let used: Vec<&str> = CASES.iter().flat_map(|c| c.args.iter()).filter_map(|a| a.strip_prefix('@').or_else(|| a.strip_prefix('%'))).collect();
    for e in std::fs::read_dir(corpus_dir()).unwrap() {
        let name = e.unwrap().file_name().to_string_lossy().into_owned();
        if name.ends_with(".txt") || name == "spec-ok.toml" || name == "dist-ok.toml" {
            continue; // the valid base files the corpus was made from
        }
        assert!(used.contains(&name.as_str()), "tests/bad_inputs/{name} is in no case");
    }
}

#[test]
fn every_bad_input_fails_with_one_clear_line() {
    let next = AtomicUsize::new(0);
    let failures = Mutex::new(vec![]);
    let workers = std::thread::available_parallelism().map(|n| n.get()).unwrap_or(2).clamp(2, 8) * 2;
    std::thread::scope(|s| {
        for _ in 0..workers {
            s.spawn(|| loop {
                let i = next.fetch_add(1, Ordering::Relaxed);
                let Some(case) = CASES.get(i) else { break };
                if let Err(e) = run_case(case) {
                    failures.lock().unwrap().push(e);
                }
            });
        }
    });
    let failures = failures.into_inner().unwrap();
    assert!(failures.is_empty(), "{} of {} cases broke the contract:\n{}", failures.len(), CASES.len(), failures.join("\n"));
}

#[test]
fn a_bad_limits_file_stops_simulate_before_any_output() {
    let dir = temp_dir("limits-first");
    let out = dir.join("run");
    let o = Command::new(BIN)
        .args(["simulate", "n-decane", "--no-plots", "--limits", "lim-unknown-key.toml", "--out"])
        .arg(&out)
        .current_dir(corpus_dir())
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    assert!(!out.exists(), "simulate wrote {} before refusing the limits file", out.display());
    let _ = std::fs::remove_dir_all(dir);
}
