//! Words a few edits apart: the one-pass check that two words are at most
//! one edit apart (a misspelt label word), and the banded Levenshtein
//! automaton that finds the words of the map within one or two edits of a
//! query word; the full edit-distance table only in the tests, to hold both.

use fst::Automaton;

/// Edit distance of two short words (characters changed, added or dropped):
/// the full table, against which the tests hold the quicker checks.
#[cfg(test)]
pub(super) fn edits(a: &str, b: &str) -> usize {
    let (a, b) = (a.as_bytes(), b.as_bytes());
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for i in 1..=a.len() {
        cur[0] = i;
        for j in 1..=b.len() {
            let sub = prev[j - 1] + usize::from(a[i - 1] != b[j - 1]);
            cur[j] = sub.min(prev[j] + 1).min(cur[j - 1] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

/// Whether two words are at most one edit apart (the same as
/// `edits(a, b) <= 1`, without the table: one pass, no allocation).
pub(super) fn within_one_edit(a: &str, b: &str) -> bool {
    let (a, b) = (a.as_bytes(), b.as_bytes());
    let (short, long) = if a.len() <= b.len() { (a, b) } else { (b, a) };
    if long.len() - short.len() > 1 {
        return false;
    }
    // The first byte that differs; past it, the rest must be the same
    // after one byte changed (same length) or one dropped from the longer.
    let Some(i) = short.iter().zip(long).position(|(x, y)| x != y) else {
        return true;
    };
    if short.len() == long.len() {
        short[i + 1..] == long[i + 1..]
    } else {
        short[i..] == long[i + 1..]
    }
}

/// How many edits a word of this length may be misspelt by.
pub(super) fn allowed_edits(w: &str) -> u32 {
    match w.len() {
        0..=3 => 0,
        4..=7 => 1,
        _ => 2,
    }
}

/// How far a label word matches a description word: 1 for the same word,
/// [`MISSPELT`] for one edit apart (both at least 5 letters: `hyperglycaemia`),
/// else 0. One edit only: `hyperglycemia` and `hypoglycemia` are two apart.
pub(super) fn same_word(a: &str, b: &str) -> f32 {
    if a == b {
        1.0
    } else if a.len() >= 5 && b.len() >= 5 && within_one_edit(a, b) {
        MISSPELT
    } else {
        0.0
    }
}

/// Credit for a label word matched one edit away.
pub(super) const MISSPELT: f32 = 0.8;

/// Most edits the automaton below allows (see [`allowed_edits`]).
pub(super) const MAX_EDITS: usize = 2;
/// Width of its band of the edit-distance table.
pub(super) const BAND: usize = 2 * MAX_EDITS + 1;

/// Words within `most` edits of `word`, as an automaton over the word map.
/// Only the cells of the edit-distance table within `most` of its diagonal
/// can be `most` or less, so the state is that band of the last row (five
/// bytes) and the number of bytes read: each step costs the same whatever
/// the length of the word (a long pasted word is no slower per step).
pub(super) struct Edits<'w> {
    word: &'w [u8],
    most: u8,
}

/// Bytes read, and the band of the last row: cell `k` is column
/// `read + k - most` of the table, every value capped at `most + 1`.
type Band = (usize, [u8; BAND]);

impl Edits<'_> {
    /// A new automaton; `most` is capped at [`MAX_EDITS`].
    pub(super) fn new(word: &[u8], most: u32) -> Edits<'_> {
        Edits {
            word,
            most: most.min(MAX_EDITS as u32) as u8,
        }
    }

    fn cap(&self) -> u8 {
        self.most + 1
    }

    /// The column of band cell `k` after `read` bytes, if it is in the table.
    fn column(&self, read: usize, k: usize) -> Option<usize> {
        let j = (read + k).checked_sub(self.most as usize)?;
        (j <= self.word.len()).then_some(j)
    }
}

impl Automaton for Edits<'_> {
    type State = Band;

    fn start(&self) -> Band {
        let mut band = [self.cap(); BAND];
        for (k, cell) in band.iter_mut().enumerate() {
            if let Some(j) = self.column(0, k) {
                *cell = j.min(self.cap() as usize) as u8;
            }
        }
        (0, band)
    }

    fn is_match(&self, &(read, band): &Band) -> bool {
        // The last column, if the band holds it.
        (self.word.len() + self.most as usize)
            .checked_sub(read)
            .and_then(|k| band.get(k))
            .is_some_and(|&d| d <= self.most)
    }

    fn can_match(&self, (_, band): &Band) -> bool {
        band.iter().any(|&d| d <= self.most)
    }

    fn accept(&self, &(read, old): &Band, byte: u8) -> Band {
        let cap = self.cap();
        let read = read.saturating_add(1);
        let mut band = [cap; BAND];
        for k in 0..BAND {
            let Some(j) = self.column(read, k) else {
                continue;
            };
            // Column j of the new row from columns j - 1 and j of the old one
            // (old cells k and k + 1) and column j - 1 of the new (cell k - 1).
            let d = if j == 0 {
                read.min(cap as usize) as u8
            } else {
                let sub = old[k].saturating_add(u8::from(self.word[j - 1] != byte));
                let del = old.get(k + 1).map_or(cap, |d| d.saturating_add(1));
                let ins = k.checked_sub(1).map_or(cap, |i| band[i].saturating_add(1));
                sub.min(del).min(ins)
            };
            band[k] = d.min(cap);
        }
        (read, band)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_edit_automaton_accepts_words_within_its_edits() {
        let aut = Edits::new(b"femur", 1);
        let run = |w: &[u8]| {
            let mut st = aut.start();
            for &b in w {
                st = aut.accept(&st, b);
            }
            aut.is_match(&st)
        };
        assert!(run(b"femur") && run(b"femor") && run(b"femurs") && run(b"emur"));
        assert!(!run(b"fenor") && !run(b"lemon"));
    }

    /// The banded automaton agrees with the full edit-distance table on
    /// every pair of short words over a small alphabet (both at most one
    /// or two edits, or both not), and it stops where no match can follow.
    #[test]
    fn the_banded_automaton_agrees_with_the_full_table() {
        let alphabet = b"abc";
        let mut all: Vec<Vec<u8>> = vec![Vec::new()];
        for len in 1..=5 {
            let mut w = vec![0usize; len];
            loop {
                all.push(w.iter().map(|&i| alphabet[i]).collect());
                let Some(i) = w.iter().rposition(|&i| i + 1 < alphabet.len()) else {
                    break;
                };
                w[i] += 1;
                w[i + 1..].iter_mut().for_each(|x| *x = 0);
            }
        }
        for most in 1..=2u32 {
            for a in all.iter().step_by(7) {
                let aut = Edits::new(a, most);
                for b in &all {
                    let mut st = aut.start();
                    let mut alive = true;
                    for &x in b {
                        alive &= aut.can_match(&st);
                        st = aut.accept(&st, x);
                    }
                    let (sa, sb) = (
                        std::str::from_utf8(a).unwrap(),
                        std::str::from_utf8(b).unwrap(),
                    );
                    let within = edits(sa, sb) <= most as usize;
                    assert_eq!(aut.is_match(&st), within, "{sa} {sb} {most}");
                    assert!(alive || !within, "{sa} {sb} {most}: stopped early");
                }
            }
        }
    }

    /// The one-pass check agrees with the full table on every pair of words
    /// of up to five letters over a small alphabet.
    #[test]
    fn within_one_edit_agrees_with_the_full_table() {
        let mut all: Vec<String> = vec![String::new()];
        for len in 1..=5u32 {
            for n in 0..3usize.pow(len) {
                let mut w = String::new();
                let mut k = n;
                for _ in 0..len {
                    w.push(b"abc"[k % 3] as char);
                    k /= 3;
                }
                all.push(w);
            }
        }
        for a in all.iter().step_by(5) {
            for b in &all {
                assert_eq!(within_one_edit(a, b), edits(a, b) <= 1, "{a} {b}");
            }
        }
        assert!(within_one_edit("hyperglycemia", "hyperglycaemia"));
        assert!(!within_one_edit("hyperglycemia", "hypoglycemia"));
    }

    #[test]
    fn edit_distance() {
        assert_eq!(edits("hyperglycemia", "hyperglycaemia"), 1);
        assert_eq!(edits("kitten", "sitting"), 3);
        assert_eq!(same_word("diabete", "diabete"), 1.0);
        assert_eq!(same_word("type", "tape"), 0.0);
        assert_eq!(same_word("femur", "femor"), MISSPELT);
        assert_eq!(same_word("hyperglycemia", "hypoglycemia"), 0.0);
    }
}
