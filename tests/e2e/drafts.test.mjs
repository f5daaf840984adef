// Drafts in the browser: a pasted markdown draft is read as the CLI reads
// it (same entries, same findings), the page says how it read it and marks
// the codes taken, and a fix keeps the markdown around the code; a code in
// the list opens its card from the caret (button, Alt+Enter, double-click).
import { test, before, after } from "node:test";
import assert from "node:assert/strict";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";
import { ROOT, DIST, CLI, CHROMIUM, BROWSER_ARGS } from "./env.mjs";

const DRAFT = path.join(ROOT, "demo-data/drafts/assistant-answer.md");
const require = createRequire(import.meta.url);
const AXE = fs.readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");

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

/** axe-core's violations on the page as it is (evaluated through the DevTools protocol, outside the page's CSP). */
async function axeViolations(page) {
  if (!(await page.evaluate(() => typeof window.axe === "object"))) await page.evaluate(AXE);
  const v = await page.evaluate(async () => (await window.axe.run(document)).violations);
  return v.map((x) => `${x.id}: ${x.help} (${x.nodes.map((n) => n.target.join(" ")).slice(0, 3).join("; ")})`);
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

/** Put the caret at `at` in the list (the list focused). */
async function caretAt(page, at) {
  await page.focus("#list");
  await page.evaluate((i) => document.getElementById("list").setSelectionRange(i, i), at);
}

test("a code in the list opens its card from the caret: button, Alt+Enter, double-click", async () => {
  const text = [
    "## Larkfield draft",
    "- **E11.9** – Type 2 diabetes mellitus without complications",
    "- heart failure: I5O.9, and `E11.65` for hyperglycemia",
    "",
  ].join("\n");
  const page = await context.newPage();
  const errors = [];
  page.on("pageerror", (e) => errors.push(e.message));
  await page.goto(`${origin}/`);
  await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
  await page.click("#when-on");
  await page.fill("#opt-on", "2024-01-01");
  await pageChecked(page, text);
  await page.waitForFunction(() => document.querySelectorAll("#list-marks mark").length === 3);
  const button = page.locator("#card-at-caret");

  // The caret in a word not taken as a code: nothing to open, and Alt+Enter says so.
  await caretAt(page, text.indexOf("Larkfield") + 2);
  await page.waitForFunction(() => document.getElementById("card-at-caret").disabled);
  await page.keyboard.press("Alt+Enter");
  assert.match(await page.textContent("#caret-status"), /not in a code/);
  assert.equal(await page.inputValue("#list"), text, "Alt+Enter writes no line break");

  // In the mistyped I5O.9: the card is of I50.9, the code the check took there.
  await caretAt(page, text.indexOf("I5O.9") + 2);
  await page.waitForFunction(() => !document.getElementById("card-at-caret").disabled);
  await button.click();
  await cardOf(page, "I50.9");
  assert.match(await page.textContent("#card-panel"), /Heart failure, unspecified/);
  assert.deepEqual(await axeViolations(page), [], "the card open from the list");
  await page.keyboard.press("Escape");
  assert.equal(await page.evaluate(() => document.activeElement.id), "card-at-caret", "the focus goes back to the button");

  // Just after `E11.65`, by the keyboard alone; closing gives the list back with its caret.
  const after = text.indexOf("E11.65") + "E11.65".length;
  await caretAt(page, after);
  await page.keyboard.press("Alt+Enter");
  await cardOf(page, "E11.65");
  await page.keyboard.press("Escape");
  const back = await page.evaluate(() => {
    const ta = document.activeElement;
    return [ta.id, ta.selectionStart];
  });
  assert.deepEqual(back, ["list", after]);
  assert.equal(await page.inputValue("#list"), text);

  // A double-click on the marked E11.9 (the mark lies under the list's text).
  const box = await page.locator("#list-marks mark").first().boundingBox();
  await page.mouse.dblclick(box.x + box.width / 2, box.y + box.height / 2);
  await cardOf(page, "E11.9");
  assert.equal(await page.evaluate(() => document.getElementById("card-panel").dataset.code), "E11.9");

  assert.deepEqual(await axeViolations(page), [], "the page after the card");
  assert.deepEqual(errors, []);
  await page.close();
});
