//! An entry already covered by another entry of the list (its parent, or a
//! pattern that reaches it).

use super::*;

/// A code already covered by a header ancestor (a header throughout the
/// period) or by a pattern elsewhere in the list.
pub(crate) fn redundant(
    view: &View<'_>,
    period: &Period,
    ctx: &ListContext,
    ord: u32,
    line: usize,
) -> Option<Finding> {
    let shown = || view.display(&view.code(ord));
    for a in view.ancestors(ord) {
        let Some(lines) = ctx.listed.get(&a) else {
            continue;
        };
        // A stated hierarchy (HPO): a term stands for everything under it
        // (the true-path rule), so any listed ancestor in use covers it.
        let covers = if view.is_graph() {
            view.billable(a).any(|p| p.covers(period))
        } else {
            view.header(a).any(|p| p.covers(period))
        };
        if covers {
            return Some(Finding::new(
                Kind::Redundant,
                Severity::Warning,
                format!(
                    "{} is under {} (line {}), which the list already has; if the query takes codes with everything under them, this line adds nothing",
                    shown(),
                    view.display(&view.code(a)),
                    lines[0]
                ),
                vec![],
            ));
        }
    }
    match ctx.by_pattern.get(&ord) {
        Some(&pl) if pl != line => Some(Finding::new(
            Kind::Redundant,
            Severity::Warning,
            format!("{} is already matched by the pattern on line {pl}", shown()),
            vec![],
        )),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use crate::check::testing::*;
    use crate::report::Kind;

    /// A code under a category the list already holds is redundant.
    #[test]
    fn a_child_of_a_listed_category_is_redundant() {
        let r = check_ten("E11\nE11.9\n", "2020-01-01", "2020-12-31");
        assert!(r.entries[1]
            .findings
            .iter()
            .any(|f| f.kind == Kind::Redundant));
        assert!(!r.entries[0]
            .findings
            .iter()
            .any(|f| f.kind == Kind::Redundant));
    }
}
