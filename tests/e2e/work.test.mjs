// The page as a place to work: the keyboard path through findings with undo
// and redo, the phone layout, accessibility (axe-core, zero violations on
// every page), the form checker's readings, the default day of ICD-9-CM,
// the study period typed in two steps, compare following both lists.
// Run through run.sh, which builds web/dist, the single-file page and the CLI.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import fs from "node:fs";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";
import { ROOT, DIST, CLI, DEMO, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

const require = createRequire(import.meta.url);
const AXE = fs.readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");
const SINGLE = process.env.SINGLE || path.join(ROOT, "web/dist-single/rollcall.html");

let server;
let origin;
let browser;
const failed = [];

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: BROWSER_ARGS });
});

after(async () => {
  if (browser) await browser.close();
  if (server) server.close();
});

// ------------------------------------------------------------- helpers --

async function openPage(width = 1280, url = `${origin}/`) {
  const context = await browser.newContext({ viewport: { width, height: 900 }, acceptDownloads: true });
  const page = await context.newPage();
  page.errors = [];
  page.on("pageerror", (e) => page.errors.push(e.message));
  page.on("response", (r) => {
    // A site with no indexes of its own answers 404 for their list.
    if (r.status() >= 400 && !r.url().endsWith("/site-indexes.json")) failed.push(`${r.status()} ${r.url()}`);
  });
  await page.goto(url);
  await page.waitForFunction(() => ["ready", "index-error"].includes(document.body.dataset.state), null, { timeout: 30_000 });
  assert.equal(await page.evaluate(() => document.body.dataset.state), "ready");
  return page;
}

async function done(page) {
  await page.context().close();
}

/** Wait for the check started by `action` to be shown. */
async function checked(page, action) {
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await action();
  await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", n, { timeout: 60_000 });
}

/** axe-core's violations on the page as it is (the script is evaluated through the DevTools protocol, outside the page's CSP). */
async function axeViolations(page) {
  if (!(await page.evaluate(() => typeof window.axe === "object"))) await page.evaluate(AXE);
  const v = await page.evaluate(async () => (await window.axe.run(document)).violations);
  return v.map((x) => `${x.id}: ${x.help} (${x.nodes.map((n) => n.target.join(" ")).slice(0, 3).join("; ")})`);
}

function cli(text, args) {
  const r = spawnSync(CLI, ["check", "-", "--format", "json", ...args], { input: text, encoding: "utf8" });
  assert.ok(r.status === 0 || r.status === 1, r.stderr);
  return JSON.parse(r.stdout);
}

// ---------------------------------------------------------------- tests --

test("keyboard: choose a finding's second suggestion, the next finding gets the focus, undo and redo", async () => {
  const page = await openPage();
  // E11.56 is no ICD-10-CM code (FY2016-FY2027 code files); e119 is E11.9 written loosely.
  const list = "E11.56\tType 2 diabetes mellitus with hyperglycemia\ne119";
  await checked(page, () => page.fill("#list", list));
  const first = await page.$('#findings tbody tr[data-kind="unknown"]');
  assert.equal(await first.getAttribute("data-row"), "0", "the error comes first");
  const second = await first.$$eval("button.suggestion code", (cs) => cs[1].textContent);
  // Tab reaches the findings as one stop; the arrows go into the suggestions.
  await first.focus();
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("ArrowRight");
  assert.equal(await page.evaluate(() => document.activeElement.textContent), `Use ${second}`);
  // Past the first three, a button shows the rest, and the arrows reach them too.
  const all = await first.$$eval("button.suggestion code", (cs) => cs.map((c) => c.textContent));
  assert.ok(all.length > 3, `${all.length} suggestions`);
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("ArrowRight");
  assert.match(await page.evaluate(() => document.activeElement.textContent), /^\d+ more suggestions?$/);
  await page.keyboard.press("Enter");
  assert.equal(await page.evaluate(() => document.activeElement.textContent), `Use ${all[3]}`);
  for (let k = 0; k < 2; k++) await page.keyboard.press("ArrowLeft");
  assert.equal(await page.evaluate(() => document.activeElement.textContent), `Use ${second}`);
  await checked(page, () => page.keyboard.press("Enter"));
  assert.equal((await page.inputValue("#list")).split("\n")[0], `${second}\tType 2 diabetes mellitus with hyperglycemia`);
  // The next finding (e119, normalized) has the focus, wherever it now sorts.
  await page.waitForFunction(() => document.activeElement && document.activeElement.dataset.kind === "normalized");
  assert.equal(await page.evaluate(() => document.activeElement.dataset.line), "2");
  // Undo from the keyboard (focus on a finding), then redo both ways.
  await checked(page, () => page.keyboard.press("Control+z"));
  assert.equal(await page.inputValue("#list"), list);
  assert.match(await page.textContent("#edit-status"), /Undone: Line 1: now/);
  await checked(page, () => page.keyboard.press("Control+Shift+z"));
  assert.equal((await page.inputValue("#list")).split("\n")[0].split("\t")[0], second);
  await checked(page, () => page.click("#undo"));
  assert.equal(await page.inputValue("#list"), list);
  await checked(page, () => page.keyboard.press("Control+y"));
  assert.equal((await page.inputValue("#list")).split("\n")[0].split("\t")[0], second);
  // The changes view shows the line as pasted and as it is now.
  const changes = await page.textContent("#changes-box");
  assert.match(changes, /1 line taken out, 1 line put in/);
  assert.match(changes, /was line 1:\s*E11\.56/);
  // A digit applies that suggestion; the kind links to the glossary.
  await page.click('#findings tbody tr[data-kind="normalized"] a.kind-link');
  assert.equal(await page.evaluate(() => document.activeElement.id), "kind-normalized");
  assert.equal(await page.evaluate(() => document.getElementById("glossary").open), true);
  await page.focus('#findings tbody tr[data-kind="normalized"]');
  await checked(page, () => page.keyboard.press("1"));
  assert.equal((await page.inputValue("#list")).split("\n")[1], "E11.9");
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("at 390 px nothing is wider than the screen, findings are cards and touch targets are 44 px", async () => {
  const page = await openPage(390);
  assert.equal(await page.isVisible("#try-demo"), true, "an empty page offers the demo list");
  await checked(page, () => page.click("#try-demo"));
  assert.equal(await page.inputValue("#list"), fs.readFileSync(DEMO, "utf8"));
  await page.fill("#list-b", fs.readFileSync(path.join(ROOT, "demo-data/compare-expert.tsv"), "utf8"));
  await page.click("#compare-now");
  await page.waitForFunction(() => document.body.dataset.comparing === "false" && document.body.dataset.compared);
  await page.waitForSelector("#strips .strip-row");
  const wide = await page.evaluate(() => {
    const out = [];
    for (const el of document.querySelectorAll("body *")) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      if (el.closest(".visually-hidden, [hidden], .table-wrap")) continue;
      if (r.right > window.innerWidth + 0.5 || r.left < -0.5) out.push(`${el.tagName.toLowerCase()}#${el.id}.${el.className && el.className.baseVal === undefined ? el.className : ""} ${Math.round(r.left)}..${Math.round(r.right)}`);
    }
    return { out: out.slice(0, 10), scroll: document.documentElement.scrollWidth };
  });
  assert.ok(wide.scroll <= 390, `the page is ${wide.scroll} px wide`);
  assert.deepEqual(wide.out, []);
  // A finding is a card: its cells stack, the code in full.
  const card = await page.$eval("#findings tbody tr[data-row]", (tr) => ({ display: getComputedStyle(tr).display, width: tr.getBoundingClientRect().width }));
  assert.equal(card.display, "block");
  assert.ok(card.width <= 390);
  const small = await page.evaluate(() => {
    const out = [];
    const targets = document.querySelectorAll("button, select, input, textarea, summary, a[href]");
    for (const el of targets) {
      if (el.closest("[hidden], .visually-hidden") || el.offsetParent === null) continue;
      // A checkbox or radio counts with its label; the file input is its label.
      const box = ["checkbox", "radio", "file"].includes(el.type) ? el.closest("label") || el : el;
      const r = box.getBoundingClientRect();
      if (r.width === 0) continue;
      if (r.height < 44 - 0.5 || r.width < 44 - 0.5) out.push(`${box.tagName.toLowerCase()}#${box.id} ${Math.round(r.width)}x${Math.round(r.height)}`);
    }
    return out;
  });
  assert.deepEqual(small, []);
  // The screenshot in web/ (looked at before each commit of the page).
  await page.evaluate(() => document.getElementById("results-heading").scrollIntoView());
  await page.screenshot({ path: path.join(ROOT, "web/screenshot-390.png") });
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("axe-core finds no violation on the page after a check, a search and a compare", async () => {
  const page = await openPage();
  assert.deepEqual(await axeViolations(page), [], "the page as it opens");
  await checked(page, () => page.fill("#list", fs.readFileSync(DEMO, "utf8")));
  await page.waitForSelector("#strips .strip-row");
  assert.deepEqual(await axeViolations(page), [], "after a check");
  await page.fill("#word-search", "type 2 diabetes with hyperglycemia");
  await page.waitForSelector(".search-result");
  assert.deepEqual(await axeViolations(page), [], "after a search");
  await page.fill("#list-b", fs.readFileSync(path.join(ROOT, "demo-data/compare-expert.tsv"), "utf8"));
  await page.click("#compare-now");
  await page.waitForFunction(() => document.body.dataset.comparing === "false" && document.body.dataset.compared);
  await page.evaluate(() => {
    document.getElementById("glossary").open = true;
    document.getElementById("changes").open = true;
  });
  assert.deepEqual(await axeViolations(page), [], "after a compare, glossary and changes open");
  // The focus ring: at least 3:1 against white (WCAG 2.2, 1.4.11 non-text contrast).
  const ring = await page.evaluate(() => {
    const b = document.getElementById("check-now");
    b.focus({ focusVisible: true });
    return getComputedStyle(b).outlineColor;
  });
  const [r, g, bl] = ring.match(/\d+/g).map(Number);
  const lum = (c) => ((c /= 255) <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
  const L = 0.2126 * lum(r) + 0.7152 * lum(g) + 0.0722 * lum(bl);
  const contrast = 1.05 / (L + 0.05);
  assert.ok(contrast >= 3, `the focus ring is ${contrast.toFixed(2)}:1 against white`);
  // Severity is never colour alone: every finding says it in words.
  const words = await page.$$eval("#findings tbody tr[data-row]", (rows) => rows.map((r) => [r.dataset.severity, r.querySelector(".sev").textContent]));
  for (const [sev, text] of words) assert.ok(text.includes(sev), `${sev}: ${text}`);
  await done(page);
});

test("axe-core finds no violation on the example form, the API example and the single-file page", async () => {
  const ctx = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  const page = await ctx.newPage();
  await page.goto(`${origin}/form-example.html`);
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState === "checked", null, { timeout: 30_000 });
  assert.deepEqual(await axeViolations(page), [], "the example form with its panel");
  await page.goto(`${origin}/api-example.html`);
  await page.waitForFunction(() => /\d/.test(document.getElementById("api-status").textContent), null, { timeout: 30_000 });
  assert.deepEqual(await axeViolations(page), [], "the API example with its report");
  await ctx.close();

  assert.ok(fs.existsSync(SINGLE), `no single-file page at ${SINGLE}`);
  const one = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const p = await one.newPage();
  await p.goto(`file://${SINGLE}`);
  await p.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  assert.equal(await p.isVisible("#try-demo"), true);
  await checked(p, () => p.click("#try-demo"));
  assert.deepEqual(await axeViolations(p), [], "the single-file page after a check");
  await one.close();
});

test("the form writes a code read as another (I1O for I10) in its official form before sending, and its suggestions can be used", async () => {
  const ctx = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  const page = await ctx.newPage();
  await page.goto(`${origin}/form-example.html`);
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState === "checked", null, { timeout: 30_000 });
  // "I1O": a letter O typed for the zero of I10 (Essential (primary) hypertension, billable 2019-2024).
  await page.fill("#codes", "E11.9\tType 2 diabetes mellitus without complications\nI1O\tEssential (primary) hypertension");
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallState === "checked" && document.getElementById("codes").value.includes("I1O"));
  await Promise.all([page.waitForURL(/form-example\.html\?/), page.click("#send")]);
  // A form sends a textarea's line ends as CR LF (HTML, form submission).
  const sent = new URL(page.url()).searchParams.get("codes").replace(/\r\n/g, "\n");
  assert.equal(sent, "E11.9\tType 2 diabetes mellitus without complications\nI10\tEssential (primary) hypertension");

  // A suggestion in the panel is a button: E11.56 (no code) becomes the one chosen.
  await page.waitForFunction(() => document.getElementById("codes") && document.getElementById("codes").dataset.rollcallState === "checked", null, { timeout: 30_000 });
  await page.fill("#codes", "E11.56\tType 2 diabetes mellitus with hyperglycemia");
  const use = page.locator('.rollcall-panel li[data-kind="unknown"] button.use').first();
  await use.waitFor();
  const code = await use.textContent();
  await use.click();
  await page.waitForFunction((c) => document.getElementById("codes").value.startsWith(c), code);
  await page.waitForFunction(() => document.getElementById("codes").dataset.rollcallErrors === "0");
  await ctx.close();
});

test("ICD-9-CM is checked on a day its index covers, and the page says so", async () => {
  const page = await openPage();
  // 250.00 and 401.9: billable in the final ICD-9-CM release (FY2015,
  // CMS32_DESC_LONG_DX.txt), in force until 2015-09-30.
  const list = "250.00\n401.9\n";
  await page.fill("#list", list);
  await page.selectOption("#opt-system", "icd9cm");
  await page.waitForFunction(() => document.body.dataset.state === "ready" && document.querySelector("#index-ready").dataset.system === "icd9cm", null, { timeout: 30_000 });
  await checked(page, () => page.click("#check-now"));
  const want = cli(list, ["--system", "icd9cm"]);
  assert.equal(want.options.on, "2015-09-30");
  const report = await page.evaluate(() => document.getElementById("summary").textContent);
  assert.match(report, /checked on 2015-09-30/);
  assert.equal(await page.$$eval("#findings tbody tr[data-kind=\"retired\"]", (r) => r.length), 0);
  assert.match(await page.textContent("#on-hint"), /Empty means 2015-09-30, not today: the ICD-9-CM index covers 2014-10-01 to 2015-09-30/);
  assert.match(await page.textContent("#source-credit"), /ICD-9-CM/);
  assert.match(await page.textContent("#index-ready"), /ICD-9-CM index, release FY2015/);
  // A shape-only system: the index line and the credit say so.
  await page.selectOption("#opt-system", "loinc");
  await page.waitForFunction(() => document.querySelector("#index-ready").dataset.system === "loinc");
  assert.match(await page.textContent("#index-ready"), /LOINC: checked by shape and check digit only/);
  assert.match(await page.textContent("#source-credit"), /LOINC is checked by the shape and check digit/);
  assert.deepEqual(page.errors, []);
  await done(page);
});

test("a study period waits for both days without an error, and messages name no command-line option", async () => {
  const page = await openPage();
  await page.fill("#list", "E11.9\n");
  await page.check("#when-period");
  await page.fill("#opt-from", "2019-01-01");
  await page.dispatchEvent("#opt-from", "change");
  await page.waitForTimeout(500);
  assert.equal(await page.isHidden("#options-error"), true);
  assert.match(await page.textContent("#check-status"), /Waiting for both days/);
  await checked(page, async () => {
    await page.fill("#opt-to", "2024-12-31");
    await page.dispatchEvent("#opt-to", "change");
  });
  assert.match(await page.textContent("#summary"), /from 2019-01-01 to 2024-12-31/);
  // 0DTJ4ZZ is an ICD-10-PCS code (FY2024 code file): the ICD-10-CM check
  // advises picking the system, as the page offers it.
  await checked(page, () => page.fill("#list", "0DTJ4ZZ\n"));
  const message = await page.textContent("#findings tbody tr[data-row] .message");
  assert.ok(!/--\w/.test(message), message);
  assert.match(message, /“ICD-10-PCS” under Code system/);
  // One of a thing is said in the singular.
  assert.match(await page.textContent("#summary"), /· ▲ 1 warning ·/);
  await done(page);
});

test("compare follows changes to either list, and the link keeps list B", async () => {
  const page = await openPage();
  await checked(page, () => page.fill("#list", "E11.9\nI10\n"));
  await page.fill("#list-b", "E11.9\n");
  await page.waitForFunction(() => /only in A 1, only in B 0/.test((document.getElementById("compare-summary") || {}).textContent || ""), null, { timeout: 10_000 });
  // List A changes: the comparison follows without a click.
  await page.fill("#list", "E11.9\n");
  await page.waitForFunction(() => /Both lists reach the same billable codes/.test((document.getElementById("compare-summary") || {}).textContent || ""), null, { timeout: 10_000 });
  await page.waitForFunction(() => /^#(z1|v1)=/.test(location.hash));
  await page.fill("#list-b", "E11.9\nE10.9\n");
  await page.waitForFunction(() => /only in B 1/.test((document.getElementById("compare-summary") || {}).textContent || ""), null, { timeout: 10_000 });
  await page.waitForTimeout(300);
  const url = page.url();
  await done(page);
  const again = await openPage(1280, url);
  await again.waitForFunction(() => /only in B 1/.test((document.getElementById("compare-summary") || {}).textContent || ""), null, { timeout: 15_000 });
  assert.equal(await again.inputValue("#list-b"), "E11.9\nE10.9\n");
  await done(again);
});

test("the glossary explains every kind of finding the report can hold", async () => {
  // The kinds' stable names, as src/report.rs (Kind::name) writes them.
  const source = fs.readFileSync(path.join(ROOT, "src/report.rs"), "utf8");
  const body = source.slice(source.indexOf("pub fn name(self) -> &'static str {", source.indexOf("impl Kind")));
  const kinds = [...body.slice(0, body.indexOf("\n    }\n")).matchAll(/Kind::\w+ => "([a-z-]+)"/g)].map((m) => m[1]);
  assert.ok(kinds.length >= 18, `${kinds.length} kinds read from src/report.rs`);
  const page = await openPage();
  const ids = await page.$$eval("#glossary-list dt", (dts) => dts.map((d) => d.id.replace(/^kind-/, "")));
  assert.deepEqual([...ids].sort(), [...kinds].sort());
  await done(page);
});

test("no page asked for a file that is not there (favicon included)", () => {
  assert.deepEqual(failed, []);
});
