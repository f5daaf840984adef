// End-to-end tests of a site's own index: indexes built with vocab-build
// from the invented import fixtures (vocab-build/tests/data/import/), their
// manifests written by index-manifest and listed in site-indexes.json, all in
// a copy of the built page, as the README's steps put them. The page's
// picker, the form checker and the JavaScript API take them, and their
// findings are the CLI's `check --index FILE`.
// Run through run.sh, which builds web/dist, the CLI, vocab-build and
// index-manifest first.
//
// Environment: DIST, CLI, VOCAB_BUILD, INDEX_MANIFEST, CHROMIUM.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { ROOT, DIST, CLI, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

const VOCAB_BUILD = process.env.VOCAB_BUILD || path.join(ROOT, "target/fast/vocab-build");
const INDEX_MANIFEST = process.env.INDEX_MANIFEST || path.join(ROOT, "target/fast/index-manifest");
const FIXTURES = path.join(ROOT, "vocab-build/tests/data/import");

const LOINC = "site:loinc-manifest.json";
const LHM = "site:lhm-findings-manifest.json";

let server;
let origin;
let browser;
let tmp;
const requests = [];

function run(bin, args) {
  const r = spawnSync(bin, args, { encoding: "utf8" });
  assert.equal(r.status, 0, `${path.basename(bin)} ${args.join(" ")} failed: ${r.stderr}`);
  return r;
}

/**
 * A copy of the built page in `dir` (its files linked, not copied: the
 * served folder is what the page sees), as a site puts web/dist on its server.
 */
function pageCopy(dir) {
  fs.mkdirSync(dir, { recursive: true });
  for (const name of fs.readdirSync(DIST)) fs.symlinkSync(path.join(DIST, name), path.join(dir, name));
  return dir;
}

function writeJson(file, value) {
  fs.writeFileSync(file, `${JSON.stringify(value, null, 2)}\n`);
}

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  for (const bin of [CLI, VOCAB_BUILD, INDEX_MANIFEST]) assert.ok(fs.existsSync(bin), `no ${bin}; run tests/e2e/run.sh`);
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-site-"));
  const www = path.join(tmp, "www");

  // The README's steps: build each index from a release, write its
  // manifest beside it, list the manifests, put them beside the page.
  const site = pageCopy(path.join(www, "site"));
  run(VOCAB_BUILD, [
    "--loinc", path.join(FIXTURES, "Loinc.csv"), "--loinc-map-to", path.join(FIXTURES, "MapTo.csv"),
    "--release", "2.78", "--release-date", "2024-08-06", "--out", path.join(site, "loinc.rcx"),
  ]);
  run(VOCAB_BUILD, [
    "--table", path.join(FIXTURES, "larkfield-findings.tsv"), "--id", "lhm-findings", "--title", "Larkfield findings",
    "--release-date", "2025-06-30", "--out", path.join(site, "lhm-findings.rcx"),
  ]);
  run(VOCAB_BUILD, [
    "--rxnorm", path.join(FIXTURES, "rxnorm"), "--release-date", "2025-01-06", "--out", path.join(site, "rxnorm.rcx"),
  ]);
  for (const name of ["loinc", "lhm-findings", "rxnorm"]) {
    run(INDEX_MANIFEST, [path.join(site, `${name}.rcx`), path.join(site, `${name}-manifest.json`)]);
  }
  // The RxNorm index is replaced after its manifest was written: picking it
  // must be refused, since it no longer matches.
  fs.copyFileSync(path.join(site, "lhm-findings.rcx"), path.join(site, "rxnorm.rcx"));
  writeJson(path.join(site, "site-indexes.json"), {
    indexes: ["loinc-manifest.json", "lhm-findings-manifest.json", "rxnorm-manifest.json"],
  });

  // A site with no site-indexes.json, one whose file is malformed, and one
  // listing a manifest it does not have.
  pageCopy(path.join(www, "none"));
  writeJson(path.join(pageCopy(path.join(www, "malformed")), "site-indexes.json"), { index: ["loinc-manifest.json"] });
  const partial = pageCopy(path.join(www, "partial"));
  for (const f of ["loinc.rcx", "loinc-manifest.json"]) fs.copyFileSync(path.join(site, f), path.join(partial, f));
  writeJson(path.join(partial, "site-indexes.json"), { indexes: ["loinc-manifest.json", "labs-2026-manifest.json"] });

  server = await serve(www, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: BROWSER_ARGS });
});

after(async () => {
  if (browser) await browser.close();
  if (server) server.close();
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

// ------------------------------------------------------------- helpers --

/** The CLI's JSON report of a list checked against a site index file (exit 1 only means errors). */
function cli(text, index, args = []) {
  const file = path.join(tmp, `list-${crypto.randomUUID()}.txt`);
  fs.writeFileSync(file, text);
  const r = spawnSync(CLI, ["check", file, "--index", path.join(tmp, "www/site", index), "--format", "json", ...args], {
    encoding: "utf8",
  });
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

function manifest(name) {
  return JSON.parse(fs.readFileSync(path.join(tmp, "www/site", name), "utf8"));
}

/** A page of the site folder `dir`, collecting script errors and failed responses. */
async function openPage(dir, file = "") {
  const context = await browser.newContext({ viewport: { width: 1280, height: 1000 }, acceptDownloads: true });
  const page = await context.newPage();
  page.errors = [];
  page.failed = [];
  page.on("pageerror", (e) => page.errors.push(e.message));
  page.on("response", (r) => r.status() >= 400 && page.failed.push(`${r.status()} ${new URL(r.url()).pathname}`));
  page.on("request", (r) => requests.push(r.url()));
  await page.goto(`${origin}/${dir}/${file}`);
  return page;
}

async function done(page) {
  await page.context().close();
}

async function waitReady(page) {
  await page.waitForFunction(() => ["ready", "index-error"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  const st = await page.evaluate(() => document.body.dataset.state);
  if (st !== "ready") throw new Error(`index did not load: ${await page.textContent("#index-error")}`);
}

/** Ready, and the site's list read: its indexes in the menu, or its message shown. */
async function waitSite(page) {
  await waitReady(page);
  await page.waitForFunction(() => document.body.dataset.siteIndexes !== undefined, null, { timeout: 30_000 });
}

async function pickIndex(page, value, title) {
  await page.selectOption("#opt-system", value);
  await page.waitForFunction(
    (t) => document.body.dataset.state === "ready" && document.querySelector("#index-ready").textContent.includes(t),
    title,
    { timeout: 30_000 },
  );
}

async function checkNow(page) {
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click("#check-now");
  await page.waitForFunction(
    (k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false",
    n,
    { timeout: 60_000 },
  );
}

async function pageFindingKeys(page) {
  await page.selectOption("#kind-filter", "");
  return (
    await page.$$eval("#findings tbody tr[data-row]", (rows) => rows.map((r) => `${r.dataset.line} ${r.dataset.kind} ${r.dataset.severity}`))
  ).sort();
}

async function downloadReport(page) {
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click("#download-json")]);
  return JSON.parse(fs.readFileSync(await dl.path(), "utf8"));
}

// The fixture's LOINC terms (vocab-build/tests/data/import/README.md): an
// active one, a discouraged one mapped to it, a deprecated one with map-to
// targets, one with a wrong check digit and an unknown number.
const LOINC_LIST = "9900001-0\tQuellase, serum\n9900004-4\n9900005-1\n9900001-1\n9900011-9\n";

// ---------------------------------------------------------------- tests --

test("a site's indexes are in the picker; a pick is fetched, verified and checks as the CLI's --index, with its notice, and a link keeps it", async () => {
  const want = cli(LOINC_LIST, "loinc.rcx");
  const m = manifest("loinc-manifest.json");
  const page = await openPage("site");
  await waitSite(page);
  const offered = await page.$$eval("#site-indexes option", (os) => os.map((o) => [o.value, o.textContent]));
  assert.deepEqual(offered, [
    [LOINC, "LOINC, release 2.78 (one release)"],
    [LHM, "Larkfield findings, release 2025-06-30 (covers 2018-01-01 to 2025-06-30)"],
    ["site:rxnorm-manifest.json", "RxNorm, release 2025-01-06 (one release)"],
  ]);
  assert.equal(await page.isHidden("#site-indexes-message"), true);
  assert.ok(!requests.some((u) => u.endsWith("/site/loinc.rcx")), "a site index is not fetched until it is picked");

  await page.fill("#list", LOINC_LIST);
  await pickIndex(page, LOINC, "LOINC index (this site's own), release 2.78");
  assert.ok(requests.some((u) => u.endsWith("/site/loinc.rcx")));
  assert.match(await page.textContent("#index-ready"), new RegExp(`SHA-256 ${m.sha256.slice(0, 12)}…, matches its manifest`));
  // Its licence notice, shown as a bundled index's is, and the site's credit.
  assert.equal(await page.isVisible("#index-notice"), true);
  assert.equal(await page.textContent("#index-notice"), m.notice);
  assert.match(m.notice, /Regenstrief Institute/);
  assert.match(await page.textContent("#source-credit"), /LOINC is checked against this site's own index/);
  assert.match(await page.textContent("#source-files"), /Loinc\.csv \(terms, names and statuses\)/);

  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  assert.ok(findingKeys(want).length >= 4, findingKeys(want).join("; "));
  assert.deepEqual(await downloadReport(page), want);

  // The link keeps the pick: the same index is picked, fetched and checked again.
  await page.waitForFunction(() => /^#(z1|v1)=/.test(location.hash));
  const url = page.url();
  const summary = await page.textContent("#summary");
  const again = await page.context().newPage();
  again.errors = [];
  again.on("pageerror", (e) => again.errors.push(e.message));
  await again.goto(url);
  await again.waitForFunction(
    (s) => document.body.dataset.state === "ready" && /LOINC index \(this site's own\)/.test(document.querySelector("#index-ready").textContent) &&
      document.querySelector("#summary").textContent === s,
    summary,
    { timeout: 30_000 },
  );
  assert.equal(await again.inputValue("#opt-system"), LOINC);
  assert.deepEqual(again.errors, []);

  // Back to a bundled system: its own index, credit and no notice.
  await pickIndex(page, "icd10cm", "ICD-10-CM index, release");
  assert.match(await page.textContent("#source-credit"), /ICD-10-CM is a U\.S\. federal work/);
  assert.equal(await page.isHidden("#index-notice"), true);
  assert.deepEqual(page.errors, []);
  assert.deepEqual(page.failed, []);
  await done(page);
});

test("a dated site index checks a study period as the CLI does", async () => {
  // The fixture's table: a graph (LHM-21 under two parents), a retired row
  // with its replacement, a lower-case code, a status word, and a code it lacks.
  const list = "LHM-21\nLHM-23\nlhm-24\nLHM-2\nLHM-10\nLHM-11\n";
  const want = cli(list, "lhm-findings.rcx", ["--from", "2019-01-01", "--to", "2024-12-31"]);
  const page = await openPage("site");
  await waitSite(page);
  await pickIndex(page, LHM, "Larkfield findings index (this site's own), release 2025-06-30");
  assert.match(await page.textContent("#index-ready"), /covers 2018-01-01 to 2025-06-30/);
  await page.check("#when-period");
  await page.fill("#opt-from", "2019-01-01");
  await page.fill("#opt-to", "2024-12-31");
  await page.fill("#list", list);
  await checkNow(page);
  assert.deepEqual(await pageFindingKeys(page), findingKeys(want));
  assert.deepEqual(await downloadReport(page), want);
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("a site index that no longer matches its manifest is refused with a message", async () => {
  const page = await openPage("site");
  await waitSite(page);
  await page.selectOption("#opt-system", "site:rxnorm-manifest.json");
  await page.waitForSelector("#options-error:not([hidden])", { timeout: 30_000 });
  assert.match(await page.textContent("#options-error"), /^Could not load the RxNorm index: the index file does not match its manifest/);
  // The index in use stays, and so does the menu's pick of it.
  assert.equal(await page.inputValue("#opt-system"), "icd10cm");
  assert.match(await page.textContent("#index-ready"), /ICD-10-CM index, release/);
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("no site-indexes.json: the menu is as built, with no message", async () => {
  const page = await openPage("none");
  await waitSite(page);
  assert.equal(await page.evaluate(() => document.body.dataset.siteIndexes), "0");
  assert.equal(await page.$("#site-indexes"), null);
  assert.equal(await page.isHidden("#site-indexes-message"), true);
  assert.deepEqual(page.failed, ["404 /none/site-indexes.json"]);
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("a malformed site-indexes.json, or a listed manifest that is missing, is named on the page", async () => {
  const bad = await openPage("malformed");
  await waitSite(bad);
  assert.equal(await bad.evaluate(() => document.body.dataset.siteIndexes), "error");
  assert.match(
    await bad.textContent("#site-indexes-message"),
    /^This site's own indexes are not offered: site-indexes\.json is not in the expected form \(unknown field `index`, expected `indexes`.*\); write it as \{"indexes": \["loinc-manifest\.json", \.\.\.\]\}\.$/,
  );
  assert.equal(await bad.$("#site-indexes"), null);
  assert.deepEqual(bad.errors, []);
  await done(bad);

  const partial = await openPage("partial");
  await waitSite(partial);
  assert.equal(await partial.isVisible("#site-indexes-message"), true);
  assert.equal(
    await partial.textContent("#site-indexes-message"),
    "Not offered from this site's own indexes: site-indexes.json lists labs-2026-manifest.json, which could not be read (the server answered 404); copy it beside the page.",
  );
  assert.deepEqual(await partial.$$eval("#site-indexes option", (os) => os.map((o) => o.value)), [LOINC]);
  assert.deepEqual(partial.errors, []);
  await done(partial);
});

test("the form checker takes a site index by its name in site-indexes.json", async () => {
  // LHM-23 was retired before the period ends; LHM-2 is no code of the table.
  const list = "LHM-21\tGlycaemic vasculopathy\nLHM-23\nLHM-2";
  const want = cli(list, "lhm-findings.rcx", ["--from", "2019-01-01", "--to", "2024-12-31"]);
  const m = manifest("lhm-findings-manifest.json");
  const page = await openPage("site", "form-example.html");
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState === "checked", null, { timeout: 30_000 });
  await page.evaluate(async (text) => {
    const form = document.getElementById("request");
    const copy = form.cloneNode(true);
    copy.querySelectorAll(".rollcall-panel, input[type=hidden]").forEach((e) => e.remove());
    const ta = copy.querySelector("#codes");
    ta.value = text;
    ta.setAttribute("data-rollcall-check", "lhm-findings");
    ta.setAttribute("data-rollcall-site", "lhm-findings-manifest.json");
    ta.setAttribute("data-rollcall-submit", "warn");
    ta.removeAttribute("data-rollcall-billable");
    form.replaceWith(copy);
    const { attachAll } = await import("./form-check.js");
    attachAll(copy);
  }, list);
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState === "checked", null, { timeout: 30_000 });
  assert.equal(await page.getAttribute("#codes", "data-rollcall-errors"), String(want.summary.errors));
  assert.ok(want.summary.errors > 0);
  assert.match(await page.textContent(".rollcall-panel >> .status"), /Larkfield findings release 2025-06-30, from 2019-01-01 to 2024-12-31/);
  // Sent with its errors (warn only): the summary names the site index.
  await Promise.all([page.waitForURL(/form-example\.html\?/), page.click("#send")]);
  const summary = JSON.parse(await page.textContent('dd[data-field="codes_rollcall"]'));
  assert.equal(summary.checked, true);
  assert.equal(summary.vocabulary, "lhm-findings");
  assert.equal(summary.release, m.release);
  assert.equal(summary.index_sha256, m.sha256);
  assert.deepEqual([summary.errors, summary.warnings, summary.infos], [want.summary.errors, want.summary.warnings, want.summary.infos]);
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState, null, { timeout: 30_000 });

  // A name the site does not list: the panel says which ones it does.
  await page.evaluate(async () => {
    const ta = document.createElement("textarea");
    ta.id = "other";
    ta.value = "LHM-1";
    ta.setAttribute("data-rollcall-check", "lhm-findings");
    ta.setAttribute("data-rollcall-site", "lhm.json");
    document.getElementById("request").append(ta);
    const { attach } = await import("./form-check.js");
    attach(ta);
  });
  await page.waitForFunction(() => document.getElementById("other").dataset.rollcallState === "error", null, { timeout: 30_000 });
  assert.match(
    await page.locator("#other + .rollcall-panel >> .status").textContent(),
    /could not be checked: site-indexes\.json lists no index “lhm\.json”; it lists loinc-manifest\.json, lhm-findings-manifest\.json, rxnorm-manifest\.json/,
  );
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("the JavaScript API lists the site's indexes and opens one by name", async () => {
  const text = "9900001-0\n9900005-1\n";
  const want = cli(text, "loinc.rcx");
  const page = await openPage("site", "api-example.html");
  await page.waitForFunction(() => document.body.dataset.state === "done", null, { timeout: 30_000 });
  const out = await page.evaluate(async (list) => {
    const { siteIndexes, openSite } = await import("./rollcall.js");
    const site = await siteIndexes();
    const checker = await openSite("loinc-manifest.json");
    const report = await checker.check(list);
    checker.close();
    let missing = null;
    try {
      await openSite("no-such-manifest.json");
    } catch (e) {
      missing = e.message;
    }
    return {
      found: site.found,
      names: site.indexes.map((s) => `${s.name} ${s.manifest.file} ${s.manifest.release}`),
      problems: site.problems,
      info: checker.info,
      report,
      missing,
    };
  }, text);
  assert.equal(out.found, true);
  assert.deepEqual(out.names, [
    "loinc-manifest.json loinc.rcx 2.78",
    "lhm-findings-manifest.json lhm-findings.rcx 2025-06-30",
    "rxnorm-manifest.json rxnorm.rcx 2025-01-06",
  ]);
  assert.deepEqual(out.problems, []);
  assert.equal(out.info.sha256, manifest("loinc-manifest.json").sha256);
  assert.deepEqual(out.report, want);
  assert.match(out.missing, /site-indexes\.json lists no index “no-such-manifest\.json”/);

  // A site without the file: none found, and opening one says why.
  const none = await openPage("none", "api-example.html");
  await none.waitForFunction(() => document.body.dataset.state === "done", null, { timeout: 30_000 });
  const nothing = await none.evaluate(async () => {
    const { siteIndexes, openSite } = await import("./rollcall.js");
    const site = await siteIndexes();
    try {
      await openSite("loinc-manifest.json");
      return { site, error: null };
    } catch (e) {
      return { site, error: e.message };
    }
  });
  assert.deepEqual(nothing.site, { file: "site-indexes.json", found: false, indexes: [], problems: [] });
  assert.match(nothing.error, /the site lists no indexes of its own \(there is no site-indexes\.json beside rollcall\.js\)/);
  await done(page);
  await done(none);
});
