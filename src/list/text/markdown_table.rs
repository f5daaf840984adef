//! Markdown tables: a block of `|` rows, read by their code, description
//! and system columns.

use super::codes::codes;
use super::labels::clean_label;
use super::{entry, in_context, read_line};
use crate::list::table::{heading_word, LABEL_WORDS, SYSTEM_WORDS};
use crate::list::{InputLine, LineKind};

pub(super) fn markdown_table_row(line: &str) -> bool {
    let t = line.trim();
    t.starts_with('|') && t.matches('|').count() >= 2
}

fn separator_row(line: &str) -> bool {
    let t = line.trim();
    t.contains('-') && t.chars().all(|c| matches!(c, '|' | '-' | ':' | ' ' | '\t'))
}

/// The cells of a markdown table row, with their byte ranges.
fn cells(line: &str) -> Vec<(usize, usize)> {
    let mut out = Vec::new();
    let t_start = line.len() - line.trim_start().len();
    let t_end = line.trim_end().len();
    let inner_s = t_start + 1;
    let inner_e = if line[..t_end].ends_with('|') && t_end > inner_s {
        t_end - 1
    } else {
        t_end
    };
    let mut s = inner_s;
    for (i, c) in line[inner_s..inner_e].char_indices() {
        if c == '|' && !line[..inner_s + i].ends_with('\\') {
            out.push((s, inner_s + i));
            s = inner_s + i + 1;
        }
    }
    out.push((s, inner_e.max(s)));
    out
}

/// A markdown table's columns.
struct TableColumns {
    code: Option<usize>,
    label: Option<usize>,
    system: Option<usize>,
}

fn table_columns(lines: &[&str], head: usize, body: &[usize]) -> TableColumns {
    let hc = cells(lines[head]);
    let name = |i: usize| -> Option<String> {
        let (s, e) = hc[i];
        heading_word(lines[head][s..e].trim().trim_matches(['*', '_', '`']))
    };
    let system =
        (0..hc.len()).find(|&i| name(i).is_some_and(|w| SYSTEM_WORDS.contains(&w.as_str())));
    let count = |i: usize| {
        body.iter()
            .filter(|&&r| {
                let c = cells(lines[r]);
                c.get(i).is_some_and(|&(s, e)| {
                    !codes(&lines[r][..e], s, true).is_empty() && {
                        let cell = lines[r][s..e].trim();
                        cell.split_whitespace().count() <= 6
                    }
                })
            })
            .count()
    };
    let named = (0..hc.len()).find(|&i| {
        Some(i) != system
            && name(i)
                .is_some_and(|w| !LABEL_WORDS.iter().any(|l| w.starts_with(l)) && w != "category")
            && count(i) > 0
    });
    let code = named.or_else(|| {
        (0..hc.len())
            .filter(|&i| Some(i) != system)
            .max_by_key(|&i| (count(i), usize::MAX - i))
            .filter(|&i| count(i) > 0)
    });
    let label = (0..hc.len())
        .find(|&i| {
            Some(i) != code
                && Some(i) != system
                && name(i).is_some_and(|w| LABEL_WORDS.iter().any(|l| w.starts_with(l)))
        })
        .or_else(|| {
            (0..hc.len())
                .filter(|&i| Some(i) != code && Some(i) != system)
                .max_by_key(|&i| {
                    body.iter()
                        .map(|&r| {
                            cells(lines[r]).get(i).map_or(0, |&(s, e)| {
                                lines[r][s..e].chars().filter(|c| c.is_alphabetic()).count()
                            })
                        })
                        .sum::<usize>()
                })
        });
    TableColumns {
        code,
        label,
        system,
    }
}

/// Reads the rows `start..end` of a markdown table.
pub(super) fn read_table(
    lines: &[&str],
    start: usize,
    end: usize,
    context: Option<crate::systems::System>,
    out: &mut Vec<InputLine>,
) {
    let rows: Vec<usize> = (start..end).collect();
    // The heading row: the first, when the second is the `|---|` row.
    let has_head = end - start >= 2 && separator_row(lines[start + 1]);
    let body: Vec<usize> = rows
        .iter()
        .copied()
        .filter(|&r| !(separator_row(lines[r]) || has_head && r == start))
        .collect();
    let cols = has_head.then(|| table_columns(lines, start, &body));
    let mut ctx = context;
    for r in rows {
        let line = lines[r];
        let number = r + 1;
        if has_head && r == start {
            out.push(InputLine::new(number, line, LineKind::Headings));
            continue;
        }
        if separator_row(line) {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        }
        let cs = cells(line);
        let Some(TableColumns {
            code: Some(code),
            label,
            system,
        }) = cols.as_ref().map(|c| TableColumns {
            code: c.code,
            label: c.label,
            system: c.system,
        })
        else {
            read_line(line, number, &mut ctx, out);
            continue;
        };
        let Some(&(s, e)) = cs.get(code) else {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        };
        let found = codes(&line[..e], s, true);
        if found.is_empty() {
            out.push(InputLine::new(number, line, LineKind::Text));
            continue;
        }
        let label = label
            .and_then(|l| cs.get(l))
            .and_then(|&(s, e)| clean_label(&line[s..e]));
        let sys = system
            .and_then(|c| cs.get(c))
            .map(|&(s, e)| line[s..e].trim().trim_matches(['*', '`']).to_string())
            .filter(|s| !s.is_empty());
        for f in &found {
            let sys = sys.clone().or_else(|| in_context(ctx, &f.code));
            out.push(entry(number, line, f, label.clone(), sys));
        }
    }
}

#[cfg(test)]
mod tests {
    use crate::list::text::read;
    use crate::list::text::tests::{e, got};
    use crate::list::LineKind;

    #[test]
    fn markdown_table_uses_its_code_and_description_columns() {
        let d = "| # | Code | Description |\n|---|------|-------------|\n| 1 | **E11.9** | Type 2 diabetes mellitus |\n| 2 | I10 | Essential hypertension |\n";
        assert_eq!(
            got(d),
            [
                e(3, "E11.9", Some("Type 2 diabetes mellitus")),
                e(4, "I10", Some("Essential hypertension"))
            ]
        );
        let r = read(d, false);
        assert_eq!(r.lines[0].kind, LineKind::Headings);
    }
}
