// rollcall's JavaScript API: open an index, check lists, get the CLI's JSON
// report. The checker (the core compiled to WebAssembly) runs in a Web
// Worker that this module starts and owns, so a long check never blocks the
// page. Types: rollcall.d.ts next to this file.
//
//   import { open, openSite } from "./rollcall.js";
//   const checker = await open("icd10cm.rcx", { manifest: "index-manifest.json" });
//   const report = await checker.check("E11.9\nE11\n", { from: "2019-01-01", to: "2024-12-31", billable: true });
//   const labs = await openSite("loinc-manifest.json"); // an index the site lists in site-indexes.json

/** The folder this module was loaded from: worker.js, the Wasm and the index sit beside it. */
const HERE = new URL(".", import.meta.url);

function messageOf(err) {
  const m = err && err.message ? err.message : String(err);
  return m.replace(/^Error: /, "");
}

function formatBytes(n) {
  if (n >= 1e6) return `${(n / 1e6).toFixed(1)} MB`;
  if (n >= 1e3) return `${(n / 1e3).toFixed(0)} kB`;
  return `${n} bytes`;
}

function nameOf(url) {
  const s = String(url);
  return s.startsWith("blob:") || s.startsWith("data:") ? "index" : s.split(/[?#]/)[0].split("/").pop() || s;
}

/** One conversation with a worker: requests carry an id, replies echo it. */
class Channel {
  constructor(worker) {
    this.worker = worker;
    this.pending = new Map();
    this.nextId = 1;
    this.broken = null;
    worker.onmessage = (event) => {
      const { id, ok, result, error, page } = event.data || {};
      const p = this.pending.get(id);
      if (!p) return;
      if (page) {
        // A check's entries come a page at a time before its reply.
        if (page.restart) p.entries = [];
        else for (const e of page.entries) p.entries.push(e);
        if (p.onPage) p.onPage(page, p.entries);
        return;
      }
      this.pending.delete(id);
      if (ok && result && result.paged) {
        result.report.entries = p.entries;
        delete result.paged;
      }
      if (ok) p.resolve(result);
      else p.reject(new Error(error));
    };
    worker.onerror = (event) => {
      if (event.preventDefault) event.preventDefault();
      this.fail(new Error(`the checker could not start: ${event.message || "the worker failed to load"}`));
    };
    worker.onmessageerror = () => this.fail(new Error("the checker sent a reply the page could not read"));
  }

  fail(err) {
    this.broken = err;
    for (const p of this.pending.values()) p.reject(err);
    this.pending.clear();
  }

  /**
   * One request; `onPage(page, entries)` sees each page of a check's
   * entries as it comes (`entries`: all so far), and the reply's report
   * holds them all.
   */
  ask(type, payload = {}, transfer = [], onPage = null) {
    if (this.broken) return Promise.reject(this.broken);
    const id = this.nextId++;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, onPage, entries: [] });
      this.worker.postMessage({ id, type, ...payload }, transfer);
    });
  }

  close() {
    this.fail(new Error("the checker is closed"));
    this.worker.terminate();
  }
}

/**
 * A list as the checker reads it: text as it is, or rows (strings, `{code,
 * label}` objects or `[code, label]` pairs) as one line each, code and label
 * separated by a tab. Row i is line i + 1 of the report.
 */
export function listText(list) {
  if (typeof list === "string") return list;
  if (!Array.isArray(list)) {
    throw new TypeError(`a list is text or an array of rows, not ${list === null ? "null" : typeof list}`);
  }
  const flat = (v) => String(v ?? "").replace(/[\t\r\n]+/g, " ");
  return list
    .map((row, i) => {
      let code;
      let label = null;
      if (typeof row === "string") code = row;
      else if (Array.isArray(row)) [code, label = null] = row;
      else if (row && typeof row === "object") ({ code, label = null } = row);
      else {
        throw new TypeError(`row ${i + 1} of the list is ${row === null ? "null" : `a ${typeof row}`}; give a string, {code, label} or [code, label]`);
      }
      if (code !== undefined && code !== null && typeof code !== "string") {
        throw new TypeError(`row ${i + 1}: the code is a ${typeof code}; give it as a string`);
      }
      // A string row keeps its own layout (it may already hold a label).
      if (typeof row === "string") return row.replace(/[\r\n]+/g, " ");
      return label === null || label === undefined || label === "" ? flat(code) : `${flat(code)}\t${flat(label)}`;
    })
    .join("\n");
}

/** An index manifest: the object itself, or fetched from its URL and checked for shape. */
export async function readManifest(manifest) {
  if (manifest === undefined || manifest === null) return null;
  if (typeof manifest === "object" && !(manifest instanceof URL)) return manifest;
  const name = nameOf(manifest);
  let m;
  try {
    const res = await fetch(manifest, { cache: "no-cache" });
    if (!res.ok) throw new Error(`the server answered ${res.status}`);
    m = await res.json();
  } catch (e) {
    throw new Error(`the index manifest (${name}) could not be read: ${messageOf(e)}.`);
  }
  if (!m || typeof m.sha256 !== "string" || typeof m.byte_length !== "number") {
    throw new Error(`the index manifest (${name}) is not in the expected form.`);
  }
  return m;
}

async function fetchBytes(url, expected, onProgress) {
  const name = nameOf(url);
  let res;
  try {
    res = await fetch(url, { cache: "no-cache" });
  } catch (e) {
    throw new Error(`the index file “${name}” could not be fetched (${messageOf(e)}).`);
  }
  if (!res.ok) throw new Error(`the index file “${name}” is missing (the server answered ${res.status}).`);
  return readBody(res, expected, onProgress);
}

async function readBody(res, expected, onProgress) {
  const total = expected || Number(res.headers.get("content-length")) || 0;
  if (!res.body) {
    const buf = new Uint8Array(await res.arrayBuffer());
    if (onProgress) onProgress(buf.length, total || buf.length);
    return buf;
  }
  const reader = res.body.getReader();
  const chunks = [];
  let got = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    got += value.length;
    if (onProgress) onProgress(got, total);
  }
  const bytes = new Uint8Array(got);
  let at = 0;
  for (const c of chunks) {
    bytes.set(c, at);
    at += c.length;
  }
  return bytes;
}

/** The bytes of an index given as a URL, bytes, a Blob or a Response. */
async function indexBytes(source, expected, onProgress) {
  if (typeof source === "string" || source instanceof URL) {
    const base = globalThis.document ? document.baseURI : globalThis.location.href;
    return fetchBytes(new URL(source, base), expected, onProgress);
  }
  // A copy: the buffer moves to the worker and the caller keeps theirs.
  if (source instanceof ArrayBuffer) return new Uint8Array(source.slice(0));
  if (ArrayBuffer.isView(source)) return new Uint8Array(source.buffer.slice(source.byteOffset, source.byteOffset + source.byteLength));
  if (typeof Blob !== "undefined" && source instanceof Blob) return new Uint8Array(await source.arrayBuffer());
  if (typeof Response !== "undefined" && source instanceof Response) {
    if (!source.ok) throw new Error(`the index could not be read (the server answered ${source.status}).`);
    return new Uint8Array(await source.arrayBuffer());
  }
  throw new TypeError("an index is given as a URL, an ArrayBuffer, a typed array, a Blob or a Response");
}

/** A loaded, verified index in its own worker. */
export class Checker {
  constructor(channel, info, notes = null) {
    this.channel = channel;
    /** Release, coverage, sources, byte length and SHA-256 of the index. */
    this.info = info;
    this.notesSource = notes;
    this.notesLoaded = null;
  }

  /**
   * Load the index's notes file (the tabular list's notes that cards show)
   * if its system has one: the worker fetches it by its manifest, or takes
   * the bytes of `open`'s `notes` option. Resolves to true once loaded,
   * false when the system keeps no notes; until then cards say
   * `notes_status: "not-loaded"`.
   */
  loadNotes() {
    if (!this.notesLoaded) {
      this.notesLoaded = (async () => {
        const given = this.notesSource;
        if (!given) return this.channel.ask("notes");
        const bytes = await given.bytes();
        return this.channel.ask("notes", { bytes: bytes.buffer, manifest: given.manifest }, [bytes.buffer]);
      })();
      this.notesLoaded.catch(() => {
        this.notesLoaded = null; // tried again next time
      });
    }
    return this.notesLoaded;
  }

  /** Check a list; resolves to the report in the CLI's JSON schema. */
  async check(list, options = {}) {
    return (await this.checkWithCoverage(list, options)).report;
  }

  /**
   * The report, the category coverage of the same pass, and timings in ms.
   * `onPage({entries, done, lines}, all)`, if given, sees the entries of a
   * long list as they are judged, a page at a time (`done`: the line of the
   * last one; `all`: every entry so far; a page `{restart: true}` means the
   * check starts again, as when the list needed a companion index).
   */
  checkWithCoverage(list, options = {}, onPage = null) {
    // `system`: a shape-only system (loinc, snomed, ...) for the rows with no
    // system cell; the other options are the CLI's.
    const { system, ...rest } = options ?? {};
    return this.channel.ask("check", { text: listText(list), options: rest, system: system || undefined }, [], onPage);
  }

  /**
   * Check a file as the command line reads it: a spreadsheet workbook
   * (.xlsx, .xls, .ods; each entry names its sheet and row) or text in any
   * form. `file`: a Blob, an ArrayBuffer or a typed array.
   */
  async checkFile(file, options = {}) {
    const bytes =
      typeof Blob !== "undefined" && file instanceof Blob
        ? new Uint8Array(await file.arrayBuffer())
        : file instanceof ArrayBuffer
          ? new Uint8Array(file.slice(0))
          : new Uint8Array(file);
    const { system, ...rest } = options ?? {};
    return this.channel.ask("checkBytes", { bytes: bytes.buffer, options: rest }, [bytes.buffer]);
  }

  /**
   * How the core reads a list, and where each code sits in the text:
   * `{ reading, tokens: [{ line, start, end, code }] }` (UTF-16 offsets).
   * `reading`: "auto" (default), "lines", "table", "text" or "json".
   */
  read(list, reading) {
    return this.channel.ask("read", { text: listText(list), reading: reading || undefined });
  }

  /**
   * The list with edits applied (replace a code where it stands, remove or
   * add a line); `reading` as in `read`.
   */
  edit(text, edits, reading) {
    return this.channel.ask("edit", { text: String(text), edits, reading: reading || undefined });
  }

  /** Billable and header spans per code (`null` for a code the index lacks). */
  timelines(codes) {
    return this.channel.ask("timelines", { codes: [...codes].map(String) });
  }

  /** The card of a code, node or code start (the CLI's `show`), for the options' day or period. */
  card(code, options = {}) {
    return this.channel.ask("card", { code: String(code), options });
  }

  /** Lower-case hex SHA-256 of the list's text (UTF-8), as `listText` gives it. */
  digest(list) {
    return this.channel.ask("digest", { text: listText(list) });
  }

  /** A request by name to the worker (see worker.js for the protocol); `onPage` as in checkWithCoverage. */
  request(type, payload = {}, transfer = [], onPage = null) {
    return this.channel.ask(type, payload, transfer, onPage);
  }

  /** Stop the worker; later calls reject. */
  close() {
    this.channel.close();
  }
}

/**
 * Start a worker, load and verify an index, and resolve to a Checker.
 * `source`: the index as a URL (relative to the page), bytes, a Blob or a
 * Response. Options: `manifest` (an object or the URL of
 * index-manifest.json; the index must match its SHA-256 and release),
 * `onProgress(received, total)` while a URL downloads, `worker` (a Worker
 * running worker.js, default the one beside this module), `wasm` (the
 * Wasm bytes, when the worker cannot fetch them itself) and `notes`
 * (`{bytes: () => Promise<Uint8Array>, manifest}`: the notes file, when the
 * worker cannot fetch it by its manifest).
 */
export async function open(source, options = {}) {
  const worker = options.worker || new Worker(new URL("worker.js", HERE));
  const channel = new Channel(worker);
  try {
    if (options.wasm) await channel.ask("init", { wasm: options.wasm });
    return await openIn(channel, source, options);
  } catch (e) {
    channel.close();
    throw e;
  }
}

/**
 * A site's own indexes: those `site-indexes.json` beside this module lists
 * (built with vocab-build, their manifests written by index-manifest; see
 * the README). Resolves to `{file, found, indexes: [{name, manifest}],
 * problems: [{name, message}]}`: `found` is false when the site has no
 * such file, and each listed manifest that is missing or wrong is left out
 * of `indexes` and named in `problems`. Rejects with a readable message when the file itself
 * is malformed.
 */
export async function siteIndexes() {
  const channel = new Channel(new Worker(new URL("worker.js", HERE)));
  try {
    return await channel.ask("site");
  } finally {
    channel.close();
  }
}

/**
 * Open one of the site's own indexes by its name in `site-indexes.json`
 * (its manifest's file name): the index is fetched from beside this module
 * and verified against that manifest. Options: `onProgress`, as for `open`.
 */
export async function openSite(name, options = {}) {
  const channel = new Channel(new Worker(new URL("worker.js", HERE)));
  try {
    const site = await channel.ask("site");
    const entry = site.indexes.find((s) => s.name === name);
    if (!entry) throw new Error(notOffered(String(name), site));
    return await openIn(channel, new URL(entry.manifest.file, HERE), { ...options, manifest: entry.manifest });
  } catch (e) {
    channel.close();
    throw e;
  }
}

/** Why a site index asked for by name cannot be opened, and what to do. */
function notOffered(name, site) {
  if (!site.found) {
    return `the site lists no indexes of its own (there is no ${site.file} beside rollcall.js), so there is no “${name}”; see the README, “A site's own index on the page”`;
  }
  const problem = site.problems.find((p) => p.name === name);
  if (problem) return `the site's index “${name}” cannot be used: ${problem.message}`;
  const names = site.indexes.map((s) => s.name);
  return `${site.file} lists no index “${name}”; ${names.length ? `it lists ${names.join(", ")}` : "it lists none"}`;
}

/**
 * The packed copy of the manifest's index, as the manifest names it (written
 * by `index-manifest --pack`, whose name the worker checks with the core's
 * rule before it unpacks it), when the source is the manifest's own file and
 * the browser can unpack gzip: a server that sends files as they are then
 * sends a fifth of the bytes. Resolves to `{bytes, packed}`, or null when
 * there is no packed copy to use (none named, another file asked for, or the
 * server has none: the index itself is fetched).
 */
async function packedBytes(source, manifest, onProgress) {
  const packed = manifest && manifest.packed;
  if (!packed || typeof DecompressionStream !== "function") return null;
  if (!(typeof source === "string" || source instanceof URL)) return null;
  const base = globalThis.document ? document.baseURI : globalThis.location.href;
  const url = new URL(source, base);
  if (nameOf(url) !== manifest.file) return null;
  let res;
  try {
    res = await fetch(new URL(packed.file, url), { cache: "no-cache" });
  } catch {
    return null;
  }
  if (!res.ok) return null;
  return { bytes: await readBody(res, packed.byte_length, onProgress), packed };
}

/** Load and verify an index in a started worker; resolves to a Checker. */
async function openIn(channel, source, options) {
  const manifest = await readManifest(options.manifest);
  const packed = await packedBytes(source, manifest, options.onProgress);
  const bytes = packed ? packed.bytes : await indexBytes(source, manifest && manifest.byte_length, options.onProgress);
  const got = bytes.byteLength; // the buffer moves to the worker
  const expected = packed ? packed.packed.byte_length : manifest && manifest.byte_length;
  let info;
  try {
    info = await channel.ask(
      "load",
      { bytes: bytes.buffer, manifest, packed: packed ? { file: packed.packed.file, encoding: packed.packed.encoding } : null },
      [bytes.buffer],
    );
  } catch (e) {
    let msg = messageOf(e);
    if (manifest && got !== expected) {
      msg += ` (${formatBytes(got)} arrived where the manifest expects ${formatBytes(expected)})`;
    }
    throw new Error(msg);
  }
  return new Checker(channel, info, options.notes || null);
}
