//! A report written while its list is checked (a [`Run`]): the text, CSV
//! and JSON forms, byte for byte those of the whole [`Report`], with no
//! entry held longer than it takes to write it. The text form keeps its
//! finding rows until the end, since it orders them by severity.

use super::{csv_entry, csv_list_finding, text_closing, text_heading, FindingRows, CSV_HEADINGS};
use crate::check::Run;
use crate::report::{Report, Summary};
use serde::ser::{Error as _, SerializeSeq, SerializeStruct};
use serde::{Serialize, Serializer};
use std::cell::RefCell;
use std::io::{self, Write};

/// How much CSV is gathered before it is written.
const CHUNK: usize = 1 << 16;

/// [`super::text`] of the report `run` makes, written to `out`; returns
/// its summary.
pub fn text_to(out: &mut dyn Write, mut run: Run<'_>) -> io::Result<Summary> {
    let mut report = run.heading();
    let mut rows = FindingRows::new("");
    run.by_ref().for_each(|e| rows.entry(&e));
    let (list_findings, summary) = run.finish();
    list_findings.iter().for_each(|f| rows.list(f));
    out.write_all(text_heading(&report).as_bytes())?;
    rows.write_with(&mut |t| out.write_all(t.as_bytes()))?;
    report.summary = summary;
    let mut s = String::new();
    text_closing(&mut s, &report);
    out.write_all(s.as_bytes())?;
    Ok(report.summary)
}

/// [`super::csv`] of the report `run` makes, written to `out` as it goes;
/// returns its summary.
pub fn csv_to(out: &mut dyn Write, mut run: Run<'_>) -> io::Result<Summary> {
    let mut s = String::from(CSV_HEADINGS);
    for e in run.by_ref() {
        csv_entry(&mut s, &e);
        if s.len() >= CHUNK {
            out.write_all(s.as_bytes())?;
            s.clear();
        }
    }
    let (list_findings, summary) = run.finish();
    for f in &list_findings {
        csv_list_finding(&mut s, f);
        if s.len() >= CHUNK {
            out.write_all(s.as_bytes())?;
            s.clear();
        }
    }
    out.write_all(s.as_bytes())?;
    Ok(summary)
}

/// The report `run` makes as pretty JSON (`serde_json::to_writer_pretty`
/// of the [`Report`]), written to `out` as it is serialised; returns its
/// summary.
pub fn json_to(out: &mut dyn Write, run: Run<'_>) -> io::Result<Summary> {
    let heading = run.heading();
    let streamed = Streamed {
        heading: &heading,
        run: RefCell::new(Some(run)),
        summary: RefCell::new(None),
    };
    // The serialiser's many small writes (a quote, a colon, an indent) go
    // to a buffer it knows the type of, not each through `dyn Write`.
    let mut buffered = io::BufWriter::with_capacity(1 << 16, &mut *out);
    serde_json::to_writer_pretty(&mut buffered, &streamed).map_err(io::Error::other)?;
    buffered.flush()?;
    drop(buffered);
    let summary = streamed.summary.take();
    summary.ok_or_else(|| io::Error::other("the report was not written to its end"))
}

/// A [`Report`] whose entries come from a run while it is serialised.
struct Streamed<'h, 'a> {
    heading: &'h Report,
    run: RefCell<Option<Run<'a>>>,
    summary: RefCell<Option<Summary>>,
}

/// The entries of a [`Streamed`] report.
struct Entries<'r, 'a>(&'r RefCell<Option<Run<'a>>>);

impl Serialize for Streamed<'_, '_> {
    /// The fields of [`Report`] in its order, skipped as it skips them.
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let h = self.heading;
        let mut st = s.serialize_struct("Report", 7)?;
        st.serialize_field("vocabulary", &h.vocabulary)?;
        if h.reading.as_before() {
            st.skip_field("reading")?;
        } else {
            st.serialize_field("reading", &h.reading)?;
        }
        st.serialize_field("index", &h.index)?;
        st.serialize_field("options", &h.options)?;
        st.serialize_field("entries", &Entries(&self.run))?;
        let run = self.run.borrow_mut().take();
        let run = run.ok_or_else(|| S::Error::custom("a run's report is written once"))?;
        let (list_findings, summary) = run.finish();
        st.serialize_field("list_findings", &list_findings)?;
        st.serialize_field("summary", &summary)?;
        *self.summary.borrow_mut() = Some(summary);
        st.end()
    }
}

impl Serialize for Entries<'_, '_> {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let mut run = self.0.borrow_mut();
        let run = run
            .as_mut()
            .ok_or_else(|| S::Error::custom("a run's report is written once"))?;
        let mut seq = s.serialize_seq(None)?;
        for e in run.by_ref() {
            seq.serialize_element(&e)?;
        }
        seq.end()
    }
}
