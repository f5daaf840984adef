//! One module per release format: each parses the text of one official
//! file into plain rows (or, for a release that states its own hierarchy,
//! into `stated::Term`s) and names the file and line of a bad row. What the
//! rows contribute to an index is decided in `assemble` (dated ICD
//! releases) or `stated` (ontologies and imports).
//!
//! Each format's module ends with its `FORMAT` (`formats::Format`): its
//! flag, what it reads and what it builds. The list below declares the
//! modules and registers their formats, in the order the help lists them:
//! adding a format is its file and its line here.

macro_rules! formats {
    ($($module:ident),* $(,)?) => {
        $(pub mod $module;)*

        /// Every release format, in the order the help lists them.
        pub static FORMATS: &[crate::formats::Format] = &[$($module::FORMAT),*];
    };
}

formats! {
    history,
    tabular,
    order,
    codefile,
    conversion,
    gems,
    obo,
    loinc,
    rxnorm,
    table,
}

// Shared by the formats above; no format of their own.
pub mod csv;
pub mod xml;

/// The format whose flag is `flag`.
pub fn format(flag: &str) -> Option<&'static crate::formats::Format> {
    FORMATS.iter().find(|f| f.flag == flag)
}
