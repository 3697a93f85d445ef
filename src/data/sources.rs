//! The source registry: every value names a source id resolved here.

use std::collections::BTreeMap;
use std::sync::OnceLock;

use serde::Deserialize;

use super::{toml_error_at, DataError};

/// One bibliographic source.
#[derive(Debug, Clone, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct Source {
    /// Full citation.
    pub citation: String,
    /// How the values were transcribed, caveats.
    #[serde(default)]
    pub note: Option<String>,
}

/// All known sources by id. The embedded registry (mixtures/sources.toml, checked whole by the tests) is
/// parsed on first look-up, not at start-up (it is the largest file of the library); files added later
/// (user folders) are parsed when added, so their errors are reported at load, and win on equal ids.
#[derive(Debug, Clone, Default)]
pub struct SourceRegistry {
    /// Sources of the files added with [`SourceRegistry::extend`], by id.
    added: BTreeMap<String, Source>,
    /// The embedded registry's text and shown file name, parsed on first use into `embedded_parsed`.
    embedded: Option<(&'static str, &'static str)>,
    embedded_parsed: OnceLock<BTreeMap<String, Source>>,
}


fn parse_map(text: &str, file: &str) -> Result<BTreeMap<String, Source>, DataError> {
    toml::from_str(text).map_err(|e| DataError::Parse { file: file.into(), message: toml_error_at(&e, text) })
}

/// Markers allowed in place of a registry id.
pub const SOURCE_MARKERS: [&str; 3] = ["common-practice", "from-memory", "user"];

impl SourceRegistry {
    /// Parse a sources TOML file.
    pub fn parse(text: &str, file: &str) -> Result<Self, DataError> {
        Ok(SourceRegistry { added: parse_map(text, file)?, ..Default::default() })
    }

    /// Use the embedded sources file `text` (shown as `file`), parsed on first look-up (a defect in it is a build
    /// defect: `Library::check_all` and the tests parse it).
    pub fn set_embedded(&mut self, text: &'static str, file: &'static str) {
        self.embedded = Some((text, file));
        self.embedded_parsed = OnceLock::new();
    }

    /// Parse the embedded file now; its error, if any.
    pub fn check_embedded(&self) -> Result<(), DataError> {
        match self.embedded {
            Some((text, file)) => parse_map(text, file).map(|_| ()),
            None => Ok(()),
        }
    }

    fn embedded(&self) -> &BTreeMap<String, Source> {
        static EMPTY: BTreeMap<String, Source> = BTreeMap::new();
        match self.embedded {
            Some((text, file)) => self.embedded_parsed.get_or_init(|| parse_map(text, file).unwrap_or_else(|e| panic!("embedded source registry: {e}"))),
            None => &EMPTY,
        }
    }

    /// The source of a registry id (added files first, then the embedded registry).
    pub fn get(&self, id: &str) -> Option<&Source> {
        self.added.get(id).or_else(|| self.embedded().get(id))
    }

    /// Every registry id (for "did you mean" hints).
    pub fn ids(&self) -> impl Iterator<Item = &str> {
        self.added.keys().chain(self.embedded().keys().filter(|k| !self.added.contains_key(*k))).map(|s| s.as_str())
    }

    /// Add the entries of another registry (later files win on equal ids).
    pub fn extend(&mut self, other: SourceRegistry) {
        self.added.extend(other.added);
    }

    /// True when `id` is a registry id or an allowed marker (`estimated:<method>` included).
    pub fn resolves(&self, id: &str) -> bool {
        self.get(id).is_some()
            || SOURCE_MARKERS.contains(&id)
            || id.strip_prefix("estimated:").is_some_and(|m| !m.is_empty())
    }

    /// Human citation for an id or marker.
    pub fn describe(&self, id: &str) -> String {
        if let Some(s) = self.get(id) {
            return s.citation.clone();
        }
        if let Some(m) = id.strip_prefix("estimated:") {
            return format!("estimated by the {m} method (see docs/property-methods.md)");
        }
        match id {
            "common-practice" => "common practice (no single published source)".into(),
            "from-memory" => "recalled from memory, not confirmed against a published source".into(),
            "user" => "given by the user".into(),
            other => format!("unresolved source '{other}'"),
        }
    }
}
