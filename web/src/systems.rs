//! The core's policy on systems, for the page and the worker: which have a
//! bundled index and the manifest it is described by, the packed copy of
//! an index the page may fetch, and the companion kept at hand beside each
//! (`rollcall::systems`).

use crate::js::{to_js, JsBundledSystems};
use rollcall::systems::{self, System};
use serde::Serialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

/// The name of the manifest beside the page for the bundled index of the
/// system `name` (`index-manifest.json` for ICD-10-CM), or `undefined` when
/// it has none: the core's `System::index_manifest`.
#[wasm_bindgen(js_name = indexManifest)]
pub fn index_manifest(name: &str) -> Option<String> {
    System::parse(name).and_then(|s| s.index_manifest())
}

/// The packed copy a manifest names (`packed: {file, encoding}`), when it
/// is one the page fetches and unpacks: the core's `systems::packed_copy_ok`
/// (gzip, a plain file name beside the index); else `undefined`, and the
/// index itself is fetched.
#[wasm_bindgen(js_name = packedFile)]
pub fn packed_file(file: &str, encoding: &str) -> Option<String> {
    systems::packed_copy_ok(file, encoding).then(|| file.to_string())
}

/// The bundled index kept at hand beside a list of the system `name`
/// (ICD-9-CM beside ICD-10-CM and back, for the GEMs), or `undefined`: the
/// core's `System::companion`.
#[wasm_bindgen(js_name = companionOf)]
pub fn companion_of(name: &str) -> Option<String> {
    System::parse(name)
        .and_then(|s| s.companion())
        .map(|s| s.name().to_string())
}

/// Whether a list of this system with retired or partly valid codes wants
/// its companion, whose codes replace them (ICD-10-CM beside ICD-9-CM): the
/// core's `System::companion_replaces`.
#[wasm_bindgen(js_name = companionReplaces)]
pub fn companion_replaces(name: &str) -> bool {
    System::parse(name).is_some_and(|s| s.companion_replaces())
}

/// One system with a bundled index, as [`bundled_systems`] lists it.
#[derive(Serialize)]
struct Bundled {
    /// Its name (`icd10cm`).
    name: &'static str,
    /// Its title (`ICD-10-CM`).
    title: &'static str,
    /// The manifest beside the page that describes its index.
    manifest: String,
    /// The bundled index kept at hand beside it, if any.
    companion: Option<&'static str>,
    /// Whether it is the system a list is checked in when none is named
    /// (the page's first index).
    default: bool,
}

/// The systems whose index the page serves beside it, in the core's order:
/// `[{ name, title, manifest, companion, default }]` (`System::bundled`,
/// `System::index_manifest`, `System::companion`, `systems::DEFAULT`).
/// Every other system is checked by shape and check digit only.
#[wasm_bindgen(js_name = bundledSystems)]
pub fn bundled_systems() -> Result<JsBundledSystems, JsValue> {
    let list: Vec<Bundled> = systems::bundled_systems()
        .map(|s: System| Bundled {
            name: s.name(),
            title: s.title(),
            manifest: s.index_manifest().unwrap_or_default(),
            companion: s.companion().map(System::name),
            default: s == systems::DEFAULT,
        })
        .collect();
    Ok(to_js(&list)?.unchecked_into())
}
