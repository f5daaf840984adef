//! A site's own indexes: `site-indexes.json` beside the page lists the
//! manifests of indexes a site built itself with `vocab-build` (a LOINC or
//! RxNorm release it is licensed for, a plain table), and the page, the form
//! checker and the JavaScript API offer each of them beside the bundled ones.
//!
//! The rules for that file and for each manifest it lists live here, so
//! every user of the worker reads them alike, and each message says what to
//! write instead.

use crate::manifest::IndexInfo;
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;

/// The file beside the page that lists a site's own indexes. A site without
/// one has none (the page takes a 404 as that).
pub const SITE_FILE: &str = "site-indexes.json";

const SITE_FORM: &str = r#"{"indexes": ["loinc-manifest.json", ...]}"#;

/// An index manifest as `index-manifest` writes it.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct Manifest {
    #[serde(flatten)]
    pub info: IndexInfo,
    /// The index file, in the same folder as the manifest.
    pub file: String,
}

/// One index of a site: the name the site lists it by (its manifest's file
/// name, also what the picker, a link, the form checker and the API name it
/// by) and its manifest.
#[derive(Serialize, Debug, Clone, PartialEq, Eq)]
pub struct SiteIndex {
    pub name: String,
    pub manifest: Manifest,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SiteFile {
    indexes: Vec<String>,
}

/// A file name in the page's own folder: no path, nothing a URL would read
/// as more than a name, so a listed file can only be fetched from beside
/// the page.
fn plain_name(name: &str, ending: &str) -> bool {
    let mut chars = name.chars();
    name.len() <= 120
        && name.len() > ending.len()
        && name.ends_with(ending)
        && chars.next().is_some_and(|c| c.is_ascii_alphanumeric())
        && chars.all(|c| c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-'))
        && !name.contains("..")
}

/// The manifest names `site-indexes.json` lists, in its order.
pub fn site_list(text: &str) -> Result<Vec<String>, String> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let file: SiteFile = serde_json::from_str(text).map_err(|e| {
        if e.is_syntax() || e.is_eof() {
            format!("{SITE_FILE} is not JSON ({e}); write it as {SITE_FORM}")
        } else {
            format!("{SITE_FILE} is not in the expected form ({e}); write it as {SITE_FORM}")
        }
    })?;
    let mut seen = std::collections::HashSet::new();
    for name in &file.indexes {
        if name == SITE_FILE {
            return Err(format!(
                "{SITE_FILE} lists itself; list the manifests that index-manifest writes"
            ));
        }
        if !plain_name(name, ".json") {
            return Err(format!(
                "{SITE_FILE} lists “{name}”, which is not a manifest the page will fetch: give the file name of a .json manifest in the page's own folder (letters, digits, '.', '_' and '-', no folders), such as loinc-manifest.json"
            ));
        }
        if !seen.insert(name.as_str()) {
            return Err(format!(
                "{SITE_FILE} lists “{name}” twice; list each manifest once"
            ));
        }
    }
    Ok(file.indexes)
}

/// The manifest `name` (as listed in `site-indexes.json`), checked for what
/// the page needs before it offers the index: the worker verifies the index
/// itself against it when it is picked.
pub fn site_manifest(name: &str, text: &str) -> Result<SiteIndex, String> {
    let rewrite = format!(
        "write it again with index-manifest INDEX.rcx {name} (README: A site's own index on the page)"
    );
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let value: serde_json::Value = serde_json::from_str(text)
        .map_err(|e| format!("the manifest {name} is not JSON ({e}); {rewrite}"))?;
    if value.get("kind").and_then(|k| k.as_str()) == Some("notes") {
        return Err(format!(
            "{name} is the manifest of a notes file, not of an index; list the index's manifest in {SITE_FILE}"
        ));
    }
    let manifest: Manifest = serde_json::from_value(value)
        .map_err(|e| format!("{name} is not an index manifest ({e}); {rewrite}"))?;
    let info = &manifest.info;
    if !plain_name(&manifest.file, ".rcx") {
        return Err(format!(
            "{name} names the index file “{}”, which the page will not fetch: put the index beside the page under a plain name such as loinc.rcx, and {rewrite}",
            manifest.file
        ));
    }
    let hex = |s: &str| {
        s.len() == 64
            && s.bytes()
                .all(|b| b.is_ascii_digit() || (b'a'..=b'f').contains(&b))
    };
    if !hex(&info.sha256) || info.byte_length == 0 {
        return Err(format!(
            "{name} has no usable SHA-256 or size of its index; {rewrite}"
        ));
    }
    for (field, v) in [
        ("vocabulary", &info.vocabulary),
        ("title", &info.title),
        ("release", &info.release),
    ] {
        if v.trim().is_empty() {
            return Err(format!("{name} gives no {field}; {rewrite}"));
        }
    }
    let day = |field: &str, v: &str| {
        rollcall::Date::parse(v)
            .map_err(|_| format!("{name}: {field} “{v}” is not a date (YYYY-MM-DD); {rewrite}"))
    };
    let from = day("coverage_from", &info.coverage_from)?;
    let to = day("coverage_to", &info.coverage_to)?;
    if from > to {
        return Err(format!(
            "{name}: its coverage ends ({to}) before it starts ({from}); {rewrite}"
        ));
    }
    Ok(SiteIndex {
        name: name.to_string(),
        manifest,
    })
}

/// The name of the file that lists a site's own indexes.
#[wasm_bindgen(js_name = siteIndexesFile)]
pub fn site_indexes_file() -> String {
    SITE_FILE.to_string()
}

/// The manifest names `site-indexes.json` lists; throws an `Error` saying
/// what is wrong with the file and how to write it.
#[wasm_bindgen(js_name = siteIndexList)]
pub fn site_index_list(text: &str) -> Result<Vec<String>, JsValue> {
    site_list(text).map_err(|e| js_sys::Error::new(&e).into())
}

/// One listed manifest checked, as JSON text of `{name, manifest}`; throws
/// an `Error` naming the manifest and what is wrong with it.
#[wasm_bindgen(js_name = siteIndexJson)]
pub fn site_index_json(name: &str, text: &str) -> Result<String, JsValue> {
    let index = site_manifest(name, text).map_err(|e| JsValue::from(js_sys::Error::new(&e)))?;
    serde_json::to_string(&index)
        .map_err(|e| crate::js::fail("could not hand the manifest to the page", e))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn manifest() -> serde_json::Value {
        serde_json::json!({
            "vocabulary": "loinc",
            "title": "LOINC",
            "release": "2.78",
            "coverage_from": "2024-08-06",
            "coverage_to": "2024-08-06",
            "sources": [],
            "notice": "credit",
            "byte_length": 2013,
            "sha256": "ab".repeat(32),
            "file": "loinc.rcx",
        })
    }

    #[test]
    fn the_site_file_lists_plain_manifest_names() {
        assert_eq!(
            site_list(r#"{"indexes": ["loinc-manifest.json", "lhm.json"]}"#).unwrap(),
            ["loinc-manifest.json", "lhm.json"]
        );
        assert_eq!(
            site_list("\u{feff}{\"indexes\": []}").unwrap(),
            Vec::<String>::new()
        );
        for (text, says) in [
            ("{\"indexes\": [", "is not JSON"),
            ("[\"a.json\"]", "not in the expected form"),
            (r#"{"index": ["a.json"]}"#, "unknown field `index`"),
            (r#"{"indexes": [3]}"#, "not in the expected form"),
            (
                r#"{"indexes": ["../a.json"]}"#,
                "not a manifest the page will fetch",
            ),
            (r#"{"indexes": ["sub/a.json"]}"#, "no folders"),
            (
                r#"{"indexes": ["https://elsewhere.example/a.json"]}"#,
                "no folders",
            ),
            (r#"{"indexes": ["a.rcx"]}"#, ".json manifest"),
            (r#"{"indexes": ["a.json", "a.json"]}"#, "twice"),
            (r#"{"indexes": ["site-indexes.json"]}"#, "lists itself"),
        ] {
            let e = site_list(text).unwrap_err();
            assert!(e.contains(says), "{text}: {e}");
            assert!(e.contains("site-indexes.json"), "{text}: {e}");
        }
    }

    #[test]
    fn a_listed_manifest_is_checked_for_what_the_page_needs() {
        let ok = site_manifest("loinc-manifest.json", &manifest().to_string()).unwrap();
        assert_eq!(ok.name, "loinc-manifest.json");
        assert_eq!(ok.manifest.file, "loinc.rcx");
        assert_eq!(ok.manifest.info.notice, "credit");
        // The page gets the manifest's fields as they are, beside its name.
        let json: serde_json::Value = serde_json::to_value(&ok).unwrap();
        assert_eq!(json["manifest"]["release"], "2.78");
        assert_eq!(json["manifest"]["file"], "loinc.rcx");

        let with = |key: &str, v: serde_json::Value| {
            let mut m = manifest();
            m[key] = v;
            m.to_string()
        };
        for (text, says) in [
            ("not json".to_string(), "is not JSON"),
            (with("kind", "notes".into()), "notes file"),
            (with("file", "../loinc.rcx".into()), "will not fetch"),
            (with("file", "loinc.json".into()), "will not fetch"),
            (with("sha256", "xyz".into()), "SHA-256"),
            (with("byte_length", 0.into()), "size"),
            (with("release", "".into()), "no release"),
            (with("coverage_to", "2024-13-01".into()), "not a date"),
            (with("coverage_from", "2025-01-01".into()), "ends"),
            (
                with("sources", serde_json::Value::Null),
                "not an index manifest",
            ),
        ] {
            let e = site_manifest("m.json", &text).unwrap_err();
            assert!(e.contains(says), "{text}: {e}");
            assert!(e.contains("m.json"), "{text}: {e}");
        }
        let mut m = manifest();
        m.as_object_mut().unwrap().remove("sha256");
        let e = site_manifest("m.json", &m.to_string()).unwrap_err();
        assert!(
            e.contains("missing field `sha256`") && e.contains("index-manifest"),
            "{e}"
        );
    }
}
