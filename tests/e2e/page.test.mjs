// End-to-end tests of the built page (web/dist) in Debian's Chromium via
// playwright-core. Run through run.sh, which builds dist and the CLI first.
//
// Environment: DIST (built page), CLI (rollcall binary), DEMO (demo list),
// CHROMIUM (browser path).
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import zlib from "node:zlib";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { HERE, ROOT, DIST, CLI, DEMO, CHROMIUM, HISTORY, BROWSER_ARGS } from "./env.mjs";

const OUT = path.join(HERE, "out");


let server;
let origin;
let context;
let profileDir;
const requests = [];

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  assert.ok(fs.existsSync(CLI), `no CLI at ${CLI}`);
  fs.mkdirSync(OUT, { recursive: true });
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  profileDir = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-e2e-"));
  context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: BROWSER_ARGS,
    acceptDownloads: true,
    viewport: { width: 1280, height: 1000 },
  });
  context.on("request", (r) => requests.push(r.url()));
});

after(async () => {
  if (context) await context.close();
  if (server) server.close();
  if (profileDir) fs.rmSync(profileDir, { recursive: true, force: true });
});

// ------------------------------------------------------------- helpers --

/** The CLI's JSON report (exit status 1 only means the list has errors). */
function cli(file, args) {
  const r = spawnSync(CLI, ["check", file, "--format", "json", ...args], { encoding: "utf8", maxBuffer: 1 << 28 });
  assert.ok(r.status === 0 || r.status === 1, `the CLI failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

/** Each finding as "line kind severity", sorted, the way the page lists them. */
function findingKeys(report) {
  const keys = [];
  for (const e of report.entries) for (const f of e.findings) keys.push(`${e.line} ${f.kind} ${f.severity}`);
  for (const f of report.list_findings) keys.push(`${f.lines[0] ?? 0} ${f.kind} ${f.severity}`);
  return keys.sort();
}

async function openPage(query = "", fragment = "") {
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  page.errors = errors;
  await page.goto(`${origin}/${query}${fragment}`);
  return page;
}

async function waitReady(page) {
  await page.waitForFunction(() => ["ready", "index-error"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  const st = await page.evaluate(() => document.body.dataset.state);
  if (st !== "ready") throw new Error(`index did not load: ${await page.textContent("#index-error")}`);
}

/** Start a check (or let typing start one) and wait until its result is shown. */
async function checkNow(page) {
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click("#check-now");
  await page.waitForFunction(
    (n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false",
    before,
    { timeout: 60_000 },
  );
}

async function setOptions(page, o) {
  if (o.from || o.to) {
    await page.check("#when-period");
    await page.fill("#opt-from", o.from || "");
    await page.fill("#opt-to", o.to || "");
  } else {
    await page.check("#when-on");
    await page.fill("#opt-on", o.on || "");
  }
  await page.setChecked("#opt-billable", !!o.billable);
}

async function pageFindingKeys(page) {
  // Show every row: all severities, all kinds, every page of rows.
  await page.selectOption("#kind-filter", "");
  for (;;) {
    const more = await page.$("#show-more");
    if (!more) break;
    await more.click();
  }
  return (
    await page.$$eval("#findings tbody tr[data-row]", (rows) =>
      rows.map((r) => `${r.dataset.line} ${r.dataset.kind} ${r.dataset.severity}`),
    )
  ).sort();
}

async function downloadText(page, buttonId) {
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click(`#${buttonId}`)]);
  const file = await dl.path();
  return { name: dl.suggestedFilename(), text: fs.readFileSync(file, "utf8") };
}

function demoText() {
  assert.ok(fs.existsSync(DEMO), `no demo list at ${DEMO}`);
  return fs.readFileSync(DEMO, "utf8");
}

// ---------------------------------------------------------------- tests --

test("the page names its caution and its source", async () => {
  const page = await openPage();
  await waitReady(page);
  const text = await page.textContent("body");
  assert.match(
    text.replace(/\s+/g, " "),
    /rollcall helps assemble research code lists; it is not coding or billing advice; official coding guidelines and local policy prevail/,
  );
  assert.match(text, /CMS/);
  assert.match(text, /CDC\/NCHS/);
  assert.match(text, /public domain/);
  const manifest = JSON.parse(fs.readFileSync(path.join(DIST, "index-manifest.json"), "utf8"));
  assert.equal(await page.textContent("#index-release"), manifest.release);
  assert.deepEqual(page.errors, []);
  await page.close();
});

const OPTION_SETS = [
  { name: "default options", page: {}, cli: null },
  { name: "a study period, billable required", page: { from: "2016-01-01", to: "2024-12-31", billable: true }, cli: ["--from", "2016-01-01", "--to", "2024-12-31", "--billable"] },
  { name: "one day", page: { on: "2018-06-30" }, cli: ["--on", "2018-06-30"] },
];

for (const set of OPTION_SETS) {
  test(`demo list findings equal the CLI's (${set.name})`, async () => {
    const page = await openPage();
    await waitReady(page);
    await page.fill("#list", demoText());
    await setOptions(page, set.page);
    await checkNow(page);
    // With no date both the page and the CLI check on today.
    const expected = cli(DEMO, set.cli ?? []);
    const summary = await page.$eval("#summary", (s) => ({ ...s.dataset }));
    assert.deepEqual(
      { errors: Number(summary.errors), warnings: Number(summary.warnings), infos: Number(summary.infos) },
      { errors: expected.summary.errors, warnings: expected.summary.warnings, infos: expected.summary.infos },
    );
    assert.deepEqual(await pageFindingKeys(page), findingKeys(expected));
    if (set.name === "default options") {
      await page.waitForSelector("#strips .strip-row");
      // The findings, as the page's screenshot in web/ shows them.
      await page.evaluate(() => document.getElementById("results-heading").scrollIntoView());
      await page.screenshot({ path: path.join(OUT, "demo.png"), fullPage: false });
      fs.copyFileSync(path.join(OUT, "demo.png"), path.join(ROOT, "web/screenshot.png"));
    }
    // The JSON download is the CLI's report, field for field.
    const { text } = await downloadText(page, "download-json");
    assert.deepEqual(JSON.parse(text), expected);
    assert.deepEqual(page.errors, []);
    await page.close();
  });
}

test("a suggestion applied with one click replaces the code and the finding goes", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", demoText());
  await checkNow(page);
  // A finding on one entry (roll-ups and sibling gaps are about several lines).
  const one = 'tr[data-row]:has(button.suggestion):not([data-kind="roll-up"]):not([data-kind="sibling-gap"])';
  const target = await page.$eval(`#findings tbody ${one}`, (r) => ({
    line: r.dataset.line,
    kind: r.dataset.kind,
    code: r.querySelector("button.suggestion code").textContent,
  }));
  const beforeChecked = await page.evaluate(() => Number(document.body.dataset.checked));
  await page.click(`#findings tbody tr[data-line="${target.line}"][data-kind="${target.kind}"] button.suggestion`);
  await page.waitForFunction((n) => Number(document.body.dataset.checked) > n && document.body.dataset.checking === "false", beforeChecked);
  const line = (await page.inputValue("#list")).split("\n")[Number(target.line) - 1];
  assert.ok(line.includes(target.code), `line ${target.line} is now “${line}”, without ${target.code}`);
  const still = await page.$(`#findings tbody tr[data-line="${target.line}"][data-kind="${target.kind}"]`);
  assert.equal(still, null, `the ${target.kind} finding on line ${target.line} is still listed`);
  await page.close();
});

test("arrow keys move between rows and Enter applies the first suggestion", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", "I10\ne119\nE11.9");
  await checkNow(page);
  const rows = await page.$$("#findings tbody tr[data-row]");
  assert.ok(rows.length >= 1, "expected findings");
  await rows[0].focus();
  if (rows.length > 1) {
    await page.keyboard.press("ArrowDown");
    assert.equal(await page.evaluate(() => document.activeElement.dataset.row), "1");
    await page.keyboard.press("ArrowUp");
  }
  assert.equal(await page.evaluate(() => document.activeElement.dataset.row), "0");
  // Go to the normalized finding on line 2 and press Enter.
  const idx = await page.$eval('#findings tbody tr[data-kind="normalized"]', (r) => r.dataset.row);
  for (let i = 0; i < Number(idx); i++) await page.keyboard.press("ArrowDown");
  const n = await page.evaluate(() => Number(document.body.dataset.checked));
  await page.keyboard.press("Enter");
  await page.waitForFunction((k) => Number(document.body.dataset.checked) > k && document.body.dataset.checking === "false", n);
  assert.equal((await page.inputValue("#list")).split("\n")[1], "E11.9");
  await page.close();
});

test("apply all safe fixes changes only formatting", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", "e119\ni10\nE11.9\nZZZ99");
  await checkNow(page);
  const n = await page.evaluate(() => Number(document.body.dataset.checked));
  await page.click("#apply-safe");
  await page.waitForFunction((k) => Number(document.body.dataset.checked) > k && document.body.dataset.checking === "false", n);
  assert.equal(await page.$('#findings tbody tr[data-kind="normalized"]'), null);
  const lines = (await page.inputValue("#list")).split("\n");
  assert.deepEqual([lines[0], lines[1], lines[3]], ["E11.9", "I10", "ZZZ99"]);
  await page.close();
});

test("the FHIR ValueSet download has the R4 ValueSet shape", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", demoText());
  await checkNow(page);
  const { text, name } = await downloadText(page, "download-fhir");
  assert.match(name, /\.json$/);
  const vs = JSON.parse(text);
  const manifest = JSON.parse(fs.readFileSync(path.join(DIST, "index-manifest.json"), "utf8"));
  assert.equal(vs.resourceType, "ValueSet");
  assert.ok(["draft", "active", "retired", "unknown"].includes(vs.status), "status is a ValueSet status code");
  for (const k of ["name", "title", "description"]) if (k in vs) assert.equal(typeof vs[k], "string");
  if ("experimental" in vs) assert.equal(typeof vs.experimental, "boolean");
  assert.ok(Array.isArray(vs.compose.include) && vs.compose.include.length >= 1);
  // The release checked against is named once, with the study period
  // (include.version would name one release for a period that spans several).
  assert.ok(vs.extension.some((x) => x.valueString && x.valueString.includes(`release ${manifest.release}`)));
  for (const inc of vs.compose.include) {
    assert.equal(inc.system, "http://hl7.org/fhir/sid/icd-10-cm");
    assert.equal(inc.version, undefined);
    assert.ok(Array.isArray(inc.concept) && inc.concept.length > 0);
    for (const c of inc.concept) {
      assert.equal(typeof c.code, "string");
      assert.match(c.code, /^[A-Z][0-9][0-9A-Z](\.[0-9A-Z]{1,4})?$/);
      if ("display" in c) assert.equal(typeof c.display, "string");
      assert.deepEqual(Object.keys(c).filter((k) => !["code", "display"].includes(k)), []);
    }
  }
  // Every usable code the CLI sees is in the ValueSet, once.
  const expected = cli(DEMO, []);
  // Another system's code (250.00, ICD-9-CM) is left out: it belongs in a list of its own.
  // Entries with an error-level finding are left out (and named in the description).
  const codes = [...new Set(expected.entries.filter((e) => e.code && e.status !== "pattern" && !["blank", "comment", "column-headings", "other-system"].includes(e.status) && !e.findings.some((f) => f.severity === "error")).map((e) => e.code))];
  assert.deepEqual(vs.compose.include[0].concept.map((c) => c.code), codes);
  await page.close();
});

test("the CSV download neutralises formula cells", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", "E11.9\t=HYPERLINK(\"x\")\nI10\t+1\nE10.9\t@sum\nJ45.909\t-2, with comma");
  await checkNow(page);
  const { text } = await downloadText(page, "download-csv");
  const lines = text.trim().split("\r\n");
  assert.equal(lines[0], "code,label,description,status");
  const labelCell = (l) => l.split(",")[1];
  assert.ok(lines[1].startsWith("E11.9,\"'=HYPERLINK(\"\"x\"\")\""), lines[1]);
  assert.equal(labelCell(lines[2]), "'+1");
  assert.equal(labelCell(lines[3]), "'@sum");
  assert.ok(lines[4].startsWith("J45.909,\"'-2, with comma\""), lines[4]);
  await page.close();
});

test("a FHIR ValueSet file is read by the core, each concept in its system", async () => {
  const page = await openPage();
  await waitReady(page);
  const vs = {
    resourceType: "ValueSet",
    status: "draft",
    compose: { include: [{ system: "http://hl7.org/fhir/sid/icd-10-cm", concept: [{ code: "E11.9", display: "Type 2 diabetes" }, { code: "I10" }] }, { system: "http://snomed.info/sct", concept: [{ code: "44054006" }] }] },
    expansion: { contains: [{ system: "http://hl7.org/fhir/sid/icd-10-cm", code: "E10.9", display: "Type 1\tdiabetes" }] },
  };
  const json = JSON.stringify(vs, null, 2);
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.setInputFiles("#file-input", { name: "list.json", mimeType: "application/json", buffer: Buffer.from(json) });
  await page.waitForFunction((n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false", before);
  // The file goes into the list as it is; the core finds the concepts.
  assert.equal(await page.inputValue("#list"), json);
  assert.match(await page.textContent("#reading-line"), /Read as fhir valueset: 4 codes/);
  // The SNOMED CT concept is checked in its own system, by shape.
  const snomedLine = json.split("\n").findIndex((l) => l.includes("44054006")) + 1;
  await page.waitForSelector(`#findings tbody tr[data-line="${snomedLine}"][data-kind="shape-only"][data-system="snomed"]`);
  // A CSV file is taken as it is and checked; its safe fix keeps the label column.
  await page.setInputFiles("#file-input", { name: "l.csv", mimeType: "text/csv", buffer: Buffer.from('label,code\r\n"Diabetes, type 2",e119\r\n') });
  await page.waitForFunction(() => document.getElementById("list").value.startsWith("label,code"));
  await page.waitForSelector('#findings tbody tr[data-line="2"][data-kind="normalized"]');
  const n = await page.evaluate(() => Number(document.body.dataset.checked));
  await page.click("#apply-safe");
  await page.waitForFunction((k) => Number(document.body.dataset.checked) > k && document.body.dataset.checking === "false", n);
  assert.match(await page.inputValue("#list"), /^label,code\n"Diabetes, type 2",E11\.9\n?$/);
  await page.close();
});

test("a permalink restores the list and options", async () => {
  const page = await openPage();
  await waitReady(page);
  await page.fill("#list", "E11.9\tdiabetes\ne10.9\nI10");
  await setOptions(page, { from: "2017-01-01", to: "2020-12-31", billable: true });
  await checkNow(page);
  await page.waitForFunction(() => /^#(z1|v1)=/.test(location.hash));
  const url = page.url();
  assert.ok(!url.includes("E11.9"), "the list is encoded, not plain");
  const summary = await page.textContent("#summary");
  await page.close();

  const again = await context.newPage();
  await again.goto(url);
  await waitReady(again);
  await again.waitForFunction(() => Number(document.body.dataset.checked || 0) > 0 && document.body.dataset.checking === "false");
  assert.equal(await again.inputValue("#list"), "E11.9\tdiabetes\ne10.9\nI10");
  assert.equal(await again.isChecked("#when-period"), true);
  assert.equal(await again.inputValue("#opt-from"), "2017-01-01");
  assert.equal(await again.inputValue("#opt-to"), "2020-12-31");
  assert.equal(await again.isChecked("#opt-billable"), true);
  assert.equal(await again.textContent("#summary"), summary);
  await again.close();

  const broken = await context.newPage();
  await broken.goto(`${origin}/#z1=AAAA$$`);
  await waitReady(broken);
  assert.match(await broken.textContent("#link-status"), /could not be restored/);
  await broken.close();
});

// The page fetches the manifest's packed copy (icd10cm.rcx.gz) where the
// server has one; these tests damage the index itself, so the copy is made
// missing and the page falls back to the file.
const withoutPacked = (page) => page.route("**/icd10cm.rcx.gz", (route) => route.fulfill({ status: 404, body: "" }));

test("a corrupted index gives a clear message", async () => {
  const good = fs.readFileSync(path.join(DIST, "icd10cm.rcx"));
  const page = await context.newPage();
  await withoutPacked(page);
  await page.route("**/icd10cm.rcx", (route) => {
    const bad = Buffer.from(good);
    const at = Math.floor(bad.length * 0.6);
    bad[at] ^= 0xff;
    route.fulfill({ status: 200, contentType: "application/octet-stream", body: bad });
  });
  await page.goto(`${origin}/`);
  await page.waitForSelector("#index-error:not([hidden])");
  const msg = await page.textContent("#index-error");
  assert.match(msg, /cannot be used/);
  assert.match(msg, /damaged|does not match/i);
  assert.equal(await page.isDisabled("#check-now"), true);
  await page.close();
});

test("a truncated or wrong index gives a clear message", async () => {
  const good = fs.readFileSync(path.join(DIST, "icd10cm.rcx"));
  const page = await context.newPage();
  await withoutPacked(page);
  await page.route("**/icd10cm.rcx", (route) => route.fulfill({ status: 200, body: good.subarray(0, 100) }));
  await page.goto(`${origin}/`);
  await page.waitForSelector("#index-error:not([hidden])");
  assert.match(await page.textContent("#index-error"), /cannot (be used|open)/);
  await page.close();

  const notIndex = await context.newPage();
  await withoutPacked(notIndex);
  await notIndex.route("**/icd10cm.rcx", (route) => route.fulfill({ status: 200, body: Buffer.from("this is not an index file at all, just text ".repeat(20)) }));
  await notIndex.goto(`${origin}/`);
  await notIndex.waitForSelector("#index-error:not([hidden])");
  assert.match(await notIndex.textContent("#index-error"), /cannot open the index: this is not a rollcall index/i);
  await notIndex.close();
});

test("the index travels packed, and a damaged packed copy gives a clear message", async () => {
  // index-manifest --pack writes icd10cm.rcx.gz beside the index and names it
  // in the manifest; a browser with DecompressionStream fetches that copy
  // alone (a fifth of the bytes from a server that sends files as they are).
  const manifest = JSON.parse(fs.readFileSync(path.join(DIST, "index-manifest.json"), "utf8"));
  const packedFile = fs.readFileSync(path.join(DIST, "icd10cm.rcx.gz"));
  assert.deepEqual(manifest.packed, { file: "icd10cm.rcx.gz", encoding: "gzip", byte_length: packedFile.length });
  assert.deepEqual(zlib.gunzipSync(packedFile), fs.readFileSync(path.join(DIST, "icd10cm.rcx")));
  const page = await context.newPage();
  const seen = [];
  page.on("request", (r) => seen.push(new URL(r.url()).pathname));
  await page.goto(`${origin}/`);
  await waitReady(page);
  assert.ok(seen.includes("/icd10cm.rcx.gz"), "the packed copy is fetched");
  assert.ok(!seen.includes("/icd10cm.rcx"), "the raw index is not fetched as well");
  await page.close();

  // A copy that is not gzip, and one that unpacks to other bytes.
  for (const [body, want] of [
    [Buffer.concat([packedFile.subarray(0, 1000), Buffer.alloc(50, 0xaa)]), /icd10cm\.rcx\.gz.*does not unpack.*damaged/],
    [zlib.gzipSync(Buffer.from("this is not an index file at all, just text ".repeat(20))), /cannot open the index: this is not a rollcall index/i],
  ]) {
    const bad = await context.newPage();
    await bad.route("**/icd10cm.rcx.gz", (route) => route.fulfill({ status: 200, contentType: "application/octet-stream", body }));
    await bad.goto(`${origin}/`);
    await bad.waitForSelector("#index-error:not([hidden])");
    assert.match(await bad.textContent("#index-error"), want);
    assert.equal(await bad.isDisabled("#check-now"), true);
    await bad.close();
  }
});

test("a missing index gives a clear message", async () => {
  const page = await openPage("?index=no-such-index.rcx");
  await page.waitForSelector("#index-error:not([hidden])");
  assert.match(await page.textContent("#index-error"), /no-such-index\.rcx.*missing.*404/);
  await page.close();
  const odd = await openPage("?index=../secret");
  await odd.waitForSelector("#index-error:not([hidden])");
  assert.match(await odd.textContent("#index-error"), /not an index file name/);
  await odd.close();
});

test("100,000 lines are checked while the page keeps answering", async () => {
  const page = await openPage();
  await waitReady(page);
  const base = demoText().split("\n").filter((l) => l.trim() && !l.startsWith("#"));
  const lines = [];
  for (let i = 0; lines.length < 100_000; i++) lines.push(base[i % base.length]);
  // Paste, and let the page lay the long text out once (as after a real paste).
  await page.evaluate(async (t) => {
    document.getElementById("list").value = t;
    void document.body.offsetHeight;
    await new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));
  }, lines.join("\n"));
  // Count main-thread timer ticks while the worker checks.
  await page.evaluate(() => {
    // Input delay: from the click event's creation to its handler running.
    document.getElementById("opt-billable").addEventListener("click", (e) => {
      window.__delay = performance.now() - e.timeStamp;
    });
    window.__ticks = [];
    window.__tick = setInterval(() => window.__ticks.push(performance.now()), 10);
  });
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  const clickedAt = await page.evaluate(() => {
    document.getElementById("check-now").click();
    return performance.now();
  });
  // While the worker checks, the page answers typing in another field at once.
  await page.click("#opt-billable");
  const answered = await page.isChecked("#opt-billable");
  const latency = await page.evaluate(() => Math.round(window.__delay));
  const typedAt = await page.evaluate(() => performance.now());
  await page.waitForFunction((n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false", before, { timeout: 180_000 });
  const { ticks, checkMs } = await page.evaluate(() => {
    clearInterval(window.__tick);
    return { ticks: window.__ticks, checkMs: Number(document.body.dataset.checkMs) };
  });
  assert.equal(answered, true);
  const summary = await page.$eval("#summary", (s) => ({ ...s.dataset }));
  assert.ok(Number(summary.errors) + Number(summary.warnings) + Number(summary.infos) > 0);
  assert.match(await page.textContent("#check-status"), /Checked 100,000 lines/);
  assert.ok(typedAt - clickedAt < checkMs, `the click was answered after the check ended (${(typedAt - clickedAt).toFixed(0)} ms, check ${checkMs.toFixed(0)} ms)`);
  assert.ok(latency < 100, `a click waited ${latency} ms for the page during the check`);
  // Timer ticks kept coming while the worker checked.
  const during = ticks.filter((x) => x > clickedAt + 50 && x < clickedAt + checkMs * 0.9);
  assert.ok(during.length >= Math.floor((checkMs * 0.85) / 40), `only ${during.length} timer ticks in ${checkMs.toFixed(0)} ms of checking`);
  console.log(`# 100,000 lines: ${checkMs.toFixed(0)} ms in the worker; a click answered in ${latency} ms; ${during.length} main-thread ticks meanwhile`);
  await page.close();
});

// Every code of the ICD-10-CM history file (CMS code files FY2016-FY2027,
// bundled in vocab-build/sources) with its description, over and over to
// 200,000 lines, checked for FY2020-FY2024: retired, not yet valid and
// partial-period codes among them, and every code on several lines.
test("a long list fills the table a page at a time, and ends with the CLI's findings", async () => {
  const rows = zlib.gunzipSync(fs.readFileSync(HISTORY)).toString("utf8").split("\n").slice(1).filter(Boolean)
    .map((l) => { const c = l.split("\t"); return `${c[0]}\t${c[3]}`; });
  const lines = [];
  for (let i = 0; lines.length < 200_000; i++) lines.push(rows[i % rows.length]);
  const text = lines.join("\n") + "\n";
  const file = path.join(OUT, "long-list.tsv");
  fs.writeFileSync(file, text);
  const period = { from: "2019-10-01", to: "2024-09-30" };
  const want = cli(file, ["--from", period.from, "--to", period.to]);

  const page = await openPage();
  await waitReady(page);
  await setOptions(page, period);
  await page.evaluate(async (t) => {
    document.getElementById("list").value = t;
    await new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));
  }, text);
  // What the status and the table say while the worker checks.
  await page.evaluate(() => {
    window.__seen = [];
    new MutationObserver(() => {
      const status = document.getElementById("check-status").textContent;
      const rows = document.querySelectorAll("#findings tbody tr[data-row]").length;
      if (document.body.dataset.checking === "true") window.__seen.push({ status, rows, busy: document.getElementById("findings").getAttribute("aria-busy") });
    }).observe(document.getElementById("check-status"), { childList: true, characterData: true, subtree: true });
  });
  await checkNow(page);
  const seen = await page.evaluate(() => window.__seen);
  const during = seen.filter((x) => /^Checking… [\d,]+ of 200,000 lines so far\.$/.test(x.status));
  assert.ok(during.length >= 2, `the status told how far the check was only ${during.length} times: ${JSON.stringify(seen.slice(0, 5))}`);
  const done = during.map((x) => Number(x.status.match(/[\d,]+/)[0].replace(/,/g, "")));
  assert.ok(done.every((n, i) => n < 200_000 && (i === 0 || n >= done[i - 1])), `lines done: ${done}`);
  // By the second progress line the first page's findings were in the table, not yet for acting on.
  assert.ok(during.slice(1).some((x) => x.rows > 0 && x.busy === "true"), "no findings were shown before the check ended");
  assert.equal(await page.$eval("#findings tbody", (b) => b.inert), false);
  assert.equal(await page.$eval("#findings", (t) => t.getAttribute("aria-busy")), null);

  // The whole report: the CLI's counts, and each kind's number of findings.
  const summary = await page.$eval("#summary", (s) => ({ ...s.dataset }));
  assert.deepEqual(
    [Number(summary.errors), Number(summary.warnings), Number(summary.infos)],
    [want.summary.errors, want.summary.warnings, want.summary.infos],
  );
  const kinds = {};
  for (const e of want.entries) for (const f of e.findings) kinds[f.kind] = (kinds[f.kind] || 0) + 1;
  for (const f of want.list_findings) kinds[f.kind] = (kinds[f.kind] || 0) + 1;
  const shown = Object.fromEntries(
    (await page.$$eval("#kind-filter option", (os) => os.map((o) => [o.value, o.textContent])))
      .filter(([k]) => k)
      .map(([k, t]) => [k, Number(t.match(/\((\d+)\)$/)[1])]),
  );
  assert.deepEqual(shown, kinds);
  assert.match(await page.textContent("#check-status"), /Checked 200,000 lines/);
  console.log(`# 200,000 lines: ${during.length} progress updates; ${Object.values(kinds).reduce((a, b) => a + b, 0)} findings`);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("no request leaves the page's origin", async () => {
  assert.ok(requests.length > 0);
  const foreign = requests.filter((u) => !(u.startsWith(origin + "/") || u.startsWith("blob:" + origin) || u.startsWith("data:")));
  assert.deepEqual(foreign, []);
});

test("comparing two lists shows the CLI's figures, runs and equivalents", async () => {
  const draft = path.join(ROOT, "demo-data/compare-draft.tsv");
  const expert = path.join(ROOT, "demo-data/compare-expert.tsv");
  const r = spawnSync(CLI, ["compare", draft, expert, "--from", "2019-01-01", "--to", "2024-12-31", "--format", "json"], {
    encoding: "utf8",
  });
  assert.equal(r.status, 1, `the lists differ: ${r.stderr}`);
  const want = JSON.parse(r.stdout);

  const page = await openPage();
  await waitReady(page);
  await setOptions(page, { from: "2019-01-01", to: "2024-12-31" });
  await page.fill("#list", fs.readFileSync(draft, "utf8"));
  await page.fill("#list-b", fs.readFileSync(expert, "utf8"));
  await page.click("#compare-now");
  await page.waitForFunction(() => document.body.dataset.comparing === "false" && document.body.dataset.compared, null, {
    timeout: 30_000,
  });
  const g = want.agreement;
  const summary = await page.textContent("#compare-summary");
  assert.match(summary, new RegExp(`In both ${g.both}, only in A ${g.only_a}, only in B ${g.only_b}`));
  assert.match(summary, new RegExp(`Jaccard index ${g.jaccard.toFixed(3)}`));
  // One bar per chapter, with its numbers in words.
  const rows = await page.$$eval(".cmp-row", (rs) => rs.map((x) => x.getAttribute("aria-label")));
  assert.deepEqual(
    rows,
    want.chapters.map((t) => `Chapter ${t.chapter}: in both ${t.both}, only in A ${t.only_a}, only in B ${t.only_b}`),
  );
  const runs = await page.$$eval(".cmp-run", (rs) => rs.length);
  assert.equal(runs, want.differences.length);
  const eq = await page.$$eval(".cmp-equivalents li", (ls) => ls.map((l) => l.textContent));
  assert.equal(eq.length, want.equivalents.length);
  assert.match(eq[0], /E11\.21, E11\.22, E11\.29 = B line 4 E11\.2/);
  assert.match(await page.textContent("#compare-legend"), /in both lists.*only in A.*only in B/s);
  const panel = await page.$(".compare-panel");
  await panel.screenshot({ path: path.join(OUT, "compare.png") });
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("another code system's index is fetched when picked, and checks as the CLI does", async () => {
  const list = path.join(OUT, "pcs-list.txt");
  // 0DTJ4ZZ and its body-part node 0DTJ (FY2024 ICD-10-PCS code file), a
  // letter O typed for zero, and a six-character code that cannot be one.
  fs.writeFileSync(list, "0DTJ4ZZ\n0DTJ\nODTJ4ZZ\n0DTJ4Z\n");
  const want = cli(list, ["--system", "icd10pcs", "--on", "2024-01-01"]);
  const page = await openPage();
  await waitReady(page);
  const before = requests.filter((u) => /icd10pcs\.rcx(\.gz)?$/.test(u)).length;
  assert.equal(before, 0, "the PCS index is not fetched until it is picked");
  await setOptions(page, { on: "2024-01-01" });
  await page.fill("#list", fs.readFileSync(list, "utf8"));
  await page.selectOption("#opt-system", "icd10pcs");
  await page.waitForFunction(() => document.body.dataset.state === "ready" && /ICD-10-PCS/.test(document.querySelector("#index-ready").textContent), null, { timeout: 30_000 });
  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  assert.ok(requests.some((u) => /icd10pcs\.rcx(\.gz)?$/.test(u)));
  assert.deepEqual(page.errors, []);
  await page.close();
});

// The GEMs (icd9cm-to-icd10cm-gem-2015.csv, line 5848: "4280","I509"):
// retired ICD-9-CM codes are offered their ICD-10-CM targets, as on the
// command line, where the ICD-10-CM index is always at hand; the page
// fetches it for them.
test("an ICD-9-CM list with retired codes gets their GEM targets, the ICD-10-CM index fetched for them", async () => {
  const list = path.join(OUT, "icd9-list.txt");
  fs.writeFileSync(list, "428.0\n250.00\n");
  const period = { from: "2019-10-01", to: "2024-09-30" };
  const want = cli(list, ["--system", "icd9cm", "--from", period.from, "--to", period.to]);
  const suggested = (report) =>
    report.entries.flatMap((e) => e.findings.map((f) => `${e.line} ${f.kind}: ${(f.suggestions || []).map((x) => x.code).join(" ")}`)).sort();
  assert.ok(suggested(want).some((x) => /^1 retired: .*I50\.9/.test(x)), JSON.stringify(suggested(want)));
  const page = await openPage();
  await waitReady(page);
  await setOptions(page, period);
  await page.fill("#list", fs.readFileSync(list, "utf8"));
  await page.selectOption("#opt-system", "icd9cm");
  await page.waitForFunction(() => document.body.dataset.state === "ready" && /ICD-9-CM/.test(document.querySelector("#index-ready").textContent), null, { timeout: 30_000 });
  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  const shown = await page.$$eval("#findings tbody tr[data-row]", (rows) =>
    rows.map((r) => `${r.dataset.line} ${r.dataset.kind}: ${[...r.querySelectorAll("button.suggestion code")].map((c) => c.textContent).join(" ")}`),
  );
  assert.deepEqual(shown.sort(), suggested(want));
  // Away to ICD-10-CM and back: the new ICD-9-CM checker gets its companion again.
  for (const [system, title] of [["icd10cm", /ICD-10-CM/], ["icd9cm", /ICD-9-CM/]]) {
    await page.selectOption("#opt-system", system);
    await page.waitForFunction((t) => document.body.dataset.state === "ready" && new RegExp(t).test(document.querySelector("#index-ready").textContent), title.source, { timeout: 30_000 });
  }
  await checkNow(page);
  const again = await page.$$eval("#findings tbody tr[data-row]", (rows) =>
    rows.map((r) => `${r.dataset.line} ${r.dataset.kind}: ${[...r.querySelectorAll("button.suggestion code")].map((c) => c.textContent).join(" ")}`),
  );
  assert.deepEqual(again.sort(), suggested(want));
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("a list with a system column is checked per system as the CLI does, the PCS index fetched only then", async () => {
  // demo-data/mixed-list.tsv: ICD-10-CM, ICD-10-PCS (02703ZZ and 02100Z9, in
  // the FY2024 PCS code file), ICD-9-CM (250.00, CMS32_DESC_LONG_DX.txt),
  // LOINC (2345-7, the LOINC Users' Guide's check digit) and a system value
  // rollcall does not know.
  const file = path.join(ROOT, "demo-data/mixed-list.tsv");
  const want = cli(file, ["--from", "2019-01-01", "--to", "2024-12-31"]);
  const pcsFetches = () => requests.filter((u) => /\/(icd10pcs\.rcx(\.gz)?|manifest-icd10pcs\.json)$/.test(u)).length;
  const page = await openPage();
  await waitReady(page);
  await setOptions(page, { from: "2019-01-01", to: "2024-12-31" });
  const before = pcsFetches();
  await page.fill("#list", demoText());
  await checkNow(page);
  assert.equal(pcsFetches(), before, "an ICD-10-CM list does not fetch the PCS index");
  assert.equal(await page.isHidden("#systems-line"), true);

  await page.fill("#list", fs.readFileSync(file, "utf8"));
  await checkNow(page);
  assert.ok(pcsFetches() >= before + 2, "the PCS manifest and index are fetched for the list that names ICD-10-PCS");
  // The report is the CLI's, field for field: each entry's system and status,
  // the per-system parts and every finding.
  const { text } = await downloadText(page, "download-json");
  const got = JSON.parse(text);
  assert.deepEqual(
    got.entries.map((e) => `${e.line} ${e.system} ${e.status}`),
    want.entries.map((e) => `${e.line} ${e.system} ${e.status}`),
  );
  assert.deepEqual(got.summary.by_system, want.summary.by_system);
  assert.deepEqual(got, want);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  // The findings table names each row's system; the line above it the parts
  // and the indexes loaded.
  const systems = await page.$$eval("#findings tbody tr[data-row]", (rows) => rows.map((r) => `${r.dataset.line} ${r.dataset.system}`));
  assert.ok(systems.includes("10 icd9cm") && systems.includes("11 loinc"), systems.join("; "));
  const line = await page.$eval("#systems-line", (p) => ({ text: p.textContent, loaded: p.dataset.loaded.split(" ") }));
  // ICD-9-CM came with the demo list (its 250.00), ICD-10-PCS with this one.
  assert.deepEqual(line.loaded, ["icd10cm", "icd9cm", "icd10pcs"]);
  for (const p of want.summary.by_system) assert.ok(line.text.includes(`${p.title}: ${p.entries} entr`), `${p.title} in ${line.text}`);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("a shape-only system picked in the menu checks by shape as the CLI's --system", async () => {
  const list = path.join(OUT, "loinc-list.txt");
  // LOINC Users' Guide: 2345-7 has the right mod 10 check digit, so 2345-8 has not.
  fs.writeFileSync(list, "2345-7\n2345-8\n");
  const want = cli(list, ["--system", "loinc", "--on", "2024-01-01"]);
  const page = await openPage();
  await waitReady(page);
  await setOptions(page, { on: "2024-01-01" });
  await page.fill("#list", fs.readFileSync(list, "utf8"));
  await page.selectOption("#opt-system", "loinc");
  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  const { text } = await downloadText(page, "download-json");
  assert.deepEqual(JSON.parse(text), want);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("a PCS list naming ICD-10-CM rows fetches the ICD-10-CM index for them", async () => {
  // 0DTJ4ZZ (FY2024 ICD-10-PCS code file) and E11.9 (FY2024 ICD-10-CM code file).
  const list = path.join(OUT, "pcs-with-cm.tsv");
  fs.writeFileSync(list, "system\tcode\n\t0DTJ4ZZ\nICD-10-CM\tE11.9\n");
  const want = cli(list, ["--system", "icd10pcs", "--on", "2024-01-01"]);
  const page = await openPage();
  await waitReady(page);
  await setOptions(page, { on: "2024-01-01" });
  await page.selectOption("#opt-system", "icd10pcs");
  await page.waitForFunction(() => document.body.dataset.state === "ready" && /ICD-10-PCS/.test(document.querySelector("#index-ready").textContent), null, { timeout: 30_000 });
  await page.fill("#list", fs.readFileSync(list, "utf8"));
  await checkNow(page);
  const { text } = await downloadText(page, "download-json");
  const got = JSON.parse(text);
  assert.deepEqual(got.entries.map((e) => `${e.system} ${e.status}`), ["null column-headings", "icd10pcs valid", "icd10cm valid"]);
  assert.deepEqual(got, want);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("HPO picked in the menu: the demo phenotype list checks as the CLI's --system hpo, with the HPO credit", async () => {
  // demo-data/hpo-phenotypes.tsv against hp-2025-01-16.obo: an obsolete term
  // replaced_by another, an alt_id, a term under a listed parent.
  const file = path.join(ROOT, "demo-data/hpo-phenotypes.tsv");
  const want = cli(file, ["--system", "hpo"]);
  const page = await openPage();
  await waitReady(page);
  assert.equal(requests.filter((u) => /hpo\.rcx(\.gz)?$/.test(u)).length, 0, "the HPO index is not fetched until it is picked");
  await page.selectOption("#opt-system", "hpo");
  await page.waitForFunction(() => document.body.dataset.state === "ready" && /HPO/.test(document.querySelector("#index-ready").textContent), null, { timeout: 30_000 });
  assert.match(await page.textContent("#index-ready"), /one release only/);
  const notice = await page.textContent("#index-notice");
  assert.match(notice, /Human Phenotype Ontology \(HPO\), release 2025-01-16/);
  assert.equal(await page.isVisible("#index-notice"), true);
  await page.fill("#list", fs.readFileSync(file, "utf8"));
  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  const { text } = await downloadText(page, "download-json");
  assert.deepEqual(JSON.parse(text), want);
  assert.deepEqual(page.errors, []);
  // The permalink keeps the system: HPO is picked again and its index fetched.
  await page.waitForFunction(() => /^#(z1|v1)=/.test(location.hash));
  const url = page.url();
  const summary = await page.textContent("#summary");
  await page.close();
  const again = await context.newPage();
  await again.goto(url);
  await again.waitForFunction(() => document.body.dataset.state === "ready" && /HPO/.test(document.querySelector("#index-ready").textContent), null, { timeout: 30_000 });
  await again.waitForFunction((s) => document.querySelector("#summary").textContent === s, summary, { timeout: 30_000 });
  assert.equal(await again.inputValue("#opt-system"), "hpo");
  await again.close();
});
