//! Text and CSV forms of a translation (JSON is its serde form).

use super::csv_cell;
use crate::translate::{Outcome, Translation};
use std::fmt::Write;

/// A translation for a terminal: each entry with its outcome and targets.
pub fn translation_text(t: &Translation) -> String {
    let mut s = String::new();
    let o = &t.options;
    let _ = writeln!(
        s,
        "rollcall: {} list translated to {} with the {}\ntargets judged {}",
        t.from,
        t.to,
        t.mapping,
        match o.on {
            Some(d) => format!("on {d}"),
            None => format!("over the study period {} to {}", o.from, o.to),
        }
    );
    for e in t.entries.iter().filter(|e| e.outcome != Outcome::Skipped) {
        let _ = writeln!(
            s,
            "\nline {:<5} {:<10} {}\n            {}",
            e.line,
            e.code.as_deref().unwrap_or("-"),
            e.description.as_deref().unwrap_or(""),
            e.note
        );
        for x in &e.targets {
            let _ = writeln!(
                s,
                "            -> {:<10} {}  ({}{}{})",
                x.code,
                x.description,
                crate::translate::row_words(&x.flags),
                if x.status == "valid" { "" } else { "; " },
                if x.status == "valid" {
                    String::new()
                } else {
                    format!("{}: {}", x.status, x.note)
                }
            );
        }
    }
    let m = &t.summary;
    let _ = writeln!(
        s,
        "\n{} entr{}: {}; {} distinct target{}, {} of them not billable throughout the period",
        m.entries,
        if m.entries == 1 { "y" } else { "ies" },
        m.outcomes
            .iter()
            .map(|(k, v)| format!("{v} {k}"))
            .collect::<Vec<_>>()
            .join(", "),
        m.targets,
        if m.targets == 1 { "" } else { "s" },
        m.targets_not_valid
    );
    s.push_str("A mapping is a starting point, not an answer: review approximate and combination entries.\n");
    s.push_str(
        "rollcall helps assemble research code lists; it is not coding or billing advice.\n",
    );
    s
}

/// One row per source-target pair (and one per entry without targets).
pub fn translation_csv(t: &Translation) -> String {
    let mut s = String::from(
        "line,source,source_description,outcome,target,target_description,approximate,combination,scenario,choice_list,target_status,target_note\n",
    );
    for e in t.entries.iter().filter(|e| e.outcome != Outcome::Skipped) {
        let head = format!(
            "{},{},{},{}",
            e.line,
            csv_cell(e.code.as_deref().unwrap_or("")),
            csv_cell(e.description.as_deref().unwrap_or("")),
            e.outcome.name()
        );
        if e.targets.is_empty() {
            let _ = writeln!(s, "{head},,,,,,,,");
        }
        for x in &e.targets {
            let _ = writeln!(
                s,
                "{head},{},{},{},{},{},{},{},{}",
                csv_cell(&x.code),
                csv_cell(&x.description),
                x.flags.approximate as u8,
                x.flags.combination as u8,
                x.flags.scenario,
                x.flags.choice_list,
                x.status,
                csv_cell(&x.note)
            );
        }
    }
    s
}
