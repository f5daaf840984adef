//! The mapping rows (the GEMs) of every index at hand that name a code, as
//! source or as target.

use super::facts::MapLink;
use crate::index::View;

/// The mapping rows of every index at hand that name `code` of this
/// index's vocabulary, as source or as target.
pub(super) fn mappings(view: &View<'_>, others: &[View<'_>], code: &str) -> Vec<MapLink> {
    let own = view.meta().vocabulary.as_str();
    let mut out = Vec::new();
    let all = std::iter::once(view).chain(others.iter());
    for holder in all {
        for m in holder.mappings() {
            let other_system = if m.from == own {
                m.to
            } else if m.to == own {
                m.from
            } else {
                continue;
            };
            let other = std::iter::once(view)
                .chain(others.iter())
                .find(|v| v.meta().vocabulary == other_system);
            let shown = |c: &str| match other {
                Some(v) => (
                    v.display(c),
                    v.ordinal(c).map(|o| v.description(o)).unwrap_or_default(),
                ),
                None => (c.to_string(), String::new()),
            };
            let rows = if m.from == own {
                m.lookup(code)
                    .into_iter()
                    .map(|r| ("source", r.target, r.flags))
                    .collect::<Vec<_>>()
            } else {
                m.rows()
                    .into_iter()
                    .filter(|r| r.target == code)
                    .map(|r| ("target", r.source, r.flags))
                    .collect()
            };
            for (role, c, flags) in rows {
                let (code, description) = shown(&c);
                out.push(MapLink {
                    mapping: m.name.to_string(),
                    title: m.title.to_string(),
                    role,
                    code,
                    system: other_system.to_string(),
                    description,
                    flags,
                });
            }
        }
    }
    out
}
