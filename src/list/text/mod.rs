//! Drafts read a line at a time: markdown (bullets, numbered items, bold and
//! backticks, tables, headings), prose with codes in sentences, and code
//! literals (SQL `IN (...)` and `LIKE`, R `c(...)`, Python and JavaScript
//! lists). Every code on a line is an entry of its own; the label of each is
//! the text that goes with it (in parentheses after it, after a dash or a
//! colon, or before it when it stands in parentheses).

mod codes;
mod form;
mod labels;
mod markdown_table;
mod words;

pub(crate) use codes::has_strong_code;
pub(crate) use form::is_markdown_item;
pub use form::reads_as_lines;

use super::tokens::system_by_shape;
use super::{lines_of, Draft, InputLine, LineKind, Place, Reading};
use codes::{codes, codes_in, Found};
use form::form_of;
use labels::{labels, system_named};
use markdown_table::{markdown_table_row, read_table};
use words::item_start;

/// Reads a draft (see the module docs).
pub fn read(text: &str, forced: bool) -> Draft {
    let lines: Vec<&str> = lines_of(text).collect();
    let code_draft = lines
        .iter()
        .any(|l| !codes(l, item_start(l), false).is_empty());
    let form = form_of(&lines);
    let prose = form == "prose";
    let mut out: Vec<InputLine> = Vec::with_capacity(lines.len());
    let mut context: Option<crate::systems::System> = None;
    let mut i = 0;
    while i < lines.len() {
        let line = lines[i];
        // A markdown table: a block of rows starting with `|`.
        if markdown_table_row(line) {
            let mut j = i;
            while j < lines.len() && markdown_table_row(lines[j]) {
                j += 1;
            }
            read_table(&lines, i, j, context, &mut out);
            i = j;
            continue;
        }
        read_line_in(line, i + 1, &mut context, code_draft, prose, &mut out);
        i += 1;
    }
    Draft::finish(out, Reading::Text, &form, forced, lines.len())
}

/// The system a heading named, for a code whose shape fits it (a closing
/// sentence about diagnoses under a procedures heading keeps its own).
fn in_context(context: Option<crate::systems::System>, code: &str) -> Option<String> {
    let s = context?;
    crate::systems::shape(s, code)
        .fits()
        .then(|| s.title().to_string())
}

fn entry(
    number: usize,
    line: &str,
    f: &Found,
    label: Option<String>,
    system: Option<String>,
) -> InputLine {
    let system = system.or_else(|| system_by_shape(&f.code).map(|s| s.title().to_string()));
    InputLine {
        number,
        text: line.to_string(),
        kind: LineKind::Entry {
            code: f.code.clone(),
            label,
            system,
        },
        place: Place {
            span: Some((f.start, f.end)),
            ..Place::default()
        },
    }
}

/// Reads one line of a draft into `out`: its codes, or one line of text.
pub(crate) fn read_line(
    line: &str,
    number: usize,
    context: &mut Option<crate::systems::System>,
    out: &mut Vec<InputLine>,
) {
    read_line_in(line, number, context, false, false, out)
}

fn read_line_in(
    line: &str,
    number: usize,
    context: &mut Option<crate::systems::System>,
    code_draft: bool,
    prose: bool,
    out: &mut Vec<InputLine>,
) {
    let t = line.trim();
    if t.is_empty() {
        out.push(InputLine::new(number, line, LineKind::Blank));
        return;
    }
    if t.starts_with("//") || t.starts_with("--") || t.starts_with("/*") {
        out.push(InputLine::new(number, line, LineKind::Comment));
        return;
    }
    let heading = t.starts_with('#');
    let from = item_start(line);
    let found = codes_in(line, from, false, code_draft);
    if found.is_empty() {
        if let Some(s) = system_named(line) {
            *context = Some(s);
        } else if heading {
            *context = None;
        }
        out.push(InputLine::new(number, line, LineKind::Text));
        return;
    }
    for (f, label) in found.iter().zip(labels(line, from, &found, prose)) {
        out.push(entry(number, line, f, label, in_context(*context, &f.code)));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    pub(super) fn got(text: &str) -> Vec<(usize, String, Option<String>)> {
        read(text, false)
            .lines
            .into_iter()
            .filter_map(|l| match l.kind {
                LineKind::Entry { code, label, .. } => Some((l.number, code, label)),
                _ => None,
            })
            .collect()
    }

    pub(super) fn e(n: usize, c: &str, l: Option<&str>) -> (usize, String, Option<String>) {
        (n, c.to_string(), l.map(str::to_string))
    }

    #[test]
    fn a_heading_names_the_system_of_what_follows() {
        let r = read(
            "## Procedures (ICD-10-PCS)\n- 0DTJ4ZZ Resection of appendix\n## Diagnoses\n- K35.80\n",
            false,
        );
        let systems: Vec<Option<String>> = r
            .lines
            .iter()
            .filter_map(|l| match &l.kind {
                LineKind::Entry { system, .. } => Some(system.clone()),
                _ => None,
            })
            .collect();
        assert_eq!(systems, [Some("ICD-10-PCS".to_string()), None]);
    }

    #[test]
    fn spans_point_at_the_code() {
        let r = read("- **E11.9** – diabetes\n", false);
        let l = &r.lines[0];
        let (s, e) = l.place.span.unwrap();
        assert_eq!(&l.text[s..e], "E11.9");
        assert_eq!(l.column(), Some(5));
    }
}
