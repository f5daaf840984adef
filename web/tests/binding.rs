//! The binding as the page's worker uses it, run inside a dedicated worker in
//! headless Chromium: `CHROMEDRIVER=/usr/bin/chromedriver cargo test
//! --target wasm32-unknown-unknown` from `web/` (see .cargo/config.toml).
#![cfg(target_arch = "wasm32")]

use rollcall_web::Checker;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use wasm_bindgen_test::*;

wasm_bindgen_test_configure!(run_in_dedicated_worker);

/// The bundled index, as the page serves it.
const INDEX: &[u8] = include_bytes!("../../vocab/icd10cm.rcx");

fn get(v: &JsValue, key: &str) -> JsValue {
    js_sys::Reflect::get(v, &key.into()).expect("property")
}

fn options(json: &str) -> rollcall_web::JsCheckOptions {
    js_sys::JSON::parse(json).expect("json").unchecked_into()
}

fn message(err: JsValue) -> String {
    err.dyn_into::<js_sys::Error>()
        .expect("an Error")
        .message()
        .into()
}

#[wasm_bindgen_test]
fn opens_the_bundled_index_and_describes_it() {
    let c = Checker::new(INDEX.to_vec()).expect("index opens");
    let info: JsValue = c.info().unwrap().into();
    assert_eq!(get(&info, "vocabulary").as_string().unwrap(), "icd10cm");
    assert_eq!(
        get(&info, "byte_length").as_f64().unwrap() as usize,
        INDEX.len()
    );
    // The content checksum: SHA-256 of everything after the 56-byte header.
    assert_eq!(
        get(&info, "sha256").as_string().unwrap(),
        rollcall_web::sha256_hex(&INDEX[56..])
    );
    let from = get(&info, "coverage_from").as_string().unwrap();
    let to = get(&info, "coverage_to").as_string().unwrap();
    assert!(from < to, "{from} < {to}");
}

#[wasm_bindgen_test]
fn a_check_gives_the_cli_report_shape() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let report: JsValue = c
        .check(
            "E11.9\ne119\nnot a code\n",
            options(r#"{"from":"2016-01-01","to":"2024-12-31","billable":true}"#),
        )
        .unwrap()
        .into();
    // Same JSON as the core's serde output.
    let idx = rollcall::Index::open(INDEX).unwrap();
    let day = |s| rollcall::Date::parse(s).unwrap();
    let opts = rollcall::CheckOptions {
        from: day("2016-01-01"),
        to: day("2024-12-31"),
        billable: true,
    };
    let core = rollcall::check(&idx, "E11.9\ne119\nnot a code\n", &opts);
    let expected = serde_json::to_string(&core).unwrap();
    let got: String = js_sys::JSON::stringify(&report).unwrap().into();
    assert_eq!(
        serde_json::from_str::<serde_json::Value>(&got).unwrap(),
        serde_json::from_str::<serde_json::Value>(&expected).unwrap()
    );
    let entries = js_sys::Array::from(&get(&report, "entries"));
    assert_eq!(entries.length(), 3);
    let cov: JsValue = c.coverage().unwrap().into();
    assert!(js_sys::Array::is_array(&cov));
}

#[wasm_bindgen_test]
fn timelines_know_codes_and_not_nonsense() {
    let c = Checker::new(INDEX.to_vec()).unwrap();
    let t: JsValue = c.timeline("E11.9").unwrap().into();
    let spans = js_sys::Array::from(&t);
    assert!(spans.length() >= 1);
    assert_eq!(get(&spans.get(0), "kind").as_string().unwrap(), "billable");
    let none: JsValue = c.timeline("QQQ.Q").unwrap().into();
    assert!(none.is_null());
    let codes: rollcall_web::JsCodes = js_sys::JSON::parse(r#"["E11.9","E11","QQQ"]"#)
        .unwrap()
        .unchecked_into();
    let map: JsValue = c.timelines(codes).unwrap().into();
    assert!(get(&map, "QQQ").is_null());
    assert!(js_sys::Array::is_array(&get(&map, "E11")));
}

#[wasm_bindgen_test]
fn bad_options_are_errors_with_messages() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let e = c
        .check("E11.9", options(r#"{"on":"2020-02-30"}"#))
        .map(|_| ())
        .unwrap_err();
    assert!(message(e).contains("not a date"));
    let e = c
        .check(
            "E11.9",
            options(r#"{"from":"2021-01-01","to":"2020-01-01"}"#),
        )
        .map(|_| ())
        .unwrap_err();
    assert!(message(e).contains("after it ends"));
    let e = c
        .check("E11.9", options(r#"{"when":"soon"}"#))
        .map(|_| ())
        .unwrap_err();
    assert!(message(e).starts_with("bad check options"));
    let fresh = Checker::new(INDEX.to_vec()).unwrap();
    assert!(message(fresh.coverage().map(|_| ()).unwrap_err()).contains("check a list first"));
}

#[wasm_bindgen_test]
fn damaged_and_foreign_files_are_refused_with_messages() {
    let empty = Checker::new(Vec::new()).map(|_| ()).unwrap_err();
    assert!(message(empty).contains("empty"));

    let junk = Checker::new(b"not an index at all, only some text".to_vec())
        .map(|_| ())
        .unwrap_err();
    assert!(message(junk).starts_with("cannot open the index"));

    let truncated = message(
        Checker::new(INDEX[..INDEX.len() / 2].to_vec())
            .map(|_| ())
            .unwrap_err(),
    );
    assert!(
        truncated.starts_with("cannot open the index")
            || truncated.starts_with("the index is damaged"),
        "{truncated}"
    );

    let mut flipped = INDEX.to_vec();
    let at = flipped.len() * 2 / 3;
    flipped[at] ^= 0x55;
    let m = message(Checker::new(flipped).map(|_| ()).unwrap_err());
    assert!(
        m.starts_with("the index is damaged") || m.starts_with("cannot open the index"),
        "{m}"
    );
}

/// The page hashes an index with the browser's SHA-256 and hands the digest
/// over: the SHA-256 (FIPS 180-4) of the bytes from `indexContentStart`
/// opens it as the constructor does; a digest of damaged bytes is refused
/// with the constructor's message.
#[wasm_bindgen_test]
fn a_digest_from_the_browser_opens_the_index_or_refuses_it() {
    let start = rollcall_web::index_content_start();
    let digest = rollcall::sha256::digest(&INDEX[start..]).to_vec();
    let c = Checker::with_digest(INDEX.to_vec(), digest.clone()).expect("index opens");
    let plain = Checker::new(INDEX.to_vec()).unwrap();
    assert_eq!(
        js_sys::JSON::stringify(&c.info().unwrap()).unwrap(),
        js_sys::JSON::stringify(&plain.info().unwrap()).unwrap()
    );
    let mut flipped = INDEX.to_vec();
    let at = flipped.len() * 2 / 3;
    flipped[at] ^= 0x55;
    let of_flipped = rollcall::sha256::digest(&flipped[start..]).to_vec();
    let m = message(
        Checker::with_digest(INDEX.to_vec(), of_flipped)
            .map(|_| ())
            .unwrap_err(),
    );
    assert!(m.starts_with("the index is damaged"), "{m}");
}

#[wasm_bindgen_test]
fn check_json_gives_the_same_report_as_check() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let text = "E11.9\nE11.56\nI50.2\nE14.*\n";
    let opts = r#"{"from":"2019-01-01","to":"2024-12-31"}"#;
    let object: JsValue = c.check(text, options(opts)).unwrap().into();
    let from_object: String = js_sys::JSON::stringify(&object).unwrap().into();
    let from_text = c.check_json(text, options(opts)).unwrap();
    assert_eq!(
        serde_json::from_str::<serde_json::Value>(&from_object).unwrap(),
        serde_json::from_str::<serde_json::Value>(&from_text).unwrap()
    );
}

/// E11.2 has the billable children E11.21, E11.22 and E11.29 (FY2026
/// tabular list): the two lists reach the same codes, written differently.
#[wasm_bindgen_test]
fn compare_json_gives_the_cli_comparison() {
    let c = Checker::new(INDEX.to_vec()).unwrap();
    let json = c
        .compare_json(
            "E11.2\nI10\n",
            "E11.21\nE11.22\nE11.29\nE11.9\n",
            options(r#"{"on":"2026-01-01"}"#),
        )
        .unwrap();
    let want = rollcall::compare(
        &rollcall::Index::open(INDEX).unwrap(),
        ("A", "E11.2\nI10\n"),
        ("B", "E11.21\nE11.22\nE11.29\nE11.9\n"),
        &rollcall::CheckOptions::on(rollcall::Date::parse("2026-01-01").unwrap(), false),
    );
    assert_eq!(json, serde_json::to_string(&want).unwrap());
    let v = js_sys::JSON::parse(&json).unwrap();
    let g = get(&v, "agreement");
    assert_eq!(get(&g, "both").as_f64(), Some(3.0));
    assert_eq!(get(&g, "only_a").as_f64(), Some(1.0));
    assert_eq!(get(&g, "only_b").as_f64(), Some(1.0));
    let eq = js_sys::Array::from(&get(&v, "equivalents"));
    assert_eq!(eq.length(), 1);
    let err = c
        .compare_json("E11.9", "E11.9", options(r#"{"when":"2026"}"#))
        .unwrap_err();
    assert!(message(err).contains("unknown option"));
}

/// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): E11.65 is
/// "Type 2 diabetes mellitus with hyperglycemia".
#[wasm_bindgen_test]
fn find_gives_codes_for_words_while_typing() {
    let c = Checker::new(INDEX.to_vec()).unwrap();
    let out: serde_json::Value =
        serde_json::from_str(&c.find("type 2 diabetes with hypergl", 5).unwrap()).unwrap();
    let results = out["results"].as_array().unwrap();
    assert!(!results.is_empty() && results.len() <= 5);
    assert_eq!(results[0]["code"], "E11.65");
    assert_eq!(
        results[0]["description"],
        "Type 2 diabetes mellitus with hyperglycemia"
    );
    assert_eq!(results[0]["status"], "billable");
    let none: serde_json::Value = serde_json::from_str(&c.find("of the", 5).unwrap()).unwrap();
    assert!(none["results"].as_array().unwrap().is_empty());
}

/// With the ICD-9-CM index added, an ICD-9-CM code in an ICD-10-CM list is
/// named with its GEM target, as the CLI does (2015 GEMs: 25000 -> E119).
#[wasm_bindgen_test]
fn a_companion_index_names_old_codes_with_their_gem_targets() {
    const ICD9: &[u8] = include_bytes!("../../vocab/icd9cm.rcx");
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    assert_eq!(c.add_companion(ICD9.to_vec()).unwrap(), "icd9cm");
    let json = c
        .check_json("250.00\n", options(r#"{"on":"2020-01-01"}"#))
        .unwrap();
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(v["entries"][0]["status"], "other-system");
    assert_eq!(v["entries"][0]["system"], "icd9cm");
    assert_eq!(
        v["entries"][0]["findings"][0]["suggestions"][0]["code"],
        "E11.9"
    );
    assert!(c.add_companion(vec![1, 2, 3]).is_err());
}

/// A list with a system column: a PCS row is checked by shape with a
/// warning until the ICD-10-PCS index is added, then against it (0DTJ4ZZ is
/// in the FY2024 ICD-10-PCS code file, icd10pcs-codes-FY2024.txt).
#[wasm_bindgen_test]
fn a_system_column_uses_the_companion_of_that_system() {
    const PCS: &[u8] = include_bytes!("../../vocab/icd10pcs.rcx");
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let list = "system\tcode\nICD-10-PCS\t0DTJ4ZZ\nICD-10-CM\tE11.9\n";
    let day = options(r#"{"on":"2024-01-01"}"#);
    let v: serde_json::Value = serde_json::from_str(&c.check_json(list, day).unwrap()).unwrap();
    assert_eq!(v["entries"][1]["status"], "shape-only");
    assert_eq!(v["summary"]["by_system"][1]["checked"], "not-loaded");
    assert_eq!(c.add_companion(PCS.to_vec()).unwrap(), "icd10pcs");
    assert_eq!(c.loaded(), ["icd10cm", "icd10pcs"]);
    let day = options(r#"{"on":"2024-01-01"}"#);
    let v: serde_json::Value = serde_json::from_str(&c.check_json(list, day).unwrap()).unwrap();
    assert_eq!(v["entries"][1]["status"], "valid");
    assert_eq!(v["entries"][1]["system"], "icd10pcs");
    assert_eq!(v["entries"][2]["system"], "icd10cm");
}

/// A shape-only system: LOINC 2345-7 has the right mod 10 check digit
/// (LOINC Users' Guide), 2345-8 not; an unknown name is an Error.
#[wasm_bindgen_test]
fn check_shapes_json_checks_a_shape_only_system() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let json = c
        .check_shapes_json(
            "loinc",
            "2345-7\n2345-8\n",
            options(r#"{"on":"2024-01-01"}"#),
        )
        .unwrap();
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(v["vocabulary"], "loinc");
    assert_eq!(v["entries"][0]["status"], "shape-only");
    assert_eq!(v["entries"][1]["status"], "malformed");
    let err = c
        .check_shapes_json("icd11", "x\n", options("{}"))
        .unwrap_err();
    assert!(message(err).contains("rxnorm"));
    // A bundled system is checked against its index, not by shape.
    let err = c
        .check_shapes_json("icd10pcs", "0DTJ4ZZ\n", options("{}"))
        .unwrap_err();
    assert!(message(err).contains("bundled index"));
}

#[wasm_bindgen_test]
fn the_icd9cm_index_is_checked_on_a_day_it_covers_when_none_is_given() {
    // The final ICD-9-CM release (FY2015) was in force until 2015-09-30
    // (CMS: ICD-10 from 2015-10-01); 250.00 is billable in it.
    let mut c = Checker::new(include_bytes!("../../vocab/icd9cm.rcx").to_vec()).unwrap();
    assert_eq!(c.default_day(), "2015-09-30");
    let report: serde_json::Value =
        serde_json::from_str(&c.check_json("250.00\n", options("{}")).unwrap()).unwrap();
    assert_eq!(report["options"]["on"], "2015-09-30");
    assert_eq!(report["entries"][0]["status"], "valid");
}

#[wasm_bindgen_test]
fn exports_leave_out_error_entries_and_name_them() {
    let c = Checker::new(INDEX.to_vec()).unwrap();
    let opts = r#"{"from":"2019-01-01","to":"2024-12-31","billable":true}"#;
    // E11 is a header in every release (only its subcodes are billable).
    let e: serde_json::Value = serde_json::from_str(
        &c.export_json("E11\nE11.9\n", options(opts), "codes-sql", "", "")
            .unwrap(),
    )
    .unwrap();
    assert_eq!(e["count"], 1);
    assert_eq!(e["left_out"][0], "line 1 E11 (header)");
    assert!(e["text"].as_str().unwrap().contains("'E11.9'"));
    let bad = c
        .export_json("E11.9\n", options(opts), "xml", "", "")
        .unwrap_err();
    assert!(message(bad).contains("codes-python"));
}

/// A workbook's sheets as the workbook module hands them over: read as the
/// core reads the workbook file, each entry with its sheet and row; a workbook's
/// bytes given to `checkBytesJson` get a message, as this build has no cell
/// reader. E11.9 is billable over the period (FY2024 code file).
#[wasm_bindgen_test]
fn sheets_are_checked_as_the_workbook_is_read() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let sheets = r#"[
        {"name": "Notes", "first_row": 1, "rows": [["Larkfield study: draft list"]], "numbers": 0},
        {"name": "Codes", "first_row": 3, "rows": [["Code", "Label"], ["E11.9", "diabetes"]], "numbers": 0}
    ]"#;
    let opts = r#"{"on":"2024-01-01"}"#;
    let got: serde_json::Value =
        serde_json::from_str(&c.check_sheets_json(sheets, options(opts)).unwrap()).unwrap();
    assert_eq!(got["reading"]["as"], "workbook");
    assert_eq!(
        got["reading"]["sheets"],
        serde_json::json!([
            {"name": "Notes", "rows": 1, "codes": 0},
            {"name": "Codes", "rows": 2, "codes": 1}
        ])
    );
    let e = got["entries"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["code"] == "E11.9")
        .expect("E11.9 read");
    assert_eq!(
        (&e["status"], &e["sheet"], &e["row"]),
        (&"valid".into(), &"Codes".into(), &4.into())
    );
    let wrong = c
        .check_sheets_json(sheets, options(r#"{"reading":"lines"}"#))
        .unwrap_err();
    assert!(message(wrong).contains("read as a workbook"));
    let broken = c.check_sheets_json("[{", options("{}")).unwrap_err();
    assert!(message(broken).contains("cannot read the workbook's sheets"));
    let bytes = c
        .check_bytes_json(b"PK\x03\x04 a zip", options("{}"))
        .unwrap_err();
    assert!(message(bytes).contains("reads no workbooks"));
}

/// A dropped file is read as the core reads files (`rollcall check FILE`):
/// UTF-16 with its mark decoded, a zip container named a workbook, and bytes
/// that are no UTF-8 refused with a message naming the line.
#[wasm_bindgen_test]
fn a_dropped_file_is_decoded_by_the_core() {
    let text: String = "E11.9\tType 2 diabetes\nI10\n".into();
    let mut utf16 = vec![0xFF, 0xFE];
    utf16.extend(text.encode_utf16().flat_map(|u| u.to_le_bytes()));
    let read: serde_json::Value =
        serde_json::from_str(&rollcall_web::decode_file(&utf16).unwrap()).unwrap();
    assert_eq!(read["workbook"], false);
    assert_eq!(read["text"], text.as_str());
    let zip = b"PK\x03\x04rest of a workbook";
    let read: serde_json::Value =
        serde_json::from_str(&rollcall_web::decode_file(zip).unwrap()).unwrap();
    assert_eq!(read["workbook"], true);
    let err = rollcall_web::decode_file(b"E11.9\n\xff\xfe\xfd oops\n").unwrap_err();
    let message = String::from(err.dyn_into::<js_sys::Error>().unwrap().message());
    assert!(message.contains("line 2"), "{message}");
}

#[wasm_bindgen_test]
fn bundled_systems_name_the_manifests_the_build_writes() {
    // The manifests web/Trunk.toml's post-build hook writes beside the page,
    // one per bundled index; ICD-10-CM, the page's first index, is the default.
    let list: JsValue = rollcall_web::bundled_systems().unwrap().into();
    let list: js_sys::Array = list.dyn_into().expect("an array");
    let rows: Vec<(String, String, Option<String>, bool)> = list
        .iter()
        .map(|s| {
            (
                get(&s, "name").as_string().unwrap(),
                get(&s, "manifest").as_string().unwrap(),
                get(&s, "companion").as_string(),
                get(&s, "default").as_bool().unwrap(),
            )
        })
        .collect();
    let want = [
        ("icd10cm", "index-manifest.json", Some("icd9cm"), true),
        ("icd10pcs", "manifest-icd10pcs.json", None, false),
        ("icd9cm", "manifest-icd9cm.json", Some("icd10cm"), false),
        ("hpo", "manifest-hpo.json", None, false),
    ];
    let want: Vec<_> = want
        .iter()
        .map(|(n, m, c, d)| (n.to_string(), m.to_string(), c.map(str::to_string), *d))
        .collect();
    assert_eq!(rows, want);
    for (name, manifest, _, _) in &rows {
        assert_eq!(rollcall_web::index_manifest(name).as_ref(), Some(manifest));
    }
}

/// The entries of `checkPaged`'s pages, in order, and the rest of its
/// report make `checkJson`'s report, for every kind of list the page takes:
/// a plain list, a table with a system column (held whole, sent in pages), a
/// markdown draft and an R vector; with the ICD-9-CM companion at hand and
/// a study period. The coverage after each is the same too.
#[wasm_bindgen_test]
fn a_check_in_pages_gives_the_whole_report() {
    const ICD9: &[u8] = include_bytes!("../../vocab/icd9cm.rcx");
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    c.add_companion(ICD9.to_vec()).unwrap();
    let lists = [
        include_str!("../../demo-data/demo-list.tsv"),
        include_str!("../../demo-data/mixed-list.tsv"),
        include_str!("../../demo-data/drafts/assistant-answer.md"),
        include_str!("../../demo-data/drafts/cohort.R"),
        "E11.9\n250.00\nE11.9\nE14.*\nnot a code\n\nI10\n",
    ];
    let opts = r#"{"from":"2019-01-01","to":"2024-12-31"}"#;
    for list in lists {
        let whole: serde_json::Value =
            serde_json::from_str(&c.check_json(list, options(opts)).unwrap()).unwrap();
        let whole_coverage = js_sys::JSON::stringify(&c.coverage().unwrap()).unwrap();
        for (first, size) in [(1, 1), (1, 3), (2, 1000), (1000, 1000)] {
            let pages = std::rc::Rc::new(std::cell::RefCell::new(Vec::<serde_json::Value>::new()));
            let seen = pages.clone();
            let on_page = Closure::<dyn FnMut(String, f64, f64) -> bool>::new(
                move |json: String, done: f64, lines: f64| {
                    let page: Vec<serde_json::Value> = serde_json::from_str(&json).unwrap();
                    let cap = if seen.borrow().is_empty() {
                        first
                    } else {
                        size
                    };
                    assert!(page.len() <= cap && !page.is_empty());
                    assert_eq!(page.last().unwrap()["line"].as_f64().unwrap(), done);
                    assert!(done <= lines);
                    seen.borrow_mut().extend(page);
                    true
                },
            );
            let rest = c
                .check_paged(
                    list.to_string(),
                    options(opts),
                    first as u32,
                    size as u32,
                    on_page.as_ref().unchecked_ref(),
                )
                .unwrap()
                .expect("not stopped");
            let mut paged: serde_json::Value = serde_json::from_str(&rest).unwrap();
            assert_eq!(paged["entries"], serde_json::json!([]));
            paged["entries"] = serde_json::Value::Array(pages.borrow().clone());
            assert_eq!(paged, whole, "pages of {first}, then {size}: {list:.40}");
            let coverage = js_sys::JSON::stringify(&c.coverage().unwrap()).unwrap();
            assert_eq!(coverage, whole_coverage);
        }
    }
}

/// A page's handler that returns false stops the check at once.
#[wasm_bindgen_test]
fn a_check_in_pages_stops_when_asked() {
    let mut c = Checker::new(INDEX.to_vec()).unwrap();
    let calls = std::rc::Rc::new(std::cell::Cell::new(0));
    let seen = calls.clone();
    let stop =
        Closure::<dyn FnMut(String, f64, f64) -> bool>::new(move |_: String, _: f64, _: f64| {
            seen.set(seen.get() + 1);
            false
        });
    let list = "E11.9\nE11.65\nI10\nE78.5\n";
    let r = c
        .check_paged(
            list.to_string(),
            options(r#"{"on":"2024-01-01"}"#),
            2,
            2,
            stop.as_ref().unchecked_ref(),
        )
        .unwrap();
    assert_eq!((r, calls.get()), (None, 1));
}

/// The packed copy the worker fetches is the one the build names
/// (`index-manifest --pack`: `icd10cm.rcx.gz`, gzip), never a path or
/// another encoding (common practice: a manifest names a file beside it).
#[wasm_bindgen_test]
fn the_packed_copy_a_manifest_names_is_checked_by_the_core() {
    assert_eq!(
        rollcall_web::packed_file("icd10cm.rcx.gz", "gzip").as_deref(),
        Some("icd10cm.rcx.gz")
    );
    assert_eq!(rollcall_web::packed_file("../icd10cm.rcx.gz", "gzip"), None);
    assert_eq!(rollcall_web::packed_file("icd10cm.rcx.gz", "br"), None);
}

/// A retired ICD-9-CM code is offered its ICD-10-CM targets once the
/// ICD-10-CM index is at hand (icd9cm-to-icd10cm-gem-2015.csv, line 5848:
/// "4280","I509"), in a whole check and in pages alike.
#[wasm_bindgen_test]
fn a_retired_icd9cm_code_gets_its_gem_targets_with_icd10cm_at_hand() {
    let mut c = Checker::new(include_bytes!("../../vocab/icd9cm.rcx").to_vec()).unwrap();
    assert!(rollcall_web::companion_replaces("icd9cm"));
    assert!(!rollcall_web::companion_replaces("icd10cm"));
    c.add_companion(INDEX.to_vec()).unwrap();
    let opts = r#"{"from":"2019-10-01","to":"2024-09-30"}"#;
    let v: serde_json::Value =
        serde_json::from_str(&c.check_json("428.0\n", options(opts)).unwrap()).unwrap();
    assert_eq!(v["entries"][0]["status"], "retired");
    assert_eq!(
        v["entries"][0]["findings"][0]["suggestions"][0]["code"],
        "I50.9"
    );
}
