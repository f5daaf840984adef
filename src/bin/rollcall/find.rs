//! `rollcall find`: codes for words, or a code or code start first.

use super::*;

/// `rollcall find WORDS...`: codes for words, best first.
pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    let (limit, index) = (a.limit.unwrap_or(10), a.index.as_deref());
    let words = &a.files;
    let query = words.join(" ");
    if rollcall::words::words(&query).is_empty() {
        return Err("find needs words to look for, e.g. rollcall find type 2 diabetes".into());
    }
    let day = a.date.unwrap_or_else(today);
    let loaded = load_index(index)?;
    let finds = rollcall::find::find(&loaded.index().view(), &query, day, limit, true);
    let found = &finds.results;
    let out = if format == "json" {
        let v = serde_json::json!({
            "query": query,
            "date": day,
            "within": finds.within,
            "no_code": finds.no_code,
            "results": found,
        });
        serde_json::to_string_pretty(&v).map_err(|e| e.to_string())? + "\n"
    } else if let Some(start) = &finds.no_code {
        format!("no code starts with {start}; check the code, or search by words\n")
    } else if found.is_empty() {
        match &finds.within {
            Some(w) => format!(
                "no code under {w} fits \"{}\"\n",
                query
                    .trim()
                    .split_once(char::is_whitespace)
                    .map_or("", |x| x.1.trim())
            ),
            None => format!("no code fits \"{query}\"\n"),
        }
    } else {
        let mut s = String::new();
        for f in found {
            let span = match (f.status, f.billable_from, f.billable_to) {
                ("in-use", Some(a), Some(b)) if a == b => format!("in use in release {a}"),
                ("in-use", Some(a), Some(b)) => format!("in use {a} to {b}"),
                ("retired", None, _) => "obsolete: never in use in this release".into(),
                (_, Some(a), Some(b)) => format!("billable {a} to {b}"),
                _ => "never billable".into(),
            };
            s.push_str(&format!(
                "{:<9} {:<10} {}  ({span})\n",
                f.code, f.status, f.description
            ));
        }
        s
    };
    write_out(&out);
    Ok(ExitCode::SUCCESS)
}
