//! `rollcall check`: one list, its report or one of its exports.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    let export = rollcall::export::FORMATS.contains(&format);
    if a.valueset_url.is_some() && format != "fhir" {
        return Err("--valueset-url goes with --format fhir".into());
    }
    let target = target(a)?;
    let opts = options(a, default_day(&target)).map_err(|Usage(m)| m)?;
    let file = match a.files.as_slice() {
        [one] => one.as_str(),
        [] => return Err("check needs a list: a FILE, or - for standard input".into()),
        [_, second, ..] => {
            return Err(format!(
                "only one list can be checked at a time (got a second: {second}); to set two lists side by side use rollcall compare A B"
            ))
        }
    };
    let draft = read_draft(file, a.reading)?;
    let report = check_draft(&target, &draft, &opts)?;
    let out = match format {
        "json" => {
            // Written as it is serialised: a large list's report is never
            // held twice (a million lines: 358 MB of JSON).
            write_json(&report);
            String::new()
        }
        "csv" => render::csv(&report),
        f if export => export_text(
            f,
            &target,
            &report,
            &draft,
            &opts,
            a.valueset_url.as_deref(),
        )?,
        _ => render::text(&report),
    };
    write_out(&out);
    let status = if report.has_errors() {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    };
    // The process ends here; freeing thousands of small strings first
    // would only cost time (about a tenth of a run on a large list).
    std::mem::forget(report);
    std::mem::forget(out);
    std::mem::forget(draft);
    Ok(status)
}
