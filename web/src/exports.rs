//! The exports of a checked list (cleaned CSV, FHIR ValueSet, the billable
//! codes reached as CSV, SQL, R or Python), the bytes the CLI's
//! `check --format NAME` writes.

use crate::checker::Checker;
use crate::js::{fail, json_text, today, JsCheckOptions};
use rollcall::export::{export, Source, ValueSetMeta};
use rollcall::mixed::Primary;
use wasm_bindgen::prelude::*;

#[wasm_bindgen]
impl Checker {
    /// One export of a checked list (`cleaned-csv`, `fhir`, `codes-csv`,
    /// `codes-sql`, `codes-r`, `codes-python`), as JSON text: `{ format,
    /// filename, mime, text, count, left_out }`, the bytes the CLI's
    /// `check --format NAME` writes. `system` is a shape-only system picked
    /// for the rows with no system cell, or empty; `url` the ValueSet's
    /// canonical URL (empty: a placeholder).
    #[wasm_bindgen(js_name = exportJson)]
    pub fn export_json(
        &self,
        text: &str,
        options: JsCheckOptions,
        format: &str,
        system: &str,
        url: &str,
    ) -> Result<String, JsValue> {
        let meta = ValueSetMeta::new(url, today());
        let made = if system.is_empty() {
            let (opts, reading) = self.options_and_reading(options)?;
            let draft = rollcall::list::read(text, reading);
            let (report, _) = self.checked(&draft, &opts);
            let views = self.companion_views();
            let reach = if format.starts_with("codes-") {
                rollcall::check::check_draft_with_reach(&self.index, &views, &draft, &opts).1
            } else {
                Vec::new()
            };
            let view = self.index.view();
            export(
                format,
                &Source {
                    report: &report,
                    reach: &reach,
                    view: Some(&view),
                    meta,
                },
            )
        } else {
            let opts = self.shape_options(options)?;
            let s = rollcall::systems::System::parse(system)
                .ok_or_else(|| fail("unknown code system", system))?;
            let loaded = self.loaded_indexes();
            let report = rollcall::mixed::check_list(Primary::Shapes(s), &loaded, text, &opts);
            export(
                format,
                &Source {
                    report: &report,
                    reach: &[],
                    view: None,
                    meta,
                },
            )
        };
        let e = made.map_err(|e| fail("cannot export", e))?;
        json_text(&e)
    }
}
