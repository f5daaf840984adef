//! Building an index: the files of a dated release read in turn and put
//! together by `assemble`, or a release of its own read by its format and
//! checked by `stated`; then the index written, with its notes file.

use crate::assemble::{self, Inputs, Vocabulary};
use crate::formats::{Builds, Given, Options};
use crate::provenance::load;
use crate::stated;
use rollcall::{Date, Period};
use std::collections::HashSet;
use std::path::{Path, PathBuf};
use std::time::Instant;

/// Builds an index from the files of a dated release; with `sums`, each
/// file is checked against `SHA256SUMS`.
pub fn build(
    files: &[Given],
    dest: &Path,
    vocabulary: Vocabulary,
    sums: Option<&str>,
) -> Result<(), String> {
    let started = Instant::now();
    let mut inp = Inputs {
        vocabulary,
        ..Inputs::default()
    };
    for g in files {
        let Builds::Part { role, add } = g.format.builds else {
            return Err(format!(
                "{} builds an index of its own; give it without other files",
                g.format.flag
            ));
        };
        let role = match g.period {
            Some(p) => format!("{role} in force {}..{}", p.from, p.to),
            None => role.to_string(),
        };
        let l = load(&g.path, &role, sums).map_err(|e| e.to_string())?;
        let said = add(&mut inp, &l, g.period)?;
        eprintln!("read {}: {said}", l.name);
        inp.sources.push(l.source);
    }
    cross_check(&inp);
    let release = assemble::assemble(inp, &mut |line| eprintln!("  {line}"));
    write_release(&release, dest, started)
}

/// Builds an index from a release that states its own hierarchy.
pub fn build_own(
    given: &Given,
    options: &Options,
    dest: &Path,
    sums: Option<&str>,
) -> Result<(), String> {
    let started = Instant::now();
    let Builds::Own { read, .. } = given.format.builds else {
        return Err(format!(
            "{} is one file of a dated release, not a release of its own",
            given.format.flag
        ));
    };
    let own = read(&given.path, options, sums)?;
    let release = stated::build(own.about, own.terms).map_err(|e| e.to_string())?;
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
fn write_release(release: &rollcall::Release, dest: &Path, started: Instant) -> Result<(), String> {
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

/// When the history and a dated file both say what was billable on a day,
/// print whether they agree (they should; a difference means a wrong period).
fn cross_check(inp: &Inputs) {
    if inp.history.is_empty() {
        return;
    }
    let on = |d: Date| -> HashSet<&str> {
        inp.history
            .iter()
            .filter(|r| r.valid.contains(d))
            .map(|r| r.code.as_str())
            .collect()
    };
    let report = |what: &str, p: &Period, file: HashSet<&str>| {
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

#[cfg(test)]
mod tests {
    use super::*;

    /// The bundled notes file's name (`System::notes_file`: icd10cm-notes.rcx).
    #[test]
    fn the_notes_file_is_named_after_its_index() {
        assert_eq!(
            notes_path(Path::new("vocab/icd10cm.rcx")),
            Path::new("vocab/icd10cm-notes.rcx")
        );
    }
}
