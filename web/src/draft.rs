//! A list as the reader sees it, for the page's text area: where each code
//! sits (in UTF-16 units, as a textarea counts), and the list with edits
//! applied by the core ([`rollcall::list::edit`]).

use crate::checker::Checker;
use crate::js::{fail, json_text, JsEdits};
use crate::options::reading_named;
use rollcall::list::edit::{self, Edit};
use wasm_bindgen::prelude::*;

#[wasm_bindgen]
impl Checker {
    /// The list with some edits applied (replace a line's code, remove a
    /// line, add a line), every other character kept. Used to apply suggestions.
    #[wasm_bindgen(js_name = editList)]
    pub fn edit_list(
        &self,
        text: &str,
        edits: JsEdits,
        reading: Option<String>,
    ) -> Result<String, JsValue> {
        let edits: Vec<Edit> =
            serde_wasm_bindgen::from_value(edits.into()).map_err(|e| fail("bad edits", e))?;
        let reading = reading_named(reading, "bad edits")?;
        edit::apply(text, &edits, reading).map_err(|e| fail("cannot apply the change", e))
    }
}

/// The codes the reader finds in a list, for marking them in the page's
/// text area: JSON text `{ reading, tokens: [{ line, column, start, end, code }] }`
/// (`column` as the report's entries have it, when the code sits in a longer line),
/// with `start` and `end` in UTF-16 units from the start of the text (as a
/// textarea's selection counts); codes read whole from a line of a plain
/// list or a table cover the code as written.
#[wasm_bindgen(js_name = readDraft)]
pub fn read_draft(text: &str, reading: Option<String>) -> Result<String, JsValue> {
    let reading = reading_named(reading, "bad reading")?;
    let draft = rollcall::list::read(text, reading);
    json_text(&serde_json::json!({
        "reading": draft.facts,
        "tokens": tokens_of(text, &draft),
    }))
}

/// UTF-16 start of each line of `text` (lines split as the reader splits them).
fn line_starts16(text: &str) -> Vec<usize> {
    let mut starts = vec![0];
    let mut units = 0;
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        units += c.len_utf16();
        if c == '\r' && chars.peek() == Some(&'\n') {
            chars.next();
            units += 1;
            starts.push(units);
        } else if c == '\n' || c == '\r' {
            starts.push(units);
        }
    }
    starts
}

fn tokens_of(text: &str, draft: &rollcall::list::Draft) -> Vec<serde_json::Value> {
    use rollcall::list::LineKind;
    let bom = usize::from(text.starts_with('\u{feff}'));
    let starts = line_starts16(text);
    draft
        .lines
        .iter()
        .filter_map(|l| {
            let LineKind::Entry { code, .. } = &l.kind else {
                return None;
            };
            let base = *starts.get(l.number - 1)? + if l.number == 1 { bom } else { 0 };
            let (a, b) = match l.place.span {
                Some(span) => span,
                None => {
                    let at = l.text.find(code.as_str())?;
                    (at, at + code.len())
                }
            };
            let u16_at = |i: usize| l.text.get(..i).map(|t| t.encode_utf16().count());
            Some(serde_json::json!({
                "line": l.number,
                "column": l.column(),
                "start": base + u16_at(a)?,
                "end": base + u16_at(b)?,
                "code": code,
            }))
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use rollcall::list::Reading;

    #[test]
    fn tokens_are_in_utf16_offsets() {
        let text = "é E11.9\n- I10 €\n";
        let v: serde_json::Value = serde_json::from_str(&serde_json::to_string(&serde_json::json!({"t": tokens_of(text, &rollcall::list::read(text, Reading::Auto))})).unwrap()).unwrap();
        let t = &v["t"];
        assert_eq!(t[0]["start"], 2);
        assert_eq!(t[0]["end"], 7);
        assert_eq!(t[1]["start"], 10);
        assert_eq!(t[1]["code"], "I10");
    }
}
