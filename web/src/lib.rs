//! The WebAssembly binding of rollcall for the page.
//!
//! It is deliberately thin: one stateful [`Checker`] built from the bytes of an
//! index file, whose methods take strings or plain JS objects and hand back
//! plain JS objects. The report is the core [`rollcall::Report`] serialised
//! as-is, so the page's JSON download has exactly the CLI's schema.
//!
//! Every core error goes through one funnel (`js::fail`), which turns it
//! into a JS `Error` with a readable message; nothing here panics on bad input.
//!
//! - `checker`: the [`Checker`], its index, companions and notes, and the checks;
//! - `cards`: spans, code cards and codes for words;
//! - `exports`: the exports of a checked list;
//! - `draft`: where the reader finds each code, and edits to a list;
//! - `options`: the page's check options read into the core's;
//! - `paged`: a check handed over a page of entries at a time;
//! - `decode`: a dropped file's bytes, and SHA-256;
//! - `systems`: the core's policy on bundled systems and companions;
//! - [`manifest`]: the manifest of an index or notes file; [`site`]: a site's own indexes;
//! - `js`: the TypeScript names, the error funnel and the serialisers.

mod cards;
mod checker;
mod decode;
mod draft;
mod exports;
mod js;
pub mod manifest;
mod options;
mod paged;
pub mod site;
mod systems;

pub use checker::{index_content_start, Checker};
pub use decode::{decode_file, is_workbook, sha256_hex};
pub use draft::read_draft;
pub use js::{
    JsBundledSystems, JsCard, JsCheckOptions, JsCodes, JsCoverage, JsEdits, JsIndexInfo, JsReport,
    JsTimeline, JsTimelines,
};
pub use manifest::{
    describe_index, describe_notes, sha256_hex_of, IndexInfo, NotesInfo, SourceInfo,
};
pub use systems::{bundled_systems, companion_of, companion_replaces, index_manifest, packed_file};
