//! A cell that is no code of the list's vocabulary but has the shape of
//! another system's code, or is a code of another index at hand (an ICD-9-CM
//! code in an ICD-10-CM list, with its GEM targets).

use super::*;

/// A cell that is no code of the list's vocabulary but has the shape of
/// other systems' codes, as facts; [`OtherShape::message`] writes the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct OtherShape {
    /// The cell as written.
    pub written: String,
    /// The list's vocabulary, by its title.
    pub own: String,
    /// Each system whose shape it fits, with what its shape rules say.
    pub fits: Vec<(System, String)>,
}

impl OtherShape {
    /// The systems whose shape it fits.
    pub(crate) fn systems(&self) -> Vec<System> {
        self.fits.iter().map(|(s, _)| *s).collect()
    }
}

/// The other systems whose shape a code that is no code of the index's
/// vocabulary fits.
pub(crate) fn other_systems(view: &View<'_>, written: &str) -> Option<OtherShape> {
    let own = view.meta().vocabulary.as_str();
    let fits: Vec<(System, String)> = systems::ALL
        .into_iter()
        .filter(|s| s.name() != own)
        .filter_map(|s| match systems::shape(s, written) {
            Shape::Fits { note, .. } => Some((s, note)),
            Shape::Ambiguous { reason, .. } => Some((s, reason)),
            Shape::Fails { .. } => None,
        })
        .collect();
    (!fits.is_empty()).then(|| OtherShape {
        written: written.to_string(),
        own: view.meta().title.clone(),
        fits,
    })
}

/// A cell that is a code of another index at hand, as facts;
/// [`KnownElsewhere::message`] writes the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct KnownElsewhere {
    /// The code as the other index shows it.
    pub code: String,
    /// The list's vocabulary, by its title.
    pub own: String,
    /// The other vocabulary's name (`icd9cm`).
    pub system: String,
    /// And its title.
    pub title: String,
    /// The code's description there.
    pub description: String,
    /// Its billable spans there.
    pub valid: Vec<Period>,
    /// Its targets in the list's vocabulary; `None` when neither index
    /// keeps a mapping between the two.
    pub mapped: Option<Mapped>,
}

/// When `code` is no code of `view` but a code of one of `others`: that
/// code in its system, with the targets of its mapping into `view`'s
/// vocabulary (the GEMs), their flags and their status in the period.
pub(crate) fn known_elsewhere(
    view: &View<'_>,
    others: &[View<'_>],
    code: &str,
    period: &Period,
) -> Option<KnownElsewhere> {
    for other in others {
        // A dot where the other system puts none (`E88.00` for E880.0) says
        // the code is not from there.
        let code::Resolved::Found { ord, changes } = code::resolve(other, code) else {
            continue;
        };
        if changes.contains(&"dot moved") {
            continue;
        }
        let meta = other.meta();
        return Some(KnownElsewhere {
            code: other.display(&other.code(ord)),
            own: view.meta().title.clone(),
            system: meta.vocabulary.clone(),
            title: meta.title.clone(),
            description: other.description_or_note(ord),
            valid: other.billable(ord).collect(),
            mapped: mapped_into(other, &other.code(ord), view, period),
        });
    }
    None
}

/// A code's targets in another vocabulary by a mapping (the GEMs), as facts.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct Mapped {
    /// The mapping's title (`General Equivalence Mappings (2015), ICD-9-CM
    /// to ICD-10-CM`).
    pub title: String,
    /// The flags of the code's rows, in words.
    pub words: String,
    /// Each target the rows name, with its flags in words and its status
    /// in the period.
    pub targets: Vec<Suggestion>,
    /// How many of the targets are billable on some day of the period.
    pub in_period: usize,
}

/// `code`, a code of `from`, mapped into the vocabulary of `into`, when
/// either index keeps a mapping between the two (the GEMs of both
/// directions are kept with ICD-9-CM).
pub(crate) fn mapped_into(
    from: &View<'_>,
    code: &str,
    into: &View<'_>,
    period: &Period,
) -> Option<Mapped> {
    let (source, target) = (&from.meta().vocabulary, &into.meta().vocabulary);
    let m = from
        .mapping(source, target)
        .or_else(|| into.mapping(source, target))?;
    let rows = m.lookup(code);
    let mut targets = Vec::new();
    let mut in_period = 0;
    for r in rows.iter().filter(|r| !r.flags.no_map) {
        let Some(t) = into.ordinal(&r.target) else {
            targets.push(Suggestion {
                code: r.target.clone(),
                description: String::new(),
                reason: format!(
                    "{} target, not in any {} release from {} on",
                    m.title,
                    into.meta().title,
                    into.meta().coverage_from
                ),
            });
            continue;
        };
        let mut reason = crate::mapping::row_words(&r.flags);
        if into.billable_in(t, period) {
            in_period += 1;
        } else {
            reason.push_str(", but not billable in the period");
        }
        targets.push(suggestion(into, t, reason));
    }
    Some(Mapped {
        title: m.title.to_string(),
        words: crate::mapping::flag_words(&rows),
        targets,
        in_period,
    })
}

/// A code of the list's vocabulary that is also a code of another index at
/// hand, written the same way, as facts; [`AlsoElsewhere::message`] writes
/// the sentence.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct AlsoElsewhere {
    /// The code as the list's index shows it.
    pub code: String,
    /// The list's vocabulary, by its title.
    pub own: String,
    /// The other vocabulary's title.
    pub title: String,
    /// The code's description there.
    pub description: String,
    /// Its billable and header spans there.
    pub spans: Vec<Period>,
}

/// When `code`, a code of `view`, is also a code of another index at hand
/// written the same way (ICD-10-CM's V10.3, a transport accident header,
/// is ICD-9-CM's personal history of breast cancer): that code there; the
/// list's own system is used. A form the other system writes with its dot
/// elsewhere (`E88.0` against `E880`) is not the same code.
pub(crate) fn also_elsewhere(
    view: &View<'_>,
    others: &[View<'_>],
    code: &str,
    shown: &str,
) -> Option<AlsoElsewhere> {
    others.iter().find_map(|other| {
        let ord = other.ordinal(code)?;
        if other.display(&other.code(ord)) != shown {
            return None;
        }
        Some(AlsoElsewhere {
            code: shown.to_string(),
            own: view.meta().title.clone(),
            title: other.meta().title.clone(),
            description: other.description_or_note(ord),
            spans: other.billable(ord).chain(other.header(ord)).collect(),
        })
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::check::testing::*;

    // The tiny vocabularies of `testing`: "old" ended on 2015-09-30 and
    // maps its 428.0 into "tiny" (I10, approximate; R00.1, retired in
    // "tiny" on 2019-09-30); I10 is a code of both (invented codes).

    /// A code of the other index at hand: that code there, and its targets
    /// with their flags and whether each is billable in the period.
    #[test]
    fn a_code_of_the_other_index_is_known_there_with_its_targets() {
        let (tiny, old) = (index(ten()), old());
        let period = span("2020-01-01", "2020-12-31");
        let known = known_elsewhere(&tiny.view(), &[old.view()], "428.0", &period)
            .expect("a code of the old index");
        assert_eq!(known.code, "428.0");
        assert_eq!((known.own.as_str(), known.system.as_str()), ("Tiny", "old"));
        assert_eq!(known.description, "Congestive heart failure, unspecified");
        assert_eq!(known.valid, [span("2010-10-01", "2015-09-30")]);
        let mapped = known.mapped.expect("the old index keeps the mapping");
        assert_eq!(mapped.title, "Old to Tiny");
        let targets: Vec<(&str, &str)> = mapped
            .targets
            .iter()
            .map(|t| (t.code.as_str(), t.reason.as_str()))
            .collect();
        assert_eq!(
            targets,
            [
                ("I10", "approximate"),
                ("R00.1", "approximate, but not billable in the period")
            ]
        );
        assert_eq!(mapped.in_period, 1);
        // No index at hand: nothing known.
        assert_eq!(known_elsewhere(&tiny.view(), &[], "428.0", &period), None);
    }

    /// The mapping is read from either index: from "tiny" into "old" none
    /// is kept, so a code of "tiny" in an "old" list has no targets.
    #[test]
    fn a_code_with_no_mapping_into_the_list_has_none() {
        let (tiny, old) = (index(ten()), old());
        let period = span("2014-01-01", "2014-12-31");
        let known = known_elsewhere(&old.view(), &[tiny.view()], "E11.9", &period)
            .expect("a code of the tiny index");
        assert_eq!((known.system.as_str(), known.mapped), ("tiny", None));
    }

    /// A code of the list's index written alike in the other: the other's
    /// description and days.
    #[test]
    fn a_code_of_both_names_the_other_reading() {
        let (tiny, old) = (index(ten()), old());
        let also = also_elsewhere(&tiny.view(), &[old.view()], "I10", "I10").expect("I10 in both");
        assert_eq!(
            also,
            AlsoElsewhere {
                code: "I10".into(),
                own: "Tiny".into(),
                title: "Old".into(),
                description: "Invented old code I10".into(),
                spans: vec![span("2010-10-01", "2015-09-30")],
            }
        );
        assert_eq!(
            also_elsewhere(&tiny.view(), &[old.view()], "E119", "E11.9"),
            None
        );
    }

    /// A cell with the shape of another system's code: that system. The
    /// HPO term's shape, `HP:` and seven digits, is the HPO's own
    /// (hp.obo ids).
    #[test]
    fn a_cell_in_another_systems_shape_names_it() {
        let tiny = index(ten());
        let shape = other_systems(&tiny.view(), "HP:0001250").expect("the HPO shape");
        assert_eq!(shape.systems(), [System::Hpo]);
        assert_eq!(shape.own, "Tiny");
        assert_eq!(other_systems(&tiny.view(), "not a code"), None);
    }
}
