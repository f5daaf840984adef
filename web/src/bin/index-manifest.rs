//! Writes the manifest of a bundled index or notes file: what the file says
//! about itself (an index: release, coverage, sources; a notes file: the
//! vocabulary, release and SHA-256 of the index it belongs to) plus its
//! byte length and its content SHA-256 (everything after the 56-byte
//! header, as sealed in the header), all read from the file itself.
//!
//! Usage: `index-manifest INDEX.rcx OUT.json [--pack]`, or
//! `index-manifest NOTES.rcx [--pack]` (the manifest beside it, under the
//! name the core gives the system's notes manifest, `System::notes_manifest`).
//!
//! `--pack` also writes `INDEX.rcx.gz` beside the file (gzip, best
//! compression) and names it in the manifest as `packed`, so that a page on a
//! server that sends files as they are fetches a fifth of the bytes and
//! unpacks them in the worker. The manifest's `byte_length` and `sha256`
//! stay those of the unpacked file, which is what is verified.

use std::path::Path;
use std::process::ExitCode;

fn run(args: &[String]) -> Result<(), String> {
    let pack = args.iter().any(|a| a == "--pack");
    let args: Vec<&String> = args.iter().filter(|a| *a != "--pack").collect();
    let (path, out) = match args.as_slice() {
        [path, out] if !out.starts_with("--") => (*path, Some(*out)),
        [path] if !path.starts_with("--") => (*path, None),
        _ => {
            return Err(
                "usage: index-manifest INDEX.rcx OUT.json [--pack], or index-manifest NOTES.rcx [--pack]"
                    .into(),
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
    if pack {
        value["packed"] = packed(path, &bytes_of(path)?, &file)?;
    }
    value["file"] = serde_json::Value::String(file);
    let text = serde_json::to_string_pretty(&value).map_err(|e| e.to_string())?;
    std::fs::write(&out, text + "\n").map_err(|e| format!("cannot write {out}: {e}"))?;
    Ok(())
}

fn bytes_of(path: &str) -> Result<Vec<u8>, String> {
    std::fs::read(path).map_err(|e| format!("cannot read {path}: {e}"))
}

/// Writes `PATH.gz` and returns what the manifest says of it. The copy is
/// unpacked again and compared before it is named.
fn packed(path: &str, bytes: &[u8], file: &str) -> Result<serde_json::Value, String> {
    use flate2::{read::GzDecoder, write::GzEncoder, Compression};
    use std::io::{Read, Write};
    let mut enc = GzEncoder::new(Vec::new(), Compression::best());
    enc.write_all(bytes).map_err(|e| e.to_string())?;
    let gz = enc.finish().map_err(|e| e.to_string())?;
    let mut back = Vec::with_capacity(bytes.len());
    GzDecoder::new(gz.as_slice())
        .read_to_end(&mut back)
        .map_err(|e| format!("the packed copy of {path} does not unpack: {e}"))?;
    if back != bytes {
        return Err(format!("the packed copy of {path} unpacks to other bytes"));
    }
    let out = format!("{path}.gz");
    std::fs::write(&out, &gz).map_err(|e| format!("cannot write {out}: {e}"))?;
    Ok(serde_json::json!({
        "file": format!("{file}.gz"),
        "encoding": "gzip",
        "byte_length": gz.len(),
    }))
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
