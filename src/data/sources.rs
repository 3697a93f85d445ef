//! The source registry: every value names a source id resolved here.

use std::collections::BTreeMap;

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

/// All known sources by id.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SourceRegistry {
    /// Sources by id.
    pub sources: BTreeMap<String, Source>,
}

/// Markers allowed in place of a registry id.
pub const SOURCE_MARKERS: [&str; 3] = ["common-practice", "from-memory", "user"];

impl SourceRegistry {
    /// Parse a sources TOML file.
    pub fn parse(text: &str, file: &str) -> Result<Self, DataError> {
        let sources: BTreeMap<String, Source> =
            toml::from_str(text).map_err(|e| DataError::Parse { file: file.into(), message: toml_error_at(&e, text) })?;
        Ok(SourceRegistry { sources })
    }

    /// Add the entries of another registry (later files win on equal ids).
    pub fn extend(&mut self, other: SourceRegistry) {
        self.sources.extend(other.sources);
    }

    /// True when `id` is a registry id or an allowed marker (`estimated:<method>` included).
    pub fn resolves(&self, id: &str) -> bool {
        self.sources.contains_key(id)
            || SOURCE_MARKERS.contains(&id)
            || id.strip_prefix("estimated:").is_some_and(|m| !m.is_empty())
    }

    /// Human citation for an id or marker.
    pub fn describe(&self, id: &str) -> String {
        if let Some(s) = self.sources.get(id) {
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
