//! A check handed to the page in pages: the entries as they are judged,
//! a page at a time, then the rest of the report. A list that names no
//! system is checked as a [`rollcall::check::Run`], so a million-line paste
//! is never held as its entries in the checker's memory, nor written as one
//! JSON string (which would pass the engine's limit on a string's length).

use crate::checker::Checker;
use crate::js::{json_text, JsCheckOptions};
use rollcall::list::{Lines, Listing};
use rollcall::Entry;
use wasm_bindgen::prelude::*;

#[wasm_bindgen]
impl Checker {
    /// Check a list as [`Checker::check_json`] does, with the report's
    /// entries handed over as they are judged: `on_page(json, linesDone,
    /// lines)` gets each page as the JSON text of an array of entries (the
    /// first of up to `first` entries, so that the page shows them soon, the
    /// others of up to `page`), the line of the last one and the list's number of lines. It
    /// may return `false` to stop the check (the list needs an index not yet
    /// loaded); the result is then `undefined`. Otherwise the report as JSON
    /// text with no entries (every entry was in a page): how the list was
    /// read, the options, the findings on the list as a whole and the
    /// summary. The entries of the pages, in order, are those of
    /// [`Checker::check_json`]'s report.
    #[wasm_bindgen(js_name = checkPaged)]
    pub fn check_paged(
        &mut self,
        text: String,
        options: JsCheckOptions,
        first: u32,
        page: u32,
        on_page: &js_sys::Function,
    ) -> Result<Option<String>, JsValue> {
        let (opts, reading) = self.options_and_reading(options)?;
        let listing = Listing::of(text, reading);
        let mut pager = Pager {
            on_page,
            size: (first as usize).max(1),
            next: (page as usize).max(1),
            lines: listing.facts().lines,
        };
        if listing.names_systems() {
            // One check per system, merged by line: the report is whole
            // before its first entry is known; it still goes in pages.
            let (mut report, coverage) = self.checked(&listing.into_draft(), &opts);
            let mut left = &report.entries[..];
            while !left.is_empty() {
                let (chunk, rest) = left.split_at(pager.size.min(left.len()));
                if !pager.send(chunk)? {
                    return Ok(None);
                }
                left = rest;
            }
            report.entries = Vec::new();
            self.last = Some(coverage);
            return json_text(&report).map(Some);
        }
        let views = self.companion_views();
        let mut run = rollcall::check::Run::new(&self.index, &views, &listing, &opts);
        let mut report = run.heading();
        let mut kept: Vec<Entry> = Vec::with_capacity(pager.next);
        for e in run.by_ref() {
            kept.push(e);
            if kept.len() == pager.size {
                if !pager.send(&kept)? {
                    return Ok(None);
                }
                kept.clear();
            }
        }
        if !kept.is_empty() && !pager.send(&kept)? {
            return Ok(None);
        }
        let (list_findings, summary, coverage) = run.finish_with_coverage();
        report.list_findings = list_findings;
        report.summary = summary;
        drop(views);
        self.last = Some(coverage);
        json_text(&report).map(Some)
    }
}

/// Where the pages go, and how large they are.
struct Pager<'f> {
    on_page: &'f js_sys::Function,
    /// The size of the page being filled.
    size: usize,
    /// The size of the pages after it.
    next: usize,
    lines: usize,
}

impl Pager<'_> {
    /// Hands one page over; whether to go on.
    fn send(&mut self, entries: &[Entry]) -> Result<bool, JsValue> {
        self.size = self.next;
        let done = entries.last().map_or(0, |e| e.line);
        let reply = self.on_page.call3(
            &JsValue::NULL,
            &JsValue::from_str(&json_text(entries)?),
            &JsValue::from(done as f64),
            &JsValue::from(self.lines as f64),
        )?;
        Ok(reply.as_bool() != Some(false))
    }
}
