//! The WebAssembly binding of rollcall for the page.
//!
//! It is deliberately thin: one stateful [`Checker`] built from the bytes of an
//! index file, whose methods take strings or plain JS objects and hand back
//! plain JS objects. The report is the core [`rollcall::Report`] serialised
//! as-is, so the page's JSON download has exactly the CLI's schema.
//!
//! Every core error goes through [`fail`], which turns it into a JS `Error`
//! with a readable message; nothing here panics on bad input.

use rollcall::{CheckOptions, Date, Index, Report};
use serde::{Deserialize, Serialize};
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

#[wasm_bindgen(typescript_custom_section)]
const TS_TYPES: &'static str = r#"
/** What an index says about itself, plus the file's size and SHA-256. */
export interface IndexInfo {
  vocabulary: string;
  title: string;
  release: string;
  coverage_from: string;
  coverage_to: string;
  sources: { file: string; sha256: string; role: string }[];
  byte_length: number;
  sha256: string;
}

/** Options of one check. Give `on`, or `from` and `to`, or neither. */
export interface CheckOptionsInput {
  on?: string | null;
  from?: string | null;
  to?: string | null;
  billable?: boolean;
}

export type Severity = "error" | "warning" | "info";

export interface Suggestion { code: string; description: string; reason: string }

export interface Finding {
  kind: string;
  severity: Severity;
  message: string;
  suggestions: Suggestion[];
}

export interface Entry {
  line: number;
  input: string;
  code: string | null;
  label: string | null;
  description: string | null;
  status: string;
  findings: Finding[];
}

export interface ListFinding {
  kind: string;
  severity: Severity;
  lines: number[];
  codes: string[];
  message: string;
  suggestions: Suggestion[];
}

/** The check report: the same schema as the CLI's `--format json`. */
export interface Report {
  vocabulary: string;
  index: { release: string; coverage_from: string; coverage_to: string; sources: unknown[] };
  options: { on: string | null; from: string; to: string; billable: boolean };
  entries: Entry[];
  list_findings: ListFinding[];
  summary: { lines: number; entries: number; errors: number; warnings: number; infos: number };
}

export interface Span { kind: "billable" | "header"; from: string; to: string }

export interface CategoryCoverage {
  category: string;
  description: string;
  included: number;
  total: number;
}

/** Spans per code; `null` for a code the index does not know. */
export type Timelines = Record<string, Span[] | null>;
"#;

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
}

/// The one error funnel: a JS `Error` whose message is `context: cause`.
fn fail(context: &str, cause: impl std::fmt::Display) -> JsValue {
    js_sys::Error::new(&format!("{context}: {cause}")).into()
}

/// Serialise a value the way `JSON.stringify` would see it (maps as plain
/// objects, 64-bit numbers as numbers), so it round-trips as JSON.
fn to_js<T: Serialize + ?Sized>(value: &T) -> Result<JsValue, JsValue> {
    value
        .serialize(&serde_wasm_bindgen::Serializer::json_compatible())
        .map_err(|e| fail("could not hand the result to the page", e))
}

fn install_panic_hook() {
    static ONCE: std::sync::Once = std::sync::Once::new();
    ONCE.call_once(|| {
        std::panic::set_hook(Box::new(|info| {
            web_sys::console::error_1(&format!("rollcall: internal error: {info}").into());
        }));
    });
}

/// What an index says about itself, plus the size and SHA-256 of its bytes.
/// The same shape is written to `index-manifest.json` at build time.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct IndexInfo {
    pub vocabulary: String,
    pub title: String,
    pub release: String,
    pub coverage_from: String,
    pub coverage_to: String,
    pub sources: Vec<SourceInfo>,
    pub byte_length: u64,
    pub sha256: String,
}

/// One source file an index was built from.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct SourceInfo {
    pub file: String,
    pub sha256: String,
    pub role: String,
}

/// Lower-case hex SHA-256 of `bytes`.
pub fn sha256_hex_of(bytes: &[u8]) -> String {
    let digest = rollcall::sha256::digest(bytes);
    let mut out = String::with_capacity(64);
    for b in digest {
        out.push_str(&format!("{b:02x}"));
    }
    out
}

/// Describe an opened index whose file has the given size and SHA-256.
pub fn describe_index<D: AsRef<[u8]>>(index: &Index<D>, byte_length: u64, sha256: String) -> IndexInfo {
    let meta = index.meta();
    IndexInfo {
        vocabulary: meta.vocabulary.clone(),
        title: meta.title.clone(),
        release: meta.release.clone(),
        coverage_from: meta.coverage_from.to_string(),
        coverage_to: meta.coverage_to.to_string(),
        sources: meta
            .sources
            .iter()
            .map(|s| SourceInfo {
                file: s.file.clone(),
                sha256: s.sha256.clone(),
                role: s.role.clone(),
            })
            .collect(),
        byte_length,
        sha256,
    }
}

/// Check options as the page sends them.
#[derive(Deserialize, Default, Debug)]
#[serde(deny_unknown_fields)]
struct OptionsInput {
    #[serde(default)]
    on: Option<String>,
    #[serde(default)]
    from: Option<String>,
    #[serde(default)]
    to: Option<String>,
    #[serde(default)]
    billable: bool,
}

fn parse_day(what: &str, text: &str) -> Result<Date, String> {
    Date::parse(text.trim()).map_err(|e| format!("{what} \u{201c}{text}\u{201d} is not a date: {e}"))
}

fn blank(value: &Option<String>) -> bool {
    value.as_deref().map_or(true, |s| s.trim().is_empty())
}

/// Turn the page's options into core options, filling what is left out the
/// way the CLI does: no dates at all means the index's last covered day;
/// one end of a period alone runs to the end of what the index covers.
fn resolve_options(input: &OptionsInput, from_default: Date, to_default: Date) -> Result<CheckOptions, String> {
    let has_on = !blank(&input.on);
    let has_from = !blank(&input.from);
    let has_to = !blank(&input.to);
    if has_on && (has_from || has_to) {
        return Err("give either a single date or a study period, not both".into());
    }
    let (from, to) = if has_on {
        let day = parse_day("date", input.on.as_deref().unwrap_or(""))?;
        (day, day)
    } else if has_from || has_to {
        let from = if has_from {
            parse_day("study period start", input.from.as_deref().unwrap_or(""))?
        } else {
            from_default
        };
        let to = if has_to {
            parse_day("study period end", input.to.as_deref().unwrap_or(""))?
        } else {
            to_default
        };
        if from > to {
            return Err(format!("study period starts ({from}) after it ends ({to})"));
        }
        (from, to)
    } else {
        (to_default, to_default)
    };
    Ok(CheckOptions {
        from,
        to,
        billable: input.billable,
    })
}

/// A loaded, verified index and the last check made with it.
#[wasm_bindgen]
pub struct Checker {
    index: Index<Vec<u8>>,
    info: IndexInfo,
    last: Option<(Report, CheckOptions)>,
}

#[wasm_bindgen]
impl Checker {
    /// Open an index from its bytes and verify its internal checksum.
    /// Throws an `Error` saying what is wrong with a missing, truncated,
    /// corrupted or wrong-version file.
    #[wasm_bindgen(constructor)]
    pub fn new(bytes: Vec<u8>) -> Result<Checker, JsValue> {
        install_panic_hook();
        if bytes.is_empty() {
            return Err(fail("cannot open the index", "the file is empty"));
        }
        let sha = sha256_hex_of(&bytes);
        let len = bytes.len() as u64;
        let index = Index::open(bytes).map_err(|e| fail("cannot open the index", e))?;
        index.verify().map_err(|e| fail("the index is damaged", e))?;
        let info = describe_index(&index, len, sha);
        Ok(Checker {
            index,
            info,
            last: None,
        })
    }

    /// The index's release, coverage, sources, byte length and SHA-256.
    pub fn info(&self) -> Result<JsIndexInfo, JsValue> {
        Ok(to_js(&self.info)?.unchecked_into())
    }

    /// Check a list (one entry per line). Returns the report in the CLI's
    /// JSON schema and keeps it for [`Checker::coverage`].
    pub fn check(&mut self, text: &str, options: JsCheckOptions) -> Result<JsReport, JsValue> {
        let options: JsValue = options.into();
        let input: OptionsInput = if options.is_undefined() || options.is_null() {
            OptionsInput::default()
        } else {
            serde_wasm_bindgen::from_value(options).map_err(|e| fail("bad check options", e))?
        };
        let meta = self.index.meta();
        let opts = resolve_options(&input, meta.coverage_from, meta.coverage_to)
            .map_err(|e| fail("bad check options", e))?;
        let report = rollcall::check(&self.index, text, &opts);
        let out = to_js(&report)?;
        self.last = Some((report, opts));
        Ok(out.unchecked_into())
    }

    /// For each category in the last checked list: billable codes included of
    /// all billable codes under it in the checked period.
    pub fn coverage(&self) -> Result<JsCoverage, JsValue> {
        let Some((report, opts)) = &self.last else {
            return Err(fail("no coverage yet", "check a list first"));
        };
        let cov = rollcall::category_coverage(&self.index, report, opts);
        Ok(to_js(&cov)?.unchecked_into())
    }

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
}

/// Lower-case hex SHA-256 of some bytes (to compare a fetched index with its
/// manifest).
#[wasm_bindgen(js_name = sha256Hex)]
pub fn sha256_hex(bytes: &[u8]) -> String {
    sha256_hex_of(bytes)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn day(s: &str) -> Date {
        Date::parse(s).unwrap()
    }

    #[test]
    fn options_resolve_like_the_cli() {
        let (a, b) = (day("2015-10-01"), day("2026-09-30"));
        let none = resolve_options(&OptionsInput::default(), a, b).unwrap();
        assert_eq!((none.from, none.to, none.billable), (b, b, false));

        let on = OptionsInput { on: Some("2020-01-01".into()), ..Default::default() };
        let o = resolve_options(&on, a, b).unwrap();
        assert_eq!((o.from, o.to), (day("2020-01-01"), day("2020-01-01")));

        let period = OptionsInput {
            from: Some("2019-01-01".into()),
            to: Some("2020-12-31".into()),
            billable: true,
            ..Default::default()
        };
        let p = resolve_options(&period, a, b).unwrap();
        assert_eq!((p.from, p.to, p.billable), (day("2019-01-01"), day("2020-12-31"), true));

        let open_end = OptionsInput { from: Some("2019-01-01".into()), ..Default::default() };
        assert_eq!(resolve_options(&open_end, a, b).unwrap().to, b);
    }

    #[test]
    fn bad_options_give_messages() {
        let (a, b) = (day("2015-10-01"), day("2026-09-30"));
        let both = OptionsInput { on: Some("2020-01-01".into()), from: Some("2019-01-01".into()), ..Default::default() };
        assert!(resolve_options(&both, a, b).unwrap_err().contains("not both"));
        let bad = OptionsInput { on: Some("2020-13-01".into()), ..Default::default() };
        assert!(resolve_options(&bad, a, b).unwrap_err().contains("not a date"));
        let backwards = OptionsInput { from: Some("2021-01-01".into()), to: Some("2020-01-01".into()), ..Default::default() };
        assert!(resolve_options(&backwards, a, b).unwrap_err().contains("after it ends"));
    }

    #[test]
    fn sha256_hex_is_lower_case_hex() {
        assert_eq!(
            sha256_hex_of(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
    }
}
