//! The code systems a list may mix, and the shape checks for each: what a
//! code of the system looks like, and its check digit where the system has
//! one. A shape check cannot say that a code exists, only that it could.
//! Systems whose content rollcall ships (ICD-10-CM today) are checked
//! against their index; the others get these checks alone.

mod digits;
mod drugs;
mod icd;
mod names;
mod procedures;
pub(crate) mod terms;

pub use digits::{luhn_check_digit, verhoeff_check_digit, verhoeff_valid};
pub use drugs::{ndc, NdcForm, NdcReading};
pub use names::FHIR_URIS;
pub use terms::{loinc_check_digit, snomed_partition, Partition};

/// A code system, by the names the CLI and the JSON report use.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum System {
    /// ICD-10-CM diagnoses.
    Icd10cm,
    /// ICD-10-PCS procedures.
    Icd10pcs,
    /// ICD-9-CM diagnoses.
    Icd9cm,
    /// Human Phenotype Ontology terms.
    Hpo,
    /// LOINC (laboratory and clinical observations).
    Loinc,
    /// SNOMED CT identifiers.
    Snomed,
    /// National Drug Codes.
    Ndc,
    /// HCPCS Level II.
    Hcpcs,
    /// CPT (Category I, II and III).
    Cpt,
    /// RxNorm concept identifiers (RXCUI).
    Rxnorm,
}

/// Every system, in the order detection tries them.
pub const ALL: [System; 10] = [
    System::Icd10cm,
    System::Icd10pcs,
    System::Icd9cm,
    System::Hpo,
    System::Loinc,
    System::Snomed,
    System::Ndc,
    System::Hcpcs,
    System::Cpt,
    System::Rxnorm,
];

/// The system a list is checked in when none is named: the page's first
/// index, whose manifest is `index-manifest.json`.
pub const DEFAULT: System = System::Icd10cm;

/// The systems whose index rollcall ships ([`System::bundled`]), in the
/// order of [`ALL`].
pub fn bundled_systems() -> impl Iterator<Item = System> {
    ALL.into_iter().filter(|s| s.bundled())
}

/// The packed copy of a file served beside the page (`icd10cm.rcx.gz`):
/// gzip, for a server that sends files as they are. The page's build
/// (`index-manifest --pack`) writes it and names it in the file's manifest.
pub fn packed_copy(file: &str) -> String {
    format!("{file}.gz")
}

/// The encoding of a packed copy, as its manifest names it.
pub const PACKED_ENCODING: &str = "gzip";

/// Whether `file`, the packed copy a manifest names in `encoding`, is one
/// the page fetches and unpacks: gzip, and a plain file name beside the
/// index (letters, digits, `.`, `_` and `-`, starting with a letter or
/// digit, ending `.gz`), never a path or another site.
pub fn packed_copy_ok(file: &str, encoding: &str) -> bool {
    encoding == PACKED_ENCODING
        && file.len() > ".gz".len()
        && file.ends_with(".gz")
        && file.as_bytes()[0].is_ascii_alphanumeric()
        && file
            .bytes()
            .all(|b| b.is_ascii_alphanumeric() || matches!(b, b'.' | b'_' | b'-'))
}

impl System {
    /// The name used by `--system` and in JSON.
    pub fn name(self) -> &'static str {
        match self {
            System::Icd10cm => "icd10cm",
            System::Icd10pcs => "icd10pcs",
            System::Icd9cm => "icd9cm",
            System::Hpo => "hpo",
            System::Loinc => "loinc",
            System::Snomed => "snomed",
            System::Ndc => "ndc",
            System::Hcpcs => "hcpcs",
            System::Cpt => "cpt",
            System::Rxnorm => "rxnorm",
        }
    }

    /// The system named `name` (as [`System::name`] gives it; case and
    /// hyphens ignored).
    pub fn parse(name: &str) -> Option<System> {
        let n: String = name
            .chars()
            .filter(|c| !matches!(c, '-' | '_' | ' '))
            .collect::<String>()
            .to_ascii_lowercase();
        ALL.into_iter().find(|s| s.name() == n)
    }

    /// Whether rollcall ships an index of the system's content.
    pub fn bundled(self) -> bool {
        matches!(
            self,
            System::Icd10cm | System::Icd10pcs | System::Icd9cm | System::Hpo
        )
    }

    /// The bundled index kept at hand beside a list of this system: the
    /// other of ICD-10-CM and ICD-9-CM, since the GEMs of both directions
    /// live in the ICD-9-CM index (an old code in a new list is named with
    /// its targets, and a card shows its mappings both ways).
    pub fn companion(self) -> Option<System> {
        match self {
            System::Icd10cm => Some(System::Icd9cm),
            System::Icd9cm => Some(System::Icd10cm),
            _ => None,
        }
    }

    /// Whether the companion's codes are offered for this system's retired
    /// codes (through the GEMs), so that the companion is wanted beside a
    /// list with retired codes: a frozen system's codes were replaced by the
    /// companion's (ICD-9-CM by ICD-10-CM); ICD-10-CM codes are never
    /// offered ICD-9-CM ones.
    pub fn companion_replaces(self) -> bool {
        self.frozen() && self.companion().is_some()
    }

    /// The name of the manifest beside the page that describes the system's
    /// bundled index (release, coverage, size, SHA-256): `index-manifest.json`
    /// for the page's default, ICD-10-CM, `manifest-NAME.json` for the
    /// others; none for a system with no bundled index.
    pub fn index_manifest(self) -> Option<String> {
        match self {
            DEFAULT => Some("index-manifest.json".into()),
            s if s.bundled() => Some(format!("manifest-{}.json", s.name())),
            _ => None,
        }
    }

    /// The file of the system's bundled index, in `vocab/` and beside the
    /// page (`icd10cm.rcx`); none for a system with no bundled index.
    pub fn index_file(self) -> Option<String> {
        self.bundled().then(|| format!("{}.rcx", self.name()))
    }

    /// The file of the bundled notes of the system (the tabular list's
    /// notes, kept apart from the index: only the code card needs them),
    /// if it has one. It sits beside the index, and the page lists it in
    /// [`notes_manifest`](Self::notes_manifest).
    pub fn notes_file(self) -> Option<&'static str> {
        match self {
            System::Icd10cm => Some("icd10cm-notes.rcx"),
            _ => None,
        }
    }

    /// The name of the manifest beside the page that lists the notes file
    /// (its release, size and SHA-256), if the system has one.
    pub fn notes_manifest(self) -> Option<&'static str> {
        match self {
            System::Icd10cm => Some("manifest-icd10cm-notes.json"),
            _ => None,
        }
    }

    /// Whether the nodes above a system's codes are codes of their own
    /// (ICD-10-CM's categories and subcategories, which a list may name as
    /// headers) or only places in its tables (ICD-10-PCS: `0DT` is the
    /// root operation Resection of the gastrointestinal system, and only
    /// 7-character codes are codes; CMS, ICD-10-PCS Official Guidelines,
    /// A.1-A.2, from memory).
    pub fn nodes_are_codes(self) -> bool {
        self != System::Icd10pcs
    }

    /// Whether the vocabulary has had its last release, so that the end of
    /// an index's coverage is the end of its codes: ICD-9-CM, frozen after
    /// FY2015 and replaced in the US by ICD-10-CM and ICD-10-PCS from
    /// 2015-10-01 (the HIPAA code set rule, 45 CFR 162.1002; from memory).
    pub fn frozen(self) -> bool {
        self == System::Icd9cm
    }

    /// `a` or `an`, as said before the title.
    pub fn article(self) -> &'static str {
        match self {
            System::Loinc | System::Snomed | System::Cpt | System::Hcpcs => "a",
            _ => "an",
        }
    }

    /// A title for people.
    pub fn title(self) -> &'static str {
        match self {
            System::Icd10cm => "ICD-10-CM",
            System::Icd10pcs => "ICD-10-PCS",
            System::Icd9cm => "ICD-9-CM",
            System::Hpo => "HPO",
            System::Loinc => "LOINC",
            System::Snomed => "SNOMED CT",
            System::Ndc => "NDC",
            System::Hcpcs => "HCPCS Level II",
            System::Cpt => "CPT",
            System::Rxnorm => "RxNorm",
        }
    }
}

/// What a shape check says of one code.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Shape {
    /// The code has the system's shape (and check digit, if any). `code` is
    /// its normal written form; `note` says what was checked, for a report.
    Fits {
        /// The normal written form.
        code: String,
        /// What was checked, in words.
        note: String,
    },
    /// The code could be one of several codes of the system and the text
    /// cannot tell which (a hyphen-less 10-digit NDC).
    Ambiguous {
        /// Why.
        reason: String,
        /// The possible readings, in the normal form.
        readings: Vec<String>,
    },
    /// The code cannot be a code of the system; `reason` says why and what to do.
    Fails {
        /// Why.
        reason: String,
    },
}

impl Shape {
    /// Whether the shape fits (unambiguously).
    pub fn fits(&self) -> bool {
        matches!(self, Shape::Fits { .. })
    }
}

/// Checks the shape of `code` as a code of `system`. Surrounding spaces
/// are ignored; letter case is ignored where the system has one case.
pub fn shape(system: System, code: &str) -> Shape {
    let c = code.trim();
    match system {
        System::Icd10cm => icd::icd10cm(c),
        System::Icd10pcs => procedures::icd10pcs(c),
        System::Icd9cm => icd::icd9cm(c),
        System::Hpo => terms::hpo(c),
        System::Loinc => terms::loinc(c),
        System::Snomed => terms::snomed(c),
        System::Ndc => drugs::ndc_shape(c),
        System::Hcpcs => procedures::hcpcs(c),
        System::Cpt => procedures::cpt(c),
        System::Rxnorm => drugs::rxnorm(c),
    }
}

/// The systems whose shape `code` fits (ambiguous readings count), in the
/// order of [`ALL`]. Many short codes fit several systems (`12345` is a
/// CPT shape and an RxNorm identifier); membership in a loaded index, or
/// an explicit system, decides.
pub fn candidates(code: &str) -> Vec<System> {
    ALL.into_iter()
        .filter(|&s| !matches!(shape(s, code), Shape::Fails { .. }))
        .collect()
}

pub(crate) fn fits(code: impl Into<String>, note: impl Into<String>) -> Shape {
    Shape::Fits {
        code: code.into(),
        note: note.into(),
    }
}

pub(crate) fn fails(reason: impl Into<String>) -> Shape {
    Shape::Fails {
        reason: reason.into(),
    }
}

pub(crate) fn all_digits(s: &str) -> bool {
    !s.is_empty() && s.bytes().all(|b| b.is_ascii_digit())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The names the page's build writes (web/Trunk.toml's post-build hook)
    /// and the worker asks for.
    #[test]
    fn bundled_indexes_have_manifests_and_the_icd_pair_are_companions() {
        assert_eq!(
            System::Icd10cm.index_manifest().as_deref(),
            Some("index-manifest.json")
        );
        assert_eq!(
            System::Hpo.index_manifest().as_deref(),
            Some("manifest-hpo.json")
        );
        assert_eq!(System::Loinc.index_manifest(), None);
        assert_eq!(System::Icd10cm.companion(), Some(System::Icd9cm));
        assert_eq!(System::Icd9cm.companion(), Some(System::Icd10cm));
        assert_eq!(System::Hpo.companion(), None);
        for s in ALL {
            assert_eq!(s.index_manifest().is_some(), s.bundled(), "{s:?}");
        }
        // The four indexes web/Trunk.toml copies beside the page.
        let bundled: Vec<&str> = bundled_systems().map(System::name).collect();
        assert_eq!(bundled, ["icd10cm", "icd10pcs", "icd9cm", "hpo"]);
        assert!(DEFAULT.bundled());
        // And their files: vocab/icd10cm.rcx and the rest, and the notes.
        assert_eq!(System::Icd9cm.index_file().as_deref(), Some("icd9cm.rcx"));
        assert_eq!(System::Loinc.index_file(), None);
        for s in bundled_systems() {
            let file = s.index_file().expect("a bundled index");
            let path = format!("{}/vocab/{file}", env!("CARGO_MANIFEST_DIR"));
            assert!(std::path::Path::new(&path).is_file(), "{path}");
        }
    }

    /// The packed copy the build writes is one the page fetches; a path, a
    /// name of another site or another encoding is not (common practice:
    /// a manifest names a file beside it, never where else to fetch from).
    #[test]
    fn a_packed_copy_is_a_gzip_file_beside_the_index() {
        assert_eq!(packed_copy("icd10cm.rcx"), "icd10cm.rcx.gz");
        for s in bundled_systems() {
            let packed = packed_copy(&s.index_file().unwrap());
            assert!(packed_copy_ok(&packed, PACKED_ENCODING), "{packed}");
        }
        for (file, encoding) in [
            ("icd10cm.rcx.gz", "br"),
            ("icd10cm.rcx", "gzip"),
            ("../icd10cm.rcx.gz", "gzip"),
            ("sub/icd10cm.rcx.gz", "gzip"),
            ("https://elsewhere.example/x.gz", "gzip"),
            (".gz", "gzip"),
            ("-x.gz", "gzip"),
        ] {
            assert!(!packed_copy_ok(file, encoding), "{file} {encoding}");
        }
    }
}
