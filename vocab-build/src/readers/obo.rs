//! Reading an ontology in OBO 1.2 format (the HPO release file `hp.obo`):
//! each `[Term]` stanza's id, name, synonyms, `is_a` parents, obsolete flag,
//! `replaced_by`, `consider` and `alt_id`. Other stanzas (`[Typedef]`) and
//! tags are skipped.

use crate::error::BuildError;
use crate::stated::Term;
use rollcall::{Date, Period};
use crate::formats::{Builds, Format, Options, Own, Takes};
use crate::provenance::load;
use crate::stated;
use std::path::Path;

/// What the file says about itself, and its terms.
pub struct Ontology {
    /// `data-version` (`hp/releases/2025-01-16`).
    pub data_version: String,
    /// The release day read from the data version or `owl:versionInfo`.
    pub day: Date,
    /// Terms in file order, obsolete ones included: a term not obsolete is
    /// in use on the release day, an obsolete one on no day (the file does
    /// not say since when).
    pub terms: Vec<Term>,
    /// How many terms are obsolete.
    pub obsolete: usize,
}

/// The value of a tag line, without a trailing `! comment` or `{qualifiers}`.
fn value(v: &str) -> &str {
    let v = v.split(" ! ").next().unwrap_or(v);
    let v = match v.find(" {") {
        Some(i) => &v[..i],
        None => v,
    };
    v.trim()
}

/// The quoted text at the start of a `synonym:` or `def:` value.
fn quoted(v: &str) -> Option<String> {
    let rest = v.strip_prefix('"')?;
    let mut out = String::new();
    let mut chars = rest.chars();
    while let Some(c) = chars.next() {
        match c {
            '\\' => out.extend(chars.next()),
            '"' => return Some(out),
            c => out.push(c),
        }
    }
    None
}

/// Reads the file.
pub fn read(name: &str, text: &str) -> Result<Ontology, BuildError> {
    let mut data_version = String::new();
    let mut version_info = None;
    let mut terms: Vec<(Term, bool)> = Vec::new();
    let mut cur: Option<(Term, bool)> = None;
    let mut in_term = false;
    let mut header = true;
    let finish = |cur: &mut Option<(Term, bool)>, terms: &mut Vec<(Term, bool)>| {
        terms.extend(cur.take());
    };
    for (i, raw) in text.lines().enumerate() {
        let line = raw.trim_end_matches('\r');
        let n = i + 1;
        if line.starts_with('[') {
            header = false;
            finish(&mut cur, &mut terms);
            in_term = line.trim() == "[Term]";
            if in_term {
                cur = Some((
                    Term {
                        at: (name.to_string(), n),
                        ..Term::default()
                    },
                    false,
                ));
            }
            continue;
        }
        if line.trim().is_empty() || line.starts_with('!') {
            continue;
        }
        let Some((tag, v)) = line.split_once(':') else {
            return Err(BuildError::at(
                name,
                n,
                "is not a \"tag: value\" line of an OBO file; check that the file is OBO 1.2",
            ));
        };
        let v = v.trim_start();
        if header {
            match tag {
                "data-version" => data_version = v.trim().to_string(),
                "property_value" if v.starts_with("owl:versionInfo") => {
                    version_info = quoted(v.trim_start_matches("owl:versionInfo").trim());
                }
                _ => {}
            }
            continue;
        }
        if !in_term {
            continue;
        }
        let Some((t, is_obsolete)) = cur.as_mut() else {
            continue;
        };
        match tag {
            "id" => t.code = value(v).to_string(),
            "name" => t.description = v.trim().to_string(),
            "synonym" => t.synonyms.extend(quoted(v)),
            "is_a" => t.parents.push(value(v).to_string()),
            "is_obsolete" => *is_obsolete = value(v) == "true",
            "replaced_by" => t.replaced_by.push(value(v).to_string()),
            "consider" => t.consider.push(value(v).to_string()),
            "alt_id" => t.alt_ids.push(value(v).to_string()),
            _ => {}
        }
    }
    finish(&mut cur, &mut terms);
    if let Some((t, _)) = terms.iter().find(|(t, _)| t.code.is_empty()) {
        return Err(BuildError::at(
            name,
            t.at.1,
            "this [Term] stanza has no id: line; every term needs one",
        ));
    }
    let day = data_version
        .rsplit('/')
        .next()
        .and_then(|d| Date::parse(d).ok())
        .or_else(|| version_info.as_deref().and_then(|d| Date::parse(d).ok()))
        .ok_or_else(|| {
            BuildError::file(
                name,
                "states no release day (data-version: .../YYYY-MM-DD or owl:versionInfo); use an official release file",
            )
        })?;
    let obsolete = terms.iter().filter(|(_, gone)| *gone).count();
    let terms = terms
        .into_iter()
        .map(|(mut t, gone)| {
            if !gone {
                t.billable = vec![Period::new(day, day)];
            }
            t
        })
        .collect();
    Ok(Ontology {
        data_version,
        day,
        terms,
        obsolete,
    })
}

/// `--hpo FILE`: an HPO release, an index of its own (`vocab/hpo.rcx`
/// with no `--out`).
pub const FORMAT: Format = Format {
    flag: "--hpo",
    takes: Takes::File,
    reads: "an HPO release in OBO format (hp.obo): terms, is_a parents, obsolete terms with \
            replaced_by and consider, alt_ids",
    builds: Builds::Own {
        options: &[],
        default_out: Some("hpo.rcx"),
        read: read_release,
    },
};

/// The credit the HPO licence asks for (https://hpo.jax.org/app/license):
/// name the HPO and its release version, and point to the project.
fn notice(release: &str) -> String {
    format!(
        "This product uses the Human Phenotype Ontology (HPO), release {release}, from the HPO consortium; find out more at http://www.human-phenotype-ontology.org (licence: https://hpo.jax.org/app/license). Terms and their links are shown as released."
    )
}

fn read_release(file: &Path, _: &Options, sums: Option<&str>) -> Result<Own, String> {
    let e = |e: BuildError| e.to_string();
    let l = load(
        file,
        "terms, is_a hierarchy, obsolete terms, alternate ids",
        sums,
    )
    .map_err(e)?;
    let onto = read(&l.name, &l.text).map_err(e)?;
    eprintln!(
        "read {}: {} ({} terms, {} obsolete)",
        l.name,
        onto.data_version,
        onto.terms.len(),
        onto.obsolete
    );
    let release = onto.day.to_string();
    let about = stated::About {
        id: "hpo".into(),
        title: "HPO".into(),
        notice: notice(&release),
        release,
        day: onto.day,
        sources: vec![l.source],
    };
    Ok(Own {
        about,
        terms: onto.terms,
    })
}
