//! Writes the manifest of a bundled index or notes file: what the file says
//! about itself (an index: release, coverage, sources; a notes file: the
//! vocabulary, release and SHA-256 of the index it belongs to) plus its
//! byte length and its content SHA-256 (everything after the 56-byte
//! header, as sealed in the header), all read from the file itself.
//!
//! Usage: `index-manifest INDEX.rcx OUT.json`, or `index-manifest NOTES.rcx`
//! (the manifest beside it, under the name the core gives the system's
//! notes manifest, `System::notes_manifest`).

use std::path::Path;
use std::process::ExitCode;

fn run(args: &[String]) -> Result<(), String> {
    let (path, out) = match args {
        [path, out] => (path, Some(out)),
        [path] => (path, None),
        _ => {
            return Err(
                "usage: index-manifest INDEX.rcx OUT.json, or index-manifest NOTES.rcx".into(),
            )
        }
    };
    let bytes = std::fs::read(path).map_err(|e| format!("cannot read {path}: {e}"))?;
    let len = bytes.len() as u64;
    // The manifest names the file as the page fetches it.
    let file = Path::new(path)
        .file_name()
        .map(|f| f.to_string_lossy().into_owned())
        .unwrap_or_default();
    let (mut value, out) = if bytes.starts_with(rollcall::index::NOTES_MAGIC) {
        let notes =
            rollcall::NotesFile::open(bytes).map_err(|e| format!("cannot open {path}: {e}"))?;
        notes
            .verify()
            .map_err(|e| format!("{path} is damaged: {e}"))?;
        let name = rollcall::systems::System::parse(notes.vocabulary())
            .and_then(|s| s.notes_manifest())
            .ok_or_else(|| {
                format!(
                    "{path}: rollcall bundles no notes of {}",
                    notes.vocabulary()
                )
            })?;
        let out = match out {
            Some(o) => o.clone(),
            None => Path::new(path)
                .with_file_name(name)
                .to_string_lossy()
                .into_owned(),
        };
        let info = rollcall_web::describe_notes(&notes, len);
        (serde_json::to_value(&info).map_err(|e| e.to_string())?, out)
    } else {
        let out = out.ok_or("an index's manifest needs OUT.json")?.clone();
        let index = rollcall::Index::open(bytes).map_err(|e| format!("cannot open {path}: {e}"))?;
        index
            .verify()
            .map_err(|e| format!("{path} is damaged: {e}"))?;
        let info = rollcall_web::describe_index(&index, len, index.checksum());
        (serde_json::to_value(&info).map_err(|e| e.to_string())?, out)
    };
    value["file"] = serde_json::Value::String(file);
    let text = serde_json::to_string_pretty(&value).map_err(|e| e.to_string())?;
    std::fs::write(&out, text + "\n").map_err(|e| format!("cannot write {out}: {e}"))?;
    Ok(())
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    match run(&args) {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("index-manifest: {e}");
            ExitCode::FAILURE
        }
    }
}
