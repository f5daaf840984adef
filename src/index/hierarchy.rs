//! Walking the hierarchy: parents, ancestors, descendants, children and
//! category, for a prefix hierarchy (ranges of ordinals) and a stated one
//! (the `GRPH` tables); statuses, synonyms, alternate ids and 7th-character rules.

use super::*;

/// The nodes below a node, from [`View::descendants`].
pub enum Descendants {
    /// A prefix hierarchy's subtree: a range of ordinals.
    Range(std::ops::Range<u32>),
    /// A graph's, walked and sorted.
    Walked(std::vec::IntoIter<u32>),
}

impl Iterator for Descendants {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        match self {
            Descendants::Range(r) => r.next(),
            Descendants::Walked(w) => w.next(),
        }
    }
    fn size_hint(&self) -> (usize, Option<usize>) {
        match self {
            Descendants::Range(r) => r.size_hint(),
            Descendants::Walked(w) => w.size_hint(),
        }
    }
}

impl ExactSizeIterator for Descendants {}

/// Ancestors of a node, from [`View::ancestors`].
pub struct Ancestors<'v, 'a> {
    view: &'v View<'a>,
    /// The next one on a prefix chain.
    cur: Option<u32>,
    guard: u32,
    /// Graph: nodes still to hand out, in order.
    queue: Vec<u32>,
    seen: std::collections::HashSet<u32>,
}

impl Iterator for Ancestors<'_, '_> {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        if let Some((parents, _)) = &self.view.extra.graph {
            let i = self.guard as usize;
            let n = *self.queue.get(i)?;
            self.guard += 1;
            for p in parents.of(n) {
                if self.seen.insert(p) {
                    self.queue.push(p);
                }
            }
            return Some(n);
        }
        let c = self.cur?;
        self.guard += 1;
        self.cur = if self.guard > 64 {
            None
        } else {
            self.view.parent(c)
        };
        Some(c)
    }
}

impl<'a> View<'a> {
    /// Whether the hierarchy is the release's own parent links (a graph, as
    /// in HPO) rather than code prefixes.
    pub fn is_graph(&self) -> bool {
        self.extra.graph.is_some()
    }

    /// The parent node, if any (with several parents, the first in code order).
    pub fn parent(&self, ord: u32) -> Option<u32> {
        if let Some((parents, _)) = &self.extra.graph {
            return parents.of(ord).next();
        }
        let d = self.column(self.pard, ord);
        (d != 0 && d <= ord).then(|| ord - d)
    }

    /// Every parent, in code order.
    pub fn parents(&self, ord: u32) -> impl Iterator<Item = u32> + 'a {
        let (graph, single) = match &self.extra.graph {
            Some((parents, _)) => (Some(parents.of(ord)), None),
            None => (None, self.parent(ord)),
        };
        graph.into_iter().flatten().chain(single)
    }

    /// Ancestors, each once, nearest first (breadth first in a graph).
    pub fn ancestors(&self, ord: u32) -> Ancestors<'_, 'a> {
        match &self.extra.graph {
            None => Ancestors {
                view: self,
                cur: self.parent(ord),
                guard: 0,
                queue: Vec::new(),
                seen: Default::default(),
            },
            Some(_) => {
                let queue: Vec<u32> = self.parents(ord).collect();
                let seen = queue.iter().copied().collect();
                Ancestors {
                    view: self,
                    cur: None,
                    guard: 0,
                    queue,
                    seen,
                }
            }
        }
    }

    /// One past the last descendant by code order: for a prefix hierarchy
    /// the subtree of `ord` is `ord..end`. A graph's descendants are not a
    /// range (see [`descendants`](Self::descendants)); there it is `ord + 1`.
    pub fn subtree_end(&self, ord: u32) -> u32 {
        let next = ord.saturating_add(1);
        if self.extra.graph.is_some() {
            return next;
        }
        let size = self.column(self.subt, ord).max(1);
        ord.saturating_add(size).min(self.len as u32).max(next)
    }

    /// The category a node belongs to, for tallies: in a prefix hierarchy
    /// its topmost ancestor (`E11` for `E11.9`); in a stated hierarchy the
    /// ancestor two levels below the root along first parents (HPO: the
    /// organ-system branches under "Phenotypic abnormality"), or the node
    /// itself when it is that high.
    pub fn category(&self, ord: u32) -> u32 {
        if self.extra.graph.is_none() {
            return self.ancestors(ord).last().unwrap_or(ord);
        }
        let mut chain = vec![ord];
        while let Some(p) = self.parent(*chain.last().unwrap_or(&ord)) {
            if chain.len() > 64 {
                break;
            }
            chain.push(p);
        }
        chain[chain.len().saturating_sub(3).min(chain.len() - 1)]
    }

    /// Every node below `ord`, each once, ascending: a range of ordinals in
    /// a prefix hierarchy (no allocation), a walk of the children in a graph.
    pub fn descendants(&self, ord: u32) -> Descendants {
        let Some((_, children)) = &self.extra.graph else {
            return Descendants::Range(ord.saturating_add(1)..self.subtree_end(ord));
        };
        let mut seen = std::collections::HashSet::new();
        let mut stack: Vec<u32> = children.of(ord).collect();
        let mut out = Vec::new();
        while let Some(n) = stack.pop() {
            if seen.insert(n) {
                out.push(n);
                stack.extend(children.of(n));
            }
        }
        out.sort_unstable();
        Descendants::Walked(out.into_iter())
    }

    /// Direct children, in code order.
    pub fn children(&self, ord: u32) -> impl Iterator<Item = u32> + '_ {
        let graph = self.extra.graph.as_ref().map(|(_, c)| c.of(ord));
        let end = if graph.is_some() {
            ord
        } else {
            self.subtree_end(ord)
        };
        let mut next = ord.saturating_add(1);
        let tree = std::iter::from_fn(move || {
            if next >= end {
                return None;
            }
            let c = next;
            next = self.subtree_end(c);
            Some(c)
        });
        graph.into_iter().flatten().chain(tree)
    }

    /// Codes the release suggests considering in place of a retired one.
    pub fn consider(&self, ord: u32) -> impl Iterator<Item = u32> + 'a {
        self.extra.consider.of(ord)
    }

    /// The release's own status word for a code still in use (`DISCOURAGED`).
    pub fn status(&self, ord: u32) -> Option<&'a str> {
        extra::status_of(self.extra.status, ord)
    }

    /// The other wordings the release gives a record (HPO synonyms), as
    /// written and in its order. Kept only for a stated hierarchy: empty for
    /// a prefix hierarchy, whose other wordings are search words alone.
    pub fn synonyms(&self, ord: u32) -> Vec<String> {
        extra::synonyms_of(self.extra.synonyms, ord)
    }

    /// The code an alternate id stands for (HPO `alt_id`), written exactly.
    pub fn alias(&self, alt: &str) -> Option<u32> {
        let m = fst::Map::new(self.extra.aliases?).ok()?;
        m.get(alt.as_bytes())
            .map(|o| o as u32)
            .filter(|&o| (o as usize) < self.len)
    }

    /// Every alternate id with its code, sorted by alternate id.
    pub fn aliases(&self) -> Vec<(String, String)> {
        use fst::Streamer;
        let Some(b) = self.extra.aliases else {
            return Vec::new();
        };
        let Ok(m) = fst::Map::new(b) else {
            return Vec::new();
        };
        let mut out = Vec::new();
        let mut s = m.stream();
        while let Some((k, o)) = s.next() {
            out.push((String::from_utf8_lossy(k).into_owned(), self.code(o as u32)));
        }
        out
    }

    pub(super) fn own_seventh(&self, ord: u32) -> Option<u16> {
        (self.count(ord, 3) as u16).checked_sub(1)
    }

    /// The 7th-character rule in force at this node (its own or an ancestor's).
    pub fn seventh_rule(&self, ord: u32) -> Option<&'a SeventhRule> {
        std::iter::once(ord)
            .chain(self.ancestors(ord))
            .find_map(|o| self.own_seventh(o))
            .and_then(|i| self.tree.seventh.get(i as usize))
    }

    /// The 7th-character rule in force at this node and the node that
    /// states it (itself or its nearest ancestor with a rule).
    pub fn seventh_rule_at(&self, ord: u32) -> Option<(u32, &'a SeventhRule)> {
        std::iter::once(ord)
            .chain(self.ancestors(ord))
            .find_map(|o| Some((o, self.own_seventh(o)?)))
            .and_then(|(o, i)| Some((o, self.tree.seventh.get(i as usize)?)))
    }
}
