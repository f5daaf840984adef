//! Writes the manifest of a bundled index: what the index says about itself
//! (release, coverage, sources) plus its byte length and its content SHA-256
//! (everything after the 56-byte header, as sealed in the header), all read
//! from the file itself.
//!
//! Usage: `index-manifest INDEX.rcx OUT.json`

use std::process::ExitCode;

fn run(args: &[String]) -> Result<(), String> {
    let [index_path, out_path] = args else {
        return Err("usage: index-manifest INDEX.rcx OUT.json".into());
    };
    let bytes = std::fs::read(index_path).map_err(|e| format!("cannot read {index_path}: {e}"))?;
    let len = bytes.len() as u64;
    let index =
        rollcall::Index::open(bytes).map_err(|e| format!("cannot open {index_path}: {e}"))?;
    index
        .verify()
        .map_err(|e| format!("{index_path} is damaged: {e}"))?;
    let info = rollcall_web::describe_index(&index, len, index.checksum());
    // The manifest names the file as the page fetches it.
    let file = std::path::Path::new(index_path)
        .file_name()
        .map(|f| f.to_string_lossy().into_owned())
        .unwrap_or_default();
    let mut value = serde_json::to_value(&info).map_err(|e| e.to_string())?;
    value["file"] = serde_json::Value::String(file);
    let text = serde_json::to_string_pretty(&value).map_err(|e| e.to_string())?;
    std::fs::write(out_path, text + "\n").map_err(|e| format!("cannot write {out_path}: {e}"))?;
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
