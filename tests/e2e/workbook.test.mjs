// End-to-end tests of spreadsheet workbooks in the page: a workbook of two
// sheets (one with no codes) dropped on the page, passed to the JavaScript
// API's checkFile, and dropped on the single-file page gives the CLI's report
// (`rollcall check FILE.xlsx --format json`); the workbook reader is a Wasm
// module of its own, fetched only when a workbook is checked, and the
// checker's Wasm every page load fetches holds no part of it.
// Run through run.sh, which builds web/dist, the single-file page and the CLI.
//
// Environment: DIST, SINGLE (single-file page), CLI, CHROMIUM.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { ROOT, DIST, CLI, CHROMIUM, HISTORY, BROWSER_ARGS } from "./env.mjs";

const SINGLE = process.env.SINGLE || path.join(ROOT, "web/dist-single/rollcall.html");
const PERIOD = { from: "2019-01-01", to: "2024-12-31" };
const PERIOD_ARGS = ["--from", PERIOD.from, "--to", PERIOD.to];

// ------------------------------------------------------------ the file --

/** CRC-32 (ISO 3309, the polynomial 0xEDB88320 the zip format names). */
function crc32(bytes) {
  let c = ~0;
  for (const b of bytes) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
  }
  return ~c >>> 0;
}

/**
 * A zip archive of stored (uncompressed) entries, as the ZIP File Format
 * Specification (PKWARE APPNOTE.TXT, sections 4.3.7, 4.3.12 and 4.3.16)
 * lays out: a local header and the data of each file, the central
 * directory, the end record.
 */
function zipStored(files) {
  const locals = [];
  const central = [];
  let offset = 0;
  for (const [name, text] of files) {
    const nameBytes = Buffer.from(name, "utf8");
    const data = Buffer.from(text, "utf8");
    const crc = crc32(data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4); // version needed: 2.0
    local.writeUInt16LE(0x0800, 6); // names in UTF-8
    local.writeUInt16LE(0, 8); // stored
    local.writeUInt16LE(0, 10); // time 00:00
    local.writeUInt16LE((0 << 9) | (1 << 5) | 1, 12); // date 1980-01-01
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(data.length, 18);
    local.writeUInt32LE(data.length, 22);
    local.writeUInt16LE(nameBytes.length, 26);
    local.writeUInt16LE(0, 28);
    const entry = Buffer.alloc(46);
    entry.writeUInt32LE(0x02014b50, 0);
    entry.writeUInt16LE(20, 4);
    entry.writeUInt16LE(20, 6);
    entry.writeUInt16LE(0x0800, 8);
    entry.writeUInt16LE(0, 10);
    entry.writeUInt16LE(0, 12);
    entry.writeUInt16LE((0 << 9) | (1 << 5) | 1, 14);
    entry.writeUInt32LE(crc, 16);
    entry.writeUInt32LE(data.length, 20);
    entry.writeUInt32LE(data.length, 24);
    entry.writeUInt16LE(nameBytes.length, 28);
    // extra, comment, disk, internal and external attributes: zero
    entry.writeUInt32LE(offset, 42);
    locals.push(local, nameBytes, data);
    central.push(entry, nameBytes);
    offset += local.length + nameBytes.length + data.length;
  }
  const dir = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(files.length, 8);
  end.writeUInt16LE(files.length, 10);
  end.writeUInt32LE(dir.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, dir, end]);
}

const xmlText = (s) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");

/**
 * A workbook in Office Open XML (ECMA-376 Part 1: the content types, the
 * package relationship, the workbook and its relationships, one worksheet
 * per sheet with inline strings). `sheets`: [name, firstRow, rows of cells].
 */
function xlsx(sheets) {
  const ns = "http://schemas.openxmlformats.org";
  const head = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>';
  const files = [];
  const overrides = sheets
    .map((_, i) => `<Override PartName="/xl/worksheets/sheet${i + 1}.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>`)
    .join("");
  files.push([
    "[Content_Types].xml",
    `${head}<Types xmlns="${ns}/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>${overrides}</Types>`,
  ]);
  files.push([
    "_rels/.rels",
    `${head}<Relationships xmlns="${ns}/package/2006/relationships"><Relationship Id="rId1" Type="${ns}/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
  ]);
  const list = sheets.map(([name], i) => `<sheet name="${xmlText(name)}" sheetId="${i + 1}" r:id="rId${i + 1}"/>`).join("");
  files.push([
    "xl/workbook.xml",
    `${head}<workbook xmlns="${ns}/spreadsheetml/2006/main" xmlns:r="${ns}/officeDocument/2006/relationships"><sheets>${list}</sheets></workbook>`,
  ]);
  const rels = sheets
    .map((_, i) => `<Relationship Id="rId${i + 1}" Type="${ns}/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet${i + 1}.xml"/>`)
    .join("");
  files.push(["xl/_rels/workbook.xml.rels", `${head}<Relationships xmlns="${ns}/package/2006/relationships">${rels}</Relationships>`]);
  sheets.forEach(([, firstRow, rows], i) => {
    const data = rows
      .map((cells, r) => {
        const n = firstRow + r;
        const cs = cells
          .map((v, c) => `<c r="${String.fromCharCode(65 + c)}${n}" t="inlineStr"><is><t>${xmlText(v)}</t></is></c>`)
          .join("");
        return `<row r="${n}">${cs}</row>`;
      })
      .join("");
    files.push([`xl/worksheets/sheet${i + 1}.xml`, `${head}<worksheet xmlns="${ns}/spreadsheetml/2006/main"><sheetData>${data}</sheetData></worksheet>`]);
  });
  return zipStored(files);
}

// A draft list of the invented Larkfield study: a notes sheet with no codes,
// then the codes from row 3 (a title and a blank row above them).
const BOOK = xlsx([
  ["Notes", 1, [["Larkfield study: draft list of diagnoses"], ["Prepared by the data team, reviewed by Dr Ossian Pell"]]],
  [
    "Codes",
    3,
    [
      ["Code", "Description"],
      ["E11.9", "Type 2 diabetes mellitus without complications"],
      ["E11", "Type 2 diabetes mellitus"],
      ["I1O", "Essential hypertension, mistyped"],
      ["I50.22", "Chronic systolic (congestive) heart failure"],
      ["J45.909", "Unspecified asthma, uncomplicated"],
    ],
  ],
]);

/** A text file checked through the same API call. */
const TEXT_LIST = "E11.9\tType 2 diabetes mellitus without complications\nI1O\n";

/** The CLI's JSON report of a file over the period (exit status 1 only means errors). */
function cli(file) {
  const r = spawnSync(CLI, ["check", file, "--format", "json", ...PERIOD_ARGS], { encoding: "utf8" });
  assert.ok(r.status === 0 || r.status === 1, `the CLI failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

/** What the tests compare: each entry's code, status, sheet and row. */
const places = (report) => report.entries.map((e) => ({ code: e.code, status: e.status, sheet: e.sheet, row: e.row }));

// ------------------------------------------------------------- set-up --

let server;
let origin;
let browser;
let tmp;
let bookFile;
let expected;

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  assert.ok(fs.existsSync(CLI), `no CLI at ${CLI}`);
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-workbook-"));
  bookFile = path.join(tmp, "larkfield-draft.xlsx");
  fs.writeFileSync(bookFile, BOOK);
  expected = cli(bookFile);
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: BROWSER_ARGS });
});

after(async () => {
  if (browser) await browser.close();
  if (server) server.close();
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

/** A page that collects its errors, CSP violations and requests. */
async function openPage(context, url) {
  const page = await context.newPage();
  page.problems = [];
  page.requests = [];
  page.on("pageerror", (e) => page.problems.push(`page error: ${e.message}`));
  page.on("console", (m) => {
    // Failed loads are told apart below, by URL.
    if (m.type() === "error" && !m.text().startsWith("Failed to load resource")) page.problems.push(`console error: ${m.text()}`);
  });
  page.on("response", (r) => {
    // A browser asks for /favicon.ico on its own; the pages have none. A
    // site with no indexes of its own answers 404 for their list.
    if (r.status() >= 400 && !/\/(favicon\.ico|site-indexes\.json)$/.test(r.url())) page.problems.push(`${r.status()} for ${r.url()}`);
  });
  page.on("requestfailed", (r) => page.problems.push(`failed: ${r.url()}`));
  page.on("request", (r) => page.requests.push(r.url()));
  await page.addInitScript(() => {
    window.__csp = [];
    document.addEventListener("securitypolicyviolation", (e) => window.__csp.push(`${e.violatedDirective} blocked ${e.blockedURI || "inline"}`), true);
  });
  await page.goto(url);
  return page;
}

async function waitReady(page) {
  await page.waitForFunction(() => ["ready", "index-error"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  assert.equal(await page.evaluate(() => document.body.dataset.state), "ready", await page.textContent("#index-error"));
}

/** Drop the workbook on the page (its file input) and wait for the check. */
async function dropBook(page) {
  await page.check("#when-period");
  await page.fill("#opt-from", PERIOD.from);
  await page.fill("#opt-to", PERIOD.to);
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.setInputFiles("#file-input", {
    name: "larkfield-draft.xlsx",
    mimeType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    buffer: BOOK,
  });
  await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", n, { timeout: 60_000 });
  await page.waitForFunction(() => /Read the workbook/.test(document.getElementById("file-message").textContent), null, { timeout: 10_000 });
}

// -------------------------------------------------------------- tests --

test("the CLI's report of the workbook: what the page is held to", () => {
  // The Notes sheet has no codes; the codes of the Codes sheet keep their rows.
  assert.deepEqual(
    expected.reading.sheets.map((s) => [s.name, s.codes]),
    [
      ["Notes", 0],
      ["Codes", 5],
    ],
  );
  const valid = places(expected).find((e) => e.code === "E11.9");
  assert.deepEqual(valid, { code: "E11.9", status: "valid", sheet: "Codes", row: 4 });
  // E11.9 is billable through the whole period in the CMS release history
  // (vocab-build/sources/PROVENANCE.md); E11 never is (a category).
  const history = new Map(
    zlib
      .gunzipSync(fs.readFileSync(HISTORY))
      .toString("utf8")
      .split("\n")
      .slice(1)
      .map((l) => l.split("\t"))
      .map(([code, from, to]) => [code, [from, to]]),
  );
  const [from, to] = history.get("E119"); // YYYYMMDD
  const day = (iso) => iso.replace(/-/g, "");
  assert.ok(from <= day(PERIOD.from) && to >= day(PERIOD.to), `E11.9 billable ${from}..${to}`);
  assert.equal(history.get("E11"), undefined);
});

test("a workbook dropped on the page is checked as the CLI checks the file, the reader loaded on first use", async () => {
  const context = await browser.newContext({ acceptDownloads: true });
  const page = await openPage(context, `${origin}/`);
  await waitReady(page);
  const reader = () => page.requests.filter((u) => /rollcall-workbook/.test(u));
  assert.deepEqual(reader(), [], "the workbook reader is fetched before any workbook");
  // Pasted text has no workbook reading to pick (text read so is read as a table).
  const offered = () => page.$eval('#opt-reading option[value="workbook"]', (o) => !o.hidden && !o.disabled);
  assert.equal(await offered(), false);
  await dropBook(page);
  assert.deepEqual(
    reader().map((u) => new URL(u).pathname),
    ["/rollcall-workbook.js", "/rollcall-workbook_bg.wasm"],
  );
  assert.match(await page.textContent("#file-message"), /“Notes” \(no codes\), “Codes” \(5 codes\)/);
  // The picker says the file was read as a workbook.
  assert.equal(await offered(), true);
  assert.equal(await page.inputValue("#opt-reading"), "workbook");
  assert.match(await page.$eval("#opt-reading", (s) => s.selectedOptions[0].textContent), /workbook/);
  assert.match(await page.textContent("#reading-line"), /^Read as workbook: 5 codes/);
  // The JSON download is the CLI's report, field for field.
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click("#download-json")]);
  const report = JSON.parse(fs.readFileSync(await dl.path(), "utf8"));
  assert.deepEqual(places(report), places(expected));
  assert.deepEqual(report, expected);
  // The guess and the forced workbook reading read it the same.
  for (const reading of ["auto", "workbook"]) {
    const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
    await page.selectOption("#opt-reading", reading);
    await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", n, { timeout: 30_000 });
    assert.match(await page.textContent("#reading-line"), /^Read as workbook: 5 codes/, reading);
  }
  // Edited, the list is text: the workbook reading goes from the picker.
  await page.focus("#list");
  await page.keyboard.press("Control+End");
  await page.keyboard.type("\nE11.9");
  assert.equal(await offered(), false);
  assert.equal(await page.inputValue("#opt-reading"), "auto");
  assert.deepEqual(await page.evaluate(() => window.__csp), [], "CSP violations");
  assert.deepEqual(page.problems, []);
  await context.close();
});

test("the JavaScript API's checkFile reads a workbook, and names a damaged one", async () => {
  const context = await browser.newContext();
  const page = await openPage(context, `${origin}/api-example.html`);
  await page.waitForFunction(() => ["done", "failed"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  const out = await page.evaluate(
    async ({ book, period, list }) => {
      const { open } = await import("./rollcall.js");
      const checker = await open("icd10cm.rcx", { manifest: "index-manifest.json" });
      const bytes = new Uint8Array(book);
      // checkFile resolves to the report with its coverage and timings.
      const { report } = await checker.checkFile(new Blob([bytes]), period);
      const { report: again } = await checker.checkFile(bytes.buffer, period);
      const errors = [];
      for (const bad of [
        // A zip that is no workbook, and a workbook cut short.
        new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]),
        bytes.slice(0, 200),
      ]) {
        try {
          await checker.checkFile(bad, period);
          errors.push(null);
        } catch (e) {
          errors.push(e.message);
        }
      }
      // Text files still go to the checker as text.
      const { report: text } = await checker.checkFile(new TextEncoder().encode(list), period);
      checker.close();
      return { report, again, errors, text };
    },
    { book: [...BOOK], period: PERIOD, list: TEXT_LIST },
  );
  assert.deepEqual(places(out.report), places(expected));
  assert.deepEqual(out.report, expected);
  assert.deepEqual(out.again, expected);
  for (const e of out.errors) assert.match(e ?? "no error", /cannot read the file: this looks like a spreadsheet workbook but cannot be opened .*save it again/);
  const textFile = path.join(tmp, "list.txt");
  fs.writeFileSync(textFile, TEXT_LIST);
  assert.deepEqual(out.text, cli(textFile));
  assert.ok(out.text.entries.every((e) => e.sheet === undefined));
  assert.equal(page.requests.filter((u) => u.endsWith("/rollcall-workbook_bg.wasm")).length, 1, "the reader's Wasm is fetched once");
  assert.deepEqual(page.problems, []);
  await context.close();
});

test("the single-file page reads a workbook from file:// with no network", async () => {
  assert.ok(fs.existsSync(SINGLE), `no single-file page at ${SINGLE}`);
  const offline = await browser.newContext({ offline: true, acceptDownloads: true });
  await offline.route((url) => url.protocol !== "file:", (route) => route.abort("internetdisconnected"));
  const page = await openPage(offline, `file://${SINGLE}`);
  await waitReady(page);
  await dropBook(page);
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click("#download-json")]);
  const report = JSON.parse(fs.readFileSync(await dl.path(), "utf8"));
  assert.deepEqual(places(report), places(expected));
  assert.deepEqual(report, expected);
  const foreign = page.requests.filter((u) => !(u.startsWith("file://") || u.startsWith("blob:") || u.startsWith("data:")));
  assert.deepEqual(foreign, [], "requests beyond the file");
  assert.deepEqual(await page.evaluate(() => window.__csp), [], "CSP violations");
  assert.deepEqual(page.problems, []);
  await offline.close();
});

test("the checker's Wasm holds no part of the workbook reader", () => {
  const main = fs.readFileSync(path.join(DIST, "rollcall-web_bg.wasm"));
  const book = fs.readFileSync(path.join(DIST, "rollcall-workbook_bg.wasm"));
  // Strings only the cell reader has: the source paths of calamine and of
  // its XML and encoding crates in its messages, and part names of an Office
  // Open XML package (ECMA-376).
  for (const marker of ["calamine", "quick-xml", "encoding_rs", "xl/workbook.xml", "sharedStrings"]) {
    assert.ok(book.includes(marker), `the workbook reader's Wasm should hold “${marker}”`);
    assert.ok(!main.includes(marker), `the checker's Wasm holds “${marker}”: the cell reader is back in it`);
  }
  const gz = (b) => zlib.gzipSync(b, { level: 9 }).length;
  console.log(`# checker Wasm ${main.length.toLocaleString("en-US")} bytes, ${gz(main).toLocaleString("en-US")} gzip -9`);
  console.log(`# workbook reader Wasm ${book.length.toLocaleString("en-US")} bytes, ${gz(book).toLocaleString("en-US")} gzip -9`);
});
