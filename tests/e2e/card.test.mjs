// End-to-end tests of the code card (web/static/card.js) in Debian's
// Chromium via playwright-core: opened from a finding and from a search
// result, children added to the list, keys, and a node put in place of a
// line. Run through run.sh, which builds dist and the CLI first.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { DIST, CLI, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

let server;
let origin;
let context;
let profileDir;

before(async () => {
  assert.ok(fs.existsSync(path.join(DIST, "index.html")), `no built page at ${DIST}`);
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  profileDir = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-e2e-card-"));
  context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: BROWSER_ARGS,
    viewport: { width: 1280, height: 1000 },
  });
});

after(async () => {
  if (context) await context.close();
  if (server) server.close();
  if (profileDir) fs.rmSync(profileDir, { recursive: true, force: true });
});

async function readyPage() {
  const page = await context.newPage();
  page.errors = [];
  page.on("pageerror", (e) => page.errors.push(e.message));
  await page.goto(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  return page;
}

/** Run `act`, then wait for the check it starts to finish. */
async function afterCheck(page, act) {
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await act();
  await page.waitForFunction(
    (n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false",
    before,
    { timeout: 30_000 },
  );
}

/** Wait for the card of `code` to be shown. */
async function cardOf(page, code) {
  await page.waitForFunction(
    (c) => {
      const p = document.getElementById("card-panel");
      return p && !p.hidden && p.dataset.state === "ready" && p.dataset.code === c;
    },
    code,
    { timeout: 30_000 },
  );
}

/** The findings rows as "line kind". */
async function findingKeys(page) {
  return page.$$eval("#findings tbody tr[data-line]", (rows) => rows.map((r) => `${r.dataset.lines} ${r.dataset.kind}`).sort());
}

/** The card the CLI gives for the same code and day. */
function cliCard(code, day) {
  const r = spawnSync(CLI, ["show", code, "--on", day, "--format", "json"], { encoding: "utf8" });
  assert.equal(r.status, 0, r.stderr);
  return JSON.parse(r.stdout).cards[0];
}

// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): E11.6 is a
// header whose children are E11.61, E11.62, E11.63, E11.64, E11.65 and E11.69.
test("a card opened from a finding adds two children to the list and the findings change", async () => {
  const page = await readyPage();
  await page.fill("#opt-on", "2026-06-01");
  await afterCheck(page, () => page.fill("#list", "E11.6\n"));
  const before = await findingKeys(page);
  assert.ok(before.some((k) => k.startsWith("1 ")), `a finding on line 1: ${before}`);
  await page.click('#findings tbody tr[data-line="1"] td.input code');
  await cardOf(page, "E11.6");
  const want = cliCard("E11.6", "2026-06-01");
  const boxes = await page.$$eval("#card-panel .card-children input[type=checkbox]", (b) => b.map((x) => x.value));
  assert.deepEqual(boxes, want.children.map((c) => c.code));
  assert.deepEqual(boxes, ["E11.61", "E11.62", "E11.63", "E11.64", "E11.65", "E11.69"]);
  // The breadcrumb goes up to the chapter.
  const crumbs = await page.textContent("#card-panel .card-crumbs");
  assert.match(crumbs, /^Chapter 4: Endocrine, nutritional and metabolic diseases/);
  assert.match(crumbs, /E08-E13 Diabetes mellitus › E11 › E11\.6$/);
  await page.check('#card-panel input[value="E11.65"]');
  await page.check('#card-panel input[value="E11.69"]');
  await afterCheck(page, () => page.click("#card-panel .card-add"));
  const lines = (await page.inputValue("#list")).split("\n").filter(Boolean);
  assert.equal(lines.length, 3, lines.join("|"));
  assert.equal(lines[0], "E11.6");
  assert.match(lines[1], /^E11\.65\b/);
  assert.match(lines[2], /^E11\.69\b/);
  const after = await findingKeys(page);
  assert.notDeepEqual(after, before);
  // The two new lines lie under the header the list already has.
  assert.ok(after.some((k) => k.startsWith("2 ")) && after.some((k) => k.startsWith("3 ")), `${after}`);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("keys move up, down and across siblings; a node can replace its line; note codes open cards", async () => {
  const page = await readyPage();
  await page.fill("#opt-on", "2026-06-01");
  await afterCheck(page, () => page.fill("#list", "E11.6\n"));
  await page.click('#findings tbody tr[data-line="1"] td.input code');
  await cardOf(page, "E11.6");
  await page.focus("#card-panel");
  await page.keyboard.press("ArrowDown");
  await cardOf(page, "E11.61");
  await page.keyboard.press("ArrowUp");
  await cardOf(page, "E11.6");
  await page.keyboard.press("ArrowRight");
  await cardOf(page, "E11.8");
  await page.keyboard.press("ArrowLeft");
  await cardOf(page, "E11.6");
  await page.keyboard.press("ArrowUp");
  await cardOf(page, "E11");
  // E11's Excludes1 note names E10.- (type 1 diabetes mellitus): a link.
  await page.click('#card-panel .card-notes .card-link[data-code="E10"]');
  await cardOf(page, "E10");
  await page.keyboard.press("ArrowRight");
  await cardOf(page, "E11");
  await afterCheck(page, () => page.click("#card-panel .card-put"));
  assert.equal((await page.inputValue("#list")).split("\n")[0], "E11");
  await page.keyboard.press("Escape");
  assert.equal(await page.evaluate(() => document.getElementById("card-panel").hidden), true);
  assert.deepEqual(page.errors, []);
  await page.close();
});

test("a search result opens its card, with the GEMs of the ICD-9-CM index", async () => {
  const page = await readyPage();
  await page.type("#word-search", "type 2 diabetes without complications", { delay: 10 });
  await page.waitForSelector(".search-result .search-code", { timeout: 15_000 });
  await page.waitForFunction(() => document.querySelector(".search-result .search-code").textContent === "E11.9", null, { timeout: 15_000 });
  await page.click(".search-result:first-child .search-code");
  await cardOf(page, "E11.9");
  const text = await page.textContent("#card-panel");
  // Source: the 2015 GEMs (icd10cm-to-icd9cm-gem-2015.csv): E11.9 maps to 250.00.
  assert.match(text, /250\.00/);
  assert.match(text, /not coding or billing advice/);
  assert.deepEqual(page.errors, []);
  await page.close();
});

// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): E11's own
// notes include "diabetes NOS" (Includes) and an Excludes1 naming E08.-.
test("the notes file is fetched the first time a card is opened; until then the card says the notes are loading", async () => {
  const page = await context.newPage();
  page.errors = [];
  page.on("pageerror", (e) => page.errors.push(e.message));
  const fetched = [];
  // The worker's requests, too (they are the context's).
  const seen = (r) => fetched.push(new URL(r.url()).pathname);
  context.on("request", seen);
  // Hold the notes file back a little, so the loading line can be seen.
  let release;
  const held = new Promise((r) => (release = r));
  await page.route("**/icd10cm-notes.rcx", async (route) => {
    await held;
    await route.continue();
  });
  await page.goto(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  await page.fill("#opt-on", "2026-06-01");
  await afterCheck(page, () => page.fill("#list", "E11\n"));
  const notesAsked = () => fetched.filter((p) => /icd10cm-notes/.test(p));
  assert.deepEqual(notesAsked(), [], "no notes fetched before a card is opened");
  await page.click('#findings tbody tr[data-line="1"] td.input code');
  await cardOf(page, "E11");
  // The other facts are there, and a line says the notes are loading.
  assert.match(await page.textContent("#card-panel .card-notes-state"), /notes of the tabular list are loading/);
  assert.ok(await page.$("#card-panel .card-children input[value='E11.9']"));
  // A box ticked while the notes load stays ticked when they arrive.
  await page.check("#card-panel input[value='E11.9']");
  release();
  await page.waitForFunction(() => document.getElementById("card-panel").dataset.notes === "loaded", null, { timeout: 30_000 });
  assert.equal(await page.$("#card-panel .card-notes-state"), null);
  assert.equal(await page.isChecked("#card-panel input[value='E11.9']"), true);
  const want = cliCard("E11", "2026-06-01").notes.map((n) => n.text);
  const got = await page.$$eval("#card-panel .card-notes li .card-note-text", (l) => l.map((x) => x.textContent));
  assert.deepEqual(got, want);
  assert.ok(got.includes("diabetes NOS"), got.join("|"));
  assert.deepEqual(notesAsked(), ["/manifest-icd10cm-notes.json", "/icd10cm-notes.rcx"]);
  // Another card uses the notes already loaded.
  await page.click('#card-panel .card-notes .card-link[data-code="E08"]');
  await cardOf(page, "E08");
  assert.equal(await page.evaluate(() => document.getElementById("card-panel").dataset.notes), "loaded");
  assert.equal(notesAsked().length, 2);
  assert.deepEqual(page.errors, []);
  context.off("request", seen);
  await page.close();
});
