// Drafts in the browser: a pasted markdown draft is read as the CLI reads
// it (same entries, same findings), the page says how it read it and marks
// the codes taken, and a fix keeps the markdown around the code.
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";
import { ROOT, DIST, CLI, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

const DRAFT = path.join(ROOT, "demo-data/drafts/assistant-answer.md");

let server;
let origin;
let context;
let profileDir;

before(async () => {
  server = await serve(DIST, 0);
  origin = `http://127.0.0.1:${server.address().port}`;
  profileDir = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-drafts-"));
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

function cli(file, args) {
  const r = spawnSync(CLI, ["check", file, "--format", "json", ...args], { encoding: "utf8" });
  assert.ok(r.status === 0 || r.status === 1, `the CLI failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

async function pageChecked(page, text) {
  const n = await page.evaluate(() => Number(document.body.dataset.checked || 0));
  await page.fill("#list", text);
  await page.waitForFunction(
    (k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false",
    n,
    { timeout: 30_000 },
  );
}

test("a markdown draft reads as the CLI reads it, marked and fixed in place", async () => {
  const text = fs.readFileSync(DRAFT, "utf8");
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  await page.click("#when-on");
  await page.fill("#opt-on", "2024-01-01");

  // The module API gives the CLI's report for the same draft.
  const report = await page.evaluate(async (t) => {
    const { open } = await import("./rollcall.js");
    const checker = await open("icd10cm.rcx", { manifest: "index-manifest.json" });
    const r = await checker.check(t, { on: "2024-01-01" });
    checker.close();
    return r;
  }, text);
  const want = cli(DRAFT, ["--on", "2024-01-01"]);
  const keys = (r) => r.entries.map((e) => [e.line, e.column ?? null, e.code, e.status, e.label]);
  assert.deepEqual(keys(report), keys(want));
  assert.deepEqual(report.reading, want.reading);

  // The page says how it read the draft and marks the ten codes.
  await pageChecked(page, text);
  const said = await page.textContent("#reading-line");
  assert.match(said, /Read as markdown: 10 codes on 9 of 21 lines/);
  await page.waitForFunction(() => document.querySelectorAll("#list-marks mark").length === 10);
  const marked = await page.$$eval("#list-marks mark", (ms) => ms.map((m) => m.textContent));
  assert.deepEqual(marked, ["E11.9", "E11.65", "E11.22", "E11.A", "I50.22", "I50.32", "I5O.9", "02703ZZ", "N18.31", "N18.32"]);

  // A finding leads to its code in the list: the line number selects it.
  await page.click('#findings tbody tr[data-kind="normalized"] button.to-token');
  const picked = await page.evaluate(() => {
    const ta = document.getElementById("list");
    return ta.value.slice(ta.selectionStart, ta.selectionEnd);
  });
  assert.equal(picked, "I5O.9");

  // "Apply all safe fixes" writes I50.9 where I5O.9 stood, keeping the table row.
  const n = await page.evaluate(() => Number(document.body.dataset.checked));
  await page.click("#apply-safe");
  await page.waitForFunction((k) => Number(document.body.dataset.checked) > k && document.body.dataset.checking === "false", n);
  const lines = (await page.inputValue("#list")).split("\n");
  assert.equal(lines[14], "| I50.9 | Heart failure, unspecified | |");
  assert.equal(lines[4], "- **E11.9** – Type 2 diabetes mellitus without complications");

  // Read as plain lines instead, the first word of each line is its code.
  await page.selectOption("#opt-reading", "lines");
  await page.waitForFunction(() => /as you chose/.test(document.querySelector("#reading-line").textContent));
  assert.deepEqual(errors, []);
  await page.close();
});
