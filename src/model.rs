//! The in-memory release model: what `vocab-build` assembles from release files
//! and what an index file holds, in plain owned types.
//!
//! The index writer takes a [`Release`]; [`crate::Index::to_release`] gives one
//! back, so building then reading an index can be compared with its input.

use crate::date::Date;
use serde::Serialize;

/// An inclusive range of days.
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Debug, Serialize)]
pub struct Period {
    /// First day.
    pub from: Date,
    /// Last day (inclusive).
    pub to: Date,
}

impl Period {
    /// The period from `from` to `to`, both inclusive.
    pub fn new(from: Date, to: Date) -> Period {
        Period { from, to }
    }

    /// Whether `day` falls in the period.
    pub fn contains(&self, day: Date) -> bool {
        self.from <= day && day <= self.to
    }

    /// Whether the two periods share a day.
    pub fn overlaps(&self, other: &Period) -> bool {
        self.from <= other.to && other.from <= self.to
    }

    /// Whether `other` lies wholly inside this period.
    pub fn covers(&self, other: &Period) -> bool {
        self.from <= other.from && other.to <= self.to
    }

    /// The days both periods share, if any.
    pub fn intersect(&self, other: &Period) -> Option<Period> {
        let from = self.from.max(other.from);
        let to = self.to.min(other.to);
        (from <= to).then_some(Period { from, to })
    }
}

/// What a code was on a span of days.
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Debug, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum SpanKind {
    /// Valid for submission (a leaf of the release).
    Billable,
    /// A node of the hierarchy with billable codes under it.
    Header,
}

/// A span of days on which a code had one status.
#[derive(Clone, Copy, PartialEq, Eq, Debug, Serialize)]
pub struct Span {
    /// Billable or header.
    pub kind: SpanKind,
    /// First day.
    pub from: Date,
    /// Last day (inclusive).
    pub to: Date,
}

/// A later code that data under a retired code is now coded as.
#[derive(Clone, PartialEq, Eq, PartialOrd, Ord, Debug)]
pub struct Successor {
    /// The successor, undotted.
    pub code: String,
    /// The day the successor took over (the retired code's data up to the day
    /// before is now coded as the successor).
    pub effective: Date,
}

/// One code or header node of the vocabulary, across all releases.
#[derive(Clone, PartialEq, Eq, Debug)]
pub struct CodeEntry {
    /// The code without a dot, upper case (`E119`).
    pub code: String,
    /// The newest official description (may be empty).
    pub description: String,
    /// Days on which the code was billable, sorted and disjoint.
    pub billable: Vec<Period>,
    /// Days on which the code was a header, sorted and disjoint.
    pub header: Vec<Period>,
    /// Successors from the conversion table, sorted.
    pub successors: Vec<Successor>,
    /// Index into [`Release::seventh`] of the 7th-character rule that the
    /// tabular list states at this node, if any.
    pub seventh: Option<u16>,
    /// Other official wordings of the code (ICD-10-CM: the tabular list's
    /// inclusion terms; HPO: synonyms). Their words go into the word map; the
    /// text itself is kept only for a stated hierarchy ([`Hierarchy::Explicit`],
    /// for the code card), so [`crate::Index::to_release`] gives this back
    /// empty for a prefix hierarchy.
    pub terms: Vec<String>,
    /// The parents the release states, for a vocabulary whose hierarchy is
    /// explicit ([`Hierarchy::Explicit`]; several for an ontology such as
    /// HPO). Empty for a prefix hierarchy, where the parent is the longest
    /// code that is a proper prefix.
    pub parents: Vec<String>,
    /// Codes the release suggests reviewing in place of a retired one
    /// (HPO `consider`): not successors, only candidates.
    pub consider: Vec<String>,
    /// The release's own status word when it qualifies use of a code that is
    /// still valid (LOINC `DISCOURAGED`, `TRIAL`); empty otherwise.
    pub status: String,
}

impl CodeEntry {
    /// An entry with a code and description and nothing else.
    pub fn new(code: impl Into<String>, description: impl Into<String>) -> CodeEntry {
        CodeEntry {
            code: code.into(),
            description: description.into(),
            billable: Vec::new(),
            header: Vec::new(),
            successors: Vec::new(),
            seventh: None,
            terms: Vec::new(),
            parents: Vec::new(),
            consider: Vec::new(),
            status: String::new(),
        }
    }
}

/// How a vocabulary's hierarchy is stated.
#[derive(Clone, Copy, PartialEq, Eq, Debug, Default, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Hierarchy {
    /// By the codes themselves: a code's parent is the longest code of the
    /// release that is a proper prefix of it (ICD-10-CM, ICD-10-PCS, ICD-9-CM).
    #[default]
    Prefix,
    /// By the release's own parent links ([`CodeEntry::parents`]), which may
    /// give a code several parents (a directed acyclic graph) or none.
    Explicit,
}

/// A chapter of the classification.
#[derive(Clone, PartialEq, Eq, Debug, Serialize)]
pub struct Chapter {
    /// Its number as printed (`4`).
    pub name: String,
    /// Its title, with the code range (`Endocrine, nutritional ... (E00-E89)`).
    pub title: String,
}

/// A section (block) of categories.
#[derive(Clone, PartialEq, Eq, Debug, Serialize)]
pub struct Section {
    /// First category, undotted (`E08`).
    pub first: String,
    /// Last category, undotted (`E13`).
    pub last: String,
    /// Title (`Diabetes mellitus`).
    pub title: String,
    /// Index into [`Release::chapters`].
    pub chapter: u16,
}

/// A 7th-character rule: the characters allowed in the 7th place and what each means.
#[derive(Clone, PartialEq, Eq, Debug, Serialize)]
pub struct SeventhRule {
    /// Pairs of character and meaning (`A`, `initial encounter`).
    pub extensions: Vec<(char, String)>,
}

/// One source file an index was built from.
#[derive(Clone, PartialEq, Eq, Debug, Serialize)]
pub struct Source {
    /// File name.
    pub file: String,
    /// SHA-256 of the file as read, lower-case hex.
    pub sha256: String,
    /// What the build took from it.
    pub role: String,
}

/// What an index says about itself.
#[derive(Clone, PartialEq, Eq, Debug, Serialize)]
pub struct Meta {
    /// Vocabulary id (`icd10cm`).
    pub vocabulary: String,
    /// Display name (`ICD-10-CM`).
    pub title: String,
    /// Release tag naming the newest data included.
    pub release: String,
    /// First day the index knows about.
    pub coverage_from: Date,
    /// Last day the index knows about.
    pub coverage_to: Date,
    /// Files the index was built from.
    pub sources: Vec<Source>,
    /// Where the dot goes in the display form (3 for ICD-10-CM: `E11.9`).
    pub dot_after: u8,
    /// Codes starting with this letter put the dot elsewhere (ICD-9-CM:
    /// `E` codes after the fourth character, `E880.0`).
    pub dot_rules: Vec<(char, u8)>,
    /// Code shapes seen in the data, one letter per character:
    /// `A` a letter, `9` a digit (`A99.9A` style is written without the dot).
    pub shapes: Vec<String>,
    /// Credit that the release's licence asks users to see, shown with every
    /// report (HPO: the consortium, the release version, the licence).
    pub notice: String,
}

impl Meta {
    /// Whether the index holds one release only (its coverage is one day):
    /// codes are judged as of that release, not over a study period.
    pub fn snapshot(&self) -> bool {
        self.coverage_from == self.coverage_to
    }

    /// Whether the vocabulary may go on past the index's last covered day
    /// (a release the index does not have yet): not for one release only,
    /// nor for a vocabulary whose last release it holds ([`System::frozen`]).
    ///
    /// [`System::frozen`]: crate::systems::System::frozen
    pub fn open_ended(&self) -> bool {
        !self.snapshot()
            && !crate::systems::System::parse(&self.vocabulary).is_some_and(|s| s.frozen())
    }

    /// The day a check is made on when no day or study period is given:
    /// `today` when the index covers it, else the nearest day it covers (an
    /// ICD-9-CM index covering 2014-10-01 to 2015-09-30 is checked on its
    /// last day, not on a day when every code would read as retired). The
    /// CLI, the binding and the page all take their default from here.
    pub fn default_day(&self, today: Date) -> Date {
        today.max(self.coverage_from).min(self.coverage_to)
    }

    /// The day a search asked for `day` is made as of: a one-release
    /// vocabulary (HPO) as of its release, and a day past the coverage of
    /// an open-ended one as of its last covered day (the index knows
    /// nothing later).
    pub fn search_day(&self, day: Date) -> Date {
        if self.snapshot() {
            self.coverage_from
        } else if self.open_ended() && day > self.coverage_to {
            self.coverage_to
        } else {
            day
        }
    }

    /// Whether [`Meta::default_day`] is not `today`: the page and the CLI
    /// say so, since the day checked is then not the one a user expects.
    pub fn default_day_moved(&self, today: Date) -> bool {
        self.default_day(today) != today
    }

    /// Where the dot goes in `code` (0: no dot).
    pub fn dot_for(&self, code: &str) -> usize {
        let first = code.chars().next();
        self.dot_rules
            .iter()
            .find(|(c, _)| Some(*c) == first)
            .map_or(self.dot_after, |(_, n)| *n) as usize
    }
}

/// A whole vocabulary, ready to be written as an index.
#[derive(Clone, PartialEq, Eq, Debug)]
pub struct Release {
    /// Header facts.
    pub meta: Meta,
    /// Every code and header node, sorted by code.
    pub codes: Vec<CodeEntry>,
    /// Chapters in order.
    pub chapters: Vec<Chapter>,
    /// Sections in order.
    pub sections: Vec<Section>,
    /// Distinct 7th-character rules.
    pub seventh: Vec<SeventhRule>,
    /// Mappings to or from other vocabularies (the GEMs).
    pub mappings: Vec<Mapping>,
    /// How the hierarchy is stated.
    pub hierarchy: Hierarchy,
    /// Alternate ids and the code each stands for (HPO `alt_id`), sorted by
    /// alternate id. An alternate id is read as its code, with a note.
    pub aliases: Vec<(String, String)>,
    /// The tabular list's instructional notes (ICD-10-CM), grouped by
    /// owner: chapters first, then sections, then codes in code order; in
    /// the order of the tabular list within one owner.
    pub notes: Vec<Note>,
}

/// Where a tabular-list note is stated.
#[derive(Clone, PartialEq, Eq, PartialOrd, Ord, Debug)]
pub enum NoteOwner {
    /// A chapter (index into [`Release::chapters`]).
    Chapter(u16),
    /// A section (index into [`Release::sections`]).
    Section(u16),
    /// A code or header node, undotted.
    Code(String),
}

/// The kinds of instructional note of the ICD-10-CM tabular list (the
/// element names of the CDC XML in brackets).
#[derive(Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Debug, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum NoteKind {
    /// Further defines the content of the node (`includes`).
    Includes,
    /// Another wording the node covers (`inclusionTerm`).
    InclusionTerm,
    /// Never coded together with the node (`excludes1`).
    Excludes1,
    /// Not part of the node, but may be coded with it (`excludes2`).
    Excludes2,
    /// The underlying condition is coded first (`codeFirst`).
    CodeFirst,
    /// A further code is added (`useAdditionalCode`).
    UseAdditionalCode,
    /// Another code may be needed, in either order (`codeAlso`).
    CodeAlso,
    /// A plain note (`notes`).
    Note,
    /// How the 7th character applies (`sevenChrNote`).
    SeventhCharacter,
}

impl NoteKind {
    /// Every kind, in the order of its number in an index file.
    pub const ALL: [NoteKind; 9] = [
        NoteKind::Includes,
        NoteKind::InclusionTerm,
        NoteKind::Excludes1,
        NoteKind::Excludes2,
        NoteKind::CodeFirst,
        NoteKind::UseAdditionalCode,
        NoteKind::CodeAlso,
        NoteKind::Note,
        NoteKind::SeventhCharacter,
    ];

    /// The kind of an element of the CDC tabular XML, if it holds notes.
    pub fn of_element(name: &str) -> Option<NoteKind> {
        Some(match name {
            "includes" => NoteKind::Includes,
            "inclusionTerm" => NoteKind::InclusionTerm,
            "excludes1" => NoteKind::Excludes1,
            "excludes2" => NoteKind::Excludes2,
            "codeFirst" => NoteKind::CodeFirst,
            "useAdditionalCode" => NoteKind::UseAdditionalCode,
            "codeAlso" => NoteKind::CodeAlso,
            "notes" => NoteKind::Note,
            "sevenChrNote" => NoteKind::SeventhCharacter,
            _ => return None,
        })
    }

    /// Whether the note holds for the codes under its node too. Inclusion
    /// terms are wordings of the node itself; the other notes of a category
    /// or block apply to everything in it (ICD-10-CM Official Guidelines,
    /// section I.A, conventions; cited from memory).
    pub fn inherited(self) -> bool {
        self != NoteKind::InclusionTerm
    }
}

/// One instructional note of the tabular list.
#[derive(Clone, PartialEq, Eq, Debug)]
pub struct Note {
    /// Where it is stated.
    pub owner: NoteOwner,
    /// What kind of note.
    pub kind: NoteKind,
    /// Its text, spaces collapsed.
    pub text: String,
}

/// A mapping between two vocabularies, one row per source-target pair, in
/// the order of the official file (the 2015 General Equivalence Mappings).
#[derive(Clone, PartialEq, Eq, Debug)]
pub struct Mapping {
    /// Short name (`gem-icd9cm-icd10cm`).
    pub name: String,
    /// Title for people.
    pub title: String,
    /// Vocabulary of the sources.
    pub from: String,
    /// Vocabulary of the targets.
    pub to: String,
    /// Rows, grouped by source (sources ascending).
    pub rows: Vec<MapRow>,
}

/// One row of a mapping.
#[derive(Clone, PartialEq, Eq, Debug)]
pub struct MapRow {
    /// Source code, undotted.
    pub source: String,
    /// Target code, undotted (`NoDx` for no map in the GEMs).
    pub target: String,
    /// The GEM flags.
    pub flags: MapFlags,
}

/// The five GEM flags (CMS, General Equivalence Mappings documentation).
#[derive(Clone, Copy, PartialEq, Eq, Debug, Default, Serialize)]
pub struct MapFlags {
    /// The target is not an exact equivalent.
    pub approximate: bool,
    /// The source has no target.
    pub no_map: bool,
    /// The source needs several targets together (one from each choice list).
    pub combination: bool,
    /// Which combination scenario the row belongs to (0 when none).
    pub scenario: u8,
    /// Which choice list of its scenario the row belongs to (0 when none).
    pub choice_list: u8,
}

/// The shape letters of an undotted code: `A` for a letter, `9` for a digit.
pub fn shape_of(code: &str) -> String {
    code.chars()
        .map(|c| if c.is_ascii_digit() { '9' } else { 'A' })
        .collect()
}

/// For codes sorted in byte order, one past the last position whose code
/// starts with the code at each position. With parents taken as the longest
/// code that is a proper prefix, this is the end of each subtree.
pub fn subtree_ends<S: AsRef<str>>(codes: &[S]) -> Vec<usize> {
    let mut ends = vec![codes.len(); codes.len()];
    let mut open: Vec<usize> = Vec::new();
    for (i, c) in codes.iter().enumerate() {
        while let Some(&top) = open.last() {
            if c.as_ref().starts_with(codes[top].as_ref()) {
                break;
            }
            ends[top] = i;
            open.pop();
        }
        open.push(i);
    }
    ends
}

#[cfg(test)]
mod tests {
    use super::*;

    fn meta(from: &str, to: &str) -> Meta {
        Meta {
            vocabulary: "icd9cm".into(),
            title: "ICD-9-CM".into(),
            release: "FY2015".into(),
            coverage_from: Date::parse(from).unwrap(),
            coverage_to: Date::parse(to).unwrap(),
            sources: Vec::new(),
            dot_after: 3,
            dot_rules: Vec::new(),
            shapes: Vec::new(),
            notice: String::new(),
        }
    }

    #[test]
    fn the_default_day_falls_inside_the_coverage() {
        // ICD-9-CM's last release (FY2015) was in force from 2014-10-01 until
        // ICD-10-CM replaced it on 2015-10-01 (CMS, ICD-10 compliance date).
        let icd9 = meta("2014-10-01", "2015-09-30");
        let day = |s: &str| Date::parse(s).unwrap();
        assert_eq!(icd9.default_day(day("2026-12-02")), day("2015-09-30"));
        assert_eq!(icd9.default_day(day("2015-03-01")), day("2015-03-01"));
        assert_eq!(icd9.default_day(day("2010-01-01")), day("2014-10-01"));
        assert!(icd9.default_day_moved(day("2026-12-02")));
        assert!(!icd9.default_day_moved(day("2015-03-01")));
    }
}
