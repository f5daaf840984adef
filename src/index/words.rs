//! The word map: normalised word to posting list (`WFST`, `POST`) and the
//! word counts of descriptions (`WLEN`), for the word search and label check.

use super::*;

/// The ordinals of one posting list, in order; see [`View::posting`].
pub struct Posting<'a> {
    r: In<'a>,
    left: u32,
    prev: u32,
    len: u32,
    /// How many codes the list holds (as its header says).
    pub count: u32,
}

impl Iterator for Posting<'_> {
    type Item = u32;
    fn next(&mut self) -> Option<u32> {
        if self.left == 0 {
            return None;
        }
        self.left -= 1;
        let gap = self.r.varint()?;
        let o = self.prev.checked_add(gap).filter(|&o| o < self.len);
        match o {
            Some(o) => {
                self.prev = o;
                Some(o)
            }
            None => {
                self.left = 0;
                None
            }
        }
    }
}

impl<'a> View<'a> {
    /// The word map (normalised word → posting offset), for automaton searches.
    pub fn words(&self) -> &fst::Map<&'a [u8]> {
        &self.words
    }

    /// The posting list at `offset` (a value of the word map): how many codes
    /// have the word, and their ordinals in order. A damaged list ends early.
    pub fn posting(&self, offset: u64) -> Posting<'a> {
        let mut r = In::new(self.post);
        r.pos = usize::try_from(offset).unwrap_or(usize::MAX);
        let n = r.varint().unwrap_or(0).min(self.len as u32);
        Posting {
            r,
            left: n,
            count: n,
            prev: 0,
            len: self.len as u32,
        }
    }

    /// How many codes have `word` (a normalised word) among their words.
    pub fn word_codes(&self, word: &str) -> u32 {
        self.words.get(word).map_or(0, |o| self.posting(o).count)
    }

    /// Number of distinct words of a code's description.
    pub fn word_count(&self, ord: u32) -> u32 {
        self.wlen.get(ord as usize).copied().unwrap_or(0) as u32
    }

    /// Mean [`word_count`](Self::word_count) over all codes.
    pub fn mean_word_count(&self) -> f32 {
        *self.avg_words.get_or_init(|| {
            let sum: u64 = self.wlen.iter().map(|&b| b as u64).sum();
            (sum as f32 / self.wlen.len().max(1) as f32).max(1.0)
        })
    }
}
