//! What the page shows of single codes: their spans, the card of a code
//! (the CLI's `show`) and codes for words (the CLI's `find`).

use crate::checker::Checker;
use crate::js::{
    fail, json_text, to_js, today, JsCard, JsCheckOptions, JsCodes, JsTimeline, JsTimelines,
};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

#[wasm_bindgen]
impl Checker {
    /// The billable and header spans of one code (any input form), or `null`
    /// for a code the index does not know.
    pub fn timeline(&self, code: &str) -> Result<JsTimeline, JsValue> {
        Ok(to_js(&rollcall::timeline(&self.index, code))?.unchecked_into())
    }

    /// Spans for many codes at once, keyed by the code as given.
    pub fn timelines(&self, codes: JsCodes) -> Result<JsTimelines, JsValue> {
        let codes: Vec<String> = serde_wasm_bindgen::from_value(codes.into())
            .map_err(|e| fail("bad code list for timelines", e))?;
        let map: std::collections::BTreeMap<&str, Option<Vec<rollcall::Span>>> = codes
            .iter()
            .map(|c| (c.as_str(), rollcall::timeline(&self.index, c)))
            .collect();
        Ok(to_js(&map)?.unchecked_into())
    }

    /// Codes for words, best first, as JSON text: `{ query, date, within,
    /// no_code, results: [{ code, description, status, billable_from,
    /// billable_to, fit }] }` (the CLI's `find --format json`). A code or
    /// code start first lists that part of the tree (`within`), or names the
    /// start no code has (`no_code`). The last word counts as the start of a
    /// word, for suggestions while typing; codes in use on the index's
    /// default day (today when it covers it) come first.
    pub fn find(&self, query: &str, limit: u32) -> Result<String, JsValue> {
        // The index's default day: today, or the nearest day it covers.
        let day = self.index.meta().default_day(today());
        let limit = (limit as usize).clamp(1, 100);
        let f = rollcall::find::find(&self.index.view(), query, day, limit, true);
        let v = serde_json::json!({
            "query": query,
            "date": day,
            "within": f.within,
            "no_code": f.no_code,
            "results": f.results,
        });
        json_text(&v)
    }

    /// The card of one code, node or code start (`Card`, one of the CLI's
    /// `show --format json` cards) for the options' day or period; the
    /// companions' mappings (the GEMs) included. Text that is no code gets a
    /// card with the check's message and suggestions.
    pub fn card(&self, code: &str, options: JsCheckOptions) -> Result<JsCard, JsValue> {
        let opts = self.options(options)?;
        let views = self.companion_views();
        let mut cards = rollcall::card::cards(&self.index, &views, &[code], &opts);
        let card = cards
            .cards
            .pop()
            .ok_or_else(|| fail("no card", "give a code"))?;
        Ok(to_js(&card)?.unchecked_into())
    }
}
