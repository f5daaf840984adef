//! Reading a system column's cell: rollcall's own names, the usual written
//! forms (`ICD-10-CM`, `SNOMED CT`, `RxNorm`) and the FHIR code system URIs.

use super::{System, ALL};

/// FHIR code system URIs, as listed by HL7 Terminology (terminology.hl7.org,
/// the code system registry of FHIR R4), written here from memory. The
/// ICD-10-PCS one is the CMS page HL7 Terminology names for it; HCPCS has
/// the CMS release page; HPO the OBO PURL of its ontology file.
pub const FHIR_URIS: [(System, &str); 10] = [
    (System::Icd10cm, "http://hl7.org/fhir/sid/icd-10-cm"),
    (System::Icd10pcs, "http://www.cms.gov/Medicare/Coding/ICD10"),
    (System::Icd9cm, "http://hl7.org/fhir/sid/icd-9-cm"),
    (System::Hpo, "http://purl.obolibrary.org/obo/hp.owl"),
    (System::Loinc, "http://loinc.org"),
    (System::Snomed, "http://snomed.info/sct"),
    (System::Ndc, "http://hl7.org/fhir/sid/ndc"),
    (
        System::Hcpcs,
        "https://www.cms.gov/Medicare/Coding/HCPCSReleaseCodeSets",
    ),
    (System::Cpt, "http://www.ama-assn.org/go/cpt"),
    (
        System::Rxnorm,
        "http://www.nlm.nih.gov/research/umls/rxnorm",
    ),
];

/// Written forms beyond [`System::name`], compared without case, spaces,
/// hyphens, underscores and dots (`ICD-10 CM` reads as `icd10cm`).
const FORMS: &[(&str, System)] = &[
    ("icd9", System::Icd9cm),
    ("icd9dx", System::Icd9cm),
    ("humanphenotypeontology", System::Hpo),
    ("hp", System::Hpo),
    ("snomedct", System::Snomed),
    ("snomedctus", System::Snomed),
    ("sct", System::Snomed),
    ("nationaldrugcode", System::Ndc),
    ("hcpcslevelii", System::Hcpcs),
    ("hcpcsii", System::Hcpcs),
    ("cpt4", System::Cpt),
];

fn squeeze(s: &str) -> String {
    s.chars()
        .filter(|c| !matches!(c, '-' | '_' | ' ' | '.'))
        .collect::<String>()
        .to_ascii_lowercase()
}

/// The address part of a URI, for comparing: no scheme, no trailing slash,
/// lower case (`https://loinc.org/` and `http://loinc.org` are one system).
fn uri_key(s: &str) -> Option<String> {
    let l = s.trim().to_ascii_lowercase();
    let rest = l
        .strip_prefix("http://")
        .or_else(|| l.strip_prefix("https://"))?;
    Some(rest.trim_end_matches('/').to_string())
}

impl System {
    /// The system a system column's cell names: `Ok(None)` for an empty
    /// cell (the system is then told from the code), `Err` with a sentence
    /// naming the accepted values for a value rollcall does not know.
    pub fn from_cell(cell: &str) -> Result<Option<System>, String> {
        let t = cell.trim().trim_matches('"').trim();
        if t.is_empty() {
            return Ok(None);
        }
        let found = match uri_key(t) {
            Some(key) => FHIR_URIS
                .iter()
                .find(|(_, u)| uri_key(u).as_deref() == Some(key.as_str()))
                .map(|(s, _)| *s),
            None => {
                let n = squeeze(t);
                ALL.into_iter()
                    .find(|s| s.name() == n)
                    .or_else(|| FORMS.iter().find(|(f, _)| *f == n).map(|(_, s)| *s))
            }
        };
        found.map(Some).ok_or_else(|| {
            format!(
                "the system column says \"{t}\", which is not a system rollcall knows; write one of {} (or the usual written form such as ICD-10-CM or SNOMED CT, or the FHIR system URI such as http://loinc.org), or leave the cell empty to have the system told from the code",
                ALL.map(|s| s.name()).join(", ")
            )
        })
    }

    /// The FHIR code system URI of the system.
    pub fn fhir_uri(self) -> &'static str {
        FHIR_URIS
            .iter()
            .find(|(s, _)| *s == self)
            .map(|(_, u)| *u)
            .unwrap_or("")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_written_forms_and_uris() {
        let read = |c: &str| System::from_cell(c).unwrap();
        assert_eq!(read(""), None);
        assert_eq!(read("  "), None);
        for s in ALL {
            assert_eq!(read(s.name()), Some(s));
            assert_eq!(read(s.title()), Some(s), "{}", s.title());
            assert_eq!(read(s.fhir_uri()), Some(s), "{}", s.fhir_uri());
        }
        assert_eq!(read("ICD-10 CM"), Some(System::Icd10cm));
        assert_eq!(read("ICD10CM"), Some(System::Icd10cm));
        assert_eq!(read("ICD9"), Some(System::Icd9cm));
        assert_eq!(read("SNOMEDCT_US"), Some(System::Snomed));
        assert_eq!(read("https://loinc.org/"), Some(System::Loinc));
        assert_eq!(
            read("http://www.cms.gov/Medicare/Coding/ICD10"),
            Some(System::Icd10pcs)
        );
    }

    #[test]
    fn unknown_values_are_refused_with_the_names() {
        // ICD-10 without a modification is the WHO classification, not ICD-10-CM.
        for bad in ["ICD-10", "ICD-11", "http://example.org/codes", "MeSH"] {
            let e = System::from_cell(bad).unwrap_err();
            assert!(
                e.contains(bad) && e.contains("icd10pcs") && e.contains("rxnorm"),
                "{e}"
            );
        }
    }
}
