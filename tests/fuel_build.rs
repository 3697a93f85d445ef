//! `dropcut fuel build`: the checks of src/checks/fuelbuild.rs (worked examples, correlations vs library data,
//! round trips) and the command through the built binary (outputs usable by other commands, bad input →
//! exit 2 with one line naming the file, field and value).

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use dropcut::checks::{assert_all_passed, fuelbuild, print_results, CheckResult};
use dropcut::data::Library;

fn run_checks(results: Vec<CheckResult>) {
    print_results(&results);
    assert_all_passed(&results);
}

fn lib() -> Library {
    Library::embedded().expect("embedded library")
}

#[test]
fn joback_worked_example() {
    run_checks(fuelbuild::joback_worked_example());
}

#[test]
fn group_contribution_against_library() {
    run_checks(fuelbuild::group_contribution_vs_library(&lib()));
}

#[test]
fn petroleum_worked_examples() {
    run_checks(fuelbuild::petroleum_worked_examples());
}

#[test]
fn petroleum_correlations_against_library() {
    run_checks(fuelbuild::petroleum_vs_library(&lib()));
}

#[test]
fn distillation_round_trips() {
    run_checks(fuelbuild::distillation_round_trips(&lib()));
}

#[test]
fn class_table_round_trip_of_demo_wide() {
    run_checks(fuelbuild::class_table_round_trip(&lib()));
}

// ------------------------------------------------------------------------------------------- the binary

fn examples() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("examples")
}

struct TempDir(PathBuf);

impl TempDir {
    fn new(tag: &str) -> Self {
        let p = std::env::temp_dir().join(format!("dropcut-fuelbuild-{tag}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&p);
        std::fs::create_dir_all(&p).unwrap();
        TempDir(p)
    }
    fn path(&self, name: &str) -> PathBuf {
        self.0.join(name)
    }
    fn write(&self, name: &str, text: &str) -> PathBuf {
        let p = self.path(name);
        std::fs::write(&p, text).unwrap();
        p
    }
}

impl Drop for TempDir {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

fn dropcut(dir: &TempDir, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_dropcut")).current_dir(&dir.0).args(args).output().expect("run dropcut")
}

fn ok(out: &Output) -> String {
    assert!(out.status.success(), "exit {:?}\nstdout: {}\nstderr: {}", out.status.code(), String::from_utf8_lossy(&out.stdout), String::from_utf8_lossy(&out.stderr));
    String::from_utf8_lossy(&out.stdout).into_owned()
}

/// Exit code 2 and exactly one `error:` line on stderr that contains every `needle`.
fn bad(out: &Output, needles: &[&str]) {
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "stderr: {err}");
    let lines: Vec<&str> = err.lines().filter(|l| l.starts_with("error:")).collect();
    assert_eq!(lines.len(), 1, "stderr: {err}");
    for n in needles {
        assert!(lines[0].contains(n), "'{n}' not in: {}", lines[0]);
    }
    assert!(!err.contains("panicked"), "{err}");
}

#[test]
fn distillation_build_feeds_other_commands() {
    let dir = TempDir::new("dist");
    let input = examples().join("jet-a1-d86.toml");
    let out = ok(&dropcut(&dir, &["fuel", "build", "--from-distillation", input.to_str().unwrap(), "--out", "jet.toml"]));
    assert!(out.contains("12 pseudo-components") && out.contains("built 799.00"), "{out}");
    let show = ok(&dropcut(&dir, &["fuel", "show", "jet.toml", "--json"]));
    assert!(show.contains("\"density_15C_kg_m3\": 799.0") || show.contains("\"density_15C_kg_m3\": 798.99"), "{show}");
    let sim = ok(&dropcut(&dir, &["simulate", "jet.toml", "--out", "sim", "--no-plots", "--json"]));
    assert!(sim.contains("\"lifetime_s\""), "{sim}");
    // other options: RD87, Edmister, TBP cuts, 6 pseudo-components, specific gravity on the command line
    let out = ok(&dropcut(
        &dir,
        &["fuel", "build", "--from-distillation", input.to_str().unwrap(), "--out", "jet6.toml", "--pseudo", "6", "--critical", "riazi-daubert-1987", "--acentric", "edmister", "--fit", "tbp", "--specific-gravity", "0.80"],
    ));
    assert!(out.contains("6 pseudo-components") && out.contains("built 799.20"), "{out}");
    // a blend of two built fuels (different names, so different pseudo-component ids)
    let csv = examples().join("diesel-tbp.csv");
    ok(&dropcut(&dir, &["fuel", "build", "--from-distillation", csv.to_str().unwrap(), "--out", "diesel.toml", "--pseudo", "8"]));
    dir.write("blend.toml", "name = \"mix\"\nbasis = \"volume\"\n[blend]\n\"jet.toml\" = 0.5\n\"diesel.toml\" = 0.5\n");
    let show = ok(&dropcut(&dir, &["fuel", "show", "blend.toml"]));
    assert!(show.contains("diesel-tbp-pc08") && show.contains("jet-a1-certificate-pc12"), "{show}");
    // the same fuel built twice under one name with other options cannot be blended silently
    ok(&dropcut(&dir, &["fuel", "build", "--from-distillation", input.to_str().unwrap(), "--out", "jet-b.toml", "--fit", "tbp"]));
    dir.write("clash.toml", "name = \"clash\"\nbasis = \"volume\"\n[blend]\n\"jet.toml\" = 0.5\n\"jet-b.toml\" = 0.5\n");
    bad(&dropcut(&dir, &["fuel", "show", "clash.toml"]), &["defined differently"]);
    // the ambient-vapour option finds embedded components
    ok(&dropcut(&dir, &["simulate", "jet.toml", "--out", "sim2", "--no-plots", "--ambient-vapor", "jet-a1-certificate-pc01=0.001"]));
}

#[test]
fn class_build_feeds_other_commands() {
    let dir = TempDir::new("classes");
    let csv = examples().join("kerosene-classes.csv");
    let out = ok(&dropcut(&dir, &["fuel", "build", "--from-classes", csv.to_str().unwrap(), "--out", "ker.toml"]));
    assert!(out.contains("mass mapped to library components: 82.50 %; to estimated components: 17.50 %"), "{out}");
    assert!(out.contains("1-2-4-trimethylbenzene") && out.contains("library (map)"), "{out}");
    ok(&dropcut(&dir, &["fuel", "show", "ker.toml"]));
    ok(&dropcut(&dir, &["residue", "ker.toml", "--steps", "0,0.5"]));
    // the TOML form gives the same composition
    let toml = examples().join("kerosene-classes.toml");
    let a = ok(&dropcut(&dir, &["fuel", "build", "--from-classes", toml.to_str().unwrap(), "--out", "ker2.toml", "--name", "kerosene-classes", "--json"]));
    assert!(a.contains("\"library_mass_percent\": 82.5"), "{a}");
    let t1 = std::fs::read_to_string(dir.path("ker.toml")).unwrap();
    let t2 = std::fs::read_to_string(dir.path("ker2.toml")).unwrap();
    let body = |t: &str| t.lines().filter(|l| !l.starts_with('#') && !l.starts_with("description")).collect::<Vec<_>>().join("\n");
    assert_eq!(body(&t1), body(&t2));
    // Constantinou-Gani for the alkanes
    let cg = ok(&dropcut(&dir, &["fuel", "build", "--from-classes", csv.to_str().unwrap(), "--out", "ker-cg.toml", "--method", "constantinou-gani"]));
    assert!(cg.contains("est-iso-alkane-c13-cg") && cg.contains("estimated (constantinou-gani)"), "{cg}");
}

#[test]
fn groups_build_a_component_file() {
    let dir = TempDir::new("groups");
    let out = ok(&dropcut(&dir, &["fuel", "build", "--from-groups", "CH3=2,CH2=10", "--name", "my-comp", "--out", "my-comp.toml"]));
    assert!(out.contains("class n-alkane") && out.contains("estimated:joback"), "{out}");
    let text = std::fs::read_to_string(dir.path("my-comp.toml")).unwrap();
    assert!(text.contains("source = \"estimated:lee-kesler-omega\"") && text.contains("model = \"corresponding-states\""));
    // usable as a fuel directly, and from a components folder
    ok(&dropcut(&dir, &["fuel", "show", "my-comp.toml"]));
    std::fs::create_dir_all(dir.path("comps")).unwrap();
    std::fs::copy(dir.path("my-comp.toml"), dir.path("comps/my-comp.toml")).unwrap();
    ok(&dropcut(&dir, &["--components", "comps", "simulate", "my-comp", "--out", "sim", "--no-plots"]));
    // a measured boiling point, a class and the CG method
    let out = ok(&dropcut(
        &dir,
        &["fuel", "build", "--from-groups", "CH3=3,CH2=8,CH=1", "--name", "2-methylundecane-est", "--boiling-point", "483.9K", "--method", "constantinou-gani", "--out", "b.toml"],
    ));
    assert!(out.contains("iso-alkane") && out.contains("user"), "{out}");
    // a library id cannot be reused
    bad(&dropcut(&dir, &["fuel", "build", "--from-groups", "CH3=2,CH2=8", "--name", "n-decane", "--out", "d.toml"]), &["n-decane", "library"]);
}

#[test]
fn bad_input_exits_2_with_one_line() {
    let dir = TempDir::new("bad");
    let b = |args: &[&str], needles: &[&str]| bad(&dropcut(&dir, args), needles);
    // distillation curves
    let f = dir.write("nm.toml", "curve = \"d86\"\ntemperature-unit = \"degC\"\ndensity-15C = \"799 kg/m3\"\n[points]\n10 = 171\n50 = 165\n90 = 233\n");
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml"], &["nm.toml", "must increase", "165.00 °C at 50 %"]);
    let f = dir.write("pct.csv", "# curve: d86\npercent_recovered,temperature_degC\n10,171\n50,195\n120,233\n");
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml", "--density", "799kg/m3"], &["pct.csv", "line 5", "outside 0–100"]);
    let f = dir.write("nod.toml", "curve = \"tbp\"\ntemperature-unit = \"K\"\n[points]\n10 = 400\n50 = 450\n90 = 500\n");
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml"], &["no density"]);
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml", "--density", "799"], &["--density", "needs a unit"]);
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml", "--density", "799kg/m3", "--pseudo", "1"], &["--pseudo", "3–60"]);
    b(&["fuel", "build", "--from-distillation", f.to_str().unwrap(), "--out", "o.toml", "--density", "2500kg/m3"], &["2500", "550–1100"]);
    b(&["fuel", "build", "--from-distillation", "missing.toml", "--out", "o.toml"], &["missing.toml", "cannot read"]);
    // class tables
    let f = dir.write("typo.csv", "carbon_number,n-alkane,alkylbenzenes,cycloalkanse\nC10,50,20,30\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["typo.csv", "cycloalkanse", "did you mean"]);
    let f = dir.write("empty.csv", "carbon_number,n-alkane\nC10,0\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["empty.csv", "empty"]);
    let f = dir.write("neg.toml", "[mass-percent.n-alkane]\nC10 = 105\nC11 = -5\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["neg.toml", "mass-percent.n-alkane", "105"]);
    let f = dir.write("neg2.toml", "[mass-percent.n-alkane]\nC10 = 95\nC11 = -5\nC12 = 10\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["neg2.toml", "C11", "-5", "negative"]);
    let f = dir.write("sum.csv", "carbon_number,n-alkane\nC10,30\nC11,30\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["sum.csv", "60.000 %"]);
    let f = dir.write("map.toml", "[mass-percent.n-alkane]\nC10 = 100\n[map]\n\"n-alkane.C10\" = \"n-dekane\"\n");
    b(&["fuel", "build", "--from-classes", f.to_str().unwrap(), "--out", "o.toml"], &["n-dekane", "did you mean 'n-decane'"]);
    let ok_table = dir.write("ok.csv", "carbon_number,n-alkane\nC10,100\n");
    b(&["fuel", "build", "--from-classes", ok_table.to_str().unwrap(), "--out", "o.toml", "--density", "799kg/m3"], &["--density", "does not apply"]);
    b(&["fuel", "build", "--from-classes", ok_table.to_str().unwrap(), "--out", ok_table.to_str().unwrap()], &["is the input file"]);
    // groups
    b(&["fuel", "build", "--from-groups", "CH3=2,CH22=10", "--name", "x", "--out", "x.toml"], &["CH22", "did you mean 'CH2'"]);
    b(&["fuel", "build", "--from-groups", "CH3=2,CH2=10", "--out", "x.toml"], &["--name"]);
    b(&["fuel", "build", "--from-groups", "rCH2=6", "--name", "x", "--method", "constantinou-gani", "--out", "x.toml"], &["Constantinou-Gani", "acyclic"]);
    b(&["fuel", "build", "--from-groups", "CH3=2,CH2=10", "--name", "x", "--class", "alkylbenzen", "--out", "x.toml"], &["--class", "did you mean 'alkylbenzene'"]);
    // a fuel file whose embedded component reuses a library id
    let text = std::fs::read_to_string(examples().join("jet-a1-d86.toml")).unwrap();
    let src = dir.write("jet-src.toml", &text);
    ok(&dropcut(&dir, &["fuel", "build", "--from-distillation", src.to_str().unwrap(), "--out", "jet.toml", "--pseudo", "4", "--fit", "tbp"]));
    let built = std::fs::read_to_string(dir.path("jet.toml")).unwrap().replace("jet-a1-certificate-pc01", "n-decane");
    dir.write("clash.toml", &built);
    b(&["fuel", "show", "clash.toml"], &["clash.toml", "'n-decane' is already a library component"]);
}
