//! What a release format registers: the flag that names its file, what the
//! flag takes, a line on what it reads, and the function turning the file
//! into a part of a dated release or into a release of its own. The list
//! of formats is `readers::FORMATS`; the argument parser and the help
//! both read it.

use crate::assemble::Inputs;
use crate::provenance::Loaded;
use crate::stated;
use rollcall::Period;
use std::path::Path;

/// What a format's flag takes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Takes {
    /// A file.
    File,
    /// A file and the days it was in force: `FILE@FROM..TO`.
    Dated,
    /// A folder of the release's files.
    Dir,
}

impl Takes {
    /// The value's placeholder in the help.
    pub fn placeholder(self) -> &'static str {
        match self {
            Takes::File => "FILE",
            Takes::Dated => "FILE@PERIOD",
            Takes::Dir => "DIR",
        }
    }
}

/// Adds one file of a dated release to the inputs of `assemble`, and says
/// what it held (the words after "read NAME: "). The period is given for a
/// `Takes::Dated` format.
pub type AddPart = fn(&mut Inputs, &Loaded, Option<Period>) -> Result<String, String>;

/// Reads a release of its own from the path given (with the options, and
/// `SHA256SUMS` for a bundled one): what the index says of it and its terms.
pub type ReadOwn = fn(&Path, &Options, Option<&str>) -> Result<Own, String>;

/// A release that states its own hierarchy, as read.
pub struct Own {
    pub about: stated::About,
    pub terms: Vec<stated::Term>,
}

/// What a format's files become.
pub enum Builds {
    /// One of the files of a dated ICD release, put together by `assemble`.
    Part {
        /// What the file is in the release, as the index's sources name it
        /// (a dated file's role ends with the days it was in force).
        role: &'static str,
        add: AddPart,
    },
    /// A release that states its own hierarchy, an index of its own.
    Own {
        /// The options it takes (`args::OPTIONS`), and whether it needs each.
        options: &'static [(&'static str, bool)],
        /// Where it is written with no `--out`, in `vocab/` (none: `--out` is needed).
        default_out: Option<&'static str>,
        read: ReadOwn,
    },
}

/// One release format.
pub struct Format {
    /// The flag naming its file (`--history`).
    pub flag: &'static str,
    pub takes: Takes,
    /// What it reads, for the help.
    pub reads: &'static str,
    pub builds: Builds,
}

impl Format {
    /// Whether it is a release of its own.
    pub fn is_own(&self) -> bool {
        matches!(self.builds, Builds::Own { .. })
    }
}

/// The options of a build besides its files (set by `args::OPTIONS`).
#[derive(Debug, Default)]
pub struct Options {
    /// The LOINC map-to file.
    pub map_to: Option<std::path::PathBuf>,
    /// The release tag.
    pub release: Option<String>,
    /// The release's day, as given.
    pub day: Option<String>,
    /// Vocabulary id and name of a plain table.
    pub id: Option<String>,
    pub title: Option<String>,
}

impl Options {
    /// The release's day and its tag (the day, when no tag is given).
    pub fn release(&self) -> Result<(rollcall::Date, String), String> {
        let text = self
            .day
            .as_deref()
            .ok_or("an import needs --release-date YYYY-MM-DD, the day of the release")?;
        let day = rollcall::Date::parse(text)
            .map_err(|_| format!("--release-date {text} is not a date; write YYYY-MM-DD"))?;
        let tag = self.release.clone().unwrap_or_else(|| day.to_string());
        Ok((day, tag))
    }
}

/// The period of a dated file (`Takes::Dated`: the parser always gives one).
pub fn in_force(period: Option<Period>, flag: &str) -> Result<Period, String> {
    period.ok_or_else(|| format!("{flag} takes FILE@FROM..TO"))
}

/// A release file named on the command line (or in a bundled recipe): its
/// format, its path, and the days it was in force for a dated format.
pub struct Given {
    pub format: &'static Format,
    pub path: std::path::PathBuf,
    pub period: Option<Period>,
}
