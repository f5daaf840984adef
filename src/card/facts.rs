//! The facts a card holds: the serialised shape of a card and its parts
//! (nodes, children, timeline segments, notes, links, mappings). No lookups
//! here; the other files of `card/` fill these in.

use crate::date::Date;
use crate::model::NoteKind;
use crate::report::{IndexInfo, OptionsInfo, Suggestion};
use serde::Serialize;

/// The cards of one request, with the index and options they were made with.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Cards {
    /// Vocabulary id (`icd10cm`).
    pub vocabulary: String,
    /// The index used.
    pub index: IndexInfo,
    /// The day or period asked about.
    pub options: OptionsInfo,
    /// One card per code asked for, in the order asked.
    pub cards: Vec<Card>,
}

/// Everything known about one code, node or code start.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Card {
    /// The code (dotted), or the text as written when it is no code.
    pub code: String,
    /// The vocabulary (`icd10cm`).
    pub system: String,
    /// Its official description (empty when unknown).
    pub description: String,
    /// On the day, or over the whole period: `billable`, `header`,
    /// `not-in-use`; in a stated hierarchy (HPO) `in-use` or `obsolete`;
    /// `changes` when the period holds several of these (see `timeline`);
    /// `code-start` for the start of several codes; for text that is no
    /// code, the check's status (`unknown`, `malformed`, `other-system`).
    pub status: &'static str,
    /// What a check says of an unknown or malformed code, with its suggestions.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub problem: Option<Problem>,
    /// Its states across the index's coverage, oldest first, gap-free.
    pub timeline: Vec<Segment>,
    /// The chapter it is in.
    pub chapter: Option<Named>,
    /// The section (block) it is in.
    pub section: Option<Named>,
    /// Its ancestors in force on the day, from the category down to the
    /// parent (a stated hierarchy: along first parents, from the root).
    pub ancestors: Vec<Node>,
    /// Every parent (several in a stated hierarchy such as HPO).
    pub parents: Vec<Node>,
    /// Its direct children in force on the day (the last day of a period).
    pub children: Vec<Child>,
    /// The other children of its parents on that day (for a category: the
    /// other categories of its section).
    pub siblings: Vec<Child>,
    /// The tabular list's notes stated at it, then those it inherits, nearest first.
    pub notes: Vec<CardNote>,
    /// Whether `notes` could be read: `loaded` (the notes file is at hand),
    /// `not-loaded` (the system's notes are in a notes file not added to
    /// the index, so `notes` is empty for that reason alone) or `none`
    /// (rollcall keeps no notes for this vocabulary).
    pub notes_status: &'static str,
    /// The 7th-character rule in force at it, if any.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub seventh_character: Option<Seventh>,
    /// Conversion-table successors (HPO: `replaced_by`).
    pub successors: Vec<Link>,
    /// Codes whose successors include it.
    pub predecessors: Vec<Link>,
    /// Codes the release suggests considering in its place (HPO `consider`).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub consider: Vec<Node>,
    /// Alternate ids that stand for it (HPO `alt_id`).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub alternate_ids: Vec<String>,
    /// Its other wordings, as the release writes them and in its order (a
    /// stated hierarchy: HPO `synonym`); left out when there are none.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub synonyms: Vec<String>,
    /// The mapping rows that name it, as source or as target (the GEMs).
    pub mappings: Vec<MapLink>,
}

/// Why a card has no code behind it.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Problem {
    /// The check's sentence.
    pub message: String,
    /// What the check suggests.
    pub suggestions: Vec<Suggestion>,
}

/// A chapter or section.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Named {
    /// Chapter number (`4`) or category range (`E08-E13`).
    pub code: String,
    /// Title.
    pub title: String,
}

/// A code with its description.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Node {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
}

/// A child or sibling on the day.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Child {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
    /// `billable` or `header` (HPO: `in-use`) on the day.
    pub status: &'static str,
    /// Billable codes under it on the day, itself included (HPO: terms in use).
    pub billable_under: u32,
}

/// One span of the timeline.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Segment {
    /// First day.
    pub from: Date,
    /// Last day.
    pub to: Date,
    /// `billable`, `header` or `absent` (HPO: `in-use` or `obsolete`).
    pub state: &'static str,
    /// How it came to be: `first-release` (so at the start of the
    /// coverage), `in-release` (a one-release vocabulary), `not-yet-added`, `added`, `subdivided` (its children took
    /// over), `merged` (its children were retired), `retired`, `obsolete`.
    pub reason: &'static str,
    /// The codes the reason names: the children that took over, the
    /// successors of a retired code.
    pub codes: Vec<String>,
}

/// A tabular-list note that holds for the code.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CardNote {
    /// What kind of note.
    pub kind: NoteKind,
    /// Its text as printed.
    pub text: String,
    /// The codes of this index it names (dotted; both ends of a range).
    pub codes: Vec<String>,
    /// Where it is stated: `code`, `section` or `chapter`.
    pub level: &'static str,
    /// The code, section range or chapter number that states it.
    pub at: String,
}

/// A 7th-character rule and where it is stated.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Seventh {
    /// The node that states it (dotted).
    pub at: String,
    /// Each allowed character and its meaning.
    pub extensions: Vec<(char, String)>,
}

/// A successor or predecessor.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Link {
    /// Dotted code.
    pub code: String,
    /// Description.
    pub description: String,
    /// The day the successor took over (absent for HPO `replaced_by`).
    pub effective: Option<Date>,
}

/// One mapping row naming the code.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct MapLink {
    /// The mapping (`gem-icd9cm-icd10cm`).
    pub mapping: String,
    /// Its title.
    pub title: String,
    /// Whether the code is the row's `source` or its `target`.
    pub role: &'static str,
    /// The other code of the row, dotted in its vocabulary (`NoDx` for none).
    pub code: String,
    /// Its vocabulary.
    pub system: String,
    /// Its description, when its index is at hand.
    pub description: String,
    /// The GEM flags of the row.
    pub flags: crate::model::MapFlags,
}
