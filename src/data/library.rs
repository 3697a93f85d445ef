//! The component library: embedded files plus user files, with every source id resolved.

use std::collections::{BTreeMap, HashMap};
use std::path::Path;
use std::sync::{Arc, OnceLock};

use super::gases::{parse_gases, GasSpecies};
use super::{suggest, Component, DataError, Form, SourceRegistry};

include!(concat!(env!("OUT_DIR"), "/embedded.rs"));

/// One component of the library: parsed on first use when it comes from the embedded files (those are
/// checked as a whole by the tests, see [`Library::check_all`]), at once when a user adds it.
#[derive(Debug, Clone)]
struct Entry {
    /// Embedded file text and the name shown for it, until parsed.
    text: Option<(&'static str, String)>,
    parsed: OnceLock<Arc<Component>>,
}

impl Entry {
    fn get(&self) -> &Arc<Component> {
        self.parsed.get_or_init(|| {
            let (text, shown) = self.text.as_ref().expect("an entry without text is parsed when added");
            // the embedded files are fixed at build time and parsed and checked by `check_all` in the tests
            Arc::new(Component::parse_generated(text, shown).unwrap_or_else(|e| panic!("embedded component file: {e}")))
        })
    }
}

/// The top-level keys of a component file that name it (read without parsing the rest).
#[derive(serde::Deserialize)]
struct ComponentNames {
    id: String,
    #[serde(default)]
    aliases: Vec<String>,
}

include!("names_scan.rs");

/// Id and aliases of a component file from the lines before its first table header: by a line scan when every
/// line there is a one-line `key = value` (as the generated files are), otherwise by the TOML parser.
fn component_names(text: &str) -> Option<ComponentNames> {
    let header = names_header(text);
    scan_names(header).map(|(id, aliases)| ComponentNames { id, aliases }).or_else(|| toml::from_str(header).ok())
}

/// All components, gases, sources and named fuel files known to a run.
#[derive(Debug, Clone)]
pub struct Library {
    entries: Vec<Entry>,
    /// Every component in load order, gathered (and parsed) on the first call of [`Library::components`].
    all: OnceLock<Vec<Arc<Component>>>,
    index: HashMap<String, usize>,
    /// Ambient-gas species by id.
    pub gases: BTreeMap<String, GasSpecies>,
    /// Source registry.
    pub sources: SourceRegistry,
    /// Fuel files by fuel id: (origin, text).
    pub fuels: BTreeMap<String, (String, String)>,
}

impl Library {
    /// The library embedded in the binary (mixtures/ at build time).
    pub fn embedded() -> Result<Self, DataError> {
        let mut lib = Library { entries: vec![], all: OnceLock::new(), index: HashMap::new(), gases: BTreeMap::new(), sources: SourceRegistry::default(), fuels: BTreeMap::new() };
        for (i, (path, text)) in EMBEDDED_FILES.iter().enumerate() {
            let shown = format!("mixtures/{path}");
            match EMBEDDED_NAMES.get(i).copied().flatten() {
                // names read at build time by the same scan (`embedded_names_are_the_scanned_names`)
                Some((id, aliases)) => {
                    let aliases: Vec<String> = aliases.iter().map(|a| a.to_string()).collect();
                    lib.add_entry(&id.to_string(), &aliases, Entry { text: Some((text, shown.clone())), parsed: OnceLock::new() }, &shown)?;
                }
                None => lib.add_text(path, text, &shown)?,
            }
        }
        // the embedded sources file is parsed, and the embedded data's source ids resolved, by `check_all`
        // (in the tests), not at every start
        Ok(lib)
    }

    /// Parse every component (the embedded ones are otherwise parsed on first use) and check every source id.
    pub fn check_all(&self) -> Result<(), DataError> {
        for e in &self.entries {
            if e.parsed.get().is_none() {
                let (text, shown) = e.text.as_ref().expect("unparsed entries have text");
                let c = Component::parse(text, shown)?;
                let _ = e.parsed.set(Arc::new(c));
            }
        }
        self.sources.check_embedded()?;
        self.check_sources()
    }

    fn add_text(&mut self, rel: &str, text: &'static str, shown: &str) -> Result<(), DataError> {
        if rel.starts_with("components/") {
            match component_names(text) {
                Some(names) => self.add_entry(&names.id, &names.aliases, Entry { text: Some((text, shown.to_string())), parsed: OnceLock::new() }, shown)?,
                None => self.add_component(Component::parse(text, shown)?)?,
            }
        } else if rel == "gases.toml" {
            self.gases.extend(parse_gases(text, shown)?);
        } else if rel == "sources.toml" {
            self.sources.set_embedded(text, "mixtures/sources.toml");
        } else if !rel.contains('/') {
            let id = rel.trim_end_matches(".toml").to_string();
            self.fuels.insert(id, (shown.to_string(), text.to_string()));
        }
        Ok(())
    }

    /// Add a component; an id or alias already in use is an error naming both files.
    pub fn add_component(&mut self, c: Component) -> Result<(), DataError> {
        if let Form::CorrespondingStates = c.ideal_gas_heat_capacity.form {
            return Err(DataError::Invalid {
                context: format!("{}: [ideal-gas-heat-capacity]", c.origin),
                message: "needs coefficients (published, or a group-contribution polynomial marked estimated:joback)".into(),
            });
        }
        let (id, aliases, origin) = (c.id.clone(), c.aliases.clone(), c.origin.clone());
        let parsed = OnceLock::new();
        let _ = parsed.set(Arc::new(c));
        self.add_entry(&id, &aliases, Entry { text: None, parsed }, &origin)
    }

    fn add_entry(&mut self, id: &String, aliases: &[String], entry: Entry, origin: &str) -> Result<(), DataError> {
        for name in std::iter::once(id).chain(aliases.iter()) {
            if let Some(&i) = self.index.get(name) {
                return Err(DataError::Invalid { context: format!("{origin}: id"), message: format!("'{name}' is already defined by {}", self.origin_of(i)) });
            }
        }
        let i = self.entries.len();
        for name in std::iter::once(id).chain(aliases.iter()) {
            self.index.insert(name.clone(), i);
        }
        self.entries.push(entry);
        self.all = OnceLock::new();
        Ok(())
    }

    /// The file entry `i` came from (without parsing it).
    fn origin_of(&self, i: usize) -> String {
        match (&self.entries[i].text, self.entries[i].parsed.get()) {
            (_, Some(c)) => c.origin.clone(),
            (Some((_, shown)), None) => shown.clone(),
            (None, None) => String::new(),
        }
    }

    /// Load every `*.toml` component file in a user folder (and `sources.toml` there, if any).
    pub fn add_user_folder(&mut self, dir: &Path) -> Result<(), DataError> {
        let rd = std::fs::read_dir(dir).map_err(|e| DataError::Io { file: dir.display().to_string(), message: e.to_string() })?;
        let mut paths: Vec<_> = rd.filter_map(|e| e.ok()).map(|e| e.path()).filter(|p| p.extension().is_some_and(|x| x == "toml")).collect();
        paths.sort();
        for p in paths {
            let shown = p.display().to_string();
            let bytes = super::read_input_file(&p).map_err(|message| DataError::Io { file: shown.clone(), message })?;
            let text = String::from_utf8(bytes).map_err(|_| DataError::Parse { file: shown.clone(), message: "file is not UTF-8 text".into() })?;
            if p.file_name().is_some_and(|n| n == "sources.toml") {
                self.sources.extend(SourceRegistry::parse(&text, &shown)?);
            } else {
                self.add_component(Component::parse(&text, &shown)?)?;
            }
        }
        self.check_sources()
    }

    /// Every source id used anywhere must resolve in the registry or be an allowed marker.
    ///
    /// Only components already parsed are checked: the embedded ones not used so far are checked as a whole by
    /// [`Library::check_all`] (in the tests).
    pub fn check_sources(&self) -> Result<(), DataError> {
        for c in self.entries.iter().filter_map(|e| e.parsed.get()) {
            for (field, id) in c.source_ids() {
                if !self.sources.resolves(&id) {
                    return Err(DataError::Unknown {
                        context: format!("{}: {field}.source", c.origin),
                        kind: "source",
                        id: id.clone(),
                        hint: suggest(&id, self.sources.ids()),
                    });
                }
            }
        }
        for g in self.gases.values() {
            for (field, id) in g.source_ids() {
                if !self.sources.resolves(&id) {
                    return Err(DataError::Unknown { context: format!("mixtures/gases.toml: {}.{field}.source", g.id), kind: "source", id, hint: String::new() });
                }
            }
        }
        Ok(())
    }

    /// Check a component defined outside the library (e.g. inside a fuel file) before use: group-contribution
    /// or published ideal-gas cp, every source resolvable, and no id or alias that the library already uses.
    pub fn check_extra_component(&self, c: &Component) -> Result<(), DataError> {
        if let Form::CorrespondingStates = c.ideal_gas_heat_capacity.form {
            return Err(DataError::Invalid {
                context: format!("{}: [ideal-gas-heat-capacity]", c.origin),
                message: "needs coefficients (published, or an estimated polynomial with an estimated:<method> source)".into(),
            });
        }
        for name in std::iter::once(&c.id).chain(c.aliases.iter()) {
            if let Some(&i) = self.index.get(name) {
                return Err(DataError::Invalid {
                    context: format!("{}: id", c.origin),
                    message: format!("'{name}' is already a library component ({}); rename the embedded component", self.origin_of(i)),
                });
            }
        }
        for (field, id) in c.source_ids() {
            if !self.sources.resolves(&id) {
                return Err(DataError::Unknown {
                    context: format!("{}: {field}.source", c.origin),
                    kind: "source",
                    id: id.clone(),
                    hint: suggest(&id, self.sources.ids()),
                });
            }
        }
        Ok(())
    }

    /// Look a component up by id or alias.
    pub fn component(&self, name: &str) -> Option<&Arc<Component>> {
        self.index.get(name).map(|&i| self.entries[i].get())
    }

    /// Look a component up, with a "did you mean" error naming `context`.
    pub fn require_component(&self, name: &str, context: &str) -> Result<&Arc<Component>, DataError> {
        self.component(name).ok_or_else(|| DataError::Unknown {
            context: context.to_string(),
            kind: "component",
            id: name.to_string(),
            hint: suggest(name, self.index.keys().map(|s| s.as_str())),
        })
    }

    /// All components in load order.
    pub fn components(&self) -> &[Arc<Component>] {
        self.all.get_or_init(|| self.entries.iter().map(|e| e.get().clone()).collect())
    }

    /// Look an ambient-gas species up by id.
    pub fn gas(&self, id: &str) -> Option<&GasSpecies> {
        self.gases.get(id)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn embedded_library_loads_and_sources_resolve() {
        let lib = Library::embedded().unwrap_or_else(|e| panic!("{e}"));
        lib.check_all().unwrap_or_else(|e| panic!("{e}"));
        assert!(lib.components().len() >= 40, "{}", lib.components().len());
        for c in lib.components() {
            let tb = c.normal_boiling_point();
            let p = c.vapor_pressure(tb);
            assert!((p / 101_325.0 - 1.0).abs() < 0.05, "{} p_sat(Tb) = {p}", c.id);
            for t in [250.0, 300.0, tb, 0.9 * c.critical_temperature()] {
                for (name, v) in [
                    ("rho", c.liquid_density(t)),
                    ("L", c.latent_heat(t)),
                    ("cp", c.liquid_heat_capacity(t)),
                    ("mu", c.liquid_viscosity(t)),
                    ("k", c.liquid_conductivity(t)),
                    ("sigma", c.surface_tension(t)),
                    ("cpig", c.ideal_gas_heat_capacity(t)),
                    ("muv", c.vapor_viscosity(t)),
                    ("kv", c.vapor_conductivity(t)),
                ] {
                    assert!(v.is_finite() && v > 0.0, "{} {name}({t}) = {v}", c.id);
                }
            }
        }
    }

    /// The names read before parsing are those of the parsed component, for every embedded component file.
    #[test]
    fn names_read_without_parsing_match_the_parse() {
        for (path, text) in EMBEDDED_FILES.iter().filter(|(p, _)| p.starts_with("components/")) {
            let names = component_names(text).unwrap_or_else(|| panic!("{path}: id not readable"));
            let c = Component::parse(text, path).unwrap();
            assert_eq!((names.id, names.aliases), (c.id.clone(), c.aliases.clone()), "{path}");
        }
    }

    /// The names precomputed by build.rs are those the scan reads at run time, for every embedded file.
    #[test]
    fn embedded_names_are_the_scanned_names() {
        assert_eq!(EMBEDDED_NAMES.len(), EMBEDDED_FILES.len());
        let mut read = 0;
        for ((path, text), names) in EMBEDDED_FILES.iter().zip(EMBEDDED_NAMES) {
            let scanned = if path.starts_with("components/") { scan_names(names_header(text)) } else { None };
            let built = names.map(|(id, aliases)| (id.to_string(), aliases.iter().map(|a| a.to_string()).collect::<Vec<_>>()));
            assert_eq!(built, scanned, "{path}");
            read += usize::from(built.is_some());
        }
        assert!(read >= 40, "{read}");
    }

    /// The subset reader used at run time gives the component the full parser gives, for every embedded file.
    #[test]
    fn embedded_components_parse_alike() {
        for (path, text) in EMBEDDED_FILES.iter().filter(|(p, _)| p.starts_with("components/")) {
            let fast = Component::parse_generated(text, path).unwrap();
            let full = Component::parse(text, path).unwrap();
            assert_eq!(format!("{fast:?}"), format!("{full:?}"), "{path}");
        }
    }

    /// The line scan of the names agrees with the TOML parser where it answers, and leaves other headers to it.
    #[test]
    fn name_scan_agrees_with_toml() {
        let toml_names = |h: &str| toml::from_str::<ComponentNames>(h).ok().map(|n| (n.id, n.aliases));
        for header in ["id = \"a\"\naliases = [\"b\", \"c\",]  # x\nformula = { C = 1 }\n", "# c\nid = \"a\" # note\n\naliases = []\n", "id = \"a\"\n"] {
            let scanned = scan_names(header);
            assert!(scanned.is_some(), "{header}");
            assert_eq!(scanned, toml_names(header), "{header}");
        }
        let left_to_toml = [
            "id = 'a'\n",
            "\"id\" = \"a\"\n",
            "id = \"a\\u0062\"\n",
            "aliases = [\n\"b\"]\nid = \"a\"\n",
            "id = \"a\"\nid = \"b\"\n",
            "name = \"\"\"\nid = \"x\"\n\"\"\"\nid = \"a\"\n",
            "aliases = [\"b\"\nid = \"a\"\n",
        ];
        for header in left_to_toml {
            assert!(scan_names(header).is_none(), "{header}");
        }
    }

    /// Looking one component up parses only that one; `components()` parses the rest in load order.
    #[test]
    fn lookups_parse_lazily() {
        let lib = Library::embedded().unwrap();
        assert_eq!(lib.entries.iter().filter(|e| e.parsed.get().is_some()).count(), 0);
        let c = lib.component("decane").unwrap();
        assert_eq!(c.id, "n-decane");
        assert_eq!(lib.entries.iter().filter(|e| e.parsed.get().is_some()).count(), 1);
        let ids: Vec<_> = lib.components().iter().map(|c| c.id.clone()).collect();
        assert!(Arc::ptr_eq(lib.component("n-decane").unwrap(), &lib.components()[ids.iter().position(|i| i == "n-decane").unwrap()]));
    }
}
