//! The bundled indexes and notes built into the binary, the index a command
//! checks against (`--system`, `--index`), and the others kept at hand.

use super::*;

/// The bundled indexes, built by vocab-build from vocab-build/sources, with
/// the name `info` shows; the first is the default. Adding one is a line
/// here (and its system's `System::bundled`).
pub(crate) static BUNDLED_INDEXES: &[(System, &[u8], &str)] = &[
    (
        System::Icd10cm,
        include_bytes!("../../../vocab/icd10cm.rcx"),
        "vocab/icd10cm.rcx (built into this binary)",
    ),
    (
        System::Icd10pcs,
        include_bytes!("../../../vocab/icd10pcs.rcx"),
        "vocab/icd10pcs.rcx (built into this binary)",
    ),
    (
        System::Icd9cm,
        include_bytes!("../../../vocab/icd9cm.rcx"),
        "vocab/icd9cm.rcx (built into this binary)",
    ),
    (
        System::Hpo,
        include_bytes!("../../../vocab/hpo.rcx"),
        "vocab/hpo.rcx (built into this binary)",
    ),
];

pub(crate) static BUNDLED: &[u8] = BUNDLED_INDEXES[0].1;

/// The bundled notes files (the tabular list's notes, for `show`), each
/// written by vocab-build with the bundled index of its system (the file
/// `System::notes_file` names).
pub(crate) static BUNDLED_NOTES: &[(System, &[u8])] = &[(
    System::Icd10cm,
    include_bytes!("../../../vocab/icd10cm-notes.rcx"),
)];

/// Adds the notes of `path` (`--notes`) to the index, or else the bundled
/// notes of its system when they were written for it (the bundled index,
/// or the same file given with `--index`).
pub(crate) fn add_notes(
    index: &mut Index<&'static [u8]>,
    path: Option<&str>,
) -> Result<(), String> {
    use rollcall::NotesFile;
    if let Some(p) = path {
        let bytes = std::fs::read(p).map_err(|e| format!("cannot read the notes {p}: {e}"))?;
        let bytes: &'static [u8] = Box::leak(bytes.into_boxed_slice());
        let notes = NotesFile::open(bytes).map_err(|e| format!("{p}: {e}"))?;
        notes.verify().map_err(|e| format!("{p}: {e}"))?;
        return index.add_notes(notes).map_err(|e| format!("{p}: {e}"));
    }
    let system = System::parse(&index.meta().vocabulary);
    let bundled = BUNDLED_NOTES.iter().find(|(s, _)| Some(*s) == system);
    if let Some((_, bytes)) = bundled {
        let notes = NotesFile::open(*bytes).map_err(|e| e.to_string())?;
        if notes.pairs_with(index).is_ok() {
            index.add_notes(notes).map_err(|e| e.to_string())?;
        }
    }
    Ok(())
}

/// The bundled index of `system`, opened (a header check; no copy).
pub(crate) fn bundled(system: System) -> Option<Result<Index<&'static [u8]>, String>> {
    BUNDLED_INDEXES
        .iter()
        .find(|(s, _, _)| *s == system)
        .map(|(_, bytes, _)| Index::open(*bytes).map_err(|e| e.to_string()))
}

pub(crate) enum Loaded {
    Bundled(Index<&'static [u8]>),
    /// An index file; its bytes live as long as the process, like the
    /// bundled ones, so both can be checked side by side.
    File(Index<&'static [u8]>, String),
}

impl Loaded {
    pub(crate) fn index(&self) -> &Index<&'static [u8]> {
        match self {
            Loaded::Bundled(i) | Loaded::File(i, _) => i,
        }
    }

    pub(crate) fn index_mut(&mut self) -> &mut Index<&'static [u8]> {
        match self {
            Loaded::Bundled(i) | Loaded::File(i, _) => i,
        }
    }
}

/// What a list is checked against: an index, or a system's shape rules.
#[allow(clippy::large_enum_variant)] // one value per run
pub(crate) enum Target {
    Index(Loaded),
    Shapes(System),
}

type Opened = std::sync::OnceLock<Result<Index<&'static [u8]>, String>>;

/// The bundled index of `system`, opened once (each kept for the run).
pub(crate) fn opened(system: System) -> Result<&'static Index<&'static [u8]>, String> {
    static ONCE: [Opened; BUNDLED_INDEXES.len()] =
        [const { std::sync::OnceLock::new() }; BUNDLED_INDEXES.len()];
    let at = BUNDLED_INDEXES
        .iter()
        .position(|(s, _, _)| *s == system)
        .ok_or_else(|| format!("{} is not bundled", system.name()))?;
    ONCE[at]
        .get_or_init(|| {
            bundled(system).unwrap_or_else(|| Err(format!("{} is not bundled", system.name())))
        })
        .as_ref()
        .map_err(|e| e.clone())
}

/// The bundled ICD-9-CM index, opened once.
pub(crate) fn icd9() -> Result<&'static Index<&'static [u8]>, String> {
    opened(System::Icd9cm)
}

/// The bundled indexes a check of `text` needs beside its own vocabulary
/// `own`: every one the list's system column names, and ICD-9-CM (with the
/// GEMs) beside ICD-10-CM and the reverse, so a code of the other system
/// is named with its GEM targets.
pub(crate) fn at_hand(own: &str, draft: &Draft) -> Result<Vec<Index<&'static [u8]>>, String> {
    let mut want = systems_named_in(draft);
    want.extend(System::parse(own).and_then(System::companion));
    want.sort();
    want.dedup();
    want.into_iter()
        .filter(|s| s.name() != own)
        .filter_map(bundled)
        .collect()
}

/// Checks a list: the rows with no system cell against the target, the
/// others in the system their cell names.
pub(crate) fn check_draft(
    target: &Target,
    draft: &Draft,
    opts: &CheckOptions,
) -> Result<rollcall::Report, String> {
    let (primary, own) = match target {
        Target::Index(l) => (
            Primary::Index(l.index()),
            l.index().meta().vocabulary.clone(),
        ),
        Target::Shapes(s) => (Primary::Shapes(*s), s.name().to_string()),
    };
    let others = at_hand(&own, draft)?;
    let refs: Vec<&Index<&'static [u8]>> = others.iter().collect();
    Ok(check_listed_draft(primary, &refs, draft, opts).0)
}

/// Other indexes at hand for a check: the companion of the index's
/// system (`System::companion`: ICD-9-CM, with the GEMs, beside an
/// ICD-10-CM list, so old codes in a new list are named with their
/// targets, and ICD-10-CM beside ICD-9-CM for the backward GEMs).
pub(crate) fn companions<D: AsRef<[u8]>>(i: &Index<D>) -> Result<Vec<View<'static>>, String> {
    System::parse(&i.meta().vocabulary)
        .and_then(System::companion)
        .map(|s| opened(s).map(|c| c.view()))
        .into_iter()
        .collect()
}

/// The day checked when none is given: the index's own default (inside its
/// coverage), or today for a check by shape.
pub(crate) fn default_day(target: &Target, a: &Args) -> Date {
    // Said only when it is the day checked: no day or period was given.
    let none_given = a.on.is_none() && a.from.is_none() && a.to.is_none();
    match target {
        Target::Index(l) => {
            let meta = l.index().meta();
            let day = meta.default_day(today());
            if none_given && meta.default_day_moved(today()) && !meta.snapshot() {
                eprintln!(
                    "rollcall: no date given; the {} index covers {} to {}, so the list is checked on {day}",
                    meta.title, meta.coverage_from, meta.coverage_to
                );
            }
            day
        }
        Target::Shapes(_) => today(),
    }
}

/// One of the exports of `rollcall::export` for a checked list.
pub(crate) fn export_text(
    format: &str,
    target: &Target,
    report: &rollcall::Report,
    draft: &Draft,
    opts: &CheckOptions,
    url: Option<&str>,
) -> Result<String, String> {
    let meta = rollcall::export::ValueSetMeta::new(url.unwrap_or_default(), today());
    match target {
        Target::Index(l) => {
            let index = l.index();
            let reach = if format.starts_with("codes-") {
                rollcall::check::check_draft_with_reach(index, &companions(index)?, draft, opts).1
            } else {
                Vec::new()
            };
            let view = index.view();
            let src = rollcall::export::Source {
                report,
                reach: &reach,
                view: Some(&view),
                meta,
            };
            rollcall::export::export(format, &src).map(|e| e.text)
        }
        Target::Shapes(_) => {
            let src = rollcall::export::Source {
                report,
                reach: &[],
                view: None,
                meta,
            };
            rollcall::export::export(format, &src).map(|e| e.text)
        }
    }
}

pub(crate) fn target(a: &Args) -> Result<Target, String> {
    let system = match a.system.as_deref() {
        None => None,
        Some(n) => Some(System::parse(n).ok_or_else(|| {
            format!(
                "--system {n} is not known; the names are {}",
                rollcall::systems::ALL.map(|s| s.name()).join(", ")
            )
        })?),
    };
    match (system, a.index.as_deref()) {
        (None, path) => load_index(path).map(Target::Index),
        (Some(s), Some(path)) => {
            let loaded = load_index(Some(path))?;
            let i = loaded.index();
            if i.meta().vocabulary != s.name() {
                return Err(format!(
                    "{path} is an {} index, not {}; drop --system or give an index of that system",
                    i.meta().vocabulary,
                    s.name()
                ));
            }
            Ok(Target::Index(loaded))
        }
        (Some(s), None) => match bundled(s) {
            Some(i) => i.map(|i| Target::Index(Loaded::Bundled(i))),
            None => Ok(Target::Shapes(s)),
        },
    }
}

pub(crate) fn load_index(path: Option<&str>) -> Result<Loaded, String> {
    match path {
        None => Index::open(BUNDLED)
            .map(Loaded::Bundled)
            .map_err(|e| e.to_string()),
        Some(p) => {
            let bytes = std::fs::read(p).map_err(|e| format!("cannot read the index {p}: {e}"))?;
            let bytes: &'static [u8] = Box::leak(bytes.into_boxed_slice());
            let idx = Index::open(bytes).map_err(|e| format!("{p}: {e}"))?;
            idx.verify().map_err(|e| format!("{p}: {e}"))?;
            Ok(Loaded::File(idx, p.to_string()))
        }
    }
}
