//! Drafts as people bring them: the invented drafts of `demo-data/drafts/`
//! read into exactly the entries a reader sees in them, any list of real
//! codes written out in each form reads back as those codes on their lines,
//! prose without codes gives no entries, and workbooks are read sheet by
//! sheet.

mod common;

use common::{billable_on_in, index, on};
use proptest::prelude::*;
use rollcall::list::{read, read_bytes, LineKind, Reading};
use rollcall::{Kind, Status};
use std::io::Write;

/// `(line, code, label, system)` of every entry, in order.
fn entries(text: &str, reading: Reading) -> Vec<(usize, String, Option<String>, Option<String>)> {
    read(text, reading)
        .lines
        .into_iter()
        .filter_map(|l| match l.kind {
            LineKind::Entry {
                code,
                label,
                system,
            } => Some((l.number, code, label, system)),
            _ => None,
        })
        .collect()
}

fn draft(name: &str) -> String {
    std::fs::read_to_string(common::root().join("demo-data/drafts").join(name)).unwrap()
}

type Expected<'a> = &'a [(usize, &'a str, Option<&'a str>, Option<&'a str>)];

fn assert_reads(name: &str, form: &str, expected: Expected<'_>) {
    let text = draft(name);
    let got = entries(&text, Reading::Auto);
    let want: Vec<_> = expected
        .iter()
        .map(|(n, c, l, s)| {
            (
                *n,
                c.to_string(),
                l.map(str::to_string),
                s.map(str::to_string),
            )
        })
        .collect();
    assert_eq!(got, want, "{name}");
    let d = read(&text, Reading::Auto);
    assert_eq!(d.facts.form, form, "{name}");
    // Every input line is accounted for, in order.
    let mut numbers: Vec<usize> = d.lines.iter().map(|l| l.number).collect();
    numbers.dedup();
    assert_eq!(
        numbers,
        (1..=text.lines().count()).collect::<Vec<_>>(),
        "{name}"
    );
}

// The expected entries below are what a person reading each draft finds in
// it: every code, on its line, with the words the writer put beside it.

#[test]
fn an_assistants_markdown_answer() {
    assert_reads(
        "assistant-answer.md",
        "markdown",
        &[
            (
                5,
                "E11.9",
                Some("Type 2 diabetes mellitus without complications"),
                None,
            ),
            (
                6,
                "E11.65",
                Some("Type 2 diabetes mellitus with hyperglycemia"),
                None,
            ),
            (
                7,
                "E11.22",
                Some("Type 2 diabetes mellitus with diabetic chronic kidney disease"),
                None,
            ),
            (
                8,
                "E11.A",
                Some("Type 2 diabetes mellitus without complications in remission"),
                None,
            ),
            (
                13,
                "I50.22",
                Some("Chronic systolic (congestive) heart failure"),
                None,
            ),
            (
                14,
                "I50.32",
                Some("Chronic diastolic (congestive) heart failure"),
                None,
            ),
            (15, "I5O.9", Some("Heart failure, unspecified"), None),
            // The heading names ICD-10-PCS, and the shape says so too.
            (
                18,
                "02703ZZ",
                Some("Dilation of coronary artery, one artery, percutaneous approach"),
                Some("ICD-10-PCS"),
            ),
            (20, "N18.31", None, None),
            (20, "N18.32", None, None),
        ],
    );
}

#[test]
fn a_colleagues_email() {
    assert_reads(
        "colleague-email.txt",
        "prose",
        &[
            (3, "E11.9", Some("type 2 diabetes"), None),
            (4, "E11.21", None, None),
            (4, "E11.22", None, None),
            (4, "E11.29", None, None),
            (4, "E11.65", None, None),
            (5, "I10", None, None),
            (7, "I48.0", None, None),
            (7, "I48.11", None, None),
            (7, "I48.19", None, None),
        ],
    );
}

#[test]
fn a_warehouse_query() {
    assert_reads(
        "warehouse-query.sql",
        "sql",
        &[
            (5, "E11.9", None, None),
            (5, "E11.65", None, None),
            (5, "E11.22", Some("type 2 diabetes"), None),
            (6, "I50%", Some("heart failure"), None),
            (7, "I10", None, None),
            (7, "I11.0", None, None),
        ],
    );
}

#[test]
fn cohort_scripts_in_r_and_python() {
    let expected: Expected<'_> = &[
        (2, "E11.9", None, None),
        (2, "E11.65", None, None),
        (2, "E11.22", Some("type 2 diabetes"), None),
        (4, "I50.22", Some("chronic systolic HF"), None),
        (5, "I50.32", Some("chronic diastolic HF"), None),
    ];
    assert_reads("cohort.R", "r", expected);
    let mut py: Vec<_> = expected.to_vec();
    py[3].2 = Some("chronic systolic heart failure");
    py[4].2 = Some("chronic diastolic heart failure");
    assert_reads("cohort.py", "code literals", &py);
}

#[test]
fn json_answers_and_fhir_resources() {
    assert_reads(
        "assistant-answer.json",
        "json",
        &[
            (
                2,
                "E11.9",
                Some("Type 2 diabetes mellitus without complications"),
                None,
            ),
            (
                3,
                "E11.65",
                Some("Type 2 diabetes mellitus with hyperglycemia"),
                None,
            ),
            (
                4,
                "I50.22",
                Some("Chronic systolic (congestive) heart failure"),
                None,
            ),
            (5, "I50.99", Some("Other heart failure"), None),
        ],
    );
    let cm = Some("http://hl7.org/fhir/sid/icd-10-cm");
    // FHIR R4 ValueSet (hl7.org/fhir/R4/valueset.html): compose.include[]
    // with system and concept[]; compose.exclude is left out, and said so.
    assert_reads(
        "valueset.json",
        "fhir valueset",
        &[
            (
                11,
                "E11.9",
                Some("Type 2 diabetes mellitus without complications"),
                cm,
            ),
            (
                12,
                "E11.65",
                Some("Type 2 diabetes mellitus with hyperglycemia"),
                cm,
            ),
            (
                13,
                "I50.22",
                Some("Chronic systolic (congestive) heart failure"),
                cm,
            ),
            (
                19,
                "250.00",
                Some("Diabetes mellitus without mention of complication"),
                Some("http://hl7.org/fhir/sid/icd-9-cm"),
            ),
        ],
    );
    assert_eq!(
        read(&draft("valueset.json"), Reading::Auto)
            .facts
            .notes
            .len(),
        1
    );
    // FHIR R4 Bundle of Conditions with CodeableConcept.coding[].
    assert_reads(
        "bundle.json",
        "fhir bundle",
        &[
            (
                11,
                "E11.65",
                Some("Type 2 diabetes mellitus with hyperglycemia"),
                cm,
            ),
            (
                23,
                "I50.32",
                Some("Chronic diastolic (congestive) heart failure"),
                cm,
            ),
        ],
    );
}

/// The ValueSet is checked, each concept in its system: the ICD-9-CM one
/// against the bundled ICD-9-CM index. Sources: the FY2024 code file
/// (E11.9, E11.65, I50.22 billable) and CMS32 (250.00).
#[test]
fn a_valueset_is_checked_code_by_code_in_its_systems() {
    let cm = index();
    let nine = common::icd9_index();
    let r = rollcall::mixed::check_list(
        rollcall::mixed::Primary::Index(&cm),
        &[&nine],
        &draft("valueset.json"),
        &on("2024-01-01"),
    );
    let checked: Vec<(usize, Status, Option<&str>)> = r
        .entries
        .iter()
        .filter(|e| !e.status.skipped())
        .map(|e| (e.line, e.status, e.system.as_deref()))
        .collect();
    assert_eq!(
        checked,
        [
            (11, Status::Valid, Some("icd10cm")),
            (12, Status::Valid, Some("icd10cm")),
            (13, Status::Valid, Some("icd10cm")),
            // ICD-9-CM ended on 2015-09-30 (CMS).
            (19, Status::Retired, Some("icd9cm")),
        ]
    );
    assert_eq!(r.reading.form, "fhir valueset");
}

/// The defect that lost codes: a line of several codes was read as one code
/// and a label. Each is now an entry; the mistyped `I1O` (letter O) is read
/// as I10 with a note, as on its own line. Source: FY2024 code file.
#[test]
fn several_codes_on_one_line_are_all_checked() {
    let r = rollcall::check(&index(), "E11.9, E11.65, I10, I50.22\n", &on("2024-01-01"));
    let codes: Vec<&str> = r.entries.iter().filter_map(|e| e.code.as_deref()).collect();
    assert_eq!(codes, ["E11.9", "E11.65", "I10", "I50.22"]);
    assert!(r
        .entries
        .iter()
        .all(|e| e.line == 1 && e.status == Status::Valid));
    assert_eq!(r.summary.lines, 1);
    assert_eq!(r.summary.entries, 4);
    for sep in ["\t", " ", "; ", " / ", " and ", " or "] {
        let text = format!("E11.9{sep}E11.65{sep}I1O\n");
        let r = rollcall::check(&index(), &text, &on("2024-01-01"));
        let codes: Vec<&str> = r.entries.iter().filter_map(|e| e.code.as_deref()).collect();
        assert_eq!(codes, ["E11.9", "E11.65", "I10"], "{text:?}");
        assert!(r.entries[2]
            .findings
            .iter()
            .any(|f| f.kind == Kind::Normalized));
    }
}

/// Words that look like codes only to a pattern are not entries: 2,100 words
/// of clinical-sounding prose of our own (numbers, units, study and lab
/// names, dates), with no code in it.
#[test]
fn prose_without_codes_gives_no_entries() {
    let text =
        std::fs::read_to_string(common::root().join("tests/data/prose-without-codes.txt")).unwrap();
    assert!(text.split_whitespace().count() >= 2000);
    let got = entries(&text, Reading::Auto);
    assert!(got.is_empty(), "{got:?}");
    let r = rollcall::check(&index(), &text, &on("2024-01-01"));
    assert_eq!(r.summary.entries, 0);
    assert!(r.entries.iter().all(|e| e.status.skipped()));
}

/// A minimal workbook in the Office Open XML layout (ECMA-376 part 1:
/// workbook, relationships, worksheets with inline strings), written here.
fn xlsx(sheets: &[(&str, &[&[&str]])]) -> Vec<u8> {
    let mut buf = std::io::Cursor::new(Vec::new());
    {
        let mut z = zip::ZipWriter::new(&mut buf);
        let opt = zip::write::SimpleFileOptions::default();
        let mut put = |name: &str, body: String| {
            z.start_file(name, opt).unwrap();
            z.write_all(body.as_bytes()).unwrap();
        };
        let overrides: String = (1..=sheets.len())
            .map(|i| format!("<Override PartName=\"/xl/worksheets/sheet{i}.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml\"/>"))
            .collect();
        put("[Content_Types].xml", format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\"><Default Extension=\"rels\" ContentType=\"application/vnd.openxmlformats-package.relationships+xml\"/><Default Extension=\"xml\" ContentType=\"application/xml\"/><Override PartName=\"/xl/workbook.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml\"/>{overrides}</Types>"));
        put("_rels/.rels", "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\"><Relationship Id=\"rId1\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument\" Target=\"xl/workbook.xml\"/></Relationships>".into());
        let list: String = sheets
            .iter()
            .enumerate()
            .map(|(i, (n, _))| {
                format!(
                    "<sheet name=\"{n}\" sheetId=\"{}\" r:id=\"rId{}\"/>",
                    i + 1,
                    i + 1
                )
            })
            .collect();
        put("xl/workbook.xml", format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><workbook xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\" xmlns:r=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships\"><sheets>{list}</sheets></workbook>"));
        let rels: String = (1..=sheets.len())
            .map(|i| format!("<Relationship Id=\"rId{i}\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet\" Target=\"worksheets/sheet{i}.xml\"/>"))
            .collect();
        put("xl/_rels/workbook.xml.rels", format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\">{rels}</Relationships>"));
        for (i, (_, rows)) in sheets.iter().enumerate() {
            let data: String = rows
                .iter()
                .enumerate()
                .map(|(r, cells)| {
                    let cs: String = cells
                        .iter()
                        .enumerate()
                        .map(|(c, v)| {
                            format!(
                                "<c r=\"{}{}\" t=\"inlineStr\"><is><t>{v}</t></is></c>",
                                (b'A' + c as u8) as char,
                                r + 1
                            )
                        })
                        .collect();
                    format!("<row r=\"{}\">{cs}</row>", r + 1)
                })
                .collect();
            put(&format!("xl/worksheets/sheet{}.xml", i + 1), format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><worksheet xmlns=\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\"><sheetData>{data}</sheetData></worksheet>"));
        }
        z.finish().unwrap();
    }
    buf.into_inner()
}

/// The two-sheet workbook of the tests below, read: a "Notes" sheet with no
/// codes, and E11.9 and I50.22 on rows 2 and 3 of "Codes".
fn assert_two_sheets_read(d: &rollcall::Draft) {
    assert_eq!(d.facts.reading, Reading::Workbook);
    let sheets: Vec<(&str, usize)> = d
        .facts
        .sheets
        .iter()
        .map(|s| (s.name.as_str(), s.codes))
        .collect();
    assert_eq!(sheets, [("Notes", 0), ("Codes", 2)]);
    let got: Vec<(String, Option<&str>, Option<usize>)> = d
        .lines
        .iter()
        .filter_map(|l| match &l.kind {
            LineKind::Entry { code, .. } => {
                Some((code.clone(), l.place.sheet.as_deref(), l.place.row))
            }
            _ => None,
        })
        .collect();
    assert_eq!(
        got,
        [
            ("E11.9".to_string(), Some("Codes"), Some(2)),
            ("I50.22".to_string(), Some("Codes"), Some(3)),
        ]
    );
}

/// A workbook of two sheets, one with no codes: every entry names its sheet
/// and row, and the reading says which sheet held none. Source of the
/// expected statuses: the FY2024 code file.
#[test]
fn a_workbook_is_read_sheet_by_sheet() {
    let book = xlsx(&[
        (
            "Notes",
            &[
                &["Larkfield study: draft list"],
                &["Prepared by the data team"],
            ],
        ),
        (
            "Codes",
            &[
                &["Code", "Description"],
                &["E11.9", "Type 2 diabetes mellitus without complications"],
                &["I50.22", "Chronic systolic (congestive) heart failure"],
            ],
        ),
    ]);
    let d = read_bytes(&book, Reading::Auto).unwrap();
    assert_two_sheets_read(&d);
    let r = rollcall::check::check_draft(&index(), &[], &d, &on("2024-01-01")).0;
    let e: Vec<_> = r.entries.iter().filter(|e| !e.status.skipped()).collect();
    assert_eq!(e.len(), 2);
    assert!(e
        .iter()
        .all(|e| e.status == Status::Valid && e.sheet.as_deref() == Some("Codes")));
    let text = rollcall::render::text(&r);
    assert!(text.contains("\u{201c}Notes\u{201d} (no codes)"), "{text}");
}

/// An OpenDocument spreadsheet (`.ods`) of two sheets, written here with
/// the parts the OASIS OpenDocument 1.2 format names (a stored `mimetype`
/// first, `META-INF/manifest.xml`, the cells in `content.xml`; from memory):
/// read as the `.xlsx` workbook above is, sheet by sheet.
#[test]
fn an_opendocument_spreadsheet_is_read_sheet_by_sheet() {
    use std::io::Write;
    let table = |name: &str, rows: &[&[&str]]| -> String {
        let rows: String = rows
            .iter()
            .map(|cells| {
                let cs: String = cells
                    .iter()
                    .map(|v| format!("<table:table-cell office:value-type=\"string\"><text:p>{v}</text:p></table:table-cell>"))
                    .collect();
                format!("<table:table-row>{cs}</table:table-row>")
            })
            .collect();
        format!("<table:table table:name=\"{name}\">{rows}</table:table>")
    };
    let content = format!(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?><office:document-content xmlns:office=\"urn:oasis:names:tc:opendocument:xmlns:office:1.0\" xmlns:table=\"urn:oasis:names:tc:opendocument:xmlns:table:1.0\" xmlns:text=\"urn:oasis:names:tc:opendocument:xmlns:text:1.0\" office:version=\"1.2\"><office:body><office:spreadsheet>{}{}</office:spreadsheet></office:body></office:document-content>",
        table("Notes", &[&["Larkfield study: draft list"]]),
        table(
            "Codes",
            &[
                &["Code", "Description"],
                &["E11.9", "Type 2 diabetes mellitus without complications"],
                &["I50.22", "Chronic systolic (congestive) heart failure"],
            ]
        ),
    );
    let mut buf = std::io::Cursor::new(Vec::new());
    {
        let mut z = zip::ZipWriter::new(&mut buf);
        let stored = zip::write::SimpleFileOptions::default()
            .compression_method(zip::CompressionMethod::Stored);
        z.start_file("mimetype", stored).unwrap();
        z.write_all(b"application/vnd.oasis.opendocument.spreadsheet")
            .unwrap();
        let opt = zip::write::SimpleFileOptions::default();
        z.start_file("META-INF/manifest.xml", opt).unwrap();
        z.write_all(b"<?xml version=\"1.0\" encoding=\"UTF-8\"?><manifest:manifest xmlns:manifest=\"urn:oasis:names:tc:opendocument:xmlns:manifest:1.0\" manifest:version=\"1.2\"><manifest:file-entry manifest:full-path=\"/\" manifest:media-type=\"application/vnd.oasis.opendocument.spreadsheet\"/><manifest:file-entry manifest:full-path=\"content.xml\" manifest:media-type=\"text/xml\"/></manifest:manifest>").unwrap();
        z.start_file("content.xml", opt).unwrap();
        z.write_all(content.as_bytes()).unwrap();
        z.finish().unwrap();
    }
    let d = read_bytes(&buf.into_inner(), Reading::Auto).unwrap();
    assert_two_sheets_read(&d);
}

fn billable_2024() -> Vec<String> {
    let idx = index();
    let v = idx.view();
    billable_on_in(&idx, "2024-01-01")
        .into_iter()
        .map(|c| v.display(&c))
        .collect()
}

/// The forms a list of codes is written in, each with the line of every
/// code (1-based) when written that way.
fn written(codes: &[String], form: usize) -> (String, Vec<usize>) {
    let n = codes.len();
    match form {
        // markdown bullets, bold, with labels
        0 => (
            codes
                .iter()
                .map(|c| format!("- **{c}** – a label\n"))
                .collect(),
            (1..=n).collect(),
        ),
        // a markdown table
        1 => (
            "| Code | Description |\n|---|---|\n".to_string()
                + &codes
                    .iter()
                    .map(|c| format!("| {c} | a label |\n"))
                    .collect::<String>(),
            (3..3 + n).collect(),
        ),
        // a JSON array of objects, one per line
        2 => (
            "[\n".to_string()
                + &codes
                    .iter()
                    .enumerate()
                    .map(|(i, c)| {
                        format!(
                            "  {{\"code\": \"{c}\", \"display\": \"x\"}}{}\n",
                            if i + 1 < n { "," } else { "" }
                        )
                    })
                    .collect::<String>()
                + "]\n",
            (2..2 + n).collect(),
        ),
        // a SQL clause on one line
        3 => (
            format!(
                "WHERE dx IN ({})\n",
                codes
                    .iter()
                    .map(|c| format!("'{c}'"))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            vec![1; n],
        ),
        // an R vector
        4 => (
            format!(
                "codes <- c({})\n",
                codes
                    .iter()
                    .map(|c| format!("\"{c}\""))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            vec![1; n],
        ),
        // one comma-separated line
        _ => (format!("{}\n", codes.join(", ")), vec![1; n]),
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(120))]

    /// Any list of real codes (billable on 2024-01-01 per the bundled index,
    /// built from the CMS release history) written as bullets, a markdown
    /// table, JSON, a SQL clause, an R vector or one comma-separated line
    /// reads back as exactly those codes, on their lines.
    #[test]
    fn real_codes_read_back_in_every_form(picks in proptest::collection::vec(0usize..74_000, 1..12), form in 0usize..6) {
        static CODES: std::sync::OnceLock<Vec<String>> = std::sync::OnceLock::new();
        let all = CODES.get_or_init(billable_2024);
        let codes: Vec<String> = picks.iter().map(|&i| all[i % all.len()].clone()).collect();
        let (text, lines) = written(&codes, form);
        let got = entries(&text, Reading::Auto);
        let got: Vec<(usize, String)> = got.into_iter().map(|(n, c, _, _)| (n, c)).collect();
        let want: Vec<(usize, String)> = lines.into_iter().zip(codes.iter().cloned()).collect();
        prop_assert_eq!(got, want, "{}", text);
    }
}

/// The CLI reads what the page reads: a FHIR ValueSet file, and a forced
/// reading when the guess is wrong.
#[test]
fn the_cli_reads_drafts_and_takes_a_forced_reading() {
    let exe = env!("CARGO_BIN_EXE_rollcall");
    let path = common::root().join("demo-data/drafts/valueset.json");
    let out = std::process::Command::new(exe)
        .args([
            "check",
            path.to_str().unwrap(),
            "--on",
            "2024-01-01",
            "--format",
            "json",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["reading"]["as"], "json");
    assert_eq!(v["summary"]["entries"], 4);
    let text = std::process::Command::new(exe)
        .args(["check", path.to_str().unwrap(), "--on", "2024-01-01"])
        .output()
        .unwrap();
    let text = String::from_utf8(text.stdout).unwrap();
    assert!(
        text.contains("read as fhir valueset: 4 codes on 4 of 30 lines"),
        "{text}"
    );
    // Forced to plain lines, the same comma-separated line is one entry.
    let mut child = std::process::Command::new(exe)
        .args([
            "check",
            "-",
            "--read",
            "lines",
            "--on",
            "2024-01-01",
            "--format",
            "json",
        ])
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(b"E11.9 E11.65\n")
        .unwrap();
    let out = child.wait_with_output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["summary"]["entries"], 1);
    assert_eq!(v["reading"]["as"], "lines");
    let bad = std::process::Command::new(exe)
        .args(["check", "-", "--read", "xml"])
        .output()
        .unwrap();
    assert_eq!(bad.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&bad.stderr).contains("lines, table, text, json, workbook"));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    /// Any text, read any way, gives back every one of its lines, in order,
    /// and never panics (multi-byte characters, quotes, brackets, pipes).
    #[test]
    fn any_text_keeps_every_line(text in "([ -~]|[éü€\u{feff}\u{2013}\t\r\n\"'`|*#\\[\\]{}():,;]){0,300}", forced in 0usize..6) {
        let reading = [Reading::Auto, Reading::Lines, Reading::Table, Reading::Text, Reading::Json, Reading::Workbook][forced];
        let d = read(&text, reading);
        let mut numbers: Vec<usize> = d.lines.iter().map(|l| l.number).collect();
        numbers.dedup();
        let count = rollcall::list::lines_of(&text).count();
        prop_assert_eq!(numbers, (1..=count).collect::<Vec<_>>());
        for l in &d.lines {
            if let Some((a, b)) = l.place.span {
                prop_assert!(l.text.get(a..b).is_some());
            }
        }
    }
}
