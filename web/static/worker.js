// The checker's background worker: it owns the WebAssembly checker so that
// loading the index and checking long lists never block the page.
// rollcall.js starts it and speaks this protocol.
//
// Protocol (every message carries an `id`; every reply echoes it):
//   -> {id, type: "init", wasm: ArrayBuffer}   (optional, first: the Wasm bytes
//      instead of fetching rollcall-web_bg.wasm beside this file)
//   <- {id, ok: true, result: true}
//   -> {id, type: "load", bytes: ArrayBuffer, manifest: object, packed?: {file, encoding: "gzip"}}
//      (packed: the bytes are the manifest's gzip copy, unpacked here)
//   <- {id, ok: true, result: IndexInfo}   (with default_day: the day checked
//      when none is given, inside the index's coverage)
//   -> {id, type: "check", text: string, options: CheckOptionsInput, system?: string}
//      (system: a shape-only system, loinc, snomed, ...: the rows with no
//      system cell are checked by its shape rules instead of the index)
//   <- {id, page: {entries: Entry[], done, lines}}   (none or more, then the reply:
//      the report's entries a page at a time as they are judged; done: the
//      line of the last one, lines: the list's; a page {restart: true} says
//      the check starts again, the pages before it void: the list needed an
//      index that is now loaded)
//   <- {id, ok: true, result: {report, coverage, checkMs, totalMs, loaded: string[], paged: true}}
//      (loaded: the systems whose indexes are loaded, this one's first;
//      paged: report.entries is empty, its entries were the pages)
//   -> {id, type: "checkBytes", bytes: ArrayBuffer, options: CheckOptionsInput}
//   <- the same reply as "check"; a workbook (.xlsx, .xls, .ods) is read by
//      the workbook module (rollcall-workbook.js and its Wasm, loaded on
//      first use), any other file as text
//   -> {id, type: "edit", text: string, edits: Edit[]}   (replace / remove / add)
//   <- {id, ok: true, result: string}   (the list with the edits applied)
//   -> {id, type: "compare", a: string, b: string, options: CheckOptionsInput}
//   <- {id, ok: true, result: {comparison: Comparison, ms}}
//   -> {id, type: "timelines", codes: string[]}
//   <- {id, ok: true, result: {code: Span[] | null}}
//   -> {id, type: "decode", bytes: ArrayBuffer}
//   <- {id, ok: true, result: {workbook: true} | {workbook: false, text}}
//      (a dropped file as the core reads files: a workbook, or text in UTF-8
//      or UTF-16; an error says what is wrong)
//   -> {id, type: "digest", text: string}
//   <- {id, ok: true, result: "hex SHA-256 of the text as UTF-8"}
//   -> {id, type: "export", text, options, format, system?: string, url?: string}
//   <- {id, ok: true, result: {format, filename, mime, text, count, left_out}}
//      (the CLI's check --format FORMAT: cleaned-csv, fhir, codes-csv, codes-sql,
//      codes-r, codes-python)
//   -> {id, type: "find", query: string, limit: number}
//   <- {id, ok: true, result: {query, date, results: Found[]}}
//   -> {id, type: "card", code: string, options: CheckOptionsInput}
//   <- {id, ok: true, result: Card}   (notes_status "not-loaded" until "notes")
//   -> {id, type: "notes", bytes?: ArrayBuffer, manifest?: object}
//      (the index's notes file, for cards: fetched beside this file by the
//      manifest the binding names, or given, as the single-file page does)
//   <- {id, ok: true, result: true | false}   (false: the system keeps no notes)
//   -> {id, type: "site"}
//   <- {id, ok: true, result: {file, found, indexes: [{name, manifest}], problems: [{name, message}]}}
//      (a site's own indexes: site-indexes.json beside this file lists their
//      manifests, each checked by the binding; found false: the site has no
//      such file (404); a listed manifest that is missing or wrong is left
//      out and named in problems; a malformed site file fails the request)
//   -> {id, type: "bundled"}
//   <- {id, ok: true, result: BundledSystem[]}   (the systems whose index the page serves, from the core)
//   any failure: {id, ok: false, error: "readable message"}
/* global wasm_bindgen, rollcall_workbook, WORKBOOK_WASM_GZ */
"use strict";

// The single-file page builds this worker from one Blob with the glue in it.
if (typeof wasm_bindgen === "undefined") importScripts("./rollcall-web.js");

// Set by web/post-build.mjs to the SRI hashes of the built Wasm and of its
// gzip copy (rollcall-web_bg.wasm.gz, for servers that send files as they
// are), which are then fetched with them.
const WASM_INTEGRITY = "";
const WASM_GZ_INTEGRITY = "";

// Whether this browser unpacks gzip itself (DecompressionStream).
const CAN_UNPACK = typeof DecompressionStream === "function";

let wasmReady = null;

function wasmRefused(e) {
  return new Error(
    `the checker's Wasm file (rollcall-web_bg.wasm) could not be loaded or does not match its integrity hash (${e.message}); ` +
      "the page's files may be damaged or from different builds",
  );
}

/** The checker's Wasm as a Response: the gzip copy unpacked as it arrives
 * (compiled while it streams), or the file itself where there is no copy. */
async function wasmSource() {
  const url = new URL("./rollcall-web_bg.wasm", self.location.href);
  if (!WASM_INTEGRITY) return url; // an unbuilt tree: no hashes to check
  if (CAN_UNPACK && WASM_GZ_INTEGRITY) {
    let res;
    try {
      res = await fetch(new URL("./rollcall-web_bg.wasm.gz", self.location.href), { integrity: WASM_GZ_INTEGRITY });
    } catch (e) {
      throw wasmRefused(e);
    }
    if (res.ok) {
      return new Response(res.body.pipeThrough(new DecompressionStream("gzip")), {
        headers: { "Content-Type": "application/wasm" },
      });
    }
  }
  return fetch(url, { integrity: WASM_INTEGRITY }).catch((e) => {
    throw wasmRefused(e);
  });
}

function startWasm(bytes) {
  if (!wasmReady) {
    wasmReady = (bytes ? Promise.resolve(bytes) : wasmSource()).then((source) => wasm_bindgen({ module_or_path: source }));
  }
  return wasmReady;
}

/** Unpacks gzip bytes; `name` is the file they came from, for the message. */
async function gunzip(bytes, name) {
  try {
    const stream = new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"));
    return new Uint8Array(await new Response(stream).arrayBuffer());
  } catch (e) {
    throw new Error(`the packed file “${name}” does not unpack (${e.message}): it is damaged or not gzip; it may be from another build`);
  }
}

/** The bytes of the index a manifest names: its packed copy where the
 * manifest names one the core accepts (packedFile) and the server has it,
 * else the file itself. */
async function fetchIndexFile(manifest) {
  const packed = manifest.packed;
  const file = CAN_UNPACK && packed ? wasm_bindgen.packedFile(String(packed.file), String(packed.encoding)) : undefined;
  if (file) {
    const res = await fetch(`./${file}`);
    if (res.ok) return gunzip(new Uint8Array(await res.arrayBuffer()), file);
  }
  return new Uint8Array(await (await fetch(`./${manifest.file}`)).arrayBuffer());
}

// The workbook reader (calamine) is a Wasm module of its own, loaded the
// first time a workbook is checked, so the checker every page load fetches
// stays without it. Set by web/post-build.mjs to the SRI hash of its Wasm.
const WORKBOOK_WASM_INTEGRITY = "";

let workbookReady = null;

/** The workbook module's `sheets` function, loading the module on first use. */
function workbookReader() {
  if (!workbookReady) {
    workbookReady = (async () => {
      // The single-file page puts the module's glue and its Wasm (gzip,
      // base64) in front of this file; the served page has them beside it.
      if (typeof rollcall_workbook === "undefined") importScripts("./rollcall-workbook.js");
      let source;
      if (typeof WORKBOOK_WASM_GZ !== "undefined") {
        source = await gunzipBase64(WORKBOOK_WASM_GZ);
      } else {
        const url = new URL("./rollcall-workbook_bg.wasm", self.location.href);
        source = WORKBOOK_WASM_INTEGRITY
          ? await fetch(url, { integrity: WORKBOOK_WASM_INTEGRITY }).catch((e) => {
              throw new Error(
                `the workbook reader's Wasm file (rollcall-workbook_bg.wasm) could not be loaded or does not match its integrity hash (${e.message}); ` +
                  "the page's files may be damaged or from different builds; save the sheet as CSV (CSV UTF-8) and drop that instead",
              );
            })
          : url;
      }
      await rollcall_workbook({ module_or_path: source });
      return rollcall_workbook.sheets;
    })();
    // A failed load is tried again with the next workbook.
    workbookReady.catch(() => {
      workbookReady = null;
    });
  }
  return workbookReady;
}

async function gunzipBase64(base64) {
  const text = atob(base64);
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  return gunzip(bytes, "rollcall-workbook_bg.wasm");
}

/** Whether the bytes are read as a workbook, as the command line decides:
 * told so, or (reading "auto") a zip (.xlsx, .ods) or OLE2 file (.xls). */
function readAsWorkbook(bytes, options) {
  const reading = String(options.reading ?? "").trim() || "auto";
  if (reading === "workbook") return true;
  if (reading !== "auto") return false;
  // The core's rule, as the CLI and decodeFile use it.
  return wasm_bindgen.isWorkbook(bytes);
}

let checker = null;
// The notes file of the loaded index, added once (see notes()).
let notesReady = null;

/** An index opened and verified: its content hashed by the browser's own
 * SHA-256 where it has one (crypto.subtle, in a secure context: several
 * times faster than hashing in Wasm), else by the core's; either way the
 * core holds the digest against the header. */
async function openChecker(bytes) {
  const subtle = self.isSecureContext && self.crypto && self.crypto.subtle;
  const start = wasm_bindgen.indexContentStart();
  if (subtle && bytes.length > start) {
    const digest = new Uint8Array(await subtle.digest("SHA-256", bytes.subarray(start)));
    return wasm_bindgen.Checker.withDigest(bytes, digest);
  }
  return new wasm_bindgen.Checker(bytes);
}

async function load(bytes, manifest) {
  if (checker) {
    checker.free();
    checker = null;
  }
  notesReady = null;
  // Opening checks the header (format and version); the constructor then
  // verifies the index's own checksum. Both throw readable errors.
  const c = await openChecker(new Uint8Array(bytes));
  const info = c.info();
  if (manifest) {
    if (manifest.sha256 !== info.sha256) {
      c.free();
      throw new Error(
        `the index file does not match its manifest: SHA-256 ${info.sha256.slice(0, 12)}… ` +
          `where ${String(manifest.sha256).slice(0, 12)}… was expected. It may be damaged or from another build.`,
      );
    }
    if (manifest.release !== info.release) {
      c.free();
      throw new Error(
        `the index is release ${info.release} but the manifest names release ${manifest.release}`,
      );
    }
  }
  checker = c;
  // The new checker has none of the old one's companions.
  companions.clear();
  info.default_day = c.defaultDay();
  return info;
}

// Other systems' indexes, fetched the first time a list needs one: an
// ICD-10-CM list with ICD-9-CM codes in it gets the ICD-9-CM index (and its
// GEMs), and a list whose system column names a bundled system gets that
// system's index, each verified against its manifest (manifest-NAME.json,
// written by the post-build hook), as the CLI has them built in.
const companions = new Map(); // vocabulary -> Promise<boolean>

async function companion(name) {
  if (!companions.has(name)) {
    companions.set(
      name,
      (async () => {
        try {
          // The manifest's name is the core's (System::index_manifest).
          const file = wasm_bindgen.indexManifest(name);
          if (!file) return false;
          const manifest = await (await fetch(`./${file}`)).json();
          const bytes = await fetchIndexFile(manifest);
          if (wasm_bindgen.sha256Hex(bytes.subarray(56)) !== manifest.sha256) return false;
          checker.addCompanion(bytes);
          return true;
        } catch {
          return false; // not served here (the single-file page): shapes only
        }
      })(),
    );
  }
  return companions.get(name);
}

// The tabular list's notes live in a file of their own, fetched the first
// time a card is opened (most visits never open one): its manifest, named by
// the core (Checker.notesManifest), gives its file, size and SHA-256; the
// binding then verifies it again and refuses notes of another index.
function notes(given, givenManifest) {
  if (!checker) return Promise.reject(new Error("the index is not loaded"));
  if (!notesReady) {
    const target = checker;
    notesReady = (async () => {
      const name = target.notesManifest();
      if (!name) return false;
      let manifest = givenManifest;
      let bytes = given;
      if (!bytes) {
        const res = await fetch(`./${name}`);
        if (!res.ok) throw new Error(`the notes manifest (${name}) could not be read (HTTP ${res.status})`);
        manifest = await res.json();
        const file = await fetch(`./${manifest.file}`);
        if (!file.ok) throw new Error(`the notes file (${manifest.file}) could not be read (HTTP ${file.status})`);
        bytes = new Uint8Array(await file.arrayBuffer());
      }
      if (manifest) {
        if (bytes.length !== manifest.byte_length || wasm_bindgen.sha256Hex(bytes.subarray(56)) !== manifest.sha256) {
          throw new Error(`the notes file does not match its manifest (${bytes.length} bytes); it may be damaged or from another build`);
        }
      }
      if (target !== checker) return false; // another index was loaded meanwhile
      checker.addNotes(bytes);
      return true;
    })();
    // A failed fetch may be tried again with the next card.
    notesReady.catch(() => {
      notesReady = null;
    });
  }
  return notesReady;
}

// A site's own indexes (built with vocab-build from releases it holds),
// listed by their manifests in a file beside the page. The binding holds the
// rules for the file and each manifest; the index itself is verified against
// its manifest by "load" once it is picked.
async function siteIndexes() {
  const file = wasm_bindgen.siteIndexesFile();
  let res;
  try {
    res = await fetch(`./${file}`, { cache: "no-cache" });
  } catch (e) {
    throw new Error(`${file} could not be fetched (${e.message})`);
  }
  if (res.status === 404) return { file, found: false, indexes: [], problems: [] };
  if (!res.ok) throw new Error(`${file} could not be read (the server answered ${res.status})`);
  const names = wasm_bindgen.siteIndexList(await res.text());
  // One bad manifest leaves out its index only; the others are offered.
  const read = await Promise.all(
    names.map(async (name) => {
      try {
        const m = await fetch(`./${name}`, { cache: "no-cache" });
        if (!m.ok) {
          throw new Error(`${file} lists ${name}, which could not be read (the server answered ${m.status}); copy it beside the page`);
        }
        return { index: JSON.parse(wasm_bindgen.siteIndexJson(name, await m.text())) };
      } catch (e) {
        return { problem: { name, message: e && e.message ? e.message : String(e) } };
      }
    }),
  );
  return {
    file,
    found: true,
    indexes: read.filter((r) => r.index).map((r) => r.index),
    problems: read.filter((r) => r.problem).map((r) => r.problem),
  };
}

/** The bundled indexes a report says its list needs and that are not loaded yet. */
function needed(report) {
  const wanted = new Set(
    (report.summary.by_system || []).filter((p) => p.checked === "not-loaded").map((p) => p.system),
  );
  for (const name of companionNeeded(report.vocabulary, report.entries)) wanted.add(name);
  return [...wanted].filter((name) => !companions.has(name));
}

/**
 * The companion once the entries need it, unless it is loaded: ICD-9-CM
 * beside ICD-10-CM once they hold its codes; ICD-10-CM beside ICD-9-CM also
 * once they hold retired or partly valid codes, which its codes replace.
 */
function companionNeeded(vocabulary, entries) {
  const other = wasm_bindgen.companionOf(vocabulary);
  if (!other || companions.has(other)) return [];
  const replaces = wasm_bindgen.companionReplaces(vocabulary);
  const wants = (e) =>
    (e.status === "other-system" && e.system === other) || (replaces && (e.status === "retired" || e.status === "partial"));
  return entries.some(wants) ? [other] : [];
}

// Entries per page of a paged check: the first page small, so the table
// starts to fill at once, the rest larger (fewer, cheaper messages).
const FIRST_PAGE = 500;
const PAGE = 5000;

/**
 * A pasted list checked in pages (Checker.checkPaged): each page of entries
 * goes to the page as it is judged; the reply's report has no entries. A
 * page naming a companion that is not loaded stops the check, which starts
 * again once it is loaded. Returns the report without entries, or null
 * when stopped (with the companions to load).
 */
function checkInPages(id, text, options) {
  const want = [];
  const vocabulary = checker.info().vocabulary;
  const rest = checker.checkPaged(text, options, FIRST_PAGE, PAGE, (json, done, lines) => {
    const entries = JSON.parse(json);
    want.push(...companionNeeded(vocabulary, entries));
    if (want.length) return false;
    self.postMessage({ id, page: { entries, done, lines } });
    return true;
  });
  return { report: rest === undefined ? null : JSON.parse(rest), want };
}

async function check(id, text, options, system, bytes) {
  if (!checker) throw new Error("the index is not loaded");
  const t0 = performance.now();
  // A companion an earlier check started to fetch is waited for, so that
  // this check has it as that one will (a check does not wait for a fetch
  // it did not start otherwise: it sees the companion as asked for).
  await Promise.all(companions.values());
  if (!bytes && !system) return checkPasted(id, text, options, t0);
  // A dropped file's bytes are read as the command line reads them: a
  // workbook's cells by the workbook module, then its sheets by the checker.
  let sheets = null;
  if (bytes && readAsWorkbook(bytes, options)) {
    const read = await workbookReader();
    try {
      sheets = read(bytes);
    } catch (err) {
      // A readable Error from the reader, or a trap of its Wasm.
      if (err instanceof Error && !(err instanceof WebAssembly.RuntimeError)) throw err;
      throw new Error(
        `cannot read the file: the workbook reader stopped (${err && err.message ? err.message : err}); save the workbook again as .xlsx, or the sheet as CSV (CSV UTF-8), and try again`,
      );
    }
  }
  // One JSON string across the boundary is much faster than building the
  // report object by object (see Checker.checkJson).
  const run = () =>
    JSON.parse(
      sheets !== null
        ? checker.checkSheetsJson(sheets, options)
        : bytes
          ? checker.checkBytesJson(bytes, options)
          : system
            ? checker.checkShapesJson(system, text, options)
            : checker.checkJson(text, options),
    );
  let report = run();
  const wanted = needed(report);
  if (wanted.length) {
    // One after the other, so the indexes are at hand in the same order as
    // on the command line (the order of the system names).
    let any = false;
    for (const name of wanted) any = (await companion(name)) || any;
    if (any) report = run();
  }
  const t1 = performance.now();
  const coverage = checker.coverage();
  const t2 = performance.now();
  return { report, coverage, checkMs: t1 - t0, totalMs: t2 - t0, loaded: checker.loaded() };
}

/** A pasted list, checked in pages (see checkInPages), again once the companions it names are loaded. */
async function checkPasted(id, text, options, t0) {
  let { report, want } = checkInPages(id, text, options);
  let any = false;
  for (const name of report ? needed(report) : want) any = (await companion(name)) || any;
  if (!report || any) {
    // Stopped, or the list named a system whose index is now loaded: the
    // pages so far are void. A companion is tried once, so this check runs
    // to its end (what could not be loaded is named as without it).
    self.postMessage({ id, page: { restart: true } });
    ({ report } = checkInPages(id, text, options));
  }
  const t1 = performance.now();
  const coverage = checker.coverage();
  return { report, coverage, checkMs: t1 - t0, totalMs: performance.now() - t0, loaded: checker.loaded(), paged: true };
}

function timelines(codes) {
  if (!checker) throw new Error("the index is not loaded");
  return checker.timelines(codes);
}

self.onmessage = async (event) => {
  const msg = event.data || {};
  const id = msg.id;
  try {
    if (msg.type === "init") {
      if (wasmReady) throw new Error("the checker has already started");
      startWasm(new Uint8Array(msg.wasm));
    }
    // A packed index is unpacked while the Wasm starts.
    const unpacked = msg.type === "load" && msg.packed ? gunzip(new Uint8Array(msg.bytes), String(msg.packed.file)) : null;
    if (unpacked) unpacked.catch(() => {}); // its error is thrown below, once the Wasm is up
    await startWasm();
    let result;
    switch (msg.type) {
      case "init":
        result = true;
        break;
      case "load":
        // The page fetched the copy its manifest names; the core says whether it is one.
        if (msg.packed && !wasm_bindgen.packedFile(String(msg.packed.file), String(msg.packed.encoding))) {
          throw new Error(`the manifest names a packed copy “${msg.packed.file}” that is not a gzip file beside the index; write the manifest again with index-manifest --pack`);
        }
        result = await load(unpacked ? await unpacked : msg.bytes, msg.manifest);
        break;
      case "check":
        result = await check(id, String(msg.text ?? ""), msg.options ?? {}, msg.system ? String(msg.system) : null);
        break;
      case "checkBytes":
        result = await check(id, "", msg.options ?? {}, null, new Uint8Array(msg.bytes));
        break;
      case "read":
        result = JSON.parse(wasm_bindgen.readDraft(String(msg.text ?? ""), msg.reading ? String(msg.reading) : undefined));
        break;
      case "edit":
        if (!checker) throw new Error("the index is not loaded");
        result = checker.editList(String(msg.text ?? ""), msg.edits ?? [], msg.reading ? String(msg.reading) : undefined);
        break;
      case "compare": {
        if (!checker) throw new Error("the index is not loaded");
        const t0 = performance.now();
        const comparison = JSON.parse(
          checker.compareJson(String(msg.a ?? ""), String(msg.b ?? ""), msg.options ?? {}),
        );
        result = { comparison, ms: performance.now() - t0 };
        break;
      }
      case "timelines":
        result = timelines(Array.isArray(msg.codes) ? msg.codes.map(String) : []);
        break;
      case "decode":
        result = JSON.parse(wasm_bindgen.decodeFile(new Uint8Array(msg.bytes)));
        break;
      case "digest":
        result = wasm_bindgen.sha256Hex(new TextEncoder().encode(String(msg.text ?? "")));
        break;
      case "export":
        if (!checker) throw new Error("the index is not loaded");
        result = JSON.parse(
          checker.exportJson(String(msg.text ?? ""), msg.options ?? {}, String(msg.format ?? ""), String(msg.system ?? ""), String(msg.url ?? "")),
        );
        break;
      case "card":
        if (!checker) throw new Error("the index is not loaded");
        // The GEMs live in the ICD-9-CM index: at hand beside ICD-10-CM, and
        // the ICD-10-CM one beside ICD-9-CM, as on the command line.
        {
          const vocabulary = checker.info().vocabulary;
          const other = wasm_bindgen.companionOf(vocabulary);
          if (other) await companion(other);
        }
        result = checker.card(String(msg.code ?? ""), msg.options ?? {});
        break;
      case "find":
        if (!checker) throw new Error("the index is not loaded");
        result = JSON.parse(checker.find(String(msg.query ?? ""), Number(msg.limit) || 10));
        break;
      case "site":
        result = await siteIndexes();
        break;
      case "bundled": result = wasm_bindgen.bundledSystems(); break; // <- [{name, title, manifest, companion, default}]
      case "notes":
        result = await notes(msg.bytes ? new Uint8Array(msg.bytes) : null, msg.manifest || null);
        break;
      default:
        throw new Error(`unknown request “${msg.type}”`);
    }
    self.postMessage({ id, ok: true, result });
  } catch (err) {
    const message = err && err.message ? err.message : String(err);
    self.postMessage({ id, ok: false, error: message });
  }
};
