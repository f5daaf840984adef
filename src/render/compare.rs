//! Text and CSV forms of a comparison (JSON is its serde form).

use super::{counts, csv_cell, line_label, when, write_findings};
use crate::compare::{Comparison, Difference, Side};
use std::fmt::Write;

/// The most codes named in one run of the text form.
const RUN_CODES_SHOWN: usize = 6;

fn percent(x: f64) -> String {
    format!("{:.1}%", x * 100.0)
}

fn side_word(side: Side) -> &'static str {
    match side {
        Side::A => "A",
        Side::B => "B",
    }
}

/// A comparison for a terminal: the two lists, agreement figures, a tally
/// per chapter, the differences as runs, entries written differently that
/// reach the same codes, and the findings of each list's check.
pub fn comparison_text(c: &Comparison) -> String {
    let mut s = String::new();
    let o = &c.options;
    let _ = writeln!(
        s,
        "rollcall: two {} lists compared against release {} (coverage {} to {})",
        c.vocabulary, c.index.release, c.index.coverage_from, c.index.coverage_to
    );
    let _ = writeln!(s, "{}", when(o));
    // A one-release vocabulary (HPO) has terms in use, not billable codes by date.
    let (billable, in_period, by) = if o.single_release {
        ("", "", "BY CATEGORY")
    } else {
        ("billable ", " in the period", "BY CHAPTER")
    };
    for (w, side) in [("A", &c.a), ("B", &c.b)] {
        let _ = writeln!(
            s,
            "  {w}  {}: {} entries reaching {} {billable}code{}; check: {}",
            side.name,
            side.summary.entries,
            side.reaches,
            if side.reaches == 1 { "" } else { "s" },
            counts(&side.summary)
        );
    }

    let g = &c.agreement;
    let _ = writeln!(
        s,
        "\nAGREEMENT ({billable}codes each list reaches{in_period})\n  in both {}, only in A {}, only in B {}; Jaccard index {:.3}\n  B reaches {} of A's codes; A reaches {} of B's",
        g.both,
        g.only_a,
        g.only_b,
        g.jaccard,
        percent(g.a_in_b),
        percent(g.b_in_a)
    );

    if !c.chapters.is_empty() {
        let _ = writeln!(s, "\n{:<59}{:>7}{:>8}{:>8}", by, "both", "only A", "only B");
        for t in &c.chapters {
            let title: String = t.title.chars().take(58).collect();
            let _ = writeln!(
                s,
                "  {:>2} {:<58} {:>7} {:>7} {:>7}",
                t.chapter, title, t.both, t.only_a, t.only_b
            );
        }
    }

    for side in [Side::A, Side::B] {
        let runs: Vec<&Difference> = c.differences.iter().filter(|d| d.side == side).collect();
        if runs.is_empty() {
            continue;
        }
        let codes: usize = runs.iter().map(|d| d.codes.len()).sum();
        let _ = writeln!(
            s,
            "\nONLY IN {} ({} code{} in {} run{})",
            side_word(side),
            codes,
            if codes == 1 { "" } else { "s" },
            runs.len(),
            if runs.len() == 1 { "" } else { "s" }
        );
        let mut k = 0;
        while k < runs.len() {
            // Runs under the same node read as one group.
            let d = runs[k];
            let group = runs[k..]
                .iter()
                .take_while(|r| r.within == d.within)
                .count();
            let indent = match (&d.within, group) {
                (Some(w), 2..) => {
                    let _ = writeln!(
                        s,
                        "  {:<10} {} of its {} {billable}codes: {}",
                        w.code, d.within_only, d.within_total, w.description
                    );
                    "  "
                }
                _ => "",
            };
            for r in &runs[k..k + group] {
                write_run(&mut s, r, indent);
            }
            k += group;
        }
    }

    if !c.equivalents.is_empty() {
        let _ = writeln!(
            s,
            "\nWRITTEN DIFFERENTLY, SAME CODES ({})",
            c.equivalents.len()
        );
        for e in &c.equivalents {
            let _ = writeln!(
                s,
                "  A {} {}  =  B {} {}  ({} {billable}code{})",
                line_label(&e.a_lines),
                short_list(&e.a_entries),
                line_label(&e.b_lines),
                short_list(&e.b_entries),
                e.codes,
                if e.codes == 1 { "" } else { "s" }
            );
        }
    }

    for (w, side) in [("A", &c.a), ("B", &c.b)] {
        let m = &side.summary;
        if m.errors + m.warnings + m.infos == 0 {
            continue;
        }
        let _ = writeln!(s, "\nCHECK OF {w} ({}): {}", side.name, counts(m));
        write_findings(&mut s, &side.report, "  ");
    }

    let _ = writeln!(
        s,
        "\n{}",
        if c.same_codes() {
            format!("The two lists reach the same {billable}codes.")
        } else {
            "The two lists differ.".to_string()
        }
    );
    s.push_str(
        "rollcall helps assemble research code lists; it is not coding or billing advice.\n",
    );
    s
}

fn write_run(s: &mut String, d: &Difference, indent: &str) {
    if d.all_of {
        let names: Vec<&str> = d
            .codes
            .iter()
            .take(RUN_CODES_SHOWN)
            .map(|n| n.code.as_str())
            .collect();
        let more = d.codes.len().saturating_sub(RUN_CODES_SHOWN);
        let _ = writeln!(
            s,
            "{indent}  {:<10} all {} billable code{} under it: {}\n{indent}  {:<10} {}{}",
            d.code,
            d.codes.len(),
            if d.codes.len() == 1 { "" } else { "s" },
            d.description,
            "",
            names.join(", "),
            if more > 0 {
                format!(" and {more} more")
            } else {
                String::new()
            }
        );
    } else {
        let _ = writeln!(s, "{indent}  {:<10} {}", d.code, d.description);
    }
    match &d.nearest {
        Some(n) => {
            let _ = writeln!(
                s,
                "{indent}  {:<10} nearest in {}: {} ({}) {}",
                "",
                side_word(d.missing_from()),
                n.code,
                n.relation.name(),
                n.description
            );
        }
        None => {
            let _ = writeln!(
                s,
                "{indent}  {:<10} {} has nothing in category {}",
                "",
                side_word(d.missing_from()),
                d.category
            );
        }
    }
}

fn short_list(items: &[String]) -> String {
    if items.len() <= 4 {
        items.join(", ")
    } else {
        format!("{}, ... ({} entries)", items[..3].join(", "), items.len())
    }
}

/// The differences as CSV, one row per billable code that only one list
/// reaches, with the run it belongs to and the nearest code of the other list.
pub fn comparison_csv(c: &Comparison) -> String {
    let mut s = String::from(
        "only_in,code,description,run,run_description,run_codes,category,chapter,nearest,nearest_relation,nearest_description\n",
    );
    for d in &c.differences {
        let (nc, nr, nd) = match &d.nearest {
            Some(n) => (n.code.as_str(), n.relation.name(), n.description.as_str()),
            None => ("", "", ""),
        };
        for n in &d.codes {
            let _ = writeln!(
                s,
                "{},{},{},{},{},{},{},{},{},{},{}",
                d.side.name(),
                csv_cell(&n.code),
                csv_cell(&n.description),
                csv_cell(&d.code),
                csv_cell(&d.description),
                d.codes.len(),
                csv_cell(&d.category),
                csv_cell(&d.chapter),
                csv_cell(nc),
                nr,
                csv_cell(nd)
            );
        }
    }
    s
}
