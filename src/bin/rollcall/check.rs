//! `rollcall check`: one list, its report or one of its exports.

use super::*;

pub(crate) fn run(a: &Args, format: &str) -> Result<ExitCode, String> {
    let export = rollcall::export::FORMATS.contains(&format);
    if a.valueset_url.is_some() && format != "fhir" {
        return Err("--valueset-url goes with --format fhir".into());
    }
    let target = target(a)?;
    let opts = options(a, default_day(&target, a)).map_err(|Usage(m)| m)?;
    let file = match a.files.as_slice() {
        [one] => one.as_str(),
        [] => return Err("check needs a list: a FILE, or - for standard input".into()),
        [_, second, ..] => {
            return Err(format!(
                "only one list can be checked at a time (got a second: {second}); to set two lists side by side use rollcall compare A B"
            ))
        }
    };
    let listing = read_listing(file, a.reading)?;
    if let (Target::Index(loaded), "json" | "text" | "csv") = (&target, format) {
        if !rollcall::list::Lines::names_systems(&listing) {
            return streamed(loaded.index(), &listing, &opts, format);
        }
    }
    let draft = listing.into_draft();
    let report = check_draft(&target, &draft, &opts)?;
    let out = match format {
        "json" => {
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

/// The report of a list that names no system, written entry by entry as
/// the list is checked: a list of a million lines is never held as its
/// entries (the output is the same as of the whole report).
fn streamed(
    index: &Index<&'static [u8]>,
    listing: &rollcall::list::Listing,
    opts: &CheckOptions,
    format: &str,
) -> Result<ExitCode, String> {
    use std::io::Write;
    // No line names a system: the others at hand are the companion only.
    let others = at_hand(&index.meta().vocabulary, &Draft::default())?;
    let views: Vec<View<'_>> = others.iter().map(|i| i.view()).collect();
    let run = rollcall::check::Run::new(index, &views, listing, opts);
    let mut out = Quiet::new(std::io::BufWriter::with_capacity(
        1 << 16,
        std::io::stdout().lock(),
    ));
    let summary = match format {
        "json" => render::json_to(&mut out, run).inspect(|_| {
            let _ = out.write_all(b"\n");
        }),
        "csv" => render::csv_to(&mut out, run),
        _ => render::text_to(&mut out, run),
    };
    let _ = out.flush();
    let summary = summary.map_err(|e| format!("the report could not be written: {e}"))?;
    let status = if summary.errors > 0 {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    };
    // As above: the process ends here.
    std::mem::forget(others);
    Ok(status)
}

/// Standard output that, once closed (rollcall ... | head), takes what is
/// left without a word, so the check still runs to its exit status.
struct Quiet<W> {
    inner: W,
    closed: bool,
}

impl<W: std::io::Write> Quiet<W> {
    fn new(inner: W) -> Self {
        Quiet {
            inner,
            closed: false,
        }
    }
}

impl<W: std::io::Write> std::io::Write for Quiet<W> {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        if !self.closed && self.inner.write_all(buf).is_err() {
            self.closed = true;
        }
        Ok(buf.len())
    }
    fn flush(&mut self) -> std::io::Result<()> {
        if !self.closed && self.inner.flush().is_err() {
            self.closed = true;
        }
        Ok(())
    }
}
