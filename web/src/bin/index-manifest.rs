//! Writes the manifest of a bundled index or notes file: what the file says
//! about itself (an index: release, coverage, sources; a notes file: the
//! vocabulary, release and SHA-256 of the index it belongs to) plus its
//! byte length and its content SHA-256 (everything after the 56-byte
//! header, as sealed in the header), all read from the file itself.
//!
//! Usage: `index-manifest INDEX.rcx OUT.json [--pack]`, or
//! `index-manifest NOTES.rcx [--pack]` (the manifest beside it, under the
//! name the core gives the system's notes manifest, `System::notes_manifest`),
//! or `index-manifest --bundled DIR [--pack]`: every bundled index in DIR
//! (the core's `bundled_systems`, each `System::index_file`) under its
//! manifest's name (`System::index_manifest`), packed with `--pack`, and
//! each bundled notes file (`System::notes_file`), never packed: the notes
//! are fetched only when a card is opened.
//!
//! `--pack` also writes `INDEX.rcx.gz` beside the file (the core's
//! `systems::packed_copy`) (gzip, best
//! compression) and names it in the manifest as `packed`, so that a page on a
//! server that sends files as they are fetches a fifth of the bytes and
//! unpacks them in the worker. The manifest's `byte_length` and `sha256`
//! stay those of the unpacked file, which is what is verified.

use std::path::Path;
use std::process::ExitCode;

fn run(args: &[String]) -> Result<(), String> {
    let pack = args.iter().any(|a| a == "--pack");
    let args: Vec<&String> = args.iter().filter(|a| *a != "--pack").collect();
    match args.as_slice() {
        [flag, dir] if *flag == "--bundled" => bundled(Path::new(dir.as_str()), pack),
        [path, out] if !path.starts_with("--") && !out.starts_with("--") => {
            manifest(path, Some(out), pack)
        }
        [path] if !path.starts_with("--") => manifest(path, None, pack),
        _ => Err(
            "usage: index-manifest INDEX.rcx OUT.json [--pack], index-manifest NOTES.rcx [--pack], or index-manifest --bundled DIR [--pack]"
                .into(),
        ),
    }
}

/// The manifests of every bundled index and notes file in `dir`.
fn bundled(dir: &Path, pack: bool) -> Result<(), String> {
    use rollcall::systems::{bundled_systems, System};
    let at = |file: &str| dir.join(file).to_string_lossy().into_owned();
    for s in bundled_systems() {
        let (Some(file), Some(out)) = (s.index_file(), s.index_manifest()) else {
            continue;
        };
        manifest(&at(&file), Some(&at(&out)), pack)?;
    }
    for file in bundled_systems().filter_map(System::notes_file) {
        manifest(&at(file), None, false)?;
    }
    Ok(())
}

/// Writes the manifest of the index or notes file at `path`: to `out`, or
/// for a notes file beside it under the core's name.
fn manifest(path: &str, out: Option<&str>, pack: bool) -> Result<(), String> {
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
            Some(o) => o.to_string(),
            None => Path::new(path)
                .with_file_name(name)
                .to_string_lossy()
                .into_owned(),
        };
        let info = rollcall_web::describe_notes(&notes, len);
        (serde_json::to_value(&info).map_err(|e| e.to_string())?, out)
    } else {
        let out = out.ok_or("an index's manifest needs OUT.json")?.to_string();
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
    let (out, name) = (
        rollcall::systems::packed_copy(path),
        rollcall::systems::packed_copy(file),
    );
    let encoding = rollcall::systems::PACKED_ENCODING;
    if !rollcall::systems::packed_copy_ok(&name, encoding) {
        return Err(format!(
            "{path}: the page would not fetch a packed copy named {name}; rename the file (letters, digits, '.', '_' and '-')"
        ));
    }
    std::fs::write(&out, &gz).map_err(|e| format!("cannot write {out}: {e}"))?;
    Ok(serde_json::json!({
        "file": name,
        "encoding": encoding,
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
