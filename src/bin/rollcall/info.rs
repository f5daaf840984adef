//! `rollcall info`: the indexes and what they hold.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    if let Some(f) = a.files.first() {
        return Err(format!(
            "info takes no files (got {f}); it takes only {}",
            flags::flag_names("info")
        ));
    }
    let loaded: Vec<Loaded> = match a.index.as_deref() {
        Some(p) => vec![load_index(Some(p))?],
        None => BUNDLED_INDEXES
            .iter()
            .map(|(_, bytes, _)| {
                Index::open(*bytes)
                    .map(Loaded::Bundled)
                    .map_err(|e| e.to_string())
            })
            .collect::<Result<_, _>>()?,
    };
    let described: Vec<_> = loaded
        .iter()
        .map(|l| match l {
            Loaded::Bundled(i) => (
                i.meta(),
                BUNDLED_INDEXES
                    .iter()
                    .find(|(s, _, _)| s.name() == i.meta().vocabulary)
                    .map_or(String::new(), |(_, _, name)| name.to_string()),
                i.bytes().len(),
                i.checksum(),
            ),
            Loaded::File(i, p) => (i.meta(), p.clone(), i.bytes().len(), i.checksum()),
        })
        .collect();
    let out = match format {
        "json" => {
            let list: Vec<serde_json::Value> = described
                .iter()
                .map(|(meta, path, size, sum)| {
                    serde_json::json!({
                        "vocabulary": meta.vocabulary,
                        "title": meta.title,
                        "release": meta.release,
                        "coverage_from": meta.coverage_from,
                        "coverage_to": meta.coverage_to,
                        "sources": meta.sources,
                        "notice": meta.notice,
                        "path": path,
                        "bytes": size,
                        "sha256": sum,
                    })
                })
                .collect();
            let v = serde_json::json!({ "indexes": list });
            serde_json::to_string_pretty(&v).map_err(|e| e.to_string())? + "\n"
        }
        _ => {
            let mut s = String::new();
            for (meta, path, size, sum) in &described {
                s.push_str(&format!(
                    "{} ({}) release {}, coverage {} to {}\n  path: {path}\n  size: {size} bytes\n  checksum (SHA-256): {sum}\n  sources:\n",
                    meta.title, meta.vocabulary, meta.release, meta.coverage_from, meta.coverage_to
                ));
                for src in &meta.sources {
                    s.push_str(&format!(
                        "    {}  {}\n      sha256 {}\n",
                        src.file, src.role, src.sha256
                    ));
                }
                if !meta.notice.is_empty() {
                    s.push_str(&format!("  notice: {}\n", meta.notice));
                }
            }
            s.push_str("checked by shape and check digit only (no content bundled): loinc, snomed, ndc, hcpcs, cpt, rxnorm\n");
            s
        }
    };
    write_out(&out);
    Ok(ExitCode::SUCCESS)
}
