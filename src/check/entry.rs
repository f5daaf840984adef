//! Pass 2 for one entry: the findings of what pass 1 read, in the order the
//! report gives them.

use super::*;

#[allow(clippy::too_many_arguments)]
pub(crate) fn judge(
    view: &View<'_>,
    options: &CheckOptions,
    period: &Period,
    ctx: &ListContext,
    item: Item,
    line: usize,
    e: &mut Entry,
    suggestions_left: &mut usize,
    memo: &mut Memo,
    others: &[View<'_>],
) {
    let title = &view.meta().title;
    let cov = Period::new(view.meta().coverage_from, view.meta().coverage_to);
    // A code of another system at hand (ICD-9-CM beside ICD-10-CM).
    if let Item::Malformed { written, .. } | Item::Unknown { written, .. } = &item {
        if let Some(known) = known_elsewhere(view, others, written, period) {
            e.status = Status::OtherSystem;
            e.system = Some(known.system.clone());
            if matches!(item, Item::Malformed { .. }) {
                e.code = Some(written.clone());
            }
            e.findings.push(known.finding());
            return;
        }
    }
    match item {
        Item::Skip(s) => e.status = s,
        Item::Unreadable(m) => {
            e.status = Status::Malformed;
            e.findings
                .push(Finding::new(Kind::Malformed, Severity::Error, m, vec![]));
        }
        Item::Malformed { reason, written } => {
            let undotted = written.to_ascii_uppercase().replace('.', "");
            // The same cell and label on many lines is judged once.
            let key = (format!("malformed {undotted}"), e.label.clone());
            if let Some((status, system, f)) = memo.malformed.get(&key) {
                e.status = *status;
                e.system = system.clone();
                e.findings.push(f.clone());
                return;
            }
            // The label may still name the code that was meant; a code
            // mistyped out of shape (`SR2.002B`, `436.810D`) gets the codes
            // within two edits of it, as an unknown code does.
            let other = other_systems(view, &written);
            let typed = (3..=10).contains(&undotted.len())
                && undotted.bytes().all(|b| b.is_ascii_alphanumeric())
                && undotted.bytes().filter(u8::is_ascii_digit).count() >= 2
                && !view.is_graph();
            let sugg: Vec<Suggestion> = if other.is_none() && typed && *suggestions_left > 0 {
                *suggestions_left -= 1;
                let near = near_suggestions(view, &undotted, e.label.as_deref(), period, memo);
                offer(view, &near.offered)
            } else {
                label_candidates(view, e.label.as_deref(), &undotted, period, &[], memo)
                    .into_iter()
                    .map(|(o, fit)| suggestion(view, o, fit.reason()))
                    .collect()
            };
            let f = match other {
                Some(shape) => {
                    e.status = Status::OtherSystem;
                    if let [one] = shape.systems().as_slice() {
                        e.system = Some(one.name().to_string());
                    }
                    Finding::new(Kind::OtherSystem, Severity::Warning, shape.message(), sugg)
                }
                None => {
                    e.status = Status::Malformed;
                    Finding::new(Kind::Malformed, Severity::Error, reason, sugg)
                }
            };
            memo.malformed
                .insert(key, (e.status, e.system.clone(), f.clone()));
            e.findings.push(f);
        }
        Item::Pattern(p, matched) => {
            let shown = p.display(view);
            e.status = Status::Pattern;
            e.code = Some(shown.clone());
            if matched.is_empty() {
                e.findings.push(Finding::new(
                    Kind::PatternEmpty,
                    Severity::Error,
                    format!(
                        "{shown} matches no billable {title} code in the period {} to {}; check the start of the pattern or the period",
                        period.from, period.to
                    ),
                    vec![],
                ));
            } else {
                e.findings.push(Finding::new(
                    Kind::Pattern,
                    Severity::Info,
                    format!(
                        "{shown} matches {} billable code{} in the period ({})",
                        matched.len(),
                        if matched.len() == 1 { "" } else { "s" },
                        name_codes(view, &matched)
                    ),
                    vec![],
                ));
            }
        }
        Item::Unknown { code: c, .. } => {
            e.status = Status::Unknown;
            e.code = Some(view.display(&c));
            let mut msg = if cov.from == cov.to {
                format!(
                    "{} is not {} {title} code of release {}",
                    view.display(&c),
                    article(title),
                    view.meta().release
                )
            } else {
                format!(
                    "{} is not {} {title} code in any release from {} to {}",
                    view.display(&c),
                    article(title),
                    cov.from,
                    cov.to
                )
            };
            if let Some(seventh) = seventh_note(view, &c) {
                msg.push_str("; ");
                msg.push_str(&seventh.phrase());
            }
            let mut sugg = Vec::new();
            let key = (c.clone(), e.label.clone());
            if let Some(f) = memo.unknown.get(&key) {
                e.findings.push(f.clone());
                return;
            }
            if *suggestions_left > 0 {
                *suggestions_left -= 1;
                let near = near_suggestions(view, &c, e.label.as_deref(), period, memo);
                sugg = offer(view, &with_every_seventh(view, &c, near.offered));
                if near.label_first {
                    msg.push_str(&format!("; its label fits {} best", sugg[0].code));
                }
                if !near.any_near {
                    msg.push_str("; no code is within two characters of it");
                }
            } else {
                msg.push_str(&format!(
                    "; near codes were not searched (only the first {SUGGESTION_LIMIT} unknown codes of a list are)"
                ));
            }
            let f = Finding::new(Kind::Unknown, Severity::Error, msg, sugg);
            memo.unknown.insert(key, f.clone());
            e.findings.push(f);
        }
        Item::Code {
            ord,
            mut changes,
            written,
        } => {
            if !ctx.dotted {
                changes.retain(|c| *c != "dot added");
            }
            let code = view.code(ord);
            let shown = view.display(&code);
            e.code = Some(shown.clone());
            e.description = Some(view.description_or_note(ord));
            if !changes.is_empty() {
                let mut sugg = vec![suggestion(view, ord, "the official form")];
                let letter_read = changes.iter().any(|c| c.contains(" read as "));
                if let (true, Some(label)) = (letter_read, e.label.as_deref()) {
                    sugg.extend(offer(
                        view,
                        &other_readings(view, &written, ord, label, period),
                    ));
                }
                e.findings.push(Finding::new(
                    Kind::Normalized,
                    Severity::Info,
                    format!("\"{written}\" read as {shown} ({})", changes.join(", ")),
                    sugg,
                ));
            }
            // The same code on many lines is judged once.
            if let Some((status, found)) = memo.dates.get(&ord) {
                e.status = *status;
                e.findings.extend(found.iter().cloned());
            } else {
                let before = e.findings.len();
                judge_dates(view, others, options, period, ctx, ord, &shown, e);
                memo.dates
                    .insert(ord, (e.status, e.findings[before..].to_vec()));
            }
            if let Some(also) = also_elsewhere(view, others, &code, &shown) {
                e.findings.push(also.finding());
            }
            if let Some(f) = redundant(view, period, ctx, ord, line) {
                e.findings.push(f);
            }
            if let Some(label) = e.label.clone() {
                let key = (ord, label);
                let f = match memo.labels.get(&key) {
                    Some(f) => f.clone(),
                    None => {
                        let left = &mut memo.label_searches;
                        let f = crate::check::labels::judge(view, &key.1, ord, period, left)
                            .map(crate::check::labels::Judgement::finding);
                        memo.labels.insert(key, f.clone());
                        f
                    }
                };
                e.findings.extend(f);
            }
        }
    }
}
