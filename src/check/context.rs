//! What the judging of one entry knows of the whole list (the codes it
//! holds and reaches) and of the entries judged before it (the memo, so the
//! same code on many lines is judged once).

use super::*;

/// A hasher for ordinals (small integers chosen by us, not by an attacker):
/// one multiply instead of SipHash.
#[derive(Default, Clone, Copy)]
pub(crate) struct OrdHasher(u64);

impl std::hash::Hasher for OrdHasher {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 = (self.0.rotate_left(5) ^ b as u64).wrapping_mul(0x51_7c_c1_b7_27_22_0a_95);
        }
    }
    fn write_u32(&mut self, n: u32) {
        self.0 = (self.0 ^ n as u64).wrapping_mul(0x9e37_79b9_7f4a_7c15);
    }
}

/// Maps keyed by ordinal.
pub(crate) type OrdMap<V> = HashMap<u32, V, std::hash::BuildHasherDefault<OrdHasher>>;

/// A set of ordinals as a bitmap, remembering insertion order for iteration.
pub(crate) struct Marks {
    pub(crate) bits: Vec<u64>,
    pub(crate) list: Vec<u32>,
}

impl Marks {
    pub fn new(len: usize) -> Marks {
        Marks {
            bits: vec![0; len.div_ceil(64)],
            list: Vec::new(),
        }
    }
    pub fn insert(&mut self, o: u32) -> bool {
        let (w, b) = (o as usize / 64, 1u64 << (o % 64));
        match self.bits.get_mut(w) {
            Some(x) if *x & b == 0 => {
                *x |= b;
                self.list.push(o);
                true
            }
            _ => false,
        }
    }
    #[inline]
    pub fn contains(&self, o: &u32) -> bool {
        self.bits
            .get(*o as usize / 64)
            .is_some_and(|x| x & (1u64 << (o % 64)) != 0)
    }
}

impl<'a> IntoIterator for &'a Marks {
    type Item = &'a u32;
    type IntoIter = std::slice::Iter<'a, u32>;
    fn into_iter(self) -> Self::IntoIter {
        self.list.iter()
    }
}

/// The list as a whole, for judging each entry against the others.
pub(crate) struct ListContext {
    /// Explicit code entries: ordinal → lines.
    pub listed: OrdMap<Vec<usize>>,
    /// Billable-in-period codes reached by explicit entries or patterns.
    pub reached: Marks,
    /// Billable-in-period codes written explicitly.
    pub explicit: Marks,
    /// Codes matched by a pattern → the first pattern line.
    pub by_pattern: OrdMap<usize>,
    /// Whether any code of the list is written with a dot. A list written
    /// wholly without dots uses the official undotted form of the release
    /// files, so a missing dot is only worth a note in a list that mixes forms.
    pub dotted: bool,
}

/// Findings already made in this check, by code: a list that repeats a code
/// gets the same judgement for each line without redoing it.
/// A malformed cell's (or another system's code's) status, system and finding.
pub(crate) type Judged = (Status, Option<String>, Finding);

pub(crate) struct Memo {
    pub(crate) dates: OrdMap<(Status, Vec<Finding>)>,
    pub(crate) unknown: HashMap<(String, Option<String>), Finding>,
    /// Malformed cells (and other systems' codes) already judged, with their label.
    pub(crate) malformed: HashMap<(String, Option<String>), Judged>,
    /// The label check of a code and label already judged.
    pub(crate) labels: HashMap<(u32, String), Option<Finding>>,
    /// Labels that may still be searched for codes ([`crate::check::labels::SEARCH_LIMIT`]).
    pub(crate) label_searches: usize,
}

impl Default for Memo {
    fn default() -> Memo {
        Memo {
            dates: OrdMap::default(),
            unknown: HashMap::new(),
            malformed: HashMap::new(),
            labels: HashMap::new(),
            label_searches: crate::check::labels::SEARCH_LIMIT,
        }
    }
}
