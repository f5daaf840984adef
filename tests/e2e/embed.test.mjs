// End-to-end tests of the checker embedded in other pages: the form checker
// (web/form-example.html), the JavaScript API example (web/api-example.html),
// the single-file page opened from file:// with no network, the
// Content-Security-Policy of every page, and injection payloads.
// Run through run.sh, which builds web/dist, the single-file page and the CLI.
//
// Environment: DIST, SINGLE (single-file page), CLI, DEMO, CHROMIUM.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { HERE, ROOT, DIST, CLI, DEMO, CHROMIUM, HISTORY, BROWSER_ARGS } from "./env.mjs";

const SINGLE = process.env.SINGLE || path.join(ROOT, "web/dist-single/rollcall.html");


let server;
let origin;
let browser;
let context;
let tmp;
const requests = [];

/** Record CSP violations and the handlers an injected payload would run. */
function watchPage() {
  window.__csp = [];
  const note = (e) => window.__csp.push(`${e.violatedDirective} blocked ${e.blockedURI || "inline"} (${e.sourceFile || ""}:${e.lineNumber || 0})`);
  document.addEventListener("securitypolicyviolation", note, true);
}

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "form-example.html")), `no built pages at ${DIST}`);
  assert.ok(fs.existsSync(CLI), `no CLI at ${CLI}`);
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-embed-"));
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: BROWSER_ARGS });
  context = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  await context.addInitScript(watchPage);
  context.on("request", (r) => requests.push(r.url()));
});

after(async () => {
  if (browser) await browser.close();
  if (server) server.close();
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

// ------------------------------------------------------------- helpers --

/** The CLI's JSON report of a list (exit status 1 only means it has errors). */
function cli(text, args) {
  const file = path.join(tmp, `list-${crypto.randomUUID()}.txt`);
  fs.writeFileSync(file, text);
  const r = spawnSync(CLI, ["check", file, "--format", "json", ...args], { encoding: "utf8", maxBuffer: 1 << 28 });
  assert.ok(r.status === 0 || r.status === 1, `the CLI failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

function manifest() {
  return JSON.parse(fs.readFileSync(path.join(DIST, "index-manifest.json"), "utf8"));
}

/**
 * Billable spans from the release history file (CMS Medicare Code Editor
 * validity tables, vocab-build/sources/PROVENANCE.md): code -> [from, to].
 */
let history;
function billableSpan(dotted) {
  if (!history) {
    history = new Map();
    for (const line of zlib.gunzipSync(fs.readFileSync(HISTORY)).toString("utf8").split("\n").slice(1)) {
      const [code, from, to] = line.split("\t");
      if (code) history.set(code, [from, to]);
    }
  }
  return history.get(dotted.replace(".", "")) ?? null;
}

/** Open a page, collecting script errors, console errors and dialogs. */
async function openPage(url) {
  const page = await context.newPage();
  page.problems = [];
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
  page.on("dialog", (d) => {
    page.problems.push(`a dialog opened: ${d.message()}`);
    d.dismiss();
  });
  await page.goto(url);
  return page;
}

/** No CSP violation, script error, console error or dialog in the page. */
async function assertClean(page) {
  const csp = await page.evaluate(() => window.__csp);
  assert.deepEqual(csp, [], "CSP violations");
  assert.deepEqual(page.problems, []);
}

async function formState(page, state = "checked") {
  await page.waitForFunction((s) => document.getElementById("codes").dataset.rollcallState === s, state, { timeout: 30_000 });
}

/** Set the example form's list as typing would, and wait for its check. */
async function typeList(page, text) {
  await page.fill("#codes", text);
  await page.waitForFunction(
    (t) => {
      const ta = document.getElementById("codes");
      return ta.dataset.rollcallState === "checked" && ta.rollcall.fresh() && ta.value === t;
    },
    text,
    { timeout: 30_000 },
  );
}

/** Elements under a root, shadow roots included, that carry an event-handler attribute or are active content. */
function activeContent() {
  const found = [];
  const walk = (root) => {
    for (const el of root.querySelectorAll("*")) {
      for (const a of el.attributes) if (/^on/i.test(a.name)) found.push(`${el.tagName} ${a.name}`);
      if (["SCRIPT", "IFRAME", "OBJECT", "EMBED"].includes(el.tagName) && !el.closest("head")) found.push(el.tagName);
      if (el.tagName === "IMG") found.push(`IMG ${el.getAttribute("src")}`);
      if (el.shadowRoot) walk(el.shadowRoot);
    }
  };
  walk(document);
  return found;
}

const PERIOD = ["--from", "2019-01-01", "--to", "2024-12-31"];

// ----------------------------------------------------------------- form --

test("the form is held while the list has errors, sent once it is clean, with the summary", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  // The example's list has E11, a category (not in the billable history) with billable codes required.
  assert.equal(billableSpan("E11"), null, "E11 is not a billable code in the release history");
  const start = await page.inputValue("#codes");
  const expected = cli(start, [...PERIOD, "--billable"]);
  assert.ok(expected.summary.errors > 0);
  assert.equal(await page.getAttribute("#codes", "data-rollcall-errors"), String(expected.summary.errors));
  const status = await page.textContent(".rollcall-panel >> .status");
  assert.match(status, new RegExp(`^${expected.summary.errors} errors?, `));
  assert.match(status, new RegExp(`release ${manifest().release}, from 2019-01-01 to 2024-12-31, billable codes required`));
  const kinds = await page.$$eval(".rollcall-panel >> li", (lis) => lis.map((li) => li.dataset.kind));
  assert.ok(kinds.includes("header"), `the panel lists ${kinds.join(", ")}`);

  // Submit: held, with a message that takes the focus.
  const url = page.url();
  await page.click("#send");
  const hold = page.locator(".rollcall-panel >> .hold");
  await hold.waitFor({ state: "visible" });
  assert.match(await hold.textContent(), /Not sent: .* has 1 error/);
  assert.equal(await page.evaluate(() => document.querySelector(".rollcall-panel").shadowRoot.activeElement?.className), "hold");
  await page.waitForTimeout(300);
  assert.equal(page.url(), url, "the form was sent with errors");

  // A clean list, sent at once (before its live check): checked, then sent.
  // E11.9 and I10 are billable throughout 2019-2024 (release history file).
  const clean = "E11.9\tType 2 diabetes mellitus without complications\nI10\tEssential (primary) hypertension";
  for (const code of ["E11.9", "I10"]) {
    const [from, to] = billableSpan(code);
    assert.ok(from <= "20190101" && to >= "20241231", `${code} is billable ${from}-${to}`);
  }
  await page.fill("#codes", clean);
  await Promise.all([page.waitForURL(/form-example\.html\?/), page.click("#send")]);
  await page.waitForSelector("#received:not([hidden])");
  const summary = JSON.parse(await page.textContent('dd[data-field="codes_rollcall"]'));
  const cleanReport = cli(clean, [...PERIOD, "--billable"]);
  const kindsOf = (r) => {
    const k = {};
    for (const e of r.entries) for (const f of e.findings) k[f.kind] = (k[f.kind] || 0) + 1;
    for (const f of r.list_findings) k[f.kind] = (k[f.kind] || 0) + 1;
    return k;
  };
  const m = manifest();
  assert.deepEqual(summary, {
    format: "rollcall-summary/1",
    checked: true,
    vocabulary: "icd10cm",
    release: m.release,
    index_sha256: m.sha256,
    options: { on: null, from: "2019-01-01", to: "2024-12-31", billable: true },
    lines: 2,
    entries: 2,
    errors: 0,
    warnings: cleanReport.summary.warnings,
    infos: cleanReport.summary.infos,
    kinds: kindsOf(cleanReport),
    list_sha256: crypto.createHash("sha256").update(clean, "utf8").digest("hex"),
  });
  // The desk can recompute the digest from the list it received (a form sends CRLF line ends).
  const sent = await page.textContent('dd[data-field="codes"]');
  assert.equal(crypto.createHash("sha256").update(sent.replace(/\r\n/g, "\n")).digest("hex"), summary.list_sha256);
  await assertClean(page);
  await page.close();
});

test("a submit stopped by the form's own validation does not let a later one past the check", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  const url = page.url();
  // A clean list, sent before its check; while it is checked a required field
  // is emptied, so the browser's validation stops the submit made after the check.
  await page.fill("#codes", "I10");
  await page.evaluate(() => {
    document.getElementById("send").click();
    document.getElementById("requester").value = "";
  });
  await formState(page);
  await page.waitForTimeout(300);
  assert.equal(page.url(), url);
  // Now a list with an error (a header with billable codes required), the field filled: held.
  await page.fill("#requester", "Data team");
  await typeList(page, "E11");
  await page.click("#send");
  await page.locator(".rollcall-panel >> .hold").waitFor({ state: "visible" });
  await page.waitForTimeout(300);
  assert.equal(page.url(), url, "the form was sent with errors");
  await assertClean(page);
  await page.close();
});

test("warn only: the form is sent with its errors counted in the summary", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  await page.evaluate(() => document.getElementById("codes").setAttribute("data-rollcall-submit", "warn"));
  // The mode is read when the checker attaches; attach a fresh copy of the form.
  await page.evaluate(async () => {
    const form = document.getElementById("request");
    const copy = form.cloneNode(true);
    copy.querySelectorAll(".rollcall-panel, input[type=hidden]").forEach((e) => e.remove());
    form.replaceWith(copy);
    const { attachAll } = await import("./form-check.js");
    attachAll(copy);
  });
  await formState(page);
  const list = await page.inputValue("#codes");
  const expected = cli(list, [...PERIOD, "--billable"]);
  await Promise.all([page.waitForURL(/form-example\.html\?/), page.click("#send")]);
  const summary = JSON.parse(await page.textContent('dd[data-field="codes_rollcall"]'));
  assert.equal(summary.errors, expected.summary.errors);
  assert.ok(summary.errors > 0);
  await assertClean(page);
  await page.close();
});

test("an index that cannot be loaded: the panel says so, the form goes with an unchecked summary", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  await page.evaluate(async () => {
    const form = document.getElementById("request");
    const copy = form.cloneNode(true);
    copy.querySelectorAll(".rollcall-panel, input[type=hidden]").forEach((e) => e.remove());
    copy.querySelector("#codes").setAttribute("data-rollcall-index", "no-such-index.rcx");
    form.replaceWith(copy);
    const { attachAll } = await import("./form-check.js");
    attachAll(copy);
  });
  await formState(page, "error");
  assert.match(await page.textContent(".rollcall-panel >> .status"), /could not be checked: the index file “no-such-index\.rcx” is missing \(the server answered 404\)/);
  await Promise.all([page.waitForURL(/form-example\.html\?/), page.click("#send")]);
  const summary = JSON.parse(await page.textContent('dd[data-field="codes_rollcall"]'));
  assert.equal(summary.checked, false);
  assert.match(summary.reason, /no-such-index\.rcx/);
  // The 404 is the point of this test.
  page.problems = page.problems.filter((p) => !p.includes("no-such-index.rcx"));
  await assertClean(page);
  await page.close();
});

test("a date attribute naming a missing field gets a clear message", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  await page.evaluate(async () => {
    const form = document.getElementById("request");
    const copy = form.cloneNode(true);
    copy.querySelectorAll(".rollcall-panel, input[type=hidden]").forEach((e) => e.remove());
    const ta = copy.querySelector("#codes");
    ta.removeAttribute("data-rollcall-from");
    ta.removeAttribute("data-rollcall-to");
    ta.setAttribute("data-rollcall-on", "#no-such-field");
    form.replaceWith(copy);
    const { attachAll } = await import("./form-check.js");
    attachAll(copy);
  });
  await formState(page, "error");
  assert.match(await page.textContent(".rollcall-panel >> .status"), /could not be checked: .*“#no-such-field” is not a date/);
  await assertClean(page);
  await page.close();
});

test("the findings panel is usable from the keyboard and announces its status", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  await typeList(page, "I10\nE11.9\nE11\nZZZ99");
  const status = page.locator(".rollcall-panel >> .status");
  assert.equal(await status.getAttribute("aria-live"), "polite");
  assert.equal(await status.getAttribute("role"), "status");
  // Tab from the list into the panel: the first finding's button goes to its line.
  await page.focus("#codes");
  await page.keyboard.press("Tab");
  const label = await page.evaluate(() => document.querySelector(".rollcall-panel").shadowRoot.activeElement?.getAttribute("aria-label"));
  assert.match(label, /^Go to line \d+ of the list$/);
  const line = Number(label.match(/\d+/)[0]);
  await page.keyboard.press("Enter");
  const sel = await page.evaluate(() => {
    const ta = document.getElementById("codes");
    return { active: document.activeElement === ta, text: ta.value.slice(ta.selectionStart, ta.selectionEnd) };
  });
  assert.equal(sel.active, true);
  assert.equal(sel.text, "I10\nE11.9\nE11\nZZZ99".split("\n")[line - 1]);
  // The page's own rules (uppercase, purple list items) do not reach the panel.
  const look = await page.evaluate(() => {
    const li = document.querySelector(".rollcall-panel").shadowRoot.querySelector("li");
    const s = getComputedStyle(li);
    return { transform: s.textTransform, color: s.color };
  });
  assert.notEqual(look.transform, "uppercase");
  assert.notEqual(look.color, "rgb(123, 31, 162)");
  await assertClean(page);
  await page.close();
});

// ------------------------------------------------------------------ API --

test("the JavaScript API example gives the CLI's report", async () => {
  const page = await openPage(`${origin}/api-example.html`);
  await page.waitForFunction(() => ["done", "failed"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  assert.equal(await page.evaluate(() => document.body.dataset.state), "done", await page.textContent("#api-status"));
  const report = JSON.parse(await page.textContent("#api-report"));
  // The rows of api-example.js as a TSV file, checked by the CLI.
  const text = [
    "E11.9\tType 2 diabetes mellitus without complications",
    "E11\tType 2 diabetes mellitus",
    "I1O\tEssential hypertension, mistyped",
    "I50.2",
  ].join("\n");
  assert.deepEqual(report, cli(text, [...PERIOD, "--billable"]));
  // I1O is I10 typed with the letter O (the release history has I10, not I1O).
  assert.ok(billableSpan("I10") && !billableSpan("I1O"));
  assert.equal(report.entries[2].findings[0].kind, "normalized");
  await assertClean(page);
  await page.close();
});

test("the API takes bytes, rows, and names bad input", async () => {
  const page = await openPage(`${origin}/api-example.html`);
  await page.waitForFunction(() => document.body.dataset.state === "done", null, { timeout: 30_000 });
  const out = await page.evaluate(async () => {
    const { open } = await import("./rollcall.js");
    const bytes = await (await fetch("icd10cm.rcx")).arrayBuffer();
    const checker = await open(new Uint8Array(bytes));
    const rows = await checker.check([["E11.9", "with a\ttab"], { code: "I10" }], { on: "2024-01-01" });
    const errors = [];
    for (const bad of [
      () => checker.check([42]),
      () => checker.check("I10", { when: "today" }),
      () => checker.check("I10", { from: "2024-01-01" }),
      () => open(new Uint8Array(10)),
    ]) {
      try {
        await bad();
        errors.push(null);
      } catch (e) {
        errors.push(e.message);
      }
    }
    checker.close();
    return { info: checker.info, lines: rows.entries.map((e) => [e.line, e.code, e.label]), errors };
  });
  assert.equal(out.info.sha256, manifest().sha256);
  assert.deepEqual(out.lines, [
    [1, "E11.9", "with a tab"],
    [2, "I10", null],
  ]);
  assert.match(out.errors[0], /row 1 of the list is a number/);
  assert.match(out.errors[1], /unknown option “when”/);
  assert.match(out.errors[2], /both a start and an end/);
  assert.match(out.errors[3], /cannot open the index/);
  await assertClean(page);
  await page.close();
});

// ---------------------------------------------------------- single file --

test("the single-file page works from file:// with every network request blocked", async () => {
  assert.ok(fs.existsSync(SINGLE), `no single-file page at ${SINGLE}`);
  const offline = await browser.newContext({ offline: true });
  await offline.addInitScript(watchPage);
  const seen = [];
  offline.on("request", (r) => seen.push(r.url()));
  // Every request beyond the file itself fails.
  await offline.route((url) => url.protocol !== "file:", (route) => route.abort("internetdisconnected"));
  const copy = path.join(tmp, "rollcall copy.html"); // as saved on a shared drive, with a space in its name
  fs.copyFileSync(SINGLE, copy);
  const page = await offline.newPage();
  page.problems = [];
  page.on("pageerror", (e) => page.problems.push(`page error: ${e.message}`));
  page.on("console", (m) => m.type() === "error" && page.problems.push(`console error: ${m.text()}`));
  await page.goto(`file://${copy}`);
  await page.waitForFunction(() => ["ready", "index-error"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  assert.equal(await page.evaluate(() => document.body.dataset.state), "ready", await page.textContent("#index-error"));
  assert.equal(await page.textContent("#index-release"), manifest().release);
  const demo = fs.readFileSync(DEMO, "utf8");
  await page.fill("#list", demo);
  await page.check("#when-period");
  await page.fill("#opt-from", "2019-01-01");
  await page.fill("#opt-to", "2024-12-31");
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click("#check-now");
  await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", n, { timeout: 60_000 });
  const expected = cli(demo, PERIOD);
  const got = await page.$eval("#summary", (s) => ({ ...s.dataset }));
  assert.deepEqual(
    { errors: Number(got.errors), warnings: Number(got.warnings), infos: Number(got.infos) },
    { errors: expected.summary.errors, warnings: expected.summary.warnings, infos: expected.summary.infos },
  );
  await page.waitForSelector("#strips .strip-row");
  // A code card gets the notes embedded in the file (no fetch).
  await page.click("#findings tbody tr[data-line] td.input code");
  await page.waitForFunction(() => document.getElementById("card-panel").dataset.notes === "loaded", null, { timeout: 30_000 });
  const foreign = seen.filter((u) => !(u.startsWith("file://") || u.startsWith("blob:") || u.startsWith("data:")));
  assert.deepEqual(foreign, [], "requests beyond the file");
  assert.deepEqual(await page.evaluate(() => window.__csp), [], "CSP violations");
  assert.deepEqual(page.problems, []);
  const bytes = fs.statSync(SINGLE).size;
  console.log(`# single-file page: ${bytes.toLocaleString("en-US")} bytes`);
  await offline.close();
});

// ------------------------------------------------------- CSP, injection --

test("every built page carries a CSP without unsafe-inline or unsafe-eval, and integrity on what it loads", async () => {
  const pages = fs.readdirSync(DIST).filter((f) => f.endsWith(".html")).map((f) => path.join(DIST, f));
  pages.push(SINGLE);
  for (const file of pages) {
    const html = fs.readFileSync(file, "utf8");
    const csp = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]*)">/);
    assert.ok(csp, `${file} has no CSP`);
    assert.doesNotMatch(csp[1], /'unsafe-inline'|'unsafe-eval'/, file);
    assert.match(csp[1], /script-src [^;]*'wasm-unsafe-eval'/, file);
    assert.match(csp[1], /object-src 'none'/, file);
    if (file !== SINGLE) {
      // The test server sends the same policy as a header, with frame-ancestors.
      const res = await fetch(`${origin}/${path.basename(file)}`);
      assert.equal(res.headers.get("content-security-policy"), `${csp[1]}; frame-ancestors 'none'`);
    }
    for (const tag of html.match(/<script\b[^>]*\bsrc=[^>]*>|<link\b[^>]*rel="stylesheet"[^>]*>/g) || []) {
      const ref = tag.match(/(?:src|href)="([^"]+)"/)[1];
      const want = `sha384-${crypto.createHash("sha384").update(fs.readFileSync(path.join(DIST, ref))).digest("base64")}`;
      assert.ok(tag.includes(`integrity="${want}"`), `${path.basename(file)}: ${tag} lacks integrity ${want}`);
    }
  }
  // The worker fetches the Wasm with the Wasm's own SRI hash.
  const wasmSri = `sha384-${crypto.createHash("sha384").update(fs.readFileSync(path.join(DIST, "rollcall-web_bg.wasm"))).digest("base64")}`;
  assert.ok(fs.readFileSync(path.join(DIST, "worker.js"), "utf8").includes(`const WASM_INTEGRITY = "${wasmSri}";`));
});

test("a tampered Wasm file is refused by its integrity", async () => {
  const page = await context.newPage();
  // The Wasm or its gzip copy, whichever the worker fetches.
  await page.route(/rollcall-web_bg\.wasm(\.gz)?$/, async (route) => {
    const res = await route.fetch();
    const body = Buffer.from(await res.body());
    body[body.length - 10] ^= 0x01;
    route.fulfill({ response: res, body });
  });
  await page.goto(`${origin}/`);
  await page.waitForSelector("#index-error:not([hidden])", { timeout: 30_000 });
  assert.match(await page.textContent("#index-error"), /cannot be used.*Wasm file .* does not match its integrity hash/);
  await page.close();
});

test("a changed module is refused by the import map's integrity", async () => {
  const page = await context.newPage();
  const blocked = [];
  page.on("console", (m) => m.type() === "error" && /integrity/.test(m.text()) && blocked.push(m.text()));
  await page.route("**/undo.js", async (route) => {
    const res = await route.fetch();
    route.fulfill({ response: res, body: `${await res.text()}\nwindow.__changed = true;\n` });
  });
  await page.goto(`${origin}/`);
  await page.waitForTimeout(1500);
  assert.equal(await page.evaluate(() => window.__changed), undefined, "the changed module ran");
  assert.equal(await page.evaluate(() => document.body.dataset.state), undefined, "the page started with a changed module");
  assert.ok(blocked.some((t) => t.includes("undo.js")), `no integrity error for undo.js: ${blocked.join("; ")}`);
  await page.close();
});

// Payloads from the common XSS test repertoire (common practice), in the code and label columns.
const PAYLOADS = [
  '<img src=x onerror="window.__pwned=1;alert(1)">\t<img src=x onerror="window.__pwned=2;alert(2)">',
  'E11.9\t"><script>window.__pwned=3;alert(3)</script>',
  "E10.9\t<svg onload=\"window.__pwned=4;alert(4)\"></svg>",
  "'\"><iframe src=\"javascript:alert(5)\"></iframe>\tlabel",
  "I10\t</textarea><img src=x onerror=alert(6)>",
  "E11.<b>9</b>\t<a href=\"javascript:alert(7)\">x</a>",
].join("\n");

test("injection payloads in codes and labels stay text on the page", async () => {
  const page = await openPage(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  await page.fill("#list", PAYLOADS);
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click("#check-now");
  await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", n);
  await page.waitForSelector("#strips .strip-row");
  assert.deepEqual(await page.evaluate(activeContent), []);
  assert.equal(await page.evaluate(() => window.__pwned), undefined);
  assert.equal(await page.$$eval("a[href^='javascript:']", (a) => a.length), 0);
  // The payloads are shown as written.
  const shown = await page.textContent("#findings");
  assert.ok(shown.includes('<img src=x onerror="window.__pwned=1;alert(1)">'), "the code payload is shown as text");
  assert.ok((await page.textContent("#cleaned")).includes('"><script>window.__pwned=3;alert(3)</script>'), "the label payload is shown as text");
  await page.waitForTimeout(300);
  await assertClean(page);
  await page.close();
});

test("injection payloads stay text in the form checker's panel and summary", async () => {
  const page = await openPage(`${origin}/form-example.html`);
  await formState(page);
  await typeList(page, PAYLOADS);
  assert.deepEqual(await page.evaluate(activeContent), []);
  const panel = await page.evaluate(() => document.querySelector(".rollcall-panel").shadowRoot.textContent);
  assert.ok(panel.includes('<img src=x onerror="window.__pwned=1;alert(1)">'), "the payload is shown as text");
  assert.equal(await page.evaluate(() => window.__pwned), undefined);
  await assertClean(page);
  await page.close();
});

test("no request leaves the pages' origin", async () => {
  assert.ok(requests.length > 0);
  const foreign = requests.filter((u) => !(u.startsWith(origin + "/") || u.startsWith("blob:") || u.startsWith("data:")));
  assert.deepEqual(foreign, []);
});
