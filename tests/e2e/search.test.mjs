// End-to-end tests of the page's word search box (web/static/search.js) in
// Debian's Chromium via playwright-core. Run through run.sh, which builds
// dist and the CLI first. Environment as for page.test.mjs.
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
  profileDir = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-e2e-search-"));
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

/** Type into the search box and wait for results for exactly these words. */
async function search(page, words) {
  await page.fill("#word-search", "");
  await page.type("#word-search", words, { delay: 15 });
  await page.waitForFunction(
    (w) => document.getElementById("search-status").textContent.includes(`“${w}”`),
    words,
    { timeout: 15_000 },
  );
  return page.$$eval(".search-result", (rows) =>
    rows.map((r) => ({
      code: r.querySelector(".search-code").textContent,
      description: r.querySelector(".search-desc").textContent,
      status: r.querySelector(".search-status").textContent,
      dates: r.querySelector(".search-dates").textContent,
    })),
  );
}

// Source: the CDC tabular XML 2026-04-01 (vocab-build/sources): E11.65 is
// "Type 2 diabetes mellitus with hyperglycemia", billable since 2015-10-01
// (the history file of the same folder).
test("the search box suggests codes while typing and matches the CLI", async () => {
  const page = await readyPage();
  const got = await search(page, "type 2 diabetes with hypergl");
  assert.ok(got.length > 0 && got.length <= 10, `results: ${got.length}`);
  assert.equal(got[0].code, "E11.65");
  assert.equal(got[0].description, "Type 2 diabetes mellitus with hyperglycemia");
  assert.match(got[0].status, /billable today/);
  assert.match(got[0].dates, /^billable 2015-10-01 to /);
  // The CLI answers the same words with the same codes in the same order.
  const r = spawnSync(CLI, ["find", "type", "2", "diabetes", "with", "hypergl", "--format", "json"], { encoding: "utf8" });
  assert.equal(r.status, 0, r.stderr);
  const cli = JSON.parse(r.stdout).results.map((x) => x.code);
  assert.deepEqual(got.map((x) => x.code), cli);
  assert.deepEqual(page.errors, []);
  await page.close();
});

// Source: the CDC tabular XML 2026-04-01: I10 is "Essential (primary)
// hypertension"; "hypertensoin" is a misspelling (two letters swapped).
test("a misspelt word and an abbreviation still find the code", async () => {
  const page = await readyPage();
  const misspelt = await search(page, "essential hypertensoin");
  assert.equal(misspelt[0].code, "I10");
  // E11.9 is "Type 2 diabetes mellitus without complications" (same file).
  const abbreviated = await search(page, "type 2 DM w/o complications");
  assert.equal(abbreviated[0].code, "E11.9");
  const nothing = await search(page, "zzqx");
  assert.equal(nothing.length, 0);
  assert.match(await page.textContent("#search-status"), /No code fits/);
  await page.close();
});

test("Add to list appends the code with its description and checks the list", async () => {
  const page = await readyPage();
  await page.fill("#list", "I10\tEssential (primary) hypertension\n");
  await search(page, "type 2 diabetes with hyperglycemia");
  const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.click(".search-result:first-child .search-add");
  await page.waitForFunction(
    (n) => Number(document.body.dataset.checked || 0) > n && document.body.dataset.checking === "false",
    before,
    { timeout: 30_000 },
  );
  const list = await page.inputValue("#list");
  assert.equal(list, "I10\tEssential (primary) hypertension\nE11.65\tType 2 diabetes mellitus with hyperglycemia\n");
  assert.deepEqual(page.errors, []);
  await page.close();
});
