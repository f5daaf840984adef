//! Text and CSV forms of a report (JSON is the report's serde form), of
//! a comparison (`compare`), a translation and code cards (`show`).

pub mod card;
mod compare;
mod stream;
mod translate;
pub use card::cards_text;
pub use compare::{comparison_csv, comparison_text};
pub use stream::{csv_to, json_to, text_to};
pub use translate::{translation_csv, translation_text};

use crate::report::{Entry, ListFinding, Report, Severity, Suggestion};
use std::fmt::Write;

/// The finding rows of a report's text form, gathered entry by entry and
/// written in order of severity, then line (a finding on the whole list
/// after the entries' findings of its first line).
pub(crate) struct FindingRows {
    indent: &'static str,
    /// Each row as written, one after the other.
    text: String,
    /// Per row: its severity, first line, and where it ends in `text`.
    rows: Vec<(Severity, usize, usize)>,
}

impl FindingRows {
    pub(crate) fn new(indent: &'static str) -> Self {
        FindingRows {
            indent,
            text: String::new(),
            rows: Vec::new(),
        }
    }

    /// The rows of one entry's findings.
    pub(crate) fn entry(&mut self, e: &Entry) {
        for f in &e.findings {
            let code = e.code.as_deref().unwrap_or_else(|| first_cell(&e.input));
            self.row(
                &[e.line],
                code,
                f.kind.name(),
                f.severity,
                &f.message,
                &f.suggestions,
            );
        }
    }

    /// The row of a finding on the whole list.
    pub(crate) fn list(&mut self, f: &ListFinding) {
        self.row(
            &f.lines,
            "",
            f.kind.name(),
            f.severity,
            &f.message,
            &f.suggestions,
        );
    }

    fn row(
        &mut self,
        lines: &[usize],
        code: &str,
        kind: &str,
        severity: Severity,
        message: &str,
        suggestions: &[Suggestion],
    ) {
        let (s, indent) = (&mut self.text, self.indent);
        let head = line_label(lines);
        let _ = writeln!(
            s,
            "{indent}  {head:<10} {:<14} {kind}: {message}",
            if code.is_empty() { "-" } else { code },
        );
        for g in suggestions.iter().take(8) {
            let _ = writeln!(
                s,
                "{indent}  {:<10}   -> {:<12} {}  ({})",
                "", g.code, g.description, g.reason
            );
        }
        if suggestions.len() > 8 {
            let _ = writeln!(
                s,
                "{indent}  {:<10}   -> and {} more",
                "",
                suggestions.len() - 8
            );
        }
        let first = lines.first().copied().unwrap_or(0);
        self.rows.push((severity, first, s.len()));
    }

    /// The rows grouped by severity, each group under its heading, handed
    /// to `put` piece by piece.
    pub(crate) fn write_with<E>(self, put: &mut dyn FnMut(&str) -> Result<(), E>) -> Result<(), E> {
        let mut order: Vec<(Severity, usize, usize, usize)> = Vec::with_capacity(self.rows.len());
        let mut start = 0;
        for &(severity, first, end) in &self.rows {
            order.push((severity, first, start, end));
            start = end;
        }
        // Stable: rows of one severity and first line keep their order.
        order.sort_by_key(|&(severity, first, ..)| (severity, first));
        let indent = self.indent;
        for sev in [Severity::Error, Severity::Warning, Severity::Info] {
            let group = order.iter().filter(|r| r.0 == sev);
            let n = group.clone().count();
            if n == 0 {
                continue;
            }
            let name = match sev {
                Severity::Error => "ERRORS",
                Severity::Warning => "WARNINGS",
                Severity::Info => "NOTES",
            };
            put(&format!("\n{indent}{name} ({n})\n"))?;
            for &(.., from, to) in group {
                put(&self.text[from..to])?;
            }
        }
        Ok(())
    }

    /// [`FindingRows::write_with`] onto `s`.
    pub(crate) fn write(self, s: &mut String) {
        let _ = self.write_with(&mut |t| -> Result<(), ()> {
            s.push_str(t);
            Ok(())
        });
    }
}

/// The first cell of a line, for naming an entry that has no code.
fn first_cell(input: &str) -> &str {
    let t = input.trim();
    let end = t.find(['\t', ',', ' ']).unwrap_or(t.len());
    &t[..end]
}

fn line_label(lines: &[usize]) -> String {
    match lines {
        [] => "list".into(),
        [one] => format!("line {one}"),
        many if many.len() <= 4 => format!(
            "lines {}",
            many.iter()
                .map(|l| l.to_string())
                .collect::<Vec<_>>()
                .join(", ")
        ),
        many => format!(
            "lines {}-{} ({} lines)",
            many[0],
            many[many.len() - 1],
            many.len()
        ),
    }
}

/// A report for a terminal: a heading, findings grouped by severity with
/// line numbers and suggestions, and a summary line.
pub fn text(report: &Report) -> String {
    let mut s = text_heading(report);
    write_findings(&mut s, report, "");
    text_closing(&mut s, report);
    s
}

/// The lines of [`text`] before the findings (of a report's heading, see
/// [`crate::check::Run::heading`]).
pub(crate) fn text_heading(report: &Report) -> String {
    let mut s = String::new();
    let o = &report.options;
    if report.index.sources.is_empty() {
        let _ = writeln!(
            s,
            "rollcall: {} list checked by shape and check digit only (rollcall has no content of this system)",
            report.vocabulary
        );
    } else {
        let _ = writeln!(
            s,
            "rollcall: {} list checked against release {} (coverage {} to {})",
            report.vocabulary,
            report.index.release,
            report.index.coverage_from,
            report.index.coverage_to
        );
    }
    let _ = writeln!(s, "{}", when(o));
    if let Some(r) = reading(&report.reading) {
        let _ = writeln!(s, "{r}");
    }
    if !report.index.notice.is_empty() {
        let _ = writeln!(s, "{}", report.index.notice);
    }
    s
}

/// The lines of [`text`] after the findings: the counts.
pub(crate) fn text_closing(s: &mut String, report: &Report) {
    let m = &report.summary;
    if !m.by_system.is_empty() {
        let _ = writeln!(s, "\nBY SYSTEM (the system each entry was checked in)");
        for p in &m.by_system {
            let how = match (p.checked.as_str(), &p.release) {
                ("index", Some(r)) => format!("against release {r}"),
                ("not-loaded", _) => "by shape only (its index was not loaded)".into(),
                _ => "by shape and check digit only".into(),
            };
            let part = crate::report::Summary {
                errors: p.errors,
                warnings: p.warnings,
                infos: p.infos,
                ..Default::default()
            };
            let _ = writeln!(
                s,
                "  {:<24} {} entr{}, {how}: {}",
                format!("{} ({})", p.title, p.system),
                p.entries,
                if p.entries == 1 { "y" } else { "ies" },
                counts(&part)
            );
            if !p.notice.is_empty() && p.notice != report.index.notice {
                let _ = writeln!(s, "  {:<24} {}", "", p.notice);
            }
        }
    }
    let _ = writeln!(
        s,
        "\n{} lines, {} entries: {}",
        m.lines,
        m.entries,
        counts(m)
    );
    s.push_str(
        "rollcall helps assemble research code lists; it is not coding or billing advice.\n",
    );
}

/// `on 2026-01-01` or `study period 2019-01-01 to 2024-12-31`, and whether
/// billable codes were required: the second line of every text output.
pub(crate) fn when(o: &crate::report::OptionsInfo) -> String {
    format!(
        "{}{}",
        match o.on {
            Some(d) if o.single_release => {
                format!("as of its one release ({d}); study dates do not apply to it")
            }
            Some(d) => format!("on {d}"),
            None => format!("study period {} to {}", o.from, o.to),
        },
        if o.billable {
            ", billable codes required"
        } else {
            ""
        }
    )
}

/// `2 errors, 1 warning, 0 notes`.
pub(crate) fn counts(m: &crate::report::Summary) -> String {
    let plural = |n: usize, one: &str| format!("{n} {one}{}", if n == 1 { "" } else { "s" });
    format!(
        "{}, {}, {}",
        plural(m.errors, "error"),
        plural(m.warnings, "warning"),
        plural(m.infos, "note")
    )
}

/// The findings of a report grouped by severity, each line after `indent`.
fn plural(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// How a list was read, as the report's heading says it; none for a list
/// read as plain lines or a table without being told to.
pub fn reading(f: &crate::list::ReadFacts) -> Option<String> {
    if f.as_before() {
        return None;
    }
    let unit = if f.reading == crate::list::Reading::Workbook {
        ("row", "rows")
    } else {
        ("line", "lines")
    };
    let mut s = format!(
        "read as {}{}: {} on {} of {}",
        f.form,
        if f.forced { " (as asked)" } else { "" },
        plural(f.codes, "code", "codes"),
        f.lines_with_codes,
        plural(f.lines, unit.0, unit.1)
    );
    if !f.sheets.is_empty() {
        let sheets: Vec<String> = f
            .sheets
            .iter()
            .map(|x| {
                if x.codes == 0 {
                    format!("\u{201c}{}\u{201d} (no codes)", x.name)
                } else {
                    format!(
                        "\u{201c}{}\u{201d} ({})",
                        x.name,
                        plural(x.codes, "code", "codes")
                    )
                }
            })
            .collect();
        s.push_str(&format!("; sheets {}", sheets.join(", ")));
    }
    for n in &f.notes {
        s.push_str(&format!("\n  note: {n}"));
    }
    Some(s)
}

pub(crate) fn write_findings(s: &mut String, report: &Report, indent: &'static str) {
    let mut rows = FindingRows::new(indent);
    report.entries.iter().for_each(|e| rows.entry(e));
    report.list_findings.iter().for_each(|f| rows.list(f));
    rows.write(s);
}

/// One CSV cell, quoted when needed; a cell that a spreadsheet would read
/// as a formula (`=`, `+`, `-`, `@`) gets a leading apostrophe.
pub fn csv_cell(v: &str) -> String {
    let v = if v.starts_with(['=', '+', '-', '@', '\t', '\r']) {
        format!("'{v}")
    } else {
        v.to_string()
    };
    if v.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", v.replace('"', "\"\""))
    } else {
        v
    }
}

/// A report as CSV: one row per finding, plus one row for each line
/// without findings, so every input line appears.
pub fn csv(report: &Report) -> String {
    let mut s = String::from(CSV_HEADINGS);
    report.entries.iter().for_each(|e| csv_entry(&mut s, e));
    report
        .list_findings
        .iter()
        .for_each(|f| csv_list_finding(&mut s, f));
    s
}

/// The first row of [`csv`].
pub(crate) const CSV_HEADINGS: &str = "lines,input,code,status,kind,severity,message,suggestions\n";

fn csv_suggestions(g: &[Suggestion]) -> String {
    g.iter()
        .map(|x| format!("{} {}", x.code, x.description))
        .collect::<Vec<_>>()
        .join("; ")
}

/// The rows of [`csv`] of one entry.
pub(crate) fn csv_entry(s: &mut String, e: &Entry) {
    let status = e.status.name();
    let code = e.code.as_deref().unwrap_or("");
    if e.findings.is_empty() {
        let _ = writeln!(
            s,
            "{},{},{},{},,,,",
            e.line,
            csv_cell(&e.input),
            csv_cell(code),
            status
        );
    }
    for f in &e.findings {
        let _ = writeln!(
            s,
            "{},{},{},{},{},{},{},{}",
            e.line,
            csv_cell(&e.input),
            csv_cell(code),
            status,
            f.kind.name(),
            f.severity.name(),
            csv_cell(&f.message),
            csv_cell(&csv_suggestions(&f.suggestions))
        );
    }
}

/// The row of [`csv`] of a finding on the whole list.
pub(crate) fn csv_list_finding(s: &mut String, f: &ListFinding) {
    let lines: Vec<String> = f.lines.iter().map(|l| l.to_string()).collect();
    let _ = writeln!(
        s,
        "{},,{},,{},{},{},{}",
        csv_cell(&lines.join(" ")),
        csv_cell(&f.codes.join(" ")),
        f.kind.name(),
        f.severity.name(),
        csv_cell(&f.message),
        csv_cell(&csv_suggestions(&f.suggestions))
    );
}

#[cfg(test)]
mod tests {
    #[test]
    fn csv_cells_are_quoted_and_neutralised() {
        assert_eq!(super::csv_cell("=1+2"), "'=1+2");
        assert_eq!(super::csv_cell("a,b"), "\"a,b\"");
        assert_eq!(super::csv_cell("say \"x\""), "\"say \"\"x\"\"\"");
        assert_eq!(super::csv_cell("-E11"), "'-E11");
    }
}
