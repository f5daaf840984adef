//! The check of a list in a system whose content rollcall does not ship:
//! each entry by the system's shape and check digit alone (see
//! [`crate::systems`]). Such a check cannot say that a code exists or was
//! valid in the period, and every finding says so.

use crate::check::CheckOptions;
use crate::list::{Draft, LineKind};
use crate::report::*;
use crate::systems::{shape, Shape, System};
use std::collections::BTreeMap;

/// Checks every entry of `text` as a code of `system` by shape.
pub fn check_shapes(system: System, text: &str, options: &CheckOptions) -> Report {
    check_shapes_draft(
        system,
        &crate::list::read(text, crate::list::Reading::Auto),
        options,
    )
}

/// [`check_shapes`] of a list already read.
pub fn check_shapes_draft(system: System, draft: &Draft, options: &CheckOptions) -> Report {
    let period = options.period();
    let lines = &draft.lines;
    let title = system.title();
    let mut entries = Vec::with_capacity(lines.len());
    let mut seen: BTreeMap<String, Vec<usize>> = BTreeMap::new();
    for l in lines {
        let mut e = Entry {
            label: None,
            ..Entry::of(l)
        };
        match &l.kind {
            LineKind::Blank => e.status = Status::Blank,
            LineKind::Comment => e.status = Status::Comment,
            LineKind::Headings => e.status = Status::ColumnHeadings,
            LineKind::Text => e.status = Status::Text,
            LineKind::Unreadable(m) => e.findings.push(Finding::new(
                Kind::Malformed,
                Severity::Error,
                m.clone(),
                vec![],
            )),
            LineKind::Entry { code, label, .. } => {
                e.label = label.clone();
                let written = code.trim();
                match shape(system, written) {
                    Shape::Fits { code, note } => {
                        e.status = Status::ShapeOnly;
                        e.system = Some(system.name().to_string());
                        e.findings.push(Finding::new(
                            Kind::ShapeOnly,
                            Severity::Info,
                            format!(
                                "{code} {note}; rollcall has no {title} content, so it cannot say whether {code} exists or was valid in the period"
                            ),
                            vec![],
                        ));
                        if code != written.to_ascii_uppercase() {
                            e.findings.push(Finding::new(
                                Kind::Normalized,
                                Severity::Info,
                                format!("\"{written}\" read as {code}"),
                                vec![Suggestion {
                                    code: code.clone(),
                                    description: String::new(),
                                    reason: format!("the usual {title} form"),
                                }],
                            ));
                        }
                        seen.entry(code.clone()).or_default().push(l.number);
                        e.code = Some(code);
                    }
                    Shape::Ambiguous { reason, readings } => {
                        e.status = Status::Ambiguous;
                        e.system = Some(system.name().to_string());
                        e.code = Some(written.to_string());
                        e.findings.push(Finding::new(
                            Kind::Ambiguous,
                            Severity::Warning,
                            reason,
                            readings
                                .into_iter()
                                .map(|r| Suggestion {
                                    code: r,
                                    description: String::new(),
                                    reason: "one possible reading".into(),
                                })
                                .collect(),
                        ));
                    }
                    Shape::Fails { reason } => {
                        e.code = Some(written.to_string());
                        e.findings.push(Finding::new(
                            Kind::Malformed,
                            Severity::Error,
                            format!("\"{written}\" is not a {title} code: {reason}"),
                            vec![],
                        ));
                    }
                }
            }
        }
        entries.push(e);
    }
    let list_findings: Vec<ListFinding> = seen
        .into_iter()
        .filter(|(_, l)| l.len() > 1)
        .map(|(code, l)| ListFinding {
            coverage_to: None,
            kind: Kind::Duplicate,
            severity: Severity::Warning,
            message: format!(
                "{code} is on lines {}; keep one of them",
                l.iter()
                    .map(|n| n.to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            lines: l,
            codes: vec![code],
            suggestions: vec![],
        })
        .collect();
    let summary = Summary::of(draft.line_count(), &entries, &list_findings);
    Report {
        vocabulary: system.name().to_string(),
        reading: draft.facts.clone(),
        index: IndexInfo {
            release: "none: shape and check-digit rules only".into(),
            coverage_from: period.from,
            coverage_to: period.to,
            sources: vec![],
            notice: String::new(),
        },
        options: OptionsInfo::of(&period, options.billable),
        entries,
        list_findings,
        summary,
    }
}
