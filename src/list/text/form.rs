//! What a whole draft reads as: a plain list of one code a line, or which
//! forms it takes (markdown, SQL, R, code literals, prose).

use super::codes::codes;
use super::markdown_table::markdown_table_row;
use super::words::item_start;
use crate::list::table::{is_skip, plain_entry};
use crate::list::{code_like, lines_of, LineKind};

/// Whether a line is a markdown bullet, numbered item or table row.
pub(crate) fn is_markdown_item(line: &str) -> bool {
    item_start(line) > line.len() - line.trim_start().len() || markdown_table_row(line)
}

/// Whether a whole text reads as a plain list, one code per line as
/// rollcall has always read it: every line that is not blank or a comment
/// starts with a code-like word (or with a mistyped one), and no line holds
/// a second code or markdown.
pub fn reads_as_lines(text: &str) -> bool {
    lines_of(text).filter(|l| is_skip(l).is_none()).all(|line| {
        if item_start(line) != line.len() - line.trim_start().len() || markdown_table_row(line) {
            return false;
        }
        let first = line.split_whitespace().next().unwrap_or("");
        let lead = line.len() - line.trim_start().len();
        let found = codes(line, lead, false);
        let LineKind::Entry { code, label, .. } = plain_entry(line) else {
            return false;
        };
        let starts_code = code_like(&code) || found.first().is_some_and(|f| f.start == lead);
        if !starts_code {
            // A mistyped code (`E11,9`) still starts with something a code
            // could be; a sentence does not.
            return !found.is_empty() && first.chars().any(|c| c.is_ascii_digit());
        }
        label.is_none_or(|l| codes(&l, 0, false).is_empty())
    })
}

/// The forms a draft takes, for the report's heading: each of SQL, R, code
/// literals and markdown it shows, in that order (`markdown and sql` for an
/// email with bullets and a query), else prose.
pub(super) fn form_of(lines: &[&str]) -> String {
    let has = |f: &dyn Fn(&str) -> bool| lines.iter().any(|l| f(l));
    let lower: Vec<String> = lines.iter().map(|l| l.to_ascii_lowercase()).collect();
    let any_lower = |p: &str| lower.iter().any(|l| l.contains(p));
    let sql = any_lower(" in ('")
        || any_lower(" in (\"")
        || any_lower(" like '")
        || any_lower("select ") && any_lower(" from ");
    let r = any_lower("c(\"") || any_lower("c('") || any_lower("<- c(");
    let literals = !r && has(&|l| l.contains("['") || l.contains("[\"") || l.contains("= ["));
    let markdown = has(&|l| {
        markdown_table_row(l)
            || item_start(l) > l.len() - l.trim_start().len()
            || l.contains("**")
            || l.trim_start().starts_with('#')
            || l.contains('`')
    });
    // Beside a query or script, only bold or a table says markdown: a
    // script's own comments (`#`, `--`) and quotes look like markdown too.
    let code = sql || r || literals;
    let plainly_markdown = has(&|l| markdown_table_row(l) || l.contains("**"));
    let forms: Vec<&str> = [
        (markdown && (!code || plainly_markdown), "markdown"),
        (sql, "sql"),
        (r, "r"),
        (literals, "code literals"),
    ]
    .into_iter()
    .filter_map(|(on, name)| on.then_some(name))
    .collect();
    match forms.as_slice() {
        [] => "prose".into(),
        [one] => (*one).into(),
        [first @ .., last] => format!("{} and {last}", first.join(", ")),
    }
}

#[cfg(test)]
mod tests {
    use crate::list::text::read;
    use crate::list::text::reads_as_lines;

    /// An email with bullets and a warehouse query reads as both.
    #[test]
    fn a_draft_of_several_forms_names_them_all() {
        let r = read(
            "**Heart failure**\n- I50.22 Chronic systolic heart failure\nWHERE dx IN ('I50.20', 'I50.21')\n",
            false,
        );
        assert_eq!(r.facts.form, "markdown and sql");
        let r = read("WHERE dx IN ('I50.20', 'I50.21') -- heart failure\n", false);
        assert_eq!(r.facts.form, "sql");
    }

    #[test]
    fn lists_read_as_lines_stay_lines() {
        assert!(reads_as_lines("E11.9 Type 2 diabetes\nT2DM Type 2 diabetes mellitus\nE11 .65\nE08 - E13 diabetes\n# note\n"));
        assert!(!reads_as_lines("E11.9, E11.65, I10\n"));
        assert!(!reads_as_lines("- E11.9\n"));
        assert!(!reads_as_lines("Here are the codes:\nE11.9\n"));
    }
}
