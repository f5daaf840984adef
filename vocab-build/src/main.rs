//! vocab-build: reads official release files and writes a rollcall index.
//!
//! With no arguments it builds the bundled ICD-10-CM index from
//! `vocab-build/sources/` into `vocab/icd10cm.rcx`. With arguments it builds
//! from any year's official files (see `--help`).

mod assemble;
mod error;
mod readers;
mod stated;

use assemble::Inputs;
use error::BuildError;
use readers::*;
use rollcall::model::Source;
use rollcall::{Date, Period};
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

const HELP: &str = "\
vocab-build: write a rollcall index from official release files

usage:
  vocab-build                      build the bundled indexes (vocab-build/sources ->
                                   vocab/icd10cm.rcx, icd10pcs.rcx, icd9cm.rcx, hpo.rcx,
                                   and icd10cm-notes.rcx, the tabular notes)
  vocab-build [--vocabulary icd10cm|icd10pcs|icd9cm] [FILES...] --out PATH
  vocab-build --hpo FILE.obo --out PATH
  vocab-build --loinc Loinc.csv [--loinc-map-to MapTo.csv] --release-date DAY [--release TAG] --out PATH
  vocab-build --rxnorm DIR --release-date DAY [--release TAG] --out PATH
  vocab-build --table FILE.tsv --id ID --title TITLE --release-date DAY [--release TAG] --out PATH

files (plain or .gz; PERIOD is FROM..TO in YYYY-MM-DD, the days the file was in force):
  --history FILE               release-history TSV (code, valid_from, valid_to, description)
  --tabular FILE@PERIOD        CDC tabular XML (hierarchy, chapters, sections, 7th characters)
  --order FILE@PERIOD          CMS order file (fixed width; flag 1 billable, 0 header)
  --codes FILE@PERIOD          CMS code-description file (billable codes)
  --conversion FILE            CMS conversion table (effective_date, current_code, previous_code)
  --gems FILE                  a General Equivalence Mappings CSV (either direction), kept in the index

  --hpo FILE                   an HPO release in OBO format (hp.obo): terms, is_a parents,
                               obsolete terms with replaced_by and consider, alt_ids

imports of releases a site is licensed for (each builds an index of its own):
  --loinc FILE                 the LOINC table (Loinc.csv): LOINC_NUM, LONG_COMMON_NAME or
                               COMPONENT, SHORTNAME, STATUS (TRIAL and DISCOURAGED warn,
                               DEPRECATED is retired)
  --loinc-map-to FILE          the LOINC map-to file (MapTo.csv): replacements of deprecated terms
  --rxnorm DIR                 an RxNorm release's rrf/ folder: RXNCONSO.RRF (SAB=RXNORM names),
                               RXNCUI.RRF when present (retired and remapped RXCUIs)
  --table FILE                 the plain table format (see README: code, description, parent,
                               status, valid_from, valid_to, replaced_by)
  --release TAG                the release tag shown in reports (default: the release date)
  --release-date DAY           the release's day, YYYY-MM-DD (required for imports)
  --id ID, --title TITLE       vocabulary id and name of a --table import

Without --history, billable dates come from the order and code files' periods.
The notes of the newest --tabular go to a notes file beside the index (PATH's name
with -notes: icd10cm-notes.rcx for icd10cm.rcx), which pairs with that index only.
--vocabulary icd10pcs builds an ICD-10-PCS index: no dots, and the hierarchy by
position (every prefix of a code is a node above it); the default is icd10cm.
";

struct Loaded {
    name: String,
    text: String,
    source: Source,
}

fn load(path: &Path, role: &str, sums: Option<&str>) -> Result<Loaded, BuildError> {
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().to_string())
        .unwrap_or_default();
    let raw = std::fs::read(path).map_err(|e| {
        BuildError::file(
            &path.display().to_string(),
            format!("cannot be read ({e}); check the path"),
        )
    })?;
    let sha = rollcall::sha256::hex(&rollcall::sha256::digest(&raw));
    if let Some(sums) = sums {
        let want = sums.lines().find_map(|l| {
            l.split_once("  ")
                .filter(|(_, f)| *f == name)
                .map(|(h, _)| h)
        });
        match want {
            Some(h) if h == sha => {}
            Some(h) => {
                return Err(BuildError::file(
                    &name,
                    format!("SHA-256 is {sha} but SHA256SUMS says {h}; restore the file from ../shared/vocab or from git"),
                ))
            }
            None => return Err(BuildError::file(&name, "is not listed in SHA256SUMS")),
        }
    }
    let text = if name.ends_with(".gz") {
        let mut bytes = Vec::new();
        flate2::read::MultiGzDecoder::new(&raw[..])
            .read_to_end(&mut bytes)
            .map_err(|e| {
                BuildError::file(&name, format!("is not valid gzip-compressed data ({e})"))
            })?;
        latin1_if_not_utf8(&name, bytes)
    } else {
        latin1_if_not_utf8(&name, raw)
    };
    Ok(Loaded {
        source: Source {
            file: name.clone(),
            sha256: sha,
            role: role.to_string(),
        },
        name,
        text,
    })
}

/// Text as UTF-8, or, when it is not, as ISO-8859-1 (the encoding of the
/// CMS ICD-9-CM files), saying so.
fn latin1_if_not_utf8(name: &str, bytes: Vec<u8>) -> String {
    match String::from_utf8(bytes) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("note: {name} is not UTF-8; read as ISO-8859-1");
            e.into_bytes().into_iter().map(char::from).collect()
        }
    }
}

fn period(s: &str) -> Result<Period, String> {
    let (a, b) = s.split_once("..").ok_or_else(|| {
        format!("\"{s}\" is not a period; write FROM..TO, e.g. 2025-10-01..2026-09-30")
    })?;
    let (a, b) = (
        Date::parse(a).map_err(|e| e.to_string())?,
        Date::parse(b).map_err(|e| e.to_string())?,
    );
    if b < a {
        return Err(format!("period {s} ends before it starts"));
    }
    Ok(Period::new(a, b))
}

enum Arg {
    History(PathBuf),
    Tabular(PathBuf, Period),
    Order(PathBuf, Period),
    Codes(PathBuf, Period),
    Conversion(PathBuf),
    Gems(PathBuf),
    Hpo(PathBuf),
    Loinc(PathBuf),
    Rxnorm(PathBuf),
    Table(PathBuf),
}

/// The options of an import.
#[derive(Default)]
struct Import {
    map_to: Option<PathBuf>,
    release: Option<String>,
    day: Option<String>,
    id: Option<String>,
    title: Option<String>,
}

fn bundled(dir: &Path) -> Vec<Arg> {
    let p = |a: &str, b: &str| Period::new(Date::parse(a).unwrap(), Date::parse(b).unwrap());
    let f = |n: &str| dir.join(n);
    vec![
        Arg::History(f("icd10cm-history-FY2016-FY2027.tsv.gz")),
        Arg::Tabular(
            f("icd10cm-tabular-2021.xml.gz"),
            p("2020-10-01", "2020-12-31"),
        ),
        Arg::Order(
            f("icd10cm-order-2021-01.txt.gz"),
            p("2021-01-01", "2021-09-30"),
        ),
        Arg::Codes(
            f("icd10cm-codes-FY2024.txt.gz"),
            p("2023-10-01", "2024-09-30"),
        ),
        Arg::Tabular(
            f("icd10cm-tabular-2025-04-01.xml.gz"),
            p("2025-04-01", "2025-09-30"),
        ),
        Arg::Tabular(
            f("icd10cm-tabular-2026-04-01.xml.gz"),
            p("2026-04-01", "2026-09-30"),
        ),
        Arg::Conversion(f("icd10cm-conversion-FY2017-FY2026.tsv.gz")),
    ]
}

/// The bundled ICD-9-CM recipe: the final code file (version 32), in force
/// for FY2015, the last year before the system was retired on 2015-10-01
/// (HHS final rule, 79 FR 45128).
fn bundled_icd9(dir: &Path) -> Vec<Arg> {
    vec![
        Arg::Codes(
            dir.join("CMS32_DESC_LONG_DX.txt.gz"),
            Period::new(
                Date::parse("2014-10-01").unwrap(),
                Date::parse("2015-09-30").unwrap(),
            ),
        ),
        Arg::Gems(dir.join("icd9cm-to-icd10cm-gem-2015.csv.gz")),
        Arg::Gems(dir.join("icd10cm-to-icd9cm-gem-2015.csv.gz")),
    ]
}

/// The bundled ICD-10-PCS recipe: the history gives the billable dates, the
/// FY2024 code file the descriptions of the codes valid that year.
fn bundled_pcs(dir: &Path) -> Vec<Arg> {
    let p = |a: &str, b: &str| Period::new(Date::parse(a).unwrap(), Date::parse(b).unwrap());
    vec![
        Arg::History(dir.join("icd10pcs-history-FY2016-FY2027.tsv.gz")),
        Arg::Codes(
            dir.join("icd10pcs-codes-FY2024.txt.gz"),
            p("2023-10-01", "2024-09-30"),
        ),
    ]
}

/// Files to read, where to write, the vocabulary, or the help text to print instead.
type Parsed = (
    Vec<Arg>,
    Option<PathBuf>,
    assemble::Vocabulary,
    Option<String>,
    Import,
);

fn parse_args(args: &[String]) -> Result<Parsed, String> {
    let mut out = Vec::new();
    let mut dest = None;
    let mut vocabulary = assemble::ICD10CM;
    let mut import = Import::default();
    let mut it = args.iter();
    while let Some(a) = it.next() {
        let mut val = || {
            it.next()
                .cloned()
                .ok_or_else(|| format!("{a} needs a value"))
        };
        let dated = |v: String| -> Result<(PathBuf, Period), String> {
            let (f, p) = v.rsplit_once('@').ok_or_else(|| {
                format!("{a} takes FILE@FROM..TO, e.g. order.txt@2024-10-01..2025-09-30")
            })?;
            Ok((PathBuf::from(f), period(p)?))
        };
        match a.as_str() {
            "-h" | "--help" => {
                return Ok((Vec::new(), None, vocabulary, Some(HELP.to_string()), import))
            }
            "--vocabulary" => {
                vocabulary = match val()?.as_str() {
                    "icd10cm" => assemble::ICD10CM,
                    "icd10pcs" => assemble::ICD10PCS,
                    "icd9cm" => assemble::ICD9CM,
                    v => {
                        return Err(format!(
                            "--vocabulary {v} is not known; use icd10cm, icd10pcs or icd9cm"
                        ))
                    }
                }
            }
            "--history" => out.push(Arg::History(val()?.into())),
            "--conversion" => out.push(Arg::Conversion(val()?.into())),
            "--gems" => out.push(Arg::Gems(val()?.into())),
            "--hpo" => out.push(Arg::Hpo(val()?.into())),
            "--loinc" => out.push(Arg::Loinc(val()?.into())),
            "--rxnorm" => out.push(Arg::Rxnorm(val()?.into())),
            "--table" => out.push(Arg::Table(val()?.into())),
            "--loinc-map-to" => import.map_to = Some(val()?.into()),
            "--release" => import.release = Some(val()?),
            "--release-date" => import.day = Some(val()?),
            "--id" => import.id = Some(val()?),
            "--title" => import.title = Some(val()?),
            "--tabular" => {
                let (f, p) = dated(val()?)?;
                out.push(Arg::Tabular(f, p))
            }
            "--order" => {
                let (f, p) = dated(val()?)?;
                out.push(Arg::Order(f, p))
            }
            "--codes" => {
                let (f, p) = dated(val()?)?;
                out.push(Arg::Codes(f, p))
            }
            "--out" => dest = Some(PathBuf::from(val()?)),
            other => {
                return Err(format!(
                    "unknown argument \"{other}\"; see vocab-build --help"
                ))
            }
        }
    }
    Ok((out, dest, vocabulary, None, import))
}

fn run(args: &[String]) -> Result<(), String> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let (files, dest, vocabulary, help, import) = parse_args(args)?;
    if let Some(h) = help {
        print!("{h}");
        return Ok(());
    }
    let imports = files
        .iter()
        .filter(|a| matches!(a, Arg::Loinc(_) | Arg::Rxnorm(_) | Arg::Table(_)))
        .count();
    if imports == 0 && import.map_to.is_some() {
        return Err("--loinc-map-to goes with --loinc".into());
    }
    if imports > 0 {
        let [a] = files.as_slice() else {
            return Err("--loinc, --rxnorm and --table each build an index of their own; give one of them without other files".into());
        };
        let dest = dest.ok_or("an import needs --out PATH, the index file to write")?;
        return build_import(a, &import, &dest);
    }
    if import.release.is_some()
        || import.day.is_some()
        || import.id.is_some()
        || import.title.is_some()
    {
        return Err(
            "--release, --release-date, --id and --title go with --loinc, --rxnorm or --table"
                .into(),
        );
    }
    if let [Arg::Hpo(f)] = files.as_slice() {
        let dest = dest.unwrap_or_else(|| root.join("..").join("vocab").join("hpo.rcx"));
        return build_hpo(f, &dest, None);
    }
    if files.iter().any(|a| matches!(a, Arg::Hpo(_))) {
        return Err("--hpo builds an index of its own; give it without other files".into());
    }
    if !files.is_empty() {
        let dest = dest.unwrap_or_else(|| {
            root.join("..")
                .join("vocab")
                .join(format!("{}.rcx", vocabulary.id))
        });
        return build(&files, &dest, vocabulary, None);
    }
    let dir = root.join("sources");
    let sums = std::fs::read_to_string(dir.join("SHA256SUMS"))
        .map_err(|e| format!("{}: {e}", dir.join("SHA256SUMS").display()))?;
    let vocab = root.join("..").join("vocab");
    if dest.is_some() {
        return Err(
            "--out needs source files; with none, vocab-build writes the bundled indexes to vocab/"
                .into(),
        );
    }
    build(
        &bundled(&dir),
        &vocab.join("icd10cm.rcx"),
        assemble::ICD10CM,
        Some(&sums),
    )?;
    build(
        &bundled_pcs(&dir),
        &vocab.join("icd10pcs.rcx"),
        assemble::ICD10PCS,
        Some(&sums),
    )?;
    build(
        &bundled_icd9(&dir),
        &vocab.join("icd9cm.rcx"),
        assemble::ICD9CM,
        Some(&sums),
    )?;
    build_hpo(
        &dir.join("hp-2025-01-16.obo.gz"),
        &vocab.join("hpo.rcx"),
        Some(&sums),
    )
}

/// The credit the HPO licence asks for (https://hpo.jax.org/app/license):
/// name the HPO and its release version, and point to the project.
fn hpo_notice(release: &str) -> String {
    format!(
        "This product uses the Human Phenotype Ontology (HPO), release {release}, from the HPO consortium; find out more at http://www.human-phenotype-ontology.org (licence: https://hpo.jax.org/app/license). Terms and their links are shown as released."
    )
}

/// Builds an HPO index from an OBO release file.
fn build_hpo(file: &Path, dest: &Path, sums: Option<&str>) -> Result<(), String> {
    let started = std::time::Instant::now();
    let e = |e: BuildError| e.to_string();
    let l = load(
        file,
        "terms, is_a hierarchy, obsolete terms, alternate ids",
        sums,
    )
    .map_err(e)?;
    let onto = obo::read(&l.name, &l.text).map_err(e)?;
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
        notice: hpo_notice(&release),
        release,
        day: onto.day,
        sources: vec![l.source],
    };
    let release = stated::build(about, onto.terms).map_err(e)?;
    write_release(&release, dest, started)
}

/// Builds an index from a release a site holds itself: LOINC, RxNorm or
/// the plain table.
fn build_import(a: &Arg, o: &Import, dest: &Path) -> Result<(), String> {
    let started = std::time::Instant::now();
    let e = |e: BuildError| e.to_string();
    let day_text = o
        .day
        .as_deref()
        .ok_or("an import needs --release-date YYYY-MM-DD, the day of the release")?;
    let day = Date::parse(day_text)
        .map_err(|_| format!("--release-date {day_text} is not a date; write YYYY-MM-DD"))?;
    let release = o.release.clone().unwrap_or_else(|| day.to_string());
    let (about, terms) = match a {
        Arg::Loinc(f) => {
            if o.id.is_some() || o.title.is_some() {
                return Err(
                    "--id and --title go with --table; a LOINC index is always loinc".into(),
                );
            }
            let l = load(f, "terms, names and statuses", None).map_err(e)?;
            let m = match &o.map_to {
                Some(m) => Some(load(m, "replacements of deprecated terms", None).map_err(e)?),
                None => None,
            };
            let t = loinc::read(
                &l.name,
                &l.text,
                m.as_ref().map(|m| (m.name.as_str(), m.text.as_str())),
                day,
            )
            .map_err(e)?;
            eprintln!(
                "read {}: {} terms, {} deprecated, {} trial or discouraged; {} map-to rows",
                l.name,
                t.terms.len(),
                t.deprecated,
                t.qualified,
                t.map_to
            );
            let mut sources = vec![l.source];
            sources.extend(m.map(|m| m.source));
            let about = stated::About {
                id: "loinc".into(),
                title: "LOINC".into(),
                release,
                day,
                notice: loinc::NOTICE.into(),
                sources,
            };
            (about, t.terms)
        }
        Arg::Rxnorm(dir) => {
            if o.id.is_some() || o.title.is_some() || o.map_to.is_some() {
                return Err("--id, --title and --loinc-map-to do not go with --rxnorm".into());
            }
            let conso = load(
                &dir.join("RXNCONSO.RRF"),
                "concept names and term types",
                None,
            )
            .map_err(e)?;
            let cui_path = dir.join("RXNCUI.RRF");
            let cui = if cui_path.exists() {
                Some(load(&cui_path, "retired and remapped concepts", None).map_err(e)?)
            } else {
                eprintln!(
                    "note: {} is not there; no retired concepts",
                    cui_path.display()
                );
                None
            };
            let c = rxnorm::read(
                (&conso.name, &conso.text),
                cui.as_ref().map(|c| (c.name.as_str(), c.text.as_str())),
                day,
            )
            .map_err(e)?;
            eprintln!(
                "read {}: {} RXNORM names, {} concepts in use ({} with every name suppressed)",
                conso.name,
                c.names,
                c.terms.len() - c.retired,
                c.suppressed
            );
            if cui.is_some() {
                eprintln!(
                    "read RXNCUI.RRF: {} retired concepts, {} remapped; {} rows name a concept still in RXNCONSO (kept in use); {} remap targets are no concept of the release (left out)",
                    c.retired, c.remapped, c.still_current, c.unknown_targets
                );
            }
            let mut sources = vec![conso.source];
            sources.extend(cui.map(|c| c.source));
            let about = stated::About {
                id: "rxnorm".into(),
                title: "RxNorm".into(),
                release,
                day,
                notice: String::new(),
                sources,
            };
            (about, c.terms)
        }
        Arg::Table(f) => {
            if o.map_to.is_some() {
                return Err("--loinc-map-to goes with --loinc".into());
            }
            let (Some(id), Some(title)) = (&o.id, &o.title) else {
                return Err("a --table import needs --id (e.g. local-labs) and --title (the vocabulary's name)".into());
            };
            let l = load(f, "codes, parents, statuses and dates", None).map_err(e)?;
            let t = table::read(&l.name, &l.text, day).map_err(e)?;
            eprintln!(
                "read {}: {} codes ({})",
                l.name,
                t.terms.len(),
                if t.dated { "dated" } else { "one release" }
            );
            let about = stated::About {
                id: id.clone(),
                title: title.clone(),
                release,
                day,
                notice: String::new(),
                sources: vec![l.source],
            };
            (about, t.terms)
        }
        _ => return Err("--loinc, --rxnorm or --table is needed for an import".into()),
    };
    let release = stated::build(about, terms).map_err(e)?;
    write_release(&release, dest, started)
}

/// The notes file written beside an index: `NAME-notes.rcx` for
/// `NAME.rcx` (so `vocab/icd10cm-notes.rcx`, the bundled one's name in
/// `System::notes_file`).
fn notes_path(index: &Path) -> PathBuf {
    let stem = index
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    index.with_file_name(format!("{stem}-notes.rcx"))
}

/// Writes the index file, and the notes file beside it when the release
/// has notes, and says what they hold.
fn write_release(
    release: &rollcall::Release,
    dest: &Path,
    started: std::time::Instant,
) -> Result<(), String> {
    let bytes = rollcall::index::write::write(release).map_err(|x| x.to_string())?;
    let notes = rollcall::index::write::notes(release, &bytes).map_err(|x| x.to_string())?;
    if let Some(dir) = dest.parent() {
        std::fs::create_dir_all(dir).map_err(|x| format!("{}: {x}", dir.display()))?;
    }
    std::fs::write(dest, &bytes).map_err(|x| format!("{}: {x}", dest.display()))?;
    if let Some(notes) = notes {
        let at = notes_path(dest);
        std::fs::write(&at, &notes).map_err(|x| format!("{}: {x}", at.display()))?;
        eprintln!(
            "wrote {} ({} bytes, {} tabular notes, for the index below)",
            at.display(),
            notes.len(),
            release.notes.len()
        );
    }
    eprintln!(
        "wrote {} ({} bytes, {} entries, release {}, coverage {} to {}) in {:.1} s",
        dest.display(),
        bytes.len(),
        release.codes.len(),
        release.meta.release,
        release.meta.coverage_from,
        release.meta.coverage_to,
        started.elapsed().as_secs_f64()
    );
    Ok(())
}

fn build(
    files: &[Arg],
    dest: &Path,
    vocabulary: assemble::Vocabulary,
    sums: Option<&str>,
) -> Result<(), String> {
    let started = std::time::Instant::now();
    let mut inp = Inputs {
        vocabulary,
        ..Inputs::default()
    };
    let e = |e: BuildError| e.to_string();
    for a in files {
        match a {
            Arg::History(f) => {
                let l = load(f, "billable dates and descriptions", sums).map_err(e)?;
                inp.history = history::parse(&l.name, &l.text).map_err(e)?;
                eprintln!("read {}: {} history rows", l.name, inp.history.len());
                inp.sources.push(l.source);
            }
            Arg::Tabular(f, p) => {
                let l = load(f, &format!("hierarchy in force {}..{}", p.from, p.to), sums)
                    .map_err(e)?;
                let t = tabular::parse(&l.text).map_err(|x| format!("{}: {x}", l.name))?;
                eprintln!(
                    "read {}: version {}, {} chapters, {} sections, {} nodes, {} with 7th-character rules",
                    l.name,
                    t.version,
                    t.chapters.len(),
                    t.sections.len(),
                    t.nodes.len(),
                    t.nodes.iter().filter(|n| n.seventh.is_some()).count()
                );
                inp.tabulars.push((*p, t));
                inp.sources.push(l.source);
            }
            Arg::Order(f, p) => {
                let l = load(
                    f,
                    &format!("hierarchy and billable flags in force {}..{}", p.from, p.to),
                    sums,
                )
                .map_err(e)?;
                let rows = order::parse(&l.name, &l.text).map_err(e)?;
                let b = rows.iter().filter(|r| r.billable).count();
                eprintln!(
                    "read {}: {} rows, {b} billable, {} headers",
                    l.name,
                    rows.len(),
                    rows.len() - b
                );
                inp.orders.push((*p, rows));
                inp.sources.push(l.source);
            }
            Arg::Codes(f, p) => {
                let l = load(
                    f,
                    &format!("billable codes in force {}..{}", p.from, p.to),
                    sums,
                )
                .map_err(e)?;
                let rows = codefile::parse(&l.name, &l.text).map_err(e)?;
                eprintln!("read {}: {} billable codes", l.name, rows.len());
                inp.codefiles.push((*p, rows));
                inp.sources.push(l.source);
            }
            Arg::Gems(f) => {
                let l = load(f, "mapping to or from another vocabulary", sums).map_err(e)?;
                let m = gems::parse(&l.name, &l.text).map_err(e)?;
                eprintln!("read {}: {} ({} rows)", l.name, m.title, m.rows.len());
                inp.mappings.push(m);
                inp.sources.push(l.source);
            }
            Arg::Hpo(_) | Arg::Loinc(_) | Arg::Rxnorm(_) | Arg::Table(_) => {
                return Err("this import builds an index of its own".into())
            }
            Arg::Conversion(f) => {
                let l = load(f, "successors of retired codes", sums).map_err(e)?;
                inp.conversion = conversion::parse(&l.name, &l.text).map_err(e)?;
                eprintln!("read {}: {} conversion pairs", l.name, inp.conversion.len());
                inp.sources.push(l.source);
            }
        }
    }
    cross_check(&inp);
    let release = assemble::assemble(inp, &mut |line| eprintln!("  {line}"));
    write_release(&release, dest, started)
}

/// When the history and a dated file both say what was billable on a day,
/// print whether they agree (they should; a difference means a wrong period).
fn cross_check(inp: &Inputs) {
    if inp.history.is_empty() {
        return;
    }
    let on = |d: Date| -> std::collections::HashSet<&str> {
        inp.history
            .iter()
            .filter(|r| r.valid.contains(d))
            .map(|r| r.code.as_str())
            .collect()
    };
    let report = |what: &str, p: &Period, file: std::collections::HashSet<&str>| {
        let hist = on(p.from);
        let missing = file.difference(&hist).count();
        let extra = hist.difference(&file).count();
        eprintln!(
            "  cross-check {what} on {}: file {} billable, history {} ({})",
            p.from,
            file.len(),
            hist.len(),
            if missing + extra == 0 {
                "same codes".to_string()
            } else {
                format!("{missing} only in the file, {extra} only in the history")
            }
        );
    };
    for (p, rows) in &inp.orders {
        report(
            "order file",
            p,
            rows.iter()
                .filter(|r| r.billable)
                .map(|r| r.code.as_str())
                .collect(),
        );
    }
    for (p, rows) in &inp.codefiles {
        report(
            "code file",
            p,
            rows.iter().map(|(c, _)| c.as_str()).collect(),
        );
    }
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    match run(&args) {
        Ok(()) => ExitCode::SUCCESS,
        Err(msg) => {
            eprintln!("vocab-build: {msg}");
            ExitCode::from(2)
        }
    }
}
