//! What crosses to JavaScript: the TypeScript names of the values handed
//! over, the one error funnel, the serialisers, the panic hook, and today's
//! date as the browser has it.

use rollcall::Date;
use serde::Serialize;
use wasm_bindgen::prelude::*;

// The report types are written once, in web/static/report.d.ts, which the
// JavaScript API's declarations re-export.
#[wasm_bindgen(typescript_custom_section)]
const TS_TYPES: &'static str = include_str!("../static/report.d.ts");

#[wasm_bindgen]
extern "C" {
    #[wasm_bindgen(typescript_type = "IndexInfo")]
    pub type JsIndexInfo;
    #[wasm_bindgen(typescript_type = "CheckOptionsInput")]
    pub type JsCheckOptions;
    #[wasm_bindgen(typescript_type = "Report")]
    pub type JsReport;
    #[wasm_bindgen(typescript_type = "CategoryCoverage[]")]
    pub type JsCoverage;
    #[wasm_bindgen(typescript_type = "Span[] | null")]
    pub type JsTimeline;
    #[wasm_bindgen(typescript_type = "Timelines")]
    pub type JsTimelines;
    #[wasm_bindgen(typescript_type = "string[]")]
    pub type JsCodes;
    #[wasm_bindgen(typescript_type = "Edit[]")]
    pub type JsEdits;
    #[wasm_bindgen(typescript_type = "Card")]
    pub type JsCard;
    #[wasm_bindgen(typescript_type = "BundledSystem[]")]
    pub type JsBundledSystems;
}

/// The one error funnel: a JS `Error` whose message is `context: cause`.
pub(crate) fn fail(context: &str, cause: impl std::fmt::Display) -> JsValue {
    js_sys::Error::new(&format!("{context}: {cause}")).into()
}

/// Serialise a value the way `JSON.stringify` would see it (maps as plain
/// objects, 64-bit numbers as numbers), so it round-trips as JSON.
pub(crate) fn to_js<T: Serialize + ?Sized>(value: &T) -> Result<JsValue, JsValue> {
    value
        .serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(|e| fail("could not hand the result to the page", e))
}

/// A value as JSON text: for a large result, `JSON.parse` of one string is
/// much faster than building the objects across the boundary.
pub(crate) fn json_text<T: Serialize + ?Sized>(value: &T) -> Result<String, JsValue> {
    serde_json::to_string(value).map_err(|e| fail("could not hand the result to the page", e))
}

pub(crate) fn install_panic_hook() {
    static ONCE: std::sync::Once = std::sync::Once::new();
    ONCE.call_once(|| {
        std::panic::set_hook(Box::new(|info| {
            web_sys::console::error_1(&format!("rollcall: internal error: {info}").into());
        }));
    });
}

/// Today (UTC), as the CLI takes it when no date is given.
pub(crate) fn today() -> Date {
    Date::from_days((js_sys::Date::now() / 86_400_000.0).floor() as i32)
}
