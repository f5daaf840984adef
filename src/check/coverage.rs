//! A code's dated spans, and how much of each category a list reaches.

use super::*;

/// The days a code was billable and a header, in order (for pictures).
pub fn timeline<D: AsRef<[u8]>>(index: &Index<D>, code: &str) -> Option<Vec<Span>> {
    let view = index.view();
    let Resolved::Found { ord, .. } = code::resolve(&view, code) else {
        return None;
    };
    let mut spans: Vec<Span> = view
        .billable(ord)
        .map(|p| Span {
            kind: SpanKind::Billable,
            from: p.from,
            to: p.to,
        })
        .chain(view.header(ord).map(|p| Span {
            kind: SpanKind::Header,
            from: p.from,
            to: p.to,
        }))
        .collect();
    spans.sort_by_key(|s| s.from);
    Some(spans)
}

/// How much of one category a list covers in the period.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CategoryCoverage {
    /// The category (`E11`).
    pub category: String,
    /// Its description.
    pub description: String,
    /// Billable codes under it in the period that the list reaches.
    pub included: u32,
    /// Billable codes under it in the period.
    pub total: u32,
}

/// Coverage of every category the reached codes fall in, in code order.
pub(crate) fn coverage_of(
    view: &View<'_>,
    period: &Period,
    reached: &Marks,
) -> Vec<CategoryCoverage> {
    let mut cats: Vec<u32> = reached
        .into_iter()
        .map(|&o| view.category(o))
        .collect::<HashSet<_>>()
        .into_iter()
        .collect();
    cats.sort();
    cats.into_iter()
        .map(|c| {
            let all: Vec<u32> = std::iter::once(c)
                .chain(view.descendants(c))
                .filter(|&o| view.billable_in(o, period))
                .collect();
            CategoryCoverage {
                category: view.display(&view.code(c)),
                description: view.description_or_note(c),
                included: all.iter().filter(|o| reached.contains(o)).count() as u32,
                total: all.len() as u32,
            }
        })
        .collect()
}
