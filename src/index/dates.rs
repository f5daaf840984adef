//! The dated facts of a code: billable and header spans (run-length blocks),
//! successors from the conversion table and predecessors.

use super::*;

impl<'a> View<'a> {
    /// Start of this record's run in a table whose block starts are in
    /// `blocks`, given the run length of each record.
    pub(super) fn run_start(
        &self,
        blocks: &[u8],
        ord: u32,
        len_of: impl Fn(u32) -> usize,
    ) -> usize {
        let block = ord as usize / REC_BLOCK;
        let first = (block * REC_BLOCK) as u32;
        let base = u32_entry(blocks, block).unwrap_or(0) as usize;
        (first..ord).map(len_of).fold(base, usize::saturating_add)
    }

    pub(super) fn spans_of(&self, ord: u32) -> (usize, usize, usize) {
        let nb = self.count(ord, 0);
        let nh = self.count(ord, 1);
        let start = (u32_entry(self.spbk, ord as usize / REC_BLOCK).unwrap_or(0) as usize)
            .saturating_add(Self::u16_at(self.spof, ord as usize) as usize);
        let total = self.spans.len() / 8;
        let s = start.min(total);
        let m = s.saturating_add(nb).min(total);
        (s, m, m.saturating_add(nh).min(total))
    }

    pub(super) fn period_at(&self, i: usize) -> Period {
        let pair = bytes::entry(self.spans, i, 8).unwrap_or(&[]);
        let f = u32_at(pair, 0).unwrap_or(0) as i32;
        let t = u32_at(pair, 4).unwrap_or(0) as i32;
        Period::new(Date::from_days(f), Date::from_days(t))
    }

    /// Periods in which the code was billable.
    pub fn billable(&self, ord: u32) -> impl Iterator<Item = Period> + '_ {
        let (s, m, _) = self.spans_of(ord);
        (s..m).map(move |i| self.period_at(i))
    }

    /// Periods in which the code was a header.
    pub fn header(&self, ord: u32) -> impl Iterator<Item = Period> + '_ {
        let (_, m, e) = self.spans_of(ord);
        (m..e).map(move |i| self.period_at(i))
    }

    /// Whether the code was billable on any day of `period`.
    #[inline]
    pub fn billable_in(&self, ord: u32, period: &Period) -> bool {
        self.billable(ord).any(|p| p.overlaps(period))
    }

    pub(super) fn succ_of(&self, ord: u32) -> (usize, usize) {
        let start = self.run_start(self.scbk, ord, |o| self.count(o, 2));
        let total = self.succ.len() / 8;
        let s = start.min(total);
        (s, s.saturating_add(self.count(ord, 2)).min(total))
    }

    /// Successors and the day each took over.
    pub fn successors(&self, ord: u32) -> impl Iterator<Item = (u32, Date)> + '_ {
        let (start, end) = self.succ_of(ord);
        (start..end).map(move |i| {
            let pair = bytes::entry(self.succ, i, 8).unwrap_or(&[]);
            (
                u32_at(pair, 0)
                    .unwrap_or(0)
                    .min(self.len.saturating_sub(1) as u32),
                Date::from_days(u32_at(pair, 4).unwrap_or(0) as i32),
            )
        })
    }

    /// Codes whose successors include `ord`, with the day each handed over.
    /// The reverse table is built on first use (one pass over the records).
    pub fn predecessors(&self, ord: u32) -> Vec<(u32, Date)> {
        let map = self.predecessors.get_or_init(|| {
            let mut m: std::collections::HashMap<u32, Vec<(u32, Date)>> = Default::default();
            for o in 0..self.len as u32 {
                if self.count(o, 2) > 0 {
                    for (s, d) in self.successors(o) {
                        m.entry(s).or_default().push((o, d));
                    }
                }
            }
            m
        });
        map.get(&ord).cloned().unwrap_or_default()
    }
}
